package predict

import "shiftrank/molecule"

// shiftOf predicts the shift of one H group.
func (p *Predictor) shiftOf(m *mol, gr *hgroup) shiftResult {
	var r shiftResult
	ac := acc{explain: p.opts.Explain}
	g := m.g
	a := g.Atoms[gr.atom]
	switch a.Element {
	case molecule.C:
		p.carbonH(m, gr, &r, &ac)
	case molecule.N, molecule.O, molecule.S:
		p.exchangeable(m, gr, &r, &ac)
	case molecule.Si:
		p.siliconH(m, gr, &r, &ac)
	case molecule.P:
		p.phosphorusH(m, gr, &r, &ac)
	case molecule.B:
		p.boronH(m, gr, &r, &ac)
	default:
		// H on a halogen (HF, HCl ...): a strong acid, exchangeable.
		r.kind = "H–" + a.Element.String() + " (acid)"
		ac.add("estimate: hydrogen halide", 3.0)
		r.exch, r.broad = true, true
		r.lo, r.hi = 0.5, 13
		r.sigma = 3
		r.reasons = append(r.reasons, "hydrogen on a halogen is outside the shift tables: estimate with a very wide range")
	}
	if gr.syn != gr.anti && !r.exch {
		// Restricted amide rotation: the two N-substituents differ by
		// ~0.08 ppm (DMF 2.88 / 2.96, Gottlieb 1997).
		d := 0.04
		if gr.syn > gr.anti {
			d = -d
		}
		if g.BondBetween(gr.atom, amideN(m, gr.atom)) < 0 {
			d *= 0.75
		}
		ac.add("amide rotamer (syn/anti to C=O)", d)
	}
	r.shift = ac.value()
	r.terms = ac.terms
	if r.half > 0 {
		r.lo, r.hi = r.shift-r.half, r.shift+r.half
	}
	if r.lo == 0 && r.hi == 0 {
		r.lo, r.hi = r.shift, r.shift
	}
	if r.sigma <= 0 {
		r.sigma = 0.3
	}
	return r
}

func (p *Predictor) carbonH(m *mol, gr *hgroup, r *shiftResult, ac *acc) {
	g := m.g
	c := gr.atom
	if m.arom[c] {
		p.aromaticH(m, gr, r, ac)
		return
	}
	if m.ringCO && m.multi[c] == 1 {
		if ring, _ := m.amideRing(c); ring != nil {
			p.amideRingH(m, c, ring, r, ac)
			return
		}
	}
	var dblO, dblS, dblN, dblC, dblX, tripC, tripN int
	dblPartner := -1
	for _, nb := range g.Neighbors(c) {
		e := g.Atoms[nb.Atom].Element
		switch nb.Order {
		case molecule.Double:
			switch e {
			case molecule.O:
				dblO++
			case molecule.S:
				dblS++
			case molecule.N:
				dblN++
			case molecule.C:
				dblC++
				dblPartner = nb.Atom
			default:
				dblX++
			}
		case molecule.Triple:
			if e == molecule.C {
				tripC++
				dblPartner = nb.Atom
			} else {
				tripN++
			}
		}
	}
	switch {
	case tripC > 0:
		p.alkyneH(m, c, dblPartner, r, ac)
	case tripN > 0:
		r.kind = "H–C≡X (unusual)"
		ac.add("estimate: H–C≡N type", 4.0)
		r.sigma = 1.0
		r.reasons = append(r.reasons, "H on a carbon triply bonded to a heteroatom is outside the tables: estimate")
	case dblO > 0:
		p.formylH(m, c, r, ac)
	case dblS > 0 && g.Valence(m.thioCarbonylOf(c)) > 2:
		r.kind = "H on C=S (sulfine/sulfene, unusual)"
		ac.add("estimate: H on a hypervalent C=S", 6.5)
		r.sigma = 1.5
		r.reasons = append(r.reasons, "H on carbon doubly bonded to a hypervalent sulfur is outside the tables: estimate")
	case dblS > 0 && m.thioformamide(c):
		// Thioformamides HC(=S)NR2: about 1.2 ppm above the formamide H
		// (DMF 8.02; N,N-dimethylthioformamide near 9.2, from memory, not
		// checked): an estimate with a wide σ.
		r.kind = "HC(=S)N (thioformamide)"
		ac.add("estimate: thioformamide H", 9.2)
		r.sigma = 0.5
		r.reasons = append(r.reasons, "thioformamide H: estimate, no tabulated increments")
	case dblS > 0:
		r.kind = "CH=S (thioformyl)"
		ac.add("estimate: thioaldehyde H", 10.5)
		r.sigma = 1.0
		r.reasons = append(r.reasons, "thioaldehyde H is outside the tables: estimate")
	case dblN > 0:
		p.imineH(m, c, r, ac)
	case dblC == 1 && dblX == 0:
		p.alkeneH(m, gr, dblPartner, r, ac)
	case dblC+dblX > 0:
		r.kind = "H on C=X (unusual)"
		ac.add("estimate: H on an unusual double bond", 6.0)
		r.sigma = 1.5
		r.reasons = append(r.reasons, "H on a carbon doubly bonded to Si, P, B or in a cumulene: estimate with a wide uncertainty")
	default:
		p.sp3(m, gr, r, ac)
	}
}

