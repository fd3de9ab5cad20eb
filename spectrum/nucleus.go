package spectrum

import (
	"fmt"
	"strings"
)

// Nucleus is the observed nucleus of a peak list. The zero value is 1H, so
// a PeakList built without one is a proton list.
type Nucleus uint8

// The nuclei shiftrank reads.
const (
	H1  Nucleus = iota // 1H
	C13                // 13C
)

// Shift and coupling limits by nucleus. A value outside them is a typing
// error rather than a signal.
const (
	// MinShift1H and MaxShift1H bound a 1H shift, ppm: real 1H signals lie
	// between about −1 (metal hydrides excepted) and 16 ppm (strongly
	// hydrogen-bonded acids and enols); common practice.
	MinShift1H = -1.0
	MaxShift1H = 16.0
	// MinShift13C and MaxShift13C bound a 13C shift, ppm. Carbonyl carbons
	// reach about 220 (cyclopentanone 219, di-tert-butyl ketone 218) and
	// thiocarbonyl carbons about 250; at the low end the heavy-atom effect
	// of iodine takes iodomethane to about −21 and diiodomethane to about
	// −54 (Pretsch, Bühlmann, Badertscher, Structure Determination of
	// Organic Compounds, 13C tables; values from memory). Iodoform (about
	// −140) and CI4 lie outside and are refused.
	MinShift13C = -60.0
	MaxShift13C = 260.0
	// MaxJ1H is the largest accepted coupling in a 1H list, Hz: H–H
	// couplings stay below about 20 Hz and H–F couplings below about
	// 50 Hz (common practice); anything above 100 Hz is a typing error.
	MaxJ1H = 100.0
	// MaxJ13C is the largest accepted coupling in a 13C list, Hz: one-bond
	// C–F couplings reach about 290 Hz (aryl C–F about 245, CF3 about
	// 272) and one-bond C–H couplings in coupled spectra about 250 Hz
	// (alkynes); common practice, from memory.
	MaxJ13C = 400.0
)

// String returns "1H" or "13C".
func (n Nucleus) String() string {
	switch n {
	case H1:
		return "1H"
	case C13:
		return "13C"
	}
	return fmt.Sprintf("Nucleus(%d)", uint8(n))
}

// ShiftRange returns the accepted shifts of the nucleus, ppm.
func (n Nucleus) ShiftRange() (lo, hi float64) {
	if n == C13 {
		return MinShift13C, MaxShift13C
	}
	return MinShift1H, MaxShift1H
}

// MaxJ returns the largest accepted coupling constant of the nucleus, Hz.
func (n Nucleus) MaxJ() float64 {
	if n == C13 {
		return MaxJ13C
	}
	return MaxJ1H
}

// nucleusNames maps accepted spellings (lower case, without "^", spaces
// and hyphens) to a nucleus: the forms of journal headers, JCAMP-DX
// ##.OBSERVE NUCLEUS= values and JSON.
var nucleusNames = map[string]Nucleus{
	"1h": H1, "¹h": H1, "h1": H1, "h": H1, "proton": H1,
	"13c": C13, "¹³c": C13, "c13": C13, "c": C13, "carbon": C13, "carbon13": C13,
}

// ParseNucleus reads a nucleus: "1H", "¹H", "H1", "^1H", "proton", "13C",
// "¹³C", "C13", "^13C", "carbon" (case, spaces and hyphens do not matter).
// Another nucleus ("19F", "31P") or anything else is a *PeakError with
// Field "nucleus".
func ParseNucleus(s string) (Nucleus, error) {
	if n, ok := nucleusNames[nucleusKey(s)]; ok {
		return n, nil
	}
	return 0, &PeakError{Input: s, Token: s, Field: "nucleus", Msg: "not a 1H or 13C nucleus"}
}

func nucleusKey(s string) string {
	return strings.ToLower(strings.NewReplacer("^", "", " ", "", "-", "", "\t", "").Replace(strings.TrimSpace(s)))
}
