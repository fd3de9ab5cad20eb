package predict

import (
	"math"
	"strconv"

	"shiftrank/molecule"
)

// hgroup is a set of hydrogens on one heavy atom that are predicted
// together: all of the atom's H, or one H of a split =CH2 or amide NH2.
type hgroup struct {
	atom  int
	h     int
	split int8 // 0 whole atom; 1 =CH2 half (see cisTo); 2 amide NH2 half (see side)
	cisTo int  // =CH2 half: substituent atom on the partner carbon this H is cis to, -1 = the partner's H
	side  int8 // amide: 1 or 2 for the two N-substituent sides (or NH2 halves), 0 none
	syn   int8 // number of amide N this atom is on side 1 of
	anti  int8 // ... side 2 of
	env   int
	ring  []int // aromatic ring (cache), nil if not aromatic
}

// shiftResult is the predicted shift of one group.
type shiftResult struct {
	shift, sigma, lo, hi float64
	half                 float64 // half-width of a configuration range, if any
	kind                 string
	exch, broad          bool
	terms                []Term
	reasons              []string
}

// acc accumulates a shift and, when explaining, its breakdown. The sum is
// kept in integer micro-ppm so that it does not depend on the order in
// which increments are added (which follows the atom numbering).
type acc struct {
	u       int64 // sum in 1e-6 ppm
	terms   []Term
	explain bool
}

func micro(v float64) int64 { return int64(math.Round(v * 1e6)) }

func (a *acc) value() float64 { return float64(a.u) / 1e6 }

// raw adds an increment without a breakdown entry.
func (a *acc) raw(v float64) { a.u += micro(v) }

func (a *acc) add(name string, v float64) {
	a.u += micro(v)
	if a.explain {
		a.terms = append(a.terms, Term{Term: name, PPM: round3(v)})
	}
}

// addSub adds an increment named prefix + the class name (the name is
// built only when explaining).
func (a *acc) addSub(prefix string, s sub, v float64) {
	a.u += micro(v)
	if a.explain {
		a.terms = append(a.terms, Term{Term: prefix + subName[s], PPM: round3(v)})
	}
}

func round3(v float64) float64 {
	if v < 0 {
		return -float64(int64(-v*1000+0.5)) / 1000
	}
	return float64(int64(v*1000+0.5)) / 1000
}

