package predict

import (
	"strconv"
	"strings"

	"shiftrank/molecule"
)

// sp3 predicts an sp3 carbon: the Grant–Paul value of the parent
// hydrocarbon skeleton (all sp3 carbons, groups replaced by H), steric
// and ring corrections, and the α, β and γ effects of every other group
// (xtab).
func (cx *cctx) sp3(c int, r *cres) {
	g := cx.g
	h := g.Atoms[c].HCount
	switch {
	case h >= 4:
		r.kind = "CH4"
	case h == 3:
		r.kind = "CH3 (sp3)"
	case h == 2:
		r.kind = "CH2 (sp3)"
	case h == 1:
		r.kind = "CH (sp3)"
	default:
		r.kind = "C (sp3, quaternary)"
	}
	r.sigma = 1.5
	ac := &r.ac
	if cx.trifluoromethyl(c, r) {
		return
	}
	// Skeleton distances from c.
	var n [5]int
	cx.skelBFS(c, 4)
	for i := range g.Atoms {
		if d := cx.dist[i]; d > 0 && d <= 4 {
			n[d]++
		}
	}
	ac.add("base (Grant–Paul)", gpBase)
	if n[1] > 0 {
		ac.addCat(gpAlpha*float64(n[1]), "α carbons ×", strconv.Itoa(n[1]))
	}
	if n[2] > 0 {
		ac.addCat(gpBeta*float64(n[2]), "β carbons ×", strconv.Itoa(n[2]))
	}
	if n[3] > 0 {
		ac.addCat(gpGamma*float64(n[3]), "γ carbons ×", strconv.Itoa(n[3]))
	}
	if n[4] > 0 {
		ac.addCat(gpDelta*float64(n[4]), "δ carbons ×", strconv.Itoa(n[4]))
	}
	degC := cx.skelDegree(c)
	steric := 0.0
	for _, nb := range g.Neighbors(c) {
		x := nb.Atom
		if !cx.skel[x] || cx.m.ringBond[nb.Bond] > 0 {
			continue
		}
		steric += gpSteric[min(degC, 4)][min(cx.skelDegree(x), 4)]
	}
	if steric != 0 {
		ac.add("steric (branching)", steric)
	}
	if size := int(cx.m.ringAtom[c]); size > 0 {
		s := min(size, 8)
		var v float64
		var name string
		if cx.skelCycle(c) == size {
			v = ringCarbo[s]
			if cx.explain {
				name = "ring (" + strconv.Itoa(size) + "-membered carbocycle)"
			}
		} else {
			// Several kinds at the least distance (a ring CH β to both
			// the C=O and the C=C of a cyclohexenone) take the mean of
			// their corrections.
			pos, kinds := cx.ringHeteroDistance(c)
			nk := 0
			var what []string
			for kind := range 3 {
				if kinds&(1<<kind) == 0 {
					continue
				}
				v += ringHetero[s][kind][pos]
				nk++
				if cx.explain {
					what = append(what, [3]string{"a heteroatom", "a C=X carbon", "a C=C carbon"}[kind])
				}
			}
			v /= float64(nk)
			if size == 3 && cx.ringHasElement(c, molecule.S) {
				v = -9 // thiirane 18.9 against oxirane 40.6 (Pretsch, from memory)
			}
			if cx.explain {
				name = "ring (" + strconv.Itoa(size) + "-membered, " + [4]string{"", "α", "β", "γ"}[pos] + " to " + strings.Join(what, " and ") + ")"
			}
			r.sigma += 1.0
		}
		if size > 8 {
			v = -1
		}
		ac.add(name, v)
		if size <= 4 {
			r.sigma += 1.5
		}
		if size == 3 {
			r.sigma += 1.5
			// A C=O or C≡N on the next ring carbon conjugates with the
			// cyclopropane: cyclopropyl methyl ketone CH2 10.4 against
			// cyclopropane −2.8 (Kalinowski, from memory).
			for _, nb := range g.Neighbors(c) {
				if cx.m.ringBond[nb.Bond] != 3 {
					continue
				}
				for _, n2 := range g.Neighbors(nb.Atom) {
					if cx.m.ringBond[n2.Bond] == 0 && isAcyl(cx.xclass(nb.Atom, n2.Atom)) {
						ac.add("cyclopropane next to C=O/C≡N", 11.0)
						r.sigma += 2
					}
				}
			}
		}
		// An exocyclic alkyl group on a ring carbon adds less than a
		// chain carbon: methylcyclohexane C1 33.0 against cyclohexane
		// 27.0 (+6.0, Pretsch cyclohexane increments) where Grant–Paul
		// counts +9.1.
		exo := 0
		for _, nb := range g.Neighbors(c) {
			if cx.skel[nb.Atom] && cx.m.ringBond[nb.Bond] == 0 {
				exo++
			}
		}
		if exo > 0 && size >= 5 {
			ac.add("exocyclic alkyl on a ring carbon", -3.0*float64(exo))
		}
	}
	// γ carbons anti rather than gauche: an equatorial group and the ring
	// carbons two bonds away (methylcyclohexane CH3 22.9, C3 26.6; Pretsch
	// cyclohexane increments: γ 0.0 for equatorial CH3).
	if anti := cx.antiGamma(c, func(z int) bool { return cx.skel[z] }); anti > 0 {
		ac.addCat(-gpGamma*float64(anti), "γ carbons anti in a ring (equatorial) ×", strconv.Itoa(anti))
	}
	// α substituents.
	var subs [4]xsub
	var subAt [4]int
	ns := 0
	hetAlpha := false
	// β carbons in the same ring of five or fewer atoms are not gauche to
	// the group (cyclopentanol C1 73.9 against cyclopentane 25.8: +48.1,
	// the full open-chain α effect; Kalinowski, from memory).
	nBeta := float64(n[2] - cx.smallRingBeta(c))
	deg := min(degC, 3)
	for _, nb := range g.Neighbors(c) {
		y := nb.Atom
		if cx.skel[y] {
			continue
		}
		s := cx.xclass(c, y)
		if ns < 4 {
			subs[ns], subAt[ns] = s, y
			ns++
		}
		if g.Atoms[y].Element != molecule.C {
			hetAlpha = true
		}
		z := &xtab[s].sp3
		v := z.a[deg] + z.kb*nBeta
		if cx.explain {
			ac.addCat(v, "α: ", xtab[s].name)
		} else {
			ac.raw(v)
		}
		r.sigma += 0.4
		if xtab[s].est {
			r.sigma += 2.5
			r.est = true
		}
		if rb := cx.m.ringBond[nb.Bond]; (s == xOAcyl || s == xOCarbonyl2 || s == xAmideNH || s == xAmideNR) && rb >= 5 && rb <= 7 {
			// γ-butyrolactone OCH2 68.6, δ-valerolactone 69.4 and
			// 2-pyrrolidinone NCH2 42.5 against THF 68.0, THP 68.7 and
			// pyrrolidine 47.0, where the open-chain increments predict
			// ester and amide α carbons ~5–10 ppm below ethers and amines
			// (Pretsch, Kalinowski, from memory).
			ac.add("lactone/lactam ring", 6.5)
		}
		switch {
		case s == xAryl || s == xHetAryl:
			cx.benzylic(c, y, r)
		case s == xVinyl && cx.m.multi[y] == 1:
			cx.allylic(c, y, nb.Bond, r)
		}
		// γ effect across the group: sp3 carbons on the far side of a
		// heteroatom or carbonyl (MTBE OCH3 49.5 against dimethyl ether
		// 60.0: −3.6 each across O and N, also fitting Et2O/Me2O and
		// Et3N/Me3N; 3-pentanone CH2 35.5 against butanone 36.9: −1.4
		// across C=O; −2.0 across S; from memory).
		if !cx.m.arom[y] {
			per := gammaAcross(g.Atoms[y].Element)
			k := 0
			for _, n1 := range g.Neighbors(y) {
				x2 := n1.Atom
				if x2 == c || !cx.skel[x2] {
					continue
				}
				for _, n2 := range g.Neighbors(x2) {
					z := n2.Atom
					if z == y || z == c || !cx.skel[z] {
						continue
					}
					if cx.antiPath(nb.Bond, n1.Bond, n2.Bond) || (cx.dist[z] >= 0 && cx.dist[z] <= 2) || cx.nextToNeighbour(c, z) {
						continue
					}
					k++
				}
				// A heteroatom on the far carbon (the OCH2 of an acetal,
				// 1,1-diethoxyethane 60.8 against diethyl ether 65.9;
				// Kalinowski, from memory).
				if g.Atoms[y].Element != molecule.C {
					for _, n2 := range g.Neighbors(x2) {
						if z := n2.Atom; z != y && !cx.skel[z] && g.Atoms[z].Element != molecule.C && !cx.nextToNeighbour(c, z) && g.BondBetween(c, z) < 0 {
							ac.add("heteroatom across "+g.Atoms[y].Element.String(), -4.0)
						}
					}
				}
			}
			if k > 0 {
				ac.addCat(per*float64(k), "γ across ", xtab[s].name, " ×", strconv.Itoa(k))
			}
		}
	}
	for i := 0; i < ns; i++ {
		for j := i + 1; j < ns; j++ {
			ac.addCat(gemPair(subs[i], subs[j]), "geminal ", xtab[subs[i]].name, "/", xtab[subs[j]].name)
			r.sigma += 1.5
		}
	}
	partOfAlpha := func(y int) bool {
		for _, a := range subAt[:ns] {
			if g.BondBetween(a, y) >= 0 {
				return true
			}
		}
		return false
	}
	// β substituents (on sp3 neighbours): smaller on a branched carbon
	// (2-methyl-1-propanol CH 30.8 and isobutyl chloride CH 31.0 against
	// isobutane 25.2: about half of Zβ) and next to another heteroatom
	// (1,2-dichloroethane 43.5 against chloroethane 39.9; DME 71.8,
	// 1,4-dioxane 67.1: about half; Gottlieb 1997, from memory).
	betaScale := [5]float64{1, 1, 1, 0.55, 0.45}[min(degC, 4)]
	for _, n1 := range g.Neighbors(c) {
		x := n1.Atom
		if !cx.skel[x] {
			continue
		}
		degX := cx.skelDegree(x)
		for _, n2 := range g.Neighbors(x) {
			y := n2.Atom
			if y == c || cx.skel[y] || g.BondBetween(c, y) >= 0 || partOfAlpha(y) {
				continue
			}
			s := cx.xclass(x, y)
			z := &xtab[s].sp3
			v := (z.b + z.bb*float64(max(degX-1, 0))) * betaScale
			if s == xF && cx.countElem(x, molecule.F) >= 2 {
				// β effects of CF2/CF3 are far below three times one F
				// (2,2,2-trifluoroethanol CH2 61.4 against ethanol 58.3;
				// Kalinowski, from memory).
				v = 2.5 * betaScale
			}
			note := ""
			if hetAlpha && g.Atoms[y].Element != molecule.C {
				v *= 0.5
				note = " (vicinal to a heteroatom, ×0.5)"
			}
			ac.addCat(v, "β: ", xtab[s].name, note)
			r.sigma += 0.2
		}
	}
	// γ substituents (on sp3 carbons two bonds away); ×0.4 when anti
	// across a ring (cyclohexanol C3 24.4 against cyclohexane 27.0:
	// −2.6 where the open-chain Zγ is −6.2; Pretsch).
	for _, n1 := range g.Neighbors(c) {
		x := n1.Atom
		if !cx.skel[x] {
			continue
		}
		for _, n2 := range g.Neighbors(x) {
			z := n2.Atom
			if z == c || !cx.skel[z] || cx.dist[z] != 2 {
				continue
			}
			for _, n3 := range g.Neighbors(z) {
				y := n3.Atom
				if cx.skel[y] || g.BondBetween(c, y) >= 0 || partOfAlpha(y) {
					continue
				}
				s := cx.xclass(z, y)
				v := xtab[s].sp3.g
				note := ""
				if cx.antiPath(n1.Bond, n2.Bond, n3.Bond) || cx.exoOnFiveRing(n1.Bond, n2.Bond, n3.Bond) {
					v *= 0.4
					note = " (anti in a ring)"
				}
				ac.addCat(v, "γ: ", xtab[s].name, note)
			}
		}
	}
	if g.Atoms[c].Charge != 0 {
		r.estimate("charged sp3 carbon: predicted as if neutral")
	}
}

