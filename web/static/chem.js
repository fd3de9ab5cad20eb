// Client-side reading of the two things a chemist types: a molecular formula
// and a 1H peak list in journal notation. These give live feedback only; the
// service parses both again and its answer is the one that counts.

// Lowest normal valence of each supported element: the same rule the service
// uses for the DBE (C/Si 4, N/P/B 3, O/S 2, H and halogens 1; common practice).
const VALENCE = { H: 1, B: 3, C: 4, N: 3, O: 2, F: 1, Si: 4, P: 3, S: 2, Cl: 1, Br: 1, I: 1 };

// parseFormula reads "C4H8O2"-style formulas (any element order, repeats add
// up). It returns {counts, dbe, heavy, hCount} or {error, pos, token}.
export function parseFormula(text) {
  const s = text.trim();
  const off = text.indexOf(s);
  if (s === "") return { error: "empty formula", pos: 0, token: "" };
  const counts = {};
  let i = 0;
  while (i < s.length) {
    const start = i;
    if (!/[A-Z]/.test(s[i])) {
      const m = /^[a-z]+|^[0-9]+|^./.exec(s.slice(i));
      const msg = /[0-9]/.test(s[i]) ? "count without an element symbol"
        : /[a-z]/.test(s[i]) ? "element symbols start with a capital letter" : "unexpected character";
      return { error: msg, pos: off + i, token: m[0] };
    }
    i++;
    while (i < s.length && /[a-z]/.test(s[i])) i++;
    const sym = s.slice(start, i);
    if (!(sym in VALENCE)) {
      return { error: "unknown or unsupported element (C H N O S P Si B F Cl Br I)", pos: off + start, token: sym };
    }
    const ns = i;
    while (i < s.length && /[0-9]/.test(s[i])) i++;
    let n = 1;
    if (i > ns) {
      n = parseInt(s.slice(ns, i), 10);
      if (n === 0) return { error: "element count must be at least 1", pos: off + start, token: s.slice(start, i) };
    }
    counts[sym] = (counts[sym] || 0) + n;
  }
  let twice = 2, heavy = 0;
  for (const [e, n] of Object.entries(counts)) {
    twice += n * (VALENCE[e] - 2);
    if (e !== "H") heavy += n;
  }
  if (heavy === 0) return { error: "a formula needs at least one heavy atom", pos: off, token: s };
  if (twice % 2 !== 0) return { error: "odd number of electrons: no neutral closed-shell structure", pos: off, token: s };
  if (twice < 0) return { error: "too many hydrogens and halogens for the heavy atoms (DBE below zero)", pos: off, token: s };
  return { counts, dbe: twice / 2, heavy, hCount: counts.H || 0 };
}

// Symbols of the periodic table (IUPAC, elements 1–118) in lower case, to
// tell when a lower-case formula has more than one reading.
const ALL_ELEMENTS = new Set(`H He Li Be B C N O F Ne Na Mg Al Si P S Cl Ar K Ca Sc Ti V Cr Mn Fe Co Ni Cu Zn
  Ga Ge As Se Br Kr Rb Sr Y Zr Nb Mo Tc Ru Rh Pd Ag Cd In Sn Sb Te I Xe Cs Ba La Ce Pr Nd Pm Sm Eu Gd Tb Dy Ho Er Tm
  Yb Lu Hf Ta W Re Os Ir Pt Au Hg Tl Pb Bi Po At Rn Fr Ra Ac Th Pa U Np Pu Am Cm Bk Cf Es Fm Md No Lr Rf Db Sg Bh Hs
  Mt Ds Rg Cn Nh Fl Mc Lv Ts Og`.trim().split(/\s+/).map((x) => x.toLowerCase()));

