package spectrum

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// ParseText reads the peak lists of journal text, as chemists paste it
// from an experimental section:
//
//	1H NMR (400 MHz, CDCl3) δ 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H);
//	13C NMR (101 MHz, CDCl3) δ 171.1 (C), 60.4 (CH2), 21.0 (CH3), 14.2 (CH3).
//
// It returns one PeakList per 1H or 13C section, in input order. A section
// starts with a header naming the nucleus ("1H NMR", "¹H-NMR", "13C{1H}
// NMR", "¹³C NMR", "δC"); the header is free in order ("1H NMR (CDCl3,
// 400 MHz):", "δH", "δ (ppm)", "500 MHz, DMSO-d6") and gives the
// spectrometer frequency in MHz and the solvent (any spelling
// CanonicalSolvent accepts). Text without a header is one 1H list.
// Sections for other nuclei ("19F NMR ...") are skipped, and a following
// section for another technique ("HRMS ...", "IR ...") ends the reading.
//
// Each peak is a shift in ppm, or a range in either order joined by a
// hyphen, en or em dash or minus sign ("7.35–7.20"), optionally followed
// by a parenthesised description whose comma-separated items may come in
// any order: a multiplicity (see ParseMultiplicity); coupling constants
// ("J = 8.0, 2.1 Hz", "J1 = 8.0 Hz, J2 = 2.1 Hz", "J = 7.1 and 1.2 Hz",
// "3J = 7.1 Hz", "JC–F = 245 Hz", also "8.0 Hz" or a bare number right
// after a split multiplicity); in a 1H list an integral ("2H", "2 H",
// "2.04H"); in a 13C list a carbon count ("2C", "2 C") and a DEPT class
// ("CH3", "CH2", "CH", "C", "Cq"; also "2 × CH" for both); and free
// assignment notes ("OCH2", "H-3", "2 × CH3", "H-2,6", "C=O") kept as
// Label. Peaks are separated by commas, semicolons or line breaks; a final
// "." or ";" is allowed. White space may include line breaks and
// non-breaking or thin spaces; full-width punctuation ("（s，3H）") and δ
// written as "d" (PDF symbol fonts) are accepted. Positions always refer
// to the input as given.
//
// Errors are *PeakError naming the token, its byte position and its line:
// malformed numbers, a decimal comma ("4,12"), a shift outside the
// nucleus's range (Nucleus.ShiftRange), an unknown multiplicity code, a
// negative or zero integral or count, a bare number where an integral
// belongs, an integral in a 13C list, J on a singlet, a J outside 0 to
// the nucleus's MaxJ, unbalanced parentheses, a section without peaks,
// no peaks at all, or input longer than MaxPeakInput bytes or with more
// than MaxPeaks peaks in a list or MaxJValues J values on one peak; JSON
// or JCAMP-DX input gets an error saying so.
func ParseText(s string) ([]PeakList, error) { return parseText(s, H1) }

// parseText is ParseText with def the nucleus of a first section without
// a header naming one.
func parseText(s string, def Nucleus) ([]PeakList, error) {
	p := &journal{in: s, def: def}
	if len(s) > MaxPeakInput {
		return nil, p.errAt(0, s[:40], "", "input longer than 1 MiB")
	}
	if !utf8.ValidString(s) {
		i := 0
		for i < len(s) {
			r, n := utf8.DecodeRuneInString(s[i:])
			if r == utf8.RuneError && n == 1 {
				break
			}
			i += n
		}
		return nil, p.errAt(i, s[i:i+1], "", "invalid UTF-8")
	}
	p.fold()
	p.skipSpace()
	switch {
	case strings.HasPrefix(p.in[p.i:], "##"):
		return nil, p.errAt(p.i, p.word(), "", "this is a JCAMP-DX file, not journal text")
	case strings.HasPrefix(p.in[p.i:], "[") || strings.HasPrefix(p.in[p.i:], "{"):
		return nil, p.errAt(p.i, p.in[p.i:p.i+1], "", "this is JSON, not journal text")
	}
	var lists []PeakList
	sections := 0
	for {
		p.skipSpace()
		if p.eof() || sections > 0 && p.atTechnique() {
			break
		}
		pl, skipped, err := p.section()
		if err != nil {
			return nil, err
		}
		sections++
		if !skipped {
			lists = append(lists, pl)
		}
	}
	if len(lists) == 0 {
		return nil, p.errAt(p.i, p.word(), "shift", "no peaks found")
	}
	return lists, nil
}

