package infer

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"sort"
	"strings"

	"shiftrank/isomers"
	"shiftrank/molecule"
)

// variant is a choice of charge-separated groups for a reading: k N+
// atoms each bonded to one anion of element anion (O for nitro groups and
// N-oxides, N for azides and diazo compounds, C for isonitriles).
type variant struct {
	k     int
	anion molecule.Element
	logp  float64
}

// chargeVariants lists the charge-separated options the atoms left
// without hydrogens allow: none, or one or two N+ with their anions.
func (a *analysis) chargeVariants(parts []part) []variant {
	out := []variant{{logp: 0}}
	left := a.leftover(parts)
	n0 := left[molecule.N]
	if n0 == 0 {
		return out
	}
	// Priors: nitro compounds and N-oxides are common unknowns when the
	// formula has an N and two O left without H; azides, diazo compounds
	// and isonitriles are rare (common practice).
	if o0 := left[molecule.O]; o0 >= 1 {
		p := 0.12
		if o0 >= 2 {
			p = 0.35
		}
		out = append(out, variant{k: 1, anion: molecule.O, logp: math.Log(p)})
		if n0 >= 2 && o0 >= 4 {
			out = append(out, variant{k: 2, anion: molecule.O, logp: math.Log(p * 0.3)})
		}
	}
	if n0 >= 3 {
		out = append(out, variant{k: 1, anion: molecule.N, logp: math.Log(0.03)})
	}
	if left[molecule.C] >= 1 {
		out = append(out, variant{k: 1, anion: molecule.C, logp: math.Log(0.02)})
	}
	return out
}

// templateAtoms returns the hydrogen-free atoms pt's template adds to the
// part's own atoms — carbons and ring nitrogens — and how many of them are
// sp2.
func (pt part) templateAtoms() (c, n, sp2 int) {
	switch pt.tmpl {
	case tPhenyl:
		return 1, 0, 1
	case tPara, tOrtho:
		r := 2 * (pt.count / 4) // two substituted C per ring
		return r, 0, r
	case tPyridyl:
		return 1, 1, 2
	case tNaphthyl:
		return 3, 0, 3
	case tDisub:
		return 2, 0, 2
	case tGem:
		return 1, 0, 0
	case tTBu:
		return pt.count / 3, 0, 0
	}
	return 0, 0, 0
}

// leftover counts the heavy atoms the parts (and their templates) do not
// use: the atoms without hydrogens.
func (a *analysis) leftover(parts []part) [molecule.NumElements]int {
	var left [molecule.NumElements]int
	for e := molecule.H + 1; e < molecule.NumElements; e++ {
		left[e] = a.f.Count(e)
	}
	for _, pt := range parts {
		left[pt.el] -= pt.count
		c, n, _ := pt.templateAtoms()
		left[molecule.C] -= c
		left[molecule.N] -= n
	}
	return left
}

var heteroElements = []molecule.Element{molecule.N, molecule.O, molecule.S, molecule.F, molecule.Cl, molecule.Br, molecule.I, molecule.P, molecule.Si, molecule.B}

