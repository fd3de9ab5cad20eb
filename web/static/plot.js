// The spectrum plot: observed peaks above the axis, the selected candidate's
// predicted spectrum mirrored below, lines joining each peak to the
// environments it is assigned to. δ runs from high (left) to low (right), as
// the trade draws it. Drawn as plain SVG.

const NS = "http://www.w3.org/2000/svg";

function el(name, attrs = {}, text) {
  const e = document.createElementNS(NS, name);
  for (const [k, v] of Object.entries(attrs)) e.setAttribute(k, v);
  if (text !== undefined) e.textContent = text;
  return e;
}

// Split counts of the first-order patterns, by multiplicity letter.
const SPLITS = { d: 1, t: 2, q: 3, quint: 4, sext: 5, sept: 6 };

function binomial(n) {
  let row = [1];
  for (let i = 0; i < n; i++) {
    const next = [1];
    for (let k = 1; k < row.length; k++) next.push(row[k - 1] + row[k]);
    next.push(1);
    row = next;
  }
  return row;
}

// multipletLines returns first-order lines {ppm, w} for one environment (sum
// of w = its H count) and the line half-width in Hz to draw them with.
export function multipletLines(env, mhz) {
  const h = env.h || 1;
  const mult = (env.multiplicity || "s").trim();
  const js = (env.j || []).filter((x) => x > 0);
  let groups = []; // [{n, J}]
  if (Array.isArray(env.couplings) && env.couplings.length) {
    groups = env.couplings.filter((c) => c.j > 0 && c.n > 0).map((c) => ({ n: c.n, J: c.j }));
  } else if (mult === "m") {
    return { lines: [{ ppm: env.shift, w: h }], hw: 6 };
  } else if (mult === "br s") {
    return { lines: [{ ppm: env.shift, w: h }], hw: 3 };
  } else {
    const parts = mult in SPLITS ? [mult] : mult.split("");
    parts.forEach((p, i) => {
      const n = SPLITS[p];
      if (n && js[i] !== undefined) groups.push({ n, J: js[i] });
    });
  }
  let lines = [{ off: 0, w: 1 }];
  for (const g of groups) {
    const coef = binomial(g.n);
    const tot = coef.reduce((a, b) => a + b, 0);
    const next = [];
    for (const l of lines) {
      coef.forEach((c, k) => next.push({ off: l.off + (k - g.n / 2) * g.J, w: (l.w * c) / tot }));
    }
    lines = next;
  }
  return { lines: lines.map((l) => ({ ppm: env.shift + l.off / mhz, w: l.w * h })), hw: 0.8 };
}

// trace samples the sum of Lorentzian lines of envs at each pixel column.
function trace(envs, mhz, x2ppm, width, ppmPerPx) {
  const all = [];
  for (const env of envs) {
    if (typeof env.shift !== "number") continue;
    const { lines, hw } = multipletLines(env, mhz);
    const gamma = Math.max(hw / mhz, ppmPerPx * 0.9);
    for (const l of lines) all.push({ c: l.ppm, w: l.w, g: gamma });
  }
  const ys = new Float64Array(width + 1);
  for (let x = 0; x <= width; x++) {
    const p = x2ppm(x);
    let y = 0;
    for (const l of all) {
      const d = p - l.c;
      if (Math.abs(d) < 60 * l.g) y += (l.w * l.g) / (d * d + l.g * l.g);
    }
    ys[x] = y;
  }
  return ys;
}

// plotWidth is the width to draw container's plot at: its own width in CSS
// pixels, so one drawing unit is one pixel and the labels keep their font
// size (11–12 px) at any window width; 900 when it is not laid out.
function plotWidth(container, min) {
  const w = Math.floor(container.clientWidth || 0) - 2;
  return w > 0 ? Math.max(min, w) : 900;
}

// boxesMeet tells whether two boxes {x0, x1, y0, y1} overlap.
function boxesMeet(a, b) {
  return a.x0 < b.x1 && b.x0 < a.x1 && a.y0 < b.y1 && b.y0 < a.y1;
}

