// shiftrank page: the submit form, the job view with its progress, and the
// review of ranked candidates. Routes on the path: "/" is the form,
// "/jobs/{id}" a job (history.pushState; a reload of a job URL works).

import { parseFormula, normalizeFormula, hillFormula, parsePeaks, formatPeaks, checkRow, normalizeMultiplicity, parseCarbonText } from "./chem.js";
import { putDrawing, rdkit, drawSVG } from "./draw.js";
import { drawPlot, fitRange, drawCarbonPlot, fitCarbonRange } from "./plot.js";
import { comparePeaks, likelihoodRatio, patternWord, summaryLine } from "./compare.js";
import { exportHeader, reportHTML } from "./report.js";

const $ = (id) => document.getElementById(id);
const KEY_STORE = "shiftrank.apiKey";
const REQ_STORE = "shiftrank.request.";

// The demo unknown behind "Load example": an invented sample from an invented
// project. The peak list is ethyl acetate's in CDCl3 as Gottlieb, Kotlyar and
// Nudelman list it (J. Org. Chem. 1997, 62, 7512; from memory).
const EXAMPLE = {
  formula: "C4H8O2",
  mhz: "400",
  solvent: "CDCl3",
  reference: "Saltmarsh Row / SR-0412, distillate fraction 2",
  peaks: "1H NMR (400 MHz, CDCl3) δ 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H)",
};

// ---------- API ----------

class APIError extends Error {
  constructor(status, problem) {
    super(problem?.detail || problem?.title || `HTTP ${status}`);
    this.status = status;
    this.problem = problem || {};
  }
}

async function api(method, path, body, { retryAuth = true, idempotencyKey = "" } = {}) {
  const headers = { Accept: "application/json, application/problem+json" };
  if (idempotencyKey) headers["Idempotency-Key"] = idempotencyKey;
  const key = sessionStorage.getItem(KEY_STORE);
  if (key) headers.Authorization = `Bearer ${key}`;
  if (body !== undefined) headers["Content-Type"] = "application/json";
  const res = await fetch(path, { method, headers, body: body === undefined ? undefined : JSON.stringify(body) });
  let data = null;
  const text = await res.text();
  if (text) {
    try { data = JSON.parse(text); } catch (_) { data = { detail: text.slice(0, 300) }; }
  }
  if (res.status === 401 && key) sessionStorage.removeItem(KEY_STORE); // a refused key is not kept
  if (res.status === 401 && retryAuth) {
    const ok = await askForKey(key ? "The service did not accept that API key. Check it (no spaces) and try again, or ask for a new one." : null);
    if (ok) return api(method, path, body, { retryAuth: true, idempotencyKey });
    throw new APIError(401, { detail: "An API key is needed to use this service." });
  }
  if (!res.ok) throw new APIError(res.status, data);
  return data;
}

let keyPrompt = null; // the open key dialog's promise: concurrent 401s share it

// askForKey opens the key dialog; resolves true when a key was entered.
function askForKey(message) {
  if (keyPrompt) return keyPrompt;
  keyPrompt = openKeyDialog(message).finally(() => { keyPrompt = null; });
  return keyPrompt;
}

function openKeyDialog(message) {
  const dlg = $("key-dialog");
  $("key-message").textContent = message ||
    "This service asks for an API key. Ask whoever runs it for one, then paste it here.";
  $("key-input").value = "";
  $("key-open").hidden = false;
  return new Promise((resolve) => {
    dlg.addEventListener("close", () => {
      const v = $("key-input").value.trim();
      if (dlg.returnValue === "forget") {
        sessionStorage.removeItem(KEY_STORE);
        resolve(false);
      } else if (dlg.returnValue === "save" && v) {
        sessionStorage.setItem(KEY_STORE, v);
        resolve(true);
      } else resolve(false);
    }, { once: true });
    dlg.showModal();
    $("key-input").focus();
  });
}

// ---------- routing ----------

let stopJob = () => {};

function route() {
  stopJob();
  const m = /^\/jobs\/([A-Za-z0-9_-]+)$/.exec(location.pathname);
  $("view-submit").hidden = !!m;
  $("view-job").hidden = !m;
  if (m) {
    document.title = `Job ${m[1]} · shiftrank`;
    showJob(m[1]);
  } else {
    document.title = "shiftrank";
    loadRecent();
  }
}

function go(path) {
  history.pushState({}, "", path);
  route();
  $("main").focus();
}

document.addEventListener("click", (e) => {
  const a = e.target.closest("a[data-route]");
  if (a && !e.ctrlKey && !e.metaKey && !e.shiftKey && e.button === 0) {
    e.preventDefault();
    go(a.getAttribute("href"));
  }
});
window.addEventListener("popstate", route);

// ---------- submit form ----------

// readFormula reads the formula field as the service will: normalised
// (case, spaces, subscript digits) and then parsed. It returns parseFormula's
// result with hill (the Hill formula) and typed (the field's text), or
// {error, pos, token, ambiguous}.
function readFormula(v) {
  const n = normalizeFormula(v);
  if (n.error) return n;
  const f = parseFormula(n.text);
  if (f.error) return f; // positions are in the normalised text
  return { ...f, hill: hillFormula(f.counts), typed: v.trim() };
}

function updateDBE() {
  const v = $("formula").value;
  const out = $("formula-dbe");
  out.removeAttribute("title");
  delete out.dataset.hill;
  if (!v.trim()) { out.textContent = ""; out.className = ""; return; }
  const f = readFormula(v);
  if (f.error) {
    out.textContent = f.ambiguous ? f.error : `not read yet: ${f.error}${f.token ? ` (“${f.token}”)` : ""}`;
    out.className = f.ambiguous ? "dbe ambiguous" : "dbe pending";
  } else {
    // A formula typed another way (lower case, spaces, subscripts, any
    // element order) is shown back as the service will read it.
    out.textContent = f.hill !== f.typed ? `read as ${f.hill} · DBE ${f.dbe}` : `DBE ${f.dbe}`;
    out.dataset.hill = f.hill;
    out.className = "dbe ok";
    out.title = "double-bond equivalents: rings plus π bonds";
  }
}

let rows = [];

function rowFromInputs(tr) {
  const get = (n) => tr.querySelector(`[data-col="${n}"]`).value;
  return { shift: get("shift"), mult: get("mult"), j: get("j"), integral: get("integral") };
}

function renderRows() {
  const tbody = $("peak-rows");
  tbody.replaceChildren();
  rows.forEach((r, i) => {
    const tr = document.createElement("tr");
    const cell = (col, label, value, extra = {}) => {
      const td = document.createElement("td");
      const lab = document.createElement("label");
      lab.className = "sr";
      lab.htmlFor = `peak-${i}-${col}`;
      lab.textContent = `Peak ${i + 1} ${label}`;
      const inp = document.createElement("input");
      inp.id = `peak-${i}-${col}`;
      inp.dataset.col = col;
      inp.value = value;
      inp.autocomplete = "off";
      inp.spellcheck = false;
      Object.assign(inp, extra);
      td.append(lab, inp);
      tr.append(td);
      return inp;
    };
    cell("shift", "δ (ppm) or range", r.shift, { inputMode: "decimal", size: 9 });
    const m = cell("mult", "multiplicity", r.mult, { size: 5 });
    m.setAttribute("list", "mult-codes");
    cell("j", "J (Hz)", r.j, { size: 9 });
    cell("integral", "integral", r.integral, { inputMode: "decimal", size: 4 });
    const td = document.createElement("td");
    const rm = document.createElement("button");
    rm.type = "button";
    rm.className = "quiet remove";
    rm.textContent = "×";
    rm.setAttribute("aria-label", `Remove peak ${i + 1}`);
    rm.addEventListener("click", () => {
      rows.splice(i, 1);
      renderRows();
      syncTextFromRows();
      const next = $(`peak-${Math.min(i, rows.length - 1)}-shift`) || $("add-peak");
      next.focus();
    });
    td.append(rm);
    tr.append(td);
    const msg = checkRow(r);
    if (msg) tr.dataset.problem = msg;
    tbody.append(tr);
  });
  updateRowNote();
}

function updateRowNote() {
  const trs = [...$("peak-rows").children];
  const problems = [];
  trs.forEach((tr, i) => {
    const msg = checkRow(rows[i]);
    tr.classList.toggle("bad", !!msg);
    tr.querySelectorAll("input").forEach((inp) => inp.setAttribute("aria-invalid", msg ? "true" : "false"));
    if (msg) problems.push(`peak ${i + 1}: ${msg}`);
  });
  if (problems.length) setNote(problems.join("; "), true);
}

function setNote(text, bad = false) {
  const n = $("peaks-note");
  n.textContent = text;
  n.classList.toggle("bad", bad);
}

function syncTextFromRows() {
  const text = formatPeaks(rows);
  document.querySelector(".peak-table").classList.remove("stale");
  $("peaks-text").value = text;
  const count = rows.filter((r) => r.shift.trim()).length;
  setNote(count ? `${count} peak${count === 1 ? "" : "s"}` : "");
  updateRowNote();
  clearFieldError("peaks");
}

function syncRowsFromText() {
  const text = $("peaks-text").value;
  if (!text.trim()) { rows = []; renderRows(); setNote(""); document.querySelector(".peak-table").classList.remove("stale"); return; }
  const size = byteLength(text.trim());
  if (size > PEAK_INPUT_LIMIT) {
    document.querySelector(".peak-table").classList.add("stale");
    setNote(`This paste is ${sizeText(size)}; the service reads at most ${sizeText(PEAK_INPUT_LIMIT)} of peak list. ` +
      "Keep only the peak list itself.", true);
    return;
  }
  const r = parsePeaks(text);
  document.querySelector(".peak-table").classList.toggle("stale", !!r.error);
  if (r.error) {
    setNote(`The table waits until the text reads cleanly: ${r.error} at character ${r.pos + 1}${r.token ? ` (“${r.token.slice(0, 30)}”)` : ""}.`, true);
    return;
  }
  rows = r.rows;
  renderRows();
  if (r.mhz) $("mhz").value = r.mhz;
  if (r.solvent) {
    const sel = $("solvent");
    const opt = [...sel.options].find((o) => o.value.toLowerCase() === r.solvent.toLowerCase());
    if (opt) sel.value = opt.value;
    else { sel.append(new Option(r.solvent, r.solvent)); sel.value = r.solvent; }
  }
  const head = r.mhz || r.solvent ? ` (header read: ${[r.mhz && `${r.mhz} MHz`, r.solvent].filter(Boolean).join(", ")})` : "";
  setNote(`${rows.length} peak${rows.length === 1 ? "" : "s"}${head}`);
}

function lines(v) {
  return v.split(/\n/).map((s) => s.trim()).filter(Boolean);
}

// formDisable holds the constraint IDs switched off in the job the form
// was filled from ("Edit as a new unknown"); they travel in
// options.disable until cleared.
let formDisable = [];

function showDisable() {
  $("disable-row").hidden = formDisable.length === 0;
  $("disable-note").textContent = formDisable.length
    ? `Switched off (from the job you edited): ${formDisable.join(", ")}.` : "";
}

function buildRequest() {
  const maxNodes = $("max-nodes").value.trim();
  const timeBudget = $("time-budget").value.trim();
  const maxCand = $("max-candidates").value.trim();
  const body = {
    formula: $("formula").value.trim(),
    peaks: $("peaks-text").value.trim(),
    carbon_peaks: $("carbon-text").value.trim() || undefined,
    mhz: Number($("mhz").value) || undefined,
    solvent: $("solvent").value,
    options: {
      top_k: Number($("top-k").value) || undefined,
      filter: $("filter").value.trim() || undefined,
      require: lines($("require").value),
      forbid: lines($("forbid").value),
      keep_solvent_peaks: $("keep-solvent").checked || undefined,
      all_isomers: $("all-isomers").checked || undefined,
      // Sent as typed: the service says at the field what is wrong with it.
      max_nodes: maxNodes === "" ? undefined : Number(maxNodes),
      time_budget: timeBudget === "" ? undefined : Number(timeBudget),
      max_candidates: maxCand === "" ? undefined : Number(maxCand),
      neutral: $("neutral").checked || undefined,
      disable: formDisable.length ? [...formDisable] : undefined,
    },
  };
  const ref = $("reference").value.trim();
  if (ref) body.reference = ref;
  return body;
}

