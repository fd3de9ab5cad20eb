package isomers

import (
	"fmt"
	"strings"
	"sync"

	"shiftrank/molecule"
)

// Spec restricts a run to the structures whose heavy atoms can be divided
// into the given classes, each atom obeying its class's local rules. The
// classes together must hold exactly the formula's heavy atoms.
//
// The rules enter the canonical augmentation itself: every partial
// structure is tested after each added atom and dropped as soon as one of
// its atoms can no longer satisfy its class (too many neighbours, a bond
// of the wrong order, too many hydrogens next to it, or — once the atom and
// its neighbours are complete — too few). Each test is hereditary (if a
// partial structure fails it, so does everything built from it), so the
// pruning never loses a structure that satisfies the Spec, and the work
// grows with the constrained space rather than with the whole isomer space.
//
// A structure that can be divided into the classes in several ways (two
// classes of the same element and hydrogen count whose rules both fit one
// atom) is still emitted once: the run then keeps a set of the emitted
// structures' canonical forms (see Options.Seen).
type Spec struct {
	Classes []Class
}

// FreeH as Class.H lets the atoms of a class take any hydrogen count (the
// unused valence, as in an unconstrained run).
const FreeH = -1

// Unbounded as NeighbourRule.Max means no upper limit.
const Unbounded = -1

// Class is Count heavy atoms of one element with the same hydrogen count
// and the same local rules.
type Class struct {
	// Name says what the class stands for ("CH3 of peak 4"); for messages.
	Name    string
	Element molecule.Element
	// Valences lists the allowed valence states (bond-order sum plus
	// hydrogens); nil means all of the element's neutral valences. With
	// Charge ±1 it must be given.
	Valences []int
	// Charge is the formal charge of each atom: 0, or +1/−1 for the
	// charge-separated groups (see Options.ChargeSeparated).
	Charge int
	// H is the number of hydrogens on each atom, or FreeH.
	H     int
	Count int
	// MinDegree and MaxDegree bound the number of heavy-atom neighbours
	// (0 = no bound).
	MinDegree, MaxDegree int
	// Bonds restricts the orders of the atom's bonds.
	Bonds BondPattern
	// Vicinal bounds the hydrogens three bonds from each hydrogen of the
	// atom (the n+1 rule's coupling partners): Max counts hydrogens on
	// neighbouring carbons, leaving out aldehyde hydrogens (whose vicinal
	// couplings are 1–3 Hz and often unresolved); Min counts hydrogens on
	// every neighbour (N–H and O–H couplings are often seen in CDCl3) plus
	// fluorines on the atom and its neighbours.
	Vicinal Bound
	// Neighbours are rules on the atom's neighbours, all of which must hold.
	Neighbours []NeighbourRule
	// Sum, when not nil, bounds a sum over the atom's neighbours of an
	// interval per kind of neighbour (see NeighbourSum).
	Sum *NeighbourSum
	// Slots, when not empty, divide the class's atoms further: each atom
	// takes one slot (the slots' counts add up to Count) and obeys the
	// slot's rules as well as the class's. Unlike separate classes, slots
	// are not colours of the search: a structure is built once however
	// many ways its atoms could fill the slots, which the search tests as
	// a matching of atoms to slots after every step.
	Slots []Slot
}

// Slot is a part of a class with rules of its own (see Class.Slots). Its
// neighbour rules may not name classes.
type Slot struct {
	Name                 string
	Count                int
	MinDegree, MaxDegree int
	Bonds                BondPattern
	Vicinal              Bound
	Neighbours           []NeighbourRule
	Sum                  *NeighbourSum
}

// NeighbourKind classifies a neighbouring atom for NeighbourSum. A carbon
// is classified by its bonds: a triple bond or two double bonds make it
// KindCarbonSP; else a double bond to O, N or S KindCarbonyl; else a
// double bond to C KindCarbonC2 (alkene or aromatic carbon); else
// KindCarbonSP3. A nitrogen with a positive charge is KindNPlus.
type NeighbourKind uint8

