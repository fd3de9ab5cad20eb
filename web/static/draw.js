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
// atoms (0-based, in SMILES order) highlighted, or "" when RDKit is missing
// or cannot read the SMILES.
export async function drawSVG(smiles, { width = 220, height = 160, atoms = [] } = {}) {
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
    return mol.get_svg_with_highlights(JSON.stringify(details));
  } finally {
    mol.delete();
  }
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
