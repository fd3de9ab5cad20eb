package molecule

// Fragment is a substructure query written in SMILES. Build one with
// ParseFragment; it is immutable and safe for concurrent use.
type Fragment struct {
	smiles   string
	q        *Graph
	atomArom []bool  // query atom written lowercase: matches aromatic atoms only
	written  []uint8 // bracket atom: hydrogen count / charge must match (writtenH, writtenCharge)
	bond     []fragBond
	order    []int            // query atoms in matching order (each after a neighbour)
	parent   []int            // for order[k], k > 0: an earlier query atom bonded to it
	counts   [NumElements]int // query atoms per element, for a quick reject
}

type fragBond uint8

const (
	fragSingleOrAromatic fragBond = iota // no symbol: single or aromatic
	fragSingle                           // '-': single, not aromatic
	fragDouble                           // '=': double, not aromatic
	fragTriple                           // '#'
	fragAromatic                         // ':' or implicit between lowercase atoms
)

// ParseFragment reads a substructure query written in SMILES, with the
// meaning SMARTS gives to the same symbols: an uppercase atom (C, O,
// [NH2]) matches a non-aromatic atom of that element, a lowercase atom
// (c, n, [nH]) an aromatic one; a bracket atom requires the hydrogen count
// and the charge it writes ([OH], [CH3], [CH0], [O-], [N+]) and leaves
// unwritten ones free, organic-subset atoms match any hydrogen count and
// charge. A bond written without a symbol matches a single or
// an aromatic bond, also between two lowercase atoms (so c1ccccc1c1ccccc1
// finds biphenyl, whose ring-joining bond is single, as in SMARTS); '-' a
// single non-aromatic bond, '=' a double and '#' a triple bond outside
// aromatic rings, ':' an aromatic bond. Aromaticity of the target is
// perceived with AromaticBonds, so the query c1ccccc1 finds a benzene ring
// in any Kekulé structure, and C=C does not match inside it. Rings written
// in Kekulé form that are aromatic by that rule count as aromatic query
// atoms and bonds: C1=CC=CC=C1 finds what c1ccccc1 finds (unlike SMARTS).
//
// Errors are *SMILESError as for ParseSMILES; valences are not checked.
func ParseFragment(s string) (*Fragment, error) {
	p := smilesParser{s: s, fragment: true}
	q, err := p.parseGraph()
	if err != nil {
		return nil, err
	}
	f := &Fragment{smiles: s, q: q, atomArom: p.arom, written: p.written}
	for _, a := range q.Atoms {
		f.counts[a.Element]++
	}
	for i := range q.Bonds {
		var k fragBond
		switch p.bondSym[i] {
		case '-', '/', '\\':
			k = fragSingle
		case '=':
			k = fragDouble
		case '#':
			k = fragTriple
		case ':':
			k = fragAromatic
		default:
			// Also between two lowercase atoms: the bond joining the
			// rings of biphenyl (c1ccccc1c1ccccc1) is single, not aromatic.
			k = fragSingleOrAromatic
		}
		f.bond = append(f.bond, k)
	}
	// Rings written in Kekulé form that are aromatic by Hückel's rule
	// become aromatic query atoms and bonds, so C1=CC=CC=C1 finds what
	// c1ccccc1 finds (the query read as a molecule, when it is one, with
	// the atom and bond numbering of the query). Bonds written between
	// lowercase atoms keep their meaning.
	if mol, err := ParseSMILES(s); err == nil && len(mol.Bonds) == len(q.Bonds) {
		for i, ar := range AromaticBonds(mol) {
			b := q.Bonds[i]
			if ar && b.Order != Aromatic {
				f.bond[i] = fragAromatic
				f.atomArom[b.A], f.atomArom[b.B] = true, true
			}
		}
	}
	// Breadth-first matching order from atom 0 (the query is connected:
	// ParseSMILES rejects '.').
	n := len(q.Atoms)
	seen := make([]bool, n)
	f.order = append(f.order, 0)
	f.parent = append(f.parent, -1)
	seen[0] = true
	for h := 0; h < len(f.order); h++ {
		v := f.order[h]
		for _, nb := range q.Neighbors(v) {
			if !seen[nb.Atom] {
				seen[nb.Atom] = true
				f.order = append(f.order, nb.Atom)
				f.parent = append(f.parent, v)
			}
		}
	}
	return f, nil
}

