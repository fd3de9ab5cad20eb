package isomers

import (
	"context"
	"fmt"
	"math/rand/v2"
	"slices"
	"sync"
	"testing"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/molecule"
)

// The constrained generator is checked against an independent reference:
// the unconstrained generator (itself checked against OEIS, handbook counts,
// the brute-force oracle and RDKit) followed by a direct test of each
// structure against the Spec, written here on molecule.Graph without any of
// the generator's incremental pruning. The two sets must be equal.

// specSet runs the constrained generator and returns canonical SMILES.
func specSet(t *testing.T, f molecule.Formula, s *Spec, filter Filter) []string {
	t.Helper()
	var out []string
	seen := map[string]bool{}
	_, err := Generate(context.Background(), f, Options{Filter: filter, Spec: s}, func(g *molecule.Graph) bool {
		smi := molecule.CanonicalSMILES(g)
		require.Falsef(t, seen[smi], "constrained run emitted %s twice", smi)
		seen[smi] = true
		out = append(out, smi)
		return true
	})
	require.NoError(t, err)
	slices.Sort(out)
	return out
}

// referenceSet filters the unconstrained isomers with fitsSpec.
func referenceSet(t *testing.T, f molecule.Formula, s *Spec, filter Filter, charged bool) []string {
	t.Helper()
	var out []string
	_, err := Generate(context.Background(), f, Options{Filter: filter, ChargeSeparated: charged}, func(g *molecule.Graph) bool {
		if s.Fits(g) {
			out = append(out, molecule.CanonicalSMILES(g))
		}
		return true
	})
	require.NoError(t, err)
	slices.Sort(out)
	return out
}

func TestSpecHandWritten(t *testing.T) {
	C, O, N := molecule.C, molecule.O, molecule.N
	cases := []struct {
		name    string
		formula string
		spec    Spec
		// want, when given, is the expected set (canonical SMILES of
		// the named compounds; common practice).
		want []string
	}{
		{
			// ethyl acetate's reading: CH3 singlet, CH3 triplet, CH2 quartet on O
			name: "C4H8O2 ethyl acetate reading", formula: "C4H8O2",
			spec: Spec{Classes: []Class{
				{Name: "CH3 s", Element: C, H: 3, Count: 1, Vicinal: Bound{On: true, Max: 0}},
				{Name: "CH3 t", Element: C, H: 3, Count: 1, Vicinal: Bound{On: true, Min: 2, Max: 2}},
				{Name: "CH2 q on O", Element: C, H: 2, Count: 1, Vicinal: Bound{On: true, Min: 3, Max: 3},
					Neighbours: []NeighbourRule{{Elements: []molecule.Element{O}, Min: 1, Max: Unbounded}}},
				{Name: "C", Element: C, H: 0, Count: 1},
				{Name: "O", Element: O, H: 0, Count: 2},
			}},
			want: []string{"CCOC(C)=O"},
		},
		{
			name: "C8H10 monosubstituted benzene", formula: "C8H10",
			spec: Spec{Classes: []Class{
				{Name: "ArH", Element: C, H: 1, Count: 5, Bonds: OneDouble, MaxDegree: 2,
					Neighbours: []NeighbourRule{{Classes: []int{0, 1}, Min: 2, Max: 2}}},
				{Name: "ipso", Element: C, H: 0, Count: 1, Bonds: OneDouble,
					Neighbours: []NeighbourRule{{Classes: []int{0}, Min: 2, Max: 2}}},
				{Name: "CH2", Element: C, H: 2, Count: 1},
				{Name: "CH3", Element: C, H: 3, Count: 1},
			}},
			want: []string{"CCc1ccccc1"},
		},
		{
			name: "C4H10O free classes", formula: "C4H10O",
			spec: Spec{Classes: []Class{
				{Element: C, H: FreeH, Count: 4, Bonds: SingleBonds},
				{Element: O, H: FreeH, Count: 1},
			}},
		},
		{
			name: "C3H6O2 ambiguous CH3 classes", formula: "C3H6O2",
			spec: Spec{Classes: []Class{
				{Name: "CH3 a", Element: C, H: 3, Count: 1},
				{Name: "CH3 b", Element: C, H: 3, Count: 1},
				{Name: "C", Element: C, H: 0, Count: 1},
				{Name: "O", Element: O, H: 0, Count: 2},
			}},
		},
		{
			name: "C2H5NO2 nitro", formula: "C2H5NO2",
			spec: Spec{Classes: []Class{
				{Name: "CH3", Element: C, H: 3, Count: 1},
				{Name: "CH2", Element: C, H: 2, Count: 1},
				{Name: "N+", Element: N, H: 0, Count: 1, Charge: 1, Valences: []int{4},
					Neighbours: []NeighbourRule{{Classes: []int{3}, Min: 1, Max: 1}}},
				{Name: "O-", Element: O, H: 0, Count: 1, Charge: -1, Valences: []int{1}, MaxDegree: 1,
					Neighbours: []NeighbourRule{{Classes: []int{2}, Min: 1, Max: 1}}},
				{Name: "O", Element: O, H: 0, Count: 1},
			}},
			// nitroethane, the O-methyl nitronate and an oxaziridine
			// N-oxide: every way to bond the five atoms (common practice)
			want: []string{"CC[N+](=O)[O-]", "CO[N+](=C)[O-]", "C[N+]1([O-])CO1"},
		},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			f := molecule.MustParseFormula(c.formula)
			got := specSet(t, f, &c.spec, NoFilter())
			ref := referenceSet(t, f, &c.spec, NoFilter(), true)
			assert.Equal(t, ref, got, "constrained set vs unconstrained set filtered by the spec")
			if c.want != nil {
				var want []string
				for _, s := range c.want {
					g, err := molecule.ParseSMILES(s)
					require.NoError(t, err)
					want = append(want, molecule.CanonicalSMILES(g))
				}
				slices.Sort(want)
				assert.Equal(t, want, got)
			}
		})
	}
}

