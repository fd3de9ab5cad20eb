package predict

import (
	"math"
	"strconv"
	"sync"

	"shiftrank/molecule"
)

// ringParent is an unsubstituted aromatic ring system with the 13C shifts
// of its carbons, in the atom order of SMILES (NaN for heteroatoms and for
// the methyl that stands for any substituent on a ring nitrogen).
type ringParent struct {
	name   string
	smiles string
	shifts []float64
}

var nan = math.NaN()

// ringParents: parent aromatic ring systems in CDCl3. Pretsch (13C
// heteroaromatics tables) and Kalinowski, Berger, Braun ch. 4, recalled
// from memory; NH azoles are averaged over their fast tautomers.
var ringParents = []ringParent{
	{"benzene", "c1ccccc1", []float64{128.5, 128.5, 128.5, 128.5, 128.5, 128.5}},
	{"pyridine", "n1ccccc1", []float64{nan, 149.9, 123.7, 135.9, 123.7, 149.9}},
	{"pyrimidine", "n1cnccc1", []float64{nan, 158.4, nan, 156.9, 121.7, 156.9}},
	{"pyrazine", "n1ccncc1", []float64{nan, 145.1, 145.1, nan, 145.1, 145.1}},
	{"pyridazine", "n1ncccc1", []float64{nan, nan, 151.8, 126.6, 126.6, 151.8}},
	{"1,3,5-triazine", "n1cncnc1", []float64{nan, 166.1, nan, 166.1, nan, 166.1}},
	{"pyridine N-oxide", "[O-][n+]1ccccc1", []float64{nan, nan, 138.5, 125.6, 125.4, 125.6, 138.5}},
	{"pyrrole", "[nH]1cccc1", []float64{nan, 118.0, 108.1, 108.1, 118.0}},
	{"N-substituted pyrrole", "Cn1cccc1", []float64{nan, nan, 121.5, 108.0, 108.0, 121.5}},
	{"furan", "o1cccc1", []float64{nan, 142.7, 109.6, 109.6, 142.7}},
	{"thiophene", "s1cccc1", []float64{nan, 125.5, 127.3, 127.3, 125.5}},
	{"imidazole", "c1c[nH]cn1", []float64{122.0, 122.0, nan, 135.4, nan}},
	{"N-substituted imidazole", "Cn1ccnc1", []float64{nan, nan, 120.0, 129.4, nan, 137.8}},
	{"pyrazole", "[nH]1nccc1", []float64{nan, nan, 134.0, 105.0, 134.0}},
	{"N-substituted pyrazole", "Cn1cccn1", []float64{nan, nan, 130.0, 105.2, 138.7, nan}},
	{"oxazole", "o1ccnc1", []float64{nan, 138.1, 125.4, nan, 150.6}},
	{"thiazole", "s1ccnc1", []float64{nan, 119.7, 143.7, nan, 153.4}},
	{"isoxazole", "o1nccc1", []float64{nan, nan, 149.1, 103.7, 157.9}},
	{"isothiazole", "s1nccc1", []float64{nan, nan, 157.0, 123.4, 147.8}},
	{"1,2,4-triazole", "[nH]1cncn1", []float64{nan, 147.4, nan, 147.4, nan}},
	{"1,2,3-triazole", "[nH]1ccnn1", []float64{nan, 130.5, 130.5, nan, nan}},
	{"tetrazole", "[nH]1cnnn1", []float64{nan, 143.5, nan, nan, nan}},
	{"1,3,4-oxadiazole", "o1cnnc1", []float64{nan, 152.7, nan, nan, 152.7}},
	{"1,3,4-thiadiazole", "s1cnnc1", []float64{nan, 153.0, nan, nan, 153.0}},
	{"naphthalene", "c1cccc2ccccc12", []float64{128.0, 125.9, 125.9, 128.0, 133.6, 128.0, 125.9, 125.9, 128.0, 133.6}},
	{"indole", "c1ccc2[nH]ccc2c1", []float64{119.8, 122.0, 111.1, 135.8, nan, 124.2, 102.6, 127.9, 120.8}},
	{"N-substituted indole", "Cn1ccc2ccccc21", []float64{nan, nan, 128.8, 100.9, 128.5, 120.9, 119.3, 121.5, 109.2, 136.7}},
	{"benzofuran", "c1ccc2occc2c1", []float64{122.8, 124.3, 111.5, 155.0, nan, 144.9, 106.6, 127.5, 121.2}},
	{"benzothiophene", "c1ccc2sccc2c1", []float64{124.2, 124.3, 122.5, 139.7, nan, 126.2, 123.9, 139.8, 123.7}},
	{"quinoline", "c1ccc2ncccc2c1", []float64{126.5, 129.4, 129.4, 148.3, nan, 150.3, 121.0, 135.9, 128.2, 127.7}},
	{"isoquinoline", "c1ccc2cnccc2c1", []float64{130.3, 127.2, 127.6, 128.7, 152.6, nan, 143.1, 120.4, 135.7, 126.4}},
	{"benzimidazole", "c1ccc2[nH]cnc2c1", []float64{121.9, 121.9, 115.4, 138.0, nan, 141.5, nan, 138.0, 115.4}},
	{"benzoxazole", "c1ccc2ocnc2c1", []float64{124.5, 125.4, 110.9, 150.0, nan, 152.6, nan, 140.1, 120.5}},
	{"benzothiazole", "c1ccc2scnc2c1", []float64{126.2, 125.5, 121.9, 133.7, nan, 153.9, nan, 153.3, 123.6}},
}

