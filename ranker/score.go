package ranker

import (
	"math"

	"shiftrank/spectrum"
)

// Model holds the parameters of the likelihood that scores a candidate
// structure against an observed peak list. All costs are in nats (natural
// log units); a candidate's Score is minus its total cost, so a higher score
// is a better explanation. DefaultModel documents the values in use.
//
// The likelihood of a candidate is that of its best assignment of predicted
// environments to observed peaks (see Score). It is a product of:
//
// Shift. For environment i on peak j the residual d is the distance
// between the predicted interval [ShiftMin, ShiftMax] and the observed one
// [ShiftLo, ShiftHi] (0 when they overlap), in units of the environment's
// σ (with SigmaObs added in quadrature and SigmaFloor as a lower limit).
// Its density is Student's t with Nu degrees of freedom, as in the DP4
// method (Smith & Goodman, J. Am. Chem. Soc. 2010, 132, 12946), whose
// heavy tails keep one badly predicted environment from vetoing an
// otherwise good candidate. A predicted interval of width W spreads the
// density over it: f = t(d/σ)/t(0) / (W + σ/t(0)), which is t(d/σ)/σ for a
// point prediction and about 1/W inside a wide (exchangeable) range, so
// vague predictions are not rewarded.
//
// Multiplicity. A table P(observed pattern | predicted pattern): exact,
// compatible (same number of coupling partners grouped differently, "dd"
// seen as "t"; couplings unresolved, "dt" seen as "t"; any pattern seen as
// "m") or contradicting (more partners than predicted, a predicted singlet
// seen split). See multiplicityLogP.
//
// Coupling constants. When both the peak and the environment carry J
// values, each observed J is compared with the nearest predicted one with
// a t density of scale SigmaJ Hz, relative to a perfect match (≤ 0).
//
// The shift, multiplicity and J terms of environment i on peak j are
// weighted by w = min(H_i / h_j, MaxWeight), h_j being the peak's implied
// H from its integral, so each observed peak contributes about one unit of
// evidence however many environments share it. Without integrals w = 1.
// The discount covers what environments sharing a peak have in common:
// one reported shift, and prediction errors that move a class of
// hydrogens together. It does not cover a miss beyond SharedMiss σ from
// the peak's reported shift or range: a peak reported as
// "7.35–7.25 (m, 2H)" says that each of its hydrogens lies in that range,
// so an environment predicted 3 ppm away contradicts the report on its
// own, whatever shares the peak with it. The part of the shift term
// beyond SharedMiss σ is therefore weighted max(w, 1); without it a
// 3 ppm miss of one H on a 2H multiplet cost about 7 nats (half of a
// resolved peak's), which let wrong candidates park a hydrogen in a
// multiplet far from its predicted shift.
//
// Overlap. Each environment beyond the first on a peak reported with a
// first-order pattern costs Overlap.
//
// Integration. For a peak of implied h_j holding L assigned hydrogens, a
// Gaussian term −(L − h_j)²/(2 s²) with s = IntAbs + IntRel·h_j.
//
// Penalties. An unexplained peak costs UnexplainedBase + UnexplainedPerH·h_j
// (an impurity or a wrong candidate); an environment left without a peak
// costs UnobservedBase + UnobservedPerH·H, or the much smaller
// ExchangeableBase + ExchangeablePerH·H for exchangeable H (OH, NH, COOH),
// which are often broad or missing in CDCl3.
//
// Probabilities (see Ranker.Rank) come from normalising exp(Score/Temperature)
// over every scored candidate with a uniform prior (CarbonModel.Temperature
// when a 13C list is scored too).
type Model struct {
	Nu         float64 // Student t degrees of freedom for shift residuals
	SigmaFloor float64 // ppm, lower limit of an environment's σ
	SigmaObs   float64 // ppm, observation and referencing error, added in quadrature
	SigmaJ     float64 // Hz, scale of J residuals
	JWeight    float64 // weight of the J term relative to the shift term
	MaxWeight  float64 // upper limit of the per-peak weight H_i / h_j
	// SharedMiss, in units of σ, is how far beyond a peak's reported
	// shift or range the shift residuals of environments that share the
	// peak are discounted by the peak weight (see Model). Beyond it, the
	// miss counts at full weight: 0 discounts no miss, +Inf every miss.
	SharedMiss float64
	// MaxSplitGap, ppm, is how far apart the two peaks of a split
	// diastereotopic CH2 may be (their shifts rarely differ by more than
	// about 1 ppm in small molecules; common practice).
	MaxSplitGap float64

	IntAbs, IntRel float64 // integration error s = IntAbs + IntRel·h, in H

	// Overlap is the cost, nats, of each environment beyond the first on
	// a peak reported with a resolved first-order pattern (s, d, t, dd,
	// ...): inequivalent hydrogens rarely coincide so exactly that their
	// sum reads as one clean multiplet. Peaks reported as m, as ranges or
	// without a multiplicity hold several environments at no cost.
	Overlap float64

	UnexplainedBase, UnexplainedPerH   float64 // nats
	UnobservedBase, UnobservedPerH     float64 // nats
	ExchangeableBase, ExchangeablePerH float64 // nats

	// Carbon is the 13C part of the likelihood (zero value in Options:
	// DefaultCarbonModel()).
	Carbon CarbonModel

	// Temperature divides scores before normalising them into
	// probabilities: errors of one predictor are correlated across the
	// environments of a molecule, so the product of per-peak terms is
	// overconfident; a temperature above 1 calibrates it.
	Temperature float64
}

