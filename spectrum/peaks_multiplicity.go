package spectrum

import "strings"

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

// compoundLetters maps the words of "doublet of triplets" style names to
// the letter they contribute.
var compoundLetters = map[string]string{
	"doublet": "d", "doublets": "d", "triplet": "t", "triplets": "t",
	"quartet": "q", "quartets": "q",
}

// NormalizeMultiplicity returns the canonical code for a multiplicity as
// written in a journal peak list: "s", "d", "t", "q", "quint" (also "p",
// "quin", "pent"), "sext", "sept" (also "hept"), "oct", "non", compounds of
// up to five d/t/q letters ("dd", "dt", "td", "ddd", "dq", "qd", "tt"; also
// "doublet of triplets"), "m" (also "AB q" and "AA'BB'", which are not first
// order), and any of those prefixed "br " for broad signals ("br s" from
// "br s", "br. s", "brs", "bs", "br", "broad singlet"). A leading "app",
// "apparent", "pseudo" or "ps" sets apparent and is dropped from the code.
// Case and inner white space do not matter. ok is false for anything else.
func NormalizeMultiplicity(s string) (code string, apparent, ok bool) {
	s = strings.ToLower(strings.TrimSpace(s))
	s = strings.NewReplacer(".", " ", "-", " ", "_", " ").Replace(s)
	words := strings.Fields(s)
	broad := false
	for len(words) > 0 {
		switch words[0] {
		case "app", "apparent", "appar", "pseudo", "ps":
			apparent = true
		case "br", "broad", "brd", "b":
			if words[0] == "brd" && len(words) == 1 {
				// "brd" alone reads as a broad doublet.
				return "br d", apparent, true
			}
			if words[0] == "b" && len(words) == 1 {
				return "", false, false
			}
			broad = true
		default:
			goto base
		}
		words = words[1:]
	}
base:
	var b string
	switch len(words) {
	case 0:
		if !broad {
			return "", false, false
		}
		b = "s" // "br" alone: a broad singlet
	case 1:
		w := words[0]
		if c, ok := multiplicityWords[w]; ok {
			b = c
			break
		}
		switch w {
		case "brs", "bs":
			broad, b = true, "s"
		case "bd", "brd":
			broad, b = true, "d"
		case "bt", "brt":
			broad, b = true, "t"
		case "brm", "bm":
			broad, b = true, "m"
		default:
			if !isCompound(w) {
				return "", false, false
			}
			b = w
		}
	default:
		if c, ok := multiplicityWords[strings.Join(words, "")]; ok {
			b = c // "AB q"
			break
		}
		// "doublet of doublets", "triplet of doublets".
		var letters strings.Builder
		for i, w := range words {
			if i%2 == 1 {
				if w != "of" {
					return "", false, false
				}
				continue
			}
			l, ok := compoundLetters[w]
			if !ok {
				return "", false, false
			}
			letters.WriteString(l)
		}
		if len(words)%2 == 0 {
			return "", false, false
		}
		b = letters.String()
	}
	if broad {
		return "br " + b, apparent, true
	}
	return b, apparent, true
}

// isCompound reports whether w is a first-order compound multiplicity of
// two to five letters d, t, q.
func isCompound(w string) bool {
	if len(w) < 2 || len(w) > 5 {
		return false
	}
	for i := 0; i < len(w); i++ {
		if w[i] != 'd' && w[i] != 't' && w[i] != 'q' {
			return false
		}
	}
	return true
}

// SplitMultiplicity splits a canonical code into its first-order pattern
// and whether the signal is broad: "br s" gives ("s", true), "dt" gives
// ("dt", false).
func SplitMultiplicity(code string) (base string, broad bool) {
	if b, ok := strings.CutPrefix(code, "br "); ok {
		return b, true
	}
	return code, false
}

// isSinglet reports whether a canonical code is a singlet, broad or not.
func isSinglet(code string) bool { return code == "s" || code == "br s" }