// randomSpec derives a Spec from one structure of the formula: classes by
// (element, hydrogen count), with rules that the structure satisfies
// (so the constrained set is never empty) drawn at random.
func randomSpec(rng *rand.Rand, g *molecule.Graph) Spec {
	type key struct {
		el molecule.Element
		h  int
	}
	idx := map[key]int{}
	var s Spec
	var members [][]int
	for i, a := range g.Atoms {
		k := key{a.Element, a.HCount}
		ci, ok := idx[k]
		if !ok {
			ci = len(s.Classes)
			idx[k] = ci
			s.Classes = append(s.Classes, Class{Element: a.Element, H: a.HCount})
			members = append(members, nil)
		}
		s.Classes[ci].Count++
		members[ci] = append(members[ci], i)
	}
	if rng.IntN(4) == 0 {
		// some classes keep a free hydrogen count
		for i := range s.Classes {
			if rng.IntN(2) == 0 {
				s.Classes[i].H = FreeH
			}
		}
	}
	for ci := range s.Classes {
		c := &s.Classes[ci]
		atoms := members[ci]
		if len(atoms) >= 2 && rng.IntN(2) == 0 {
			// slots: one per atom, each with rules that atom satisfies
			for _, x := range atoms {
				sl := Slot{Count: 1}
				if rng.IntN(2) == 0 {
					sl.MaxDegree = g.Degree(x)
				}
				if c.Element == molecule.C && rng.IntN(3) > 0 {
					sure, all := vicinalOf(g, x)
					sl.Vicinal = Bound{On: true, Min: all - rng.IntN(2), Max: sure + rng.IntN(2)}
				}
				d := 0
				for _, e := range g.Neighbors(x) {
					if e.Order == molecule.Double {
						d++
					}
				}
				if d == 1 && rng.IntN(2) == 0 {
					sl.Bonds = OneDouble
				}
				c.Slots = append(c.Slots, sl)
			}
			continue
		}
		if rng.IntN(2) == 0 {
			maxDeg := 0
			for _, x := range atoms {
				maxDeg = max(maxDeg, g.Degree(x))
			}
			c.MaxDegree = maxDeg
		}
		if rng.IntN(3) == 0 {
			all := func(p func(d, t int) bool) bool {
				for _, x := range atoms {
					d, t := 0, 0
					for _, e := range g.Neighbors(x) {
						if e.Order == molecule.Double {
							d++
						} else if e.Order == molecule.Triple {
							t++
						}
					}
					if !p(d, t) {
						return false
					}
				}
				return true
			}
			switch {
			case all(func(d, t int) bool { return d+t == 0 }):
				c.Bonds = SingleBonds
			case all(func(d, t int) bool { return d == 1 && t == 0 }):
				c.Bonds = OneDouble
			case all(func(d, t int) bool { return d+t > 0 }):
				c.Bonds = Unsaturated
			}
		}
		if c.Element == molecule.C && rng.IntN(2) == 0 {
			lo, hi := 99, 0
			for _, x := range atoms {
				sure, all := vicinalOf(g, x)
				hi = max(hi, sure)
				lo = min(lo, all)
			}
			c.Vicinal = Bound{On: true, Min: lo, Max: hi}
		}
		if rng.IntN(2) == 0 {
			// a neighbour sum with random intervals, its target around
			// the value for the atoms of the class
			var ns NeighbourSum
			for k := range ns.Per {
				a := rng.Float64() * 2
				ns.Per[k] = Interval{a, a + rng.Float64()}
			}
			lo, hi := 1e9, -1e9
			for _, x := range atoms {
				v := 0.0
				for _, e := range g.Neighbors(x) {
					iv := ns.Per[kindOf(g, e.Atom)]
					v += (iv.Lo + iv.Hi) / 2
				}
				lo, hi = min(lo, v), max(hi, v)
			}
			ns.Target = Interval{lo - 0.1, hi + 0.1}
			c.Sum = &ns
		}
		if rng.IntN(3) == 0 {
			// double-bonded heteroatom neighbours, as counted
			lo, hi := 99, 0
			for _, x := range atoms {
				n := 0
				for _, e := range g.Neighbors(x) {
					if e.Order == molecule.Double && g.Atoms[e.Atom].Element != molecule.C {
						n++
					}
				}
				lo, hi = min(lo, n), max(hi, n)
			}
			c.Neighbours = append(c.Neighbours, NeighbourRule{Elements: []molecule.Element{molecule.N, molecule.O, molecule.S}, Double: true, Min: lo, Max: hi})
		}
		if rng.IntN(2) == 0 {
			// neighbours that are heteroatoms or unsaturated, as counted
			lo, hi := 99, 0
			for _, x := range atoms {
				n := 0
				for _, e := range g.Neighbors(x) {
					u := e.Atom
					un := false
					for _, f := range g.Neighbors(u) {
						un = un || f.Order > molecule.Single
					}
					if g.Atoms[u].Element != molecule.C || un {
						n++
					}
				}
				lo, hi = min(lo, n), max(hi, n)
			}
			var els []molecule.Element
			for e := molecule.H + 1; e < molecule.NumElements; e++ {
				if e != molecule.C {
					els = append(els, e)
				}
			}
			c.Neighbours = append(c.Neighbours, NeighbourRule{Elements: els, Unsaturated: true, Min: lo, Max: hi})
		}
	}
	return s
}

