package infer

import (
	"strings"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/molecule"
)

// pk builds a peak: a shift (or range lo–hi when hi > lo), its integral in
// hydrogens, and its pattern.
func pk(n int, lo, hi, h float64, pat Pattern) Peak {
	if hi < lo {
		hi = lo
	}
	return Peak{Number: n, Shift: (lo + hi) / 2, Lo: lo, Hi: hi, H: h, Pattern: pat}
}

func split(j []float64, lines ...int) Pattern { return Pattern{Kind: FirstOrder, Lines: lines, J: j} }

var (
	singlet   = Pattern{Kind: FirstOrder}
	multiplet = Pattern{Kind: Multiplet}
)

// TestInferReadsWhatAChemistReads checks, on published CDCl3 spectra, the
// constraints a chemist draws by hand (common practice) and that the true
// structure fits the first (most plausible) reading.
func TestInferReadsWhatAChemistReads(t *testing.T) {
	runInferCases(t, true, []inferCase{
		{"ethyl phenylacetate", "C10H12O2", "CCOC(=O)Cc1ccccc1", []Peak{
			pk(1, 7.22, 7.35, 5, multiplet), pk(2, 4.14, 0, 2, split([]float64{7.1}, 4)),
			pk(3, 3.60, 0, 2, singlet), pk(4, 1.24, 0, 3, split([]float64{7.1}, 3)),
		}, []string{"monosubstituted-benzene", "peak-3-coupling", "peak-2-coupling"},
			"Pretsch, Bühlmann, Badertscher, Structure Determination of Organic Compounds, from memory"},
		{"4-methoxyacetophenone", "C9H10O2", "COc1ccc(cc1)C(C)=O", []Peak{
			pk(1, 7.94, 0, 2, split([]float64{8.9}, 2)), pk(2, 6.93, 0, 2, split([]float64{8.9}, 2)),
			pk(3, 3.87, 0, 3, singlet), pk(4, 2.56, 0, 3, singlet),
		}, []string{"para-disubstituted-benzene"},
			"Silverstein, Webster, Kiemle, Spectrometric Identification of Organic Compounds, from memory"},
		{"dimethyl phthalate", "C10H10O4", "COC(=O)c1ccccc1C(=O)OC", []Peak{
			pk(1, 7.70, 7.75, 2, multiplet), pk(2, 7.51, 7.56, 2, multiplet), pk(3, 3.91, 0, 6, singlet),
		}, []string{"ortho-disubstituted-benzene"},
			"Pretsch, Bühlmann, Badertscher, Structure Determination of Organic Compounds, from memory"},
		{"3-acetylpyridine (H-6 next to the ring N)", "C7H7NO", "CC(=O)c1cccnc1", []Peak{
			pk(1, 9.17, 0, 1, split([]float64{2.2}, 2)), pk(2, 8.78, 0, 1, split([]float64{4.8, 1.7}, 2, 2)),
			pk(3, 8.23, 0, 1, split([]float64{8.0, 2.0, 2.0}, 2, 3)), pk(4, 7.42, 0, 1, split([]float64{8.0, 4.8}, 2, 2)),
			pk(5, 2.65, 0, 3, singlet),
		}, []string{"peak-2-next-to-ring-n", "monosubstituted-pyridine"},
			"Pretsch, Bühlmann, Badertscher, Structure Determination of Organic Compounds, from memory"},
		{"2-acetylpyridine (pyridyl ring)", "C7H7NO", "CC(=O)c1ccccn1", []Peak{
			pk(1, 8.68, 0, 1, split([]float64{4.7}, 2)), pk(2, 8.04, 0, 1, split([]float64{7.9}, 2)),
			pk(3, 7.83, 0, 1, split([]float64{7.7, 1.7}, 3, 2)), pk(4, 7.47, 0, 1, split([]float64{7.5, 4.8, 1.2}, 2, 2, 2)),
			pk(5, 2.73, 0, 3, singlet),
		}, []string{"monosubstituted-pyridine"},
			"Pretsch, Bühlmann, Badertscher, Structure Determination of Organic Compounds, from memory"},
		{"4-acetylpyridine (AA'XX' pyridyl ring)", "C7H7NO", "CC(=O)c1ccncc1", []Peak{
			pk(1, 8.81, 0, 2, split([]float64{6.0}, 2)), pk(2, 7.72, 0, 2, split([]float64{6.0}, 2)),
			pk(3, 2.63, 0, 3, singlet),
		}, []string{"monosubstituted-pyridine"},
			"Pretsch, Bühlmann, Badertscher, Structure Determination of Organic Compounds, from memory"},
		{"2-methoxynaphthalene (naphthyl ring system)", "C11H10O", "COc1ccc2ccccc2c1", []Peak{
			pk(1, 7.72, 7.78, 3, multiplet), pk(2, 7.45, 0, 1, split([]float64{8.2, 6.9, 1.2}, 2, 2, 2)),
			pk(3, 7.35, 0, 1, split([]float64{8.1, 6.9, 1.2}, 2, 2, 2)), pk(4, 7.12, 7.16, 2, multiplet),
			pk(5, 3.92, 0, 3, singlet),
		}, []string{"monosubstituted-naphthalene"},
			"Pretsch, Bühlmann, Badertscher, Structure Determination of Organic Compounds, from memory"},
		{"1-methylnaphthalene (naphthyl ring system)", "C11H10", "Cc1cccc2ccccc12", []Peak{
			pk(1, 8.00, 0, 1, split([]float64{8.2}, 2)), pk(2, 7.85, 0, 1, split([]float64{8.0}, 2)),
			pk(3, 7.70, 0, 1, split([]float64{8.1}, 2)), pk(4, 7.45, 7.55, 2, multiplet),
			pk(5, 7.30, 7.40, 2, multiplet), pk(6, 2.70, 0, 3, singlet),
		}, []string{"monosubstituted-naphthalene"},
			"Pretsch, Bühlmann, Badertscher, Structure Determination of Organic Compounds, from memory"},
		{"3-methylanisole (4 aromatic H, pattern not resolved)", "C8H10O", "COc1cccc(C)c1", []Peak{
			pk(1, 7.14, 7.20, 1, multiplet), pk(2, 6.68, 6.78, 3, multiplet),
			pk(3, 3.79, 0, 3, singlet), pk(4, 2.33, 0, 3, singlet),
		}, []string{"disubstituted-benzene"},
			"Pretsch, Bühlmann, Badertscher, Structure Determination of Organic Compounds, from memory"},
		{"4-aminoacetophenone (N in the formula, benzene ring: no pyridine)", "C8H9NO", "CC(=O)c1ccc(N)cc1", []Peak{
			pk(1, 7.80, 0, 2, split([]float64{8.7}, 2)), pk(2, 6.64, 0, 2, split([]float64{8.7}, 2)),
			pk(3, 4.12, 0, 2, Pattern{Kind: FirstOrder, Broad: true}), pk(4, 2.50, 0, 3, singlet),
		}, []string{"para-disubstituted-benzene"},
			"Silverstein, Webster, Kiemle, Spectrometric Identification of Organic Compounds, from memory"},
		{"diethyl succinate (equivalent CH2–CH2 as a singlet)", "C8H14O4", "CCOC(=O)CCC(=O)OCC", []Peak{
			pk(1, 4.14, 0, 4, split([]float64{7.1}, 4)), pk(2, 2.61, 0, 4, singlet), pk(3, 1.25, 0, 6, split([]float64{7.1}, 3)),
		}, []string{"peak-2-coupling"},
			"Gottlieb, Kotlyar, Nudelman, J. Org. Chem. 1997, 62, 7512 (related esters); from memory"},
	})
}

