package predict

import "shiftrank/molecule"

// Cross-conjugated rings with a ring C=O or C=S: 2-pyridones, 4-pyridones,
// uracils, pyranones, coumarins, quinolinones, pyridinethiones, tropone.
// The aromaticity model of package molecule keeps them in their Kekulé form
// (a carbon with an exocyclic double bond contributes no π electron), so
// without this file their ring H would be predicted as plain diene H
// (2-pyridone H5 5.5 against 6.3 observed). Counting such a carbon as 0
// and a ring N, O or S with two single bonds as 2 π electrons, the ring
// holds 4n+2 electrons: it is aromatic in character, and its H are
// predicted like aromatic H, from the benzene base value with increments
// for each ring atom by position.

// amideRingInc[t] = {ortho, meta, para} for a ring atom of type t, relative
// to benzene (7.30). K (ring C=O) and N (ring NH/NR) are our least-squares
// fit to 2-pyridone, 1-methyl-2-pyridone, uracil (DMSO-d6) and
// 1,3-dimethyluracil (testdata/classes/ring_amides.json, tuning part) with
// the meta and para effects of N set to 0 (pyridine's β increment is
// −0.01); T (ring C=S) from pyridine-2(1H)-thione. O and S are estimates:
// the N values shifted by the furan − pyrrole and thiophene − pyrrole
// differences of the parent five-membered rings (α +0.68 / +0.59, β +0.14
// / +0.86; Pretsch, from memory); they carry a wider σ.
var amideRingInc = [...][3]float64{
	'K': {-0.72, 0.08, -1.07},
	'T': {0.38, 0.22, -0.51},
	'N': {-0.06, 0, 0},
	'O': {0.62, 0.14, 0.14},
	'S': {0.53, 0.86, 0.86},
}

// amideRing returns the atoms of the smallest ring through atom x (x
// first, then round the ring) when that ring is a cross-conjugated ring
// with a ring C=O or C=S and 4n+2 π electrons counted as described above,
// with the number of ring C=O and C=S carbons; nil otherwise. Aromatic
// atoms of a fused aromatic ring count as one π electron (the benzo ring
// of coumarin, the imidazole carbons of caffeine).
func (m *mol) amideRing(x int) (ring []int, nCO int) {
	if !m.ringCO || m.arom[x] {
		return nil, 0
	}
	sz := m.ringAtom[x]
	if sz < 5 || sz > 7 || m.rsys[x] < 0 {
		return nil, 0
	}
	for _, nb := range m.g.Neighbors(x) {
		// Quick rejection: an sp3 ring carbon next to x breaks the ring's
		// conjugation.
		if y := nb.Atom; m.ringBond[nb.Bond] > 0 && m.g.Atoms[y].Element == molecule.C && m.multi[y] == 0 && !m.arom[y] {
			return nil, 0
		}
	}
	if !m.rsysCO(m.rsys[x]) {
		return nil, 0
	}
	ring = m.smallestRing(x)
	if len(ring) != int(sz) {
		return nil, 0
	}
	pi := 0
	for _, a := range ring {
		t := m.amideRingType(a, ring)
		switch t {
		case 0:
			return nil, 0
		case 'K', 'T':
			nCO++
		case 'N', 'O', 'S':
			pi += 2
		default:
			pi++
		}
	}
	if nCO == 0 || pi%4 != 2 {
		return nil, 0
	}
	return ring, nCO
}

