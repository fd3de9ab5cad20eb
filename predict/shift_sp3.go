package predict

import "shiftrank/molecule"

// Damping of the second and third non-alkyl substituent on one sp3 carbon
// (substituent effects are not additive at crowded carbons; our fit to
// CH2Cl2 5.30 and CHCl3 7.26, Gottlieb 1997). Used when no electronegative
// group precedes; see gemDamp.
var alphaDamp = [3]float64{1, 0.75, 0.45}

// gemDamp returns the factor for the k-th (k ≥ 1, largest increment first)
// non-alkyl substituent s on a CH carbon whose earlier substituents are
// prev. Geminal electronegative groups are far from additive, and not in
// the same way for each element (second F adds a quarter of the first, a
// second Cl more than half, a second OR less than half; a C=O or C≡N next
// to halogens adds little, an aryl most of its increment). Factors are our
// fit to the tuning part of testdata/classes/geminal_electronegative.json
// (1,1,2-trichloroethane 5.77, dichloroacetic acid 5.95, benzal chloride
// 6.69, (difluoromethyl)benzene 6.64, 1,1-dimethoxyethane 4.57,
// trimethyl orthoformate 4.97) and CHCl3 7.26 (Gottlieb 1997).
func gemDamp(s sub, k int, prev []sub) float64 {
	neg := false
	for _, q := range prev {
		if electronegative(q) {
			neg = true
			break
		}
	}
	if !neg {
		return alphaDamp[min(k, len(alphaDamp)-1)]
	}
	switch {
	case s == subF:
		return 0.25
	case s >= subCl && s <= subI:
		return 0.60
	case s >= subOH && s <= subOX:
		if k == 1 {
			return 0.44
		}
		return 0.19
	case s >= subCHO && s <= subCN, s == subImineC, s == subThioC:
		return 0.28
	case s == subAryl, s == subHetAryl, s == subAlkenyl, s == subAlkynyl:
		return 0.76
	}
	return alphaDamp[min(k, len(alphaDamp)-1)]
}

// electronegative reports whether s is a halogen or O substituent (the
// tuning compounds of gemDamp have no N or S pairs, so those keep the
// general damping).
func electronegative(s sub) bool {
	return s >= subF && s <= subOX
}

// shooleryI is Shoolery's constant for iodine (1.82; Shoolery's table as
// reprinted by Silverstein, Webster, Kiemle, from memory): the value
// derived from the α increments (2.20) puts CH2I2 at 4.63 against 3.90
// observed (Pretsch, from memory).
const shooleryI = 1.82

// shooleryPh is Shoolery's constant for phenyl (1.85, same source): the
// derived value (1.70) puts diphenylmethane at 3.63 against 3.98 observed
// and benzyl chloride at 4.46 against 4.57 (Gottlieb 1997; Silverstein,
// from memory).
const shooleryPh = 1.85

