package predict

import (
	"shiftrank/molecule"
)

// alkene predicts a C=C carbon: 123.3 plus the Pretsch alkene increments
// for alkyl groups (α, β, γ on the observed carbon's side, α', β', γ' on
// the other) and for other groups (xtab ene), with the geminal and cis
// corrections, and a ring correction for cycloalkenes.
func (cx *cctx) alkene(c int, r *cres) {
	g := cx.g
	m := cx.m
	q := -1
	for _, nb := range g.Neighbors(c) {
		if nb.Order == molecule.Double && g.Atoms[nb.Atom].Element == molecule.C {
			q = nb.Atom
		}
	}
	h := g.Atoms[c].HCount
	r.kind = [3]string{"alkene C", "alkene CH", "alkene =CH2"}[min(h, 2)]
	r.sigma = 2.0
	ac := &r.ac
	if m.multi[q] > 1 {
		cx.alleneEnd(c, q, r)
		return
	}
	ac.add("base alkene (Pretsch)", eneBase)
	nc := cx.alkeneSide(c, q, true, r)
	nq := cx.alkeneSide(q, c, false, r)
	if nc == 2 {
		ac.add("two groups on this carbon", eneGem)
	}
	if nq == 2 {
		ac.add("two groups on the other carbon", eneGem1)
	}
	bond := g.BondBetween(c, q)
	rs := int(m.ringBond[bond])
	var cis float64
	switch {
	case nc == 0 || nq == 0:
	case nc == 2 && nq == 2:
		cis = 2
	case nc == 2 || nq == 2:
		cis = 1
	case rs > 0 && rs <= 7:
		cis = 1
	default:
		// E/Z not fixed by the constitution: half a cis pair, and a wider
		// sigma (E- and Z-2-butene CH= differ by 1.4 ppm).
		cis = 0.5
		r.sigma += 0.7
	}
	if cis > 0 {
		ac.add("cis pair correction", eneCisCor*cis)
	}
	// Push–pull: alkyl groups on the β carbon of an α,β-unsaturated
	// carbonyl or nitrile deshield it more than the additive increments
	// say (mesityl oxide C4 155, crotonaldehyde C3 153.8, cyclohexenone C3
	// 150.9; Kalinowski, from memory).
	if nc > 0 && cx.acceptorOn(q, c) {
		k := 0
		for _, nb := range g.Neighbors(c) {
			if nb.Atom != q && cx.skel[nb.Atom] {
				k++
			}
		}
		if k > 0 {
			ac.add("alkyl on the β carbon of a conjugated C=O/C≡N", 4.0*float64(min(k, 2)))
		}
	}
	// The α carbon of such an enone gains too (cyclohexenone C2 130.0,
	// mesityl oxide C3 124.1, methyl crotonate C2 122.7 against the
	// additive 127.8, 121.9, 120.9).
	if cx.acceptorOn(c, q) {
		k := 0
		for _, nb := range g.Neighbors(q) {
			if nb.Atom != c && cx.skel[nb.Atom] {
				k++
			}
		}
		if k > 0 {
			ac.add("alkyl on the other carbon of a conjugated C=O/C≡N", 2.0*float64(min(k, 2)))
		}
	}
	if rs > 0 && !cx.allSkeletonRing(c, q, rs) {
		return
	}
	switch rs {
	case 3:
		ac.add("cyclopropene ring", -16.2) // cyclopropene 108.7
		r.sigma += 3
	case 4:
		ac.add("cyclobutene ring", 6.9) // cyclobutene 137.2
		r.sigma += 2
	case 5:
		ac.add("cyclopentene ring", 0.5) // cyclopentene 130.8
	case 6:
		ac.add("cyclohexene ring", -3.0) // cyclohexene 127.3
	}
}

// alkeneSide adds the increments of the groups on alkene carbon a (own
// side when own, else the other side) and returns how many there are.
func (cx *cctx) alkeneSide(a, partner int, own bool, r *cres) int {
	g := cx.g
	ac := &r.ac
	k := 0
	col := 1
	prefix := "other carbon: "
	if own {
		col = 0
		prefix = ""
	}
	for _, nb := range g.Neighbors(a) {
		x := nb.Atom
		if x == partner {
			continue
		}
		k++
		if !cx.skel[x] {
			s := cx.xclass(a, x)
			if cx.explain {
				ac.addCat(xtab[s].ene[col], prefix, xtab[s].name)
			} else {
				ac.raw(xtab[s].ene[col])
			}
			if xtab[s].est {
				r.sigma += 3
				r.est = true
			} else {
				r.sigma += 0.5
			}
			continue
		}
		alpha, beta, gamma := eneA, eneB, eneG
		if !own {
			alpha, beta, gamma = eneA1, eneB1, eneG1
		}
		ac.addCat(alpha, prefix, "α alkyl")
		for _, n2 := range g.Neighbors(x) {
			y := n2.Atom
			if y == a || y == partner {
				continue
			}
			if cx.skel[y] {
				ac.addCat(beta, prefix, "β carbon")
				for _, n3 := range g.Neighbors(y) {
					if z := n3.Atom; z != x && z != a && z != partner && cx.skel[z] {
						ac.addCat(gamma, prefix, "γ carbon")
					}
				}
				continue
			}
			s := cx.xclass(x, y)
			ac.addCat(eneBeta(s)[col], prefix, "β: ", xtab[s].name)
			r.sigma += 0.3
		}
	}
	return k
}