// normalizeFormula rewrites the common ways of typing a formula into the
// strict form parseFormula reads, with the service's rules: subscript
// digits become digits, white space is dropped, and text all in lower case
// is read with capitals when it has exactly one reading as element symbols
// ("co", "si", "no" could be one element or two: refused, not guessed).
// Text with a capital letter is taken as written. It returns {text} or
// {error, pos, token, ambiguous} with pos the character offset in text.
export function normalizeFormula(text) {
  let t = "";
  const at = []; // at[k]: offset in text of t[k]
  let lower = false, upper = false;
  for (let i = 0; i < text.length; i++) {
    const ch = text[i];
    const code = ch.charCodeAt(0);
    if (code >= 0x2080 && code <= 0x2089) { t += String(code - 0x2080); at.push(i); continue; }
    if (/\s/.test(ch)) continue;
    if (ch >= "a" && ch <= "z") lower = true;
    if (ch >= "A" && ch <= "Z") upper = true;
    t += ch;
    at.push(i);
  }
  if (upper || !lower) return { text: t };
  const n = t.length;
  const isDigit = (c) => c >= "0" && c <= "9";
  const isLower = (c) => c >= "a" && c <= "z";
  // ways[i] counts the readings of t[i:] (capped at 2); next[i] is the
  // symbol length of the first one found.
  const ways = new Array(n + 1).fill(0), next = new Array(n + 1).fill(0);
  ways[n] = 1;
  for (let i = n - 1; i >= 0; i--) {
    if (isDigit(t[i])) {
      if (i > 0 && (isLower(t[i - 1]) || isDigit(t[i - 1]))) { ways[i] = ways[i + 1]; next[i] = 1; }
      continue;
    }
    for (let l = 1; l <= 2 && i + l <= n; l++) {
      if (!ALL_ELEMENTS.has(t.slice(i, i + l)) || ways[i + l] === 0) continue;
      if (ways[i] === 0) next[i] = l;
      ways[i] = Math.min(ways[i] + ways[i + l], 2);
    }
  }
  const posOf = (k) => (k < at.length ? at[k] : text.length);
  if (ways[0] === 0) {
    for (let i = 0; i < n; i++) {
      if (isLower(t[i]) && !ALL_ELEMENTS.has(t[i]) && (i + 2 > n || !ALL_ELEMENTS.has(t.slice(i, i + 2)))) {
        return { error: "cannot be read as element symbols; write symbols with a capital letter (C4H8O2)", pos: posOf(i), token: t[i] };
      }
    }
    return { error: "cannot be read as element symbols; write symbols with a capital letter (C4H8O2)", pos: 0, token: text.trim() };
  }
  if (ways[0] > 1) {
    for (let i = 0; i + 2 <= n; i++) {
      const pair = t.slice(i, i + 2);
      if (ALL_ELEMENTS.has(pair) && ALL_ELEMENTS.has(pair[0]) && ALL_ELEMENTS.has(pair[1])) {
        const one = pair[0].toUpperCase() + pair[1], two = pair.toUpperCase();
        return { error: `ambiguous in lower case: “${pair}” could be ${one} or ${two[0]} and ${two[1]}; write it with capitals (${two} or ${one})`,
          pos: posOf(i), token: pair, ambiguous: true };
      }
    }
    return { error: "ambiguous in lower case; write symbols with capital letters", pos: 0, token: text.trim(), ambiguous: true };
  }
  let out = "";
  for (let i = 0; i < n;) {
    if (isDigit(t[i])) { out += t[i]; i++; continue; }
    const l = next[i];
    out += t[i].toUpperCase() + t.slice(i + 1, i + l);
    i += l;
  }
  return { text: out };
}

// hillFormula writes element counts in Hill order: C first, then H, then
// the others alphabetically (without C: all alphabetically); common practice.
export function hillFormula(counts) {
  const syms = Object.keys(counts).filter((e) => counts[e] > 0);
  const part = (e) => `${e}${counts[e] === 1 ? "" : counts[e]}`;
  if (!("C" in counts)) return syms.sort().map(part).join("");
  const rest = syms.filter((e) => e !== "C" && e !== "H").sort();
  return ["C", ...(counts.H ? ["H"] : []), ...rest].map(part).join("");
}

// Multiplicity codes as written in journals, mapped to the normal form.
const MULT_ALIASES = {
  s: "s", d: "d", t: "t", q: "q", m: "m",
  quint: "quint", quin: "quint", p: "quint", pent: "quint",
  sext: "sext", sex: "sext", hex: "sext", sxt: "sext",
  sept: "sept", sep: "sept", hept: "sept",
  "br s": "br s", brs: "br s", bs: "br s", "br. s": "br s", "br": "br s", "br. s.": "br s",
};

// normalizeMultiplicity returns the normal code for a journal multiplicity
// ("dd", "br s", "quint", ...) or "" when it is not one.
export function normalizeMultiplicity(raw) {
  const m = raw.trim().toLowerCase().replace(/\s+/g, " ");
  if (m in MULT_ALIASES) return MULT_ALIASES[m];
  if (/^[dtq]{2,4}$/.test(m)) return m; // dd, dt, td, ddd, tt, dq, qd, ...
  return "";
}

