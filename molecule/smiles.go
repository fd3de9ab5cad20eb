package molecule

import (
	"fmt"
	"strings"
)

// SMILESError describes SMILES input that cannot be read. Pos is the
// 0-based byte offset of Token in Input.
type SMILESError struct {
	Input string
	Pos   int
	Token string
	Msg   string
}

// Error formats the error with the input, message, position and token.
func (e *SMILESError) Error() string {
	return fmt.Sprintf("SMILES %q: %s at position %d (%q)", e.Input, e.Msg, e.Pos, e.Token)
}

// maxSMILESAtoms bounds the size of a parsed molecule; far above anything
// shiftrank ranks, it keeps hostile input from costing much time or memory.
const maxSMILESAtoms = 1000

// ParseSMILES reads one molecule written in SMILES (the OpenSMILES
// specification) and returns its kekulised graph. Atom i of the result is
// the i-th atom written in the string.
//
// Supported: the organic subset B C N O P S F Cl Br I (implicit hydrogens
// at the lowest normal valence that fits: B 3; C 4; N 3; O 2; P 3, 5;
// S 2, 4, 6; halogens 1), bracket atoms with hydrogen counts and charges
// ([NH4+], [SiH4], [PH3], [S], [O-]), branches, ring closures (digits and
// %nn), the bond symbols - = # and : (/ and \ are accepted and read as
// single bonds: shiftrank does not handle stereochemistry; the chirality
// marks of OpenSMILES, @ @@ @TH1 ... @OH30, are ignored likewise), atom classes ([CH3:1], ignored) and aromatic atoms
// b c n o p s, which are kekulised (an error if no Kekulé structure
// exists). Explicit hydrogen atoms [H] bonded to one heavy atom are
// folded into that atom's hydrogen count ([H]C([H])([H])O is methanol); the
// atom numbering then counts heavy atoms only.
//
// Rejected with a *SMILESError naming the token and its byte position:
// dot-disconnected input (one molecule per SMILES), elements other than
// B C N O F Si P S Cl Br I, isotopes ([2H]), charges beyond ±1 (±1 only
// on B C N O P S and halogens), valences not allowed for the element and
// charge (C(C)(C)(C)(C)C; bracket atoms are taken as written, so [CH2] and
// [S] are accepted with open valences, but not with too many bonds),
// chirality marks that OpenSMILES does not define ([C@@@H], [C@TH3H]),
// unbalanced branches and ring closures, and
// more than 1000 atoms. ParseSMILES never panics.
func ParseSMILES(s string) (*Graph, error) {
	p := smilesParser{s: s}
	g, err := p.parseGraph()
	if err != nil {
		return nil, err
	}
	return g, nil
}

// MustParseSMILES is like ParseSMILES but panics on error. It is meant for
// tests and constant SMILES in code, never for user input.
func MustParseSMILES(s string) *Graph {
	g, err := ParseSMILES(s)
	if err != nil {
		panic("molecule: " + err.Error())
	}
	return g
}

type ringOpen struct {
	active bool
	atom   int
	sym    byte // bond symbol given at the opening, 0 if none
	pos    int
}

type smilesParser struct {
	s        string
	i        int
	g        *Graph
	arom     []bool  // atom written lowercase
	bracket  []bool  // atom written in brackets (H count given)
	written  []uint8 // bracket atom: writtenH, writtenCharge bits
	atomPos  []int
	atomLen  []int
	bondPos  []int
	bondSym  []byte // bond symbol written for each bond, 0 if none
	extraH   []int  // per atom: explicit [H] atoms folded into it
	rings    [100]ringOpen
	fragment bool // parse as a substructure query: no valence check
}

func (p *smilesParser) errAt(pos, n int, msg string) error {
	end := pos + n
	if pos > len(p.s) {
		pos = len(p.s)
	}
	if end > len(p.s) {
		end = len(p.s)
	}
	return &SMILESError{Input: p.s, Pos: pos, Token: p.s[pos:end], Msg: msg}
}

