package predict

import (
	"context"
	"math/rand/v2"
	"slices"
	"testing"

	"shiftrank/isomers"
	"shiftrank/molecule"
)

// TestGeneratedIsomers predicts every constitutional isomer (no
// plausibility filter, so hypervalent S and P, Si, B, peroxides, N–O, small
// rings and cumulenes all occur) of a few formulas and checks the
// invariants of each prediction.
func TestGeneratedIsomers(t *testing.T) {
	if testing.Short() {
		t.Skip("generates a few thousand isomers")
	}
	p := New(Options{Explain: true})
	r := rand.New(rand.NewPCG(3, 4))
	total := 0
	for _, fs := range []string{"C4H8O2", "C3H7NO", "C2H4OS", "C2H7OP", "C2H7BO", "C2H8OSi", "C3H5Cl", "C2H3FO2", "CH4O3S", "C5H10O", "C4H6O", "C3H6N2", "C4H4O", "C4H5N", "C6H6"} {
		f, err := molecule.ParseFormula(fs)
		if err != nil {
			t.Fatal(err)
		}
		n := 0
		_, err = isomers.Generate(context.Background(), f, isomers.Options{Filter: isomers.NoFilter(), Limit: 3000}, func(g *molecule.Graph) bool {
			n++
			sp, err := p.Predict(g)
			if err != nil {
				t.Errorf("%s: Predict(%s): %v", fs, g.SMILES(), err)
				return false
			}
			checkSpectrum(t, fs+" "+g.SMILES(), g, sp, true)
			if n%2 == 0 {
				// Renumbering invariance on generated structures.
				sp2, err := p.Predict(permute(g, r))
				if err != nil || !slices.Equal(signature(sp2), signature(sp)) {
					t.Errorf("%s: %s renumbered predicts differently: %v vs %v (%v)", fs, g.SMILES(), signature(sp2), signature(sp), err)
				}
			}
			return !t.Failed()
		})
		if err != nil {
			t.Fatalf("%s: %v", fs, err)
		}
		total += n
	}
	t.Logf("%d generated isomers predicted", total)
}
