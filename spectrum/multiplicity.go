package spectrum

import (
	"fmt"
	"strings"
)

// Multiplicity is the splitting pattern of a signal, read once where the
// text enters and compared as a value afterwards: not reported (the zero
// value), a first-order pattern given as its n+1 factors (a singlet has
// none; "d" is [2], "t" [3], "q" [4], "quint" [5] up to "non" [9]; a
// compound such as "dt" is [2 3], first factor first, each 2 to 4, at most
// MaxFactors of them), or a multiplet ("m": lines not resolved into a
// first-order pattern, including the second-order AB quartet and AA'BB'
// systems). Either may be broad ("br s") and apparent ("app t": the lines
// look like the pattern but need not be first order).
//
// Multiplicity is comparable: == compares every property, SamePattern the
// splitting alone.
type Multiplicity struct {
	shape    shape
	n        uint8             // number of factors
	factors  [MaxFactors]uint8 // line counts, first factor first; 0 = unused
	broad    bool
	apparent bool
}

type shape uint8

const (
	shapeUnreported shape = iota
	shapeFirstOrder
	shapeMultiplet
)

// MaxFactors is the largest number of n+1 factors of a compound pattern
// ("ddddd").
const MaxFactors = 5

// Singlet returns the multiplicity "s".
func Singlet() Multiplicity { return Multiplicity{shape: shapeFirstOrder} }

// Multiplet returns the multiplicity "m".
func Multiplet() Multiplicity { return Multiplicity{shape: shapeMultiplet} }

// Split returns the first-order pattern with the given n+1 factors (line
// counts), first factor first: Split(3) is "t", Split(2, 3) is "dt". A
// single factor may be 2 to 9; the factors of a compound pattern 2 to 4,
// at most MaxFactors of them. Split() is the singlet. Other arguments are
// a programming error and panic.
func Split(lines ...int) Multiplicity {
	m := Multiplicity{shape: shapeFirstOrder}
	if len(lines) > MaxFactors {
		panic(fmt.Sprintf("spectrum: Split with %d factors, at most %d", len(lines), MaxFactors))
	}
	for _, l := range lines {
		if l < 2 || l > 9 || len(lines) > 1 && l > 4 {
			panic(fmt.Sprintf("spectrum: Split factor %d of %v out of range", l, lines))
		}
		m.factors[m.n] = uint8(l)
		m.n++
	}
	return m
}

// WithBroad returns m marked broad (b true) or not. The unreported
// multiplicity is returned unchanged: broad alone reads as a broad singlet
// (see ParseMultiplicity).
func (m Multiplicity) WithBroad(b bool) Multiplicity {
	if m.shape != shapeUnreported {
		m.broad = b
	}
	return m
}

// WithApparent returns m marked apparent (a true) or not. The unreported
// multiplicity is returned unchanged.
func (m Multiplicity) WithApparent(a bool) Multiplicity {
	if m.shape != shapeUnreported {
		m.apparent = a
	}
	return m
}

// IsReported reports whether a multiplicity was given.
func (m Multiplicity) IsReported() bool { return m.shape != shapeUnreported }

// IsFirstOrder reports whether m is a singlet or a first-order pattern.
func (m Multiplicity) IsFirstOrder() bool { return m.shape == shapeFirstOrder }

// IsSinglet reports whether m is a singlet, broad, apparent or not.
func (m Multiplicity) IsSinglet() bool { return m.shape == shapeFirstOrder && m.n == 0 }

// IsMultiplet reports whether m is "m" (broad or not).
func (m Multiplicity) IsMultiplet() bool { return m.shape == shapeMultiplet }

// Broad reports whether the signal was reported broad.
func (m Multiplicity) Broad() bool { return m.broad }

// Apparent reports whether the pattern was reported as apparent.
func (m Multiplicity) Apparent() bool { return m.apparent }

// NumFactors returns the number of n+1 factors: 0 for a singlet, a
// multiplet and the unreported multiplicity.
func (m Multiplicity) NumFactors() int { return int(m.n) }

