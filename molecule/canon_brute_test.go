package molecule

import (
	"math/rand/v2"
	"slices"
	"testing"
)

// The tests in this file check Canonicalize against brute-force
// backtracking (written independently here) on many random small graphs:
// Orbits must equal the orbits of the full automorphism group, and two
// graphs must have equal Keys exactly when they are isomorphic.

// viewOrders returns the bond orders of g's aromatised view.
func viewOrders(g *Graph) []Order {
	arom := AromaticBonds(g)
	o := make([]Order, len(g.Bonds))
	for i, b := range g.Bonds {
		o[i] = b.Order
		if arom[i] {
			o[i] = Aromatic
		}
	}
	return o
}

// bruteMaps calls f for every isomorphism from a to b (as an image array)
// until f returns false.
func bruteMaps(a, b *Graph, f func(img []int) bool) {
	n := len(a.Atoms)
	if n != len(b.Atoms) || len(a.Bonds) != len(b.Bonds) {
		return
	}
	oa, ob := viewOrders(a), viewOrders(b)
	img := make([]int, n)
	used := make([]bool, n)
	stop := false
	var rec func(v int)
	rec = func(v int) {
		if stop {
			return
		}
		if v == n {
			if !f(img) {
				stop = true
			}
			return
		}
		av := a.Atoms[v]
		for w := 0; w < n && !stop; w++ {
			bw := b.Atoms[w]
			if used[w] || av.Element != bw.Element || av.HCount != bw.HCount || av.Charge != bw.Charge || a.Degree(v) != b.Degree(w) {
				continue
			}
			ok := true
			for _, nb := range a.Neighbors(v) {
				if nb.Atom < v {
					k := b.BondBetween(w, img[nb.Atom])
					if k < 0 || ob[k] != oa[nb.Bond] {
						ok = false
						break
					}
				}
			}
			if !ok {
				continue
			}
			img[v], used[w] = w, true
			rec(v + 1)
			used[w] = false
		}
	}
	rec(0)
}

func bruteIsomorphic(a, b *Graph) bool {
	found := false
	bruteMaps(a, b, func([]int) bool { found = true; return false })
	return found
}

func bruteOrbits(g *Graph) []int {
	n := len(g.Atoms)
	orb := make([]int, n)
	for i := range orb {
		orb[i] = i
	}
	bruteMaps(g, g, func(img []int) bool {
		for v, w := range img {
			if w < orb[v] {
				orb[v] = w
			}
		}
		return true
	})
	// orb[v] is now the smallest image of v, which is the smallest member
	// of its orbit.
	return orb
}

// randomGraph returns a random connected graph with n atoms and about
// extra additional bonds, elements and orders drawn from small sets so
// that symmetric and near-symmetric graphs are common.
func randomGraph(r *rand.Rand, n, extra int, elems []Element, maxOrder int) *Graph {
	g := NewGraph(n)
	for i := 0; i < n; i++ {
		g.AddAtom(elems[r.IntN(len(elems))], r.IntN(2))
	}
	for i := 1; i < n; i++ {
		g.MustAddBond(i, r.IntN(i), Order(1+r.IntN(maxOrder)))
	}
	for k := 0; k < extra; k++ {
		a, b := r.IntN(n), r.IntN(n)
		if a != b && g.BondBetween(a, b) < 0 {
			g.MustAddBond(a, b, Order(1+r.IntN(maxOrder)))
		}
	}
	return g
}

// randomCubic returns a random simple cubic graph on n vertices (CH
// atoms), or nil if the configuration-model attempt failed.
func randomCubic(r *rand.Rand, n int) *Graph {
	for attempt := 0; attempt < 100; attempt++ {
		pts := make([]int, 0, 3*n)
		for v := 0; v < n; v++ {
			pts = append(pts, v, v, v)
		}
		r.Shuffle(len(pts), func(i, j int) { pts[i], pts[j] = pts[j], pts[i] })
		g := NewGraph(n)
		for v := 0; v < n; v++ {
			g.AddAtom(C, 1)
		}
		ok := true
		for i := 0; i < len(pts); i += 2 {
			if pts[i] == pts[i+1] || g.BondBetween(pts[i], pts[i+1]) >= 0 {
				ok = false
				break
			}
			g.MustAddBond(pts[i], pts[i+1], Single)
		}
		if ok {
			return g
		}
	}
	return nil
}

func checkOrbits(t *testing.T, what string, g *Graph) {
	t.Helper()
	got := Canonicalize(g).Orbits
	want := bruteOrbits(g)
	for i := range want {
		if got[i] != want[i] {
			t.Fatalf("%s %s: Orbits = %v, brute force %v", what, g.SMILES(), got, want)
		}
	}
}

