package isomers

import (
	"fmt"
	"math/bits"

	"shiftrank/molecule"
)

// This file holds the isomorph-free search: canonical augmentation by
// vertex addition (McKay 1998, "Isomorph-free exhaustive generation",
// J. Algorithms 26:306–324). A connected coloured multigraph with k+1
// vertices is accepted as the child of its k-vertex parent only when the
// added vertex lies in the automorphism orbit of the canonical deletion
// vertex m(C): among the vertices whose removal leaves the graph connected,
// those in the last cell of the equitable partition refined from an
// invariant vertex key (degree first, so leaves come last; for trees also
// the eccentricity), and among them the one with the largest canonical
// label. In trees the cells are the orbits, so no search is needed. The
// parent offers each augmentation only once per orbit of its own
// automorphism group. Every structure then has exactly one accepted path
// from a single atom, so no two emitted structures are isomorphic. Cheap
// necessary conditions of the acceptance test are applied while the
// augmentations are enumerated, before any child is built.

// maxColours bounds the number of vertex colours of a run (the canonical
// certificate writes a colour as one byte below 0xff).
const maxColours = 48

// plan is what a formula (and a Spec) fixes for the whole search.
type plan struct {
	formula molecule.Formula
	n       int // heavy atoms
	h       int // hydrogens not fixed by a class
	colours []colour
	groups  []group
	assigns []assignment
	// rules is true when some colour carries rules (a Spec, or the
	// charge-separated colours).
	rules bool
	// slotted is true when some class has slots.
	slotted bool
	// allFixed is true when every colour fixes its hydrogen count, so
	// every atom must use its whole capacity.
	allFixed bool
	// ambiguous is true when one structure may be divided into the
	// classes in more than one way, so emitted structures are deduplicated.
	ambiguous bool
}

// colour is a vertex class of the search: an element in one valence state
// with, under a Spec, a fixed hydrogen count, a charge and local rules.
// The hydrogen count of an atom is its fixed count plus its unused bonding
// capacity, so colouring atoms this way makes the coloured multigraph and
// the constitution carry the same information.
type colour struct {
	el    molecule.Element
	val   int // bonding capacity: valence minus fixed hydrogens
	hx    int // fixed hydrogens (0 when free)
	chg   int // formal charge
	group int // the group (element, or Spec class) whose count it shares
	rule  *crule
}

// group is a set of colours whose atom counts add up to one number: an
// element's valence states, or a Spec class's.
type group struct {
	colours []int
	count   int
	// slots and slotCount are the compiled Class.Slots.
	slots     []*crule
	slotCount []int
}

// assignment fixes the number of atoms of every colour (the valence state
// of every hypervalent-capable atom) and hence the total bond order E.
type assignment struct {
	count [maxColours]int
	e     int
}

// newPlan lists the colours and the valence assignments of f under opts.
func newPlan(f molecule.Formula, opts *Options) (*plan, error) {
	p := &plan{formula: f, n: f.HeavyAtoms(), h: f.HydrogenCount()}
	if p.n == 0 {
		return nil, fmt.Errorf("isomers: formula %s has no heavy atoms", f)
	}
	if p.n > MaxAtoms {
		return nil, fmt.Errorf("isomers: formula %s has %d heavy atoms, more than the generator's limit of %d", f, p.n, MaxAtoms)
	}
	switch {
	case opts != nil && opts.Spec != nil:
		if err := p.specColours(f, opts.Spec); err != nil {
			return nil, err
		}
	default:
		p.elementColours(f, opts != nil && opts.ChargeSeparated)
	}
	p.enumerateAssignments()
	return p, nil
}

