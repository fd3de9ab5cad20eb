package infer

import (
	"fmt"
	"math"
	"slices"

	"shiftrank/molecule"
)

// This file finds the fragments a chemist reads from groups of peaks:
// vinyl groups, CH=CH pairs, benzene rings, =CH2 and geminal CH2 pairs,
// tert-butyl groups. Each becomes a unit whose first option is the
// fragment and whose second is the peaks read one by one.

// separately reads the peaks of a unit one by one (each peak's likeliest
// reading), the fallback option of a fragment unit.
func (a *analysis) separately(peaks []int, logp float64) option {
	var parts []part
	lp := logp
	for _, i := range peaks {
		opts := a.peakOptions(i)
		if len(opts) == 0 {
			return option{}
		}
		best := opts[0]
		for _, o := range opts[1:] {
			if o.logp > best.logp {
				best = o
			}
		}
		base := len(parts)
		for _, pt := range best.parts {
			if pt.pair >= 0 {
				pt.pair += base
			}
			parts = append(parts, pt)
		}
		lp += best.logp
	}
	return option{parts: parts, logp: lp, label: "separate", declines: true}
}

func (a *analysis) oneH(i int) bool { return a.n[i] == 1 }

// smallJOnly reports whether every reported coupling of peak i is at most
// max Hz (a singlet has none).
func (a *analysis) smallJOnly(i int, max float64) bool {
	p := a.peaks[i].Pattern
	if p.Kind == FirstOrder && len(p.Lines) > 0 && len(p.J) == 0 {
		return false
	}
	for _, j := range p.J {
		if j > max {
			return false
		}
	}
	return true
}

// vinylUnits finds CH=CH2 groups: a 1H alkene signal with a trans
// (12.5–18.5 Hz) and a smaller cis (4.5–12.5 Hz) coupling whose partners
// are two 1H signals in the =CH2 range, each carrying one of those
// couplings. An electronegative group on the =CH lowers both couplings
// and shields the =CH2: vinyl acetate J 14.0/6.3 Hz, ethyl vinyl ether
// 14.3/6.8 Hz with its =CH2 at 4.17/3.97, vinyl chloride 14.6/7.3
// (Pretsch et al., alkene tables; from memory).
func (a *analysis) vinylUnits(used []bool) []unit {
	var us []unit
	for v := range a.peaks {
		pv := a.peaks[v]
		if used[v] || !a.oneH(v) || pv.Lo < sp3Max || !pv.Pattern.resolved() {
			continue
		}
		trans := pv.Pattern.jIn(12.5, 18.5)
		cis := pv.Pattern.jIn(4.5, 12.5)
		if len(trans) == 0 || len(cis) == 0 || cis[0] >= trans[0]-2 {
			continue
		}
		find := func(j float64, not int) int {
			best, bd := -1, jMatch+1
			for k, p := range a.peaks {
				if k == v || k == not || used[k] || !a.oneH(k) || p.Lo < vinylCH2Min || p.Hi > methyleneMax {
					continue
				}
				for _, x := range p.Pattern.J {
					if d := math.Abs(x - j); d <= jMatch && d < bd {
						best, bd = k, d
					}
				}
			}
			return best
		}
		t := find(trans[0], -1)
		c := find(cis[0], t)
		if t < 0 || c < 0 {
			if u, ok := a.vinylWithMultiplet(v, trans[0], cis[0], used); ok {
				us = append(us, u)
			}
			continue
		}
		used[v], used[t], used[c] = true, true, true
		peaks := []int{v, t, c}
		id := fmt.Sprintf("vinyl-%d", pv.Number)
		u := unit{peaks: peaks}
		if a.constraint(id, "vinyl group", fmt.Sprintf("peaks %d, %d and %d (δ %.2f, %.2f, %.2f) couple with J %.1f (trans) and %.1f Hz (cis): a CH=CH2 group",
			pv.Number, a.peaks[t].Number, a.peaks[c].Number, pv.Shift, a.peaks[t].Shift, a.peaks[c].Shift, trans[0], cis[0]), peaks, fragmentConfidence) {
			ch := a.withShift(a.withCoupling(a.basePart(v, molecule.C, 1, 1, kSP2), v))
			ch.pair, ch.pairID = 1, id
			ch2 := part{el: molecule.C, h: 2, count: 1, kind: kSP2, peaks: []int{t, c}, lo: min(a.peaks[t].Lo, a.peaks[c].Lo), hi: max(a.peaks[t].Hi, a.peaks[c].Hi), pair: 0, pairID: id}
			ch2 = a.withShift(ch2)
			ch2 = a.splitCoupling(ch2, []int{t, c}, 3.5, vicinalSP2)
			u.opts = append(u.opts, option{parts: []part{ch, ch2}, logp: math.Log(fragmentConfidence), label: "vinyl"})
		}
		if o := a.separately(peaks, math.Log(1-fragmentConfidence)); len(o.parts) > 0 {
			u.opts = append(u.opts, o)
		}
		us = append(us, u)
	}
	return us
}

