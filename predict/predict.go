package predict

import (
	"errors"
	"fmt"
	"sync"

	"shiftrank/molecule"
	"shiftrank/spectrum"
)

// Options configures a Predictor. The zero value means the defaults.
type Options struct {
	// MHz is the spectrometer 1H frequency in MHz (default 400). It sets
	// the Hz separation of shifts, which decides when a multiplet is
	// strongly coupled and reported as "m".
	MHz float64
	// LineWidthHz is the natural line width (full width at half height) in
	// Hz (default 1.0). Couplings smaller than about 1.5 line widths are
	// treated as unresolved.
	LineWidthHz float64
	// Explain fills Environment.Breakdown and Environment.Reasons (slower:
	// it allocates strings). Scoring many candidates should leave it off
	// and re-predict the few it shows.
	Explain bool
}

// Default option values.
const (
	DefaultMHz         = 400.0
	DefaultLineWidthHz = 1.0
)

// Predictor predicts 1H spectra. It holds immutable configuration and a
// pool of scratch space, and is safe for concurrent use by multiple
// goroutines. Predicting a molecule of about eight heavy atoms with Explain
// off takes a few microseconds (BenchmarkPredict).
type Predictor struct {
	opts Options
	// work reuses scratch space across calls (a molecule.Canonicalizer
	// and the per-molecule arrays are not safe for concurrent use; the
	// pool is).
	work sync.Pool
}

// New returns a Predictor. Zero or negative MHz or LineWidthHz take the
// defaults (400 MHz, 1.0 Hz).
func New(opts Options) *Predictor {
	if !(opts.MHz > 0) {
		opts.MHz = DefaultMHz
	}
	if !(opts.LineWidthHz > 0) {
		opts.LineWidthHz = DefaultLineWidthHz
	}
	p := &Predictor{opts: opts}
	p.work.New = func() any { return new(work) }
	return p
}

// Options returns the Predictor's options with defaults applied.
func (p *Predictor) Options() Options { return p.opts }

// Spectrum is a predicted 1H spectrum: one Environment per set of
// equivalent hydrogens, ordered by decreasing Shift (ties by the lowest
// atom index). The H counts of the environments add up to the molecule's
// hydrogen count.
type Spectrum struct {
	Environments []Environment
	// Notes are remarks about the whole prediction (for example a spin
	// system too large for the full simulation).
	Notes []string

	// spins holds group-level couplings for Simulate (Explain only).
	spins *spinTable
}

// HydrogenCount returns the sum of the environments' H counts.
func (s *Spectrum) HydrogenCount() int {
	n := 0
	for i := range s.Environments {
		n += s.Environments[i].H
	}
	return n
}

// Environment is a set of symmetry-equivalent hydrogens and its predicted
// signal.
type Environment struct {
	// ID is the index of the environment in Spectrum.Environments.
	ID int
	// Atoms are the heavy atoms carrying these hydrogens (indices of the
	// input graph, ascending). Two environments may share an atom: the two
	// hydrogens of a terminal =CH2 or of an amide NH2 can be inequivalent.
	Atoms []int
	// H is the number of hydrogens (the integration).
	H int
	// Kind names the kind of hydrogen, e.g. "CH3 (sp3)", "aromatic CH",
	// "OH (alcohol)", "CHO (aldehyde)".
	Kind string
	// Shift is the predicted chemical shift δ in ppm relative to TMS.
	Shift float64
	// Sigma is the uncertainty of Shift in ppm (one standard deviation);
	// it depends on the kind of hydrogen and grows for hydrogens outside
	// the increment tables.
	Sigma float64
	// ShiftMin and ShiftMax bound the expected shift: the E/Z range of an
	// alkene hydrogen whose configuration the constitution does not fix,
	// the wide range of an exchangeable hydrogen. Both equal Shift
	// otherwise.
	ShiftMin, ShiftMax float64
	// Pattern is the expected first-order appearance in typed form: a
	// singlet, an n+1 pattern ("d" to "sept"), a compound of d, t and q
	// factors of at most 16 lines ("dd", "dt", "td", "tt", "dq", "qd",
	// "ddd"), a multiplet, or a broad singlet. Scoring compares it with
	// the observed spectrum.Multiplicity without reading text.
	Pattern spectrum.Multiplicity
	// Multiplicity is Pattern written as its code ("s", "dt", "m",
	// "br s"), for reports.
	Multiplicity string
	// Couplings lists every predicted coupling of one hydrogen of this
	// environment, resolved or not, largest J first.
	Couplings []Coupling
	// J lists the distinct resolved coupling constants in Hz, largest
	// first, as a chemist would quote them for Multiplicity (empty for
	// "s", "br s" and usually for "m").
	J []float64
	// Exchangeable is set for O–H, N–H and S–H hydrogens, which exchange
	// fast enough to appear as broad singlets over a wide shift range.
	Exchangeable bool
	// Diastereotopic is set for a CH2 whose two hydrogens are not
	// interchangeable by symmetry (a stereocentre in the molecule, a
	// ring whose faces differ, or a prochiral centre that replacing either
	// H turns into a second stereocentre); they may appear as two signals.
	// It is also set for an environment of two CH3 groups on one atom that
	// are not equivalent in space: on an alkene carbon, cis and trans to
	// different groups ((CH3)2C=CH–), or an isopropyl group in a molecule
	// with a stereocentre. The ranker may then put each group on its own
	// peak.
	Diastereotopic bool
	// SlowExchangeH counts the hydrogens three bonds away that couple with
	// this environment only when exchange is slow: for a C–H, the N–H, O–H
	// or S–H hydrogens on its neighbouring atoms; for an exchangeable
	// hydrogen, the C–H hydrogens on the atoms next to its own. Such
	// couplings are left out of Multiplicity (fast exchange, the n+1 rule's
	// usual exception), but an amide N–H or an O–H in dry CDCl3 often
	// shows them (common practice), so an observed extra splitting by up
	// to this many hydrogens is compatible.
	SlowExchangeH int
	// LongRangeH counts the hydrogens four bonds away across a C=C bond
	// (allylic ⁴J, H–C=C–C–H, about 1–2 Hz; common practice): left out of
	// Multiplicity because they are usually unresolved, but a resolved one
	// (the q of a propenyl =CH reported "dq") is compatible. Hydrogens of
	// other small couplings predicted below the line width (heteroaromatic
	// ⁴J of 0.8 Hz and more) count too.
	LongRangeH int
	// Breakdown is the shift's derivation: base value and increments in
	// ppm that sum to Shift (Options.Explain only).
	Breakdown []Term
	// Reasons explain the shift, grouping and multiplicity in words
	// (Options.Explain only, except warnings about fallback values, which
	// are always present).
	Reasons []string
}