// alleneEnd: terminal allene carbon (allene CH2 74.8, 1,2-butadiene C1
// 74.0 and C3 84.2; Kalinowski, from memory) and the CH2 of a ketene
// (2.5).
func (cx *cctx) alleneEnd(c, q int, r *cres) {
	g := cx.g
	ac := &r.ac
	if cx.m.carbonylOf(q) >= 0 {
		r.kind = "ketene C"
		ac.add("base ketene CH2=C=O", 2.5)
		for _, nb := range g.Neighbors(c) {
			if nb.Atom != q {
				ac.add("substituent on ketene C", 12)
			}
		}
		r.sigma = 8
		r.estimate("ketene carbon: rough estimate")
		return
	}
	r.kind = "allene terminal C"
	ac.add("base allene CH2", 74.8)
	for _, nb := range g.Neighbors(c) {
		if nb.Atom == q {
			continue
		}
		s := cx.xclass(c, nb.Atom)
		if s == xAlkyl {
			ac.add("alkyl on allene C", 10.0)
		} else {
			ac.addCat(0.8*xtab[s].ene[0], "allene: ", xtab[s].name, " (×0.8 of the alkene increment)")
		}
	}
	for _, nb := range g.Neighbors(q) {
		if nb.Atom != c && g.BondBetween(nb.Atom, q) >= 0 && nb.Order == molecule.Single {
			ac.add("group on the central allene C", -2.0)
		}
	}
	r.sigma = 4
}

// cumulene predicts a carbon with two double bonds: allene central C
// (allene 213.5, 1,2-butadiene 209.8), ketene C=O (194.0), isocyanate
// (methyl isocyanate 121.5, phenyl isocyanate 125), isothiocyanate
// (~130, broad), carbodiimide (dicyclohexylcarbodiimide 139.9), CO2
// (125.0, Gottlieb 1997), CS2 (192.8); Kalinowski, Pretsch, from memory.
func (cx *cctx) cumulene(c, dblO, dblS, dblN, dblC int, r *cres) {
	ac := &r.ac
	r.sigma = 4
	switch {
	case dblC == 2:
		r.kind = "allene central C"
		ac.add("base allene central C", 211.0)
	case dblC == 1 && dblO == 1:
		r.kind = "ketene C=O"
		ac.add("base ketene C", 194.0)
		r.sigma = 8
	case dblN == 1 && dblO == 1:
		r.kind = "N=C=O (isocyanate)"
		ac.add("base isocyanate C", 122.5)
		r.sigma = 3
	case dblN == 1 && dblS == 1:
		r.kind = "N=C=S (isothiocyanate)"
		ac.add("base isothiocyanate C", 131.0)
		r.sigma = 4
	case dblN == 2:
		r.kind = "N=C=N (carbodiimide)"
		ac.add("base carbodiimide C", 140.0)
		r.sigma = 3
	case dblO == 2:
		r.kind = "O=C=O"
		ac.add("carbon dioxide", 125.0)
		r.sigma = 1
	case dblS == 2:
		r.kind = "S=C=S"
		ac.add("carbon disulfide", 192.8)
		r.sigma = 1
	case dblO == 1 && dblS == 1:
		r.kind = "O=C=S"
		ac.add("carbonyl sulfide", 153.8)
		r.sigma = 3
	case dblC == 1 && dblN == 1:
		r.kind = "ketenimine C"
		ac.add("estimate: ketenimine C", 190.0)
		r.sigma = 10
		r.estimate("ketenimine carbon: rough estimate")
	default:
		r.kind = "cumulene C (unusual)"
		ac.add("estimate: cumulated double bonds", 170.0)
		r.sigma = 20
		r.estimate("carbon with unusual cumulated double bonds: rough estimate")
	}
}

