package isomers

import (
	"math/bits"

	"shiftrank/molecule"
)

// MaxAtoms is the largest number of heavy atoms the generator accepts.
const MaxAtoms = 64

// maxDeg bounds the number of heavy-atom neighbours of one atom (S(VI)
// with six single bonds).
const maxDeg = 6

// mol is the generator's compact molecular multigraph. Vertices are added
// and removed only at the end (push/pop), and the edges of the last vertex
// are the last entries of its neighbours' lists, so undo is cheap.
type mol struct {
	n     int
	edges int // number of bonded atom pairs (not bond orders)
	col   [MaxAtoms]uint8
	el    [MaxAtoms]molecule.Element
	val   [MaxAtoms]uint8 // bonding capacity: valence minus fixed hydrogens
	hx    [MaxAtoms]uint8 // hydrogens fixed by the atom's class (0 when free)
	chg   [MaxAtoms]int8  // formal charge
	deg   [MaxAtoms]uint8
	bsum  [MaxAtoms]uint8
	nb    [MaxAtoms][maxDeg]uint8
	bo    [MaxAtoms][maxDeg]uint8
	adj   [MaxAtoms]uint64 // neighbour sets as bit masks
}

// free returns the unused bonding capacity of atom i: its implicit
// hydrogen count beyond the fixed ones.
func (m *mol) free(i int) int { return int(m.val[i]) - int(m.bsum[i]) }

// hcount returns the hydrogen count of atom i.
func (m *mol) hcount(i int) int { return int(m.val[i]) + int(m.hx[i]) - int(m.bsum[i]) }

// valence returns the valence state of atom i (bond-order sum plus
// hydrogens).
func (m *mol) valence(i int) int { return int(m.val[i]) + int(m.hx[i]) }

// push adds a vertex of colour c (element e, bonding capacity val, fixed
// hydrogens hx, charge chg) bonded to the atoms in att with the orders in
// ord.
func (m *mol) push(c uint8, e molecule.Element, val, hx, chg int, att, ord []uint8) {
	v := m.n
	m.n++
	m.col[v] = c
	m.el[v] = e
	m.val[v] = uint8(val)
	m.hx[v] = uint8(hx)
	m.chg[v] = int8(chg)
	m.deg[v] = 0
	m.bsum[v] = 0
	m.adj[v] = 0
	for k, u := range att {
		o := ord[k]
		m.nb[v][m.deg[v]] = u
		m.bo[v][m.deg[v]] = o
		m.deg[v]++
		m.bsum[v] += o
		m.nb[u][m.deg[u]] = uint8(v)
		m.bo[u][m.deg[u]] = o
		m.deg[u]++
		m.bsum[u] += o
		m.adj[v] |= 1 << u
		m.adj[u] |= 1 << uint(v)
	}
	m.edges += len(att)
}

// pop removes the last vertex and its bonds.
func (m *mol) pop() {
	v := m.n - 1
	for k := 0; k < int(m.deg[v]); k++ {
		u := m.nb[v][k]
		m.deg[u]--
		m.bsum[u] -= m.bo[v][k]
		m.adj[u] &^= 1 << uint(v)
	}
	m.edges -= int(m.deg[v])
	m.n--
}

// isTree reports whether the simple graph underlying m is a tree (m is
// always connected in the generator).
func (m *mol) isTree() bool { return m.edges == m.n-1 }

// order returns the bond order between a and b, or 0.
func (m *mol) order(a, b int) int {
	for k := 0; k < int(m.deg[a]); k++ {
		if int(m.nb[a][k]) == b {
			return int(m.bo[a][k])
		}
	}
	return 0
}

