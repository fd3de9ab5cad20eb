package molecule

// Element is a chemical element supported by shiftrank. The zero value is
// NoElement. Elements are ordered so that iterating from H to I visits them
// in a fixed, documented order (used by canonical forms); Hill order is
// produced by Formula.String, not by this ordering.
type Element uint8

// The supported elements.
const (
	NoElement Element = iota
	H
	B
	C
	N
	O
	F
	Si
	P
	S
	Cl
	Br
	I
	// NumElements is one more than the largest Element value; use it to
	// size arrays indexed by Element.
	NumElements
)

type elementInfo struct {
	symbol   string
	valences []int   // allowed neutral valences, ascending
	mass     float64 // monoisotopic mass of the most abundant isotope, u
}

// Valences: common practice (neutral, closed-shell, as in the OpenSMILES
// organic subset). Monoisotopic masses: IUPAC/NIST atomic weights and
// isotopic compositions tables, values from memory.
var elementTable = [NumElements]elementInfo{
	NoElement: {"", nil, 0},
	H:         {"H", []int{1}, 1.00782503},
	B:         {"B", []int{3}, 11.00930536},
	C:         {"C", []int{4}, 12.0},
	N:         {"N", []int{3}, 14.00307401},
	O:         {"O", []int{2}, 15.99491462},
	F:         {"F", []int{1}, 18.99840316},
	Si:        {"Si", []int{4}, 27.97692653},
	P:         {"P", []int{3, 5}, 30.97376199},
	S:         {"S", []int{2, 4, 6}, 31.97207117},
	Cl:        {"Cl", []int{1}, 34.96885268},
	Br:        {"Br", []int{1}, 78.9183371},
	I:         {"I", []int{1}, 126.904473},
}

// Symbol returns the element symbol ("C", "Cl"), or "" for NoElement or an
// out-of-range value.
func (e Element) Symbol() string {
	if e >= NumElements {
		return ""
	}
	return elementTable[e].symbol
}

// String returns the element symbol, or "Element(n)" for unknown values.
func (e Element) String() string {
	if s := e.Symbol(); s != "" {
		return s
	}
	return "Element(" + itoa(int(e)) + ")"
}

// Valences returns the allowed neutral valences of e in ascending order
// (C 4; N 3; O 2; S 2, 4, 6; P 3, 5; Si 4; B 3; H and halogens 1). The
// returned slice must not be modified.
func (e Element) Valences() []int {
	if e >= NumElements {
		return nil
	}
	return elementTable[e].valences
}

// MinValence returns the smallest allowed valence of e, or 0 for NoElement.
func (e Element) MinValence() int {
	v := e.Valences()
	if len(v) == 0 {
		return 0
	}
	return v[0]
}

// MaxValence returns the largest allowed valence of e, or 0 for NoElement.
func (e Element) MaxValence() int {
	v := e.Valences()
	if len(v) == 0 {
		return 0
	}
	return v[len(v)-1]
}

// Mass returns the monoisotopic mass of e in unified atomic mass units.
func (e Element) Mass() float64 {
	if e >= NumElements {
		return 0
	}
	return elementTable[e].mass
}

// IsHalogen reports whether e is F, Cl, Br or I.
func (e Element) IsHalogen() bool { return e == F || e == Cl || e == Br || e == I }

// ElementBySymbol returns the element with the given case-sensitive symbol
// ("Cl", not "CL" or "cl").
func ElementBySymbol(sym string) (Element, bool) {
	for e := H; e < NumElements; e++ {
		if elementTable[e].symbol == sym {
			return e, true
		}
	}
	return NoElement, false
}

func itoa(n int) string {
	if n == 0 {
		return "0"
	}
	neg := n < 0
	if neg {
		n = -n
	}
	var b [20]byte
	i := len(b)
	for n > 0 {
		i--
		b[i] = byte('0' + n%10)
		n /= 10
	}
	if neg {
		i--
		b[i] = '-'
	}
	return string(b[i:])
}