// parentEntry is a ringParents entry indexed by canonical label.
type parentEntry struct {
	name    string
	byLabel []float64
}

// aromaticParents maps the canonical key of each parent ring system to
// its shifts; built once, read-only afterwards.
var aromaticParents = sync.OnceValue(func() map[string]parentEntry {
	out := make(map[string]parentEntry, len(ringParents))
	for _, p := range ringParents {
		g, err := molecule.ParseSMILES(p.smiles)
		if err != nil || len(g.Atoms) != len(p.shifts) {
			panic("predict: bad aromatic parent " + p.smiles)
		}
		cn := molecule.Canonicalize(g)
		e := parentEntry{name: p.name, byLabel: make([]float64, len(p.shifts))}
		for i, l := range cn.Labels {
			e.byLabel[l] = p.shifts[i]
		}
		out[cn.Key] = e
	}
	return out
})

// assignParents finds each aromatic ring system of the molecule, strips
// its substituents (H on carbon, a methyl on a ring nitrogen, O⁻ kept on
// an N-oxide) and looks the bare system up in ringParents.
func (cx *cctx) assignParents() {
	g := cx.g
	m := cx.m
	n := len(g.Atoms)
	cx.parent = make([]float64, n)
	cx.parentOf = make([]string, n)
	for i := range cx.parent {
		cx.parent[i] = nan
	}
	comp := make([]int, n)
	for i := range comp {
		comp[i] = -1
	}
	table := aromaticParents()
	canon := &m.w.canon // the orbits are already copied out (refine.go)
	for s := range g.Atoms {
		if !m.arom[s] || comp[s] >= 0 {
			continue
		}
		members := []int{s}
		comp[s] = s
		for h := 0; h < len(members); h++ {
			for _, nb := range g.Neighbors(members[h]) {
				if cx.aromBond[nb.Bond] && comp[nb.Atom] < 0 {
					comp[nb.Atom] = s
					members = append(members, nb.Atom)
				}
			}
		}
		idx := make(map[int]int, len(members))
		for i, a := range members {
			idx[a] = i
		}
		sub := molecule.NewGraph(len(members) + 2)
		for _, a := range members {
			at := g.Atoms[a]
			hc := at.HCount
			if at.Element == molecule.C {
				for _, nb := range g.Neighbors(a) {
					if _, in := idx[nb.Atom]; !in {
						hc += int(nb.Order)
					}
				}
			}
			k := sub.AddAtom(at.Element, hc)
			sub.Atoms[k].Charge = at.Charge
		}
		for _, a := range members {
			for _, nb := range g.Neighbors(a) {
				if j, in := idx[nb.Atom]; in {
					if a < nb.Atom {
						sub.MustAddBond(idx[a], j, nb.Order)
					}
					continue
				}
				if g.Atoms[a].Element == molecule.C {
					continue
				}
				// A substituent on a ring heteroatom: O⁻ of an N-oxide
				// kept, anything else stands as a methyl.
				y := g.Atoms[nb.Atom]
				var k int
				if y.Element == molecule.O && y.Charge < 0 {
					k = sub.AddAtom(molecule.O, 0)
					sub.Atoms[k].Charge = -1
				} else {
					k = sub.AddAtom(molecule.C, 3)
				}
				sub.MustAddBond(idx[a], k, molecule.Single)
			}
		}
		cn := canon.Canonicalize(sub)
		e, ok := table[cn.Key]
		if !ok {
			continue
		}
		for i, a := range members {
			if g.Atoms[a].Element == molecule.C {
				cx.parent[a] = e.byLabel[cn.Labels[i]]
				cx.parentOf[a] = e.name
			}
		}
	}
}

