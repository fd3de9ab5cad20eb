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
	baseBenzene  = 7.30
	ringNAlpha   = 1.32
	ringNAlpha2  = 0.65
	ringNBeta    = -0.01
	ringNGamma   = 0.38
	ringNNAlpha  = 0.55
	fiveRingElse = 6.80
)

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
		nAlpha := 0
		for k := 1; k < 6; k++ {
			x := ring[k]
			if g.Atoms[x].Element == molecule.C {
				continue
			}
			d := min(k, 6-k)
			if g.Atoms[x].Element != molecule.N {
				r.sigma += 0.3
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
				ac.add("ring N (γ)", ringNGamma)
			}
		}
	} else {
		r.kind = "heteroaromatic CH"
		r.sigma = 0.2
		sig := m.fiveSignature(ring)
		if v, ok := fiveRing[sig]; ok {
			ac.add("base five-membered heteroaromatic ("+sig+")", v)
		} else {
			ac.add("estimate: five-membered heteroaromatic", fiveRingElse)
			r.sigma = 0.5
			r.reasons = append(r.reasons, "five-membered aromatic ring outside the base-value table: estimate")
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
					if g.Atoms[y].Element == molecule.C {
						v, name = benzeneInc[subAlkenyl][d-1], "fused five-membered ring C"
					} else {
						v, name = benzeneInc[subNArom][d-1], "fused five-membered ring heteroatom"
					}
				}
				if size == 5 {
					if fused {
						// Benzo fusion on a five-membered ring: indole H3
						// 6.56 and benzofuran H2 7.62 against pyrrole and
						// furan (Pretsch, from memory): ~0.6 × the aryl
						// increments.
						v = 0.6 * benzeneInc[subAryl][d-1]
						name = "fused aromatic ring"
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