const FIELD_SLOTS = {
  formula: "formula", peaks: "peaks", mhz: "mhz", solvent: "solvent", reference: "reference",
  top_k: "top_k", filter: "filter", require: "require", forbid: "forbid", keep_solvent_peaks: "keep_solvent_peaks",
  all_isomers: "all_isomers", carbon_peaks: "carbon_peaks", max_nodes: "max_nodes", time_budget: "time_budget", max_candidates: "max_candidates", neutral: "neutral", disable: "disable",
};
const SLOT_INPUT = { top_k: "top-k", peaks: "peaks-text", keep_solvent_peaks: "keep-solvent", all_isomers: "all-isomers",
  carbon_peaks: "carbon-text", max_nodes: "max-nodes", time_budget: "time-budget", max_candidates: "max-candidates", disable: "disable-clear" };
const OPTION_SLOTS = new Set(["require", "forbid", "top_k", "filter", "max_nodes", "time_budget", "max_candidates", "neutral", "disable", "keep_solvent_peaks", "all_isomers"]);

function slotFor(field) {
  const base = String(field || "").replace(/^\/+/, "").replace(/^(body|request)[./]/, "")
    .replace(/^options[./]/, "").split(/[.\[\]/]/)[0];
  return FIELD_SLOTS[base] || null;
}

function fieldValue(slot) {
  const inp = $(SLOT_INPUT[slot] || slot);
  return inp && "value" in inp ? String(inp.value).trim() : "";
}

function clearFieldError(slot) {
  const p = $(`${slot}-error`);
  if (p) p.textContent = "";
  const inp = $(SLOT_INPUT[slot] || slot);
  if (inp) inp.removeAttribute("aria-invalid");
}

function clearErrors() {
  Object.values(FIELD_SLOTS).forEach(clearFieldError);
  $("form-error").textContent = "";
  document.querySelectorAll("#peak-rows tr.server-bad").forEach((tr) => tr.classList.remove("server-bad"));
}

// showProblem puts each of the service's validation messages next to the
// field it names; anything unplaced goes under the form.
function showProblem(err) {
  const prob = err.problem || {};
  const list = Array.isArray(prob.errors) ? prob.errors : [];
  const loose = [];
  let first = null;
  for (const e of list) {
    const slot = slotFor(e.field || e.pointer || e.name);
    let msg = humanSizes(e.detail || e.message || "not valid");
    // "/options/require/1" → "fragment 2: ...", "/peaks/0/j" → "peak 1: ...".
    const idx = /\/(require|forbid|peaks|carbon_peaks|disable)\/(\d+)/.exec(String(e.field || ""));
    const what = { peaks: "peak", carbon_peaks: "13C peak", disable: "constraint" };
    if (idx) msg = `${what[idx[1]] || "fragment"} ${Number(idx[2]) + 1}: ${msg}`;
    const pos = typeof e.position === "number" ? e.position : e.pos;
    let text = msg;
    // A token that is the whole field adds nothing to the message.
    const whole = slot && e.token !== undefined && e.token.trim() === fieldValue(slot);
    if (e.token && !whole && !msg.includes(e.token)) text += ` (“${e.token}”)`;
    if (typeof pos === "number" && pos >= 0 && !whole && !/position|character/.test(msg)) text += ` at character ${pos + 1}`;
    if (!slot) { loose.push(e.field ? `${e.field}: ${text}` : text); continue; }
    const p = $(`${slot}-error`);
    p.textContent = p.textContent ? `${p.textContent} ${text}` : text;
    const inp = $(SLOT_INPUT[slot] || slot);
    if (inp && slot !== "disable") { inp.setAttribute("aria-invalid", "true"); first = first || inp; }
    if (OPTION_SLOTS.has(slot)) $("submit-form").querySelector("details.options").open = true;
    if (slot === "peaks" && typeof pos === "number") markRowAt(pos);
  }
  if (!list.length) loose.push(humanSizes(prob.detail || prob.title || err.message));
  else if (loose.length === 0 && prob.detail && !first) loose.push(prob.detail);
  $("form-error").textContent = loose.join(" ");
  (first || $("form-error")).focus?.();
}

// markRowAt outlines the table row whose text holds byte offset pos.
function markRowAt(pos) {
  const text = $("peaks-text").value.trim();
  const r = parsePeaks(text);
  if (r.error) return;
  let at = 0;
  const formatted = formatPeaks(r.rows);
  if (formatted !== text) return; // offsets only map when the text is the table's own
  r.rows.forEach((row, i) => {
    const piece = formatPeaks([row]);
    if (pos >= at && pos < at + piece.length) $("peak-rows").children[i]?.classList.add("server-bad");
    at += piece.length + 2;
  });
}

let lastSubmit = { body: "", key: "" };

function newKey() {
  if (crypto.randomUUID) return crypto.randomUUID();
  return [...crypto.getRandomValues(new Uint8Array(16))].map((b) => b.toString(16).padStart(2, "0")).join("");
}

// integralProblem checks the integrals against the formula before a run:
// integrals that add up to more H than the formula has cannot all be H
// counts of this unknown. It returns the warning, or "" when they fit
// (or there is nothing to check).
function integralProblem(formula, peaksText) {
  const f = readFormula(formula);
  if (f.error) return "";
  const r = parsePeaks(peaksText);
  if (r.error) return "";
  const ints = r.rows.map((row) => Number(row.integral)).filter((v) => isFinite(v) && v > 0);
  if (!ints.length) return "";
  const sum = ints.reduce((a, b) => a + b, 0);
  if (sum <= f.hCount + 0.5) return "";
  const shown = Number.isInteger(sum) ? String(sum) : sum.toFixed(1);
  return `The integrals add up to ${shown} H, but ${f.hill} has ${f.hCount} H: read as hydrogen counts they cannot ` +
    `fit this formula. Check the integrals (or the formula); if they are relative areas, scale them to the formula's ${f.hCount} H. ` +
    "You can still rank with them as they are.";
}

let integralsAccepted = ""; // the formula and peaks the user chose to rank despite the warning

function clearIntegralWarning() {
  $("integral-warning").hidden = true;
  $("peaks-text").removeAttribute("aria-invalid");
}

// PEAK_INPUT_LIMIT is the most peak-list text the service reads from one
// field, in bytes (1 MiB: the service's peak-input limit).
const PEAK_INPUT_LIMIT = 1 << 20;

// sizeText writes a byte count in human units: bytes, KiB or MiB.
function sizeText(n) {
  if (n < 1024) return `${n} bytes`;
  const [v, unit] = n < 1 << 20 ? [n / 1024, "KiB"] : [n / (1 << 20), "MiB"];
  return `${v < 10 && !Number.isInteger(v) ? v.toFixed(1) : Math.round(v)} ${unit}`;
}

// humanSizes rewrites byte counts in a message ("larger than 1048576
// bytes") in human units ("larger than 1 MiB").
function humanSizes(msg) {
  return String(msg).replace(/(\d{4,}) bytes/g, (_, d) => sizeText(Number(d)));
}

const byteLength = (v) => new TextEncoder().encode(v).length;

// TEXT_FIELDS are the form's free-text fields a paste can make large, with
// the slot their errors go to.
const TEXT_FIELDS = [["peaks", "peaks-text", "peak list"], ["carbon_peaks", "carbon-text", "13C peak list"],
  ["require", "require", "list of fragments"], ["forbid", "forbid", "list of fragments"], ["reference", "reference", "reference"]];

// sizeProblem returns a field error for a peak field holding more than the
// service reads, or null.
function sizeProblem() {
  for (const [slot, id, what] of TEXT_FIELDS.slice(0, 2)) {
    const n = byteLength($(id).value.trim());
    if (n > PEAK_INPUT_LIMIT) {
      return { field: slot, message: `This ${what} is ${sizeText(n)}; the service reads at most ${sizeText(PEAK_INPUT_LIMIT)}. ` +
        "Paste only the peak list itself (not the whole file or spectrum)." };
    }
  }
  return null;
}

// tooLargeProblem places the service's "request too large" answer at the
// largest text field, in human units.
function tooLargeProblem(err) {
  let best = null, size = 0;
  for (const [slot, id, what] of TEXT_FIELDS) {
    const n = byteLength($(id).value);
    if (n > size) { size = n; best = [slot, what]; }
  }
  const limit = /(\d+) bytes/.exec(err.problem?.detail || "");
  const most = limit ? ` (at most ${sizeText(Number(limit[1]))})` : "";
  if (!best || size < 1024) return { problem: { detail: humanSizes(err.message) } };
  return { problem: { errors: [{ field: best[0],
    message: `The request is larger than the service accepts${most}; this ${best[1]} alone is ${sizeText(size)}. Shorten it and try again.` }] } };
}

async function submit(e) {
  e.preventDefault();
  clearErrors();
  clearIntegralWarning();
  const body = buildRequest();
  if (!body.formula) { showProblem({ problem: { errors: [{ field: "formula", message: "Enter the molecular formula." }] } }); return; }
  if (!body.peaks) { showProblem({ problem: { errors: [{ field: "peaks", message: "Enter at least one peak." }] } }); return; }
  const big = sizeProblem();
  if (big) { showProblem({ problem: { errors: [big] } }); return; }
  const warn = integralProblem(body.formula, body.peaks);
  if (warn && integralsAccepted !== `${body.formula}\n${body.peaks}`) {
    $("integral-warning-text").textContent = warn;
    $("integral-warning").hidden = false;
    $("peaks-text").setAttribute("aria-invalid", "true");
    $("integral-proceed").focus();
    return;
  }
  const btn = $("submit");
  btn.disabled = true;
  btn.textContent = "Sending…";
  try {
    // The same body sent twice (a double click, a retry after a lost
    // answer) names the same job.
    const text = JSON.stringify(body);
    if (text !== lastSubmit.body) lastSubmit = { body: text, key: newKey() };
    const job = await api("POST", "/v1/jobs", body, { idempotencyKey: lastSubmit.key });
    sessionStorage.setItem(REQ_STORE + job.id, JSON.stringify(body));
    go(`/jobs/${job.id}`);
  } catch (err) {
    if (err instanceof APIError && (err.status === 413 || err.problem?.code === "too_large")) showProblem(tooLargeProblem(err));
    else if (err instanceof APIError) showProblem(err);
    else $("form-error").textContent = `The service could not be reached: ${err.message}`;
  } finally {
    btn.disabled = false;
    btn.textContent = "Rank candidates";
  }
}

function loadExample() {
  clearErrors();
  $("formula").value = EXAMPLE.formula;
  $("mhz").value = EXAMPLE.mhz;
  $("solvent").value = EXAMPLE.solvent;
  $("reference").value = EXAMPLE.reference;
  $("peaks-text").value = EXAMPLE.peaks;
  $("top-k").value = "10";
  $("filter").value = "plausible";
  $("require").value = "";
  $("forbid").value = "";
  $("keep-solvent").checked = false;
  $("all-isomers").checked = false;
  $("carbon-text").value = "";
  $("max-nodes").value = "";
  $("time-budget").value = "";
  $("max-candidates").value = "";
  $("neutral").checked = false;
  formDisable = [];
  showDisable();
  updateCarbonNote();
  updateDBE();
  syncRowsFromText();
  $("formula").focus();
}

