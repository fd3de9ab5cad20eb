package predict

import (
	"strings"

	"shiftrank/molecule"
)

// sub classifies a substituent as seen from the atom it is attached to. The
// classes are those of the increment tables (Pretsch, Bühlmann,
// Badertscher, "Structure Determination of Organic Compounds: Tables of
// Spectral Data"; Silverstein, Webster, Kiemle, "Spectrometric
// Identification of Organic Compounds"), extended to every neighbour the
// isomer generator can make.
type sub uint8

const (
	subAlkyl     sub = iota // sp3 carbon
	subAlkenyl              // C=C (also allenyl, enol carbon)
	subAlkynyl              // C≡C
	subAryl                 // carbon of a benzene-type ring
	subHetAryl              // carbon of a heteroaromatic ring
	subCHO                  // C(=O)H
	subKetone               // C(=O)C
	subArKetone             // C(=O)Ar
	subCOOH                 // C(=O)OH
	subEster                // C(=O)OC
	subAmideC               // C(=O)N
	subAcylX                // C(=O)Hal
	subThioester            // C(=O)S
	subAcylOther            // C(=O) with another neighbour (Si, P, B, O–X ...)
	subCN                   // C≡N
	subImineC               // C=N
	subThioC                // C=S
	subCOther               // carbon with an unusual multiple bond (C=P, C=Si, C=B, ketene ...)
	subF
	subCl
	subBr
	subI
	subOH
	subOR      // O–C(sp3)
	subOAr     // O–aryl
	subOVinyl  // O–C=C, O–C≡C, O–C=N
	subOAcyl   // O–C(=O)C (ester oxygen)
	subOFormyl // O–C(=O)H
	subOAroyl  // O–C(=O)Ar
	subOCarbonate
	subOCarbamate
	subOO  // peroxide, hydroperoxide
	subON  // O–N
	subOS  // O–S
	subOP  // O–P
	subOSi // O–Si
	subOB  // O–B
	subOX  // O–halogen
	subAmine
	subNAryl
	subAmideN  // N–C(=O), N–C(=S)
	subImineN  // N=C
	subIsoCN   // N≡C
	subAzo     // N=N
	subNitroso // N=O
	subNitro   // NO2 (charge-separated or written with two N=O)
	subNN      // N–N
	subNO      // N–O
	subNS      // N–S, N–P(=O)
	subNArom   // ring N of a heteroaromatic (pyrrole type)
	subSR      // SH, S–C(sp3)
	subSAr
	subSS
	subSAcyl
	subSO  // sulfoxide
	subSO2 // sulfone, sulfonate, sulfonamide S
	subSOther
	subP3 // P(III)
	subP5 // P(V): P=O, P=S, pentavalent
	subSi
	subB
	numSub
)

// subName names each class in breakdowns ("α: Cl").
var subName = [numSub]string{
	subAlkyl: "alkyl", subAlkenyl: "C=C", subAlkynyl: "C≡C", subAryl: "aryl", subHetAryl: "heteroaryl",
	subCHO: "CHO", subKetone: "C(=O)R", subArKetone: "C(=O)Ar", subCOOH: "COOH", subEster: "C(=O)OR",
	subAmideC: "C(=O)N", subAcylX: "C(=O)Hal", subThioester: "C(=O)S", subAcylOther: "C(=O)X",
	subCN: "C≡N", subImineC: "C=N", subThioC: "C=S", subCOther: "C=X (unusual)",
	subF: "F", subCl: "Cl", subBr: "Br", subI: "I",
	subOH: "OH", subOR: "O–R", subOAr: "O–Ar", subOVinyl: "O–C=C", subOAcyl: "O–C(=O)R",
	subOFormyl: "O–C(=O)H", subOAroyl: "O–C(=O)Ar", subOCarbonate: "O–C(=O)O", subOCarbamate: "O–C(=O)N",
	subOO: "O–O", subON: "O–N", subOS: "O–S", subOP: "O–P", subOSi: "O–Si", subOB: "O–B", subOX: "O–Hal",
	subAmine: "N (amine)", subNAryl: "N–Ar", subAmideN: "N–C(=O)", subImineN: "N=C", subIsoCN: "N≡C",
	subAzo: "N=N", subNitroso: "N=O", subNitro: "NO2", subNN: "N–N", subNO: "N–O", subNS: "N–S", subNArom: "N (heteroaromatic)",
	subSR: "S–R", subSAr: "S–Ar", subSS: "S–S", subSAcyl: "S–C(=O)", subSO: "S(=O)", subSO2: "SO2",
	subSOther: "S (hypervalent)", subP3: "P(III)", subP5: "P(V)", subSi: "Si", subB: "B",
}