// skelBFS fills cx.dist with distances from s through skeleton atoms
// (sp3 carbons) up to maxD; -1 elsewhere. s itself need not be skeleton.
func (cx *cctx) skelBFS(s, maxD int) {
	for i := range cx.dist {
		cx.dist[i] = -1
	}
	q := cx.queue[:0]
	q = append(q, s)
	cx.dist[s] = 0
	for h := 0; h < len(q); h++ {
		v := q[h]
		if int(cx.dist[v]) >= maxD {
			continue
		}
		for _, nb := range cx.g.Neighbors(v) {
			w := nb.Atom
			if !cx.skel[w] || cx.dist[w] >= 0 {
				continue
			}
			cx.dist[w] = cx.dist[v] + 1
			q = append(q, w)
		}
	}
	cx.queue = q
}

// skelDegree returns the number of sp3-carbon neighbours of x.
func (cx *cctx) skelDegree(x int) int {
	k := 0
	for _, nb := range cx.g.Neighbors(x) {
		if cx.skel[nb.Atom] {
			k++
		}
	}
	return k
}

// skelCycle returns the size of the smallest ring through c made of
// skeleton atoms only, or 0. It uses its own scratch (not cx.dist).
func (cx *cctx) skelCycle(c int) int {
	g := cx.g
	nbs := g.Neighbors(c)
	best := 0
	dist := cx.scratch()
	for i := 0; i < len(nbs); i++ {
		p := nbs[i].Atom
		if !cx.skel[p] {
			continue
		}
		for j := i + 1; j < len(nbs); j++ {
			q := nbs[j].Atom
			if !cx.skel[q] {
				continue
			}
			for k := range dist {
				dist[k] = -1
			}
			dist[p] = 0
			queue := append(cx.q2[:0], p)
			for h := 0; h < len(queue); h++ {
				v := queue[h]
				for _, nb := range g.Neighbors(v) {
					w := nb.Atom
					if w == c || !cx.skel[w] || dist[w] >= 0 {
						continue
					}
					dist[w] = dist[v] + 1
					queue = append(queue, w)
				}
			}
			cx.q2 = queue
			if d := int(dist[q]); d > 0 && (best == 0 || d+2 < best) {
				best = d + 2
			}
		}
	}
	return best
}

