package ranker

import (
	"fmt"
	"runtime"
	"time"

	"shiftrank/spectrum"
)

// Request defaults and limits.
const (
	DefaultMHz           = 400.0
	DefaultSolvent       = spectrum.SolventCDCl3
	DefaultTopK          = 10
	MaxTopK              = 200
	DefaultFilter        = "plausible"
	DefaultMaxCandidates = 2_000_000
	DefaultTimeBudget    = 60 * time.Second
	// DefaultProgressInterval is the least time between two progress
	// callbacks.
	DefaultProgressInterval = 100 * time.Millisecond
)

// Caution is the wording shown with every ranking.
const Caution = "A ranking is a hypothesis to be confirmed against an authentic sample or further spectra; " +
	"it is not for forensic, clinical or safety decisions on its own."

// Request is one ranking job. Zero fields take the defaults named on each.
type Request struct {
	// Formula is the molecular formula ("C4H8O2"), parsed with
	// molecule.ParseFormulaLimit and MaxHeavyAtoms.
	Formula string
	// Peaks is the observed 1H peak list (see spectrum.Read). At least one
	// peak.
	Peaks spectrum.PeakList
	// Carbon is an observed 13C peak list (no peaks: none). When given, it
	// steers the search (see infer) and each candidate's Score adds its
	// 13C log-likelihood to the 1H one (see CarbonModel).
	Carbon spectrum.PeakList
	// MHz is the spectrometer 1H frequency (default: Peaks.MHz, else 400).
	MHz float64
	// Solvent (default: Peaks.Solvent, else CDCl3) decides which peaks are
	// flagged as residual solvent or water.
	Solvent string
	// TopK is the number of candidates returned with explanations
	// (default 10, at most MaxTopK).
	TopK int
	// Filter is the plausibility filter in isomers.ParseFilter syntax
	// (default "plausible").
	Filter string
	// Require and Forbid are fragment SMILES (substructure queries, see
	// molecule.ParseFragment): a candidate must contain every Require
	// fragment and none of the Forbid fragments.
	Require, Forbid []string
	// MaxCandidates stops the generator after this many isomers (default
	// 2,000,000); TimeBudget after this long (default 60 s). A stopped
	// ranking has Result.Complete = false and says so in Warnings.
	MaxCandidates int64
	TimeBudget    time.Duration
	// KeepSolventPeaks scores solvent and water peaks like any other.
	KeepSolventPeaks bool
	// Disable lists IDs of constraints read from the spectrum to switch
	// off (see SearchReport.Constraints); Unconstrained searches every
	// plausible isomer instead, ignoring what the spectrum says.
	Disable       []string
	Unconstrained bool
	// MaxNodes is the search budget in generator nodes (default
	// DefaultMaxNodes): it bounds the work by what is searched, so the
	// same input gives the same ranking on a busy or an idle machine.
	MaxNodes int64
	// Neutral leaves out the charge-separated groups (nitro, N-oxide,
	// azide, diazo, isonitrile; see isomers.ChargeSeparatedGroups).
	Neutral bool
	// MaxHeavyAtoms limits the formula (default molecule.DefaultMaxHeavyAtoms).
	MaxHeavyAtoms int
}

// Progress reports a running ranking: isomers generated so far (after the
// plausibility filter), candidates scored (after fragment constraints), an
// estimate of the total number of isomers (0 while unknown), and for a
// constrained search the readings searched so far out of all.
type Progress struct {
	Generated     int64 `json:"generated"`
	Scored        int64 `json:"scored"`
	TotalEstimate int64 `json:"total_estimate"`
	Readings      int   `json:"readings,omitempty"`
	ReadingsTotal int   `json:"readings_total,omitempty"`
}

// RequestError reports bad input in a Request: Field names the request
// field ("formula", "peaks[2]", "require[0]", "filter", ...), Pos is the
// 0-based byte offset of Token within that field's text (0 when the whole
// field is at fault).
type RequestError struct {
	Field string
	Pos   int
	Token string
	Msg   string
	Err   error // the underlying parse error, if any
}

// Error names the field, the message and, when known, the token and its
// position.
func (e *RequestError) Error() string {
	if e.Token != "" {
		return fmt.Sprintf("%s: %s at position %d (%q)", e.Field, e.Msg, e.Pos, e.Token)
	}
	return fmt.Sprintf("%s: %s", e.Field, e.Msg)
}

// Unwrap returns the underlying parse error, if any.
func (e *RequestError) Unwrap() error { return e.Err }

// Options configures a Ranker. The zero value means the defaults.
type Options struct {
	// Model is the likelihood (zero value: DefaultModel()).
	Model *Model
	// Workers is the number of goroutines generating and scoring
	// (default runtime.GOMAXPROCS(0)).
	Workers int
	// ProgressInterval is the least time between progress callbacks
	// (default 100 ms).
	ProgressInterval time.Duration
	// LineWidthHz is passed to the predictor (default predict's).
	LineWidthHz float64
}

