package molecule

import (
	"slices"
	"strings"
)

// SMILES writes g as a Kekulé SMILES string: a depth-first walk from atom 0
// visiting neighbours in increasing atom index, so a graph read by
// ParseSMILES from a string in that form is written back the same way.
// Organic-subset atoms whose hydrogen count follows the implicit-hydrogen
// rule are written bare (C, O, CS(=O)(=O)C), all others in brackets
// ([SiH4], [NH4+], [O-], [CH2] for a carbene-like atom). A disconnected
// graph is written with '.' between components (which ParseSMILES
// rejects). Bonds of order Aromatic, which kekulised graphs do not have,
// are written ':'.
func (g *Graph) SMILES() string {
	n := len(g.Atoms)
	rank := make([]int, n)
	for i := range rank {
		rank[i] = i
	}
	orders := make([]Order, len(g.Bonds))
	for i, b := range g.Bonds {
		orders[i] = b.Order
	}
	var w smilesWriter
	s, _ := w.write(g, orders, nil, rank)
	return s
}

// CanonicalSMILES returns one SMILES string per compound: atoms are
// visited in canonical order (Canonicalize), atoms of Hückel aromatic
// systems are written lowercase with implicit aromatic bonds (c1ccccc1,
// c1ccncc1, c1cc[nH]c1), so Kekulé structures that differ only by shifted
// double bonds give the same string; a single bond between two aromatic
// atoms is written '-' (biphenyl: c1ccc(-c2ccccc2)cc1). ParseSMILES reads
// the result back (kekulising it) to an isomorphic graph, and writing that
// again gives the same string.
func CanonicalSMILES(g *Graph) string {
	s, _ := CanonicalSMILESOrder(g)
	return s
}

// CanonicalSMILESOrder is CanonicalSMILES that also returns the atom order
// of the string: order[k] is the index in g of the k-th atom written, so
// atom k of ParseSMILES(s) corresponds to atom order[k] of g.
func CanonicalSMILESOrder(g *Graph) (string, []int) {
	var c Canonicalizer
	return c.CanonicalSMILES(g)
}

// CanonicalSMILES is like the package-level CanonicalSMILESOrder, reusing
// c's memory.
func (c *Canonicalizer) CanonicalSMILES(g *Graph) (string, []int) {
	c.search(g)
	n := c.n
	rank := make([]int, n)
	for p, v := range c.bestLab[:n] {
		rank[v] = p
	}
	orders := make([]Order, len(g.Bonds))
	atomArom := make([]bool, n)
	for i := range g.Bonds {
		orders[i] = Order(c.bondOrd[i])
		if orders[i] == Aromatic {
			atomArom[g.Bonds[i].A] = true
			atomArom[g.Bonds[i].B] = true
		}
	}
	var w smilesWriter
	return w.write(g, orders, atomArom, rank)
}

type smilesWriter struct {
	g        *Graph
	orders   []Order
	arom     []bool
	rank     []int
	visited  []bool
	bondKind []uint8 // 0 unclassified, 1 tree, 2 ring closure
	children [][]int // tree bonds to children, in visiting order
	closeAt  [][]int // ring-closure bonds whose second end is this atom
	openAt   [][]int // ring-closure bonds whose first end is this atom
	digit    []int   // per bond: ring-closure number in use
	free     []bool  // ring numbers in use
	order    []int
	b        strings.Builder
}

func (w *smilesWriter) write(g *Graph, orders []Order, arom []bool, rank []int) (string, []int) {
	n := len(g.Atoms)
	w.g, w.orders, w.arom, w.rank = g, orders, arom, rank
	w.visited = make([]bool, n)
	w.bondKind = make([]uint8, len(g.Bonds))
	w.children = make([][]int, n)
	w.closeAt = make([][]int, n)
	w.openAt = make([][]int, n)
	w.digit = make([]int, len(g.Bonds))
	w.free = make([]bool, 100)
	byRank := make([]int, n)
	for v := range byRank {
		byRank[v] = v
	}
	slices.SortFunc(byRank, func(a, b int) int { return rank[a] - rank[b] })
	first := true
	for _, s := range byRank {
		if w.visited[s] {
			continue
		}
		w.classify(s, -1)
		if !first {
			w.b.WriteByte('.')
		}
		first = false
		w.emit(s, -1)
	}
	return w.b.String(), w.order
}

