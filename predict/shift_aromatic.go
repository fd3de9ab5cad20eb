package predict

import "shiftrank/molecule"

// Six-membered aromatic rings: benzene base plus increments for each ring N
// by position relative to the H (pyridine in CDCl3: α 8.62, β 7.29, γ 7.68,
// Gottlieb 1997), a second α-N adds less (pyrimidine H2 9.26), an α-N
// bonded to another ring N adds more (pyridazine H3 9.21). The base is
// 7.30 rather than Pretsch's 7.26 (measured in CCl4): benzene in CDCl3 is
// 7.36 (Gottlieb 1997), and 7.30 fits toluene, anisole and benzaldehyde
// in CDCl3 best with Pretsch's increments.
const (
	baseBenzene = 7.30
	ringNAlpha  = 1.32
	ringNAlpha2 = 0.65
	ringNBeta   = -0.01
	ringNGamma  = 0.38
	ringNNAlpha = 0.55
	// A γ ring N in a ring with a second N adds less (pyrimidine H4 8.78,
	// 1,3,5-triazine 9.25, pyridazine H4 7.51, Pretsch, from memory; our
	// fit, testdata/classes/azoles.json tuning part).
	ringNGamma2 = 0.12
)

// Benzo ring H next to a fused heteroaromatic ring: increments {ortho,
// meta, para} of the heteroatom on the fusion carbon, by kind. Pyridine-
// type N of a fused six-membered ring from quinoline H8/H7/H6 (8.11, 7.71,
// 7.53), of a fused five-membered ring from 1-methylbenzimidazole H4/H7/H6
// (7.80, 7.38, 7.30); ring S of a fused five-membered ring from
// benzothiazole H7/H4 (7.94, 8.14); Pretsch and literature values from
// memory, our fit (testdata/classes/azoles.json, tuning part).
var (
	fusedN6 = [3]float64{0.61, 0.22, 0.03}
	fusedN5 = [3]float64{0.34, -0.06, -0.16}
	fusedS5 = [3]float64{0.70, 0.50, 0.10}
)

// ringNBridge = {α, β, γ}: increments of a three-connected ring N in a
// six-membered aromatic ring, our fit to imidazo[1,2-a]pyridine H5, H6/H8
// and H7 (8.10, 6.76 / 7.58, 7.14; literature values from memory,
// testdata/classes/azoles.json tuning part).
var ringNBridge = [3]float64{0.80, -0.19, 0.0}

// pyrroleN reports whether x is an aromatic N with three bonds (or an H):
// pyrrole type.
func (m *mol) pyrroleN(x int) bool {
	return m.g.Atoms[x].Element == molecule.N && m.arom[x] && m.g.Degree(x)+m.g.Atoms[x].HCount == 3
}

// pyridineN reports whether y is an aromatic N without H and with two
// neighbours (pyridine type).
func (m *mol) pyridineN(y int) bool {
	return m.g.Atoms[y].Element == molecule.N && m.arom[y] && m.g.Atoms[y].HCount == 0 && m.g.Degree(y) == 2
}

// fiveRingFit is an additive model of the fiveRing table, used for ring
// signatures the table lacks: δ = 6.01 + Σ over the four other ring atoms
// of an increment by kind and position (α next to the H-bearing carbon, β
// across), + 0.72 for each α heteroatom bonded to another ring heteroatom,
// + 0.05 for two adjacent β heteroatoms. Least-squares fit to the 35
// entries of fiveRing: mean absolute error 0.16 ppm, largest 0.45.
var fiveRingFit = [...][2]float64{
	'N': {0.89, 0.28},
	'n': {0.63, 0.01},
	'O': {1.41, 0.51},
	'S': {1.71, 1.19},
	'C': {0, 0},
}

// fiveRingEstimate adds the fiveRingFit estimate for a five-membered
// heteroaromatic H whose signature sig is not in fiveRing.
func (p *Predictor) fiveRingEstimate(m *mol, ring []int, sig string, r *shiftResult, ac *acc) {
	v := 6.01
	known := true
	for k := 0; k < 4; k++ {
		ch := sig[k]
		if int(ch) >= len(fiveRingFit) || (ch != 'C' && fiveRingFit[ch] == [2]float64{}) {
			known = false
			continue
		}
		pos := 1
		if k == 0 || k == 3 {
			pos = 0
		}
		v += fiveRingFit[ch][pos]
	}
	if sig[0] != 'C' && sig[1] != 'C' {
		v += 0.72
	}
	if sig[3] != 'C' && sig[2] != 'C' {
		v += 0.72
	}
	if sig[1] != 'C' && sig[2] != 'C' {
		v += 0.05
	}
	ac.add("estimate: five-membered heteroaromatic, additive fit ("+sig+")", v)
	r.sigma = 0.35
	if !known {
		r.sigma = 0.6
	}
	r.reasons = append(r.reasons, "five-membered aromatic ring outside the base-value table: additive estimate")
}

