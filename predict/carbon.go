package predict

import (
	"errors"
	"fmt"
	"strconv"
	"strings"

	"shiftrank/molecule"
)

// CHClass is the number of hydrogens on a carbon, as DEPT and edited HSQC
// experiments report it: C (quaternary), CH, CH2, CH3 (and CH4 for
// methane). The numeric value is the hydrogen count.
type CHClass uint8

// The carbon classes.
const (
	Cq  CHClass = 0 // quaternary carbon, no H (also carbonyl and nitrile C)
	CH  CHClass = 1
	CH2 CHClass = 2
	CH3 CHClass = 3
	CH4 CHClass = 4 // methane
)

// String returns "C", "CH", "CH2", "CH3" or "CH4".
func (c CHClass) String() string {
	switch c {
	case Cq:
		return "C"
	case CH:
		return "CH"
	case CH2, CH3, CH4:
		return "CH" + strconv.Itoa(int(c))
	}
	return "CHClass(" + strconv.Itoa(int(c)) + ")"
}

// H returns the number of hydrogens on a carbon of the class.
func (c CHClass) H() int { return int(c) }

// DEPT135 returns the sign of the carbon's signal in a DEPT-135 spectrum:
// +1 for CH and CH3 (and CH4), −1 for CH2, 0 for a quaternary carbon,
// which DEPT does not show (common practice).
func (c CHClass) DEPT135() int {
	switch c {
	case Cq:
		return 0
	case CH2:
		return -1
	}
	return 1
}

// DEPT90 reports whether the carbon appears in a DEPT-90 spectrum (CH
// only; common practice).
func (c CHClass) DEPT90() bool { return c == CH }

// ErrCHClass is wrapped by the error ParseCHClass returns for a token it
// does not know.
var ErrCHClass = errors.New("unknown carbon class")

// ParseCHClass parses a carbon class as chemists write it: "C", "Cq",
// "CH", "CH2", "CH3", "CH4" (case-insensitive, surrounding space ignored).
// Any other token gives an error wrapping ErrCHClass that quotes it.
func ParseCHClass(s string) (CHClass, error) {
	switch strings.ToUpper(strings.TrimSpace(s)) {
	case "C", "CQ":
		return Cq, nil
	case "CH":
		return CH, nil
	case "CH2":
		return CH2, nil
	case "CH3":
		return CH3, nil
	case "CH4":
		return CH4, nil
	}
	return 0, fmt.Errorf("predict: %w %q (want C, CH, CH2 or CH3)", ErrCHClass, s)
}

// CarbonSpectrum is a predicted 13C spectrum (proton-decoupled): one
// CarbonSignal per set of equivalent carbons, ordered by decreasing Shift
// (ties by the lowest atom index). The number of signals is the number of
// lines expected; the carbon counts of the signals add up to the
// molecule's carbon count.
type CarbonSpectrum struct {
	Signals []CarbonSignal
	// Notes are remarks about the whole prediction (carbons whose shift
	// is an estimate outside the increment tables).
	Notes []string
}

// CarbonCount returns the number of carbons over all signals.
func (s *CarbonSpectrum) CarbonCount() int {
	n := 0
	for i := range s.Signals {
		n += len(s.Signals[i].Atoms)
	}
	return n
}

