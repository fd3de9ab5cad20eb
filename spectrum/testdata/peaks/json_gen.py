# Generates spectrum/testdata/peaks/json.json (format tests; invented values).
import json
cases = []
def ok(name, inp, mhz=0, solvent="", peaks=()):
    cases.append({"name": name, "input": inp, "want": {"mhz": mhz, "solvent": solvent, "peaks": list(peaks)}})
def lists(name, inp, ls):
    cases.append({"name": name, "input": inp, "lists": ls})
def bad(name, inp, token, field, occurrence=1, pos=None):
    b = inp.encode()
    if pos is None:
        pos = -1
        for _ in range(occurrence):
            pos = b.index(token.encode(), pos + 1)
    cases.append({"name": name, "input": inp, "err": {"pos": pos, "token": token, "field": field}})
ok("array form", '[{"shift": 4.12, "multiplicity": "q", "j": [7.1], "integral": 2}, {"range": [7.35, 7.20], "multiplicity": "m", "integral": 5}]',
   peaks=[{"shift": 4.12, "multiplicity": "q", "j": [7.1], "integral": 2}, {"range": [7.35, 7.20], "multiplicity": "m", "integral": 5}])
ok("object form", '{"mhz": 400, "solvent": "chloroform-d", "peaks": [{"shift": 2.05, "multiplicity": "s", "integral": 3}]}',
   400, "CDCl3", [{"shift": 2.05, "multiplicity": "s", "integral": 3}])
ok("spellings normalised", '[{"shift": 5.1, "multiplicity": "brs"}, {"shift": 7.2, "multiplicity": "app t", "j": [7.8]}, {"range": [1.2, 1.4], "multiplicity": "p", "label": "CH2"}]',
   peaks=[{"shift": 5.1, "multiplicity": "br s"}, {"shift": 7.2, "multiplicity": "t", "apparent": True, "j": [7.8]}, {"range": [1.4, 1.2], "multiplicity": "quint", "label": "CH2"}])
ok("fractional integral, no multiplicity", '[{"shift": 3.3, "integral": 0.97}]', peaks=[{"shift": 3.3, "integral": 0.97}])
bad("unknown field", '[{"shift": 4.12, "colour": "q"}]', "colour", "[0].colour")
bad("unknown top-level field", '{"peaks": [{"shift": 1}], "colour": "red"}', "colour", "colour")
bad("repeated field", '[{"shift": 4.12, "shift": 4.2}]', "shift", "[0].shift", occurrence=2)
bad("J on a singlet", '[{"shift": 2.05, "multiplicity": "s", "j": [7]}]', "j", "[0].j")
bad("unknown multiplicity", '[{"shift": 4.12, "multiplicity": "xx"}]', "xx", "[0].multiplicity")
bad("shift out of range", '[{"shift": 2.0}, {"shift": 40.12}]', "40.12", "[1].shift")
bad("range out of range", '[{"range": [7.3, -3]}]', "-3", "[0].range")
bad("range of one value", '[{"range": [7.3]}]', "range", "[0].range")
bad("shift and range", '[{"shift": 7.3, "range": [7.3, 7.2]}]', "range", "[0].range")
bad("missing shift", '[{"multiplicity": "s"}]', "{", "[0].shift", occurrence=1)
bad("negative integral", '[{"shift": 2.0, "integral": -1}]', "-1", "[0].integral")
bad("J out of range", '[{"shift": 2.0, "multiplicity": "d", "j": [0]}]', "0", "[0].j", occurrence=1, pos='[{"shift": 2.0, "multiplicity": "d", "j": [0]}]'.index("[0]") + 1)
bad("string shift", '{"peaks": [{"shift": "4.12"}]}', '"4.12"', "peaks[0].shift")
bad("syntax error", '[{"shift": 4.12,}]', "}]", "[0]")
bad("trailing data", '[{"shift": 4.12}] x', "x", "")
bad("empty", '[]', "[]", "peaks", pos=0)
bad("unknown solvent", '{"solvent": "CCl4", "peaks": [{"shift": 1}]}', "CCl4", "solvent")
bad("missing peaks", '{"mhz": 400}', "{", "peaks")