// fiveRing maps the ring signature of a five-membered heteroaromatic H
// position to its shift in CDCl3. The signature lists the other four ring
// atoms going round from the H-bearing carbon (the smaller of the two
// directions): C carbon, N pyrrole-type N (with H or substituent), n
// pyridine-type N, O, S. Values recalled from Pretsch and Silverstein
// (parent heterocycles in CDCl3; NH azoles averaged over tautomers).
var fiveRing = map[string]float64{
	"CCCN": 6.74, "CCNC": 6.24, // pyrrole α, β
	"CCCO": 7.42, "CCOC": 6.38, // furan
	"CCCS": 7.33, "CCSC": 7.10, // thiophene
	"NCCn": 7.73, "CNCn": 7.14, "CnCN": 7.10, // imidazole H2, H4, H5
	"CCNn": 7.61, "CNnC": 6.31, "CCnN": 7.55, // pyrazole H3, H4, H5
	"OCCn": 7.95, "COCn": 7.09, "CnCO": 7.69, // oxazole H2, H4, H5
	"SCCn": 8.80, "CSCn": 7.95, "CnCS": 7.38, // thiazole H2, H4, H5
	"CCOn": 8.28, "COnC": 6.39, "CCnO": 8.44, // isoxazole H3, H4, H5
	"CCSn": 8.54, "CSnC": 7.26, "CCnS": 8.72, // isothiazole H3, H4, H5
	"CNnn": 7.75, "CnnN": 7.75, // 1,2,3-triazole H4, H5
	"nCNn": 8.10, "NnCn": 8.20, // 1,2,4-triazole H3, H5
	"Nnnn": 8.90,               // tetrazole H5
	"OCnn": 8.42,               // 1,3,4-oxadiazole
	"nCOn": 8.20, "OnCn": 8.70, // 1,2,4-oxadiazole H3, H5
	"CnOn": 8.20,               // 1,2,5-oxadiazole
	"SCnn": 9.10,               // 1,3,4-thiadiazole
	"CnSn": 8.60,               // 1,2,5-thiadiazole
	"nCSn": 8.70, "SnCn": 9.80, // 1,2,4-thiadiazole H3, H5 (estimate)
	"CNnN": 7.70, "CnNn": 7.70, // estimates for rare azoles
}