// Ranker ranks isomers against observed spectra. It holds only immutable
// configuration and is safe for concurrent use.
type Ranker struct {
	model    Model
	workers  int
	interval time.Duration
	lineW    float64
}

// New returns a Ranker with opts.
func New(opts Options) *Ranker {
	r := &Ranker{model: DefaultModel(), workers: opts.Workers, interval: opts.ProgressInterval, lineW: opts.LineWidthHz}
	if opts.Model != nil {
		r.model = *opts.Model
	}
	if r.model.Carbon == (CarbonModel{}) {
		r.model.Carbon = DefaultCarbonModel()
	}
	if r.model.Temperature <= 0 {
		r.model.Temperature = 1
	}
	if r.model.Carbon.Temperature <= 0 {
		r.model.Carbon.Temperature = r.model.Temperature
	}
	if r.workers <= 0 {
		r.workers = runtime.GOMAXPROCS(0)
	}
	if r.interval <= 0 {
		r.interval = DefaultProgressInterval
	}
	return r
}

// temperature returns the temperature that turns the job's scores into
// probabilities: the joint one when a 13C list is scored.
func (r *Ranker) temperature(j *job) float64 {
	if len(j.cobs) > 0 {
		return r.model.Carbon.Temperature
	}
	return r.model.Temperature
}

// ObservedPeak is an input peak as the ranking used it.
type ObservedPeak struct {
	Index        int       `json:"index"` // 0-based position in the input list
	Shift        float64   `json:"shift"` // ppm
	ShiftLo      float64   `json:"shift_lo,omitempty"`
	ShiftHi      float64   `json:"shift_hi,omitempty"`
	Multiplicity string    `json:"multiplicity,omitempty"`
	J            []float64 `json:"j,omitempty"`
	Integral     float64   `json:"integral,omitempty"`  // as given
	ImpliedH     float64   `json:"implied_h,omitempty"` // integral scaled to the formula's H count
	Solvent      string    `json:"solvent,omitempty"`   // e.g. "residual CHCl3" when flagged
	Excluded     bool      `json:"excluded,omitempty"`  // not scored (solvent or water)
	Text         string    `json:"text,omitempty"`
}

// Result is the outcome of a ranking; its JSON is the `rank --json`
// output (field names fixed).
type Result struct {
	Formula string `json:"formula"` // Hill notation
	DBE     int    `json:"dbe"`
	// IsomersTotal is the number of isomers passing the plausibility
	// filter: exact when Complete, else an estimate from the fraction of
	// the search space covered (IsomersEstimated).
	IsomersTotal     int64 `json:"isomers_total"`
	IsomersEstimated bool  `json:"isomers_estimated,omitempty"`
	// Generated counts the isomers generated (after the filter), Scored
	// those scored (after fragment constraints).
	Generated int64 `json:"generated"`
	Scored    int64 `json:"scored"`
	// Complete is false when a budget (MaxCandidates, TimeBudget) stopped
	// the generator: probabilities are then over the scored part only.
	Complete bool `json:"complete"`
	// PredictFailures counts isomers the predictor could not handle (not
	// scored).
	PredictFailures int64 `json:"predict_failures,omitempty"`
	// UnprovenAssignments counts candidates whose assignment search hit
	// its node limit (their score is a lower bound of the optimum's).
	UnprovenAssignments int64          `json:"unproven_assignments,omitempty"`
	MHz                 float64        `json:"mhz"`
	Solvent             string         `json:"solvent"`
	Filter              string         `json:"filter"`
	Require             []string       `json:"require,omitempty"`
	Forbid              []string       `json:"forbid,omitempty"`
	Prior               string         `json:"prior"`
	Peaks               []ObservedPeak `json:"peaks"`
	// CarbonPeaks is the observed 13C list as scored (absent without one).
	CarbonPeaks    []ObservedCarbonPeak `json:"carbon_peaks,omitempty"`
	Candidates     []Candidate          `json:"candidates"`
	Warnings       []string             `json:"warnings"`
	Caution        string               `json:"caution"`
	ElapsedSeconds float64              `json:"elapsed_seconds"`
	// Search says what was searched: all isomers or the readings of the
	// spectrum, completely or not, and which constraints applied.
	Search SearchReport `json:"search"`

	logZ float64 // log Σ exp(Score/T) over every scored candidate
}