// alkyneH: H–C≡C–X, base 1.91 (ethyne) plus an increment for X (Pretsch;
// propyne 1.80, phenylacetylene 3.06, propargyl alcohol 2.47, but-3-yn-2-one
// 3.2; from memory).
func (p *Predictor) alkyneH(m *mol, c, q int, r *shiftResult, ac *acc) {
	g := m.g
	r.kind = "alkyne CH"
	r.sigma = 0.2
	ac.add("base HC≡C– (ethyne)", 1.91)
	for _, nb := range g.Neighbors(q) {
		x := nb.Atom
		if x == c {
			continue
		}
		s := m.classify(q, x)
		var v float64
		switch {
		case s == subAlkyl:
			v = -0.11
			for _, n2 := range g.Neighbors(x) {
				if n2.Atom != q && m.classify(x, n2.Atom) != subAlkyl {
					v += 0.55 // propargylic heteroatom
					break
				}
			}
		case s == subAryl || s == subHetAryl:
			v = 1.15
		case s == subAlkenyl:
			v = 0.95
		case s == subAlkynyl:
			v = 0.10
		case s >= subCHO && s <= subAcylOther:
			v = 1.10
		case s == subCN:
			v = 0.60
		case s >= subOH && s <= subOX:
			v = -0.40
		case s >= subAmine && s <= subNArom:
			v = 0.60
		case s >= subF && s <= subI:
			v = 0.20
		case s >= subSR && s <= subSOther:
			v = 0.80
		case s == subSi:
			v = 0.45
		default:
			v = 0.6
			r.sigma += 0.4
		}
		ac.addSub("substituent: ", s, v)
	}
}

// formylH: H–C(=O)–X. Aldehydes 9.5–10 (propanal 9.79, benzaldehyde 10.0,
// acrolein 9.6), formates 8.05, formamides 8.0–8.2 (DMF 8.02, Gottlieb
// 1997). From memory.
func (p *Predictor) formylH(m *mol, c int, r *shiftResult, ac *acc) {
	g := m.g
	o := m.carbonylOf(c)
	x := -1
	for _, nb := range g.Neighbors(c) {
		if nb.Atom != o {
			x = nb.Atom
		}
	}
	r.sigma = 0.12
	if x < 0 {
		r.kind = "CHO (aldehyde)"
		ac.add("formaldehyde", 9.60)
		return
	}
	s := m.classify(c, x)
	switch {
	case s == subAlkyl:
		r.kind = "CHO (aldehyde)"
		ac.add("base CHO, alkyl", 9.74)
		nh := 0
		for _, nb := range g.Neighbors(x) {
			if nb.Atom != c {
				nh++
			}
		}
		if nh >= 2 {
			ac.add("α-branching", -0.12)
		}
	case s == subAryl || s == subHetAryl:
		r.kind = "CHO (aldehyde)"
		ac.add("base CHO, aryl", 9.98)
		if s == subHetAryl {
			ac.add("heteroaryl", -0.10)
		}
	case s == subAlkenyl:
		r.kind = "CHO (aldehyde)"
		ac.add("base CHO, α,β-unsaturated", 9.52)
	case s == subAlkynyl:
		r.kind = "CHO (aldehyde)"
		ac.add("base CHO, alkynyl", 9.20)
	case s >= subCHO && s <= subAcylOther, s == subCN:
		r.kind = "CHO (aldehyde)"
		ac.add("base CHO, α-dicarbonyl", 9.30)
		r.sigma = 0.3
	case s >= subOH && s <= subOX:
		r.kind = "HC(=O)O (formate)"
		ac.add("base formate", 8.05)
	case s >= subAmine && s <= subNArom:
		r.kind = "HC(=O)N (formamide)"
		ac.add("base formamide", 8.05)
		r.sigma = 0.15
	case s >= subSR && s <= subSOther:
		r.kind = "HC(=O)S (thioformate)"
		ac.add("base thioformate", 10.0)
		r.sigma = 0.4
	case s >= subF && s <= subI:
		r.kind = "HC(=O)X (formyl halide)"
		ac.add("estimate: formyl halide", 9.2)
		r.sigma = 0.6
	default:
		r.kind = "CHO (unusual)"
		ac.addSub("estimate: formyl on ", s, 9.5)
		r.sigma = 0.8
		r.reasons = append(r.reasons, "formyl H on an unusual atom: estimate")
	}
}

