package predict

import (
	"math"
	"strconv"

	"shiftrank/molecule"
	"shiftrank/spectrum"
)

// Coupling constants, Hz (common practice; Pretsch and Friebolin ch. 3,
// from memory).
const (
	jVicinal        = 7.0  // H–C–C–H, freely rotating sp3
	jAllylic3       = 6.8  // =CH–CH (sp2–sp3)
	jDiene          = 10.5 // =CH–CH= (s-trans diene, enal)
	jEnal           = 7.8  // CHO–CH=
	jCHOMethyl      = 2.8  // CHO–CH3
	jCHO            = 1.6  // CHO–CH2 / CHO–CH
	jImine          = 5.0  // CH=N–... H–C=N with H–C(sp3)
	jAlkeneCis      = 10.5 // acyclic alkene cis
	jAlkeneTrans    = 16.5 // acyclic alkene trans
	jGemAlkene      = 1.5  // =CH2 geminal
	jOrtho          = 7.8  // benzene ortho
	jOrthoN         = 4.9  // pyridine J23
	jMeta           = 1.8  // benzene meta
	jMetaAcrossN    = 0.3  // pyridine J26
	jPara           = 0.6  // benzene para
	jPropargylic    = 2.6  // H–C≡C–C–H (4J, resolved)
	jSiVicinal      = 3.5  // H–Si–C–H
	jRingAlkeneAlly = 3.5  // =CH–CH2 in a ring (cyclohexene)
)

// Karplus relation 3J(φ) = A cos²φ + B cos φ + C (Karplus, J. Am. Chem. Soc.
// 1963, 85, 2870; coefficients A 7.76, B −1.10, C 1.40 as commonly quoted,
// from memory).
func karplus(deg float64) float64 {
	c := math.Cos(deg * math.Pi / 180)
	return 7.76*c*c - 1.10*c + 1.40
}

// ringVicinal returns typical cis and trans 3J for H–C–C–H in an sp3 ring.
// Three-membered rings: tabulated (cyclopropane cis 9, trans 5.5; Karplus
// parameters do not fit strained rings). Four- and five-membered rings:
// Karplus with typical dihedrals (cis 20°/30°, trans 140°/150°). Chair
// six-membered rings interconverting fast: trans = mean of ax–ax (180°) and
// eq–eq (60°), cis = ax–eq (60°).
func ringVicinal(size int) (cis, trans float64) {
	switch size {
	case 3:
		return 9.0, 5.5
	case 4:
		return karplus(20), karplus(140)
	case 5:
		return karplus(30), karplus(150)
	case 6:
		return karplus(60), (karplus(180) + karplus(60)) / 2
	}
	return jVicinal, jVicinal
}

// alkeneRingCis: cis 3J across a ring double bond (cyclopropene 1.5,
// cyclobutene 2.8, cyclopentene 5.5, cyclohexene 10.0, cycloheptene 11;
// Pretsch, from memory).
func alkeneRingCis(size int) float64 {
	switch size {
	case 3:
		return 1.5
	case 4:
		return 2.8
	case 5:
		return 5.5
	case 6:
		return 10.0
	}
	return 11.0
}

type jterm struct {
	j       float64
	n       int
	label   string
	nucleus string
	atom    int
}

