package molecule

import "fmt"

// Order is a bond order. Only Single, Double and Triple occur in a Graph
// built by the isomer generator or the SMILES parser (aromatic input is
// kekulised); Aromatic is used only inside aromaticity perception and
// canonical forms.
type Order uint8

// Bond orders.
const (
	Single   Order = 1
	Double   Order = 2
	Triple   Order = 3
	Aromatic Order = 4
)

// Atom is a heavy (non-hydrogen) atom of a molecular graph. Hydrogens are
// implicit: HCount says how many are attached.
type Atom struct {
	Element Element
	HCount  int
	// Charge is the formal charge; the isomer generator only makes neutral
	// atoms, the SMILES parser keeps what the input says.
	Charge int
}

// Bond joins atoms A and B (indices into Graph.Atoms, A != B).
type Bond struct {
	A, B  int
	Order Order
}

// Other returns the atom at the other end of the bond from atom i.
func (b Bond) Other(i int) int {
	if b.A == i {
		return b.B
	}
	return b.A
}

// Neighbor is one entry of an atom's adjacency list.
type Neighbor struct {
	Atom  int   // the neighbouring atom
	Bond  int   // index into Graph.Bonds
	Order Order // the bond order
}

// Graph is a molecular graph: heavy atoms with implicit hydrogen counts,
// joined by bonds of order 1 to 3. Atom indices are stable: the SMILES
// parser numbers atoms in input order, so atom i of a parsed Graph is the
// i-th atom written in the SMILES string.
//
// Build a Graph with AddAtom and AddBond; the adjacency lists are kept up
// to date. A Graph is not safe for concurrent mutation.
type Graph struct {
	Atoms []Atom
	Bonds []Bond
	adj   [][]Neighbor
}

// NewGraph returns an empty graph with room for n atoms.
func NewGraph(n int) *Graph {
	return &Graph{Atoms: make([]Atom, 0, n), Bonds: make([]Bond, 0, n+2), adj: make([][]Neighbor, 0, n)}
}

// AddAtom appends an atom and returns its index.
func (g *Graph) AddAtom(e Element, hCount int) int {
	g.Atoms = append(g.Atoms, Atom{Element: e, HCount: hCount})
	g.adj = append(g.adj, nil)
	return len(g.Atoms) - 1
}

// AddBond joins atoms a and b with the given order and returns the bond
// index. It returns an error if an index is out of range, a == b, the order
// is not 1–4, or the atoms are already bonded.
func (g *Graph) AddBond(a, b int, o Order) (int, error) {
	if a < 0 || b < 0 || a >= len(g.Atoms) || b >= len(g.Atoms) {
		return -1, fmt.Errorf("molecule: bond %d-%d: atom index out of range (%d atoms)", a, b, len(g.Atoms))
	}
	if a == b {
		return -1, fmt.Errorf("molecule: bond %d-%d: an atom cannot bond to itself", a, b)
	}
	if o < Single || o > Aromatic {
		return -1, fmt.Errorf("molecule: bond %d-%d: invalid order %d", a, b, o)
	}
	if g.BondBetween(a, b) >= 0 {
		return -1, fmt.Errorf("molecule: bond %d-%d: atoms already bonded", a, b)
	}
	g.ensureAdj()
	idx := len(g.Bonds)
	g.Bonds = append(g.Bonds, Bond{A: a, B: b, Order: o})
	g.adj[a] = append(g.adj[a], Neighbor{Atom: b, Bond: idx, Order: o})
	g.adj[b] = append(g.adj[b], Neighbor{Atom: a, Bond: idx, Order: o})
	return idx, nil
}

// MustAddBond is AddBond for code that has already validated its input; it
// panics on error (programmer error).
func (g *Graph) MustAddBond(a, b int, o Order) int {
	i, err := g.AddBond(a, b, o)
	if err != nil {
		panic(err)
	}
	return i
}

// SetBondOrder changes the order of bond i, keeping adjacency lists in step.
func (g *Graph) SetBondOrder(i int, o Order) {
	b := &g.Bonds[i]
	b.Order = o
	g.ensureAdj()
	for k := range g.adj[b.A] {
		if g.adj[b.A][k].Bond == i {
			g.adj[b.A][k].Order = o
		}
	}
	for k := range g.adj[b.B] {
		if g.adj[b.B][k].Bond == i {
			g.adj[b.B][k].Order = o
		}
	}
}

// ensureAdj rebuilds the adjacency lists when a Graph was assembled by
// setting Atoms and Bonds directly.
func (g *Graph) ensureAdj() {
	if len(g.adj) == len(g.Atoms) {
		return
	}
	g.RebuildAdjacency()
}

