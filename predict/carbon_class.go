package predict

import "shiftrank/molecule"

// xsub classifies a neighbour of a carbon as a substituent for the 13C
// increment tables (carbon_tables.go). The classes follow the rows of the
// 13C increment tables in Pretsch, Bühlmann, Badertscher, "Structure
// Determination of Organic Compounds: Tables of Spectral Data" and
// Kalinowski, Berger, Braun, "Carbon-13 NMR Spectroscopy", extended to
// every neighbour the isomer generator can make.
type xsub uint8

const (
	xAlkyl xsub = iota // sp3 carbon (handled by the skeleton counts)
	xVinyl             // C=C (also allenyl)
	xAlkynyl
	xAryl
	xHetAryl
	xCHO
	xKetone     // C(=O)–alkyl
	xConjKetone // C(=O)–aryl or vinyl
	xCOOH
	xCOOMinus // carboxylate C(=O)O−
	xEster
	xAnhydride // C(=O)–O–C(=O)
	xAmide
	xAcylCl // C(=O)–halogen
	xThioester
	xAcylOther
	xCN
	xImineC // C=N
	xThioC  // C=S
	xCOther // ketene, C=P, C=Si, ...
	xF
	xCl
	xBr
	xI
	xOH
	xOR     // O–alkyl
	xOAr    // O–aryl
	xOVinyl // O–C=C, O–C=N
	xOAcyl  // O–C(=O)C, O–C(=O)H (ester oxygen)
	xOCarbonyl2
	xOSi
	xOS
	xOP
	xON
	xOO
	xOB
	xOMinus
	xNH2
	xNHR
	xNR2
	xNHAr
	xNArR
	xAmideNH // N(H)–C(=O)
	xAmideNR // N(R)–C(=O)
	xImineN  // N=C
	xNitro
	xNO    // N–O single bond (hydroxylamine, amine oxide)
	xNN    // hydrazine N
	xAzide // N=N=N
	xAzo   // N=N–
	xIsoCN // N≡C (isocyanide)
	xNCX   // N=C=O, N=C=S
	xNArom // aromatic ring N (pyrrole type)
	xNS    // sulfonamide N, N–P
	xNPlus // ammonium N+
	xSH
	xSR
	xSAr
	xSS
	xSAcyl
	xSO
	xSO2
	xSO2X // S(=O)2–O, –N, –Cl (sulfonate, sulfonamide, sulfonyl chloride)
	xSOther
	xSi
	xP3
	xP5
	xB
	numX
)

// cctx is the per-molecule state of a 13C prediction.
type cctx struct {
	m        *mol
	g        *molecule.Graph
	explain  bool
	skel     []bool    // sp3 carbon: member of the Grant–Paul skeleton
	aromBond []bool    // Hückel aromatic bonds (molecule.AromaticBonds)
	parent   []float64 // aromatic parent-ring shift per atom, NaN if none
	parentOf []string  // name of the parent ring system per atom
	dist     []int16   // BFS scratch (skelBFS)
	queue    []int
	dist2    []int16 // second BFS scratch (scratch())
	q2       []int
	// alkCis maps each of two equivalent groups on an alkene carbon,
	// keyed with that alkene carbon ({group, alkene carbon}: a ring CH2
	// can sit on two such alkenes), to the position on the other carbon it
	// is cis to (-1 for H); see markAlkeneSides.
	alkCis map[[2]int]int
	// pauling holds the Pauling bond order of each aromatic bond of a
	// polycyclic six-membered aromatic system (NaN elsewhere), computed
	// on first use (paulingOrder).
	pauling []float64
}

func newCarbonCtx(m *mol, explain bool) *cctx {
	g := m.g
	n := len(g.Atoms)
	d := make([]int16, 2*n)
	q := make([]int, 0, 2*n)
	cx := &cctx{m: m, g: g, explain: explain, skel: make([]bool, n), dist: d[:n], dist2: d[n:], queue: q[:0:n], q2: q[n:n]}
	for i, a := range g.Atoms {
		cx.skel[i] = a.Element == molecule.C && !m.arom[i] && m.multi[i] == 0 && a.Charge == 0
	}
	anyArom := false
	for _, a := range m.arom {
		if a {
			anyArom = true
			break
		}
	}
	if anyArom {
		cx.aromBond = molecule.AromaticBonds(g)
		cx.assignParents()
	}
	return cx
}