func (p *Predictor) predict(m *mol, w *work) *Spectrum {
	g := m.g
	groups := p.makeGroups(m, w.groups[:0])
	w.groups = groups
	// Environments: groups with equal keys (orbit, split identity, amide
	// sides) are equivalent.
	type envKey struct {
		orbit, part, syn, anti int
	}
	keyOf := func(gr *hgroup) envKey {
		k := envKey{orbit: m.orbit[gr.atom], syn: int(gr.syn), anti: int(gr.anti)}
		switch gr.split {
		case 1:
			if gr.cisTo < 0 {
				k.part = -1
			} else {
				k.part = 1 + m.orbit[gr.cisTo]
			}
		case 2:
			k.part = -10 - int(gr.side)
		default:
			k.part = -100
		}
		return k
	}
	var keyBuf [24]envKey
	keys := keyBuf[:0]
	ints := make([]int, 3*len(groups)+len(groups))
	reps := ints[:0:len(groups)] // representative group of each env
	for i := range groups {
		k := keyOf(&groups[i])
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
		groups[i].env = e
	}
	nEnv := len(keys)
	res := make([]shiftResult, nEnv)
	for e := 0; e < nEnv; e++ {
		res[e] = p.shiftOf(m, &groups[reps[e]])
	}
	// Order environments by decreasing shift, then by atom.
	order := ints[len(groups) : len(groups)+nEnv]
	for i := range order {
		order[i] = i
	}
	less := func(a, b int) bool {
		if res[a].shift != res[b].shift {
			return res[a].shift > res[b].shift
		}
		return groups[reps[a]].atom < groups[reps[b]].atom
	}
	for i := 1; i < len(order); i++ {
		for j := i; j > 0 && less(order[j], order[j-1]); j-- {
			order[j], order[j-1] = order[j-1], order[j]
		}
	}
	newID := ints[2*len(groups) : 2*len(groups)+nEnv]
	atomBuf := ints[3*len(groups):]
	for id, e := range order {
		newID[e] = id
	}
	for i := range groups {
		groups[i].env = newID[groups[i].env]
	}
	sp := &Spectrum{Environments: make([]Environment, nEnv)}
	for id, e := range order {
		r := &res[e]
		env := &sp.Environments[id]
		env.ID = id
		env.Kind = r.kind
		env.Shift = round3(r.shift)
		env.Sigma = round3(r.sigma)
		env.ShiftMin, env.ShiftMax = round3(r.lo), round3(r.hi)
		env.Exchangeable = r.exch
		env.Breakdown = r.terms
		env.Reasons = r.reasons
	}
	// Atoms of each environment, carved from one backing array.
	off := 0
	for id := range sp.Environments {
		env := &sp.Environments[id]
		start := off
		for i := range groups {
			gr := &groups[i]
			if gr.env != id {
				continue
			}
			env.H += gr.h
			if off == start || atomBuf[off-1] != gr.atom {
				atomBuf[off] = gr.atom
				off++
			}
		}
		env.Atoms = atomBuf[start:off:off]
	}
	for id := range sp.Environments {
		env := &sp.Environments[id]
		a0 := env.Atoms
		for i := 1; i < len(a0); i++ {
			for j := i; j > 0 && a0[j] < a0[j-1]; j-- {
				a0[j], a0[j-1] = a0[j-1], a0[j]
			}
		}
		rep := &groups[reps[order[id]]]
		a := g.Atoms[rep.atom]
		if a.Element == molecule.C && a.HCount == 2 && rep.split == 0 && m.multi[rep.atom] == 0 && !m.arom[rep.atom] {
			ringFaces := !m.stereo && m.ringAtom[rep.atom] > 0 && m.ringFacesDiffer(rep.atom)
			if m.stereo || ringFaces || m.markedStereocentres(rep.atom) {
				env.Diastereotopic = true
				if p.opts.Explain {
					why := "a stereocentre in the molecule"
					switch {
					case ringFaces:
						why = "the two faces of its ring differ"
					case !m.stereo:
						why = "replacing either H makes two stereocentres"
					}
					env.Reasons = append(env.Reasons, "diastereotopic CH2 ("+why+"): the two H may give separate signals")
				}
			}
		}
		if why := m.geminalGroupsDiffer(env.Atoms); why != "" && rep.split == 0 && rep.syn+rep.anti == 0 {
			env.Diastereotopic = true
			if p.opts.Explain {
				env.Reasons = append(env.Reasons, "two equal groups on one atom that are not equivalent in space ("+why+"): they may give two signals")
			}
		}
		if p.opts.Explain {
			if len(env.Atoms) > 1 {
				env.Reasons = append(env.Reasons, "equivalent by symmetry: atoms "+intList(env.Atoms))
			}
			if rep.syn+rep.anti > 0 || rep.split == 2 {
				env.Reasons = append(env.Reasons, "restricted rotation about the amide C–N bond (common practice): the two groups on N are inequivalent at room temperature; which one is syn to O is not predicted")
			}
			if rep.split == 1 {
				what := "the H on the other alkene carbon"
				if rep.cisTo >= 0 {
					what = "the " + g.Atoms[rep.cisTo].Element.String() + " substituent (atom " + strconv.Itoa(rep.cisTo) + ") on the other alkene carbon"
				}
				env.Reasons = append(env.Reasons, "=CH2 hydrogen cis to "+what)
			}
			if a.Charge != 0 {
				env.Reasons = append(env.Reasons, "charged atom: predicted as if neutral")
			}
			if n := amideN(m, rep.atom); n >= 0 && rep.syn+rep.anti == 0 && m.tertiaryAmide(n) {
				env.Reasons = append(env.Reasons, "on a tertiary amide N with two different substituents: the two C–N rotamers may each give a signal (doubled peaks, common practice)")
			}
		}
		if a.Charge != 0 {
			env.Sigma += 0.5
		}
		if !env.Exchangeable && env.Sigma >= 0.5 {
			sp.Notes = append(sp.Notes, "environment "+strconv.Itoa(id)+" ("+env.Kind+"): estimate outside the increment tables, σ "+ftoa1(env.Sigma)+" ppm")
		}
	}
	var broadBuf [24]bool
	broad := broadBuf[:0]
	if nEnv > len(broadBuf) {
		broad = make([]bool, nEnv)
	} else {
		broad = broadBuf[:nEnv]
	}
	for id, e := range order {
		broad[id] = res[e].broad
		if res[e].broad && !res[e].exch {
			sp.Environments[id].Multiplicity = "br s"
		}
	}
	p.couple(m, w, groups, reps, order, sp, broad)
	return sp
}

