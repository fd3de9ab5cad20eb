package molecule

import (
	"encoding/binary"
	"slices"
)

// Canon is the canonical form of a molecular graph.
type Canon struct {
	// Labels[i] is the canonical rank (0..n-1) of atom i. Isomorphic graphs
	// get labellings under which they become identical.
	Labels []int
	// Orbits[i] is the smallest atom index in the automorphism orbit of
	// atom i (atoms with equal Orbits are symmetry-equivalent).
	Orbits []int
	// Key is a canonical certificate: two graphs have equal Keys if and
	// only if they are isomorphic, comparing element, hydrogen count,
	// formal charge and bond order, with the bonds of Hückel aromatic
	// systems normalised to Aromatic (so all Kekulé structures of one
	// compound share a Key). Key is an opaque binary string: compare it,
	// use it as a map key, do not parse it.
	Key string
}

// Canonicalize returns the canonical labelling, the automorphism orbits and
// the canonical certificate of g. It is exact (individualisation-refinement
// with automorphism pruning, not a hash) and works on the aromatised view
// of g (see AromaticBonds). It does not modify g. For many calls from one
// goroutine, a Canonicalizer reuses its memory.
func Canonicalize(g *Graph) Canon {
	var c Canonicalizer
	return c.Canonicalize(g)
}

// Canonicalizer computes canonical forms with reusable scratch space. The
// zero value is ready to use. A Canonicalizer is not safe for concurrent
// use; give each goroutine its own.
type Canonicalizer struct {
	arom aromaticity

	n        int
	elem     []Element
	hc       []int
	chg      []int
	adjStart []int32
	adjNbr   []int32
	adjOrd   []uint8
	bondA    []int32
	bondB    []int32
	bondOrd  []uint8
	inv0     []int32 // initial invariant index per vertex (sorted rank)

	// per search depth
	labs  [][]int32 // position -> vertex
	invs  [][]int32 // vertex -> position
	cells [][]int32 // position -> start position of its cell
	clens [][]int32 // cell start position -> cell length (valid at starts)
	cellV [][]int32 // vertices of the target cell
	expl  [][]int32 // explored children
	orbs  [][]int32 // orbit representatives under the stabiliser
	path  []int32

	haveFirst bool
	firstPath []int32
	bestPath  []int32
	firstLab  []int32
	bestLab   []int32
	firstCert []uint64
	bestCert  []uint64
	cert      []uint64
	gens      [][]int32
	genPool   [][]int32

	// refinement scratch
	queue    []int32
	inQueue  []bool   // per cell start
	cellMark []bool   // per cell start
	cnt      []uint64 // per vertex: neighbours in the splitter, by order
	touched  []int32
	tcells   []int32
	tmp      []int32
	keyed    []vertexKey
	key      []byte
}

type vertexKey struct {
	k [7]int
	v int32
}

// Canonicalize is like the package-level Canonicalize, reusing c's memory.
// The returned slices and string are owned by the caller.
func (c *Canonicalizer) Canonicalize(g *Graph) Canon {
	c.search(g)
	n := c.n
	res := Canon{Labels: make([]int, n), Orbits: make([]int, n)}
	for p, v := range c.bestLab[:n] {
		res.Labels[v] = p
	}
	c.orbitsInto(res.Orbits)
	res.Key = string(c.appendKey(c.key[:0]))
	return res
}

// Key returns only the canonical certificate of g (see Canon.Key).
func (c *Canonicalizer) Key(g *Graph) string {
	c.search(g)
	c.key = c.appendKey(c.key[:0])
	return string(c.key)
}

