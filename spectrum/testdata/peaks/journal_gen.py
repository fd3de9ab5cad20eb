# Generates spectrum/testdata/peaks/journal.json: positions computed here, independently of the Go parser.
import json
cases = []
def ok(name, inp, mhz=0, solvent="", peaks=(), source=""):
    cases.append({"name": name, "source": source, "input": inp, "want": {"mhz": mhz, "solvent": solvent, "peaks": list(peaks)}})
def bad(name, inp, token, field, occurrence=1, msg="", pos=None):
    b = inp.encode()
    t = token.encode()
    if pos is None:
        pos = -1
        for _ in range(occurrence):
            pos = b.index(t, pos + 1)
    line = b[:pos].count(b"\n") + 1
    cases.append({"name": name, "input": inp, "err": {"pos": pos, "line": line, "token": token, "field": field, "msg": msg}})
def lists(name, inp, ls, source=""):
    cases.append({"name": name, "source": source, "input": inp, "lists": ls})
def L(nucleus, peaks, mhz=0, solvent=""):
    d = {"mhz": mhz, "solvent": solvent, "peaks": list(peaks)}
    if nucleus != "1H": d["nucleus"] = nucleus
    return d
def C(shift=None, rng=None, m="", j=None, count=0, dept="", label=""):
    d = P(shift, rng, m, j, 0, label)
    if count: d["count"] = count
    if dept: d["dept"] = dept
    return d
def P(shift=None, rng=None, m="", j=None, i=0, label="", app=False):
    d = {}
    if shift is not None: d["shift"] = shift
    if rng is not None: d["range"] = rng
    if m: d["multiplicity"] = m
    if app: d["apparent"] = True
    if j: d["j"] = j
    if i: d["integral"] = i
    if label: d["label"] = label
    return d

GOT = "Gottlieb, Kotlyar, Nudelman, J. Org. Chem. 1997, 62, 7512, Table 1 (from memory)"
EA = [P(4.12, m="q", j=[7.1], i=2), P(2.05, m="s", i=3), P(1.26, m="t", j=[7.1], i=3)]
ok("ethyl acetate, full header", "1H NMR (400 MHz, CDCl3) δ 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H).", 400, "CDCl3", EA, GOT)
ok("header solvent first, colon", "1H NMR (CDCl3, 400 MHz): δ 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H)", 400, "CDCl3", EA, GOT)
ok("no header", "4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H)", 0, "", EA, GOT)
ok("delta H, field outside parentheses", "δH 500 MHz, CDCl3: 4.12 (q, J = 7.1 Hz, 2H); 2.05 (s, 3H); 1.26 (t, J = 7.1 Hz, 3H);", 500, "CDCl3", EA, GOT)
ok("delta (ppm)", "1H NMR (CDCl3) δ (ppm): 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H)", 0, "CDCl3", EA, GOT)
ok("integral first, J without =", "δ 4.12 (2H, q, J 7.1 Hz), 2.05 (3H, s), 1.26 (3H, t, J 7.1 Hz)", 0, "", EA, GOT)
ok("newlines and odd spacing", "1H NMR\n(400MHz , CDCl3)\nδ\n4.12  (q,J=7.1Hz,2H)\n2.05(s,3H)\n1.26 ( t , J = 7.1 Hz , 3 H )\n", 400, "CDCl3", EA, GOT)
ok("superscript nucleus, chloroform-d", "¹H NMR (400 MHz, chloroform-d) δ 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H)", 400, "CDCl3", EA, GOT)
ok("ethyl acetate in DMSO-d6, [D6]DMSO", "1H NMR ([D6]DMSO, 400 MHz) δ 4.03 (q, J = 7.1 Hz, 2H), 1.99 (s, 3H), 1.17 (t, J = 7.1 Hz, 3H)", 400, "DMSO-d6",
   [P(4.03, m="q", j=[7.1], i=2), P(1.99, m="s", i=3), P(1.17, m="t", j=[7.1], i=3)], GOT)
