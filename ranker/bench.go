package ranker

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"slices"
	"strings"
	"time"

	"shiftrank/infer"
	"shiftrank/molecule"
	"shiftrank/spectrum"
)

// Reference is one compound of an accuracy set: a formula, an observed
// peak list in journal notation, the true structure and where the data
// come from.
type Reference struct {
	Name    string `json:"name"`
	Formula string `json:"formula"`
	SMILES  string `json:"smiles"`
	Peaks   string `json:"peaks"`
	// Carbon is the observed 13C peak list in journal notation
	// ("13C NMR (101 MHz, CDCl3) δ 171.2, 134.1, 129.3 (2C), ..."), with
	// "(nC)" where n carbons give one signal; empty if none was given.
	Carbon string `json:"carbon,omitempty"`
	Source string `json:"source"`
	Group  string `json:"group,omitempty"`
}

// ReferenceSet is an accuracy set (testdata/accuracy.json).
type ReferenceSet struct {
	Description string      `json:"description,omitempty"`
	Compounds   []Reference `json:"compounds"`
}

// MaxReferenceSet is the largest accuracy-set file accepted, bytes.
const MaxReferenceSet = 8 << 20

// ParseReferenceSet reads an accuracy set. Every compound must have a
// name, a formula, a SMILES, a peak list and a source. Errors are
// *RequestError with Field "compounds[i].field" and, for JSON syntax
// errors, the byte offset in Pos.
func ParseReferenceSet(b []byte) (*ReferenceSet, error) {
	if len(b) > MaxReferenceSet {
		return nil, &RequestError{Field: "file", Msg: fmt.Sprintf("%d bytes exceed the limit of %d", len(b), MaxReferenceSet)}
	}
	dec := json.NewDecoder(bytes.NewReader(b))
	dec.DisallowUnknownFields()
	var set ReferenceSet
	if err := dec.Decode(&set); err != nil {
		var se *json.SyntaxError
		var te *json.UnmarshalTypeError
		switch {
		case errors.As(err, &se):
			return nil, &RequestError{Field: "file", Pos: int(se.Offset), Token: near(b, int(se.Offset)), Msg: se.Error(), Err: err}
		case errors.As(err, &te):
			return nil, &RequestError{Field: te.Field, Pos: int(te.Offset), Token: near(b, int(te.Offset)), Msg: "expected " + te.Type.String(), Err: err}
		}
		return nil, &RequestError{Field: "file", Msg: err.Error(), Err: err}
	}
	if _, err := dec.Token(); err != io.EOF {
		return nil, &RequestError{Field: "file", Pos: int(dec.InputOffset()), Msg: "data after the top-level object"}
	}
	if len(set.Compounds) == 0 {
		return nil, &RequestError{Field: "compounds", Msg: "no compounds"}
	}
	for i, c := range set.Compounds {
		for _, f := range []struct{ name, v string }{
			{"name", c.Name}, {"formula", c.Formula}, {"smiles", c.SMILES}, {"peaks", c.Peaks}, {"source", c.Source},
		} {
			if strings.TrimSpace(f.v) == "" {
				return nil, &RequestError{Field: fmt.Sprintf("compounds[%d].%s", i, f.name), Msg: "missing"}
			}
		}
	}
	return &set, nil
}

// near returns a few bytes of b around off, for error messages.
func near(b []byte, off int) string {
	lo, hi := max(off-8, 0), min(off+8, len(b))
	if lo > hi {
		return ""
	}
	return string(b[lo:hi])
}

// BenchOptions configures Bench.
type BenchOptions struct {
	TopK          int           // candidates explained per compound (default 5)
	MaxCandidates int64         // per compound (default DefaultMaxCandidates)
	TimeBudget    time.Duration // per compound (default DefaultTimeBudget)
	Filter        string        // default "plausible"
	// Carbon scores each compound with its 13C list (Reference.Carbon)
	// as well, when it has one; otherwise the 13C lists are ignored.
	Carbon bool
}

// BenchCase is the outcome for one reference compound.
type BenchCase struct {
	Reference
	// Rank of the true structure among all scored candidates (1 = best);
	// 0 if it was not scored (removed by the filter, outside the budget,
	// or the input could not be read: see Error).
	Rank int `json:"rank"`
	// Ties counts other candidates with the same score as the true one.
	Ties int `json:"ties,omitempty"`
	// Probability given to the true structure.
	Probability float64 `json:"probability"`
	// TopProbability is the probability of the first candidate.
	TopProbability float64 `json:"top_probability"`
	TopSMILES      string  `json:"top_smiles"`
	// TopScores are the scores of the candidates explained (best first):
	// with Probability's score they let a study recompute approximate
	// probabilities at another temperature without ranking again.
	TopScores []float64 `json:"top_scores,omitempty"`
	// TopCarbonScores are the 13C parts of TopScores (with a 13C list).
	TopCarbonScores []float64 `json:"top_carbon_scores,omitempty"`
	// TrueScore is the true structure's score (0 when it was not scored).
	TrueScore float64 `json:"true_score,omitempty"`
	Scored    int64   `json:"scored"`
	Complete  bool    `json:"complete"`
	// Status is the search's status (see SearchReport.Status); Excluded
	// says why the true structure was outside the readings searched.
	Status   string  `json:"status"`
	Excluded string  `json:"excluded,omitempty"`
	Seconds  float64 `json:"seconds"`
	Error    string  `json:"error,omitempty"`
	// CarbonScored says the compound's 13C list was scored with its 1H
	// list (BenchOptions.Carbon).
	CarbonScored bool `json:"carbon_scored,omitempty"`
	// Top is the first candidate and True the true structure's candidate
	// (explained even when it is outside the top K), for misses.
	Top  *Candidate `json:"top,omitempty"`
	True *Candidate `json:"true,omitempty"`
}