// The neighbour kinds.
const (
	KindCarbonSP3 NeighbourKind = iota
	KindCarbonC2
	KindCarbonyl
	KindCarbonSP
	KindN
	KindNPlus
	KindO
	KindS
	KindF
	KindCl
	KindBr
	KindI
	KindP
	KindSi
	KindB
	NumKinds
)

// Interval is a closed range of reals.
type Interval struct{ Lo, Hi float64 }

// NeighbourSum requires that the interval sum over the atom's neighbours
// of Per[kind of the neighbour] intersect Target, once the atom is
// complete. A carbon neighbour whose kind may still change (it can take
// more bonds and has no triple bond) counts with the hull of the four
// carbon kinds' intervals. This expresses additive shift increments: with
// Per the range of the α-increment each kind of substituent gives and
// Target the observed shift minus the base value (widened for β and ring
// effects), a structure whose substituents cannot reach the observed shift
// is pruned.
type NeighbourSum struct {
	Per    [NumKinds]Interval
	Target Interval
}

// BondPattern restricts the orders of an atom's bonds.
type BondPattern uint8

// The bond patterns.
const (
	AnyBonds    BondPattern = iota
	SingleBonds             // sp3: single bonds only
	OneDouble               // sp2 in a chain or ring: exactly one double bond, no triple
	Unsaturated             // at least one double or triple bond
	OneTriple               // exactly one triple bond
)

var bondPatternNames = [...]string{"any bonds", "single bonds only", "exactly one double bond", "a double or triple bond", "exactly one triple bond"}

// String names the pattern.
func (b BondPattern) String() string {
	if int(b) < len(bondPatternNames) {
		return bondPatternNames[b]
	}
	return fmt.Sprintf("BondPattern(%d)", uint8(b))
}

// Bound is an inclusive range that applies only when On.
type Bound struct {
	On       bool
	Min, Max int
}

// NeighbourRule requires that between Min and Max (Unbounded: no limit)
// of an atom's neighbours match: a neighbour matches if it belongs to one
// of Classes (indices into Spec.Classes), or is one of Elements, or — when
// Unsaturated — carries a double or triple bond. The count is tested once
// the atom is complete; Max is tested all along.
type NeighbourRule struct {
	Classes     []int
	Elements    []molecule.Element
	Unsaturated bool
	// Double counts only neighbours joined to the atom by a double bond.
	Double   bool
	Min, Max int
}

// SpecError reports a Spec that cannot be used with a formula.
type SpecError struct {
	Class int // index of the class at fault, or −1 for the whole Spec
	Msg   string
}

// Error names the class and the problem.
func (e *SpecError) Error() string {
	if e.Class < 0 {
		return "isomers: spec: " + e.Msg
	}
	return fmt.Sprintf("isomers: spec class %d: %s", e.Class, e.Msg)
}

// crule is a class's rules compiled for the inner loop.
type crule struct {
	minDeg, maxDeg uint8
	bonds          BondPattern
	vic            Bound
	nbr            []cnbr
	sum            *NeighbourSum
	cHull          Interval // hull of the carbon kinds' intervals of sum
	fixedH         bool
}

type cnbr struct {
	colours  uint64 // colour indices
	elements uint32 // element bits
	unsat    bool
	double   bool
	min, max int
}