ok("d6-DMSO spelling", "1H NMR (d6-DMSO, 300 MHz) δ 2.05 (s, 3H)", 300, "DMSO-d6", [P(2.05, m="s", i=3)])
ok("acetone-d6", "1H NMR (acetone-d6) δ 2.05 (s, 3H)", 0, "acetone-d6", [P(2.05, m="s", i=3)])
ok("methanol-d4", "1H NMR (600 MHz, methanol-d4) δ 2.05 (s, 3H)", 600, "CD3OD", [P(2.05, m="s", i=3)])
ok("CD3OD", "1H NMR (CD3OD) δ 2.05 (s, 3H)", 0, "CD3OD", [P(2.05, m="s", i=3)])
ok("D2O", "1H NMR (D2O) δ 2.05 (s, 3H)", 0, "D2O", [P(2.05, m="s", i=3)])
ok("C6D6 / benzene-d6", "1H NMR (benzene-d6, 400 MHz) δ 2.05 (s, 3H)", 400, "C6D6", [P(2.05, m="s", i=3)])
ok("CD3CN", "1H NMR (CD3CN) δ 2.05 (s, 3H)", 0, "CD3CN", [P(2.05, m="s", i=3)])
ok("CD2Cl2", "1H NMR (400 MHz, CD2Cl2) δ 2.05 (s, 3H)", 400, "CD2Cl2", [P(2.05, m="s", i=3)])
ok("subscript digits", "1H NMR (400 MHz, CDCl₃) δ 2.05 (s, 3H)", 400, "CDCl3", [P(2.05, m="s", i=3)])
ok("temperature in header ignored", "1H NMR (400 MHz, CDCl3, 298 K) δ 2.05 (s, 3H)", 400, "CDCl3", [P(2.05, m="s", i=3)])
ok("range en dash, high first", "δ 7.35–7.20 (m, 5H)", peaks=[P(rng=[7.35, 7.20], m="m", i=5)])
ok("range hyphen, low first", "δ 7.20-7.35 (m, 5H)", peaks=[P(rng=[7.35, 7.20], m="m", i=5)])
ok("range minus sign with spaces", "δ 7.35 − 7.20 (m, 5H)", peaks=[P(rng=[7.35, 7.20], m="m", i=5)])
ok("range em dash", "δ 7.35—7.20 (m, 5H)", peaks=[P(rng=[7.35, 7.20], m="m", i=5)])
ok("negative shift (silyl)", "δ 0.06 (s, 9H), -0.02 (s, 6H)", peaks=[P(0.06, m="s", i=9), P(-0.02, m="s", i=6)])
ok("broad singlet spellings", "δ 5.1 (br s, 1H), 5.2 (brs, 1H), 5.3 (bs, 1H), 5.4 (br, 1H), 5.5 (br. s, 1H), 5.6 (broad s, 1H), 5.7 (s, br, 1H)",
   peaks=[P(x, m="br s", i=1) for x in (5.1, 5.2, 5.3, 5.4, 5.5, 5.6, 5.7)])
ok("broad doublet", "δ 6.1 (br d, J = 7.5 Hz, 1H)", peaks=[P(6.1, m="br d", j=[7.5], i=1)])
ok("compound multiplicities", "δ 7.80 (dd, J = 8.0, 2.1 Hz, 1H), 7.10 (td, J = 7.6 and 1.2 Hz, 1H), 6.90 (ddd, J = 8.1, 7.4, 1.0 Hz, 1H), 5.80 (dt, J1 = 15.6 Hz, J2 = 6.8 Hz, 1H), 5.50 (dq, J = 15.3, 6.5 Hz, 1H), 2.40 (qd, J = 7.3, 2.0 Hz, 2H), 1.90 (tt, J = 7.0, 3.1 Hz, 1H)",
   peaks=[P(7.80, m="dd", j=[8.0, 2.1], i=1), P(7.10, m="td", j=[7.6, 1.2], i=1), P(6.90, m="ddd", j=[8.1, 7.4, 1.0], i=1),
          P(5.80, m="dt", j=[15.6, 6.8], i=1), P(5.50, m="dq", j=[15.3, 6.5], i=1), P(2.40, m="qd", j=[7.3, 2.0], i=2), P(1.90, m="tt", j=[7.0, 3.1], i=1)])
