package predict

import (
	"context"
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/isomers"
	"shiftrank/molecule"
)

// rekekulise returns g with its atoms renumbered by a random permutation,
// its bonds shuffled (each written either way round) and its aromatic
// rings given the Kekulé form the matching search finds in the new order:
// the same compound as another chemist's SMILES would give it.
func rekekulise(t testing.TB, g *molecule.Graph, r *rand.Rand) *molecule.Graph {
	t.Helper()
	n := len(g.Atoms)
	order := r.Perm(n)
	perm := make([]int, n)
	for newIdx, old := range order {
		perm[old] = newIdx
	}
	arom := molecule.AromaticBonds(g)
	h := molecule.NewGraph(n)
	for _, old := range order {
		a := g.Atoms[old]
		i := h.AddAtom(a.Element, a.HCount)
		h.Atoms[i].Charge = a.Charge
	}
	for _, bi := range r.Perm(len(g.Bonds)) {
		b := g.Bonds[bi]
		o := b.Order
		if arom[bi] {
			o = molecule.Aromatic
		}
		a, c := perm[b.A], perm[b.B]
		if r.IntN(2) == 0 {
			a, c = c, a
		}
		h.MustAddBond(a, c, o)
	}
	require.NoError(t, molecule.Kekulize(h), "Kekulize(%s)", g.SMILES())
	return h
}

// carbonShifts returns the predicted 13C shifts of g, one per carbon,
// sorted.
func carbonShifts(t testing.TB, p *Predictor, g *molecule.Graph) []float64 {
	t.Helper()
	sp, err := p.Carbon(g)
	require.NoError(t, err, "Carbon(%s)", g.SMILES())
	var out []float64
	for _, s := range sp.Signals {
		for range s.Atoms {
			out = append(out, s.Shift)
		}
	}
	slices.Sort(out)
	return out
}

// maxDiff returns the largest difference between two sorted shift lists
// of equal length.
func maxDiff(a, b []float64) float64 {
	d := 0.0
	for i := range a {
		d = max(d, math.Abs(a[i]-b[i]))
	}
	return d
}

// TestCarbonAtomOrderIsomers: the 13C prediction of a generated isomer
// does not change when its atoms are renumbered and its aromatic rings
// re-kekulised (an invariant, checked on a sample of the isomers of
// formulas rich in rings, carbonyls and five-membered aromatics: the
// first structures the generator gives, a few thousand in all).
func TestCarbonAtomOrderIsomers(t *testing.T) {
	perFormula := int64(1500)
	if testing.Short() {
		perFormula = 300
	}
	p := New(Options{})
	for _, f := range []string{"C8H8O2", "C10H8O", "C11H10", "C8H6OS"} {
		t.Run(f, func(t *testing.T) {
			r := rand.New(rand.NewPCG(7, 11))
			n, bad := 0, 0
			_, err := isomers.Generate(context.Background(), molecule.MustParseFormula(f), isomers.Options{Limit: perFormula, Workers: 1},
				func(g *molecule.Graph) bool {
					n++
					want := carbonShifts(t, p, g)
					for k := 0; k < 2; k++ {
						h := rekekulise(t, g, r)
						if d := maxDiff(want, carbonShifts(t, p, h)); d > 1e-6 {
							bad++
							t.Errorf("Carbon(%s) and Carbon(%s) differ by up to %.2f ppm (the same compound)", g.SMILES(), h.SMILES(), d)
							break
						}
					}
					return bad < 5
				})
			require.NoError(t, err)
			t.Logf("%s: %d isomers, each in 3 atom orders", f, n)
		})
	}
}

// TestCarbonAtomOrderCases: compounds whose prediction once depended on
// the atom order, each written two ways. An aryl vinyl ketone (which
// conjugated group is attenuated), a 1,3-dialkylidenecyclobutane (a ring
// CH2 allylic to two alkenes), a methylazulene (formal C=C bonds of a
// five-membered ring without a heteroatom) and a ring with both O and S.
func TestCarbonAtomOrderCases(t *testing.T) {
	tests := []struct {
		name string
		a, b string
	}{
		{"aryl vinyl ketone", "C1(C(C2=CC=C(C1)C=C2)=O)=C", "C1C=C2C(=O)C(=C)CC=1C=C2"},
		{"phenyl vinyl ketone", "C=CC(=O)c1ccccc1", "O=C(c1ccccc1)C=C"},
		{"dialkylidenecyclobutane", "C1(CC(C1)=CC)=C1C(O1)=O", "C1(=CC)CC(=C2OC2=O)C1"},
		{"1-methylazulene", "C12C(=CC=CC=C1)C(=CC=2)C", "C1=CC2=C(C)C=CC2=CC=C1"},
		{"oxathiole", "C12C(=CC=C1)OSC=2C=C", "C1=CC=C2OSC(C=C)=C12"},
	}
	p := New(Options{})
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			a := carbonShifts(t, p, molecule.MustParseSMILES(tc.a))
			b := carbonShifts(t, p, molecule.MustParseSMILES(tc.b))
			assert.Equal(t, a, b, "Carbon(%s) differs from Carbon(%s) (the same compound)", tc.a, tc.b)
		})
	}
}