// BenchReport summarises an accuracy run.
type BenchReport struct {
	Cases []BenchCase `json:"cases"`
	N     int         `json:"n"`
	// WithCarbon counts the compounds scored with their 13C list too.
	WithCarbon int     `json:"with_carbon"`
	Top1       float64 `json:"top1"` // fraction with the true structure first
	Top3       float64 `json:"top3"`
	MRR        float64 `json:"mrr"` // mean reciprocal rank (0 for unscored)
	// MeanTopProbability is the mean probability of the first candidate;
	// for a calibrated score it is close to Top1.
	MeanTopProbability float64 `json:"mean_top_probability"`
	// MeanTrueProbability is the mean probability given to the true
	// structure.
	MeanTrueProbability float64 `json:"mean_true_probability"`
	// Calibration groups the compounds by the probability of their first
	// candidate: in a calibrated model each bin's top-1 rate is close to
	// its mean probability.
	Calibration []CalibrationBin `json:"calibration"`
	Seconds     float64          `json:"seconds"`
	// CompleteShare is the fraction of searches that finished (over all
	// isomers or within the constraints); MedianSeconds and MaxSeconds
	// the wall-clock time per compound.
	CompleteShare float64 `json:"complete_share"`
	MedianSeconds float64 `json:"median_seconds"`
	MaxSeconds    float64 `json:"max_seconds"`
}

// CalibrationBin is one probability range of BenchReport.Calibration.
type CalibrationBin struct {
	Lo, Hi          float64 // probability range of the first candidate, [Lo, Hi)
	N               int     // compounds in the bin
	MeanProbability float64 // mean probability of their first candidate
	Top1            float64 // fraction whose first candidate is the true structure
}

// calibrationEdges are the bin edges of BenchReport.Calibration.
var calibrationEdges = [...]float64{0, 0.5, 0.8, 0.95, 0.99, 1.0000001}

// Bench ranks every compound of set and reports how often the true
// structure comes first, in the top three, its mean reciprocal rank and
// the calibration of the probabilities. caseDone, if not nil, is called
// after each compound.
func (r *Ranker) Bench(ctx context.Context, set *ReferenceSet, opts BenchOptions, caseDone func(i int, c BenchCase)) (*BenchReport, error) {
	if opts.TopK <= 0 {
		opts.TopK = 5
	}
	start := time.Now()
	rep := &BenchReport{}
	for i, ref := range set.Compounds {
		if err := ctx.Err(); err != nil {
			return nil, err
		}
		c, err := r.benchOne(ctx, ref, opts)
		if err != nil {
			if ctx.Err() != nil {
				return nil, ctx.Err()
			}
			c.Error = err.Error()
		}
		rep.Cases = append(rep.Cases, c)
		if caseDone != nil {
			caseDone(i, c)
		}
	}
	rep.N = len(rep.Cases)
	for _, c := range rep.Cases {
		if c.CarbonScored {
			rep.WithCarbon++
		}
		if c.Rank == 1 {
			rep.Top1++
		}
		if c.Rank >= 1 && c.Rank <= 3 {
			rep.Top3++
		}
		if c.Rank >= 1 {
			rep.MRR += 1 / float64(c.Rank)
		}
		rep.MeanTopProbability += c.TopProbability
		rep.MeanTrueProbability += c.Probability
	}
	if rep.N > 0 {
		n := float64(rep.N)
		rep.Top1 /= n
		rep.Top3 /= n
		rep.MRR /= n
		rep.MeanTopProbability /= n
		rep.MeanTrueProbability /= n
	}
	for b := 0; b+1 < len(calibrationEdges); b++ {
		bin := CalibrationBin{Lo: calibrationEdges[b], Hi: min(calibrationEdges[b+1], 1)}
		for _, c := range rep.Cases {
			if c.TopProbability >= calibrationEdges[b] && c.TopProbability < calibrationEdges[b+1] {
				bin.N++
				bin.MeanProbability += c.TopProbability
				if c.Rank == 1 {
					bin.Top1++
				}
			}
		}
		if bin.N > 0 {
			bin.MeanProbability /= float64(bin.N)
			bin.Top1 /= float64(bin.N)
		}
		rep.Calibration = append(rep.Calibration, bin)
	}
	rep.Seconds = time.Since(start).Seconds()
	var secs []float64
	done := 0
	for _, c := range rep.Cases {
		secs = append(secs, c.Seconds)
		if c.Complete {
			done++
		}
	}
	if len(secs) > 0 {
		slices.Sort(secs)
		rep.MedianSeconds = secs[len(secs)/2]
		if len(secs)%2 == 0 {
			rep.MedianSeconds = (secs[len(secs)/2-1] + secs[len(secs)/2]) / 2
		}
		rep.MaxSeconds = secs[len(secs)-1]
		rep.CompleteShare = float64(done) / float64(len(secs))
	}
	return rep, nil
}

