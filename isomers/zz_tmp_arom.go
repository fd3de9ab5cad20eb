package isomers

import "shiftrank/molecule"

// TEMPORARY until molecule.AromaticBonds lands: benzenoid 6-rings only.
func aromaticBonds(g *molecule.Graph) []bool {
	out := make([]bool, len(g.Bonds))
	n := len(g.Atoms)
	var path []int
	var rec func(v, start int)
	rec = func(v, start int) {
		if len(path) == 6 {
			if g.BondBetween(v, start) < 0 {
				return
			}
			// alternating?
			cyc := append(append([]int{}, path...), start)
			d := 0
			for i := 0; i < 6; i++ {
				if g.Bonds[g.BondBetween(cyc[i], cyc[i+1])].Order == 2 {
					d++
				}
			}
			if d != 3 {
				return
			}
			for i := 0; i < 6; i++ {
				o1 := g.Bonds[g.BondBetween(cyc[i], cyc[i+1])].Order
				o2 := g.Bonds[g.BondBetween(cyc[(i+1)%6], cyc[(i+2)%6])].Order
				if o1 == o2 {
					return
				}
			}
			for i := 0; i < 6; i++ {
				out[g.BondBetween(cyc[i], cyc[i+1])] = true
			}
			return
		}
		for _, nb := range g.Neighbors(v) {
			if nb.Atom < start {
				continue
			}
			dup := false
			for _, p := range path {
				if p == nb.Atom {
					dup = true
				}
			}
			if dup {
				continue
			}
			path = append(path, nb.Atom)
			rec(nb.Atom, start)
			path = path[:len(path)-1]
		}
	}
	for s := 0; s < n; s++ {
		path = []int{s}
		rec(s, s)
	}
	return out
}