// splitCoupling sets the vicinal bounds of a CH2 whose two hydrogens give
// the signals idx: each hydrogen's partners less the geminal one (its
// coupling is at most gemMax Hz for =CH2, or within the geminal range for
// sp3 CH2), bounded below by the partners coupled with J ≥ vicMin.
func (a *analysis) splitCoupling(pt part, idx []int, gemMax, vicMin float64) part {
	lo, hi := 0, 99
	for _, i := range idx {
		p := a.peaks[i].Pattern
		if !p.resolved() {
			return pt
		}
		gem := 0
		if gemMax < geminalMin {
			if len(p.jIn(0, gemMax)) > 0 {
				gem = 1
			}
		} else if len(p.jIn(geminalMin, geminalMax)) > 0 {
			gem = 1
		}
		max := p.partners() - gem
		min, known := p.partnersAbove(vicMin)
		if known && gemMax >= geminalMin {
			min -= len(p.jIn(geminalMin, geminalMax))
		}
		if !known {
			min = 0
		}
		lo = maxInt(lo, min)
		hi = minInt(hi, max)
	}
	if lo > hi || hi < 0 {
		return pt
	}
	id := fmt.Sprintf("peaks-%s-coupling", joinNums(a, idx))
	if a.constraint(id, "coupling partners", fmt.Sprintf("peaks %s are the two hydrogens of one CH2; apart from their geminal coupling they are split by %d–%d hydrogens on the neighbouring atoms", joinNums(a, idx), lo, hi), idx, patternConfidenceSP2) {
		pt.vic.On, pt.vic.Min, pt.vic.Max = true, lo, hi
		pt.vicID = id
	}
	return pt
}

func maxInt(a, b int) int { return max(a, b) }
func minInt(a, b int) int { return min(a, b) }