// benzylic adds the corrections for an sp3 carbon c on aromatic atom y:
// the ring position relative to ring heteroatoms (2-, 3- and
// 4-methylpyridine CH3 24.5, 18.5, 21.0 against toluene 21.4;
// 2-methylfuran 13.5, 2-methylthiophene 15.0, 2-methylpyrrole 12.9) and
// the γ effect of ortho substituents (o-xylene 19.7, 2-methylanisole
// 16.2, o-toluidine 17.4, 2-fluorotoluene 14.3, 2-chlorotoluene 19.9,
// 2-bromotoluene 22.9, 2-iodotoluene 28.1, 1-methylnaphthalene 19.4);
// Pretsch, Kalinowski, from memory.
func (cx *cctx) benzylic(c, y int, r *cres) {
	g := cx.g
	m := cx.m
	ring := m.aromRing(y)
	if len(ring) == 5 && m.hetRing[y] {
		r.ac.add("five-membered heteroaromatic ring", -7.0)
		r.sigma += 1.0
	}
	if len(ring) == 6 {
		for k := 1; k < 6; k++ {
			if g.Atoms[ring[k]].Element == molecule.N {
				switch min(k, 6-k) {
				case 1:
					r.ac.add("ring N α to the attachment", 3.0)
				case 2:
					r.ac.add("ring N β to the attachment", -2.5)
				case 3:
					r.ac.add("ring N γ to the attachment", -0.5)
				}
			}
		}
	}
	for _, n1 := range g.Neighbors(y) {
		w := n1.Atom
		if !m.arom[w] || cx.aromBond == nil || !cx.aromBond[n1.Bond] {
			continue
		}
		for _, n2 := range g.Neighbors(w) {
			v := n2.Atom
			if v == y || (cx.aromBond[n2.Bond] && inRing(ring, v)) {
				continue
			}
			var e float64
			switch g.Atoms[v].Element {
			case molecule.C:
				e = -1.6
			case molecule.O:
				e = -5.0
			case molecule.N:
				e = -3.5
			case molecule.F:
				e = -7.0
			case molecule.Cl:
				e = -1.5
			case molecule.Br:
				e = 1.5
			case molecule.I:
				e = 6.6
			case molecule.S:
				e = -2.0
			default:
				e = -1.0
			}
			r.ac.addCat(e, "ortho substituent ", g.Atoms[v].Element.String(), " (γ)")
		}
	}
}

