package molecule

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
	rank := make([]int32, n)
	for i := range rank {
		rank[i] = int32(i)
	}
	orders := make([]uint8, len(g.Bonds))
	for i, b := range g.Bonds {
		orders[i] = uint8(b.Order)
	}
	var w smilesWriter
	return string(w.write(nil, g, orders, nil, rank, false))
}

// CanonicalSMILES returns one SMILES string per compound: atoms are
// visited in canonical order (Canonicalize), atoms of Hückel aromatic
// systems are written lowercase with implicit aromatic bonds (c1ccccc1,
// c1ccncc1, c1cc[nH]c1), so Kekulé structures that differ only by shifted
// double bonds give the same string; a single bond between two aromatic
// atoms is written '-' (biphenyl: c1ccc(cc1)-c1ccccc1). ParseSMILES reads
// the result back (kekulising it) to an isomorphic graph, and writing that
// again gives the same string. For many calls, use a Canonicalizer.
func CanonicalSMILES(g *Graph) string {
	var c Canonicalizer
	return string(c.AppendCanonicalSMILES(nil, g))
}

// CanonicalSMILESOrder is CanonicalSMILES that also returns the atom order
// of the string: order[k] is the index in g of the k-th atom written, so
// atom k of ParseSMILES(s) corresponds to atom order[k] of g.
func CanonicalSMILESOrder(g *Graph) (string, []int) {
	var c Canonicalizer
	return c.CanonicalSMILES(g)
}

// CanonicalSMILES is like the package-level CanonicalSMILESOrder, reusing
// c's memory. The returned slice is owned by the caller.
func (c *Canonicalizer) CanonicalSMILES(g *Graph) (string, []int) {
	c.search(g)
	b := c.writeCanonical(g, true)
	order := make([]int, len(c.w.order))
	for i, v := range c.w.order {
		order[i] = int(v)
	}
	return string(b), order
}

// AppendCanonicalSMILES appends CanonicalSMILES(g) to dst and returns the
// extended slice, reusing c's memory.
func (c *Canonicalizer) AppendCanonicalSMILES(dst []byte, g *Graph) []byte {
	c.search(g)
	return append(dst, c.writeCanonical(g, false)...)
}

func (c *Canonicalizer) writeCanonical(g *Graph, wantOrder bool) []byte {
	n := c.n
	c.rank = grow32(c.rank, n)
	for p, v := range c.bestLab[:n] {
		c.rank[v] = int32(p)
	}
	c.atomArom = resizeBools(c.atomArom, n)
	for i := range g.Bonds {
		if Order(c.bondOrd[i]) == Aromatic {
			c.atomArom[g.Bonds[i].A] = true
			c.atomArom[g.Bonds[i].B] = true
		}
	}
	c.out = c.w.write(c.out[:0], g, c.bondOrd, c.atomArom, c.rank, wantOrder)
	return c.out
}

// smilesWriter writes a depth-first SMILES walk; its buffers are reused.
type smilesWriter struct {
	g        *Graph
	orders   []uint8 // per bond, Aromatic for aromatic bonds
	arom     []bool  // per atom: write lowercase (nil: none)
	rank     []int32 // visiting priority per atom
	nbStart  []int32 // neighbours of each atom sorted by rank (CSR)
	nbAtom   []int32
	nbBond   []int32
	visit    []int32 // visiting order per atom, -1 if not visited
	parent   []int32 // bond to the parent in the walk, -1 for roots
	bondKind []uint8 // 0 unclassified, 1 tree, 2 ring closure
	digit    []int8  // per bond: ring-closure number in use
	inUse    [100]bool
	byRank   []int32
	order    []int32
	wantOrd  bool
	b        []byte
}

func (w *smilesWriter) write(dst []byte, g *Graph, orders []uint8, arom []bool, rank []int32, wantOrder bool) []byte {
	n, m := len(g.Atoms), len(g.Bonds)
	w.g, w.orders, w.arom, w.rank, w.wantOrd = g, orders, arom, rank, wantOrder
	w.b = dst
	w.order = w.order[:0]
	w.inUse = [100]bool{}
	// Neighbours sorted by rank.
	w.nbStart = grow32(w.nbStart, n+1)
	w.nbAtom = w.nbAtom[:0]
	w.nbBond = w.nbBond[:0]
	for v := 0; v < n; v++ {
		w.nbStart[v] = int32(len(w.nbAtom))
		s := len(w.nbAtom)
		for _, nb := range g.Neighbors(v) {
			w.nbAtom = append(w.nbAtom, int32(nb.Atom))
			w.nbBond = append(w.nbBond, int32(nb.Bond))
			for k := len(w.nbAtom) - 1; k > s && rank[w.nbAtom[k]] < rank[w.nbAtom[k-1]]; k-- {
				w.nbAtom[k], w.nbAtom[k-1] = w.nbAtom[k-1], w.nbAtom[k]
				w.nbBond[k], w.nbBond[k-1] = w.nbBond[k-1], w.nbBond[k]
			}
		}
	}
	w.nbStart[n] = int32(len(w.nbAtom))
	w.visit = grow32(w.visit, n)
	w.parent = grow32(w.parent, n)
	for v := 0; v < n; v++ {
		w.visit[v], w.parent[v] = -1, -1
	}
	if cap(w.bondKind) < m {
		w.bondKind = make([]uint8, m)
		w.digit = make([]int8, m)
	}
	w.bondKind = w.bondKind[:m]
	w.digit = w.digit[:m]
	clear(w.bondKind)
	w.byRank = grow32(w.byRank, n)
	for v := 0; v < n; v++ {
		w.byRank[rank[v]] = int32(v)
	}
	t := int32(0)
	first := true
	for _, s := range w.byRank {
		if w.visit[s] >= 0 {
			continue
		}
		t = w.classify(s, t)
		if !first {
			w.b = append(w.b, '.')
		}
		first = false
		w.emit(s, -1)
	}
	return w.b
}

