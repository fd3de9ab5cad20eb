package infer

import (
	"container/heap"
	"encoding/json"
	"fmt"
	"math"
	"slices"
	"strings"

	"shiftrank/isomers"
	"shiftrank/molecule"
)

// Constraint is one inference a chemist would draw from the peak list.
type Constraint struct {
	// ID is stable for the same input; pass it in Options.Disabled to
	// switch the constraint off.
	ID string `json:"id"`
	// Name is the kind of constraint ("hydrogen groups", "coupling
	// partners", "shift window", "monosubstituted benzene", ...).
	Name string `json:"name"`
	// Reason says in one line what the constraint requires and which peaks
	// it rests on.
	Reason string `json:"reason"`
	// Peaks are the 1-based numbers of the peaks it rests on.
	Peaks []int `json:"peaks"`
	// Confidence is how often the inference holds for an ordinary
	// spectrum (0–1): a reading that uses it is weighted by it.
	Confidence float64 `json:"confidence"`
	// Enabled is false when the user switched it off.
	Enabled bool `json:"enabled"`
}

// Reading is one complete interpretation of the peak list: a division of
// the formula's heavy atoms into classes for the generator.
type Reading struct {
	// Name summarises the hydrogen groups ("CH3 ×2, CH2 ×1, aromatic CH
	// ×5, ...") and says whether the reading is strict or relaxed.
	Name string `json:"name"`
	// Weight is the reading's relative plausibility (the readings'
	// weights sum to 1).
	Weight float64 `json:"weight"`
	// Relaxed readings keep only the hydrogen groups, hybridisation and
	// shift windows of the strict reading with the same groups; their
	// structures include the strict reading's.
	Relaxed bool `json:"relaxed"`
	// Fallback readings read some peaks one by one although together they
	// fit a fragment (a benzene ring, a vinyl group, ...) that another
	// reading uses: like the relaxed readings, they are the alternative
	// to search when the readings with the fragment explain the spectrum
	// poorly.
	Fallback bool `json:"fallback,omitempty"`
	// Constraints are the IDs of the constraints it applies.
	Constraints []string `json:"constraints"`
	// Spec is what the generator builds.
	Spec isomers.Spec `json:"-"`
	// Groups is the decomposition it relaxes (same value for a strict
	// reading and its relaxed form).
	Groups int `json:"groups"`
}

// Analysis is the outcome of Infer.
type Analysis struct {
	Constraints []Constraint `json:"constraints"`
	// Readings, most plausible first; empty when the peak list cannot
	// constrain the search (no integrals, integrals that do not fit the
	// formula, or the hydrogen-groups constraint switched off).
	Readings []Reading `json:"readings"`
	// Notes explain why there are no readings, or what was left out.
	Notes []string `json:"notes,omitempty"`
}

// Options tunes Infer. The zero value infers everything.
type Options struct {
	// Disabled lists constraint IDs the user switched off.
	Disabled []string
	// MaxReadings bounds the number of readings (default
	// DefaultMaxReadings).
	MaxReadings int
	// Carbon is the observed 13C list, if any: DEPT classes fix the
	// carbons' hydrogen counts, and shifts the kind of carbons without H.
	Carbon []CarbonPeak
}

// DefaultMaxReadings is the default bound on the readings returned.
const DefaultMaxReadings = 40

// HydrogenGroupsID is the ID of the constraint that reads hydrogen groups
// from the integrals; switching it off switches every reading off.
const HydrogenGroupsID = "hydrogen-groups"

// partKind is what a group of equivalent hydrogen-bearing atoms is.
type partKind uint8

const (
	kSP3    partKind = iota // sp3 C–H
	kSP2                    // aromatic or alkene C–H: one double bond
	kMid                    // alkene C–H, or sp3 C–H with electronegative or unsaturated neighbours
	kFormyl                 // aldehyde CHO
	kAlkyne                 // ≡C–H
	kExch                   // O–H, N–H, S–H
)

// template is a fragment a part belongs to.
type template uint8

const (
	tNone     template = iota
	tPhenyl            // monosubstituted benzene ring: 5 CH and an ipso C
	tPara              // para-disubstituted benzene ring: 4 CH and 2 ipso C
	tOrtho             // ortho-disubstituted benzene ring: 4 adjacent CH and 2 adjacent substituted C
	tTBu               // tert-butyl: 3 CH3 and a quaternary C
	tPyridyl           // monosubstituted pyridine ring: 4 CH, a ring N and a substituted C
	tNaphthyl          // monosubstituted naphthalene-type bicyclic: 7 CH, 2 fusion C and a substituted C
	tGem               // gem-dimethyl: 2 CH3 on one quaternary sp3 C
	tDisub             // disubstituted benzene ring of unread pattern: 4 CH and 2 substituted C in one ring
)

