package ranker

import (
	"context"
	"fmt"
	"math"
	"slices"
	"strings"

	"shiftrank/molecule"
	"shiftrank/predict"
)

// explainTop re-predicts the kept candidates from their canonical SMILES
// (so atom numbers refer to that string), re-scores them and builds their
// explanations, best first.
func (r *Ranker) explainTop(ctx context.Context, j *job, items []ranked[*molecule.Graph], logZ float64) ([]Candidate, error) {
	pred := predict.New(predict.Options{MHz: j.mhz, LineWidthHz: r.lineW, Explain: true})
	sc := newScorer(r.model)
	cands := make([]Candidate, 0, len(items))
	for k := range items {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		it := &items[k]
		smi := it.getKey()
		g, err := molecule.ParseSMILES(smi)
		if err != nil {
			// The canonical writer and the parser disagree: explain the
			// generated graph under its own (non-canonical) SMILES so
			// that atom numbers still match the string shown.
			g = it.item
			smi = g.SMILES()
		}
		c, err := r.explainWith(pred, sc, j, g, smi)
		if err != nil {
			return nil, err
		}
		cands = append(cands, c)
	}
	slices.SortStableFunc(cands, func(a, b Candidate) int {
		switch {
		case a.Score > b.Score:
			return -1
		case a.Score < b.Score:
			return 1
		}
		return strings.Compare(a.SMILES, b.SMILES)
	})
	for k := range cands {
		cands[k].Rank = k + 1
		if !math.IsInf(logZ, -1) {
			cands[k].Probability = math.Exp(cands[k].Score/r.temperature(j) - logZ)
		}
	}
	for k := range cands {
		cands[k].Summary = summarise(cands, k, j)
	}
	return cands, nil
}

// explainOne explains graph g (written as smi, whose atom order g follows)
// as a candidate of job j.
func (r *Ranker) explainOne(j *job, g *molecule.Graph, smi string) (Candidate, error) {
	pred := predict.New(predict.Options{MHz: j.mhz, LineWidthHz: r.lineW, Explain: true})
	return r.explainWith(pred, newScorer(r.model), j, g, smi)
}

func (r *Ranker) explainWith(pred *predict.Predictor, sc *scorer, j *job, g *molecule.Graph, smi string) (Candidate, error) {
	sp, err := pred.Predict(g)
	if err != nil {
		return Candidate{}, fmt.Errorf("re-predict candidate %s: %w", smi, err)
	}
	c := explainCandidate(sc, j, sp, smi)
	c.Notes = sp.Notes
	if len(j.cobs) > 0 {
		csp, err := pred.Carbon(g)
		if err != nil {
			return Candidate{}, fmt.Errorf("re-predict 13C of candidate %s: %w", smi, err)
		}
		explainCarbon(&c, sc, j, csp)
		c.Notes = append(c.Notes, csp.Notes...)
	}
	return c, nil
}