// Coupling is the coupling of one hydrogen of an environment to a set of
// equivalent nuclei.
type Coupling struct {
	// Env is the ID of the coupled environment, or -1 for a heteronucleus
	// (see Nucleus).
	Env int
	// N is the number of equivalent coupled nuclei.
	N int
	// J is the coupling constant in Hz (positive; signs are not predicted).
	J float64
	// Label names the kind of coupling: "vicinal sp3", "alkene trans",
	// "aromatic ortho", "2J H–F", ...
	Label string
	// Nucleus is "" for 1H, or "19F" / "31P" for heteronuclear couplings.
	Nucleus string
	// Resolved reports whether J is large enough to be seen at the
	// configured line width (it counts in Multiplicity).
	Resolved bool
	// Atoms are the heavy atoms carrying the coupled hydrogens (or the F/P
	// atoms).
	Atoms []int
}

// Term is one entry of a shift breakdown.
type Term struct {
	Term string  `json:"term"`
	PPM  float64 `json:"ppm"`
}

// ErrEmpty is returned by Predict for a nil or empty graph.
var ErrEmpty = errors.New("predict: empty molecule")

// GraphError reports a graph Predict cannot interpret: an element it has no
// data for, a bond to a missing atom, a negative hydrogen count.
type GraphError struct {
	Atom int // atom index, or -1
	Msg  string
}

func (e *GraphError) Error() string {
	if e.Atom < 0 {
		return "predict: " + e.Msg
	}
	return fmt.Sprintf("predict: atom %d: %s", e.Atom, e.Msg)
}

// Predict returns the predicted 1H spectrum of g. g is not modified; it
// must be a kekulised molecular graph (bond orders 1–3) of the elements
// molecule supports. Charged atoms are accepted but predicted as if neutral
// (with a Reason saying so). A molecule without hydrogens gives a Spectrum
// without environments. Errors: ErrEmpty, *GraphError.
func (p *Predictor) Predict(g *molecule.Graph) (*Spectrum, error) {
	if g == nil || len(g.Atoms) == 0 {
		return nil, ErrEmpty
	}
	if err := checkGraph(g); err != nil {
		return nil, err
	}
	w := p.work.Get().(*work)
	m := w.analyse(g)
	sp := p.predict(m, w)
	p.work.Put(w)
	return sp, nil
}

func checkGraph(g *molecule.Graph) error {
	for i, a := range g.Atoms {
		if a.Element <= molecule.H || a.Element >= molecule.NumElements {
			return &GraphError{Atom: i, Msg: fmt.Sprintf("unsupported element %v", a.Element)}
		}
		if a.HCount < 0 || a.HCount > 8 {
			return &GraphError{Atom: i, Msg: fmt.Sprintf("hydrogen count %d out of range 0–8", a.HCount)}
		}
	}
	for i, b := range g.Bonds {
		if b.A < 0 || b.B < 0 || b.A >= len(g.Atoms) || b.B >= len(g.Atoms) || b.A == b.B {
			return &GraphError{Atom: -1, Msg: fmt.Sprintf("bond %d joins invalid atoms %d-%d", i, b.A, b.B)}
		}
		if b.Order < molecule.Single || b.Order > molecule.Aromatic {
			return &GraphError{Atom: -1, Msg: fmt.Sprintf("bond %d has invalid order %d", i, b.Order)}
		}
	}
	return nil
}