// validate checks s against f and returns the number of hydrogens not
// fixed by a class (to be carried by FreeH classes).
func (s *Spec) validate(f molecule.Formula) (freeH int, err error) {
	if len(s.Classes) == 0 {
		return 0, &SpecError{Class: -1, Msg: "no classes"}
	}
	var count [molecule.NumElements]int
	fixedH, free := 0, false
	for i, c := range s.Classes {
		if c.Element <= molecule.H || c.Element >= molecule.NumElements {
			return 0, &SpecError{Class: i, Msg: "not a heavy element"}
		}
		if c.Count <= 0 {
			return 0, &SpecError{Class: i, Msg: "count must be positive"}
		}
		if c.Charge != 0 && len(c.Valences) == 0 {
			return 0, &SpecError{Class: i, Msg: "a charged class must give its valence"}
		}
		if c.Charge < -1 || c.Charge > 1 {
			return 0, &SpecError{Class: i, Msg: "charge must be −1, 0 or +1"}
		}
		if c.H < FreeH {
			return 0, &SpecError{Class: i, Msg: "negative hydrogen count"}
		}
		for _, v := range c.valences() {
			if c.H > v {
				return 0, &SpecError{Class: i, Msg: fmt.Sprintf("%d hydrogens exceed valence %d", c.H, v)}
			}
		}
		for _, r := range c.Neighbours {
			for _, k := range r.Classes {
				if k < 0 || k >= len(s.Classes) {
					return 0, &SpecError{Class: i, Msg: fmt.Sprintf("neighbour rule names class %d of %d", k, len(s.Classes))}
				}
			}
			if r.Max >= 0 && r.Max < r.Min {
				return 0, &SpecError{Class: i, Msg: "neighbour rule with max below min"}
			}
		}
		if len(c.Slots) > 0 {
			n := 0
			for k, sl := range c.Slots {
				if sl.Count <= 0 {
					return 0, &SpecError{Class: i, Msg: fmt.Sprintf("slot %d: count must be positive", k)}
				}
				for _, r := range sl.Neighbours {
					if len(r.Classes) > 0 {
						return 0, &SpecError{Class: i, Msg: fmt.Sprintf("slot %d: a slot's neighbour rule may not name classes", k)}
					}
				}
				n += sl.Count
			}
			if n != c.Count {
				return 0, &SpecError{Class: i, Msg: fmt.Sprintf("slots hold %d atoms, the class %d", n, c.Count)}
			}
		}
		count[c.Element] += c.Count
		if c.H == FreeH {
			free = true
		} else {
			fixedH += c.H * c.Count
		}
	}
	for e := molecule.H + 1; e < molecule.NumElements; e++ {
		if count[e] != f.Count(e) {
			return 0, &SpecError{Class: -1, Msg: fmt.Sprintf("classes hold %d %s atoms, the formula %d", count[e], e, f.Count(e))}
		}
	}
	freeH = f.HydrogenCount() - fixedH
	switch {
	case freeH < 0:
		return 0, &SpecError{Class: -1, Msg: fmt.Sprintf("classes fix %d hydrogens, the formula has %d", fixedH, f.HydrogenCount())}
	case freeH > 0 && !free:
		return 0, &SpecError{Class: -1, Msg: fmt.Sprintf("classes fix %d hydrogens, the formula has %d, and no class takes the rest", fixedH, f.HydrogenCount())}
	}
	if len(s.Classes) > maxColours {
		return 0, &SpecError{Class: -1, Msg: fmt.Sprintf("%d classes exceed the limit of %d", len(s.Classes), maxColours)}
	}
	return freeH, nil
}

func (c *Class) valences() []int {
	if len(c.Valences) > 0 {
		return c.Valences
	}
	return c.Element.Valences()
}

// String describes the class in one line.
func (c Class) String() string {
	var b strings.Builder
	fmt.Fprintf(&b, "%d × %s", c.Count, c.Element)
	if c.H != FreeH {
		fmt.Fprintf(&b, "H%d", c.H)
	}
	if c.Charge > 0 {
		b.WriteString("+")
	} else if c.Charge < 0 {
		b.WriteString("−")
	}
	if c.Name != "" {
		fmt.Fprintf(&b, " (%s)", c.Name)
	}
	return b.String()
}

// complete reports whether atom x can take no further bond: its
// hydrogen count is fixed and its valence is used up, or the whole
// structure is complete.
func (s *searcher) complete(x int) bool {
	return s.done || (s.rule[x] != nil && s.rule[x].fixedH && s.m.free(x) == 0)
}

// multiples counts the double and triple bonds of atom x.
func (m *mol) multiples(x int) (doubles, triples int) {
	for k := 0; k < int(m.deg[x]); k++ {
		switch m.bo[x][k] {
		case 2:
			doubles++
		case 3:
			triples++
		}
	}
	return
}