// elementColours makes one group per element with one colour per neutral
// valence and, when charged, the charge-separated states: N+ (valence 4),
// and the anions bonded to it, O− (1), N− (2) and C− (3).
func (p *plan) elementColours(f molecule.Formula, charged bool) {
	var cation, anions []int
	for e := molecule.H + 1; e < molecule.NumElements; e++ {
		if f.Count(e) == 0 {
			continue
		}
		g := group{count: f.Count(e)}
		add := func(c colour) int {
			c.group = len(p.groups)
			p.colours = append(p.colours, c)
			g.colours = append(g.colours, len(p.colours)-1)
			return len(p.colours) - 1
		}
		for _, v := range e.Valences() {
			add(colour{el: e, val: v})
		}
		if charged && f.Count(molecule.N) > 0 {
			switch e {
			case molecule.N:
				cation = append(cation, add(colour{el: e, val: 4, chg: 1}))
				anions = append(anions, add(colour{el: e, val: 2, chg: -1}))
			case molecule.O:
				anions = append(anions, add(colour{el: e, val: 1, chg: -1}))
			case molecule.C:
				anions = append(anions, add(colour{el: e, val: 3, chg: -1}))
			}
		}
		p.groups = append(p.groups, g)
	}
	if len(cation) == 0 {
		return
	}
	p.rules = true
	var cm, am uint64
	for _, c := range cation {
		cm |= 1 << c
	}
	for _, a := range anions {
		am |= 1 << a
	}
	for _, c := range cation {
		p.colours[c].rule = &crule{fixedH: true, nbr: []cnbr{{colours: am, min: 1, max: 1}}}
	}
	for _, a := range anions {
		p.colours[a].rule = &crule{fixedH: true, maxDeg: 1, minDeg: 1, nbr: []cnbr{{colours: cm, min: 1, max: 1}}}
	}
}

// ChargeSeparatedGroups names the charge-separated groups the generator
// makes with Options.ChargeSeparated: an N+ (four bonds, no hydrogen)
// bonded to exactly one anion, the anion being a terminal O− (nitro,
// N-oxide, nitrone, nitrate), =N− (azide, diazo) or ≡C− (isonitrile).
const ChargeSeparatedGroups = "nitro, nitrate, N-oxides, nitrones, nitrile oxides, azides, diazo compounds and isonitriles"

// specColours makes one group per Spec class with one colour per valence
// state.
func (p *plan) specColours(f molecule.Formula, s *Spec) error {
	freeH, err := s.validate(f)
	if err != nil {
		return err
	}
	p.h = freeH
	p.rules = true
	p.allFixed = true
	for _, c := range s.Classes {
		if c.H == FreeH {
			p.allFixed = false
		}
	}
	first := make([]int, len(s.Classes))
	n := 0
	for i, c := range s.Classes {
		first[i] = n
		n += len(c.valences())
	}
	if n > maxColours {
		return &SpecError{Class: -1, Msg: fmt.Sprintf("%d colours (classes times valence states) exceed the limit of %d", n, maxColours)}
	}
	compile := func(fixedH bool, minDeg, maxDeg int, bonds BondPattern, vic Bound, nbrs []NeighbourRule, sum *NeighbourSum) *crule {
		r := &crule{fixedH: fixedH, bonds: bonds, vic: vic, sum: sum}
		if sum != nil {
			r.cHull = sum.Per[KindCarbonSP3]
			for _, k := range []NeighbourKind{KindCarbonC2, KindCarbonyl, KindCarbonSP} {
				r.cHull.Lo = min(r.cHull.Lo, sum.Per[k].Lo)
				r.cHull.Hi = max(r.cHull.Hi, sum.Per[k].Hi)
			}
		}
		if minDeg > 0 {
			r.minDeg = uint8(minDeg)
		}
		if maxDeg > 0 {
			r.maxDeg = uint8(maxDeg)
		}
		for _, nr := range nbrs {
			cn := cnbr{unsat: nr.Unsaturated, double: nr.Double, min: nr.Min, max: nr.Max}
			for _, k := range nr.Classes {
				for j := range s.Classes[k].valences() {
					cn.colours |= 1 << (first[k] + j)
				}
			}
			for _, e := range nr.Elements {
				cn.elements |= 1 << e
			}
			r.nbr = append(r.nbr, cn)
		}
		return r
	}
	for i, c := range s.Classes {
		g := group{count: c.Count}
		r := compile(c.H != FreeH, c.MinDegree, c.MaxDegree, c.Bonds, c.Vicinal, c.Neighbours, c.Sum)
		for _, sl := range c.Slots {
			g.slots = append(g.slots, compile(c.H != FreeH, sl.MinDegree, sl.MaxDegree, sl.Bonds, sl.Vicinal, sl.Neighbours, sl.Sum))
			g.slotCount = append(g.slotCount, sl.Count)
			p.slotted = true
		}
		for _, v := range c.valences() {
			hx := 0
			if c.H != FreeH {
				hx = c.H
			}
			p.colours = append(p.colours, colour{el: c.Element, val: v - hx, hx: hx, chg: c.Charge, group: i, rule: r})
			g.colours = append(g.colours, len(p.colours)-1)
		}
		p.groups = append(p.groups, g)
	}
	// Two classes sharing element, charge and hydrogen count may both fit
	// one atom.
	for i := range s.Classes {
		for j := i + 1; j < len(s.Classes); j++ {
			a, b := &s.Classes[i], &s.Classes[j]
			if a.Element == b.Element && a.Charge == b.Charge && (a.H == b.H || a.H == FreeH || b.H == FreeH) {
				p.ambiguous = true
			}
		}
	}
	return nil
}