// Factor returns the line count of factor i (0 ≤ i < NumFactors()): 2 for
// a doublet, 3 for a triplet, ...
func (m Multiplicity) Factor(i int) int { return int(m.factors[i]) }

// Partners returns the number of coupling partners the n+1 rule implies:
// the sum of factor − 1 ("q" 3, "dt" 1 + 2 = 3); 0 for anything but a
// split first-order pattern.
func (m Multiplicity) Partners() int {
	n := 0
	for k := uint8(0); k < m.n; k++ {
		n += int(m.factors[k]) - 1
	}
	return n
}

// SamePattern reports whether m and o have the same shape and factors,
// whether broad or apparent or not.
func (m Multiplicity) SamePattern(o Multiplicity) bool {
	return m.shape == o.shape && m.n == o.n && m.factors == o.factors
}

// singleNames are the codes of one n+1 factor, indexed by line count.
var singleNames = [...]string{2: "d", 3: "t", 4: "q", 5: "quint", 6: "sext", 7: "sept", 8: "oct", 9: "non"}

// Code returns the normalised code without the apparent mark: "" (not
// reported), "s", "d", "t", "q", "quint", "sext", "sept", "oct", "non", a
// compound of d, t and q ("dt"), "m", each possibly prefixed "br ". It is
// the form stored in the multiplicity fields of JSON output, beside a
// separate apparent flag.
func (m Multiplicity) Code() string {
	var base string
	switch {
	case m.shape == shapeUnreported:
		return ""
	case m.shape == shapeMultiplet:
		base = "m"
	case m.n == 0:
		base = "s"
	case m.n == 1:
		base = singleNames[m.factors[0]]
	default:
		b := make([]byte, m.n)
		for k := uint8(0); k < m.n; k++ {
			b[k] = "..dtq"[m.factors[k]]
		}
		base = string(b)
	}
	if m.broad {
		return "br " + base
	}
	return base
}

// String returns Code prefixed "app " when the pattern is apparent
// ("app t", "app br s"); ParseMultiplicity reads it back.
func (m Multiplicity) String() string {
	if m.apparent {
		return "app " + m.Code()
	}
	return m.Code()
}

// multiplicityWords maps every accepted spelling of a simple multiplicity
// (after lower-casing) to its canonical code. The codes and their usual
// spellings are common practice in journal experimental sections.
var multiplicityWords = map[string]string{
	"s": "s", "singlet": "s", "sing": "s",
	"d": "d", "doublet": "d", "doublets": "d",
	"t": "t", "triplet": "t", "triplets": "t", "tr": "t",
	"q": "q", "quartet": "q", "quartets": "q", "quart": "q",
	"quint": "quint", "quin": "quint", "quintet": "quint", "p": "quint", "pent": "quint",
	"pentet": "quint", "pentuplet": "quint", "qui": "quint", "qn": "quint",
	"sext": "sext", "sextet": "sext", "sex": "sext", "sx": "sext", "hex": "sext", "hextet": "sext",
	"sept": "sept", "septet": "sept", "hept": "sept", "heptet": "sept", "septuplet": "sept", "sep": "sept",
	"oct": "oct", "octet": "oct",
	"non": "non", "nonet": "non",
	"m": "m", "mult": "m", "multiplet": "m", "multiplets": "m", "cm": "m", "complex": "m",
	// An AB quartet (or an AA'BB' system) is not first order: reported as a
	// multiplet so that scoring does not read it as a q.
	"abq": "m", "ab": "m", "aa'bb'": "m", "aa′bb′": "m", "abx": "m",
}

// codeLines maps the canonical code of one factor to its line count.
var codeLines = map[string]int{"d": 2, "t": 3, "q": 4, "quint": 5, "sext": 6, "sept": 7, "oct": 8, "non": 9}

// compoundLetters maps the words of "doublet of triplets" style names to
// the letter they contribute.
var compoundLetters = map[string]string{
	"doublet": "d", "doublets": "d", "triplet": "t", "triplets": "t",
	"quartet": "q", "quartets": "q",
}

