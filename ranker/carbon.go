package ranker

import (
	"math"

	"shiftrank/predict"
	"shiftrank/spectrum"
)

// CarbonModel holds the parameters of the 13C part of the likelihood,
// used when a request carries a 13C peak list. Costs are in nats; a
// candidate's Score is its 1H log-likelihood plus Weight times its 13C
// log-likelihood. DefaultCarbonModel documents the values in use.
//
// The 13C log-likelihood of a candidate is that of its best assignment of
// predicted carbon signals (predict.Carbon: one signal per set of
// symmetry-equivalent carbons, with a shift, a σ and a CH_n class) to the
// observed 13C peaks, found exactly by the same branch and bound as the
// 1H assignment (see assignProblem), with the number of carbons of a
// signal in the place of the hydrogens of an environment. A signal goes
// to one peak or is left unobserved; a peak holds any number of signals
// or none. The terms are:
//
// Shift. Signal i on peak j contributes the log density of the observed
// shift, log t_ν(d/σ) − log σ (ppm⁻¹), with d the distance from the
// predicted shift to the observed value or range and σ the predictor's σ
// with SigmaObs added in quadrature (at least SigmaFloor): Student's t as
// in DP4 (Smith & Goodman, J. Am. Chem. Soc. 2010, 132, 12946), whose
// heavy tails keep one badly predicted carbon from vetoing a candidate.
// The −log σ part makes vague predictions (estimates with a wide σ) earn
// less than precise ones that match.
//
// DEPT. When the observed peak carries a DEPT class (CH3, CH2, CH or C)
// that differs from the signal's CH_n class, the pair costs DEPTMismatch:
// an edited experiment rarely mislabels a carbon. A matching class or a
// peak without a class costs nothing.
//
// Several signals on one peak. A peak reported without a carbon count
// (or as "(1C)") that holds k signals costs (k−1)·Overlap: inequivalent
// carbons seldom coincide within the resolution of a 13C spectrum. A peak
// reported as "(nC)" with n ≥ 2 says that several carbons are there, so
// its signals coincide at no cost, and the number L of predicted carbons
// on it is compared with n: each carbon too many or too few costs
// CountPerCarbon. When some peaks of a list carry a count, the others are
// read as one carbon each (authors who write "(2C)" write it wherever it
// applies); when none does, the count is not known and not scored.
//
// Diastereotopic pairs. A signal of two carbons equivalent in the
// constitution but not in space (predict.CarbonSignal.Diastereotopic: the
// methyls of an isopropyl group next to a stereocentre) may be one line of
// two carbons or two lines. It is scored as a mixture of the two cases:
// one line costs −log(1−DiastereotopicSplit) on top of the terms above;
// two lines (one carbon on each of two peaks at most DiastereotopicGap
// apart) cost −log DiastereotopicSplit plus a shift term for each line,
// each with DiastereotopicSpread added to σ in quadrature (the predicted
// shift is the pair's mean, each line lies to one side of it). Two lines
// are then scored like two inequivalent carbons, one line like one signal
// of two carbons, so neither reading is free.
//
// Missing and extra lines. A predicted signal with no peak costs
// UnobservedQuaternary for a carbon without hydrogen (no NOE enhancement
// and a long T1 make quaternary carbons weak: they are the lines most
// often missed, common practice) and UnobservedProtonated for any other.
// An observed peak no signal explains costs Unexplained, more than either
// (a real line is hard to explain away: an impurity or a wrong candidate).
//
// With σ = 2 ppm a perfect match scores about −1.7 nats and a 3σ miss
// about −4.9; a pair is worth keeping up to about 5.5σ, beyond which
// leaving the signal unobserved and the peak unexplained costs less.
type CarbonModel struct {
	Nu         float64 // Student t degrees of freedom for 13C residuals
	SigmaFloor float64 // ppm, lower limit of a signal's σ
	SigmaObs   float64 // ppm, reporting and referencing error, added in quadrature

	DEPTMismatch   float64 // nats, a signal on a peak of another DEPT class
	Overlap        float64 // nats, each signal beyond the first on a peak of one carbon
	CountPerCarbon float64 // nats, each carbon more or fewer than an "(nC)" peak states

	DiastereotopicSplit  float64 // probability that a diastereotopic pair gives two lines
	DiastereotopicSpread float64 // ppm, spread of each line of a split pair about the predicted mean
	DiastereotopicGap    float64 // ppm, largest distance between the two lines of a split pair

	UnobservedQuaternary float64 // nats, a predicted C without H and no peak
	UnobservedProtonated float64 // nats, a predicted CH, CH2 or CH3 and no peak
	Unexplained          float64 // nats, an observed peak no signal explains

	// Weight multiplies the 13C log-likelihood in the joint score (1:
	// the 13C list is independent evidence, like the 1H list).
	Weight float64

	// Temperature replaces Model.Temperature when a 13C list is scored:
	// the errors of the 1H and 13C increment predictions of one structure
	// are correlated (a group the tables describe poorly misleads both),
	// so the joint score overstates the evidence more than the 1H score
	// alone, and its probabilities need their own calibration. Zero in
	// Options means Model.Temperature.
	Temperature float64
}

