package isomers

// This file holds the generator's own exact canonical labelling of small
// vertex-coloured multigraphs (bond orders as edge colours): equitable
// partition refinement followed by an individualisation-refinement search
// with automorphism pruning, as described by McKay (1981, "Practical graph
// isomorphism", Congressus Numerantium 30:45–87) and McKay & Piperno (2014,
// "Practical graph isomorphism, II", J. Symbolic Computation 60:94–112).
// It is specialised for the generator's inner loop: fixed-size arrays, no
// allocation after warm-up.

// partition is an ordered partition of the vertices: lab lists the
// vertices cell by cell; a cell starting at position s ends (exclusive) at
// end[s]; cellOf[v] is the start of v's cell.
type partition struct {
	lab    [MaxAtoms]uint8
	cellOf [MaxAtoms]uint8
	end    [MaxAtoms]uint8
	ncells int
}

// bondWeight packs the number of neighbours by bond order into one integer
// (at most maxDeg < 256 of each).
var bondWeight = [4]uint32{0, 1, 1 << 8, 1 << 16}

// canonizer holds scratch space for one goroutine.
type canonizer struct {
	m     *mol
	cnt   [MaxAtoms]uint32
	inQ   [MaxAtoms]bool
	queue [MaxAtoms * 2]uint8
	key   [MaxAtoms]uint64

	// search state
	path      [MaxAtoms]uint8
	firstPath [MaxAtoms]uint8
	firstLab  [MaxAtoms]uint8
	bestLab   [MaxAtoms]uint8
	firstCert []byte
	bestCert  []byte
	cert      []byte
	haveFirst bool
	gens      [][MaxAtoms]uint8
	leaves    int
	parts     [MaxAtoms + 1]partition // search partitions by depth
}

// vertexKeys fills c.key with an isomorphism-invariant key per vertex. The
// top bits are (8 − degree), so the vertices with the largest key always
// have the smallest degree; then the colour, the bond-order sum and a hash
// of the neighbours' (degree, colour, order) multiset (for a leaf, the
// packed tuple of its one neighbour).
func (c *canonizer) vertexKeys() {
	for x := 0; x < c.m.n; x++ {
		c.key[x] = c.vertexKey(x)
	}
}

// vertexKey returns the key of vertex x (see vertexKeys).
func (c *canonizer) vertexKey(x int) uint64 {
	m := c.m
	if m.deg[x] == 1 {
		// a leaf: the exact packed tuple of its neighbour instead of a hash
		return uint64(coarseKey(m, x))<<40 | uint64(leafTuple(m, x))
	}
	var h uint64
	for k := 0; k < int(m.deg[x]); k++ {
		u := m.nb[x][k]
		h1 := uint64(m.deg[u])<<16 | uint64(m.col[u])<<8 | uint64(m.bsum[u])<<2 | uint64(m.bo[x][k])
		h += mix(h1)
	}
	return uint64(8-m.deg[x])<<56 | uint64(m.col[x])<<48 | uint64(m.bsum[x])<<40 | h&(1<<40-1)
}

// mix is a 64-bit finaliser (splitmix64); sums of mixed values hash
// multisets.
func mix(z uint64) uint64 {
	z += 0x9e3779b97f4a7c15
	z = (z ^ (z >> 30)) * 0xbf58476d1ce4e5b9
	z = (z ^ (z >> 27)) * 0x94d049bb133111eb
	return z ^ (z >> 31)
}

// initPartition sorts the vertices by c.key into cells and refines to the
// coarsest equitable partition finer than that.
func (c *canonizer) initPartition(p *partition) {
	m := c.m
	n := m.n
	for i := 0; i < n; i++ {
		p.lab[i] = uint8(i)
	}
	// insertion sort by key (n is small)
	for i := 1; i < n; i++ {
		v := p.lab[i]
		kv := c.key[v]
		j := i
		for j > 0 && c.key[p.lab[j-1]] > kv {
			p.lab[j] = p.lab[j-1]
			j--
		}
		p.lab[j] = v
	}
	qn := 0
	p.ncells = 0
	for i := 0; i < n; {
		j := i + 1
		for j < n && c.key[p.lab[j]] == c.key[p.lab[i]] {
			j++
		}
		p.end[i] = uint8(j)
		for k := i; k < j; k++ {
			p.cellOf[p.lab[k]] = uint8(i)
		}
		p.ncells++
		c.queue[qn] = uint8(i)
		qn++
		c.inQ[i] = true
		i = j
	}
	c.refine(p, qn)
}