// amideRingType classifies ring atom a of a candidate ring: 'K' carbon
// with an exocyclic C=O, 'T' with C=S, 'N'/'O'/'S' a heteroatom with only
// single bonds (two π electrons), 'n' N with a double bond in the ring,
// 'C' carbon with a double bond in the ring (or aromatic), 0 for an atom
// that breaks the conjugation.
func (m *mol) amideRingType(a int, ring []int) byte {
	g := m.g
	e := g.Atoms[a].Element
	if m.arom[a] {
		if e == molecule.C {
			return 'C'
		}
		return 0 // a fused heteroaromatic atom: not modelled
	}
	var inRingDouble, exoO, exoS, other bool
	for _, nb := range g.Neighbors(a) {
		switch nb.Order {
		case molecule.Single:
		case molecule.Double:
			y := nb.Atom
			switch {
			case inRing(ring, y):
				inRingDouble = true
			case g.Atoms[y].Element == molecule.O:
				exoO = true
			case g.Atoms[y].Element == molecule.S:
				exoS = true
			default:
				other = true
			}
		default:
			return 0
		}
	}
	switch {
	case other || (inRingDouble && (exoO || exoS)):
		return 0
	case e == molecule.C && exoO:
		return 'K'
	case e == molecule.C && exoS:
		return 'T'
	case inRingDouble && e == molecule.C:
		return 'C'
	case inRingDouble && e == molecule.N:
		return 'n'
	case exoO || exoS || inRingDouble:
		return 0
	case e == molecule.N && g.Atoms[a].Charge == 0 && g.Degree(a)+g.Atoms[a].HCount == 3:
		return 'N'
	case e == molecule.O && g.Degree(a) == 2:
		return 'O'
	case e == molecule.S && g.Degree(a) == 2:
		return 'S'
	}
	return 0
}

// rsysCO reports whether ring system sys has a ring carbon with an
// exocyclic C=O or C=S.
func (m *mol) rsysCO(sys int16) bool {
	for a := range m.g.Atoms {
		if m.rsys[a] == sys && m.g.Atoms[a].Element == molecule.C && (m.exoCO(a)) {
			return true
		}
	}
	return false
}

// exoCO reports whether carbon a has a double bond to O or S that is not
// a ring bond.
func (m *mol) exoCO(a int) bool {
	for _, nb := range m.g.Neighbors(a) {
		if nb.Order == molecule.Double && m.ringBond[nb.Bond] == 0 {
			if e := m.g.Atoms[nb.Atom].Element; e == molecule.O || e == molecule.S {
				return true
			}
		}
	}
	return false
}

// smallestRing returns the atoms of a smallest ring through x, x first and
// then in ring order, in the work's shared ring storage; nil if x is in no
// ring.
func (m *mol) smallestRing(x int) []int {
	g := m.g
	var best []int
	nbs := g.Neighbors(x)
	for i := 0; i < len(nbs); i++ {
		if m.ringBond[nbs[i].Bond] == 0 {
			continue
		}
		p := nbs[i].Atom
		for j := i + 1; j < len(nbs); j++ {
			if m.ringBond[nbs[j].Bond] == 0 {
				continue
			}
			q := nbs[j].Atom
			d := m.bfs(p, q, -1, x, -1, false)
			if d < 0 || (best != nil && d+2 >= len(best)) {
				continue
			}
			start := len(m.w.rings)
			m.w.rings = append(m.w.rings, make([]int, d+2)...)
			ring := m.w.rings[start : start+d+2 : start+d+2]
			ring[0] = x
			k := d + 1
			for v := q; v >= 0; v = m.par[v] {
				ring[k] = v
				k--
			}
			best = ring
		}
	}
	return best
}

