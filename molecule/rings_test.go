package molecule

import (
	"slices"
	"testing"
)

func TestRings(t *testing.T) {
	// Ring sizes: common practice (structures of these textbook compounds).
	tests := []struct {
		smiles    string
		sizes     []int // SSSR ring sizes, sorted
		atomSizes []int // smallest ring size per atom, nil = not checked
	}{
		{"CCCC", nil, []int{0, 0, 0, 0}},
		{"C1CC1", []int{3}, []int{3, 3, 3}},
		{"C1CCCCC1C", []int{6}, []int{6, 6, 6, 6, 6, 6, 0}},
		{"c1ccc2ccccc2c1", []int{6, 6}, nil},
		{"C12CC1C2", []int{3, 3}, nil},                    // bicyclo[1.1.0]butane
		{"C1CC2CCC1C2", []int{5, 5}, nil},                 // norbornane
		{"C1C2CC3CC1CC(C2)C3", []int{6, 6, 6}, nil},       // adamantane
		{"C12C3C4C1C5C2C3C45", []int{4, 4, 4, 4, 4}, nil}, // cubane
		{"C1CC11CC1", []int{3, 3}, []int{3, 3, 3, 3, 3}},  // spiropentane
		{"c1ccc(cc1)-c1ccccc1", []int{6, 6}, nil},
		{"C1CCC2(CC1)CCCC2", []int{5, 6}, nil},
	}
	for _, tc := range tests {
		g := MustParseSMILES(tc.smiles)
		ri := Rings(g)
		var sizes []int
		for _, r := range ri.SSSR {
			sizes = append(sizes, len(r))
			for k := range r {
				if g.BondBetween(r[k], r[(k+1)%len(r)]) < 0 {
					t.Errorf("Rings(%q): ring %v is not a cycle", tc.smiles, r)
				}
			}
		}
		slices.Sort(sizes)
		if !slices.Equal(sizes, tc.sizes) {
			t.Errorf("Rings(%q) SSSR sizes %v, want %v", tc.smiles, sizes, tc.sizes)
		}
		if tc.atomSizes != nil && !slices.Equal(ri.AtomRingSize, tc.atomSizes) {
			t.Errorf("Rings(%q) AtomRingSize %v, want %v", tc.smiles, ri.AtomRingSize, tc.atomSizes)
		}
		for i, s := range ri.AtomRingSize {
			if ri.AtomInRing[i] != (s > 0) {
				t.Errorf("Rings(%q): AtomInRing[%d] inconsistent", tc.smiles, i)
			}
		}
	}
	// Biphenyl's linking bond is in no ring.
	g := MustParseSMILES("c1ccc(cc1)-c1ccccc1")
	ri := Rings(g)
	link := g.BondBetween(3, 6)
	if ri.BondInRing[link] || ri.BondRingSize[link] != 0 {
		t.Errorf("Rings(biphenyl): linking bond in ring")
	}
}