// refine makes p equitable. The first qn entries of c.queue are the
// splitter cells to start from (c.inQ marks them).
func (c *canonizer) refine(p *partition, qn int) {
	m := c.m
	n := m.n
	head := 0
	var touched [MaxAtoms]uint8
	var cells [MaxAtoms]uint8
	var mark [MaxAtoms]bool
	for head < qn {
		s := int(c.queue[head%len(c.queue)])
		head++
		c.inQ[s] = false
		if p.ncells == n {
			continue
		}
		e := int(p.end[s])
		nt := 0
		for i := s; i < e; i++ {
			w := p.lab[i]
			for k := 0; k < int(m.deg[w]); k++ {
				u := m.nb[w][k]
				if c.cnt[u] == 0 {
					touched[nt] = u
					nt++
				}
				c.cnt[u] += bondWeight[m.bo[w][k]]
			}
		}
		nc := 0
		for t := 0; t < nt; t++ {
			cs := p.cellOf[touched[t]]
			if !mark[cs] && p.end[cs]-cs > 1 {
				mark[cs] = true
				// insert sorted
				j := nc
				for j > 0 && cells[j-1] > cs {
					cells[j] = cells[j-1]
					j--
				}
				cells[j] = cs
				nc++
			}
		}
		for t := 0; t < nc; t++ {
			cs := int(cells[t])
			mark[cs] = false
			ce := int(p.end[cs])
			first := c.cnt[p.lab[cs]]
			uniform := true
			for i := cs + 1; i < ce; i++ {
				if c.cnt[p.lab[i]] != first {
					uniform = false
					break
				}
			}
			if uniform {
				continue
			}
			for i := cs + 1; i < ce; i++ {
				v := p.lab[i]
				kv := c.cnt[v]
				j := i
				for j > cs && c.cnt[p.lab[j-1]] > kv {
					p.lab[j] = p.lab[j-1]
					j--
				}
				p.lab[j] = v
			}
			wasQ := c.inQ[cs]
			// fragments
			largest, largestSize := cs, 0
			for f := cs; f < ce; {
				g := f + 1
				for g < ce && c.cnt[p.lab[g]] == c.cnt[p.lab[f]] {
					g++
				}
				p.end[f] = uint8(g)
				for k := f; k < g; k++ {
					p.cellOf[p.lab[k]] = uint8(f)
				}
				if f != cs {
					p.ncells++
				}
				if g-f > largestSize {
					largest, largestSize = f, g-f
				}
				f = g
			}
			for f := cs; f < ce; f = int(p.end[f]) {
				if c.inQ[f] {
					continue
				}
				if !wasQ && f == largest {
					continue
				}
				c.queue[qn%len(c.queue)] = uint8(f)
				qn++
				c.inQ[f] = true
			}
		}
		for t := 0; t < nt; t++ {
			c.cnt[touched[t]] = 0
		}
	}
	// drain flags of cells left in the queue when the partition became discrete
	for ; head < qn; head++ {
		c.inQ[c.queue[head%len(c.queue)]] = false
	}
}

// individualize splits vertex v off the front of its cell and refines.
func (c *canonizer) individualize(p *partition, v uint8) {
	s := int(p.cellOf[v])
	e := int(p.end[s])
	// move v to position s
	for i := s; i < e; i++ {
		if p.lab[i] == v {
			p.lab[i] = p.lab[s]
			p.lab[s] = v
			break
		}
	}
	p.end[s+1] = uint8(e)
	p.end[s] = uint8(s + 1)
	for i := s + 1; i < e; i++ {
		p.cellOf[p.lab[i]] = uint8(s + 1)
	}
	p.ncells++
	c.queue[0] = uint8(s)
	c.inQ[s] = true
	c.refine(p, 1)
}

// certificate writes the graph relabelled by the discrete partition p:
// for each canonical position, the colour, then the later neighbours with
// their bond orders in position order.
func (c *canonizer) certificate(p *partition, buf []byte) []byte {
	m := c.m
	n := m.n
	var pos [MaxAtoms]uint8
	for i := 0; i < n; i++ {
		pos[p.lab[i]] = uint8(i)
	}
	buf = buf[:0]
	for i := 0; i < n; i++ {
		v := p.lab[i]
		buf = append(buf, m.col[v])
		start := len(buf)
		for k := 0; k < int(m.deg[v]); k++ {
			pu := pos[m.nb[v][k]]
			if int(pu) <= i {
				continue
			}
			buf = append(buf, pu, m.bo[v][k])
			// keep pairs sorted by position (insertion)
			j := len(buf) - 2
			for j > start && buf[j-2] > buf[j] {
				buf[j-2], buf[j] = buf[j], buf[j-2]
				buf[j-1], buf[j+1] = buf[j+1], buf[j-1]
				j -= 2
			}
		}
		buf = append(buf, 0xff)
	}
	return buf
}

