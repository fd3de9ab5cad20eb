package spectrum

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// Limits applied to every observed peak list, whatever its format. The
// shift and coupling limits depend on the nucleus (see Nucleus.ShiftRange
// and Nucleus.MaxJ).
const (
	// MaxPeakInput is the largest peak-list input accepted, bytes.
	MaxPeakInput = 1 << 20
	// MaxPeaks is the largest number of peaks accepted in one list.
	MaxPeaks = 1000
	// MaxJValues is the largest number of coupling constants accepted for
	// one peak.
	MaxJValues = 12
	// MaxCount is the largest number of carbons accepted for one 13C peak
	// ("(2C)"); more than the heavy atoms of any formula shiftrank ranks.
	MaxCount = 100
)

// Peak is one observed signal of a 1H or 13C list.
//
// Shift is the centre in ppm: the reported shift, or the midpoint of a
// range. ShiftLo <= ShiftHi bound a range ("7.35–7.20 (m, 5H)"); both equal
// Shift for a single value. Multiplicity is the reported pattern (the zero
// value when not reported), apparent ("app t") and broad ("br s") marks
// included; in a 13C list it is the splitting by other nuclei (a C–F
// doublet). J lists the coupling constants in Hz in the order given (may
// be empty even for a split signal: J is optional). Label is the author's
// assignment note ("OCH2", "H-3", "exch. D2O", "C=O"), kept for display
// and never used for scoring. Pos is the byte offset of the peak in the
// input and Text the original token, for error messages.
//
// A 1H peak has an Integral: the relative area as given, possibly
// fractional; 0 means not given. A 13C peak has instead a Count, the
// number of equivalent carbons the author attributes to it ("129.3 (2C)";
// 0 means not given), and a DEPT class (DEPTUnknown when not given).
type Peak struct {
	Shift            float64
	ShiftLo, ShiftHi float64
	Multiplicity     Multiplicity
	J                []float64
	Integral         float64
	Count            int
	DEPT             DEPT
	Label            string
	Pos              int
	Text             string
}

// IsRange reports whether the peak was reported as a shift range.
func (p Peak) IsRange() bool { return p.ShiftLo != p.ShiftHi }

// PeakList is one observed peak list. Nucleus is the observed nucleus
// (zero value: 1H). MHz is the spectrometer frequency of that nucleus as
// the input states it (0 if absent): about 101 MHz for the 13C list of a
// 400 MHz instrument. Solvent is a canonical solvent name as returned by
// CanonicalSolvent ("CDCl3", "DMSO-d6", ...; "" if absent or not
// recognised). Pos is the byte offset in the input where the list starts
// (its header, or its first peak). Peaks are in input order.
type PeakList struct {
	Nucleus Nucleus
	MHz     float64
	Solvent string
	Pos     int
	Peaks   []Peak
}

// PeakError describes a peak list that cannot be read. Pos is the 0-based
// byte offset of Token in Input and Line its 1-based line (0 when the
// error concerns no position, such as a list built by hand); Field names
// what was being read ("shift", "multiplicity", "j", "integral", "count",
// "dept", "header", "mhz", "solvent", "nucleus", a JSON path such as
// "peaks[1].j", or a JCAMP-DX label).
type PeakError struct {
	Input string
	Pos   int
	Line  int
	Token string
	Field string
	Msg   string
}

// newPeakError returns a *PeakError with Line worked out from Input and
// Pos.
func newPeakError(input string, pos int, tok, field, msg string) *PeakError {
	line := 0
	if pos >= 0 && pos <= len(input) {
		line = 1 + strings.Count(input[:pos], "\n")
	}
	return &PeakError{Input: input, Pos: pos, Line: line, Token: tok, Field: field, Msg: msg}
}

// Error names the field, the message, the line (for input of several
// lines), the byte position and the token.
func (e *PeakError) Error() string {
	field := ""
	if e.Field != "" {
		field = e.Field + ": "
	}
	line := ""
	if e.Line > 1 || e.Line == 1 && strings.Contains(e.Input, "\n") {
		line = fmt.Sprintf("line %d, ", e.Line)
	}
	return fmt.Sprintf("peak list: %s%s at %sposition %d (%q)", field, e.Msg, line, e.Pos, e.Token)
}

// String writes the list in journal notation, for example
//
//	1H NMR (400 MHz, CDCl3) δ 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H)
//	13C NMR (101 MHz, CDCl3) δ 171.1 (C), 60.4 (CH2), 21.0 (CH3), 14.2 (CH3)
//
// Numbers are written in their shortest exact form, so ParseText of the
// result gives back the same list (apart from Pos and Text).
func (pl PeakList) String() string {
	var b strings.Builder
	b.WriteString(pl.Nucleus.String() + " NMR")
	var head []string
	if pl.MHz > 0 {
		head = append(head, peakNum(pl.MHz)+" MHz")
	}
	if pl.Solvent != "" {
		head = append(head, pl.Solvent)
	}
	if len(head) > 0 {
		b.WriteString(" (" + strings.Join(head, ", ") + ")")
	}
	b.WriteString(" δ ")
	for i, p := range pl.Peaks {
		if i > 0 {
			b.WriteString(", ")
		}
		b.WriteString(p.String())
	}
	return b.String()
}