// sp3 predicts H on an sp3 carbon (also Si and other sp3 centres, with a
// wider sigma): base + α increments + β increments + ring correction.
func (p *Predictor) sp3(m *mol, gr *hgroup, r *shiftResult, ac *acc) {
	g := m.g
	c := gr.atom
	h := g.Atoms[c].HCount
	var subs [4]sub
	var subRing [4]bool
	ns := 0
	odd := false
	conj, hetAdj := 0, 0.0
	longAlkyl := 0
	for _, nb := range g.Neighbors(c) {
		s := m.classify(c, nb.Atom)
		if unusual[s] {
			odd = true
		}
		switch s {
		case subAlkenyl:
			if m.conjugatedAcceptor(nb.Atom) {
				conj++
			}
		case subHetAryl:
			hetAdj += m.hetArylAdjust(nb.Atom)
		case subAlkyl:
			if g.Degree(nb.Atom) > 1 && m.ringBond[nb.Bond] == 0 {
				longAlkyl++
			}
		}
		if s != subAlkyl && ns < 4 {
			subRing[ns] = m.ringBond[nb.Bond] > 0 && g.Atoms[nb.Atom].Element != molecule.C
			subs[ns] = s
			ns++
		}
	}
	// The ring heteroatom (if any) before the substituents are sorted.
	ringHet, hasRingHet := sub(0), false
	for k := 0; k < ns; k++ {
		if subRing[k] && (!hasRingHet || subs[k] > ringHet) {
			ringHet, hasRingHet = subs[k], true
		}
	}
	r.sigma = 0.10 + 0.06*float64(ns)
	switch h {
	case 4:
		r.kind = "CH4"
		ac.add("base CH4 (methane)", baseCH4)
		return
	case 3:
		r.kind = "CH3 (sp3)"
		ac.add("base CH3", baseCH3)
	case 2:
		r.kind = "CH2 (sp3)"
	default:
		r.kind = "CH (sp3)"
	}
	if m.ringAtom[c] == 4 && h <= 2 && g.Atoms[c].Element == molecule.C && p.ring4H(m, c, h, r, ac) {
		return
	}
	idx := 3 - h
	if idx < 0 {
		idx = 0
	}
	if idx > 2 {
		idx = 2
	}
	if h == 2 && ns >= 2 {
		// Shoolery's rule for CH2XY: δ = 0.23 + σX + σY, with σ derived
		// from the α increments (σ = 0.88·(Zα + 0.60) reproduces
		// Shoolery's constants for Cl, Br, OH, OR within 0.1 ppm).
		ac.add("Shoolery base (CH2XY)", 0.23)
		hal, oxy := false, false
		for k := 0; k < ns; k++ {
			v := 0.88 * (alphaInc[subs[k]][1] + 0.60)
			switch subs[k] {
			case subI:
				v = shooleryI
			case subAryl:
				v = shooleryPh
			}
			ac.addSub("Shoolery σ: ", subs[k], v)
			hal = hal || subs[k] >= subCl && subs[k] <= subI
			oxy = oxy || subs[k] >= subOR && subs[k] <= subOX
		}
		if hal && oxy {
			// Halogen and ether O on one CH2 (MOMCl 5.45 against
			// 5.21 from Shoolery's rule; our fit, testdata/classes).
			ac.add("Shoolery: halogen and O on one carbon", 0.25)
		}
	} else {
		if h == 2 {
			ac.add("base CH2", baseCH2)
		} else if h == 1 {
			ac.add("base CH", baseCH)
		}
		// Largest increment first, then damped.
		sorted := subs[:ns]
		for i := 1; i < len(sorted); i++ {
			for j := i; j > 0 && alphaInc[sorted[j]][idx] > alphaInc[sorted[j-1]][idx]; j-- {
				sorted[j], sorted[j-1] = sorted[j-1], sorted[j]
			}
		}
		for k, s := range sorted {
			d := 1.0
			if k > 0 {
				d = gemDamp(s, k, sorted[:k])
			}
			ac.addSub("α: ", s, alphaInc[s][idx]*d)
		}
	}
	for _, nb := range g.Neighbors(c) {
		if v := m.esterAlcoholAdjust(nb.Atom); v != 0 && m.classify(c, nb.Atom) == subEster {
			// Esters of phenols and enols: CH3CO 2.29 in phenyl acetate,
			// 2.14 in vinyl acetate, vs 2.05 in alkyl acetates (Pretsch,
			// from memory).
			ac.add("ester of a phenol/enol", v)
		}
	}
	for _, nb := range g.Neighbors(c) {
		x := nb.Atom
		switch g.Atoms[x].Element {
		case molecule.O:
			if n := m.haloAcylOxygen(x, c); n > 0 {
				// Esters of halogenated acids: OCH2 of ethyl
				// trifluoroacetate 4.41 against 4.12 for an acetate; our
				// fit (testdata/classes/fluoroalkyl.json), 0.097 per
				// halogen on the acyl α carbon.
				ac.add("ester of a halogenated acid", 0.097*float64(n))
			}
		case molecule.S:
			if m.classify(c, x) == subSO2 && m.sulfonylHalide(x) {
				// Sulfonyl halides: CH3SO2Cl 3.65 against 2.99 for a
				// sulfone (literature value, from memory;
				// testdata/classes/sulfur.json tuning part).
				ac.add("sulfonyl halide", 0.66)
			}
		}
	}
	for _, nb := range g.Neighbors(c) {
		if n := nb.Atom; m.arom[n] && g.Atoms[n].Element == molecule.N {
			p.azoleNAdjust(m, n, r, ac)
		}
	}
	if m.ringCO {
		for _, nb := range g.Neighbors(c) {
			if g.Atoms[nb.Atom].Element != molecule.N || m.ringBond[nb.Bond] != 0 {
				continue
			}
			if v, thio := m.amideRingNAdjust(nb.Atom); v != 0 {
				ac.add("on N of a cross-conjugated ring (pyridone/uracil type)", v)
				if thio {
					r.sigma += 0.2
				}
			}
		}
	}
	if conj > 0 {
		// C=C conjugated with C=O/C≡N: allylic H are further deshielded
		// (crotonaldehyde CH3 2.03, methyl methacrylate CH3 1.95;
		// Pretsch, from memory).
		ac.add("C=C conjugated with C=O", 0.27*float64(conj))
	}
	if hetAdj != 0 {
		ac.add("heteroaryl position", hetAdj)
	}
	if ns > 0 && longAlkyl > 0 && h <= 2 {
		// A longer alkyl chain next to an X-bearing carbon lowers its H
		// (ethanol 3.72 vs 1-propanol 3.58; 2-propanol 4.04 vs 2-butanol
		// 3.72; Gottlieb 1997, Silverstein, from memory).
		v := -0.08
		if h == 1 {
			v = -0.15
		}
		ac.add("γ: longer alkyl chain", v*float64(longAlkyl))
	}
	if nO := countO(subs[:ns]); nO >= 2 && h == 2 {
		// Acetal and orthoester carbons lie well below the additive
		// estimate (Pretsch: CH2(OMe)2 4.58).
		ac.add("O,O-acetal correction", -0.50)
	}
	// β increments: non-alkyl substituents on neighbouring sp3 carbons.
	scale := [3]float64{1, 0.85, 0.8}[idx]
	if ns > 0 {
		scale *= 0.5
	}
	nb := 0
	for _, n1 := range g.Neighbors(c) {
		y := n1.Atom
		if g.Atoms[y].Element != molecule.C || m.multi[y] > 0 || m.arom[y] {
			continue
		}
		// Acetal and orthoester carbons: each O after the first adds a
		// quarter of its β increment (1,1-dimethoxyethane CH3 1.29; our
		// fit, testdata/classes), unlike halogens, whose β effects add up
		// (CH3CCl3 2.73). The full increment goes to the largest.
		nO, maxO := 0, 0.0
		for _, n2 := range g.Neighbors(y) {
			if n2.Atom != c && g.Atoms[n2.Atom].Element == molecule.O {
				nO++
				maxO = max(maxO, betaInc[m.classify(y, n2.Atom)])
			}
		}
		fullO := false
		for _, n2 := range g.Neighbors(y) {
			z := n2.Atom
			if z == c {
				continue
			}
			s := m.classify(y, z)
			if s == subAlkyl {
				continue
			}
			if unusual[s] {
				odd = true
			}
			nb++
			v := betaInc[s] * scale
			if nO > 1 && g.Atoms[z].Element == molecule.O {
				if !fullO && betaInc[s] == maxO {
					fullO = true
				} else {
					v *= 0.25
				}
			}
			if m.ringBond[n1.Bond] == 3 && m.ringBond[n2.Bond] != 3 {
				// An exocyclic group on the next carbon of a three-membered
				// ring acts about twice as strongly as in open chains
				// (cyclopropylbenzene CH2 0.82, styrene oxide CH2 2.97;
				// our fit, testdata/classes/small_rings.json).
				v *= 1.9
			}
			if m.ringBond[n1.Bond] > 0 && m.ringBond[n2.Bond] > 0 && ringAcceptor(s) {
				// C=O or SO2 in the same ring: the β effect is about twice
				// the acyclic one (cyclohexanone β-H 1.86, sulfolane 2.22).
				v *= 2
			}
			if s == subOAcyl {
				if n := m.haloAcylOxygen(z, y); n > 0 {
					// (ethyl trifluoroacetate CH3 1.40 against 1.26)
					v += 0.047 * float64(n)
				}
			}
			ac.addSub("β: ", s, v)
		}
	}
	r.sigma += 0.02 * float64(min(nb, 5))
	// γ increments: groups on the carbons two bonds away (1-propanol CH3
	// 0.94, 2-butanol C1 0.93 against 0.86–0.88 for alkanes; Pretsch lists
	// γ increments of 0.05–0.1, from memory).
	for _, n1 := range g.Neighbors(c) {
		y := n1.Atom
		if g.Atoms[y].Element != molecule.C || m.multi[y] > 0 || m.arom[y] {
			continue
		}
		for _, n2 := range g.Neighbors(y) {
			z := n2.Atom
			if z == c || g.Atoms[z].Element != molecule.C || m.multi[z] > 0 || m.arom[z] {
				continue
			}
			for _, n3 := range g.Neighbors(z) {
				if n3.Atom == y || n3.Atom == c {
					continue
				}
				switch s := m.classify(z, n3.Atom); {
				case s == subAlkyl:
				case s == subBr || s == subI:
					ac.addSub("γ: ", s, 0.10)
				default:
					ac.addSub("γ: ", s, 0.05)
				}
			}
		}
	}
	if ns == 0 && m.ringAtom[c] > 0 && m.ringCarbonylGamma(c) {
		ac.add("γ: ring C=O", 0.25)
	}
	if sz := m.ringAtom[c]; sz > 0 && !m.ringCarbonylAlpha(c) {
		// (Next to a ring C=O the open-chain α increment already fits:
		// cyclohexanone α-H 2.33, γ-butyrolactone α-H 2.48.)
		p.ringCorrection(h, int(sz), ringHet, hasRingHet, r, ac)
	}
	if m.ringAtom[c] > 0 && h <= 2 {
		if v, name := m.bridgedCorrection(c, h); name != "" {
			ac.add(name, v)
			r.sigma += 0.15
			if v > 1 {
				r.sigma += 0.35
			}
		}
	}
	if g.Atoms[c].Element != molecule.C {
		r.sigma += 0.4
	}
	if m.bridgesAromaticRing(c) {
		// A one-atom bridge across an aromatic ring sits in the shielding
		// cone of its ring current (the CH2 of 1,6-methano[10]annulene
		// lies near −0.5; Vogel, from memory); the increments know
		// nothing of it, so the estimate gets a very wide σ.
		r.sigma += 2.0
		r.reasons = append(r.reasons, "bridges an aromatic ring (ring-current shielding not modelled): very wide uncertainty")
	}
	if odd {
		r.sigma += 0.3
		r.reasons = append(r.reasons, "an unusual neighbouring group outside the increment tables: estimated, wide uncertainty")
	}
}