// classify returns the class of neighbour x as a substituent of atom from.
func (m *mol) classify(from, x int) sub {
	g := m.g
	a := g.Atoms[x]
	switch a.Element {
	case molecule.C:
		return m.classifyC(from, x)
	case molecule.O:
		if a.HCount > 0 {
			return subOH
		}
		for _, nb := range g.Neighbors(x) {
			if nb.Atom == from {
				continue
			}
			y := nb.Atom
			switch g.Atoms[y].Element {
			case molecule.C:
				if m.arom[y] {
					return subOAr
				}
				if k := m.carbonylOf(y); k >= 0 {
					switch m.acylOther(y, x, k) {
					case 'O':
						return subOCarbonate
					case 'N':
						return subOCarbamate
					case 'H':
						return subOFormyl
					case 'A':
						return subOAroyl
					}
					return subOAcyl
				}
				if m.multi[y] > 0 {
					return subOVinyl
				}
				return subOR
			case molecule.O:
				return subOO
			case molecule.N:
				return subON
			case molecule.S:
				return subOS
			case molecule.P:
				return subOP
			case molecule.Si:
				return subOSi
			case molecule.B:
				return subOB
			default:
				return subOX
			}
		}
		return subOR
	case molecule.N:
		if m.arom[x] {
			return subNArom
		}
		if m.nitro(x) {
			return subNitro
		}
		// Decide by a fixed priority, not by neighbour order.
		var triple, nitroso, azo, imine, amide, aryl, ns, nn, no bool
		for _, nb := range g.Neighbors(x) {
			if nb.Atom == from {
				continue
			}
			y := nb.Atom
			ey := g.Atoms[y].Element
			switch {
			case nb.Order == molecule.Triple:
				triple = true
			case nb.Order == molecule.Double && ey == molecule.O:
				nitroso = true
			case nb.Order == molecule.Double && ey == molecule.N:
				azo = true
			case nb.Order == molecule.Double:
				imine = true
			case ey == molecule.C && (m.carbonylOf(y) >= 0 || m.thioCarbonylOf(y) >= 0):
				amide = true
			case ey == molecule.C && m.arom[y]:
				aryl = true
			case ey == molecule.S || ey == molecule.P && m.multi[y] > 0:
				ns = true
			case ey == molecule.N:
				nn = true
			case ey == molecule.O:
				no = true
			}
		}
		switch {
		case triple:
			return subIsoCN
		case nitroso:
			return subNitroso
		case azo:
			return subAzo
		case imine:
			return subImineN
		case amide:
			return subAmideN
		case aryl:
			return subNAryl
		case ns:
			return subNS
		case nn:
			return subNN
		case no:
			return subNO
		}
		return subAmine
	case molecule.S:
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
			return subSO2
		case dblO == 1 && !other && g.Valence(x) == 4:
			return subSO
		case dblO > 0 || other || g.Valence(x) > 2:
			return subSOther
		}
		for _, nb := range g.Neighbors(x) {
			if nb.Atom == from {
				continue
			}
			y := nb.Atom
			switch {
			case m.arom[y]:
				return subSAr
			case g.Atoms[y].Element == molecule.S:
				return subSS
			case g.Atoms[y].Element == molecule.C && m.carbonylOf(y) >= 0:
				return subSAcyl
			}
		}
		return subSR
	case molecule.P:
		if g.Valence(x) >= 5 || m.multi[x] > 0 {
			return subP5
		}
		return subP3
	case molecule.Si:
		return subSi
	case molecule.B:
		return subB
	case molecule.F:
		return subF
	case molecule.Cl:
		return subCl
	case molecule.Br:
		return subBr
	case molecule.I:
		return subI
	}
	return subCOther
}

