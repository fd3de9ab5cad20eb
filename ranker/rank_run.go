package ranker

import (
	"context"
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"
	"sync"
	"sync/atomic"
	"time"

	"shiftrank/infer"
	"shiftrank/isomers"
	"shiftrank/molecule"
	"shiftrank/predict"
	"shiftrank/spectrum"
)

// job is a validated Request with everything parsed.
type job struct {
	req      Request
	formula  molecule.Formula
	filter   isomers.Filter
	require  []*molecule.Fragment
	forbid   []*molecule.Fragment
	mhz      float64
	solvent  string
	topK     int
	maxCand  int64
	budget   time.Duration
	maxNodes int64
	peaks    []ObservedPeak       // every input peak, in input order
	scored   []int                // indices into peaks of the peaks that are scored
	obs      []obsPeak            // the scored peaks, for the likelihood
	cpeaks   []ObservedCarbonPeak // the 13C list, in input order (none: no 13C scoring)
	cobs     []obsCarbon          // the same, for the likelihood
	warnings []string
}

// prepare validates req and applies the defaults.
func (r *Ranker) prepare(req Request) (*job, error) {
	j := &job{req: req}
	maxHeavy := req.MaxHeavyAtoms
	if maxHeavy == 0 {
		maxHeavy = molecule.DefaultMaxHeavyAtoms
	}
	f, err := molecule.ParseFormulaLimit(req.Formula, maxHeavy)
	if err != nil {
		var fe *molecule.FormulaError
		if errors.As(err, &fe) {
			return nil, &RequestError{Field: "formula", Pos: fe.Pos, Token: fe.Token, Msg: fe.Msg, Err: err}
		}
		return nil, &RequestError{Field: "formula", Msg: err.Error(), Err: err}
	}
	j.formula = f
	if f.HydrogenCount() == 0 {
		return nil, &RequestError{Field: "formula", Token: req.Formula, Msg: "no hydrogens: a 1H spectrum cannot distinguish its isomers"}
	}

	switch {
	case req.MHz < 0 || math.IsNaN(req.MHz) || math.IsInf(req.MHz, 0):
		return nil, &RequestError{Field: "mhz", Token: fmt.Sprint(req.MHz), Msg: "spectrometer frequency must be positive"}
	case req.MHz > 0:
		j.mhz = req.MHz
	case req.Peaks.MHz > 0:
		j.mhz = req.Peaks.MHz
	default:
		j.mhz = DefaultMHz
	}
	if j.mhz < 20 || j.mhz > 2000 {
		return nil, &RequestError{Field: "mhz", Token: fmt.Sprint(j.mhz), Msg: "spectrometer frequency outside 20–2000 MHz"}
	}

	j.solvent = DefaultSolvent
	switch {
	case req.Solvent != "":
		c, ok := spectrum.CanonicalSolvent(req.Solvent)
		if !ok {
			return nil, &RequestError{Field: "solvent", Token: req.Solvent, Msg: "unknown solvent (known: " + strings.Join(spectrum.Solvents(), ", ") + ")"}
		}
		j.solvent = c
	case req.Peaks.Solvent != "":
		j.solvent = req.Peaks.Solvent
	}

	j.topK = req.TopK
	switch {
	case j.topK == 0:
		j.topK = DefaultTopK
	case j.topK < 0 || j.topK > MaxTopK:
		return nil, &RequestError{Field: "top", Token: fmt.Sprint(req.TopK), Msg: fmt.Sprintf("number of candidates must be 1–%d", MaxTopK)}
	}
	j.maxCand = req.MaxCandidates
	switch {
	case j.maxCand == 0:
		j.maxCand = DefaultMaxCandidates
	case j.maxCand < 0:
		return nil, &RequestError{Field: "max_candidates", Token: fmt.Sprint(req.MaxCandidates), Msg: "must be positive"}
	}
	j.maxNodes = req.MaxNodes
	switch {
	case j.maxNodes == 0:
		j.maxNodes = DefaultMaxNodes
	case j.maxNodes < 0:
		return nil, &RequestError{Field: "max_nodes", Token: fmt.Sprint(req.MaxNodes), Msg: "must be positive"}
	}
	j.budget = req.TimeBudget
	switch {
	case j.budget == 0:
		j.budget = DefaultTimeBudget
	case j.budget < 0:
		return nil, &RequestError{Field: "time_budget", Token: req.TimeBudget.String(), Msg: "must be positive"}
	}

	fs := req.Filter
	if fs == "" {
		fs = DefaultFilter
	}
	flt, err := isomers.ParseFilter(fs)
	if err != nil {
		return nil, &RequestError{Field: "filter", Token: fs, Msg: err.Error(), Err: err}
	}
	j.filter = flt

	for k, s := range req.Require {
		fr, err := parseFragment(fmt.Sprintf("require[%d]", k), s)
		if err != nil {
			return nil, err
		}
		j.require = append(j.require, fr)
	}
	for k, s := range req.Forbid {
		fr, err := parseFragment(fmt.Sprintf("forbid[%d]", k), s)
		if err != nil {
			return nil, err
		}
		j.forbid = append(j.forbid, fr)
	}

	if err := j.preparePeaks(); err != nil {
		return nil, err
	}
	return j, nil
}