// DefaultModel returns the likelihood parameters shiftrank uses. Nu = 6:
// additive-increment predictions have heavier tails than the quantum
// chemical shifts of DP4 (ν ≈ 14 there for 1H), so we take a value at the
// heavy end of the 4–14 range. SharedMiss = 2: a class error of the
// increments moves the environments of one peak together by up to about
// 2σ; beyond that a miss is the environment's own (about 4 % of the true
// structures' environments on reported ranges in testdata/realsize.json
// lie further out, and there the heavy t tail, not the peak weight,
// forgives them).
func DefaultModel() Model {
	return Model{
		Nu:               6,
		SigmaFloor:       0.08,
		SigmaObs:         0.03,
		SigmaJ:           1.2,
		JWeight:          0.5,
		MaxWeight:        1.5,
		SharedMiss:       2,
		MaxSplitGap:      1.0,
		IntAbs:           0.2,
		IntRel:           0.05,
		Overlap:          1.4,
		UnexplainedBase:  3,
		UnexplainedPerH:  3,
		UnobservedBase:   4,
		UnobservedPerH:   3,
		ExchangeableBase: 0.5,
		ExchangeablePerH: 0.3,
		Carbon:           DefaultCarbonModel(),
		Temperature:      1,
	}
}

// logSum accumulates log Σ exp(x) in a numerically stable way.
type logSum struct {
	max, sum float64
	n        int64
}

func (l *logSum) add(x float64) {
	switch {
	case l.n == 0:
		l.max, l.sum = x, 1
	case x > l.max:
		l.sum = l.sum*math.Exp(l.max-x) + 1
		l.max = x
	default:
		l.sum += math.Exp(x - l.max)
	}
	l.n++
}

func (l *logSum) merge(o logSum) {
	if o.n == 0 {
		return
	}
	if l.n == 0 {
		*l = o
		return
	}
	if o.max > l.max {
		l.sum = l.sum*math.Exp(l.max-o.max) + o.sum
		l.max = o.max
	} else {
		l.sum += o.sum * math.Exp(o.max-l.max)
	}
	l.n += o.n
}

func (l *logSum) value() float64 {
	if l.n == 0 {
		return math.Inf(-1)
	}
	return l.max + math.Log(l.sum)
}

