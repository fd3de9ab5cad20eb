package molecule

import (
	"errors"
	"math"
	"testing"
)

func TestParseFormula(t *testing.T) {
	// Hill order (Hill 1900, as used by CAS): C, then H, then the other
	// elements alphabetically; without carbon, all alphabetically. DBE =
	// C − H/2 − X/2 + N/2 + 1 (common practice).
	tests := []struct {
		in   string
		hill string
		dbe  int
	}{
		{"C4H8O2", "C4H8O2", 1},
		{"H8C4O2", "C4H8O2", 1},
		{"C6H5Cl", "C6H5Cl", 4},
		{"CHCl3", "CHCl3", 0},
		{"C6H6", "C6H6", 4},
		{"C2H6O", "C2H6O", 0},
		{"CH3COOH", "C2H4O2", 1},
		{"ClCH3", "CH3Cl", 0},
		{"C5H5N", "C5H5N", 4},
		{"C10H8", "C10H8", 7},
		{"C2H3N", "C2H3N", 2},
		{"H2O", "H2O", 0},
		{"H3BO3", "BH3O3", 0},
		{"SiH4", "H4Si", 0},
		{"C2H6OS", "C2H6OS", 0},
		{"C3H9O4P", "C3H9O4P", 0},
		{"CBrClFI", "CBrClFI", 0},
		{" C7H8 ", "C7H8", 4},
	}
	for _, tc := range tests {
		f, err := ParseFormula(tc.in)
		if err != nil {
			t.Errorf("ParseFormula(%q): %v", tc.in, err)
			continue
		}
		if got := f.String(); got != tc.hill {
			t.Errorf("ParseFormula(%q).String() = %q, want %q (Hill order)", tc.in, got, tc.hill)
		}
		if got := f.DBE(); got != tc.dbe {
			t.Errorf("ParseFormula(%q).DBE() = %d, want %d (common practice)", tc.in, got, tc.dbe)
		}
	}
}

// Formulas that exist only with hypervalent S or P have a negative DBE at
// the lowest valences but must parse: SF6 and PCl5 are real compounds
// (common practice).
func TestParseFormulaHypervalent(t *testing.T) {
	for _, tc := range []struct {
		in          string
		dbe, maxDBE int
	}{
		{"SF6", -2, 0},
		{"PCl5", -1, 0},
		{"CH3SO2Cl", 0, 2},
	} {
		f, err := ParseFormula(tc.in)
		if err != nil {
			t.Errorf("ParseFormula(%q) = %v, want success", tc.in, err)
			continue
		}
		if f.DBE() != tc.dbe || f.MaxDBE() != tc.maxDBE {
			t.Errorf("ParseFormula(%q): DBE %d, MaxDBE %d; want %d, %d", tc.in, f.DBE(), f.MaxDBE(), tc.dbe, tc.maxDBE)
		}
	}
}

func TestParseFormulaErrors(t *testing.T) {
	tests := []struct {
		in    string
		limit int
		pos   int
		token string
	}{
		{"Xy", 0, 0, "Xy"},
		{"co", 0, 0, "co"},
		{"C0H4", 0, 0, "C0"},
		{"C4H9O", 0, 0, "C4H9O"},    // odd electron count
		{"C2H8", 0, 0, "C2H8"},      // DBE −1
		{"SH8", 0, 0, "SH8"},        // DBE −2 even for S(VI)
		{"C41H84", 40, 0, "C41H84"}, // heavy-atom limit
		{"C5H12", 4, 0, "C5H12"},
		{"", 0, 0, ""},
		{"H2", 0, 0, "H2"},
		{"4C", 0, 0, "4"},
		{"C4-H8", 0, 2, "-"},
		{"C4H8Zz", 0, 4, "Zz"},
		{"C999999C", 0, 7, "C"}, // counts add up past six digits (found by fuzzing)
	}
	for _, tc := range tests {
		_, err := ParseFormulaLimit(tc.in, tc.limit)
		var fe *FormulaError
		if !errors.As(err, &fe) {
			t.Errorf("ParseFormulaLimit(%q, %d) = %v, want *FormulaError", tc.in, tc.limit, err)
			continue
		}
		if fe.Pos != tc.pos || fe.Token != tc.token {
			t.Errorf("ParseFormulaLimit(%q, %d) error at %d %q, want %d %q (%s)", tc.in, tc.limit, fe.Pos, fe.Token, tc.pos, tc.token, fe.Msg)
		}
	}
}

func TestFormulaMass(t *testing.T) {
	// Monoisotopic masses: benzene 78.04695, ethanol 46.04186 (NIST
	// Chemistry WebBook exact masses, from memory).
	for _, tc := range []struct {
		f    string
		mass float64
	}{{"C6H6", 78.04695}, {"C2H6O", 46.04186}} {
		if got := MustParseFormula(tc.f).Mass(); math.Abs(got-tc.mass) > 1e-4 {
			t.Errorf("%s mass %.5f, want %.5f", tc.f, got, tc.mass)
		}
	}
}

func TestGraphFormulaMatchesSMILES(t *testing.T) {
	// Formulas of textbook compounds (common practice).
	for _, tc := range []struct{ smiles, formula string }{
		{"CCOC(C)=O", "C4H8O2"}, {"Clc1ccccc1", "C6H5Cl"}, {"ClC(Cl)Cl", "CHCl3"},
	} {
		if got := MustParseSMILES(tc.smiles).Formula(); got != MustParseFormula(tc.formula) {
			t.Errorf("formula of %s = %s, want %s", tc.smiles, got, tc.formula)
		}
	}
}
