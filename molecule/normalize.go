package molecule

import (
	"strings"
	"unicode"
)

// NormalizeFormula rewrites the common ways of typing a molecular formula
// into the strict form ParseFormula reads, where the rewriting is
// unambiguous:
//
//   - subscript digits become digits ("C₄H₈O₂" → "C4H8O2");
//   - white space inside the formula is dropped ("C4 H8 O2" → "C4H8O2");
//   - a formula typed all in lower case ("c4h8o2") is read with capitals
//     when it has exactly one reading as element symbols of the periodic
//     table. Two letters that could be one symbol or two ("co": cobalt, or
//     carbon and oxygen; "si": silicon, or sulfur and iodine; "no":
//     nobelium, or nitrogen and oxygen) make it ambiguous, and it is
//     refused rather than guessed, even when only one reading uses the
//     elements this program supports: a paste meaning cobalt must not be
//     ranked as an organic formula.
//
// Text with any capital letter is taken as written (apart from subscripts
// and spaces). The result is not validated: ParseFormula checks it. Errors
// are *FormulaError with Pos the byte offset in s of the offending token.
func NormalizeFormula(s string) (string, error) {
	var b strings.Builder
	lower, upper := false, false
	for _, r := range s {
		switch {
		case r >= '₀' && r <= '₉':
			b.WriteByte(byte('0' + r - '₀'))
		case unicode.IsSpace(r):
		default:
			if r >= 'a' && r <= 'z' {
				lower = true
			}
			if r >= 'A' && r <= 'Z' {
				upper = true
			}
			b.WriteRune(r)
		}
	}
	out := b.String()
	if upper || !lower {
		return out, nil
	}
	return capitalise(s, out)
}

// capitalise reads the all-lower-case formula t (s before normalising)
// as element symbols with counts, and returns it with capitals when there
// is exactly one reading.
func capitalise(s, t string) (string, error) {
	// ways[i] counts the readings of t[i:] (capped at 2); next[i] is the
	// symbol length of the first one found.
	n := len(t)
	ways := make([]int, n+1)
	next := make([]int, n+1)
	ways[n] = 1
	for i := n - 1; i >= 0; i-- {
		if t[i] >= '0' && t[i] <= '9' {
			if i > 0 && (t[i-1] >= 'a' && t[i-1] <= 'z' || t[i-1] >= '0' && t[i-1] <= '9') {
				ways[i] = ways[i+1] // a count continues the symbol before it
				next[i] = 1
			}
			continue
		}
		for l := 1; l <= 2 && i+l <= n; l++ {
			if !allElements[t[i:i+l]] || ways[i+l] == 0 {
				continue
			}
			if ways[i] == 0 {
				next[i] = l
			}
			ways[i] = min(ways[i]+ways[i+l], 2)
		}
	}
	if ways[0] == 0 {
		pos, tok := lowerBad(s, t)
		return "", &FormulaError{Input: s, Pos: pos, Token: tok, Msg: "cannot be read as element symbols; write symbols with a capital letter (C4H8O2)"}
	}
	if ways[0] > 1 {
		pos, tok := ambiguousPair(s, t, ways)
		return "", &FormulaError{Input: s, Pos: pos, Token: tok, Msg: "ambiguous in lower case (one element or two?); write symbols with capital letters, e.g. CO or Co"}
	}
	var b strings.Builder
	for i := 0; i < n; {
		if t[i] >= '0' && t[i] <= '9' {
			b.WriteByte(t[i])
			i++
			continue
		}
		l := next[i]
		b.WriteString(strings.ToUpper(t[i:i+1]) + t[i+1:i+l])
		i += l
	}
	return b.String(), nil
}

// ambiguousPair finds the first two letters of t that could be read as one
// symbol or as two and returns their position in s.
func ambiguousPair(s, t string, ways []int) (int, string) {
	for i := 0; i+2 <= len(t); i++ {
		p := t[i : i+2]
		if allElements[p] && allElements[p[:1]] && allElements[p[1:]] {
			return posIn(s, i), p
		}
	}
	return 0, s
}

// lowerBad returns the first letter of t that starts no element symbol.
func lowerBad(s, t string) (int, string) {
	for i := 0; i < len(t); i++ {
		if c := t[i]; c >= 'a' && c <= 'z' && !allElements[t[i:i+1]] && (i+2 > len(t) || !allElements[t[i:i+2]]) {
			return posIn(s, i), t[i : i+1]
		}
	}
	return 0, s
}

// posIn maps a byte offset in the normalised text back to s, skipping the
// white space that normalising dropped and counting a subscript digit as
// one character.
func posIn(s string, i int) int {
	k := 0
	for p, r := range s {
		if unicode.IsSpace(r) {
			continue
		}
		if k == i {
			return p
		}
		k++
	}
	return len(s)
}

// allElements holds the symbols of the periodic table (IUPAC, elements 1–118)
// in lower case, to tell when a lower-case formula has more than one reading.
var allElements = func() map[string]bool {
	m := map[string]bool{}
	for _, sym := range strings.Fields(`H He Li Be B C N O F Ne Na Mg Al Si P S Cl Ar K Ca Sc Ti V Cr Mn Fe Co Ni Cu Zn
		Ga Ge As Se Br Kr Rb Sr Y Zr Nb Mo Tc Ru Rh Pd Ag Cd In Sn Sb Te I Xe Cs Ba La Ce Pr Nd Pm Sm Eu Gd Tb Dy Ho Er Tm
		Yb Lu Hf Ta W Re Os Ir Pt Au Hg Tl Pb Bi Po At Rn Fr Ra Ac Th Pa U Np Pu Am Cm Bk Cf Es Fm Md No Lr Rf Db Sg Bh Hs
		Mt Ds Rg Cn Nh Fl Mc Lv Ts Og`) {
		m[strings.ToLower(sym)] = true
	}
	return m
}()