func countO(s []sub) int {
	n := 0
	for _, x := range s {
		if x >= subOH && x <= subOX {
			n++
		}
	}
	return n
}

// ringCorrection: ring-size corrections for sp3 C–H in rings, from the
// parent cycloalkanes (cyclopropane 0.22, cyclobutane 1.96, cyclopentane
// 1.51, cyclohexane 1.43, cycloheptane 1.54; oxirane 2.54, thiirane 2.27,
// aziridine 1.62, oxetane 4.73; Pretsch, from memory).
func (p *Predictor) ringCorrection(h, size int, hetero sub, hasHet bool, r *shiftResult, ac *acc) {
	var v float64
	switch size {
	case 3:
		v = -1.08
		if h == 1 {
			v = -0.85
		}
		if hasHet {
			switch {
			case hetero >= subOH && hetero <= subOX:
				v = -0.95
			case hetero >= subAmine && hetero <= subNArom:
				v = -0.90
			case hetero >= subSR && hetero <= subSOther:
				v = -0.25
			}
		}
		r.sigma += 0.15
	case 4:
		v = 0.66
		if h == 1 {
			v = 0.60
		}
		if hasHet {
			v += 0.55
		}
		r.sigma += 0.15
	case 5:
		v = 0.20
		if h == 1 {
			v = 0.15
		}
	case 6:
		v = 0.13
		if h == 1 {
			v = -0.30
		}
	case 7:
		v = 0.25
		if h == 1 {
			v = 0
		}
	default:
		v = 0.05
	}
	if p.opts.Explain {
		ac.add("ring ("+itoa(size)+"-membered)", v)
	} else {
		ac.raw(v)
	}
	r.sigma += 0.05
}