// gammaAcross is the γ effect of an sp3 carbon reached across a
// heteroatom or carbonyl group (see sp3).
func gammaAcross(e molecule.Element) float64 {
	switch e {
	case molecule.O, molecule.N:
		return -3.6
	case molecule.C:
		return -1.4
	}
	return -2.0
}

// antiPath reports whether the path of bonds b1–b2–b3 runs anti across a
// ring: b2 is a bond of a ring of six or more atoms and exactly one of b1,
// b3 is a ring bond (an equatorial group and the ring atoms two bonds
// away).
func (cx *cctx) antiPath(b1, b2, b3 int) bool {
	rb := cx.m.ringBond
	if rb[b2] < 6 {
		return false
	}
	return (rb[b1] > 0) != (rb[b3] > 0)
}

// antiGamma counts the atoms z (accepted by ok) three bonds from c along
// paths that run anti across a ring (antiPath), each counted once.
func (cx *cctx) antiGamma(c int, ok func(int) bool) int {
	g := cx.g
	k := 0
	for _, n1 := range g.Neighbors(c) {
		x := n1.Atom
		if !cx.skel[x] {
			continue
		}
		for _, n2 := range g.Neighbors(x) {
			y := n2.Atom
			if y == c || !cx.skel[y] {
				continue
			}
			for _, n3 := range g.Neighbors(y) {
				z := n3.Atom
				if z == x || z == c || !ok(z) || cx.dist[z] != 3 {
					continue
				}
				if cx.antiPath(n1.Bond, n2.Bond, n3.Bond) {
					k++
				}
			}
		}
	}
	return k
}