// CarbonSignal is a set of symmetry-equivalent carbons and their predicted
// line.
type CarbonSignal struct {
	// ID is the index of the signal in CarbonSpectrum.Signals.
	ID int
	// Atoms are the equivalent carbons (indices of the input graph,
	// ascending); len(Atoms) is the relative intensity a chemist would
	// write as "(2C)".
	Atoms []int
	// Class is the carbons' CH_n class (what DEPT shows).
	Class CHClass
	// Kind names the kind of carbon, e.g. "CH3 (sp3)", "aromatic C",
	// "C=O (ester)", "C≡N (nitrile)".
	Kind string
	// Shift is the predicted chemical shift δ in ppm relative to TMS
	// (CDCl3), about −30 to 240.
	Shift float64
	// Sigma is the uncertainty of Shift in ppm (one standard deviation):
	// about 1–2 ppm inside the increment tables, 3–10 ppm for estimates.
	Sigma float64
	// Diastereotopic is set for a pair of carbons (or pairs) equivalent in
	// the constitution but not in space: two equal groups on one sp3
	// carbon whose two other positions differ, in a molecule with a
	// stereocentre (the methyls of an isopropyl group next to one:
	// menthol 21.0 and 16.1 ppm; Pretsch, from memory), or two methyls on
	// the carbon of a C=N whose N carries a group (acetone oxime 21.8 and
	// 15.4 ppm; from memory). Shift is their mean; a spectrum may show
	// one line of two carbons or two lines.
	Diastereotopic bool
	// Breakdown is the shift's derivation: the base value and every named
	// increment, summing to Shift (Options.Explain only).
	Breakdown []Term
	// Reasons explain the shift and grouping in words (Options.Explain
	// only, except warnings about estimates, which are always present).
	Reasons []string
}

// Carbon returns the predicted proton-decoupled 13C spectrum of g. g is
// not modified; it must be a kekulised molecular graph (bond orders 1–3)
// of the elements molecule supports. Charged atoms are accepted (nitro
// groups, N-oxides, ammonium and carboxylate ions); groups outside the
// increment tables get an estimate with a wide Sigma and a Reason saying
// so. A molecule without carbon gives a CarbonSpectrum without signals.
// Errors: ErrEmpty, *GraphError.
func (p *Predictor) Carbon(g *molecule.Graph) (*CarbonSpectrum, error) {
	if g == nil || len(g.Atoms) == 0 {
		return nil, ErrEmpty
	}
	if err := checkGraph(g); err != nil {
		return nil, err
	}
	w := p.work.Get().(*work)
	m := w.analyse(g)
	cx := newCarbonCtx(m, p.opts.Explain)
	sp := p.carbonSpectrum(cx)
	p.work.Put(w)
	return sp, nil
}

// cres is the predicted shift of one carbon.
type cres struct {
	sigma   float64
	kind    string
	est     bool // an estimate outside the tables
	ac      acc
	reasons []string
}

func (r *cres) estimate(why string) {
	r.est = true
	r.reasons = append(r.reasons, why)
}