func itoa(n int) string {
	if n >= 0 && n < 10 {
		return string(rune('0' + n))
	}
	b := []byte{}
	neg := n < 0
	if neg {
		n = -n
	}
	for n > 0 {
		b = append([]byte{byte('0' + n%10)}, b...)
		n /= 10
	}
	if neg {
		b = append([]byte{'-'}, b...)
	}
	return string(b)
}

func ringAcceptor(s sub) bool {
	return s >= subCHO && s <= subAcylOther || s == subSO || s == subSO2
}

// conjugatedAcceptor reports whether alkene carbon x or its double-bond
// partner carries a C=O or C≡N group.
func (m *mol) conjugatedAcceptor(x int) bool {
	g := m.g
	for _, nb := range g.Neighbors(x) {
		if nb.Order != molecule.Double {
			continue
		}
		for _, y := range [2]int{x, nb.Atom} {
			for _, n2 := range g.Neighbors(y) {
				z := n2.Atom
				if n2.Order == molecule.Single && g.Atoms[z].Element == molecule.C && (m.carbonylOf(z) >= 0 || m.tripleN(z)) {
					return true
				}
			}
		}
	}
	return false
}

func (m *mol) tripleN(z int) bool {
	for _, nb := range m.g.Neighbors(z) {
		if nb.Order == molecule.Triple && m.g.Atoms[nb.Atom].Element == molecule.N {
			return true
		}
	}
	return false
}