func (m *mol) classifyC(from, x int) sub {
	g := m.g
	if m.arom[x] {
		if m.hetRing[x] {
			return subHetAryl
		}
		return subAryl
	}
	if m.multi[x] == 0 {
		return subAlkyl
	}
	if k := m.carbonylOf(x); k >= 0 {
		switch m.acylOther(x, from, k) {
		case 'H':
			return subCHO
		case 'O':
			// C(=O)–O: acid or ester.
			for _, nb := range g.Neighbors(x) {
				if nb.Atom != from && nb.Atom != k && g.Atoms[nb.Atom].Element == molecule.O {
					if g.Atoms[nb.Atom].HCount > 0 {
						return subCOOH
					}
				}
			}
			return subEster
		case 'N':
			return subAmideC
		case 'X':
			return subAcylX
		case 'S':
			return subThioester
		case 'A':
			return subArKetone
		case 'C':
			return subKetone
		}
		return subAcylOther
	}
	var cn, yne, imine, thio, ene bool
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
			ene = true // also allenes and ketenes: closest class
		}
	}
	switch {
	case cn:
		return subCN
	case yne:
		return subAlkynyl
	case imine:
		return subImineC
	case thio:
		return subThioC
	case ene:
		return subAlkenyl
	}
	return subCOther
}

// carbonylOf returns the O doubly bonded to carbon c, or -1.
func (m *mol) carbonylOf(c int) int {
	if m.g.Atoms[c].Element != molecule.C {
		return -1
	}
	for _, nb := range m.g.Neighbors(c) {
		if nb.Order == molecule.Double && m.g.Atoms[nb.Atom].Element == molecule.O {
			return nb.Atom
		}
	}
	return -1
}

// thioCarbonylOf returns the S doubly bonded to carbon c, or -1.
func (m *mol) thioCarbonylOf(c int) int {
	if m.g.Atoms[c].Element != molecule.C {
		return -1
	}
	for _, nb := range m.g.Neighbors(c) {
		if nb.Order == molecule.Double && m.g.Atoms[nb.Atom].Element == molecule.S {
			return nb.Atom
		}
	}
	return -1
}

func (m *mol) doubleCount(x int) int {
	n := 0
	for _, nb := range m.g.Neighbors(x) {
		if nb.Order == molecule.Double {
			n++
		}
	}
	return n
}

// acylOther describes the third substituent of carbonyl carbon c (besides
// from and the carbonyl oxygen k): 'H' hydrogen, 'O', 'N', 'S', 'X'
// halogen, 'A' aromatic carbon, 'C' other carbon, '?' anything else. The
// most electronegative / most specific neighbour wins for amide-like
// carbons with two heteroatoms (carbamate C sees 'O' from N and 'N' from O).
func (m *mol) acylOther(c, from, k int) byte {
	g := m.g
	if g.Atoms[c].HCount > 0 {
		return 'H'
	}
	// Priority N > O > S > halogen > aryl > carbon, independent of order.
	const prio = "NOSXAC?"
	r := byte('?')
	for _, nb := range g.Neighbors(c) {
		if nb.Atom == from || nb.Atom == k {
			continue
		}
		y := nb.Atom
		e := g.Atoms[y].Element
		var v byte
		switch {
		case e == molecule.N:
			v = 'N'
		case e == molecule.O:
			v = 'O'
		case e == molecule.S:
			v = 'S'
		case e.IsHalogen():
			v = 'X'
		case e == molecule.C && m.arom[y]:
			v = 'A'
		case e == molecule.C:
			v = 'C'
		default:
			continue
		}
		if strings.IndexByte(prio, v) < strings.IndexByte(prio, r) {
			r = v
		}
	}
	return r
}