// amideRingH predicts H on carbon c of a cross-conjugated ring (see
// amideRing): benzene base, ring-atom increments by position, and the
// benzene increments of exocyclic substituents on the other ring atoms
// (fused aromatic rings included). Substituents on ring N are not counted
// (1-methyl-2-pyridone and 2-pyridone differ by less than 0.15 ppm).
func (p *Predictor) amideRingH(m *mol, c int, ring []int, r *shiftResult, ac *acc) {
	g := m.g
	size := len(ring)
	r.kind = "ring CH (amide-type conjugated ring)"
	r.sigma = 0.22
	ac.add("base benzene (cross-conjugated ring with C=O/C=S)", baseBenzene)
	for k := 1; k < size; k++ {
		x := ring[k]
		d := min(k, size-k)
		if d > 3 {
			d = 3
		}
		t := m.amideRingType(x, ring)
		var v float64
		name := ""
		switch t {
		case 'K', 'T', 'N', 'O', 'S':
			v = amideRingInc[t][d-1]
			name = [...]string{'K': "C=O", 'T': "C=S", 'N': "N", 'O': "O", 'S': "S"}[t]
			if t == 'O' || t == 'S' {
				r.sigma += 0.1
			}
			if t == 'T' {
				r.sigma += 0.05
			}
		case 'n':
			// Ring =N–: ortho from quinazolin-4(3H)-one H2 (8.09,
			// DMSO-d6; testdata/classes tuning), meta and para as in
			// pyridine.
			v = [3]float64{0.77, ringNBeta, ringNGamma}[d-1]
			name = "=N–"
			r.sigma += 0.1
		}
		if name != "" {
			if p.opts.Explain {
				ac.add([3]string{"ring ", "ring ", "ring "}[d-1]+name+[3]string{" (ortho)", " (meta)", " (para)"}[d-1], v)
			} else {
				ac.raw(v)
			}
		}
		if t == 'N' {
			continue
		}
		for _, nb := range g.Neighbors(x) {
			y := nb.Atom
			if inRing(ring, y) || nb.Order == molecule.Double {
				continue
			}
			s := m.classify(x, y)
			v := benzeneInc[s][d-1]
			if s == subAlkyl {
				v = alkylBenzeneInc[min(g.Atoms[y].HCount, 3)][d-1]
			}
			if unusual[s] {
				r.sigma += 0.2
			}
			if p.opts.Explain {
				ac.add([3]string{"ortho: ", "meta: ", "para: "}[d-1]+subName[s], v)
			} else {
				ac.raw(v)
			}
		}
	}
	if size != 6 {
		r.sigma += 0.25
		r.reasons = append(r.reasons, "cross-conjugated "+itoa(size)+"-membered ring: six-membered-ring increments used, wide uncertainty")
	}
}

// amideRingNAdjust returns the correction for an sp3 C–H on ring nitrogen
// n of a cross-conjugated ring (the N-CH3 of 1-methyl-2-pyridone 3.54 and
// of 1,3-dimethyluracil 3.33/3.39 against 2.92 predicted as an amide
// N-CH3): +0.62 with one ring C=O, 0.15 less for each further one (our fit
// to the tuning part of testdata/classes/ring_amides.json), +0.35 more
// next to a ring C=S (estimate: N,N-dimethylthioamide N-CH3 lie about
// 0.35 above the amide values; from memory).
func (m *mol) amideRingNAdjust(n int) (v float64, thio bool) {
	ring, nCO := m.amideRing(n)
	if ring == nil {
		return 0, false
	}
	v = 0.62 - 0.15*float64(nCO-1)
	for _, nb := range m.g.Neighbors(n) {
		if inRing(ring, nb.Atom) && m.amideRingType(nb.Atom, ring) == 'T' {
			return v + 0.35, true
		}
	}
	return v, false
}

// Four-membered rings with a ring C=O or a ring heteroatom. The open-chain
// increments plus a ring term do not carry over: the ester O of a
// β-lactone deshields its CH2 less than the ether O of oxetane (4.29
// against 4.73), and the CH2 next to a ring C=O lies 0.6–1.0 ppm above the
// open-chain estimate. The CH2 of each position of the parent rings is
// therefore taken from a table (cyclobutane 1.96, oxetane 4.73 / 2.72,
// cyclobutanone 3.05 / 2.00, β-propiolactone 4.29 / 3.52; Pretsch,
// Bühlmann, Badertscher, from memory, the tuning part of
// testdata/classes/small_rings.json), and exocyclic substituents add their
// usual increments. Positions the table lacks keep the open-chain scheme.
//
// The key is the types of the two ring neighbours (sorted) and of the
// opposite ring atom: C carbon, K carbon with an exocyclic C=O/C=S, O ring
// ether O, E ring O next to a K (lactone), N ring N, L ring N next to a K
// (lactam), S ring S.
var ring4Parent = map[[3]byte]float64{
	{'C', 'C', 'C'}: 1.96,
	{'C', 'O', 'C'}: 4.73,
	{'C', 'C', 'O'}: 2.72,
	{'C', 'K', 'C'}: 3.05,
	{'C', 'C', 'K'}: 2.00,
	{'C', 'E', 'K'}: 4.29,
	{'C', 'K', 'E'}: 3.52,
}

