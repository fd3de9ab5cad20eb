package molecule

import (
	"errors"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"
)

// Element symbols: IUPAC periodic table (common practice); Hill order:
// C, then H, then the others alphabetically (common practice).
func TestNormalizeFormula(t *testing.T) {
	accepted := []struct {
		name, in, want, hill string
	}{
		{"strict form unchanged", "C4H8O2", "C4H8O2", "C4H8O2"},
		{"lower case", "c4h8o2", "C4H8O2", "C4H8O2"},
		{"spaces between elements", "C4 H8 O2", "C4H8O2", "C4H8O2"},
		{"spaces and tabs around and inside", "  C4\tH8 O2 ", "C4H8O2", "C4H8O2"},
		{"subscript digits", "C₄H₈O₂", "C4H8O2", "C4H8O2"},
		{"subscript two-digit count", "C₁₀H₁₂O₂", "C10H12O2", "C10H12O2"},
		{"lower case with subscripts and spaces", "c₄ h₈ o₂", "C4H8O2", "C4H8O2"},
		{"lower case chlorine: l is no element", "c6h5cl", "C6H5Cl", "C6H5Cl"},
		{"lower case bromine: r is no element", "c2h5br", "C2H5Br", "C2H5Br"},
		{"lower case chloroform", "chcl3", "CHCl3", "CHCl3"},
		{"order kept, Hill from the parser", "h8c4o2", "H8C4O2", "C4H8O2"},
		{"mixed case taken as written", "C4H8O 2", "C4H8O2", "C4H8O2"},
		{"lower case sulfur alone", "c2h6s", "C2H6S", "C2H6S"},
	}
	for _, tc := range accepted {
		t.Run(tc.name, func(t *testing.T) {
			got, err := NormalizeFormula(tc.in)
			require.NoError(t, err, "NormalizeFormula(%q)", tc.in)
			assert.Equal(t, tc.want, got, "NormalizeFormula(%q)", tc.in)
			f, err := ParseFormula(got)
			require.NoError(t, err, "ParseFormula(%q)", got)
			assert.Equal(t, tc.hill, f.String(), "Hill formula of %q", tc.in)
		})
	}

	rejected := []struct {
		name, in string
		pos      int
		token    string
	}{
		{"co: cobalt, or carbon and oxygen", "c2h4co", 4, "co"},
		{"acetic acid typed in lower case (co)", "ch3cooh", 3, "co"},
		{"si: silicon, or sulfur and iodine", "c2h6si", 4, "si"},
		{"no: nobelium, or nitrogen and oxygen", "c2h5no2", 4, "no"},
		{"ambiguous after a subscript and spaces (byte offset)", "c₂ h₄ co", 10, "co"},
		{"not element symbols", "xyz", 0, "x"},
		{"count first", "4c", 0, "4c"},
	}
	for _, tc := range rejected {
		t.Run(tc.name, func(t *testing.T) {
			got, err := NormalizeFormula(tc.in)
			require.Error(t, err, "NormalizeFormula(%q) = %q, want an error", tc.in, got)
			var fe *FormulaError
			require.True(t, errors.As(err, &fe), "error %v is not a *FormulaError", err)
			assert.Equal(t, tc.pos, fe.Pos, "position of the error in %q: %v", tc.in, err)
			assert.Equal(t, tc.token, fe.Token, "token of the error in %q", tc.in)
		})
	}
}

func FuzzNormalizeFormula(f *testing.F) {
	for _, s := range []string{"c4h8o2", "C₄H₈O₂", "C4 H8 O2", "co", "chcl3", ""} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		out, err := NormalizeFormula(s)
		if err != nil {
			return
		}
		// Normalising is idempotent.
		again, err := NormalizeFormula(out)
		if err != nil || again != out {
			t.Fatalf("NormalizeFormula(%q) = %q, then %q, %v", s, out, again, err)
		}
	})
}