// fillForm puts a job's request (the service's echo of it) back in the form.
function fillForm(req) {
  clearErrors();
  $("formula").value = req.formula || "";
  $("mhz").value = req.mhz ? String(req.mhz) : "400";
  if (req.solvent) {
    const sel = $("solvent");
    if (![...sel.options].some((o) => o.value === req.solvent)) sel.append(new Option(req.solvent, req.solvent));
    sel.value = req.solvent;
  }
  $("reference").value = req.reference || "";
  if (typeof req.peaks === "string") $("peaks-text").value = req.peaks;
  else if (Array.isArray(req.peaks)) {
    $("peaks-text").value = formatPeaks(req.peaks.map((p) => ({
      shift: Array.isArray(p.range) ? `${Math.max(...p.range)}–${Math.min(...p.range)}` : String(p.shift ?? ""),
      mult: p.multiplicity || "", j: (p.j || []).join(", "), integral: p.integral ? String(p.integral) : "",
    })));
  }
  const o = req.options || {};
  $("top-k").value = String(o.top_k || 10);
  $("filter").value = o.filter || "plausible";
  $("require").value = (o.require || []).join("\n");
  $("forbid").value = (o.forbid || []).join("\n");
  $("keep-solvent").checked = !!o.keep_solvent_peaks;
  $("all-isomers").checked = !!o.all_isomers;
  $("max-nodes").value = o.max_nodes ? String(o.max_nodes) : "";
  $("time-budget").value = o.time_budget ? String(o.time_budget) : "";
  $("max-candidates").value = o.max_candidates ? String(o.max_candidates) : "";
  $("neutral").checked = !!o.neutral;
  formDisable = Array.isArray(o.disable) ? [...o.disable] : [];
  showDisable();
  $("carbon-text").value = carbonText(req.carbon_peaks);
  updateCarbonNote();
  updateDBE();
  syncRowsFromText();
  $("formula").focus();
}

// carbonText writes a request's carbon_peaks member back as text for the
// form: text as given, peak objects as "129.3 (2C, CH)".
function carbonText(v) {
  if (typeof v === "string") return v;
  const list = Array.isArray(v) ? v : v && Array.isArray(v.peaks) ? v.peaks : null;
  if (!list) return "";
  if (list.length && list[0] && Array.isArray(list[0].peaks)) return carbonText(list.find((l) => l.nucleus === "13C") || list[0]);
  return list.map((p) => {
    const shift = Array.isArray(p.range) ? `${Math.max(...p.range)}–${Math.min(...p.range)}` : String(p.shift ?? "");
    const bits = [p.count ? `${p.count}C` : "", p.dept || ""].filter(Boolean);
    return bits.length ? `${shift} (${bits.join(", ")})` : shift;
  }).join(", ");
}

// readCarbon reads the 13C field's text as the page can: JSON peak
// objects or journal text ({peaks} or {error, pos, token}); a JCAMP-DX file
// is left to the service ({jcamp: true}).
function readCarbon(t) {
  const head = t.trimStart();
  if (head.startsWith("##")) return { jcamp: true };
  if (head.startsWith("[") || head.startsWith("{")) {
    try { return parseCarbonText(carbonText(JSON.parse(t))); } catch (e) { return { error: "not valid JSON", pos: 0, token: "" }; }
  }
  return parseCarbonText(t);
}

function updateCarbonNote() {
  const t = $("carbon-text").value;
  const note = $("carbon-note");
  if (!t.trim()) { note.textContent = ""; note.classList.remove("bad"); return; }
  const r = readCarbon(t);
  if (r.jcamp) { note.textContent = "a JCAMP-DX file: the service reads its 13C peak table"; note.classList.remove("bad"); return; }
  note.classList.toggle("bad", !!r.error);
  note.textContent = r.error
    ? `Not read yet: ${r.error} at character ${r.pos + 1}${r.token ? ` (“${r.token}”)` : ""}; the service has the last word.`
    : `${r.peaks.length} 13C peak${r.peaks.length === 1 ? "" : "s"}${r.peaks.some((p) => p.dept) ? ", with DEPT classes" : ""}`;
}

function clearForm() {
  formDisable = [];
  showDisable();
  $("carbon-note").textContent = "";
  $("submit-form").reset();
  rows = [{ shift: "", mult: "", j: "", integral: "" }];
  renderRows();
  setNote("");
  updateDBE();
  clearErrors();
}

// recentState says in words where a listed job stands, with how far the
// search of a finished one went (from its candidate list).
function recentState(j, top) {
  const st = top?.search?.status || "";
  if (j.status === "succeeded") {
    return st === "stopped early" ? "done — stopped early" : st === "complete within the constraints"
      ? "done — complete within the readings" : st === "complete" ? "done — all isomers" : "done";
  }
  if (j.status === "cancelled") return top ? "cancelled — best so far kept" : "cancelled";
  return STATUS_WORDS[j.status] || j.status;
}

// loadRecent lists the caller's latest jobs: reference, formula, state and
// the top candidate with its probability (read from each finished job's
// first candidate).
async function loadRecent() {
  try {
    const res = await api("GET", "/v1/jobs?limit=8", undefined, { retryAuth: false });
    const jobs = res?.jobs || res?.items || (Array.isArray(res) ? res : []);
    const tops = await Promise.all(jobs.map((j) => (j.status === "succeeded" || j.status === "cancelled")
      ? api("GET", `/v1/jobs/${j.id}/candidates?limit=1`, undefined, { retryAuth: false }).catch(() => null)
      : Promise.resolve(null)));
    const tb = $("recent-list");
    tb.replaceChildren();
    jobs.forEach((j, k) => {
      const top = tops[k];
      const c = top?.candidates?.[0];
      const tr = document.createElement("tr");
      tr.dataset.id = j.id;
      tr.dataset.status = j.status;
      const cell = (cls, text) => {
        const td = document.createElement("td");
        td.className = cls;
        if (text !== undefined) td.textContent = text;
        tr.append(td);
        return td;
      };
      const a = document.createElement("a");
      a.href = `/jobs/${j.id}`;
      a.dataset.route = "";
      a.textContent = j.reference || `job ${j.id.slice(0, 8)}…`;
      cell("ref").append(a);
      cell("formula", j.formula || "—");
      cell("state", recentState(j, top));
      const tc = cell("top");
      if (c) {
        const code = document.createElement("code");
        code.textContent = c.smiles;
        tc.append(code);
      } else tc.textContent = "—";
      cell("prob", c && typeof c.probability === "number" ? pctText(c.probability) : "—");
      cell("when", j.created_at ? new Date(j.created_at).toLocaleString() : "—");
      tb.append(tr);
    });
    $("recent").hidden = jobs.length === 0;
  } catch (_) {
    $("recent").hidden = true;
  }
}

// ---------- job view ----------

const fmt = new Intl.NumberFormat("en");

function elapsedText(job) {
  const start = Date.parse(job.started_at || job.created_at || "");
  if (!start) return "—";
  const end = job.finished_at ? Date.parse(job.finished_at) : Date.now();
  const s = Math.max(0, (end - start) / 1000);
  if (s < 60) return `${s.toFixed(1)} s`;
  const m = Math.floor(s / 60);
  return `${m} min ${Math.round(s - 60 * m)} s`;
}

const STATUS_WORDS = {
  queued: "queued — waiting for a worker",
  running: "running",
  succeeded: "done",
  failed: "failed",
  cancelled: "cancelled",
};

// searchKind sorts a search status into "stopped", "constrained",
// "complete" or "" (not known).
function searchKind(status) {
  return { "stopped early": "stopped", "complete within the constraints": "constrained", complete: "complete" }[status] || "";
}

// SEARCH_WORDS say, after "done", how far the search went.
const SEARCH_WORDS = {
  stopped: (reason) => `done — stopped early${reason ? ` (${reason})` : ""}`,
  constrained: () => "done — complete within the spectrum’s readings",
  complete: () => "done — all isomers searched",
};

// showSearchState marks the status badge and the progress bar of a
// succeeded job with how far its search went.
function showSearchState(status, reason) {
  const kind = searchKind(status);
  const badge = $("job-status");
  const bar = $("job-progress");
  if (badge.dataset.status === "cancelled" && kind) {
    // A job cancelled while it ran keeps the candidates scored so far.
    badge.dataset.search = "stopped";
    bar.dataset.search = "stopped";
    badge.textContent = "cancelled — best candidates so far kept";
    return;
  }
  if (!kind || badge.dataset.status !== "succeeded") {
    delete badge.dataset.search;
    delete bar.dataset.search;
    return;
  }
  badge.dataset.search = kind;
  bar.dataset.search = kind;
  badge.textContent = SEARCH_WORDS[kind](reason);
  const now = bar.getAttribute("aria-valuenow");
  bar.setAttribute("aria-valuetext", kind === "stopped"
    ? `search stopped early${reason ? ` (${reason})` : ""}: ${now} % of the estimated isomers scored`
    : kind === "constrained" ? "complete within the constraints read from the spectrum" : "complete");
}

function showJobState(job) {
  const st = job.status;
  const badge = $("job-status");
  badge.textContent = STATUS_WORDS[st] || st;
  badge.dataset.status = st;
  $("job-reference").textContent = job.reference || "—";
  const req = job.request;
  if (req && req.formula) {
    let n = "";
    if (typeof req.peaks === "string") {
      const r = parsePeaks(req.peaks);
      if (!r.error) n = `${r.rows.length} peak${r.rows.length === 1 ? "" : "s"}`;
    } else if (Array.isArray(req.peaks)) n = `${req.peaks.length} peak${req.peaks.length === 1 ? "" : "s"}`;
    const cp = req.carbon_peaks;
    let nc = "";
    if (typeof cp === "string") {
      const r = readCarbon(cp);
      if (r.peaks) nc = `${r.peaks.length} 13C peak${r.peaks.length === 1 ? "" : "s"}`;
    } else if (cp) nc = "13C peaks";
    // The service reads the formula normalised, in Hill form; when it was
    // typed another way, both are shown (the page reads it by the same
    // rules; the job's own formula when the page cannot).
    const typed = String(job.formula || req.formula).trim();
    const hill = readFormula(typed).hill || typed;
    const formula = typed !== hill ? `${hill} (read from “${typed}”)` : hill;
    $("job-request").textContent = [formula, req.mhz ? `${req.mhz} MHz` : "", req.solvent || "", n, nc].filter(Boolean).join(" · ");
  }
  const p = job.progress || {};
  const gen = p.generated || 0, scored = p.scored || 0, total = p.total_estimate || 0;
  const kept = st === "cancelled" && !!job.search_status;
  const done = st === "succeeded" || kept;
  const stopped = done && searchKind(job.search_status) === "stopped";
  // A search that stopped early does not fill the bar: it shows the share
  // of the estimated isomers scored.
  let pct = stopped ? (total > 0 ? Math.min(99, (100 * scored) / total) : 50)
    : done ? 100 : total > 0 ? Math.min(99, (100 * scored) / total) : 0;
  const bar = $("job-progress");
  bar.classList.toggle("indeterminate", !done && total <= 0 && (st === "running" || st === "queued"));
  bar.setAttribute("aria-valuenow", pct.toFixed(0));
  bar.setAttribute("aria-valuetext", `${pct.toFixed(0)} %, ${fmt.format(scored)} scored`);
  $("job-bar").style.width = `${pct}%`;
  bar.dataset.status = st;
  $("job-counts").innerHTML = "";
  const parts = [
    ["generated", fmt.format(gen)],
    ["scored", fmt.format(scored)],
    ["estimated total", total > 0 ? `${done ? "" : "≈ "}${fmt.format(total)}` : st === "queued" || st === "running" ? "not known yet" : "not known"],
  ];
  for (const [k, v] of parts) {
    const span = document.createElement("span");
    span.className = "count";
    span.dataset.count = k;
    span.innerHTML = `<span class="k"></span> <strong></strong>`;
    span.querySelector(".k").textContent = k;
    span.querySelector("strong").textContent = v;
    $("job-counts").append(span);
  }
  $("job-elapsed").textContent = elapsedText(job);
  $("resubmit").hidden = !(req && req.formula);
  $("resubmit").onclick = () => { go("/"); fillForm(req); };
  const active = st === "queued" || st === "running";
  $("cancel-job").hidden = !active;
  const errEl = $("job-error");
  errEl.classList.toggle("quiet-note", st === "cancelled");
  errEl.textContent = kept ? "This job was cancelled: the candidates below are the best found before the cancel, over the structures scored by then; the true structure may not have been reached."
    : st === "cancelled" ? "This job was cancelled before it had scored any structure, so it has no ranking. Submit the unknown again to rank it."
    : job.error ? `The job stopped: ${job.error}` : "";
  showSearchState(job.search_status, job.search_stop_reason);
}

