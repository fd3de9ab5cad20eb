package predict

import (
	"slices"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/molecule"
)

// TestCarbonFusionCarbonInvariant: the prediction of a substituted
// naphthalene does not depend on how its SMILES is written (aromatic or
// one of its Kekulé forms, atoms in another order). The two ring fusion
// carbons of 2-naphthol lie meta and para to the OH, and each takes that
// increment: published C8a 134.6 and C4a 128.9 ppm (testdata/realsize.json,
// 2-naphthol; from memory) are told apart.
func TestCarbonFusionCarbonInvariant(t *testing.T) {
	tests := []struct {
		name      string
		spellings []string
	}{
		{"2-naphthol", []string{"Oc1ccc2ccccc2c1", "OC1=CC2=CC=CC=C2C=C1", "OC1=CC=C2C=CC=CC2=C1", "c1ccc2cc(O)ccc2c1"}},
		{"2-acetonaphthone", []string{"CC(=O)c1ccc2ccccc2c1", "CC(=O)C1=CC2=CC=CC=C2C=C1", "C1=CC=C2C=C(C(C)=O)C=CC2=C1"}},
		{"2-methoxynaphthalene", []string{"COc1ccc2ccccc2c1", "COC1=CC2=CC=CC=C2C=C1", "C1=CC2=CC=C(OC)C=C2C=C1"}},
	}
	p := New(Options{})
	shifts := func(smi string) []float64 {
		sp, err := p.Carbon(molecule.MustParseSMILES(smi))
		require.NoError(t, err, smi)
		var out []float64
		for _, s := range sp.Signals {
			for range s.Atoms {
				out = append(out, s.Shift)
			}
		}
		slices.Sort(out)
		return out
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			want := shifts(tc.spellings[0])
			for _, smi := range tc.spellings[1:] {
				assert.Equal(t, want, shifts(smi), "Carbon(%s) differs from Carbon(%s)", smi, tc.spellings[0])
			}
		})
	}
}