func (p *Predictor) aromaticH(m *mol, gr *hgroup, r *shiftResult, ac *acc) {
	g := m.g
	ring := gr.ring
	c := gr.atom
	r.kind = "aromatic CH"
	r.sigma = 0.15
	if ring != nil && m.carbocycleNonBenzenoid(ring) {
		p.azuleneH(m, ring, r, ac)
		return
	}
	if ring == nil || (len(ring) != 5 && len(ring) != 6) {
		r.kind = "aromatic CH (unusual ring)"
		ac.add("estimate: aromatic H", 7.0)
		r.sigma = 0.6
		r.reasons = append(r.reasons, "aromatic ring other than five- or six-membered: estimate")
		return
	}
	size := len(ring)
	hetero := false
	for _, x := range ring {
		if g.Atoms[x].Element != molecule.C {
			hetero = true
		}
	}
	if size == 6 {
		if hetero {
			r.kind = "heteroaromatic CH"
			r.sigma = 0.2
		}
		ac.add("base benzene", baseBenzene)
		nAlpha, nN := 0, 0
		for _, x := range ring {
			if g.Atoms[x].Element == molecule.N {
				nN++
			}
		}
		for k := 1; k < 6; k++ {
			x := ring[k]
			if g.Atoms[x].Element == molecule.C {
				continue
			}
			d := min(k, 6-k)
			if g.Atoms[x].Element != molecule.N {
				r.sigma += 0.3
			}
			if m.pyrroleN(x) {
				// A ring N with three bonds in a six-membered aromatic
				// ring (the bridgehead N of imidazo[1,2-a]pyridine,
				// indolizine) donates instead of withdrawing.
				v := ringNBridge[d-1]
				if p.opts.Explain {
					ac.add([3]string{"ring N, bridgehead (α)", "ring N, bridgehead (β)", "ring N, bridgehead (γ)"}[d-1], v)
				} else {
					ac.raw(v)
				}
				r.sigma += 0.1
				continue
			}
			switch d {
			case 1:
				if nAlpha == 0 {
					ac.add("ring N (α)", ringNAlpha)
				} else {
					ac.add("second ring N (α)", ringNAlpha2)
				}
				nAlpha++
				for _, nb := range g.Neighbors(x) {
					if nb.Atom != c && g.Atoms[nb.Atom].Element == molecule.N && m.arom[nb.Atom] {
						ac.add("α-N next to ring N", ringNNAlpha)
						break
					}
				}
			case 2:
				ac.add("ring N (β)", ringNBeta)
			case 3:
				if nN > 1 {
					ac.add("ring N (γ, with a second ring N)", ringNGamma2)
				} else {
					ac.add("ring N (γ)", ringNGamma)
				}
			}
		}
	} else {
		r.kind = "heteroaromatic CH"
		r.sigma = 0.2
		sig := m.fiveSignature(ring)
		if v, ok := fiveRing[sig]; ok {
			ac.add("base five-membered heteroaromatic ("+sig+")", v)
		} else {
			p.fiveRingEstimate(m, ring, sig, r, ac)
		}
	}
	// Substituents on the other ring atoms (exocyclic neighbours, fused
	// rings included): benzene ortho/meta/para increments, applied to
	// heteroaromatic rings too (an approximation; five-membered rings use
	// ortho for adjacent and meta for the next positions).
	for k := 1; k < size; k++ {
		x := ring[k]
		d := min(k, size-k)
		for _, nb := range g.Neighbors(x) {
			y := nb.Atom
			if inRing(ring, y) {
				continue
			}
			var s sub
			if nb.Order == molecule.Double && !m.arom[y] {
				s = subKetone // exocyclic C=O/C=N on a ring carbon
			} else {
				s = m.classify(x, y)
			}
			if unusual[s] {
				r.sigma += 0.2
			}
			fused := m.arom[y] && m.ringBond[nb.Bond] > 0
			name := subName[s]
			var v float64
			if d <= 3 {
				v = benzeneInc[s][d-1]
				switch {
				case s == subAlkyl:
					v = alkylBenzeneInc[min(g.Atoms[y].HCount, 3)][d-1]
				case fused && m.piExcessive5(y):
					// Fused pyrrole, furan or thiophene ring (indole,
					// benzofuran): its carbon acts like a vinyl group, its
					// heteroatom like an N-pyrrolyl group (our fit to
					// indole and benzofuran benzo-ring H, Pretsch, from
					// memory).
					switch {
					case g.Atoms[y].Element == molecule.C:
						v, name = benzeneInc[subAlkenyl][d-1], "fused five-membered ring C"
					case m.pyridineN(y):
						v, name = fusedN5[d-1], "fused five-membered ring =N–"
					case g.Atoms[y].Element == molecule.S:
						v, name = fusedS5[d-1], "fused five-membered ring S"
					default:
						v, name = benzeneInc[subNArom][d-1], "fused five-membered ring heteroatom"
					}
				case fused && m.pyridineN(y):
					v, name = fusedN6[d-1], "fused six-membered ring =N–"
				}
				if size == 5 {
					if fused {
						// Benzo fusion on a five-membered ring: indole H3
						// 6.56 and benzofuran H2 7.62 against pyrrole and
						// furan (Pretsch, from memory): ~0.6 × the aryl
						// increments.
						v = 0.6 * benzeneInc[subAryl][d-1]
						name = "fused aromatic ring"
					} else if s == subAryl || s == subHetAryl {
						// An aryl ring on a five-membered heteroaromatic
						// ring acts mostly through its ring current:
						// 2-phenylthiophene H3/H4/H5 +0.19/−0.03/−0.07,
						// 2-phenylfuran +0.26/+0.08/+0.04, 2-phenylpyrrole
						// +0.28/+0.06/+0.16 against the parent rings
						// (Pretsch et al. and common literature data, from
						// memory): far below ×1.5 the benzene row.
						v = arylOnFive[d-1]
					} else {
						// Substituent effects on five-membered
						// heteroaromatics are larger than on benzene
						// (2-methylfuran, furfural; our fit: ×1.5).
						v *= 1.5
					}
				}
			}
			if p.opts.Explain {
				ac.add([3]string{"ortho: ", "meta: ", "para: "}[d-1]+name, v)
			} else {
				ac.raw(v)
			}
		}
	}
}

// arylOnFive = {adjacent, next} ring positions of a five-membered
// heteroaromatic ring carrying an aryl or heteroaryl group (see the
// sources where it is used; the third entry is unused in five-membered
// rings).
var arylOnFive = [3]float64{0.24, 0.03, 0}