function showJob(id) {
  $("job-id").textContent = id;
  $("results").hidden = true;
  $("job-error").textContent = "";
  $("job-status").textContent = "loading…";
  delete $("job-status").dataset.search;
  delete $("job-progress").dataset.search;
  $("job-counts").textContent = "";
  $("job-bar").style.width = "0%";
  let stopped = false, timer = 0, ticker = 0, current = null, cancelling = false;
  stopJob = () => { stopped = true; clearTimeout(timer); clearInterval(ticker); };
  ticker = setInterval(() => { if (current) $("job-elapsed").textContent = elapsedText(current); }, 250);
  const cancelBtn = $("cancel-job");
  cancelBtn.disabled = false;
  cancelBtn.textContent = "Cancel job";
  cancelBtn.onclick = async () => {
    cancelling = true;
    cancelBtn.disabled = true;
    cancelBtn.textContent = "Cancelling…";
    try {
      const job = await api("POST", `/v1/jobs/${id}/cancel`);
      if (job && job.status) { current = job; showJobState(job); }
    } catch (err) {
      $("job-error").textContent = `Could not cancel: ${err.message}`;
      cancelBtn.disabled = false;
      cancelBtn.textContent = "Cancel job";
    }
  };
  const poll = async () => {
    if (stopped) return;
    try {
      const job = await api("GET", `/v1/jobs/${id}`);
      if (stopped) return;
      current = job;
      showJobState(job);
      if (job.status === "queued" || job.status === "running") {
        timer = setTimeout(poll, cancelling ? 300 : 600);
        return;
      }
      clearInterval(ticker);
      if (job.status === "succeeded" || (job.status === "cancelled" && job.search_status)) await showResults(id, job);
    } catch (err) {
      if (stopped) return;
      if (err.status === 404) {
        $("job-status").textContent = "not found";
        $("job-error").textContent = "There is no job with this id that your key can see.";
        $("cancel-job").hidden = true;
        clearInterval(ticker);
        return;
      }
      if (err.status === 401) { $("job-error").textContent = err.message; clearInterval(ticker); return; }
      $("job-error").textContent = `Lost contact with the service (${err.message}); trying again…`;
      timer = setTimeout(poll, 2000);
    }
  };
  poll();
}

// ---------- results ----------

// Views of the service's candidate JSON (the ranker's `rank --json` shape:
// assignments with observed_*/predicted_* fields and environment_details).

function num(v) { return typeof v === "number" && isFinite(v) ? v : undefined; }

// normPeak reads one entry of the result's "peaks" list (or a peak of the
// request) into {index, shift, hi, lo, multiplicity, j, integral, h}.
function normPeak(p, i) {
  const range = Array.isArray(p.range) ? p.range : null;
  let hi = num(p.shift_hi) ?? (range ? Math.max(...range) : undefined);
  let lo = num(p.shift_lo) ?? (range ? Math.min(...range) : undefined);
  const shift = num(p.shift) ?? (hi !== undefined && lo !== undefined ? (hi + lo) / 2 : undefined);
  if (hi === undefined || lo === undefined || hi === lo) { hi = undefined; lo = undefined; }
  return {
    index: num(p.index) ?? i,
    shift, hi, lo,
    multiplicity: p.multiplicity || "",
    j: Array.isArray(p.j) ? p.j : [],
    integral: num(p.integral) || undefined,
    h: num(p.implied_h) || undefined,
    solvent: p.solvent || "",
    excluded: !!p.excluded,
  };
}

function normDetail(d, peak) {
  return {
    id: d.environment,
    key: `${peak}:${d.environment}`,
    atoms: Array.isArray(d.atoms) ? d.atoms : [],
    h: num(d.h) ?? 0,
    kind: d.kind || "",
    shift: num(d.predicted_shift),
    sigma: num(d.sigma),
    multiplicity: d.predicted_multiplicity || "",
    j: Array.isArray(d.j) ? d.j : [],
    breakdown: Array.isArray(d.breakdown) ? d.breakdown.map((b) => ({ ...b, term: oneBased(b.term) })) : [],
    reasons: Array.isArray(d.reasons) ? d.reasons.map(oneBased) : [],
    split: !!d.split,
  };
}

// oneBased rewrites the 0-based atom and environment numbers inside the
// service's explanation texts ("1 H of atoms 7,11", "env 0:") as the
// 1-based numbers the page shows everywhere (the JSON arrays stay 0-based);
// the command line does the same.
function oneBased(text) {
  return String(text || "").replace(/\b(atoms?|env|environments?) (\d+(?:, ?\d+)*)/g,
    (m, word, list) => `${word} ${list.split(/, ?/).map((n) => Number(n) + 1).join(list.includes(", ") ? ", " : ",")}`);
}

function normAssignment(a, observedList) {
  const idx = a.peak;
  const known = observedList.find((p) => p.index === idx) || {};
  const range = Array.isArray(a.observed_range) && a.observed_range.length === 2 ? a.observed_range : null;
  const peak = {
    ...known,
    index: idx,
    shift: num(a.observed_shift) ?? known.shift,
    hi: range ? Math.max(...range) : known.hi,
    lo: range ? Math.min(...range) : known.lo,
    multiplicity: a.observed_multiplicity || known.multiplicity || "",
    h: num(a.observed_h) || known.h,
  };
  const envs = (a.environment_details || []).map((d) => normDetail(d, idx));
  return {
    peak, envs,
    atoms: Array.isArray(a.atoms) ? a.atoms : envs.flatMap((e) => e.atoms),
    breakdown: Array.isArray(a.breakdown) ? a.breakdown.map((b) => ({ ...b, term: oneBased(b.term) })) : [],
    expH: num(a.expected_h) ?? envs.reduce((s, e) => s + e.h, 0),
    pred: num(a.predicted_shift),
    predMult: a.predicted_multiplicity || "",
    reason: oneBased(a.multiplicity_reason),
    share: num(a.score_share),
    terms: a.terms || null,
    delta: num(a.observed_shift) !== undefined && num(a.predicted_shift) !== undefined
      ? a.observed_shift - a.predicted_shift : undefined,
  };
}

function normCandidate(c, observedList) {
  const assignments = (c.assignments || []).map((a) => normAssignment(a, observedList));
  const unexplained = (c.unexplained_peaks || []).map((u) => {
    const known = observedList.find((p) => p.index === u.peak) || {};
    return { ...known, index: u.peak, shift: num(u.observed_shift) ?? known.shift,
      multiplicity: u.multiplicity || known.multiplicity || "", h: num(u.observed_h) || known.h,
      share: num(u.score_share) };
  });
  const unobserved = (c.unobserved_environments || []).map((e) => ({
    id: e.environment, key: `u:${e.environment}`, atoms: e.atoms || [], h: num(e.h) ?? 0, kind: e.kind || "",
    shift: num(e.predicted_shift), multiplicity: e.predicted_multiplicity || "", j: [],
    exchangeable: !!e.exchangeable, share: num(e.score_share), reason: oneBased(e.reason),
  }));
  const carbonAssignments = (c.carbon_assignments || []).map((a) => ({
    peak: a.peak, shift: num(a.observed_shift),
    range: Array.isArray(a.observed_range) && a.observed_range.length === 2 ? a.observed_range : null,
    dept: a.observed_dept || "", count: num(a.observed_count) || 0,
    pred: num(a.predicted_shift), predClass: a.predicted_class || "", carbons: num(a.carbons) || 0,
    atoms: Array.isArray(a.atoms) ? a.atoms : [], share: num(a.score_share), reason: a.reason || "",
    signals: (a.signal_details || []).map((d) => ({ signal: d.signal, shift: num(d.predicted_shift), cls: d.class || "",
      carbons: Array.isArray(d.atoms) ? d.atoms.length : 1, kind: d.kind || "" })),
  }));
  const carbonUnexplained = (c.unexplained_carbon_peaks || []).map((u) => ({
    peak: u.peak, shift: num(u.observed_shift), dept: u.observed_dept || "", share: num(u.score_share), reason: u.reason || "" }));
  const carbonUnobserved = (c.unobserved_carbons || []).map((u) => ({
    signal: u.signal, shift: num(u.predicted_shift), cls: u.class || "", kind: u.kind || "",
    carbons: Array.isArray(u.atoms) ? u.atoms.length : 1, share: num(u.score_share), reason: u.reason || "" }));
  return {
    raw: c, rank: c.rank, smiles: c.smiles, score: num(c.score), probability: num(c.probability) ?? 0,
    carbonScore: num(c.carbon_score),
    summary: c.summary || "", notes: c.notes || [],
    assignments, unexplained, unobserved, carbonAssignments, carbonUnexplained, carbonUnobserved,
    hasCarbon: !!(c.carbon_assignments || c.unexplained_carbon_peaks || c.unobserved_carbons),
  };
}

// observedCarbon returns the observed 13C peaks: the result's list when it
// has one, else the request's carbon_peaks as the page reads it.
function observedCarbon(data, req) {
  if (Array.isArray(data.carbon_peaks) && data.carbon_peaks.length) {
    return data.carbon_peaks.map((p, i) => {
      const hi = num(p.shift_hi), lo = num(p.shift_lo);
      return { index: num(p.index) ?? i, shift: num(p.shift), hi: hi !== lo ? hi : undefined, lo: hi !== lo ? lo : undefined,
        count: num(p.count) || 0, dept: p.dept || "" };
    });
  }
  const cp = req?.carbon_peaks;
  if (cp === undefined || cp === null) return [];
  const r = readCarbon(typeof cp === "string" ? cp : carbonText(cp));
  return r.error || r.jcamp ? [] : r.peaks.map((p) => ({ ...p, hi: p.hi !== p.lo ? p.hi : undefined, lo: p.hi !== p.lo ? p.lo : undefined }));
}

let review = null; // {job, data, candidates, observed, mhz, selected, compare, peakSel, zoom}

function observedFromRequest(id, job) {
  let req = job.request;
  if (!req) {
    try { req = JSON.parse(sessionStorage.getItem(REQ_STORE + id) || "null"); } catch (_) { req = null; }
  }
  const out = { mhz: Number(req?.mhz) || 400, peaks: [], req };
  if (!req) return out;
  if (typeof req.peaks === "string") {
    const r = parsePeaks(req.peaks);
    if (!r.error) {
      if (r.mhz && !req.mhz) out.mhz = Number(r.mhz);
      out.peaks = r.rows.map((row, i) => {
        const m = /^(-?[\d.]+)(?:\s*[–-]\s*(-?[\d.]+))?$/.exec(row.shift.trim());
        const a = parseFloat(m?.[1]), b = m?.[2] !== undefined ? parseFloat(m[2]) : a;
        return { index: i, shift: (a + b) / 2, hi: Math.max(a, b), lo: Math.min(a, b),
          multiplicity: normalizeMultiplicity(row.mult) || row.mult,
          j: row.j.split(/[,\s]+/).filter(Boolean).map(Number), integral: row.integral ? Number(row.integral) : undefined };
      });
    }
  } else if (Array.isArray(req.peaks)) {
    out.peaks = req.peaks.map((p, i) => normPeak(p, i));
  }
  return out;
}