// placeLabels puts each label ({text, x, top, cls, peak}) above its peak
// where it meets no peak, no other label and no legend: first right above
// the peak, then one row higher each time, then beside it. A label with no
// free place is left out (its peak keeps a <title> with the text).
// Labels are measured once they are in the drawing.
function placeLabels(svg, g, labels, obstacles, area) {
  const placed = [];
  for (const l of labels) {
    const t = el("text", { class: l.cls, "text-anchor": "middle", "data-peak": String(l.peak) }, l.text);
    g.append(t);
    const w = (t.getComputedTextLength ? t.getComputedTextLength() : 0) || 6.2 * l.text.length;
    const tries = [];
    for (let row = 0; row < 6; row++) tries.push([0, row]);
    for (let row = 0; row < 6; row++) tries.push([-(w / 2 + 6), row], [w / 2 + 6, row]);
    let ok = null;
    for (const [dx, row] of tries) {
      let cx = l.x + dx;
      cx = Math.min(Math.max(cx, area.x0 + w / 2 + 1), area.x1 - w / 2 - 1);
      const y = l.top - 4 - row * 14;
      const box = { x0: cx - w / 2 - 1, x1: cx + w / 2 + 1, y0: y - 11, y1: y + 3 };
      if (box.y0 < area.y0) break;
      if (obstacles.some((o) => boxesMeet(o, box)) || placed.some((o) => boxesMeet(o, box))) continue;
      ok = { cx, y, box };
      break;
    }
    if (!ok) { t.remove(); l.dropped = true; continue; }
    t.setAttribute("x", ok.cx.toFixed(1));
    t.setAttribute("y", ok.y.toFixed(1));
    placed.push(ok.box);
  }
  return placed;
}