// doubleToO reports whether atom x has a double bond to an oxygen.
func (m *mol) doubleToO(x int) bool {
	for k := 0; k < int(m.deg[x]); k++ {
		if m.bo[x][k] == 2 && m.el[m.nb[x][k]] == molecule.O {
			return true
		}
	}
	return false
}

// ruleOK tests the rules of atom x in the current partial structure; it is
// false only when no structure built from it can satisfy them.
func (s *searcher) ruleOK(x int) bool {
	return s.ruleOKWith(x, s.rule[x])
}

// ruleOKWith is ruleOK for rule r (a class's or a slot's).
func (s *searcher) ruleOKWith(x int, r *crule) bool {
	if r == nil {
		return true
	}
	m := &s.m
	if s.done && r.fixedH && m.free(x) != 0 {
		return false
	}
	deg := int(m.deg[x])
	if r.maxDeg > 0 && deg > int(r.maxDeg) {
		return false
	}
	cx := s.complete(x)
	if cx && deg < int(r.minDeg) {
		return false
	}
	if r.bonds != AnyBonds {
		d, t := m.multiples(x)
		switch r.bonds {
		case SingleBonds:
			if d+t > 0 {
				return false
			}
		case OneDouble:
			if d > 1 || t > 0 || cx && d == 0 {
				return false
			}
		case Unsaturated:
			if cx && d+t == 0 {
				return false
			}
		case OneTriple:
			if t > 1 || d > 0 || cx && t == 0 {
				return false
			}
		}
	}
	if r.vic.On {
		sure, all, allKnown := 0, 0, cx
		for k := 0; k < deg; k++ {
			u := int(m.nb[x][k])
			cu := s.complete(u)
			if !cu {
				allKnown = false
			}
			h := s.knownH(u, cu)
			if m.el[u] == molecule.C && h > 0 && !(h == 1 && (!cu || m.doubleToO(u))) {
				sure += h
			}
			all += h
			if cu && m.el[u] == molecule.F {
				all++
			}
			if cu {
				for j := 0; j < int(m.deg[u]); j++ {
					if w := m.nb[u][j]; int(w) != x && m.el[w] == molecule.F {
						all++
					}
				}
			}
		}
		if sure > r.vic.Max {
			return false
		}
		if allKnown && all < r.vic.Min {
			return false
		}
	}
	for i := range r.nbr {
		nr := &r.nbr[i]
		yes, maybe := 0, 0
		for k := 0; k < deg; k++ {
			u := int(m.nb[x][k])
			if nr.double && m.bo[x][k] != 2 {
				continue
			}
			switch {
			case nr.colours&(1<<m.col[u]) != 0 || nr.elements&(1<<m.el[u]) != 0:
				yes++
			case nr.unsat:
				if d, t := m.multiples(u); d+t > 0 {
					yes++
				} else if !s.complete(u) {
					maybe++
				}
			}
		}
		if nr.max >= 0 && yes > nr.max {
			return false
		}
		if cx && yes+maybe < nr.min {
			return false
		}
	}
	if r.sum != nil && cx {
		lo, hi := 0.0, 0.0
		for k := 0; k < deg; k++ {
			u := int(m.nb[x][k])
			iv := s.kindInterval(r, u)
			lo += iv.Lo
			hi += iv.Hi
		}
		if hi < r.sum.Target.Lo || lo > r.sum.Target.Hi {
			return false
		}
	}
	return true
}