async function showResults(id, job) {
  let data;
  try {
    // The service pages the candidates (at most 100 a page); take them all.
    data = await api("GET", `/v1/jobs/${id}/candidates?limit=100`);
    const all = [...(data.candidates || [])];
    while (typeof data.total === "number" && all.length < data.total) {
      const next = await api("GET", `/v1/jobs/${id}/candidates?limit=100&offset=${all.length}`);
      if (!next.candidates || next.candidates.length === 0) break;
      all.push(...next.candidates);
    }
    data = { ...data, candidates: all, offset: 0, limit: all.length };
  } catch (err) {
    $("job-error").textContent = `Could not load the candidates: ${err.message}`;
    return;
  }
  const obs = observedFromRequest(id, job);
  const fromData = Array.isArray(data.peaks) ? data.peaks.map(normPeak) : null;
  const observed = fromData && fromData.length ? fromData : obs.peaks;
  const candidates = (data.candidates || []).map((c) => normCandidate(c, observed));
  // Observed peaks: take them from the first candidate's assignments when
  // the request is not at hand.
  let observedAll = observed;
  if (!observedAll.length && candidates.length) {
    const seen = new Map();
    for (const a of candidates[0].assignments) seen.set(a.peak.index, a.peak);
    for (const p of candidates[0].unexplained) seen.set(p.index, p);
    observedAll = [...seen.values()].sort((a, b) => a.index - b.index);
  }
  const req = job.request || obs.req || null;
  review = { job, id, data, candidates, observed: observedAll, mhz: Number(data.mhz) || obs.mhz,
    selected: 0, compare: -1, peakSel: -1, zoom: null, req, carbon: observedCarbon(data, req) };
  $("results").hidden = false;
  const search = data.search && typeof data.search === "object" ? data.search : null;
  if (search) showSearchState(search.status, search.stop_reason);
  renderScope(search, candidates.length);
  renderConstraints(search);
  $("results-caution").textContent = data.caution ? `Caution: ${data.caution}` : "";
  const total = num(data.isomers_total);
  const scored = num(data.scored) ?? job.progress?.scored;
  const complete = data.complete;
  const bits = [];
  if (search?.scope === "constrained") {
    if (scored !== undefined) bits.push(`${fmt.format(scored)} structures fitting the spectrum’s readings scored`);
  } else {
    if (total !== undefined) bits.push(`${fmt.format(total)} isomer${total === 1 ? "" : "s"} of the formula${complete === false || data.isomers_estimated ? " (estimated)" : ""}`);
    if (scored !== undefined) bits.push(`${fmt.format(scored)} scored`);
  }
  bits.push(`${candidates.length} kept`);
  $("results-summary").textContent = bits.join(" · ") + ".";
  const warn = $("results-warnings");
  warn.replaceChildren();
  for (const w of data.warnings || []) {
    const li = document.createElement("li");
    li.textContent = exchangeHint(w, candidates);
    warn.append(li);
  }
  const sel = $("compare");
  sel.replaceChildren(new Option("none", ""));
  candidates.forEach((c, i) => sel.append(new Option(`#${c.rank ?? i + 1} ${c.smiles}`, String(i))));
  // The runner-up is drawn over the plot and compared side by side from
  // the start; any other pair can be chosen.
  if (candidates.length > 1) { review.compare = 1; sel.value = "1"; }
  renderCandidateList();
  if (candidates.length) selectCandidate(0, false);
  else {
    $("detail").hidden = true;
    $("results-summary").textContent += " No candidate fits the formula and the constraints.";
  }
}

// exchangeHint keeps the guess that missing integral H are exchangeable
// H not observed only when the leading candidate has exchangeable H; for
// one without, it says so instead of guessing.
function exchangeHint(w, candidates) {
  const m = /^(.*?):\s*(\S+) exchangeable H not observed\?$/.exec(w);
  if (!m) return w;
  const top = candidates[0];
  const hasExch = top && top.unobserved.some((e) => e.exchangeable);
  if (hasExch) return w;
  return `${m[1]}: ${m[2]} H not accounted for, and the leading candidate has no exchangeable H left unobserved — check the integrals.`;
}

// SCOPE_HEADS are the first line of a result, by search kind.
const SCOPE_HEADS = {
  stopped: (s) => `Search stopped early${s.stop_reason ? ` (${s.stop_reason})` : ""}: the ranking covers only the structures ` +
    `scored before the stop${s.scope === "constrained" ? ", inside the spectrum’s readings" : ""}; the true structure may not have been reached.`,
  constrained: () => "Complete within the constraints: searched only isomers fitting the spectrum’s readings. " +
    "Isomers outside them were not scored; switch constraints off below, or run again over all isomers, if you doubt them.",
  complete: () => "Complete: every plausible isomer of the formula was scored.",
};

// renderScope shows how far the search went: a banner above the ranking and
// a note over the candidate list.
function renderScope(search, kept) {
  const box = $("search-scope");
  const note = $("candidate-scope-note");
  const kind = search ? searchKind(search.status) : "";
  box.hidden = !kind;
  note.textContent = "";
  delete note.dataset.status;
  if (!kind) return;
  box.dataset.status = kind;
  box.dataset.scope = search.scope || "";
  $("search-scope-head").textContent = SCOPE_HEADS[kind](search);
  $("search-scope-summary").textContent = [search.summary, ...(search.notes || [])].filter(Boolean).join(" ");
  note.dataset.status = kind;
  if (!kept) return;
  note.textContent = kind === "stopped"
    ? "Stopped early: probabilities are over the structures scored before the stop, not over every isomer."
    : kind === "constrained"
      ? "Probabilities are over the structures fitting the spectrum’s readings."
      : "Probabilities are over every plausible isomer scored.";
}

// renderConstraints fills the panel of constraints read from the spectrum
// approxCount writes a rough count with two significant digits ("3.1k").
function approxCount(x) {
  if (!(x > 0)) return "0";
  if (x < 1000) return String(Math.round(x));
  const [d, u] = x < 1e6 ? [1e3, "k"] : x < 1e9 ? [1e6, "M"] : [1e9, "G"];
  const v = x / d;
  return (v < 10 ? v.toFixed(1) : Math.round(v).toString()) + u;
}

// estimateText writes a reading's size estimated before the run
// (structures / search nodes; "?" where no probe reached a structure).
function estimateText(e) {
  if (!e) return "—";
  const s = e.structures === 0 && !e.exact ? "?" : approxCount(e.structures);
  return `${e.exact ? "" : "~"}${s} / ${approxCount(e.nodes)}`;
}

// and the readings searched, with the controls to run the unknown again.
function renderConstraints(search) {
  const panel = $("constraints");
  const cons = Array.isArray(search?.constraints) ? search.constraints : [];
  const readings = Array.isArray(search?.readings) ? search.readings : [];
  const notes = Array.isArray(search?.notes) ? search.notes : [];
  panel.hidden = !search || (!cons.length && !readings.length && !notes.length);
  if (panel.hidden) return;
  panel.open = search.scope === "constrained";
  const on = cons.filter((c) => c.enabled !== false).length;
  let est = "";
  if (search.estimated_nodes > 0) {
    est = `; estimated before the run: ${search.estimated_structures > 0 ? `about ${approxCount(search.estimated_structures)} structures` : "structures too rare for the probes to count"}, ` +
      `about ${approxCount(search.estimated_nodes)} search nodes ` +
      (search.estimated_nodes > search.node_budget ? `(more than the budget of ${approxCount(search.node_budget)}: a stop was expected)` : `(budget ${approxCount(search.node_budget)})`);
  }
  $("constraints-count").textContent = `${cons.length} constraint${cons.length === 1 ? "" : "s"} (${on} on), ` +
    `${readings.length} reading${readings.length === 1 ? "" : "s"}${search.scope === "all isomers" ? "; this search covered all isomers" : ""}${est}`;
  const ul = $("constraint-list");
  ul.replaceChildren();
  cons.forEach((c, i) => {
    const li = document.createElement("li");
    li.dataset.id = c.id;
    const box = document.createElement("input");
    box.type = "checkbox";
    box.id = `constraint-${i}`;
    box.value = c.id;
    box.checked = c.enabled !== false;
    box.dataset.was = box.checked ? "on" : "off";
    const lab = document.createElement("label");
    lab.htmlFor = box.id;
    const name = document.createElement("span");
    name.className = "cname";
    name.textContent = c.name || c.id;
    const meta = document.createElement("span");
    meta.className = "cmeta";
    const peaks = Array.isArray(c.peaks) && c.peaks.length ? `rests on peak${c.peaks.length === 1 ? "" : "s"} ${c.peaks.join(", ")}` : "";
    meta.textContent = [peaks, typeof c.confidence === "number" ? `holds in about ${Math.round(100 * c.confidence)} % of spectra` : "",
      `id ${c.id}`].filter(Boolean).join(" · ");
    lab.append(name, document.createTextNode(`: ${c.reason || ""}`), meta);
    li.classList.toggle("off", !box.checked);
    box.addEventListener("change", () => { li.classList.toggle("off", !box.checked); updateRerun(); });
    li.append(box, lab);
    ul.append(li);
  });
  if (!cons.length) ul.append(Object.assign(document.createElement("li"), { className: "none", textContent: "none read from this spectrum" }));
  const nl = $("constraint-notes");
  nl.replaceChildren(...notes.map((n) => Object.assign(document.createElement("li"), { textContent: n })));
  const tb = $("reading-rows");
  tb.replaceChildren();
  for (const r of readings) {
    const tr = document.createElement("tr");
    tr.dataset.state = r.state || "";
    const cells = [r.name || "", typeof r.weight === "number" ? `${(100 * r.weight).toFixed(0)} %` : "—", r.state || "—",
      typeof r.structures === "number" ? fmt.format(r.structures) : "—", estimateText(r.estimate), (r.constraints || []).join(", ")];
    cells.forEach((t, k) => {
      const td = document.createElement("td");
      td.textContent = t;
      if (k === 5) td.className = "ids";
      tr.append(td);
    });
    tb.append(tr);
  }
  $("reading-rows").closest(".table-wrap").hidden = !readings.length;
  $("readings-title").hidden = !readings.length;
  $("rerun-note").textContent = review.req ? "" : "The job’s request is not at hand, so it cannot be run again from here.";
  $("rerun-all").disabled = !review.req;
  updateRerun();
}

// disabledIDs lists the constraints the panel has switched off.
function disabledIDs() {
  return [...$("constraint-list").querySelectorAll("input[type=checkbox]")].filter((b) => !b.checked).map((b) => b.value);
}

function updateRerun() {
  const changed = [...$("constraint-list").querySelectorAll("input[type=checkbox]")]
    .some((b) => (b.checked ? "on" : "off") !== b.dataset.was);
  $("rerun-constraints").disabled = !review?.req || !changed;
}

// rerun submits the job's request again with changed options and opens
// the new job.
async function rerun(change, btn) {
  const body = JSON.parse(JSON.stringify(review.req));
  body.options = { ...(body.options || {}) };
  change(body.options);
  for (const k of Object.keys(body.options)) {
    const v = body.options[k];
    if (v === undefined || v === false || (Array.isArray(v) && !v.length)) delete body.options[k];
  }
  btn.disabled = true;
  $("rerun-note").textContent = "Sending…";
  try {
    const job = await api("POST", "/v1/jobs", body, { idempotencyKey: newKey() });
    sessionStorage.setItem(REQ_STORE + job.id, JSON.stringify(body));
    go(`/jobs/${job.id}`);
  } catch (err) {
    const fields = Array.isArray(err.problem?.errors) ? err.problem.errors.map((e) => `${e.field}: ${e.detail}`).join("; ") : "";
    $("rerun-note").textContent = `Could not run it again: ${err.message}${fields ? ` (${fields})` : ""}`;
    btn.disabled = false;
  }
}

function pctText(p) {
  const v = 100 * p;
  if (v >= 99.95) return "> 99.9 %";
  if (v > 0 && v < 0.1) return "< 0.1 %";
  return `${v.toFixed(1)} %`;
}

function copyText(text, btn) {
  const done = () => {
    const old = btn.textContent;
    btn.textContent = "Copied";
    setTimeout(() => { btn.textContent = old; }, 1200);
  };
  if (navigator.clipboard?.writeText) {
    navigator.clipboard.writeText(text).then(done, () => fallbackCopy(text, done));
  } else fallbackCopy(text, done);
}

function fallbackCopy(text, done) {
  const ta = document.createElement("textarea");
  ta.value = text;
  ta.setAttribute("readonly", "");
  ta.style.position = "fixed";
  ta.style.opacity = "0";
  document.body.append(ta);
  ta.select();
  try { document.execCommand("copy"); done(); } catch (_) { /* nothing more to try */ }
  ta.remove();
}

