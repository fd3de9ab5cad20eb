// Two candidates side by side, peak by peak, in plain words: what each
// predicts at every observed peak and where the spectrum sides with one of
// them. Pure functions over the page's normalised candidates (see
// normCandidate in app.js), so they can be checked without drawing.

// PATTERN_WORDS names the first-order patterns in words.
const PATTERN_WORDS = {
  s: "singlet", d: "doublet", t: "triplet", q: "quartet", quint: "quintet", sext: "sextet", sept: "septet",
  m: "multiplet", "br s": "broad singlet", br: "broad signal", dd: "doublet of doublets", dt: "doublet of triplets",
  td: "triplet of doublets", ddd: "doublet of doublets of doublets", dq: "doublet of quartets", qd: "quartet of doublets",
  tt: "triplet of triplets", ddt: "doublet of doublets of triplets",
};

// patternWord returns the pattern in words ("doublet"), or the code itself
// when it has no name here, or "" for none.
export function patternWord(m) {
  const k = (m || "").trim();
  if (k.includes(" + ")) return k.split(" + ").map(patternWord).join(" and ");
  return PATTERN_WORDS[k] || k;
}

// patternsAgree reports whether a predicted pattern fits the observed one:
// equal codes, or an observed multiplet (which hides any pattern), or a
// broad observed signal against a singlet.
export function patternsAgree(obs, pred) {
  const o = (obs || "").trim(), p = (pred || "").trim();
  if (!o || !p) return true; // nothing to compare
  if (o === p || o === "m") return true;
  if ((o === "br s" || o === "br") && (p === "s" || p === "br s")) return true;
  return false;
}

// sideAt returns what candidate c says about observed peak index i:
// {kind: "assigned", shifts, delta, pattern, h, agree} or {kind: "unexplained"}.
function sideAt(c, i, obs) {
  const a = c.assignments.find((x) => x.peak.index === i);
  if (!a) return { kind: "unexplained", share: c.unexplained.find((u) => u.index === i)?.share };
  const shifts = a.envs.length ? a.envs.map((e) => e.shift).filter((v) => v !== undefined) : a.pred !== undefined ? [a.pred] : [];
  const deltas = shifts.map((s) => (obs.shift ?? a.peak.shift) - s);
  // The pattern the candidate predicts at this peak: the assignment's own,
  // else the one all its environments share.
  const pats = [...new Set(a.envs.map((e) => e.multiplicity).filter(Boolean))];
  const pattern = a.predMult || (pats.length === 1 ? pats[0] : pats.join(" + "));
  const obsMult = obs.multiplicity || a.peak.multiplicity || "";
  const signals = a.envs.length > 1 ? a.envs.map((e) => `${article(patternWord(e.multiplicity))} at δ ${e.shift?.toFixed(2) ?? "—"}`) : [];
  return {
    kind: "assigned", shifts, deltas, signals, worst: deltas.length ? Math.max(...deltas.map(Math.abs)) : undefined,
    pattern, h: a.expH, share: a.share, agree: patternsAgree(obsMult, pattern),
  };
}

// shiftGap is the difference in |Δδ| (ppm) from which one candidate is
// said to be closer in shift than the other: about one typical error of
// additive 1H increments (common practice: ±0.1–0.3 ppm).
export const SHIFT_GAP = 0.2;

