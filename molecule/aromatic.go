package molecule

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
//     Every simple cycle of it whose atoms' π counts sum to 4n+2 is
//     aromatic: its bonds, and bonds joining two of its atoms (the fusion
//     bond of azulene), are aromatic. Single rings (benzene, pyrrole) and
//     the perimeters of fused systems (naphthalene, azulene, indole) are
//     all simple cycles, so fused systems need no special case. A ring of
//     4n π electrons (cyclobutadiene, cyclooctatetraene, pentalene) is not
//     aromatic, so its Kekulé structures stay distinct.
//  3. For large candidate subgraphs (cyclomatic number above
//     maxCandRings, as in large polycyclic aromatics) only cycles of at
//     most fallbackCycleLen atoms are examined, which bounds the work.
//     The limit depends only on the graph, so the result is still
//     independent of atom numbering.
//
// The result is invariant under renumbering the atoms and under Kekulé
// shifts within the aromatic bonds, which is what canonical forms need.
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
	a.enumerate(g)
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

// cycle handles the cycle a.path (closed back to its first atom).
func (a *aromaticity) cycle(g *Graph) {
	if a.pathSum%4 != 2 {
		return
	}
	for _, v := range a.path {
		for k := a.cStart[v]; k < a.cStart[v+1]; k++ {
			if a.onPath[a.cNbr[k]] {
				a.arom[a.cBond[k]] = true
			}
		}
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
