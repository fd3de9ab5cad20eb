package molecule

import (
	"math/rand/v2"
	"slices"
	"testing"
)

// sameCompound: each group lists different ways of writing one compound
// (atom order, Kekulé structure, aromatic or Kekulé input, bracket
// atoms); all must give one Key and one CanonicalSMILES (common practice:
// these are the textbook equivalences of SMILES notation).
var sameCompound = [][]string{
	{"OCC", "C(O)C", "[CH3][CH2][OH]", "CCO"},
	{"c1ccccc1", "C1=CC=CC=C1", "C1C=CC=CC=1", "[cH]1[cH][cH][cH][cH][cH]1"},
	{"Cc1ccccc1C", "CC1=C(C)C=CC=C1", "CC1=CC=CC=C1C", "C1=CC=C(C)C(C)=C1"},
	{"c1ccc2ccccc2c1", "C1=CC2=CC=CC=C2C=C1", "C1=CC=C2C=CC=CC2=C1", "C12=CC=CC=C1C=CC=C2"},
	{"c1ccc2cc3ccccc3cc2c1", "C1=CC=C2C=C3C=CC=CC3=CC2=C1"},
	{"c1cc[nH]c1", "C1=CNC=C1", "N1C=CC=C1"},
	{"c1ccncc1", "C1=CC=NC=C1", "N1=CC=CC=C1"},
	{"c1ccoc1", "C1=COC=C1"},
	{"Oc1ccccc1", "OC1=CC=CC=C1", "C1=CC=CC(O)=C1"},
	{"c1ccc2[nH]ccc2c1", "C1=CC=C2NC=CC2=C1", "N1C=CC2=CC=CC=C21"},
	{"c1ccc2cccc2cc1", "C1=CC=C2C=CC=C2C=C1", "C1=CC2=CC=CC2=CC=C1"},
	{"CS(=O)(=O)C", "O=S(=O)(C)C", "CS(C)(=O)=O"},
	{"CP(=O)(C)C", "O=P(C)(C)C"},
	{"C#N", "N#C"},
	{"ClC(Cl)Cl", "C(Cl)(Cl)Cl"},
}

func TestCanonicalSameCompound(t *testing.T) {
	for _, group := range sameCompound {
		var key, smi string
		for i, s := range group {
			g := MustParseSMILES(s)
			c := Canonicalize(g)
			cs := CanonicalSMILES(g)
			if i == 0 {
				key, smi = c.Key, cs
				continue
			}
			if c.Key != key {
				t.Errorf("Canonicalize(%q).Key differs from that of %q (same compound)", s, group[0])
			}
			if cs != smi {
				t.Errorf("CanonicalSMILES(%q) = %q, want %q as for %q (same compound)", s, cs, smi, group[0])
			}
		}
	}
}

// differentCompounds must all get distinct Keys: constitutional isomers,
// and the two Kekulé structures of a substituted cyclooctatetraene (a 4n
// π system, not aromatic: its bond-shift isomers are distinct), and a
// pyridone against its hydroxypyridine tautomer.
var differentCompounds = []string{
	"CCCC", "CC(C)C", "CCO", "COC", "C1CC1", "C=CC",
	"CC1=C(C)C=CC=CC=C1", "CC1=CC=CC=CC=C1C",
	"O=C1C=CC=CN1", "Oc1ccccn1",
	"Cc1ccccc1C", "Cc1cccc(C)c1", "Cc1ccc(C)cc1",
	"c1ccc2ccccc2c1", "C1=CC=C2C=CC=C2C=C1",
	"CC(C)=O", "CCC=O", "C=CCO", "CC=CO",
}

func TestCanonicalDifferent(t *testing.T) {
	seen := map[string]string{}
	for _, s := range differentCompounds {
		k := Canonicalize(MustParseSMILES(s)).Key
		if prev, ok := seen[k]; ok {
			t.Errorf("Canonicalize(%q).Key equals that of %q (different compounds)", s, prev)
		}
		seen[k] = s
	}
}