// verdict says in words how the two candidates fare at one peak.
function verdict(obs, A, B, na, nb) {
  const seen = patternWord(obs.multiplicity);
  if (A.kind === "unexplained" && B.kind === "unexplained") return { text: "Neither candidate explains this peak.", side: "" };
  if (A.kind === "unexplained") return { text: `${na} leaves this peak unexplained; ${nb} assigns it.`, side: "b" };
  if (B.kind === "unexplained") return { text: `${nb} leaves this peak unexplained; ${na} assigns it.`, side: "a" };
  const parts = [];
  let side = "";
  const predicts = (n, x) => x.signals.length > 1
    ? `${n} puts ${x.signals.length} signals here (${x.signals.join(", ")}); the spectrum shows one ${seen || "signal"}.`
    : `${n} predicts ${article(patternWord(x.pattern))} here; the spectrum shows ${article(seen)}.`;
  if (A.agree && !B.agree) {
    parts.push(predicts(nb, B));
    side = "a";
  } else if (B.agree && !A.agree) {
    parts.push(predicts(na, A));
    side = "b";
  } else if (!A.agree && !B.agree) {
    parts.push(`Neither predicts the ${seen} seen here (${na}: ${patternWord(A.pattern)}, ${nb}: ${patternWord(B.pattern)}).`);
  }
  const h = num(obs.h);
  if (h !== undefined && A.h !== B.h) {
    const off = (x) => Math.abs(x - h);
    if (Math.abs(off(A.h) - off(B.h)) >= 0.5) {
      const [w, r] = off(A.h) < off(B.h) ? [nb, B] : [na, A];
      parts.push(`${w} puts ${r.h} H here; the integral says about ${fmtH(h)}.`);
      side = side || (w === nb ? "a" : "b");
    }
  }
  if (A.worst !== undefined && B.worst !== undefined && Math.abs(A.worst - B.worst) >= SHIFT_GAP) {
    const [w, l, wv, lv] = A.worst < B.worst ? [na, nb, A.worst, B.worst] : [nb, na, B.worst, A.worst];
    parts.push(`${w} is closer in shift (off by ${wv.toFixed(2)} ppm against ${lv.toFixed(2)} for ${l}).`);
    side = side || (w === na ? "a" : "b");
  }
  if (!parts.length) return { text: "Both fit this peak about equally.", side: "" };
  return { text: parts.join(" "), side };
}

function article(w) {
  if (!w) return "no pattern";
  return `${/^[aeiou]/i.test(w) ? "an" : "a"} ${w}`;
}

function fmtH(h) { return Number.isInteger(h) ? String(h) : h.toFixed(1); }

function num(v) { return typeof v === "number" && isFinite(v) ? v : undefined; }

// comparePeaks lines up candidates a and b over the observed peaks (each
// {index, shift, hi, lo, multiplicity, h}); na and nb name them ("#1").
// Each row: {peak, a, b, verdict, side, shareDiff}; side is "a" or "b"
// for the candidate the peak favours, "" for neither.
export function comparePeaks(a, b, observed, na, nb) {
  const rows = [];
  for (const obs of observed) {
    if (obs.excluded || typeof obs.shift !== "number" || !isFinite(obs.shift)) continue;
    const A = sideAt(a, obs.index, obs), B = sideAt(b, obs.index, obs);
    const v = verdict(obs, A, B, na, nb);
    const shareDiff = A.share !== undefined && B.share !== undefined ? A.share - B.share : undefined;
    rows.push({ peak: obs, a: A, b: B, verdict: v.text, side: v.side, shareDiff });
  }
  return rows;
}

// likelihoodRatio formats exp(d) for a score difference d in nats: plain
// below 1000, else in exponent form ("4.6e+04"), "> 1e+300" past floats.
export function likelihoodRatio(d) {
  const r = Math.exp(d);
  if (!isFinite(r)) return "> 1e+300";
  if (r < 1000) return r.toFixed(r < 10 ? 2 : 0);
  return r.toExponential(1);
}

// summaryLine sums up the comparison in one sentence.
export function summaryLine(rows, na, nb) {
  const forA = rows.filter((r) => r.side === "a").length;
  const forB = rows.filter((r) => r.side === "b").length;
  const n = (k) => `${k} peak${k === 1 ? "" : "s"}`;
  if (!forA && !forB) return `${na} and ${nb} explain every peak about equally; the difference lies in the fine detail (see the numbers).`;
  return `The spectrum sides with ${na} at ${n(forA)} and with ${nb} at ${n(forB)}.`;
}