ok("J with Hz after each value", "δ 7.80 (dd, J = 8.0 Hz, 2.1 Hz, 1H)", peaks=[P(7.80, m="dd", j=[8.0, 2.1], i=1)])
ok("3J label", "δ 1.26 (t, 3J = 7.1 Hz, 3H)", peaks=[P(1.26, m="t", j=[7.1], i=3)])
ok("JHH label", "δ 1.26 (t, JHH = 7.1 Hz, 3H)", peaks=[P(1.26, m="t", j=[7.1], i=3)])
ok("quintet spellings", "δ 1.6 (quint, J = 7.4 Hz, 2H), 1.7 (p, J = 7.4 Hz, 2H), 1.8 (quin, 2H), 1.9 (pent, 2H)",
   peaks=[P(1.6, m="quint", j=[7.4], i=2), P(1.7, m="quint", j=[7.4], i=2), P(1.8, m="quint", i=2), P(1.9, m="quint", i=2)])
ok("sextet and septet", "δ 1.55 (sext, J = 7.4 Hz, 2H), 2.55 (sept, J = 6.9 Hz, 1H), 2.60 (hept, J = 6.9 Hz, 1H)",
   peaks=[P(1.55, m="sext", j=[7.4], i=2), P(2.55, m="sept", j=[6.9], i=1), P(2.60, m="sept", j=[6.9], i=1)])
ok("apparent", "δ 7.25 (app t, J = 7.8 Hz, 1H), 7.15 (apparent d, J = 8.0 Hz, 2H), 6.95 (pseudo-t, 1H)",
   peaks=[P(7.25, m="t", app=True, j=[7.8], i=1), P(7.15, m="d", app=True, j=[8.0], i=2), P(6.95, m="t", app=True, i=1)])
ok("multiplet without J, J on m is allowed", "δ 3.5 (m, 1H), 3.6 (m, J = 7 Hz, 1H)", peaks=[P(3.5, m="m", i=1), P(3.6, m="m", j=[7], i=1)])
ok("fractional and spaced integrals", "δ 7.26 (m, 2.04H), 3.70 (s, 2 H), 1.20 (t, 3.1H), 1.0 (d, .97 H)",
   peaks=[P(7.26, m="m", i=2.04), P(3.70, m="s", i=2), P(1.20, m="t", i=3.1), P(1.0, m="d", i=0.97)])
ok("assignment labels kept", "δ 4.12 (q, J = 7.1 Hz, 2H, OCH2), 2.05 (s, 3H, C(O)CH3), 1.26 (t, J = 7.1 Hz, 3H, CH3)",
   peaks=[P(4.12, m="q", j=[7.1], i=2, label="OCH2"), P(2.05, m="s", i=3, label="C(O)CH3"), P(1.26, m="t", j=[7.1], i=3, label="CH3")])
ok("peak without description", "δ 7.26, 2.05 (s)", peaks=[P(7.26), P(2.05, m="s")])
ok("full-word multiplicities", "δ 7.80 (doublet of doublets, J = 8.0, 2.1 Hz, 1H), 1.26 (triplet, 3H), 2.05 (singlet, 3H)",
   peaks=[P(7.80, m="dd", j=[8.0, 2.1], i=1), P(1.26, m="t", i=3), P(2.05, m="s", i=3)])
ok("AB quartet read as multiplet", "δ 4.55 (ABq, J = 12.0 Hz, 2H)", peaks=[P(4.55, m="m", j=[12.0], i=2)])
lists("1H and 13C sections", "1H NMR (400 MHz, CDCl3) δ 2.05 (s, 3H); 13C NMR (101 MHz, CDCl3) δ 171.1, 21.0.",
      [L("1H", [P(2.05, m="s", i=3)], 400, "CDCl3"), L("13C", [C(171.1), C(21.0)], 101, "CDCl3")])
