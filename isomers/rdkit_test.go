package isomers

import (
	"bufio"
	"bytes"
	"context"
	"fmt"
	"os/exec"
	"sort"
	"strconv"
	"strings"
	"testing"

	"shiftrank/internal/rdkittest"
	"shiftrank/molecule"
)

type rdkitResult struct {
	canon, formula, err string
}

// rdkitCanon sends SMILES to RDKit in one process and returns its
// canonical SMILES and formula for each, in input order.
func rdkitCanon(t *testing.T, smiles []string) []rdkitResult {
	t.Helper()
	var in bytes.Buffer
	for i, s := range smiles {
		fmt.Fprintf(&in, "%d\t%s\n", i, s)
	}
	cmd := exec.Command(rdkittest.Python, "testdata/rdkit_canon.py")
	cmd.Stdin = &in
	var stderr bytes.Buffer
	cmd.Stderr = &stderr
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("rdkit_canon.py: %v: %s", err, stderr.String())
	}
	res := make([]rdkitResult, len(smiles))
	sc := bufio.NewScanner(bytes.NewReader(out))
	sc.Buffer(make([]byte, 1<<20), 1<<20)
	n := 0
	for sc.Scan() {
		f := strings.Split(sc.Text(), "\t")
		if len(f) != 3 {
			t.Fatalf("rdkit_canon.py: bad line %q", sc.Text())
		}
		i, _ := strconv.Atoi(f[0])
		if f[1] == "!" {
			res[i].err = f[2]
		} else {
			res[i] = rdkitResult{canon: f[1], formula: f[2]}
		}
		n++
	}
	if n != len(smiles) {
		t.Fatalf("rdkit_canon.py answered %d of %d lines", n, len(smiles))
	}
	return res
}

// testSMILES writes g as SMILES with every atom in brackets and explicit
// H counts and bond symbols. It is deliberately independent of the
// molecule package's writer, so that the cross-check tests the generator
// alone.
func testSMILES(g *molecule.Graph) string {
	n := len(g.Atoms)
	if n == 0 {
		return ""
	}
	visited := make([]bool, n)
	order := make([]int, n) // DFS discovery index
	parentBond := make([]int, n)
	tree := make([]bool, len(g.Bonds))
	idx := 0
	var dfs func(v int)
	dfs = func(v int) {
		visited[v] = true
		order[v] = idx
		idx++
		for _, nb := range g.Neighbors(v) {
			if !visited[nb.Atom] {
				tree[nb.Bond] = true
				parentBond[nb.Atom] = nb.Bond
				dfs(nb.Atom)
			}
		}
	}
	parentBond[0] = -1
	dfs(0)
	ringNum := make(map[int]int) // bond -> ring closure number
	free := []int{}
	next := 1
	sym := func(o molecule.Order) string {
		switch o {
		case molecule.Double:
			return "="
		case molecule.Triple:
			return "#"
		}
		return "-"
	}
	num := func(k int) string {
		if k < 10 {
			return strconv.Itoa(k)
		}
		return "%" + strconv.Itoa(k)
	}
	var b strings.Builder
	done := make([]bool, n)
	var write func(v int)
	write = func(v int) {
		done[v] = true
		a := g.Atoms[v]
		b.WriteString("[" + a.Element.Symbol())
		if a.HCount > 0 {
			b.WriteString("H")
			if a.HCount > 1 {
				b.WriteString(strconv.Itoa(a.HCount))
			}
		}
		b.WriteString("]")
		// ring closures at v: close those opened earlier, open new ones
		for _, nb := range g.Neighbors(v) {
			if tree[nb.Bond] {
				continue
			}
			if k, ok := ringNum[nb.Bond]; ok {
				b.WriteString(sym(nb.Order) + num(k))
				free = append(free, k)
				delete(ringNum, nb.Bond)
			} else if !done[nb.Atom] {
				var k int
				if len(free) > 0 {
					sort.Ints(free)
					k, free = free[0], free[1:]
				} else {
					k = next
					next++
				}
				ringNum[nb.Bond] = k
				b.WriteString(sym(nb.Order) + num(k))
			}
		}
		var kids []molecule.Neighbor
		for _, nb := range g.Neighbors(v) {
			if tree[nb.Bond] && parentBond[nb.Atom] == nb.Bond && nb.Atom != v && !done[nb.Atom] {
				kids = append(kids, nb)
			}
		}
		sort.Slice(kids, func(i, j int) bool { return order[kids[i].Atom] < order[kids[j].Atom] })
		for i, nb := range kids {
			last := i == len(kids)-1
			if !last {
				b.WriteString("(")
			}
			b.WriteString(sym(nb.Order))
			write(nb.Atom)
			if !last {
				b.WriteString(")")
			}
		}
	}
	write(0)
	return b.String()
}