// predEnv is the part of a predicted environment the likelihood reads.
type predEnv struct {
	h              int
	shift, lo, hi  float64
	sigma          float64
	mult           spectrum.Multiplicity
	j              []float64 // Hz, largest first
	exchangeable   bool
	diastereotopic bool
	// slow counts hydrogens that couple with this environment only under
	// slow exchange (predict.Environment.SlowExchangeH).
	slow int
	// longRange counts hydrogens with a small long-range coupling
	// (predict.Environment.LongRangeH).
	longRange int
}

// obsPeak is the part of an observed peak the likelihood reads.
type obsPeak struct {
	shift, lo, hi float64
	mult          spectrum.Multiplicity // as scoredPattern returns it
	j             []float64
	h             float64 // implied H from the integral, 0 when not given
}

// tConst returns log t_ν(0) for the standard Student t density.
func tConst(nu float64) float64 {
	a, _ := math.Lgamma((nu + 1) / 2)
	b, _ := math.Lgamma(nu / 2)
	return a - b - 0.5*math.Log(nu*math.Pi)
}

// logTRel returns log(t_ν(x)/t_ν(0)) = −(ν+1)/2 · log(1 + x²/ν) (≤ 0).
func logTRel(x, nu float64) float64 {
	return -(nu + 1) / 2 * math.Log1p(x*x/nu)
}

// terms are the parts of one environment-on-peak cost, before weighting,
// as log-likelihoods (higher is better).
type terms struct {
	shift, mult, j float64
	// miss is the part of the shift term beyond Model.SharedMiss σ
	// (≤ 0), weighted at least 1 (see missWeight).
	miss float64
}

// scorer evaluates the likelihood; one per worker (not safe for concurrent
// use: it reuses its buffers).
type scorer struct {
	m      Model
	t0     float64 // t_ν(0), the standard t density at 0
	prob   assignProblem
	solver solver
	c      *carbonScorer // the 13C part
}

func newScorer(m Model) *scorer {
	return &scorer{m: m, t0: math.Exp(tConst(m.Nu)), c: newCarbonScorer(m.Carbon)}
}

// sigma returns the effective σ of an environment, ppm.
func (s *scorer) sigma(e *predEnv) float64 {
	sg := math.Hypot(e.sigma, s.m.SigmaObs)
	return math.Max(sg, s.m.SigmaFloor)
}

// residual returns the gap between the predicted and observed intervals,
// ppm (0 when they overlap).
func residual(e *predEnv, p *obsPeak) float64 {
	return intervalGap(e.lo, e.hi, p.lo, p.hi)
}

// intervalGap returns the distance between the intervals [alo, ahi] and
// [blo, bhi] (0 when they overlap).
func intervalGap(alo, ahi, blo, bhi float64) float64 {
	switch {
	case ahi < blo:
		return blo - ahi
	case alo > bhi:
		return alo - bhi
	}
	return 0
}

// pairTerms returns the unweighted log-likelihood terms of environment e
// on peak p.
func (s *scorer) pairTerms(e *predEnv, p *obsPeak) terms {
	sg := s.sigma(e)
	d := residual(e, p) / sg
	width := e.hi - e.lo
	dShared := math.Min(d, s.m.SharedMiss)
	shared := logTRel(dShared, s.m.Nu)
	return terms{
		shift: shared - math.Log(width+sg/s.t0),
		miss:  logTRel(d, s.m.Nu) - shared,
		mult:  multiplicityLogP(p.mult, e.mult, e.exchangeable, e.slow, e.longRange),
		j:     s.jTerm(e.j, p.j),
	}
}