// imineH: H–C=N–Y. Aldimines 7.6 (alkyl) / 8.3 (aryl), oximes 7.4 / 8.1,
// hydrazones 7.1 / 7.7 (Pretsch, from memory).
func (p *Predictor) imineH(m *mol, c int, r *shiftResult, ac *acc) {
	g := m.g
	r.kind = "CH=N (imine)"
	r.sigma = 0.3
	n := -1
	for _, nb := range g.Neighbors(c) {
		if nb.Order == molecule.Double && g.Atoms[nb.Atom].Element == molecule.N {
			n = nb.Atom
		}
	}
	if g.Atoms[c].HCount >= 2 {
		ac.add("estimate: CH2=N", 7.2)
		r.sigma = 0.5
		return
	}
	aryl, hetero := false, false
	for _, nb := range g.Neighbors(c) {
		if nb.Atom == n {
			continue
		}
		s := m.classify(c, nb.Atom)
		if s == subAryl || s == subHetAryl || s == subAlkenyl {
			aryl = true
		}
		if e := g.Atoms[nb.Atom].Element; e != molecule.C {
			hetero = true
		}
	}
	base := 7.6
	if aryl {
		base = 8.3
	}
	ac.add("base CH=N", base)
	for _, nb := range g.Neighbors(n) {
		if nb.Atom == c {
			continue
		}
		switch g.Atoms[nb.Atom].Element {
		case molecule.O:
			r.kind = "CH=N–O (oxime)"
			ac.add("N–O (oxime)", -0.2)
		case molecule.N:
			r.kind = "CH=N–N (hydrazone)"
			ac.add("N–N (hydrazone)", -0.55)
		case molecule.C:
			if m.arom[nb.Atom] {
				ac.add("N-aryl", 0.1)
			}
		}
	}
	if hetero {
		ac.add("heteroatom on the imine carbon (amidine/imidate)", -0.1)
		r.sigma = 0.5
	}
}