// classify walks depth-first from s (recursively: the depth is at most
// the atom count), sorting bonds into tree bonds and ring closures, and
// returns the next visiting number.
func (w *smilesWriter) classify(s, t int32) int32 {
	w.visit[s] = t
	return w.classifyFrom(s, t+1)
}

func (w *smilesWriter) classifyFrom(v, t int32) int32 {
	for k := w.nbStart[v]; k < w.nbStart[v+1]; k++ {
		u, bi := w.nbAtom[k], w.nbBond[k]
		if bi == w.parent[v] || w.bondKind[bi] != 0 {
			continue
		}
		if w.visit[u] >= 0 {
			w.bondKind[bi] = 2 // back edge to an ancestor
			continue
		}
		w.bondKind[bi] = 1
		w.parent[u] = bi
		w.visit[u] = t
		t++
		t = w.classifyFrom(u, t)
	}
	return t
}

func (w *smilesWriter) emit(v, fromBond int32) {
	if fromBond >= 0 {
		w.bondSymbol(fromBond)
	}
	if w.wantOrd {
		w.order = append(w.order, v)
	}
	w.atom(int(v))
	lo, hi := w.nbStart[v], w.nbStart[v+1]
	// Ring closures ending here first (partners visited earlier), freeing
	// their numbers, then those opening here, in rank order of partners.
	for k := lo; k < hi; k++ {
		u, bi := w.nbAtom[k], w.nbBond[k]
		if w.bondKind[bi] == 2 && w.visit[u] < w.visit[v] {
			w.bondSymbol(bi)
			w.ringNumber(int(w.digit[bi]))
			w.inUse[w.digit[bi]] = false
		}
	}
	for k := lo; k < hi; k++ {
		u, bi := w.nbAtom[k], w.nbBond[k]
		if w.bondKind[bi] == 2 && w.visit[u] > w.visit[v] {
			d := 1
			for d < 99 && w.inUse[d] {
				d++
			}
			w.inUse[d] = true
			w.digit[bi] = int8(d)
			w.ringNumber(d)
		}
	}
	children := 0
	for k := lo; k < hi; k++ {
		if u := w.nbAtom[k]; w.parent[u] == w.nbBond[k] && w.bondKind[w.nbBond[k]] == 1 && w.visit[u] > w.visit[v] {
			children++
		}
	}
	for k := lo; k < hi; k++ {
		u, bi := w.nbAtom[k], w.nbBond[k]
		if w.parent[u] != bi || w.bondKind[bi] != 1 || w.visit[u] < w.visit[v] {
			continue
		}
		children--
		if children > 0 {
			w.b = append(w.b, '(')
			w.emit(u, bi)
			w.b = append(w.b, ')')
		} else {
			w.emit(u, bi)
		}
	}
}

func (w *smilesWriter) ringNumber(d int) {
	if d < 10 {
		w.b = append(w.b, byte('0'+d))
		return
	}
	w.b = append(w.b, '%', byte('0'+d/10), byte('0'+d%10))
}

func (w *smilesWriter) isArom(v int) bool { return w.arom != nil && w.arom[v] }

func (w *smilesWriter) bondSymbol(bi int32) {
	b := w.g.Bonds[bi]
	switch Order(w.orders[bi]) {
	case Single:
		if w.isArom(b.A) && w.isArom(b.B) {
			w.b = append(w.b, '-')
		}
	case Double:
		w.b = append(w.b, '=')
	case Triple:
		w.b = append(w.b, '#')
	case Aromatic:
		if !(w.isArom(b.A) && w.isArom(b.B)) {
			w.b = append(w.b, ':')
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

var lowerSymbol = [NumElements]string{B: "b", C: "c", N: "n", O: "o", P: "p", S: "s"}

func (w *smilesWriter) atom(v int) {
	a := w.g.Atoms[v]
	sym := a.Element.Symbol()
	arom := false
	if w.isArom(v) && a.Element < NumElements && lowerSymbol[a.Element] != "" {
		arom = true
		sym = lowerSymbol[a.Element]
	}
	if a.Charge == 0 && organicSubset(a.Element) {
		sum := 0
		for _, nb := range w.g.Neighbors(v) {
			if o := Order(w.orders[nb.Bond]); o == Aromatic {
				sum++
			} else {
				sum += int(o)
			}
		}
		if organicHydrogens(a.Element, arom, sum) == a.HCount {
			w.b = append(w.b, sym...)
			return
		}
	}
	w.b = append(w.b, '[')
	w.b = append(w.b, sym...)
	if a.HCount > 0 {
		w.b = append(w.b, 'H')
		if a.HCount > 1 {
			w.b = append(w.b, itoa(a.HCount)...)
		}
	}
	w.b = append(w.b, chargeSuffix(a.Charge)...)
	w.b = append(w.b, ']')
}