// alkyne predicts a C≡C carbon: 71.9 plus the Pretsch alkyne increments.
func (cx *cctx) alkyne(c int, r *cres) {
	g := cx.g
	q := -1
	for _, nb := range g.Neighbors(c) {
		if nb.Order == molecule.Triple {
			q = nb.Atom
		}
	}
	r.kind = "alkyne C"
	if g.Atoms[c].HCount > 0 {
		r.kind = "alkyne CH"
	}
	r.sigma = 2.0
	r.ac.add("base alkyne (Pretsch)", yneBase)
	for side, a := range [2]int{c, q} {
		other := q
		prefix := ""
		if side == 1 {
			other, prefix = c, "other carbon: "
		}
		for _, nb := range g.Neighbors(a) {
			x := nb.Atom
			if x == other {
				continue
			}
			if !cx.skel[x] {
				s := cx.xclass(a, x)
				r.ac.addCat(xtab[s].yne[side], prefix, xtab[s].name)
				if xtab[s].est || s >= xOH && s <= xOMinus || s >= xF && s <= xI || s >= xNH2 && s <= xNPlus {
					r.sigma += 3
				} else {
					r.sigma += 0.7
				}
				continue
			}
			alpha, beta, gamma := yneA, yneB, yneG
			if side == 1 {
				alpha, beta, gamma = yneA1, yneB1, yneG1
			}
			r.ac.addCat(alpha, prefix, "α alkyl")
			for _, n2 := range g.Neighbors(x) {
				y := n2.Atom
				if y == a {
					continue
				}
				if cx.skel[y] {
					r.ac.addCat(beta, prefix, "β carbon")
					for _, n3 := range g.Neighbors(y) {
						if z := n3.Atom; z != x && cx.skel[z] {
							r.ac.addCat(gamma, prefix, "γ carbon")
						}
					}
					continue
				}
				s := cx.xclass(x, y)
				r.ac.addCat(yneBeta(s)[side], prefix, "β: ", xtab[s].name)
				r.sigma += 0.5
			}
		}
	}
	if cx.m.ringBond[g.BondBetween(c, q)] > 0 {
		r.sigma += 5
		r.estimate("alkyne in a ring: strained, estimate")
	}
}

// acylFamily names a carbonyl (or nitrile) type for the base values and
// the effects of its carbon substituents.
type acylFamily uint8

const (
	famKetone acylFamily = iota
	famAldehyde
	famAcid
	famEster
	famAmide
	famAcylCl
	famAnhydride
	famThioester
	famNitrile
	famOther
)

// famBranch[f][k]: effect of k sp3 carbons on the α carbon of an alkyl
// substituent of the carbonyl carbon (acetone 206.7, butanone 209.3,
// 3-methyl-2-butanone 212.4, pinacolone 213.5; acetaldehyde 200.5,
// propanal 203.1, isobutyraldehyde 204.7, pivalaldehyde 205.8; acetic
// 177.0, propanoic 180.8, isobutyric 184.0, pivalic 185.9; methyl
// acetate 171.0, propanoate 174.6, isobutyrate 177.3, pivalate 178.8;
// acetamide/propanamide/isobutyramide/pivalamide; acetyl/propionyl
// chloride 170.4/174.7; acetonitrile 116.4, propionitrile 120.8,
// isobutyronitrile 123.7, pivalonitrile 125.1; Pretsch, Kalinowski,
// from memory).
var famBranch = [famOther + 1][4]float64{
	famKetone:    {0, 2.6, 5.6, 6.8},
	famAldehyde:  {0, 2.6, 4.2, 5.3},
	famAcid:      {0, 3.8, 7.0, 8.9},
	famEster:     {0, 3.6, 6.3, 7.8},
	famAmide:     {0, 3.4, 6.0, 7.5},
	famAcylCl:    {0, 4.3, 7.0, 9.0},
	famAnhydride: {0, 3.3, 6.0, 7.5},
	famThioester: {0, 3.5, 6.5, 8.0},
	famNitrile:   {0, 4.4, 7.3, 8.7},
	famOther:     {0, 3.0, 5.5, 7.0},
}

// famConj[f] = {aryl, vinyl, alkynyl, acyl}: effect of a conjugated
// substituent replacing a methyl on the carbonyl carbon (acetophenone
// 198.1, methyl vinyl ketone 198.4, 3-butyn-2-one 184.7, biacetyl 197.4;
// benzaldehyde 192.3, acrolein 193.5, propynal 176.5; benzoic acid 172.4,
// acrylic acid 171.5, propiolic acid 156.5, pyruvic acid 160; methyl
// benzoate 167.0, methyl acrylate 166.6, methyl propiolate 153.3,
// methyl pyruvate 160.8, diethyl oxalate 157.8; benzamide 169.0,
// acrylamide 168.0; benzoyl chloride 168.3; benzoic anhydride 162.3;
// benzonitrile 118.7, acrylonitrile 117.4; Pretsch, Kalinowski, from
// memory).
var famConj = [famOther + 1][4]float64{
	famKetone:    {-8.6, -8.3, -21.0, -9.5},
	famAldehyde:  {-8.2, -7.0, -24.0, -10.0},
	famAcid:      {-4.6, -5.5, -20.5, -16.0},
	famEster:     {-4.0, -4.4, -17.7, -11.0},
	famAmide:     {-2.0, -3.0, -17.0, -10.0},
	famAcylCl:    {-2.1, -4.5, -18.0, -10.0},
	famAnhydride: {-4.2, -4.0, -17.0, -10.0},
	famThioester: {-3.5, -5.0, -18.0, -10.0},
	famNitrile:   {2.3, 1.0, -11.0, -3.0},
	famOther:     {-5.0, -5.0, -18.0, -10.0},
}

