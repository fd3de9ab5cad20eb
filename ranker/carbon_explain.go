package ranker

import (
	"fmt"
	"slices"
	"strings"

	"shiftrank/predict"
	"shiftrank/spectrum"
)

// ObservedCarbonPeak is an input 13C peak as the ranking used it.
type ObservedCarbonPeak struct {
	Index   int     `json:"index"` // 0-based position in the input 13C list
	Shift   float64 `json:"shift"` // ppm
	ShiftLo float64 `json:"shift_lo,omitempty"`
	ShiftHi float64 `json:"shift_hi,omitempty"`
	// Count is the number of carbons given ("(2C)"; 0: not given) and
	// ScoredCount the number the likelihood compares with (1 for a peak
	// without a count in a list where other peaks have one; 0: not
	// scored). See CarbonModel.
	Count       int    `json:"count,omitempty"`
	ScoredCount int    `json:"scored_count,omitempty"`
	DEPT        string `json:"dept,omitempty"` // "CH3", "CH2", "CH", "C" or absent
	Text        string `json:"text,omitempty"`
}

// CarbonAssignment explains one observed 13C peak of a candidate: the
// predicted carbon signals on it and its share of the score.
type CarbonAssignment struct {
	Peak          int       `json:"peak"` // index into Result.CarbonPeaks (input order)
	ObservedShift float64   `json:"observed_shift"`
	ObservedRange []float64 `json:"observed_range,omitempty"` // [hi, lo] for a range
	ObservedDEPT  string    `json:"observed_dept,omitempty"`
	ObservedCount int       `json:"observed_count,omitempty"` // as given; 0: not given
	// PredictedShift is the carbon-weighted mean of the assigned signals;
	// PredictedClass their CH_n classes ("CH3", or "C + CH" for two).
	PredictedShift float64 `json:"predicted_shift"`
	PredictedClass string  `json:"predicted_class"`
	// Signals are the IDs of the predicted carbon signals on this peak
	// (predict.CarbonSignal.ID); Atoms their carbons (SMILES atom
	// indices) and Carbons how many there are.
	Signals []int `json:"signals"`
	Atoms   []int `json:"atoms"`
	Carbons int   `json:"carbons"`
	// Breakdown is the increment breakdown of the shift (of each signal,
	// labelled when there are several).
	Breakdown []ShiftTerm `json:"breakdown"`
	// ScoreShare is this peak's contribution to Score, nats (shift + DEPT
	// + count + overlap terms, times CarbonModel.Weight).
	ScoreShare float64              `json:"score_share"`
	Terms      CarbonTerms          `json:"terms"`
	Reason     string               `json:"reason"`
	Details    []CarbonSignalDetail `json:"signal_details"`
}

// CarbonTerms splits a 13C peak's ScoreShare, nats.
type CarbonTerms struct {
	Shift   float64 `json:"shift"`
	DEPT    float64 `json:"dept"`
	Count   float64 `json:"count"`
	Overlap float64 `json:"overlap"` // signals beyond the first on a peak of one carbon
}

// CarbonSignalDetail is one predicted carbon signal on a 13C peak.
type CarbonSignalDetail struct {
	Signal         int         `json:"signal"`
	Atoms          []int       `json:"atoms"`
	Class          string      `json:"class"` // CH_n class: "C", "CH", "CH2", "CH3"
	Kind           string      `json:"kind"`
	PredictedShift float64     `json:"predicted_shift"`
	Sigma          float64     `json:"sigma"`
	Residual       float64     `json:"residual"` // ppm, 0 inside an observed range
	Breakdown      []ShiftTerm `json:"breakdown"`
	Reasons        []string    `json:"reasons,omitempty"`
}

// UnexplainedCarbonPeak is an observed 13C peak no predicted signal of
// the candidate accounts for.
type UnexplainedCarbonPeak struct {
	Peak          int     `json:"peak"`
	ObservedShift float64 `json:"observed_shift"`
	ObservedDEPT  string  `json:"observed_dept,omitempty"`
	ObservedCount int     `json:"observed_count,omitempty"`
	ScoreShare    float64 `json:"score_share"`
	Reason        string  `json:"reason"`
}

