package isomers

import (
	"fmt"
	"slices"

	"shiftrank/molecule"
)

// Fits reports whether the atoms of g (a complete, kekulised structure)
// can be divided into the classes of s — counts, hydrogens, charges,
// valences — so that every rule holds. It tests the whole graph directly,
// independently of the generator's incremental pruning (the tests compare
// the two), and is meant for checking single structures: it backtracks
// over the class of each atom.
func (s *Spec) Fits(g *molecule.Graph) bool {
	ok, _ := s.Explain(g)
	return ok
}

// Explain is Fits with a reason when g does not fit: the first rule that
// fails for an atom under the first division of the atoms into classes
// that gets that far, or the counts that cannot be met.
func (s *Spec) Explain(g *molecule.Graph) (bool, string) {
	n := len(g.Atoms)
	cls := make([]int, n)
	left := make([]int, len(s.Classes))
	for i, c := range s.Classes {
		left[i] = c.Count
	}
	why := ""
	var rec func(i int) bool
	rec = func(i int) bool {
		if i == n {
			for x := 0; x < n; x++ {
				if ok, w := atomFits(g, &s.Classes[cls[x]], cls, x); !ok {
					if why == "" {
						why = fmt.Sprintf("atom %d (%s) as %s: %s", x+1, g.Atoms[x].Element, s.Classes[cls[x]], w)
					}
					return false
				}
			}
			for k := range s.Classes {
				if ok, w := slotsFit(g, &s.Classes[k], k, cls); !ok {
					if why == "" {
						why = fmt.Sprintf("%s: %s", s.Classes[k], w)
					}
					return false
				}
			}
			return true
		}
		a := g.Atoms[i]
		for k, c := range s.Classes {
			if left[k] == 0 || c.Element != a.Element || c.Charge != a.Charge || (c.H != FreeH && c.H != a.HCount) {
				continue
			}
			if !slices.Contains(c.valences(), g.Valence(i)) {
				continue
			}
			left[k]--
			cls[i] = k
			ok := rec(i + 1)
			left[k]++
			if ok {
				return true
			}
		}
		return false
	}
	if rec(0) {
		return true, ""
	}
	if why == "" {
		why = "the atoms' elements, hydrogen counts and valences do not match the classes' counts"
	}
	return false, why
}

func atomFits(g *molecule.Graph, c *Class, cls []int, x int) (bool, string) {
	nb := g.Neighbors(x)
	if c.MaxDegree > 0 && len(nb) > c.MaxDegree || len(nb) < c.MinDegree {
		return false, fmt.Sprintf("%d neighbours", len(nb))
	}
	multiples := func(y int) (d, t int) {
		for _, e := range g.Neighbors(y) {
			switch e.Order {
			case molecule.Double:
				d++
			case molecule.Triple:
				t++
			}
		}
		return
	}
	d, t := multiples(x)
	bad := false
	switch c.Bonds {
	case SingleBonds:
		bad = d+t > 0
	case OneDouble:
		bad = d != 1 || t != 0
	case Unsaturated:
		bad = d+t == 0
	case OneTriple:
		bad = t != 1 || d != 0
	}
	if bad {
		return false, fmt.Sprintf("%d double and %d triple bonds, not %s", d, t, c.Bonds)
	}
	if c.Vicinal.On {
		sure, all := 0, 0
		for _, e := range nb {
			u := e.Atom
			h := g.Atoms[u].HCount
			all += h
			if g.Atoms[u].Element == molecule.F {
				all++
			}
			for _, f := range g.Neighbors(u) {
				if f.Atom != x && g.Atoms[f.Atom].Element == molecule.F {
					all++
				}
			}
			if g.Atoms[u].Element != molecule.C {
				continue
			}
			formyl := false
			for _, f := range g.Neighbors(u) {
				if f.Order == molecule.Double && g.Atoms[f.Atom].Element == molecule.O {
					formyl = h == 1
				}
			}
			if !formyl {
				sure += h
			}
		}
		if sure > c.Vicinal.Max || all < c.Vicinal.Min {
			return false, fmt.Sprintf("%d H on neighbouring carbons (%d coupling partners), outside %d–%d", sure, all, c.Vicinal.Min, c.Vicinal.Max)
		}
	}
	if c.Sum != nil {
		lo, hi := 0.0, 0.0
		for _, e := range nb {
			iv := c.Sum.Per[kindOf(g, e.Atom)]
			lo += iv.Lo
			hi += iv.Hi
		}
		if hi < c.Sum.Target.Lo || lo > c.Sum.Target.Hi {
			return false, fmt.Sprintf("neighbour sum %.2f–%.2f misses %.2f–%.2f", lo, hi, c.Sum.Target.Lo, c.Sum.Target.Hi)
		}
	}
	for ri, r := range c.Neighbours {
		count := 0
		for _, e := range nb {
			u := e.Atom
			if r.Double && e.Order != molecule.Double {
				continue
			}
			d, t := multiples(u)
			if slices.Contains(r.Classes, cls[u]) || slices.Contains(r.Elements, g.Atoms[u].Element) || r.Unsaturated && d+t > 0 {
				count++
			}
		}
		if count < r.Min || r.Max >= 0 && count > r.Max {
			return false, fmt.Sprintf("%d matching neighbours for neighbour rule %d", count, ri+1)
		}
	}
	return true, ""
}