// famRing[f][s]: ring correction for a carbonyl carbon in a ring of s
// atoms (cyclobutanone 208.9, cyclopentanone 219.9, cyclohexanone 211.8,
// cycloheptanone 215.0, cyclooctanone 218; β-propiolactone 168,
// γ-butyrolactone 177.9, δ-valerolactone 171.3, ε-caprolactone 176.0;
// 2-azetidinone 168, 2-pyrrolidinone 179.4, 2-piperidinone 172.8,
// caprolactam 179.5; succinic anhydride 170.8, glutaric anhydride
// 166.4; ethylene carbonate 155.9, 2-oxazolidinone 161.4; Pretsch,
// Kalinowski, from memory).
func famRing(f acylFamily, s int) float64 {
	switch f {
	case famKetone:
		return [9]float64{3: -25, 4: -3.0, 5: 8.0, 6: 0, 7: 3.1, 8: 6.0}[min(s, 8)]
	case famEster:
		return [9]float64{3: -10, 4: -6.0, 5: 3.3, 6: -3.2, 7: 1.4, 8: 0}[min(s, 8)]
	case famAmide:
		return [9]float64{3: -10, 4: -6.0, 5: 4.0, 6: -1.5, 7: 4.5, 8: 2.0}[min(s, 8)]
	case famAnhydride:
		return [9]float64{5: 1.0, 6: -3.0}[min(s, 8)]
	}
	return 0
}

// famAlphaX: effect of a group on the α carbon of an alkyl substituent
// of a ketone or aldehyde carbonyl (chloroacetone 200.1, bromoacetone
// 199.7, hydroxyacetone 207.4, methoxyacetone 206.6, acetoxyacetone
// 201.9, phenylacetone 206.4, acetylacetone (keto) 201.9, ethyl
// acetoacetate 200.7; Kalinowski, from memory). Acid derivatives and
// nitriles feel 0.6 of it (methyl chloroacetate 167.8, methyl
// phenylacetate 172.0, diethyl malonate 166.6, chloroacetonitrile 114.9,
// benzyl cyanide 117.9).
func famAlphaX(s xsub) float64 {
	switch {
	case s == xCl:
		return -6.6
	case s == xBr || s == xI:
		return -7.5
	case s == xF:
		return -5.0
	case s == xOH || s == xOR || s == xOAr || s == xOSi:
		return -0.5
	case s >= xOH && s <= xOMinus:
		return -5.0
	case s == xNitro:
		return -8.0
	case s >= xNH2 && s <= xNPlus:
		return -1.5
	case s == xCN:
		return -8.0
	case isAcyl(s):
		return -5.5
	case s == xAryl || s == xHetAryl:
		return -0.3
	case s == xVinyl || s == xAlkynyl:
		return -1.5
	case s >= xSH && s <= xSOther:
		return -3.0
	case s == xSi:
		return 2.0
	}
	return -1.0
}

// conjRank orders the substituents x of a carbonyl carbon c for
// acylSubstituent: aryl and heteroaryl 0, C=C and C=N 1, others 2.
func (cx *cctx) conjRank(c, x int) int {
	if cx.skel[x] {
		return 2
	}
	switch cx.xclass(c, x) {
	case xAryl, xHetAryl:
		return 0
	case xVinyl, xImineC:
		return 1
	}
	return 2
}