func (p *smilesParser) parseGraph() (*Graph, error) {
	p.g = NewGraph(len(p.s))
	prev := -1
	var bondSym byte // pending bond symbol, 0 if none
	bondAt := 0
	var stack []int    // atoms at open branches
	var stackPos []int // positions of '('
	justOpened := false
	s := p.s
	for p.i < len(s) {
		c := s[p.i]
		start := p.i
		switch {
		case c == '(':
			if prev < 0 {
				return nil, p.errAt(start, 1, "branch opened before any atom")
			}
			if bondSym != 0 {
				return nil, p.errAt(bondAt, 1, "bond symbol before '('")
			}
			if justOpened {
				return nil, p.errAt(start, 1, "a branch must start with a bond or an atom")
			}
			stack = append(stack, prev)
			stackPos = append(stackPos, start)
			p.i++
			justOpened = true
			continue
		case c == ')':
			if len(stack) == 0 {
				return nil, p.errAt(start, 1, "unmatched ')'")
			}
			if justOpened {
				return nil, p.errAt(start-1, 2, "empty branch")
			}
			if bondSym != 0 {
				return nil, p.errAt(bondAt, 1, "bond symbol without a following atom")
			}
			prev = stack[len(stack)-1]
			stack = stack[:len(stack)-1]
			stackPos = stackPos[:len(stackPos)-1]
			p.i++
			continue
		case c == '.':
			return nil, p.errAt(start, 1, "dot-disconnected SMILES: one molecule per SMILES (no salts or mixtures)")
		case c == '-' || c == '=' || c == '#' || c == ':' || c == '/' || c == '\\' || c == '$':
			if c == '$' {
				return nil, p.errAt(start, 1, "quadruple bonds are not supported")
			}
			if prev < 0 {
				return nil, p.errAt(start, 1, "bond symbol before any atom")
			}
			if bondSym != 0 {
				return nil, p.errAt(start, 1, "two bond symbols in a row")
			}
			bondSym, bondAt = c, start
			p.i++
		case c >= '0' && c <= '9' || c == '%':
			if prev < 0 {
				return nil, p.errAt(start, 1, "ring-closure number before any atom")
			}
			if justOpened {
				return nil, p.errAt(start, 1, "ring-closure number right after '('")
			}
			num := int(c - '0')
			n := 1
			if c == '%' {
				if p.i+2 >= len(s) || !isDigit(s[p.i+1]) || !isDigit(s[p.i+2]) {
					return nil, p.errAt(start, 3, "'%' must be followed by two digits")
				}
				num = int(s[p.i+1]-'0')*10 + int(s[p.i+2]-'0')
				n = 3
			}
			p.i += n
			if err := p.ringBond(prev, num, bondSym, bondAt, start, n); err != nil {
				return nil, err
			}
			bondSym = 0
		case c == '[' || isLetter(c):
			if len(p.g.Atoms) >= maxSMILESAtoms {
				return nil, p.errAt(start, 1, fmt.Sprintf("more than %d atoms", maxSMILESAtoms))
			}
			var a int
			var err error
			if c == '[' {
				a, err = p.bracketAtom()
			} else {
				a, err = p.organicAtom()
			}
			if err != nil {
				return nil, err
			}
			if prev >= 0 {
				if err := p.addBond(prev, a, bondSym, bondAt, start); err != nil {
					return nil, err
				}
			}
			bondSym = 0
			prev = a
		default:
			return nil, p.errAt(start, 1, "unexpected character")
		}
		justOpened = false
	}
	if bondSym != 0 {
		return nil, p.errAt(bondAt, 1, "bond symbol without a following atom")
	}
	if len(stack) > 0 {
		return nil, p.errAt(stackPos[len(stackPos)-1], 1, "unclosed branch '('")
	}
	for num, r := range p.rings {
		if r.active {
			return nil, p.errAt(r.pos, 1, fmt.Sprintf("ring bond %d is never closed", num))
		}
	}
	if len(p.g.Atoms) == 0 {
		return nil, &SMILESError{Input: p.s, Pos: 0, Token: p.s, Msg: "no atoms"}
	}
	if err := p.foldHydrogens(); err != nil {
		return nil, err
	}
	if p.fragment {
		return p.g, nil
	}
	if err := p.finish(); err != nil {
		return nil, err
	}
	return p.g, nil
}