// pairJ appends the couplings between one H of group A and the H of group
// B.
func (p *Predictor) pairJ(m *mol, A, B *hgroup, out []jterm) []jterm {
	g := m.g
	a, b := A.atom, B.atom
	if a == b {
		if A.split == 1 {
			out = append(out, jterm{j: jGemAlkene, n: 1, label: "geminal =CH2", atom: b})
		}
		return out
	}
	bi := g.BondBetween(a, b)
	if bi >= 0 {
		bond := g.Bonds[bi]
		if m.arom[a] && m.arom[b] && A.ring != nil && inRing(A.ring, b) {
			return append(out, p.aromaticJ(m, A, b, 1))
		}
		if bond.Order == molecule.Double {
			return append(out, p.alkeneJ(m, A, B, bi))
		}
		if bond.Order != molecule.Single {
			return out
		}
		return p.singleBondJ(m, A, B, bi, out)
	}
	if m.arom[a] && m.arom[b] && A.ring != nil {
		for k, x := range A.ring {
			if x == b {
				d := min(k, len(A.ring)-k)
				return append(out, p.aromaticJ(m, A, b, d))
			}
		}
		return out
	}
	// 4J propargylic: H–C≡C–C–H.
	if q := m.tripleC(a); q >= 0 && g.BondBetween(q, b) >= 0 && m.hybrid(b) == 3 {
		return append(out, jterm{j: jPropargylic, n: B.h, label: "4J propargylic", atom: b})
	}
	if q := m.tripleC(b); q >= 0 && g.BondBetween(q, a) >= 0 && m.hybrid(a) == 3 {
		return append(out, jterm{j: jPropargylic, n: B.h, label: "4J propargylic", atom: b})
	}
	return out
}

// tripleC returns the carbon triply bonded to carbon a, or -1.
func (m *mol) tripleC(a int) int {
	for _, nb := range m.g.Neighbors(a) {
		if nb.Order == molecule.Triple && m.g.Atoms[nb.Atom].Element == molecule.C {
			return nb.Atom
		}
	}
	return -1
}

func (p *Predictor) singleBondJ(m *mol, A, B *hgroup, bi int, out []jterm) []jterm {
	g := m.g
	a, b := A.atom, B.atom
	ea, eb := g.Atoms[a].Element, g.Atoms[b].Element
	if ea == molecule.Si || eb == molecule.Si {
		return append(out, jterm{j: jSiVicinal, n: B.h, label: "vicinal H–Si–C–H", atom: b})
	}
	if ea != molecule.C && ea != molecule.P || eb != molecule.C && eb != molecule.P {
		return out
	}
	ha, hb := m.hybrid(a), m.hybrid(b)
	cho := func(x int) bool { return g.Atoms[x].Element == molecule.C && m.carbonylOf(x) >= 0 }
	imine := func(x int) bool {
		for _, nb := range g.Neighbors(x) {
			if nb.Order == molecule.Double && g.Atoms[nb.Atom].Element == molecule.N {
				return true
			}
		}
		return false
	}
	switch {
	case cho(a) || cho(b):
		other, oh := b, hb
		if cho(b) {
			other, oh = a, ha
		}
		if oh == 2 && !cho(other) {
			return append(out, jterm{j: jEnal, n: B.h, label: "CHO–CH=", atom: b})
		}
		j := jCHO
		if g.Atoms[other].HCount == 3 {
			j = jCHOMethyl
		}
		return append(out, jterm{j: j, n: B.h, label: "CHO–CH", atom: b})
	case imine(a) || imine(b):
		return append(out, jterm{j: jImine, n: B.h, label: "CH=N–CH", atom: b})
	case ha == 3 && hb == 3:
		size := int(m.ringBond[bi])
		if size >= 3 && size <= 6 {
			cis, trans := ringVicinal(size)
			if B.h == 2 {
				return append(out,
					jterm{j: round1(trans), n: 1, label: ringTransLabel[size], atom: b},
					jterm{j: round1(cis), n: 1, label: ringCisLabel[size], atom: b})
			}
			return append(out, jterm{j: round1((cis + trans) / 2), n: B.h, label: ringEitherLabel[size], atom: b})
		}
		return append(out, jterm{j: jVicinal, n: B.h, label: "vicinal sp3", atom: b})
	case ha == 2 && hb == 2:
		return append(out, jterm{j: jDiene, n: B.h, label: "=CH–CH=", atom: b})
	case ha == 1 || hb == 1:
		return out
	default:
		if m.ringBond[bi] > 0 && m.ringBond[bi] <= 7 {
			return append(out, jterm{j: jRingAlkeneAlly, n: B.h, label: "ring vicinal =CH–CH", atom: b})
		}
		return append(out, jterm{j: jAllylic3, n: B.h, label: "vicinal =CH–CH", atom: b})
	}
}