// generated returns testSMILES of every structure Generate emits.
func generated(t *testing.T, formula string, filter Filter) []string {
	t.Helper()
	f := molecule.MustParseFormula(formula)
	var out []string
	st, err := Generate(context.Background(), f, Options{Filter: filter}, func(g *molecule.Graph) bool {
		if g.Formula() != f {
			t.Errorf("%s: emitted %s has formula %s", formula, testSMILES(g), g.Formula())
		}
		if err := g.CheckValence(); err != nil || !g.Connected() {
			t.Errorf("%s: emitted %s: valence %v, connected %v", formula, testSMILES(g), err, g.Connected())
		}
		out = append(out, testSMILES(g))
		return true
	})
	if err != nil || !st.Complete {
		t.Fatalf("Generate(%s): %v (complete %v)", formula, err, st.Complete)
	}
	return out
}

// rdkitFormula returns RDKit's formula string for f (Hill order, as
// CalcMolFormula writes it).
func rdkitFormula(f molecule.Formula) string { return f.String() }

// rdkitBattery: formulas with N, O, S, P, Si, B and halogens, DBE 0 to 4
// (DBE from the formula: 1 + Σ n(v−2)/2 with the lowest valences). The
// expected facts are checked by RDKit, not written here.
var rdkitBattery = []string{
	"C4H10O",  // DBE 0
	"C3H9N",   // DBE 0
	"C2H6S",   // DBE 0, S(II) and hypervalent S
	"C3H7Cl",  // DBE 0
	"C2H4BrF", // DBE 0
	"CH5P",    // DBE 0, P(III)/P(V)
	"C2H8Si",  // DBE 0
	"C3H9B",   // DBE 0
	"C3H6O",   // DBE 1
	"C3H7NO",  // DBE 1
	"C2H4O2",  // DBE 1
	"C3H5Cl",  // DBE 1
	"C2H6OS",  // DBE 1 for S(II); S(IV) gives DMSO
	"CH4O3S",  // S(VI): methanesulfonic acid
	"H3O4P",   // P(V): phosphoric acid
	"C4H6O",   // DBE 2
	"C3H3N",   // DBE 3
	"C4H4O",   // DBE 3, furan
	"C4H4S",   // DBE 3, thiophene
	"C4H5N",   // DBE 3, pyrrole
	"C5H5N",   // DBE 4, pyridine
	"C6H6",    // DBE 4, benzene
	"C3H2ClF", // DBE 2
	"C7H8",    // DBE 4, toluene
	"C8H10",   // DBE 4, o-xylene must come once
	"C4H4N2",  // DBE 4, diazines
	"C5H4O2",  // DBE 4, furfural
}