func (p *Predictor) carbonSpectrum(cx *cctx) *CarbonSpectrum {
	m := cx.m
	g := m.g
	// Carbons, grouped by automorphism orbit and, for the two sides of an
	// amide nitrogen with equivalent substituents, by side (restricted
	// C–N rotation makes them inequivalent: DMF N-CH3 36.5 and 31.4,
	// Gottlieb 1997).
	var groups []hgroup
	for i, a := range g.Atoms {
		if a.Element == molecule.C {
			groups = append(groups, hgroup{atom: i, cisTo: -1})
		}
	}
	if len(groups) == 0 {
		return &CarbonSpectrum{Signals: []CarbonSignal{}}
	}
	p.markAmideSides(m, groups)
	alk := cx.markAlkeneSides(groups)
	type key struct{ orbit, syn, anti, cis, trans int }
	var keys []key
	var reps []int
	env := make([]int, len(groups))
	for i := range groups {
		k := key{m.orbit[groups[i].atom], int(groups[i].syn), int(groups[i].anti), int(alk[i][0]), int(alk[i][1])}
		e := -1
		for j, kk := range keys {
			if kk == k {
				e = j
				break
			}
		}
		if e < 0 {
			e = len(keys)
			keys = append(keys, k)
			reps = append(reps, i)
		}
		env[i] = e
	}
	res := make([]cres, len(keys))
	shift := make([]float64, len(keys))
	for e, gi := range reps {
		gr := &groups[gi]
		r := &res[e]
		r.ac.explain = cx.explain
		cx.carbon(gr.atom, r)
		if gr.syn != gr.anti {
			// Restricted amide rotation: the N-alkyl carbon syn to O is
			// ~2.5 ppm upfield of the anti one (DMF 31.4 / 36.5, DMA
			// 35.0 / 38.0; Gottlieb 1997). Which side is syn is not
			// predicted.
			d := 2.5
			if gr.syn > gr.anti {
				d = -d
			}
			if g.BondBetween(gr.atom, amideN(m, gr.atom)) < 0 {
				d *= 0.3
			}
			r.ac.add("amide rotamer (syn/anti to C=O)", d)
		}
		if r.sigma <= 0 {
			r.sigma = 2
		}
		if cx.polycyclic(gr.atom) {
			// Bridged and fused saturated ring systems (camphor, decalins)
			// are outside what additive increments describe well.
			r.sigma += 2.5
			if cx.explain {
				r.reasons = append(r.reasons, "in a fused or bridged non-aromatic ring system: wider uncertainty")
			}
		}
		if g.Atoms[gr.atom].Charge != 0 {
			r.sigma += 3
			r.reasons = append(r.reasons, "charged carbon: estimate")
		}
		shift[e] = r.ac.value()
	}
	order := make([]int, len(keys))
	for i := range order {
		order[i] = i
	}
	less := func(a, b int) bool {
		if shift[a] != shift[b] {
			return shift[a] > shift[b]
		}
		return groups[reps[a]].atom < groups[reps[b]].atom
	}
	for i := 1; i < len(order); i++ {
		for j := i; j > 0 && less(order[j], order[j-1]); j-- {
			order[j], order[j-1] = order[j-1], order[j]
		}
	}
	sp := &CarbonSpectrum{Signals: make([]CarbonSignal, len(keys))}
	atoms := make([]int, len(groups))
	off := 0
	for id, e := range order {
		r := &res[e]
		s := &sp.Signals[id]
		s.ID = id
		start := off
		for i := range groups {
			if env[i] == e {
				atoms[off] = groups[i].atom
				off++
			}
		}
		s.Atoms = atoms[start:off:off]
		s.Class = CHClass(min(g.Atoms[s.Atoms[0]].HCount, 4))
		s.Kind = r.kind
		s.Shift = round3(shift[e])
		s.Sigma = round3(r.sigma)
		s.Breakdown = r.ac.terms
		s.Reasons = r.reasons
		if cx.explain && len(s.Atoms) > 1 {
			s.Reasons = append(s.Reasons, "equivalent by symmetry: atoms "+intList(s.Atoms))
		}
		if why := diastereotopicCarbons(m, s.Atoms); why != "" {
			s.Diastereotopic = true
			if cx.explain {
				s.Reasons = append(s.Reasons, "two equal groups on one atom that are not equivalent in space ("+why+"): one line of two carbons or two lines")
			}
		}
		if cx.explain && keys[e].cis != keys[e].trans {
			s.Reasons = append(s.Reasons, "the two equal groups on one alkene carbon are cis and trans to different groups on the other: separate lines")
		}
		if cx.explain && keys[e].syn != keys[e].anti {
			s.Reasons = append(s.Reasons, "restricted rotation about the amide C–N bond (common practice): the two groups on N give separate lines; which one is syn to O is not predicted")
		}
		if r.est {
			sp.Notes = append(sp.Notes, "carbon signal "+strconv.Itoa(id)+" ("+r.kind+"): estimate outside the increment tables, σ "+ftoa1(s.Sigma)+" ppm")
		}
	}
	return sp
}