var (
	ringCisLabel    = [7]string{3: "ring vicinal cis (3-ring)", 4: "ring vicinal cis (4-ring)", 5: "ring vicinal cis (5-ring)", 6: "ring vicinal cis (6-ring)"}
	ringTransLabel  = [7]string{3: "ring vicinal trans (3-ring)", 4: "ring vicinal trans (4-ring)", 5: "ring vicinal trans (5-ring)", 6: "ring vicinal trans (6-ring)"}
	ringEitherLabel = [7]string{3: "ring vicinal, cis/trans not fixed (3-ring)", 4: "ring vicinal, cis/trans not fixed (4-ring)", 5: "ring vicinal, cis/trans not fixed (5-ring)", 6: "ring vicinal, cis/trans not fixed (6-ring)"}
	alkeneRingLabel = [8]string{3: "alkene cis (3-ring)", 4: "alkene cis (4-ring)", 5: "alkene cis (5-ring)", 6: "alkene cis (6-ring)", 7: "alkene cis (7-ring)"}
)

func round1(v float64) float64 { return math.Round(v*10) / 10 }

// alkeneJ: 3J across a C=C between H of A and H of B. Electronegative
// substituents lower both (vinyl ethers, vinyl chloride: cis ~7, trans ~14).
func (p *Predictor) alkeneJ(m *mol, A, B *hgroup, bi int) jterm {
	g := m.g
	a, b := A.atom, B.atom
	neg := 0
	for _, x := range [2]int{a, b} {
		for _, nb := range g.Neighbors(x) {
			switch g.Atoms[nb.Atom].Element {
			case molecule.O, molecule.N, molecule.F, molecule.Cl:
				if nb.Order == molecule.Single {
					neg++
				}
			}
		}
	}
	cis := max(jAlkeneCis-2.0*float64(neg), 4)
	trans := jAlkeneTrans - 1.5*float64(neg)
	if ring := int(m.ringBond[bi]); ring > 0 && ring <= 7 {
		return jterm{j: alkeneRingCis(ring), n: 1, label: alkeneRingLabel[ring], atom: b}
	}
	// Split =CH2 halves know their geometry.
	if A.split == 1 {
		if A.cisTo == -1 {
			return jterm{j: cis, n: 1, label: "alkene cis", atom: b}
		}
		return jterm{j: trans, n: 1, label: "alkene trans", atom: b}
	}
	if B.split == 1 {
		if B.cisTo == -1 {
			return jterm{j: cis, n: 1, label: "alkene cis", atom: b}
		}
		return jterm{j: trans, n: 1, label: "alkene trans", atom: b}
	}
	if B.h >= 2 {
		return jterm{j: round1((cis + trans) / 2), n: B.h, label: "alkene cis and trans", atom: b}
	}
	// 1,2-disubstituted alkene: E/Z not fixed by the constitution; we
	// report the mean of cis and trans so that either observed value is
	// within ~3 Hz.
	return jterm{j: round1((cis + trans) / 2), n: 1, label: "alkene 3J, E/Z not fixed (mean of cis and trans)", atom: b}
}

func ftoa1(v float64) string { return strconv.FormatFloat(v, 'f', 1, 64) }

