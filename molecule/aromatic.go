package molecule

import (
	"math/bits"
	"slices"
)

// Aromaticity model (Hückel's rule, 4n+2 π electrons), chosen so that it
// depends only on the constitution and never on which Kekulé structure a
// graph happens to carry:
//
//  1. Each ring atom gets a π-electron count, or none (not a candidate):
//     - 1 for an atom with exactly one double bond, that bond being a ring
//     bond, at its normal valence: C, N, P (neutral), N+, P+, O+, S+
//     (benzene, pyridine, pyridinium, pyrylium);
//     - 2 for an atom with only single bonds and a lone pair in the ring:
//     neutral N or P with three bonds including H (pyrrole NH), neutral O
//     and S with two (furan, thiophene), C− (cyclopentadienide), N− and
//     P− with two (pyrrolide);
//     - 0 for C+ with only single bonds (tropylium);
//     - none otherwise: sp3 atoms, triple bonds, two double bonds, and C
//     with an exocyclic double bond. The last rule means that 2-pyridone,
//     4-pyranone, tropone and quinone rings are kept in their single
//     Kekulé form rather than aromatised (a decision; some toolkits count
//     such a carbon as contributing 0 electrons instead). Those rings have
//     only one arrangement of their ring double bonds, so nothing needs
//     merging.
//     A Kekulé shift moves every double bond of an alternating ring to the
//     neighbouring ring bond, so the counts above are the same in every
//     Kekulé structure.
//  2. Candidate atoms joined by ring bonds form the candidate subgraph.
//     A simple cycle of it is aromatic if its atoms' π counts sum to
//     4n+2 and it is a ring of the molecule: a GF(2) sum of relevant
//     cycles (cycles that are not sums of shorter ones; Vismara 1997,
//     Electron. J. Combin. 4:R9, from memory) made of candidate atoms
//     only. Single rings (benzene, pyrrole) are relevant cycles, and the
//     perimeters of fused systems (naphthalene, azulene, indole) are sums
//     of their rings, so fused systems need no special case; but the six
//     sp2 atoms of 1,4-methanobenzene (bicyclo[2.2.1]hepta-1,3,5-triene)
//     only close a cycle around the sp3 bridge, which is the sum of the
//     two five-membered rings through the bridge, and are not aromatic.
//     The bonds of an aromatic cycle are aromatic; a bond across it
//     (the 5/7 fusion bond of azulene, the transannular bond of an
//     azabicyclo[2.1.0]pentadiene) is aromatic only if it lies on another
//     aromatic cycle (the fusion bond of naphthalene lies on both benzene
//     rings), so it keeps its own order and Kekulé structures that differ
//     in it stay distinct compounds. A ring of 4n π electrons
//     (cyclobutadiene, cyclooctatetraene, pentalene) is not aromatic, so
//     its Kekulé structures stay distinct.
//     This follows the ring model of RDKit's aromaticity (rings of the
//     molecule and fused combinations of them, marking the bonds of a
//     combination that lie on one of its rings only), with two
//     differences: RDKit takes its rings from a symmetrised smallest set
//     of smallest rings, which in a few strained polycycles misses a
//     relevant ring depending on the atom order of the input; and RDKit
//     counts a ring carbon with an exocyclic C=C as one π electron (and
//     one with an exocyclic C=O or C=N as none), where step 1 makes it no
//     candidate (a cross-conjugated, fulvene- or quinone-like ring, not a
//     cyclic 4n+2 system).
//  3. For large candidate subgraphs (cyclomatic number above
//     maxCandRings, as in large polycyclic aromatics) only cycles of at
//     most fallbackCycleLen atoms are examined, which bounds the work.
//     The limit depends only on the graph, so the result is still
//     independent of atom numbering.
//
// The result is invariant under renumbering the atoms (relevant cycles
// and their spans are graph invariants, unlike a smallest set of smallest
// rings) and under Kekulé shifts within the aromatic bonds, which is what
// canonical forms need.
const (
	maxCandRings     = 8
	fallbackCycleLen = 10
)

// AromaticBonds returns, indexed like g.Bonds, whether each bond belongs to
// a Hückel (4n+2) aromatic ring or fused ring system (benzene, pyridine,
// pyrrole, furan, thiophene, naphthalene, azulene, indole, ...). See the
// model described in aromatic.go. Bonds of order Aromatic in g are treated
// like ring bonds of an alternating system. The result is the same for all
// Kekulé structures of a compound.
func AromaticBonds(g *Graph) []bool {
	var a aromaticity
	return append([]bool(nil), a.perceive(g)...)
}