func intList(a []int) string {
	b := make([]byte, 0, 4*len(a))
	for i, x := range a {
		if i > 0 {
			b = append(b, ", "...)
		}
		b = strconv.AppendInt(b, int64(x), 10)
	}
	return string(b)
}

// makeGroups lists the H groups of the molecule, splitting =CH2 and amide
// NH2 hydrogens that are not equivalent and marking amide N-substituent
// sides.
func (p *Predictor) makeGroups(m *mol, groups []hgroup) []hgroup {
	g := m.g
	for i, a := range g.Atoms {
		if a.HCount == 0 {
			continue
		}
		base := hgroup{atom: i, h: a.HCount, cisTo: -1}
		if a.Element == molecule.C && a.HCount == 2 && !m.arom[i] {
			if y1, y2, ok := m.vinylPartners(i); ok {
				h1, h2 := base, base
				h1.h, h2.h = 1, 1
				h1.split, h2.split = 1, 1
				h1.cisTo, h2.cisTo = y1, y2
				groups = append(groups, h1, h2)
				continue
			}
		}
		if a.Element == molecule.N && a.HCount == 2 && m.amideCarbon(i) >= 0 {
			h1, h2 := base, base
			h1.h, h2.h = 1, 1
			h1.split, h2.split = 2, 2
			h1.side, h2.side = 1, 2
			groups = append(groups, h1, h2)
			continue
		}
		groups = append(groups, base)
	}
	p.markAmideSides(m, groups)
	for i := range groups {
		if m.arom[groups[i].atom] {
			groups[i].ring = m.aromRing(groups[i].atom)
		}
	}
	return groups
}

// vinylPartners: for a terminal =CH2 carbon c, returns the two positions on
// the other alkene carbon (atom indices, -1 for H) when they differ, so the
// two H of c are inequivalent (one cis to y1, one cis to y2).
func (m *mol) vinylPartners(c int) (y1, y2 int, ok bool) {
	g := m.g
	p := -1
	for _, nb := range g.Neighbors(c) {
		if nb.Order == molecule.Double && g.Atoms[nb.Atom].Element == molecule.C {
			p = nb.Atom
		}
	}
	if p < 0 || m.multi[c] != 1 || m.multi[p] != 1 {
		return 0, 0, false // not an alkene, or an allene/cumulene end
	}
	var pos [2]int
	n := 0
	for _, nb := range g.Neighbors(p) {
		if nb.Atom != c && n < 2 {
			pos[n] = nb.Atom
			n++
		}
	}
	for k := 0; k < g.Atoms[p].HCount && n < 2; k++ {
		pos[n] = -1
		n++
	}
	if n != 2 {
		return 0, 0, false
	}
	if pos[0] >= 0 && pos[1] >= 0 && m.orbit[pos[0]] == m.orbit[pos[1]] {
		return 0, 0, false
	}
	if pos[0] == -1 && pos[1] == -1 {
		return 0, 0, false
	}
	// Deterministic order: H first, then by canonical label.
	if pos[1] == -1 || (pos[0] >= 0 && m.label[pos[1]] < m.label[pos[0]]) {
		pos[0], pos[1] = pos[1], pos[0]
	}
	return pos[0], pos[1], true
}

// amideCarbon returns the carbonyl (C=O or C=S) carbon bonded to nitrogen n
// by a single bond, or -1. Aromatic and doubly bonded N are not amide N.
func (m *mol) amideCarbon(n int) int {
	g := m.g
	if g.Atoms[n].Element != molecule.N || m.arom[n] || m.multi[n] > 0 {
		return -1
	}
	for _, nb := range g.Neighbors(n) {
		if nb.Order == molecule.Single && !m.arom[nb.Atom] && (m.carbonylOf(nb.Atom) >= 0 || m.thioCarbonylOf(nb.Atom) >= 0) {
			return nb.Atom
		}
	}
	return -1
}