// aromaticJ: couplings within an aromatic ring by ring distance d.
func (p *Predictor) aromaticJ(m *mol, A *hgroup, b, d int) jterm {
	g := m.g
	ring := A.ring
	a := A.atom
	nextToHetero := func(x int) molecule.Element {
		for _, nb := range g.Neighbors(x) {
			if inRing(ring, nb.Atom) && g.Atoms[nb.Atom].Element != molecule.C {
				return g.Atoms[nb.Atom].Element
			}
		}
		return molecule.C
	}
	if len(ring) == 6 {
		switch d {
		case 1:
			if nextToHetero(a) != molecule.C || nextToHetero(b) != molecule.C {
				return jterm{j: jOrthoN, n: 1, label: "aromatic ortho (next to ring N)", atom: b}
			}
			return jterm{j: jOrtho, n: 1, label: "aromatic ortho", atom: b}
		case 2:
			// The atom between a and b.
			for _, nb := range g.Neighbors(a) {
				if g.BondBetween(nb.Atom, b) >= 0 && inRing(ring, nb.Atom) && g.Atoms[nb.Atom].Element != molecule.C {
					return jterm{j: jMetaAcrossN, n: 1, label: "aromatic meta (across N)", atom: b}
				}
			}
			return jterm{j: jMeta, n: 1, label: "aromatic meta", atom: b}
		default:
			return jterm{j: jPara, n: 1, label: "aromatic para", atom: b}
		}
	}
	// Five-membered rings (thiophene J23 4.9, J34 3.5, J25 2.8, J24 1.0;
	// furan 1.8, 3.3, 1.5, 0.8; pyrrole 2.6, 3.4, 1.5, 1.4).
	if d == 1 {
		ha, hb := nextToHetero(a), nextToHetero(b)
		e := ha
		if e == molecule.C {
			e = hb
		}
		switch e {
		case molecule.S:
			return jterm{j: 4.9, n: 1, label: "heteroaromatic 3J (next to S)", atom: b}
		case molecule.O:
			return jterm{j: 1.8, n: 1, label: "heteroaromatic 3J (next to O)", atom: b}
		case molecule.N:
			return jterm{j: 2.6, n: 1, label: "heteroaromatic 3J (next to N)", atom: b}
		}
		return jterm{j: 3.4, n: 1, label: "heteroaromatic 3J", atom: b}
	}
	for _, nb := range g.Neighbors(a) {
		if g.BondBetween(nb.Atom, b) >= 0 && inRing(ring, nb.Atom) {
			switch g.Atoms[nb.Atom].Element {
			case molecule.S:
				return jterm{j: 2.8, n: 1, label: "heteroaromatic 4J (across S)", atom: b}
			case molecule.O, molecule.N:
				return jterm{j: 1.5, n: 1, label: "heteroaromatic 4J (across " + g.Atoms[nb.Atom].Element.String() + ")", atom: b}
			}
		}
	}
	return jterm{j: 1.0, n: 1, label: "heteroaromatic 4J", atom: b}
}