// Aromaticity perceives aromatic bonds like AromaticBonds, reusing its
// memory across calls. The zero value is ready to use; it is not safe for
// concurrent use.
type Aromaticity struct {
	a aromaticity
}

// Bonds returns AromaticBonds(g) in a slice owned by a, valid until the
// next call.
func (a *Aromaticity) Bonds(g *Graph) []bool { return a.a.perceive(g) }

// AromaticAtoms returns, indexed like g.Atoms, whether each atom has at
// least one aromatic bond (see AromaticBonds).
func AromaticAtoms(g *Graph) []bool {
	bonds := AromaticBonds(g)
	atoms := make([]bool, len(g.Atoms))
	for i, ar := range bonds {
		if ar {
			atoms[g.Bonds[i].A] = true
			atoms[g.Bonds[i].B] = true
		}
	}
	return atoms
}

// aromaticity holds reusable scratch space for perception.
type aromaticity struct {
	ringBond []bool
	pi       []int8
	arom     []bool
	cand     []bool
	deg      []int
	// cycle enumeration
	path    []int
	onPath  []bool
	pathSum int
	maxLen  int
	// bridge finding
	disc, low []int
	// candidate adjacency (CSR over atoms)
	cStart, cNbr, cBond []int
	// the simple cycles of the candidate subgraph: bond bit sets of
	// words uint64 each, lengths, 4n+2 flags, one atom of each
	words     int
	cycBits   []uint64
	cycLen    []int
	cycHuckel []bool
	cycAtom   []int
	anyHuckel bool
	// ring cycle selection (markRingCycles)
	sysOf         []int // ring system (union-find parent) per atom
	sysImpure     []bool
	order, hOrder []int
	good, shorter gf2Basis
	scratch       []uint64
	// Horton candidate cycles: bond bit sets and lengths; shortest-path
	// trees (distance and parent bond per source and atom, flattened)
	hBits     []uint64
	hLen      []int
	dist, par []int
	queue     []int
	mark      []int
}

func (a *aromaticity) perceive(g *Graph) []bool {
	n := len(g.Atoms)
	m := len(g.Bonds)
	a.arom = resizeBools(a.arom, m)
	if n < 3 || m < 3 {
		return a.arom
	}
	// Quick exit: fewer than three atoms that could be candidates at all
	// (saturated skeletons are the common case in isomer generation).
	maybe := 0
	for v := 0; v < n && maybe < 3; v++ {
		if a.mayBeCandidate(g, v) {
			maybe++
		}
	}
	if maybe < 3 {
		return a.arom
	}
	a.findRingBonds(g)
	a.pi = resizeInt8(a.pi, n)
	a.cand = resizeBools(a.cand, n)
	cnt := 0
	for v := 0; v < n; v++ {
		a.pi[v] = a.piCount(g, v)
		a.cand[v] = a.pi[v] >= 0
		if a.cand[v] {
			cnt++
		}
	}
	if cnt < 3 {
		return a.arom
	}
	// Prune candidates with fewer than two candidate ring neighbours.
	a.deg = resizeInts(a.deg, n)
	for v := 0; v < n; v++ {
		a.deg[v] = 0
	}
	for i, b := range g.Bonds {
		if a.ringBond[i] && a.cand[b.A] && a.cand[b.B] {
			a.deg[b.A]++
			a.deg[b.B]++
		}
	}
	for changed := true; changed; {
		changed = false
		for v := 0; v < n; v++ {
			if a.cand[v] && a.deg[v] < 2 {
				a.cand[v] = false
				cnt--
				changed = true
				for _, nb := range g.Neighbors(v) {
					if a.ringBond[nb.Bond] && a.cand[nb.Atom] {
						a.deg[nb.Atom]--
					}
				}
			}
		}
	}
	if cnt < 3 {
		return a.arom
	}
	// Candidate adjacency.
	a.cStart = resizeInts(a.cStart, n+1)
	a.cNbr = a.cNbr[:0]
	a.cBond = a.cBond[:0]
	for v := 0; v < n; v++ {
		a.cStart[v] = len(a.cNbr)
		if !a.cand[v] {
			continue
		}
		for _, nb := range g.Neighbors(v) {
			if a.ringBond[nb.Bond] && a.cand[nb.Atom] {
				a.cNbr = append(a.cNbr, nb.Atom)
				a.cBond = append(a.cBond, nb.Bond)
			}
		}
	}
	a.cStart[n] = len(a.cNbr)

	a.onPath = resizeBools(a.onPath, n)
	// Simple paths, and so the work of enumerating cycles, grow
	// exponentially with the cyclomatic number of the candidate subgraph;
	// past maxCandRings only rings of at most fallbackCycleLen atoms are
	// examined (the number is a graph invariant, so the choice does not
	// depend on atom numbering).
	a.maxLen = n
	if a.candRings(n) > maxCandRings {
		a.maxLen = fallbackCycleLen
	}
	a.words = (m + 63) / 64
	a.cycBits, a.cycLen, a.cycHuckel, a.cycAtom = a.cycBits[:0], a.cycLen[:0], a.cycHuckel[:0], a.cycAtom[:0]
	a.anyHuckel = false
	a.enumerate(g)
	if a.anyHuckel {
		a.markRingCycles(g)
	}
	return a.arom
}