// alkenePairUnits finds CH=CH pairs: two 1H signals at alkene or aromatic
// shifts sharing a coupling of at least alkenePairMin Hz (cis or trans
// alkene; aromatic ortho couplings stay below 9.5 Hz).
func (a *analysis) alkenePairUnits(used []bool) []unit {
	var us []unit
	for i := range a.peaks {
		pi := a.peaks[i]
		if used[i] || !a.oneH(i) || pi.Lo < sp3Max || !pi.Pattern.resolved() || a.region(i) == kFormyl || a.region(i) == kExch {
			continue
		}
		for _, j := range pi.Pattern.jIn(alkenePairMin, geminalMax) {
			best, bd := -1, jMatch+1
			for k, pk := range a.peaks {
				if k == i || used[k] || !a.oneH(k) || pk.Lo < sp3Max || !pk.Pattern.resolved() || a.region(k) == kFormyl || a.region(k) == kExch {
					continue
				}
				for _, x := range pk.Pattern.J {
					if d := math.Abs(x - j); d <= jMatch && d < bd {
						best, bd = k, d
					}
				}
			}
			if best < 0 {
				continue
			}
			k := best
			used[i], used[k] = true, true
			peaks := []int{i, k}
			id := fmt.Sprintf("alkene-%d-%d", pi.Number, a.peaks[k].Number)
			kind := "trans (E)"
			if j < 13 {
				kind = "cis (Z)"
			}
			u := unit{peaks: peaks}
			if a.constraint(id, "1,2-disubstituted alkene", fmt.Sprintf("peaks %d and %d (δ %.2f, %.2f) share J = %.1f Hz, a %s alkene coupling: a CH=CH group",
				pi.Number, a.peaks[k].Number, pi.Shift, a.peaks[k].Shift, j, kind), peaks, fragmentConfidence) {
				x := a.withShift(a.withCoupling(a.basePart(i, molecule.C, 1, 1, kSP2), i))
				y := a.withShift(a.withCoupling(a.basePart(k, molecule.C, 1, 1, kSP2), k))
				x.pair, x.pairID = 1, id
				y.pair, y.pairID = 0, id
				u.opts = append(u.opts, option{parts: []part{x, y}, logp: math.Log(0.92), label: "CH=CH"})
			}
			if o := a.separately(peaks, math.Log(0.08)); len(o.parts) > 0 {
				u.opts = append(u.opts, o)
			}
			us = append(us, u)
			break
		}
	}
	return us
}