// section reads one section: a header and its peaks. skipped is true for
// a section of a nucleus other than 1H and 13C, which is passed over.
func (p *journal) section() (pl PeakList, skipped bool, err error) {
	start := p.i
	pl.Nucleus = p.def
	other, err := p.header(&pl)
	if err != nil {
		return PeakList{}, false, err
	}
	pl.Pos, _ = p.origSpan(start, start)
	if other {
		p.skipSection()
		return PeakList{}, true, nil
	}
	p.nuc = pl.Nucleus
	for {
		p.skipSpace()
		if p.eof() || p.atNextSection() {
			break
		}
		if len(pl.Peaks) == MaxPeaks {
			return PeakList{}, false, p.errAt(p.i, p.word(), "shift", "more than 1000 peaks")
		}
		pk, err := p.peak()
		if err != nil {
			return PeakList{}, false, err
		}
		pl.Peaks = append(pl.Peaks, pk)
		p.skipSpace()
		if hasPrefixFold(p.in[p.i:], "ppm") && !letterAt(p.in, p.i+3) {
			p.i += 3 // "7.26 (s) ppm"
			p.skipSpace()
		}
		if p.eof() {
			break
		}
		r, n := p.peek()
		switch {
		case r == ',' || r == ';':
			p.i += n
		case r == '.':
			p.i += n
			p.skipSpace()
			if !p.eof() && !p.atNextSection() {
				return PeakList{}, false, p.errAt(p.i, p.word(), "", "unexpected text after the final '.'")
			}
		case p.atNumber():
			// A line break or space alone between peaks.
		default:
			return PeakList{}, false, p.errAt(p.i, p.word(), "", "expected ',' between peaks")
		}
	}
	if len(pl.Peaks) == 0 {
		return PeakList{}, false, p.errAt(p.i, p.word(), "shift", "no peaks found")
	}
	return pl, false, nil
}

// skipSection passes over the body of a section for another nucleus, up
// to the next section header, technique name or the end of the text.
func (p *journal) skipSection() {
	for !p.eof() {
		if p.i > 0 {
			prev, _ := utf8.DecodeLastRuneInString(p.in[:p.i])
			if unicode.IsSpace(prev) || prev == ';' || prev == '.' || prev == ',' {
				if p.atSectionHeader() || p.atTechnique() {
					return
				}
			}
		}
		_, n := p.peek()
		p.i += n
	}
}

// journal is the state of ParseText: the text being read, a byte offset
// in it, the original input when the text is a folded copy, and the
// nucleus of the section being read.
type journal struct {
	in   string
	i    int
	orig string  // the input as given
	offs []int   // offs[k]: offset in orig of byte k of in; nil when in == orig
	nuc  Nucleus // nucleus of the current section
	def  Nucleus // nucleus of a section whose header names none
}

// fold replaces full-width forms (U+FF01–U+FF5E, as pasted from CJK
// sources: "（s，3H）") and the ideographic space by their ASCII
// equivalents, keeping a map back to the original offsets.
func (p *journal) fold() {
	p.orig = p.in
	if !strings.ContainsFunc(p.in, func(r rune) bool { return r >= 0xFF01 && r <= 0xFF5E || r == 0x3000 }) {
		return
	}
	var b strings.Builder
	offs := make([]int, 0, len(p.in)+1)
	for i, r := range p.in {
		switch {
		case r >= 0xFF01 && r <= 0xFF5E:
			b.WriteByte(byte(r - 0xFEE0))
			offs = append(offs, i)
		case r == 0x3000:
			b.WriteByte(' ')
			offs = append(offs, i)
		default:
			n := utf8.RuneLen(r)
			b.WriteRune(r)
			for k := 0; k < n; k++ {
				offs = append(offs, i+k)
			}
		}
	}
	p.in = b.String()
	p.offs = append(offs, len(p.orig))
}

// origSpan maps a span of the text being read to the original input.
func (p *journal) origSpan(from, to int) (int, string) {
	if p.offs == nil {
		return from, p.orig[from:to]
	}
	return p.offs[from], p.orig[p.offs[from]:p.offs[to]]
}

func (p *journal) errAt(pos int, tok, field, msg string) error {
	if p.offs != nil && pos >= 0 && pos <= len(p.in) {
		if pos+len(tok) <= len(p.in) && p.in[pos:pos+len(tok)] == tok {
			pos, tok = p.origSpan(pos, pos+len(tok))
		} else {
			pos = p.offs[pos]
		}
	}
	in := p.orig
	if in == "" {
		in = p.in
	}
	return newPeakError(in, pos, tok, field, msg)
}

func (p *journal) eof() bool { return p.i >= len(p.in) }

func (p *journal) peek() (rune, int) {
	if p.i >= len(p.in) {
		return 0, 0
	}
	return utf8.DecodeRuneInString(p.in[p.i:])
}

func (p *journal) skipSpace() {
	for !p.eof() {
		r, n := p.peek()
		if !unicode.IsSpace(r) && r != '\u200b' && r != '\ufeff' { // zero-width space, byte-order mark
			return
		}
		p.i += n
	}
}

// word returns the token at the cursor, for error messages: up to the next
// space, comma or parenthesis, at most 40 bytes, at least one rune.
func (p *journal) word() string { return peakWordAt(p.in, p.i) }

func peakWordAt(s string, i int) string {
	if i >= len(s) {
		return ""
	}
	j := i
	for j < len(s) && j-i < 40 {
		r, n := utf8.DecodeRuneInString(s[j:])
		if j > i && (unicode.IsSpace(r) || r == ',' || r == ';' || r == '(' || r == ')') {
			break
		}
		j += n
	}
	return s[i:j]
}

