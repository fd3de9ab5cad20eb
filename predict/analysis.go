package predict

import "shiftrank/molecule"

// mol holds what Predict derives from a graph before assigning shifts.
type mol struct {
	g        *molecule.Graph
	w        *work
	arom     []bool  // Hückel-aromatic atoms (molecule.AromaticAtoms)
	hetRing  []bool  // aromatic atom whose smallest aromatic ring has a heteroatom
	multi    []int8  // number of double/triple bonds at the atom
	ringAtom []int16 // smallest ring through the atom, 0 if acyclic
	ringBond []int16 // smallest ring through the bond, 0 if not in a ring
	rsys     []int16 // ring system (components of ring bonds), -1 if acyclic
	orbit    []int   // automorphism orbit representative (molecule.Canonicalize)
	label    []int   // canonical label
	stereo   bool    // the molecule has a stereocentre
	// prochiral: some atom could become a stereocentre when one H of a
	// CH2 elsewhere is replaced (see prochiralAt)
	prochiral bool
	nRing     []int8 // number of ring bonds at the atom
	// poly: some atom has three or more ring bonds (a fused, bridged or
	// spiro polycyclic skeleton)
	poly bool
	// ringCO: some ring carbon of a 5- to 7-membered ring carries an
	// exocyclic C=O or C=S (candidates for amideRing)
	ringCO bool
	// scratch for breadth-first searches
	dist  []int16
	queue []int
	par   []int
}

// work is the scratch space of one Predict call, reused through a pool.
type work struct {
	canon  molecule.Canonicalizer
	m      mol
	i16    []int16
	i8     []int8
	ints   []int
	bools  []bool
	col    []uint64
	groups []hgroup
	jbuf   []jterm
	rings  []int
	marked []int // orbits of a marked copy (markedStereocentres)
}

func growInt16(s []int16, n int) []int16 {
	if cap(s) < n {
		return make([]int16, n)
	}
	s = s[:n]
	clear(s)
	return s
}

func (w *work) analyse(g *molecule.Graph) *mol {
	n := len(g.Atoms)
	m := &w.m
	*m = mol{g: g, w: w}
	// One backing array for the small per-atom slices.
	w.i16 = growInt16(w.i16, 3*n+len(g.Bonds))
	i16 := w.i16
	m.ringAtom, m.rsys, m.dist, m.ringBond = i16[:n], i16[n:2*n], i16[2*n:3*n], i16[3*n:]
	if cap(w.i8) < 2*n {
		w.i8 = make([]int8, 2*n)
	}
	m.multi, m.nRing = w.i8[:n], w.i8[n:2*n]
	clear(w.i8[:2*n])
	if cap(w.ints) < 4*n {
		w.ints = make([]int, 4*n)
	}
	m.queue = w.ints[:0:n]
	m.par = w.ints[n : 2*n]
	m.orbit = w.ints[2*n : 3*n]
	m.label = w.ints[3*n : 4*n]
	if cap(w.bools) < 2*n {
		w.bools = make([]bool, 2*n)
	}
	m.arom, m.hetRing = w.bools[:n], w.bools[n:2*n]
	clear(m.arom)
	clear(m.hetRing)
	w.rings = w.rings[:0]
	for _, b := range g.Bonds {
		if b.Order >= molecule.Double && b.Order <= molecule.Triple {
			m.multi[b.A]++
			m.multi[b.B]++
		}
	}
	var aromBond []bool
	if g.NumRings() > 0 {
		aromBond = molecule.AromaticBonds(g)
		for i, ar := range aromBond {
			if ar {
				m.arom[g.Bonds[i].A] = true
				m.arom[g.Bonds[i].B] = true
			}
		}
	}
	m.symmetry(aromBond, &w.canon)
	for i := range m.rsys {
		m.rsys[i] = -1
	}
	if g.NumRings() > 0 {
		for bi, b := range g.Bonds {
			if d := m.pathLen(b.B, b.A, bi, -1, -1); d > 0 {
				m.ringBond[bi] = int16(d + 1)
			}
		}
		for bi, b := range g.Bonds {
			r := m.ringBond[bi]
			if r == 0 {
				continue
			}
			m.nRing[b.A]++
			m.nRing[b.B]++
			if m.nRing[b.A] >= 3 || m.nRing[b.B] >= 3 {
				m.poly = true
			}
			for _, x := range [2]int{b.A, b.B} {
				if m.ringAtom[x] == 0 || r < m.ringAtom[x] {
					m.ringAtom[x] = r
				}
			}
		}
		m.ringSystems()
		for bi, b := range g.Bonds {
			if b.Order != molecule.Double || m.ringBond[bi] != 0 {
				continue
			}
			for _, x := range [2]int{b.A, b.B} {
				if sz := m.ringAtom[x]; sz >= 5 && sz <= 7 && g.Atoms[x].Element == molecule.C {
					if e := g.Atoms[b.A+b.B-x].Element; e == molecule.O || e == molecule.S {
						m.ringCO = true
					}
				}
			}
		}
	}
	for i := range g.Atoms {
		if m.arom[i] {
			for _, x := range m.aromRing(i) {
				if g.Atoms[x].Element != molecule.C {
					m.hetRing[i] = true
					break
				}
			}
		}
	}
	m.stereo = m.hasStereocentre()
	if !m.stereo {
		for d := range g.Atoms {
			if m.prochiralAt(d) {
				m.prochiral = true
				break
			}
		}
	}
	return m
}