func TestCanonicalBruteForceRandom(t *testing.T) {
	r := rand.New(rand.NewPCG(7, 11))
	type sample struct {
		g   *Graph
		key string
	}
	for round := 0; round < 300; round++ {
		n := 3 + r.IntN(6)
		var graphs []sample
		for k := 0; k < 6; k++ {
			g := randomGraph(r, n, r.IntN(4), []Element{C, C, C, N}, 1+r.IntN(2))
			if round%10 == 0 {
				// Hydrogen counts beyond the packed invariant fields take
				// the general initial-partition path.
				for i := range g.Atoms {
					g.Atoms[i].HCount = 16 + r.IntN(2)
				}
			}
			checkOrbits(t, "random", g)
			graphs = append(graphs, sample{g, Canonicalize(g).Key})
			h := permuted(g, r)
			if Canonicalize(h).Key != graphs[len(graphs)-1].key {
				t.Fatalf("renumbered %s: different Key", g.SMILES())
			}
			graphs = append(graphs, sample{h, Canonicalize(h).Key})
		}
		for i := range graphs {
			for j := i + 1; j < len(graphs); j++ {
				iso := bruteIsomorphic(graphs[i].g, graphs[j].g)
				if eq := graphs[i].key == graphs[j].key; eq != iso {
					t.Fatalf("%s vs %s: equal Keys %v, brute-force isomorphic %v", graphs[i].g.SMILES(), graphs[j].g.SMILES(), eq, iso)
				}
			}
		}
	}
}

func TestCanonicalBruteForceCubic(t *testing.T) {
	r := rand.New(rand.NewPCG(3, 5))
	for _, n := range []int{6, 8, 10} {
		var gs []*Graph
		for len(gs) < 12 {
			if g := randomCubic(r, n); g != nil {
				gs = append(gs, g)
			}
		}
		keys := make([]string, len(gs))
		for i, g := range gs {
			keys[i] = Canonicalize(g).Key
			checkOrbits(t, "cubic", g)
		}
		for i := range gs {
			for j := i + 1; j < len(gs); j++ {
				if eq, iso := keys[i] == keys[j], bruteIsomorphic(gs[i], gs[j]); eq != iso {
					t.Fatalf("cubic n=%d %s vs %s: equal Keys %v, isomorphic %v", n, gs[i].SMILES(), gs[j].SMILES(), eq, iso)
				}
			}
		}
	}
}

func TestCanonicalOrbitsMolecules(t *testing.T) {
	for _, s := range rdkitCrossCheckSMILES {
		g := MustParseSMILES(s)
		if len(g.Atoms) <= 12 {
			checkOrbits(t, "molecule", g)
		}
	}
	for _, g := range []*Graph{generalizedPetersen(4, 1), generalizedPetersen(5, 2), moebiusLadder(8), MustParseSMILES("C1C2CC3CC1CC(C2)C3")} {
		checkOrbits(t, "symmetric", g)
	}
}

// TestCanonicalBruteForceForests covers the forest shortcut (first search
// path only, orbits from the equitable partition) on symmetric random
// trees and two-tree forests of one element.
func TestCanonicalBruteForceForests(t *testing.T) {
	r := rand.New(rand.NewPCG(13, 17))
	for round := 0; round < 150; round++ {
		n := 4 + r.IntN(6)
		var gs []*Graph
		var keys []string
		for k := 0; k < 8; k++ {
			g := randomGraph(r, n, 0, []Element{C}, 1+r.IntN(2))
			if k%2 == 1 {
				// Cut one bond: a forest of two trees.
				b := g.Bonds[r.IntN(len(g.Bonds))]
				h := NewGraph(n)
				h.Atoms = append(h.Atoms, g.Atoms...)
				for _, x := range g.Bonds {
					if x != b {
						h.Bonds = append(h.Bonds, x)
					}
				}
				h.RebuildAdjacency()
				g = h
			}
			checkOrbits(t, "forest", g)
			gs = append(gs, g)
			keys = append(keys, Canonicalize(g).Key)
			if Canonicalize(permuted(g, r)).Key != keys[len(keys)-1] {
				t.Fatalf("renumbered forest %s: different Key", g.SMILES())
			}
		}
		for i := range gs {
			for j := i + 1; j < len(gs); j++ {
				if eq, iso := keys[i] == keys[j], bruteIsomorphic(gs[i], gs[j]); eq != iso {
					t.Fatalf("%s vs %s: equal Keys %v, isomorphic %v", gs[i].SMILES(), gs[j].SMILES(), eq, iso)
				}
			}
		}
	}
}

// TestCanonicalizerReuse runs one Canonicalizer over graphs of varying
// size and symmetry and compares with fresh ones (no state may leak from
// one call to the next).
func TestCanonicalizerReuse(t *testing.T) {
	r := rand.New(rand.NewPCG(99, 1))
	var c Canonicalizer
	for i := 0; i < 400; i++ {
		var g *Graph
		switch i % 4 {
		case 0:
			g = randomGraph(r, 1+r.IntN(12), r.IntN(5), []Element{C, N, O}, 2)
		case 1:
			g = randomCubic(r, 4+2*r.IntN(4))
		case 2:
			g = randomMolecule(r, r.IntN(6))
		default:
			g = randomGraph(r, 1+r.IntN(20), 0, []Element{C}, 1)
		}
		if g == nil {
			continue
		}
		want := Canonicalize(g)
		got := c.Canonicalize(g)
		if got.Key != want.Key || !slices.Equal(got.Labels, want.Labels) || !slices.Equal(got.Orbits, want.Orbits) {
			t.Fatalf("reused Canonicalizer differs on %s", g.SMILES())
		}
		s1, _ := c.CanonicalSMILES(g)
		if s1 != CanonicalSMILES(g) {
			t.Fatalf("reused Canonicalizer: CanonicalSMILES differs on %s", g.SMILES())
		}
	}
}