// build turns a decomposition into a Spec; relaxed keeps only hydrogen
// groups, hybridisation and shift windows. It returns the IDs of the
// constraints applied, or a nil Spec when the variant does not fit.
func (a *analysis) build(parts []part, v variant, relaxed bool) (*isomers.Spec, []string) {
	var s isomers.Spec
	ids := map[string]bool{HydrogenGroupsID: true}
	use := func(id string) bool {
		if id == "" || a.disabled[id] {
			return false
		}
		ids[id] = true
		return true
	}
	classOf := make([]int, len(parts))
	halogens := 0
	for _, e := range []molecule.Element{molecule.F, molecule.Cl, molecule.Br, molecule.I} {
		halogens += a.f.Count(e)
	}
	raise := raiseAllowance + raisePerHalogen*float64(min(halogens, maxHalogenAllowance))
	if v.k > 0 {
		raise += 0.35 // β-nitro raises an sp3 C–H by 0.5–0.7
	}
	type pending struct{ class, of int } // part indices
	var pairs []pending
	var templ []int
	cands := make([]isomers.Class, len(parts))
	own := make([]bool, len(parts))
	for pi, pt := range parts {
		c := isomers.Class{Element: pt.el, H: pt.h, Count: pt.count, Name: a.partName(pt)}
		switch pt.kind {
		case kSP3:
			if use(pt.shiftID) {
				c.Bonds = isomers.SingleBonds
				if pt.h >= 1 && pt.h <= 3 {
					base := baseShift[pt.h]
					c.Sum = &isomers.NeighbourSum{Per: alphaIncrements[pt.h],
						Target: isomers.Interval{Lo: pt.lo - base - raise - shiftTolerance, Hi: pt.hi - base + lowerAllowance + shiftTolerance}}
				}
			}
		case kSP2:
			if use(pt.shiftID) {
				c.Bonds = isomers.OneDouble
			}
			if !relaxed && pt.nextToN && use(pt.nextToNID) {
				c.Neighbours = append(c.Neighbours, isomers.NeighbourRule{Elements: []molecule.Element{molecule.N}, Min: 1, Max: isomers.Unbounded})
			}
		case kFormyl:
			if use(pt.shiftID) {
				c.Bonds = isomers.OneDouble
				c.Neighbours = append(c.Neighbours, isomers.NeighbourRule{Elements: []molecule.Element{molecule.O}, Double: true, Min: 1, Max: 1})
			}
		case kAlkyne:
			if use(pt.shiftID) {
				c.Bonds = isomers.OneTriple
			}
		case kMid:
			if use(pt.shiftID) {
				c.Neighbours = append(c.Neighbours, isomers.NeighbourRule{Elements: heteroElements, Unsaturated: true, Min: 1, Max: isomers.Unbounded})
			}
		case kExch:
			if pt.onUnsat && use(pt.onUnsatID) {
				c.Neighbours = append(c.Neighbours, isomers.NeighbourRule{Unsaturated: true, Min: 1, Max: isomers.Unbounded})
			}
		}
		if !relaxed && pt.vic.On && use(pt.vicID) {
			c.Vicinal = pt.vic
		}
		cands[pi] = c
		if !relaxed && pt.pair >= 0 && use(pt.pairID) {
			pairs = append(pairs, pending{class: pi, of: pt.pair})
			own[pi] = true
		}
		if !relaxed && pt.tmpl != tNone && use(pt.tmplID) {
			templ = append(templ, pi)
			own[pi] = true
		}
	}
	// Parts that other classes' rules refer to keep a class of their own;
	// the others become slots of one class per element and hydrogen count,
	// so that the search builds each structure once (see isomers.Slot).
	for pi := range parts {
		if own[pi] {
			classOf[pi] = len(s.Classes)
			s.Classes = append(s.Classes, cands[pi])
		}
	}
	pool := map[[2]int]int{}
	for pi, pt := range parts {
		if own[pi] {
			continue
		}
		c := cands[pi]
		k := [2]int{int(pt.el), pt.h}
		ci, ok := pool[k]
		if !ok {
			ci = len(s.Classes)
			pool[k] = ci
			s.Classes = append(s.Classes, isomers.Class{Element: pt.el, H: pt.h, Name: fmt.Sprintf("%sH%s", pt.el, hs(pt.h))})
		}
		pc := &s.Classes[ci]
		pc.Count += c.Count
		pc.Slots = append(pc.Slots, isomers.Slot{Name: c.Name, Count: c.Count, MinDegree: c.MinDegree, MaxDegree: c.MaxDegree,
			Bonds: c.Bonds, Vicinal: c.Vicinal, Neighbours: c.Neighbours, Sum: c.Sum})
		classOf[pi] = ci
	}
	for ci := range s.Classes {
		if c := &s.Classes[ci]; len(c.Slots) == 1 {
			// one slot: its rules are the class's
			sl := c.Slots[0]
			c.Name, c.MinDegree, c.MaxDegree, c.Bonds, c.Vicinal, c.Neighbours, c.Sum = sl.Name, sl.MinDegree, sl.MaxDegree, sl.Bonds, sl.Vicinal, sl.Neighbours, sl.Sum
			c.Slots = nil
		}
	}
	for _, p := range pairs {
		c := &s.Classes[classOf[p.class]]
		c.Neighbours = append(c.Neighbours, isomers.NeighbourRule{Classes: []int{classOf[p.of]}, Double: true, Min: 1, Max: 1})
	}
	left := a.leftover(parts)
	// template carbons without hydrogens: counted in left unless relaxed
	for _, pi := range templ {
		pt := parts[pi]
		ci := classOf[pi]
		switch pt.tmpl {
		case tPhenyl:
			ipso := len(s.Classes)
			s.Classes = append(s.Classes, isomers.Class{Name: "ipso C of the C6H5 ring", Element: molecule.C, H: 0, Count: 1, Bonds: isomers.OneDouble,
				Neighbours: []isomers.NeighbourRule{{Classes: []int{ci}, Min: 2, Max: 2}}})
			c := &s.Classes[ci]
			c.MaxDegree = 2
			c.Neighbours = append(c.Neighbours, isomers.NeighbourRule{Classes: []int{ci, ipso}, Min: 2, Max: 2})
		case tPara:
			ipso := len(s.Classes)
			s.Classes = append(s.Classes, isomers.Class{Name: "substituted C of the C6H4 ring", Element: molecule.C, H: 0, Count: 2, Bonds: isomers.OneDouble,
				Neighbours: []isomers.NeighbourRule{{Classes: []int{ci}, Min: 2, Max: 2}}})
			c := &s.Classes[ci]
			c.MaxDegree = 2
			c.Neighbours = append(c.Neighbours, isomers.NeighbourRule{Classes: []int{ci}, Min: 1, Max: 1}, isomers.NeighbourRule{Classes: []int{ipso}, Min: 1, Max: 1})
		case tOrtho:
			// Per ring: four CH in a row (two ends, two middles) and two
			// substituted carbons, each bonded to one end and to the
			// other substituted carbon (or, in a fused system such as
			// dibenzofuran, also to a substituted carbon of the other
			// ring): end–middle–middle–end between two substituted
			// carbons closes a six-membered ring.
			r := pt.count / 4
			mids, ipso := len(s.Classes), len(s.Classes)+1
			s.Classes[ci].Count = 2 * r
			s.Classes = append(s.Classes,
				isomers.Class{Name: "middle CH of the ortho C6H4 ring", Element: molecule.C, H: 1, Count: 2 * r, Bonds: isomers.OneDouble, MaxDegree: 2,
					Neighbours: []isomers.NeighbourRule{{Classes: []int{mids}, Min: 1, Max: 1}, {Classes: []int{ci}, Min: 1, Max: 1}}},
				isomers.Class{Name: "substituted C of the ortho C6H4 ring", Element: molecule.C, H: 0, Count: 2 * r, Bonds: isomers.OneDouble,
					Neighbours: []isomers.NeighbourRule{{Classes: []int{ci}, Min: 1, Max: 1}, {Classes: []int{ipso}, Min: 1, Max: 2}}})
			c := &s.Classes[ci]
			c.Name = "end CH of the ortho C6H4 ring"
			c.MaxDegree = 2
			c.Neighbours = append(c.Neighbours, isomers.NeighbourRule{Classes: []int{mids}, Min: 1, Max: 1}, isomers.NeighbourRule{Classes: []int{ipso}, Min: 1, Max: 1})
		case tPyridyl:
			// Six ring atoms each bonded to two others of the ring: four
			// CH, the ring N and the substituted C (2-, 3- or
			// 4-pyridyl: the readings do not fix which).
			n, ipso := len(s.Classes), len(s.Classes)+1
			s.Classes = append(s.Classes,
				isomers.Class{Name: "ring N of the pyridine ring", Element: molecule.N, H: 0, Count: 1, Bonds: isomers.OneDouble, MaxDegree: 2,
					Neighbours: []isomers.NeighbourRule{{Classes: []int{ci, ipso}, Min: 2, Max: 2}}},
				isomers.Class{Name: "substituted C of the pyridine ring", Element: molecule.C, H: 0, Count: 1, Bonds: isomers.OneDouble,
					Neighbours: []isomers.NeighbourRule{{Classes: []int{ci, n}, Min: 2, Max: 2}}})
			c := &s.Classes[ci]
			c.MaxDegree = 2
			c.Neighbours = append(c.Neighbours, isomers.NeighbourRule{Classes: []int{ci, n, ipso}, Min: 2, Max: 2})
		case tNaphthyl:
			// Ten ring atoms of a fused bicyclic: seven CH and the
			// substituted C with two ring neighbours, two fusion C with
			// three, bonded to each other (naphthalene; azulene also
			// fits, smaller rings fail the plausibility rules).
			fu, ipso := len(s.Classes), len(s.Classes)+1
			s.Classes = append(s.Classes,
				isomers.Class{Name: "fusion C of the bicyclic ring system", Element: molecule.C, H: 0, Count: 2, Bonds: isomers.OneDouble, MaxDegree: 3,
					Neighbours: []isomers.NeighbourRule{{Classes: []int{ci, fu, ipso}, Min: 3, Max: 3}, {Classes: []int{fu}, Min: 1, Max: 1}}},
				isomers.Class{Name: "substituted C of the bicyclic ring system", Element: molecule.C, H: 0, Count: 1, Bonds: isomers.OneDouble,
					Neighbours: []isomers.NeighbourRule{{Classes: []int{ci, fu}, Min: 2, Max: 2}}})
			c := &s.Classes[ci]
			c.MaxDegree = 2
			c.Neighbours = append(c.Neighbours, isomers.NeighbourRule{Classes: []int{ci, fu, ipso}, Min: 2, Max: 2})
		case tDisub:
			// Six ring atoms each bonded to two others of the ring: four
			// CH and two substituted C (ortho, meta or para: the
			// pattern did not tell).
			ipso := len(s.Classes)
			s.Classes = append(s.Classes, isomers.Class{Name: "substituted C of the C6H4 ring", Element: molecule.C, H: 0, Count: 2, Bonds: isomers.OneDouble,
				Neighbours: []isomers.NeighbourRule{{Classes: []int{ci, ipso}, Min: 2, Max: 2}}})
			c := &s.Classes[ci]
			c.MaxDegree = 2
			c.Neighbours = append(c.Neighbours, isomers.NeighbourRule{Classes: []int{ci, ipso}, Min: 2, Max: 2})
		case tGem:
			q := len(s.Classes)
			s.Classes = append(s.Classes, isomers.Class{Name: "quaternary C of the gem-dimethyl group", Element: molecule.C, H: 0, Count: 1, Bonds: isomers.SingleBonds,
				Neighbours: []isomers.NeighbourRule{{Classes: []int{ci}, Min: 2, Max: 2}}})
			c := &s.Classes[ci]
			c.Neighbours = append(c.Neighbours, isomers.NeighbourRule{Classes: []int{q}, Min: 1, Max: 1})
		case tTBu:
			q := len(s.Classes)
			s.Classes = append(s.Classes, isomers.Class{Name: "quaternary C of the tert-butyl group", Element: molecule.C, H: 0, Count: pt.count / 3, Bonds: isomers.SingleBonds,
				Neighbours: []isomers.NeighbourRule{{Classes: []int{ci}, Min: 3, Max: 3}}})
			c := &s.Classes[ci]
			c.Neighbours = append(c.Neighbours, isomers.NeighbourRule{Classes: []int{q}, Min: 1, Max: 1})
		}
	}
	if relaxed || len(templ) < countTemplates(parts) {
		// template carbons of unused templates go back to the plain pool
		for _, pt := range parts {
			if pt.tmpl == tNone {
				continue
			}
			used := false
			for _, pi := range templ {
				if parts[pi].tmplID == pt.tmplID {
					used = true
				}
			}
			if used {
				continue
			}
			c, n, _ := pt.templateAtoms()
			left[molecule.C] += c
			left[molecule.N] += n
		}
	}
	// charge-separated groups
	if v.k > 0 {
		if left[molecule.N] < v.k || left[v.anion] < v.k+map[bool]int{true: v.k, false: 0}[v.anion == molecule.N] {
			return nil, nil
		}
		cat := len(s.Classes)
		an := cat + 1
		s.Classes = append(s.Classes, isomers.Class{Name: "N+ of a charge-separated group", Element: molecule.N, Charge: 1, Valences: []int{4}, H: 0, Count: v.k,
			Neighbours: []isomers.NeighbourRule{{Classes: []int{an}, Min: 1, Max: 1}}})
		val := map[molecule.Element]int{molecule.O: 1, molecule.N: 2, molecule.C: 3}[v.anion]
		s.Classes = append(s.Classes, isomers.Class{Name: fmt.Sprintf("%s− bonded to N+", v.anion), Element: v.anion, Charge: -1, Valences: []int{val}, H: 0, Count: v.k, MaxDegree: 1,
			Neighbours: []isomers.NeighbourRule{{Classes: []int{cat}, Min: 1, Max: 1}}})
		left[molecule.N] -= v.k
		left[v.anion] -= v.k
	}
	for e := molecule.H + 1; e < molecule.NumElements; e++ {
		if left[e] < 0 {
			return nil, nil
		}
		if left[e] == 0 {
			continue
		}
		c := isomers.Class{Name: e.String() + " without H", Element: e, H: 0, Count: left[e]}
		if e == molecule.C && !relaxed {
			c.Slots = a.carbonSlots(parts, left[e], ids)
		}
		s.Classes = append(s.Classes, c)
	}
	var out []string
	for id := range ids {
		out = append(out, id)
	}
	sort.Strings(out)
	return &s, out
}