// mayBeCandidate is a necessary condition for piCount(v) >= 0 that needs
// no ring information.
func (a *aromaticity) mayBeCandidate(g *Graph, v int) bool {
	nbs := g.Neighbors(v)
	if len(nbs) < 2 {
		return false
	}
	at := g.Atoms[v]
	if at.Charge != 0 {
		return true
	}
	for _, nb := range nbs {
		if nb.Order != Single {
			return true
		}
	}
	switch at.Element {
	case N, P, O, S:
		return true
	}
	return false
}

// piCount returns the π-electron count of atom v as described in the
// model, or -1 if v cannot be part of an aromatic ring.
func (a *aromaticity) piCount(g *Graph, v int) int8 {
	at := g.Atoms[v]
	ringBonds, doubles, dbRing, arom := 0, 0, false, 0
	sum := at.HCount
	for _, nb := range g.Neighbors(v) {
		if a.ringBond[nb.Bond] {
			ringBonds++
		}
		switch nb.Order {
		case Double:
			doubles++
			dbRing = a.ringBond[nb.Bond]
			sum += 2
		case Triple:
			return -1
		case Aromatic:
			arom++
			sum++
		default:
			sum++
		}
	}
	if ringBonds < 2 {
		return -1
	}
	if arom > 0 {
		// Aromatic-order bonds (not kekulised): treat the atom as if it
		// had the double bond it needs, or none.
		if doubles > 0 {
			return -1
		}
		if !valenceAllowed(at.Element, at.Charge, sum) && valenceAllowed(at.Element, at.Charge, sum+1) {
			doubles, dbRing, sum = 1, true, sum+1
		}
	}
	switch doubles {
	case 1:
		if !dbRing || !valenceAllowed(at.Element, at.Charge, sum) || sum != lowestValence(at.Element, at.Charge) {
			return -1
		}
		switch at.Charge {
		case 0:
			if at.Element == C || at.Element == N || at.Element == P {
				return 1
			}
		case 1:
			if at.Element == N || at.Element == P || at.Element == O || at.Element == S {
				return 1
			}
		}
		return -1
	case 0:
		if sum != lowestValence(at.Element, at.Charge) {
			return -1
		}
		switch at.Charge {
		case 0:
			switch at.Element {
			case N, P:
				if sum == 3 {
					return 2
				}
			case O, S:
				if sum == 2 {
					return 2
				}
			}
		case -1:
			switch at.Element {
			case C, N, P:
				return 2
			}
		case 1:
			if at.Element == C {
				return 0
			}
		}
	}
	return -1
}

func lowestValence(e Element, q int) int {
	v := allowedValences(e, q)
	if len(v) == 0 {
		return -1
	}
	return v[0]
}

// enumerate visits every simple cycle of the candidate subgraph once: from
// each start atom s, paths through atoms greater than s that return to s,
// counted once per direction pair by requiring the second atom to be
// smaller than the last.
func (a *aromaticity) enumerate(g *Graph) {
	n := len(g.Atoms)
	for s := 0; s < n; s++ {
		if !a.cand[s] {
			continue
		}
		a.path = append(a.path[:0], s)
		a.onPath[s] = true
		a.pathSum = int(a.pi[s])
		a.extend(g, s, s)
		a.onPath[s] = false
	}
}