// enumerateAssignments lists every split of each group's count over its
// colours that is neutral and gives a whole total bond order that a
// connected structure can have.
func (p *plan) enumerateAssignments() {
	var cur assignment
	var rec func(gi int)
	rec = func(gi int) {
		if gi == len(p.groups) {
			sum, chg := 0, 0
			for ci, c := range p.colours {
				sum += cur.count[ci] * c.val
				chg += cur.count[ci] * c.chg
			}
			if chg != 0 || (sum-p.h)%2 != 0 || sum < p.h {
				return
			}
			e := (sum - p.h) / 2
			if e < p.n-1 || e > 3*p.n*(p.n-1)/2 {
				return
			}
			a := cur
			a.e = e
			p.assigns = append(p.assigns, a)
			return
		}
		idx := p.groups[gi].colours
		var split func(j, left int)
		split = func(j, left int) {
			if j == len(idx)-1 {
				cur.count[idx[j]] = left
				rec(gi + 1)
				cur.count[idx[j]] = 0
				return
			}
			for k := left; k >= 0; k-- {
				cur.count[idx[j]] = k
				split(j+1, left-k)
			}
			cur.count[idx[j]] = 0
		}
		split(0, p.groups[gi].count)
	}
	rec(0)
}

// aug is one augmentation: a new atom of colour c bonded to att[:na] with
// orders ord[:na].
type aug struct {
	c   uint8
	na  uint8
	att [maxDeg]uint8
	ord [maxDeg]uint8
}

// level is the per-depth scratch of a worker.
type level struct {
	kids                    []aug
	gens                    [][MaxAtoms]uint8
	orbit                   [MaxAtoms]uint8
	trivial, tree, haveGens bool
	part                    partition
	orbitQ                  [][MaxAtoms]uint8
	// the parent's non-cut vertices, their (colour, bond-order sum) keys,
	// ncDeg[i] = degree of i if it is not a cut vertex (else 99), and
	// ncSuffix[i] = min ncDeg[j] over j >= i
	nc       []uint8
	ncKey    [MaxAtoms]uint16
	ncDeg    [MaxAtoms]uint8
	ncSuffix [MaxAtoms + 1]uint8
}

// searcher runs the depth-first canonical augmentation from a given node.
// One per goroutine.
type searcher struct {
	p      *plan
	m      mol
	cz     canonizer
	rem    [maxColours]int
	nrem   int // atoms still to add
	vrem   int // sum of valences of atoms still to add
	e      int // target total bond order
	b      int // current total bond order
	levels []level
	// emit receives each complete structure; false stops the search.
	emit    func(m *mol) bool
	stopped bool
	// poll is called every few thousand nodes; returning false stops.
	poll  func() bool
	nodes int
	// nodeCap, when positive, stops the current task after that many
	// nodes (Options.NodeLimit); truncated records that it did.
	nodeCap   int
	truncated bool
	covered   float64 // weight of finished subtrees (see Stats.Fraction)
	cut       [MaxAtoms]bool
	cutw      cutScratch
	res       canonResult
	distA     [MaxAtoms]int8
	distB     [MaxAtoms]int8
	// rule[x] is the compiled rule of atom x's colour (nil: none); done
	// marks a complete structure while its rules are tested.
	rule [MaxAtoms]*crule
	done bool
	// slot matching scratch (see slotsOK)
	slotAtoms []int
	slotOK    []bool
	slotFill  []int
	slotOf    []int
	slotSeen  []bool
	// slotHint[x] is the slot atom x took in the last matching found
	// (slotHintGroup[x] its group; −1: none), see slotsOK
	slotHint, slotHintGroup [MaxAtoms]int16
}