func minusRune(r rune) bool {
	return r == '-' || r == '−' || r == '–' || r == '‐' || r == '‑' || r == '‒'
}

func dashRune(r rune) bool { return minusRune(r) || r == '—' || r == '~' }

func digitRune(r rune) bool { return r >= '0' && r <= '9' }

// deltaRune reports the Greek small delta and its mathematical forms.
func deltaRune(r rune) bool {
	return r == 'δ' || r == '𝛿' || r == '𝜹' || r == '𝛅' || r == 'ẟ'
}

// atNumber reports whether a number starts at the cursor.
func (p *journal) atNumber() bool { return numberAt(p.in, p.i) }

func numberAt(s string, i int) bool {
	if i >= len(s) {
		return false
	}
	r, n := utf8.DecodeRuneInString(s[i:])
	if digitRune(r) {
		return true
	}
	if minusRune(r) || r == '+' {
		i += n
		if i >= len(s) {
			return false
		}
		r, n = utf8.DecodeRuneInString(s[i:])
	}
	if digitRune(r) {
		return true
	}
	return r == '.' && i+n < len(s) && s[i+n] >= '0' && s[i+n] <= '9'
}

// scanNumber reads an optionally signed decimal number at i. It returns
// the value, the token and the end offset; ok is false with the token when
// the text there is not a well-formed number.
func scanNumber(s string, i int) (v float64, tok string, end int, ok bool) {
	start := i
	neg := false
	if i < len(s) {
		r, n := utf8.DecodeRuneInString(s[i:])
		if minusRune(r) || r == '+' {
			neg = r != '+'
			i += n
		}
	}
	j := i
	for j < len(s) && (s[j] >= '0' && s[j] <= '9' || s[j] == '.') {
		j++
	}
	// A final '.' not followed by a digit ends a sentence, not the number.
	sentence := false
	if j > i && s[j-1] == '.' && j-1 > i {
		j--
		sentence = true
	}
	digits := s[i:j]
	tok = s[start:j]
	if digits == "" || digits == "." || strings.Count(digits, ".") > 1 {
		return 0, peakWordAt(s, start), j, false
	}
	if j < len(s) && s[j] == '.' && !sentence {
		// "4.1.2" or "4..1"
		return 0, peakWordAt(s, start), j, false
	}
	v, err := strconv.ParseFloat(digits, 64)
	if err != nil {
		return 0, peakWordAt(s, start), j, false
	}
	if neg {
		v = -v
	}
	return v, tok, j, true
}

// number reads a number at the cursor or returns a *PeakError for field.
func (p *journal) number(field string) (float64, string, error) {
	start := p.i
	v, tok, end, ok := scanNumber(p.in, p.i)
	if !ok {
		return 0, tok, p.errAt(start, tok, field, "malformed number")
	}
	p.i = end
	return v, tok, nil
}

// matchParen returns the offset of the ')' closing the '(' at i, or -1.
func matchParen(s string, i int) int {
	depth := 0
	for j := i; j < len(s); j++ {
		switch s[j] {
		case '(', '[', '{':
			depth++
		case ')', ']', '}':
			depth--
			if depth == 0 {
				return j
			}
			if depth < 0 {
				return -1
			}
		}
	}
	return -1
}

// nucleusAt reports a nucleus token such as "1H", "13C", "¹H", "¹³C" at i:
// its text and end offset, or "" when there is none.
func nucleusAt(s string, i int) (tok string, end int) {
	j := i
	for j < len(s) {
		r, n := utf8.DecodeRuneInString(s[j:])
		if !digitRune(r) && !strings.ContainsRune("¹²³⁴⁵⁶⁷⁸⁹⁰", r) {
			break
		}
		j += n
	}
	if j == i || j >= len(s) || s[j] < 'A' || s[j] > 'Z' {
		return "", i
	}
	k := j + 1
	if k < len(s) && s[k] >= 'a' && s[k] <= 'z' {
		k++
	}
	// The element symbol must end the word ("1H NMR", "1H-NMR", "13C{1H}").
	if k < len(s) {
		r, _ := utf8.DecodeRuneInString(s[k:])
		if unicode.IsLetter(r) || unicode.IsDigit(r) {
			return "", i
		}
	}
	return s[i:k], k
}

// sectionWords start the text of another technique in an experimental
// section (common practice); ParseText stops there.
var sectionWords = []string{"HRMS", "HR-MS", "LRMS", "MS", "IR", "FT-IR", "FTIR", "Anal", "mp", "Mp", "Rf", "ESI", "EI", "UV", "Elemental", "[α]"}

// atNextSection reports whether the cursor is at the start of another
// section: a nucleus token ("13C NMR") or a technique name.
func (p *journal) atNextSection() bool {
	if tok, _ := nucleusAt(p.in, p.i); tok != "" {
		return true
	}
	if r, n := p.peek(); deltaRune(r) {
		// "δC 128.5, ..." after a 1H list given as "δH ...".
		rest := strings.TrimPrefix(p.in[p.i+n:], "_")
		if (strings.HasPrefix(rest, "C") || strings.HasPrefix(rest, "H")) && !letterAt(rest, 1) {
			return true
		}
	}
	return p.atTechnique()
}

