package molecule

import (
	"errors"
	"testing"
)

func TestParseSMILES(t *testing.T) {
	// Formulas: common practice (textbook formulas of these compounds).
	tests := []struct {
		smiles  string
		formula string
	}{
		{"C", "CH4"},
		{"CCO", "C2H6O"},
		{"c1ccccc1", "C6H6"},
		{"c1cc[nH]c1", "C4H5N"},
		{"c1ccncc1", "C5H5N"},
		{"c1ccoc1", "C4H4O"},
		{"c1ccsc1", "C4H4S"},
		{"Cn1cccc1", "C5H7N"},
		{"c1ccc2ccccc2c1", "C10H8"},
		{"CS(=O)(=O)C", "C2H6O2S"},
		{"CP(=O)(C)C", "C3H9OP"},
		{"[SiH4]", "H4Si"},
		{"[PH3]", "H3P"},
		{"C%10CC%10", "C3H6"},
		{"C1CC=1", "C3H4"},
		{"C=1CC1", "C3H4"},
		{"F/C=C/F", "C2H2F2"},
		{"N[C@@H](C)C(=O)O", "C3H7NO2"},
		{"[CH3:1]C", "C2H6"},
		{"ClC(Br)I", "CHBrClI"},
		{"OB(O)O", "BH3O3"},
		{"C#C", "C2H2"},
		{"[S]", "S"},
		{"[H]C([H])([H])O", "CH4O"},
		{"[H]OC", "CH4O"},
		{"[CH2]([H])O", "CH4O"},
		{"[H]C(=O)O", "CH2O2"},
		{"[H]c1ccccc1", "C6H6"},
	}
	for _, tc := range tests {
		g, err := ParseSMILES(tc.smiles)
		if err != nil {
			t.Errorf("ParseSMILES(%q): %v", tc.smiles, err)
			continue
		}
		if got := g.Formula().String(); got != tc.formula {
			t.Errorf("ParseSMILES(%q) formula %s, want %s", tc.smiles, got, tc.formula)
		}
		for _, b := range g.Bonds {
			if b.Order == Aromatic {
				t.Errorf("ParseSMILES(%q) left an aromatic bond", tc.smiles)
			}
		}
	}
}

func TestParseSMILESErrors(t *testing.T) {
	tests := []struct {
		smiles string
		pos    int
		token  string
	}{
		{"", 0, ""},
		{"CC.O", 2, "."},
		{"C1CC", 1, "1"},
		{"C(C", 1, "("},
		{"CC)", 2, ")"},
		{"C()C", 1, "()"},
		{"Xe", 0, "Xe"},
		{"[Xe]", 1, "Xe"},
		{"[H]", 0, "[H]"},
		{"[2H]C", 0, "[2H]"},
		{"C(C)(C)(C)(C)C", 0, "C"},
		{"c1cccc1", 0, "c"},
		{"c1ccccc1c", 8, "c"},
		{"C==C", 2, "="},
		{"=C", 0, "="},
		{"C=", 1, "="},
		{"[CH4", 0, "[CH4"},
		{"C$C", 1, "$"},
		{"C11", 2, "1"},
		{"C1C1", 3, "1"},
		{"C%1", 1, "%1"},
		{"CSi", 2, "i"},
		{"[Fe]", 1, "Fe"},
		{"[N+2]", 0, "[N+2]"},
		{"C:C", 1, ":"},
		{"[se]1cccc1", 1, "se"},
		{"[H][H]", 0, "[H][H]"},
		{"C[H]C", 1, "[H]"},
		{"[H+]C", 0, "[H+]"},
		{"[H]=C", 0, "[H]"},
		{"C((C))", 2, "("},
		{"C(", 1, "("},
		{"(C)", 0, "("},
		{"C)C", 1, ")"},
		{"C(=)C", 2, "="},
	}
	for _, tc := range tests {
		_, err := ParseSMILES(tc.smiles)
		var se *SMILESError
		if !errors.As(err, &se) {
			t.Errorf("ParseSMILES(%q) error %v, want *SMILESError", tc.smiles, err)
			continue
		}
		if se.Pos != tc.pos || se.Token != tc.token {
			t.Errorf("ParseSMILES(%q) error at %d %q, want %d %q (%s)", tc.smiles, se.Pos, se.Token, tc.pos, tc.token, se.Msg)
		}
	}
}

func TestSMILESRoundTrip(t *testing.T) {
	for _, s := range rdkitCrossCheckSMILES {
		g := MustParseSMILES(s)
		k := Canonicalize(g).Key
		w := g.SMILES()
		g2, err := ParseSMILES(w)
		if err != nil {
			t.Errorf("ParseSMILES(%q.SMILES() = %q): %v", s, w, err)
			continue
		}
		if Canonicalize(g2).Key != k {
			t.Errorf("%q: SMILES() = %q reads back to a different graph", s, w)
		}
		cs := CanonicalSMILES(g)
		g3, err := ParseSMILES(cs)
		if err != nil {
			t.Errorf("ParseSMILES(CanonicalSMILES(%q) = %q): %v", s, cs, err)
			continue
		}
		if Canonicalize(g3).Key != k {
			t.Errorf("%q: CanonicalSMILES = %q reads back to a different graph", s, cs)
		}
		if cs2 := CanonicalSMILES(g3); cs2 != cs {
			t.Errorf("%q: CanonicalSMILES not stable: %q then %q", s, cs, cs2)
		}
	}
}

func TestCheckValence(t *testing.T) {
	// Valences: common practice (neutral and isoelectronic charged atoms).
	for _, tc := range []struct {
		smiles string
		ok     bool
	}{
		{"CCO", true}, {"[NH4+]", true}, {"C[N+](=O)[O-]", true}, {"CC(=O)[O-]", true},
		{"[CH2]", false}, {"[S]", false}, {"CS(=O)(=O)C", true}, {"[CH3+]", true}, {"[CH3-]", true},
	} {
		err := MustParseSMILES(tc.smiles).CheckValence()
		if (err == nil) != tc.ok {
			t.Errorf("CheckValence(%q) = %v, want ok=%v", tc.smiles, err, tc.ok)
		}
	}
}

func TestCanonicalSMILESOrder(t *testing.T) {
	for _, s := range rdkitCrossCheckSMILES {
		g := MustParseSMILES(s)
		cs, order := CanonicalSMILESOrder(g)
		h := MustParseSMILES(cs)
		if len(order) != len(g.Atoms) || len(h.Atoms) != len(g.Atoms) {
			t.Fatalf("%s: order has %d atoms, want %d", s, len(order), len(g.Atoms))
		}
		for k, i := range order {
			if h.Atoms[k] != g.Atoms[i] {
				t.Errorf("%s: atom %d of %q is %v, atom %d of the input %v", s, k, cs, h.Atoms[k], i, g.Atoms[i])
			}
		}
		for _, b := range h.Bonds {
			if g.BondBetween(order[b.A], order[b.B]) < 0 {
				t.Errorf("%s: bond %d-%d of %q has no counterpart", s, b.A, b.B, cs)
			}
		}
	}
}