func (a *aromaticity) extend(g *Graph, s, v int) {
	for k := a.cStart[v]; k < a.cStart[v+1]; k++ {
		w := a.cNbr[k]
		if w == s && len(a.path) >= 3 && a.path[1] < v {
			a.cycle(g)
			continue
		}
		if w <= s || a.onPath[w] || len(a.path) >= a.maxLen {
			continue
		}
		a.path = append(a.path, w)
		a.onPath[w] = true
		a.pathSum += int(a.pi[w])
		a.extend(g, s, w)
		a.pathSum -= int(a.pi[w])
		a.onPath[w] = false
		a.path = a.path[:len(a.path)-1]
	}
}

// cycle records the cycle a.path (closed back to its first atom): its
// bonds as a bit set, its length and whether its π count is 4n+2.
func (a *aromaticity) cycle(g *Graph) {
	w := a.words
	start := len(a.cycBits)
	for k := 0; k < w; k++ {
		a.cycBits = append(a.cycBits, 0)
	}
	set := a.cycBits[start:]
	for i, v := range a.path {
		u := a.path[(i+1)%len(a.path)]
		for k := a.cStart[v]; k < a.cStart[v+1]; k++ {
			if a.cNbr[k] == u {
				b := a.cBond[k]
				set[b/64] |= 1 << (b % 64)
				break
			}
		}
	}
	huckel := a.pathSum%4 == 2
	a.cycLen = append(a.cycLen, len(a.path))
	a.cycHuckel = append(a.cycHuckel, huckel)
	a.cycAtom = append(a.cycAtom, a.path[0])
	if huckel {
		a.anyHuckel = true
	}
}

// candRings returns the cyclomatic number (edges − vertices + components)
// of the candidate subgraph.
func (a *aromaticity) candRings(n int) int {
	verts, comps := 0, 0
	a.deg = resizeInts(a.deg, n) // reused as a visited mark
	for s := 0; s < n; s++ {
		if !a.cand[s] || a.deg[s] != 0 {
			continue
		}
		comps++
		a.path = append(a.path[:0], s)
		a.deg[s] = 1
		for len(a.path) > 0 {
			v := a.path[len(a.path)-1]
			a.path = a.path[:len(a.path)-1]
			verts++
			for k := a.cStart[v]; k < a.cStart[v+1]; k++ {
				if w := a.cNbr[k]; a.deg[w] == 0 {
					a.deg[w] = 1
					a.path = append(a.path, w)
				}
			}
		}
	}
	return len(a.cNbr)/2 - verts + comps
}

// findRingBonds marks the bonds that lie on a cycle (are not bridges).
func (a *aromaticity) findRingBonds(g *Graph) {
	n := len(g.Atoms)
	a.ringBond = resizeBools(a.ringBond, len(g.Bonds))
	a.disc = resizeInts(a.disc, n)
	a.low = resizeInts(a.low, n)
	for i := range a.disc {
		a.disc[i] = -1
	}
	t := 0
	for s := 0; s < n; s++ {
		if a.disc[s] < 0 {
			t = a.bridgeDFS(g, s, -1, t)
		}
	}
	for i, b := range g.Bonds {
		// A bond u–v (u discovered first) is a bridge iff low[v] > disc[u].
		u, v := b.A, b.B
		if a.disc[u] > a.disc[v] {
			u, v = v, u
		}
		a.ringBond[i] = a.low[v] <= a.disc[u]
	}
}

func (a *aromaticity) bridgeDFS(g *Graph, v, parentBond, t int) int {
	a.disc[v] = t
	a.low[v] = t
	t++
	for _, nb := range g.Neighbors(v) {
		if nb.Bond == parentBond {
			continue
		}
		w := nb.Atom
		if a.disc[w] < 0 {
			t = a.bridgeDFS(g, w, nb.Bond, t)
			if a.low[w] < a.low[v] {
				a.low[v] = a.low[w]
			}
		} else if a.disc[w] < a.low[v] {
			a.low[v] = a.disc[w]
		}
	}
	return t
}

func resizeBools(s []bool, n int) []bool {
	if cap(s) < n {
		return make([]bool, n)
	}
	s = s[:n]
	clear(s)
	return s
}