// acylSubstituent adds the effect of substituent x (neighbour of the
// carbonyl or nitrile carbon c) for family f.
func (cx *cctx) acylSubstituent(c, x int, f acylFamily, nConj *int, r *cres) {
	g := cx.g
	m := cx.m
	ac := &r.ac
	if cx.skel[x] {
		k := 0
		gam := 0
		for _, nb := range g.Neighbors(x) {
			y := nb.Atom
			if y == c {
				continue
			}
			if cx.skel[y] {
				k++
				for _, n2 := range g.Neighbors(y) {
					if z := n2.Atom; z != x && z != c && cx.skel[z] {
						gam++
					}
				}
				continue
			}
			s := cx.xclass(x, y)
			v := famAlphaX(s)
			if f != famKetone && f != famAldehyde {
				v *= 0.6
			}
			ac.addCat(v, "α-carbon group: ", xtab[s].name)
			r.sigma += 0.8
		}
		if k > 0 {
			ac.add("α-carbon branching", famBranch[f][min(k, 3)])
		}
		if gam > 0 {
			per := -0.5
			if f == famNitrile {
				per = -1.0
			}
			ac.add("γ carbons", per*float64(gam))
		}
		return
	}
	s := cx.xclass(c, x)
	var v float64
	var name string
	switch {
	case s == xAryl || s == xHetAryl:
		v, name = famConj[f][0], "conjugated aryl"
		if *nConj > 0 {
			v *= 0.2 // benzophenone 196.7 vs acetophenone 198.1
		}
		if s == xHetAryl && len(m.aromRing(x)) == 5 {
			// 2-acetylfuran 186.8, 2-acetylthiophene 190.7, furfural
			// 177.9, methyl 2-furoate 159.1 (Kalinowski, from memory).
			ac.add("five-membered heteroaryl", [famOther + 1]float64{famKetone: -9, famAldehyde: -12, famAcid: -6, famEster: -6, famAmide: -5, famNitrile: -3}[f])
			r.sigma += 1.5
		}
		*nConj++
	case s == xVinyl || s == xImineC:
		v, name = famConj[f][1], "conjugated C=C"
		if *nConj > 0 {
			v *= 0.4 // cross-conjugated dienones, quinones
			r.sigma += 3
		}
		*nConj++
	case s == xAlkynyl:
		v, name = famConj[f][2], "conjugated C≡C"
		r.sigma += 1.5
	case isAcyl(s):
		v, name = famConj[f][3], "adjacent "+xtab[s].name
		if f == famKetone && s >= xCOOH && s <= xAcylCl {
			v = -14 // methyl pyruvate ketone C 191.8
		}
		r.sigma += 2
	default:
		v, name = -3, "estimate: "+xtab[s].name+" on the carbonyl carbon"
		r.sigma += 5
		r.est = true
	}
	ac.add(name, v)
}