// jTerm compares each observed J with the nearest predicted J (relative t
// density, ≤ 0). It is 0 when either side has no J.
func (s *scorer) jTerm(pred, obs []float64) float64 {
	if len(pred) == 0 || len(obs) == 0 {
		return 0
	}
	sum := 0.0
	for _, jo := range obs {
		best := math.Inf(1)
		for _, jp := range pred {
			if d := math.Abs(jo - jp); d < best {
				best = d
			}
		}
		sum += logTRel(best/s.m.SigmaJ, s.m.Nu)
	}
	return sum
}

// weight returns the evidence weight of h hydrogens (may be fractional for
// a half CH2) on a peak of implied H ph.
func (s *scorer) weight(h float64, ph float64) float64 {
	if ph <= 0 {
		return 1
	}
	return math.Min(h/ph, s.m.MaxWeight)
}

func (s *scorer) pairCost(t terms, w float64) float64 {
	return -w*(t.shift+t.mult+s.m.JWeight*t.j) - missWeight(w)*t.miss
}

// missWeight returns the weight of the part of a shift residual beyond
// Model.SharedMiss σ for an environment of peak weight w: at least 1, so
// that a far miss is not divided among the environments sharing a peak.
func missWeight(w float64) float64 {
	return math.Max(w, 1)
}

// overlapCost returns the cost of one extra environment on peak p.
func (s *scorer) overlapCost(p *obsPeak) float64 {
	if !p.mult.IsFirstOrder() || p.lo != p.hi {
		return 0
	}
	return s.m.Overlap
}

// integrationLogP returns the integration log-likelihood of load assigned
// hydrogens on a peak of implied H h (relative to a perfect match, ≤ 0).
func (s *scorer) integrationLogP(load int, h float64) float64 {
	if h <= 0 {
		return 0
	}
	sd := s.m.IntAbs + s.m.IntRel*h
	d := float64(load) - h
	return -d * d / (2 * sd * sd)
}

// unexplainedLogP returns the log-likelihood of a peak left unexplained.
func (s *scorer) unexplainedLogP(h float64) float64 {
	if h <= 0 {
		h = 1
	}
	return -(s.m.UnexplainedBase + s.m.UnexplainedPerH*h)
}

// unobservedLogP returns the log-likelihood of an environment with no peak.
func (s *scorer) unobservedLogP(e *predEnv) float64 {
	if e.exchangeable {
		return -(s.m.ExchangeableBase + s.m.ExchangeablePerH*float64(e.h))
	}
	return -(s.m.UnobservedBase + s.m.UnobservedPerH*float64(e.h))
}

// build fills s.prob for envs against peaks.
func (s *scorer) build(envs []predEnv, peaks []obsPeak) {
	total := 0
	for i := range envs {
		total += envs[i].h
	}
	n, m := len(envs), len(peaks)
	p := &s.prob
	p.reset(n, m, total)
	for i := range envs {
		e := &envs[i]
		p.envH[i] = e.h
		// A diastereotopic environment is one or more equivalent CH2
		// groups; its halves are the H on one face and on the other.
		p.split[i] = e.diastereotopic && e.h%2 == 0
		p.unobs[i] = -s.unobservedLogP(e)
		for j := range peaks {
			t := s.pairTerms(e, &peaks[j])
			ov := s.overlapCost(&peaks[j])
			p.whole[i*m+j] = s.pairCost(t, s.weight(float64(e.h), peaks[j].h)) + ov
			if p.split[i] {
				p.half[i*m+j] = s.pairCost(t, s.weight(float64(e.h)/2, peaks[j].h)) + ov
			}
		}
	}
	for j := range peaks {
		for k := range peaks {
			p.splitOK[j*m+k] = j != k && math.Abs(peaks[j].shift-peaks[k].shift) <= s.m.MaxSplitGap
		}
	}
	w := total + 1
	for j := range peaks {
		p.peak[j*w] = -s.unexplainedLogP(peaks[j].h)
		// Every environment on the peak paid the overlap cost; the
		// first one is refunded here, so k environments cost (k−1)·Overlap.
		ov := s.overlapCost(&peaks[j])
		for l := 1; l <= total; l++ {
			p.peak[j*w+l] = -s.integrationLogP(l, peaks[j].h) - ov
		}
	}
}