func (c *Canonicalizer) appendKey(b []byte) []byte {
	b = binary.AppendUvarint(b, uint64(c.n))
	for _, v := range c.bestLab[:c.n] {
		b = append(b, byte(c.elem[v]))
		b = binary.AppendUvarint(b, uint64(c.hc[v]))
		b = binary.AppendVarint(b, int64(c.chg[v]))
	}
	b = binary.AppendUvarint(b, uint64(len(c.bestCert)))
	for _, code := range c.bestCert {
		b = binary.AppendUvarint(b, code>>32)
		b = binary.AppendUvarint(b, (code>>8)&0xffffff)
		b = append(b, byte(code))
	}
	return b
}

func (c *Canonicalizer) orbitsInto(out []int) {
	n := c.n
	uf := c.tmp[:0]
	for i := 0; i < n; i++ {
		uf = append(uf, int32(i))
	}
	for _, gamma := range c.gens {
		for v := 0; v < n; v++ {
			ufUnion(uf, int32(v), gamma[v])
		}
	}
	for v := 0; v < n; v++ {
		out[v] = int(ufFind(uf, int32(v)))
	}
	c.tmp = uf
}

// ufFind returns the representative of x; representatives are the smallest
// member of each class.
func ufFind(uf []int32, x int32) int32 {
	for uf[x] != x {
		uf[x] = uf[uf[x]]
		x = uf[x]
	}
	return x
}

func ufUnion(uf []int32, a, b int32) {
	ra, rb := ufFind(uf, a), ufFind(uf, b)
	if ra == rb {
		return
	}
	if ra < rb {
		uf[rb] = ra
	} else {
		uf[ra] = rb
	}
}

// load builds the aromatised view of g.
func (c *Canonicalizer) load(g *Graph) {
	n := len(g.Atoms)
	c.n = n
	arom := c.arom.perceive(g)
	c.elem = c.elem[:0]
	c.hc = c.hc[:0]
	c.chg = c.chg[:0]
	for _, a := range g.Atoms {
		c.elem = append(c.elem, a.Element)
		c.hc = append(c.hc, a.HCount)
		c.chg = append(c.chg, a.Charge)
	}
	c.bondA = c.bondA[:0]
	c.bondB = c.bondB[:0]
	c.bondOrd = c.bondOrd[:0]
	for i, b := range g.Bonds {
		o := uint8(b.Order)
		if arom[i] {
			o = uint8(Aromatic)
		}
		c.bondA = append(c.bondA, int32(b.A))
		c.bondB = append(c.bondB, int32(b.B))
		c.bondOrd = append(c.bondOrd, o)
	}
	c.adjStart = c.adjStart[:0]
	c.adjNbr = c.adjNbr[:0]
	c.adjOrd = c.adjOrd[:0]
	for v := 0; v < n; v++ {
		c.adjStart = append(c.adjStart, int32(len(c.adjNbr)))
		for _, nb := range g.Neighbors(v) {
			o := uint8(nb.Order)
			if arom[nb.Bond] {
				o = uint8(Aromatic)
			}
			c.adjNbr = append(c.adjNbr, int32(nb.Atom))
			c.adjOrd = append(c.adjOrd, o)
		}
	}
	c.adjStart = append(c.adjStart, int32(len(c.adjNbr)))
}

func grow32(s []int32, n int) []int32 {
	if cap(s) < n {
		return make([]int32, n)
	}
	return s[:n]
}