// TestOracleMultigraphs compares the generator's raw multigraphs (every
// Kekulé structure kept) with the oracle's, by the oracle's brute-force
// canonical form. No aromaticity model is involved on either side.
func TestOracleMultigraphs(t *testing.T) {
	formulas := []string{"C4H10O", "C2H6S", "CH5P", "C3H7NO", "C2H6OS", "CH4O3S", "H3O4P", "C4H6O", "C4H4O", "C4H5N", "C6H6", "C3H2ClF", "C2H8Si", "C3H9B", "C5H5N", "C4H4N2",
		"C2H5O2P", "C2H3NS", "C3H2N2", "C2H6S2",
		// seven heavy atoms, still quick for the brute-force oracle
		"C7H8", "C6H6O", "C4H4O3", "C5H12O2"}
	if testing.Short() {
		formulas = formulas[:5]
	}
	for _, fs := range formulas {
		f := molecule.MustParseFormula(fs)
		want := map[string]string{}
		for _, e := range oracle(f) {
			want[e.key] = e.smiles
		}
		got := map[string]string{}
		st, err := Generate(context.Background(), f, Options{Filter: NoFilter(), allKekule: true}, func(g *molecule.Graph) bool {
			k := graphKey(g)
			if prev, dup := got[k]; dup {
				t.Errorf("%s: duplicate multigraph %s and %s", fs, prev, testSMILES(g))
			}
			got[k] = testSMILES(g)
			return true
		})
		if err != nil || !st.Complete {
			t.Fatalf("Generate(%s): %v", fs, err)
		}
		for k, smi := range want {
			if _, ok := got[k]; !ok {
				t.Errorf("%s: generator misses %s (oracle)", fs, smi)
			}
		}
		for k, smi := range got {
			if _, ok := want[k]; !ok {
				t.Errorf("%s: generator emits %s, not in the oracle", fs, smi)
			}
		}
		if len(got) != len(want) {
			t.Errorf("%s: %d multigraphs, oracle %d", fs, len(got), len(want))
		}
	}
}

func TestRDKitCrossCheck(t *testing.T) {
	rdkittest.Require(t)
	if testing.Short() {
		t.Skip("RDKit battery skipped in -short mode")
	}
	type set struct {
		formula string
		smiles  []string
		oracle  []oracleEntry
	}
	var sets []set
	var all []string
	for _, fs := range rdkitBattery {
		s := set{formula: fs, smiles: generated(t, fs, NoFilter())}
		if molecule.MustParseFormula(fs).HeavyAtoms() <= 6 {
			s.oracle = oracle(molecule.MustParseFormula(fs))
		}
		sets = append(sets, s)
		all = append(all, s.smiles...)
		for _, e := range s.oracle {
			all = append(all, e.smiles)
		}
	}
	res := rdkitCanon(t, all)
	k := 0
	for _, s := range sets {
		want := rdkitFormula(molecule.MustParseFormula(s.formula))
		mine := map[string]string{}
		for _, smi := range s.smiles {
			r := res[k]
			k++
			if r.err != "" {
				t.Errorf("%s: RDKit cannot read emitted %s: %s", s.formula, smi, r.err)
				continue
			}
			if r.formula != want {
				t.Errorf("%s: emitted %s has RDKit formula %s", s.formula, smi, r.formula)
			}
			if prev, dup := mine[r.canon]; dup {
				t.Errorf("%s: %s and %s are the same compound for RDKit (%s)", s.formula, prev, smi, r.canon)
			}
			mine[r.canon] = smi
		}
		if s.formula == "C8H10" {
			// o-xylene has two non-isomorphic Kekulé structures; it must come once
			if _, ok := mine["Cc1ccccc1C"]; !ok {
				t.Errorf("C8H10: o-xylene (RDKit Cc1ccccc1C) missing")
			}
		}
		if s.oracle == nil {
			t.Logf("%s: %d structures, RDKit-distinct", s.formula, len(s.smiles))
			continue
		}
		ora := map[string]string{}
		for _, e := range s.oracle {
			smi := e.smiles
			r := res[k]
			k++
			if r.err != "" {
				t.Errorf("%s: RDKit cannot read oracle %s: %s", s.formula, smi, r.err)
				continue
			}
			ora[r.canon] = smi
		}
		for c, smi := range ora {
			if _, ok := mine[c]; !ok {
				t.Errorf("%s: generator misses %s (oracle %s)", s.formula, c, smi)
			}
		}
		for c, smi := range mine {
			if _, ok := ora[c]; !ok {
				t.Errorf("%s: generator emits %s (%s), which the oracle does not have", s.formula, c, smi)
			}
		}
		t.Logf("%s: %d structures, oracle %d RDKit-distinct compounds", s.formula, len(s.smiles), len(ora))
	}
}
