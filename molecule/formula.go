package molecule

import (
	"fmt"
	"strings"
)

// DefaultMaxHeavyAtoms is the heavy-atom limit applied by ParseFormula. The
// isomer count grows roughly exponentially with the heavy-atom count, so a
// service sets its own limit with ParseFormulaLimit.
const DefaultMaxHeavyAtoms = 40

// maxElementCount bounds the count of one element, so that every parsed
// formula can be written and read back (counts have at most six digits).
const maxElementCount = 999999

// Formula is a molecular formula: a count for each element. The zero value
// is the empty formula. Formula is a comparable value type.
type Formula struct {
	counts [NumElements]int
}

// FormulaError describes a formula that cannot be parsed or that has no
// neutral closed-shell structure. Pos is the 0-based byte offset of Token
// in the input; for whole-formula problems (odd electron count, negative
// DBE, too many atoms) Pos is 0 and Token is the whole input.
type FormulaError struct {
	Input string
	Pos   int
	Token string
	Msg   string
}

// Error formats the error with the input, message, position and token.
func (e *FormulaError) Error() string {
	return fmt.Sprintf("formula %q: %s at position %d (%q)", e.Input, e.Msg, e.Pos, e.Token)
}

// NewFormula returns a formula from element counts. Negative counts are
// treated as zero.
func NewFormula(counts map[Element]int) Formula {
	var f Formula
	for e, n := range counts {
		if e > NoElement && e < NumElements && n > 0 {
			f.counts[e] = n
		}
	}
	return f
}

// ParseFormula parses a molecular formula such as "C4H8O2", "H8C4O2",
// "C6H5Cl" or "CHCl3" with the DefaultMaxHeavyAtoms limit. See
// ParseFormulaLimit.
func ParseFormula(s string) (Formula, error) {
	return ParseFormulaLimit(s, DefaultMaxHeavyAtoms)
}

// ParseFormulaLimit parses a molecular formula. Elements may appear in any
// order and may repeat (counts add up: "CH3COOH" is C2H4O2); a missing count
// means 1. Supported elements are C H N O S P Si B F Cl Br I; symbols are
// case-sensitive. White space around the formula is ignored.
//
// It returns a *FormulaError naming the token and its position for an
// unknown symbol ("Xy", "co"), a count of zero, a stray character, an
// empty formula, a formula without heavy atoms, an odd electron count
// (no neutral closed-shell structure), a DBE that stays negative even with
// the hypervalent states of S and P (see MaxDBE), or more than
// maxHeavy heavy (non-hydrogen) atoms. maxHeavy <= 0 means no limit.
func ParseFormulaLimit(s string, maxHeavy int) (Formula, error) {
	in := s
	trimmed := strings.TrimSpace(s)
	off := strings.Index(s, trimmed)
	s = trimmed
	var f Formula
	if s == "" {
		return f, &FormulaError{Input: in, Pos: 0, Token: "", Msg: "empty formula"}
	}
	i := 0
	for i < len(s) {
		start := i
		c := s[i]
		if c < 'A' || c > 'Z' {
			tok := s[i : i+1]
			msg := "expected an element symbol starting with a capital letter"
			if c >= 'a' && c <= 'z' {
				j := i + 1
				for j < len(s) && s[j] >= 'a' && s[j] <= 'z' {
					j++
				}
				tok = s[i:j]
				msg = "unknown element symbol (symbols start with a capital letter)"
			} else if c >= '0' && c <= '9' {
				j := i
				for j < len(s) && s[j] >= '0' && s[j] <= '9' {
					j++
				}
				tok = s[i:j]
				msg = "count without an element symbol"
			}
			return Formula{}, &FormulaError{Input: in, Pos: off + start, Token: tok, Msg: msg}
		}
		i++
		for i < len(s) && s[i] >= 'a' && s[i] <= 'z' {
			i++
		}
		sym := s[start:i]
		e, ok := ElementBySymbol(sym)
		if !ok || e == NoElement {
			return Formula{}, &FormulaError{Input: in, Pos: off + start, Token: sym, Msg: "unknown or unsupported element symbol (supported: C H N O S P Si B F Cl Br I)"}
		}
		numStart := i
		for i < len(s) && s[i] >= '0' && s[i] <= '9' {
			i++
		}
		n := 1
		if i > numStart {
			digits := s[numStart:i]
			if len(digits) > 6 {
				return Formula{}, &FormulaError{Input: in, Pos: off + numStart, Token: digits, Msg: "count too large"}
			}
			n = 0
			for _, d := range digits {
				n = n*10 + int(d-'0')
			}
			if n == 0 {
				return Formula{}, &FormulaError{Input: in, Pos: off + start, Token: s[start:i], Msg: "element count must be at least 1"}
			}
		}
		f.counts[e] += n
		if f.counts[e] > maxElementCount {
			return Formula{}, &FormulaError{Input: in, Pos: off + start, Token: s[start:i], Msg: fmt.Sprintf("more than %d atoms of %s", maxElementCount, e)}
		}
	}
	whole := func(msg string) error {
		return &FormulaError{Input: in, Pos: off, Token: s, Msg: msg}
	}
	heavy := f.HeavyAtoms()
	if heavy == 0 {
		return Formula{}, whole("no heavy (non-hydrogen) atoms")
	}
	if maxHeavy > 0 && heavy > maxHeavy {
		return Formula{}, whole(fmt.Sprintf("%d heavy atoms exceed the limit of %d", heavy, maxHeavy))
	}
	if !f.EvenElectron() {
		return Formula{}, whole("odd number of electrons: no neutral closed-shell structure exists (check the hydrogen count)")
	}
	if f.MaxDBE() < 0 {
		return Formula{}, whole(fmt.Sprintf("negative ring-plus-double-bond equivalents (DBE %d even with hypervalent S and P): too many hydrogens or halogens for the skeleton", f.DBE()))
	}
	return f, nil
}