// carbonyl predicts a C=O carbon: a base value per type (ketone,
// aldehyde, acid, ester, amide, acid halide, anhydride, carbonate,
// carbamate, urea, ...) plus the effects of its carbon substituents.
func (cx *cctx) carbonyl(c int, r *cres) {
	g := cx.g
	m := cx.m
	ac := &r.ac
	o := m.carbonylOf(c)
	var het []int // heteroatom neighbours (besides =O)
	var car []int // carbon neighbours
	for _, nb := range g.Neighbors(c) {
		x := nb.Atom
		if x == o {
			continue
		}
		if g.Atoms[x].Element == molecule.C {
			car = append(car, x)
		} else {
			het = append(het, x)
		}
	}
	el := func(x int) molecule.Element { return g.Atoms[x].Element }
	r.sigma = 1.5
	fam := famOther
	switch len(het) {
	case 0:
		if g.Atoms[c].HCount > 0 {
			fam = famAldehyde
			r.kind = "CHO (aldehyde)"
			if g.Atoms[c].HCount >= 2 {
				r.kind = "H2C=O (formaldehyde)"
				ac.add("formaldehyde", 194.0)
				r.sigma = 4
				return
			}
			ac.add("base aldehyde (acetaldehyde)", 200.5)
		} else {
			fam = famKetone
			r.kind = "C=O (ketone)"
			ac.add("base ketone (acetone)", 206.7)
			r.sigma = 2.0
		}
	case 1:
		x := het[0]
		formyl := len(car) == 0
		switch e := el(x); {
		case e == molecule.O && g.Atoms[x].Charge < 0:
			fam = famAcid
			r.kind = "COO⁻ (carboxylate)"
			ac.add("base carboxylate (acetate ion)", 181.5)
			r.sigma = 3
		case e == molecule.O && g.Atoms[x].HCount > 0:
			fam = famAcid
			r.kind = "COOH (acid)"
			if formyl {
				ac.add("formic acid", 166.3)
			} else {
				ac.add("base carboxylic acid (acetic acid)", 177.0)
				r.sigma = 2.0
			}
		case e == molecule.O:
			fam = famEster
			r.kind = "C=O (ester)"
			anhydride := false
			for _, nb := range g.Neighbors(x) {
				if nb.Atom != c && m.carbonylOf(nb.Atom) >= 0 {
					anhydride = true
				}
			}
			switch {
			case anhydride:
				fam = famAnhydride
				r.kind = "C=O (anhydride)"
				ac.add("base anhydride (acetic anhydride)", 166.5)
			case formyl:
				r.kind = "HC(=O)O (formate)"
				ac.add("base formate", 161.1)
			default:
				ac.add("base ester (methyl acetate)", 171.0)
			}
			if !anhydride {
				cx.esterAlcohol(c, x, r)
			}
		case e == molecule.N:
			fam = famAmide
			r.kind = "C=O (amide)"
			if formyl {
				r.kind = "HC(=O)N (formamide)"
				ac.add("base formamide (DMF)", 162.7)
			} else {
				ac.add("base amide (acetamide)", 171.0)
			}
			r.sigma = 2.0
			cx.amideNitrogen(c, x, r)
		case e == molecule.S:
			fam = famThioester
			r.kind = "C=O (thioester)"
			ac.add("base thioester (S-methyl thioacetate)", 195.5)
			r.sigma = 3
		case e.IsHalogen():
			fam = famAcylCl
			r.kind = "C=O (acid halide)"
			switch e {
			case molecule.Cl:
				ac.add("base acid chloride (acetyl chloride)", 170.4)
			case molecule.Br:
				ac.add("base acid bromide (acetyl bromide)", 165.6)
			case molecule.F:
				ac.add("base acid fluoride (acetyl fluoride)", 161.0)
				r.sigma = 3
			default:
				ac.add("estimate: acid iodide", 160.0)
				r.sigma = 6
			}
		default:
			r.kind = "C=O (unusual)"
			ac.addCat(215, "estimate: acyl on ", e.String())
			r.sigma = 15
			r.estimate("carbonyl bonded to " + e.String() + " is outside the tables: rough estimate")
		}
	default:
		// Two heteroatoms: carbonic acid derivatives (dimethyl carbonate
		// 156.5, diethyl carbonate 155.1, diphenyl carbonate 152.1; methyl
		// carbamate 157.9, Boc 155.8; urea 160.3 (DMSO), tetramethylurea
		// 165.6; methyl chloroformate 150.8; Kalinowski, from memory).
		a, b := el(het[0]), el(het[1])
		if a > b {
			a, b = b, a
		}
		r.sigma = 2.5
		switch {
		case a == molecule.O && b == molecule.O:
			r.kind = "O–C(=O)–O (carbonate)"
			ac.add("base carbonate", 155.5)
			for _, x := range het {
				cx.esterAlcohol(c, x, r)
			}
		case a == molecule.N && b == molecule.O:
			r.kind = "N–C(=O)–O (carbamate)"
			ac.add("base carbamate", 156.5)
			for _, x := range het {
				if el(x) == molecule.O {
					cx.esterAlcohol(c, x, r)
				}
			}
			fam = famAmide
		case a == molecule.N && b == molecule.N:
			r.kind = "N–C(=O)–N (urea)"
			ac.add("base urea", 158.5)
			fam = famAmide
		case a == molecule.O && b.IsHalogen():
			r.kind = "chloroformate C=O"
			ac.add("base chloroformate", 150.8)
		case a == molecule.N && b.IsHalogen():
			r.kind = "carbamoyl chloride C=O"
			ac.add("base carbamoyl chloride", 149.5)
			r.sigma = 4
		case a.IsHalogen() && b.IsHalogen():
			r.kind = "carbonyl dihalide"
			ac.add("estimate: carbonyl dihalide", 143.0)
			r.sigma = 6
		case a == molecule.O && b == molecule.S, a == molecule.N && b == molecule.S:
			r.kind = "thiocarbonate/thiocarbamate C=O"
			ac.add("estimate: S-alkyl thiocarbonate/thiocarbamate", 168.0)
			r.sigma = 5
		default:
			r.kind = "C=O (unusual)"
			ac.add("estimate: carbonyl between two heteroatoms", 160.0)
			r.sigma = 10
			r.estimate("carbonyl between unusual heteroatoms: rough estimate")
		}
		if size := cx.carbonylRing(c); size == 5 {
			ac.add("five-membered ring", 2.5)
		}
		return
	}
	// The first conjugated group takes its full effect and the second an
	// attenuated one; an aryl goes first (chalcone C=O 190.5, phenyl vinyl
	// ketone 191; Pretsch, from memory: the aryl-first sum is the closer),
	// so the order of the atoms in the input does not matter.
	if len(car) == 2 && cx.conjRank(c, car[1]) < cx.conjRank(c, car[0]) {
		car[0], car[1] = car[1], car[0]
	}
	nConj := 0
	for _, x := range car {
		cx.acylSubstituent(c, x, fam, &nConj, r)
	}
	for _, x := range car {
		if cx.chelatingOH(x) >= 0 {
			// An OH ortho on the aryl ring binds to the C=O oxygen
			// (intramolecular hydrogen bond): salicylaldehyde 196.5 vs
			// benzaldehyde 192.3, 2'-hydroxyacetophenone 204.5 vs
			// acetophenone 198.1, methyl salicylate 170.6 vs methyl
			// benzoate 167.0 (Pretsch, from memory).
			v := [famOther + 1]float64{famKetone: 6.0, famAldehyde: 4.0, famEster: 3.5, famAcid: 3.5, famAmide: 3.5}[fam]
			if v != 0 {
				ac.add("hydrogen bond to an ortho OH (chelate)", v)
			}
		}
	}
	if size := cx.carbonylRing(c); size > 0 {
		if v := famRing(fam, size); v != 0 {
			ac.addCat(v, "ring (", itoa(size), "-membered)")
		}
		if size <= 4 {
			r.sigma += 3
		}
	}
}