// explainCandidate scores sp against the job's peaks and explains the best
// assignment peak by peak.
func explainCandidate(sc *scorer, j *job, sp *predict.Spectrum, smi string) Candidate {
	envs := toEnvs(sp, nil)
	score, a := sc.score(envs, j.obs)
	c := Candidate{SMILES: smi, Score: score, Assignments: []Assignment{}, UnexplainedPeaks: []UnexplainedPeak{}, UnobservedEnvironments: []UnobservedEnvironment{}}

	type part struct {
		env  int
		half bool
	}
	onPeak := make([][]part, len(j.obs))
	for i := range envs {
		switch {
		case a.first[i] < 0:
			e := &sp.Environments[i]
			reason := "no observed peak fits it better than leaving it out"
			if e.Exchangeable {
				reason = "exchangeable H: often broad or not observed in CDCl3"
			}
			c.UnobservedEnvironments = append(c.UnobservedEnvironments, UnobservedEnvironment{
				Environment: e.ID, Atoms: e.Atoms, H: e.H, Kind: e.Kind, PredictedShift: e.Shift,
				PredictedMultiplicity: e.Multiplicity, Exchangeable: e.Exchangeable,
				ScoreShare: sc.unobservedLogP(&envs[i]), Reason: reason,
			})
		case a.second[i] >= 0:
			onPeak[a.first[i]] = append(onPeak[a.first[i]], part{i, true})
			onPeak[a.second[i]] = append(onPeak[a.second[i]], part{i, true})
		default:
			onPeak[a.first[i]] = append(onPeak[a.first[i]], part{i, false})
		}
	}

	for k := range j.obs {
		p := &j.obs[k]
		op := &j.peaks[j.scored[k]]
		parts := onPeak[k]
		if len(parts) == 0 {
			c.UnexplainedPeaks = append(c.UnexplainedPeaks, UnexplainedPeak{
				Peak: op.Index, ObservedShift: op.Shift, Multiplicity: op.Multiplicity,
				ObservedH: p.h, ScoreShare: sc.unexplainedLogP(p.h),
			})
			continue
		}
		as := Assignment{Peak: op.Index, ObservedShift: op.Shift, ObservedMultiplicity: op.Multiplicity, ObservedH: p.h,
			Environments: []int{}, Atoms: []int{}, Breakdown: []ShiftTerm{}}
		if op.ShiftLo != op.ShiftHi {
			as.ObservedRange = []float64{op.ShiftHi, op.ShiftLo}
		}
		var mults, reasons []string
		load, wsum := 0, 0.0
		for _, pt := range parts {
			e := &sp.Environments[pt.env]
			pe := &envs[pt.env]
			h := e.H
			if pt.half {
				h = e.H / 2
			}
			load += h
			t := sc.pairTerms(pe, p)
			w := sc.weight(float64(h), p.h)
			as.Terms.Shift += w*t.shift + missWeight(w)*t.miss
			as.Terms.Multiplicity += w * t.mult
			as.Terms.J += w * sc.m.JWeight * t.j
			as.PredictedShift += float64(h) * e.Shift
			wsum += float64(h)
			as.Environments = append(as.Environments, e.ID)
			for _, at := range e.Atoms {
				if !slices.Contains(as.Atoms, at) {
					as.Atoms = append(as.Atoms, at)
				}
			}
			for _, b := range e.Breakdown {
				t := b.Term
				if len(parts) > 1 {
					t = fmt.Sprintf("env %d: %s", e.ID, t)
				}
				as.Breakdown = append(as.Breakdown, ShiftTerm{Term: t, PPM: b.PPM})
			}
			mults = append(mults, e.Multiplicity)
			_, verdict := multiplicityJudge(p.mult, pe.mult, pe.exchangeable, pe.slow, pe.longRange)
			reasons = append(reasons, multiplicityReason(sp, e, pt.half, verdict, len(parts) > 1))
			as.Details = append(as.Details, EnvironmentDetail{
				Environment: e.ID, Atoms: e.Atoms, H: h, Split: pt.half, Kind: e.Kind,
				PredictedShift: e.Shift, ShiftMin: pe.lo, ShiftMax: pe.hi, Sigma: e.Sigma,
				Residual: residual(pe, p), PredictedMultiplicity: e.Multiplicity, J: e.J,
				Breakdown: nonNilTerms(e.Breakdown), Reasons: e.Reasons,
			})
		}
		slices.Sort(as.Atoms)
		if wsum > 0 {
			as.PredictedShift = round(as.PredictedShift/wsum, 3)
		}
		as.ExpectedH = load
		if p.h > 0 {
			as.Terms.Integration = sc.integrationLogP(load, p.h)
		}
		as.Terms.Overlap = -float64(len(parts)-1) * sc.overlapCost(p)
		as.Terms.Integration += 0 // no negative zero in the JSON
		as.Terms.Overlap += 0
		as.PredictedMultiplicity = strings.Join(mults, " + ")
		as.MultiplicityReason = strings.Join(reasons, "; ")
		as.ScoreShare = as.Terms.Shift + as.Terms.Multiplicity + as.Terms.J + as.Terms.Integration + as.Terms.Overlap
		c.Assignments = append(c.Assignments, as)
	}
	return c
}

func nonNilTerms(t []predict.Term) []ShiftTerm {
	out := make([]ShiftTerm, len(t))
	for i, x := range t {
		out[i] = ShiftTerm{Term: x.Term, PPM: x.PPM}
	}
	return out
}

func round(x float64, digits int) float64 {
	p := math.Pow(10, float64(digits))
	return math.Round(x*p) / p
}

// multiplicityReason explains a predicted multiplicity from its resolved
// couplings (n+1 rule), and how the observation compares.
func multiplicityReason(sp *predict.Spectrum, e *predict.Environment, half bool, verdict string, shared bool) string {
	var b strings.Builder
	if shared {
		fmt.Fprintf(&b, "env %d: ", e.ID)
	}
	if half {
		if e.H == 6 && len(e.Atoms) == 2 {
			b.WriteString("one of two CH3 groups on one atom that are not equivalent in space; ")
		} else if e.H > 2 {
			b.WriteString("one H of each diastereotopic CH2; ")
		} else {
			b.WriteString("one H of a diastereotopic CH2; ")
		}
	}
	var parts []string
	for _, cp := range e.Couplings {
		if !cp.Resolved {
			continue
		}
		who := "H"
		if cp.Nucleus != "" {
			who = cp.Nucleus
		}
		where := ""
		switch {
		case len(cp.Atoms) == 1:
			where = fmt.Sprintf(" on atom %d", cp.Atoms[0])
		case len(cp.Atoms) > 1 && cp.N <= len(cp.Atoms) && cp.N > 0 && cp.N%len(cp.Atoms) != 0:
			where = " of atoms " + joinInts(cp.Atoms)
		case len(cp.Atoms) > 1:
			where = " on atoms " + joinInts(cp.Atoms)
		}
		label := ""
		if cp.Label != "" {
			label = cp.Label + ", "
		}
		parts = append(parts, fmt.Sprintf("%d %s%s (%sJ ≈ %.1f Hz)", cp.N, who, where, label, cp.J))
	}
	switch {
	case e.Exchangeable:
		b.WriteString("exchangeable H: no resolved coupling expected → " + e.Multiplicity)
	case len(parts) == 0:
		b.WriteString("no resolved couplings → " + e.Multiplicity)
	default:
		b.WriteString(strings.Join(parts, ", ") + " → " + e.Multiplicity)
	}
	b.WriteString("; observed: " + verdict)
	return b.String()
}