// kindInterval returns the NeighbourSum interval of neighbour u: that of
// its kind, or for a carbon whose kind may still change the hull of the
// carbon kinds.
func (s *searcher) kindInterval(r *crule, u int) Interval {
	m := &s.m
	switch m.el[u] {
	case molecule.C:
		d, t := m.multiples(u)
		switch {
		case t > 0 || d > 1:
			return r.sum.Per[KindCarbonSP]
		case !s.complete(u):
			return r.cHull
		case d == 1:
			for k := 0; k < int(m.deg[u]); k++ {
				if m.bo[u][k] == 2 && m.el[m.nb[u][k]] != molecule.C {
					return r.sum.Per[KindCarbonyl]
				}
			}
			return r.sum.Per[KindCarbonC2]
		}
		return r.sum.Per[KindCarbonSP3]
	case molecule.N:
		if m.chg[u] > 0 {
			return r.sum.Per[KindNPlus]
		}
		return r.sum.Per[KindN]
	case molecule.O:
		return r.sum.Per[KindO]
	case molecule.S:
		return r.sum.Per[KindS]
	case molecule.F:
		return r.sum.Per[KindF]
	case molecule.Cl:
		return r.sum.Per[KindCl]
	case molecule.Br:
		return r.sum.Per[KindBr]
	case molecule.I:
		return r.sum.Per[KindI]
	case molecule.P:
		return r.sum.Per[KindP]
	case molecule.Si:
		return r.sum.Per[KindSi]
	case molecule.B:
		return r.sum.Per[KindB]
	}
	return Interval{}
}

// knownH returns the final hydrogen count of atom u when it is known (a
// fixed count, or u is complete), else 0.
func (s *searcher) knownH(u int, complete bool) int {
	if r := s.rule[u]; r != nil && r.fixedH {
		return int(s.m.hx[u])
	}
	if complete {
		return s.m.hcount(u)
	}
	return 0
}

// futureOK tests whether the incomplete atom x can still satisfy its rules
// with the atoms not yet added. In canonical augmentation a new atom bonds
// only to existing atoms, so every bond x still lacks must come from an
// atom still to be added: x needs as many of them (of the right classes)
// as its rules still require, and no more than its unused capacity.
func (s *searcher) futureOK(x int) bool {
	return s.futureOKWith(x, s.rule[x])
}

// futureOKWith is futureOK for rule r (a class's or a slot's).
func (s *searcher) futureOKWith(x int, r *crule) bool {
	if r == nil || s.complete(x) {
		return true
	}
	m := &s.m
	f := m.free(x)
	if !r.fixedH {
		// a free hydrogen count leaves the capacity open; only the
		// neighbour counts below apply
		f = min(f, 6)
	}
	nrem := s.nrem
	deg := int(m.deg[x])
	if need := int(r.minDeg) - deg; need > 0 && (need > f || need > nrem) {
		return false
	}
	if r.fixedH {
		switch r.bonds {
		case OneDouble:
			if d, _ := m.multiples(x); d == 0 && f < 2 {
				return false
			}
		case OneTriple:
			if _, t := m.multiples(x); t == 0 && f < 3 {
				return false
			}
		case Unsaturated:
			if d, t := m.multiples(x); d+t == 0 && f < 2 {
				return false
			}
		}
	}
	for i := range r.nbr {
		nr := &r.nbr[i]
		if nr.min == 0 {
			continue
		}
		have := 0
		for k := 0; k < deg; k++ {
			u := int(m.nb[x][k])
			if nr.double && m.bo[x][k] != 2 {
				continue
			}
			switch {
			case nr.colours&(1<<m.col[u]) != 0 || nr.elements&(1<<m.el[u]) != 0:
				have++
			case nr.unsat:
				if d, t := m.multiples(u); d+t > 0 || !s.complete(u) {
					have++
				}
			}
		}
		need := nr.min - have
		if need <= 0 {
			continue
		}
		per := 1
		if nr.double {
			per = 2
		}
		if need*per > f && r.fixedH {
			return false
		}
		avail := 0
		for ci := range s.p.colours {
			if s.rem[ci] == 0 {
				continue
			}
			c := &s.p.colours[ci]
			if nr.colours&(1<<ci) != 0 || nr.elements&(1<<c.el) != 0 || nr.unsat && c.val >= 2 {
				avail += s.rem[ci]
			}
		}
		if need > avail {
			return false
		}
	}
	if r.sum != nil && r.fixedH && f > 0 {
		lo, hi := 0.0, 0.0
		for k := 0; k < deg; k++ {
			iv := s.kindInterval(r, int(m.nb[x][k]))
			lo += iv.Lo
			hi += iv.Hi
		}
		// f more bond orders come from at least ceil(f/3) and at most f
		// new neighbours, each contributing within the hull of what the
		// atoms still to add can be
		fLo, fHi := 1e9, -1e9
		for ci := range s.p.colours {
			if s.rem[ci] == 0 {
				continue
			}
			iv := s.colourInterval(r, ci)
			fLo = min(fLo, iv.Lo)
			fHi = max(fHi, iv.Hi)
		}
		if fLo > fHi {
			return false
		}
		nMin, nMax := (f+2)/3, f
		hiAll := hi + float64(nMax)*max(fHi, 0) + float64(nMin)*min(fHi, 0)
		loAll := lo + float64(nMin)*max(fLo, 0) + float64(nMax)*min(fLo, 0)
		if hiAll < r.sum.Target.Lo || loAll > r.sum.Target.Hi {
			return false
		}
	}
	return true
}