// ringHeteroDistance returns 1, 2 or 3 (3 or more): the bond distance from
// ring carbon c to the nearest ring atom of its ring system that is not an
// sp3 carbon, and the kinds (bits 1<<ringHet, 1<<ringExo, 1<<ringEndo)
// of every such atom at that distance.
func (cx *cctx) ringHeteroDistance(c int) (int, uint8) {
	g := cx.g
	m := cx.m
	sys := m.rsys[c]
	dist := cx.scratch()
	for i := range dist {
		dist[i] = -1
	}
	dist[c] = 0
	queue := append(cx.q2[:0], c)
	defer func() { cx.q2 = queue }()
	// Every kind met at the least distance is returned: which of two
	// atoms at one distance the search meets first follows the atom
	// order, which must not change the prediction.
	found, kinds := -1, uint8(0)
	for h := 0; h < len(queue); h++ {
		v := queue[h]
		if found >= 0 && int(dist[v]) > found {
			break
		}
		if v != c && !cx.skel[v] {
			kind := ringHet
			if g.Atoms[v].Element == molecule.C {
				kind = ringEndo
				for _, nb := range g.Neighbors(v) {
					if nb.Order == molecule.Double && m.ringBond[nb.Bond] == 0 {
						kind = ringExo
					}
				}
			}
			found = int(dist[v])
			kinds |= 1 << kind
			continue
		}
		if dist[v] >= 3 || found >= 0 {
			continue
		}
		for _, nb := range g.Neighbors(v) {
			w := nb.Atom
			if dist[w] >= 0 || m.rsys[w] != sys || m.ringBond[nb.Bond] == 0 {
				continue
			}
			dist[w] = dist[v] + 1
			queue = append(queue, w)
		}
	}
	if found >= 0 {
		return min(found, 3), kinds
	}
	return 3, 1 << ringHet
}

// allylic adds the effects of the groups on the alkene carbon y (bonded to
// c by bond b) and on its partner: a second group on y (isobutylene CH3
// 24.2 against propene 19.4: +4.8) and the γ effect of groups on the
// partner, large when cis (Z-2-butene CH3 12.1, E 17.6; 2-methyl-2-butene
// 17.3 cis and 25.7 trans; Pretsch, from memory). The constitution fixes
// cis/trans only in small rings; otherwise the mean is used.
func (cx *cctx) allylic(c, y, b int, r *cres) {
	g := cx.g
	m := cx.m
	q, qb := -1, -1
	for _, nb := range g.Neighbors(y) {
		if nb.Order == molecule.Double && g.Atoms[nb.Atom].Element == molecule.C {
			q, qb = nb.Atom, nb.Bond
		}
	}
	if q < 0 || m.multi[q] != 1 {
		return
	}
	for _, nb := range g.Neighbors(y) {
		if nb.Atom != c && nb.Atom != q {
			r.ac.add("allylic: second group on the alkene carbon", 4.8)
		}
	}
	ringDbl := m.ringBond[qb] > 0 && m.ringBond[qb] <= 7
	for _, nb := range g.Neighbors(q) {
		if nb.Atom == y {
			continue
		}
		cisTo, fixed := cx.alkCis[[2]int{c, y}]
		switch {
		case !ringDbl && fixed && cisTo == nb.Atom:
			r.ac.add("allylic: cis group on the other alkene carbon", -7.0)
		case !ringDbl && fixed:
			r.ac.add("allylic: trans group on the other alkene carbon", -0.5)
		case !ringDbl:
			r.ac.add("allylic: group on the other alkene carbon (cis/trans mean)", -3.75)
			r.sigma += 0.8
		case (m.ringBond[b] > 0) == (m.ringBond[nb.Bond] > 0):
			if m.ringBond[qb] <= 5 {
				break // cyclopentene: the ring correction covers it
			}
			r.ac.add("allylic: cis group on the other alkene carbon", -7.0)
		default:
			r.ac.add("allylic: trans group on the other alkene carbon", -0.5)
		}
	}
}

