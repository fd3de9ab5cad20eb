package molecule

import (
	"math/rand/v2"
	"os/exec"
	"slices"
	"strings"
	"testing"

	"shiftrank/internal/rdkittest"
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

// TestRingsAgainstRDKit compares SSSR ring sizes and the smallest ring
// size of every atom with RDKit's ring perception (sizes, not ring atoms:
// smallest sets are not unique) on the cross-check list
// and random substituted ring systems.
func TestRingsAgainstRDKit(t *testing.T) {
	rdkittest.Require(t)
	r := rand.New(rand.NewPCG(31, 7))
	var smiles []string
	for _, s := range rdkitCrossCheckSMILES {
		smiles = append(smiles, MustParseSMILES(s).SMILES())
	}
	for _, s := range []string{"C12C3C4C1C5C2C3C45", "C1C2CC3CC1CC(C2)C3", "C12C3C1C4C2C34", "C1CC2CCC1C2", "C1CC11CC1"} {
		smiles = append(smiles, s)
	}
	for i := 0; i < 200; i++ {
		smiles = append(smiles, randomMolecule(r, r.IntN(6)).SMILES())
	}
	cmd := exec.Command(rdkittest.Python, "testdata/rdkit_rings.py")
	cmd.Stdin = strings.NewReader(strings.Join(smiles, "\n") + "\n")
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("run RDKit: %v", err)
	}
	lines := strings.Split(strings.TrimRight(string(out), "\n"), "\n")
	if len(lines) != len(smiles) {
		t.Fatalf("RDKit printed %d lines, want %d", len(lines), len(smiles))
	}
	join := func(x []int) string {
		var b strings.Builder
		for i, v := range x {
			if i > 0 {
				b.WriteByte(',')
			}
			b.WriteString(itoa(v))
		}
		return b.String()
	}
	for i, s := range smiles {
		// Atom k of the parsed graph is the k-th atom of the string, as in RDKit.
		g := MustParseSMILES(s)
		ri := Rings(g)
		var sizes []int
		for _, ring := range ri.SSSR {
			sizes = append(sizes, len(ring))
		}
		slices.Sort(sizes)
		want := strings.Split(lines[i], "\t")
		if len(want) != 2 {
			t.Errorf("RDKit cannot read %q", s)
			continue
		}
		// RDKit returns a symmetrised ring set (cubane: 6 rings), so our
		// sizes must be contained in RDKit's, and their number must be the
		// cyclomatic number (bonds − atoms + 1, graph theory).
		if len(sizes) != len(g.Bonds)-len(g.Atoms)+1 {
			t.Errorf("Rings(%q): %d SSSR rings, want the cyclomatic number %d", s, len(sizes), len(g.Bonds)-len(g.Atoms)+1)
		}
		rd := map[string]int{}
		if want[0] != "" {
			for _, x := range strings.Split(want[0], ",") {
				rd[x]++
			}
		}
		for _, x := range sizes {
			if rd[itoa(x)] == 0 {
				t.Errorf("Rings(%q) SSSR sizes %s not within RDKit's %s", s, join(sizes), want[0])
				break
			}
			rd[itoa(x)]--
		}
		if got := join(ri.AtomRingSize); got != want[1] {
			t.Errorf("Rings(%q) AtomRingSize %s, RDKit %s", s, got, want[1])
		}
	}
}
