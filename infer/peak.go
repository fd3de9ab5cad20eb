package infer

import "math"

// Peak is one observed 1H signal as Infer reads it (solvent and water
// signals already left out).
type Peak struct {
	// Number is the peak's 1-based position in the user's list; messages
	// and constraint IDs use it.
	Number int
	// Shift is the reported shift, ppm; Lo ≤ Hi its reported range (both
	// Shift for a single value).
	Shift, Lo, Hi float64
	// H is the integral scaled to the formula's hydrogen count (implied
	// hydrogens, fractional); 0 when the peak has no integral.
	H       float64
	Pattern Pattern
}

// Pattern is a reported multiplicity.
type Pattern struct {
	Kind PatternKind
	// Broad and Apparent mark "br" and "app" signals.
	Broad, Apparent bool
	// Lines holds the line count of each coupling (n+1: d 2, t 3, q 4,
	// quint 5, ...), first coupling first; empty for a singlet.
	Lines []int
	// J are the reported coupling constants, Hz, largest first as
	// written; matched to Lines when there are as many.
	J []float64
}

// PatternKind says how much a reported multiplicity tells.
type PatternKind uint8

// The pattern kinds.
const (
	// FirstOrder is a singlet or an n+1 pattern (d, t, q, dd, dt, ...).
	FirstOrder PatternKind = iota
	// Multiplet is an unresolved or higher-order signal ("m").
	Multiplet
	// Unreported means no multiplicity was given.
	Unreported
)

// singlet reports a sharp singlet.
func (p Pattern) singlet() bool {
	return p.Kind == FirstOrder && len(p.Lines) == 0 && !p.Broad
}

// resolved reports a sharp first-order pattern with couplings.
func (p Pattern) resolved() bool {
	return p.Kind == FirstOrder && len(p.Lines) > 0 && !p.Broad
}

// partners returns the number of coupling partners (n+1 rule).
func (p Pattern) partners() int {
	n := 0
	for _, l := range p.Lines {
		n += l - 1
	}
	return n
}

// couplings returns each coupling's J with its partner count, when the J
// values can be matched to the line counts (as many J as couplings, or
// one J for a single coupling); ok is false otherwise.
func (p Pattern) couplings() (js []float64, counts []int, ok bool) {
	if len(p.Lines) == 0 || len(p.J) != len(p.Lines) {
		return nil, nil, false
	}
	for k, l := range p.Lines {
		js = append(js, p.J[k])
		counts = append(counts, l-1)
	}
	return js, counts, true
}

// partnersAbove returns the number of partners coupled with J ≥ min Hz;
// known is false when the J values cannot be matched to the couplings.
func (p Pattern) partnersAbove(min float64) (n int, known bool) {
	js, counts, ok := p.couplings()
	if !ok {
		return 0, false
	}
	for k, j := range js {
		if j >= min {
			n += counts[k]
		}
	}
	return n, true
}

// hasJ reports whether the pattern carries a coupling within jMatch of j,
// in [lo, hi].
func (p Pattern) hasJ(j, lo, hi float64) bool {
	for _, x := range p.J {
		if x >= lo && x <= hi && math.Abs(x-j) <= jMatch {
			return true
		}
	}
	return false
}

// jIn returns the reported couplings within [lo, hi].
func (p Pattern) jIn(lo, hi float64) []float64 {
	var out []float64
	for _, x := range p.J {
		if x >= lo && x <= hi {
			out = append(out, x)
		}
	}
	return out
}
