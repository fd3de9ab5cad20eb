package molecule

import "testing"

func FuzzParseFormula(f *testing.F) {
	for _, s := range []string{"C4H8O2", "H8C4O2", "C6H5Cl", "CHCl3", "Xy", "co", "C0", "C4H9O", "SiH4", "C12H22O11", "CH3COOH", "C999999"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		fm, err := ParseFormulaLimit(s, 0)
		if err != nil {
			if _, ok := err.(*FormulaError); !ok {
				t.Fatalf("ParseFormula(%q) error %T, want *FormulaError", s, err)
			}
			return
		}
		back, err := ParseFormulaLimit(fm.String(), 0)
		if err != nil {
			t.Fatalf("ParseFormula(%q) = %s, which does not parse: %v", s, fm, err)
		}
		if back != fm {
			t.Fatalf("ParseFormula(%q) = %s reads back as %s", s, fm, back)
		}
	})
}

func FuzzParseSMILES(f *testing.F) {
	for _, s := range rdkitCrossCheckSMILES {
		f.Add(s)
	}
	for _, s := range []string{"C1CC", "C(C", "c1cccc1", "[nH]1cccc1", "C%10CC%10", "[CH3:2]C", "F/C=C\\F", "C.C", "[H]", "c1ccc2c(c1)-c1ccccc1-2", "C1=CC=C2C=CC=C2C=C1"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		g, err := ParseSMILES(s)
		if err != nil {
			if _, ok := err.(*SMILESError); !ok {
				t.Fatalf("ParseSMILES(%q) error %T, want *SMILESError", s, err)
			}
			return
		}
		key := Canonicalize(g).Key
		w := g.SMILES()
		g2, err := ParseSMILES(w)
		if err != nil {
			t.Fatalf("ParseSMILES(%q).SMILES() = %q does not parse: %v", s, w, err)
		}
		if Canonicalize(g2).Key != key {
			t.Fatalf("ParseSMILES(%q).SMILES() = %q reads back to a different graph", s, w)
		}
		cs := CanonicalSMILES(g)
		g3, err := ParseSMILES(cs)
		if err != nil {
			t.Fatalf("CanonicalSMILES(%q) = %q does not parse: %v", s, cs, err)
		}
		if Canonicalize(g3).Key != key {
			t.Fatalf("CanonicalSMILES(%q) = %q reads back to a different graph", s, cs)
		}
		if cs2 := CanonicalSMILES(g3); cs2 != cs {
			t.Fatalf("CanonicalSMILES(%q) = %q, but of its reading %q", s, cs, cs2)
		}
		if _, err := ParseFragment(s); err != nil {
			t.Fatalf("ParseFragment(%q): %v, but ParseSMILES accepts it", s, err)
		}
	})
}

func FuzzParseFragment(f *testing.F) {
	for _, s := range fragmentQueries {
		f.Add(s)
	}
	for _, s := range []string{"C1=CC=CC=C1", "[OH]C", "c1cc[nH]c1", "C(", "[CH0]", "S(=O)(=O)"} {
		f.Add(s)
	}
	targets := []*Graph{MustParseSMILES("CC(=O)Oc1ccccc1C(=O)O"), MustParseSMILES("c1ccc2[nH]ccc2c1"), MustParseSMILES("CS(=O)(=O)N")}
	f.Fuzz(func(t *testing.T, s string) {
		q, err := ParseFragment(s)
		if err != nil {
			if _, ok := err.(*SMILESError); !ok {
				t.Fatalf("ParseFragment(%q) error %T, want *SMILESError", s, err)
			}
			return
		}
		for _, g := range targets {
			q.Matches(g)
		}
		// A molecule contains itself, unless lowercase query atoms are not
		// aromatic in the molecule (cc reads as C=C), or a bond written
		// without a symbol between lowercase atoms is a double bond outside
		// the aromatic rings (the ring-joining bonds of
		// o3c1oc3c3ccoc3c3ccoc31): as in SMARTS, such a query bond is single
		// or aromatic, and RDKit does not find that query in the molecule
		// either.
		if g, err := ParseSMILES(s); err == nil && !q.Matches(g) {
			arom := AromaticAtoms(g)
			for i, a := range q.atomArom {
				if a && !arom[i] {
					return
				}
			}
			bonds := AromaticBonds(g)
			for i, k := range q.bond {
				if k == fragSingleOrAromatic && !bonds[i] && g.Bonds[i].Order != Single {
					return
				}
			}
			t.Fatalf("ParseFragment(%q) does not match ParseSMILES(%q)", s, s)
		}
	})
}