func isDigit(c byte) bool  { return c >= '0' && c <= '9' }
func isLetter(c byte) bool { return c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' }

// bondOrder resolves a bond symbol (0 = none) between atoms a and b.
func (p *smilesParser) bondOrder(a, b int, sym byte, at int) (Order, error) {
	switch sym {
	case 0:
		if p.arom[a] && p.arom[b] {
			return Aromatic, nil
		}
		return Single, nil
	case '-', '/', '\\':
		return Single, nil
	case '=':
		return Double, nil
	case '#':
		return Triple, nil
	case ':':
		if !p.arom[a] || !p.arom[b] {
			return 0, p.errAt(at, 1, "aromatic bond ':' between atoms not written as aromatic")
		}
		return Aromatic, nil
	}
	return 0, p.errAt(at, 1, "unknown bond symbol")
}

func (p *smilesParser) addBond(a, b int, sym byte, at, atomAt int) error {
	o, err := p.bondOrder(a, b, sym, at)
	if err != nil {
		return err
	}
	if _, err := p.g.AddBond(a, b, o); err != nil {
		return p.errAt(atomAt, 1, "invalid bond")
	}
	p.bondPos = append(p.bondPos, atomAt)
	p.bondSym = append(p.bondSym, sym)
	return nil
}

func (p *smilesParser) ringBond(atom, num int, sym byte, symAt, at, n int) error {
	r := &p.rings[num]
	if !r.active {
		*r = ringOpen{active: true, atom: atom, sym: sym, pos: at}
		return nil
	}
	r.active = false
	if r.atom == atom {
		return p.errAt(at, n, "ring bond from an atom to itself")
	}
	if p.g.BondBetween(r.atom, atom) >= 0 {
		return p.errAt(at, n, "ring bond duplicates an existing bond")
	}
	use, useAt := sym, symAt
	if r.sym != 0 {
		if sym != 0 && sym != r.sym && !(isSingleSym(sym) && isSingleSym(r.sym)) {
			return p.errAt(at, n, "ring bond symbols at its two ends disagree")
		}
		use, useAt = r.sym, r.pos
	}
	return p.addBond(r.atom, atom, use, useAt, at)
}

func isSingleSym(c byte) bool { return c == '-' || c == '/' || c == '\\' }

// Bits of smilesParser.written.
const (
	writtenH      = 1 << iota // bracket atom gave a hydrogen count
	writtenCharge             // bracket atom gave a charge
)

func (p *smilesParser) newAtom(e Element, h, charge int, arom, bracket bool, written uint8, pos, n int) int {
	a := p.g.AddAtom(e, h)
	p.g.Atoms[a].Charge = charge
	p.arom = append(p.arom, arom)
	p.bracket = append(p.bracket, bracket)
	p.written = append(p.written, written)
	p.atomPos = append(p.atomPos, pos)
	p.atomLen = append(p.atomLen, n)
	return a
}

func (p *smilesParser) organicAtom() (int, error) {
	s := p.s
	start := p.i
	c := s[p.i]
	var e Element
	arom := false
	n := 1
	switch c {
	case 'B':
		e = B
		if p.i+1 < len(s) && s[p.i+1] == 'r' {
			e, n = Br, 2
		}
	case 'C':
		e = C
		if p.i+1 < len(s) && s[p.i+1] == 'l' {
			e, n = Cl, 2
		}
	case 'N':
		e = N
	case 'O':
		e = O
	case 'P':
		e = P
	case 'S':
		e = S
	case 'F':
		e = F
	case 'I':
		e = I
	case 'b':
		e, arom = B, true
	case 'c':
		e, arom = C, true
	case 'n':
		e, arom = N, true
	case 'o':
		e, arom = O, true
	case 'p':
		e, arom = P, true
	case 's':
		e, arom = S, true
	case 'H':
		return 0, p.errAt(start, 1, "explicit hydrogen atoms are not supported (write the count in the neighbour's bracket, as in [CH4])")
	default:
		j := p.i + 1
		if c >= 'A' && c <= 'Z' && j < len(s) && s[j] >= 'a' && s[j] <= 'z' {
			j++
		}
		return 0, p.errAt(start, j-start, "element not in the organic subset (write other supported elements in brackets, such as [SiH4]; supported: B C N O F Si P S Cl Br I)")
	}
	p.i += n
	return p.newAtom(e, -1, 0, arom, false, 0, start, n), nil
}

// bracketAtom reads [isotope? symbol chirality? hcount? charge? class?].
func (p *smilesParser) bracketAtom() (int, error) {
	s := p.s
	open := p.i
	p.i++
	end := strings.IndexByte(s[p.i:], ']')
	if end < 0 {
		return 0, p.errAt(open, len(s)-open, "unclosed bracket atom '['")
	}
	end += p.i
	tok := end + 1 - open
	if p.i < end && isDigit(s[p.i]) {
		return 0, p.errAt(open, tok, "isotopes are not supported")
	}
	if p.i >= end {
		return 0, p.errAt(open, tok, "empty bracket atom")
	}
	var e Element
	arom := false
	c := s[p.i]
	switch {
	case c == 'H' && (p.i+1 == end || !(s[p.i+1] >= 'a' && s[p.i+1] <= 'z')):
		// An explicit hydrogen atom: [H] (or [H:n]) only; it is folded
		// into its neighbour's hydrogen count after parsing.
		q := p.i + 1
		if q < end && s[q] == ':' {
			q++
			for q < end && isDigit(s[q]) {
				q++
			}
		}
		if q != end {
			return 0, p.errAt(open, tok, "explicit hydrogen atoms must be written [H] (no charge or hydrogen count; write [CH4] style counts instead)")
		}
		p.i = end + 1
		return p.newAtom(H, 0, 0, false, true, 0, open, tok), nil
	case c >= 'A' && c <= 'Z':
		j := p.i + 1
		if j < end && s[j] >= 'a' && s[j] <= 'z' {
			j++
		}
		el, ok := ElementBySymbol(s[p.i:j])
		if !ok || el == H {
			return 0, p.errAt(p.i, j-p.i, "unsupported element (supported: B C N O F Si P S Cl Br I)")
		}
		e = el
		p.i = j
	case c >= 'a' && c <= 'z':
		if p.i+1 < end && s[p.i+1] >= 'a' && s[p.i+1] <= 'z' {
			return 0, p.errAt(p.i, 2, "unsupported aromatic element (supported: b c n o p s)")
		}
		switch c {
		case 'b':
			e = B
		case 'c':
			e = C
		case 'n':
			e = N
		case 'o':
			e = O
		case 'p':
			e = P
		case 's':
			e = S
		default:
			return 0, p.errAt(p.i, 1, "unsupported aromatic element (supported: b c n o p s)")
		}
		arom = true
		p.i++
	default:
		return 0, p.errAt(p.i, 1, "expected an element symbol")
	}
	// Chirality marks are checked and ignored (no stereochemistry).
	if p.i < end && s[p.i] == '@' {
		n := chiralityLen(s[p.i:end])
		if n == 0 {
			j := p.i + 1
			for j < end && (s[j] == '@' || s[j] >= 'A' && s[j] <= 'Z' && s[j] != 'H' || isDigit(s[j])) {
				j++
			}
			return 0, p.errAt(p.i, j-p.i, "invalid chirality mark (OpenSMILES allows @, @@, @TH1-2, @AL1-2, @SP1-3, @TB1-20, @OH1-30)")
		}
		p.i += n
	}
	h := 0
	var written uint8
	if p.i < end && s[p.i] == 'H' {
		p.i++
		h = 1
		written |= writtenH
		if p.i < end && isDigit(s[p.i]) {
			h = int(s[p.i] - '0')
			p.i++
			if p.i < end && isDigit(s[p.i]) {
				return 0, p.errAt(open, tok, "hydrogen count too large")
			}
		}
	}
	charge := 0
	if p.i < end && (s[p.i] == '+' || s[p.i] == '-') {
		sign := 1
		if s[p.i] == '-' {
			sign = -1
		}
		sc := s[p.i]
		p.i++
		mag := 1
		if p.i < end && isDigit(s[p.i]) {
			mag = 0
			for p.i < end && isDigit(s[p.i]) && mag < 100 {
				mag = mag*10 + int(s[p.i]-'0')
				p.i++
			}
		} else {
			for p.i < end && s[p.i] == sc {
				mag++
				p.i++
			}
		}
		charge = sign * mag
		written |= writtenCharge
		if mag > 1 {
			return 0, p.errAt(open, tok, "charges beyond ±1 are not supported")
		}
	}
	if p.i < end && s[p.i] == ':' {
		p.i++
		j := p.i
		for p.i < end && isDigit(s[p.i]) {
			p.i++
		}
		if p.i == j {
			return 0, p.errAt(open, tok, "atom class ':' without a number")
		}
	}
	if p.i != end {
		return 0, p.errAt(p.i, 1, "unexpected character in bracket atom")
	}
	p.i = end + 1
	if charge != 0 && allowedValences(e, charge) == nil {
		return 0, p.errAt(open, tok, fmt.Sprintf("charge %+d is not supported on %s", charge, e))
	}
	return p.newAtom(e, h, charge, arom, true, written, open, tok), nil
}

// chiralityLen returns the length of the OpenSMILES chirality mark at the
// start of s ("@", "@@", "@TH1", "@TH2", "@AL1", "@AL2", "@SP1"–"@SP3",
// "@TB1"–"@TB20", "@OH1"–"@OH30"), or 0 if s does not start with a valid
// one. "@@@" and "@TH3" are not chirality marks.
func chiralityLen(s string) int {
	if len(s) >= 2 && s[1] == '@' {
		if len(s) > 2 && s[2] == '@' {
			return 0
		}
		return 2
	}
	if len(s) < 3 {
		return 1
	}
	var hi int
	switch s[1:3] {
	case "TH", "AL":
		hi = 2
	case "SP":
		hi = 3
	case "TB":
		hi = 20
	case "OH":
		hi = 30
	default:
		if s[1] >= 'A' && s[1] <= 'Z' && s[1] != 'H' {
			return 0 // an unknown chirality class
		}
		return 1
	}
	n, j := 0, 3
	for j < len(s) && isDigit(s[j]) && j < 5 {
		n = n*10 + int(s[j]-'0')
		j++
	}
	if j == 3 || n < 1 || n > hi || j < len(s) && isDigit(s[j]) || s[3] == '0' {
		return 0
	}
	return j
}

// allowedValences returns the valences (bond-order sum plus hydrogens)
// allowed for element e with formal charge q, or nil if that charge is not
// supported. Charged atoms take the valences of the isoelectronic neutral
// atom (N+ like C, O+ like N, C− like N, ...): common practice.
func allowedValences(e Element, q int) []int {
	switch q {
	case 0:
		return e.Valences()
	case 1:
		switch e {
		case C:
			return []int{3}
		case B:
			return []int{2}
		case N, P:
			return []int{4}
		case O:
			return []int{3}
		case S:
			return []int{3, 5}
		case F, Cl, Br, I:
			return []int{2}
		}
	case -1:
		switch e {
		case C:
			return []int{3}
		case B:
			return []int{4}
		case N:
			return []int{2}
		case P:
			return []int{2, 4}
		case O:
			return []int{1}
		case S:
			return []int{1, 3, 5}
		case F, Cl, Br, I:
			return []int{0}
		}
	}
	return nil
}

func valenceAllowed(e Element, q, v int) bool {
	for _, a := range allowedValences(e, q) {
		if a == v {
			return true
		}
	}
	return false
}

// organicHydrogens returns the implicit hydrogen count of an organic-subset
// atom given its bond-order sum (aromatic bonds counted as 1), following
// OpenSMILES: aliphatic atoms take the lowest normal valence that is at
// least the bond-order sum; aromatic atoms also reserve one valence for
// the π bond and use only the lowest valence (c 4, n 3, o 2, p 3, s 2,
// b 3), so c1ccccc1 has CH and c1cc[nH]c1 needs its H written.
func organicHydrogens(e Element, arom bool, sum int) int {
	if arom {
		h := e.MinValence() - sum - 1
		if h < 0 {
			return 0
		}
		return h
	}
	for _, v := range e.Valences() {
		if v >= sum {
			return v - sum
		}
	}
	return 0
}

// foldHydrogens removes explicit [H] atoms, each of which must have exactly
// one single bond to a heavy atom, and counts them in p.extraH of that
// atom; the remaining atoms keep their input order.
func (p *smilesParser) foldHydrogens() error {
	g := p.g
	nH := 0
	for _, a := range g.Atoms {
		if a.Element == H {
			nH++
		}
	}
	if nH == 0 {
		return nil
	}
	if nH == len(g.Atoms) {
		return &SMILESError{Input: p.s, Pos: 0, Token: p.s, Msg: "no heavy (non-hydrogen) atoms"}
	}
	newIdx := make([]int, len(g.Atoms))
	k := 0
	for i, a := range g.Atoms {
		if a.Element == H {
			newIdx[i] = -1
			nbs := g.Neighbors(i)
			if len(nbs) != 1 || nbs[0].Order != Single || g.Atoms[nbs[0].Atom].Element == H {
				return p.errAt(p.atomPos[i], p.atomLen[i], "an explicit hydrogen atom must have exactly one single bond to a heavy atom")
			}
			continue
		}
		newIdx[i] = k
		k++
	}
	h := NewGraph(k)
	extra := make([]int, k)
	var arom, bracket []bool
	var written []uint8
	var pos, ln []int
	for i, a := range g.Atoms {
		if newIdx[i] < 0 {
			extra[newIdx[g.Neighbors(i)[0].Atom]]++
			continue
		}
		h.AddAtom(a.Element, a.HCount)
		h.Atoms[newIdx[i]].Charge = a.Charge
		arom = append(arom, p.arom[i])
		bracket = append(bracket, p.bracket[i])
		written = append(written, p.written[i])
		pos = append(pos, p.atomPos[i])
		ln = append(ln, p.atomLen[i])
	}
	var syms []byte
	for bi, b := range g.Bonds {
		if newIdx[b.A] < 0 || newIdx[b.B] < 0 {
			continue
		}
		h.MustAddBond(newIdx[b.A], newIdx[b.B], b.Order)
		syms = append(syms, p.bondSym[bi])
	}
	for i := range extra {
		if bracket[i] && extra[i] > 0 {
			h.Atoms[i].HCount += extra[i]
			written[i] |= writtenH
		}
	}
	p.g, p.arom, p.bracket, p.written, p.atomPos, p.atomLen, p.bondSym, p.extraH = h, arom, bracket, written, pos, ln, syms, extra
	return nil
}

// finish assigns implicit hydrogens, kekulises and checks valences.
func (p *smilesParser) finish() error {
	g := p.g
	for i := range g.Atoms {
		if p.bracket[i] {
			continue
		}
		sum, extra := 0, 0
		if p.extraH != nil {
			extra = p.extraH[i]
		}
		for _, nb := range g.Neighbors(i) {
			if nb.Order == Aromatic {
				sum++
			} else {
				sum += int(nb.Order)
			}
		}
		// Folded [H] atoms count as bonds for the implicit-hydrogen rule.
		g.Atoms[i].HCount = organicHydrogens(g.Atoms[i].Element, p.arom[i], sum+extra) + extra
	}
	if bad, err := kekulize(g); err != nil {
		if bad >= 0 {
			return p.errAt(p.atomPos[bad], p.atomLen[bad], err.Error())
		}
		return &SMILESError{Input: p.s, Pos: 0, Token: p.s, Msg: err.Error()}
	}
	for i, a := range g.Atoms {
		v := g.Valence(i)
		vs := allowedValences(a.Element, a.Charge)
		if p.bracket[i] && len(vs) > 0 && v < vs[len(vs)-1] {
			// Bracket atoms are taken as written: [CH2] and [S] are
			// accepted with their open valences (CheckValence reports
			// them); only too many bonds are an error.
			continue
		}
		if !valenceAllowed(a.Element, a.Charge, v) {
			return p.errAt(p.atomPos[i], p.atomLen[i], fmt.Sprintf("valence %d is not allowed for %s%s (allowed %v)", v, a.Element, chargeSuffix(a.Charge), allowedValences(a.Element, a.Charge)))
		}
	}
	return nil
}

func chargeSuffix(q int) string {
	switch {
	case q == 1:
		return "+"
	case q == -1:
		return "-"
	case q > 0:
		return "+" + itoa(q)
	case q < 0:
		return "-" + itoa(-q)
	}
	return ""
}