func resizeInts(s []int, n int) []int {
	if cap(s) < n {
		return make([]int, n)
	}
	s = s[:n]
	clear(s)
	return s
}

func resizeInt8(s []int8, n int) []int8 {
	if cap(s) < n {
		return make([]int8, n)
	}
	s = s[:n]
	clear(s)
	return s
}

// markRingCycles marks the bonds of the 4n+2 cycles that count as rings
// of the molecule (step 2 of the model): a cycle counts if it is a GF(2)
// sum of relevant cycles (Vismara 1997: cycles that are not sums of
// shorter cycles) made of candidate atoms only. In a ring system whose
// atoms are all candidates every cycle qualifies, so the minimum cycle
// basis is only computed for ring systems that also hold other atoms.
func (a *aromaticity) markRingCycles(g *Graph) {
	n := len(g.Atoms)
	a.sysOf = resizeInts(a.sysOf, n)
	for v := range a.sysOf {
		a.sysOf[v] = v
	}
	for i, b := range g.Bonds {
		if a.ringBond[i] {
			if ra, rb := a.find(b.A), a.find(b.B); ra != rb {
				a.sysOf[ra] = rb
			}
		}
	}
	a.sysImpure = resizeBools(a.sysImpure, n)
	for i, b := range g.Bonds {
		if !a.ringBond[i] {
			continue
		}
		if !a.cand[b.A] || !a.cand[b.B] {
			a.sysImpure[a.find(b.A)] = true
		}
	}
	mixed := false
	for c := range a.cycLen {
		if a.cycHuckel[c] && a.sysImpure[a.find(a.cycAtom[c])] {
			mixed = true
			break
		}
	}
	if !mixed {
		for c := range a.cycLen {
			if a.cycHuckel[c] {
				a.markCycle(c)
			}
		}
		return
	}
	// Horton's candidate cycles (Horton 1987, SIAM J. Comput. 16:358,
	// from memory) shorter than the longest candidate cycle: those shorter
	// than L span every cycle shorter than L, so a cycle of length L is
	// relevant exactly when it is not in their span.
	w := a.words
	maxLen := 0
	for _, l := range a.cycLen {
		maxLen = max(maxLen, l)
	}
	a.hortonCycles(g, maxLen-1)
	a.order = a.order[:0]
	for c := range a.hLen {
		a.order = append(a.order, c)
	}
	slices.SortStableFunc(a.order, func(x, y int) int { return a.hLen[x] - a.hLen[y] })
	a.hOrder = append(a.hOrder[:0], a.order...)
	a.order = a.order[:0]
	for c := range a.cycLen {
		a.order = append(a.order, c)
	}
	slices.SortStableFunc(a.order, func(x, y int) int { return a.cycLen[x] - a.cycLen[y] })
	a.good.reset(w)
	a.shorter.reset(w)
	r := 0
	for i := 0; i < len(a.order); {
		l := a.cycLen[a.order[i]]
		for ; r < len(a.hOrder) && a.hLen[a.hOrder[r]] < l; r++ {
			h := a.hOrder[r]
			a.shorter.add(a.hBits[h*w : (h+1)*w])
		}
		for ; i < len(a.order) && a.cycLen[a.order[i]] == l; i++ {
			set := a.cycleBits(a.order[i])
			if !a.shorter.contains(set, &a.scratch) {
				a.good.add(set)
			}
		}
	}
	for c := range a.cycLen {
		if a.cycHuckel[c] && a.good.contains(a.cycleBits(c), &a.scratch) {
			a.markCycle(c)
		}
	}
}

func (a *aromaticity) find(v int) int {
	for a.sysOf[v] != v {
		a.sysOf[v] = a.sysOf[a.sysOf[v]]
		v = a.sysOf[v]
	}
	return v
}

func (a *aromaticity) cycleBits(c int) []uint64 { return a.cycBits[c*a.words : (c+1)*a.words] }

// markCycle marks the bonds of cycle c aromatic.
func (a *aromaticity) markCycle(c int) {
	for wi, word := range a.cycleBits(c) {
		for ; word != 0; word &= word - 1 {
			a.arom[wi*64+bits.TrailingZeros64(word)] = true
		}
	}
}