// drawPlot renders into container. data: {observed: [{shift, lo, hi, h,
// label, integral, multiplicity}], predicted: [env], overlay: [env] or
// null, links: [{peak, env}], mhz, hi, lo, selectedPeak, names:
// {predicted, overlay}, shiftLabels}. With shiftLabels each observed peak
// is labelled with its δ, multiplicity and integral; without, with its
// multiplicity only. Legends sit in a band of their own above the peaks,
// and labels are placed where they meet no peak and no other label.
export function drawPlot(container, data) {
  const W = plotWidth(container, 560), padL = 16, padR = 16;
  const legendH = 22, obsBase = 166, predTop = 196, axisY = 300, H = 330;
  const stickMax = 92; // tallest observed peak: leaves three label rows above it
  const width = W - padL - padR;
  const { hi, lo } = data;
  const ppmPerPx = (hi - lo) / width;
  const x = (ppm) => padL + ((hi - ppm) / (hi - lo)) * width;
  const x2ppm = (px) => hi - px * ppmPerPx;

  const svg = el("svg", { viewBox: `0 0 ${W} ${H}`, width: W, height: H, class: "spectrum", role: "img",
    "aria-label": `Observed peaks against the predicted spectrum of ${data.names.predicted}, δ ${hi} to ${lo} ppm` });
  svg.append(el("rect", { x: 0, y: 0, width: W, height: H, class: "plot-bg" }));
  const clip = el("clipPath", { id: "plot-clip" });
  clip.append(el("rect", { x: padL, y: 0, width, height: H }));
  svg.append(clip);
  const g = el("g", { "clip-path": "url(#plot-clip)" });
  svg.append(g);
  // In the page while drawing, so labels can be measured.
  container.replaceChildren(svg);

  // Axis and ticks.
  const span = hi - lo;
  const pxPerPpm = width / span;
  // Tick spacing: at least about 60 px between tick labels.
  const step = [0.05, 0.1, 0.2, 0.5, 1, 2].find((st) => st * pxPerPpm >= 60) || 2;
  svg.append(el("line", { x1: padL, x2: W - padR, y1: axisY, y2: axisY, class: "axis" }));
  for (let t = Math.ceil(lo / step - 1e-9) * step; t <= hi + 1e-9; t += step) {
    const tx = x(t);
    svg.append(el("line", { x1: tx, x2: tx, y1: axisY, y2: axisY + 5, class: "axis" }));
    svg.append(el("text", { x: tx, y: axisY + 18, class: "tick", "text-anchor": "middle" },
      t.toFixed(step < 0.1 ? 2 : step < 1 ? 1 : 0)));
  }
  svg.append(el("text", { x: W - padR, y: H - 2, class: "axis-label", "text-anchor": "end" }, "δ (ppm)"));
  g.append(el("line", { x1: padL, x2: W - padR, y1: obsBase, y2: obsBase, class: "baseline" }));
  g.append(el("line", { x1: padL, x2: W - padR, y1: predTop, y2: predTop, class: "baseline" }));

  // Legends: one row in their own band above the peaks, each with a swatch.
  const legends = [["obs", "observed"], ["pred", `predicted: ${data.names.predicted}`]];
  if (data.overlay) legends.push(["over", `overlay: ${data.names.overlay}`]);
  let lx = padL + 4;
  for (const [cls, text] of legends) {
    svg.append(el("line", { x1: lx, x2: lx + 14, y1: 11, y2: 11, class: `swatch ${cls}` }));
    const t = el("text", { x: lx + 18, y: 15, class: `legend ${cls}` }, text);
    svg.append(t);
    lx += 18 + ((t.getComputedTextLength && t.getComputedTextLength()) || 7 * text.length) + 16;
  }

  // Observed: sticks (bands for ranges) with height by H.
  const maxH = Math.max(1, ...data.observed.map((p) => p.h || 1));
  const peakBoxes = [];
  const labels = [];
  data.observed.forEach((p, i) => {
    if (typeof p.shift !== "number" || !isFinite(p.shift)) return;
    const top = obsBase - stickMax * ((p.h || 1) / maxH);
    const cls = `obs-peak${i === data.selectedPeak ? " selected" : ""}${p.unexplained ? " unexplained" : ""}${p.excluded ? " excluded" : ""}`;
    const pg = el("g", { class: "obs-group", "data-peak": String(i) });
    let x0, x1;
    if (p.hi !== undefined && p.lo !== undefined && Math.abs(p.hi - p.lo) > 1e-6) {
      x0 = x(p.hi); x1 = Math.max(x0 + 1, x(p.lo));
      pg.append(el("rect", { x: x0, y: top, width: x1 - x0, height: obsBase - top, class: `${cls} band` }));
    } else {
      // Draw the observed pattern as first-order sticks when its J values
      // are given; the total height still stands for the H count.
      const { lines } = multipletLines({ shift: p.shift, h: 1, multiplicity: p.multiplicity || "s", j: p.j || [] }, data.mhz);
      const wmax = Math.max(...lines.map((l) => l.w));
      x0 = Infinity; x1 = -Infinity;
      for (const l of lines) {
        const yt = obsBase - (obsBase - top) * (l.w / wmax);
        pg.append(el("line", { x1: x(l.ppm), x2: x(l.ppm), y1: obsBase, y2: yt, class: cls }));
        x0 = Math.min(x0, x(l.ppm)); x1 = Math.max(x1, x(l.ppm));
      }
    }
    g.append(pg);
    peakBoxes.push({ x0: x0 - 3, x1: x1 + 3, y0: top - 1, y1: obsBase });
    const text = data.shiftLabels ? shiftLabel(p) : p.label || "";
    if (text && x1 >= padL && x0 <= W - padR) labels.push({ text, x: (x0 + x1) / 2, top, cls: `peak-label${data.shiftLabels ? " shift-label" : ""}`, peak: i, group: pg });
  });

  // Predicted traces, mirrored below.
  const drawTrace = (envs, cls, scaleTo) => {
    const ys = trace(envs, data.mhz, x2ppm, width, ppmPerPx);
    const max = scaleTo || Math.max(...ys, 1e-9);
    let d = "";
    for (let i = 0; i <= width; i++) {
      const yy = predTop + 95 * Math.min(1, ys[i] / max);
      d += `${i === 0 ? "M" : "L"}${(padL + i).toFixed(1)},${yy.toFixed(1)}`;
    }
    g.append(el("path", { d, class: cls }));
    return max;
  };
  const scale = drawTrace(data.predicted, "pred-trace");
  if (data.overlay) drawTrace(data.overlay, "over-trace", scale);

  // Connectors from each observed peak to its environments.
  const envById = new Map(data.predicted.map((e) => [e.id, e]));
  for (const l of data.links) {
    const p = data.observed[l.peak];
    const e = envById.get(l.env);
    if (!p || !e || typeof e.shift !== "number") continue;
    const sel = l.peak === data.selectedPeak;
    g.append(el("line", { x1: x(p.shift), y1: obsBase + 2, x2: x(e.shift), y2: predTop - 2,
      class: `link${sel ? " selected" : ""}` }));
  }

  // Peak labels last, above the peaks, clear of peaks and of each other.
  placeLabels(svg, g, labels, peakBoxes, { x0: padL, x1: W - padR, y0: legendH + 2 });
  for (const l of labels) {
    if (l.dropped) l.group.append(el("title", {}, l.text));
  }
}