// heteroJ appends couplings of group A's H to 19F and 31P nuclei (spin 1/2,
// 100 % abundance). Values, Hz (Pretsch; common practice, from memory):
// 2J H–C–F 47 (CH2F) / 56 (CHF2) / 80 (=CHF); 3J H–C–C–F 22 / 18 / 9 for
// 1 / 2 / 3 F on the neighbouring carbon; H–C=C–F cis 20, trans 50;
// aromatic H–F ortho 9, meta 5.5; 1J P–H 200 (P(III)) / 600 (P(V)); 2J
// H–C–P 3 / 15; 3J H–C–C–P 13 / 18; 3J H–C–O–P 11; aromatic P ortho 12,
// meta 3; 3J H–C–N–P 9.5 (HMPA).
func (p *Predictor) heteroJ(m *mol, A *hgroup, out []jterm) []jterm {
	g := m.g
	a := A.atom
	add := func(j float64, label, nuc string, atom int) {
		out = append(out, jterm{j: j, n: 1, label: label, nucleus: nuc, atom: atom})
	}
	p5 := func(x int) bool { return g.Valence(x) >= 5 || m.multi[x] > 0 }
	if g.Atoms[a].Element == molecule.P {
		if p5(a) {
			add(600, "1J P–H", "31P", a)
		} else {
			add(200, "1J P–H", "31P", a)
		}
		return out
	}
	if g.Atoms[a].Element != molecule.C {
		return out
	}
	ha := m.hybrid(a)
	nF := 0
	for _, nb := range g.Neighbors(a) {
		if g.Atoms[nb.Atom].Element == molecule.F {
			nF++
		}
	}
	for _, nb := range g.Neighbors(a) {
		x := nb.Atom
		switch g.Atoms[x].Element {
		case molecule.F:
			j := 47.0
			if nF >= 2 {
				j = 56
			}
			if ha == 2 {
				j = 80
			}
			add(j, "2J H–F (geminal)", "19F", x)
		case molecule.P:
			if p5(x) {
				add(15, "2J H–C–P", "31P", x)
			} else {
				add(3, "2J H–C–P", "31P", x)
			}
		case molecule.O, molecule.N:
			for _, n2 := range g.Neighbors(x) {
				if n2.Atom != a && g.Atoms[n2.Atom].Element == molecule.P {
					if g.Atoms[x].Element == molecule.O {
						add(11, "3J H–C–O–P", "31P", n2.Atom)
					} else {
						add(9.5, "3J H–C–N–P", "31P", n2.Atom)
					}
				}
			}
		case molecule.C:
			// F or P on the neighbouring carbon.
			nFx := 0
			for _, n2 := range g.Neighbors(x) {
				if g.Atoms[n2.Atom].Element == molecule.F {
					nFx++
				}
			}
			for _, n2 := range g.Neighbors(x) {
				y := n2.Atom
				if y == a {
					continue
				}
				switch g.Atoms[y].Element {
				case molecule.F:
					switch {
					case m.arom[a] && m.arom[x]:
						add(9, "3J H–F (aromatic ortho)", "19F", y)
					case nb.Order == molecule.Double:
						add(35, "3J H–C=C–F (E/Z not fixed: cis ~20, trans ~50)", "19F", y)
					case ha == 3 && m.hybrid(x) == 3:
						j := [4]float64{0, 22, 18, 9}[min(nFx, 3)]
						add(j, "3J H–C–C–F", "19F", y)
					default:
						add(8, "3J H–C–C–F", "19F", y)
					}
				case molecule.P:
					switch {
					case m.arom[a] && m.arom[x]:
						add(12, "3J H–P (aromatic ortho)", "31P", y)
					case p5(y):
						add(18, "3J H–C–C–P", "31P", y)
					default:
						add(13, "3J H–C–C–P", "31P", y)
					}
				}
			}
		}
	}
	if m.arom[a] && A.ring != nil && len(A.ring) == 6 {
		for _, k := range [2]int{2, 4} {
			x := A.ring[k]
			for _, nb := range g.Neighbors(x) {
				if inRing(A.ring, nb.Atom) {
					continue
				}
				switch g.Atoms[nb.Atom].Element {
				case molecule.F:
					add(5.5, "4J H–F (aromatic meta)", "19F", nb.Atom)
				case molecule.P:
					add(3, "4J H–P (aromatic meta)", "31P", nb.Atom)
				}
			}
		}
	}
	return out
}

// couple fills Couplings, J and Multiplicity of every environment.
func (p *Predictor) couple(m *mol, w *work, groups []hgroup, reps, order []int, sp *Spectrum, broad []bool) {
	envs := sp.Environments
	lw := p.opts.LineWidthHz
	buf := w.jbuf[:0]
	defer func() { w.jbuf = buf[:0] }()
	for id := range envs {
		e := &envs[id]
		e.SlowExchangeH = slowExchangeH(m, groups[reps[order[id]]].atom, e.Exchangeable)
		if !e.Exchangeable {
			e.LongRangeH = allylicH(m, groups[reps[order[id]]].atom)
		}
		if e.Exchangeable || broad[id] {
			continue
		}
		A := &groups[reps[order[id]]]
		buf = buf[:0]
		for k := range groups {
			B := &groups[k]
			if B.env == id && B.atom == A.atom && B.split == A.split && B.cisTo == A.cisTo && B.side == A.side {
				continue // the group itself
			}
			if envs[B.env].Exchangeable || broad[B.env] {
				continue
			}
			n0 := len(buf)
			buf = p.pairJ(m, A, B, buf)
			for i := n0; i < len(buf); i++ {
				buf[i].atom = B.env // env of the partner (atom kept below)
			}
			_ = n0
		}
		// Homonuclear couplings to the own environment do not split.
		for _, t := range buf {
			if t.atom == id {
				continue
			}
			addCoupling(e, Coupling{Env: t.atom, N: t.n, J: t.j, Label: t.label})
		}
		buf = buf[:0]
		buf = p.heteroJ(m, A, buf)
		for _, t := range buf {
			addCoupling(e, Coupling{Env: -1, N: t.n, J: t.j, Label: t.label, Nucleus: t.nucleus, Atoms: []int{t.atom}})
		}
		for i := range e.Couplings {
			c := &e.Couplings[i]
			c.Resolved = c.J > lw
			if !c.Resolved && c.Env >= 0 && c.J >= minLongRangeJ {
				// a small ring coupling (heteroaromatic ⁴J) predicted
				// below the line width is often resolved all the same
				e.LongRangeH += c.N
			}
		}
		sortCouplings(e.Couplings)
	}
	if p.opts.Explain {
		sp.spins = p.spinTable(m, groups, envs, broad)
	}
	// Atoms of the coupled environments.
	for id := range envs {
		for i := range envs[id].Couplings {
			c := &envs[id].Couplings[i]
			if c.Env >= 0 {
				c.Atoms = envs[c.Env].Atoms
			}
		}
	}
	for id := range envs {
		p.name(envs, id)
	}
}