// ring4Type types ring atom a of the four-membered ring ring (see
// ring4Parent); 0 for atoms the table does not describe.
func (m *mol) ring4Type(a int, ring []int) byte {
	g := m.g
	switch g.Atoms[a].Element {
	case molecule.C:
		if m.arom[a] {
			return 0
		}
		for _, nb := range g.Neighbors(a) {
			if nb.Order == molecule.Double {
				if !inRing(ring, nb.Atom) {
					if e := g.Atoms[nb.Atom].Element; e == molecule.O || e == molecule.S {
						return 'K'
					}
				}
				return 0
			}
			if nb.Order != molecule.Single {
				return 0
			}
		}
		return 'C'
	case molecule.O, molecule.N, molecule.S:
		e := g.Atoms[a].Element
		if m.multi[a] > 0 || m.arom[a] {
			return 0
		}
		acyl := false
		for _, nb := range g.Neighbors(a) {
			if y := nb.Atom; inRing(ring, y) && g.Atoms[y].Element == molecule.C && m.exoCO(y) {
				acyl = true
			}
		}
		switch {
		case e == molecule.O && acyl:
			return 'E'
		case e == molecule.O:
			return 'O'
		case e == molecule.N && acyl:
			return 'L'
		case e == molecule.N:
			return 'N'
		case !acyl && g.Degree(a) == 2:
			return 'S'
		}
	}
	return 0
}

// ring4H predicts an sp3 CH2 or CH carbon c of a four-membered ring from
// ring4Parent; it reports false (adding nothing) when the position is not
// in the table. The caller has set r.kind.
func (p *Predictor) ring4H(m *mol, c, h int, r *shiftResult, ac *acc) bool {
	if m.ringBonds(c) != 2 {
		return false
	}
	ring := m.smallestRing(c)
	if len(ring) != 4 || m.commonNeighbours(ring[1], ring[3]) != 2 {
		return false // several four-membered rings through c: no single parent
	}
	var key [3]byte
	key[0], key[1], key[2] = m.ring4Type(ring[1], ring), m.ring4Type(ring[3], ring), m.ring4Type(ring[2], ring)
	if key[0] == 0 || key[1] == 0 || key[2] == 0 {
		return false
	}
	if key[1] < key[0] {
		key[0], key[1] = key[1], key[0]
	}
	if key == [3]byte{'C', 'C', 'C'} {
		return false // cyclobutane: the ring correction of the general scheme is exact
	}
	base, ok := ring4Parent[key]
	g := m.g
	r.sigma = 0.2
	if !ok && (key[0] == 'L' || key[1] == 'L' || key[2] == 'L') {
		// β-Lactams: no parent at hand; take the β-lactone position and
		// the open-chain difference between an amide N and an ester O as
		// α substituents (2.00 against 2.82 on CH2, alphaInc), wider σ.
		var lk [3]byte
		for i, t := range key {
			lk[i] = t
			if t == 'L' {
				lk[i] = 'E'
			}
		}
		if lk[1] < lk[0] {
			lk[0], lk[1] = lk[1], lk[0]
		}
		if base, ok = ring4Parent[lk]; !ok {
			return false
		}
		if key[0] == 'L' || key[1] == 'L' {
			base += alphaInc[subAmideN][1] - alphaInc[subOAcyl][1]
		}
		r.sigma += 0.25
		if p.opts.Explain {
			r.reasons = append(r.reasons, "β-lactam ring: estimated from the β-lactone parent, wider uncertainty")
		}
	}
	if !ok {
		return false
	}
	ac.add("four-membered ring parent ("+string(key[:2])+"/"+string(key[2:])+")", base)
	ns := 0
	for _, nb := range g.Neighbors(c) {
		if inRing(ring, nb.Atom) {
			continue
		}
		s := m.classify(c, nb.Atom)
		if h == 1 {
			ac.add("CH instead of CH2", baseCH-baseCH2)
		}
		if s != subAlkyl {
			ns++
			ac.addSub("α (exocyclic): ", s, alphaInc[s][2])
			r.sigma += 0.06
		}
	}
	// β: exocyclic groups on the neighbouring ring carbons.
	scale := 0.85
	if ns > 0 {
		scale *= 0.5
	}
	for _, y := range [2]int{ring[1], ring[3]} {
		if g.Atoms[y].Element != molecule.C || m.multi[y] > 0 {
			continue
		}
		for _, nb := range g.Neighbors(y) {
			if inRing(ring, nb.Atom) {
				continue
			}
			if s := m.classify(y, nb.Atom); s != subAlkyl {
				ac.addSub("β (exocyclic): ", s, betaInc[s]*scale)
				r.sigma += 0.04
			}
		}
	}
	return true
}