// MustParseFormula is like ParseFormula but panics on error. It is meant
// for tests and constant formulas in code, never for user input.
func MustParseFormula(s string) Formula {
	f, err := ParseFormula(s)
	if err != nil {
		panic("molecule: " + err.Error())
	}
	return f
}

// Count returns the number of atoms of element e.
func (f Formula) Count(e Element) int {
	if e >= NumElements {
		return 0
	}
	return f.counts[e]
}

// HeavyAtoms returns the number of non-hydrogen atoms.
func (f Formula) HeavyAtoms() int {
	n := 0
	for e := H + 1; e < NumElements; e++ {
		n += f.counts[e]
	}
	return n
}

// HydrogenCount returns the number of hydrogen atoms.
func (f Formula) HydrogenCount() int { return f.counts[H] }

// EvenElectron reports whether the formula can form a neutral closed-shell
// molecule: the sum of the (lowest) valences of all atoms is even. The
// alternative valences of S (2/4/6) and P (3/5) have the same parity.
func (f Formula) EvenElectron() bool {
	sum := 0
	for e := H; e < NumElements; e++ {
		sum += f.counts[e] * e.MinValence()
	}
	return sum%2 == 0
}

// DBE returns the ring-plus-double-bond equivalents computed with the lowest
// valence of each element: DBE = 1 + Σ n_i (v_i − 2) / 2 (common practice;
// for CcHhNnOoXx this is c − h/2 − x/2 + n/2 + 1). Hypervalent S and P add
// further equivalents in a given structure; the value here is the minimum.
// For an odd-electron formula the result is rounded down.
func (f Formula) DBE() int { return f.dbe(Element.MinValence) }

// MaxDBE is DBE computed with the highest valence of each element (S 6,
// P 5). It differs from DBE only for formulas with S or P; a formula such as
// SF6 or PCl5 has a negative DBE but a non-negative MaxDBE, and exists only
// with hypervalent S or P.
func (f Formula) MaxDBE() int { return f.dbe(Element.MaxValence) }

// dbe is 1 + Σ n_i (v_i − 2) / 2 with the valence v_i given by valence,
// rounded down.
func (f Formula) dbe(valence func(Element) int) int {
	twice := 2
	for e := H; e < NumElements; e++ {
		twice += f.counts[e] * (valence(e) - 2)
	}
	if twice < 0 {
		return -((-twice + 1) / 2)
	}
	return twice / 2
}

// Mass returns the monoisotopic mass in u.
func (f Formula) Mass() float64 {
	m := 0.0
	for e := H; e < NumElements; e++ {
		m += float64(f.counts[e]) * e.Mass()
	}
	return m
}

// String formats the formula in Hill order: C first, then H, then the other
// elements alphabetically; without carbon, all elements alphabetically.
// Counts of 1 are omitted ("CHCl3", "C6H5Cl").
func (f Formula) String() string {
	var b strings.Builder
	write := func(e Element) {
		if f.counts[e] == 0 {
			return
		}
		b.WriteString(e.Symbol())
		if f.counts[e] > 1 {
			b.WriteString(itoa(f.counts[e]))
		}
	}
	alpha := []Element{B, Br, C, Cl, F, H, I, N, O, P, S, Si}
	if f.counts[C] > 0 {
		write(C)
		write(H)
		for _, e := range alpha {
			if e != C && e != H {
				write(e)
			}
		}
	} else {
		for _, e := range alpha {
			write(e)
		}
	}
	return b.String()
}