ok("following HRMS ends the list", "δ 2.05 (s, 3H). HRMS (ESI) m/z calcd for C4H8O2", peaks=[P(2.05, m="s", i=3)])
ok("ppm after the list", "δ 2.05 (s, 3H), 1.26 (t, 3H) ppm.", peaks=[P(2.05, m="s", i=3), P(1.26, m="t", i=3)])
ok("ppm after shift", "δ 2.05 ppm (s, 3H)", peaks=[P(2.05, m="s", i=3)])
ok("non-breaking and thin spaces", "δ\u00a04.12\u2009(q, J\u00a0=\u00a07.1\u00a0Hz, 2H)", peaks=[P(4.12, m="q", j=[7.1], i=2)])

ok("labels with digits and commas", "δ 7.10 (d, J = 8.5 Hz, 2H, H-2,6), 1.20 (s, 6H, 2 × CH3), 6.80 (d, J = 8.5 Hz, 3-H)",
   peaks=[P(7.10, m="d", j=[8.5], i=2, label="H-2, 6"), P(1.20, m="s", i=6, label="2 × CH3"), P(6.80, m="d", j=[8.5], label="3-H")])
ok("J without J =", "δ 7.80 (dd, 8.0, 2.1 Hz, 1H), 1.26 (t, 7.1 Hz, 3H)", peaks=[P(7.80, m="dd", j=[8.0, 2.1], i=1), P(1.26, m="t", j=[7.1], i=3)])

ok("full-width punctuation", "1H NMR（400 MHz，CDCl3）δ 4.12（q，J ＝ 7.1 Hz，2H），2.05（s，3H）", 400, "CDCl3",
   [P(4.12, m="q", j=[7.1], i=2), P(2.05, m="s", i=3)])
bad("full-width, error position in the original", "δ 4.12（q，2H），2.05（x，3H）", "x", "multiplicity")
ok("byte-order mark", "\ufeff1H NMR δ 2.05 (s, 3H)", peaks=[P(2.05, m="s", i=3)])
ok("delta lost to a symbol font", "1H NMR (400 MHz, CDCl3) d 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H)", 400, "CDCl3",
   [P(4.12, m="q", j=[7.1], i=2), P(2.05, m="s", i=3)])
ok("delta lost, no header", "d 2.05 (s, 3H)", peaks=[P(2.05, m="s", i=3)])
ok("mathematical delta and J", "𝛿 4.12 (q, 𝐽 = 7.1 Hz, 2H)", peaks=[P(4.12, m="q", j=[7.1], i=2)])
bad("JCAMP-DX given as journal text", "\n##TITLE= x", "##TITLE=", "")
bad("JSON given as journal text", " [{\"shift\": 1}]", "[", "")
bad("decimal comma", "δ 4,12 (q, 2H)", "4,1", "shift")
bad("malformed integral", "δ 4.12 (q, 2.0.4H)", "2.0.4H", "integral")
bad("unknown multiplicity", "1H NMR (400 MHz, CDCl3) δ 4.12 (x, 2H)", "x", "multiplicity")
bad("unknown multiplicity word", "δ 4.12 (qx, J = 7.1 Hz, 2H)", "qx", "multiplicity")
bad("shift above 16 ppm", "δ 4.12 (q, 2H), 17.5 (s, 1H)", "17.5", "shift")
bad("shift below -1 ppm", "δ -1.5 (s, 1H)", "-1.5", "shift")
bad("range end out of range", "δ 7.35–27.20 (m, 5H)", "27.20", "shift")
bad("negative integral", "δ 2.05 (s, -3H)", "-3H", "integral")
bad("zero integral", "δ 2.05 (s, 0H)", "0H", "integral")
bad("J on a singlet", "δ 4.12 (q, 2H), 2.05 (s, J = 7.1 Hz, 3H)", "J = 7.1 Hz", "j")
bad("J on a broad singlet", "δ 2.05 (br s, J = 7.1 Hz, 1H)", "J = 7.1 Hz", "j")
bad("malformed shift", "δ 4.12 (q, 2H), 2.0.5 (s, 3H)", "2.0.5", "shift")
bad("malformed J", "δ 4.12 (q, J = 7.x Hz, 2H)", "7.x", "j")
bad("J out of range", "δ 4.12 (q, J = 170 Hz, 2H)", "170", "j")
bad("unclosed parenthesis", "δ 4.12 (q, J = 7.1 Hz, 2H, 2.05 (s, 3H)", "(q", "peak")
bad("no peaks", "1H NMR (400 MHz, CDCl3) δ", "", "shift", pos=len("1H NMR (400 MHz, CDCl3) δ".encode()))
bad("garbage", "hello world", "hello", "shift")
bad("two multiplicities", "δ 4.12 (q, t, 2H)", "t", "multiplicity", occurrence=1)
bad("two integrals", "δ 4.12 (q, 2H, 3H)", "3H", "integral")
bad("missing comma", "δ 4.12 (q, 2H) x 2.05 (s, 3H)", "x", "")
bad("text after the final period", "δ 4.12 (q, 2H). and more", "and", "")
bad("field out of range", "1H NMR (4000 MHz) δ 2.05 (s)", "4000 MHz", "mhz")
bad("bare number item", "δ 4.12 (q, 2H, 2)", "2", "integral", occurrence=3)
bad("bare number after a singlet", "δ 4.12 (s, 3)", "3", "integral")

