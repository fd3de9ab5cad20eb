package ranker

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/molecule"
)

// TestExplanationSharesAddUp: the per-peak shares of a 1H explanation,
// with the miss beyond SharedMiss σ counted in full, add up to the
// candidate's score. Coumarin's published list (testdata/realsize.json
// names the source) against coumarin and two isomers whose alkyne or
// aldehyde H sit far from its aromatic multiplets.
func TestExplanationSharesAddUp(t *testing.T) {
	r := New(Options{Workers: 1})
	j, err := r.prepare(Request{Formula: "C9H6O2", Peaks: mustPeaks(t, realsizePeaks(t, "coumarin"))})
	require.NoError(t, err)
	for _, smi := range []string{"O=c1ccc2ccccc2o1", "C#CC(=O)c1ccccc1O", "O=Cc1ccc(C#C)cc1O"} {
		c, err := r.explainOne(j, molecule.MustParseSMILES(smi), smi)
		require.NoError(t, err)
		sum := 0.0
		for _, a := range c.Assignments {
			sum += a.ScoreShare
			assert.InDelta(t, a.ScoreShare, a.Terms.Shift+a.Terms.Multiplicity+a.Terms.J+a.Terms.Integration+a.Terms.Overlap, 1e-9)
		}
		for _, u := range c.UnexplainedPeaks {
			sum += u.ScoreShare
		}
		for _, u := range c.UnobservedEnvironments {
			sum += u.ScoreShare
		}
		assert.InDelta(t, c.Score, sum, 1e-9, "%s: 1H shares", smi)
	}
}