// alkeneH: Pascual–Meier–Simon: δ = 5.25 + Z_gem + Z_cis + Z_trans.
func (p *Predictor) alkeneH(m *mol, gr *hgroup, q int, r *shiftResult, ac *acc) {
	g := m.g
	c := gr.atom
	r.kind = "alkene CH"
	if g.Atoms[c].HCount == 2 {
		r.kind = "alkene =CH2"
	}
	r.sigma = 0.18
	if m.multi[q] > 1 {
		// Allene (or cumulene) terminal H: allene 4.67, alkylallenes
		// 4.6–5.1 (Pretsch, from memory).
		r.kind = "allene CH"
		ac.add("base allene H", 4.67)
		for _, nb := range g.Neighbors(c) {
			if nb.Atom != q {
				s := m.classify(c, nb.Atom)
				ac.addSub("gem (allene, ×0.6): ", s, 0.6*pms[s][0])
			}
		}
		if m.carbonylOf(q) >= 0 {
			r.kind = "ketene CH"
			ac.add("ketene", -2.2)
			r.sigma = 0.6
		}
		r.sigma = 0.3
		return
	}
	ac.add("base alkene (Pascual–Meier–Simon)", 5.25)
	dbl := g.BondBetween(c, q)
	dblRing := m.ringBond[dbl]
	z := func(from, x int, col int) (float64, sub) {
		s := m.classify(from, x)
		if s == subAlkyl {
			if dblRing > 0 && dblRing <= 7 && m.ringBond[g.BondBetween(from, x)] > 0 {
				return pmsRingAlkyl[col], s
			}
			if row, ok := m.pmsAlkylRow(from, x); ok {
				return row[col], s
			}
		}
		return pms[s][col], s
	}
	for _, nb := range g.Neighbors(c) {
		if nb.Atom == q {
			continue
		}
		v, s := z(c, nb.Atom, 0)
		ac.addSub("Z_gem: ", s, v)
		if unusual[s] {
			r.sigma += 0.3
		}
	}
	// Positions on the other carbon: up to two substituents, H otherwise.
	var pos [2]int
	np := 0
	for _, nb := range g.Neighbors(q) {
		if nb.Atom != c && np < 2 {
			pos[np] = nb.Atom
			np++
		}
	}
	for np < 2 {
		pos[np] = -1
		np++
	}
	zz := func(x, col int) (float64, sub) {
		if x < 0 {
			return 0, subAlkyl
		}
		return z(q, x, col)
	}
	if gr.split == 1 {
		cis, trans := gr.cisTo, pos[0]
		if trans == cis {
			trans = pos[1]
		}
		v, s := zz(cis, 1)
		if cis >= 0 {
			ac.addSub("Z_cis: ", s, v)
		}
		v, s = zz(trans, 2)
		if trans >= 0 {
			ac.addSub("Z_trans: ", s, v)
		}
	} else {
		// Which substituent of q is cis to this H? Fixed when the
		// substituent of c and one of q's share a small ring with the
		// double bond (they are then cis to each other).
		cisIdx := -1
		gem := -1
		for _, nb := range g.Neighbors(c) {
			if nb.Atom != q {
				gem = nb.Atom
			}
		}
		if gem >= 0 && dblRing > 0 && dblRing <= 7 {
			// gem is cis to the position closing the smaller ring (≤ 7
			// atoms with the double bond); a tie leaves it open.
			var d [2]int
			for k, y := range pos {
				d[k] = -1
				if y >= 0 {
					if l := m.pathLen(gem, y, -1, c, q); l > 0 && l+3 <= 7 {
						d[k] = l
					}
				}
			}
			switch {
			case d[0] > 0 && (d[1] < 0 || d[0] < d[1]):
				cisIdx = 1 // gem cis to pos[0] => H cis to pos[1]
			case d[1] > 0 && (d[0] < 0 || d[1] < d[0]):
				cisIdx = 0
			}
		}
		if cisIdx >= 0 {
			v, s := zz(pos[cisIdx], 1)
			if pos[cisIdx] >= 0 {
				ac.addSub("Z_cis: ", s, v)
			}
			v, s = zz(pos[1-cisIdx], 2)
			if pos[1-cisIdx] >= 0 {
				ac.addSub("Z_trans: ", s, v)
			}
		} else {
			c0, _ := zz(pos[0], 1)
			t1, _ := zz(pos[1], 2)
			c1, _ := zz(pos[1], 1)
			t0, _ := zz(pos[0], 2)
			e1, e2 := c0+t1, c1+t0
			if pos[0] >= 0 || pos[1] >= 0 {
				if p.opts.Explain {
					ac.add("Z_cis + Z_trans (mean of both configurations)", (e1+e2)/2)
				} else {
					ac.raw((e1 + e2) / 2)
				}
			}
			if d := e1 - e2; d > 0.02 || d < -0.02 {
				half := d / 2
				if half < 0 {
					half = -half
				}
				r.half = half
				if dblRing == 0 || dblRing > 7 {
					r.sigma += half / 2
					if p.opts.Explain {
						r.reasons = append(r.reasons, "the constitution does not fix E/Z: shift averaged over both configurations, range ±"+ppm2(half)+" ppm")
					}
				}
			}
		}
	}
	switch dblRing {
	case 3:
		ac.add("cyclopropene ring", 1.35)
		r.sigma += 0.2
	case 4:
		ac.add("cyclobutene ring", 0.37)
		r.sigma += 0.1
	case 5:
		ac.add("cyclopentene ring", 0.07)
	}
	if dblRing >= 5 && dblRing <= 7 && m.poly {
		p.bridgedAlkene(m, c, q, r, ac)
	}
	if dblRing >= 5 && dblRing <= 8 && m.ringDiene(c, q) {
		// Endocyclic s-cis dienes and trienes depart from the increments,
		// which were derived on open-chain (s-trans) dienes, by up to
		// 0.6 ppm either way (cycloheptatriene 6.65 / 6.19 / 5.35 against
		// 6.02 / 5.97 / 5.71, Pretsch, from memory): wider σ, no shift.
		r.sigma += 0.25
		if p.opts.Explain {
			r.reasons = append(r.reasons, "conjugated diene inside a ring: the alkene increments fit it poorly, wide uncertainty")
		}
	}
}

