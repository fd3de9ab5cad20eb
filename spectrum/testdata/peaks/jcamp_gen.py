# Generates spectrum/testdata/peaks/jcamp.json. Expected peaks are worked out by hand in
# the comments; error positions are found here in the file bytes.
import json, os
D = os.path.dirname(os.path.abspath(__file__))
cases = []
def ok(f, mhz, solvent, peaks):
    cases.append({"name": f, "file": f, "want": {"mhz": mhz, "solvent": solvent, "peaks": peaks}})
def lists(f, ls):
    cases.append({"name": f, "file": f, "lists": ls})
def bad(f, token, field, pos=None):
    b = open(os.path.join(D, f), "rb").read()
    if pos is None:
        pos = b.index(token.encode())
    cases.append({"name": f, "file": f, "err": {"pos": pos, "token": token, "field": field}})
# q lines 1659.19..1637.89 Hz at 400.13 MHz: centre 1648.54 Hz = 4.1200 ppm, spacing 7.10 Hz;
# 820.27 Hz = 2.0500 ppm; t centre 504.16 Hz = 1.2600 ppm, spacing 7.10 Hz.
ok("ethyl-acetate-table.jdx", 400.13, "CDCl3", [
    {"shift": 4.12, "multiplicity": "q", "j": [7.1]},
    {"shift": 2.05, "multiplicity": "s"},
    {"shift": 1.26, "multiplicity": "t", "j": [7.1]}])
ok("butanone-assignments.jdx", 500.13, "DMSO-d6", [
    {"shift": 2.45, "multiplicity": "q", "label": "CH2"},
    {"shift": 2.07, "multiplicity": "s", "label": "C(O)CH3, acetyl"},
    {"shift": 0.91, "multiplicity": "t", "label": "CH2CH3"}])
# Both NMR blocks in file order; the IR block is skipped. 13C lines are peaks
# of their own, their heights not read.
lists("compound-13c-1h.jdx", [
    {"nucleus": "13C", "mhz": 100.61, "solvent": "", "peaks": [{"shift": 171.1}, {"shift": 60.4}, {"shift": 21.0}, {"shift": 14.2}]},
    {"mhz": 400.13, "solvent": "CDCl3", "peaks": [
        {"shift": 4.12, "multiplicity": "q"}, {"shift": 2.05, "multiplicity": "s"}, {"shift": 1.26, "multiplicity": "t"}]}])
lists("only-13c.jdx", [{"nucleus": "13C", "mhz": 0, "solvent": "", "peaks": [{"shift": 171.1}, {"shift": 60.4}]}])
# 17136 Hz / 100 MHz = 171.36 ppm, 17131 Hz = 171.31 ppm (5 Hz apart: two
# carbons, not grouped as a 1H multiplet would be), 6049 Hz = 60.49 ppm; no
# integral from height × width in a 13C list.
lists("carbon-hz-width.jdx", [{"nucleus": "13C", "mhz": 100.0, "solvent": "CDCl3", "peaks": [
    {"shift": 171.36}, {"shift": 171.31}, {"shift": 60.49}]}])
# Reference: X = 400 Hz is 0.00 ppm. 3304 Hz -> 7.26 ppm singlet, area 100*1.0.
# 2400/2396/2392 Hz -> 5.00/4.99/4.98 ppm, 1:2:1, spacing 4 Hz: t, J 4.0, centre 4.99, area 40.
# 1300..1311.5 Hz -> 2.25..2.27875 ppm: 5 lines, uneven spacings (2, 3, 3, 3.5 Hz): m, range, area 2*(30+28+35+25+20) = 276.
ok("referenced-hz-areas.jdx", 400.0, "CDCl3", [
    {"shift": 7.26, "multiplicity": "s", "integral": 100},
    {"shift": 4.99, "multiplicity": "t", "j": [4.0], "integral": 40},
    {"range": [2.2788, 2.25], "multiplicity": "m", "integral": 276}])
bad("spectrum-only.jdx", "", "PEAK TABLE", pos=0)
bad("hz-no-frequency.jdx", "HZ", "XUNITS")
bad("bad-multiplicity.jdx", "Z", "PEAK ASSIGNMENTS", pos=open(os.path.join(D, "bad-multiplicity.jdx"), "rb").read().index(b" Z,") + 1)
bad("missing-end.jdx", "", "END", pos=len(open(os.path.join(D, "missing-end.jdx"), "rb").read()))
bad("only-19f.jdx", "^19F", "PEAK TABLE", pos=0)
bad("carbon-out-of-range.jdx", "271.5,30", "PEAK TABLE")
bad("shift-out-of-range.jdx", "21.5,30", "PEAK TABLE")
bad("no-title.jdx", "##JCAMP-DX", "TITLE")
print(json.dumps(cases, indent=1))