# 13C lists and several lists.
lists("13C list object", '{"nucleus": "13C", "mhz": 101, "solvent": "CDCl3", "peaks": [{"shift": 129.3, "dept": "CH", "count": 2}, {"shift": 171.2, "dept": "C"}, {"shift": 21.4, "dept": "CH3"}]}',
      [{"nucleus": "13C", "mhz": 101, "solvent": "CDCl3", "peaks": [{"shift": 129.3, "dept": "CH", "count": 2}, {"shift": 171.2, "dept": "C"}, {"shift": 21.4, "dept": "CH3"}]}])
lists("nucleus after the peaks", '{"peaks": [{"shift": 171.2}], "nucleus": "13C"}',
      [{"nucleus": "13C", "mhz": 0, "solvent": "", "peaks": [{"shift": 171.2}]}])
lists("explicit 1H nucleus", '{"nucleus": "1H", "peaks": [{"shift": 1}]}', [{"mhz": 0, "solvent": "", "peaks": [{"shift": 1}]}])
lists("array of lists", '[{"mhz": 400, "peaks": [{"shift": 2.05, "multiplicity": "s", "integral": 3}]}, {"nucleus": "13C", "mhz": 101, "peaks": [{"shift": 171.2, "dept": "Cq"}, {"shift": 162.9, "multiplicity": "d", "j": [245.3]}]}]',
      [{"mhz": 400, "solvent": "", "peaks": [{"shift": 2.05, "multiplicity": "s", "integral": 3}]},
       {"nucleus": "13C", "mhz": 101, "solvent": "", "peaks": [{"shift": 171.2, "dept": "C"}, {"shift": 162.9, "multiplicity": "d", "j": [245.3]}]}])
bad("13C shift out of range", '{"nucleus": "13C", "peaks": [{"shift": 129.3}, {"shift": 300}]}', "300", "peaks[1].shift")
bad("13C range out of range, nucleus last", '{"peaks": [{"range": [130, 270]}], "nucleus": "13C"}', "270", "peaks[0].range")
bad("1H shift in a 13C range", '[{"shift": 129.3}]', "129.3", "[0].shift")
bad("integral in a 13C list", '{"nucleus": "13C", "peaks": [{"shift": 129.3, "integral": 2}]}', "2", "peaks[0].integral", occurrence=2)
bad("count in a 1H list", '[{"shift": 7.3, "count": 2}]', "2", "[0].count")
bad("dept in a 1H list", '[{"shift": 7.3, "dept": "CH"}]', "CH", "[0].dept")
bad("unknown DEPT class", '{"nucleus": "13C", "peaks": [{"shift": 129.3, "dept": "CH4"}]}', "CH4", "peaks[0].dept")
bad("fractional count", '{"nucleus": "13C", "peaks": [{"shift": 129.3, "count": 1.5}]}', "1.5", "peaks[0].count")
bad("zero count", '{"nucleus": "13C", "peaks": [{"shift": 129.3, "count": 0}]}', "0", "peaks[0].count")
bad("unknown nucleus", '{"nucleus": "19F", "peaks": [{"shift": -63}]}', "19F", "nucleus")
bad("J above the 13C limit", '{"nucleus": "13C", "peaks": [{"shift": 120, "multiplicity": "d", "j": [450]}]}', "450", "peaks[0].j")
bad("peaks and lists mixed", '[{"shift": 1}, {"peaks": [{"shift": 2}]}]', "{", "[1]", occurrence=2)
bad("list without peaks in an array", '[{"nucleus": "13C", "peaks": []}]', "[", "[0].peaks", occurrence=2)
bad("second list's peak", '[{"peaks": [{"shift": 1}]}, {"nucleus": "13C", "peaks": [{"shift": 1, "colour": 2}]}]', "colour", "[1].peaks[0].colour")
print(json.dumps(cases, ensure_ascii=False, indent=1))