func compareBytes(a, b []byte) int {
	for i := 0; i < len(a) && i < len(b); i++ {
		if a[i] != b[i] {
			if a[i] < b[i] {
				return -1
			}
			return 1
		}
	}
	return len(a) - len(b)
}

// canonResult is the outcome of a search.
type canonResult struct {
	labels [MaxAtoms]uint8 // canonical position of each vertex
	orbit  [MaxAtoms]uint8 // smallest vertex of each vertex's orbit
}

// search runs the individualisation-refinement search from the equitable
// partition p and fills res. The generators of the automorphism group are
// left in c.gens; the canonical certificate in c.bestCert.
func (c *canonizer) search(p *partition, res *canonResult) {
	c.haveFirst = false
	c.gens = c.gens[:0]
	c.leaves = 0
	c.dfs(p, 0)
	n := c.m.n
	for i := 0; i < n; i++ {
		res.labels[c.bestLab[i]] = uint8(i)
	}
	c.orbits(&res.orbit, 0)
}

// orbits computes the orbits (as smallest member) of the group generated
// by the generators that fix path[0:depth] pointwise.
func (c *canonizer) orbits(orb *[MaxAtoms]uint8, depth int) {
	n := c.m.n
	for i := 0; i < n; i++ {
		orb[i] = uint8(i)
	}
	for gi := range c.gens {
		g := &c.gens[gi]
		ok := true
		for d := 0; d < depth; d++ {
			if g[c.path[d]] != c.path[d] {
				ok = false
				break
			}
		}
		if !ok {
			continue
		}
		for i := 0; i < n; i++ {
			a, b := find(orb, uint8(i)), find(orb, g[i])
			if a != b {
				if a < b {
					orb[b] = a
				} else {
					orb[a] = b
				}
			}
		}
	}
	for i := 0; i < n; i++ {
		orb[i] = find(orb, uint8(i))
	}
}

func find(orb *[MaxAtoms]uint8, x uint8) uint8 {
	for orb[x] != x {
		orb[x] = orb[orb[x]]
		x = orb[x]
	}
	return x
}

// dfs explores the search tree below p (at the given depth) and returns
// the depth to return to: a value below depth aborts this subtree.
func (c *canonizer) dfs(p *partition, depth int) int {
	n := c.m.n
	if p.ncells == n {
		return c.leaf(p, depth)
	}
	// target cell: the first non-singleton cell
	s := 0
	for s < n && int(p.end[s])-s == 1 {
		s = int(p.end[s])
	}
	e := int(p.end[s])
	var cell [MaxAtoms]uint8
	cn := copy(cell[:], p.lab[s:e])
	var explored [MaxAtoms]uint8
	ne := 0
	var orb [MaxAtoms]uint8
	ngens := -1
	for i := 0; i < cn; i++ {
		v := cell[i]
		if ne > 0 {
			if ngens != len(c.gens) {
				c.orbits(&orb, depth)
				ngens = len(c.gens)
			}
			pruned := false
			for j := 0; j < ne; j++ {
				if orb[v] == orb[explored[j]] {
					pruned = true
					break
				}
			}
			if pruned {
				continue
			}
		}
		// one partition per depth, reused (a local copy would escape)
		child := &c.parts[depth+1]
		*child = *p
		c.individualize(child, v)
		c.path[depth] = v
		r := c.dfs(child, depth+1)
		explored[ne] = v
		ne++
		if r < depth {
			return r
		}
	}
	return depth
}

// leaf handles a discrete partition at the given depth.
func (c *canonizer) leaf(p *partition, depth int) int {
	n := c.m.n
	c.leaves++
	c.cert = c.certificate(p, c.cert)
	if !c.haveFirst {
		c.haveFirst = true
		c.firstLab = p.lab
		c.bestLab = p.lab
		c.firstPath = c.path
		c.firstCert = append(c.firstCert[:0], c.cert...)
		c.bestCert = append(c.bestCert[:0], c.cert...)
		return depth
	}
	if compareBytes(c.cert, c.firstCert) == 0 {
		var g [MaxAtoms]uint8
		for i := 0; i < n; i++ {
			g[c.firstLab[i]] = p.lab[i]
		}
		c.gens = append(c.gens, g)
		// return to the node where this path left the first path
		l := 0
		for l < depth && c.path[l] == c.firstPath[l] {
			l++
		}
		return l
	}
	cmp := compareBytes(c.cert, c.bestCert)
	if cmp == 0 {
		var g [MaxAtoms]uint8
		for i := 0; i < n; i++ {
			g[c.bestLab[i]] = p.lab[i]
		}
		c.gens = append(c.gens, g)
	} else if cmp < 0 {
		c.bestLab = p.lab
		c.bestCert = append(c.bestCert[:0], c.cert...)
	}
	return depth
}