func parseFragment(field, s string) (*molecule.Fragment, error) {
	fr, err := molecule.ParseFragment(s)
	if err != nil {
		var se *molecule.SMILESError
		if errors.As(err, &se) {
			return nil, &RequestError{Field: field, Pos: se.Pos, Token: se.Token, Msg: se.Msg, Err: err}
		}
		return nil, &RequestError{Field: field, Token: s, Msg: err.Error(), Err: err}
	}
	return fr, nil
}

// checkList validates a peak list given in the request; prefix names the
// request field ("" for peaks, "carbon." for the 13C list).
func checkList(prefix string, pl spectrum.PeakList) error {
	err := pl.Check()
	if err == nil {
		return nil
	}
	var pe *spectrum.PeakError
	if errors.As(err, &pe) {
		return &RequestError{Field: prefix + pe.Field, Pos: pe.Pos, Token: pe.Token, Msg: pe.Msg, Err: err}
	}
	return &RequestError{Field: prefix + "peaks", Msg: err.Error(), Err: err}
}

// solventMaxH is the implied H count from which a peak on a solvent or
// water shift is taken to be the compound's (see preparePeaks).
const solventMaxH = 1.5

// preparePeaks checks the peaks, flags solvent signals and scales the
// integrals of the peaks that are scored.
func (j *job) preparePeaks() error {
	pl := j.req.Peaks
	if pl.Nucleus != spectrum.H1 {
		return &RequestError{Field: "peaks", Token: pl.Nucleus.String(), Msg: "the ranking needs a 1H peak list"}
	}
	if err := checkList("", pl); err != nil {
		return err
	}
	if c := j.req.Carbon; len(c.Peaks) > 0 {
		if c.Nucleus != spectrum.C13 {
			return &RequestError{Field: "carbon", Token: c.Nucleus.String(), Msg: "not a 13C peak list"}
		}
		if err := checkList("carbon.", c); err != nil {
			return err
		}
		if j.formula.Count(molecule.C) == 0 {
			return &RequestError{Field: "carbon", Token: j.formula.String(), Msg: "a 13C list for a formula without carbon"}
		}
		j.prepareCarbon(c)
	}
	j.peaks = make([]ObservedPeak, len(pl.Peaks))
	for i, p := range pl.Peaks {
		op := ObservedPeak{Index: i, Shift: p.Shift, Multiplicity: p.Multiplicity.Code(), J: p.J, Integral: p.Integral, Text: p.Text}
		if p.IsRange() {
			op.ShiftLo, op.ShiftHi = p.ShiftLo, p.ShiftHi
		}
		j.peaks[i] = op
	}
	excluded := make([]bool, len(pl.Peaks))
	// A solvent or water signal is small next to the compound's: a
	// flagged peak that integrates for at least solventMaxH hydrogens of
	// the formula when every peak is counted is taken to be the
	// compound's (tert-butyl chloride's 9 H singlet at 1.62 ppm sits on
	// the water signal of CDCl3).
	allH, _, scaleErr := spectrum.ScaleIntegrals(pl, j.formula.HydrogenCount())
	var exclWarn []string
	for _, fl := range spectrum.FlagSolvent(pl, j.solvent) {
		k := fl.Peak
		if k < 0 || k >= len(j.peaks) {
			continue
		}
		j.peaks[k].Solvent = fl.Signal.Kind + " " + fl.Signal.Name
		switch {
		case fl.Exclude && !j.req.KeepSolventPeaks && scaleErr == nil && k < len(allH) && allH[k] >= solventMaxH:
			j.warnings = append(j.warnings, fmt.Sprintf("peak %d (δ %.2f) lies on the %s signal of %s in %s but integrates for %.1f H: scored as a signal of the compound",
				k+1, pl.Peaks[k].Shift, fl.Signal.Kind, fl.Signal.Name, j.solvent, allH[k]))
		case !fl.Exclude:
			j.warnings = append(j.warnings, fmt.Sprintf("peak %d (δ %.2f) overlaps the %s signal of %s in %s: its integral may include it",
				k+1, pl.Peaks[k].Shift, fl.Signal.Kind, fl.Signal.Name, j.solvent))
		case j.req.KeepSolventPeaks:
			j.warnings = append(j.warnings, fmt.Sprintf("peak %d (δ %.2f) matches the %s signal of %s in %s; scored as asked",
				k+1, pl.Peaks[k].Shift, fl.Signal.Kind, fl.Signal.Name, j.solvent))
		default:
			j.peaks[k].Excluded = true
			excluded[k] = true
			exclWarn = append(exclWarn, fmt.Sprintf("peak %d (δ %.2f) matches the %s signal of %s in %s and is not scored (keep solvent peaks to score it)",
				k+1, pl.Peaks[k].Shift, fl.Signal.Kind, fl.Signal.Name, j.solvent))
		}
	}
	if !slices.Contains(excluded, false) {
		// Nothing would be left: the compound's own signals sit on the
		// solvent or water shifts (a lone singlet at 1.56 in CDCl3).
		clear(excluded)
		for k := range j.peaks {
			j.peaks[k].Excluded = false
		}
		exclWarn = []string{"every peak matches a solvent or water signal; all are scored as signals of the compound"}
	}
	j.warnings = append(j.warnings, exclWarn...)
	kept := spectrum.PeakList{MHz: pl.MHz, Solvent: pl.Solvent}
	for i, p := range pl.Peaks {
		if !excluded[i] {
			kept.Peaks = append(kept.Peaks, p)
			j.scored = append(j.scored, i)
		}
	}
	implied, warns, err := spectrum.ScaleIntegrals(kept, j.formula.HydrogenCount())
	if err != nil {
		var pe *spectrum.PeakError
		if errors.As(err, &pe) {
			return &RequestError{Field: "peaks." + pe.Field, Pos: pe.Pos, Token: pe.Token, Msg: pe.Msg, Err: err}
		}
		return &RequestError{Field: "peaks", Msg: err.Error(), Err: err}
	}
	j.warnings = append(j.warnings, warns...)
	j.obs = make([]obsPeak, len(kept.Peaks))
	for k, p := range kept.Peaks {
		lo, hi := p.ShiftLo, p.ShiftHi
		if !p.IsRange() {
			lo, hi = p.Shift, p.Shift
		}
		h := 0.0
		if k < len(implied) {
			h = implied[k]
		}
		j.peaks[j.scored[k]].ImpliedH = h
		j.obs[k] = obsPeak{shift: p.Shift, lo: lo, hi: hi, mult: scoredPattern(p.Multiplicity), j: p.J, h: h}
	}
	return nil
}