// Ring nitrogen increments for six-membered rings outside ringParents,
// from pyridine against benzene (α +21.4, β −4.8, γ +7.4).
var ringNInc = [4]float64{0, 21.4, -4.8, 7.4}

// fusedInc: a fused aromatic ring treated as a substituent {ipso, ortho,
// meta, para}, solved from naphthalene (128.0, 125.9, 133.6) with the
// meta term set to 0.
var fusedInc = [4]float64{5.6, -0.5, 0.0, -2.6}

// aromatic predicts an aromatic carbon: the parent ring system's value
// (ringParents, or benzene with ring-N increments) plus the benzene
// ipso/ortho/meta/para increments of every substituent on its ring.
func (cx *cctx) aromatic(c int, r *cres) {
	g := cx.g
	m := cx.m
	ac := &r.ac
	r.kind = "aromatic C"
	if g.Atoms[c].HCount > 0 {
		r.kind = "aromatic CH"
	}
	ring := m.aromRing(c)
	ring = append([]int(nil), ring...) // aromRing's storage is reused
	size := len(ring)
	hasParent := cx.parent != nil && !math.IsNaN(cx.parent[c])
	hetero := false
	for _, x := range ring {
		if g.Atoms[x].Element != molecule.C {
			hetero = true
		}
	}
	switch {
	case hasParent:
		ac.addCat(cx.parent[c], "base ", cx.parentOf[c])
		r.sigma = 1.0
		if hetero || cx.parentOf[c] != "benzene" {
			r.kind = "heteroaromatic " + r.kind[len("aromatic "):]
			if cx.parentOf[c] == "naphthalene" {
				r.kind = "aromatic " + r.kind[len("heteroaromatic "):]
			}
			r.sigma = 1.5
		}
	case size == 6:
		ac.add("base benzene", 128.5)
		r.sigma = 3
		for k := 1; k < 6; k++ {
			x := ring[k]
			if e := g.Atoms[x].Element; e != molecule.C {
				d := min(k, 6-k)
				ac.addCat(ringNInc[d], "ring ", e.String(), " (", [4]string{"", "α", "β", "γ"}[d], ")")
				if e != molecule.N {
					r.sigma += 4
				}
			}
		}
		r.estimate("aromatic ring system outside the parent table: benzene with ring-N and fusion increments")
	case size == 5:
		ac.add("estimate: five-membered heteroaromatic C", 125.0)
		r.sigma = 8
		r.estimate("five-membered aromatic ring outside the parent table: rough estimate")
	default:
		ac.add("estimate: aromatic C", 130.0)
		r.sigma = 10
		r.estimate("aromatic ring of unusual size: rough estimate")
	}
	if size != 5 && size != 6 {
		return
	}
	alphaN := false
	for _, nb := range g.Neighbors(c) {
		if inRing(ring, nb.Atom) && g.Atoms[nb.Atom].Element == molecule.N {
			alphaN = true
		}
	}
	if size == 6 {
		cx.chelateRing(c, ring, r)
		cx.periEffect(c, ring, r)
	}
	pos := [4]string{"ipso: ", "ortho: ", "meta: ", "para: "}
	// A carbon shared by two aromatic rings of the same size (the ring
	// fusion carbons of naphthalene) takes the substituent increments of
	// both rings, so that the result does not depend on which ring
	// aromRing happens to return (which follows the atom order).
	rings := [][]int{ring}
	rings = append(rings, cx.tiedAromRings(c, ring)...)
	for ri, ring := range rings {
		for k, x := range ring {
			if ri > 0 && inRing(rings[0], x) {
				continue // counted with the first ring
			}
			d := min(k, size-k)
			for _, nb := range g.Neighbors(x) {
				v := nb.Atom
				if inRing(ring, v) {
					continue
				}
				if cx.aromBond != nil && cx.aromBond[nb.Bond] {
					// A fused ring: part of the parent when there is one.
					if !hasParent && ri == 0 {
						ac.addCat(fusedInc[d], pos[d], "fused ring")
					}
					continue
				}
				if g.Atoms[x].Element != molecule.C {
					if d == 0 {
						continue
					}
					if !(g.Atoms[v].Element == molecule.C && g.Atoms[v].HCount == 3 && g.Degree(v) == 1) && g.Atoms[v].Charge == 0 {
						r.sigma += 1.0
						if cx.explain {
							r.reasons = append(r.reasons, "the group on the ring nitrogen is taken as a methyl (parent ring value)")
						}
					}
					continue
				}
				s := cx.xclass(x, v)
				var inc [4]float64
				name := xtab[s].name
				if s == xAlkyl {
					inc, name = cx.alkylOnRing(x, v)
				} else {
					inc = xtab[s].ar
				}
				if !cx.explain {
					name = ""
				}
				val := inc[d]
				if d == 1 && size == 6 {
					// Ortho effects follow the π bond order of the bond
					// between (benzene 1/2): across naphthalene's C1–C2
					// (2/3) they are larger, across C2–C3 (1/3) smaller
					// (2-methoxynaphthalene C1 105.8, C3 118.7;
					// 2-fluoronaphthalene C1 110.9, C3 116.3; Hansen,
					// Org. Magn. Reson. 1979, correlation of naphthalene
					// substituent effects with bond orders; from memory).
					if o := cx.paulingOrder(g.BondBetween(c, x)); !math.IsNaN(o) && o != 0.5 {
						val *= 2 * o
						if cx.explain {
							name += " (scaled by the bond order " + ftoa2(o) + ")"
						}
					}
				}
				if d == 3 && size == 6 && cx.fusedSystem(c) {
					// A fused ring takes part of the charge a substituent
					// moves to its para position: 1-methoxynaphthalene C4
					// 120.2, 1-naphthol C4 120.8, 2-methoxynaphthalene
					// C4a 129.0, 2-naphthol C4a 128.9 (0.6–0.75 of the
					// benzene para increment; Pretsch, Kalinowski, from
					// memory).
					val *= 0.65
					if cx.explain {
						name += " (×0.65 in a fused ring system)"
					}
				}
				if d == 1 && size == 6 && s == xOR {
					// An alkoxy group next to one ortho substituent lies in
					// the ring plane with its alkyl turned away from it,
					// towards the ortho CH: the CH is shielded more than
					// the mean ortho increment says, the substituted carbon
					// less (2-methylanisole C6 109.9, guaiacol C3 110.8 and
					// C1 145.7, veratrole C3 111.5 and C1 149.1; Pretsch,
					// from memory).
					if t := cx.alkoxyTilt(x, c, ring); t != 0 {
						val += 4.0 * t
						if cx.explain {
							name += " (alkyl turned away from the ortho substituent)"
						}
					}
				}
				if size == 5 {
					val, name = cx.fiveRingInc(c, x, d, ring, inc, name)
					r.sigma += 2.0
				}
				if d == 0 && alphaN && size == 6 {
					switch {
					case s >= xOH && s <= xNPlus:
						// 2-methoxypyridine C2 164.2, 2-aminopyridine 158.7
						// (Kalinowski, from memory): half the benzene ipso
						// effect next to a ring N.
						val *= 0.5
					case s == xCl:
						val *= 0.3 // 2-chloropyridine 151.6
					}
				}
				if xtab[s].est {
					r.sigma += 1.5
					r.est = true
				} else {
					r.sigma += 0.3
				}
				if cx.explain {
					ac.addCat(val, pos[d], name)
				} else {
					ac.raw(val)
				}
			}
		}
	}
}

