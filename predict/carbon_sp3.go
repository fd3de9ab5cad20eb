package predict

import (
	"strconv"

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
		ac.add("α carbons ×"+strconv.Itoa(n[1]), gpAlpha*float64(n[1]))
	}
	if n[2] > 0 {
		ac.add("β carbons ×"+strconv.Itoa(n[2]), gpBeta*float64(n[2]))
	}
	if n[3] > 0 {
		ac.add("γ carbons ×"+strconv.Itoa(n[3]), gpGamma*float64(n[3]))
	}
	if n[4] > 0 {
		ac.add("δ carbons ×"+strconv.Itoa(n[4]), gpDelta*float64(n[4]))
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
		name := "ring (" + strconv.Itoa(size) + "-membered"
		if cx.skelCycle(c) == size {
			v = ringCarbo[s]
			name += " carbocycle)"
		} else {
			v = ringHetero[s]
			name += ", with heteroatom or sp2 atom)"
			r.sigma += 1.0
		}
		if size > 8 {
			v = -1
		}
		ac.add(name, v)
		if size <= 4 {
			r.sigma += 1.5
		}
	}
	// α substituents.
	var subs [4]xsub
	var subAt [4]int
	ns := 0
	nBeta := float64(n[2])
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
		z := &xtab[s].sp3
		v := z.a[deg] + z.kb*nBeta
		if cx.explain {
			ac.add("α: "+xtab[s].name, v)
		} else {
			ac.raw(v)
		}
		r.sigma += 0.4
		if xtab[s].est {
			r.sigma += 2.5
			r.est = true
		}
		if s == xAryl || s == xHetAryl {
			cx.benzylic(c, y, r)
		}
		// γ effect across the group: sp3 carbons on the far side of a
		// heteroatom or carbonyl (MTBE OCH3 49.4 vs dimethyl ether 60.0;
		// 3-pentanone CH2 35.5 vs butanone 36.9; from memory).
		if !cx.m.arom[y] {
			per := -2.0
			if g.Atoms[y].Element == molecule.C {
				per = -1.4
			}
			k := 0
			for _, n1 := range g.Neighbors(y) {
				x2 := n1.Atom
				if x2 == c || !cx.skel[x2] {
					continue
				}
				for _, n2 := range g.Neighbors(x2) {
					if z := n2.Atom; z != y && z != c && cx.skel[z] {
						k++
					}
				}
			}
			if k > 0 {
				ac.add("γ across "+xtab[s].name+" ×"+strconv.Itoa(k), per*float64(k))
			}
		}
	}
	for i := 0; i < ns; i++ {
		for j := i + 1; j < ns; j++ {
			ac.add("geminal "+xtab[subs[i]].name+"/"+xtab[subs[j]].name, gemPair(subs[i], subs[j]))
			r.sigma += 1.5
		}
	}
	_ = subAt
	// β substituents (on sp3 neighbours) and γ substituents (on sp3
	// carbons two bonds away).
	for _, n1 := range g.Neighbors(c) {
		x := n1.Atom
		if !cx.skel[x] {
			continue
		}
		degX := cx.skelDegree(x)
		for _, n2 := range g.Neighbors(x) {
			y := n2.Atom
			if y == c || cx.skel[y] || g.BondBetween(c, y) >= 0 {
				continue
			}
			s := cx.xclass(x, y)
			z := &xtab[s].sp3
			v := z.b + z.bb*float64(max(degX-1, 0))
			if cx.explain {
				ac.add("β: "+xtab[s].name, v)
			} else {
				ac.raw(v)
			}
			r.sigma += 0.2
		}
	}
	for z := range g.Atoms {
		if cx.dist[z] != 2 {
			continue
		}
		for _, n1 := range g.Neighbors(z) {
			y := n1.Atom
			if cx.skel[y] || g.BondBetween(c, y) >= 0 {
				continue
			}
			s := cx.xclass(z, y)
			if cx.explain {
				ac.add("γ: "+xtab[s].name, xtab[s].sp3.g)
			} else {
				ac.raw(xtab[s].sp3.g)
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
	dist := make([]int16, len(g.Atoms))
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
			queue := []int{p}
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
			r.ac.add("ortho substituent "+g.Atoms[v].Element.String()+" (γ)", e)
		}
	}
}
