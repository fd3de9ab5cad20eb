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

// TestCarbonNaphthaleneOrtho: a substituent's ortho effect on a
// naphthalene follows the bond order of the bond between (Pauling bond
// orders from the Kekulé structures): large across C1–C2, small across
// C2–C3 and C1–C8a. Published CDCl3 shifts, from memory (Pretsch;
// Kalinowski, Berger, Braun, 13C NMR Spectroscopy).
func TestCarbonNaphthaleneOrtho(t *testing.T) {
	tests := []struct {
		name   string
		smiles string
		atom   int
		want   float64
	}{
		{"2-methoxynaphthalene C1", "COc1ccc2ccccc2c1", 11, 105.8},
		{"2-methoxynaphthalene C3", "COc1ccc2ccccc2c1", 3, 118.7},
		{"2-naphthol C1", "Oc1ccc2ccccc2c1", 10, 109.6},
		{"2-naphthol C3", "Oc1ccc2ccccc2c1", 2, 117.7},
		{"1-methoxynaphthalene C2", "COc1cccc2ccccc12", 3, 103.8},
		{"1-methoxynaphthalene C8a", "COc1cccc2ccccc12", 11, 125.2},
		{"1-methoxynaphthalene C4", "COc1cccc2ccccc12", 5, 120.2},
		{"1-methoxynaphthalene C8 (peri)", "COc1cccc2ccccc12", 10, 122.0},
		{"1-methylnaphthalene C8 (peri)", "Cc1cccc2ccccc12", 9, 124.2},
		{"2-methoxynaphthalene C4a", "COc1ccc2ccccc2c1", 5, 129.0},
		{"2-naphthol C4a", "Oc1ccc2ccccc2c1", 4, 128.9},
	}
	p := New(Options{})
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) { checkCarbonShift(t, p, tc.smiles, tc.atom, tc.want, 3.0) })
	}
}

// TestCarbonSalicylChelate: an OH ortho to an aryl C=O forms an
// intramolecular hydrogen bond that moves the C=O, the C–OH and the
// carbon carrying the C=O beyond the additive increments. Published
// CDCl3 shifts, from memory (Pretsch): salicylaldehyde 196.5 (CHO), 161.6
// (C2), 120.6 (C1); 2'-hydroxyacetophenone 204.5 (C=O), 162.4 (C2), 119.7
// (C1).
func TestCarbonSalicylChelate(t *testing.T) {
	tests := []struct {
		name   string
		smiles string
		atom   int
		want   float64
	}{
		{"salicylaldehyde CHO", "O=Cc1ccccc1O", 1, 196.5},
		{"salicylaldehyde C2", "O=Cc1ccccc1O", 7, 161.6},
		{"salicylaldehyde C1", "O=Cc1ccccc1O", 2, 120.6},
		{"2'-hydroxyacetophenone C=O", "CC(=O)c1ccccc1O", 1, 204.5},
		{"2'-hydroxyacetophenone C2", "CC(=O)c1ccccc1O", 8, 162.4},
		{"2'-hydroxyacetophenone C1", "CC(=O)c1ccccc1O", 3, 119.7},
	}
	p := New(Options{})
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) { checkCarbonShift(t, p, tc.smiles, tc.atom, tc.want, 2.0) })
	}
}

// TestCarbonAlkoxyOrtho: a methoxy group with one ortho substituent turns
// its methyl away from it, so the ortho CH is shielded more and the
// substituted ortho carbon less than the mean ortho increment says.
// Published CDCl3 shifts, from memory (Pretsch): guaiacol 145.7 (C1, OH),
// 110.8 (C3); veratrole 149.1 (C1), 111.5 (C3); 2-methylanisole 109.9
// (C6).
func TestCarbonAlkoxyOrtho(t *testing.T) {
	tests := []struct {
		name   string
		smiles string
		atom   int
		want   float64
	}{
		{"guaiacol C1", "COc1ccccc1O", 7, 145.7},
		{"guaiacol C3", "COc1ccccc1O", 3, 110.8},
		{"veratrole C1", "COc1ccccc1OC", 2, 149.1},
		{"veratrole C3", "COc1ccccc1OC", 3, 111.5},
		{"2-methylanisole C6", "COc1ccccc1C", 3, 109.9},
	}
	p := New(Options{})
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) { checkCarbonShift(t, p, tc.smiles, tc.atom, tc.want, 2.0) })
	}
}

// checkCarbonShift checks the predicted 13C shift of atom in smiles against
// want ± tol ppm (the published value named in the calling test's comment).
func checkCarbonShift(t *testing.T, p *Predictor, smiles string, atom int, want, tol float64) {
	t.Helper()
	sp, err := p.Carbon(molecule.MustParseSMILES(smiles))
	require.NoError(t, err)
	for _, s := range sp.Signals {
		for _, a := range s.Atoms {
			if a == atom {
				assert.InDelta(t, want, s.Shift, tol, "Carbon(%s) atom %d = %.1f, want %.1f ± %.0f (source: see the test comment)", smiles, atom, s.Shift, want, tol)
				return
			}
		}
	}
	t.Fatalf("Carbon(%s): atom %d not found", smiles, atom)
}