// alkylBenzeneInc[h] = {ortho, meta, para} for an alkyl substituent with h
// hydrogens on its attachment carbon: tert-butyl (0.02, −0.08, −0.21),
// CHR2 (−0.13, −0.08, −0.18), CH2R (−0.14, −0.06, −0.17), CH3 (−0.18,
// −0.11, −0.21); Pretsch, from memory.
var alkylBenzeneInc = [4][3]float64{
	{0.02, -0.08, -0.21},
	{-0.13, -0.08, -0.18},
	{-0.14, -0.06, -0.17},
	{-0.18, -0.11, -0.21},
}

func inRing(ring []int, x int) bool {
	for _, y := range ring {
		if y == x {
			return true
		}
	}
	return false
}

// fiveSignature codes the ring atoms after ring[0] in both directions and
// returns the smaller string.
func (m *mol) fiveSignature(ring []int) string {
	var a, b [4]byte
	for k := 1; k < 5; k++ {
		a[k-1] = m.ringCode(ring[k], ring)
		b[k-1] = m.ringCode(ring[5-k], ring)
	}
	if string(b[:]) < string(a[:]) {
		return string(b[:])
	}
	return string(a[:])
}

func (m *mol) ringCode(x int, ring []int) byte {
	g := m.g
	switch g.Atoms[x].Element {
	case molecule.C:
		return 'C'
	case molecule.N:
		if g.Atoms[x].HCount > 0 || g.Degree(x) > 2 {
			return 'N'
		}
		return 'n'
	case molecule.O:
		return 'O'
	case molecule.S:
		return 'S'
	}
	return 'X'
}

// piExcessive5 reports whether aromatic atom y lies in a five-membered
// aromatic ring with a pyrrole-type N, O or S (a π-excessive ring).
func (m *mol) piExcessive5(y int) bool {
	ring := m.aromRing(y)
	if len(ring) != 5 {
		return false
	}
	for _, x := range ring {
		switch m.ringCode(x, ring) {
		case 'N', 'O', 'S':
			return true
		}
	}
	return false
}

// carbocycleNonBenzenoid reports whether ring is an all-carbon aromatic
// five- or seven-membered ring fused to another ring (azulene type).
func (m *mol) carbocycleNonBenzenoid(ring []int) bool {
	if len(ring) != 5 && len(ring) != 7 {
		return false
	}
	fused := false
	for _, x := range ring {
		if m.g.Atoms[x].Element != molecule.C {
			return false
		}
		if m.ringBonds(x) >= 3 {
			fused = true
		}
	}
	return fused
}

// azuleneRing[size][d]: H of an all-carbon aromatic five- or
// seven-membered ring, by its distance d (1–3) round the ring to the
// nearest fusion atom; azulene in CDCl3: H1/H3 7.39, H2 7.90, H4/H8 8.31,
// H5/H7 7.13, H6 7.55 (Pretsch, from memory; testdata/classes tuning).
var azuleneRing = map[int][4]float64{
	5: {0, 7.39, 7.90, 7.90},
	7: {0, 8.31, 7.13, 7.55},
}

// azuleneH predicts H on an azulene-type ring (see carbocycleNonBenzenoid)
// from the parent shift of its position plus the benzene increments of
// exocyclic non-aromatic substituents.
func (p *Predictor) azuleneH(m *mol, ring []int, r *shiftResult, ac *acc) {
	g := m.g
	size := len(ring)
	d := size
	for k := 1; k < size; k++ {
		if m.ringBonds(ring[k]) >= 3 {
			d = min(d, k, size-k)
		}
	}
	d = min(d, 3)
	r.kind = "aromatic CH (non-benzenoid ring)"
	r.sigma = 0.3
	ac.add("base azulene-type ring ("+itoa(size)+"-membered, "+itoa(d)+" from the fusion)", azuleneRing[size][d])
	for k := 1; k < size; k++ {
		x := ring[k]
		dk := min(k, size-k, 3)
		for _, nb := range g.Neighbors(x) {
			y := nb.Atom
			if inRing(ring, y) || m.arom[y] {
				continue
			}
			s := m.classify(x, y)
			v := benzeneInc[s][dk-1]
			if s == subAlkyl {
				v = alkylBenzeneInc[min(g.Atoms[y].HCount, 3)][dk-1]
			}
			ac.addSub([3]string{"ortho: ", "meta: ", "para: "}[dk-1], s, v)
			r.sigma += 0.05
		}
	}
}