// generalizedPetersen returns the carbon skeleton (CH atoms) of the
// generalised Petersen graph GP(n,k): outer cycle u_i–u_{i+1}, spokes
// u_i–v_i, inner edges v_i–v_{i+k}. GP(4,1) is the cube (cubane),
// GP(5,1) the pentagonal prism, GP(5,2) the Petersen graph, GP(10,2) the
// dodecahedron (dodecahedrane), GP(10,3) the Desargues graph (standard
// graph theory).
func generalizedPetersen(n, k int) *Graph {
	g := NewGraph(2 * n)
	for i := 0; i < 2*n; i++ {
		g.AddAtom(C, 1)
	}
	for i := 0; i < n; i++ {
		g.MustAddBond(i, (i+1)%n, Single)
		g.MustAddBond(i, n+i, Single)
		g.MustAddBond(n+i, n+(i+k)%n, Single)
	}
	return g
}

// moebiusLadder returns the CH skeleton of the Möbius ladder on n (even)
// vertices: a cycle with chords i–i+n/2. For n = 8 this is the Wagner
// graph, cubic like the cube but not bipartite.
func moebiusLadder(n int) *Graph {
	g := NewGraph(n)
	for i := 0; i < n; i++ {
		g.AddAtom(C, 1)
	}
	for i := 0; i < n; i++ {
		g.MustAddBond(i, (i+1)%n, Single)
	}
	for i := 0; i < n/2; i++ {
		g.MustAddBond(i, i+n/2, Single)
	}
	return g
}

// permuted returns g with its atoms renumbered by a random permutation and
// its bonds shuffled and flipped.
func permuted(g *Graph, r *rand.Rand) *Graph {
	n := len(g.Atoms)
	perm := r.Perm(n)
	h := NewGraph(n)
	h.Atoms = make([]Atom, n)
	for i, a := range g.Atoms {
		h.Atoms[perm[i]] = a
	}
	bonds := append([]Bond(nil), g.Bonds...)
	r.Shuffle(len(bonds), func(i, j int) { bonds[i], bonds[j] = bonds[j], bonds[i] })
	for _, b := range bonds {
		a, c := perm[b.A], perm[b.B]
		if r.IntN(2) == 0 {
			a, c = c, a
		}
		h.Bonds = append(h.Bonds, Bond{A: a, B: c, Order: b.Order})
	}
	h.RebuildAdjacency()
	return h
}

func countOrbits(orbits []int, g *Graph, e Element) int {
	seen := map[int]bool{}
	for i, o := range orbits {
		if g.Atoms[i].Element == e {
			seen[o] = true
		}
	}
	return len(seen)
}

