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
	adjW     []uint64 // per adjacency entry: 1 << (16*(order-1)), the count increment
	bondA    []int32
	bondB    []int32
	bondOrd  []uint8
	inv0     []int32 // initial invariant index per vertex (sorted rank)

	// Per search depth d, seven arrays of n int32 in one flat slice (see
	// lvl): position->vertex, vertex->position, position->cell start, cell
	// start->cell length, target-cell vertices, explored children, orbit
	// representatives under the stabiliser.
	lv    []int32
	ncell []int // number of cells per depth
	path  []int32

	haveFirst bool
	forest    bool // no cycles: see firstPathOnly
	firstPath []int32
	bestPath  []int32
	firstLab  []int32
	bestLab   []int32
	firstCert []uint64
	bestCert  []uint64
	cert      []uint64
	gens      []int32 // automorphisms found, n entries each
	ngen      int

	// refinement scratch
	queue    []int32
	inQueue  []bool   // per cell start
	cellMark []bool   // per cell start
	cnt      []uint64 // per vertex: neighbours in the splitter, by order
	touched  []int32
	members  []int32
	tcells   []int32
	tmp      []int32
	keyed    []vertexKey
	packed   []uint64
	key      []byte

	// SMILES writing
	w        smilesWriter
	rank     []int32
	atomArom []bool
	out      []byte
}

type vertexKey struct {
	k [7]int
	v int32
}

const (
	lvLab = iota
	lvInv
	lvCell
	lvLen
	lvCellV
	lvExpl
	lvOrb
	lvArrays
)

// lvl returns array k of depth d.
func (c *Canonicalizer) lvl(d, k int) []int32 {
	o := (d*lvArrays + k) * c.n
	return c.lv[o : o+c.n : o+c.n]
}