// DefaultCarbonModel returns the 13C likelihood parameters shiftrank
// uses. Nu = 6, as for 1H (see DefaultModel). SigmaObs = 0.5 ppm covers
// the spread of CDCl3 referencing (77.0 or 77.16 ppm) and rounding; the
// predictor's own σ is 1–2 ppm inside its tables. DEPTMismatch = 5 nats
// (P ≈ 0.007); Overlap = 1.5 nats (P ≈ 0.2 that two inequivalent carbons
// are reported as one line, higher than chance because authors merge
// close aromatic lines); CountPerCarbon = 2 nats. A diastereotopic pair
// gives two lines about as often as one (DiastereotopicSplit = 0.5), a
// few tenths of a ppm to about 5 ppm apart (valine 19.0 and 17.8,
// leucine 22.9 and 21.9, menthol 21.0 and 16.1, acetone oxime 21.8 and
// 15.4; Pretsch, from memory): DiastereotopicSpread = 1.5 ppm,
// DiastereotopicGap = 7 ppm. These are judgements
// of the trade, not fitted values. Temperature = 2 is measured: on the
// 101 compounds of testdata/realsize.json (shiftrank bench --carbon) the
// joint score at temperature 1 gave the first candidate a mean
// probability of 0.95 for a top-1 rate of 0.88, where the 1H score alone
// is calibrated at 1 (0.81 for 0.79); at 2 the mean probability falls to
// about 0.90 (estimated from the ten best candidates of each compound)
// without changing any ranking. Checked on testdata/realsize_holdout.json.
func DefaultCarbonModel() CarbonModel {
	return CarbonModel{
		Nu:                   6,
		SigmaFloor:           0.5,
		SigmaObs:             0.5,
		DEPTMismatch:         5,
		Overlap:              1.5,
		CountPerCarbon:       2,
		DiastereotopicSplit:  0.5,
		DiastereotopicSpread: 1.5,
		DiastereotopicGap:    7,
		UnobservedQuaternary: 1,
		UnobservedProtonated: 3,
		Unexplained:          5,
		Weight:               1,
		Temperature:          2,
	}
}

// predCarbon is the part of a predicted carbon signal the likelihood reads.
type predCarbon struct {
	n     int // equivalent carbons
	class predict.CHClass
	shift float64
	sigma float64
	dia   bool // a diastereotopic pair: one line or two (see CarbonModel)
}

// obsCarbon is the part of an observed 13C peak the likelihood reads.
type obsCarbon struct {
	shift, lo, hi float64
	count         int // carbons stated or implied (see CarbonModel); 0: not known
	dept          spectrum.DEPT
}

// carbonScorer evaluates the 13C likelihood; one per worker (not safe for
// concurrent use: it reuses its buffers).
type carbonScorer struct {
	m      CarbonModel
	t0     float64 // t_ν(0)
	prob   assignProblem
	solver solver
}

func newCarbonScorer(m CarbonModel) *carbonScorer {
	return &carbonScorer{m: m, t0: math.Exp(tConst(m.Nu))}
}

// toCarbons converts a predicted 13C spectrum for the likelihood, reusing
// buf.
func toCarbons(sp *predict.CarbonSpectrum, buf []predCarbon) []predCarbon {
	buf = buf[:0]
	for k := range sp.Signals {
		s := &sp.Signals[k]
		buf = append(buf, predCarbon{n: len(s.Atoms), class: s.Class, shift: s.Shift, sigma: s.Sigma, dia: s.Diastereotopic && len(s.Atoms)%2 == 0})
	}
	return buf
}

// sigma returns the effective σ of a signal, ppm.
func (s *carbonScorer) sigma(c *predCarbon) float64 {
	return math.Max(math.Hypot(c.sigma, s.m.SigmaObs), s.m.SigmaFloor)
}

// halfSigma returns the effective σ of one line of a split diastereotopic
// pair, ppm.
func (s *carbonScorer) halfSigma(c *predCarbon) float64 {
	return math.Hypot(s.sigma(c), s.m.DiastereotopicSpread)
}

// residual returns the distance from the predicted shift to the observed
// value or range, ppm.
func (c *predCarbon) residual(p *obsCarbon) float64 {
	return intervalGap(c.shift, c.shift, p.lo, p.hi)
}

// shiftLogP returns the log density of peak p's shift given signal c.
func (s *carbonScorer) shiftLogP(c *predCarbon, p *obsCarbon) float64 {
	sg := s.sigma(c)
	return logTRel(c.residual(p)/sg, s.m.Nu) - math.Log(sg/s.t0)
}