// worker is the per-goroutine state of a ranking.
type worker struct {
	sc       *scorer
	envs     []predEnv
	sigs     []predCarbon
	top      *topK[*molecule.Graph]
	ls       logSum
	failed   int64
	unproven int64   // assignments whose search hit the node cap
	maxGap   float64 // nats: the largest cost − lower bound among them
	lastErr  error
	above    int64 // probe counts
	ties     int64
	seen     int64
	_        [64]byte // keep workers' hot fields on separate cache lines
}

// toEnvs converts a predicted spectrum for the likelihood, reusing buf.
func toEnvs(sp *predict.Spectrum, buf []predEnv) []predEnv {
	buf = buf[:0]
	for k := range sp.Environments {
		e := &sp.Environments[k]
		lo, hi := e.ShiftMin, e.ShiftMax
		if lo == 0 && hi == 0 || lo > hi {
			lo, hi = e.Shift, e.Shift
		}
		buf = append(buf, predEnv{
			h: e.H, shift: e.Shift, lo: math.Min(lo, e.Shift), hi: math.Max(hi, e.Shift), sigma: e.Sigma,
			mult: e.Pattern, j: e.J,
			exchangeable: e.Exchangeable, diastereotopic: e.Diastereotopic, slow: e.SlowExchangeH, longRange: e.LongRangeH,
		})
	}
	return buf
}