// score returns the log-likelihood of envs explaining peaks and the optimal
// assignment (owned by the scorer until the next call).
func (s *scorer) score(envs []predEnv, peaks []obsPeak) (float64, assignment) {
	s.build(envs, peaks)
	a := s.solver.solve(&s.prob)
	return -a.cost, a
}

// maxScoredFactors is the largest number of n+1 factors the likelihood
// tells apart: an observed pattern of more (a "ddddd") is scored as m.
const maxScoredFactors = 4

// scoredPattern returns an observed multiplicity as the likelihood reads
// it (see maxScoredFactors).
func scoredPattern(m spectrum.Multiplicity) spectrum.Multiplicity {
	if m.NumFactors() > maxScoredFactors {
		return spectrum.Multiplet().WithBroad(m.Broad()).WithApparent(m.Apparent())
	}
	return m
}

// Multiplicity probabilities P(observed | predicted). These are our own
// judgement of how often a correctly predicted pattern is reported in each
// way in routine CDCl3 spectra at 300–600 MHz (common practice: small
// couplings go unresolved and overlapping lines are reported as "m"); they
// are relative weights, not fitted frequencies. A peak reported as "m"
// carries the same weight whatever coupled pattern was predicted (first
// order or strongly coupled): "m" says only that the lines were not
// resolved, so it must not favour candidates whose prediction is vaguer.
const (
	pExact          = 0.70 // reported as predicted
	pRegrouped      = 0.15 // same number of partners, grouped differently (dd ↔ t)
	pApparent       = 0.50 // an "apparent" pattern with the predicted number of partners
	pUnresolvedOne  = 0.10 // one coupling partner fewer than predicted (dt → t)
	pUnresolvedMore = 0.03 // two or more partners fewer
	pExtraOne       = 0.02 // one partner more than predicted
	pExtraMore      = 0.004
	pSplitSinglet   = 0.005 // predicted singlet reported split
	pObservedM      = 0.40  // any predicted splitting reported as m
	pSingletAsM     = 0.03  // predicted singlet reported as m (overlap)
	pPredMObservedM = 0.40  // predicted m (strongly coupled) reported as m
	pPredMObservedS = 0.03  // predicted m reported as s
	pPredMOther     = 0.12  // predicted m reported with a first-order pattern
	pBroadFactor    = 0.7   // a "br" prefix on a non-exchangeable signal
	pExchBroadS     = 0.50  // exchangeable H reported as br s
	pExchS          = 0.35  // exchangeable H reported as s
	pExchOther      = 0.05  // exchangeable H reported coupled or as m
	// Couplings through an N–H or O–H are absent under fast exchange (the
	// n+1 rule's heteroatom exception) but common for amide N–H and for
	// O–H in dry CDCl3: a rule of thumb, not a law (common practice).
	pSlowExchange = 0.12 // C–H reported split also by the X–H next to it
	pExchCoupled  = 0.20 // exchangeable H reported split by the C–H next to it
	// A small long-range coupling (allylic ⁴J ≈ 1–2 Hz) is often
	// unresolved, but at 400 MHz and above it is often reported too.
	pLongRange       = 0.15
	pBroadSingletSeq = 0.15 // non-exchangeable singlet reported as br s
	// A coupled C–H reported as a broad singlet: exchange or slow
	// rotation (the N–CH2 of amide rotamers, CH next to a quadrupolar
	// nucleus) can broaden a multiplet into a featureless hump (common
	// practice); less likely than a predicted singlet reported broad.
	pBroadHidesSplitting = 0.08
)