// halfShiftLogP returns the log density of peak p's shift given one line
// of the split diastereotopic pair c.
func (s *carbonScorer) halfShiftLogP(c *predCarbon, p *obsCarbon) float64 {
	sg := s.halfSigma(c)
	return logTRel(c.residual(p)/sg, s.m.Nu) - math.Log(sg/s.t0)
}

// oneLineLogP returns the log-probability that signal c gives one line: 0
// for an ordinary signal, log(1 − DiastereotopicSplit) for a
// diastereotopic pair.
func (s *carbonScorer) oneLineLogP(c *predCarbon) float64 {
	if !c.dia || !(s.m.DiastereotopicSplit > 0 && s.m.DiastereotopicSplit < 1) {
		return 0
	}
	return math.Log1p(-s.m.DiastereotopicSplit)
}

// twoLinesLogP returns the log-probability that the diastereotopic pair
// gives two lines.
func (s *carbonScorer) twoLinesLogP() float64 { return math.Log(s.m.DiastereotopicSplit) }

// deptMatch reports whether a signal's class agrees with the peak's DEPT
// class (true when the peak has none).
func deptMatch(c *predCarbon, p *obsCarbon) bool {
	return p.dept == spectrum.DEPTUnknown || p.dept.H() == c.class.H()
}

// deptLogP returns the DEPT term of signal c on peak p (≤ 0).
func (s *carbonScorer) deptLogP(c *predCarbon, p *obsCarbon) float64 {
	if deptMatch(c, p) {
		return 0
	}
	return -s.m.DEPTMismatch
}

// overlapCost returns the cost of each signal beyond the first on p.
func (s *carbonScorer) overlapCost(p *obsCarbon) float64 {
	if p.count >= 2 {
		return 0
	}
	return s.m.Overlap
}

// countLogP returns the count term of load predicted carbons on p (≤ 0).
func (s *carbonScorer) countLogP(load int, p *obsCarbon) float64 {
	if p.count <= 0 || load == 0 {
		return 0
	}
	return -s.m.CountPerCarbon * math.Abs(float64(load-p.count))
}

// unobservedLogP returns the log-likelihood of a signal with no peak.
func (s *carbonScorer) unobservedLogP(c *predCarbon) float64 {
	if c.class == predict.Cq {
		return -s.m.UnobservedQuaternary
	}
	return -s.m.UnobservedProtonated
}

// unexplainedLogP returns the log-likelihood of a peak no signal explains.
func (s *carbonScorer) unexplainedLogP() float64 { return -s.m.Unexplained }

// build fills s.prob for signals against peaks.
func (s *carbonScorer) build(sigs []predCarbon, peaks []obsCarbon) {
	total := 0
	for i := range sigs {
		total += sigs[i].n
	}
	n, m := len(sigs), len(peaks)
	p := &s.prob
	p.reset(n, m, total)
	for i := range sigs {
		c := &sigs[i]
		p.envH[i] = c.n
		p.split[i] = c.dia && s.m.DiastereotopicSplit > 0 && s.m.DiastereotopicSplit < 1
		p.unobs[i] = -s.unobservedLogP(c)
		one := s.oneLineLogP(c)
		for j := range peaks {
			pk := &peaks[j]
			p.whole[i*m+j] = -s.shiftLogP(c, pk) - s.deptLogP(c, pk) + s.overlapCost(pk) - one
			if p.split[i] {
				p.half[i*m+j] = -s.halfShiftLogP(c, pk) - s.deptLogP(c, pk) + s.overlapCost(pk) - s.twoLinesLogP()/2
			}
		}
	}
	for j := range peaks {
		for k := range peaks {
			p.splitOK[j*m+k] = j != k && math.Abs(peaks[j].shift-peaks[k].shift) <= s.m.DiastereotopicGap
		}
	}
	w := total + 1
	for j := range peaks {
		pk := &peaks[j]
		p.peak[j*w] = -s.unexplainedLogP()
		// Every signal on the peak paid the overlap cost; the first is
		// refunded here, so k signals cost (k−1)·Overlap.
		ov := s.overlapCost(pk)
		for l := 1; l <= total; l++ {
			p.peak[j*w+l] = -s.countLogP(l, pk) - ov
		}
	}
}

// score returns the 13C log-likelihood of sigs explaining peaks (not yet
// weighted) and the optimal assignment (owned by the scorer until the
// next call). Without peaks it is 0.
func (s *carbonScorer) score(sigs []predCarbon, peaks []obsCarbon) (float64, assignment) {
	if len(peaks) == 0 {
		return 0, assignment{proven: true}
	}
	s.build(sigs, peaks)
	a := s.solver.solve(&s.prob)
	return -a.cost, a
}