// TestInferTruthInSomeReading checks, on published CDCl3 spectra, that
// the true structure fits one of the readings (not necessarily the first)
// and that the named constraints are read: vinyl groups on O with their
// small couplings and shielded =CH2, rings of equivalent CH2, and ring
// CH2 hydrogens spread over several multiplets.
func TestInferTruthInSomeReading(t *testing.T) {
	runInferCases(t, false, []inferCase{
		{"vinyl acetate (J 14.0/6.3 Hz)", "C4H6O2", "C=COC(C)=O", []Peak{
			pk(1, 7.27, 0, 1, split([]float64{14.0, 6.3}, 2, 2)), pk(2, 4.88, 0, 1, split([]float64{14.0, 1.5}, 2, 2)),
			pk(3, 4.57, 0, 1, split([]float64{6.3, 1.5}, 2, 2)), pk(4, 2.14, 0, 3, singlet),
		}, []string{"vinyl-1"}, "Pretsch, Bühlmann, Badertscher, Structure Determination of Organic Compounds (enol esters), from memory"},
		{"ethyl vinyl ether (=CH2 at 4.17/3.97)", "C4H8O", "C=COCC", []Peak{
			pk(1, 6.47, 0, 1, split([]float64{14.3, 6.8}, 2, 2)), pk(2, 4.17, 0, 1, split([]float64{14.3, 1.9}, 2, 2)),
			pk(3, 3.97, 0, 1, split([]float64{6.8, 1.9}, 2, 2)), pk(4, 3.73, 0, 2, split([]float64{7.0}, 4)),
			pk(5, 1.29, 0, 3, split([]float64{7.0}, 3)),
		}, []string{"vinyl-1"}, "Pretsch, Bühlmann, Badertscher, Structure Determination of Organic Compounds (enol ethers), from memory"},
		{"cyclohexane (12H singlet)", "C6H12", "C1CCCCC1", []Peak{
			pk(1, 1.43, 0, 12, singlet),
		}, []string{"peak-1-coupling"}, "Gottlieb, Kotlyar, Nudelman, J. Org. Chem. 1997, 62, 7512, Table 1 (CDCl3); from memory"},
		{"cyclohexanol (ring CH2 hydrogens in several multiplets)", "C6H12O", "OC1CCCCC1", []Peak{
			pk(1, 3.60, 0, 1, multiplet), pk(2, 1.88, 0, 2, multiplet), pk(3, 1.73, 0, 2, multiplet),
			pk(4, 1.54, 0, 1, multiplet), pk(5, 1.10, 1.35, 5, multiplet), pk(6, 1.60, 0, 1, Pattern{Kind: FirstOrder, Broad: true}),
		}, []string{"peaks-2-3-4-5-envelope"}, "Silverstein, Webster, Kiemle, Spectrometric Identification of Organic Compounds, from memory"},
	})
}