// gf2Basis is a basis of a space of bit vectors over GF(2) (here: sets of
// bonds, cycles under symmetric difference) in echelon form: each vector
// has a pivot bit that no earlier vector has set.
type gf2Basis struct {
	words int
	vecs  []uint64
	piv   []int
}

func (b *gf2Basis) reset(words int) {
	b.words = words
	b.vecs = b.vecs[:0]
	b.piv = b.piv[:0]
}

// reduce removes from v, in place, every pivot of the basis.
func (b *gf2Basis) reduce(v []uint64) {
	for k, p := range b.piv {
		if v[p/64]&(1<<(p%64)) != 0 {
			bv := b.vecs[k*b.words : (k+1)*b.words]
			for i := range v {
				v[i] ^= bv[i]
			}
		}
	}
}

// add inserts v (which it does not modify) unless it is in the span.
func (b *gf2Basis) add(v []uint64) {
	start := len(b.vecs)
	b.vecs = append(b.vecs, v...)
	nv := b.vecs[start:]
	b.reduce(nv)
	for i, word := range nv {
		if word != 0 {
			b.piv = append(b.piv, i*64+bits.TrailingZeros64(word))
			return
		}
	}
	b.vecs = b.vecs[:start]
}

// contains reports whether v is in the span, using *scratch.
func (b *gf2Basis) contains(v []uint64, scratch *[]uint64) bool {
	*scratch = append((*scratch)[:0], v...)
	b.reduce(*scratch)
	for _, word := range *scratch {
		if word != 0 {
			return false
		}
	}
	return true
}

// hortonCycles fills a.hBits and a.hLen with Horton's candidate cycles of
// at most maxLen atoms: for each ring atom s and ring bond x–y, the shortest
// path from s to x, the bond, and the shortest path from y back to s, when
// the two paths meet only at s. Shortest paths follow one breadth-first
// tree per source over the ring bonds.
func (a *aromaticity) hortonCycles(g *Graph, maxLen int) {
	n := len(g.Atoms)
	w := a.words
	a.hBits = a.hBits[:0]
	a.hLen = a.hLen[:0]
	if cap(a.dist) < n*n {
		a.dist = make([]int, n*n)
		a.par = make([]int, n*n)
	}
	a.dist, a.par = a.dist[:n*n], a.par[:n*n]
	a.mark = resizeInts(a.mark, n)
	for s := 0; s < n; s++ {
		d, p := a.dist[s*n:(s+1)*n], a.par[s*n:(s+1)*n]
		for v := range d {
			d[v], p[v] = -1, -1
		}
		d[s] = 0
		a.queue = append(a.queue[:0], s)
		for h := 0; h < len(a.queue); h++ {
			v := a.queue[h]
			if 2*d[v]+1 > maxLen {
				break // farther atoms only close longer cycles
			}
			for _, nb := range g.Neighbors(v) {
				if a.ringBond[nb.Bond] && d[nb.Atom] < 0 {
					d[nb.Atom] = d[v] + 1
					p[nb.Atom] = nb.Bond
					a.queue = append(a.queue, nb.Atom)
				}
			}
		}
	}
	stamp := 0
	for s := 0; s < n; s++ {
		d, p := a.dist[s*n:(s+1)*n], a.par[s*n:(s+1)*n]
		for i, b := range g.Bonds {
			if !a.ringBond[i] {
				continue
			}
			x, y := b.A, b.B
			if d[x] < 0 || d[y] < 0 || p[x] == i || p[y] == i || d[x]+d[y]+1 > maxLen {
				continue
			}
			stamp++
			for v := x; v != s; v = g.Bonds[p[v]].Other(v) {
				a.mark[v] = stamp
			}
			disjoint := true
			for v := y; v != s; v = g.Bonds[p[v]].Other(v) {
				if a.mark[v] == stamp {
					disjoint = false
					break
				}
			}
			if !disjoint {
				continue
			}
			start := len(a.hBits)
			for k := 0; k < w; k++ {
				a.hBits = append(a.hBits, 0)
			}
			set := a.hBits[start:]
			set[i/64] |= 1 << (i % 64)
			for _, v := range [2]int{x, y} {
				for ; v != s; v = g.Bonds[p[v]].Other(v) {
					set[p[v]/64] |= 1 << (p[v] % 64)
				}
			}
			a.hLen = append(a.hLen, d[x]+d[y]+1)
		}
	}
}