// atTechnique reports whether the cursor is at the name of another
// technique ("HRMS", "IR", "mp").
func (p *journal) atTechnique() bool {
	rest := p.in[p.i:]
	for _, w := range sectionWords {
		if strings.HasPrefix(rest, w) {
			r, _ := utf8.DecodeRuneInString(rest[len(w):])
			if len(rest) == len(w) || !unicode.IsLetter(r) {
				return true
			}
		}
	}
	return false
}

// atSectionHeader reports whether an NMR section header starts at the
// cursor: a nucleus token, an optional decoupling note in braces, and
// "NMR" ("13C NMR", "¹³C{¹H}-NMR").
func (p *journal) atSectionHeader() bool {
	tok, end := nucleusAt(p.in, p.i)
	if tok == "" {
		return false
	}
	if end < len(p.in) && p.in[end] == '{' {
		k := strings.IndexByte(p.in[end:], '}')
		if k < 0 {
			return false
		}
		end += k + 1
	}
	for end < len(p.in) && (p.in[end] == ' ' || p.in[end] == '-' || p.in[end] == '\t') {
		end++
	}
	return hasPrefixFold(p.in[end:], "nmr")
}

// headerWords may appear in a header without making it one (they carry no
// information we need).
var headerWords = map[string]bool{
	"nmr": true, "ppm": true, "in": true, "at": true, "h": true, "spectrum": true,
	"proton": true, "data": true, "delta": true, "(ppm)": true, "1h-nmr": true,
	// Text copied from a PDF often has δ turned into "d" by a symbol font.
	"d": true, "dh": true, "dc": true,
}

// header reads an optional header up to the first peak, filling Nucleus,
// MHz and Solvent. other is true when the header names a nucleus other
// than 1H and 13C; the cursor is then just past that nucleus.
func (p *journal) header(pl *PeakList) (other bool, err error) {
	seen := false   // a header marker (nucleus, NMR, δ, group) has been read
	named := false  // the nucleus has been named by a token
	deltaC := false // "δC": a 13C list unless a token says otherwise
	deltaH := false // "δH": a 1H list unless a token says otherwise
	defer func() {
		switch {
		case named:
		case deltaC:
			pl.Nucleus = C13
		case deltaH:
			pl.Nucleus = H1
		}
	}()
	for {
		p.skipSpace()
		if p.eof() {
			return false, nil
		}
		r, n := p.peek()
		start := p.i
		if tok, end := nucleusAt(p.in, p.i); tok != "" {
			p.i, seen = end, true
			if named {
				continue // "1H, 13C" or a second mention
			}
			nuc, err := ParseNucleus(tok)
			if err != nil {
				return true, nil
			}
			pl.Nucleus, named = nuc, true
			continue
		}
		switch {
		case r == '{':
			// "13C{1H}": the decoupled nucleus.
			end := strings.IndexByte(p.in[p.i:], '}')
			if end < 0 {
				return false, p.errAt(start, "{", "header", "unclosed '{'")
			}
			p.i += end + 1
		case r == '(':
			end := matchParen(p.in, p.i)
			if end < 0 {
				return false, p.errAt(start, "(", "header", "unclosed '('")
			}
			if err := p.headerGroup(pl, p.i+1, end); err != nil {
				return false, err
			}
			p.i, seen = end+1, true
		case deltaRune(r) || hasPrefixFold(p.in[p.i:], "delta"):
			if deltaRune(r) {
				p.i += n
			} else {
				p.i += len("delta")
			}
			// δH, δ_H, δC, δ_C
			p.i += len(p.in[p.i:]) - len(strings.TrimPrefix(p.in[p.i:], "_"))
			switch {
			case strings.HasPrefix(p.in[p.i:], "H") && !letterAt(p.in, p.i+1):
				p.i++
				deltaH = true
			case strings.HasPrefix(p.in[p.i:], "C") && !letterAt(p.in, p.i+1):
				p.i++
				deltaC = true
			}
			seen = true
		case r == ':' || r == ',' || r == ';' || r == '=' || r == '/' || r == '-' && !p.atNumber():
			p.i += n
		case p.atNumber():
			v, _, end, ok := scanNumber(p.in, p.i)
			k := end
			for k < len(p.in) && (p.in[k] == ' ' || p.in[k] == '\t') {
				k++
			}
			if ok && hasPrefixFold(p.in[k:], "mhz") {
				if err := p.setMHz(pl, v, start, p.in[start:k+3]); err != nil {
					return false, err
				}
				p.i, seen = k+3, true
				continue
			}
			return false, nil // the first peak
		default:
			w := headerWord(p.in, p.i)
			if w == "" {
				return false, p.errAt(start, p.word(), "shift", "expected a chemical shift")
			}
			if c, ok := CanonicalSolvent(w); ok {
				if pl.Solvent == "" {
					pl.Solvent = c
				}
				seen = true
			} else if strings.EqualFold(w, "NMR") || strings.EqualFold(w, "1H-NMR") {
				seen = true
			} else if !seen && !headerWords[strings.ToLower(w)] {
				return false, p.errAt(start, w, "shift", "expected a chemical shift")
			}
			p.i += len(w)
		}
	}
}