// tiedAromRings returns the aromatic rings through c other than ring that
// have ring's size (the second ring of a fusion carbon of naphthalene),
// each starting at c and in cyclic order like aromRing's.
func (cx *cctx) tiedAromRings(c int, ring []int) [][]int {
	m := cx.m
	g := cx.g
	var out [][]int
	nbs := g.Neighbors(c)
	for i := 0; i < len(nbs); i++ {
		p := nbs[i].Atom
		if !m.arom[p] || m.ringBond[nbs[i].Bond] == 0 {
			continue
		}
		for j := i + 1; j < len(nbs); j++ {
			q := nbs[j].Atom
			if !m.arom[q] || m.ringBond[nbs[j].Bond] == 0 {
				continue
			}
			if d := m.bfs(p, q, -1, c, -1, true); d < 0 || d+2 != len(ring) {
				continue
			}
			r := make([]int, len(ring))
			r[0] = c
			k := len(ring) - 1
			for v := q; v >= 0 && k > 0; v = m.par[v] {
				r[k] = v
				k--
			}
			if !sameRing(r, ring) {
				out = append(out, r)
			}
		}
	}
	return out
}

// sameRing reports whether a and b hold the same atoms.
func sameRing(a, b []int) bool {
	if len(a) != len(b) {
		return false
	}
	for _, x := range a {
		if !inRing(b, x) {
			return false
		}
	}
	return true
}