// shiftLabel is an observed peak's label: its δ (or range), multiplicity
// and integral, e.g. "4.12 q 2H".
function shiftLabel(p) {
  const d = p.hi !== undefined && p.lo !== undefined && Math.abs(p.hi - p.lo) > 1e-6
    ? `${p.hi.toFixed(2)}–${p.lo.toFixed(2)}` : p.shift.toFixed(2);
  const n = typeof p.integral === "number" && p.integral > 0 ? p.integral : undefined;
  const h = n === undefined ? "" : ` ${Number.isInteger(n) ? n : n.toFixed(1)}H`;
  const m = p.excluded ? " (not scored)" : p.multiplicity ? ` ${p.multiplicity}` : "";
  return `${d}${m}${h}`;
}

// fitRange returns {hi, lo} covering every shift with a margin, in whole or
// half ppm.
export function fitRange(shifts) {
  const s = shifts.filter((v) => typeof v === "number" && isFinite(v));
  if (!s.length) return { hi: 10, lo: 0 };
  let hi = Math.ceil((Math.max(...s) + 0.4) * 2) / 2;
  let lo = Math.floor((Math.min(...s) - 0.4) * 2) / 2;
  if (hi - lo < 2) { hi += 0.5; lo -= 0.5; }
  return { hi, lo };
}