// ringDiene reports whether the ring double bond c=q is conjugated with
// another non-aromatic double bond of the same ring.
func (m *mol) ringDiene(c, q int) bool {
	g := m.g
	for _, x := range [2]int{c, q} {
		for _, nb := range g.Neighbors(x) {
			y := nb.Atom
			if y == c || y == q || m.ringBond[nb.Bond] == 0 || m.multi[y] == 0 || m.arom[y] {
				continue
			}
			for _, n2 := range g.Neighbors(y) {
				if n2.Order == molecule.Double && m.ringBond[n2.Bond] > 0 && g.Atoms[n2.Atom].Element == molecule.C {
					return true
				}
			}
		}
	}
	return false
}

// bridgedAlkene: an alkene H next to the bridgehead of a bridged bicyclic
// lies above the cycloalkene value (norbornene 5.99 against 5.73 from the
// increments: +0.26), and far above when the bridgehead also carries the
// double bond or aromatic ring of another bridge (norbornadiene 6.75:
// +0.76 more, the two π systems face each other); our fit to the tuning
// part of testdata/classes/ring_alkenes.json.
func (p *Predictor) bridgedAlkene(m *mol, c, q int, r *shiftResult, ac *acc) {
	g := m.g
	for _, nb := range g.Neighbors(c) {
		j := nb.Atom
		if j == q || m.ringBond[nb.Bond] == 0 || m.junction(j) != junctionBridged {
			continue
		}
		ac.add("alkene next to a bridgehead (bridged bicyclic)", 0.26)
		r.sigma += 0.1
		for _, n2 := range g.Neighbors(j) {
			y := n2.Atom
			if y != c && m.ringBond[n2.Bond] > 0 && (m.multi[y] > 0 || m.arom[y]) {
				ac.add("second π bridge across the bicyclic (norbornadiene type)", 0.76)
				r.sigma += 0.15
				return
			}
		}
		return
	}
}

func ppm2(v float64) string {
	// two decimals without fmt (cheap, explain-only)
	neg := v < 0
	if neg {
		v = -v
	}
	n := int64(v*100 + 0.5)
	s := itoa(int(n/100)) + "." + string(rune('0'+n/10%10)) + string(rune('0'+n%10))
	if neg {
		s = "-" + s
	}
	return s
}

// amideN returns an amide nitrogen bonded to x, or -1.
func amideN(m *mol, x int) int {
	for _, nb := range m.g.Neighbors(x) {
		if m.amideCarbon(nb.Atom) >= 0 {
			return nb.Atom
		}
	}
	return -1
}

// Pascual–Meier–Simon rows for substituted alkyl groups (Pretsch, from
// memory): CH2–O, CH2–N, CH2–halogen, CH2–S, CH2–C=O/C≡N, CH2–Ar.
var (
	pmsCH2O   = [3]float64{0.64, -0.01, -0.02}
	pmsCH2N   = [3]float64{0.58, -0.10, -0.08}
	pmsCH2Hal = [3]float64{0.70, 0.11, -0.04}
	pmsCH2S   = [3]float64{0.71, -0.13, -0.22}
	pmsCH2CO  = [3]float64{0.69, -0.08, -0.06}
	pmsCH2Ar  = [3]float64{1.05, -0.29, -0.32}
)

// pmsAlkylRow returns the PMS row for alkyl substituent x (seen from alkene
// carbon from) when x carries a heteroatom, carbonyl or aryl group.
// With several such groups on x the row with the largest Z_gem is used
// (independent of atom order).
func (m *mol) pmsAlkylRow(from, x int) ([3]float64, bool) {
	var best [3]float64
	found := false
	for _, nb := range m.g.Neighbors(x) {
		if nb.Atom == from {
			continue
		}
		s := m.classify(x, nb.Atom)
		var row [3]float64
		switch {
		case s >= subOH && s <= subOX:
			row = pmsCH2O
		case s >= subAmine && s <= subNArom:
			row = pmsCH2N
		case s >= subF && s <= subI:
			row = pmsCH2Hal
		case s >= subSR && s <= subSOther:
			row = pmsCH2S
		case s >= subCHO && s <= subCN:
			row = pmsCH2CO
		case s == subAryl || s == subHetAryl:
			row = pmsCH2Ar
		default:
			continue
		}
		if !found || row[0] > best[0] {
			best, found = row, true
		}
	}
	return best, found
}

// thioformamide reports whether thiocarbonyl carbon c is bonded to N by a
// single bond.
func (m *mol) thioformamide(c int) bool {
	for _, nb := range m.g.Neighbors(c) {
		if nb.Order == molecule.Single && m.g.Atoms[nb.Atom].Element == molecule.N {
			return true
		}
	}
	return false
}
