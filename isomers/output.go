package isomers

import "shiftrank/molecule"

// outputBuilder turns complete search structures into molecule graphs and
// holds the per-structure scratch of the Kekulé and filter checks. One per
// goroutine.
type outputBuilder struct {
	g *molecule.Graph
	// aromatic bonds of the current structure, by atom pair, when computed
	aromDone bool
	aromOK   bool // perception succeeded
	arom     [MaxAtoms][maxDeg]bool
	// Kekulé comparison scratch
	km   mol
	kc   *canonizer // allocated on first use
	best []byte
	own  []byte
}

// graph builds the molecule graph of m in a reused Graph.
func (o *outputBuilder) graph(m *mol) *molecule.Graph {
	if o.g == nil {
		o.g = molecule.NewGraph(m.n)
	}
	g := o.g
	g.Atoms = g.Atoms[:0]
	g.Bonds = g.Bonds[:0]
	for i := 0; i < m.n; i++ {
		g.Atoms = append(g.Atoms, molecule.Atom{Element: m.el[i], HCount: m.hcount(i), Charge: int(m.chg[i])})
	}
	for i := 0; i < m.n; i++ {
		for k := 0; k < int(m.deg[i]); k++ {
			u := int(m.nb[i][k])
			if u > i {
				g.Bonds = append(g.Bonds, molecule.Bond{A: i, B: u, Order: molecule.Order(m.bo[i][k])})
			}
		}
	}
	g.RebuildAdjacency()
	return g
}

// encode appends a compact form of m: atom count, then element, H count
// and charge per atom, bond count, then (a, b, order) per bond.
func (o *outputBuilder) encode(buf []byte, m *mol) []byte {
	buf = append(buf, byte(m.n))
	for i := 0; i < m.n; i++ {
		buf = append(buf, byte(m.el[i]), byte(m.hcount(i)), byte(m.chg[i]))
	}
	buf = append(buf, byte(m.edges))
	for i := 0; i < m.n; i++ {
		for k := 0; k < int(m.deg[i]); k++ {
			u := m.nb[i][k]
			if int(u) > i {
				buf = append(buf, byte(i), u, m.bo[i][k])
			}
		}
	}
	return buf
}

// decode reads one structure written by encode at off into g and returns
// the offset after it.
func decode(buf []byte, off int, g *molecule.Graph) int {
	n := int(buf[off])
	off++
	g.Atoms = g.Atoms[:0]
	g.Bonds = g.Bonds[:0]
	for i := 0; i < n; i++ {
		g.Atoms = append(g.Atoms, molecule.Atom{Element: molecule.Element(buf[off]), HCount: int(buf[off+1]), Charge: int(int8(buf[off+2]))})
		off += 3
	}
	ne := int(buf[off])
	off++
	for i := 0; i < ne; i++ {
		g.Bonds = append(g.Bonds, molecule.Bond{A: int(buf[off]), B: int(buf[off+1]), Order: molecule.Order(buf[off+2])})
		off += 3
	}
	g.RebuildAdjacency()
	return off
}

// aromatic reports whether the bond from atom a (its k-th neighbour) is
// aromatic, perceiving aromaticity once per structure.
func (o *outputBuilder) aromatic(m *mol, a, k int) bool {
	if !o.aromDone {
		o.perceive(m)
	}
	return o.arom[a][k]
}

// perceive fills o.arom from molecule.AromaticBonds.
func (o *outputBuilder) perceive(m *mol) {
	o.aromDone = true
	o.arom = [MaxAtoms][maxDeg]bool{}
	g := o.graph(m)
	flags := molecule.AromaticBonds(g)
	for bi, b := range g.Bonds {
		if bi >= len(flags) || !flags[bi] {
			continue
		}
		for k := 0; k < int(m.deg[b.A]); k++ {
			if int(m.nb[b.A][k]) == b.B {
				o.arom[b.A][k] = true
			}
		}
		for k := 0; k < int(m.deg[b.B]); k++ {
			if int(m.nb[b.B][k]) == b.A {
				o.arom[b.B][k] = true
			}
		}
	}
}