// carbon predicts one carbon.
func (cx *cctx) carbon(c int, r *cres) {
	m := cx.m
	g := cx.g
	switch {
	case m.arom[c]:
		cx.aromatic(c, r)
		return
	case m.multi[c] == 0:
		cx.sp3(c, r)
		return
	}
	var dblO, dblS, dblN, dblC, dblX, tripC, tripN int
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
			default:
				dblX++
			}
		case molecule.Triple:
			if e == molecule.C {
				tripC++
			} else {
				tripN++
			}
		}
	}
	switch {
	case dblO+dblS+dblN+dblC+dblX >= 2:
		cx.cumulene(c, dblO, dblS, dblN, dblC, r)
	case tripN > 0 && g.Atoms[c].Charge < 0:
		r.kind = "isocyanide C"
		r.ac.add("base R–N≡C (isocyanide)", 157.5) // methyl isocyanide 157, phenyl isocyanide 164 (Kalinowski, from memory)
		r.sigma = 5
	case tripN > 0:
		cx.nitrile(c, r)
	case tripC > 0:
		cx.alkyne(c, r)
	case dblO > 0:
		cx.carbonyl(c, r)
	case dblS > 0:
		cx.thiocarbonyl(c, r)
	case dblN > 0:
		cx.imine(c, r)
	case dblC > 0:
		cx.alkene(c, r)
	default:
		r.kind = "C=X (unusual)"
		r.ac.add("estimate: carbon doubly bonded to Si, P or B", 150)
		r.sigma = 15
		r.estimate("carbon doubly bonded to Si, P or B is outside the tables: estimate")
	}
}

// xclass returns the class of neighbour x as a substituent of atom from.
func (cx *cctx) xclass(from, x int) xsub {
	m := cx.m
	g := cx.g
	a := g.Atoms[x]
	switch a.Element {
	case molecule.C:
		return cx.xclassC(from, x)
	case molecule.O:
		if a.Charge < 0 {
			return xOMinus
		}
		if a.HCount > 0 {
			return xOH
		}
		best := xOR
		for _, nb := range g.Neighbors(x) {
			y := nb.Atom
			if y == from {
				continue
			}
			switch g.Atoms[y].Element {
			case molecule.C:
				switch {
				case m.arom[y]:
					best = xOAr
				case m.carbonylOf(y) >= 0 || m.thioCarbonylOf(y) >= 0:
					if k := m.carbonylOf(y); k >= 0 {
						switch m.acylOther(y, x, k) {
						case 'O', 'N':
							return xOCarbonyl2
						}
					}
					return xOAcyl
				case m.multi[y] > 0:
					best = xOVinyl
				}
			case molecule.Si:
				return xOSi
			case molecule.S:
				return xOS
			case molecule.P:
				return xOP
			case molecule.N:
				return xON
			case molecule.O:
				return xOO
			case molecule.B:
				return xOB
			default:
				return xOO
			}
		}
		return best
	case molecule.N:
		if a.Charge > 0 {
			nitro := 0
			for _, nb := range g.Neighbors(x) {
				if g.Atoms[nb.Atom].Element == molecule.O && nb.Atom != from {
					nitro++
				}
			}
			if nitro >= 2 {
				return xNitro
			}
			for _, nb := range g.Neighbors(x) {
				if nb.Order == molecule.Triple {
					return xIsoCN
				}
				if nb.Order == molecule.Double && g.Atoms[nb.Atom].Element == molecule.N {
					return xAzide
				}
			}
			if m.arom[x] {
				return xNArom
			}
			if nitro == 1 {
				return xNO
			}
			return xNPlus
		}
		if m.arom[x] {
			return xNArom
		}
		var nO2, nAryl, nAlkyl int
		var triple, imine, azo, azide, acyl, ns, nn, no, ncx bool
		for _, nb := range g.Neighbors(x) {
			y := nb.Atom
			if y == from {
				continue
			}
			ey := g.Atoms[y].Element
			switch {
			case nb.Order == molecule.Triple:
				triple = true
			case nb.Order == molecule.Double && ey == molecule.O:
				nO2++
			case nb.Order == molecule.Double && ey == molecule.N:
				azo = true
				for _, n2 := range g.Neighbors(y) {
					if n2.Atom != x && n2.Order == molecule.Double {
						azide = true
					}
				}
			case nb.Order == molecule.Double && ey == molecule.C:
				imine = true
				if m.multi[y] > 1 {
					ncx = true
				}
			case nb.Order == molecule.Double:
				imine = true
			case ey == molecule.C && (m.carbonylOf(y) >= 0 || m.thioCarbonylOf(y) >= 0):
				acyl = true
			case ey == molecule.C && m.arom[y]:
				nAryl++
			case ey == molecule.C && m.multi[y] > 0:
				nAryl++ // enamine N: like an aryl amine
			case ey == molecule.C:
				nAlkyl++
			case ey == molecule.S || ey == molecule.P:
				ns = true
			case ey == molecule.N:
				nn = true
			case ey == molecule.O && g.Atoms[y].Charge < 0:
				nO2++
			case ey == molecule.O:
				no = true
			default:
				nAlkyl++
			}
		}
		switch {
		case nO2 >= 2:
			return xNitro
		case triple:
			return xIsoCN
		case nO2 == 1:
			return xNO
		case azide:
			return xAzide
		case azo:
			return xAzo
		case ncx:
			return xNCX
		case imine:
			return xImineN
		case acyl && a.HCount > 0:
			return xAmideNH
		case acyl:
			return xAmideNR
		case ns:
			return xNS
		case nn:
			return xNN
		case no:
			return xNO
		case nAryl > 0 && a.HCount > 0:
			return xNHAr
		case nAryl > 0:
			return xNArR
		case nAlkyl == 0:
			return xNH2
		case nAlkyl == 1:
			return xNHR
		}
		return xNR2
	case molecule.S:
		if a.Charge != 0 {
			return xSOther
		}
		dblO, other := 0, false
		for _, nb := range g.Neighbors(x) {
			if nb.Order == molecule.Double {
				if g.Atoms[nb.Atom].Element == molecule.O {
					dblO++
				} else {
					other = true
				}
			}
		}
		switch {
		case dblO >= 2:
			for _, nb := range g.Neighbors(x) {
				if nb.Atom == from || nb.Order != molecule.Single {
					continue
				}
				switch g.Atoms[nb.Atom].Element {
				case molecule.O, molecule.N, molecule.F, molecule.Cl, molecule.Br:
					return xSO2X
				}
			}
			return xSO2
		case dblO == 1 && !other:
			return xSO
		case dblO > 0 || other || g.Valence(x) > 2:
			return xSOther
		}
		if a.HCount > 0 {
			return xSH
		}
		for _, nb := range g.Neighbors(x) {
			y := nb.Atom
			if y == from {
				continue
			}
			switch {
			case m.arom[y]:
				return xSAr
			case g.Atoms[y].Element == molecule.S:
				return xSS
			case g.Atoms[y].Element == molecule.C && (m.carbonylOf(y) >= 0 || m.thioCarbonylOf(y) >= 0):
				return xSAcyl
			case g.Atoms[y].Element == molecule.C && m.multi[y] > 0:
				return xSAr
			}
		}
		return xSR
	case molecule.P:
		if g.Valence(x) >= 5 || m.multi[x] > 0 || a.Charge != 0 {
			return xP5
		}
		return xP3
	case molecule.Si:
		return xSi
	case molecule.B:
		return xB
	case molecule.F:
		return xF
	case molecule.Cl:
		return xCl
	case molecule.Br:
		return xBr
	case molecule.I:
		return xI
	}
	return xCOther
}