// ParseMultiplicity reads a multiplicity as written in a journal peak
// list: "s", "d", "t", "q", "quint" (also "p", "quin", "pent"), "sext",
// "sept" (also "hept"), "oct", "non", compounds of up to MaxFactors d/t/q
// letters ("dd", "dt", "td", "ddd", "dq", "qd", "tt"; also "doublet of
// triplets"), "m" (also "AB q" and "AA'BB'", which are not first order),
// and any of those marked broad ("br s", "br. s", "brs", "bs", "br",
// "broad singlet") or apparent (a leading "app", "apparent", "pseudo" or
// "ps"). Case and inner white space do not matter; "" is the unreported
// multiplicity. Anything else is a *PeakError with Field "multiplicity"
// and the whole of s as Token.
func ParseMultiplicity(s string) (Multiplicity, error) {
	if strings.TrimSpace(s) == "" {
		return Multiplicity{}, nil
	}
	m, ok := parseMultiplicity(s)
	if !ok {
		return Multiplicity{}, &PeakError{Input: s, Token: s, Field: "multiplicity", Msg: "unknown multiplicity"}
	}
	return m, nil
}

// parseMultiplicity is ParseMultiplicity for a non-empty s, reporting
// failure by ok alone.
func parseMultiplicity(s string) (m Multiplicity, ok bool) {
	s = strings.ToLower(strings.TrimSpace(s))
	s = strings.NewReplacer(".", " ", "-", " ", "_", " ").Replace(s)
	words := strings.Fields(s)
	broad, apparent := false, false
	for len(words) > 0 {
		switch words[0] {
		case "app", "apparent", "appar", "pseudo", "ps":
			apparent = true
		case "br", "broad", "brd", "b":
			if words[0] == "brd" && len(words) == 1 {
				// "brd" alone reads as a broad doublet.
				return Split(2).WithBroad(true).WithApparent(apparent), true
			}
			if words[0] == "b" && len(words) == 1 {
				return Multiplicity{}, false
			}
			broad = true
		default:
			goto base
		}
		words = words[1:]
	}
base:
	var code string
	switch len(words) {
	case 0:
		if !broad {
			return Multiplicity{}, false
		}
		code = "s" // "br" alone: a broad singlet
	case 1:
		w := words[0]
		if c, ok := multiplicityWords[w]; ok {
			code = c
			break
		}
		switch w {
		case "brs", "bs":
			broad, code = true, "s"
		case "bd", "brd":
			broad, code = true, "d"
		case "bt", "brt":
			broad, code = true, "t"
		case "brm", "bm":
			broad, code = true, "m"
		default:
			if !isCompound(w) {
				return Multiplicity{}, false
			}
			code = w
		}
	default:
		if c, ok := multiplicityWords[strings.Join(words, "")]; ok {
			code = c // "AB q"
			break
		}
		// "doublet of doublets", "triplet of doublets".
		var letters strings.Builder
		for i, w := range words {
			if i%2 == 1 {
				if w != "of" {
					return Multiplicity{}, false
				}
				continue
			}
			l, ok := compoundLetters[w]
			if !ok {
				return Multiplicity{}, false
			}
			letters.WriteString(l)
		}
		if len(words)%2 == 0 || len(words) > 2*MaxFactors-1 {
			return Multiplicity{}, false
		}
		code = letters.String()
	}
	switch {
	case code == "s":
		m = Singlet()
	case code == "m":
		m = Multiplet()
	case codeLines[code] > 0:
		m = Split(codeLines[code])
	default:
		m = Multiplicity{shape: shapeFirstOrder}
		for i := 0; i < len(code); i++ {
			m.factors[m.n] = uint8(strings.IndexByte("..dtq", code[i]))
			m.n++
		}
	}
	return m.WithBroad(broad).WithApparent(apparent), true
}

// isCompound reports whether w is a first-order compound multiplicity of
// two to MaxFactors letters d, t, q.
func isCompound(w string) bool {
	if len(w) < 2 || len(w) > MaxFactors {
		return false
	}
	for i := 0; i < len(w); i++ {
		if w[i] != 'd' && w[i] != 't' && w[i] != 'q' {
			return false
		}
	}
	return true
}