function renderCandidateList() {
  const ol = $("candidate-list");
  ol.replaceChildren();
  review.candidates.forEach((c, i) => {
    const li = document.createElement("li");
    li.className = "candidate";
    li.dataset.index = String(i);
    li.innerHTML = `
      <button type="button" class="pick" aria-pressed="false">
        <span class="rank"></span>
        <span class="structure"></span>
      </button>
      <div class="cand-body">
        <p class="smiles"><code></code> <button type="button" class="quiet copy">Copy</button></p>
        <div class="prob"><div class="prob-bar" aria-hidden="true"><div></div></div><span class="prob-num"></span></div>
        <p class="score"></p>
      </div>`;
    li.querySelector(".rank").textContent = `#${c.rank ?? i + 1}`;
    li.querySelector("code").textContent = c.smiles;
    li.querySelector(".pick").setAttribute("aria-label", `Show the explanation of candidate ${c.rank ?? i + 1}, ${c.smiles}`);
    li.querySelector(".prob-bar div").style.width = `${Math.max(0.5, 100 * c.probability)}%`;
    li.querySelector(".prob-num").textContent = pctText(c.probability);
    li.querySelector(".prob-num").title = `probability ${c.probability}`;
    li.querySelector(".score").textContent = c.score !== undefined ? `score (log-likelihood) ${c.score.toFixed(2)}` : "";
    li.querySelector(".pick").addEventListener("click", () => selectCandidate(i, true));
    const copy = li.querySelector(".copy");
    copy.setAttribute("aria-label", `Copy SMILES of candidate ${c.rank ?? i + 1}`);
    copy.addEventListener("click", () => copyText(c.smiles, copy));
    ol.append(li);
    putDrawing(li.querySelector(".structure"), c.smiles, { width: 200, height: 150 });
  });
}

function selectCandidate(i, focusDetail) {
  review.selected = i;
  review.peakSel = -1;
  if (review.compare === i) {
    // A candidate is not compared with itself: take the other of the top two.
    review.compare = review.candidates.length > 1 ? (i === 0 ? 1 : 0) : -1;
    $("compare").value = review.compare >= 0 ? String(review.compare) : "";
  }
  document.querySelectorAll("#candidate-list .candidate").forEach((li, k) => {
    li.classList.toggle("selected", k === i);
    li.querySelector(".pick").setAttribute("aria-pressed", k === i ? "true" : "false");
  });
  const c = review.candidates[i];
  $("detail").hidden = false;
  $("detail-title").textContent = `Candidate #${c.rank ?? i + 1}`;
  $("detail-smiles").textContent = c.smiles;
  $("detail-numbers").textContent = `probability ${pctText(c.probability)}` +
    (c.score !== undefined ? ` · score ${c.score.toFixed(2)}` : "") +
    (c.carbonScore !== undefined ? ` (13C part ${c.carbonScore.toFixed(2)})` : "");
  review.zoom = null;
  renderDetailDrawing();
  renderExplain();
  renderPlot();
  renderCompare();
  renderCarbon();
  if (focusDetail) $("detail-title").scrollIntoView({ block: "nearest" });
}

function renderDetailDrawing() {
  const c = review.candidates[review.selected];
  let atoms = [];
  if (review.peakSel >= 0) {
    const a = c.assignments[review.peakSel];
    atoms = a ? a.atoms : [];
  }
  putDrawing($("detail-structure"), c.smiles, { width: 360, height: 270, atoms, numbers: true });
  $("detail-highlight-note").textContent = review.peakSel >= 0
    ? `Marked and numbered (from 1, in SMILES order, as in the table): ${atoms.length > 1 ? "atoms" : "atom"} ${atoms.map((x) => x + 1).join(", ")}, ` +
      `carrying the H of the peak at δ ${fmtShift(c.assignments[review.peakSel].peak)}.`
    : "Select a row of the table to mark its atoms in the drawing.";
}

function fmtShift(p) {
  if (!p) return "—";
  if (p.hi !== undefined && p.lo !== undefined && Math.abs(p.hi - p.lo) > 1e-6) return `${p.hi.toFixed(2)}–${p.lo.toFixed(2)}`;
  return p.shift !== undefined ? p.shift.toFixed(2) : "—";
}

function fmtNum(v, d = 2) { return v === undefined ? "—" : v.toFixed(d); }

function multText(m, j) {
  if (!m) return "—";
  return j && j.length ? `${m}, J = ${j.map((x) => x.toFixed(1)).join(", ")} Hz` : m;
}

const COLUMN_LABELS = {
  "obs-shift": "Observed δ", env: "Assigned to", "pred-shift": "Predicted δ", delta: "Δδ",
  mult: "Multiplicity (obs. / pred.)", hcount: "H (obs. / exp.)", share: "Share of score (nats)",
};

function signed(v, d = 2) {
  return `${v >= 0 ? "+" : "−"}${Math.abs(v).toFixed(d)}`;
}

function termsText(t) {
  if (!t) return "";
  return `shift ${signed(t.shift)}, multiplicity ${signed(t.multiplicity)}, J ${signed(t.j)}, integration ${signed(t.integration)} nats`;
}

// shareScale is the full width of the share-of-score bars in nats: the
// largest share of any peak of any candidate of the ranking, so a bar is
// the same length for the same share whichever candidate is shown.
function shareScale() {
  if (review.shareScale === undefined) {
    review.shareScale = Math.max(1e-9, ...review.candidates.flatMap((c) => [...c.assignments, ...c.unexplained, ...c.unobserved]
      .map((a) => Math.abs(a.share ?? 0))));
  }
  return review.shareScale;
}

function renderExplain() {
  const c = review.candidates[review.selected];
  const tbody = $("explain-rows");
  tbody.replaceChildren();
  const maxShare = shareScale();
  c.assignments.forEach((a, i) => {
    const tr = document.createElement("tr");
    tr.className = "assign";
    tr.tabIndex = 0;
    tr.dataset.index = String(i);
    tr.setAttribute("aria-selected", i === review.peakSel ? "true" : "false");
    const td = (cls, text) => {
      const cell = document.createElement("td");
      cell.className = cls;
      cell.dataset.label = COLUMN_LABELS[cls] || "";
      if (text !== undefined) cell.textContent = text;
      tr.append(cell);
      return cell;
    };
    td("obs-shift", fmtShift(a.peak));
    const envText = a.envs.length
      ? a.envs.map((e) => `${e.kind || "environment"}, ${e.h}H${e.split ? " (one half of a diastereotopic pair)" : ""}`).join("; ")
      : "—";
    const envCell = td("env", envText);
    if (a.atoms.length) {
      const at = document.createElement("span");
      at.className = "why";
      // Atoms count from 1 in SMILES order on the page (and the CLI); the
      // API's atom indices are 0-based.
      at.textContent = `atom${a.atoms.length > 1 ? "s" : ""} ${a.atoms.map((x) => x + 1).join(", ")}`;
      envCell.append(at);
    }
    const predCell = td("pred-shift");
    // Several environments on one peak each keep their own predicted δ
    // (and Δδ): their mean is a shift no signal has.
    const own = a.envs.length > 1 && a.envs.every((e) => e.shift !== undefined);
    if (own) {
      for (const e of a.envs) {
        const line = document.createElement("span");
        line.className = "pred-env";
        line.dataset.env = String(e.id);
        line.innerHTML = `<span class="pred-env-value"></span><span class="sigma"></span> <span class="why"></span>`;
        line.querySelector(".pred-env-value").textContent = fmtNum(e.shift);
        if (e.sigma !== undefined) line.querySelector(".sigma").textContent = ` ± ${e.sigma.toFixed(2)}`;
        line.querySelector(".why").textContent = `${e.kind || "environment"}, ${e.h}H`;
        predCell.append(line);
      }
    } else {
      const predSpan = document.createElement("span");
      predSpan.className = "pred-value";
      predSpan.textContent = fmtNum(a.envs.length === 1 && a.envs[0].shift !== undefined ? a.envs[0].shift : a.pred);
      predCell.append(predSpan);
      const sig = a.envs.map((e) => e.sigma).filter((v) => v !== undefined);
      if (sig.length) {
        const sg = document.createElement("span");
        sg.className = "sigma";
        sg.textContent = ` ± ${Math.max(...sig).toFixed(2)}`;
        predCell.append(sg);
      }
    }
    const terms = a.breakdown.length ? a.breakdown : a.envs.flatMap((e) => e.breakdown);
    if (terms.length) {
      const b = document.createElement("button");
      b.type = "button";
      b.className = "quiet increments";
      b.textContent = "increments";
      b.setAttribute("aria-expanded", "false");
      b.addEventListener("click", (ev) => {
        ev.stopPropagation();
        const open = b.getAttribute("aria-expanded") === "true";
        b.setAttribute("aria-expanded", open ? "false" : "true");
        const next = tr.nextElementSibling;
        if (next && next.classList.contains("breakdown")) next.hidden = open;
      });
      b.addEventListener("keydown", (ev) => ev.stopPropagation());
      predCell.append(" ", b);
    }
    const obsShift = a.peak.shift;
    td("delta", own && obsShift !== undefined ? a.envs.map((e) => signed(obsShift - e.shift)).join(" / ")
      : a.delta !== undefined ? signed(a.delta) : "—");
    const mc = td("mult");
    const obsM = document.createElement("span");
    obsM.textContent = `${multText(a.peak.multiplicity, a.peak.j)} / ${multText(a.predMult, a.envs.length === 1 ? a.envs[0].j : [])}`;
    mc.append(obsM);
    // The assignment's own reason is the short one; the environments'
    // reasons go with the increments below.
    const why = (a.reason ? [a.reason] : a.envs.flatMap((e) => e.reasons)).filter(Boolean);
    if (why.length) {
      const small = document.createElement("span");
      small.className = "why";
      small.textContent = [...new Set(why)].join("; ");
      mc.append(small);
    }
    td("hcount", `${a.peak.h ? fmtNum(a.peak.h, 1) : "—"} / ${a.expH}`);
    const share = td("share");
    if (a.share !== undefined) {
      share.innerHTML = `<span class="share-bar" aria-hidden="true"><span></span></span> <span class="share-num"></span>`;
      const bar = share.querySelector(".share-bar span");
      bar.style.width = `${Math.min(100, (100 * Math.abs(a.share)) / maxShare)}%`;
      bar.classList.toggle("cost", a.share < 0);
      share.querySelector(".share-num").textContent = signed(a.share);
      share.title = termsText(a.terms);
    } else share.textContent = "—";
    const pick = () => {
      review.peakSel = review.peakSel === i ? -1 : i;
      tbody.querySelectorAll("tr.assign").forEach((r) => r.setAttribute("aria-selected", r.dataset.index === String(review.peakSel) ? "true" : "false"));
      renderDetailDrawing();
      renderPlot();
    };
    tr.addEventListener("click", pick);
    tr.addEventListener("keydown", (ev) => {
      if (ev.target !== tr) return;
      if (ev.key === "Enter" || ev.key === " ") { ev.preventDefault(); pick(); }
      if (ev.key === "ArrowDown") { ev.preventDefault(); focusRow(i + 1); }
      if (ev.key === "ArrowUp") { ev.preventDefault(); focusRow(i - 1); }
    });
    tbody.append(tr);
    if (terms.length) {
      const br = document.createElement("tr");
      br.className = "breakdown";
      br.hidden = true;
      const cell = document.createElement("td");
      cell.colSpan = 7;
      const list = document.createElement("ul");
      for (const t of terms) {
        const li = document.createElement("li");
        li.textContent = `${t.term} ${signed(Number(t.ppm))} ppm`;
        list.append(li);
      }
      cell.append(list);
      const envWhy = a.reason ? [...new Set(a.envs.flatMap((e) => e.reasons))] : [];
      if (envWhy.length) {
        const w = document.createElement("p");
        w.className = "why";
        w.textContent = `Couplings: ${envWhy.join("; ")}.`;
        cell.append(w);
      }
      if (a.terms) {
        const sc = document.createElement("p");
        sc.className = "why";
        sc.textContent = `Score terms of this peak: ${termsText(a.terms)}.`;
        cell.append(sc);
      }
      br.append(cell);
      tbody.append(br);
    }
  });
  const ux = $("unexplained");
  ux.replaceChildren();
  for (const p of c.unexplained) {
    const li = document.createElement("li");
    li.textContent = `δ ${fmtShift(p)}${p.multiplicity ? ` (${p.multiplicity}${p.h ? `, ${fmtNum(p.h, 1)}H` : ""})` : ""}` +
      `${p.share !== undefined ? ` — costs ${signed(p.share)} nats` : ""}`;
    ux.append(li);
  }
  for (const p of excludedPeaks(c)) {
    const li = document.createElement("li");
    li.className = "excluded";
    li.textContent = `δ ${fmtShift(p)} — not scored (${p.solvent ? `the ${p.solvent} signal` : "a solvent or water signal"}; see the notes above)`;
    ux.append(li);
  }
  if (!ux.children.length) ux.append(Object.assign(document.createElement("li"), { className: "none", textContent: "none" }));
  const uo = $("unobserved");
  uo.replaceChildren();
  for (const e of c.unobserved) {
    const li = document.createElement("li");
    li.textContent = `${e.kind || "environment"}, ${e.h}H, predicted δ ${fmtNum(e.shift)}${e.multiplicity ? ` (${e.multiplicity})` : ""}` +
      `${e.share !== undefined ? ` — ${signed(e.share)} nats` : ""}${e.reason ? `: ${e.reason}` : e.exchangeable ? ": exchangeable H, often missing or broad" : ""}`;
    uo.append(li);
  }
  if (!c.unobserved.length) uo.append(Object.assign(document.createElement("li"), { className: "none", textContent: "none" }));
  const sum = $("detail-summary");
  sum.textContent = [c.summary, ...c.notes].filter(Boolean).join(" ");
  sum.hidden = !sum.textContent;
}