// headerWord returns the word at i: letters, digits, subscripts, brackets,
// hyphens and primes, or one rune of anything else.
func headerWord(s string, i int) string {
	j := i
	for j < len(s) {
		r, n := utf8.DecodeRuneInString(s[j:])
		if !(unicode.IsLetter(r) || unicode.IsDigit(r) || r == '-' || r == '[' || r == ']' ||
			r == '\'' || r == '′' || (r >= '₀' && r <= '₉')) || deltaRune(r) {
			break
		}
		j += n
	}
	if j == i {
		_, n := utf8.DecodeRuneInString(s[i:])
		j = i + n
		if unicode.IsPunct(firstRune(s[i:j])) || unicode.IsSymbol(firstRune(s[i:j])) {
			return s[i:j]
		}
		return ""
	}
	return s[i:j]
}

func firstRune(s string) rune { r, _ := utf8.DecodeRuneInString(s); return r }

// letterAt reports whether a letter starts at s[i].
func letterAt(s string, i int) bool {
	if i >= len(s) {
		return false
	}
	r, _ := utf8.DecodeRuneInString(s[i:])
	return unicode.IsLetter(r)
}

func hasPrefixFold(s, prefix string) bool {
	return len(s) >= len(prefix) && strings.EqualFold(s[:len(prefix)], prefix)
}

func (p *journal) setMHz(pl *PeakList, v float64, pos int, tok string) error {
	if v < 1 || v > 2000 {
		return p.errAt(pos, tok, "mhz", "spectrometer frequency outside 1 to 2000 MHz")
	}
	if pl.MHz == 0 {
		pl.MHz = v
	}
	return nil
}

// headerGroup reads a parenthesised header group "(400 MHz, CDCl3)".
func (p *journal) headerGroup(pl *PeakList, from, to int) error {
	for _, it := range splitPeakItems(p.in, from, to) {
		text := it.text
		if text == "" {
			continue
		}
		if c, ok := CanonicalSolvent(text); ok && isSolventish(text) {
			if pl.Solvent == "" {
				pl.Solvent = c
			}
			continue
		}
		// Words: solvent names and "400 MHz" pairs.
		ws := fieldsAt(text, it.pos)
		for k, w := range ws {
			lw := strings.ToLower(w.text)
			if strings.HasSuffix(lw, "mhz") && lw != "mhz" {
				num := w.text[:len(w.text)-3]
				v, _, end, ok := scanNumber(num, 0)
				if !ok || end != len(num) {
					return p.errAt(w.pos, w.text, "mhz", "malformed number")
				}
				if err := p.setMHz(pl, v, w.pos, w.text); err != nil {
					return err
				}
				continue
			}
			if lw == "mhz" && k > 0 {
				prev := ws[k-1]
				v, _, end, ok := scanNumber(prev.text, 0)
				if !ok || end != len(prev.text) {
					return p.errAt(prev.pos, prev.text, "mhz", "malformed number")
				}
				if err := p.setMHz(pl, v, prev.pos, prev.text+" "+w.text); err != nil {
					return err
				}
				continue
			}
			if c, ok := CanonicalSolvent(w.text); ok && isSolventish(w.text) && pl.Solvent == "" {
				pl.Solvent = c
			}
		}
	}
	return nil
}

// isSolventish rejects words that reduce to a solvent key only by dropping
// punctuation that makes them something else (a lone number, say).
func isSolventish(s string) bool {
	for _, r := range s {
		if unicode.IsLetter(r) {
			return true
		}
	}
	return false
}

type posText struct {
	pos  int
	text string
}

// splitPeakItems splits s[from:to] at commas and semicolons outside nested
// brackets, trimming space. Positions are offsets in s.
func splitPeakItems(s string, from, to int) []posText {
	var out []posText
	depth := 0
	start := from
	emit := func(end int) {
		seg := s[start:end]
		lead := len(seg) - len(strings.TrimLeftFunc(seg, unicode.IsSpace))
		out = append(out, posText{pos: start + lead, text: strings.TrimSpace(seg)})
	}
	for j := from; j < to; j++ {
		switch s[j] {
		case '(', '[', '{':
			depth++
		case ')', ']', '}':
			if depth > 0 {
				depth--
			}
		case ',', ';':
			if depth == 0 {
				emit(j)
				start = j + 1
			}
		}
	}
	emit(to)
	return out
}

// fieldsAt splits text (which starts at offset base) at white space.
func fieldsAt(text string, base int) []posText {
	var out []posText
	i := 0
	for i < len(text) {
		r, n := utf8.DecodeRuneInString(text[i:])
		if unicode.IsSpace(r) {
			i += n
			continue
		}
		j := i
		for j < len(text) {
			r, n := utf8.DecodeRuneInString(text[j:])
			if unicode.IsSpace(r) {
				break
			}
			j += n
		}
		out = append(out, posText{pos: base + i, text: text[i:j]})
		i = j
	}
	return out
}