// benchOne ranks one reference compound and finds the exact rank of its
// true structure: the true structure is scored first, and the ranking
// counts how many candidates score higher.
func (r *Ranker) benchOne(ctx context.Context, ref Reference, opts BenchOptions) (BenchCase, error) {
	c := BenchCase{Reference: ref}
	pl, err := spectrum.ReadList([]byte(ref.Peaks), spectrum.H1)
	if err != nil {
		return c, fmt.Errorf("peaks: %w", err)
	}
	req := Request{Formula: ref.Formula, Peaks: pl, TopK: opts.TopK, Filter: opts.Filter,
		MaxCandidates: opts.MaxCandidates, TimeBudget: opts.TimeBudget}
	if opts.Carbon && strings.TrimSpace(ref.Carbon) != "" {
		cl, err := spectrum.ReadList([]byte(ref.Carbon), spectrum.C13)
		if err != nil {
			return c, fmt.Errorf("carbon: %w", err)
		}
		req.Carbon = cl
	}
	j, err := r.prepare(req)
	if err != nil {
		return c, err
	}
	c, err = r.benchJob(ctx, j, ref)
	c.CarbonScored = len(j.cobs) > 0
	return c, err
}

// benchJob is benchOne for a prepared job.
func (r *Ranker) benchJob(ctx context.Context, j *job, ref Reference) (BenchCase, error) {
	c := BenchCase{Reference: ref}
	g, err := molecule.ParseSMILES(ref.SMILES)
	if err != nil {
		return c, fmt.Errorf("true structure: %w", err)
	}
	if g.Formula() != j.formula {
		return c, fmt.Errorf("true structure %s has formula %s, not %s", ref.SMILES, g.Formula(), j.formula)
	}
	trueSMILES := molecule.CanonicalSMILES(g)
	tg, err := molecule.ParseSMILES(trueSMILES)
	if err != nil {
		return c, fmt.Errorf("true structure: canonical SMILES %s: %w", trueSMILES, err)
	}
	tc, err := r.explainOne(j, tg, trueSMILES)
	if err != nil {
		return c, err
	}
	pr := &probe{score: tc.Score, smiles: trueSMILES}
	t0 := time.Now()
	res, err := r.run(ctx, j, nil, pr)
	if err != nil {
		return c, err
	}
	c.Seconds = time.Since(t0).Seconds()
	c.Scored, c.Complete, c.Status = res.Scored, res.Complete, res.Search.Status
	for _, cd := range res.Candidates {
		c.TopScores = append(c.TopScores, cd.Score)
		if c.CarbonScored = len(j.cobs) > 0; c.CarbonScored {
			c.TopCarbonScores = append(c.TopCarbonScores, cd.CarbonScore)
		}
	}
	if len(res.Candidates) > 0 {
		top := res.Candidates[0]
		c.TopSMILES, c.TopProbability = top.SMILES, top.Probability
		c.Top = &top
	}
	allowed, rule := j.filter.Allows(tg)
	switch {
	case !allowed:
		return c, fmt.Errorf("true structure %s is removed by the filter rule %q", trueSMILES, rule)
	case pr.seen == 0:
		// a miss: the true structure was outside what was searched
		c.Excluded = r.whyExcluded(j, tg, res)
		tc.Rank = 0
		c.True = &tc
		return c, nil
	}
	c.Rank = int(pr.above) + 1
	c.Ties = int(pr.ties)
	tc.Rank = c.Rank
	tc.Probability = math.Exp(tc.Score/r.temperature(j) - res.logZ)
	c.Probability = tc.Probability
	c.TrueScore = tc.Score
	c.True = &tc
	return c, nil
}

// whyExcluded says why a structure was not scored: which constraint of the
// likeliest reading it breaks, or that the search stopped first.
func (r *Ranker) whyExcluded(j *job, g *molecule.Graph, res *Result) string {
	if res.Search.Scope != ScopeConstrained {
		return "not reached before the search stopped"
	}
	an := infer.Infer(j.formula, j.inferPeaks(), infer.Options{Disabled: j.req.Disable, Carbon: j.inferCarbon()})
	for k, rd := range an.Readings {
		if ok, _ := rd.Spec.Explain(g); ok {
			state := ReadingSkipped
			if k < len(res.Search.Readings) {
				state = res.Search.Readings[k].State
			}
			return fmt.Sprintf("inside reading %d (%s), which was %s", k+1, rd.Name, state)
		}
	}
	if len(an.Readings) == 0 {
		return "no reading"
	}
	_, why := an.Readings[0].Spec.Explain(g)
	return "outside every reading; reading 1 (" + an.Readings[0].Name + "): " + why
}
