package molecule

import (
	"bufio"
	"bytes"
	"math/rand/v2"
	"os/exec"
	"strings"
	"testing"

	"shiftrank/internal/rdkittest"
)

// randomScaffolds are ring systems that random substituents are hung on:
// aromatic, heteroaromatic, antiaromatic and non-aromatic (common practice
// structures).
var randomScaffolds = []string{
	"c1ccccc1", "c1ccncc1", "c1cc[nH]c1", "c1ccoc1", "c1ccsc1", "c1ccc2ccccc2c1",
	"c1ccc2[nH]ccc2c1", "c1ccc2cccc2cc1", "c1cnc[nH]1", "c1cncnc1", "c1ccc2ncccc2c1",
	"C1=CC=CC=CC=C1", "C1=CC2=CC=CC2=C1", "O=C1C=CC=CN1", "C1=CCC=C1", "C1CCCCC1",
	"C1=CC=CC1", "c1ccc2c(c1)-c1ccccc1-2", "C1CC1", "C1COCCN1", "c1ccc(cc1)-c1ccccn1",
	"c1ccc2c(c1)ccc1ccccc12", "c1ccc2cc3ccccc3cc2c1", "c1cc2cccc3c4cccc5cccc(c(c1)c23)c54",
	"O=c1ccocc1", "C1=CC2=C1C=CC=C2", "c1ccc2c(c1)oc1ccccc12", "c1csc(n1)-c1ncccc1",
	"C1=CC=C2C=CC=CC2=C1", "c1ccc2cc3c(ccc4ccccc43)cc2c1", "C1=CN=CC=N1", "c1cc[o+]cc1",
}

// randomMolecule hangs up to k random substituent atoms (C, N, O, S, F,
// Cl) on a scaffold, with double or triple bonds where valences allow,
// and fills hydrogens at the lowest allowed valence.
func randomMolecule(r *rand.Rand, k int) *Graph {
	g := MustParseSMILES(randomScaffolds[r.IntN(len(randomScaffolds))])
	return decorate(r, g, k)
}

// randomHeteroMolecule is randomMolecule on a scaffold in which random
// aromatic CH atoms were replaced by n, o, s or [nH] (azines, azoles,
// oxazoles, thiazoles, ...); scaffolds that cannot be kekulised are
// redrawn.
func randomHeteroMolecule(r *rand.Rand, k int) *Graph {
	for {
		var b strings.Builder
		for _, ch := range randomScaffolds[r.IntN(len(randomScaffolds))] {
			switch x := r.IntN(16); {
			case ch != 'c' || x >= 6:
				b.WriteRune(ch)
			case x < 4:
				b.WriteByte('n')
			case x == 4:
				b.WriteString([]string{"o", "s", "[nH]"}[r.IntN(3)])
			default:
				b.WriteRune(ch)
			}
		}
		if g, err := ParseSMILES(b.String()); err == nil {
			return decorate(r, g, k)
		}
	}
}

func decorate(r *rand.Rand, g *Graph, k int) *Graph {
	elems := []Element{C, C, C, C, N, O, S, F, Cl}
	used := func(v int) int { return g.BondOrderSum(v) }
	for i := 0; i < k; i++ {
		var cands []int
		for v, a := range g.Atoms {
			if a.Element.MaxValence()-used(v) >= 1 && a.HCount > 0 {
				cands = append(cands, v)
			}
		}
		if len(cands) == 0 {
			break
		}
		v := cands[r.IntN(len(cands))]
		e := elems[r.IntN(len(elems))]
		o := Single
		free := g.Atoms[v].HCount
		if r.IntN(4) == 0 && free >= 2 && e.MaxValence() >= 2 && e != S {
			o = Double
		}
		if r.IntN(8) == 0 && free >= 3 && (e == C || e == N) {
			o = Triple
		}
		u := g.AddAtom(e, 0)
		g.MustAddBond(v, u, o)
		g.Atoms[v].HCount -= int(o)
		g.Atoms[u].HCount = e.MinValence() - int(o)
		if g.Atoms[u].HCount < 0 {
			g.Atoms[u].HCount = 0
		}
	}
	return g
}