// Candidate is one ranked structure with its explanation.
type Candidate struct {
	Rank int `json:"rank"` // 1-based
	// SMILES is canonical; atom numbers in the explanation are 0-based
	// indices of the atoms in the order written in this string.
	SMILES string `json:"smiles"`
	// Score is the log-likelihood (nats) of the best assignment: of the
	// 1H list, plus CarbonScore when a 13C list was given.
	Score float64 `json:"score"`
	// CarbonScore is the 13C part of Score (weighted; see CarbonModel),
	// absent without a 13C list.
	CarbonScore float64 `json:"carbon_score,omitempty"`
	// Probability is exp(Score/T) normalised over every scored candidate
	// (uniform prior, T = Model.Temperature, or CarbonModel.Temperature
	// when a 13C list is scored).
	Probability            float64                 `json:"probability"`
	Assignments            []Assignment            `json:"assignments"`
	UnexplainedPeaks       []UnexplainedPeak       `json:"unexplained_peaks"`
	UnobservedEnvironments []UnobservedEnvironment `json:"unobserved_environments"`
	// CarbonAssignments, UnexplainedCarbonPeaks and UnobservedCarbons
	// explain the 13C part of the score the same way, per observed 13C
	// peak and per predicted carbon signal (absent when empty).
	CarbonAssignments      []CarbonAssignment      `json:"carbon_assignments,omitempty"`
	UnexplainedCarbonPeaks []UnexplainedCarbonPeak `json:"unexplained_carbon_peaks,omitempty"`
	UnobservedCarbons      []UnobservedCarbon      `json:"unobserved_carbons,omitempty"`
	// Summary says in one or two sentences why this candidate ranks where
	// it does compared with the next one.
	Summary string   `json:"summary,omitempty"`
	Notes   []string `json:"notes,omitempty"` // predictor remarks
}

// Assignment explains one observed (scored) peak of a candidate.
type Assignment struct {
	Peak          int       `json:"peak"` // index into Result.Peaks (input order)
	ObservedShift float64   `json:"observed_shift"`
	ObservedRange []float64 `json:"observed_range,omitempty"` // [hi, lo] for a range
	// PredictedShift is the H-weighted mean of the assigned environments.
	PredictedShift float64 `json:"predicted_shift"`
	// Environments are the IDs of the predicted environments on this peak;
	// Atoms the atoms carrying their hydrogens (SMILES atom indices).
	Environments []int `json:"environments"`
	Atoms        []int `json:"atoms"`
	// Breakdown is the increment breakdown of the shift (of each
	// environment, labelled when there are several).
	Breakdown             []ShiftTerm `json:"breakdown"`
	ObservedMultiplicity  string      `json:"observed_multiplicity"`
	PredictedMultiplicity string      `json:"predicted_multiplicity"`
	MultiplicityReason    string      `json:"multiplicity_reason"`
	ExpectedH             int         `json:"expected_h"` // assigned predicted H
	ObservedH             float64     `json:"observed_h"` // implied from the integral (0 if none)
	// ScoreShare is this peak's contribution to Score, nats (shift +
	// multiplicity + J + integration + overlap terms).
	ScoreShare float64             `json:"score_share"`
	Terms      ScoreTerms          `json:"terms"`
	Details    []EnvironmentDetail `json:"environment_details"`
}

// ScoreTerms splits a peak's ScoreShare, nats.
type ScoreTerms struct {
	Shift        float64 `json:"shift"`
	Multiplicity float64 `json:"multiplicity"`
	J            float64 `json:"j"`
	Integration  float64 `json:"integration"`
	Overlap      float64 `json:"overlap"` // environments beyond the first on a first-order peak
}

// EnvironmentDetail is one predicted environment on a peak.
type EnvironmentDetail struct {
	Environment           int         `json:"environment"`
	Atoms                 []int       `json:"atoms"`
	H                     int         `json:"h"`     // H of this environment on this peak
	Split                 bool        `json:"split"` // half of a diastereotopic CH2
	Kind                  string      `json:"kind"`
	PredictedShift        float64     `json:"predicted_shift"`
	ShiftMin              float64     `json:"shift_min"`
	ShiftMax              float64     `json:"shift_max"`
	Sigma                 float64     `json:"sigma"`
	Residual              float64     `json:"residual"` // ppm, 0 inside the observed range
	PredictedMultiplicity string      `json:"predicted_multiplicity"`
	J                     []float64   `json:"j,omitempty"`
	Breakdown             []ShiftTerm `json:"breakdown"`
	Reasons               []string    `json:"reasons,omitempty"`
}

// UnexplainedPeak is an observed peak no environment of the candidate
// accounts for.
type UnexplainedPeak struct {
	Peak          int     `json:"peak"`
	ObservedShift float64 `json:"observed_shift"`
	Multiplicity  string  `json:"multiplicity,omitempty"`
	ObservedH     float64 `json:"observed_h"`
	ScoreShare    float64 `json:"score_share"`
}

// UnobservedEnvironment is a predicted environment left without a peak.
type UnobservedEnvironment struct {
	Environment           int     `json:"environment"`
	Atoms                 []int   `json:"atoms"`
	H                     int     `json:"h"`
	Kind                  string  `json:"kind"`
	PredictedShift        float64 `json:"predicted_shift"`
	PredictedMultiplicity string  `json:"predicted_multiplicity"`
	Exchangeable          bool    `json:"exchangeable"`
	ScoreShare            float64 `json:"score_share"`
	Reason                string  `json:"reason"`
}

// ShiftTerm is one entry of a shift's increment breakdown: the base
// value or an increment, ppm. The terms of an environment sum to its
// predicted shift.
type ShiftTerm struct {
	Term string  `json:"term"`
	PPM  float64 `json:"ppm"`
}