# 13C lists. Ethyl acetate and toluene in CDCl3: Gottlieb, Kotlyar, Nudelman,
# J. Org. Chem. 1997, 62, 7512, Table 2 (from memory).
GOT13 = "Gottlieb, Kotlyar, Nudelman, J. Org. Chem. 1997, 62, 7512, Table 2 (from memory)"
EA13 = [C(171.36), C(60.49), C(21.04), C(14.19)]
lists("13C list alone", "13C NMR (101 MHz, CDCl3) δ 171.36, 60.49, 21.04, 14.19", [L("13C", EA13, 101, "CDCl3")], GOT13)
lists("13C{1H} header, DEPT classes, final period", "13C{1H} NMR (126 MHz, CDCl3) δ 171.36 (C), 60.49 (CH2), 21.04 (CH3), 14.19 (CH3).",
      [L("13C", [C(171.36, dept="C"), C(60.49, dept="CH2"), C(21.04, dept="CH3"), C(14.19, dept="CH3")], 126, "CDCl3")], GOT13)
lists("superscripts, hyphen, counts and classes", "¹³C-NMR (CDCl3): δ 137.89 (Cq), 129.07 (2 × CH), 128.26 (2C, CH), 125.33 (CH), 21.46 (CH3)",
      [L("13C", [C(137.89, dept="C"), C(129.07, count=2, dept="CH"), C(128.26, count=2, dept="CH"), C(125.33, dept="CH"), C(21.46, dept="CH3")], 0, "CDCl3")], GOT13)
lists("count spellings", "13C NMR δ 129.07 (2 C), 128.26 (CH, 2C), 125.33 (1C), 128.5 (CH × 2), 127.9 (3CH)",
      [L("13C", [C(129.07, count=2), C(128.26, count=2, dept="CH"), C(125.33, count=1), C(128.5, count=2, dept="CH"), C(127.9, count=3, dept="CH")])])
lists("class spellings", "13C NMR δ 171.4 (quaternary), 137.9 (C_q), 21.5 (CH₃), 60.5 (CH₂)",
      [L("13C", [C(171.4, dept="C"), C(137.9, dept="C"), C(21.5, dept="CH3"), C(60.5, dept="CH2")])])
lists("labels in a 13C list", "13C NMR δ 171.4 (C=O), 60.5 (OCH2, CH2), 14.2 (C-2)",
      [L("13C", [C(171.4, label="C=O"), C(60.5, dept="CH2", label="OCH2"), C(14.2, label="C-2")])])