// part is a group of equivalent hydrogen-bearing atoms of a reading.
type part struct {
	el     molecule.Element
	h      int // hydrogens per atom
	count  int // atoms
	kind   partKind
	peaks  []int // indices into the inference's peaks
	lo, hi float64
	// vicinal bounds from the multiplicity, and the constraint behind it
	vic   isomers.Bound
	vicID string
	// shiftID names the shift window of an sp3 C–H (kSP3) or the region
	// rule of other kinds; onUnsat requires an unsaturated neighbour (acid,
	// amide or aromatic X–H)
	shiftID   string
	onUnsat   bool
	onUnsatID string
	// pair links to the part double-bonded to this one (alkene CH=CH,
	// vinyl), as an index into the decomposition's parts, with its
	// constraint; -1 for none
	pair   int
	pairID string
	tmpl   template
	tmplID string
	// nextToN requires a ring nitrogen next to an aromatic C–H (see
	// withRingN), with its constraint
	nextToN   bool
	nextToNID string
}

// option is one way to read a unit, with its log prior.
type option struct {
	parts []part
	logp  float64
	label string
	// declines marks the alternative of a fragment unit that reads its
	// peaks one by one (see Reading.Fallback)
	declines bool
}

// unit is a set of peaks read together.
type unit struct {
	peaks []int
	opts  []option
}

// analysis holds one Infer call's working state.
type analysis struct {
	f           molecule.Formula
	peaks       []Peak
	n           []int // integer H per peak
	disabled    map[string]bool
	constraints map[string]*Constraint
	order       []string
	notes       []string
	carbon      *carbonInfo
}

// Infer reads peaks (the scored 1H signals of an unknown with formula f)
// and returns the constraints it can draw and the readings built from
// them, most plausible first. It never fails on odd input: a peak list that
// cannot be read gives an Analysis with no readings and a note saying why.
func Infer(f molecule.Formula, peaks []Peak, opts Options) *Analysis {
	a := &analysis{f: f, peaks: peaks, disabled: map[string]bool{}, constraints: map[string]*Constraint{}}
	for _, id := range opts.Disabled {
		a.disabled[id] = true
	}
	maxR := opts.MaxReadings
	if maxR <= 0 {
		maxR = DefaultMaxReadings
	}
	out := &Analysis{Readings: []Reading{}, Constraints: []Constraint{}}
	a.readCarbon(opts.Carbon)
	readings := a.run(maxR)
	for _, id := range a.order {
		out.Constraints = append(out.Constraints, *a.constraints[id])
	}
	out.Readings = append(out.Readings, readings...)
	out.Notes = a.notes
	return out
}

// constraint records a constraint (once per ID) and reports whether it is
// enabled.
func (a *analysis) constraint(id, name, reason string, peaks []int, conf float64) bool {
	if c, ok := a.constraints[id]; ok {
		return c.Enabled
	}
	var nums []int
	for _, p := range peaks {
		nums = append(nums, a.peaks[p].Number)
	}
	c := &Constraint{ID: id, Name: name, Reason: reason, Peaks: nums, Confidence: conf, Enabled: !a.disabled[id]}
	a.constraints[id] = c
	a.order = append(a.order, id)
	return c.Enabled
}

func (a *analysis) run(maxR int) []Reading {
	hTotal := a.f.HydrogenCount()
	if len(a.peaks) == 0 {
		a.notes = append(a.notes, "no peaks to read")
		return nil
	}
	sum := 0
	a.n = make([]int, len(a.peaks))
	for i, p := range a.peaks {
		if p.H <= 0 {
			a.notes = append(a.notes, fmt.Sprintf("peak %d has no integral: hydrogen groups cannot be read, so the search is not constrained", p.Number))
			return nil
		}
		a.n[i] = int(math.Round(p.H))
		if a.n[i] == 0 {
			a.n[i] = 1
		}
		sum += a.n[i]
	}
	missing := hTotal - sum
	if missing < 0 || missing > 4 {
		a.notes = append(a.notes, fmt.Sprintf("the integrals account for %d H of the formula's %d: hydrogen groups cannot be read, so the search is not constrained", sum, hTotal))
		return nil
	}
	var all []int
	for i := range a.peaks {
		all = append(all, i)
	}
	if !a.constraint(HydrogenGroupsID, "hydrogen groups",
		fmt.Sprintf("the integrals give each peak a whole number of hydrogens (%s), read as CH3, CH2, CH and exchangeable X–H groups", a.hList()),
		all, 0.95) {
		a.notes = append(a.notes, "hydrogen groups switched off: the search is not constrained by the spectrum")
		return nil
	}
	units := a.units()
	if missing > 0 {
		units = append(units, a.missingUnit(missing))
	}
	decs := a.decompositions(units, maxR)
	if len(decs) == 0 {
		a.notes = append(a.notes, "no reading of the hydrogen groups fits the formula: the search is not constrained")
		return nil
	}
	if d, ok := a.envelope(decs[0].logp, missing); ok {
		decs = append(decs, d)
	}
	var rs []Reading
	for gi, d := range decs {
		for _, v := range a.chargeVariants(d.parts) {
			for _, relaxed := range []bool{false, true} {
				spec, ids := a.build(d.parts, v, relaxed)
				if spec == nil {
					continue
				}
				w := d.logp + v.logp
				if relaxed {
					w += math.Log(0.15)
				}
				name := a.describe(d.parts, v, relaxed)
				if d.fallback && !relaxed {
					name = strings.TrimSuffix(name, " (strict)") + " (strict, some peaks read without their fragment)"
				}
				if d.envelope && !relaxed {
					name = strings.TrimSuffix(name, " (strict)") + " (strict, aliphatic multiplets read together)"
				}
				rs = append(rs, Reading{Name: name, Weight: w, Relaxed: relaxed, Fallback: d.fallback && !relaxed, Constraints: ids, Spec: *spec, Groups: gi})
			}
		}
	}
	slices.SortStableFunc(rs, func(x, y Reading) int {
		switch {
		case x.Weight > y.Weight:
			return -1
		case x.Weight < y.Weight:
			return 1
		}
		return 0
	})
	if len(rs) > maxR {
		rs = rs[:maxR]
	}
	// a relaxed reading whose strict form is identical adds nothing
	rs = dedupReadings(rs)
	top := rs[0].Weight
	z := 0.0
	for i := range rs {
		rs[i].Weight = math.Exp(rs[i].Weight - top)
		z += rs[i].Weight
	}
	for i := range rs {
		rs[i].Weight /= z
	}
	return rs
}

