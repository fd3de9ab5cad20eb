package predict

import (
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/molecule"
)

// TestCarbonDiastereotopic: a signal of two carbons equivalent in the
// constitution but not in space is flagged Diastereotopic (it may give two
// lines); equivalent pairs are not. Menthol's isopropyl methyls 21.0 and
// 16.1 ppm, valine's 19.0 and 17.8 (Pretsch, from memory), acetone oxime's
// methyls 21.8 and 15.4 (from memory); isobutanol's methyls one line,
// 18.9 ppm (Pretsch, from memory); the ring C2/C6 of a cyclohexyl group on
// a stereocentre are diastereotopic (common practice).
func TestCarbonDiastereotopic(t *testing.T) {
	tests := []struct {
		name   string
		smiles string
		atoms  []int // the pair
		want   bool
	}{
		{"menthol isopropyl methyls", "CC(C)C1CCC(C)CC1O", []int{0, 2}, true},
		{"valine methyls", "CC(C)C(N)C(=O)O", []int{0, 2}, true},
		{"acetone oxime methyls", "CC(C)=NO", []int{0, 2}, true},
		{"1-cyclohexylethanol ring C2/C6", "CC(O)C1CCCCC1", []int{4, 8}, true},
		{"isobutanol methyls (no stereocentre)", "CC(C)CO", []int{0, 2}, false},
		{"acetone methyls", "CC(C)=O", []int{0, 2}, false},
		{"isobutylene methyls", "C=C(C)C", []int{2, 3}, false},
		{"cyclohexanol C2/C6 (no stereocentre)", "OC1CCCCC1", []int{2, 6}, false},
	}
	p := New(Options{Explain: true})
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			sp, err := p.Carbon(molecule.MustParseSMILES(tc.smiles))
			require.NoError(t, err)
			var sig *CarbonSignal
			for i := range sp.Signals {
				if assert.ObjectsAreEqual(sp.Signals[i].Atoms, tc.atoms) {
					sig = &sp.Signals[i]
				}
			}
			require.NotNil(t, sig, "Carbon(%s): no signal of atoms %v", tc.smiles, tc.atoms)
			assert.Equal(t, tc.want, sig.Diastereotopic, "Carbon(%s) signal %v Diastereotopic (source: see the test comment)", tc.smiles, tc.atoms)
		})
	}
}