// drawCarbonPlot renders a 13C stick spectrum into container: observed
// peaks above the axis (height by carbon count, a band for a range, the
// DEPT class as label), the selected candidate's predicted carbon signals
// mirrored below, and lines joining each peak to the signals assigned to
// it. data: {observed: [{index, shift, hi, lo, count, dept, unexplained}],
// predicted: [{signal, shift, carbons, cls}], links: [{peak, signal}],
// hi, lo, name}. predicted may be empty (the ranking did not score 13C).
export function drawCarbonPlot(container, data) {
  const W = plotWidth(container, 560), H = 240, padL = 16, padR = 16;
  const obsBase = 100, predTop = 130, axisY = 212;
  const width = W - padL - padR;
  const { hi, lo } = data;
  const x = (ppm) => padL + ((hi - ppm) / (hi - lo)) * width;
  const svg = el("svg", { viewBox: `0 0 ${W} ${H}`, class: "spectrum carbon", role: "img",
    "aria-label": `13C: ${data.observed.length} observed peaks` +
      (data.predicted.length ? ` against the ${data.predicted.length} predicted carbon signals of ${data.name}` : "") + `, δ ${hi} to ${lo} ppm` });
  svg.append(el("rect", { x: 0, y: 0, width: W, height: H, class: "plot-bg" }));
  const span = hi - lo;
  const step = span > 120 ? 20 : span > 50 ? 10 : span > 20 ? 5 : span > 8 ? 2 : 1;
  svg.append(el("line", { x1: padL, x2: W - padR, y1: axisY, y2: axisY, class: "axis" }));
  for (let t = Math.ceil(lo / step) * step; t <= hi + 1e-9; t += step) {
    const tx = x(t);
    svg.append(el("line", { x1: tx, x2: tx, y1: axisY, y2: axisY + 5, class: "axis" }));
    svg.append(el("text", { x: tx, y: axisY + 18, class: "tick", "text-anchor": "middle" }, t.toFixed(0)));
  }
  svg.append(el("text", { x: W - padR, y: H - 2, class: "axis-label", "text-anchor": "end" }, "δC (ppm)"));
  svg.append(el("line", { x1: padL, x2: W - padR, y1: obsBase, y2: obsBase, class: "baseline" }));
  svg.append(el("text", { x: padL + 4, y: 14, class: "legend obs" }, "observed 13C"));
  if (data.predicted.length) {
    svg.append(el("line", { x1: padL, x2: W - padR, y1: predTop, y2: predTop, class: "baseline" }));
    svg.append(el("text", { x: padL + 4, y: predTop + 14, class: "legend pred" }, `predicted: ${data.name}`));
  }
  const maxC = Math.max(1, ...data.observed.map((p) => p.count || 1), ...data.predicted.map((s) => s.carbons || 1));
  const obsX = new Map();
  for (const p of data.observed) {
    if (typeof p.shift !== "number" || !isFinite(p.shift)) continue;
    const top = obsBase - 70 * ((p.count || 1) / maxC);
    const cls = `obs-peak carbon-obs${p.unexplained ? " unexplained" : ""}`;
    if (p.hi !== undefined && p.lo !== undefined && p.hi - p.lo > 1e-6) {
      svg.append(el("rect", { x: x(p.hi), y: top, width: Math.max(2, x(p.lo) - x(p.hi)), height: obsBase - top, class: `${cls} band` }));
    } else {
      svg.append(el("line", { x1: x(p.shift), x2: x(p.shift), y1: obsBase, y2: top, class: cls }));
    }
    obsX.set(p.index, x(p.shift));
    const label = [p.count > 1 ? `${p.count}C` : "", p.dept].filter(Boolean).join(" ");
    if (label) svg.append(el("text", { x: x(p.shift), y: top - 4, class: "peak-label", "text-anchor": "middle" }, label));
  }
  const predX = new Map();
  for (const s of data.predicted) {
    if (typeof s.shift !== "number" || !isFinite(s.shift)) continue;
    const bottom = predTop + 60 * ((s.carbons || 1) / maxC);
    svg.append(el("line", { x1: x(s.shift), x2: x(s.shift), y1: predTop, y2: bottom, class: `pred-stick${s.unobserved ? " unobserved" : ""}` }));
    if (s.cls) svg.append(el("text", { x: x(s.shift), y: bottom + 11, class: "peak-label", "text-anchor": "middle" }, s.cls));
    predX.set(s.signal, x(s.shift));
  }
  for (const l of data.links) {
    const x1 = obsX.get(l.peak), x2 = predX.get(l.signal);
    if (x1 === undefined || x2 === undefined) continue;
    svg.append(el("line", { x1, y1: obsBase + 2, x2, y2: predTop - 2, class: "link" }));
  }
  container.replaceChildren(svg);
}

// fitCarbonRange returns {hi, lo} covering every 13C shift with a margin,
// in steps of 10 ppm.
export function fitCarbonRange(shifts) {
  const s = shifts.filter((v) => typeof v === "number" && isFinite(v));
  if (!s.length) return { hi: 220, lo: 0 };
  let hi = Math.ceil((Math.max(...s) + 5) / 10) * 10;
  let lo = Math.floor((Math.min(...s) - 5) / 10) * 10;
  if (hi - lo < 20) { hi += 10; lo -= 10; }
  return { hi, lo };
}
