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

// biarylTargets are aromatic systems joined by single bonds, fused
// heteroaromatics and their neighbours, as SMILES (names: common practice).
var biarylTargets = []string{
	"c1ccccc1c1ccccc1",             // biphenyl, the joining bond implicit
	"c1ccc(cc1)-c1ccccc1",          // biphenyl, the joining bond written
	"c1ccc2c(c1)Cc1ccccc12",        // fluorene
	"c1ccc2c(c1)-c1ccccc1C2",       // fluorene, written otherwise
	"c1ccc2c(c1)CCc1ccccc12",       // 9,10-dihydrophenanthrene
	"c1ccc(cc1)c1ccc(cc1)c1ccccc1", // p-terphenyl
	"n1ccccc1c1ccccn1",             // 2,2'-bipyridine
	"c1ccc(nc1)c1ccccc1",           // 2-phenylpyridine
	"o1cccc1c1ccccc1",              // 2-phenylfuran
	"s1cccc1c1cccs1",               // 2,2'-bithiophene
	"c1ccn(c1)c1ccccc1",            // 1-phenylpyrrole
	"Oc1ccc(cc1)c1ccccc1",          // 4-phenylphenol
	"c1ccc2c(c1)[nH]c1ccccc12",     // carbazole
	"c1ccc2c(c1)oc1ccccc12",        // dibenzofuran
	"c1ccc2c(c1)sc1ccccc12",        // dibenzothiophene
	"c1ccc2occc2c1",                // benzofuran
	"c1ccc2[nH]ccc2c1",             // indole
	"c1ccc2ncccc2c1",               // quinoline
	"c1ccc2ccccc2c1",               // naphthalene
	"c1ccc(cc1)c1ccc2ccccc2c1",     // 2-phenylnaphthalene
	"c1ccc(Cc2ccccn2)cc1",          // 2-benzylpyridine
	"C1CCC(CC1)c1ccccc1",           // cyclohexylbenzene
	"B1c3ccoc3c3ccoc31",            // a borole fused to two furans (fuzzing find)
	"o3c1oc3c3ccoc3c3ccoc31",       // furan rings joined by double bonds (fuzzing find)
	"c1cc(oc1)c1ccc(o1)c1ccco1",    // 2,2':5',2''-terfuran
	"Cc1ccccc1c1ccccc1C",           // 2,2'-dimethylbiphenyl
	"c1ccc(cc1)C(=O)c1ccccc1",      // benzophenone (rings not joined directly)
	"c1ccc(cc1)N=Nc1ccccc1",        // azobenzene
	"c1ccc2c(c1)c1ccccc1C2=O",      // fluorenone
	"c1cnc(nc1)c1ncccn1",           // 2,2'-bipyrimidine
	"c1ccc2c(c1)[nH]c1ccncc12",     // a pyrido[3,4-b]indole (norharman)
}

// biarylQueries are fragment queries meant the same way as SMARTS.
var biarylQueries = []string{
	"cc", "c-c", "c:c", "c1ccccc1", "c1ccccc1c", "c1ccccc1-c", "c1ccccc1c1ccccc1",
	"c1ccccc1-c1ccccc1", "n1ccccc1c", "c1ccoc1c", "c1ccsc1c", "c1ccc2c(c1)Cc1ccccc12",
	"c1ccc2ccccc2c1", "c1ccc2occc2c1", "c1ccc2[nH]ccc2c1", "c(c)(c)c", "c1ccccc1C",
	"c1ccccc1[CH2]c", "c1ccccc1C(=O)c1ccccc1", "B1c3ccoc3c3ccoc31", "n1ccccc1c1ccccn1",
}

// TestFragmentBiaryls checks the implicit bond between two lowercase query
// atoms: outside a ring it is single, so it matches the joining bond of
// a biaryl. Expected answers: RDKit 2022.09 HasSubstructMatch with the
// query read as SMARTS (run by TestFragmentBiarylsAgainstRDKit).
func TestFragmentBiaryls(t *testing.T) {
	tests := []struct {
		frag, target string
		want         bool
	}{
		{"c1ccccc1c1ccccc1", "c1ccccc1c1ccccc1", true},
		{"c1ccccc1c1ccccc1", "c1ccc(cc1)-c1ccccc1", true},
		{"c1ccccc1-c1ccccc1", "c1ccccc1c1ccccc1", true},
		{"c1ccccc1c1ccccc1", "c1ccc2c(c1)Cc1ccccc12", true},
		{"c1ccc2c(c1)Cc1ccccc12", "c1ccc2c(c1)Cc1ccccc12", true},
		{"c1ccc2c(c1)Cc1ccccc12", "c1ccc2c(c1)-c1ccccc1C2", true},
		{"B1c3ccoc3c3ccoc31", "B1c3ccoc3c3ccoc31", true},
		{"cc", "c1ccc(cc1)C(=O)c1ccccc1", true},
		{"c1ccccc1c1ccccc1", "c1ccc(cc1)C(=O)c1ccccc1", false},
		{"c1ccccc1c1ccccc1", "c1ccc2ccccc2c1", false},
		{"c:c", "c1ccccc1c1ccccc1", true},
		{"c1ccccc1c", "C1CCC(CC1)c1ccccc1", false},
		{"n1ccccc1c", "c1ccc(nc1)c1ccccc1", true},
		// Aromatic rings joined by double bonds outside them: the implicit
		// query bond (single or aromatic) does not match, so the query is
		// not found even in the molecule it writes (found by fuzzing).
		{"o3c1oc3c3ccoc3c3ccoc31", "o3c1oc3c3ccoc3c3ccoc31", false},
	}
	for _, tc := range tests {
		if got := MustParseFragment(tc.frag).Matches(MustParseSMILES(tc.target)); got != tc.want {
			t.Errorf("ParseFragment(%q).Matches(%q) = %v, want %v (RDKit substructure match, query as SMARTS)", tc.frag, tc.target, got, tc.want)
		}
	}
	// Every target is found in itself, except the one whose rings are
	// joined by double bonds (above).
	for _, s := range biarylTargets {
		if s != "o3c1oc3c3ccoc3c3ccoc31" && !MustParseFragment(s).Matches(MustParseSMILES(s)) {
			t.Errorf("ParseFragment(%q) does not match the molecule it writes", s)
		}
	}
}