// hetArylAdjust corrects the heteroaryl α increment by ring position:
// CH3 next to a ring N (2-picoline 2.55) vs on a furan (2-methylfuran
// 2.28) or elsewhere (3-picoline 2.32); Pretsch, from memory.
func (m *mol) hetArylAdjust(x int) float64 {
	g := m.g
	for _, nb := range g.Neighbors(x) {
		if !m.arom[nb.Atom] {
			continue
		}
		switch g.Atoms[nb.Atom].Element {
		case molecule.N:
			return 0
		case molecule.O:
			return -0.18
		case molecule.S:
			return -0.05
		}
	}
	return -0.20
}

// ringCarbonylGamma reports whether ring CH2 c is two ring bonds from a
// ring carbon bearing C=O (cyclohexanone γ-H 1.72 vs cyclohexane 1.43).
func (m *mol) ringCarbonylGamma(c int) bool {
	g := m.g
	for _, n1 := range g.Neighbors(c) {
		if m.ringBond[n1.Bond] == 0 {
			continue
		}
		for _, n2 := range g.Neighbors(n1.Atom) {
			if n2.Atom == c || m.ringBond[n2.Bond] == 0 {
				continue
			}
			for _, n3 := range g.Neighbors(n2.Atom) {
				k := n3.Atom
				if k != n1.Atom && m.ringBond[n3.Bond] > 0 && g.Atoms[k].Element == molecule.C && m.carbonylOf(k) >= 0 && !m.nextTo(c, k) {
					// (A C=O that is also β to c, the other way round a
					// five-membered ring, already counts as β: no γ term.)
					return true
				}
			}
		}
	}
	return false
}

// ringCarbonylAlpha reports whether atom c is bonded, by a ring bond, to a
// ring carbon bearing C=O.
func (m *mol) ringCarbonylAlpha(c int) bool {
	for _, nb := range m.g.Neighbors(c) {
		if m.ringBond[nb.Bond] > 0 && m.carbonylOf(nb.Atom) >= 0 {
			return true
		}
	}
	return false
}

