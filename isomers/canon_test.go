package isomers

import (
	"context"
	"math/rand"
	"testing"

	"shiftrank/molecule"
)

// eachMol calls fn with the internal form of every structure of f.
func eachMol(t *testing.T, formula string, fn func(m *mol)) {
	t.Helper()
	f := molecule.MustParseFormula(formula)
	_, err := Generate(context.Background(), f, Options{Filter: NoFilter(), allKekule: true}, func(g *molecule.Graph) bool {
		var m mol
		if !fromGraph(g, &m) {
			t.Fatalf("fromGraph failed on a generated structure")
		}
		fn(&m)
		return true
	})
	if err != nil {
		t.Fatal(err)
	}
}

// TestTreeCellsAreOrbits checks the fact the tree fast paths rely on: for
// (vertex- and edge-coloured) trees the equitable partition is the orbit
// partition (colour refinement identifies trees; Immerman and Lander
// 1990). Orbits come from the full search.
func TestTreeCellsAreOrbits(t *testing.T) {
	for _, fs := range []string{"C10H22", "C7H16O", "C5H13N", "C5H11NO", "C4H9ClO"} {
		trees := 0
		eachMol(t, fs, func(m *mol) {
			if !m.isTree() {
				return
			}
			trees++
			var cz canonizer
			cz.m = m
			cz.vertexKeys()
			var p partition
			cz.initPartition(&p)
			q := p
			var res canonResult
			cz.search(&q, &res)
			for x := 0; x < m.n; x++ {
				for y := 0; y < m.n; y++ {
					sameCell := p.cellOf[x] == p.cellOf[y]
					sameOrbit := res.orbit[x] == res.orbit[y]
					if sameCell != sameOrbit {
						t.Fatalf("%s: atoms %d, %d: same cell %v, same orbit %v", fs, x, y, sameCell, sameOrbit)
					}
				}
			}
		})
		if trees == 0 {
			t.Errorf("%s: no trees", fs)
		}
	}
}

// relabel returns m with vertex i moved to perm[i].
func relabel(m *mol, perm []int) *mol {
	r := &mol{n: m.n, edges: m.edges}
	for i := 0; i < m.n; i++ {
		j := perm[i]
		r.col[j], r.el[j], r.val[j], r.deg[j], r.bsum[j] = m.col[i], m.el[i], m.val[i], m.deg[i], m.bsum[i]
		for k := 0; k < int(m.deg[i]); k++ {
			r.nb[j][k] = uint8(perm[m.nb[i][k]])
			r.bo[j][k] = m.bo[i][k]
			r.adj[j] |= 1 << uint(perm[m.nb[i][k]])
		}
	}
	return r
}

func certAndOrbits(m *mol) ([]byte, canonResult) {
	var cz canonizer
	cz.m = m
	cz.vertexKeys()
	var p partition
	cz.initPartition(&p)
	var res canonResult
	cz.search(&p, &res)
	return append([]byte(nil), cz.bestCert...), res
}

// TestCanonicalInvariance: the certificate does not depend on the atom
// numbering, and orbits move with the atoms.
func TestCanonicalInvariance(t *testing.T) {
	rng := rand.New(rand.NewSource(1))
	for _, fs := range []string{"C8H8", "C6H12O", "C5H5N", "C6H6"} {
		count := 0
		eachMol(t, fs, func(m *mol) {
			count++
			if count%3 != 0 && m.n > 6 {
				return
			}
			c0, r0 := certAndOrbits(m)
			for trial := 0; trial < 3; trial++ {
				perm := rng.Perm(m.n)
				pm := relabel(m, perm)
				c1, r1 := certAndOrbits(pm)
				if string(c0) != string(c1) {
					t.Fatalf("%s: certificate changes under relabelling", fs)
				}
				for x := 0; x < m.n; x++ {
					for y := 0; y < m.n; y++ {
						if (r0.orbit[x] == r0.orbit[y]) != (r1.orbit[perm[x]] == r1.orbit[perm[y]]) {
							t.Fatalf("%s: orbits change under relabelling", fs)
						}
					}
				}
			}
		})
	}
}

// TestCanonicalSymmetric: highly symmetric graphs (cubane, adamantane,
// dodecahedrane skeletons drawn as saturated hydrocarbons) relabelled at
// random keep their certificate and have one orbit of carbons (or the
// known two for adamantane: 4 CH and 6 CH2; common practice).
func TestCanonicalSymmetric(t *testing.T) {
	rng := rand.New(rand.NewSource(2))
	cases := []struct {
		smiles string
		orbits int
	}{
		{"C12C3C4C1C5C2C3C45", 1}, // cubane
		{"C1C2CC3CC1CC(C2)C3", 2}, // adamantane
		{"C1CC1", 1},              // cyclopropane
		{"C12C3C1C23", 1},         // tetrahedrane
		{"C1CCCCCCCCCCC1", 1},     // cyclododecane
		{"C12C3C4C5C1C6C7C2C8C3C9C4C%10C5C6C%11C7C8C9C%10%11", 1}, // dodecahedrane (20 CH, all rings five-membered; RDKit: one symmetry class)
	}
	for _, c := range cases {
		g, err := molecule.ParseSMILES(c.smiles)
		if err != nil {
			t.Fatalf("ParseSMILES(%q): %v", c.smiles, err)
		}
		var m mol
		if !fromGraph(g, &m) {
			t.Fatalf("fromGraph(%q)", c.smiles)
		}
		c0, r0 := certAndOrbits(&m)
		orb := map[uint8]bool{}
		for x := 0; x < m.n; x++ {
			orb[r0.orbit[x]] = true
		}
		if len(orb) != c.orbits {
			t.Errorf("%s: %d orbits, want %d", c.smiles, len(orb), c.orbits)
		}
		for trial := 0; trial < 5; trial++ {
			c1, _ := certAndOrbits(relabel(&m, rng.Perm(m.n)))
			if string(c0) != string(c1) {
				t.Errorf("%s: certificate changes under relabelling", c.smiles)
			}
		}
	}
}