// vicinalOf returns the Vicinal counts of atom x as atomFits computes them.
func vicinalOf(g *molecule.Graph, x int) (sure, all int) {
	for _, e := range g.Neighbors(x) {
		u := e.Atom
		h := g.Atoms[u].HCount
		all += h
		if g.Atoms[u].Element == molecule.F {
			all++
		}
		for _, f := range g.Neighbors(u) {
			if f.Atom != x && g.Atoms[f.Atom].Element == molecule.F {
				all++
			}
		}
		if g.Atoms[u].Element != molecule.C {
			continue
		}
		formyl := false
		for _, f := range g.Neighbors(u) {
			if f.Order == molecule.Double && g.Atoms[f.Atom].Element == molecule.O {
				formyl = h == 1
			}
		}
		if !formyl {
			sure += h
		}
	}
	return
}

func TestSpecRandomAgainstReference(t *testing.T) {
	formulas := []string{"C4H8O2", "C5H10O", "C6H6", "C5H9N", "C4H6O", "C3H6FCl", "C6H12", "C4H5NO", "C7H8"}
	if testing.Short() {
		formulas = formulas[:4]
	}
	rng := rand.New(rand.NewPCG(7, 11))
	for _, fs := range formulas {
		f := molecule.MustParseFormula(fs)
		var all []*molecule.Graph
		_, err := Generate(context.Background(), f, Options{Filter: NoFilter()}, func(g *molecule.Graph) bool {
			all = append(all, g.Clone())
			return true
		})
		require.NoError(t, err)
		for k := 0; k < 14; k++ {
			g := all[rng.IntN(len(all))]
			spec := randomSpec(rng, g)
			t.Run(fmt.Sprintf("%s/%s/%d", fs, molecule.CanonicalSMILES(g), k), func(t *testing.T) {
				got := specSet(t, f, &spec, NoFilter())
				ref := referenceSet(t, f, &spec, NoFilter(), false)
				assert.Equal(t, ref, got, "spec %v", spec.Classes)
				assert.Contains(t, got, molecule.CanonicalSMILES(g), "the structure the spec was drawn from")
			})
		}
	}
}