func newSearcher(p *plan) *searcher {
	s := &searcher{p: p, levels: make([]level, p.n+1)}
	s.slotOK = make([]bool, MaxAtoms*MaxAtoms)
	s.slotFill = make([]int, MaxAtoms)
	s.slotOf = make([]int, MaxAtoms)
	s.slotSeen = make([]bool, MaxAtoms)
	for i := range s.slotHint {
		s.slotHint[i], s.slotHintGroup[i] = -1, -1
	}
	s.cz.m = &s.m
	return s
}

// reset starts a new task: the single atom of colour root under
// assignment a, then the given augmentations.
func (s *searcher) reset(a int, root uint8, path []aug) {
	s.m = mol{}
	s.rem = s.p.assigns[a].count
	s.e = s.p.assigns[a].e
	s.b = 0
	s.nrem = s.p.n
	s.vrem = 0
	for ci, c := range s.p.colours {
		s.vrem += s.rem[ci] * c.val
	}
	s.pushAtom(root, nil, nil)
	for i := range path {
		a := &path[i]
		s.pushAtom(a.c, a.att[:a.na], a.ord[:a.na])
	}
}

func (s *searcher) pushAtom(c uint8, att, ord []uint8) {
	col := &s.p.colours[c]
	s.rule[s.m.n] = col.rule
	s.m.push(c, col.el, col.val, col.hx, col.chg, att, ord)
	s.rem[c]--
	s.nrem--
	s.vrem -= col.val
	for _, o := range ord {
		s.b += int(o)
	}
}

func (s *searcher) popAtom() {
	v := s.m.n - 1
	c := s.m.col[v]
	s.b -= int(s.m.bsum[v])
	s.m.pop()
	s.rem[c]++
	s.nrem++
	s.vrem += s.p.colours[c].val
}

// expand searches the subtree below the current structure; weight is the
// share of the whole search space this subtree stands for.
func (s *searcher) expand(weight float64) {
	if s.stopped {
		return
	}
	if s.m.n == s.p.n {
		if s.p.rules {
			s.done = true
			ok := s.allRulesOK()
			s.done = false
			if !ok {
				s.covered += weight
				return
			}
		}
		if !s.emit(&s.m) {
			s.stopped = true
		}
		s.covered += weight
		return
	}
	lv := &s.levels[s.m.n]
	lv.kids = s.children(lv.kids[:0])
	if s.stopped {
		return
	}
	if len(lv.kids) == 0 {
		s.covered += weight
		return
	}
	w := weight / float64(len(lv.kids))
	for i := 0; i < len(lv.kids) && !s.stopped; i++ {
		a := lv.kids[i]
		s.pushAtom(a.c, a.att[:a.na], a.ord[:a.na])
		s.expand(w)
		s.popAtom()
	}
}

// children returns the accepted augmentations of the current structure.
// When the children would be complete structures they are emitted
// instead and the returned slice stays empty.
func (s *searcher) children(kids []aug) []aug {
	s.nodes++
	if s.nodeCap > 0 && s.nodes > s.nodeCap {
		s.stopped = true
		s.truncated = true
		return kids
	}
	if s.nodes&1023 == 0 && s.poll != nil && !s.poll() {
		s.stopped = true
		return kids
	}
	k := s.m.n
	lv := &s.levels[k]
	F := 0
	for i := 0; i < k; i++ {
		F += s.m.free(i)
	}
	R := s.e - s.b
	if 2*R > F+s.vrem || F == 0 {
		return kids
	}
	if s.p.allFixed && F > s.vrem {
		// existing atoms never bond to each other again: their unused
		// capacity must all go to the atoms still to add
		return kids
	}
	if s.m.isTree() {
		// in a tree the non-cut vertices are the leaves
		for i := 0; i < k; i++ {
			s.cut[i] = s.m.deg[i] > 1
		}
	} else {
		s.m.articulation(&s.cut, &s.cutw)
	}
	lv.nc = lv.nc[:0]
	for i := 0; i < k; i++ {
		lv.ncDeg[i] = 99
		if !s.cut[i] {
			lv.nc = append(lv.nc, uint8(i))
			lv.ncDeg[i] = s.m.deg[i]
			lv.ncKey[i] = uint16(s.m.col[i])<<8 | uint16(s.m.bsum[i])
		}
	}
	lv.ncSuffix[k] = 99
	for i := k - 1; i >= 0; i-- {
		lv.ncSuffix[i] = min(lv.ncDeg[i], lv.ncSuffix[i+1])
	}
	// automorphisms of the parent
	cz := &s.cz
	cz.vertexKeys()
	cz.initPartition(&lv.part)
	lv.trivial = lv.part.ncells == k
	lv.tree = s.m.isTree()
	lv.haveGens = false
	lv.gens = lv.gens[:0]
	if !lv.trivial {
		if lv.tree {
			for i := 0; i < k; i++ {
				lv.orbit[i] = uint8(i)
			}
			for i := 0; i < k; i++ {
				c := lv.part.cellOf[i]
				// smallest vertex of the cell
				min := uint8(MaxAtoms)
				for j := int(c); j < int(lv.part.end[c]); j++ {
					if lv.part.lab[j] < min {
						min = lv.part.lab[j]
					}
				}
				lv.orbit[i] = min
			}
		} else {
			s.parentGroup(lv)
		}
	}
	final := k+1 == s.p.n
	var a aug
	for ci := range s.p.colours {
		if s.rem[ci] == 0 {
			continue
		}
		vc := s.p.colours[ci].val
		rp := s.nrem - 1
		vp := s.vrem - vc
		smin := max(1, R-vp)
		smax := min(vc, R-rp, F)
		if rp > 0 {
			smax = min(smax, (F+vc-1)/2)
		} else {
			smin = max(smin, R)
		}
		if smin > smax {
			continue
		}
		a.c = uint8(ci)
		kids = s.enumerate(kids, lv, &a, 0, 0, smin, smax, 99, final)
		if s.stopped {
			return kids
		}
	}
	return kids
}

