package molecule

import (
	"math/rand/v2"
	"slices"
	"testing"
)

func TestAromaticBonds(t *testing.T) {
	// Expected aromatic atom counts: Hückel's rule as stated in aromatic.go
	// (common practice for these textbook compounds).
	tests := []struct {
		smiles string
		atoms  int // aromatic atoms
		why    string
	}{
		{"C1=CC=CC=C1", 6, "benzene, 6 π"},
		{"CC1=CC=CC=C1", 6, "toluene: ring only"},
		{"C1=CC=NC=C1", 6, "pyridine"},
		{"C1=CNC=C1", 5, "pyrrole, NH gives 2"},
		{"C1=COC=C1", 5, "furan"},
		{"C1=CSC=C1", 5, "thiophene"},
		{"C1=CC=C2C=CC=CC2=C1", 10, "naphthalene"},
		{"C1=CC=C2C=CC=C2C=C1", 10, "azulene, 10 π perimeter"},
		{"C1=CC=CC=CC=C1", 0, "cyclooctatetraene, 8 π"},
		{"C1=CC=C1", 0, "cyclobutadiene, 4 π"},
		{"C1=CCC=C1", 0, "cyclopentadiene: CH2 is sp3"},
		{"O=C1C=CC=CN1", 0, "2-pyridone: exocyclic C=O (documented choice)"},
		{"O=C1C=CC(=O)C=C1", 0, "p-benzoquinone"},
		{"C=C1C=CC=C1", 0, "fulvene: exocyclic C=C"},
		{"C1=CC2=CC=CC2=C1", 0, "pentalene, 8 π"},
		{"[CH-]1C=CC=C1", 5, "cyclopentadienide, 6 π"},
		{"[CH+]1C=CC=CC=C1", 7, "tropylium, 6 π"},
		{"C1=C[N-]C=C1", 5, "pyrrolide, 6 π"},
		{"C1=CC=[N+](C)C=C1", 6, "N-methylpyridinium"},
		{"C1=CC=C(C=C1)C1=CC=CC=C1", 12, "biphenyl: two rings, linking bond not aromatic"},
		{"C1CCCCC1", 0, "cyclohexane"},
		{"C1=CC=CC=CC=CC=C1", 10, "[10]annulene, 10 π (graph model: no strain)"},
	}
	for _, tc := range tests {
		g := MustParseSMILES(tc.smiles)
		n := 0
		for _, a := range AromaticAtoms(g) {
			if a {
				n++
			}
		}
		if n != tc.atoms {
			t.Errorf("AromaticAtoms(%q): %d aromatic atoms, want %d (%s)", tc.smiles, n, tc.atoms, tc.why)
		}
	}
	g := MustParseSMILES("C1=CC=C(C=C1)C1=CC=CC=C1")
	if AromaticBonds(g)[g.BondBetween(3, 6)] {
		t.Errorf("biphenyl linking bond perceived aromatic")
	}
	var a Aromaticity
	for _, tc := range tests {
		g := MustParseSMILES(tc.smiles)
		if !slices.Equal(a.Bonds(g), AromaticBonds(g)) {
			t.Errorf("Aromaticity.Bonds(%q) differs from AromaticBonds", tc.smiles)
		}
	}
}

// TestKekuleVariantsSameKey: renumbered, re-kekulised copies of random
// substituted ring systems keep their Key, CanonicalSMILES and aromatic
// bond count (the invariance the isomer generator relies on).
func TestKekuleVariantsSameKey(t *testing.T) {
	r := rand.New(rand.NewPCG(4, 4))
	for i := 0; i < 300; i++ {
		g := randomMolecule(r, r.IntN(6))
		c := Canonicalize(g)
		cs := CanonicalSMILES(g)
		na := countTrue(AromaticBonds(g))
		for k := 0; k < 4; k++ {
			h := kekuleVariant(g, r)
			if h == nil {
				t.Fatalf("%s: cannot re-kekulise", g.SMILES())
			}
			if Canonicalize(h).Key != c.Key || CanonicalSMILES(h) != cs || countTrue(AromaticBonds(h)) != na {
				t.Fatalf("Kekulé variant %s of %s: different canonical form", h.SMILES(), g.SMILES())
			}
		}
	}
}

func countTrue(b []bool) int {
	n := 0
	for _, x := range b {
		if x {
			n++
		}
	}
	return n
}

// TestAromaticOrderInput: a graph that still carries Aromatic bond orders
// (not kekulised) is perceived like its Kekulé structure.
func TestAromaticOrderInput(t *testing.T) {
	for _, s := range []string{"c1ccccc1", "Cc1ccncc1", "c1cc[nH]c1", "c1ccc2ccccc2c1", "c1ccoc1"} {
		kek := MustParseSMILES(s)
		g := kek.Clone()
		arom := AromaticBonds(kek)
		for i, a := range arom {
			if a {
				g.SetBondOrder(i, Aromatic)
			}
		}
		if !slices.Equal(AromaticBonds(g), arom) {
			t.Errorf("%s with Aromatic orders: AromaticBonds %v, want %v", s, AromaticBonds(g), arom)
		}
		if Canonicalize(g).Key != Canonicalize(kek).Key || CanonicalSMILES(g) != CanonicalSMILES(kek) {
			t.Errorf("%s with Aromatic orders: canonical form differs from the Kekulé one", s)
		}
	}
}