// RebuildAdjacency recomputes the adjacency lists from Atoms and Bonds. Call
// it after modifying Atoms or Bonds directly. It reuses the lists' memory,
// so a Graph refilled in a loop (the isomer stream) does not allocate;
// slices returned by Neighbors before the call are invalid after it.
func (g *Graph) RebuildAdjacency() {
	if cap(g.adj) >= len(g.Atoms) {
		g.adj = g.adj[:len(g.Atoms)]
		for i := range g.adj {
			g.adj[i] = g.adj[i][:0]
		}
	} else {
		g.adj = make([][]Neighbor, len(g.Atoms))
	}
	for i, b := range g.Bonds {
		g.adj[b.A] = append(g.adj[b.A], Neighbor{Atom: b.B, Bond: i, Order: b.Order})
		g.adj[b.B] = append(g.adj[b.B], Neighbor{Atom: b.A, Bond: i, Order: b.Order})
	}
}

// NumAtoms returns the number of heavy atoms.
func (g *Graph) NumAtoms() int { return len(g.Atoms) }

// Neighbors returns the adjacency list of atom i in bond-insertion order.
// The slice must not be modified.
func (g *Graph) Neighbors(i int) []Neighbor {
	g.ensureAdj()
	return g.adj[i]
}

// Degree returns the number of heavy-atom neighbours of atom i.
func (g *Graph) Degree(i int) int { return len(g.Neighbors(i)) }

// BondOrderSum returns the sum of the orders of the bonds at atom i
// (Aromatic counts as 1.5, rounded down per atom after summing; it does not
// occur in kekulised graphs).
func (g *Graph) BondOrderSum(i int) int {
	s, arom := 0, 0
	for _, nb := range g.Neighbors(i) {
		if nb.Order == Aromatic {
			arom++
		} else {
			s += int(nb.Order)
		}
	}
	return s + (3*arom)/2
}

// Valence returns the bond-order sum plus the hydrogen count of atom i.
func (g *Graph) Valence(i int) int { return g.BondOrderSum(i) + g.Atoms[i].HCount }

// BondBetween returns the index of the bond joining a and b, or -1.
func (g *Graph) BondBetween(a, b int) int {
	if a < 0 || a >= len(g.Atoms) {
		return -1
	}
	for _, nb := range g.Neighbors(a) {
		if nb.Atom == b {
			return nb.Bond
		}
	}
	return -1
}

// HydrogenCount returns the total number of (implicit) hydrogens.
func (g *Graph) HydrogenCount() int {
	n := 0
	for _, a := range g.Atoms {
		n += a.HCount
	}
	return n
}

// Formula returns the molecular formula of the graph.
func (g *Graph) Formula() Formula {
	var f Formula
	for _, a := range g.Atoms {
		if a.Element > NoElement && a.Element < NumElements {
			f.counts[a.Element]++
		}
		f.counts[H] += a.HCount
	}
	return f
}

// Clone returns a deep copy of g.
func (g *Graph) Clone() *Graph {
	c := &Graph{
		Atoms: append([]Atom(nil), g.Atoms...),
		Bonds: append([]Bond(nil), g.Bonds...),
	}
	c.RebuildAdjacency()
	return c
}

// Connected reports whether every atom is reachable from atom 0. The empty
// graph counts as connected.
func (g *Graph) Connected() bool {
	n := len(g.Atoms)
	if n == 0 {
		return true
	}
	seen := make([]bool, n)
	stack := []int{0}
	seen[0] = true
	count := 1
	for len(stack) > 0 {
		v := stack[len(stack)-1]
		stack = stack[:len(stack)-1]
		for _, nb := range g.Neighbors(v) {
			if !seen[nb.Atom] {
				seen[nb.Atom] = true
				count++
				stack = append(stack, nb.Atom)
			}
		}
	}
	return count == n
}

// CheckValence returns an error naming the first atom whose valence
// (bond-order sum plus hydrogens) is not allowed for its element and
// formal charge: the element's neutral valences for uncharged atoms, those
// of the isoelectronic neutral atom for charges ±1 (N+ 4, O− 1, C− 3, ...;
// common practice); other charges are reported as unsupported.
func (g *Graph) CheckValence() error {
	for i, a := range g.Atoms {
		v := g.Valence(i)
		allowed := allowedValences(a.Element, a.Charge)
		if allowed == nil {
			return fmt.Errorf("atom %d (%s%s): charge not supported", i, a.Element, chargeSuffix(a.Charge))
		}
		if !valenceAllowed(a.Element, a.Charge, v) {
			return fmt.Errorf("atom %d (%s%s): valence %d not allowed (allowed %v)", i, a.Element, chargeSuffix(a.Charge), v, allowed)
		}
	}
	return nil
}

// NumRings returns the cyclomatic number (bonds − atoms + components),
// i.e. the number of independent rings.
func (g *Graph) NumRings() int {
	if len(g.Atoms) == 0 {
		return 0
	}
	comp := 0
	seen := make([]bool, len(g.Atoms))
	for s := range g.Atoms {
		if seen[s] {
			continue
		}
		comp++
		stack := []int{s}
		seen[s] = true
		for len(stack) > 0 {
			v := stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			for _, nb := range g.Neighbors(v) {
				if !seen[nb.Atom] {
					seen[nb.Atom] = true
					stack = append(stack, nb.Atom)
				}
			}
		}
	}
	return len(g.Bonds) - len(g.Atoms) + comp
}