// envelope returns, for a spectrum with an aliphatic envelope (three or
// more unresolved multiplets of sp3 C–H up to envelopeMax ppm), a reading
// with the envelope's hydrogens read together: in rings the two hydrogens
// of a CH2 often fall in different multiplets (cyclohexanol's equatorial H
// near 1.9 and 1.7, its axial H in one 5H multiplet at 1.1–1.35; common
// practice), so the multiplets' integrals say how many hydrogens the
// envelope holds, not how they divide into CH3, CH2 and CH. The envelope's
// hydrogens become CH2, CH and CH3 groups in the likeliest proportions,
// each within the envelope's shift range, with no coupling bounds; the
// other peaks are read as usual. Its prior is envelopePrior times best's
// (the log prior of the best reading).
func (a *analysis) envelope(best float64, missing int) (decomposition, bool) {
	used := make([]bool, len(a.peaks))
	var env []int
	total := 0
	for i, p := range a.peaks {
		pat := p.Pattern
		if a.region(i) != kSP3 || p.Hi > envelopeMax || pat.Broad || pat.singlet() || pat.Kind != Multiplet && !pat.Apparent {
			continue
		}
		used[i] = true
		env = append(env, i)
		total += a.n[i]
	}
	if len(env) < 3 {
		return decomposition{}, false
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, i := range env {
		lo = math.Min(lo, a.peaks[i].Lo)
		hi = math.Max(hi, a.peaks[i].Hi)
	}
	id := fmt.Sprintf("peaks-%s-envelope", joinNums(a, env))
	if !a.constraint(id, "aliphatic envelope", fmt.Sprintf("peaks %s (δ %s, %d H) are unresolved multiplets of sp3 C–H: read together as %d hydrogens on CH2, CH and CH3 groups in that range, since the two H of a ring CH2 often fall in different multiplets",
		strings.ReplaceAll(joinNums(a, env), "-", ", "), rangeText(lo, hi), total, total), env, 0.9) {
		return decomposition{}, false
	}
	u := unit{peaks: env}
	for _, c := range compositions(total, kSP3, true) {
		var parts []part
		for _, g := range c.groups {
			parts = append(parts, part{el: molecule.C, h: g[0], count: g[1], kind: kSP3, peaks: env, lo: lo, hi: hi, pair: -1, shiftID: id})
		}
		u.opts = append(u.opts, option{parts: parts, logp: c.logp, label: "envelope " + c.label})
	}
	units := append(a.unitsFrom(used), u)
	if missing > 0 {
		units = append(units, a.missingUnit(missing))
	}
	ds := a.decompositions(units, 1)
	if len(ds) == 0 {
		return decomposition{}, false
	}
	d := ds[0]
	d.logp = best + math.Log(envelopePrior)
	d.envelope = true
	return d, true
}

// hList lists the peaks' whole hydrogen counts.
func (a *analysis) hList() string {
	var s []string
	for i, p := range a.peaks {
		s = append(s, fmt.Sprintf("δ %.2f %dH", p.Shift, a.n[i]))
	}
	return strings.Join(s, ", ")
}

// dedupReadings drops readings whose Spec equals an earlier one's.
func dedupReadings(rs []Reading) []Reading {
	var out []Reading
	seen := map[string]bool{}
	for _, r := range rs {
		b, _ := json.Marshal(r.Spec.Classes)
		k := string(b)
		if seen[k] {
			continue
		}
		seen[k] = true
		out = append(out, r)
	}
	return out
}

// region classifies a sharp signal by its shift.
func (a *analysis) region(i int) partKind {
	p := a.peaks[i]
	switch {
	case p.Lo >= acidMin:
		return kExch
	case p.Lo >= aldehydeMin && p.Hi <= aldehydeMax:
		return kFormyl
	case p.Lo >= aromaticMin:
		return kSP2
	case p.Hi <= sp3Max:
		return kSP3
	}
	return kMid
}

// units groups the peaks: fragments first (vinyl groups, CH=CH pairs,
// benzene rings, =CH2 and geminal CH2 pairs, a pool of loose 1H
// multiplets), then one unit per remaining peak.
func (a *analysis) units() []unit {
	return a.unitsFrom(make([]bool, len(a.peaks)))
}

// unitsFrom is units for the peaks not yet used.
func (a *analysis) unitsFrom(used []bool) []unit {
	var us []unit
	us = append(us, a.vinylUnits(used)...)
	us = append(us, a.alkenePairUnits(used)...)
	us = append(us, a.ringUnits(used)...)
	us = append(us, a.methyleneUnits(used)...)
	us = append(us, a.geminalUnits(used)...)
	us = append(us, a.poolUnit(used)...)
	for i := range a.peaks {
		if !used[i] {
			us = append(us, unit{peaks: []int{i}, opts: a.peakOptions(i)})
		}
	}
	return us
}

// basePart returns a part for peak i's hydrogens held by count atoms of h
// hydrogens each, of kind k, with the peak's window.
func (a *analysis) basePart(i int, el molecule.Element, h, count int, k partKind) part {
	p := a.peaks[i]
	return part{el: el, h: h, count: count, kind: k, peaks: []int{i}, lo: p.Lo, hi: p.Hi, pair: -1}
}

// withCoupling adds the vicinal bounds read from peak i's multiplicity to
// pt (the atoms of pt hold all the peak's hydrogens, so each hydrogen sees
// the same partners).
func (a *analysis) withCoupling(pt part, i int) part {
	p := a.peaks[i].Pattern
	if pt.kind == kExch {
		return pt
	}
	sp2 := pt.kind == kSP2 || pt.kind == kFormyl || pt.kind == kMid
	num := a.peaks[i].Number
	switch {
	case p.singlet():
		conf := singletConfidenceSP3
		if sp2 {
			conf = singletConfidenceSP2
		}
		id := fmt.Sprintf("peak-%d-coupling", num)
		reason := fmt.Sprintf("peak %d (δ %.2f) is a singlet: no hydrogen on the neighbouring carbons (n+1 rule; aldehyde H with their 1–3 Hz couplings excepted)", num, a.peaks[i].Shift)
		max := 0
		if pt.count >= 2 {
			// Equivalent groups of one signal may be bonded to each other
			// without splitting it (X–CH2–CH2–X of a succinate, the
			// CH=CH of a maleate; common practice): one such neighbour,
			// or two when three or more equivalent groups can form a
			// chain or ring (the CH2 of cyclohexane, the CH of benzene).
			max = pt.h
			if pt.count >= 3 {
				max = 2 * pt.h
			}
			reason = fmt.Sprintf("peak %d (δ %.2f) is a singlet of %d equivalent groups: no hydrogen on the neighbouring carbons except on an equivalent group of the same signal (n+1 rule; equivalent hydrogens do not split each other)", num, a.peaks[i].Shift, pt.count)
		}
		if a.constraint(id, "coupling partners", reason, []int{i}, conf) {
			pt.vic = isomers.Bound{On: true, Min: 0, Max: max}
			pt.vicID = id
		}
	case p.resolved() && !p.Apparent:
		thr := vicinalSP3
		conf := patternConfidenceSP3
		if sp2 {
			thr, conf = vicinalSP2, patternConfidenceSP2
		}
		max := p.partners()
		min, known := p.partnersAbove(thr)
		if known && !sp2 {
			// a coupling in the geminal range may be the other H of a CH2
			min -= countIn(p, geminalMin, 99)
		}
		if !known {
			min = 0
			if !sp2 && len(p.J) == 0 {
				// sp3 n+1 patterns without J: alkyl vicinal couplings
				// are 6–8 Hz, so every partner is vicinal
				min = max
			}
		}
		if pt.kind == kFormyl {
			min = 0
		}
		id := fmt.Sprintf("peak-%d-coupling", num)
		what := fmt.Sprintf("%d–%d", min, max)
		if min == max {
			what = fmt.Sprint(max)
		}
		if a.constraint(id, "coupling partners", fmt.Sprintf("peak %d (δ %.2f) is split by %d hydrogens (n+1 rule): %s hydrogens on the neighbouring atoms", num, a.peaks[i].Shift, max, what), []int{i}, conf) {
			pt.vic = isomers.Bound{On: true, Min: min, Max: max}
			pt.vicID = id
		}
	}
	return pt
}

// withShift adds the shift rule of pt's kind.
func (a *analysis) withShift(pt part) part {
	if len(pt.peaks) == 0 {
		return pt
	}
	i := pt.peaks[0]
	num := a.peaks[i].Number
	id := fmt.Sprintf("peak-%d-shift", num)
	if len(pt.peaks) > 1 {
		id = fmt.Sprintf("peaks-%s-shift", joinNums(a, pt.peaks))
	}
	var reason string
	switch pt.kind {
	case kSP3:
		reason = fmt.Sprintf("δ %s: an sp3 carbon whose neighbours' α-increments (Shoolery's rule) can reach this shift", rangeText(pt.lo, pt.hi))
	case kSP2:
		reason = fmt.Sprintf("δ %s: an aromatic, heteroaromatic or alkene C–H (one double bond on the carbon)", rangeText(pt.lo, pt.hi))
	case kMid:
		reason = fmt.Sprintf("δ %s: an alkene C–H, or an sp3 C–H next to an electronegative or unsaturated atom", rangeText(pt.lo, pt.hi))
	case kFormyl:
		reason = fmt.Sprintf("δ %s: an aldehyde hydrogen, CH=O", rangeText(pt.lo, pt.hi))
	case kAlkyne:
		reason = fmt.Sprintf("δ %s: a terminal alkyne C–H", rangeText(pt.lo, pt.hi))
	default:
		return pt
	}
	if a.constraint(id, "shift window", reason, pt.peaks, shiftWindowConfidence) {
		pt.shiftID = id
	}
	if pt.kind == kSP2 && len(pt.peaks) == 1 {
		pt = a.withRingN(pt)
	}
	return pt
}

// withRingN reads an aromatic C–H far downfield with a coupling of
// 4.0–5.6 Hz as the C–H next to a ring nitrogen: pyridine and pyrimidine
// H-2/H-6 lie at 8.4–8.8 ppm with J(2,3) ≈ 4.5–5.0 Hz, while benzene
// ortho couplings are 7–9 Hz and meta 1–3 Hz (Pretsch, Bühlmann,
// Badertscher, Structure Determination of Organic Compounds, coupling
// tables; from memory).
func (a *analysis) withRingN(pt part) part {
	p := a.peaks[pt.peaks[0]]
	if a.f.Count(molecule.N) == 0 || p.Lo < ringNMinShift || p.Hi > ringNMaxShift {
		return pt
	}
	var jn float64
	for _, j := range p.Pattern.J {
		if j >= ringNJLo && j <= ringNJHi {
			jn = j
		}
	}
	if jn == 0 {
		return pt
	}
	id := fmt.Sprintf("peak-%d-next-to-ring-n", p.Number)
	reason := fmt.Sprintf("peak %d (δ %.2f, J = %.1f Hz): a heteroaromatic C–H next to a ring nitrogen (pyridine H-2/H-6 type: far downfield, J(2,3) of 4–5.5 Hz)", p.Number, p.Shift, jn)
	if a.constraint(id, "fragment", reason, pt.peaks, ringNConfidence) {
		pt.nextToN, pt.nextToNID = true, id
	}
	return pt
}

func rangeText(lo, hi float64) string {
	if hi-lo < 0.005 {
		return fmt.Sprintf("%.2f", lo)
	}
	return fmt.Sprintf("%.2f–%.2f", hi, lo)
}

func joinNums(a *analysis, idx []int) string {
	var s []string
	for _, i := range idx {
		s = append(s, fmt.Sprint(a.peaks[i].Number))
	}
	return strings.Join(s, "-")
}

// exchangeable returns the X–H parts peak i may be: n hydrogens on O or
// N atoms available in the formula.
func (a *analysis) exchangeable(i int, n int) []option {
	p := a.peaks[i]
	var out []option
	onUnsat := p.Lo >= exchangeableOnUnsaturated
	mk := func(el molecule.Element, h, count int, logp float64, label string) {
		pt := a.basePart(i, el, h, count, kExch)
		if onUnsat {
			id := fmt.Sprintf("peak-%d-exchangeable", p.Number)
			if a.constraint(id, "exchangeable hydrogen", fmt.Sprintf("peak %d (δ %.2f, %dH) read as O–H or N–H above %.1f ppm: on an unsaturated atom (carboxylic acid, phenol, amide or aromatic N–H)", p.Number, p.Shift, n, exchangeableOnUnsaturated), []int{i}, 0.95) {
				pt.onUnsat, pt.onUnsatID = true, id
			}
		}
		out = append(out, option{parts: []part{pt}, logp: logp, label: label})
	}
	hasO, hasN := a.f.Count(molecule.O) > 0, a.f.Count(molecule.N) > 0
	// Below 5.6 ppm alcohol O–H is the commoner broad signal; between 5.6
	// and 10.6 amide and aromatic N–H outnumber phenol O–H (common
	// practice).
	pO, pN := 0.6, 0.4
	if p.Lo >= exchangeableOnUnsaturated && p.Hi < acidMin {
		pO, pN = 0.35, 0.6
	}
	switch n {
	case 1:
		if hasO {
			mk(molecule.O, 1, 1, math.Log(pO), "OH")
		}
		if hasN {
			mk(molecule.N, 1, 1, math.Log(pN), "NH")
		}
	case 2:
		if hasN {
			mk(molecule.N, 2, 1, math.Log(0.5), "NH2")
		}
		if hasO {
			mk(molecule.O, 1, 2, math.Log(0.2), "2 OH")
		}
		if hasN {
			mk(molecule.N, 1, 2, math.Log(0.1), "2 NH")
		}
	}
	return out
}

// carbonSplits returns the ways n hydrogens of one sharp, first-order
// signal (one environment) at δ up to hi can sit on equivalent carbons,
// the more common first.
func carbonSplits(n int, kind partKind, hi float64) [][2]int {
	// pairs (h per atom, atoms) with the more common first
	switch kind {
	case kSP2, kFormyl:
		if n == 2 && hi <= methyleneMax {
			// an sp2 CH2 is a terminal =CH2, which stays below
			// methyleneMax
			return [][2]int{{1, 2}, {2, 1}}
		}
		return [][2]int{{1, n}}
	case kAlkyne:
		return [][2]int{{1, n}}
	}
	var out [][2]int
	switch {
	case n == 3:
		out = [][2]int{{3, 1}}
	case n == 2:
		out = [][2]int{{2, 1}, {1, 2}}
	case n == 1:
		out = [][2]int{{1, 1}}
	case n%3 == 0 && n%2 == 0:
		out = [][2]int{{3, n / 3}, {2, n / 2}}
	case n%3 == 0:
		out = [][2]int{{3, n / 3}}
	case n%2 == 0:
		out = [][2]int{{2, n / 2}, {1, n}}
	default:
		out = [][2]int{{1, n}}
	}
	return out
}

// peakOptions returns the readings of a peak read on its own.
func (a *analysis) peakOptions(i int) []option {
	p := a.peaks[i]
	n := a.n[i]
	pat := p.Pattern
	var out []option
	add := func(o option) {
		if len(o.parts) > 0 {
			out = append(out, o)
		}
	}
	broad := pat.Broad
	if broad || p.Lo >= acidMin {
		// exchangeable first
		for _, o := range a.exchangeable(i, n) {
			add(o)
		}
		if p.Lo >= acidMin {
			return out
		}
	}
	kind := a.region(i)
	if kind == kFormyl && n == 1 && !broad {
		pt := a.withShift(a.withCoupling(a.basePart(i, molecule.C, 1, 1, kFormyl), i))
		add(option{parts: []part{pt}, logp: math.Log(0.9), label: "CHO"})
		for _, o := range a.exchangeable(i, n) {
			o.logp += math.Log(0.2)
			add(o)
		}
		return out
	}
	if kind == kFormyl {
		kind = kSP2
	}
	penalty := 0.0
	switch {
	case broad && n >= 2:
		// broad CH2 and CH3 signals are common (amide rotamers)
		penalty = math.Log(0.35)
	case broad:
		penalty = math.Log(0.15)
	}
	multi := pat.Kind != FirstOrder || pat.Apparent || broad
	if multi && n >= 2 && kind != kSP2 {
		// several environments may share the signal
		for _, c := range compositions(n, kind, p.Hi-p.Lo > methylMaxSpread) {
			var parts []part
			for _, hc := range c.groups {
				parts = append(parts, a.withShift(a.basePart(i, molecule.C, hc[0], hc[1], kind)))
			}
			add(option{parts: parts, logp: c.logp + penalty, label: c.label})
		}
	} else {
		if kind == kSP3 && n%9 == 0 && pat.singlet() && p.Hi <= alkylMethylMax {
			// tert-butyl groups: 9H singlets of methyls on one quaternary sp3 carbon
			id := fmt.Sprintf("tert-butyl-%d", p.Number)
			if a.constraint(id, "tert-butyl group", fmt.Sprintf("peak %d (δ %.2f) is a %dH singlet of alkyl methyls: %d tert-butyl group(s) C(CH3)3", p.Number, p.Shift, n, n/9), []int{i}, 0.85) {
				pt := a.withShift(a.withCoupling(a.basePart(i, molecule.C, 3, n/3, kind), i))
				pt.tmpl, pt.tmplID = tTBu, id
				add(option{parts: []part{pt}, logp: math.Log(0.85) + penalty, label: "tert-butyl"})
				penalty += math.Log(0.15)
			}
		}
		if kind == kSP3 && n == 6 && pat.singlet() && p.Hi <= alkylMethylMax && a.f.Count(molecule.Si) == 0 {
			// gem-dimethyl groups: a 6H singlet of alkyl methyls is two
			// equivalent CH3 on one quaternary sp3 carbon (the ring
			// C(CH3)2 of terpenes, 2,2-dimethyl chains); two equivalent
			// quaternary carbons of a symmetric molecule each with one
			// CH3 remain the alternative (common practice)
			id := fmt.Sprintf("gem-dimethyl-%d", p.Number)
			if a.constraint(id, "gem-dimethyl group", fmt.Sprintf("peak %d (δ %.2f) is a 6H singlet of alkyl methyls: two equivalent CH3 on one quaternary carbon, C(CH3)2", p.Number, p.Shift), []int{i}, 0.8) {
				pt := a.withShift(a.withCoupling(a.basePart(i, molecule.C, 3, 2, kind), i))
				pt.tmpl, pt.tmplID = tGem, id
				add(option{parts: []part{pt}, logp: math.Log(0.8) + penalty, label: "gem-dimethyl"})
				penalty += math.Log(0.2)
			}
		}
		for k, s := range carbonSplits(n, kind, p.Hi) {
			pt := a.withShift(a.withCoupling(a.basePart(i, molecule.C, s[0], s[1], kind), i))
			lp := penalty
			if k > 0 {
				lp += math.Log(0.15)
			}
			if kind == kMid && s[0] == 2 {
				lp = penalty + math.Log(0.5)
			}
			add(option{parts: []part{pt}, logp: lp, label: fmt.Sprintf("%d×CH%d", s[1], s[0])})
		}
	}
	// a lone sharp 1H in the sp3 range may be an alkyne C–H or an X–H
	if n == 1 && kind == kSP3 && !broad {
		if p.Lo >= alkyneMin && p.Hi <= alkyneMax && (pat.singlet() || pat.resolved() && pat.partners() <= 2 && len(pat.jIn(0, 3.5)) == len(pat.J)) && a.f.DBE() >= 2 {
			pt := a.withShift(a.basePart(i, molecule.C, 1, 1, kAlkyne))
			add(option{parts: []part{pt}, logp: math.Log(0.15), label: "≡CH"})
		}
		if pat.singlet() || pat.Kind != FirstOrder {
			for _, o := range a.exchangeable(i, n) {
				o.logp += math.Log(0.35)
				add(o)
			}
		}
	}
	if n == 1 && kind == kMid && !broad && pat.singlet() {
		// phenol O–H often comes as a sharp singlet at 4.5–6
		for _, o := range a.exchangeable(i, n) {
			o.logp += math.Log(0.6)
			add(o)
		}
	}
	if n == 2 && !broad && kind == kSP3 && pat.singlet() && a.f.Count(molecule.N) > 0 {
		for _, o := range a.exchangeable(i, n) {
			if o.label == "NH2" {
				o.logp += math.Log(0.2)
				add(o)
			}
		}
	}
	if multi && n >= 2 && kind == kSP3 && (a.f.Count(molecule.O) > 0 || a.f.Count(molecule.N) > 0) {
		// an O–H or N–H hidden in an aliphatic multiplet
		for _, c := range compositions(n-1, kind, p.Hi-p.Lo > methylMaxSpread) {
			var parts []part
			for _, hc := range c.groups {
				parts = append(parts, a.withShift(a.basePart(i, molecule.C, hc[0], hc[1], kind)))
			}
			for _, x := range []molecule.Element{molecule.O, molecule.N} {
				if a.f.Count(x) == 0 {
					continue
				}
				xp := a.basePart(i, x, 1, 1, kExch)
				add(option{parts: append(slices.Clone(parts), xp), logp: c.logp + math.Log(0.08), label: c.label + " + XH"})
			}
		}
	}
	return out
}

// composition is a multiset of (h per atom, atoms) groups.
type composition struct {
	groups [][2]int
	logp   float64
	label  string
}

// compositions returns the ways n hydrogens of a multiplet can be held by
// CH3, CH2 and CH groups (sp3) or CH and =CH2 groups (others), the
// likelier first: in an aliphatic multiplet CH2 groups are the rule,
// methyls usually give their own resolved signal.
func compositions(n int, kind partKind, spread bool) []composition {
	w := map[int]float64{3: 0.3, 2: 1.0, 1: 0.6}
	switch {
	case spread:
		// a signal reported over a range wider than a methyl's lines is
		// rarely a methyl: the three H of a CH3 share one shift
		w = map[int]float64{3: 0.1, 2: 1.0, 1: 0.6}
	case kind != kSP3 && n == 2:
		// a 2H signal at 4.5–6.3 is most often a terminal =CH2
		w = map[int]float64{2: 1.0, 1: 0.8}
	case kind != kSP3:
		w = map[int]float64{2: 0.3, 1: 1.0}
	case n == 3:
		// a 3H multiplet is mostly a methyl with small long-range
		// couplings (allylic CH3)
		w = map[int]float64{3: 1.0, 2: 0.6, 1: 0.6}
	}
	var out []composition
	var rec func(left, maxH int, cur [][2]int, lp float64)
	rec = func(left, maxH int, cur [][2]int, lp float64) {
		if left == 0 {
			var lab []string
			for _, g := range cur {
				lab = append(lab, fmt.Sprintf("%d×CH%d", g[1], g[0]))
			}
			out = append(out, composition{groups: slices.Clone(cur), logp: lp, label: strings.Join(lab, "+")})
			return
		}
		for h := min(maxH, 3); h >= 1; h-- {
			wh, ok := w[h]
			if !ok {
				continue
			}
			for k := left / h; k >= 1; k-- {
				rec(left-k*h, h-1, append(cur, [2]int{h, k}), lp+float64(k)*math.Log(wh))
			}
		}
	}
	rec(n, 3, nil, 0)
	slices.SortStableFunc(out, func(x, y composition) int {
		switch {
		case x.logp > y.logp:
			return -1
		case x.logp < y.logp:
			return 1
		}
		return 0
	})
	if len(out) > 6 {
		out = out[:6]
	}
	// normalise so the best composition has log prior 0
	if len(out) > 0 {
		top := out[0].logp
		for i := range out {
			out[i].logp -= top
		}
	}
	return out
}

// missingUnit reads hydrogens of the formula that no peak accounts for
// as exchangeable O–H or N–H not observed (broad or exchanged away).
func (a *analysis) missingUnit(missing int) unit {
	u := unit{}
	hasO, hasN := a.f.Count(molecule.O) > 0, a.f.Count(molecule.N) > 0
	var rec func(left int, parts []part, lp float64, label string)
	rec = func(left int, parts []part, lp float64, label string) {
		if left == 0 {
			u.opts = append(u.opts, option{parts: slices.Clone(parts), logp: lp, label: label})
			return
		}
		if hasO {
			rec(left-1, append(parts, part{el: molecule.O, h: 1, count: 1, kind: kExch, pair: -1}), lp+math.Log(0.6), label+"+OH")
		}
		if hasN {
			rec(left-1, append(parts, part{el: molecule.N, h: 1, count: 1, kind: kExch, pair: -1}), lp+math.Log(0.4), label+"+NH")
			if left >= 2 {
				rec(left-2, append(parts, part{el: molecule.N, h: 2, count: 1, kind: kExch, pair: -1}), lp+math.Log(0.5), label+"+NH2")
			}
		}
	}
	rec(missing, nil, 0, "unobserved")
	a.constraint("unobserved-hydrogens", "unobserved hydrogens",
		fmt.Sprintf("the integrals account for %d H fewer than the formula: read as exchangeable O–H or N–H not observed", missing), nil, 0.8)
	return u
}

// decomposition is one choice of option per unit.
type decomposition struct {
	parts []part
	logp  float64
	// fallback: some unit was read without the fragment it offers
	fallback bool
	// envelope: the aliphatic multiplets are read together (see envelope)
	envelope bool
}

// decompositions returns up to max feasible combinations of the units'
// options, the most probable first (best-first search over the options
// sorted by prior).
func (a *analysis) decompositions(units []unit, max int) []decomposition {
	for k := range units {
		slices.SortStableFunc(units[k].opts, func(x, y option) int {
			switch {
			case x.logp > y.logp:
				return -1
			case x.logp < y.logp:
				return 1
			}
			return 0
		})
		if len(units[k].opts) == 0 {
			a.notes = append(a.notes, fmt.Sprintf("peak %d has no reading for this formula", a.peaks[units[k].peaks[0]].Number))
			return nil
		}
	}
	start := make([]int, len(units))
	h := &choiceHeap{}
	push := func(idx []int) {
		lp := 0.0
		for k, i := range idx {
			lp += units[k].opts[i].logp
		}
		heap.Push(h, choice{idx: idx, logp: lp})
	}
	push(start)
	seen := map[string]bool{fmt.Sprint(start): true}
	var out []decomposition
	for pops := 0; h.Len() > 0 && len(out) < max && pops < 20000; pops++ {
		c := heap.Pop(h).(choice)
		var parts []part
		for k, i := range c.idx {
			base := len(parts)
			for _, pt := range units[k].opts[i].parts {
				if pt.pair >= 0 {
					pt.pair += base
				}
				parts = append(parts, pt)
			}
		}
		if a.feasible(parts) && a.carbonFits(parts) {
			fb := false
			for k, i := range c.idx {
				fb = fb || units[k].opts[i].declines && len(units[k].opts) > 1
			}
			out = append(out, decomposition{parts: parts, logp: c.logp, fallback: fb})
		}
		for k := range c.idx {
			if c.idx[k]+1 < len(units[k].opts) {
				next := slices.Clone(c.idx)
				next[k]++
				key := fmt.Sprint(next)
				if !seen[key] {
					seen[key] = true
					push(next)
				}
			}
		}
	}
	return out
}

type choice struct {
	idx  []int
	logp float64
}

type choiceHeap []choice

func (h choiceHeap) Len() int           { return len(h) }
func (h choiceHeap) Less(i, j int) bool { return h[i].logp > h[j].logp }
func (h choiceHeap) Swap(i, j int)      { h[i], h[j] = h[j], h[i] }
func (h *choiceHeap) Push(x any)        { *h = append(*h, x.(choice)) }
func (h *choiceHeap) Pop() any {
	old := *h
	x := old[len(old)-1]
	*h = old[:len(old)-1]
	return x
}

// feasible reports whether the parts fit the formula: enough atoms of
// each element, enough unsaturation for the sp2 carbons.
func (a *analysis) feasible(parts []part) bool {
	var use [molecule.NumElements]int
	sp2 := 0
	for _, pt := range parts {
		use[pt.el] += pt.count
		c, n, s2 := pt.templateAtoms()
		use[molecule.C] += c
		use[molecule.N] += n
		sp2 += s2
		switch pt.kind {
		case kSP2, kFormyl:
			sp2 += pt.count
		}
		if pt.kind == kFormyl && a.f.Count(molecule.O) == 0 {
			return false
		}
	}
	for e := molecule.H + 1; e < molecule.NumElements; e++ {
		if use[e] > a.f.Count(e) {
			return false
		}
	}
	// every sp2 carbon needs a double bond; one double bond serves two
	return (sp2+1)/2 <= a.f.DBE()
}

// countIn returns the number of partners coupled with J in [lo, hi].
func countIn(p Pattern, lo, hi float64) int {
	js, counts, ok := p.couplings()
	if !ok {
		return 0
	}
	n := 0
	for k, j := range js {
		if j >= lo && j <= hi {
			n += counts[k]
		}
	}
	return n
}
