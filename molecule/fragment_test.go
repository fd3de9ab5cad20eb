package molecule

import (
	"math/rand/v2"
	"os/exec"
	"strings"
	"testing"

	"shiftrank/internal/rdkittest"
)

func TestFragmentMatches(t *testing.T) {
	// Expected answers: common practice (functional groups present in
	// these textbook structures).
	tests := []struct {
		frag, target string
		want         bool
	}{
		{"C=O", "CC(=O)C", true},
		{"C=O", "CCO", false},
		{"[OH]", "CCO", true},
		{"[OH]", "COC", false},
		{"[CH3]", "CC", true},
		{"[CH3]", "C1CC1", false},
		{"c1ccccc1", "C1=CC=CC=C1C", true},
		{"c1ccccc1", "C1CCCCC1", false},
		{"C1CCCCC1", "c1ccccc1", false},
		{"C=C", "c1ccccc1", false},
		{"C=C", "C=CC", true},
		{"c1ccncc1", "Cc1ccncc1", true},
		{"c1ccncc1", "c1ccccc1", false},
		{"[nH]", "c1cc[nH]c1", true},
		{"C(=O)O", "CC(=O)OC", true},
		{"C(=O)[OH]", "CC(=O)OC", false},
		{"C(=O)[OH]", "CC(=O)O", true},
		{"OO", "COOC", true},
		{"OO", "COC", false},
		{"C#N", "CC#N", true},
		{"CC(C)(C)C", "CC(C)(C)CC", true},
		{"CC(C)(C)C", "CC(C)CC", false},
		{"cO", "Oc1ccccc1", true},
		{"CO", "Oc1ccccc1", false},
		{"c-c", "c1ccc(cc1)-c1ccccc1", true},
		{"c-c", "c1ccccc1", false},
		{"cc", "c1ccccc1", true},
		{"S(=O)(=O)", "CS(C)(=O)=O", true},
		{"Cl", "CCl", true},
		{"Br", "CCl", false},
	}
	for _, tc := range tests {
		f := MustParseFragment(tc.frag)
		if got := f.Matches(MustParseSMILES(tc.target)); got != tc.want {
			t.Errorf("ParseFragment(%q).Matches(%q) = %v, want %v", tc.frag, tc.target, got, tc.want)
		}
	}
	if got := MustParseFragment("CC").Count(MustParseSMILES("CC")); got != 2 {
		t.Errorf("CC in ethane: %d embeddings, want 2", got)
	}
	if _, err := ParseFragment("C.C"); err == nil {
		t.Errorf("ParseFragment(C.C): no error")
	}
}

// fragmentQueries are written so that they mean the same as SMILES
// queries here and as SMARTS in RDKit.
var fragmentQueries = []string{
	"C=O", "[OH]", "[CH3]", "[CH2]", "c1ccccc1", "c1ccncc1", "C=C", "C#N", "CO", "cO", "c-c",
	"[nH]", "C(=O)O", "C(=O)[OH]", "OO", "S(=O)=O", "Cl", "cCl", "CCC", "C1CC1", "c1ccoc1",
	"[N]", "[C]=[C]", "cc", "cn", "C(C)(C)C", "C=CC=O", "NC=O", "[CH0]", "c[CH3]",
}

// TestFragmentAgainstRDKit compares Matches with RDKit's substructure
// search (query read as SMARTS) on random substituted ring systems. Targets
// whose aromatic atoms differ between the two aromaticity models (RDKit
// also aromatises rings with an exocyclic C=O, such as 2-pyridone) are
// skipped.
func TestFragmentAgainstRDKit(t *testing.T) {
	rdkittest.Require(t)
	r := rand.New(rand.NewPCG(77, 3))
	var targets []*Graph
	var in strings.Builder
	for i := 0; i < 60; i++ {
		g := MustParseSMILES(randomMolecule(r, r.IntN(6)).SMILES())
		targets = append(targets, g)
		for _, q := range fragmentQueries {
			in.WriteString(q + "\t" + g.SMILES() + "\n")
		}
	}
	cmd := exec.Command(rdkittest.Python, "testdata/rdkit_match.py")
	cmd.Stdin = strings.NewReader(in.String())
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("run RDKit: %v", err)
	}
	lines := strings.Split(strings.TrimRight(string(out), "\n"), "\n")
	if len(lines) != len(targets)*len(fragmentQueries) {
		t.Fatalf("RDKit printed %d lines, want %d", len(lines), len(targets)*len(fragmentQueries))
	}
	compared, skipped := 0, 0
	for i, g := range targets {
		ours := ""
		for _, a := range AromaticAtoms(g) {
			if a {
				ours += "1"
			} else {
				ours += "0"
			}
		}
		for j, q := range fragmentQueries {
			f := strings.Split(lines[i*len(fragmentQueries)+j], "\t")
			if len(f) != 2 {
				t.Fatalf("RDKit cannot read %q or %q", q, g.SMILES())
			}
			if f[1] != ours {
				skipped++
				continue
			}
			compared++
			if got, want := MustParseFragment(q).Matches(g), f[0] == "1"; got != want {
				t.Errorf("ParseFragment(%q).Matches(%q) = %v, RDKit %v", q, g.SMILES(), got, want)
			}
		}
	}
	t.Logf("%d query/target pairs compared, %d skipped", compared, skipped)
	if compared < len(targets)*len(fragmentQueries)/2 {
		t.Errorf("only %d comparisons (%d skipped for aromaticity differences)", compared, skipped)
	}
}

func TestFragmentKekuleQuery(t *testing.T) {
	// Kekulé-written aromatic queries match aromatic rings in any Kekulé
	// structure; non-aromatic Kekulé rings stay as written.
	for _, tc := range []struct {
		frag, target string
		want         bool
	}{
		{"C1=CC=CC=C1", "Cc1ccccc1", true},
		{"C1=CC=CC=C1", "C1=CC=CC=C1C", true},
		{"CC1=CC=CC=C1", "CC1=CC=CC=C1", true},
		{"C1=CC=CC=CC=C1", "C1=CC=CC=CC=C1", true},
		{"C1=CC=CC=C1", "C1=CCC=CC1", false},
	} {
		if got := MustParseFragment(tc.frag).Matches(MustParseSMILES(tc.target)); got != tc.want {
			t.Errorf("ParseFragment(%q).Matches(%q) = %v, want %v", tc.frag, tc.target, got, tc.want)
		}
	}
}