// search runs the individualisation-refinement search, leaving the best
// leaf in bestLab/bestCert and the automorphism generators in gens.
func (c *Canonicalizer) search(g *Graph) {
	c.load(g)
	n := c.n
	for len(c.labs) < n+1 {
		c.labs = append(c.labs, nil)
		c.invs = append(c.invs, nil)
		c.cells = append(c.cells, nil)
		c.clens = append(c.clens, nil)
		c.cellV = append(c.cellV, nil)
		c.expl = append(c.expl, nil)
		c.orbs = append(c.orbs, nil)
	}
	for d := 0; d <= n; d++ {
		c.labs[d] = grow32(c.labs[d], n)
		c.invs[d] = grow32(c.invs[d], n)
		c.cells[d] = grow32(c.cells[d], n)
		c.clens[d] = grow32(c.clens[d], n)
	}
	c.path = grow32(c.path, n+1)
	c.firstLab = grow32(c.firstLab, n)
	c.bestLab = grow32(c.bestLab, n)
	c.genPool = append(c.genPool, c.gens...)
	c.gens = c.gens[:0]
	c.haveFirst = false
	c.firstCert = c.firstCert[:0]
	c.bestCert = c.bestCert[:0]
	if n == 0 {
		return
	}

	// Initial partition: cells of equal cheap invariants, in invariant
	// order (degree first, so that rank 0 is a terminal atom when there is
	// one, which gives natural-looking canonical SMILES).
	c.keyed = c.keyed[:0]
	for v := 0; v < n; v++ {
		var k vertexKey
		k.v = int32(v)
		k.k[0] = int(c.adjStart[v+1] - c.adjStart[v])
		k.k[1] = int(c.elem[v])
		k.k[2] = c.hc[v]
		k.k[3] = c.chg[v]
		for j := c.adjStart[v]; j < c.adjStart[v+1]; j++ {
			switch c.adjOrd[j] {
			case uint8(Double):
				k.k[4]++
			case uint8(Triple):
				k.k[5]++
			case uint8(Aromatic):
				k.k[6]++
			}
		}
		c.keyed = append(c.keyed, k)
	}
	slices.SortFunc(c.keyed, func(a, b vertexKey) int {
		for i := range a.k {
			if a.k[i] != b.k[i] {
				if a.k[i] < b.k[i] {
					return -1
				}
				return 1
			}
		}
		return int(a.v - b.v)
	})
	lab, inv, cs, cl := c.labs[0], c.invs[0], c.cells[0], c.clens[0]
	start := 0
	for p, k := range c.keyed {
		if p > 0 && k.k != c.keyed[p-1].k {
			cl[start] = int32(p - start)
			start = p
		}
		lab[p] = k.v
		inv[k.v] = int32(p)
		cs[p] = int32(start)
	}
	cl[start] = int32(n - start)
	if cap(c.inQueue) < n {
		c.inQueue = make([]bool, n)
		c.cellMark = make([]bool, n)
		c.cnt = make([]uint64, n)
	}
	c.inQueue = c.inQueue[:n]
	c.cellMark = c.cellMark[:n]
	c.cnt = c.cnt[:n]
	c.queue = c.queue[:0]
	for s := 0; s < n; s += int(cl[s]) {
		c.queue = append(c.queue, int32(s))
		c.inQueue[s] = true
	}
	c.refine(0)
	c.node(0)
}

// refine makes the partition at depth d equitable: afterwards vertices of
// one cell have the same number of neighbours in every cell by every bond
// order. c.queue holds the cells to split by (all cells initially, the new
// singleton after individualisation). Cells split in place, their parts
// ordered by neighbour counts, and the work is driven by cell positions
// and counts only, so the result depends only on the labelled partition,
// never on vertex numbers. Parts of a cell not waiting in the queue are
// queued except the (first) largest, as in Hopcroft's algorithm.
func (c *Canonicalizer) refine(d int) {
	lab, inv, cs, cl := c.labs[d], c.invs[d], c.cells[d], c.clens[d]
	cnt := c.cnt
	for head := 0; head < len(c.queue); head++ {
		w := c.queue[head]
		c.inQueue[w] = false
		touched := c.touched[:0]
		for p := w; p < w+cl[w]; p++ {
			v := lab[p]
			for a := c.adjStart[v]; a < c.adjStart[v+1]; a++ {
				u := c.adjNbr[a]
				if cnt[u] == 0 {
					touched = append(touched, u)
				}
				cnt[u] += 1 << (16 * (uint(c.adjOrd[a]) - 1))
			}
		}
		tc := c.tcells[:0]
		for _, u := range touched {
			s := cs[inv[u]]
			if !c.cellMark[s] && cl[s] > 1 {
				c.cellMark[s] = true
				tc = append(tc, s)
			}
		}
		slices.Sort(tc)
		for _, s := range tc {
			c.cellMark[s] = false
			c.splitByCount(lab, inv, cs, cl, s)
		}
		for _, u := range touched {
			cnt[u] = 0
		}
		c.touched, c.tcells = touched, tc
	}
	c.queue = c.queue[:0]
}