func addCoupling(e *Environment, c Coupling) {
	for i := range e.Couplings {
		d := &e.Couplings[i]
		if d.Env == c.Env && d.Label == c.Label && math.Abs(d.J-c.J) < 0.05 {
			d.N += c.N
			if c.Env < 0 {
				for _, a := range c.Atoms {
					if !containsInt(d.Atoms, a) {
						d.Atoms = append(d.Atoms, a)
					}
				}
			}
			return
		}
	}
	e.Couplings = append(e.Couplings, c)
}

func containsInt(s []int, x int) bool {
	for _, y := range s {
		if y == x {
			return true
		}
	}
	return false
}

func sortCouplings(c []Coupling) {
	less := func(a, b *Coupling) bool {
		if a.J != b.J {
			return a.J > b.J
		}
		if a.Label != b.Label {
			return a.Label < b.Label
		}
		return a.N > b.N
	}
	for i := 1; i < len(c); i++ {
		for j := i; j > 0 && less(&c[j], &c[j-1]); j-- {
			c[j], c[j-1] = c[j-1], c[j]
		}
	}
}

// Naming limits.
const (
	// strongNameRatio: below this Δν/J a homonuclear coupling distorts the
	// pattern beyond recognition and the signal is reported as "m" (our
	// judgement; first-order analysis is safe above ~10, Friebolin ch. 4).
	strongNameRatio = 6.0
	// mergeTolHz: couplings closer than this (or than the line width, if
	// larger) merge into one n+1 factor.
	mergeTolHz = 1.5
)

// maxSingleN is the largest number of equivalent partners named as one
// n+1 pattern (a septet); more read as "m".
const maxSingleN = 6

// setPattern sets the typed and the written multiplicity of e.
func setPattern(e *Environment, m spectrum.Multiplicity) {
	e.Pattern, e.Multiplicity = m, m.Code()
}