// trifluoromethyl predicts a carbon with three or four fluorines from a
// base value, where the additive scheme fails: CF3 on carbon 124.5
// (2,2,2-trifluoroethanol 124.2, benzotrifluoride 124.3), on C=O 115
// (trifluoroacetic acid 114.8), CHF3 118.5, CF4 123.3 (Pretsch,
// Kalinowski, from memory). It reports whether it handled c.
func (cx *cctx) trifluoromethyl(c int, r *cres) bool {
	g := cx.g
	nF := 0
	for _, nb := range g.Neighbors(c) {
		if g.Atoms[nb.Atom].Element == molecule.F {
			nF++
		}
	}
	if nF < 3 {
		return false
	}
	r.kind = "CF3"
	r.sigma = 3
	switch {
	case nF >= 4:
		r.kind = "CF4"
		r.ac.add("tetrafluoromethane", 123.3)
		return true
	case g.Atoms[c].HCount > 0:
		r.kind = "CHF3"
		r.ac.add("fluoroform", 118.5)
		return true
	}
	r.ac.add("base CF3–C", 124.5)
	for _, nb := range g.Neighbors(c) {
		y := nb.Atom
		if g.Atoms[y].Element == molecule.F {
			continue
		}
		s := cx.xclass(c, y)
		switch {
		case isAcyl(s):
			r.ac.addCat(-9.5, "CF3 on ", xtab[s].name)
		case s == xAlkyl, s == xAryl, s == xHetAryl, s == xVinyl, s == xAlkynyl:
		default:
			r.ac.addCat(-3, "estimate: CF3 on ", xtab[s].name)
			r.sigma = 6
		}
	}
	return true
}

// countElem returns the number of neighbours of x of element e.
func (cx *cctx) countElem(x int, e molecule.Element) int {
	k := 0
	for _, nb := range cx.g.Neighbors(x) {
		if cx.g.Atoms[nb.Atom].Element == e {
			k++
		}
	}
	return k
}

// nextToNeighbour reports whether z is bonded to a neighbour of c (so it is
// two bonds from c, not three).
func (cx *cctx) nextToNeighbour(c, z int) bool {
	for _, nb := range cx.g.Neighbors(c) {
		if cx.g.BondBetween(nb.Atom, z) >= 0 {
			return true
		}
	}
	return false
}

// smallRingBeta counts the sp3 carbons two bonds from c inside c's ring
// when that ring has five or fewer atoms.
func (cx *cctx) smallRingBeta(c int) int {
	m := cx.m
	size := m.ringAtom[c]
	if size == 0 || size > 5 {
		return 0
	}
	k := 0
	for z := range cx.g.Atoms {
		if cx.dist[z] == 2 && m.rsys[z] == m.rsys[c] && m.ringAtom[z] <= 5 {
			k++
		}
	}
	return k
}

// exoOnFiveRing reports whether the path b1–b2–b3 goes from c along ring
// bonds of a five-membered ring to a group outside it (cyclopentanol C3
// 23.3 against cyclopentane 25.8: −2.5, where the open-chain Zγ of OH is
// −6.2).
func (cx *cctx) exoOnFiveRing(b1, b2, b3 int) bool {
	rb := cx.m.ringBond
	return rb[b1] == 5 && rb[b2] == 5 && rb[b3] == 0
}

// ringHasElement reports whether the ring system of c holds an atom of
// element e.
func (cx *cctx) ringHasElement(c int, e molecule.Element) bool {
	sys := cx.m.rsys[c]
	for i, a := range cx.g.Atoms {
		if a.Element == e && cx.m.rsys[i] == sys {
			return true
		}
	}
	return false
}
