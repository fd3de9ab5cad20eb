package molecule

import "errors"

// Kekulize replaces every Aromatic bond of g by a single or a double bond
// so that each atom that needs one more bond order to reach an allowed
// valence (for its element and formal charge, counting its hydrogens, its
// other bonds and each aromatic bond as 1) gets exactly one double bond
// among its aromatic bonds: the double bonds form a perfect matching of
// those atoms. Pyrrole-type atoms ([nH], o, s, n with three bonds) need no
// double bond. Hydrogen counts are not changed.
//
// It returns an error, leaving g unchanged, if no such matching exists
// (c1cccc1, c1ccccc1c) or the search exceeds its step budget.
func Kekulize(g *Graph) error {
	_, err := kekulize(g)
	return err
}

// kekuleBudget bounds the backtracking search for a perfect matching. With
// forced moves first, real aromatic systems need about one step per atom
// pair.
const kekuleBudget = 20000

// kekulize implements Kekulize and also returns an atom to blame on error
// (-1 if none).
func kekulize(g *Graph) (int, error) {
	n := len(g.Atoms)
	hasArom := false
	for _, b := range g.Bonds {
		if b.Order == Aromatic {
			hasArom = true
			break
		}
	}
	if !hasArom {
		return -1, nil
	}
	need := make([]bool, n)
	for i, a := range g.Atoms {
		used, arom := a.HCount, 0
		for _, nb := range g.Neighbors(i) {
			if nb.Order == Aromatic {
				arom++
				used++
			} else {
				used += int(nb.Order)
			}
		}
		if arom > 0 && !valenceAllowed(a.Element, a.Charge, used) && valenceAllowed(a.Element, a.Charge, used+1) {
			need[i] = true
		}
	}
	k := kekuleSearch{g: g, need: need, mate: make([]int, n), budget: kekuleBudget}
	for i := range k.mate {
		k.mate[i] = -1
	}
	// A connected group of atoms needing a double bond with an odd count
	// has no perfect matching: fail without searching.
	if bad := k.oddComponent(); bad >= 0 {
		return bad, errors.New("cannot kekulise the aromatic system (no arrangement of alternating double bonds fits; check [nH] and ring closures)")
	}
	if !k.solve() {
		bad := k.blame()
		if k.budget <= 0 {
			return bad, errors.New("aromatic system too complex to kekulise")
		}
		return bad, errors.New("cannot kekulise the aromatic system (no arrangement of alternating double bonds fits; check [nH] and ring closures)")
	}
	for i, b := range g.Bonds {
		if b.Order != Aromatic {
			continue
		}
		if k.mate[b.A] == i {
			g.SetBondOrder(i, Double)
		} else {
			g.SetBondOrder(i, Single)
		}
	}
	return -1, nil
}

type kekuleSearch struct {
	g      *Graph
	need   []bool
	mate   []int // bond index matched at each atom, -1 if none
	budget int
}

// free returns the number of aromatic bonds from atom v to unmatched
// atoms that need a double bond.
func (k *kekuleSearch) free(v int) int {
	c := 0
	for _, nb := range k.g.Neighbors(v) {
		if nb.Order == Aromatic && k.need[nb.Atom] && k.mate[nb.Atom] < 0 {
			c++
		}
	}
	return c
}

// solve matches all atoms that need a double bond, choosing at each step
// the unmatched atom with the fewest options (forced moves first) and
// backtracking over its options.
func (k *kekuleSearch) solve() bool {
	k.budget--
	if k.budget <= 0 {
		return false
	}
	best, bestFree := -1, 1<<30
	for v := range k.need {
		if !k.need[v] || k.mate[v] >= 0 {
			continue
		}
		f := k.free(v)
		if f < bestFree {
			best, bestFree = v, f
			if f <= 1 {
				break
			}
		}
	}
	if best < 0 {
		return true
	}
	if bestFree == 0 {
		return false
	}
	for _, nb := range k.g.Neighbors(best) {
		if nb.Order != Aromatic || !k.need[nb.Atom] || k.mate[nb.Atom] >= 0 {
			continue
		}
		k.mate[best], k.mate[nb.Atom] = nb.Bond, nb.Bond
		if k.solve() {
			return true
		}
		k.mate[best], k.mate[nb.Atom] = -1, -1
		if k.budget <= 0 {
			return false
		}
	}
	return false
}

// oddComponent returns the first atom of a connected set (via aromatic
// bonds) of atoms needing a double bond with an odd number of atoms, or -1.
func (k *kekuleSearch) oddComponent() int {
	n := len(k.need)
	seen := make([]bool, n)
	var stack []int
	for s := 0; s < n; s++ {
		if !k.need[s] || seen[s] {
			continue
		}
		seen[s] = true
		stack = append(stack[:0], s)
		size := 0
		for len(stack) > 0 {
			v := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			size++
			for _, nb := range k.g.Neighbors(v) {
				if nb.Order == Aromatic && k.need[nb.Atom] && !seen[nb.Atom] {
					seen[nb.Atom] = true
					stack = append(stack, nb.Atom)
				}
			}
		}
		if size%2 == 1 {
			return k.blame()
		}
	}
	return -1
}

// blame picks an atom to report: the first atom of an aromatic component
// with an odd number of atoms needing a double bond, else the first atom
// needing one.
func (k *kekuleSearch) blame() int {
	n := len(k.need)
	comp := make([]int, n)
	for i := range comp {
		comp[i] = -1
	}
	first := -1
	// An atom that needs a double bond but has only one aromatic bond is
	// usually the culprit (a lowercase atom outside any ring).
	for v := 0; v < n; v++ {
		if !k.need[v] {
			continue
		}
		c := 0
		for _, nb := range k.g.Neighbors(v) {
			if nb.Order == Aromatic {
				c++
			}
		}
		if c < 2 {
			return v
		}
	}
	for s := 0; s < n; s++ {
		if !k.need[s] || comp[s] >= 0 {
			continue
		}
		if first < 0 {
			first = s
		}
		comp[s] = s
		stack := []int{s}
		size := 0
		for len(stack) > 0 {
			v := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			size++
			for _, nb := range k.g.Neighbors(v) {
				if nb.Order == Aromatic && k.need[nb.Atom] && comp[nb.Atom] < 0 {
					comp[nb.Atom] = s
					stack = append(stack, nb.Atom)
				}
			}
		}
		if size%2 == 1 {
			return s
		}
	}
	if first < 0 {
		// No atom needs a double bond but there are aromatic bonds: blame
		// the first aromatic atom.
		for _, b := range k.g.Bonds {
			if b.Order == Aromatic {
				return b.A
			}
		}
	}
	return first
}