// sortedNeighbors returns v's neighbours ordered by rank.
func (w *smilesWriter) sortedNeighbors(v int) []Neighbor {
	nbs := append([]Neighbor(nil), w.g.Neighbors(v)...)
	slices.SortFunc(nbs, func(a, b Neighbor) int { return w.rank[a.Atom] - w.rank[b.Atom] })
	return nbs
}

// classify walks depth-first from v, sorting bonds into tree bonds and
// ring closures.
func (w *smilesWriter) classify(v, parentBond int) {
	w.visited[v] = true
	for _, nb := range w.sortedNeighbors(v) {
		if nb.Bond == parentBond || w.bondKind[nb.Bond] != 0 {
			continue
		}
		if w.visited[nb.Atom] {
			// Back edge: nb.Atom is an ancestor, written earlier.
			w.bondKind[nb.Bond] = 2
			w.openAt[nb.Atom] = append(w.openAt[nb.Atom], nb.Bond)
			w.closeAt[v] = append(w.closeAt[v], nb.Bond)
			continue
		}
		w.bondKind[nb.Bond] = 1
		w.children[v] = append(w.children[v], nb.Bond)
		w.classify(nb.Atom, nb.Bond)
	}
}

func (w *smilesWriter) emit(v, fromBond int) {
	if fromBond >= 0 {
		w.bondSymbol(fromBond)
	}
	w.order = append(w.order, v)
	w.atom(v)
	// Ring closures ending here first, freeing their numbers, then those
	// opening here, in the order their partners are reached.
	for _, bi := range w.closeAt[v] {
		w.bondSymbol(bi)
		w.ringNumber(w.digit[bi])
		w.free[w.digit[bi]] = false
	}
	opens := w.openAt[v]
	slices.SortFunc(opens, func(a, b int) int {
		return w.rank[w.g.Bonds[a].Other(v)] - w.rank[w.g.Bonds[b].Other(v)]
	})
	for _, bi := range opens {
		d := 1
		for d < 99 && w.free[d] {
			d++
		}
		w.free[d] = true
		w.digit[bi] = d
		w.ringNumber(d)
	}
	ch := w.children[v]
	for i, bi := range ch {
		u := w.g.Bonds[bi].Other(v)
		if i < len(ch)-1 {
			w.b.WriteByte('(')
			w.emit(u, bi)
			w.b.WriteByte(')')
		} else {
			w.emit(u, bi)
		}
	}
}

func (w *smilesWriter) ringNumber(d int) {
	if d < 10 {
		w.b.WriteByte(byte('0' + d))
		return
	}
	w.b.WriteByte('%')
	w.b.WriteByte(byte('0' + d/10))
	w.b.WriteByte(byte('0' + d%10))
}

func (w *smilesWriter) isArom(v int) bool { return w.arom != nil && w.arom[v] }

func (w *smilesWriter) bondSymbol(bi int) {
	b := w.g.Bonds[bi]
	switch w.orders[bi] {
	case Single:
		if w.isArom(b.A) && w.isArom(b.B) {
			w.b.WriteByte('-')
		}
	case Double:
		w.b.WriteByte('=')
	case Triple:
		w.b.WriteByte('#')
	case Aromatic:
		if !(w.isArom(b.A) && w.isArom(b.B)) {
			w.b.WriteByte(':')
		}
	}
}

// organicSubset reports whether e may be written without brackets.
func organicSubset(e Element) bool {
	switch e {
	case B, C, N, O, P, S, F, Cl, Br, I:
		return true
	}
	return false
}

func (w *smilesWriter) atom(v int) {
	a := w.g.Atoms[v]
	arom := w.isArom(v) && (a.Element == B || a.Element == C || a.Element == N || a.Element == O || a.Element == P || a.Element == S)
	sym := a.Element.Symbol()
	if arom {
		sym = strings.ToLower(sym)
	}
	if a.Charge == 0 && organicSubset(a.Element) {
		sum := 0
		for _, nb := range w.g.Neighbors(v) {
			if o := w.orders[nb.Bond]; o == Aromatic {
				sum++
			} else {
				sum += int(o)
			}
		}
		if organicHydrogens(a.Element, arom, sum) == a.HCount {
			w.b.WriteString(sym)
			return
		}
	}
	w.b.WriteByte('[')
	w.b.WriteString(sym)
	if a.HCount > 0 {
		w.b.WriteByte('H')
		if a.HCount > 1 {
			w.b.WriteString(itoa(a.HCount))
		}
	}
	w.b.WriteString(chargeSuffix(a.Charge))
	w.b.WriteByte(']')
}