func joinInts(a []int) string {
	s := make([]string, len(a))
	for i, x := range a {
		s[i] = fmt.Sprint(x)
	}
	return strings.Join(s, ",")
}

// summarise says why candidate k ranks above candidate k+1 (or, for the
// last shown, how far it is from the first).
func summarise(cands []Candidate, k int, j *job) string {
	c := &cands[k]
	if k+1 >= len(cands) {
		if k == 0 {
			return "only candidate shown"
		}
		return fmt.Sprintf("%.1f nats below the first candidate", cands[0].Score-c.Score)
	}
	n := &cands[k+1]
	diff := c.Score - n.Score
	if diff == 0 {
		return fmt.Sprintf("ties with #%d (%s): the spectra cannot tell them apart; ordered by SMILES", n.Rank, n.SMILES)
	}
	// Per-peak differences, 1H peaks first, then 13C peaks.
	type d struct {
		label string
		v     float64
	}
	var ds []d
	hs := func(x *Candidate) map[int]float64 {
		m := map[int]float64{}
		for _, a := range x.Assignments {
			m[a.Peak] += a.ScoreShare
		}
		for _, u := range x.UnexplainedPeaks {
			m[u.Peak] += u.ScoreShare
		}
		return m
	}
	sa, sb := hs(c), hs(n)
	for _, k := range j.scored {
		if v := sa[k] - sb[k]; math.Abs(v) > 0.05 {
			p := j.peaks[k]
			ds = append(ds, d{fmt.Sprintf("peak %d (δ %.2f)", p.Index+1, p.Shift), v})
		}
	}
	cs := func(x *Candidate) map[int]float64 {
		m := map[int]float64{}
		for _, a := range x.CarbonAssignments {
			m[a.Peak] += a.ScoreShare
		}
		for _, u := range x.UnexplainedCarbonPeaks {
			m[u.Peak] += u.ScoreShare
		}
		return m
	}
	ca, cb := cs(c), cs(n)
	for k, p := range j.cpeaks {
		if v := ca[k] - cb[k]; math.Abs(v) > 0.05 {
			ds = append(ds, d{fmt.Sprintf("13C peak %d (δ %.1f)", p.Index+1, p.Shift), v})
		}
	}
	unobs := func(x *Candidate) float64 {
		s := 0.0
		for _, u := range x.UnobservedEnvironments {
			s += u.ScoreShare
		}
		return s
	}
	if v := unobs(c) - unobs(n); math.Abs(v) > 0.05 {
		ds = append(ds, d{"unobserved environments", v})
	}
	unobsC := func(x *Candidate) float64 {
		s := 0.0
		for _, u := range x.UnobservedCarbons {
			s += u.ScoreShare
		}
		return s
	}
	if v := unobsC(c) - unobsC(n); math.Abs(v) > 0.05 {
		ds = append(ds, d{"unobserved carbons", v})
	}
	// Stable: equal differences keep the order above.
	slices.SortStableFunc(ds, func(a, b d) int {
		switch {
		case a.v > b.v:
			return -1
		case a.v < b.v:
			return 1
		}
		return 0
	})
	var why, against []string
	for i := 0; i < len(ds) && len(why) < 3 && ds[i].v > 0; i++ {
		why = append(why, fmt.Sprintf("%s %+.1f", ds[i].label, ds[i].v))
	}
	for i := len(ds) - 1; i >= 0 && len(against) < 2 && ds[i].v < 0; i-- {
		against = append(against, fmt.Sprintf("%s %+.1f", ds[i].label, ds[i].v))
	}
	ratio := math.Exp(diff)
	rs := fmt.Sprintf("%.3g", ratio)
	if ratio > 1e6 {
		rs = "more than a million"
	}
	s := fmt.Sprintf("beats #%d (%s) by %.2f nats (likelihood ratio %s)", n.Rank, n.SMILES, diff, rs)
	if len(why) > 0 {
		s += ": " + strings.Join(why, ", ")
	}
	if len(against) > 0 {
		s += "; in #" + fmt.Sprint(n.Rank) + "'s favour: " + strings.Join(against, ", ")
	}
	if diff < 1 {
		s += "; the spectrum hardly tells them apart"
	}
	return s
}