// Rank generates the isomers of req.Formula, scores each against
// req.Peaks and returns the best req.TopK with explanations. progress, if
// not nil, is called from one goroutine at most every ProgressInterval and
// once at the end.
//
// Errors: *RequestError for bad input; ctx.Err() when ctx is cancelled
// (a budget running out is not an error: the Result says Complete=false).
// A ranking cancelled while it searched returns the best candidates found
// so far together with ctx.Err(): a Result whose search stopped early,
// with the stop reason "cancelled on request"; one cancelled before it
// began returns nil.
func (r *Ranker) Rank(ctx context.Context, req Request, progress func(Progress)) (*Result, error) {
	j, err := r.prepare(req)
	if err != nil {
		return nil, err
	}
	return r.run(ctx, j, progress, nil)
}

// probe counts, during a ranking, the candidates scoring above a given
// score (the benchmark's true structure), to give its exact rank.
type probe struct {
	score  float64
	smiles string // canonical SMILES of the probed structure
	above  int64  // candidates with a higher score
	ties   int64  // other candidates with the same score
	seen   int64  // times the probed structure itself was scored
}

// probeTolerance is the score difference below which two candidates tie
// (sums over environments in different orders differ by rounding).
const probeTolerance = 1e-9

// run is Rank after validation.
func (r *Ranker) run(ctx context.Context, j *job, progress func(Progress), pr *probe) (*Result, error) {
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	start := time.Now()
	gctx, cancel := context.WithTimeoutCause(ctx, j.budget, errBudget)
	defer cancel()

	pred := predict.New(predict.Options{MHz: j.mhz, LineWidthHz: r.lineW})
	workers := make([]worker, r.workers)
	for w := range workers {
		workers[w].sc = newScorer(r.model)
		workers[w].top = newTopK[*molecule.Graph](j.topK)
	}
	var generated, scored atomic.Int64
	var searched, readingsTotal atomic.Int64

	var an *infer.Analysis
	if !j.req.Unconstrained {
		an = infer.Infer(j.formula, j.inferPeaks(), infer.Options{Disabled: j.req.Disable, Carbon: j.inferCarbon()})
	}
	if an != nil {
		j.warnUnknownDisabled(an)
	}
	constrained := an != nil && len(an.Readings) > 0
	readingsTotal.Store(int64(max(len(readingsOf(an)), 1)))

	var wg sync.WaitGroup
	stopProgress := make(chan struct{})
	var totalEstimate atomic.Int64
	if progress != nil {
		wg.Add(1)
		go func() {
			defer wg.Done()
			t := time.NewTicker(r.interval)
			defer t.Stop()
			for {
				select {
				case <-stopProgress:
					return
				case <-t.C:
					p := Progress{Generated: generated.Load(), Scored: scored.Load(), TotalEstimate: totalEstimate.Load()}
					if constrained {
						p.Readings, p.ReadingsTotal = int(searched.Load()), int(readingsTotal.Load())
					}
					progress(p)
				}
			}
		}()
	}

	temp := r.temperature(j)
	canon := func(g *molecule.Graph) string { return molecule.CanonicalSMILES(g) }
	clone := func(g *molecule.Graph) *molecule.Graph { return g.Clone() }
	yield := func(w int, g *molecule.Graph) bool {
		if gctx.Err() != nil {
			// the time budget (or a cancel) ends the scoring of the
			// structures already generated too, so the budget holds
			return false
		}
		generated.Add(1)
		wk := &workers[w]
		sp, err := pred.Predict(g)
		if err != nil {
			wk.failed++
			wk.lastErr = err
			return true
		}
		wk.envs = toEnvs(sp, wk.envs)
		s, a := wk.sc.score(wk.envs, j.obs)
		if !a.proven {
			wk.unproven++
			wk.maxGap = max(wk.maxGap, a.cost-a.bound)
		}
		if len(j.cobs) > 0 {
			csp, err := pred.Carbon(g)
			if err != nil {
				wk.failed++
				wk.lastErr = err
				return true
			}
			wk.sigs = toCarbons(csp, wk.sigs)
			cs, ca := wk.sc.c.score(wk.sigs, j.cobs)
			if !ca.proven {
				wk.unproven++
				wk.maxGap = max(wk.maxGap, ca.cost-ca.bound)
			}
			s += r.model.Carbon.Weight * cs
		}
		wk.ls.add(s / temp)
		wk.top.offer(s, g, canon, clone)
		if pr != nil {
			switch d := s - pr.score; {
			case d > probeTolerance:
				wk.above++
			case d >= -probeTolerance:
				if pr.smiles != "" && canon(g) == pr.smiles {
					wk.seen++
				} else {
					wk.ties++
				}
			}
		}
		scored.Add(1)
		return true
	}
	search := SearchReport{NodeBudget: j.maxNodes, Constraints: []infer.Constraint{}, Readings: []ReadingReport{}}
	if an != nil {
		search.Constraints = append(search.Constraints, an.Constraints...)
		search.Notes = an.Notes
	}
	base := isomers.Options{Filter: j.filter, Workers: r.workers, Require: j.require, Forbid: j.forbid, ChargeSeparated: !j.req.Neutral}
	var stats isomers.Stats
	var gerr error
	candLeft := j.maxCand
	nodesLeft := j.maxNodes
	stopReason := ""
	// firstReport gives progress its total before the search starts: the
	// size estimated from random probes of the search tree (see
	// isomers.Estimate), the same on any machine.
	firstReport := func() {
		if progress != nil {
			p := Progress{TotalEstimate: totalEstimate.Load()}
			if constrained {
				p.ReadingsTotal = int(readingsTotal.Load())
			}
			progress(p)
		}
	}
	if !constrained {
		search.Scope = ScopeAll
		opts := base
		if est, err := isomers.Estimate(gctx, j.formula, opts, readingEstimateProbes, 1); err == nil {
			search.EstimatedStructures = int64(math.Round(est.Structures))
			search.EstimatedNodes = int64(math.Round(est.Nodes))
			totalEstimate.Store(search.EstimatedStructures)
		}
		firstReport()
		opts.Limit, opts.NodeLimit = candLeft, nodesLeft
		stats, gerr = isomers.GenerateConcurrent(gctx, j.formula, opts, yield)
		search.Nodes = stats.Nodes
		if !stats.Complete {
			switch {
			case candLeft > 0 && stats.Emitted >= candLeft:
				stopReason = fmt.Sprintf("the candidate limit of %d", j.maxCand)
			case stats.Truncated > 0:
				stopReason = fmt.Sprintf("the work budget of %d search nodes", j.maxNodes)
			}
		}
	} else {
		search.Scope = ScopeConstrained
		seen := isomers.NewSeen()
		readings := an.Readings
		reps := make([]ReadingReport, len(readings))
		for k := range readings {
			rd := &readings[k]
			reps[k] = ReadingReport{Name: rd.Name, Weight: rd.Weight, Relaxed: rd.Relaxed, Fallback: rd.Fallback, Constraints: rd.Constraints, State: ReadingSkipped}
		}
		// run searches reading k within a node cap; a reading run again
		// with a larger cap starts over, and the structures it already
		// gave are not scored twice (seen).
		run := func(k int, cap int64) {
			if cap <= 0 || candLeft <= 0 || gctx.Err() != nil || gerr != nil {
				return
			}
			opts := base
			opts.Spec, opts.Seen, opts.Limit, opts.NodeLimit = &readings[k].Spec, seen, candLeft, cap
			st, err := isomers.GenerateConcurrent(gctx, j.formula, opts, yield)
			if err != nil {
				var se *isomers.SpecError
				switch {
				case errors.As(err, &se):
					return
				case errors.Is(err, context.DeadlineExceeded) || errors.Is(err, context.Canceled):
				default:
					gerr = err
					return
				}
			}
			rep := &reps[k]
			if rep.State == ReadingSkipped {
				searched.Add(1)
			}
			rep.Nodes += st.Nodes
			rep.Structures += st.Emitted
			nodesLeft -= st.Nodes
			candLeft -= st.Emitted
			search.Nodes += st.Nodes
			stats.Generated += st.Generated
			stats.Emitted += st.Emitted
			for rule, n := range st.Removed {
				if stats.Removed == nil {
					stats.Removed = map[string]int64{}
				}
				stats.Removed[rule] += n
			}
			rep.State = ReadingPartly
			if st.Complete && err == nil {
				rep.State = ReadingComplete
			}
		}
		// The readings that drop a fragment (Fallback) come before the
		// relaxed ones among those that only widen the search.
		var strict, fallback, relaxed []int
		for k := range readings {
			switch {
			case readings[k].Relaxed:
				relaxed = append(relaxed, k)
			case readings[k].Fallback:
				fallback = append(fallback, k)
			default:
				strict = append(strict, k)
			}
		}
		relaxed = append(fallback, relaxed...)
		// The size of each strict reading's search, estimated before any
		// runs (the relaxed ones are estimated when they run).
		estimate := func(k int) {
			if reps[k].Estimate != nil || gctx.Err() != nil {
				return
			}
			opts := base
			opts.Spec = &readings[k].Spec
			est, err := isomers.Estimate(gctx, j.formula, opts, readingEstimateProbes, uint64(k)+1)
			if err == nil {
				reps[k].Estimate = &est
			}
		}
		for _, k := range strict {
			estimate(k)
			if e := reps[k].Estimate; e != nil {
				search.EstimatedStructures += int64(math.Round(e.Structures))
				search.EstimatedNodes += int64(math.Round(e.Nodes))
			}
		}
		totalEstimate.Store(search.EstimatedStructures)
		firstReport()
		// Pass 1: every strict reading gets an equal share of half the
		// budget (or what its estimate says it needs), so that small
		// readings are searched completely whatever the large ones need.
		// Pass 2: the readings cut short start over, most plausible first,
		// each with half of what is left (the last with all of it).
		if len(strict) > 0 {
			first := max(nodesLeft/int64(2*len(strict)), 1)
			for _, k := range strict {
				// A reading whose estimate says it needs more than the
				// equal share gets twice its estimated nodes at once (up
				// to half of what is left), so that it is not cut short
				// and searched again from the start in pass 2.
				cap := first
				if e := reps[k].Estimate; e != nil {
					if want := int64(2*e.Nodes) + 1000; want > cap && want <= nodesLeft/2 {
						cap = want
					}
				}
				run(k, min(cap, nodesLeft))
			}
			var cut []int
			for _, k := range strict {
				if reps[k].State != ReadingComplete {
					cut = append(cut, k)
				}
			}
			for i, k := range cut {
				share := nodesLeft / 2
				if i == len(cut)-1 {
					share = nodesLeft
				}
				if share > first {
					run(k, share)
				}
			}
		}
		// The relaxed readings widen the search only when the strict ones
		// leave the spectrum poorly explained (or explain nothing).
		best, found := bestScore(workers)
		widen := !found || best < poorFitPerPeak*float64(len(j.obs))+r.model.Carbon.Weight*poorFitPerCarbonPeak*float64(len(j.cobs))
		for i, k := range relaxed {
			switch {
			case !widen:
				reps[k].State = ReadingNotNeeded
			default:
				share := nodesLeft / 2
				if i == len(relaxed)-1 {
					share = nodesLeft
				}
				if share > 0 && candLeft > 0 {
					estimate(k)
				}
				run(k, share)
			}
		}
		complete := true
		for _, k := range strict {
			complete = complete && reps[k].State == ReadingComplete
		}
		if widen {
			for _, k := range relaxed {
				complete = complete && reps[k].State == ReadingComplete
			}
		}
		search.Readings = reps
		stats.Complete = complete
		stats.Fraction = 1
		switch {
		case complete:
		case candLeft <= 0:
			stopReason = fmt.Sprintf("the candidate limit of %d", j.maxCand)
		default:
			stopReason = fmt.Sprintf("the work budget of %d search nodes", j.maxNodes)
		}
	}
	close(stopProgress)
	wg.Wait()
	// A cancelled ranking still hands back what it found so far, with
	// the cancel as its error (see Rank).
	cancelErr := ctx.Err()
	timedOut := errors.Is(context.Cause(gctx), errBudget)
	stopped := timedOut || cancelErr != nil
	if gerr != nil && !(stopped && (errors.Is(gerr, context.DeadlineExceeded) || errors.Is(gerr, context.Canceled))) {
		return nil, fmt.Errorf("generate isomers of %s: %w", j.formula, gerr)
	}
	switch {
	case cancelErr != nil:
		stopReason = "cancelled on request"
	case timedOut:
		stopReason = fmt.Sprintf("the time budget of %s, a safety stop whose point depends on the machine's load", j.budget)
	}
	search.StopReason = stopReason

	res := &Result{
		Formula: j.formula.String(), DBE: j.formula.DBE(),
		Generated: generated.Load(), Scored: scored.Load(),
		Complete: stats.Complete && !stopped,
		MHz:      j.mhz, Solvent: j.solvent, Filter: orDefault(j.req.Filter, DefaultFilter),
		Require: j.req.Require, Forbid: j.req.Forbid,
		Peaks: j.peaks, CarbonPeaks: j.cpeaks, Caution: Caution,
	}
	res.Warnings = append(res.Warnings, j.warnings...)
	top := newTopK[*molecule.Graph](j.topK)
	var ls logSum
	var failed int64
	var lastErr error
	for w := range workers {
		wk := &workers[w]
		top.merge(wk.top)
		ls.merge(wk.ls)
		failed += wk.failed
		if wk.lastErr != nil {
			lastErr = wk.lastErr
		}
		if pr != nil {
			pr.above += wk.above
			pr.ties += wk.ties
			pr.seen += wk.seen
		}
	}
	res.PredictFailures = failed
	var unproven int64
	gap := 0.0
	for w := range workers {
		unproven += workers[w].unproven
		gap = max(gap, workers[w].maxGap)
	}
	res.UnprovenAssignments = unproven
	if unproven > 0 {
		res.Warnings = append(res.Warnings, fmt.Sprintf("for %d candidates the assignment search hit its node limit: their scores are those of the best assignment found, which may not be optimal, by at most %.1f nats (it can only rank them lower than they deserve)", unproven, gap))
	}
	if failed > 0 {
		res.Warnings = append(res.Warnings, fmt.Sprintf("%d isomers could not be predicted and were not scored (last error: %v)", failed, lastErr))
	}
	r.totals(res, stats, stopped, j, &search)
	res.logZ = ls.value()

	// The explanation of what was found is quick and bounded: it runs
	// also when the ranking was cancelled.
	cands, err := r.explainTop(context.WithoutCancel(ctx), j, top.sorted(), res.logZ)
	if err != nil {
		return nil, err
	}
	res.Candidates = cands
	if res.Scored == 0 {
		if res.Complete {
			res.Warnings = append(res.Warnings, "no structure fits the formula and the constraints: nothing was scored")
		} else {
			res.Warnings = append(res.Warnings, "nothing was scored before the search stopped; this does not mean that no structure fits")
		}
	}
	res.ElapsedSeconds = time.Since(start).Seconds()
	if progress != nil {
		progress(Progress{Generated: res.Generated, Scored: res.Scored, TotalEstimate: res.IsomersTotal})
	}
	if res.Warnings == nil {
		res.Warnings = []string{}
	}
	if cancelErr != nil {
		return res, cancelErr
	}
	return res, nil
}