// splitTop splits s at commas that are not inside parentheses, keeping the
// offset of each part.
function splitTop(s, base) {
  const parts = [];
  let depth = 0, start = 0;
  for (let i = 0; i <= s.length; i++) {
    const c = s[i];
    if (c === "(") depth++;
    else if (c === ")") depth = Math.max(0, depth - 1);
    if (i === s.length || (c === "," && depth === 0) || (c === ";" && depth === 0)) {
      parts.push({ text: s.slice(start, i), pos: base + start });
      start = i + 1;
    }
  }
  return parts;
}

const NUM = "[-−]?\\d+(?:\\.\\d+)?";
const HEADER_RE = /^\s*(?:1H|¹H|H)?\s*NMR\s*(?:\(([^)]*)\))?\s*[:,]?\s*(?:δ|delta|d)?\s*(?:[(]?ppm[)]?)?\s*[:=]?\s*/i;
const PEAK_RE = new RegExp(`^\\s*(${NUM})(?:\\s*[–—-]\\s*(${NUM}))?\\s*(?:\\(([^)]*)\\))?\\s*$`);

function num(s) { return parseFloat(s.replace("−", "-")); }

// parsePeaks reads journal text such as
//   1H NMR (400 MHz, CDCl3) δ 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 7.35–7.20 (m, 5H)
// The header is optional. It returns {mhz, solvent, rows: [{shift, mult, j,
// integral}]} with the row fields as the table shows them (strings), or
// {error, pos, token} naming the first thing it cannot read.
export function parsePeaks(text) {
  let s = text.replace(/\s+$/, "");
  let base = 0, mhz = "", solvent = "";
  const h = HEADER_RE.exec(s);
  if (h && h[0].trim() !== "" && /NMR/i.test(h[0])) {
    if (h[1]) {
      for (const part of h[1].split(",")) {
        const p = part.trim();
        const f = /^(\d+(?:\.\d+)?)\s*MHz$/i.exec(p);
        if (f) mhz = f[1];
        else if (p) solvent = p;
      }
    }
    base = h[0].length;
  }
  let body = s.slice(base);
  if (body.endsWith(".")) body = body.slice(0, -1);
  const rows = [];
  if (body.trim() === "") return { mhz, solvent, rows };
  for (const part of splitTop(body, base)) {
    if (part.text.trim() === "") {
      return { error: "empty entry between commas", pos: part.pos, token: "," };
    }
    const m = PEAK_RE.exec(part.text);
    if (!m) {
      return { error: "expected a shift such as 4.12 or a range such as 7.35–7.20, then (multiplicity, J = … Hz, nH)", pos: part.pos + (part.text.length - part.text.trimStart().length), token: part.text.trim() };
    }
    const row = { shift: m[1].replace("−", "-"), mult: "", j: "", integral: "" };
    if (m[2] !== undefined) row.shift = `${m[1]}–${m[2]}`.replace(/−/g, "-");
    const inner = m[3] || "";
    const innerPos = part.pos + part.text.indexOf("(") + 1;
    let rest = inner;
    const jm = /J\s*=?\s*((?:\d+(?:\.\d+)?\s*(?:,|and|&)?\s*)+)\s*Hz/i.exec(rest);
    if (jm) {
      row.j = jm[1].split(/\s*(?:,|and|&)\s*/).map((x) => x.trim()).filter(Boolean).join(", ");
      rest = rest.replace(jm[0], "");
    }
    const im = /(\d+(?:\.\d+)?)\s*H\b/.exec(rest);
    if (im) {
      row.integral = im[1];
      rest = rest.replace(im[0], "");
    }
    const multText = rest.replace(/,/g, " ").trim();
    if (multText !== "") {
      const mult = normalizeMultiplicity(multText);
      if (!mult) {
        const at = inner.indexOf(multText.split(" ")[0]);
        return { error: "unknown multiplicity", pos: innerPos + Math.max(0, at), token: multText };
      }
      row.mult = mult;
    }
    rows.push(row);
  }
  return { mhz, solvent, rows };
}