// candName names candidate i as the page does ("#2").
function candName(i) { return `#${review.candidates[i].rank ?? i + 1}`; }

// sideText says what one candidate predicts at a peak: its shift or shifts
// (each environment its own), the deviation and the pattern.
function sideText(x) {
  if (x.kind === "unexplained") return "leaves it unexplained";
  const sh = x.shifts.map((v) => v.toFixed(2)).join(" and ");
  const dd = x.deltas.map((d) => signed(d)).join(", ");
  return `δ ${sh || "—"} (Δδ ${dd || "—"}), ${patternWord(x.pattern) || "no pattern"}, ${x.h} H`;
}

// renderCompare fills the side-by-side comparison of the selected
// candidate with the one chosen in #compare, peak by peak in words, with
// the score difference one click away.
function renderCompare() {
  const panel = $("compare-panel");
  const ia = review.selected, ib = review.compare;
  panel.hidden = ib < 0 || ib === ia || !review.candidates[ib];
  if (panel.hidden) return;
  const a = review.candidates[ia], b = review.candidates[ib];
  const na = candName(ia), nb = candName(ib);
  panel.dataset.a = String(ia);
  panel.dataset.b = String(ib);
  $("compare-title").textContent = `Side by side: ${na} and ${nb}`;
  $("compare-head-a").textContent = `${na} predicts`;
  $("compare-head-b").textContent = `${nb} predicts`;
  const rows = comparePeaks(a, b, review.observed, na, nb);
  $("compare-summary").textContent = summaryLine(rows, na, nb);
  const tb = $("compare-rows");
  tb.replaceChildren();
  for (const r of rows) {
    const tr = document.createElement("tr");
    tr.dataset.peak = String(r.peak.index);
    if (r.side) tr.dataset.favours = r.side;
    const obsPattern = `${patternWord(r.peak.multiplicity) || "—"}${r.peak.h ? `, ${fmtNum(r.peak.h, 1)} H` : ""}`;
    for (const [cls, text] of [["obs-shift", fmtShift(r.peak)], ["obs-mult", obsPattern],
      ["side-a", sideText(r.a)], ["side-b", sideText(r.b)], ["verdict", r.verdict]]) {
      const td = document.createElement("td");
      td.className = cls;
      td.textContent = text;
      tr.append(td);
    }
    tb.append(tr);
  }
  const d = a.score !== undefined && b.score !== undefined ? a.score - b.score : undefined;
  $("compare-nats").textContent = d === undefined ? "No scores to compare."
    : `${na} scores ${signed(d)} nats against ${nb} (likelihood ratio ${likelihoodRatio(d)}); ` +
      `probabilities ${pctText(a.probability)} and ${pctText(b.probability)}.`;
  const ul = $("compare-shares");
  ul.replaceChildren(...rows.filter((r) => r.shareDiff !== undefined).map((r) => Object.assign(document.createElement("li"), {
    textContent: `δ ${fmtShift(r.peak)}: ${signed(r.shareDiff)} nats (${na} ${signed(r.a.share)}, ${nb} ${signed(r.b.share)})`,
  })));
}

// excludedPeaks lists the observed peaks the service left out of the
// scoring: those the result's peak list marks excluded, or, without that
// list, those a candidate neither assigns nor counts as unexplained.
function excludedPeaks(c) {
  const used = new Set([...c.assignments.map((a) => a.peak.index), ...c.unexplained.map((u) => u.index)]);
  return review.observed.filter((p) => (p.excluded || !used.has(p.index)) && typeof p.shift === "number" && isFinite(p.shift));
}

function focusRow(i) {
  const r = $("explain-rows").querySelector(`tr.assign[data-index="${i}"]`);
  if (r) r.focus();
}

// plotEnvs lists a candidate's predicted environments for the plot: one item
// per (peak, environment) pair, so the halves of a split CH2 each get their
// line, plus the unobserved ones.
function plotEnvs(c) {
  return [...c.assignments.flatMap((a) => a.envs), ...c.unobserved].map((e) => ({ ...e, id: e.key }));
}

function renderPlot() {
  const c = review.candidates[review.selected];
  const envs = plotEnvs(c);
  const links = c.assignments.flatMap((a) => a.envs.map((e) => ({ peak: a.peak.index, env: e.key })));
  const byIndex = new Map();
  for (const p of review.observed) byIndex.set(p.index, { ...p });
  for (const a of c.assignments) {
    const o = byIndex.get(a.peak.index);
    if (!o) byIndex.set(a.peak.index, { ...a.peak });
    else if (!o.h) o.h = a.peak.h;
  }
  const unexplainedIdx = new Set(c.unexplained.map((p) => p.index));
  const excludedIdx = new Set(excludedPeaks(c).map((p) => p.index));
  const obsList = [];
  for (const [i, p] of byIndex) {
    const excluded = excludedIdx.has(i);
    obsList[i] = { ...p, h: p.h || p.integral || 1, unexplained: unexplainedIdx.has(i), excluded,
      label: excluded ? "not scored" : p.multiplicity || "" };
  }
  for (let i = 0; i < obsList.length; i++) if (!obsList[i]) obsList[i] = { shift: NaN, index: i };
  const overlay = review.compare >= 0 ? plotEnvs(review.candidates[review.compare]) : null;
  const shifts = [...obsList.flatMap((p) => [p.shift, p.hi, p.lo]), ...envs.map((e) => e.shift),
    ...(overlay || []).map((e) => e.shift)];
  const range = review.zoom || fitRange(shifts);
  $("zoom-hi").value = String(range.hi);
  $("zoom-lo").value = String(range.lo);
  const selPeak = review.peakSel >= 0 ? c.assignments[review.peakSel]?.peak.index : -1;
  $("zoom-peak").disabled = review.peakSel < 0;
  drawPlot($("plot"), {
    observed: obsList, predicted: envs, overlay, links, mhz: review.mhz,
    hi: range.hi, lo: range.lo, selectedPeak: selPeak, shiftLabels: $("shift-labels").checked,
    names: { predicted: `#${c.rank ?? review.selected + 1}`,
      overlay: review.compare >= 0 ? `#${review.candidates[review.compare].rank ?? review.compare + 1}` : "" },
  });
}

// renderCarbon draws the 13C panel and table of the selected candidate:
// the observed 13C peaks always (when there are any), its predicted carbons
// and their assignment when the ranking scored the 13C list.
function renderCarbon() {
  const c = review.candidates[review.selected];
  const obs = review.carbon || [];
  $("carbon-figure").hidden = obs.length === 0;
  $("carbon-explain").hidden = !c.hasCarbon;
  if (!obs.length) return;
  const unexplained = new Set(c.carbonUnexplained.map((u) => u.peak));
  const predicted = [
    ...c.carbonAssignments.flatMap((a) => a.signals),
    ...c.carbonUnobserved.map((u) => ({ ...u, unobserved: true })),
  ];
  const links = c.carbonAssignments.flatMap((a) => a.signals.map((sg) => ({ peak: a.peak, signal: sg.signal })));
  const range = fitCarbonRange([...obs.flatMap((p) => [p.shift, p.hi, p.lo]), ...predicted.map((p) => p.shift)]);
  drawCarbonPlot($("carbon-plot"), {
    observed: obs.map((p) => ({ ...p, unexplained: unexplained.has(p.index) })),
    predicted, links, hi: range.hi, lo: range.lo, name: `#${c.rank ?? review.selected + 1}`,
  });
  $("carbon-caption").textContent = c.hasCarbon
    ? "13C: observed peaks (top, taller for more carbons) against the selected candidate’s predicted carbons (bottom); lines join each peak to the carbons assigned to it. δ runs from high on the left to low on the right."
    : "13C: the observed peaks (taller for more carbons). This ranking did not score the 13C list, so no predicted carbons are drawn. δ runs from high on the left to low on the right.";
  if (!c.hasCarbon) return;
  const tb = $("carbon-rows");
  tb.replaceChildren();
  for (const a of c.carbonAssignments) {
    const tr = document.createElement("tr");
    const obsShift = a.range ? `${Math.max(...a.range).toFixed(1)}–${Math.min(...a.range).toFixed(1)}` : fmtNum(a.shift, 1);
    const cells = [
      ["obs-shift", obsShift], ["dept", `${a.dept || "—"} / ${a.predClass || "—"}`], ["pred-shift", fmtNum(a.pred, 1)],
      ["delta", a.shift !== undefined && a.pred !== undefined ? signed(a.shift - a.pred, 1) : "—"],
      ["carbons", `${a.count || "—"} / ${a.carbons}`], ["share", a.share !== undefined ? signed(a.share) : "—"],
    ];
    for (const [cls, text] of cells) {
      const td = document.createElement("td");
      td.className = cls;
      td.textContent = text;
      tr.append(td);
    }
    if (a.reason) {
      const why = document.createElement("span");
      why.className = "why";
      why.textContent = a.reason;
      tr.children[1].append(why);
    }
    tb.append(tr);
  }
  const list = (id, items, text) => {
    const ul = $(id);
    ul.replaceChildren(...items.map((it) => Object.assign(document.createElement("li"), { textContent: text(it) })));
    if (!items.length) ul.append(Object.assign(document.createElement("li"), { className: "none", textContent: "none" }));
  };
  list("carbon-unexplained", c.carbonUnexplained, (u) => `δ ${fmtNum(u.shift, 1)}${u.dept ? ` (${u.dept})` : ""}` +
    `${u.share !== undefined ? ` — costs ${signed(u.share)} nats` : ""}${u.reason ? `: ${u.reason}` : ""}`);
  list("carbon-unobserved", c.carbonUnobserved, (u) => `${u.kind || u.cls || "carbon"}${u.cls ? ` (${u.cls})` : ""}, predicted δ ${fmtNum(u.shift, 1)}` +
    `${u.share !== undefined ? ` — ${signed(u.share)} nats` : ""}${u.reason ? `: ${u.reason}` : ""}`);
}

function setZoom() {
  const hi = parseFloat($("zoom-hi").value), lo = parseFloat($("zoom-lo").value);
  if (isFinite(hi) && isFinite(lo) && Math.abs(hi - lo) >= 0.02) {
    review.zoom = { hi: Math.max(hi, lo), lo: Math.min(hi, lo) };
    renderPlot();
  }
}