// pathLen returns the length of the shortest path from s to t that does not
// use bond skipBond nor pass through atoms avoid1, avoid2 (-1 = none), or
// -1 if there is none. With onlyArom it stays on aromatic atoms.
func (m *mol) pathLen(s, t, skipBond, avoid1, avoid2 int) int {
	return m.bfs(s, t, skipBond, avoid1, avoid2, false)
}

func (m *mol) bfs(s, t, skipBond, avoid1, avoid2 int, onlyArom bool) int {
	g := m.g
	for i := range m.dist {
		m.dist[i] = -1
	}
	m.queue = m.queue[:0]
	m.queue = append(m.queue, s)
	m.dist[s] = 0
	m.par[s] = -1
	for h := 0; h < len(m.queue); h++ {
		v := m.queue[h]
		for _, nb := range g.Neighbors(v) {
			w := nb.Atom
			if nb.Bond == skipBond || w == avoid1 || w == avoid2 || m.dist[w] >= 0 {
				continue
			}
			if onlyArom && !m.arom[w] {
				continue
			}
			m.dist[w] = m.dist[v] + 1
			m.par[w] = v
			if w == t {
				return int(m.dist[w])
			}
			m.queue = append(m.queue, w)
		}
	}
	return -1
}

func (m *mol) ringSystems() {
	g := m.g
	next := int16(0)
	for s := range g.Atoms {
		if m.ringAtom[s] == 0 || m.rsys[s] >= 0 {
			continue
		}
		stack := []int{s}
		m.rsys[s] = next
		for len(stack) > 0 {
			v := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			for _, nb := range g.Neighbors(v) {
				if m.ringBond[nb.Bond] > 0 && m.rsys[nb.Atom] < 0 {
					m.rsys[nb.Atom] = next
					stack = append(stack, nb.Atom)
				}
			}
		}
		next++
	}
}

// aromRing returns the atoms of the smallest aromatic ring through aromatic
// atom a, starting with a and going round the ring. It returns nil if a is
// not in an aromatic ring.
func (m *mol) aromRing(a int) []int {
	g := m.g
	var best []int
	nbs := g.Neighbors(a)
	for i := 0; i < len(nbs); i++ {
		p := nbs[i].Atom
		if !m.arom[p] || m.ringBond[nbs[i].Bond] == 0 {
			continue
		}
		for j := i + 1; j < len(nbs); j++ {
			q := nbs[j].Atom
			if !m.arom[q] || m.ringBond[nbs[j].Bond] == 0 {
				continue
			}
			d := m.bfs(p, q, -1, a, -1, true)
			if d < 0 || (best != nil && d+2 >= len(best)) {
				continue
			}
			// Rings live in the work's shared backing array.
			start := len(m.w.rings)
			m.w.rings = append(m.w.rings, make([]int, d+2)...)
			ring := m.w.rings[start : start+d+2 : start+d+2]
			ring[0] = a
			k := d + 1
			for v := q; v >= 0; v = m.par[v] {
				ring[k] = v
				k--
			}
			best = ring
		}
	}
	return best
}

// hybrid reports the hybridisation class of atom x: 3 (sp3), 2 (sp2 or
// aromatic), 1 (sp).
func (m *mol) hybrid(x int) int {
	if m.arom[x] {
		return 2
	}
	dbl, tri := 0, 0
	for _, nb := range m.g.Neighbors(x) {
		switch nb.Order {
		case molecule.Double:
			dbl++
		case molecule.Triple:
			tri++
		}
	}
	switch {
	case tri > 0 || dbl > 1:
		return 1
	case dbl == 1:
		return 2
	}
	return 3
}

// hasStereocentre reports whether some atom is a stereocentre by
// constitution: an sp3 carbon (or Si) with four different substituents,
// compared by automorphism orbit (an implicit H is its own class), a
// sulfoxide S with two different substituents, or a P with three or four
// different substituents.
func (m *mol) hasStereocentre() bool {
	for i := range m.g.Atoms {
		if m.stereoShape(i) && m.distinctNeighbours(i, m.orbit) {
			return true
		}
	}
	return false
}