// alkylOnRing returns the ring increments of the alkyl group v on ring
// carbon x: methyl plus the effects of the groups on v (arBenzylicC,
// arBenzylic), or the CF3 row.
func (cx *cctx) alkylOnRing(x, v int) ([4]float64, string) {
	g := cx.g
	nC, nF := 0, 0
	for _, nb := range g.Neighbors(v) {
		y := nb.Atom
		if y == x {
			continue
		}
		if cx.skel[y] {
			nC++
		}
		if g.Atoms[y].Element == molecule.F {
			nF++
		}
	}
	if nF == 3 {
		return arTrifluoroMe, "CF3"
	}
	inc := arMethyl
	b := arBenzylicC[min(nC, 3)]
	for i := range inc {
		inc[i] += b[i]
	}
	name := [4]string{"CH3", "CH2R", "CHR2", "CR3"}[min(nC, 3)]
	if !cx.explain {
		name = ""
	}
	for _, nb := range g.Neighbors(v) {
		y := nb.Atom
		if y == x || cx.skel[y] {
			continue
		}
		s := cx.xclass(v, y)
		d := arBenzylic(s)
		for i := range inc {
			inc[i] += d[i]
		}
		if cx.explain {
			name = "CH2–" + xtab[s].name
		}
	}
	if !cx.explain {
		return inc, ""
	}
	return inc, "alkyl (" + name + ")"
}