// name sets Pattern, Multiplicity and J of environment id from its
// couplings.
func (p *Predictor) name(envs []Environment, id int) {
	e := &envs[id]
	if e.Exchangeable || (len(e.Couplings) == 0 && e.Multiplicity == "br s") {
		setPattern(e, spectrum.Singlet().WithBroad(true))
		return
	}
	type cl struct {
		j float64
		n int
	}
	var cls [8]cl
	nc := 0
	strong := -1
	ratio := 0.0
	for _, c := range e.Couplings {
		if !c.Resolved {
			continue
		}
		j := c.J
		if c.Env >= 0 {
			// AA'BB' (para-disubstituted benzene): an unresolved coupling
			// to the same environment adds to the apparent splitting
			// (N = J_AB + J_AB').
			for _, u := range e.Couplings {
				if !u.Resolved && u.Env == c.Env {
					j += u.J
				}
			}
			dnu := math.Abs(e.Shift-envs[c.Env].Shift) * p.opts.MHz
			if r := dnu / c.J; r < strongNameRatio && !p.isABPair(envs, id, c.Env) {
				strong, ratio = c.Env, r
			}
		}
		merged := false
		tol := max(mergeTolHz, p.opts.LineWidthHz)
		for k := 0; k < nc; k++ {
			if math.Abs(cls[k].j-j) <= tol {
				cls[k].j = (cls[k].j*float64(cls[k].n) + j*float64(c.N)) / float64(cls[k].n+c.N)
				cls[k].n += c.N
				merged = true
				break
			}
		}
		if !merged {
			if nc == len(cls) {
				nc++ // too many: "m" below
				break
			}
			cls[nc] = cl{j, c.N}
			nc++
		}
	}
	explain := p.opts.Explain
	for _, c := range e.Couplings {
		if c.Resolved && len(c.Label) > 12 && c.Label[:12] == "ring vicinal" {
			setPattern(e, spectrum.Multiplet())
			if explain {
				e.Reasons = append(e.Reasons, "vicinal couplings in a saturated ring differ for cis and trans neighbours and the ring protons are magnetically inequivalent: m")
			}
			return
		}
	}
	if strong >= 0 {
		setPattern(e, spectrum.Multiplet())
		if explain {
			e.Reasons = append(e.Reasons, "strongly coupled to environment "+itoa(strong)+" (Δν/J = "+ftoa1(ratio)+" at "+ftoa1(p.opts.MHz)+" MHz): second-order multiplet, reported as m")
		}
		return
	}
	if nc > len(cls) {
		setPattern(e, spectrum.Multiplet())
		return
	}
	// Largest J first.
	for i := 1; i < nc; i++ {
		for k := i; k > 0 && cls[k].j > cls[k-1].j; k-- {
			cls[k], cls[k-1] = cls[k-1], cls[k]
		}
	}
	pat := spectrum.Multiplet()
	switch {
	case nc == 0:
		pat = spectrum.Singlet()
	case nc == 1 && cls[0].n <= maxSingleN:
		pat = spectrum.Split(cls[0].n + 1)
	case nc <= 3:
		// A compound pattern of d, t and q factors with at most 16 lines.
		var f [3]int
		lines := 1
		for k := 0; k < nc; k++ {
			if cls[k].n > 3 {
				lines = 0
				break
			}
			f[k] = cls[k].n + 1
			lines *= f[k]
		}
		if lines > 0 && lines <= 16 {
			pat = spectrum.Split(f[:nc]...)
		}
	}
	setPattern(e, pat)
	name := e.Multiplicity
	if name != "m" && name != "s" {
		e.J = make([]float64, nc)
		for k := 0; k < nc; k++ {
			e.J[k] = round1(cls[k].j)
		}
	}
	if explain {
		for _, c := range e.Couplings {
			who := "environment " + itoa(c.Env)
			if c.Env < 0 {
				who = c.Nucleus
			}
			if c.Resolved {
				e.Reasons = append(e.Reasons, "coupled to "+itoa(c.N)+" "+nucleusName(c)+" of "+who+" ("+c.Label+", J ≈ "+ftoa1(c.J)+" Hz)")
			} else {
				e.Reasons = append(e.Reasons, "coupling to "+who+" ("+c.Label+", J ≈ "+ftoa1(c.J)+" Hz) below the line width: unresolved")
			}
		}
		if name == "m" {
			e.Reasons = append(e.Reasons, "too many distinct couplings to resolve: reported as m")
		} else if nc > 0 {
			e.Reasons = append(e.Reasons, "n+1 rule with alike J merged: "+name)
		}
	}
}

func nucleusName(c Coupling) string {
	if c.Nucleus != "" {
		return c.Nucleus
	}
	return "H"
}

// isABPair reports whether environments a and b are two single protons
// coupled only to each other (an AB system): its roofed doublets are still
// reported as "d".
func (p *Predictor) isABPair(envs []Environment, a, b int) bool {
	only := func(x, y int) bool {
		if envs[x].H != 1 {
			return false
		}
		for _, c := range envs[x].Couplings {
			if c.Resolved && c.Env != y {
				return false
			}
		}
		return true
	}
	return only(a, b) && only(b, a)
}