// kekuleVariant returns g renumbered at random with its aromatic bonds
// re-kekulised in that numbering (usually another Kekulé structure).
func kekuleVariant(g *Graph, r *rand.Rand) *Graph {
	h := permuted(g, r)
	arom := AromaticBonds(h)
	for i, a := range arom {
		if a {
			h.SetBondOrder(i, Aromatic)
		}
	}
	if err := Kekulize(h); err != nil {
		return nil
	}
	return h
}

// TestCanonicalSMILESRandomAgainstRDKit checks on random substituted ring
// systems that (1) RDKit reads our CanonicalSMILES as the same molecule as
// our Kekulé SMILES, (2) renumbered, re-kekulised copies give the same
// CanonicalSMILES, and (3) two molecules get equal CanonicalSMILES exactly
// when RDKit's canonical SMILES are equal.
func TestCanonicalSMILESRandomAgainstRDKit(t *testing.T) {
	rdkittest.Require(t)
	r := rand.New(rand.NewPCG(21, 8))
	var in bytes.Buffer
	var ours, keks []string
	for i := 0; i < 600; i++ {
		g := randomMolecule(r, r.IntN(7))
		if i%2 == 1 {
			g = randomHeteroMolecule(r, r.IntN(5))
		}
		if err := g.CheckValence(); err != nil {
			continue
		}
		cs := CanonicalSMILES(g)
		for k := 0; k < 3; k++ {
			if h := kekuleVariant(g, r); h != nil {
				if cs2 := CanonicalSMILES(h); cs2 != cs {
					t.Errorf("CanonicalSMILES of a renumbered Kekulé variant %q = %q, want %q", h.SMILES(), cs2, cs)
				}
			}
		}
		ours = append(ours, cs)
		keks = append(keks, g.SMILES())
		in.WriteString(g.SMILES() + "\t" + cs + "\n")
	}
	cmd := exec.Command(rdkittest.Python, "testdata/rdkit_canon.py")
	cmd.Stdin = &in
	out, err := cmd.Output()
	if err != nil {
		t.Fatalf("run RDKit: %v", err)
	}
	sc := bufio.NewScanner(bytes.NewReader(out))
	rdOf := map[string]string{} // our canonical -> RDKit canonical
	ourOf := map[string]string{}
	i := 0
	for sc.Scan() {
		f := strings.Split(sc.Text(), "\t")
		if len(f) != 2 && len(f) != 5 {
			t.Fatalf("RDKit output line %q", sc.Text())
		}
		if i >= len(ours) {
			t.Fatalf("RDKit printed more lines than inputs")
		}
		kek, cs := keks[i], ours[i]
		i++
		if f[0] != "ok" {
			t.Errorf("RDKit cannot parse %s (Kekulé %q, canonical %q)", f[1], kek, cs)
			continue
		}
		if f[3] != f[4] {
			t.Errorf("CanonicalSMILES %q: RDKit reads %s, but our Kekulé SMILES %q as %s", cs, f[4], kek, f[3])
			continue
		}
		if prev, ok := rdOf[cs]; ok && prev != f[3] {
			t.Errorf("CanonicalSMILES %q for two compounds RDKit tells apart: %s and %s", cs, prev, f[3])
		}
		rdOf[cs] = f[3]
		if prev, ok := ourOf[f[3]]; ok && prev != cs {
			t.Errorf("RDKit %s is one compound, but our CanonicalSMILES differ: %q and %q", f[3], prev, cs)
		}
		ourOf[f[3]] = cs
	}
	if i != len(ours) {
		t.Fatalf("RDKit printed %d lines, want %d", i, len(ours))
	}
	t.Logf("%d molecules, %d distinct", len(ours), len(rdOf))
}