// fiveRingInc maps a substituent on atom x of a five-membered aromatic
// ring onto the benzene increments inc for carbon c at ring distance d:
// ipso (scaled by the ring heteroatom), the neighbour across the formal
// C=C bond and the atom across the heteroatom like para (conjugation),
// the neighbour across the C–C single bond like ortho, the atom two C–C
// bonds away like meta.
func (cx *cctx) fiveRingInc(c, x, d int, ring []int, inc [4]float64, name string) (float64, string) {
	g := cx.g
	// The ring's heteroatom: O before S before any other, whatever the
	// order of the ring atoms.
	het := molecule.C
	rank := func(e molecule.Element) int {
		switch e {
		case molecule.C:
			return 0
		case molecule.O:
			return 3
		case molecule.S:
			return 2
		}
		return 1
	}
	for _, a := range ring {
		if e := g.Atoms[a].Element; rank(e) > rank(het) {
			het = e
		}
	}
	// Scale factors {ipso of an alkyl, ipso of an acyl, across C=C for a
	// positive / negative increment, across the heteroatom for a
	// positive / negative increment}; acceptors are amplified more than
	// donors (2-methylfuran, furfural, 2-methylthiophene,
	// thiophene-2-carbaldehyde; Kalinowski, from memory). Pyrrole-type
	// and other rings take the mean of furan and thiophene.
	f := [6]float64{1.25, 1.8, 1.75, 1.0, 1.25, 0.7}
	switch het {
	case molecule.O:
		f = [6]float64{1.0, 1.3, 1.95, 1.28, 0.92, 0.6}
	case molecule.S:
		f = [6]float64{1.5, 2.3, 1.55, 0.8, 1.6, 0.8}
	}
	pick := func(v, pos, neg float64) float64 {
		if v > 0 {
			return v * pos
		}
		return v * neg
	}
	switch d {
	case 0:
		if inc[0] > 0 && inc[3] > 2 {
			return inc[0] * f[1], name // an acceptor (positive para increment)
		}
		return inc[0] * f[0], name
	case 1:
		// Which ring bonds are formal C=C follows from the ring's one
		// two-electron heteroatom (pyrrole-type N, furan O, thiophene S:
		// the two bonds one step away from it), not from the Kekulé form
		// the input happens to be written in. A ring without such an atom
		// (the five-membered ring of azulene) takes the mean.
		dn := cx.donorAtom(ring)
		switch {
		case dn < 0:
			if cx.explain {
				name += " (five-membered ring without a heteroatom: mean of ortho and para)"
			}
			return (inc[1] + pick(inc[3], f[2], f[3])) / 2, name
		case adjacent(g, c, dn) != adjacent(g, x, dn):
			if cx.explain {
				name += " (across C=C, as para)"
			}
			return pick(inc[3], f[2], f[3]), name
		}
		return inc[1], name
	}
	for _, nb := range g.Neighbors(c) {
		y := nb.Atom
		if inRing(ring, y) && g.BondBetween(y, x) >= 0 && g.Atoms[y].Element != molecule.C {
			if cx.explain {
				name += " (across the heteroatom, as para)"
			}
			return pick(inc[3], f[4], f[5]), name
		}
	}
	return inc[2], name
}

// donorAtom returns the atom of the five-membered aromatic ring that gives
// the ring two π electrons: its one non-carbon atom without a double bond
// (the N of pyrrole, the O of furan, the S of thiophene), or -1 if there
// is none or more than one. The result does not depend on the Kekulé
// form: such an atom has no double bond in any of them.
func (cx *cctx) donorAtom(ring []int) int {
	g := cx.g
	dn := -1
	for _, a := range ring {
		if g.Atoms[a].Element == molecule.C || cx.m.multi[a] > 0 {
			continue
		}
		if dn >= 0 {
			return -1
		}
		dn = a
	}
	return dn
}

// adjacent reports whether atoms a and b are bonded.
func adjacent(g *molecule.Graph, a, b int) bool { return g.BondBetween(a, b) >= 0 }

// paulingLimit bounds the Kekulé structures counted for one aromatic
// system (pyrene has 6, coronene 20); larger systems get no bond orders.
const paulingLimit = 4096

// paulingOrder returns the Pauling bond order of bond b (the fraction of
// the Kekulé structures in which it is double) if b lies in a polycyclic
// aromatic system whose atoms all take a double bond inside it and all
// lie in six-membered rings (naphthalene, quinoline, phenanthrene), else
// NaN. It does not depend on the Kekulé form of the input.
func (cx *cctx) paulingOrder(b int) float64 {
	if b < 0 || cx.aromBond == nil || !cx.aromBond[b] {
		return math.NaN()
	}
	if cx.pauling == nil {
		cx.computePauling()
	}
	return cx.pauling[b]
}