// splitByCount splits cell s by c.cnt and queues the new parts.
func (c *Canonicalizer) splitByCount(lab, inv, cs, cl []int32, s int32) {
	e := s + cl[s]
	cell := lab[s:e]
	cnt := c.cnt
	// insertion sort by count: cells are small
	same := true
	for i := 1; i < len(cell); i++ {
		x := cell[i]
		kx := cnt[x]
		if kx != cnt[cell[0]] {
			same = false
		}
		j := i - 1
		for j >= 0 && cnt[cell[j]] > kx {
			cell[j+1] = cell[j]
			j--
		}
		cell[j+1] = x
	}
	if same {
		return
	}
	wasQueued := c.inQueue[s]
	// Find the first largest part when the cell was not queued.
	largest, largestLen := int32(-1), int32(0)
	if !wasQueued {
		start := s
		for p := s + 1; p <= e; p++ {
			if p == e || cnt[lab[p]] != cnt[lab[p-1]] {
				if p-start > largestLen {
					largest, largestLen = start, p-start
				}
				start = p
			}
		}
	}
	start := s
	for p := s; p < e; p++ {
		if p > s && cnt[lab[p]] != cnt[lab[p-1]] {
			cl[start] = p - start
			c.pushPart(start, s, wasQueued, largest)
			start = p
		}
		cs[p] = start
		inv[lab[p]] = p
	}
	cl[start] = e - start
	c.pushPart(start, s, wasQueued, largest)
}

func (c *Canonicalizer) pushPart(start, s int32, wasQueued bool, largest int32) {
	if wasQueued {
		if start != s {
			c.queue = append(c.queue, start)
			c.inQueue[start] = true
		}
		return
	}
	if start != largest {
		c.queue = append(c.queue, start)
		c.inQueue[start] = true
	}
}

// targetCell returns the first smallest non-singleton cell at depth d, or
// s = -1 if the partition is discrete.
func (c *Canonicalizer) targetCell(d int) (s, e int) {
	n := c.n
	cl := c.clens[d]
	bs, bl := -1, 0
	for p := 0; p < n; p += int(cl[p]) {
		if l := int(cl[p]); l > 1 && (bs < 0 || l < bl) {
			bs, bl = p, l
			if l == 2 {
				break
			}
		}
	}
	return bs, bs + bl
}

// node explores the search-tree node at depth d (partition already
// refined). It returns the depth at which the search continues: d-1 when
// the node is finished normally, or a smaller depth when an automorphism
// showed that the rest of an ancestor's current subtree is equivalent to
// one already explored.
func (c *Canonicalizer) node(d int) int {
	s, e := c.targetCell(d)
	if s < 0 {
		return c.leaf(d)
	}
	n := c.n
	cell := append(c.cellV[d][:0], c.labs[d][s:e]...)
	slices.Sort(cell)
	c.cellV[d] = cell
	expl := c.expl[d][:0]
	orbGens := -1
	for _, w := range cell {
		if len(c.gens) > 0 && len(expl) > 0 {
			if orbGens != len(c.gens) {
				c.stabOrbits(d)
				orbGens = len(c.gens)
			}
			orb := c.orbs[d]
			skip := false
			for _, u := range expl {
				if orb[u] == orb[w] {
					skip = true
					break
				}
			}
			if skip {
				continue
			}
		}
		expl = append(expl, w)
		c.expl[d] = expl
		c.path[d] = w
		copy(c.labs[d+1][:n], c.labs[d][:n])
		copy(c.invs[d+1][:n], c.invs[d][:n])
		copy(c.cells[d+1][:n], c.cells[d][:n])
		copy(c.clens[d+1][:n], c.clens[d][:n])
		c.individualize(d+1, w)
		c.refine(d + 1)
		if r := c.node(d + 1); r < d {
			return r
		}
	}
	return d - 1
}