// parentGroup computes the automorphism generators and orbits of the
// current structure into lv.
func (s *searcher) parentGroup(lv *level) {
	cz := &s.cz
	p := lv.part
	cz.search(&p, &s.res)
	lv.gens = append(lv.gens[:0], cz.gens...)
	lv.orbit = s.res.orbit
	lv.haveGens = true
}

// enumerate chooses bond orders from the new atom to atoms from..k-1, with
// sum bonds so far, and tests every complete choice whose sum lies in
// [smin, smax].
//
// skipMin is the smallest degree of a parent vertex below from that is
// not a cut vertex and was not chosen. Such a vertex keeps its degree,
// bond-order sum and non-cut status in the child (the child minus it is
// the parent minus it plus the new atom, bonded elsewhere), so if its
// degree is below the new atom's its canonical key is larger (the key
// starts with 8 − degree) and accept would reject the child: those
// branches are cut here before anything is built.
func (s *searcher) enumerate(kids []aug, lv *level, a *aug, from, sum, smin, smax, skipMin int, final bool) []aug {
	k := s.m.n
	if sum >= smin && min(skipMin, int(lv.ncSuffix[from])) >= int(a.na) {
		kids = s.try(kids, lv, a, sum, final)
		if s.stopped {
			return kids
		}
	}
	if sum == smax || int(a.na) == maxDeg {
		return kids
	}
	for i := from; i < k; i++ {
		if skipMin < int(a.na)+1 {
			break
		}
		f := s.m.free(i)
		if f > 0 && s.m.deg[i] < maxDeg {
			top := min(3, f, smax-sum)
			for o := 1; o <= top; o++ {
				a.att[a.na] = uint8(i)
				a.ord[a.na] = uint8(o)
				a.na++
				kids = s.enumerate(kids, lv, a, i+1, sum+o, smin, smax, skipMin, final)
				a.na--
				if s.stopped {
					return kids
				}
			}
		}
		skipMin = min(skipMin, int(lv.ncDeg[i]))
	}
	return kids
}

// try tests one augmentation.
func (s *searcher) try(kids []aug, lv *level, a *aug, sum int, final bool) []aug {
	if a.na == 0 {
		return kids
	}
	// An untouched non-cut vertex of the new atom's degree with a larger
	// (colour, bond-order sum) part also has a larger key (see enumerate).
	mine := uint16(a.c)<<8 | uint16(sum)
	for _, x := range lv.nc {
		if lv.ncDeg[x] != a.na || lv.ncKey[x] <= mine {
			continue
		}
		touched := false
		for j := 0; j < int(a.na); j++ {
			if a.att[j] == x {
				touched = true
				break
			}
		}
		if !touched {
			return kids
		}
	}
	if !lv.trivial && !s.augCanonical(lv, a) {
		return kids
	}
	s.pushAtom(a.c, a.att[:a.na], a.ord[:a.na])
	ok := true
	if s.p.rules {
		if final {
			s.done = true
			ok = s.allRulesOK()
			s.done = false
		} else {
			ok = s.rulesOK()
		}
	}
	ok = ok && s.accept()
	if ok {
		if final {
			if !s.emit(&s.m) {
				s.stopped = true
			}
		} else {
			kids = append(kids, *a)
		}
	}
	s.popAtom()
	return kids
}

