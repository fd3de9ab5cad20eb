package predict_test

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/molecule"
	"shiftrank/predict"
	"shiftrank/spectrum"
)

// TestPatternMatchesMultiplicity checks that the typed pattern the ranker
// scores with and the code the reports print say the same thing, over
// structures that give every kind of pattern the predictor names: s, n+1
// patterns up to the septet (2-methylpropane's CH), compounds (propanal's
// dt, 1-propanol's sext), multiplets (cyclohexanol's ring) and exchangeable
// broad singlets (the patterns are common practice; no values checked here).
func TestPatternMatchesMultiplicity(t *testing.T) {
	p := predict.New(predict.Options{})
	for _, smi := range []string{
		"CC(=O)OCC", "CC(C)C", "CCC=O", "CCCO", "OC1CCCCC1", "C=CC(=O)OC", "Cc1ccc(C)cc1",
		"CC(C)Cl", "OC(=O)CC", "NCC", "C=C", "CC(C)(C)C",
	} {
		sp, err := p.Predict(molecule.MustParseSMILES(smi))
		require.NoError(t, err, smi)
		for _, e := range sp.Environments {
			assert.True(t, e.Pattern.IsReported(), "%s environment %d: no pattern", smi, e.ID)
			assert.Equal(t, e.Multiplicity, e.Pattern.Code(), "%s environment %d", smi, e.ID)
			back, err := spectrum.ParseMultiplicity(e.Multiplicity)
			require.NoError(t, err, "%s environment %d: %q", smi, e.ID, e.Multiplicity)
			assert.Equal(t, e.Pattern, back, "%s environment %d: %q", smi, e.ID, e.Multiplicity)
		}
	}
}