// formatPeaks writes table rows back as journal text (no header; the
// frequency and solvent travel in their own fields).
export function formatPeaks(rows) {
  return rows
    .filter((r) => r.shift.trim() !== "")
    .map((r) => {
      const bits = [];
      if (r.mult.trim()) bits.push(r.mult.trim());
      const j = r.j.split(/[,\s]+/).filter(Boolean);
      if (j.length) bits.push(`J = ${j.join(", ")} Hz`);
      if (r.integral.trim()) bits.push(`${r.integral.trim()}H`);
      const shift = r.shift.trim().replace(/\s*[–—]\s*|\s+-\s*/g, "–");
      return bits.length ? `${shift} (${bits.join(", ")})` : shift;
    })
    .join(", ");
}

// checkRow returns a message for the first problem in one table row, or "".
export function checkRow(r) {
  const shift = r.shift.trim();
  if (shift === "") return "";
  if (!new RegExp(`^${NUM}(?:\\s*[–—-]\\s*${NUM})?$`).test(shift)) return "δ must be a number (4.12) or a range (7.35–7.20)";
  if (r.mult.trim() && !normalizeMultiplicity(r.mult)) return `unknown multiplicity “${r.mult.trim()}”`;
  if (r.j.trim() && !/^\d+(?:\.\d+)?(?:[,\s]+\d+(?:\.\d+)?)*$/.test(r.j.trim())) return "J values are numbers in Hz, separated by commas";
  if (r.integral.trim() && !/^\d+(?:\.\d+)?$/.test(r.integral.trim())) return "integral must be a positive number";
  return "";
}

// DEPT classes as written after a 13C shift, mapped to the normal form.
const DEPT_WORDS = { ch3: "CH3", ch2: "CH2", ch: "CH", c: "C", cq: "C", "c_q": "C", quaternary: "C" };

// parseCarbonText reads a 13C list for live feedback and for the plot when
// the service's result does not carry the list: shifts (or ranges)
// separated by commas, each optionally followed by "(2C, CH)"; a leading
// header up to "δ" or the first number is passed over. It returns
// {peaks: [{index, shift, hi, lo, count, dept}]} or {error, pos, token}.
// The service reads the list again; its reading is the one that counts.
export function parseCarbonText(text) {
  let base = 0;
  const d = /δ\s*(?:C\b)?|delta\s*(?:C\b)?/i.exec(text);
  if (d && !text.slice(0, d.index).replace(/\([^)]*\)/g, "").includes(",")) base = d.index + d[0].length;
  else if (/^\s*(?:13C|¹³C|\^13C)/i.test(text)) {
    const h = /^[^\d]*(?:13C|¹³C)[^(\d]*(?:\([^)]*\))?[\s:]*/i.exec(text);
    base = h ? h[0].length : 0;
  }
  const s = text.slice(base);
  const peaks = [];
  for (const part of splitTop(s.replace(/\.\s*$/, ""), base)) {
    const t = part.text.trim().replace(/^[:\s]+/, "");
    if (t === "") continue;
    const m = new RegExp(`^(${NUM})(?:\\s*[–—-]\\s*(${NUM}))?\\s*(?:ppm)?\\s*(?:\\((.*)\\))?$`).exec(t);
    if (!m) {
      return { error: "expected a shift such as 171.1, optionally followed by (2C, CH)", pos: part.pos + (part.text.length - part.text.trimStart().length), token: t.slice(0, 30) };
    }
    const a = parseFloat(m[1].replace("−", "-")), b = m[2] !== undefined ? parseFloat(m[2].replace("−", "-")) : a;
    const p = { index: peaks.length, shift: (a + b) / 2, hi: Math.max(a, b), lo: Math.min(a, b), count: 0, dept: "" };
    for (const item of (m[3] || "").split(/[,;]/).map((x) => x.trim()).filter(Boolean)) {
      const cm = /^(\d+)\s*C$/i.exec(item);
      if (cm) { p.count = Number(cm[1]); continue; }
      const both = /^(\d+)\s*[×x]\s*(C[Hq]?\d?)$/i.exec(item);
      if (both && DEPT_WORDS[both[2].toLowerCase()]) { p.count = Number(both[1]); p.dept = DEPT_WORDS[both[2].toLowerCase()]; continue; }
      const d = DEPT_WORDS[item.toLowerCase().replace(/[₂₃]/g, (c) => (c === "₂" ? "2" : "3"))];
      if (d) p.dept = d;
    }
    peaks.push(p);
  }
  if (!peaks.length) return { error: "no 13C shifts found", pos: 0, token: "" };
  return { peaks };
}