func TestCanonicalSymmetricGraphs(t *testing.T) {
	tests := []struct {
		name      string
		g         *Graph
		orbits    int // carbon orbits
		automorph int // order of the automorphism group, 0 = not checked
		source    string
	}{
		{"cubane", generalizedPetersen(4, 1), 1, 48, "cube, Oh: 48 (standard graph theory)"},
		{"pentagonal prism", generalizedPetersen(5, 1), 1, 20, "D5h: 20 (standard graph theory)"},
		{"Petersen skeleton", generalizedPetersen(5, 2), 1, 120, "Petersen graph: 120 (standard graph theory)"},
		{"dodecahedrane", generalizedPetersen(10, 2), 1, 120, "Ih: 120 (standard graph theory)"},
		{"Desargues skeleton", generalizedPetersen(10, 3), 1, 240, "Desargues graph: 240 (standard graph theory)"},
		{"Wagner skeleton", moebiusLadder(8), 1, 16, "Wagner graph: 16 (standard graph theory)"},
		{"prismane", MustParseSMILES("C12C3C1C4C2C34"), 1, 12, "triangular prism D3h: 12 (common practice)"},
		{"adamantane", MustParseSMILES("C1C2CC3CC1CC(C2)C3"), 2, 24, "Td: CH and CH2 (common practice)"},
		{"toluene", MustParseSMILES("Cc1ccccc1"), 5, 2, "CH3, ipso, ortho, meta, para (common practice)"},
		{"benzene", MustParseSMILES("c1ccccc1"), 1, 12, "D6h graph symmetry: 12 (common practice)"},
		{"naphthalene", MustParseSMILES("c1ccc2ccccc2c1"), 3, 4, "α, β, fusion (common practice)"},
		{"neopentane", MustParseSMILES("CC(C)(C)C"), 2, 24, "central C and four CH3 (common practice)"},
		{"cyclohexane", MustParseSMILES("C1CCCCC1"), 1, 12, "common practice"},
		{"p-xylene", MustParseSMILES("Cc1ccc(C)cc1"), 3, 4, "CH3, ipso, CH (common practice)"},
		{"fullerene C60", MustParseSMILES("c12c3c4c5c1c1c6c7c2c2c8c3c3c9c4c4c%10c5c5c1c1c6c6c%11c7c2c2c7c8c3c3c8c9c4c4c9c%10c5c5c1c1c6c6c%11c2c2c7c3c3c8c4c4c9c5c1c1c6c2c3c41"), 1, 0, "Ih, all carbons equivalent (common practice)"},
		{"coronene", MustParseSMILES("c1cc2ccc3ccc4ccc5ccc6ccc1c7c2c3c4c5c67"), 3, 0, "CH, outer and inner ring-fusion C (common practice)"},
	}
	r := rand.New(rand.NewPCG(1, 2))
	for _, tc := range tests {
		c := Canonicalize(tc.g)
		if got := countOrbits(c.Orbits, tc.g, C); got != tc.orbits {
			t.Errorf("%s: %d carbon orbits, want %d (%s)", tc.name, got, tc.orbits, tc.source)
		}
		if tc.automorph > 0 {
			if got := groupOrder(tc.g); got != tc.automorph {
				t.Errorf("%s: brute-force automorphism count %d, want %d (%s)", tc.name, got, tc.automorph, tc.source)
			}
		}
		for k := 0; k < 20; k++ {
			h := permuted(tc.g, r)
			ch := Canonicalize(h)
			if ch.Key != c.Key {
				t.Fatalf("%s: Key of a renumbered copy differs", tc.name)
			}
			if got := countOrbits(ch.Orbits, h, C); got != tc.orbits {
				t.Errorf("%s (renumbered): %d carbon orbits, want %d", tc.name, got, tc.orbits)
			}
		}
	}
	// Pairs that colour refinement cannot tell apart (both cubic, same
	// number of vertices), but which are not isomorphic.
	pairs := []struct {
		name string
		a, b *Graph
	}{
		{"cube vs Wagner (8)", generalizedPetersen(4, 1), moebiusLadder(8)},
		{"Petersen vs pentagonal prism (10)", generalizedPetersen(5, 2), generalizedPetersen(5, 1)},
		{"Petersen vs Möbius ladder (10)", generalizedPetersen(5, 2), moebiusLadder(10)},
		{"dodecahedron vs Desargues (20)", generalizedPetersen(10, 2), generalizedPetersen(10, 3)},
	}
	for _, p := range pairs {
		if Canonicalize(p.a).Key == Canonicalize(p.b).Key {
			t.Errorf("%s: equal Keys for non-isomorphic graphs", p.name)
		}
	}
}

// groupOrder counts automorphisms of g's aromatised view by backtracking
// (independent of the canonical-labelling code), for checking Orbits.
func groupOrder(g *Graph) int {
	n := len(g.Atoms)
	arom := AromaticBonds(g)
	ord := func(b int) Order {
		if arom[b] {
			return Aromatic
		}
		return g.Bonds[b].Order
	}
	img := make([]int, n)
	used := make([]bool, n)
	for i := range img {
		img[i] = -1
	}
	var rec func(v int) int
	rec = func(v int) int {
		if v == n {
			return 1
		}
		total := 0
		for w := 0; w < n; w++ {
			if used[w] || g.Atoms[w].Element != g.Atoms[v].Element || g.Atoms[w].HCount != g.Atoms[v].HCount || g.Degree(w) != g.Degree(v) {
				continue
			}
			ok := true
			for _, nb := range g.Neighbors(v) {
				if nb.Atom < v {
					b := g.BondBetween(w, img[nb.Atom])
					if b < 0 || ord(b) != ord(nb.Bond) {
						ok = false
						break
					}
				}
			}
			if !ok {
				continue
			}
			img[v], used[w] = w, true
			total += rec(v + 1)
			img[v], used[w] = -1, false
		}
		return total
	}
	return rec(0)
}