// kekuleRepresentative reports whether m is the one Kekulé structure
// emitted for its compound. Structures whose double bonds cannot be
// shifted (no alternating cycle) are their own class. Otherwise the
// Kekulé structures reachable by re-pairing the aromatic double bonds
// (bonds perceived aromatic by molecule.AromaticBonds) are compared by
// their canonical certificates and only the smallest is kept; isomorphic
// forms share a certificate, so each compound is emitted exactly once.
func (o *outputBuilder) kekuleRepresentative(m *mol) (valid, rep bool) {
	o.aromDone = false
	doubles := 0
	for i := 0; i < m.n; i++ {
		for k := 0; k < int(m.deg[i]); k++ {
			if m.bo[i][k] == 2 {
				doubles++
			}
		}
	}
	if doubles < 4 { // each double bond is seen from both ends
		return true, true
	}
	// atoms with exactly one double bond and no triple bond
	var partner [MaxAtoms]int8
	for i := 0; i < m.n; i++ {
		partner[i] = -1
		nd := 0
		for k := 0; k < int(m.deg[i]); k++ {
			switch m.bo[i][k] {
			case 2:
				nd++
				partner[i] = int8(m.nb[i][k])
			case 3:
				nd = 9
			}
		}
		if nd != 1 {
			partner[i] = -2
		}
	}
	var in [MaxAtoms]bool
	any := false
	for i := 0; i < m.n; i++ {
		if partner[i] >= 0 && partner[partner[i]] >= 0 {
			in[i] = true
			any = true
		}
	}
	if !any {
		return true, true
	}
	var matched [MaxAtoms]bool
	if countMatchings(m, &in, &matched, nil, 2) < 2 {
		return true, true
	}
	// Several Kekulé structures: restrict to aromatic double bonds.
	o.perceive(m)
	var ar [MaxAtoms]bool
	anyAr := false
	for i := 0; i < m.n; i++ {
		if !in[i] {
			continue
		}
		for k := 0; k < int(m.deg[i]); k++ {
			if m.bo[i][k] == 2 && o.arom[i][k] {
				ar[i] = true
				anyAr = true
			}
		}
	}
	if !anyAr {
		return true, true
	}
	// enumerate the perfect matchings of the aromatic atoms over aromatic
	// bonds and keep the smallest certificate
	o.own = o.certOf(m, o.own)
	o.best = append(o.best[:0], o.own...)
	o.km = *m
	isRep := true
	matched = [MaxAtoms]bool{}
	var visit func(i int) bool
	visit = func(i int) bool {
		for i < m.n && (!ar[i] || matched[i]) {
			i++
		}
		if i == m.n {
			c := o.certOf(&o.km, nil)
			if compareBytes(c, o.own) < 0 {
				isRep = false
				return false
			}
			return true
		}
		matched[i] = true
		for k := 0; k < int(m.deg[i]); k++ {
			u := int(m.nb[i][k])
			if !ar[u] || matched[u] || !o.arom[i][k] {
				continue
			}
			matched[u] = true
			setOrder(&o.km, i, u, 2)
			ok := visit(i + 1)
			setOrder(&o.km, i, u, 1)
			matched[u] = false
			if !ok {
				matched[i] = false
				return false
			}
		}
		matched[i] = false
		return true
	}
	// clear the aromatic double bonds, then re-pair them
	for i := 0; i < m.n; i++ {
		if !ar[i] {
			continue
		}
		for k := 0; k < int(m.deg[i]); k++ {
			if o.km.bo[i][k] == 2 && ar[o.km.nb[i][k]] && o.arom[i][k] {
				setOrder(&o.km, i, int(o.km.nb[i][k]), 1)
			}
		}
	}
	visit(0)
	return true, isRep
}

// setOrder changes the order of the bond a–b in m (bond-order sums are
// left alone: re-pairing keeps every atom's sum).
func setOrder(m *mol, a, b int, o uint8) {
	for k := 0; k < int(m.deg[a]); k++ {
		if int(m.nb[a][k]) == b {
			m.bo[a][k] = o
		}
	}
	for k := 0; k < int(m.deg[b]); k++ {
		if int(m.nb[b][k]) == a {
			m.bo[b][k] = o
		}
	}
}

// certOf returns the canonical certificate of m (colours as in m.col).
func (o *outputBuilder) certOf(m *mol, buf []byte) []byte {
	if o.kc == nil {
		o.kc = new(canonizer)
	}
	o.kc.m = m
	o.kc.vertexKeys()
	var p partition
	o.kc.initPartition(&p)
	var res canonResult
	o.kc.search(&p, &res)
	return append(buf[:0], o.kc.bestCert...)
}

// countMatchings counts the perfect matchings of the atoms marked in over
// the bonds between them (any order), stopping at limit.
func countMatchings(m *mol, in, matched *[MaxAtoms]bool, _ []int, limit int) int {
	i := 0
	for i < m.n && (!in[i] || matched[i]) {
		i++
	}
	if i == m.n {
		return 1
	}
	total := 0
	matched[i] = true
	for k := 0; k < int(m.deg[i]) && total < limit; k++ {
		u := int(m.nb[i][k])
		if !in[u] || matched[u] || m.bo[i][k] > 2 {
			continue
		}
		matched[u] = true
		total += countMatchings(m, in, matched, nil, limit-total)
		matched[u] = false
	}
	matched[i] = false
	return total
}