// spinTable records the proton–proton couplings between individual H
// groups (not only between environments), so that Simulate can build the
// spin Hamiltonian of, for example, an AA'BB' ring system with its distinct
// ortho and para couplings. Spins of one group share their couplings (a
// group is one atom's hydrogens).
type spinTable struct {
	groups []spinGroup
	pairs  []spinPair
}

type spinGroup struct{ env, h int }

type spinPair struct {
	a, b int // group indices
	j    float64
}

func (p *Predictor) spinTable(m *mol, groups []hgroup, envs []Environment, broad []bool) *spinTable {
	st := &spinTable{groups: make([]spinGroup, len(groups))}
	var buf []jterm
	for i := range groups {
		st.groups[i] = spinGroup{env: groups[i].env, h: groups[i].h}
	}
	for i := range groups {
		A := &groups[i]
		if envs[A.env].Exchangeable || broad[A.env] {
			continue
		}
		for k := i + 1; k < len(groups); k++ {
			B := &groups[k]
			if envs[B.env].Exchangeable || broad[B.env] {
				continue
			}
			buf = p.pairJ(m, A, B, buf[:0])
			// Mean coupling of one H of A to one H of B.
			sum := 0.0
			for _, t := range buf {
				sum += t.j * float64(t.n)
			}
			if sum > 0 {
				st.pairs = append(st.pairs, spinPair{a: i, b: k, j: sum / float64(B.h)})
			}
		}
	}
	return st
}

// slowExchangeH counts the hydrogens three bonds from the hydrogens of atom
// a that couple only under slow exchange (see
// Environment.SlowExchangeH): for a C–H atom, the H of exchangeable
// groups on its neighbours; for an exchangeable one, the H on its
// neighbouring carbons. Hydrogens on N, O and S are the exchangeable ones
// (see Predictor.shiftOf), so the neighbour's element decides.
func slowExchangeH(m *mol, a int, exchangeable bool) int {
	g := m.g
	n := 0
	for _, nb := range g.Neighbors(a) {
		x := nb.Atom
		if g.Atoms[x].HCount == 0 {
			continue
		}
		if exchangeable {
			if g.Atoms[x].Element == molecule.C {
				n += g.Atoms[x].HCount
			}
			continue
		}
		switch g.Atoms[x].Element {
		case molecule.N, molecule.O, molecule.S:
			n += g.Atoms[x].HCount
		}
	}
	return n
}

// minLongRangeJ, Hz: an H–H coupling predicted below the line width but at
// least this large (thiophene J(2,4) 1.0–1.5, pyrrole 1.4, furan 0.8;
// Pretsch et al., from memory) is often resolved on a well-shimmed
// spectrum (a 2-substituted thiophene's H-5 reported "dd, J = 5.1, 1.1
// Hz"; common practice), so it counts among Environment.LongRangeH.
const minLongRangeJ = 0.8

// allylicH counts the hydrogens four bonds from those of carbon a across a
// non-aromatic C=C bond (allylic ⁴J, H–C=C–C–H): from an alkene C–H, the
// H on sp3 carbons bonded to its partner; from an sp3 C–H, the H on the
// far carbon of each alkene next to it.
func allylicH(m *mol, a int) int {
	g := m.g
	if g.Atoms[a].Element != molecule.C || m.arom[a] {
		return 0
	}
	n := 0
	for _, nb := range g.Neighbors(a) {
		c := nb.Atom
		if g.Atoms[c].Element != molecule.C || m.arom[c] {
			continue
		}
		switch {
		case nb.Order == molecule.Double:
			for _, nb2 := range g.Neighbors(c) {
				x := nb2.Atom
				if x != a && nb2.Order == molecule.Single && g.Atoms[x].Element == molecule.C && m.multi[x] == 0 {
					n += g.Atoms[x].HCount
				}
			}
		case nb.Order == molecule.Single && m.multi[a] == 0:
			for _, nb2 := range g.Neighbors(c) {
				if nb2.Order == molecule.Double && g.Atoms[nb2.Atom].Element == molecule.C && !m.arom[nb2.Atom] {
					n += g.Atoms[nb2.Atom].HCount
				}
			}
		}
	}
	return n
}