// stereoShape reports whether atom i has the shape of a stereocentre (see
// hasStereocentre), whatever its substituents.
func (m *mol) stereoShape(i int) bool {
	a := m.g.Atoms[i]
	nbs := m.g.Neighbors(i)
	switch a.Element {
	case molecule.C, molecule.Si:
		return a.HCount <= 1 && len(nbs)+a.HCount == 4 && m.multi[i] == 0
	case molecule.S:
		return a.HCount == 0 && len(nbs) == 3 && m.doubleCount(i) == 1
	case molecule.P:
		return a.HCount <= 1 && len(nbs)+a.HCount >= 3
	}
	return false
}

// distinctNeighbours reports whether the neighbours of atom i lie in
// pairwise different orbits of orbit (also distinguishing the bond order,
// so the two O of a sulfoxide-like centre count as different).
func (m *mol) distinctNeighbours(i int, orbit []int) bool {
	nbs := m.g.Neighbors(i)
	for x := 0; x < len(nbs); x++ {
		for y := x + 1; y < len(nbs); y++ {
			if orbit[nbs[x].Atom] == orbit[nbs[y].Atom] && nbs[x].Order == nbs[y].Order {
				return false
			}
		}
	}
	return true
}

// prochiralAt reports whether atom d has the shape of a stereocentre and
// exactly one pair of equivalent neighbours, both with further bonds, so
// that marking an atom inside one of the two branches can make d a
// stereocentre (the acetal C of 1,1-diethoxyethane; not the CH of an
// isopropyl group, whose equivalent branches are bare CH3).
func (m *mol) prochiralAt(d int) bool {
	if !m.stereoShape(d) {
		return false
	}
	g := m.g
	nbs := g.Neighbors(d)
	pairs := 0
	for x := 0; x < len(nbs); x++ {
		for y := x + 1; y < len(nbs); y++ {
			if m.orbit[nbs[x].Atom] == m.orbit[nbs[y].Atom] && nbs[x].Order == nbs[y].Order {
				if pairs++; pairs > 1 || g.Degree(nbs[x].Atom) < 2 {
					return false
				}
			}
		}
	}
	return pairs == 1
}

// markedStereocentres reports whether the two H of the sp3 CH2 carbon c
// are diastereotopic by the substitution test (common practice: replacing
// one or the other geminal H by a test group gives diastereomers),
// decided on the constitution of a molecule that has no stereocentre:
// with one H of c replaced by a unique marker, c must become a
// stereocentre (its two heavy neighbours differ) and so must some other
// atom (a prochiral centre whose two equivalent branches the marker tells
// apart). Two stereocentres make the two marked molecules diastereomers.
// Marking c is the same as fixing c, so the marked molecule is the graph
// plus one atom of an element the molecule lacks, bonded to c.
func (m *mol) markedStereocentres(c int) bool {
	g := m.g
	nbs := g.Neighbors(c)
	if !m.prochiral || len(nbs) != 2 || m.orbit[nbs[0].Atom] == m.orbit[nbs[1].Atom] {
		return false
	}
	var present [molecule.NumElements]bool
	for _, a := range g.Atoms {
		present[a.Element] = true
	}
	mark := molecule.NoElement
	for e := molecule.B; e < molecule.NumElements; e++ {
		if !present[e] {
			mark = e
			break
		}
	}
	if mark == molecule.NoElement {
		return false
	}
	mg := g.Clone()
	mg.Atoms[c].HCount--
	mg.MustAddBond(c, mg.AddAtom(mark, 0), molecule.Single)
	orbit := m.w.canon.Orbits(m.w.marked[:0], mg)
	m.w.marked = orbit
	for d := range g.Atoms {
		if d != c && m.prochiralAt(d) && m.distinctNeighbours(d, orbit) {
			return true
		}
	}
	return false
}

// ringFacesDiffer reports whether the ring system of atom c contains an sp3
// ring atom (other than c) with two different exocyclic substituents (one
// may be H), which makes the two faces of the ring, and so the two H of a
// ring CH2, different.
func (m *mol) ringFacesDiffer(c int) bool {
	g := m.g
	sys := m.rsys[c]
	if sys < 0 {
		return false
	}
	for r, a := range g.Atoms {
		if r == c || m.rsys[r] != sys || m.multi[r] > 0 || m.arom[r] {
			continue
		}
		var exo [4]int
		ne := 0
		for _, nb := range g.Neighbors(r) {
			if m.ringBond[nb.Bond] == 0 && ne < 4 {
				exo[ne] = m.orbit[nb.Atom]
				ne++
			}
		}
		for k := 0; k < a.HCount && ne < 4; k++ {
			exo[ne] = -1 // hydrogen
			ne++
		}
		if ne == 2 && exo[0] != exo[1] {
			return true
		}
	}
	return false
}