// peak reads one peak: a shift or range and an optional description.
func (p *journal) peak() (Peak, error) {
	var pk Peak
	start := p.i
	a, tokA, err := p.number("shift")
	if err != nil {
		return pk, err
	}
	lo, hi := p.nuc.ShiftRange()
	if a < lo || a > hi {
		return pk, p.errAt(start, tokA, "shift", shiftRangeMsg(p.nuc, a))
	}
	if p.i+1 < len(p.in) && p.in[p.i] == ',' && p.in[p.i+1] >= '0' && p.in[p.i+1] <= '9' && !strings.Contains(tokA, ".") {
		// "4,12": a decimal comma would silently give two peaks.
		return pk, p.errAt(start, peakWordAt(p.in, start)+p.in[p.i:p.i+2], "shift", "decimal comma: write the shift with a point")
	}
	b := a
	save := p.i
	p.skipSpace()
	if r, n := p.peek(); dashRune(r) {
		p.i += n
		p.skipSpace()
		bpos := p.i
		if !p.atNumber() {
			return pk, p.errAt(bpos, p.word(), "shift", "expected the other end of the range")
		}
		var tokB string
		if b, tokB, err = p.number("shift"); err != nil {
			return pk, err
		}
		if b < lo || b > hi {
			return pk, p.errAt(bpos, tokB, "shift", shiftRangeMsg(p.nuc, b))
		}
	} else {
		p.i = save
	}
	pk.setShift(a, b)
	save = p.i
	p.skipSpace()
	if hasPrefixFold(p.in[p.i:], "ppm") {
		p.i += 3
	} else {
		p.i = save
	}
	save = p.i
	p.skipSpace()
	if r, _ := p.peek(); r == '(' {
		end := matchParen(p.in, p.i)
		if end < 0 {
			return pk, p.errAt(p.i, p.word(), "peak", "unclosed '('")
		}
		if err := p.describe(&pk, p.i+1, end); err != nil {
			return pk, err
		}
		p.i = end + 1
	} else {
		p.i = save
	}
	pk.Pos, pk.Text = p.origSpan(start, p.i)
	if field, msg := checkPeak(p.nuc, pk); msg != "" {
		return pk, p.errAt(start, pk.Text, field, msg)
	}
	return pk, nil
}

// describe reads the items of a peak description "(q, J = 7.1 Hz, 2H)".
func (p *journal) describe(pk *Peak, from, to int) error {
	lastJ := false
	jPos, jTok := -1, ""
	brOnly := false    // the multiplicity so far is a bare "br"
	lastLabel := false // the previous item was an assignment note
	lastMult := false  // the previous item was a split multiplicity
	var labels []string
	for _, it := range splitPeakItems(p.in, from, to) {
		text := it.text
		if text == "" {
			lastJ = false
			continue
		}
		if v, ok := jLabelled(text); ok {
			js, err := p.jValues(v, it.pos+len(text)-len(v))
			if err != nil {
				return err
			}
			if jPos < 0 {
				jPos, jTok = it.pos, text
			}
			pk.J = append(pk.J, js...)
			if len(pk.J) > MaxJValues {
				return p.errAt(it.pos, text, "j", "more than 12 J values")
			}
			lastJ = true
			continue
		}
		afterMult := lastMult
		lastMult = false
		if (lastJ || afterMult || strings.Contains(strings.ToLower(text), "hz")) && isJList(text) {
			// "J = 8.0, 2.1 Hz" continued, or "8.0 Hz" (or a bare number
			// after a split multiplicity: "dd, 8.0, 2.1 Hz") without "J =".
			js, err := p.jValues(text, it.pos)
			if err != nil {
				return err
			}
			if jPos < 0 {
				jPos, jTok = it.pos, text
			}
			pk.J = append(pk.J, js...)
			if len(pk.J) > MaxJValues {
				return p.errAt(it.pos, text, "j", "more than 12 J values")
			}
			lastJ = true
			continue
		}
		lastJ = false
		afterLabel := lastLabel
		lastLabel = false
		if p.nuc == C13 {
			done, err := p.carbonItem(pk, it, afterLabel)
			if err != nil {
				return err
			}
			if done {
				continue
			}
		}
		if !afterLabel && !isIntegral(text) && isJList(text) {
			// Numbers that are neither J nor an integral ("(s, 3)"): most
			// likely an integral without its H. (After a note they continue
			// it: "H-2,6".)
			return p.errAt(it.pos, text, "integral", "expected an integral such as 2H")
		}
		if numberAt(text, 0) {
			_, tok, end, ok := scanNumber(text, 0)
			switch {
			case !ok:
				return p.errAt(it.pos, tok, "integral", "malformed number")
			case isIntegral(text):
				v, _, _, _ := scanNumber(text, 0)
				switch {
				case v < 0:
					return p.errAt(it.pos, text, "integral", "negative integral")
				case v == 0:
					return p.errAt(it.pos, text, "integral", "integral must be positive")
				case pk.Integral != 0:
					return p.errAt(it.pos, text, "integral", "second integral for one peak")
				}
				pk.Integral = v
			case end == len(text) && afterLabel:
				// "H-2,6": the number continues the assignment note.
				labels = append(labels, text)
				lastLabel = true
			case end == len(text):
				return p.errAt(it.pos, text, "integral", "expected an integral such as 2H")
			default:
				// An assignment note such as "2 × CH3" or "6-ArH".
				labels = append(labels, text)
				lastLabel = true
			}
			continue
		}
		if m, ok := parseMultiplicity(text); ok {
			switch {
			case !pk.Multiplicity.IsReported():
				pk.Multiplicity = m
				brOnly = isBareBroad(text)
				lastMult = !m.IsSinglet()
			case brOnly:
				// "(br, s)": the broad flag came first.
				pk.Multiplicity, brOnly = m.WithBroad(true).WithApparent(m.Apparent() || pk.Multiplicity.Apparent()), false
			case isBareBroad(text) && !pk.Multiplicity.Broad():
				// "(s, br)"
				pk.Multiplicity = pk.Multiplicity.WithBroad(true)
			default:
				return p.errAt(it.pos, text, "multiplicity", "second multiplicity for one peak")
			}
			continue
		}
		if !pk.Multiplicity.IsReported() && looksLikeCode(text) {
			return p.errAt(it.pos, text, "multiplicity", "unknown multiplicity")
		}
		labels = append(labels, text)
		lastLabel = true
	}
	pk.Label = strings.Join(labels, ", ")
	if len(pk.J) > 0 && pk.Multiplicity.IsSinglet() {
		return p.errAt(jPos, jTok, "j", "J given for a singlet")
	}
	return nil
}