// UnobservedCarbon is a predicted carbon signal left without a peak.
type UnobservedCarbon struct {
	Signal         int     `json:"signal"`
	Atoms          []int   `json:"atoms"`
	Class          string  `json:"class"`
	Kind           string  `json:"kind"`
	PredictedShift float64 `json:"predicted_shift"`
	Sigma          float64 `json:"sigma"`
	ScoreShare     float64 `json:"score_share"`
	Reason         string  `json:"reason"`
}

// prepareCarbon reads the checked 13C list into the job.
func (j *job) prepareCarbon(c spectrum.PeakList) {
	counted := slices.ContainsFunc(c.Peaks, func(p spectrum.Peak) bool { return p.Count > 0 })
	j.cpeaks = make([]ObservedCarbonPeak, len(c.Peaks))
	j.cobs = make([]obsCarbon, len(c.Peaks))
	for i, p := range c.Peaks {
		n := p.Count
		if n == 0 && counted {
			n = 1
		}
		op := ObservedCarbonPeak{Index: i, Shift: p.Shift, Count: p.Count, ScoredCount: n, DEPT: p.DEPT.String(), Text: p.Text}
		lo, hi := p.Shift, p.Shift
		if p.IsRange() {
			op.ShiftLo, op.ShiftHi = p.ShiftLo, p.ShiftHi
			lo, hi = p.ShiftLo, p.ShiftHi
		}
		j.cpeaks[i] = op
		j.cobs[i] = obsCarbon{shift: p.Shift, lo: lo, hi: hi, count: n, dept: p.DEPT}
	}
}