// isCut reports whether removing atom x disconnects the connected graph m
// (a flood fill over bit masks).
func (m *mol) isCut(x int) bool {
	if m.deg[x] < 2 {
		return false
	}
	all := uint64(1)<<uint(m.n) - 1
	if m.n == 64 {
		all = ^uint64(0)
	}
	all &^= 1 << uint(x)
	start := uint64(1) << m.nb[x][0]
	reach, frontier := start, start
	for frontier != 0 {
		var next uint64
		for f := frontier; f != 0; f &= f - 1 {
			next |= m.adj[bits.TrailingZeros64(f)]
		}
		next &= all &^ reach
		reach |= next
		frontier = next
	}
	return reach != all
}

// cutScratch is the working memory of articulation, kept by the caller
// so that nothing is zeroed per call.
type cutScratch struct {
	disc, low, parent, iter, stack [MaxAtoms]int8
}

// articulation marks the cut vertices of the connected graph m in cut
// (iterative Tarjan; only the first m.n entries are touched).
func (m *mol) articulation(cut *[MaxAtoms]bool, w *cutScratch) {
	n := m.n
	for i := 0; i < n; i++ {
		cut[i] = false
		w.disc[i] = -1
	}
	if n == 0 {
		return
	}
	var t int8
	sp := 0
	w.stack[sp] = 0
	sp++
	w.disc[0], w.low[0], w.parent[0], w.iter[0] = 0, 0, -1, 0
	t++
	rootChildren := 0
	for sp > 0 {
		v := w.stack[sp-1]
		if w.iter[v] < int8(m.deg[v]) {
			u := int8(m.nb[v][w.iter[v]])
			w.iter[v]++
			if w.disc[u] < 0 {
				w.parent[u] = v
				w.disc[u], w.low[u], w.iter[u] = t, t, 0
				t++
				w.stack[sp] = u
				sp++
				if v == 0 {
					rootChildren++
				}
			} else if u != w.parent[v] && w.disc[u] < w.low[v] {
				w.low[v] = w.disc[u]
			}
			continue
		}
		sp--
		p := w.parent[v]
		if p >= 0 {
			if w.low[v] < w.low[p] {
				w.low[p] = w.low[v]
			}
			if p != 0 && w.low[v] >= w.disc[p] {
				cut[p] = true
			}
		}
	}
	cut[0] = rootChildren > 1
}

// fromGraph converts a kekulised, neutral molecule.Graph. It reports false
// if the graph does not fit (too many atoms or neighbours, charges,
// aromatic bonds, or a valence that is not allowed for the element).
func fromGraph(g *molecule.Graph, m *mol) bool {
	n := len(g.Atoms)
	if n > MaxAtoms {
		return false
	}
	*m = mol{}
	m.n = n
	for i, a := range g.Atoms {
		if a.Charge != 0 || a.Element <= molecule.H || a.Element >= molecule.NumElements {
			return false
		}
		m.col[i] = uint8(a.Element)
		m.el[i] = a.Element
		m.val[i] = uint8(a.HCount)
	}
	for _, b := range g.Bonds {
		if b.Order < molecule.Single || b.Order > molecule.Triple || b.A == b.B {
			return false
		}
		if m.deg[b.A] >= maxDeg || m.deg[b.B] >= maxDeg {
			return false
		}
		o := uint8(b.Order)
		m.nb[b.A][m.deg[b.A]], m.bo[b.A][m.deg[b.A]] = uint8(b.B), o
		m.nb[b.B][m.deg[b.B]], m.bo[b.B][m.deg[b.B]] = uint8(b.A), o
		m.deg[b.A]++
		m.deg[b.B]++
		m.bsum[b.A] += o
		m.bsum[b.B] += o
		m.val[b.A] += o
		m.val[b.B] += o
		m.adj[b.A] |= 1 << uint(b.B)
		m.adj[b.B] |= 1 << uint(b.A)
		m.edges++
	}
	for i := 0; i < n; i++ {
		if m.val[i] > 7 {
			return false
		}
		m.col[i] = uint8(m.el[i])<<3 | m.val[i]
	}
	return true
}