var errBudget = errors.New("time budget exhausted")

// readingEstimateProbes is the number of random probes behind each
// reading's size estimate (see isomers.Estimate): about 0.1–0.3 s for a
// reading of a C10–C16 formula on one core. The node estimate is good to
// about ±30 % (nicotine's readings: 0.67M estimated against 0.78M
// visited, 0.20M against 0.15M); the structure estimate is rougher where
// complete structures are rare in the tree (no probe may reach one).
const readingEstimateProbes = 512

// extrapolate estimates how many isomers exist when n were generated from
// the given fraction (isomers.Stats.Fraction) of the search space; it is n
// when the fraction is unknown, and never below n.
func extrapolate(n int64, fraction float64) int64 {
	if fraction <= 0 || fraction > 1 {
		return n
	}
	return max(n, int64(math.Round(float64(n)/fraction)))
}

func orDefault(s, d string) string {
	if s == "" {
		return d
	}
	return s
}

// totals fills the isomer count, the prior, the search status and the
// budget warnings.
func (r *Ranker) totals(res *Result, st isomers.Stats, timedOut bool, j *job, search *SearchReport) {
	constrained := len(j.require) > 0 || len(j.forbid) > 0
	res.Complete = st.Complete && !timedOut
	switch {
	case search.Scope == ScopeConstrained:
		res.IsomersTotal = res.Generated
		res.IsomersEstimated = !res.Complete
		if res.Complete {
			search.Status = StatusCompleteWithin
		} else {
			search.Status = StatusStopped
		}
	case res.Complete:
		res.IsomersTotal = st.Emitted
		search.Status = StatusComplete
	default:
		search.Status = StatusStopped
		res.IsomersEstimated = true
		res.IsomersTotal = extrapolate(res.Generated, st.Fraction)
	}
	search.Summary = search.summary(res)
	res.Search = *search
	if !res.Complete {
		res.Warnings = append(res.Warnings, search.Summary+" The true structure may be among those not scored: switch constraints off or raise the budget only after checking the ones shown.")
	}
	scope := "scored isomers"
	if search.Scope == ScopeConstrained {
		scope = "scored structures of the searched readings of the spectrum"
	}
	switch {
	case constrained:
		res.Prior = fmt.Sprintf("uniform over the %d %s that pass the plausibility filter and the fragment constraints", res.Scored, scope)
	default:
		res.Prior = fmt.Sprintf("uniform over the %d %s that pass the plausibility filter", res.Scored, scope)
	}
}

