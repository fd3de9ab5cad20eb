package isomers

import (
	"sort"

	"shiftrank/molecule"
)

// oracle is the slow, simple, independent reference for the generator:
// it enumerates every labelled multigraph (bond orders 0–3 on every atom
// pair) of the formula's heavy atoms with every valence choice, keeps the
// connected ones whose hydrogen counts (valence − bond-order sum ≥ 0) add
// up to the formula's, and removes labelled duplicates by a brute-force
// canonical form (the smallest adjacency string over all relabellings that
// preserve element, valence, degree and bond-order sum). It returns one
// testSMILES per multigraph; Kekulé structures of one compound are all
// kept and merged later by RDKit's canonical SMILES. Only for small
// formulas (≤ 6 heavy atoms).
func oracle(f molecule.Formula) []oracleEntry {
	var el []molecule.Element
	for e := molecule.H + 1; e < molecule.NumElements; e++ {
		for i := 0; i < f.Count(e); i++ {
			el = append(el, e)
		}
	}
	n := len(el)
	h := f.HydrogenCount()
	val := make([]int, n)
	ord := make([][]int, n)
	for i := range ord {
		ord[i] = make([]int, n)
	}
	bsum := make([]int, n)
	var pairs [][2]int
	for i := 0; i < n; i++ {
		for j := i + 1; j < n; j++ {
			pairs = append(pairs, [2]int{i, j})
		}
	}
	seen := map[string]bool{}
	var out []oracleEntry
	var e int
	leaf := func() {
		if !connected(ord) {
			return
		}
		key := bruteCanon(el, val, ord, bsum)
		if seen[key] {
			return
		}
		seen[key] = true
		g := molecule.NewGraph(n)
		for i := 0; i < n; i++ {
			g.AddAtom(el[i], val[i]-bsum[i])
		}
		for _, p := range pairs {
			if o := ord[p[0]][p[1]]; o > 0 {
				g.MustAddBond(p[0], p[1], molecule.Order(o))
			}
		}
		out = append(out, oracleEntry{key: key, smiles: testSMILES(g)})
	}
	var edges func(pi, total int)
	edges = func(pi, total int) {
		if pi == len(pairs) {
			if total == e {
				leaf()
			}
			return
		}
		a, b := pairs[pi][0], pairs[pi][1]
		for o := 0; o <= 3; o++ {
			if total+o > e || bsum[a]+o > val[a] || bsum[b]+o > val[b] {
				break
			}
			ord[a][b], ord[b][a] = o, o
			bsum[a] += o
			bsum[b] += o
			edges(pi+1, total+o)
			bsum[a] -= o
			bsum[b] -= o
		}
		ord[a][b], ord[b][a] = 0, 0
	}
	var valences func(i int)
	valences = func(i int) {
		if i == n {
			sum := 0
			for _, v := range val {
				sum += v
			}
			if sum < h || (sum-h)%2 != 0 {
				return
			}
			e = (sum - h) / 2
			edges(0, 0)
			return
		}
		for _, v := range el[i].Valences() {
			// atoms of one element are interchangeable: nondecreasing valences
			if i > 0 && el[i-1] == el[i] && v < val[i-1] {
				continue
			}
			val[i] = v
			valences(i + 1)
		}
	}
	valences(0)
	return out
}

// oracleEntry is one multigraph found by the oracle.
type oracleEntry struct {
	key    string // bruteCanon
	smiles string // testSMILES
}

// graphKey is bruteCanon of a molecule graph.
func graphKey(g *molecule.Graph) string {
	n := len(g.Atoms)
	el := make([]molecule.Element, n)
	val := make([]int, n)
	bsum := make([]int, n)
	ord := make([][]int, n)
	for i, a := range g.Atoms {
		el[i] = a.Element
		ord[i] = make([]int, n)
	}
	for _, b := range g.Bonds {
		ord[b.A][b.B], ord[b.B][b.A] = int(b.Order), int(b.Order)
		bsum[b.A] += int(b.Order)
		bsum[b.B] += int(b.Order)
	}
	for i, a := range g.Atoms {
		val[i] = bsum[i] + a.HCount
	}
	return bruteCanon(el, val, ord, bsum)
}

func connected(ord [][]int) bool {
	n := len(ord)
	seen := make([]bool, n)
	stack := []int{0}
	seen[0] = true
	c := 1
	for len(stack) > 0 {
		v := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		for u := 0; u < n; u++ {
			if ord[v][u] > 0 && !seen[u] {
				seen[u] = true
				c++
				stack = append(stack, u)
			}
		}
	}
	return c == n
}

// bruteCanon returns a canonical string of the labelled multigraph: atoms
// are sorted by (element, valence, degree, bond-order sum), and within
// each group all orders are tried; the smallest column-by-column
// adjacency string wins.
func bruteCanon(el []molecule.Element, val []int, ord [][]int, bsum []int) string {
	n := len(el)
	type lab struct{ e, v, d, s int }
	labs := make([]lab, n)
	for i := 0; i < n; i++ {
		d := 0
		for j := 0; j < n; j++ {
			if ord[i][j] > 0 {
				d++
			}
		}
		labs[i] = lab{int(el[i]), val[i], d, bsum[i]}
	}
	idx := make([]int, n)
	for i := range idx {
		idx[i] = i
	}
	less := func(a, b lab) bool {
		if a.e != b.e {
			return a.e < b.e
		}
		if a.v != b.v {
			return a.v < b.v
		}
		if a.d != b.d {
			return a.d < b.d
		}
		return a.s < b.s
	}
	sort.Slice(idx, func(i, j int) bool { return less(labs[idx[i]], labs[idx[j]]) })
	// group boundaries
	group := make([]int, n) // group[pos] = first position of its group
	for p := 1; p < n; p++ {
		if labs[idx[p]] == labs[idx[p-1]] {
			group[p] = group[p-1]
		} else {
			group[p] = p
		}
	}
	var head []byte
	for p := 0; p < n; p++ {
		l := labs[idx[p]]
		head = append(head, byte(l.e), byte(l.v), byte(l.d), byte(l.s))
	}
	perm := make([]int, n)
	used := make([]bool, n)
	var best, cur []byte
	var rec func(p int, tight bool)
	rec = func(p int, tight bool) {
		if p == n {
			if best == nil || string(cur) < string(best) {
				best = append(best[:0], cur...)
			}
			return
		}
		// candidates for position p: unused atoms of p's group
		for q := group[p]; q < n && group[q] == group[p]; q++ {
			a := idx[q]
			if used[a] {
				continue
			}
			used[a] = true
			perm[p] = a
			start := len(cur)
			for i := 0; i < p; i++ {
				cur = append(cur, byte(ord[perm[i]][a]))
			}
			// branch and bound against the best complete string
			t := tight
			prune := false
			if best != nil && tight {
				c := compareBytes(cur, best[:len(cur)])
				if c > 0 {
					prune = true
				}
				t = c == 0
			}
			if !prune {
				rec(p+1, t)
			}
			cur = cur[:start]
			used[a] = false
		}
	}
	rec(0, true)
	return string(head) + "|" + string(best)
}