// inferCase is a published spectrum with the constraints a chemist reads
// from it (IDs) and the true structure.
type inferCase struct {
	name, formula, smiles string
	peaks                 []Peak
	want                  []string // constraint IDs that must be read
	source                string
}

// runInferCases checks that each case's constraints are read, that a
// benzene ring is never read as a pyridine ring, and that the true
// structure fits the first reading (first) or some strict reading.
func runInferCases(t *testing.T, first bool, cases []inferCase) {
	t.Helper()
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			f, err := molecule.ParseFormula(tc.formula)
			require.NoError(t, err)
			g, err := molecule.ParseSMILES(tc.smiles)
			require.NoError(t, err)
			an := Infer(f, tc.peaks, Options{})
			ids := map[string]bool{}
			for _, c := range an.Constraints {
				ids[c.ID] = true
			}
			for _, id := range tc.want {
				assert.True(t, ids[id], "%s: constraint %s not read (source: %s); read: %v", tc.name, id, tc.source, ids)
			}
			if g.Formula().Count(molecule.N) > 0 && !strings.Contains(tc.smiles, "n") {
				assert.False(t, ids["monosubstituted-pyridine"], "%s: a benzene ring read as a pyridine ring", tc.name)
			}
			require.NotEmpty(t, an.Readings)
			if first {
				ok, why := an.Readings[0].Spec.Explain(g)
				assert.True(t, ok, "%s: the true structure does not fit the first reading %q: %s", tc.name, an.Readings[0].Name, why)
				return
			}
			fits := false
			for _, rd := range an.Readings {
				if ok, _ := rd.Spec.Explain(g); ok && !rd.Relaxed {
					fits = true
				}
			}
			assert.True(t, fits, "%s: the true structure fits no strict reading (source: %s)", tc.name, tc.source)
		})
	}
}

// TestInferDisabledConstraint: a switched-off constraint is listed as
// disabled and no reading applies it.
func TestInferDisabledConstraint(t *testing.T) {
	f, err := molecule.ParseFormula("C10H12O2")
	require.NoError(t, err)
	peaks := []Peak{
		pk(1, 7.22, 7.35, 5, multiplet), pk(2, 4.14, 0, 2, split([]float64{7.1}, 4)),
		pk(3, 3.60, 0, 2, singlet), pk(4, 1.24, 0, 3, split([]float64{7.1}, 3)),
	}
	an := Infer(f, peaks, Options{Disabled: []string{"monosubstituted-benzene"}})
	found := false
	for _, c := range an.Constraints {
		if c.ID == "monosubstituted-benzene" {
			found = true
			assert.False(t, c.Enabled)
		}
	}
	require.True(t, found, "the switched-off constraint is still listed")
	require.NotEmpty(t, an.Readings)
	for _, rd := range an.Readings {
		assert.NotContains(t, rd.Constraints, "monosubstituted-benzene", rd.Name)
	}
}