// augCanonical reports whether a is the representative of its orbit
// under the parent's automorphism group: for a single bond, the bonded
// atom is the smallest of its orbit; otherwise the vector of bond orders
// indexed by atom is lexicographically largest in its orbit.
func (s *searcher) augCanonical(lv *level, a *aug) bool {
	if a.na == 1 {
		return lv.orbit[a.att[0]] == a.att[0]
	}
	if !lv.haveGens {
		s.parentGroup(lv)
	}
	if len(lv.gens) == 0 {
		return true
	}
	k := s.m.n
	var vec [MaxAtoms]uint8
	for i := 0; i < int(a.na); i++ {
		vec[a.att[i]] = a.ord[i]
	}
	lv.orbitQ = append(lv.orbitQ[:0], vec)
	for qi := 0; qi < len(lv.orbitQ); qi++ {
		cur := lv.orbitQ[qi]
		for gi := range lv.gens {
			g := &lv.gens[gi]
			var img [MaxAtoms]uint8
			for i := 0; i < k; i++ {
				if cur[i] != 0 {
					img[g[i]] = cur[i]
				}
			}
			// compare with vec
			c := 0
			for i := 0; i < k; i++ {
				if img[i] != vec[i] {
					if img[i] > vec[i] {
						c = 1
					} else {
						c = -1
					}
					break
				}
			}
			if c > 0 {
				return false
			}
			if c == 0 {
				continue
			}
			seen := false
			for j := range lv.orbitQ {
				if lv.orbitQ[j] == img {
					seen = true
					break
				}
			}
			if !seen {
				lv.orbitQ = append(lv.orbitQ, img)
			}
		}
	}
	return true
}

// coarseKey is the top part of canonizer.vertexKey.
func coarseKey(m *mol, x int) uint32 {
	return uint32(8-m.deg[x])<<16 | uint32(m.col[x])<<8 | uint32(m.bsum[x])
}

// accept reports whether the last atom of the current structure lies in
// the orbit of the canonical deletion vertex.
func (s *searcher) accept() bool {
	m := &s.m
	if m.isTree() {
		return s.acceptTree()
	}
	n := m.n
	v := n - 1
	cz := &s.cz
	// Compare keys cheaply first: the top part (degree, colour, bond-order
	// sum) without the neighbour hash. A vertex beats v if its key is
	// larger and it is not a cut vertex (leaves never are).
	cv := coarseKey(m, v)
	for x := 0; x < n-1; x++ {
		if coarseKey(m, x) > cv && !m.isCut(x) {
			return false
		}
	}
	// Vertices with v's coarse key have v's degree: leaves if v is one
	// (eligible), otherwise the cut vertices among them are not eligible.
	leafV := m.deg[v] == 1
	u := m.nb[v][0]
	kv := cz.vertexKey(v)
	tie := false
	s.cut[v] = false
	for x := 0; x < n-1; x++ {
		if coarseKey(m, x) != cv {
			continue
		}
		s.cut[x] = !leafV && m.isCut(x)
		if s.cut[x] {
			continue
		}
		kx := cz.vertexKey(x)
		if kx > kv {
			return false
		}
		// leaves on v's own neighbour with v's key are v's images under a
		// transposition, hence in v's orbit
		if kx == kv && !(leafV && m.nb[x][0] == u) {
			tie = true
		}
	}
	if !tie {
		return true
	}
	cz.vertexKeys()
	var p partition
	cz.initPartition(&p)
	// last cell containing an eligible vertex with key kv
	xs := -1
	for st := 0; st < n; st = int(p.end[st]) {
		u := p.lab[st]
		if cz.key[u] != kv {
			continue
		}
		for j := st; j < int(p.end[st]); j++ {
			if !s.cut[p.lab[j]] {
				xs = st
				break
			}
		}
	}
	if int(p.cellOf[v]) != xs {
		return false
	}
	elig := 0
	for j := xs; j < int(p.end[xs]); j++ {
		if !s.cut[p.lab[j]] {
			elig++
		}
	}
	if elig == 1 || m.isTree() {
		// in a tree the cells of the equitable partition are the orbits
		return true
	}
	cz.search(&p, &s.res)
	best := -1
	var bm uint8
	for j := xs; j < int(p.end[xs]); j++ {
		u := p.lab[j]
		if s.cut[u] {
			continue
		}
		if int(s.res.labels[u]) > best {
			best = int(s.res.labels[u])
			bm = u
		}
	}
	return s.res.orbit[bm] == s.res.orbit[v]
}

