package spectrum

import (
	"fmt"
	"strconv"
	"strings"
)

// Limits applied to every observed peak list, whatever its format.
const (
	// MinShift and MaxShift bound an accepted 1H chemical shift, ppm. Real
	// 1H signals lie between about −1 (metal hydrides excepted) and 16 ppm
	// (strongly hydrogen-bonded acids); common practice.
	MinShift = -1.0
	MaxShift = 16.0
	// MaxJ is the largest accepted coupling constant, Hz. H–H couplings stay
	// below about 20 Hz and H–F couplings below about 50 Hz (common
	// practice); anything above 100 Hz is a typing error.
	MaxJ = 100.0
	// MaxPeakInput is the largest peak-list input accepted, bytes.
	MaxPeakInput = 1 << 20
	// MaxPeaks is the largest number of peaks accepted in one list.
	MaxPeaks = 1000
	// MaxJValues is the largest number of coupling constants accepted for
	// one peak.
	MaxJValues = 12
)

// Peak is one observed 1H signal.
//
// Shift is the centre in ppm: the reported shift, or the midpoint of a
// range. ShiftLo <= ShiftHi bound a range ("7.35–7.20 (m, 5H)"); both equal
// Shift for a single value. Multiplicity is the reported pattern (the zero
// value when not reported), apparent ("app t") and broad ("br s") marks
// included. J lists the coupling constants in Hz in the order given (may
// be empty even for a split signal: J is optional). Integral is the
// relative area as given, possibly fractional; 0 means not given. Label is
// the author's assignment note ("OCH2", "H-3", "exch. D2O"), kept for
// display and never used for scoring. Pos is the byte offset of the peak
// in the input text and Text the original token, for error messages; for
// JSON and JCAMP-DX input they point into that input.
type Peak struct {
	Shift            float64
	ShiftLo, ShiftHi float64
	Multiplicity     Multiplicity
	J                []float64
	Integral         float64
	Label            string
	Pos              int
	Text             string
}

// IsRange reports whether the peak was reported as a shift range.
func (p Peak) IsRange() bool { return p.ShiftLo != p.ShiftHi }

// PeakList is an observed 1H peak list. MHz is the spectrometer 1H
// frequency from the header (0 if absent); Solvent is a canonical solvent
// name as returned by CanonicalSolvent ("CDCl3", "DMSO-d6", ...; "" if
// absent or not recognised). Peaks are in input order.
type PeakList struct {
	MHz     float64
	Solvent string
	Peaks   []Peak
}

// PeakError describes a peak list that cannot be read. Pos is the 0-based
// byte offset of Token in Input; Field names what was being read ("shift",
// "multiplicity", "j", "integral", "header", "mhz", "solvent", or a JSON
// field name or JCAMP-DX label).
type PeakError struct {
	Input string
	Pos   int
	Token string
	Field string
	Msg   string
}

func (e *PeakError) Error() string {
	field := ""
	if e.Field != "" {
		field = e.Field + ": "
	}
	return fmt.Sprintf("peak list: %s%s at position %d (%q)", field, e.Msg, e.Pos, e.Token)
}

// String writes the list in journal notation, for example
//
//	1H NMR (400 MHz, CDCl3) δ 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H)
//
// Numbers are written in their shortest exact form, so ParsePeaks of the
// result gives back the same list (apart from Pos and Text).
func (pl PeakList) String() string {
	var b strings.Builder
	b.WriteString("1H NMR")
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
// "7.35–7.20 (m, 5H)". A range is written high to low with an en dash.
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
// range, with a non-negative integral and at most MaxJValues J values
// within 0 to MaxJ Hz, and no J on a singlet. It returns nil or a
// *PeakError whose Field is "peaks" or "peaks[i].field" (i the 0-based
// peak index) and whose Pos and Token are the peak's Pos and Text.
func (pl PeakList) Check() error {
	switch {
	case len(pl.Peaks) == 0:
		return &PeakError{Field: "peaks", Msg: "no peaks"}
	case len(pl.Peaks) > MaxPeaks:
		return &PeakError{Field: "peaks", Msg: fmt.Sprintf("%d peaks exceed the limit of %d", len(pl.Peaks), MaxPeaks)}
	}
	for i, p := range pl.Peaks {
		if field, msg := checkPeak(p); msg != "" {
			return &PeakError{Pos: p.Pos, Token: p.Text, Field: fmt.Sprintf("peaks[%d].%s", i, field), Msg: msg}
		}
	}
	return nil
}

// checkPeak applies the validation shared by every input format. It
// returns a message and the field it concerns, or "" when the peak is
// acceptable.
func checkPeak(p Peak) (field, msg string) {
	for _, s := range []float64{p.ShiftLo, p.ShiftHi} {
		if s < MinShift || s > MaxShift {
			return "shift", fmt.Sprintf("shift %s ppm outside %g to %g ppm", peakNum(s), MinShift, MaxShift)
		}
	}
	if p.Integral < 0 {
		return "integral", "negative integral"
	}
	if len(p.J) > MaxJValues {
		return "j", fmt.Sprintf("more than %d J values", MaxJValues)
	}
	for _, j := range p.J {
		if !(j > 0) || j > MaxJ {
			return "j", fmt.Sprintf("J = %s Hz outside 0 to %g Hz", peakNum(j), MaxJ)
		}
	}
	if len(p.J) > 0 && p.Multiplicity.IsSinglet() {
		return "j", "J given for a singlet"
	}
	return "", ""
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