// esterAlcoholAdjust: for an ester carbonyl carbon x, the correction for an
// aryl (+0.22) or vinyl (+0.09) alcohol part; 0 otherwise.
func (m *mol) esterAlcoholAdjust(x int) float64 {
	g := m.g
	if g.Atoms[x].Element != molecule.C || m.carbonylOf(x) < 0 {
		return 0
	}
	for _, nb := range g.Neighbors(x) {
		o := nb.Atom
		if nb.Order != molecule.Single || g.Atoms[o].Element != molecule.O {
			continue
		}
		for _, n2 := range g.Neighbors(o) {
			y := n2.Atom
			if y == x {
				continue
			}
			switch {
			case m.arom[y]:
				return 0.22
			case g.Atoms[y].Element == molecule.C && m.multi[y] > 0:
				return 0.09
			}
		}
	}
	return 0
}

// azoleNAdjust adds the corrections for an sp3 C–H on aromatic nitrogen n
// beyond the pyrrole-type N increment (N-methylpyrrole 3.64,
// 1-methylimidazole 3.64): +0.28 when n is bonded to another ring N
// (1-methylpyrazole 3.89), +0.20 when n sits on a ring-fusion atom
// (1-methylbenzimidazole 3.83); our fit, testdata/classes/azoles.json
// tuning part.
func (p *Predictor) azoleNAdjust(m *mol, n int, r *shiftResult, ac *acc) {
	g := m.g
	nn, fused := false, false
	for _, nb := range g.Neighbors(n) {
		y := nb.Atom
		if !m.arom[y] || m.ringBond[nb.Bond] == 0 {
			continue
		}
		if g.Atoms[y].Element == molecule.N {
			nn = true
		}
		if m.ringBonds(y) >= 3 {
			fused = true
		}
	}
	if nn {
		ac.add("on ring N next to a ring N (pyrazole type)", 0.28)
	}
	if fused {
		ac.add("on ring N at a ring fusion", 0.20)
	}
}

// bridgesAromaticRing reports whether sp3 atom c is bonded to two
// non-adjacent atoms of one aromatic ring.
func (m *mol) bridgesAromaticRing(c int) bool {
	g := m.g
	nbs := g.Neighbors(c)
	for i := range nbs {
		a := nbs[i].Atom
		if !m.arom[a] {
			continue
		}
		for j := i + 1; j < len(nbs); j++ {
			b := nbs[j].Atom
			if !m.arom[b] || g.BondBetween(a, b) >= 0 {
				continue
			}
			if inRing(m.aromRing(a), b) {
				return true
			}
		}
	}
	return false
}

// haloAcylOxygen: for an O bonded to carbon from, when the O is the
// alcohol oxygen of an ester whose acyl α carbon carries halogens, the
// number of those halogens (0–3); 0 otherwise.
func (m *mol) haloAcylOxygen(o, from int) int {
	g := m.g
	if g.Atoms[o].Element != molecule.O || g.Degree(o) != 2 {
		return 0
	}
	for _, nb := range g.Neighbors(o) {
		k := nb.Atom
		if k == from || m.carbonylOf(k) < 0 {
			continue
		}
		for _, n2 := range g.Neighbors(k) {
			a := n2.Atom
			if a == o || n2.Order != molecule.Single || g.Atoms[a].Element != molecule.C || m.multi[a] > 0 {
				continue
			}
			n := 0
			for _, n3 := range g.Neighbors(a) {
				if g.Atoms[n3.Atom].Element.IsHalogen() {
					n++
				}
			}
			return min(n, 3)
		}
	}
	return 0
}

// sulfonylHalide reports whether sulfur s carries a halogen.
func (m *mol) sulfonylHalide(s int) bool {
	for _, nb := range m.g.Neighbors(s) {
		if m.g.Atoms[nb.Atom].Element.IsHalogen() {
			return true
		}
	}
	return false
}

// nextTo reports whether some neighbour of c is bonded to k (k is two
// bonds from c).
func (m *mol) nextTo(c, k int) bool {
	for _, nb := range m.g.Neighbors(c) {
		if m.g.BondBetween(nb.Atom, k) >= 0 {
			return true
		}
	}
	return false
}