// computePauling fills cx.pauling, one aromatic system at a time.
func (cx *cctx) computePauling() {
	g := cx.g
	n := len(g.Atoms)
	cx.pauling = make([]float64, len(g.Bonds))
	for i := range cx.pauling {
		cx.pauling[i] = math.NaN()
	}
	comp := make([]int, n)
	for i := range comp {
		comp[i] = -1
	}
	for s := range g.Atoms {
		if comp[s] >= 0 || !cx.m.arom[s] {
			continue
		}
		// The atoms of s's aromatic system, joined by aromatic bonds.
		atoms := []int{s}
		comp[s] = s
		for k := 0; k < len(atoms); k++ {
			for _, nb := range g.Neighbors(atoms[k]) {
				if cx.aromBond[nb.Bond] && comp[nb.Atom] < 0 {
					comp[nb.Atom] = s
					atoms = append(atoms, nb.Atom)
				}
			}
		}
		cx.systemPauling(atoms, comp, s)
	}
}

// systemPauling counts the Kekulé structures (perfect matchings over the
// aromatic bonds) of the system whose atoms carry comp == id and sets the
// bond orders, if the system qualifies (see paulingOrder).
func (cx *cctx) systemPauling(atoms, comp []int, id int) {
	g := cx.g
	m := cx.m
	nb, na := 0, len(atoms)
	for bi, b := range g.Bonds {
		if cx.aromBond[bi] && comp[b.A] == id {
			nb++
		}
	}
	if nb-na+1 < 2 || na%2 != 0 || na > 40 {
		return // one ring (order 1/2 throughout), or odd, or too large
	}
	for _, a := range atoms {
		dbl := 0
		for _, e := range g.Neighbors(a) {
			if e.Order == molecule.Double && cx.aromBond[e.Bond] {
				dbl++
			}
		}
		if dbl != 1 || len(m.aromRing(a)) != 6 {
			return // a donor atom or an exocyclic double bond, or a five-membered ring
		}
	}
	mate := make([]int, len(g.Atoms))
	for i := range mate {
		mate[i] = -1
	}
	count := make([]int, len(g.Bonds))
	total := 0
	var rec func() bool
	rec = func() bool {
		first := -1
		for _, a := range atoms {
			if mate[a] < 0 {
				first = a
				break
			}
		}
		if first < 0 {
			total++
			for _, a := range atoms {
				if a < mate[a] {
					count[g.BondBetween(a, mate[a])]++
				}
			}
			return total < paulingLimit
		}
		for _, e := range g.Neighbors(first) {
			if !cx.aromBond[e.Bond] || mate[e.Atom] >= 0 {
				continue
			}
			mate[first], mate[e.Atom] = e.Atom, first
			ok := rec()
			mate[first], mate[e.Atom] = -1, -1
			if !ok {
				return false
			}
		}
		return true
	}
	if !rec() || total == 0 {
		return
	}
	for bi, b := range g.Bonds {
		if cx.aromBond[bi] && comp[b.A] == id {
			cx.pauling[bi] = float64(count[bi]) / float64(total)
		}
	}
}

func ftoa2(v float64) string { return strconv.FormatFloat(v, 'f', 2, 64) }

// chelatingOH returns the OH oxygen on a ring neighbour of aromatic carbon
// x when x carries a C=O group (aldehyde, ketone, acid, ester, amide) and
// the two form the six-membered intramolecular hydrogen bond of a
// salicyl compound, else -1.
func (cx *cctx) chelatingOH(x int) int {
	g := cx.g
	m := cx.m
	if !m.arom[x] || g.Atoms[x].Element != molecule.C {
		return -1
	}
	acyl := false
	for _, nb := range g.Neighbors(x) {
		if y := nb.Atom; !cx.aromBond[nb.Bond] && g.Atoms[y].Element == molecule.C && m.carbonylOf(y) >= 0 {
			acyl = true
		}
	}
	if !acyl {
		return -1
	}
	for _, nb := range g.Neighbors(x) {
		if !cx.aromBond[nb.Bond] {
			continue
		}
		for _, n2 := range g.Neighbors(nb.Atom) {
			o := n2.Atom
			if g.Atoms[o].Element == molecule.O && g.Atoms[o].HCount == 1 && g.Atoms[o].Charge == 0 && g.Degree(o) == 1 {
				return o
			}
		}
	}
	return -1
}

