# Generates spectrum/testdata/peaks/json.json (format tests; invented values).
import json
cases = []
def ok(name, inp, mhz=0, solvent="", peaks=()):
    cases.append({"name": name, "input": inp, "want": {"mhz": mhz, "solvent": solvent, "peaks": list(peaks)}})
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
bad("unknown top-level field", '{"peaks": [{"shift": 1}], "nucleus": "1H"}', "nucleus", "nucleus")
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
print(json.dumps(cases, ensure_ascii=False, indent=1))