func TestCanonicalizerMethodsAgree(t *testing.T) {
	var c Canonicalizer
	var buf []byte
	for _, s := range rdkitCrossCheckSMILES {
		g := MustParseSMILES(s)
		want := Canonicalize(g)
		if got := c.Key(g); got != want.Key {
			t.Errorf("%s: Canonicalizer.Key differs from Canonicalize", s)
		}
		buf = c.AppendKey(buf[:0], g)
		if string(buf) != want.Key {
			t.Errorf("%s: AppendKey differs", s)
		}
		if got := c.Orbits(nil, g); !slices.Equal(got, want.Orbits) {
			t.Errorf("%s: Orbits %v, want %v", s, got, want.Orbits)
		}
		if got := c.Labels(nil, g); !slices.Equal(got, want.Labels) {
			t.Errorf("%s: Labels %v, want %v", s, got, want.Labels)
		}
	}
}

// rookGraph returns the k×k rook's graph (cells adjacent when they share a
// row or column) on atoms of element e with no hydrogens. The 4×4 rook's
// graph and the Shrikhande graph are both strongly regular with
// parameters (16,6,2,2) but not isomorphic (standard graph theory).
func rookGraph(k int, e Element) *Graph {
	g := NewGraph(k * k)
	for i := 0; i < k*k; i++ {
		g.AddAtom(e, 0)
	}
	for a := 0; a < k*k; a++ {
		for b := a + 1; b < k*k; b++ {
			if a/k == b/k || a%k == b%k {
				g.MustAddBond(a, b, Single)
			}
		}
	}
	return g
}

// shrikhande returns the Shrikhande graph: vertices Z4×Z4, (a,b) adjacent
// to (a±1,b), (a,b±1), (a+1,b+1), (a−1,b−1) (standard construction).
func shrikhande(e Element) *Graph {
	g := NewGraph(16)
	for i := 0; i < 16; i++ {
		g.AddAtom(e, 0)
	}
	id := func(a, b int) int { return ((a+4)%4)*4 + (b+4)%4 }
	for a := 0; a < 4; a++ {
		for b := 0; b < 4; b++ {
			for _, d := range [][2]int{{1, 0}, {0, 1}, {1, 1}} {
				g.MustAddBond(id(a, b), id(a+d[0], b+d[1]), Single)
			}
		}
	}
	return g
}

func TestCanonicalStronglyRegular(t *testing.T) {
	// Sulfur with six single bonds (valence 6) carries the degree-6 graphs.
	rook, shr := rookGraph(4, S), shrikhande(S)
	paley9 := rookGraph(3, C) // Paley graph of order 9 = 3×3 rook's graph
	r := rand.New(rand.NewPCG(5, 9))
	for _, tc := range []struct {
		name string
		g    *Graph
		aut  int
	}{
		{"4x4 rook", rook, 1152}, // (S4 × S4) ⋊ 2 (standard graph theory)
		{"Shrikhande", shr, 192}, // standard graph theory
		{"Paley 9", paley9, 72},  // (S3 × S3) ⋊ 2
	} {
		c := Canonicalize(tc.g)
		if n := countOrbits(c.Orbits, tc.g, tc.g.Atoms[0].Element); n != 1 {
			t.Errorf("%s: %d orbits, want 1 (vertex-transitive)", tc.name, n)
		}
		if got := groupOrder(tc.g); got != tc.aut {
			t.Errorf("%s: brute-force automorphism count %d, want %d", tc.name, got, tc.aut)
		}
		for k := 0; k < 10; k++ {
			if Canonicalize(permuted(tc.g, r)).Key != c.Key {
				t.Fatalf("%s: renumbered copy has another Key", tc.name)
			}
		}
	}
	if Canonicalize(rook).Key == Canonicalize(shr).Key {
		t.Errorf("4x4 rook's graph and Shrikhande graph: equal Keys, but they are not isomorphic")
	}
}