// stabOrbits computes, at depth d, the orbits of the group generated by the
// automorphisms found so far that fix the individualised vertices path[:d].
func (c *Canonicalizer) stabOrbits(d int) {
	n := c.n
	orb := grow32(c.orbs[d], n)
	for i := range orb {
		orb[i] = int32(i)
	}
	for _, gamma := range c.gens {
		fixes := true
		for _, v := range c.path[:d] {
			if gamma[v] != v {
				fixes = false
				break
			}
		}
		if !fixes {
			continue
		}
		for v := 0; v < n; v++ {
			ufUnion(orb, int32(v), gamma[v])
		}
	}
	for v := 0; v < n; v++ {
		orb[v] = ufFind(orb, int32(v))
	}
	c.orbs[d] = orb
}

// individualize splits w off the front of its cell at depth d.
func (c *Canonicalizer) individualize(d int, w int32) {
	lab, inv, cs, cl := c.labs[d], c.invs[d], c.cells[d], c.clens[d]
	p := inv[w]
	s := cs[p]
	e := s + cl[s]
	u := lab[s]
	lab[s], lab[p] = w, u
	inv[w], inv[u] = s, p
	for q := s + 1; q < e; q++ {
		cs[q] = s + 1
	}
	cl[s] = 1
	cl[s+1] = e - s - 1
	c.queue = append(c.queue[:0], s)
	c.inQueue[s] = true
}

// leaf handles a discrete partition at depth d.
func (c *Canonicalizer) leaf(d int) int {
	n := c.n
	lab, inv := c.labs[d], c.invs[d]
	cert := c.cert[:0]
	for i := range c.bondA {
		a, b := uint64(inv[c.bondA[i]]), uint64(inv[c.bondB[i]])
		if a > b {
			a, b = b, a
		}
		cert = append(cert, a<<32|b<<8|uint64(c.bondOrd[i]))
	}
	slices.Sort(cert)
	c.cert = cert
	if !c.haveFirst {
		c.haveFirst = true
		copy(c.firstLab, lab[:n])
		copy(c.bestLab, lab[:n])
		c.firstCert = append(c.firstCert[:0], cert...)
		c.bestCert = append(c.bestCert[:0], cert...)
		c.firstPath = append(c.firstPath[:0], c.path[:d]...)
		c.bestPath = append(c.bestPath[:0], c.path[:d]...)
		return d - 1
	}
	if slices.Equal(cert, c.firstCert) {
		c.addGen(c.firstLab, lab)
		return commonPrefix(c.path[:d], c.firstPath)
	}
	switch cmp := slices.Compare(cert, c.bestCert); {
	case cmp < 0:
		copy(c.bestLab, lab[:n])
		c.bestCert = append(c.bestCert[:0], cert...)
		c.bestPath = append(c.bestPath[:0], c.path[:d]...)
	case cmp == 0:
		c.addGen(c.bestLab, lab)
		return commonPrefix(c.path[:d], c.bestPath)
	}
	return d - 1
}

// addGen records the automorphism mapping leaf from to leaf to.
func (c *Canonicalizer) addGen(from, to []int32) {
	var gamma []int32
	if k := len(c.genPool); k > 0 {
		gamma = c.genPool[k-1]
		c.genPool = c.genPool[:k-1]
	}
	gamma = grow32(gamma, c.n)
	for p := 0; p < c.n; p++ {
		gamma[from[p]] = to[p]
	}
	c.gens = append(c.gens, gamma)
}

func commonPrefix(a, b []int32) int {
	k := 0
	for k < len(a) && k < len(b) && a[k] == b[k] {
		k++
	}
	return k
}
