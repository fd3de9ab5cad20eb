// The report of a ranking a chemist can file: one HTML file with the
// unknown (reference, formula, solvent, MHz, peak lists), how far the
// search went, the constraints, warnings, the caution, the top candidates'
// drawings with their probabilities and #1's table peak by peak. The CSV
// and JSON exports carry the same header (exportHeader).

// pctText rounds a probability (0–1) for people: "> 99.9 %", "< 0.1 %",
// else one decimal.
export function pctText(p) {
  const v = 100 * p;
  if (v >= 99.95) return "> 99.9 %";
  if (v > 0 && v < 0.1) return "< 0.1 %";
  return `${v.toFixed(1)} %`;
}

// peakText writes one observed 1H peak as a journal would.
function peakText(p) {
  const sh = p.hi !== undefined && p.lo !== undefined ? `${p.hi.toFixed(2)}–${p.lo.toFixed(2)}` : p.shift?.toFixed(2) ?? "?";
  const bits = [p.multiplicity, p.j?.length ? `J = ${p.j.map((x) => Number(x).toFixed(1)).join(", ")} Hz` : "",
    p.integral ? `${p.integral}H` : p.h ? `${p.h}H` : ""].filter(Boolean);
  return `${sh}${bits.length ? ` (${bits.join(", ")})` : ""}${p.excluded ? " [not scored]" : ""}`;
}

// exportHeader is the information every export carries about the ranking:
// job, reference, formula, solvent, MHz, the peak lists, the constraints
// switched off, how far the search went, warnings and the caution. r is
// the page's review state ({id, data, req, observed, carbon, mhz}).
export function exportHeader(r) {
  const d = r.data || {}, req = r.req || {}, s = d.search || {};
  const cons = Array.isArray(s.constraints) ? s.constraints : [];
  return {
    job_id: r.id || d.job_id || "",
    reference: req.reference || r.job?.reference || "",
    formula: d.formula || req.formula || "",
    solvent: d.solvent || req.solvent || "",
    mhz: Number(d.mhz) || Number(r.mhz) || Number(req.mhz) || "",
    peaks_1h: (r.observed || []).map(peakText).join("; "),
    peaks_13c: (r.carbon || []).map((p) => `${p.shift?.toFixed(1)}${p.dept ? ` (${p.dept})` : ""}`).join("; "),
    search_status: s.status || "",
    search_stop_reason: s.status === "stopped early" ? s.stop_reason || "" : "",
    search_scope: s.scope || "",
    search_summary: s.summary || "",
    constraints_on: cons.filter((c) => c.enabled !== false).map((c) => c.id),
    constraints_off: cons.filter((c) => c.enabled === false).map((c) => c.id),
    warnings: Array.isArray(d.warnings) ? d.warnings : [],
    caution: d.caution || "",
  };
}

