package predict

import "shiftrank/molecule"

// symmetry computes automorphism orbits and an invariant atom ordering.
// Fast path: colour refinement (1-dimensional Weisfeiler–Leman) on the
// aromatised view; when it separates every atom the automorphism group is
// trivial and the orbits are the atoms themselves (exact, since
// automorphisms preserve refined colours). Otherwise the exact
// individualisation-refinement of molecule.Canonicalizer decides, except
// for acyclic molecules: on trees the stable colour-refinement partition is
// the orbit partition (Immerman and Lander, "Describing graphs: a
// first-order approach to graph canonization", 1990), so the colour classes
// are used directly.
func (m *mol) symmetry(aromBond []bool, canon *molecule.Canonicalizer) {
	g := m.g
	n := len(g.Atoms)
	if cap(m.w.col) < 2*n {
		m.w.col = make([]uint64, 2*n)
	}
	col := m.w.col[:2*n]
	cur, next := col[:n], col[n:]
	for i, a := range g.Atoms {
		h := uint64(a.Element)<<40 | uint64(a.HCount)<<32 | uint64(a.Charge+8)<<24 | uint64(len(g.Neighbors(i)))<<16
		if m.arom[i] {
			h |= 1 << 8
		}
		cur[i] = mix(h)
	}
	classes := countDistinct(cur)
	var nb [8]uint64
	for iter := 0; iter < n && classes < n; iter++ {
		for i := range g.Atoms {
			k := 0
			for _, e := range g.Neighbors(i) {
				o := uint64(e.Order)
				if aromBond != nil && aromBond[e.Bond] {
					o = uint64(molecule.Aromatic)
				}
				v := mix(cur[e.Atom]*8 + o)
				if k < len(nb) {
					nb[k] = v
					k++
				} else {
					nb[len(nb)-1] ^= v
				}
			}
			// order-independent combination of the neighbour multiset
			var sum, xor uint64
			for _, v := range nb[:k] {
				sum += v
				xor ^= mix(v)
			}
			next[i] = mix(cur[i] ^ mix(sum+0x9e3779b97f4a7c15) ^ (xor << 1))
		}
		c := countDistinct(next)
		cur, next = next, cur
		if c == classes {
			break
		}
		classes = c
	}
	if classes < n && g.NumRings() == 0 {
		// Orbit representative: smallest atom index of each colour class;
		// label: rank of the colour (ties broken by index).
		for i := range m.orbit {
			m.orbit[i] = i
			for j := 0; j < i; j++ {
				if cur[j] == cur[i] {
					m.orbit[i] = j
					break
				}
			}
		}
		for i := range m.label {
			r := 0
			for j := range cur {
				if cur[j] < cur[i] || cur[j] == cur[i] && j < i {
					r++
				}
			}
			m.label[i] = r
		}
		return
	}
	if classes == n {
		for i := range m.orbit {
			m.orbit[i] = i
		}
		// Rank by colour: an ordering independent of atom numbering.
		for i := range m.label {
			r := 0
			for j := range cur {
				if cur[j] < cur[i] {
					r++
				}
			}
			m.label[i] = r
		}
		return
	}
	orb := canon.Orbits(m.orbit[:0], g)
	copy(m.orbit, orb)
	// Labels only order atoms of different orbits (vinyl halves, amide
	// sides); colour ranks do that independently of atom numbering.
	for i := range m.label {
		r := 0
		for j := range cur {
			if cur[j] < cur[i] || cur[j] == cur[i] && j < i {
				r++
			}
		}
		m.label[i] = r
	}
}

func mix(x uint64) uint64 {
	x ^= x >> 33
	x *= 0xff51afd7ed558ccd
	x ^= x >> 33
	x *= 0xc4ceb9fe1a85ec53
	x ^= x >> 33
	return x
}

func countDistinct(c []uint64) int {
	n := 0
	for i, v := range c {
		dup := false
		for _, w := range c[:i] {
			if w == v {
				dup = true
				break
			}
		}
		if !dup {
			n++
		}
	}
	return n
}