# Fluorobenzene-like C–F doublets: notation example (1J(C,F) about 245 Hz and
# 2J about 21 Hz are common practice; Pretsch et al., from memory).
lists("C–F couplings in a 13C list", "13C NMR (101 MHz, CDCl3) δ 162.9 (d, J = 245.3 Hz, C), 115.4 (d, JC–F = 21.2 Hz, 2C, CH)",
      [L("13C", [C(162.9, m="d", j=[245.3], dept="C"), C(115.4, m="d", j=[21.2], count=2, dept="CH")], 101, "CDCl3")])
lists("delta C header", "δC (CDCl3) 171.4, 60.5", [L("13C", [C(171.4), C(60.5)], 0, "CDCl3")])
lists("delta H then delta C", "δH (CDCl3) 2.05 (s, 3H); δC 171.4, 21.0",
      [L("1H", [P(2.05, m="s", i=3)], 0, "CDCl3"), L("13C", [C(171.4), C(21.0)])])
lists("1H, 13C and HRMS", "1H NMR (400 MHz, CDCl3) δ 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H); 13C NMR (101 MHz, CDCl3) δ 171.36, 60.49, 21.04, 14.19; HRMS (ESI) calcd for C4H9O2 [M+H]+ 89.0597, found 89.0598.",
      [L("1H", EA, 400, "CDCl3"), L("13C", EA13, 101, "CDCl3")], GOT13)
lists("sections on separate lines", "1H NMR (400 MHz, CDCl3) δ 2.05 (s, 3H)\n13C NMR (101 MHz, CDCl3) δ 171.1, 21.0\n",
      [L("1H", [P(2.05, m="s", i=3)], 400, "CDCl3"), L("13C", [C(171.1), C(21.0)], 101, "CDCl3")])
lists("19F section skipped", "1H NMR (400 MHz, CDCl3) δ 7.05 (m, 4H); 19F NMR (376 MHz, CDCl3) δ −117.5 (m, 1F); 13C NMR (101 MHz, CDCl3) δ 162.9 (d, J = 245 Hz)",
      [L("1H", [P(7.05, m="m", i=4)], 400, "CDCl3"), L("13C", [C(162.9, m="d", j=[245])], 101, "CDCl3")])
lists("two 1H lists", "1H NMR (CDCl3) δ 2.05 (s, 3H); 1H NMR (DMSO-d6) δ 1.99 (s, 3H)",
      [L("1H", [P(2.05, m="s", i=3)], 0, "CDCl3"), L("1H", [P(1.99, m="s", i=3)], 0, "DMSO-d6")])
lists("iodomethane-range 13C shift", "13C NMR δ -20.7", [L("13C", [C(-20.7)])])
bad("13C shift out of range", "13C NMR δ 171.4, 270.5", "270.5", "shift")
bad("13C shift too low", "13C NMR δ 171.4, -70", "-70", "shift")
bad("13C list without header", "δ 171.4, 60.5", "171.4", "shift")
bad("integral in a 13C list", "13C NMR δ 171.4 (2H)", "2H", "integral")
bad("zero count", "13C NMR δ 128.5 (0C)", "0C", "count")
bad("fractional count", "13C NMR δ 128.5 (1.5C)", "1.5C", "count")
bad("two counts", "13C NMR δ 128.5 (2C, 3C)", "3C", "count", occurrence=2)
bad("two DEPT classes", "13C NMR δ 128.5 (CH, CH2)", "CH2", "dept")
bad("bare number in a 13C list", "13C NMR δ 128.5 (2)", "2", "count", occurrence=2)
bad("J above the 13C limit", "13C NMR δ 120.1 (d, J = 450 Hz)", "450", "j")
bad("empty 13C section", "1H NMR δ 2.05 (s, 3H); 13C NMR (101 MHz, CDCl3) δ", "", "shift", pos=len("1H NMR δ 2.05 (s, 3H); 13C NMR (101 MHz, CDCl3) δ".encode()))
bad("error on the second line", "1H NMR δ 2.05 (s, 3H)\n13C NMR δ 171.4 (xq)", "xq", "multiplicity")
bad("unclosed brace in a header", "13C{1H NMR δ 171.4", "{", "header")
print(json.dumps(cases, ensure_ascii=False, indent=1))
