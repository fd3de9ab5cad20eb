// Structure drawings from SMILES with the vendored RDKit MinimalLib
// (WebAssembly). RDKit keeps the atoms in the order the SMILES writes them,
// which is the order the service's atom numbers use, so highlighting atom i
// marks the service's atom i.

let rdkitPromise = null;

// rdkit resolves to the initialised RDKit module, or null if it cannot load
// (the page then shows SMILES without drawings).
export function rdkit() {
  if (!rdkitPromise) {
    rdkitPromise = (async () => {
      for (let i = 0; i < 100 && typeof window.initRDKitModule !== "function"; i++) {
        await new Promise((r) => setTimeout(r, 50)); // the deferred script may still be loading
      }
      if (typeof window.initRDKitModule !== "function") return null;
      try {
        return await window.initRDKitModule({ locateFile: () => "/static/vendor/rdkit/RDKit_minimal.wasm" });
      } catch (err) {
        console.error("RDKit did not load:", err);
        return null;
      }
    })();
  }
  return rdkitPromise;
}

// drawSVG returns an SVG drawing of smiles as markup, with the given heavy
// atoms (0-based, in SMILES order) highlighted and, with numbers, each
// labelled with its number counted from 1 (index + 1, as the page's table
// and the CLI count), or "" when RDKit is missing or cannot read the SMILES.
export async function drawSVG(smiles, { width = 220, height = 160, atoms = [], numbers = false } = {}) {
  const rd = await rdkit();
  if (!rd) return "";
  const mol = rd.get_mol(smiles);
  if (!mol) return "";
  try {
    if (mol.is_valid && !mol.is_valid()) return "";
    const details = { width, height, bondLineWidth: 1.5, clearBackground: false };
    if (atoms.length) {
      const n = mol.get_num_atoms ? mol.get_num_atoms() : Infinity;
      details.atoms = atoms.filter((a) => Number.isInteger(a) && a >= 0 && a < n);
      // Mark the bonds between two marked atoms too.
      details.bonds = [];
      try {
        const bonds = JSON.parse(mol.get_json()).molecules?.[0]?.bonds || [];
        const set = new Set(details.atoms);
        bonds.forEach((b, i) => { if (set.has(b.atoms[0]) && set.has(b.atoms[1])) details.bonds.push(i); });
      } catch (_) { /* bond marks are a nicety */ }
      details.highlightColour = [1.0, 0.78, 0.25, 1.0];
    }
    const svg = mol.get_svg_with_highlights(JSON.stringify(details));
    return numbers && details.atoms?.length ? numberAtoms(svg, details.atoms) : svg;
  } finally {
    mol.delete();
  }
}

// numberAtoms adds a label "i+1" beside each highlighted atom i of an RDKit
// SVG drawing. RDKit marks a highlighted atom with an ellipse of class
// "atom-i" and each bond with a path of classes "bond-k atom-i atom-j"; the
// label goes on the side away from the atom's bonds, so it covers neither
// the bonds nor (mostly) the neighbouring atoms. Labels that would overlap
// an earlier one are pushed further out along the same direction.
function numberAtoms(svg, atoms) {
  const doc = new DOMParser().parseFromString(svg, "image/svg+xml");
  const root = doc.documentElement;
  if (root.nodeName !== "svg") return svg;
  const NS = "http://www.w3.org/2000/svg";
  const size = 15; // font size in drawing units (the drawing is shown at about its own size)
  const placed = [];
  const g = doc.createElementNS(NS, "g");
  g.setAttribute("class", "atom-numbers");
  for (const a of atoms) {
    const ell = root.querySelector(`ellipse.atom-${a}`);
    if (!ell) continue;
    const cx = +ell.getAttribute("cx"), cy = +ell.getAttribute("cy");
    const r = Math.max(+ell.getAttribute("rx") || 8, +ell.getAttribute("ry") || 8);
    // Sum the unit vectors towards the far ends of this atom's bonds.
    let sx = 0, sy = 0;
    for (const path of root.querySelectorAll(`path.atom-${a}`)) {
      if (!/\bbond-\d+/.test(path.getAttribute("class") || "")) continue;
      const pts = [...(path.getAttribute("d") || "").matchAll(/(-?[\d.]+)[ ,](-?[\d.]+)/g)].map((m) => [+m[1], +m[2]]);
      let far = null, best = 1;
      for (const [px, py] of pts) {
        const d = Math.hypot(px - cx, py - cy);
        if (d > best) { best = d; far = [px, py]; }
      }
      if (far) { sx += (far[0] - cx) / best; sy += (far[1] - cy) / best; }
    }
    let n = Math.hypot(sx, sy);
    let dx = -sx / n, dy = -sy / n;
    if (!(n > 0.2)) { dx = 0.6; dy = -0.8; } // no clear free side: above right
    const text = String(a + 1);
    const w = 0.62 * size * text.length + 4, h = size + 2;
    let x = 0, y = 0;
    for (let k = 0; k < 6; k++) {
      const dist = r + 0.55 * size + k * 0.8 * size;
      x = cx + dx * dist;
      y = cy + dy * dist;
      const box = { x0: x - w / 2, x1: x + w / 2, y0: y - h / 2, y1: y + h / 2 };
      if (!placed.some((b) => box.x0 < b.x1 && b.x0 < box.x1 && box.y0 < b.y1 && b.y0 < box.y1)) { placed.push(box); break; }
      if (k === 5) placed.push(box);
    }
    const t = doc.createElementNS(NS, "text");
    t.setAttribute("x", x.toFixed(1));
    t.setAttribute("y", y.toFixed(1));
    t.setAttribute("class", `atom-number atom-number-${a}`);
    t.setAttribute("data-atom", String(a));
    t.setAttribute("text-anchor", "middle");
    t.setAttribute("dominant-baseline", "central");
    t.setAttribute("style", `font: 700 ${size}px sans-serif; fill: #1f3f8f; stroke: #fff; stroke-width: 3px; paint-order: stroke; stroke-linejoin: round`);
    t.textContent = text;
    g.append(t);
  }
  root.append(g);
  return new XMLSerializer().serializeToString(root);
}

// putDrawing fills el with the drawing of smiles (or a plain note when it
// cannot be drawn) and labels it for screen readers.
export async function putDrawing(el, smiles, opts) {
  const svg = await drawSVG(smiles, opts);
  if (!svg) {
    el.innerHTML = "";
    const p = document.createElement("p");
    p.className = "no-drawing";
    p.textContent = "drawing unavailable";
    el.append(p);
    return false;
  }
  el.innerHTML = svg;
  const s = el.querySelector("svg");
  if (s) {
    s.setAttribute("role", "img");
    s.setAttribute("aria-label", `structure of ${smiles}`);
    s.removeAttribute("width");
    s.removeAttribute("height");
    s.setAttribute("data-smiles", smiles);
  }
  return true;
}
