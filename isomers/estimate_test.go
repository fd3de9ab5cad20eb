package isomers

import (
	"context"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/molecule"
)

// TestEstimate checks Knuth's estimate of a run's size against the exact
// counts of published isomer series: alkanes against OEIS A000602 (C10H22
// 75, C14H30 1,858, C18H38 60,523, C20H42 366,319), and C6H6 against the handbook count
// of 217 constitutional isomers (the generator's exact-set checks hold the
// same figure). Small trees are walked whole and must be exact; the
// others must lie within four standard errors (and a factor of two) of
// the truth.
func TestEstimate(t *testing.T) {
	tests := []struct {
		name    string
		formula string
		want    float64
		source  string
	}{
		{"decanes", "C10H22", 75, "OEIS A000602"},
		{"tetradecanes", "C14H30", 1858, "OEIS A000602"},
		{"octadecanes", "C18H38", 60523, "OEIS A000602"},
		{"icosanes", "C20H42", 366319, "OEIS A000602"},
		{"benzene isomers", "C6H6", 217, "constitutional isomers of C6H6, handbook count"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			f, err := molecule.ParseFormula(tc.formula)
			require.NoError(t, err)
			est, err := Estimate(context.Background(), f, Options{Filter: NoFilter()}, 1024, 1)
			require.NoError(t, err)
			t.Logf("%s: estimate %.0f ± %.0f%% (%d probes, exact %v), nodes %.0f; true %v (%s)",
				tc.formula, est.Structures, 100*est.RelErr, est.Probes, est.Exact, est.Nodes, tc.want, tc.source)
			if est.Exact {
				assert.Equal(t, tc.want, est.Structures, "Estimate(%s) exact walk (source: %s)", tc.formula, tc.source)
				return
			}
			tol := max(4*est.RelErr*est.Structures, 0)
			assert.InDelta(t, tc.want, est.Structures, tol, "Estimate(%s) (source: %s)", tc.formula, tc.source)
			assert.InDelta(t, 1, est.Structures/tc.want, 0.5, "Estimate(%s) within a factor of two (source: %s)", tc.formula, tc.source)
		})
	}
}