// A node limit cuts the same subtrees at the same place whatever the
// number of workers, so a truncated run emits the same set.
func TestNodeLimitDeterministic(t *testing.T) {
	f := molecule.MustParseFormula("C7H8O")
	full, err := Count(context.Background(), f, Options{ChargeSeparated: true})
	require.NoError(t, err)
	run := func(workers int, concurrent bool) ([]string, Stats) {
		var out []string
		var mu sync.Mutex
		opts := Options{Workers: workers, NodeLimit: full.Nodes / 3, ChargeSeparated: true}
		var st Stats
		var err error
		if concurrent {
			st, err = GenerateConcurrent(context.Background(), f, opts, func(_ int, g *molecule.Graph) bool {
				mu.Lock()
				out = append(out, molecule.CanonicalSMILES(g))
				mu.Unlock()
				return true
			})
		} else {
			st, err = Generate(context.Background(), f, opts, func(g *molecule.Graph) bool {
				out = append(out, molecule.CanonicalSMILES(g))
				return true
			})
		}
		require.NoError(t, err)
		slices.Sort(out)
		return out, st
	}
	a, sa := run(1, false)
	c, _ := run(3, false)
	b1, sb := run(1, true)
	b2, _ := run(2, true)
	require.Positive(t, sa.Truncated, "the limit must cut some subtrees for this test to mean anything")
	require.Positive(t, sb.Truncated, "the limit must cut some subtrees for this test to mean anything")
	assert.False(t, sa.Complete)
	assert.False(t, sb.Complete)
	assert.Equal(t, a, c, "Generate: equal shares per subtree")
	assert.Equal(t, b1, b2, "GenerateConcurrent: budget rounds")
	assert.GreaterOrEqual(t, len(b1), len(a), "rounds hand unused budget on, so they reach at least as far")
	assert.Less(t, int64(len(a)), full.Emitted)
	assert.Less(t, int64(len(b1)), full.Emitted)
}

// With an ambiguous Spec (two classes that can hold the same atom), every
// structure still comes out once, in Generate and GenerateConcurrent.
func TestAmbiguousSpecOnce(t *testing.T) {
	C, O := molecule.C, molecule.O
	f := molecule.MustParseFormula("C5H10O")
	spec := &Spec{Classes: []Class{
		{Element: C, H: 3, Count: 1},
		{Element: C, H: 3, Count: 1, Vicinal: Bound{On: true, Min: 0, Max: 2}},
		{Element: C, H: 2, Count: 1},
		{Element: C, H: 2, Count: 1},
		{Element: C, H: 0, Count: 1},
		{Element: O, H: 0, Count: 1},
	}}
	ordered := specSet(t, f, spec, DefaultFilter())
	var conc []string
	var mu sync.Mutex
	_, err := GenerateConcurrent(context.Background(), f, Options{Spec: spec}, func(_ int, g *molecule.Graph) bool {
		mu.Lock()
		conc = append(conc, molecule.CanonicalSMILES(g))
		mu.Unlock()
		return true
	})
	require.NoError(t, err)
	slices.Sort(conc)
	assert.Equal(t, ordered, conc)
	assert.Equal(t, referenceSet(t, f, spec, DefaultFilter(), false), ordered)
}