// carbonItem reads an item of a 13C peak description: a carbon count
// ("2C"), a DEPT class ("CH2", "Cq") or both ("2 × CH"). done is false for
// an item it leaves to the other readers (multiplicity, note).
func (p *journal) carbonItem(pk *Peak, it posText, afterLabel bool) (done bool, err error) {
	text := it.text
	if isIntegral(text) {
		return false, p.errAt(it.pos, text, "integral", "an integral in a 13C list: give the number of carbons, such as 2C")
	}
	count, class, ok := countAndClass(text)
	if !ok {
		if !afterLabel && isJList(text) {
			return false, p.errAt(it.pos, text, "count", "expected a carbon count such as 2C")
		}
		return false, nil
	}
	if count != 0 {
		switch {
		case count < 1 || count > MaxCount:
			return false, p.errAt(it.pos, text, "count", fmt.Sprintf("carbon count outside 1 to %d", MaxCount))
		case pk.Count != 0:
			return false, p.errAt(it.pos, text, "count", "second carbon count for one peak")
		}
		pk.Count = count
	}
	if class != DEPTUnknown {
		if pk.DEPT != DEPTUnknown {
			return false, p.errAt(it.pos, text, "dept", "second DEPT class for one peak")
		}
		pk.DEPT = class
	}
	return true, nil
}

// countAndClass reads "2C", "2 C", "CH2", "Cq", "2 × CH", "2x CH3", "CH × 2":
// a count (0 when absent; −1 when written but not a whole number from 1) and a
// DEPT class (DEPTUnknown when absent). ok is false for anything else.
func countAndClass(s string) (count int, class DEPT, ok bool) {
	s = strings.TrimSpace(s)
	if d, ok := deptWord(s); ok {
		return 0, d, true
	}
	if !numberAt(s, 0) {
		// "CH × 2"
		for _, sep := range []string{"×", "x", "X", "*"} {
			if k := strings.LastIndex(s, sep); k > 0 {
				if d, ok := deptWord(s[:k]); ok {
					if n, ok := wholeNumber(s[k+len(sep):]); ok {
						return n, d, true
					}
				}
			}
		}
		return 0, DEPTUnknown, false
	}
	v, _, end, numOK := scanNumber(s, 0)
	if !numOK {
		return 0, DEPTUnknown, false
	}
	rest := strings.TrimSpace(s[end:])
	for _, sep := range []string{"×", "x", "X", "*"} {
		if r, ok := strings.CutPrefix(rest, sep); ok {
			rest = strings.TrimSpace(r)
			break
		}
	}
	n := -1 // written, but not a count
	if v == math.Trunc(v) && v >= 1 && v <= math.MaxInt32 {
		n = int(v)
	}
	if rest == "C" {
		// "2C": a number of carbons, whatever their class.
		return n, DEPTUnknown, true
	}
	if d, ok := deptWord(rest); ok {
		// "2 × CH", "2CH", "2 CH3"
		return n, d, true
	}
	return 0, DEPTUnknown, false
}

// deptWord reads a DEPT class written as chemists do beside a 13C shift:
// it starts with a capital C ("CH3", "Cq", "C") or with "quat".
func deptWord(s string) (DEPT, bool) {
	s = strings.TrimSpace(s)
	if !strings.HasPrefix(s, "C") && !hasPrefixFold(s, "quat") {
		return DEPTUnknown, false
	}
	d, ok := deptNames[deptKey(s)]
	return d, ok
}