// explainCarbon scores the predicted 13C spectrum csp against the job's
// 13C list, adds the (weighted) score to c and explains the assignment
// peak by peak.
func explainCarbon(c *Candidate, sc *scorer, j *job, csp *predict.CarbonSpectrum) {
	cs := sc.c
	w := cs.m.Weight
	sigs := toCarbons(csp, nil)
	score, a := cs.score(sigs, j.cobs)
	c.CarbonScore = w * score
	c.Score += c.CarbonScore
	c.CarbonAssignments = []CarbonAssignment{}
	c.UnexplainedCarbonPeaks = []UnexplainedCarbonPeak{}
	c.UnobservedCarbons = []UnobservedCarbon{}

	// A split diastereotopic pair puts one line on each of two peaks.
	type part struct {
		sig  int
		half bool
	}
	onPeak := make([][]part, len(j.cobs))
	for i := range sigs {
		switch {
		case a.first[i] >= 0 && a.second[i] >= 0:
			onPeak[a.first[i]] = append(onPeak[a.first[i]], part{i, true})
			onPeak[a.second[i]] = append(onPeak[a.second[i]], part{i, true})
			continue
		case a.first[i] >= 0:
			onPeak[a.first[i]] = append(onPeak[a.first[i]], part{i, false})
			continue
		}
		s := &csp.Signals[i]
		reason := "no observed peak fits it better than leaving it out"
		if s.Class == predict.Cq {
			reason = "quaternary carbon: a weak line (no NOE, long relaxation), often missed; no observed peak fits it better"
		}
		c.UnobservedCarbons = append(c.UnobservedCarbons, UnobservedCarbon{
			Signal: s.ID, Atoms: s.Atoms, Class: s.Class.String(), Kind: s.Kind, PredictedShift: s.Shift, Sigma: s.Sigma,
			ScoreShare: w * cs.unobservedLogP(&sigs[i]), Reason: reason,
		})
	}
	for k := range j.cobs {
		p := &j.cobs[k]
		op := &j.cpeaks[k]
		parts := onPeak[k]
		if len(parts) == 0 {
			c.UnexplainedCarbonPeaks = append(c.UnexplainedCarbonPeaks, UnexplainedCarbonPeak{
				Peak: op.Index, ObservedShift: op.Shift, ObservedDEPT: op.DEPT, ObservedCount: op.Count,
				ScoreShare: w * cs.unexplainedLogP(),
				Reason:     "no predicted carbon signal fits it better than leaving it out: an impurity or a wrong candidate",
			})
			continue
		}
		as := CarbonAssignment{Peak: op.Index, ObservedShift: op.Shift, ObservedDEPT: op.DEPT, ObservedCount: op.Count,
			Signals: []int{}, Atoms: []int{}, Breakdown: []ShiftTerm{}}
		if op.ShiftLo != op.ShiftHi {
			as.ObservedRange = []float64{op.ShiftHi, op.ShiftLo}
		}
		var classes, reasons []string
		for _, pt := range parts {
			i := pt.sig
			s := &csp.Signals[i]
			pc := &sigs[i]
			n, atoms := pc.n, s.Atoms
			if pt.half {
				// One line of the pair; which carbon is which is not
				// predicted, so the line is given the first half.
				n /= 2
				atoms = s.Atoms[:n]
				if k == a.second[i] {
					atoms = s.Atoms[n:]
				}
				// The mixture weight of the two-line reading, half on
				// each line, joins the shift term.
				as.Terms.Shift += w * (cs.halfShiftLogP(pc, p) + cs.twoLinesLogP()/2)
			} else {
				as.Terms.Shift += w * (cs.shiftLogP(pc, p) + cs.oneLineLogP(pc))
			}
			as.Terms.DEPT += w * cs.deptLogP(pc, p)
			as.PredictedShift += float64(n) * s.Shift
			as.Carbons += n
			as.Signals = append(as.Signals, s.ID)
			as.Atoms = append(as.Atoms, atoms...)
			classes = append(classes, s.Class.String())
			for _, b := range s.Breakdown {
				t := b.Term
				if len(parts) > 1 {
					t = fmt.Sprintf("signal %d: %s", s.ID, t)
				}
				as.Breakdown = append(as.Breakdown, ShiftTerm{Term: t, PPM: b.PPM})
			}
			reason := carbonReason(cs, s, pc, p, len(parts) > 1)
			switch {
			case pt.half:
				reason += "; diastereotopic pair seen as two lines: one carbon on this line"
			case pc.dia:
				reason += "; diastereotopic pair seen as one line"
			}
			reasons = append(reasons, reason)
			as.Details = append(as.Details, CarbonSignalDetail{
				Signal: s.ID, Atoms: atoms, Class: s.Class.String(), Kind: s.Kind,
				PredictedShift: s.Shift, Sigma: s.Sigma, Residual: round(pc.residual(p), 3),
				Breakdown: nonNilTerms(s.Breakdown), Reasons: s.Reasons,
			})
		}
		slices.Sort(as.Atoms)
		as.PredictedShift = round(as.PredictedShift/float64(as.Carbons), 3)
		as.PredictedClass = strings.Join(classes, " + ")
		as.Terms.Count = w*cs.countLogP(as.Carbons, p) + 0 // no negative zero in the JSON
		as.Terms.Overlap = -w*float64(len(parts)-1)*cs.overlapCost(p) + 0
		switch {
		case p.count > 0 && as.Carbons != p.count:
			reasons = append(reasons, fmt.Sprintf("%d carbons predicted where the list has %d", as.Carbons, p.count))
		case len(parts) > 1 && p.count < 2:
			reasons = append(reasons, fmt.Sprintf("%d inequivalent signals coincide on one line", len(parts)))
		}
		as.Reason = strings.Join(reasons, "; ")
		as.ScoreShare = as.Terms.Shift + as.Terms.DEPT + as.Terms.Count + as.Terms.Overlap
		c.CarbonAssignments = append(c.CarbonAssignments, as)
	}
}

// carbonReason says how one predicted signal fits its peak: the shift
// residual in σ and the DEPT class.
func carbonReason(cs *carbonScorer, s *predict.CarbonSignal, pc *predCarbon, p *obsCarbon, shared bool) string {
	var b strings.Builder
	if shared {
		fmt.Fprintf(&b, "signal %d: ", s.ID)
	}
	d := pc.residual(p)
	fmt.Fprintf(&b, "%s [%s] predicted at %.1f ± %.1f ppm", s.Kind, s.Class, s.Shift, s.Sigma)
	if len(s.Atoms) > 1 {
		fmt.Fprintf(&b, " (%d equivalent carbons)", len(s.Atoms))
	}
	if d == 0 {
		b.WriteString(", on the observed shift")
	} else {
		fmt.Fprintf(&b, ", %.1f ppm (%.1fσ) off", d, d/cs.sigma(pc))
	}
	switch {
	case p.dept == spectrum.DEPTUnknown:
	case deptMatch(pc, p):
		fmt.Fprintf(&b, "; DEPT %s as predicted", p.dept)
	default:
		fmt.Fprintf(&b, "; contradicts DEPT %s", p.dept)
	}
	return b.String()
}