function download(name, type, text) {
  const url = URL.createObjectURL(new Blob([text], { type }));
  const a = document.createElement("a");
  a.href = url;
  a.download = name;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

function csvField(v) {
  const s = v === undefined || v === null ? "" : String(v);
  return /[",\n]/.test(s) ? `"${s.replace(/"/g, '""')}"` : s;
}

// CSV_HEADER_FIELDS are the fields of exportHeader every CSV row repeats
// (lists joined with " | ").
const CSV_HEADER_FIELDS = ["job_id", "reference", "formula", "solvent", "mhz", "peaks_1h", "peaks_13c",
  "constraints_off", "warnings", "caution"];

// rankingCSV writes one row per candidate. Every row carries how far the
// search went (search_status, search_stop_reason, search_scope), so a row
// copied elsewhere still says whether its ranking came from a search that
// stopped early or ran only inside the spectrum's readings; a ranking
// without candidates gets one row with only those columns.
function rankingCSV() {
  const head = ["rank", "smiles", "probability", "score", "assigned_peaks", "unexplained_peaks", "unobserved_environments", "summary",
    "carbon_score", "carbon_assigned_peaks", "carbon_unexplained_peaks", "unobserved_carbons",
    "search_status", "search_stop_reason", "search_scope", "probability_text",
    ...CSV_HEADER_FIELDS];
  const h = exportHeader(review);
  const searchCols = [h.search_status, h.search_stop_reason, h.search_scope];
  const headerCols = CSV_HEADER_FIELDS.map((k) => (Array.isArray(h[k]) ? h[k].join(" | ") : h[k]));
  const out = [head.join(",")];
  review.candidates.forEach((c, i) => {
    const carbon = c.hasCarbon ? [c.carbonScore, c.carbonAssignments.length, c.carbonUnexplained.length, c.carbonUnobserved.length] : ["", "", "", ""];
    out.push([c.rank ?? i + 1, c.smiles, c.probability, c.score, c.assignments.length, c.unexplained.length, c.unobserved.length, c.summary,
      ...carbon, ...searchCols, pctText(c.probability), ...headerCols].map(csvField).join(","));
  });
  if (!review.candidates.length) out.push([...Array(12).fill(""), ...searchCols, "", ...headerCols].map(csvField).join(","));
  return out.join("\r\n") + "\r\n";
}

// peaksCSV writes the observed 1H and 13C lists as the ranking read them.
function peaksCSV() {
  const head = ["nucleus", "index", "shift", "shift_hi", "shift_lo", "multiplicity", "j_hz", "integral", "implied_h", "carbons", "dept", "excluded"];
  const out = [head.join(",")];
  for (const p of review.observed) {
    out.push(["1H", p.index, p.shift, p.hi ?? "", p.lo ?? "", p.multiplicity, (p.j || []).join(" "), p.integral ?? "", p.h ?? "", "", "",
      p.excluded ? "yes" : ""].map(csvField).join(","));
  }
  for (const p of review.carbon || []) {
    out.push(["13C", p.index, p.shift, p.hi ?? "", p.lo ?? "", "", "", "", "", p.count || "", p.dept || "", ""].map(csvField).join(","));
  }
  return out.join("\r\n") + "\r\n";
}

// rankingJSON is the service's candidate list with the job's request and
// a top-level search_status, so the file says how far the search went.
function rankingJSON() {
  const s = review.data.search || {};
  const out = {
    search_status: s.status || "", search_stop_reason: s.status === "stopped early" ? s.stop_reason || "" : undefined,
    report: exportHeader(review),
    ...review.data,
    request: review.req || undefined,
  };
  if (!Array.isArray(review.data.carbon_peaks) && review.carbon?.length) out.carbon_peaks_as_submitted = review.carbon;
  return JSON.stringify(out, null, 2) + "\n";
}

// tableText is a candidate's table peak by peak as text cells, atoms
// numbered from 1 as the page shows them.
const REPORT_COLUMNS = ["Observed δ", "Assigned to", "Predicted δ", "Δδ", "Multiplicity (obs. / pred.)", "H (obs. / exp.)", "Share of score (nats)"];
function tableText(c) {
  return c.assignments.map((a) => {
    const own = a.envs.length > 1 && a.envs.every((e) => e.shift !== undefined);
    const pred = own ? a.envs.map((e) => `${fmtNum(e.shift)} (${e.kind || "environment"}, ${e.h}H)`).join("; ")
      : fmtNum(a.envs.length === 1 && a.envs[0].shift !== undefined ? a.envs[0].shift : a.pred);
    const dd = own && a.peak.shift !== undefined ? a.envs.map((e) => signed(a.peak.shift - e.shift)).join(" / ")
      : a.delta !== undefined ? signed(a.delta) : "—";
    const env = a.envs.map((e) => `${e.kind || "environment"}, ${e.h}H`).join("; ") +
      (a.atoms.length ? ` (atom${a.atoms.length > 1 ? "s" : ""} ${a.atoms.map((x) => x + 1).join(", ")})` : "");
    return [fmtShift(a.peak), env || "—", pred, dd,
      `${multText(a.peak.multiplicity, a.peak.j)} / ${multText(a.predMult, a.envs.length === 1 ? a.envs[0].j : [])}`,
      `${a.peak.h ? fmtNum(a.peak.h, 1) : "—"} / ${a.expH}`, a.share !== undefined ? signed(a.share) : "—"];
  });
}

// downloadReport saves the filing report as one HTML file.
async function downloadReport() {
  const top = review.candidates.slice(0, 5);
  const drawings = await Promise.all(top.map((c) => drawSVG(c.smiles, { width: 300, height: 220 })));
  const html = reportHTML(review, { drawings, columns: REPORT_COLUMNS,
    tableRows: review.candidates.length ? tableText(review.candidates[0]) : [], top: 5 });
  download(`shiftrank-${review.id}-report.html`, "text/html", html);
}

function downloadBlob(name, blob) {
  const url = URL.createObjectURL(blob);
  const a = document.createElement("a");
  a.href = url;
  a.download = name;
  document.body.append(a);
  a.click();
  a.remove();
  setTimeout(() => URL.revokeObjectURL(url), 1000);
}

// downloadDrawing saves the selected candidate's drawing as SVG or PNG
// (drawn at twice the screen size on a white ground).
async function downloadDrawing(kind) {
  const c = review.candidates[review.selected];
  // The download shows what the page shows: the selected row's atoms marked and numbered.
  const atoms = review.peakSel >= 0 ? c.assignments[review.peakSel]?.atoms || [] : [];
  const svg = await drawSVG(c.smiles, { width: 600, height: 450, atoms, numbers: true });
  if (!svg) return;
  const name = `shiftrank-${review.id}-${c.rank ?? review.selected + 1}`;
  if (kind === "svg") { download(`${name}.svg`, "image/svg+xml", svg); return; }
  const img = new Image();
  const url = URL.createObjectURL(new Blob([svg], { type: "image/svg+xml" }));
  await new Promise((res, rej) => { img.onload = res; img.onerror = rej; img.src = url; });
  const cv = document.createElement("canvas");
  cv.width = 600; cv.height = 450;
  const g = cv.getContext("2d");
  g.fillStyle = "#fff";
  g.fillRect(0, 0, cv.width, cv.height);
  g.drawImage(img, 0, 0, cv.width, cv.height);
  URL.revokeObjectURL(url);
  cv.toBlob((b) => { if (b) downloadBlob(`${name}.png`, b); }, "image/png");
}

// ---------- start ----------

function init() {
  $("formula").addEventListener("input", () => { updateDBE(); clearFieldError("formula"); });
  $("peaks-text").addEventListener("input", () => { syncRowsFromText(); clearFieldError("peaks"); clearIntegralWarning(); });
  $("peak-rows").addEventListener("input", (e) => {
    const tr = e.target.closest("tr");
    const i = [...$("peak-rows").children].indexOf(tr);
    if (i < 0) return;
    rows[i] = rowFromInputs(tr);
    syncTextFromRows();
  });
  $("add-peak").addEventListener("click", () => {
    rows.push({ shift: "", mult: "", j: "", integral: "" });
    renderRows();
    $(`peak-${rows.length - 1}-shift`).focus();
  });
  $("submit-form").addEventListener("submit", submit);
  $("integral-proceed").addEventListener("click", () => {
    integralsAccepted = `${$("formula").value.trim()}\n${$("peaks-text").value.trim()}`;
    clearIntegralWarning();
    $("submit-form").requestSubmit();
  });
  $("load-example").addEventListener("click", loadExample);
  $("clear-form").addEventListener("click", clearForm);
  ["mhz", "solvent", "reference", "top-k", "filter", "require", "forbid", "max-nodes", "time-budget", "max-candidates"].forEach((id) =>
    $(id).addEventListener("input", () => clearFieldError({ "top-k": "top_k", "max-nodes": "max_nodes", "time-budget": "time_budget", "max-candidates": "max_candidates" }[id] || id)));
  $("key-open").addEventListener("click", () => askForKey("Enter a different API key, or forget the one this tab holds."));
  if (sessionStorage.getItem(KEY_STORE)) $("key-open").hidden = false;
  $("detail-copy").addEventListener("click", () => copyText($("detail-smiles").textContent, $("detail-copy")));
  $("compare").addEventListener("change", () => {
    const v = $("compare").value;
    review.compare = v === "" ? -1 : Number(v);
    renderPlot();
    renderCompare();
  });
  $("shift-labels").addEventListener("change", () => { if (review) renderPlot(); });
  // The plot is drawn at its own pixel width (labels keep their size):
  // draw it again when that changes.
  let plotW = 0;
  new ResizeObserver(() => {
    const w = $("plot").clientWidth;
    if (review && !$("results").hidden && w && Math.abs(w - plotW) > 8) { plotW = w; renderPlot(); renderCarbon(); }
  }).observe($("plot"));
  $("zoom-hi").addEventListener("change", setZoom);
  $("zoom-lo").addEventListener("change", setZoom);
  $("zoom-fit").addEventListener("click", () => { review.zoom = null; renderPlot(); });
  $("zoom-peak").addEventListener("click", () => {
    const a = review.candidates[review.selected].assignments[review.peakSel];
    if (!a) return;
    const pts = [a.peak.shift, a.peak.hi, a.peak.lo, ...a.envs.map((e) => e.shift)].filter((v) => typeof v === "number");
    const spreadHz = Math.max(20, ...a.envs.map((e) => 2 * (e.j || []).reduce((x, y) => x + 3 * y, 0)));
    const pad = Math.max(0.08, spreadHz / review.mhz);
    review.zoom = { hi: +(Math.max(...pts) + pad).toFixed(2), lo: +(Math.min(...pts) - pad).toFixed(2) };
    renderPlot();
  });
  $("dl-csv").addEventListener("click", () => download(`shiftrank-${review.id}.csv`, "text/csv", rankingCSV()));
  $("dl-json").addEventListener("click", () => download(`shiftrank-${review.id}.json`, "application/json", rankingJSON()));
  $("dl-peaks").addEventListener("click", () => download(`shiftrank-${review.id}-peaks.csv`, "text/csv", peaksCSV()));
  $("print-results").addEventListener("click", () => window.print());
  $("dl-report").addEventListener("click", downloadReport);
  $("dl-svg").addEventListener("click", () => downloadDrawing("svg"));
  $("dl-png").addEventListener("click", () => downloadDrawing("png"));
  window.addEventListener("beforeprint", () => {
    if (!$("constraints").hidden) $("constraints").open = true;
    $("compare-numbers").open = true;
  });
  $("rerun-constraints").addEventListener("click", (e) => rerun((o) => {
    o.disable = disabledIDs();
    delete o.all_isomers;
  }, e.currentTarget));
  $("rerun-all").addEventListener("click", (e) => rerun((o) => {
    o.all_isomers = true;
    delete o.disable;
  }, e.currentTarget));
  $("carbon-text").addEventListener("input", () => { updateCarbonNote(); clearFieldError("carbon_peaks"); });
  $("neutral").addEventListener("change", () => clearFieldError("neutral"));
  $("disable-clear").addEventListener("click", () => { formDisable = []; showDisable(); clearFieldError("disable"); });
  rows = [{ shift: "", mult: "", j: "", integral: "" }];
  renderRows();
  setNote("");
  route();
  rdkit(); // start loading the drawing library early
}

init();