// colourInterval is the NeighbourSum interval of an atom of colour ci not
// yet added: its element's, or the carbon hull.
func (s *searcher) colourInterval(r *crule, ci int) Interval {
	c := &s.p.colours[ci]
	switch c.el {
	case molecule.C:
		return r.cHull
	case molecule.N:
		if c.chg > 0 {
			return r.sum.Per[KindNPlus]
		}
		return r.sum.Per[KindN]
	}
	k, ok := elementKind[c.el]
	if !ok {
		return Interval{}
	}
	return r.sum.Per[k]
}

var elementKind = map[molecule.Element]NeighbourKind{
	molecule.O: KindO, molecule.S: KindS, molecule.F: KindF, molecule.Cl: KindCl, molecule.Br: KindBr,
	molecule.I: KindI, molecule.P: KindP, molecule.Si: KindSi, molecule.B: KindB,
}

// rulesOK tests the rules of the last atom, of the atoms bonded to it and
// of their neighbours (whose tests may depend on whether those atoms are
// complete), and whether every incomplete atom can still be completed
// (futureOK).
func (s *searcher) rulesOK() bool {
	m := &s.m
	v := m.n - 1
	if !s.ruleOK(v) {
		return false
	}
	for x := 0; x < m.n; x++ {
		if !s.futureOK(x) {
			return false
		}
	}
	if s.p.slotted && !s.slotsOK() {
		return false
	}
	for k := 0; k < int(m.deg[v]); k++ {
		u := int(m.nb[v][k])
		if !s.ruleOK(u) {
			return false
		}
		if !s.complete(u) {
			continue
		}
		for j := 0; j < int(m.deg[u]); j++ {
			if w := int(m.nb[u][j]); w != v && !s.ruleOK(w) {
				return false
			}
		}
	}
	return true
}

// allRulesOK tests every atom of a complete structure.
func (s *searcher) allRulesOK() bool {
	for x := 0; x < s.m.n; x++ {
		if !s.ruleOK(x) {
			return false
		}
	}
	return !s.p.slotted || s.slotsOK()
}

// slotsOK tests, for every class with slots, whether its atoms present
// can be matched to its slots (each slot taking at most its count) so
// that every atom can still satisfy its slot's rules.
//
// It first tries the last matching found (slotHint: consecutive partial
// structures share most of their atoms, and an atom usually keeps its
// slot), completed first-fit for atoms without a usable hint; that needs
// one rule test per atom instead of one per atom and slot. Any assignment
// it accepts is a valid matching, whatever the hint's origin, so only when
// it fails does the full matching (slotsMatch) decide.
func (s *searcher) slotsOK() bool {
	m := &s.m
	for gi := range s.p.groups {
		g := &s.p.groups[gi]
		ns := len(g.slots)
		if ns == 0 {
			continue
		}
		for k := 0; k < ns; k++ {
			s.slotFill[k] = 0
		}
		for x := 0; x < m.n; x++ {
			if s.p.colours[m.col[x]].group != gi {
				continue
			}
			if k := s.slotHint[x]; k >= 0 && int(s.slotHintGroup[x]) == gi && int(k) < ns && s.slotFill[k] < g.slotCount[k] && s.slotFits(x, g.slots[k]) {
				s.slotFill[k]++
				continue
			}
			found := false
			for k := 0; k < ns; k++ {
				if s.slotFill[k] < g.slotCount[k] && s.slotFits(x, g.slots[k]) {
					s.slotFill[k]++
					s.slotHint[x], s.slotHintGroup[x] = int16(k), int16(gi)
					found = true
					break
				}
			}
			if !found {
				return s.slotsMatch()
			}
		}
	}
	return true
}