function esc(s) {
  return String(s ?? "").replace(/[&<>"]/g, (c) => ({ "&": "&amp;", "<": "&lt;", ">": "&gt;", '"': "&quot;" }[c]));
}

// reportHTML builds the report as a standalone HTML document. drawings
// holds the SVG markup of each listed candidate (may be "" when RDKit is
// missing); tableRows the text cells of #1's table peak by peak; columns
// their headings; top how many candidates to list.
export function reportHTML(r, { drawings = [], columns = [], tableRows = [], top = 5, generated = new Date() } = {}) {
  const h = exportHeader(r);
  const cands = (r.candidates || []).slice(0, top);
  const s = r.data?.search || {};
  const cons = Array.isArray(s.constraints) ? s.constraints : [];
  const li = (items) => items.map((x) => `<li>${esc(x)}</li>`).join("");
  return `<!doctype html>
<html lang="en"><head><meta charset="utf-8">
<title>shiftrank report ${esc(h.reference || h.job_id)}</title>
<style>
body { font-family: system-ui, "DejaVu Sans", sans-serif; color: #1f2630; margin: 1.5rem; font-size: 13px; line-height: 1.4; }
h1 { font-size: 1.3rem; margin: 0 0 0.5rem; } h2 { font-size: 1.05rem; margin: 1.1rem 0 0.4rem; border-bottom: 1px solid #d5dae1; }
dl { display: grid; grid-template-columns: max-content 1fr; gap: 0.15rem 1rem; margin: 0; } dt { font-weight: 600; } dd { margin: 0; }
.caution { background: #fff3df; border: 1px solid #edd4a8; padding: 0.4rem 0.7rem; }
.cands { display: grid; grid-template-columns: repeat(auto-fill, minmax(12rem, 1fr)); gap: 0.6rem; }
.cand { border: 1px solid #d5dae1; padding: 0.4rem; break-inside: avoid; } .cand svg { width: 100%; height: auto; max-height: 10rem; }
.cand code { word-break: break-all; font-size: 0.85em; }
table { border-collapse: collapse; width: 100%; } th, td { border-bottom: 1px solid #d5dae1; padding: 0.2rem 0.4rem; text-align: left; vertical-align: top; }
.off { color: #5b6573; text-decoration: line-through; }
</style></head><body>
<h1>Ranking of candidate structures${h.reference ? ` — ${esc(h.reference)}` : ""}</h1>
<p class="caution" id="report-caution">Caution: ${esc(h.caution)}</p>
<h2>Unknown</h2>
<dl id="report-header">
<dt>Reference</dt><dd data-field="reference">${esc(h.reference || "—")}</dd>
<dt>Formula</dt><dd data-field="formula">${esc(h.formula)}</dd>
<dt>Solvent</dt><dd data-field="solvent">${esc(h.solvent || "—")}</dd>
<dt>Spectrometer</dt><dd data-field="mhz">${esc(h.mhz)} MHz</dd>
<dt>1H peaks</dt><dd data-field="peaks_1h">${esc(h.peaks_1h || "—")}</dd>
${h.peaks_13c ? `<dt>13C peaks</dt><dd data-field="peaks_13c">${esc(h.peaks_13c)}</dd>` : ""}
<dt>Job</dt><dd data-field="job_id">${esc(h.job_id)}</dd>
<dt>Report made</dt><dd>${esc(generated.toISOString())}</dd>
</dl>
<h2>How far the search went</h2>
<p data-field="search_status"><strong>${esc(h.search_status || "not reported")}</strong>${h.search_stop_reason ? ` (${esc(h.search_stop_reason)})` : ""}. ${esc(h.search_summary)}</p>
${cons.length ? `<h2>Constraints read from the spectrum</h2><ul id="report-constraints">${cons.map((c) =>
    `<li class="${c.enabled === false ? "off" : ""}">${esc(c.name || c.id)}: ${esc(c.reason || "")}${c.enabled === false ? " (switched off)" : ""}</li>`).join("")}</ul>` : ""}
<h2>Warnings</h2>
<ul id="report-warnings">${h.warnings.length ? li(h.warnings) : "<li>none</li>"}</ul>
<h2>Top candidates</h2>
<div class="cands" id="report-candidates">${cands.map((c, i) => `<div class="cand" data-rank="${esc(c.rank ?? i + 1)}">
<div>${drawings[i] || ""}</div>
<p><strong>#${esc(c.rank ?? i + 1)}</strong> — probability <span class="prob">${esc(pctText(c.probability))}</span></p>
<p><code>${esc(c.smiles)}</code></p></div>`).join("")}</div>
${cands.length ? `<h2>#${esc(cands[0].rank ?? 1)} peak by peak</h2>
<table id="report-table"><thead><tr>${columns.map((c) => `<th>${esc(c)}</th>`).join("")}</tr></thead>
<tbody>${tableRows.map((row) => `<tr>${row.map((x) => `<td>${esc(x)}</td>`).join("")}</tr>`).join("")}</tbody></table>` : "<p>No candidate fits the formula and the constraints.</p>"}
<p>Probabilities are over the structures scored; atom numbers count from 1 in SMILES order.</p>
</body></html>
`;
}