func (cx *cctx) xclassC(from, x int) xsub {
	m := cx.m
	g := cx.g
	if m.arom[x] {
		if m.hetRing[x] {
			return xHetAryl
		}
		return xAryl
	}
	if g.Atoms[x].Charge != 0 {
		return xCOther
	}
	if m.multi[x] == 0 {
		return xAlkyl
	}
	if k := m.carbonylOf(x); k >= 0 && m.multi[x] == 1 {
		switch m.acylOther(x, from, k) {
		case 'H':
			return xCHO
		case 'O':
			for _, nb := range g.Neighbors(x) {
				o := nb.Atom
				if o == from || o == k || g.Atoms[o].Element != molecule.O {
					continue
				}
				if g.Atoms[o].Charge < 0 {
					return xCOOMinus
				}
				if g.Atoms[o].HCount > 0 {
					return xCOOH
				}
				for _, n2 := range g.Neighbors(o) {
					if n2.Atom != x && m.carbonylOf(n2.Atom) >= 0 {
						return xAnhydride
					}
				}
			}
			return xEster
		case 'N':
			return xAmide
		case 'X':
			return xAcylCl
		case 'S':
			return xThioester
		case 'A':
			return xConjKetone
		case 'C':
			for _, nb := range g.Neighbors(x) {
				y := nb.Atom
				if y != from && y != k && g.Atoms[y].Element == molecule.C && m.multi[y] > 0 && m.carbonylOf(y) < 0 {
					return xConjKetone
				}
			}
			return xKetone
		}
		return xAcylOther
	}
	var cn, yne, imine, thio, ene, other bool
	for _, nb := range g.Neighbors(x) {
		y := nb.Atom
		ey := g.Atoms[y].Element
		switch {
		case nb.Order == molecule.Triple && ey == molecule.N:
			cn = true
		case nb.Order == molecule.Triple && ey == molecule.C:
			yne = true
		case nb.Order == molecule.Double && ey == molecule.N:
			imine = true
		case nb.Order == molecule.Double && ey == molecule.S:
			thio = true
		case nb.Order == molecule.Double && ey == molecule.C && y != from:
			ene = true
		case nb.Order == molecule.Double:
			other = true
		}
	}
	switch {
	case cn:
		return xCN
	case yne:
		return xAlkynyl
	case imine:
		return xImineC
	case thio:
		return xThioC
	case other:
		return xCOther
	case ene:
		return xVinyl
	}
	return xCOther
}

// isAcyl reports whether class s is a carbonyl-type group (C=O, C≡N).
func isAcyl(s xsub) bool { return s >= xCHO && s <= xCN }

// scratch returns the second BFS distance array, every entry -1.
func (cx *cctx) scratch() []int16 {
	for i := range cx.dist2 {
		cx.dist2[i] = -1
	}
	return cx.dist2
}