// slotFits reports whether atom x satisfies, and can still satisfy, slot
// rule r.
func (s *searcher) slotFits(x int, r *crule) bool {
	return s.ruleOKWith(x, r) && s.futureOKWith(x, r)
}

// slotsMatch is slotsOK by a maximum bipartite matching of every slotted
// class's atoms to its slots, by augmenting paths (Kuhn's algorithm); it
// records the matching it finds in slotHint.
func (s *searcher) slotsMatch() bool {
	m := &s.m
	for gi := range s.p.groups {
		g := &s.p.groups[gi]
		if len(g.slots) == 0 {
			continue
		}
		atoms := s.slotAtoms[:0]
		for x := 0; x < m.n; x++ {
			if s.p.colours[m.col[x]].group == gi {
				atoms = append(atoms, x)
			}
		}
		s.slotAtoms = atoms
		if len(atoms) == 0 {
			continue
		}
		ns := len(g.slots)
		// compatibility
		for ai, x := range atoms {
			for k := 0; k < ns; k++ {
				r := g.slots[k]
				s.slotOK[ai*ns+k] = s.slotFits(x, r)
			}
		}
		for k := 0; k < ns; k++ {
			s.slotFill[k] = 0
		}
		for ai := range atoms {
			s.slotOf[ai] = -1
		}
		for ai := range atoms {
			for k := 0; k < ns; k++ {
				s.slotSeen[k] = false
			}
			if !s.augment(ai, g, ns, len(atoms)) {
				return false
			}
		}
		for ai, x := range atoms {
			s.slotHint[x], s.slotHintGroup[x] = int16(s.slotOf[ai]), int16(gi)
		}
	}
	return true
}

// augment finds an augmenting path from atom ai (see slotsOK).
func (s *searcher) augment(ai int, g *group, ns, na int) bool {
	for k := 0; k < ns; k++ {
		if !s.slotOK[ai*ns+k] || s.slotSeen[k] {
			continue
		}
		s.slotSeen[k] = true
		if s.slotFill[k] < g.slotCount[k] {
			s.slotFill[k]++
			s.slotOf[ai] = k
			return true
		}
		// try to move an atom holding slot k elsewhere
		for bj := 0; bj < na; bj++ {
			if s.slotOf[bj] == k && s.augment(bj, g, ns, na) {
				s.slotOf[ai] = k
				return true
			}
		}
	}
	return false
}

// Seen is a set of structures, by a 128-bit hash of their canonical key
// (molecule.Canonicalizer; Kekulé structures of one compound share it),
// safe for concurrent use. Share one between runs over different Specs of
// one formula so that a structure fitting several comes out once. Its
// memory grows by about 40 bytes per structure.
type Seen struct {
	mu sync.Mutex
	m  map[[16]byte]struct{}
}

// NewSeen returns an empty set.
func NewSeen() *Seen { return &Seen{m: map[[16]byte]struct{}{}} }

// Len returns the number of structures in the set.
func (s *Seen) Len() int {
	s.mu.Lock()
	defer s.mu.Unlock()
	return len(s.m)
}

// add inserts the structure whose canonical key hashes to key and reports
// whether it was new.
func (s *Seen) add(key [16]byte) bool {
	s.mu.Lock()
	defer s.mu.Unlock()
	if _, ok := s.m[key]; ok {
		return false
	}
	s.m[key] = struct{}{}
	return true
}
