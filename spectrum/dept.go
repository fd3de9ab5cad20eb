package spectrum

import "strings"

// DEPT is the number of hydrogens on the carbon of a 13C peak, as an
// edited experiment tells it (DEPT-135 and DEPT-90, APT, or an edited
// HSQC): CH3, CH2, CH or quaternary C. The zero value means not given.
type DEPT uint8

// The DEPT classes.
const (
	DEPTUnknown DEPT = iota
	CH3
	CH2
	CH
	Cq // quaternary carbon, no hydrogen
)

// String returns "CH3", "CH2", "CH", "C" or "" (not given), the forms
// chemists write beside a 13C shift ("21.4 (CH3)", "171.2 (C)").
func (d DEPT) String() string {
	switch d {
	case CH3:
		return "CH3"
	case CH2:
		return "CH2"
	case CH:
		return "CH"
	case Cq:
		return "C"
	}
	return ""
}

// H returns the number of hydrogens on the carbon (3, 2, 1, 0), or −1
// when the class is not given.
func (d DEPT) H() int {
	switch d {
	case CH3:
		return 3
	case CH2:
		return 2
	case CH:
		return 1
	case Cq:
		return 0
	}
	return -1
}

// deptNames maps accepted spellings (see deptKey) to a class: "CH3",
// "CH₃", "CH2", "CH", "C", "Cq", "Cquat", "quaternary C" and the like, as
// written in experimental sections (common practice).
var deptNames = map[string]DEPT{
	"ch3": CH3, "ch2": CH2, "ch": CH,
	"c": Cq, "cq": Cq, "qc": Cq, "cquat": Cq, "quatc": Cq, "quat": Cq, "quaternary": Cq,
	"quaternaryc": Cq, "cquaternary": Cq, "q(c)": Cq,
}

// deptKey reduces a spelling to lower case without spaces, dots, hyphens
// and underscores, reading subscript digits as digits: "CH₃" → "ch3",
// "C_q" → "cq", "quat. C" → "quatc".
func deptKey(s string) string {
	var b strings.Builder
	for _, r := range strings.TrimSpace(s) {
		switch {
		case r >= '₀' && r <= '₉':
			b.WriteRune('0' + (r - '₀'))
		case r == ' ' || r == '.' || r == '-' || r == '_' || r == '\t':
		default:
			b.WriteString(strings.ToLower(string(r)))
		}
	}
	return b.String()
}

// ParseDEPT reads a DEPT class: "CH3", "CH2", "CH", "C" or "Cq" (also
// "CH₃", "C_q", "Cquat", "quaternary"); case and spaces do not matter, and
// "" is DEPTUnknown. Anything else is a *PeakError with Field "dept".
func ParseDEPT(s string) (DEPT, error) {
	if strings.TrimSpace(s) == "" {
		return DEPTUnknown, nil
	}
	if d, ok := deptNames[deptKey(s)]; ok {
		return d, nil
	}
	return DEPTUnknown, &PeakError{Input: s, Token: s, Field: "dept", Msg: "unknown DEPT class (want CH3, CH2, CH or C)"}
}