// MustParseFragment is like ParseFragment but panics on error; for tests
// and constant queries only.
func MustParseFragment(s string) *Fragment {
	f, err := ParseFragment(s)
	if err != nil {
		panic("molecule: " + err.Error())
	}
	return f
}

// String returns the query as written.
func (f *Fragment) String() string { return f.smiles }

// NumAtoms returns the number of query atoms.
func (f *Fragment) NumAtoms() int { return len(f.q.Atoms) }

// Matches reports whether g contains the fragment as a substructure
// (a subgraph monomorphism: distinct query atoms map to distinct atoms of
// g, every query bond to a bond of g; g may have more bonds).
func (f *Fragment) Matches(g *Graph) bool { return f.Match(g) != nil }

// Match returns one embedding of the fragment in g, m[i] being the atom of
// g matched to query atom i, or nil if there is none.
func (f *Fragment) Match(g *Graph) []int {
	var res []int
	f.each(g, func(m []int) bool {
		res = append([]int(nil), m...)
		return false
	})
	return res
}

// Count returns the number of distinct embeddings of the fragment in g
// (symmetric fragments count each atom set several times: CC in ethane
// gives 2).
func (f *Fragment) Count(g *Graph) int {
	c := 0
	f.each(g, func([]int) bool { c++; return true })
	return c
}

func (f *Fragment) each(g *Graph, yield func(m []int) bool) {
	n := len(f.q.Atoms)
	if n == 0 || n > len(g.Atoms) {
		return
	}
	var have [NumElements]int
	for _, a := range g.Atoms {
		if a.Element < NumElements {
			have[a.Element]++
		}
	}
	for e, c := range f.counts {
		if c > have[e] {
			return
		}
	}
	var perc aromaticity
	arom := perc.perceive(g)
	atomArom := make([]bool, len(g.Atoms))
	for i, a := range arom {
		if a {
			atomArom[g.Bonds[i].A] = true
			atomArom[g.Bonds[i].B] = true
		}
	}
	m := make([]int, n)
	used := make([]bool, len(g.Atoms))
	for i := range m {
		m[i] = -1
	}
	atomOK := func(qi, t int) bool {
		qa, ta := f.q.Atoms[qi], g.Atoms[t]
		if qa.Element != ta.Element || f.atomArom[qi] != atomArom[t] {
			return false
		}
		if w := f.written[qi]; w&writtenH != 0 && qa.HCount != ta.HCount || w&writtenCharge != 0 && qa.Charge != ta.Charge {
			return false
		}
		return g.Degree(t) >= f.q.Degree(qi)
	}
	bondOK := func(qb, tb int) bool {
		ta := arom[tb]
		to := g.Bonds[tb].Order
		switch f.bond[qb] {
		case fragSingleOrAromatic:
			return ta || to == Single
		case fragSingle:
			return !ta && to == Single
		case fragDouble:
			return !ta && to == Double
		case fragTriple:
			return !ta && to == Triple
		case fragAromatic:
			return ta
		}
		return false
	}
	// consistent checks the bonds from query atom qi to already-mapped
	// query atoms.
	consistent := func(qi, t int) bool {
		for _, nb := range f.q.Neighbors(qi) {
			if mt := m[nb.Atom]; mt >= 0 {
				tb := g.BondBetween(t, mt)
				if tb < 0 || !bondOK(nb.Bond, tb) {
					return false
				}
			}
		}
		return true
	}
	stop := false
	var rec func(k int)
	rec = func(k int) {
		if k == n {
			if !yield(m) {
				stop = true
			}
			return
		}
		qi := f.order[k]
		try := func(t int) {
			if used[t] || !atomOK(qi, t) || !consistent(qi, t) {
				return
			}
			m[qi], used[t] = t, true
			rec(k + 1)
			m[qi], used[t] = -1, false
		}
		if k == 0 {
			for t := range g.Atoms {
				if try(t); stop {
					return
				}
			}
			return
		}
		for _, nb := range g.Neighbors(m[f.parent[k]]) {
			if try(nb.Atom); stop {
				return
			}
		}
	}
	rec(0)
}