// markAlkeneSides finds acyclic C=C bonds with two equivalent groups a, b
// on one carbon p and two different positions on the other carbon q (the
// two methyls of 2-methyl-2-butene, 17.3 and 25.7 ppm; Pretsch): a is cis
// to one position of q, b to the other, so they and the atoms nearer to
// either give separate lines. It returns, per group, how many such
// alkenes it lies on the cis side and on the trans side of, and records
// for a and b the position of q each is cis to (cx.alkCis; -1 for H).
func (cx *cctx) markAlkeneSides(groups []hgroup) [][2]int8 {
	m := cx.m
	g := cx.g
	out := make([][2]int8, len(groups))
	for bi, bd := range g.Bonds {
		if bd.Order != molecule.Double || m.ringBond[bi] > 0 || m.arom[bd.A] {
			continue
		}
		for _, pq := range [2][2]int{{bd.A, bd.B}, {bd.B, bd.A}} {
			p, q := pq[0], pq[1]
			if g.Atoms[p].Element != molecule.C || g.Atoms[q].Element != molecule.C || m.multi[p] != 1 || m.multi[q] != 1 {
				continue
			}
			var ab []int
			for _, nb := range g.Neighbors(p) {
				if nb.Atom != q {
					ab = append(ab, nb.Atom)
				}
			}
			if len(ab) != 2 || m.orbit[ab[0]] != m.orbit[ab[1]] {
				continue
			}
			var pos []int
			for _, nb := range g.Neighbors(q) {
				if nb.Atom != p {
					pos = append(pos, nb.Atom)
				}
			}
			for k := 0; k < g.Atoms[q].HCount; k++ {
				pos = append(pos, -1)
			}
			if len(pos) != 2 || (pos[0] == -1 && pos[1] == -1) || (pos[0] >= 0 && pos[1] >= 0 && m.orbit[pos[0]] == m.orbit[pos[1]]) {
				continue
			}
			if pos[0] == -1 || (pos[1] >= 0 && m.label[pos[1]] < m.label[pos[0]]) {
				pos[0], pos[1] = pos[1], pos[0]
			}
			a, b := ab[0], ab[1]
			if m.label[b] < m.label[a] {
				a, b = b, a
			}
			if cx.alkCis == nil {
				cx.alkCis = make(map[[2]int]int)
			}
			cx.alkCis[[2]int{a, p}], cx.alkCis[[2]int{b, p}] = pos[0], pos[1]
			m.bfs(a, -1, -1, p, -1, false)
			da := append([]int16(nil), m.dist...)
			m.bfs(b, -1, -1, p, -1, false)
			for i := range groups {
				x := groups[i].atom
				u, v := da[x], m.dist[x]
				switch {
				case u >= 0 && (v < 0 || u < v):
					out[i][0]++
				case v >= 0 && (u < 0 || v < u):
					out[i][1]++
				}
			}
		}
	}
	return out
}

// polycyclic reports whether carbon c is a non-aromatic atom of a ring
// system with more than one ring (bonds − atoms + 1 > 1).
func (cx *cctx) polycyclic(c int) bool {
	m := cx.m
	if m.arom[c] || m.rsys[c] < 0 {
		return false
	}
	sys := m.rsys[c]
	atoms, bonds := 0, 0
	for i := range cx.g.Atoms {
		if m.rsys[i] == sys {
			atoms++
		}
	}
	for bi, b := range cx.g.Bonds {
		if m.ringBond[bi] > 0 && m.rsys[b.A] == sys {
			bonds++
		}
	}
	return bonds-atoms+1 > 1
}

// addCat adds an increment whose name is the concatenation of parts,
// built only when explaining (the scoring path allocates no strings).
func (a *acc) addCat(v float64, parts ...string) {
	a.u += micro(v)
	if a.explain {
		a.terms = append(a.terms, Term{Term: strings.Join(parts, ""), PPM: round3(v)})
	}
}

// diastereotopicCarbons reports why the two carbons of a signal, bonded
// to one atom x, are not equivalent in space, or "" when they are or the
// signal is not such a pair: the two methyls cases of geminalGroupsDiffer
// (the 1H side's rule), and any two equal groups on an sp3 carbon x whose
// two other positions differ, in a molecule with a stereocentre (the ring
// CH2 carbons C2 and C6 of a cyclohexyl group on a stereocentre).
func diastereotopicCarbons(m *mol, atoms []int) string {
	if len(atoms) != 2 {
		return ""
	}
	if why := m.geminalGroupsDiffer(atoms); why != "" {
		return why
	}
	g := m.g
	a, b := atoms[0], atoms[1]
	if !m.stereo || m.arom[a] {
		return ""
	}
	for _, nb := range g.Neighbors(a) {
		x := nb.Atom
		if g.BondBetween(x, b) < 0 || g.Atoms[x].Element != molecule.C || m.multi[x] != 0 || m.arom[x] {
			continue
		}
		if pos, n := m.otherPositions(x, a, b); n == 2 && pos[0] != pos[1] {
			return "diastereotopic: a stereocentre in the molecule"
		}
	}
	return ""
}