// ringUnits reads the aromatic signals left over as benzene rings where
// the count and pattern are clear: 5 H (one monosubstituted ring), 10 H
// (two), or two 2H doublets with an ortho coupling (a para-disubstituted
// ring, the AA'BB' pattern).
func (a *analysis) ringUnits(used []bool) []unit {
	var ar []int
	total := 0
	for i, p := range a.peaks {
		if used[i] || p.Lo < aromaticMin || p.Pattern.Broad || a.region(i) == kFormyl || a.region(i) == kExch {
			continue
		}
		ar = append(ar, i)
		total += a.n[i]
	}
	if len(ar) == 0 {
		return nil
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, i := range ar {
		lo = math.Min(lo, a.peaks[i].Lo)
		hi = math.Max(hi, a.peaks[i].Hi)
	}
	ring := func(count int, t template, name, reason string, conf float64) []unit {
		id := name
		u := unit{peaks: ar}
		if a.constraint(id, name, reason, ar, conf) {
			var parts []part
			per := 5
			switch t {
			case tPara, tOrtho, tPyridyl, tDisub:
				per = 4
			case tNaphthyl:
				per = 7
			}
			if t == tOrtho {
				// equivalent rings share one class (a symmetric molecule)
				per, count = 4*count, 1
			}
			for r := 0; r < count; r++ {
				pt := part{el: molecule.C, h: 1, count: per, kind: kSP2, peaks: ar, lo: lo, hi: hi, pair: -1, tmpl: t, tmplID: id}
				parts = append(parts, a.withShift(pt))
			}
			u.opts = append(u.opts, option{parts: parts, logp: math.Log(conf), label: name})
		}
		if o := a.separately(ar, math.Log(1-conf)); len(o.parts) > 0 {
			u.opts = append(u.opts, o)
		}
		for _, i := range ar {
			used[i] = true
		}
		return []unit{u}
	}
	nums := joinNums(a, ar)
	ringN := a.nextToRingN(ar) // a C–H next to a ring N, or −1
	switch {
	case total == 5 && a.f.Count(molecule.C) >= 6:
		return ring(1, tPhenyl, "monosubstituted-benzene",
			fmt.Sprintf("5 aromatic hydrogens (peaks %s, δ %s): a monosubstituted benzene ring C6H5–", nums, rangeText(lo, hi)), 0.85)
	case total == 10 && a.f.Count(molecule.C) >= 12:
		return ring(2, tPhenyl, "two-monosubstituted-benzenes",
			fmt.Sprintf("10 aromatic hydrogens (peaks %s, δ %s): two monosubstituted benzene rings", nums, rangeText(lo, hi)), 0.7)
	case total == 4 && len(ar) == 2 && a.n[ar[0]] == 2 && a.n[ar[1]] == 2 && a.f.Count(molecule.C) >= 6 && a.paraPattern(ar):
		return ring(1, tPara, "para-disubstituted-benzene",
			fmt.Sprintf("two 2H doublets with an ortho coupling (peaks %s, δ %s): a para-disubstituted benzene ring –C6H4– (AA'BB')", nums, rangeText(lo, hi)), 0.85)
	case total == 8 && a.f.Count(molecule.C) >= 12 && a.symmetricBenzoMultiplets(ar):
		return ring(2, tOrtho, "ortho-disubstituted-benzene",
			fmt.Sprintf("8 aromatic hydrogens (peaks %s, δ %s) in signals of 2 or 4 H, partly unresolved multiplets: two equivalent benzo rings –C6H4– (a symmetric dibenzo-fused system)", nums, rangeText(lo, hi)), 0.6)
	case total == 7 && a.f.Count(molecule.C) >= 10 && a.f.DBE() >= 7 && lo >= naphthylMin:
		return ring(1, tNaphthyl, "monosubstituted-naphthalene",
			fmt.Sprintf("7 aromatic hydrogens (peaks %s, δ %s) with a DBE of %d: a monosubstituted naphthalene-type bicyclic ring system C10H7–", nums, rangeText(lo, hi), a.f.DBE()), 0.6)
	case total == 4 && a.f.Count(molecule.C) >= 5 && a.f.Count(molecule.N) >= 1 && ringN >= 0:
		i := ringN
		return ring(1, tPyridyl, "monosubstituted-pyridine",
			fmt.Sprintf("4 aromatic hydrogens (peaks %s, δ %s), one far downfield with the small ortho coupling of a C–H next to a ring N (peak %d, δ %.2f): a monosubstituted pyridine ring C5H4N– (2-, 3- or 4-pyridyl)", nums, rangeText(lo, hi), a.peaks[i].Number, a.peaks[i].Shift), 0.75)
	case (total == 4 || total == 8) && a.f.Count(molecule.C) >= 6*(total/4) && a.orthoPattern(ar, total/4):
		what := "an ortho-disubstituted benzene ring –C6H4– (or a benzo ring fused at one bond)"
		if total == 8 {
			what = "two equivalent ortho-disubstituted benzene rings (or benzo rings fused at one bond)"
		}
		return ring(total/4, tOrtho, "ortho-disubstituted-benzene",
			fmt.Sprintf("%d aromatic hydrogens (peaks %s, δ %s) with two ortho partners on half of them and one on the others: %s", total, nums, rangeText(lo, hi), what), 0.75)
	case total == 4 && a.f.Count(molecule.C) >= 6 && a.f.DBE() >= 4 && lo >= benzeneMin && hi <= benzeneMax:
		return ring(1, tDisub, "disubstituted-benzene",
			fmt.Sprintf("4 aromatic hydrogens (peaks %s, δ %s) in the benzene range: a disubstituted benzene ring –C6H4– (ortho, meta or para; the pattern does not tell)", nums, rangeText(lo, hi)), 0.6)
	}
	return nil
}

// nextToRingN returns the first of the aromatic peaks ar that reads as the
// C–H next to a ring nitrogen — far downfield (ringNMinShift–ringNMaxShift)
// with a coupling of ringNJLo–pyridylJHi Hz (pyridine J(2,3) 4.5–5.0,
// 4-substituted pyridines up to 6; Pretsch, Bühlmann, Badertscher,
// Structure Determination of Organic Compounds, from memory) — or −1.
func (a *analysis) nextToRingN(ar []int) int {
	for _, i := range ar {
		p := a.peaks[i]
		if p.Lo < ringNMinShift || p.Hi > ringNMaxShift || p.Pattern.Broad {
			continue
		}
		for _, j := range p.Pattern.J {
			if j >= ringNJLo && j <= pyridylJHi {
				return i
			}
		}
	}
	return -1
}

// symmetricBenzoMultiplets reports whether 8 aromatic hydrogens come as
// signals of 2 or 4 H (a molecule with two equivalent halves), at least
// one an unresolved multiplet, none a singlet, and not all doublets (the
// pattern of two para rings): the usual report of a symmetric
// dibenzo-fused system such as carbazole or dibenzothiophene, whose
// rings' AB-type multiplets overlap (common practice).
func (a *analysis) symmetricBenzoMultiplets(ar []int) bool {
	multiplets, doublets := 0, 0
	for _, i := range ar {
		p := a.peaks[i].Pattern
		if a.n[i] != 2 && a.n[i] != 4 || p.singlet() || p.Broad {
			return false
		}
		switch {
		case p.Kind == Multiplet:
			multiplets++
		case slices.Equal(p.Lines, []int{2}):
			doublets++
		}
	}
	return multiplets > 0 && doublets < len(ar)
}

// orthoPattern reports whether the aromatic signals look like rings of
// four adjacent CH (rings equivalent C6H4 rings of an ortho-disubstituted
// or benzo-fused system): per ring, two hydrogens with one ortho coupling
// (d, dd, ddd with one J of 6.5–9.5 Hz) and two with two (t, td, dd or ddd
// with two such J), as 1H signals, or as 2H signals of a symmetric ring
// (each ring's halves equivalent); or, for one ring, the two 2H
// multiplets or dd of the symmetric AA'BB' pattern that is not a pair of
// doublets (that is the para ring). Common practice (Pretsch, Bühlmann,
// Badertscher, Structure Determination of Organic Compounds: ortho
// 6.5–9 Hz, meta 1–3 Hz).
func (a *analysis) orthoPattern(ar []int, rings int) bool {
	if rings == 1 && len(ar) == 2 && a.n[ar[0]] == 2 && a.n[ar[1]] == 2 {
		for _, i := range ar {
			p := a.peaks[i].Pattern
			symmetric := p.Kind == Multiplet || slices.Equal(p.Lines, []int{2, 2}) && len(p.jIn(orthoJMin, orthoJMax)) <= 1
			if !symmetric || p.Broad {
				return false
			}
		}
		return true
	}
	ends, middles := 0, 0
	for _, i := range ar {
		p := a.peaks[i].Pattern
		if !p.resolved() || len(p.J) == 0 || len(p.J) != len(p.Lines) {
			return false
		}
		ortho := 0
		for k, j := range p.J {
			if j >= orthoJMin && j <= orthoJMax {
				ortho += p.Lines[k] - 1
			}
		}
		per := a.n[i] / rings
		if a.n[i]%rings != 0 || per > 2 {
			return false
		}
		switch ortho {
		case 1:
			ends += per
		case 2:
			middles += per
		default:
			return false
		}
	}
	return ends == 2 && middles == 2
}

// paraPattern reports whether the two 2H signals look like the AA'BB'
// doublets of a para-disubstituted ring: each a doublet with an ortho
// coupling (with fluorine in the formula a triplet or dd from H–F
// coupling is accepted for one of them).
func (a *analysis) paraPattern(ar []int) bool {
	doublets := 0
	for _, i := range ar {
		p := a.peaks[i].Pattern
		if !p.resolved() {
			return false
		}
		if slices.Equal(p.Lines, []int{2}) && (len(p.J) == 0 || len(p.jIn(paraJMin, paraJMax)) > 0) {
			doublets++
		}
	}
	return doublets == 2 || doublets == 1 && a.f.Count(molecule.F) > 0
}

// methyleneUnits pairs two 1H signals at 4.5–5.3 ppm without a large
// coupling, read as the two hydrogens of a terminal =CH2 (1,1-disubstituted
// alkene: 4.6–5.0).
func (a *analysis) methyleneUnits(used []bool) []unit {
	var cand []int
	for i, p := range a.peaks {
		if used[i] || !a.oneH(i) || p.Lo < methyleneMin || p.Hi > 5.3 || p.Pattern.Broad || !a.smallJOnly(i, 3.5) {
			continue
		}
		cand = append(cand, i)
	}
	if len(cand) != 2 {
		return nil
	}
	x, y := cand[0], cand[1]
	used[x], used[y] = true, true
	peaks := []int{x, y}
	id := fmt.Sprintf("methylene-%d-%d", a.peaks[x].Number, a.peaks[y].Number)
	u := unit{peaks: peaks}
	if a.constraint(id, "terminal methylene", fmt.Sprintf("peaks %d and %d (δ %.2f, %.2f), 1H each with no large coupling: the two hydrogens of a =CH2",
		a.peaks[x].Number, a.peaks[y].Number, a.peaks[x].Shift, a.peaks[y].Shift), peaks, 0.7) {
		pt := part{el: molecule.C, h: 2, count: 1, kind: kSP2, peaks: peaks, lo: min(a.peaks[x].Lo, a.peaks[y].Lo), hi: max(a.peaks[x].Hi, a.peaks[y].Hi), pair: -1}
		u.opts = append(u.opts, option{parts: []part{a.withShift(pt)}, logp: math.Log(0.7), label: "=CH2"})
	}
	if o := a.separately(peaks, math.Log(0.3)); len(o.parts) > 0 {
		u.opts = append(u.opts, o)
	}
	return []unit{u}
}

// geminalUnits pairs two 1H sp3 signals sharing a geminal coupling
// (10.5–19 Hz) as the two hydrogens of one CH2 (diastereotopic, as in
// rings and next to stereocentres).
func (a *analysis) geminalUnits(used []bool) []unit {
	var us []unit
	for i := range a.peaks {
		pi := a.peaks[i]
		if used[i] || !a.oneH(i) || a.region(i) != kSP3 || !pi.Pattern.resolved() {
			continue
		}
		for _, j := range pi.Pattern.jIn(geminalMin, geminalMax) {
			best, bd := -1, jMatch+1
			for k, pk := range a.peaks {
				if k == i || used[k] || !a.oneH(k) || a.region(k) != kSP3 || !pk.Pattern.resolved() || math.Abs(pk.Shift-pi.Shift) > 1.2 {
					continue
				}
				for _, x := range pk.Pattern.J {
					if d := math.Abs(x - j); d <= jMatch && d < bd {
						best, bd = k, d
					}
				}
			}
			if best < 0 {
				continue
			}
			k := best
			used[i], used[k] = true, true
			peaks := []int{i, k}
			id := fmt.Sprintf("geminal-%d-%d", pi.Number, a.peaks[k].Number)
			u := unit{peaks: peaks}
			if a.constraint(id, "diastereotopic CH2", fmt.Sprintf("peaks %d and %d (δ %.2f, %.2f) share J = %.1f Hz, a geminal coupling: the two hydrogens of one CH2",
				pi.Number, a.peaks[k].Number, pi.Shift, a.peaks[k].Shift, j), peaks, 0.85) {
				pt := part{el: molecule.C, h: 2, count: 1, kind: kSP3, peaks: peaks, lo: min(pi.Lo, a.peaks[k].Lo), hi: max(pi.Hi, a.peaks[k].Hi), pair: -1}
				pt = a.withShift(pt)
				pt = a.splitCoupling(pt, peaks, geminalMax, vicinalSP3)
				u.opts = append(u.opts, option{parts: []part{pt}, logp: math.Log(0.85), label: "CH2 (2 signals)"})
			}
			if o := a.separately(peaks, math.Log(0.15)); len(o.parts) > 0 {
				u.opts = append(u.opts, o)
			}
			us = append(us, u)
			break
		}
	}
	return us
}

// poolUnit gathers the unresolved 1H signals of the sp3 region: any two of
// them may be the hydrogens of one CH2 (diastereotopic CH2 groups of
// rings give two multiplets), so the unit's options hold j CH2 and k−2j
// CH for each j, over the pool's shift range.
func (a *analysis) poolUnit(used []bool) []unit {
	var pool []int
	for i, p := range a.peaks {
		if used[i] || !a.oneH(i) || a.region(i) != kSP3 || p.Pattern.Broad || p.Pattern.singlet() {
			continue
		}
		pool = append(pool, i)
	}
	if len(pool) < 2 {
		for _, i := range pool {
			used[i] = false
		}
		return nil
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, i := range pool {
		used[i] = true
		lo = math.Min(lo, a.peaks[i].Lo)
		hi = math.Max(hi, a.peaks[i].Hi)
	}
	u := unit{peaks: pool}
	k := len(pool)
	id := fmt.Sprintf("peaks-%s-shift", joinNums(a, pool))
	a.constraint(id, "shift window", fmt.Sprintf("δ %s: unresolved 1H multiplets of sp3 C–H (two of them may be one CH2)", rangeText(lo, hi)), pool, shiftWindowConfidence)
	for j := k / 2; j >= 0; j-- {
		var parts []part
		if j == 0 {
			// every signal its own CH, with its own window and couplings
			for _, i := range pool {
				parts = append(parts, a.withShift(a.withCoupling(a.basePart(i, molecule.C, 1, 1, kSP3), i)))
			}
			u.opts = append(u.opts, option{parts: parts, logp: 0, label: fmt.Sprintf("%d×CH", k)})
			continue
		}
		if j > 0 {
			parts = append(parts, part{el: molecule.C, h: 2, count: j, kind: kSP3, peaks: pool, lo: lo, hi: hi, pair: -1})
		}
		if k-2*j > 0 {
			parts = append(parts, part{el: molecule.C, h: 1, count: k - 2*j, kind: kSP3, peaks: pool, lo: lo, hi: hi, pair: -1})
		}
		for x := range parts {
			if !a.disabled[id] {
				parts[x].shiftID = id
			}
		}
		u.opts = append(u.opts, option{parts: parts, logp: 0, label: fmt.Sprintf("%d×CH2+%d×CH", j, k-2*j)})
	}
	return []unit{u}
}

// vinylWithMultiplet finds the =CH2 of a vinyl group reported as one 2H
// signal in the =CH2 range (both hydrogens within one multiplet).
func (a *analysis) vinylWithMultiplet(v int, trans, cis float64, used []bool) (unit, bool) {
	pv := a.peaks[v]
	w := -1
	for k, p := range a.peaks {
		if k == v || used[k] || a.n[k] != 2 || p.Lo < methyleneMin || p.Hi > methyleneMax || p.Pattern.resolved() && len(p.Pattern.jIn(9, 18.5)) == 0 {
			continue
		}
		w = k
		break
	}
	if w < 0 {
		return unit{}, false
	}
	used[v], used[w] = true, true
	peaks := []int{v, w}
	id := fmt.Sprintf("vinyl-%d", pv.Number)
	u := unit{peaks: peaks}
	if a.constraint(id, "vinyl group", fmt.Sprintf("peak %d (δ %.2f) couples with J %.1f (trans) and %.1f Hz (cis) to the 2H signal %d (δ %.2f): a CH=CH2 group",
		pv.Number, pv.Shift, trans, cis, a.peaks[w].Number, a.peaks[w].Shift), peaks, fragmentConfidence) {
		ch := a.withShift(a.withCoupling(a.basePart(v, molecule.C, 1, 1, kSP2), v))
		ch.pair, ch.pairID = 1, id
		ch2 := a.withShift(a.basePart(w, molecule.C, 2, 1, kSP2))
		ch2.pair, ch2.pairID = 0, id
		u.opts = append(u.opts, option{parts: []part{ch, ch2}, logp: math.Log(fragmentConfidence), label: "vinyl"})
	}
	if o := a.separately(peaks, math.Log(1-fragmentConfidence)); len(o.parts) > 0 {
		u.opts = append(u.opts, o)
	}
	return u, true
}