// wholeNumber reads a count written as digits, surrounding space
// allowed; a count below 1 is returned as −1.
func wholeNumber(s string) (int, bool) {
	s = strings.TrimSpace(s)
	n, err := strconv.Atoi(s)
	if err != nil || strings.ContainsAny(s, "+-") {
		return 0, false
	}
	if n < 1 {
		n = -1
	}
	return n, true
}

func isBareBroad(s string) bool {
	s = strings.ToLower(strings.TrimSpace(strings.TrimSuffix(strings.TrimSpace(s), ".")))
	return s == "br" || s == "broad"
}

// looksLikeCode reports whether s is written like a multiplicity code
// (lower-case letters, spaces, dots and hyphens only) rather than an
// assignment note such as "OCH2" or "H-3".
func looksLikeCode(s string) bool {
	if len(s) > 24 {
		return false
	}
	for _, r := range s {
		if !(r >= 'a' && r <= 'z' || r == ' ' || r == '.' || r == '-' || r == '\'') {
			return false
		}
	}
	return true
}

// isJList reports whether s is a list of coupling constants without a
// "J =" label: numbers joined by spaces, "and", "&" or "/", each
// optionally followed by "Hz".
func isJList(s string) bool {
	n := 0
	for _, w := range strings.Fields(strings.NewReplacer("/", " ", "&", " ").Replace(s)) {
		lw := strings.ToLower(w)
		if lw == "hz" || lw == "and" {
			continue
		}
		lw = strings.TrimSuffix(lw, "hz")
		_, _, end, ok := scanNumber(lw, 0)
		if !ok || end != len(lw) {
			return false
		}
		n++
	}
	return n > 0
}

// isIntegral reports whether s reads "2H", "2 H", "2.04H".
func isIntegral(s string) bool {
	t := strings.TrimSpace(s)
	if !strings.HasSuffix(t, "H") {
		return false
	}
	t = strings.TrimSpace(strings.TrimSuffix(t, "H"))
	_, _, end, ok := scanNumber(t, 0)
	return ok && end == len(t)
}

// jLabelled recognises a coupling item ("J = 7.1 Hz", "J 7.1", "3J = 7.1",
// "J1 = 8.0", "JHH = 7.1", "J(H,H) = 7.1") and returns the value part.
func jLabelled(s string) (string, bool) {
	i := 0
	for i < len(s) {
		r, n := utf8.DecodeRuneInString(s[i:])
		if !digitRune(r) && !strings.ContainsRune("¹²³⁴^", r) {
			break
		}
		i += n
	}
	var rest string
	switch {
	case strings.HasPrefix(s[i:], "J"):
		rest = s[i+1:]
	case strings.HasPrefix(s[i:], "𝐽"), strings.HasPrefix(s[i:], "𝑱"): // mathematical italic J
		rest = s[i+len("𝐽"):]
	default:
		return "", false
	}
	if k := strings.IndexAny(rest, "=≈:~"); k >= 0 {
		_, n := utf8.DecodeRuneInString(rest[k:])
		return strings.TrimLeftFunc(rest[k+n:], unicode.IsSpace), true
	}
	// "J 7.1 Hz", "JHH 7.1": the value starts at the first digit after
	// letters, spaces and a bracketed label.
	j := 0
	for j < len(rest) {
		c := rest[j]
		if c >= '0' && c <= '9' || c == '.' {
			break
		}
		if c == '(' {
			if k := strings.IndexByte(rest[j:], ')'); k >= 0 {
				j += k + 1
				continue
			}
		}
		r, n := utf8.DecodeRuneInString(rest[j:])
		if !(unicode.IsLetter(r) || unicode.IsSpace(r) || r == '_' || r == ',' || r == '-') {
			break
		}
		j += n
	}
	if j == len(rest) {
		return "", false
	}
	if j == 0 {
		// "J7.1" is accepted; a subscript index like "J1 7.1" is not
		// distinguishable and is read as a value.
		return rest, true
	}
	return rest[j:], true
}

// jValues reads "8.0, 2.1 Hz", "7.1 and 1.2 Hz", "7.1 Hz" (the text starts
// at offset base).
func (p *journal) jValues(s string, base int) ([]float64, error) {
	var out []float64
	for _, w := range fieldsAt(strings.NewReplacer("/", " ", "&", " ").Replace(s), base) {
		t := w.text
		lt := strings.ToLower(t)
		if lt == "hz" || lt == "and" || lt == "," {
			continue
		}
		t = strings.TrimSuffix(t, ",")
		if strings.HasSuffix(strings.ToLower(t), "hz") {
			t = t[:len(t)-2]
		}
		v, _, end, ok := scanNumber(t, 0)
		if !ok || end != len(t) {
			return nil, p.errAt(w.pos, w.text, "j", "malformed J value")
		}
		if !(v > 0) || v > p.nuc.MaxJ() {
			return nil, p.errAt(w.pos, w.text, "j", fmt.Sprintf("J outside 0 to %g Hz", p.nuc.MaxJ()))
		}
		out = append(out, v)
	}
	if len(out) == 0 {
		return nil, p.errAt(base, peakWordAt(p.in, base), "j", "J without a value")
	}
	return out, nil
}