// ringBonds returns the number of ring bonds at atom x.
func (m *mol) ringBonds(x int) int { return int(m.nRing[x]) }

// junction classifies sp3 atom x by its place in a polycyclic skeleton:
// 0 not a ring junction (fewer than three ring bonds); junctionBridged for
// the bridgehead of a bridged system (norbornane C1, adamantane CH: no
// ring neighbour is itself an sp3 junction; aromatic neighbours of a
// benzo ring do not count); junctionFused for a fusion atom next to
// another sp3 junction (decalin C4a); junctionCage when every ring
// neighbour is an sp3 junction in a four-membered ring (cubane).
func (m *mol) junction(x int) int {
	if m.multi[x] > 0 || m.arom[x] || m.ringBonds(x) < 3 {
		return 0
	}
	nj, nr := 0, 0
	for _, nb := range m.g.Neighbors(x) {
		y := nb.Atom
		if m.ringBond[nb.Bond] == 0 {
			continue
		}
		nr++
		if m.multi[y] == 0 && !m.arom[y] && m.ringBonds(y) >= 3 {
			nj++
		}
	}
	switch {
	case nj == 0:
		return junctionBridged
	case nj == nr && m.ringAtom[x] == 4:
		return junctionCage
	}
	return junctionFused
}

const (
	junctionBridged = 1 + iota
	junctionFused
	junctionCage
)

// bridgedCorrection returns the correction for sp3 C–H carbon c (h H) of
// a bridged or cage skeleton, on top of the ring-size correction of its
// smallest ring: bridgehead CH +0.56 (norbornane 2.19, norbornadiene
// 3.58, adamantane 1.87 against 1.70, 3.02 and 1.25 before), cage CH of
// fused four-membered rings +1.85 (cubane 4.00), CH2 next to a bridgehead
// in a bicyclo[2.2.1] skeleton −0.17 (norbornane 1.33 and 1.18,
// norbornadiene 1.97), CH2 between two bridgeheads of six-membered rings
// +0.32 (adamantane 1.75); our fit to the tuning part of
// testdata/classes/bridged_polycyclic.json. The name of the term is empty
// when there is none.
func (m *mol) bridgedCorrection(c, h int) (float64, string) {
	if !m.poly || m.rsys[c] < 0 {
		return 0, ""
	}
	switch h {
	case 1:
		switch m.junction(c) {
		case junctionBridged:
			if m.ringAtom[c] >= 5 {
				return 0.56, "bridgehead of a bridged ring system"
			}
		case junctionCage:
			return 1.85, "cage of fused four-membered rings"
		}
	case 2:
		nb := 0
		for _, n := range m.g.Neighbors(c) {
			if m.ringBond[n.Bond] > 0 && m.junction(n.Atom) == junctionBridged {
				nb++
			}
		}
		switch {
		case nb == 0:
		case m.ringAtom[c] == 5:
			return -0.17, "CH2 of a bicyclo[2.2.1] skeleton"
		case m.ringAtom[c] == 6 && nb == 2:
			return 0.32, "CH2 between two bridgeheads (adamantane type)"
		}
	}
	return 0, ""
}

// commonNeighbours returns the number of atoms bonded to both a and b.
func (m *mol) commonNeighbours(a, b int) int {
	n := 0
	for _, x := range m.g.Neighbors(a) {
		if m.g.BondBetween(x.Atom, b) >= 0 {
			n++
		}
	}
	return n
}