// multiplicityLogP returns log P(observed pattern | predicted pattern).
func multiplicityLogP(obs, pred spectrum.Multiplicity, exchangeable bool, slow, longRange int) float64 {
	p, _ := multiplicityJudge(obs, pred, exchangeable, slow, longRange)
	return math.Log(p)
}

// multiplicityJudge returns P(observed | predicted) and a short verdict for
// the explanation. slow is the number of hydrogens that couple only under
// slow exchange (N–H or O–H next to a C–H), longRange the number with a
// small long-range coupling (allylic ⁴J): splitting by up to that many
// more partners than predicted is compatible.
func multiplicityJudge(obs, pred spectrum.Multiplicity, exchangeable bool, slow, longRange int) (float64, string) {
	if !obs.IsReported() {
		return 1, "not reported"
	}
	if exchangeable {
		switch {
		case obs.IsSinglet() && obs.Broad():
			return pExchBroadS, "as expected for exchangeable H"
		case obs.IsSinglet():
			return pExchS, "compatible: exchangeable H, often sharp in CDCl3"
		case slow > 0 && !obs.IsMultiplet() && obs.Partners() <= slow:
			return pExchCoupled, "compatible: the X–H couples to the C–H next to it (slow exchange)"
		}
		return pExchOther, "unusual for exchangeable H (usually a singlet)"
	}
	if slow+longRange > 0 && !obs.IsMultiplet() && !pred.IsMultiplet() && !obs.SamePattern(pred) {
		if no, np := obs.Partners(), pred.Partners(); no > np && no <= np+slow+longRange {
			p, why := pSlowExchange, "compatible: also coupled to the N–H/O–H next to it (slow exchange)"
			if no <= np+longRange {
				p, why = pLongRange, "compatible: a small long-range coupling (⁴J, allylic or in a ring) resolved"
			}
			if obs.Broad() {
				p *= pBroadFactor
			}
			return p, why
		}
	}
	if obs.IsMultiplet() {
		switch {
		case pred.IsMultiplet():
			return pPredMObservedM, "as predicted"
		case pred.NumFactors() == 0:
			return pSingletAsM, "contradicts a singlet unless signals overlap"
		}
		return pObservedM, "compatible: a multiplet can hide any splitting"
	}
	if pred.IsMultiplet() {
		if obs.NumFactors() == 0 {
			return pPredMObservedS, "contradicts: a coupled multiplet predicted, a singlet observed"
		}
		return pPredMOther, "compatible: predicted strongly coupled, reported first order"
	}
	broad := 1.0
	if obs.Broad() {
		switch {
		case obs.NumFactors() == 0 && pred.NumFactors() == 0:
			return pBroadSingletSeq, "compatible: broadened singlet"
		case obs.NumFactors() == 0:
			return pBroadHidesSplitting, "compatible: the line broadening (rotamers, exchange) hides the splitting"
		}
		broad = pBroadFactor
	}
	if pred.NumFactors() == 0 {
		if obs.NumFactors() == 0 {
			return pExact * broad, "as predicted"
		}
		return pSplitSinglet * broad, "contradicts: no coupled neighbours predicted, splitting observed"
	}
	if obs.SamePattern(pred) {
		return pExact * broad, "as predicted"
	}
	no, np := obs.Partners(), pred.Partners()
	if obs.Apparent() && no == np {
		// An apparent pattern says only how many lines are seen.
		return pApparent * broad, "compatible: apparent pattern with the predicted number of coupling partners"
	}
	switch {
	case no == np:
		return pRegrouped * broad, "compatible: same number of coupling partners, grouped differently (similar J)"
	case no == np-1:
		return pUnresolvedOne * broad, "compatible: one small coupling unresolved"
	case no < np:
		return pUnresolvedMore * broad, "weakly compatible: several predicted couplings not seen"
	case no == np+1:
		return pExtraOne * broad, "contradicts: one more coupling partner observed than predicted"
	}
	return pExtraMore * broad, "contradicts: more coupling partners observed than predicted"
}
