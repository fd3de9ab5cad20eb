package molecule

import "slices"

// RingInfo describes the rings of a molecular graph.
type RingInfo struct {
	// SSSR is a smallest set of smallest rings: a minimum cycle basis of
	// the graph, one ring per independent cycle (len(SSSR) equals
	// Graph.NumRings). Each ring lists its atoms in ring order. When
	// several smallest sets exist (cubane, some bridged systems) the one
	// chosen depends on atom numbering; ring sizes do not.
	SSSR [][]int
	// AtomInRing and BondInRing report membership of any ring (indexed
	// like Graph.Atoms and Graph.Bonds).
	AtomInRing []bool
	BondInRing []bool
	// AtomRingSize and BondRingSize give the size of the smallest ring
	// through each atom or bond (0 if none). These are exact and
	// independent of atom numbering.
	AtomRingSize []int
	BondRingSize []int
}

// Rings computes the SSSR and per-atom and per-bond ring data of g. Cost
// is polynomial (Horton's candidate cycles with Gaussian elimination over
// GF(2); Horton 1987), fast for molecules of up to a few hundred atoms.
func Rings(g *Graph) RingInfo {
	n, m := len(g.Atoms), len(g.Bonds)
	ri := RingInfo{
		AtomInRing:   make([]bool, n),
		BondInRing:   make([]bool, m),
		AtomRingSize: make([]int, n),
		BondRingSize: make([]int, m),
	}
	if n == 0 {
		return ri
	}
	// Shortest paths from every atom (BFS), for both the smallest ring per
	// bond and Horton's candidates.
	dist := make([][]int, n)
	par := make([][]int, n) // par[s][v] = bond to v's parent on the BFS tree from s
	queue := make([]int, 0, n)
	for s := 0; s < n; s++ {
		d := make([]int, n)
		p := make([]int, n)
		for i := range d {
			d[i], p[i] = -1, -1
		}
		d[s] = 0
		queue = append(queue[:0], s)
		for h := 0; h < len(queue); h++ {
			v := queue[h]
			for _, nb := range g.Neighbors(v) {
				if d[nb.Atom] < 0 {
					d[nb.Atom] = d[v] + 1
					p[nb.Atom] = nb.Bond
					queue = append(queue, nb.Atom)
				}
			}
		}
		dist[s], par[s] = d, p
	}
	// Smallest ring through each bond: 1 + shortest path between its ends
	// avoiding the bond itself.
	for i, b := range g.Bonds {
		if l := shortestAvoiding(g, b.A, b.B, i, queue); l > 0 {
			ri.BondRingSize[i] = l + 1
			ri.BondInRing[i] = true
		}
	}
	for v := 0; v < n; v++ {
		for _, nb := range g.Neighbors(v) {
			if s := ri.BondRingSize[nb.Bond]; s > 0 && (ri.AtomRingSize[v] == 0 || s < ri.AtomRingSize[v]) {
				ri.AtomRingSize[v] = s
			}
		}
		ri.AtomInRing[v] = ri.AtomRingSize[v] > 0
	}
	want := g.NumRings()
	if want == 0 {
		return ri
	}

	// Horton candidates: for each atom s and ring bond x–y, the cycle
	// P(s,x) + x–y + P(y,s) when the two shortest paths share only s.
	type cand struct {
		size  int
		bonds []int
	}
	var cands []cand
	pathBonds := func(s, v int, out []int) []int {
		for v != s {
			bi := par[s][v]
			out = append(out, bi)
			v = g.Bonds[bi].Other(v)
		}
		return out
	}
	mark := make([]int, n)
	stamp := 0
	for s := 0; s < n; s++ {
		if !ri.AtomInRing[s] {
			continue
		}
		for i, b := range g.Bonds {
			if !ri.BondInRing[i] {
				continue
			}
			x, y := b.A, b.B
			dx, dy := dist[s][x], dist[s][y]
			if dx < 0 || dy < 0 || par[s][x] == i || par[s][y] == i {
				continue
			}
			// Canonical direction avoids duplicates for odd cycles.
			if dx > dy {
				x, y = y, x
			}
			stamp++
			ok := true
			for v := x; v != s; v = g.Bonds[par[s][v]].Other(v) {
				mark[v] = stamp
			}
			for v := y; v != s; v = g.Bonds[par[s][v]].Other(v) {
				if mark[v] == stamp {
					ok = false
					break
				}
			}
			if !ok {
				continue
			}
			bonds := pathBonds(s, x, nil)
			bonds = append(bonds, i)
			bonds = pathBonds(s, y, bonds)
			cands = append(cands, cand{len(bonds), bonds})
		}
	}
	slices.SortStableFunc(cands, func(a, b cand) int { return a.size - b.size })

	// Greedy: keep each candidate independent (over GF(2)) of those kept.
	words := (m + 63) / 64
	var basis [][]uint64 // reduced vectors, each with a distinct pivot
	var pivots []int
	vec := make([]uint64, words)
	for _, c := range cands {
		if len(ri.SSSR) == want {
			break
		}
		clear(vec)
		for _, bi := range c.bonds {
			vec[bi/64] ^= 1 << (bi % 64)
		}
		for k, bv := range basis {
			p := pivots[k]
			if vec[p/64]&(1<<(p%64)) != 0 {
				for w := range vec {
					vec[w] ^= bv[w]
				}
			}
		}
		p := -1
		for w := range vec {
			if vec[w] != 0 {
				for bit := 0; bit < 64; bit++ {
					if vec[w]&(1<<bit) != 0 {
						p = w*64 + bit
						break
					}
				}
				break
			}
		}
		if p < 0 {
			continue
		}
		// Keep the basis reduced on the new pivot.
		for k, bv := range basis {
			if bv[p/64]&(1<<(p%64)) != 0 {
				for w := range bv {
					basis[k][w] ^= vec[w]
				}
			}
		}
		basis = append(basis, append([]uint64(nil), vec...))
		pivots = append(pivots, p)
		ri.SSSR = append(ri.SSSR, ringAtoms(g, c.bonds))
	}
	return ri
}

// shortestAvoiding returns the length of the shortest path from a to b not
// using bond skip, or -1.
func shortestAvoiding(g *Graph, a, b, skip int, queue []int) int {
	n := len(g.Atoms)
	d := make([]int, n)
	for i := range d {
		d[i] = -1
	}
	d[a] = 0
	queue = append(queue[:0], a)
	for h := 0; h < len(queue); h++ {
		v := queue[h]
		for _, nb := range g.Neighbors(v) {
			if nb.Bond == skip || d[nb.Atom] >= 0 {
				continue
			}
			d[nb.Atom] = d[v] + 1
			if nb.Atom == b {
				return d[b]
			}
			queue = append(queue, nb.Atom)
		}
	}
	return -1
}

// ringAtoms orders the atoms of the cycle formed by bonds.
func ringAtoms(g *Graph, bonds []int) []int {
	next := map[int][]int{}
	for _, bi := range bonds {
		b := g.Bonds[bi]
		next[b.A] = append(next[b.A], b.B)
		next[b.B] = append(next[b.B], b.A)
	}
	start := g.Bonds[bonds[0]].A
	for v := range next {
		if v < start {
			start = v
		}
	}
	ring := []int{start}
	prev, cur := -1, start
	for len(ring) < len(bonds) {
		nx := next[cur][0]
		if nx == prev {
			nx = next[cur][1]
		}
		ring = append(ring, nx)
		prev, cur = cur, nx
	}
	return ring
}