// gen returns automorphism k.
func (c *Canonicalizer) gen(k int) []int32 {
	return c.gens[k*c.n : (k+1)*c.n : (k+1)*c.n]
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

// AppendKey appends the canonical certificate of g (see Canon.Key) to dst
// and returns the extended slice; with a reused dst it does not allocate.
// string(AppendKey(...)) equals Key(g); a map lookup m[string(b)] does not
// copy b.
func (c *Canonicalizer) AppendKey(dst []byte, g *Graph) []byte {
	c.search(g)
	return c.appendKey(dst)
}

// Orbits computes the automorphism orbits of g (see Canon.Orbits) into dst,
// which is grown as needed, and returns it.
func (c *Canonicalizer) Orbits(dst []int, g *Graph) []int {
	c.search(g)
	if cap(dst) < c.n {
		dst = make([]int, c.n)
	}
	dst = dst[:c.n]
	c.orbitsInto(dst)
	return dst
}

// Labels computes the canonical labelling of g (see Canon.Labels) into
// dst, which is grown as needed, and returns it.
func (c *Canonicalizer) Labels(dst []int, g *Graph) []int {
	c.search(g)
	if cap(dst) < c.n {
		dst = make([]int, c.n)
	}
	dst = dst[:c.n]
	for p, v := range c.bestLab[:c.n] {
		dst[v] = p
	}
	return dst
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
	if c.forest {
		// The cells of the equitable partition are the orbits.
		lab, cl := c.lvl(0, lvLab), c.lvl(0, lvLen)
		for s := 0; s < n; s += int(cl[s]) {
			rep := lab[s]
			for _, v := range lab[s : s+int(cl[s])] {
				rep = min(rep, v)
			}
			for _, v := range lab[s : s+int(cl[s])] {
				out[v] = int(rep)
			}
		}
		return
	}
	uf := c.tmp[:0]
	for i := 0; i < n; i++ {
		uf = append(uf, int32(i))
	}
	for k := 0; k < c.ngen; k++ {
		gamma := c.gen(k)
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
	c.adjW = c.adjW[:0]
	for v := 0; v < n; v++ {
		c.adjStart = append(c.adjStart, int32(len(c.adjNbr)))
		for _, nb := range g.Neighbors(v) {
			o := uint8(nb.Order)
			if arom[nb.Bond] {
				o = uint8(Aromatic)
			}
			c.adjNbr = append(c.adjNbr, int32(nb.Atom))
			c.adjOrd = append(c.adjOrd, o)
			c.adjW = append(c.adjW, 1<<(16*(uint(o)-1)))
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
	if need := (n + 1) * lvArrays * n; cap(c.lv) < need {
		c.lv = make([]int32, need)
	} else {
		c.lv = c.lv[:need]
	}
	if cap(c.ncell) < n+1 {
		c.ncell = make([]int, n+1)
	}
	c.ncell = c.ncell[:n+1]
	c.path = grow32(c.path, n+1)
	c.firstLab = grow32(c.firstLab, n)
	c.bestLab = grow32(c.bestLab, n)
	c.ngen = 0
	c.haveFirst = false
	c.firstCert = c.firstCert[:0]
	c.bestCert = c.bestCert[:0]
	if n == 0 {
		return
	}

	// Initial partition: cells of equal cheap invariants, in invariant
	// order (degree first, so that rank 0 is a terminal atom when there is
	// one, which gives natural-looking canonical SMILES).
	lab, inv, cs, cl := c.lvl(0, lvLab), c.lvl(0, lvInv), c.lvl(0, lvCell), c.lvl(0, lvLen)
	if !c.packedPartition(lab, inv, cs, cl) {
		c.keyedPartition(lab, inv, cs, cl)
	}
	c.ncell[0] = 0
	for s := 0; s < n; s += int(cl[s]) {
		c.ncell[0]++
	}
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
	c.forest = c.isForest()
	if c.forest {
		c.firstPathOnly()
		return
	}
	c.node(0)
}

// isForest reports whether the graph has no cycle.
func (c *Canonicalizer) isForest() bool {
	n, m := c.n, len(c.bondA)
	if m >= n {
		return false
	}
	uf := grow32(c.tmp, n)
	for i := range uf {
		uf[i] = int32(i)
	}
	c.tmp = uf
	for i := 0; i < m; i++ {
		a, b := ufFind(uf, c.bondA[i]), ufFind(uf, c.bondB[i])
		if a == b {
			return false
		}
		ufUnion(uf, a, b)
	}
	return true
}

// firstPathOnly finishes the search for a forest. Colour refinement
// decides isomorphism of (vertex- and edge-coloured) forests, and the cells
// of the equitable partition of a forest are its automorphism orbits,
// also after individualising vertices (the result is again a coloured
// forest). So every child of every search node is equivalent, all leaves
// have the same certificate, and the first leaf is canonical.
func (c *Canonicalizer) firstPathOnly() {
	n := c.n
	d := 0
	for {
		s, _ := c.targetCell(d)
		if s < 0 {
			c.leaf(d)
			return
		}
		w := c.lvl(d, lvLab)[s]
		c.path[d] = w
		o := d * lvArrays * n
		copy(c.lv[o+lvArrays*n:o+lvArrays*n+4*n], c.lv[o:o+4*n])
		c.ncell[d+1] = c.ncell[d] + 1
		c.individualize(d+1, w)
		c.refine(d + 1)
		d++
	}
}

// vertexInvariant returns the cheap invariants of vertex v used for the
// initial partition: degree, element, hydrogens, charge, and the numbers
// of double, triple and aromatic bonds.
func (c *Canonicalizer) vertexInvariant(v int) [7]int {
	var k [7]int
	k[0] = int(c.adjStart[v+1] - c.adjStart[v])
	k[1] = int(c.elem[v])
	k[2] = c.hc[v]
	k[3] = c.chg[v]
	for j := c.adjStart[v]; j < c.adjStart[v+1]; j++ {
		switch c.adjOrd[j] {
		case uint8(Double):
			k[4]++
		case uint8(Triple):
			k[5]++
		case uint8(Aromatic):
			k[6]++
		}
	}
	return k
}

// packedPartition builds the initial partition with the invariants packed
// into 4-bit fields of one integer (the common case) and reports false if
// some invariant does not fit.
func (c *Canonicalizer) packedPartition(lab, inv, cs, cl []int32) bool {
	n := c.n
	c.packed = c.packed[:0]
	for v := 0; v < n; v++ {
		lo, hi := c.adjStart[v], c.adjStart[v+1]
		var nd, nt, na uint64
		for _, o := range c.adjOrd[lo:hi] {
			switch o {
			case uint8(Double):
				nd++
			case uint8(Triple):
				nt++
			case uint8(Aromatic):
				na++
			}
		}
		deg, el, h, q := uint64(hi-lo), uint64(c.elem[v]), uint64(c.hc[v]), uint64(c.chg[v]+8)
		if deg|el|h|q|nd|nt|na > 15 { // also catches negative h and q
			return false
		}
		// Same field order as vertexInvariant.
		key := deg<<24 | el<<20 | h<<16 | q<<12 | nd<<8 | nt<<4 | na
		c.packed = append(c.packed, key<<32|uint64(v))
	}
	slices.Sort(c.packed)
	start := 0
	for p, x := range c.packed {
		if p > 0 && x>>32 != c.packed[p-1]>>32 {
			cl[start] = int32(p - start)
			start = p
		}
		v := int32(uint32(x))
		lab[p] = v
		inv[v] = int32(p)
		cs[p] = int32(start)
	}
	cl[start] = int32(n - start)
	return true
}

// keyedPartition is packedPartition for unusual invariants.
func (c *Canonicalizer) keyedPartition(lab, inv, cs, cl []int32) {
	n := c.n
	c.keyed = c.keyed[:0]
	for v := 0; v < n; v++ {
		c.keyed = append(c.keyed, vertexKey{c.vertexInvariant(v), int32(v)})
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
	lab, inv, cs, cl := c.lvl(d, lvLab), c.lvl(d, lvInv), c.lvl(d, lvCell), c.lvl(d, lvLen)
	cnt, adjStart, adjNbr, adjW := c.cnt, c.adjStart, c.adjNbr, c.adjW
	inQueue, cellMark := c.inQueue, c.cellMark
	n := int32(c.n)
	ncell := int32(c.ncell[d])
	touched, tc := c.touched[:0], c.tcells[:0]
	for head := 0; head < len(c.queue); head++ {
		w := c.queue[head]
		inQueue[w] = false
		if ncell == n {
			// Discrete: nothing left to split.
			for _, q := range c.queue[head+1:] {
				inQueue[q] = false
			}
			break
		}
		touched = touched[:0]
		for p := w; p < w+cl[w]; p++ {
			v := lab[p]
			for a := adjStart[v]; a < adjStart[v+1]; a++ {
				u := adjNbr[a]
				if cnt[u] == 0 {
					touched = append(touched, u)
				}
				cnt[u] += adjW[a]
			}
		}
		tc = tc[:0]
		for _, u := range touched {
			s := cs[inv[u]]
			if !cellMark[s] && cl[s] > 1 {
				cellMark[s] = true
				tc = append(tc, s)
			}
		}
		if len(tc) > 1 {
			slices.Sort(tc)
		}
		for _, s := range tc {
			cellMark[s] = false
			members := c.members[:0]
			for _, u := range touched {
				if cs[inv[u]] == s {
					members = append(members, u)
				}
			}
			c.members = members
			ncell += int32(c.splitByCount(lab, inv, cs, cl, s, members))
		}
		for _, u := range touched {
			cnt[u] = 0
		}
	}
	c.touched, c.tcells = touched, tc
	c.ncell[d] = int(ncell)
	c.queue = c.queue[:0]
}

// splitByCount splits cell s by c.cnt, queues the new parts and returns
// the number of cells added. members are the vertices of the cell with a
// non-zero count; the others (count 0) stay in front unsorted, as in
// McKay's partition refinement (McKay, Congr. Numer. 30 (1981) 45–87), so a
// splitter touching few vertices of a big cell costs little.
func (c *Canonicalizer) splitByCount(lab, inv, cs, cl []int32, s int32, members []int32) int {
	e := s + cl[s]
	cnt := c.cnt
	k := int32(len(members))
	if k == e-s {
		same := true
		for _, u := range members[1:] {
			if cnt[u] != cnt[members[0]] {
				same = false
				break
			}
		}
		if same {
			return 0
		}
	}
	// Move the counted vertices to the tail of the cell.
	t := e - 1
	for _, u := range members {
		p := inv[u]
		x := lab[t]
		lab[p], lab[t] = x, u
		inv[x], inv[u] = p, t
		t--
	}
	// insertion sort of the tail by count: cells are small
	tail := lab[e-k : e]
	for i := 1; i < len(tail); i++ {
		x := tail[i]
		kx := cnt[x]
		j := i - 1
		for j >= 0 && cnt[tail[j]] > kx {
			tail[j+1] = tail[j]
			j--
		}
		tail[j+1] = x
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
	added := 0
	for p := s; p < e; p++ {
		if p > s && cnt[lab[p]] != cnt[lab[p-1]] {
			cl[start] = p - start
			c.pushPart(start, s, wasQueued, largest)
			start = p
			added++
		}
		cs[p] = start
		inv[lab[p]] = p
	}
	cl[start] = e - start
	c.pushPart(start, s, wasQueued, largest)
	return added
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
	cl := c.lvl(d, lvLen)
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
	cell := append(c.lvl(d, lvCellV)[:0], c.lvl(d, lvLab)[s:e]...)
	slices.Sort(cell)
	expl := c.lvl(d, lvExpl)[:0]
	orbGens := -1
	for _, w := range cell {
		if c.ngen > 0 && len(expl) > 0 {
			if orbGens != c.ngen {
				c.stabOrbits(d)
				orbGens = c.ngen
			}
			orb := c.lvl(d, lvOrb)
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
		c.path[d] = w
		// Child partition: copy the first four arrays of depth d.
		o := d * lvArrays * n
		copy(c.lv[o+lvArrays*n:o+lvArrays*n+4*n], c.lv[o:o+4*n])
		c.ncell[d+1] = c.ncell[d] + 1
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
	orb := c.lvl(d, lvOrb)
	for i := range orb {
		orb[i] = int32(i)
	}
	for k := 0; k < c.ngen; k++ {
		gamma := c.gen(k)
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
}

// individualize splits w off the front of its cell at depth d.
func (c *Canonicalizer) individualize(d int, w int32) {
	lab, inv, cs, cl := c.lvl(d, lvLab), c.lvl(d, lvInv), c.lvl(d, lvCell), c.lvl(d, lvLen)
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
	lab, inv := c.lvl(d, lvLab), c.lvl(d, lvInv)
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
	n := c.n
	if need := (c.ngen + 1) * n; len(c.gens) < need {
		if cap(c.gens) >= need {
			c.gens = c.gens[:need]
		} else {
			c.gens = append(c.gens[:cap(c.gens)], make([]int32, need-cap(c.gens))...)
		}
	}
	c.ngen++
	gamma := c.gen(c.ngen - 1)
	for p := 0; p < n; p++ {
		gamma[from[p]] = to[p]
	}
}

func commonPrefix(a, b []int32) int {
	k := 0
	for k < len(a) && k < len(b) && a[k] == b[k] {
		k++
	}
	return k
}