// kindOf classifies atom u of a complete graph as NeighbourSum does.
func kindOf(g *molecule.Graph, u int) NeighbourKind {
	a := g.Atoms[u]
	switch a.Element {
	case molecule.C:
		d, t, hetero := 0, 0, false
		for _, e := range g.Neighbors(u) {
			switch e.Order {
			case molecule.Double:
				d++
				hetero = hetero || g.Atoms[e.Atom].Element != molecule.C
			case molecule.Triple:
				t++
			}
		}
		switch {
		case t > 0 || d > 1:
			return KindCarbonSP
		case d == 1 && hetero:
			return KindCarbonyl
		case d == 1:
			return KindCarbonC2
		}
		return KindCarbonSP3
	case molecule.N:
		if a.Charge > 0 {
			return KindNPlus
		}
		return KindN
	}
	return map[molecule.Element]NeighbourKind{molecule.O: KindO, molecule.S: KindS, molecule.F: KindF,
		molecule.Cl: KindCl, molecule.Br: KindBr, molecule.I: KindI, molecule.P: KindP, molecule.Si: KindSi, molecule.B: KindB}[a.Element]
}

// slotsFit tests whether the atoms of class k (by cls) can fill the
// class's slots, each atom obeying its slot's rules (a backtracking
// matching; classes hold few atoms).
func slotsFit(g *molecule.Graph, c *Class, k int, cls []int) (bool, string) {
	if len(c.Slots) == 0 {
		return true, ""
	}
	var atoms []int
	for x := range g.Atoms {
		if cls[x] == k {
			atoms = append(atoms, x)
		}
	}
	views := make([]Class, len(c.Slots))
	for i, sl := range c.Slots {
		views[i] = Class{Element: c.Element, H: c.H, MinDegree: sl.MinDegree, MaxDegree: sl.MaxDegree, Bonds: sl.Bonds,
			Vicinal: sl.Vicinal, Neighbours: sl.Neighbours, Sum: sl.Sum}
	}
	left := make([]int, len(c.Slots))
	for i, sl := range c.Slots {
		left[i] = sl.Count
	}
	why := ""
	var rec func(i int) bool
	rec = func(i int) bool {
		if i == len(atoms) {
			return true
		}
		x := atoms[i]
		for si := range views {
			if left[si] == 0 {
				continue
			}
			if ok, w := atomFits(g, &views[si], cls, x); !ok {
				if why == "" {
					why = fmt.Sprintf("atom %d fits no free slot (slot %d %q: %s)", x+1, si+1, c.Slots[si].Name, w)
				}
				continue
			}
			left[si]--
			ok := rec(i + 1)
			left[si]++
			if ok {
				return true
			}
		}
		return false
	}
	if rec(0) {
		return true, ""
	}
	if why == "" {
		why = "the atoms cannot fill the slots"
	}
	return false, why
}