// carbonylRing returns the size of the smallest ring through carbon c, or
// 0.
func (cx *cctx) carbonylRing(c int) int {
	return int(cx.m.ringAtom[c])
}

// esterAlcohol adds the effect of the alcohol part of an ester on the
// carbonyl carbon c through oxygen o: phenyl acetate 169.5, vinyl
// acetate 167.6, tert-butyl acetate 170.3 against methyl acetate 171.0
// (Kalinowski, from memory).
func (cx *cctx) esterAlcohol(c, o int, r *cres) {
	g := cx.g
	for _, nb := range g.Neighbors(o) {
		y := nb.Atom
		if y == c {
			continue
		}
		switch {
		case cx.m.arom[y]:
			r.ac.add("O-aryl ester", -1.6)
		case cx.skel[y] && cx.skelDegree(y) == 3:
			r.ac.add("O-tert-alkyl ester", -0.8)
		case g.Atoms[y].Element == molecule.C && cx.m.multi[y] > 0:
			r.ac.add("O-vinyl ester", -3.4)
		}
	}
}

// amideNitrogen adds the effect of the nitrogen's substituents on an amide
// carbonyl c: N-aryl (acetanilide 168.5), N-acyl (imides, diacetamide
// 172.9); Kalinowski, from memory.
func (cx *cctx) amideNitrogen(c, n int, r *cres) {
	g := cx.g
	for _, nb := range g.Neighbors(n) {
		y := nb.Atom
		if y == c {
			continue
		}
		switch {
		case cx.m.arom[y]:
			r.ac.add("N-aryl amide", -2.5)
		case cx.m.carbonylOf(y) >= 0:
			r.ac.add("imide (N-acyl)", 1.0)
		}
	}
}

// thiocarbonyl predicts a C=S carbon (thioketones ~240, thioamides 200–207,
// thioureas ~183, thionoesters ~220, dithioesters ~225, xanthates ~214,
// dithiocarbamates ~196, trithiocarbonates ~222; Kalinowski, from
// memory).
func (cx *cctx) thiocarbonyl(c int, r *cres) {
	g := cx.g
	s := cx.m.thioCarbonylOf(c)
	var nO, nN, nS, nC int
	for _, nb := range g.Neighbors(c) {
		if nb.Atom == s {
			continue
		}
		switch g.Atoms[nb.Atom].Element {
		case molecule.O:
			nO++
		case molecule.N:
			nN++
		case molecule.S:
			nS++
		default:
			nC++
		}
	}
	r.sigma = 5
	ac := &r.ac
	r.kind = "C=S"
	switch {
	case nN == 2:
		ac.add("base thiourea", 182.5)
	case nN == 1 && nS == 1:
		ac.add("base dithiocarbamate", 196.0)
	case nN == 1 && nO == 1:
		ac.add("base O-thiocarbamate", 188.0)
	case nN == 1:
		ac.add("base thioamide", 202.0)
	case nS == 2:
		ac.add("base trithiocarbonate", 222.0)
	case nS == 1 && nO == 1:
		ac.add("base xanthate", 214.0)
	case nS == 1:
		ac.add("base dithioester", 225.0)
	case nO == 1:
		ac.add("base thionoester", 220.0)
	case g.Atoms[c].HCount > 0:
		ac.add("estimate: thioaldehyde", 230.0)
		r.sigma = 10
		r.estimate("thioaldehyde carbon: rough estimate")
	default:
		ac.add("base thioketone", 240.0)
		r.sigma = 8
	}
}

// nitrile predicts a C≡N carbon: acetonitrile 116.4 (Gottlieb 1997) plus
// the effects of its substituent.
func (cx *cctx) nitrile(c int, r *cres) {
	g := cx.g
	r.kind = "C≡N (nitrile)"
	r.sigma = 1.5
	ac := &r.ac
	ac.add("base nitrile (acetonitrile)", 116.4)
	nConj := 0
	for _, nb := range g.Neighbors(c) {
		x := nb.Atom
		if nb.Order == molecule.Triple {
			continue
		}
		if g.Atoms[x].Element == molecule.C {
			cx.acylSubstituent(c, x, famNitrile, &nConj, r)
			continue
		}
		// Cyanamides 117.9, cyanates ~109, thiocyanates 112.6 (Kalinowski,
		// from memory).
		switch g.Atoms[x].Element {
		case molecule.N:
			ac.add("N–C≡N (cyanamide)", 1.5)
		case molecule.O:
			ac.add("O–C≡N (cyanate)", -7.0)
		case molecule.S:
			ac.add("S–C≡N (thiocyanate)", -4.0)
		default:
			ac.addCat(-10, "estimate: C≡N on ", g.Atoms[x].Element.String())
			r.sigma = 8
			r.estimate("nitrile carbon on an unusual atom: rough estimate")
		}
		r.sigma += 1.5
	}
	if g.Atoms[c].HCount > 0 {
		ac.add("hydrogen cyanide", -5.0)
		r.sigma = 3
	}
}