func countTemplates(parts []part) int {
	n := 0
	for _, pt := range parts {
		if pt.tmpl != tNone {
			n++
		}
	}
	return n
}

// partName names a part for its class.
func (a *analysis) partName(pt part) string {
	var what string
	switch pt.kind {
	case kSP2:
		what = fmt.Sprintf("sp2 CH%s", hs(pt.h))
	case kFormyl:
		what = "CHO"
	case kAlkyne:
		what = "≡CH"
	case kMid:
		what = fmt.Sprintf("CH%s", hs(pt.h))
	case kExch:
		what = fmt.Sprintf("%sH%s", pt.el, hs(pt.h))
	default:
		what = fmt.Sprintf("CH%s", hs(pt.h))
	}
	if len(pt.peaks) == 0 {
		return what + " (not observed)"
	}
	return fmt.Sprintf("%s of peak %s", what, strings.ReplaceAll(joinNums(a, pt.peaks), "-", ", "))
}

func hs(h int) string {
	if h == 1 {
		return ""
	}
	return fmt.Sprint(h)
}

// describe summarises a reading in one line.
func (a *analysis) describe(parts []part, v variant, relaxed bool) string {
	count := map[string]int{}
	var order []string
	add := func(k string, n int) {
		if _, ok := count[k]; !ok {
			order = append(order, k)
		}
		count[k] += n
	}
	for _, pt := range parts {
		switch pt.kind {
		case kSP2:
			add("sp2 CH"+hs(pt.h), pt.count)
		case kFormyl:
			add("CHO", pt.count)
		case kAlkyne:
			add("≡CH", pt.count)
		case kExch:
			add(pt.el.String()+"H"+hs(pt.h), pt.count)
		default:
			add("CH"+hs(pt.h), pt.count)
		}
		if relaxed {
			continue
		}
		switch pt.tmpl {
		case tPhenyl:
			add("C6H5 ring", 1)
		case tPara:
			add("para C6H4 ring", 1)
		case tOrtho:
			add("ortho C6H4 ring", pt.count/4)
		case tPyridyl:
			add("C5H4N ring", 1)
		case tNaphthyl:
			add("C10H7 ring system", 1)
		case tGem:
			add("C(CH3)2", 1)
		case tDisub:
			add("C6H4 ring", 1)
		case tTBu:
			add("tert-butyl", pt.count/3)
		}
	}
	slices.SortStableFunc(order, func(x, y string) int { return cmp.Compare(groupOrder(x), groupOrder(y)) })
	var b []string
	for _, k := range order {
		b = append(b, fmt.Sprintf("%s ×%d", k, count[k]))
	}
	if v.k > 0 {
		b = append(b, fmt.Sprintf("N+–%s− ×%d", v.anion, v.k))
	}
	mode := "strict"
	if relaxed {
		mode = "relaxed"
	}
	return strings.Join(b, ", ") + " (" + mode + ")"
}

// groupOrder sorts the groups of a reading's name: sp2 first, then CH3,
// CH2, CH, exchangeable, fragments.
func groupOrder(k string) int {
	for i, p := range []string{"CHO", "sp2 CH2", "sp2 CH", "≡CH", "CH3", "CH2", "CH", "OH", "NH2", "NH", "C6H5", "para", "tert"} {
		if strings.HasPrefix(k, p) {
			return i
		}
	}
	return 99
}