// markAmideSides: for each amide N whose two other substituents are
// equivalent by symmetry, marks the atoms on either side (nearer to one
// substituent than to the other) so that they form separate environments.
func (p *Predictor) markAmideSides(m *mol, groups []hgroup) {
	g := m.g
	var d1 []int16
	for n := range g.Atoms {
		c := m.amideCarbon(n)
		if c < 0 {
			continue
		}
		var r [2]int
		k := 0
		for _, nb := range g.Neighbors(n) {
			if nb.Atom != c && k < 2 {
				r[k] = nb.Atom
				k++
			}
		}
		if k != 2 || m.orbit[r[0]] != m.orbit[r[1]] {
			continue
		}
		if m.label[r[1]] < m.label[r[0]] {
			r[0], r[1] = r[1], r[0]
		}
		m.bfs(r[0], -1, -1, n, -1, false)
		if d1 == nil {
			d1 = make([]int16, len(g.Atoms))
		}
		copy(d1, m.dist)
		m.bfs(r[1], -1, -1, n, -1, false)
		for i := range groups {
			x := groups[i].atom
			a, b := d1[x], m.dist[x]
			switch {
			case a >= 0 && (b < 0 || a < b):
				groups[i].syn++
			case b >= 0 && (a < 0 || b < a):
				groups[i].anti++
			}
		}
	}
}

// tertiaryAmide reports whether amide nitrogen n carries two heavy
// substituents besides the acyl carbon.
func (m *mol) tertiaryAmide(n int) bool {
	return m.amideCarbon(n) >= 0 && m.g.Degree(n) == 3
}

// geminalGroupsDiffer reports why the two CH3 groups of an environment,
// equivalent in the constitution and bonded to one atom x, are not
// equivalent in space, or "" when they are (common practice; the usual
// case is the terpene (CH3)2C=CH– unit, whose methyls give two singlets,
// and an isopropyl group in a chiral molecule, whose methyls give two
// doublets):
//   - x is double-bonded (not aromatic) to an atom whose two other
//     positions (substituents, H or a lone pair) differ: one methyl is cis
//     and the other trans to the same group;
//   - x is sp3, its two other positions differ, and the molecule has a
//     stereocentre: the methyls are diastereotopic.
func (m *mol) geminalGroupsDiffer(atoms []int) string {
	g := m.g
	if len(atoms) != 2 {
		return ""
	}
	a, b := atoms[0], atoms[1]
	if g.Atoms[a].Element != molecule.C || g.Atoms[a].HCount != 3 || g.Atoms[b].HCount != 3 || g.Degree(a) != 1 || g.Degree(b) != 1 {
		return ""
	}
	x := g.Neighbors(a)[0].Atom
	if g.Neighbors(b)[0].Atom != x || m.arom[x] {
		return ""
	}
	for _, nb := range g.Neighbors(x) {
		if nb.Order != molecule.Double || m.arom[nb.Atom] {
			continue
		}
		pos, n := m.otherPositions(nb.Atom, x, -1)
		switch {
		case n == 2 && pos[0] != pos[1]:
			return "cis and trans to different groups across the double bond"
		case n == 1 && g.Atoms[nb.Atom].Element == molecule.N:
			return "cis and trans to the substituent on the C=N nitrogen"
		}
		return ""
	}
	if m.stereo && m.multi[x] == 0 {
		if pos, n := m.otherPositions(x, a, b); n == 2 && pos[0] != pos[1] {
			return "diastereotopic: a stereocentre in the molecule"
		}
	}
	return ""
}

// otherPositions lists the positions of atom y other than atoms skip1 and
// skip2 (-1: none): each neighbour's orbit, then -1 for each hydrogen; n is
// how many there are (at most 4 are kept).
func (m *mol) otherPositions(y, skip1, skip2 int) (pos [4]int, n int) {
	g := m.g
	for _, nb := range g.Neighbors(y) {
		if nb.Atom != skip1 && nb.Atom != skip2 && n < len(pos) {
			pos[n] = m.orbit[nb.Atom]
			n++
		}
	}
	for k := 0; k < g.Atoms[y].HCount && n < len(pos); k++ {
		pos[n] = -1
		n++
	}
	return pos, n
}