// imine predicts a C=N carbon: aldimines ~161 (aryl) / ~166 (alkyl),
// ketimines ~168–171, oximes (acetaldoxime 146.5, benzaldoxime 150.3,
// acetone oxime 155.5, acetophenone oxime 156.0), hydrazones ~140–150,
// amidines, imidates and guanidines 155–165 (Kalinowski, Pretsch, from
// memory).
func (cx *cctx) imine(c int, r *cres) {
	g := cx.g
	m := cx.m
	ac := &r.ac
	r.sigma = 3
	n := -1
	for _, nb := range g.Neighbors(c) {
		if nb.Order == molecule.Double && g.Atoms[nb.Atom].Element == molecule.N {
			n = nb.Atom
		}
	}
	nType := 'C'
	for _, nb := range g.Neighbors(n) {
		if nb.Atom == c {
			continue
		}
		switch g.Atoms[nb.Atom].Element {
		case molecule.O:
			nType = 'O'
		case molecule.N:
			if nType != 'O' {
				nType = 'N'
			}
		}
	}
	var carbons, hetero int
	aryl := false
	for _, nb := range g.Neighbors(c) {
		x := nb.Atom
		if x == n {
			continue
		}
		if g.Atoms[x].Element == molecule.C {
			carbons++
			if m.arom[x] || m.multi[x] > 0 {
				aryl = true
			}
		} else {
			hetero++
		}
	}
	if hetero > 0 {
		r.kind = "C=N (amidine/imidate/guanidine)"
		ac.add("base amidine-type C", 157.0+3*float64(carbons))
		r.sigma = 5
		return
	}
	ket := carbons >= 2
	var base float64
	switch nType {
	case 'O':
		r.kind = "C=N–O (oxime)"
		base = [2][2]float64{{148.5, 150.0}, {156.5, 156.0}}[b2i(ket)][b2i(aryl)]
	case 'N':
		r.kind = "C=N–N (hydrazone)"
		base = [2][2]float64{{145.0, 142.0}, {150.0, 148.0}}[b2i(ket)][b2i(aryl)]
		r.sigma = 4
	default:
		r.kind = "C=N (imine)"
		base = [2][2]float64{{166.0, 161.5}, {171.0, 167.0}}[b2i(ket)][b2i(aryl)]
	}
	ac.addCat(base, "base ", r.kind)
	for _, nb := range g.Neighbors(c) {
		x := nb.Atom
		if x == n || !cx.skel[x] {
			continue
		}
		k := cx.skelDegree(x) - 0
		if k > 0 {
			ac.add("α-carbon branching", 2.5*float64(min(k, 3)))
		}
	}
	if m.ringAtom[c] == 5 {
		ac.add("five-membered ring", 5.0)
		r.sigma += 2
	}
}

func b2i(b bool) int {
	if b {
		return 1
	}
	return 0
}

// acceptorOn reports whether alkene carbon q (partner of c) carries a C=O
// or C≡N group.
func (cx *cctx) acceptorOn(q, c int) bool {
	for _, nb := range cx.g.Neighbors(q) {
		if nb.Atom == c || nb.Order != molecule.Single {
			continue
		}
		switch cx.xclass(q, nb.Atom) {
		case xCHO, xKetone, xConjKetone, xCOOH, xEster, xAmide, xAcylCl, xAnhydride, xCN:
			return true
		}
	}
	return false
}

// allSkeletonRing reports whether the smallest ring (of rs atoms) through
// the double bond c=q has, besides c and q, only sp3 carbons.
func (cx *cctx) allSkeletonRing(c, q, rs int) bool {
	g := cx.g
	// shortest path from c to q avoiding the double bond, through sp3
	// carbons only
	dist := cx.scratch()
	for i := range dist {
		dist[i] = -1
	}
	dist[c] = 0
	queue := append(cx.q2[:0], c)
	defer func() { cx.q2 = queue }()
	for h := 0; h < len(queue); h++ {
		v := queue[h]
		for _, nb := range g.Neighbors(v) {
			w := nb.Atom
			if dist[w] >= 0 || (v == c && w == q) {
				continue
			}
			if w == q {
				return int(dist[v])+2 == rs
			}
			if !cx.skel[w] {
				continue
			}
			dist[w] = dist[v] + 1
			queue = append(queue, w)
		}
	}
	return false
}