// acceptTree is accept for trees, where the new atom is a leaf and the
// eligible vertices are exactly the leaves. The deletion vertex is chosen
// by the key (coarse key, neighbour tuple, eccentricity), which is cheap to
// compare and separates most leaves before any refinement; in a tree the
// cells of the equitable partition are the automorphism orbits (colour
// refinement identifies vertex- and edge-coloured trees), so no search is
// needed.
func (s *searcher) acceptTree() bool {
	m := &s.m
	n := m.n
	v := n - 1
	cv := coarseKey(m, v)
	cz := &s.cz
	// Only leaves can have a coarse key as large as the leaf v's. A
	// leaf's neighbour hash is a function of its one neighbour; compare
	// the packed (degree, colour, bond-order sum, bond order) tuple of that
	// neighbour instead, which orders the same way for the tie test below
	// (equal tuples give equal hashes).
	u := m.nb[v][0]
	tv := leafTuple(m, v)
	tie := false
	for x := 0; x < n-1; x++ {
		if m.deg[x] != 1 {
			continue
		}
		if c := coarseKey(m, x); c != cv {
			if c > cv {
				return false
			}
			continue
		}
		tx := leafTuple(m, x)
		if tx > tv {
			return false
		}
		// leaves on v's own neighbour with v's bond order are v's images
		// under a transposition, hence in v's orbit
		if tx == tv && m.nb[x][0] != u {
			tie = true
		}
	}
	if !tie {
		return true
	}
	// eccentricities from the two ends of a diameter
	a := s.bfs(v, &s.distA)
	b := s.bfs(a, &s.distA)
	s.bfs(b, &s.distB)
	ecc := func(x int) uint64 { return uint64(max(s.distA[x], s.distB[x])) }
	ev := ecc(v)
	tie = false
	for x := 0; x < n-1; x++ {
		if m.deg[x] != 1 || coarseKey(m, x) != cv || leafTuple(m, x) != tv || m.nb[x][0] == u {
			continue
		}
		if ex := ecc(x); ex > ev {
			return false
		} else if ex == ev {
			tie = true
		}
	}
	if !tie {
		return true
	}
	for x := 0; x < n; x++ {
		var t uint64
		if m.deg[x] == 1 {
			t = uint64(leafTuple(m, x))
		} else {
			t = cz.vertexKey(x) & (1<<32 - 1)
		}
		cz.key[x] = uint64(coarseKey(m, x))<<40 | t<<8 | ecc(x)
	}
	var p partition
	cz.initPartition(&p)
	// leaves have the largest keys, so the last cell holds the deletion
	// vertex's orbit
	last := 0
	for st := 0; st < n; st = int(p.end[st]) {
		last = st
	}
	return int(p.cellOf[v]) == last
}

// leafTuple packs the neighbour of leaf x: degree, colour, bond-order
// sum, and the bond order to x.
func leafTuple(m *mol, x int) uint32 {
	u := m.nb[x][0]
	return uint32(m.deg[u])<<18 | uint32(m.col[u])<<10 | uint32(m.bsum[u])<<2 | uint32(m.bo[x][0])
}

// bfs fills dist with distances from src and returns a farthest vertex
// (level by level over bit masks).
func (s *searcher) bfs(src int, dist *[MaxAtoms]int8) int {
	m := &s.m
	reach := uint64(1) << uint(src)
	frontier := reach
	dist[src] = 0
	far := src
	for d := int8(1); ; d++ {
		var next uint64
		for f := frontier; f != 0; f &= f - 1 {
			next |= m.adj[bits.TrailingZeros64(f)]
		}
		next &^= reach
		if next == 0 {
			return far
		}
		for f := next; f != 0; f &= f - 1 {
			dist[bits.TrailingZeros64(f)] = d
		}
		far = bits.TrailingZeros64(next)
		reach |= next
		frontier = next
	}
}