// chelateRing adds the corrections for a chelated salicyl unit on the
// six-membered aromatic ring of c beyond the additive increments: the
// C–OH carbon +5.5, the carbon carrying the C=O −4.0, the CH ortho to the
// OH on the other side +2.0 (salicylaldehyde 161.6, 120.6, 117.6;
// 2'-hydroxyacetophenone 162.4, 119.7, 118.4; methyl salicylate 161.6,
// 112.4, 117.6; Pretsch, from memory).
func (cx *cctx) chelateRing(c int, ring []int, r *cres) {
	g := cx.g
	for _, x1 := range ring {
		o := cx.chelatingOH(x1)
		if o < 0 {
			continue
		}
		x2 := g.Neighbors(o)[0].Atom
		if !inRing(ring, x2) {
			continue
		}
		switch {
		case c == x2:
			r.ac.add("chelated salicyl unit: C–OH", 5.5)
		case c == x1:
			r.ac.add("chelated salicyl unit: C–C=O", -4.0)
		case adjacent(g, c, x2) && inRing(ring, c):
			r.ac.add("chelated salicyl unit: CH ortho to OH", 2.0)
		}
	}
}

// alkoxyTilt tells where the alkyl of an alkoxy group on ring atom x
// points, for c, an ortho ring neighbour of x: +1 when c carries a
// substituent and the other ortho atom is a CH (the alkyl points away
// from c), −1 when c is that CH, 0 otherwise (no or two ortho
// substituents, a fused ring or a ring heteroatom next to x).
func (cx *cctx) alkoxyTilt(x, c int, ring []int) float64 {
	g := cx.g
	other := -1
	for _, nb := range g.Neighbors(x) {
		if y := nb.Atom; y != c && inRing(ring, y) {
			other = y
		}
	}
	if other < 0 {
		return 0
	}
	kind := func(y int) int { // 0: CH, 1: substituted C, -1: other
		if g.Atoms[y].Element != molecule.C {
			return -1
		}
		if g.Atoms[y].HCount == 1 {
			return 0
		}
		for _, nb := range g.Neighbors(y) {
			if cx.aromBond[nb.Bond] && !inRing(ring, nb.Atom) {
				return -1 // a fused ring
			}
		}
		return 1
	}
	switch kc, ko := kind(c), kind(other); {
	case kc == 1 && ko == 0:
		return 1
	case kc == 0 && ko == 1:
		return -1
	}
	return 0
}

// fusedSystem reports whether aromatic carbon c lies in a polycyclic
// six-membered aromatic system that has Pauling bond orders (see
// paulingOrder).
func (cx *cctx) fusedSystem(c int) bool {
	for _, nb := range cx.g.Neighbors(c) {
		if cx.aromBond != nil && cx.aromBond[nb.Bond] {
			return !math.IsNaN(cx.paulingOrder(nb.Bond))
		}
	}
	return false
}

// periEffect adds the steric shielding of a substituent in the peri
// position (C8 of a 1-substituted naphthalene, across the ring fusion
// from c): 1-methoxynaphthalene C8 122.0, 1-methylnaphthalene C8 124.2,
// 1-chloronaphthalene C8 124.3 against naphthalene C1 128.0 (−4 to −6;
// Pretsch, Kalinowski, from memory). Only in fused six-membered systems
// (see paulingOrder).
func (cx *cctx) periEffect(c int, ring []int, r *cres) {
	g := cx.g
	if g.Atoms[c].Element != molecule.C || !cx.fusedSystem(c) {
		return
	}
	nArom := func(a int) int {
		k := 0
		for _, nb := range g.Neighbors(a) {
			if cx.aromBond[nb.Bond] {
				k++
			}
		}
		return k
	}
	if nArom(c) != 2 {
		return // a fusion carbon
	}
	for _, nf := range g.Neighbors(c) {
		f := nf.Atom
		if !cx.aromBond[nf.Bond] || nArom(f) != 3 {
			continue
		}
		for _, nx := range g.Neighbors(f) {
			x := nx.Atom
			if x == c || !cx.aromBond[nx.Bond] || inRing(ring, x) || nArom(x) != 2 || g.Atoms[x].Element != molecule.C {
				continue
			}
			for _, ns := range g.Neighbors(x) {
				if !cx.aromBond[ns.Bond] {
					r.ac.add("peri substituent (steric)", -4.0)
				}
			}
		}
	}
}