// TestFragmentBiarylsAgainstRDKit compares every biaryl query (and every
// target read as a query) with RDKit's substructure search on the biaryl
// targets, skipping targets whose aromatic atoms differ between the two
// aromaticity models.
func TestFragmentBiarylsAgainstRDKit(t *testing.T) {
	rdkittest.Require(t)
	queries := append(append([]string(nil), biarylQueries...), biarylTargets...)
	var in strings.Builder
	for _, g := range biarylTargets {
		for _, q := range queries {
			in.WriteString(q + "\t" + g + "\n")
		}
	}
	cmd := exec.Command(rdkittest.Python, "testdata/rdkit_match.py")
	cmd.Stdin = strings.NewReader(in.String())
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("run RDKit: %v", err)
	}
	lines := strings.Split(strings.TrimRight(string(out), "\n"), "\n")
	if len(lines) != len(biarylTargets)*len(queries) {
		t.Fatalf("RDKit printed %d lines, want %d", len(lines), len(biarylTargets)*len(queries))
	}
	compared, skipped := 0, 0
	for i, s := range biarylTargets {
		g := MustParseSMILES(s)
		ours := ""
		for _, a := range AromaticAtoms(g) {
			if a {
				ours += "1"
			} else {
				ours += "0"
			}
		}
		for j, q := range queries {
			f := strings.Split(lines[i*len(queries)+j], "\t")
			if len(f) != 2 {
				t.Fatalf("RDKit cannot read %q or %q", q, s)
			}
			if f[1] != ours {
				skipped++
				continue
			}
			compared++
			if got, want := MustParseFragment(q).Matches(g), f[0] == "1"; got != want {
				t.Errorf("ParseFragment(%q).Matches(%q) = %v, RDKit %v", q, s, got, want)
			}
		}
	}
	t.Logf("%d query/target pairs compared, %d skipped for aromaticity differences", compared, skipped)
	if compared < len(biarylTargets)*len(queries)*3/4 {
		t.Errorf("only %d comparisons (%d skipped)", compared, skipped)
	}
}

func TestParseSMILESChirality(t *testing.T) {
	// Chirality marks: OpenSMILES specification (chiral ::= '@' | '@@' |
	// '@TH1' | '@TH2' | '@AL1' | '@AL2' | '@SP1'..'@SP3' | '@TB1'..'@TB20' |
	// '@OH1'..'@OH30').
	for _, tc := range []struct {
		smiles string
		ok     bool
		pos    int
	}{
		{"F[C@H](Cl)Br", true, 0},
		{"F[C@@H](Cl)Br", true, 0},
		{"F[C@TH1H](Cl)Br", true, 0},
		{"F[C@TH2H](Cl)Br", true, 0},
		{"C=[C@AL1]=CC", true, 0},
		{"F[C@SP3H](Cl)Br", true, 0},
		{"F[C@TB20H](Cl)Br", true, 0},
		{"F[C@OH30H](Cl)Br", true, 0},
		{"F[C@@@@H](Cl)Br", false, 3},
		{"F[C@@@H](Cl)Br", false, 3},
		{"F[C@TH3H](Cl)Br", false, 3},
		{"F[C@TB21H](Cl)Br", false, 3},
		{"F[C@OH31H](Cl)Br", false, 3},
		{"F[C@TBH](Cl)Br", false, 3},
		{"F[C@TB01H](Cl)Br", false, 3},
		{"F[C@XY1H](Cl)Br", false, 3},
	} {
		_, err := ParseSMILES(tc.smiles)
		if tc.ok {
			if err != nil {
				t.Errorf("ParseSMILES(%q): %v, want it accepted (OpenSMILES)", tc.smiles, err)
			}
			continue
		}
		se, ok := err.(*SMILESError)
		if !ok || se.Pos != tc.pos || !strings.Contains(se.Msg, "chirality") {
			t.Errorf("ParseSMILES(%q) error = %v, want a chirality error at position %d", tc.smiles, err, tc.pos)
		}
		if _, err := ParseFragment(tc.smiles); err == nil {
			t.Errorf("ParseFragment(%q) accepts an invalid chirality mark", tc.smiles)
		}
	}
}