// String writes one peak in journal notation: "4.12 (q, J = 7.1 Hz, 2H)",
// "7.35–7.20 (m, 5H)", "129.3 (2C, CH)". A range is written high to low
// with an en dash.
func (p Peak) String() string {
	var b strings.Builder
	if p.IsRange() {
		b.WriteString(peakNum(p.ShiftHi) + "–" + peakNum(p.ShiftLo))
	} else {
		b.WriteString(peakNum(p.Shift))
	}
	var items []string
	if p.Multiplicity.IsReported() {
		items = append(items, p.Multiplicity.String())
	}
	if len(p.J) > 0 {
		js := make([]string, len(p.J))
		for i, j := range p.J {
			js[i] = peakNum(j)
		}
		items = append(items, "J = "+strings.Join(js, ", ")+" Hz")
	}
	if p.Integral != 0 {
		items = append(items, peakNum(p.Integral)+"H")
	}
	if p.Count != 0 {
		items = append(items, strconv.Itoa(p.Count)+"C")
	}
	if p.DEPT != DEPTUnknown {
		items = append(items, p.DEPT.String())
	}
	if p.Label != "" {
		items = append(items, p.Label)
	}
	if len(items) > 0 {
		b.WriteString(" (" + strings.Join(items, ", ") + ")")
	}
	return b.String()
}

func peakNum(x float64) string { return strconv.FormatFloat(x, 'f', -1, 64) }

// Check applies the validation every reader applies, for a list built by
// hand: at least one and at most MaxPeaks peaks, each within the shift
// range of the nucleus, with at most MaxJValues J values within 0 to the
// nucleus's MaxJ, no J on a singlet; a 1H peak with a non-negative
// integral and neither count nor DEPT class, a 13C peak without an
// integral and with a count of 0 to MaxCount. It returns nil or a
// *PeakError whose Field is "peaks" or "peaks[i].field" (i the 0-based
// peak index) and whose Pos and Token are the peak's Pos and Text.
func (pl PeakList) Check() error {
	switch {
	case pl.Nucleus != H1 && pl.Nucleus != C13:
		return &PeakError{Field: "nucleus", Token: pl.Nucleus.String(), Msg: "not a 1H or 13C list"}
	case len(pl.Peaks) == 0:
		return &PeakError{Field: "peaks", Msg: "no peaks"}
	case len(pl.Peaks) > MaxPeaks:
		return &PeakError{Field: "peaks", Msg: fmt.Sprintf("%d peaks exceed the limit of %d", len(pl.Peaks), MaxPeaks)}
	}
	for i, p := range pl.Peaks {
		if field, msg := checkPeak(pl.Nucleus, p); msg != "" {
			return &PeakError{Pos: p.Pos, Token: p.Text, Field: fmt.Sprintf("peaks[%d].%s", i, field), Msg: msg}
		}
	}
	return nil
}

// checkPeak applies the validation shared by every input format. It
// returns a message and the field it concerns, or "" when the peak is
// acceptable.
func checkPeak(n Nucleus, p Peak) (field, msg string) {
	lo, hi := n.ShiftRange()
	for _, s := range []float64{p.ShiftLo, p.ShiftHi} {
		if !(s >= lo && s <= hi) {
			return "shift", shiftRangeMsg(n, s)
		}
	}
	if math.IsNaN(p.Shift) || math.IsInf(p.Shift, 0) {
		return "shift", "shift is not a number"
	}
	switch {
	case p.Integral < 0:
		return "integral", "negative integral"
	case n == C13 && p.Integral != 0:
		return "integral", "an integral in a 13C list: give the number of carbons as a count"
	case n == H1 && p.Count != 0:
		return "count", "a carbon count in a 1H list"
	case n == H1 && p.DEPT != DEPTUnknown:
		return "dept", "a DEPT class in a 1H list"
	case p.Count < 0 || p.Count > MaxCount:
		return "count", fmt.Sprintf("carbon count outside 1 to %d", MaxCount)
	case p.DEPT > Cq:
		return "dept", "unknown DEPT class"
	}
	if len(p.J) > MaxJValues {
		return "j", fmt.Sprintf("more than %d J values", MaxJValues)
	}
	for _, j := range p.J {
		if !(j > 0) || j > n.MaxJ() {
			return "j", fmt.Sprintf("J = %s Hz outside 0 to %g Hz", peakNum(j), n.MaxJ())
		}
	}
	if len(p.J) > 0 && p.Multiplicity.IsSinglet() {
		return "j", "J given for a singlet"
	}
	return "", ""
}

// shiftRangeMsg is the error message for a shift s outside the range of
// nucleus n.
func shiftRangeMsg(n Nucleus, s float64) string {
	lo, hi := n.ShiftRange()
	msg := fmt.Sprintf("shift %s ppm outside %g to %g ppm", peakNum(s), lo, hi)
	if n == H1 && s > hi && s <= MaxShift13C {
		msg += " for 1H (a 13C list needs a 13C header or nucleus)"
	}
	return msg
}

// setShift fills the shift fields of p from two bounds in either order.
func (p *Peak) setShift(a, b float64) {
	if a > b {
		a, b = b, a
	}
	p.ShiftLo, p.ShiftHi = a, b
	if a == b {
		p.Shift = a
	} else {
		p.Shift = (a + b) / 2
	}
}