// readingsOf returns an analysis's readings (none for nil).
func readingsOf(an *infer.Analysis) []infer.Reading {
	if an == nil {
		return nil
	}
	return an.Readings
}

// poorFitPerPeak is the score per scored peak (nats) below which the best
// candidate of the strict readings leaves the spectrum poorly explained,
// so the relaxed readings are searched too: about a 2.5σ shift miss or a
// contradicted multiplicity on every peak (see Model).
const poorFitPerPeak = -2.5

// poorFitPerCarbonPeak is the same for each 13C peak, nats: a perfect
// match scores about −1.7 (see CarbonModel), a 4σ miss about −6.
const poorFitPerCarbonPeak = -6.0

// bestScore returns the best score kept by any worker.
func bestScore(workers []worker) (float64, bool) {
	best, found := math.Inf(-1), false
	for w := range workers {
		for _, it := range workers[w].top.items {
			if it.score > best {
				best, found = it.score, true
			}
		}
	}
	return best, found
}

// warnUnknownDisabled warns about each ID in Request.Disable that names no
// constraint read from this spectrum: IDs depend on the peaks, so an ID
// from another spectrum's report does nothing, and the user must know.
func (j *job) warnUnknownDisabled(an *infer.Analysis) {
	known := make(map[string]bool, len(an.Constraints))
	for _, c := range an.Constraints {
		known[c.ID] = true
	}
	for _, id := range j.req.Disable {
		if !known[id] {
			j.warnings = append(j.warnings, fmt.Sprintf("disable: no constraint %q was read from this spectrum; nothing was switched off for it", id))
		}
	}
}
