package spectrum

import (
	"fmt"
	"math"
	"sort"
	"strconv"
	"strings"
	"unicode/utf8"
)

// ParseJCAMP reads the 1H and 13C peak lists of a JCAMP-DX file (IUPAC
// JCAMP-DX 4.24 and 5.01: McDonald and Wilks, Appl. Spectrosc. 1988, 42,
// 151; NMR labels: Davies and Lampen, Appl. Spectrosc. 1993, 47, 1093).
//
// The file is a sequence of labelled data records "##LABEL= value" whose
// value runs to the next "##"; "$$" starts a comment to the end of the
// line; labels are compared ignoring case, spaces, hyphens, slashes and
// underscores. A block runs from ##TITLE= to ##END=; a compound file
// (##BLOCKS=) nests blocks. Every block that carries a peak table gives
// one PeakList, in file order, when its ##.OBSERVE NUCLEUS= is ^1H or
// ^13C (or, without that label, when its ##DATA TYPE= mentions NMR: then
// it is read as 1H). Blocks of other nuclei and techniques are skipped.
//
// Within a block:
//   - ##PEAK ASSIGNMENTS= (XYA), (XYMA), (XYWA) or (XYMWA), one
//     parenthesised entry per signal, "(4.12, 35.0, q, <OCH2>)": each
//     entry is a peak; M is a multiplicity (ParseMultiplicity) and A
//     the assignment, kept as Label. Used when present.
//   - otherwise ##PEAK TABLE= (XY..XY), (XYW..XYW) or (XYM..XYM): entries
//     "x,y" separated by spaces or semicolons. With an M column each entry
//     is a signal. Without one, in a 13C block each entry is a peak (a
//     proton-decoupled spectrum has one line per carbon), and in a 1H
//     block the entries are taken as the lines of a peak-picked spectrum
//     and grouped into signals: lines closer than lineGapHz belong to one
//     signal, whose shift is the intensity-weighted centre and whose range
//     spans its lines; a group whose spacings and intensities follow the
//     n+1 rule (1:1, 1:2:1, 1:3:3:1, ...) or a doublet of doublets
//     (1:1:1:1) gets that multiplicity and its J, any other group is "m".
//   - ##XUNITS= PPM or HZ; Hz values are converted with
//     ##.OBSERVE FREQUENCY= (MHz, also stored as PeakList.MHz) and referenced
//     by ##.SHIFT REFERENCE= (type, compound, point, ppm) when present:
//     the point's X is ##FIRSTX + (point−1)·##DELTAX when both are given,
//     otherwise 0 Hz.
//   - Y is a peak height: the standard has no integral column, so a 1H
//     Integral is left 0 (not given) except where a W (width) column is
//     given, where it is Y·W summed over the signal's lines (the area of
//     Lorentzian lines up to a constant factor). ScaleIntegrals only needs
//     relative areas. 13C heights are not read: 13C intensities do not
//     count carbons.
//   - ##.SOLVENT NAME= gives PeakList.Solvent (CanonicalSolvent; ""
//     when not recognised).
//
// Errors are *PeakError with Field the label concerned, Pos the byte
// offset and Line its line: a file not starting with ##TITLE=, a missing
// ##JCAMP-DX=, ##XUNITS= or ##END=, Hz without an observe frequency,
// malformed numbers or entries, unknown multiplicities, shifts outside the
// nucleus's range, or no 1H or 13C peak table at all (a spectrum of
// ##XYDATA= alone is not peak picked here).
func ParseJCAMP(b []byte) ([]PeakList, error) { return parseJCAMP(b, H1) }

// parseJCAMP is ParseJCAMP with def the nucleus of an NMR block without
// .OBSERVE NUCLEUS.
func parseJCAMP(b []byte, def Nucleus) ([]PeakList, error) {
	in := string(b)
	if len(b) > MaxPeakInput {
		return nil, &PeakError{Msg: "input longer than 1 MiB"}
	}
	if !utf8.Valid(b) {
		// JCAMP-DX is ASCII; Latin-1 bytes in titles are common, so read
		// the file byte by byte rather than reject it.
		in = latin1ToUTF8(b)
	}
	if strings.HasPrefix(in, "\ufeff") {
		in = "   " + in[3:] // a byte-order mark, blanked to keep the offsets
	}
	jc := &jcamp{in: in, def: def}
	root, err := jc.blocks()
	if err != nil {
		return nil, err
	}
	picked, err := jc.pick(root)
	if err != nil {
		return nil, err
	}
	lists := make([]PeakList, 0, len(picked))
	for _, pb := range picked {
		pl, err := jc.peakList(pb.block, pb.nuc)
		if err != nil {
			return nil, err
		}
		lists = append(lists, pl)
	}
	return lists, nil
}

// lineGapHz is the largest gap between neighbouring lines of one multiplet
// in a peak-picked table: vicinal and geminal H–H couplings stay below
// about 18 Hz (common practice).
const lineGapHz = 20.0

// defaultGroupMHz is the field assumed for grouping lines given in ppm
// when the file states no observe frequency.
const defaultGroupMHz = 400.0

type jcamp struct {
	in  string
	nuc Nucleus // nucleus of the block being read
	def Nucleus // nucleus of a block that names none
}

// ldr is one labelled data record.
type ldr struct {
	label string // normalised label (upper case, no spaces, -, /, _)
	raw   string // label as written
	value string // value with comments removed; continuation lines kept
	pos   int    // offset of "##"
	vpos  int    // offset of the value in the input
}

type jblock struct {
	ldrs     []ldr
	children []*jblock
}

func (b *jblock) get(label string) (ldr, bool) {
	for _, l := range b.ldrs {
		if l.label == label {
			return l, true
		}
	}
	return ldr{}, false
}

func (jc *jcamp) errAt(pos int, tok, field, msg string) error {
	return newPeakError(jc.in, pos, tok, field, msg)
}

func normLabel(s string) string {
	var b strings.Builder
	for i := 0; i < len(s); i++ {
		c := s[i]
		switch {
		case c == ' ' || c == '-' || c == '/' || c == '_' || c == '\t':
		case c >= 'a' && c <= 'z':
			b.WriteByte(c - 'a' + 'A')
		default:
			b.WriteByte(c)
		}
	}
	return b.String()
}

// records splits the input into labelled data records.
func (jc *jcamp) records() ([]ldr, error) {
	var out []ldr
	var parts [][]string // value lines of each record
	s := jc.in
	i := 0
	for i < len(s) {
		end := strings.IndexByte(s[i:], '\n')
		if end < 0 {
			end = len(s)
		} else {
			end += i
		}
		line := s[i:end]
		body := strings.TrimLeft(line, " \t")
		lead := len(line) - len(body)
		if strings.HasPrefix(body, "##") {
			eq := strings.IndexByte(body, '=')
			if eq < 0 {
				return nil, jc.errAt(i+lead, trimTok(body), "", "expected '=' after the label")
			}
			raw := body[2:eq]
			val := body[eq+1:]
			vlead := len(val) - len(strings.TrimLeft(val, " \t"))
			r := ldr{label: normLabel(raw), raw: strings.TrimSpace(raw), pos: i + lead, vpos: i + lead + eq + 1 + vlead}
			out = append(out, r)
			parts = append(parts, []string{stripComment(val[vlead:])})
		} else if len(out) > 0 {
			parts[len(out)-1] = append(parts[len(out)-1], stripComment(line))
		} else if strings.TrimSpace(stripComment(line)) != "" {
			return nil, jc.errAt(i+lead, trimTok(body), "TITLE", "a JCAMP-DX file starts with ##TITLE=")
		}
		i = end + 1
	}
	for k := range out {
		out[k].value = strings.Join(parts[k], "\n")
	}
	return out, nil
}

// stripComment removes a "$$" comment from a line, outside <...> text.
func stripComment(line string) string {
	inText := false
	for k := 0; k+1 < len(line); k++ {
		switch line[k] {
		case '<':
			inText = true
		case '>':
			inText = false
		case '$':
			if !inText && line[k+1] == '$' {
				return line[:k]
			}
		}
	}
	return strings.TrimRight(line, "\r")
}

func trimTok(s string) string {
	s = strings.TrimSpace(s)
	if len(s) > 40 {
		s = s[:40]
	}
	return s
}

// blocks reads the records into nested blocks; it returns the outermost.
func (jc *jcamp) blocks() (*jblock, error) {
	recs, err := jc.records()
	if err != nil {
		return nil, err
	}
	if len(recs) == 0 {
		return nil, jc.errAt(0, trimTok(jc.in), "TITLE", "not a JCAMP-DX file: no ##TITLE=")
	}
	if recs[0].label != "TITLE" {
		return nil, jc.errAt(recs[0].pos, "##"+recs[0].raw, "TITLE", "a JCAMP-DX file starts with ##TITLE=")
	}
	var stack []*jblock
	var root *jblock
	for k, r := range recs {
		switch r.label {
		case "TITLE":
			if root != nil && len(stack) == 0 {
				return nil, jc.errAt(r.pos, "##"+r.raw, "END", "text after the final ##END=")
			}
			b := &jblock{}
			if len(stack) > 0 {
				top := stack[len(stack)-1]
				top.children = append(top.children, b)
			} else {
				root = b
			}
			stack = append(stack, b)
			b.ldrs = append(b.ldrs, r)
		case "END":
			if len(stack) == 0 {
				return nil, jc.errAt(r.pos, "##"+r.raw, "END", "##END= without a block")
			}
			stack = stack[:len(stack)-1]
			if len(stack) == 0 && k+1 < len(recs) {
				n := recs[k+1]
				return nil, jc.errAt(n.pos, "##"+n.raw, "END", "text after the final ##END=")
			}
		default:
			if len(stack) == 0 {
				return nil, jc.errAt(r.pos, "##"+r.raw, "END", "text after the final ##END=")
			}
			top := stack[len(stack)-1]
			top.ldrs = append(top.ldrs, r)
		}
	}
	if len(stack) > 0 {
		return nil, jc.errAt(len(jc.in), "", "END", "missing ##END=")
	}
	if _, ok := root.get("JCAMPDX"); !ok {
		return nil, jc.errAt(root.ldrs[0].pos, "##TITLE=", "JCAMP-DX", "missing ##JCAMP-DX= version record")
	}
	return root, nil
}

// pickedBlock is a block with a peak table of a nucleus shiftrank reads.
type pickedBlock struct {
	block *jblock
	nuc   Nucleus
}

// pick returns the blocks holding 1H or 13C peak tables, in file order.
func (jc *jcamp) pick(root *jblock) ([]pickedBlock, error) {
	var found []*jblock
	var walk func(b *jblock)
	walk = func(b *jblock) {
		found = append(found, b)
		for _, c := range b.children {
			walk(c)
		}
	}
	walk(root)
	var picked []pickedBlock
	var other string
	for _, b := range found {
		_, pt := b.get("PEAKTABLE")
		_, pa := b.get("PEAKASSIGNMENTS")
		if !pt && !pa {
			continue
		}
		if nuc, ok := b.get(".OBSERVENUCLEUS"); ok {
			n, err := ParseNucleus(nuc.value)
			if err != nil {
				other = strings.TrimSpace(nuc.value)
				continue
			}
			picked = append(picked, pickedBlock{b, n})
			continue
		}
		if dt, ok := b.get("DATATYPE"); ok && !strings.Contains(strings.ToUpper(dt.value), "NMR") {
			other = strings.TrimSpace(dt.value)
			continue
		}
		picked = append(picked, pickedBlock{b, jc.def})
	}
	switch {
	case len(picked) > 0:
		return picked, nil
	case other != "":
		return nil, jc.errAt(0, other, "PEAK TABLE", "no 1H or 13C NMR peak table (found "+other+")")
	}
	return nil, jc.errAt(0, "", "PEAK TABLE", "no ##PEAK TABLE= or ##PEAK ASSIGNMENTS= in the file")
}

// jnum parses a JCAMP-DX number (decimal, optional exponent).
func jnum(s string) (float64, bool) {
	s = strings.TrimSpace(s)
	if s == "" {
		return 0, false
	}
	for i := 0; i < len(s); i++ {
		c := s[i]
		if !(c >= '0' && c <= '9' || c == '.' || c == '-' || c == '+' || c == 'e' || c == 'E') {
			return 0, false
		}
	}
	v, err := strconv.ParseFloat(s, 64)
	if err != nil || math.IsInf(v, 0) || math.IsNaN(v) {
		return 0, false
	}
	return v, true
}

func (jc *jcamp) numberLDR(b *jblock, label string) (float64, bool, error) {
	r, ok := b.get(label)
	if !ok {
		return 0, false, nil
	}
	v, ok := jnum(r.value)
	if !ok {
		return 0, false, jc.errAt(r.vpos, trimTok(r.value), r.raw, "malformed number")
	}
	return v, true, nil
}

// axis converts X values of the block to ppm.
type axis struct {
	hz     bool
	mhz    float64
	offset float64 // ppm at X = xRef
	xRef   float64 // Hz
}

func (a axis) ppm(x float64) float64 {
	if !a.hz {
		return x
	}
	return roundPPM(a.offset + (x-a.xRef)/a.mhz)
}

// roundPPM rounds a shift derived from Hz or from several lines to
// 0.0001 ppm, well below what a 1H shift means.
func roundPPM(x float64) float64 { return math.Round(x*1e4) / 1e4 }

// peakList reads the peak table of block b, whose nucleus is nuc.
func (jc *jcamp) peakList(b *jblock, nuc Nucleus) (PeakList, error) {
	pl := PeakList{Nucleus: nuc, Pos: b.ldrs[0].pos}
	jc.nuc = nuc
	mhz, hasMHz, err := jc.numberLDR(b, ".OBSERVEFREQUENCY")
	if err != nil {
		return pl, err
	}
	if hasMHz {
		if mhz < 1 || mhz > 2000 {
			r, _ := b.get(".OBSERVEFREQUENCY")
			return pl, jc.errAt(r.vpos, trimTok(r.value), r.raw, "spectrometer frequency outside 1 to 2000 MHz")
		}
		pl.MHz = mhz
	}
	if sv, ok := b.get(".SOLVENTNAME"); ok {
		if c, ok := CanonicalSolvent(strings.TrimSpace(sv.value)); ok {
			pl.Solvent = c
		}
	}
	xu, ok := b.get("XUNITS")
	if !ok {
		return pl, jc.errAt(b.ldrs[0].pos, "##TITLE=", "XUNITS", "missing ##XUNITS=")
	}
	ax := axis{}
	switch strings.ToUpper(strings.TrimSpace(xu.value)) {
	case "PPM":
	case "HZ":
		if !hasMHz {
			return pl, jc.errAt(xu.vpos, trimTok(xu.value), "XUNITS", "X in Hz needs ##.OBSERVE FREQUENCY=")
		}
		ax = axis{hz: true, mhz: mhz}
		if ref, ok := b.get(".SHIFTREFERENCE"); ok {
			if err := jc.shiftReference(b, ref, &ax); err != nil {
				return pl, err
			}
		}
	default:
		return pl, jc.errAt(xu.vpos, trimTok(xu.value), "XUNITS", "X units must be PPM or HZ")
	}
	if pa, ok := b.get("PEAKASSIGNMENTS"); ok {
		pl.Peaks, err = jc.assignments(pa, ax)
	} else {
		pt, _ := b.get("PEAKTABLE")
		gm := pl.MHz
		if gm == 0 {
			gm = defaultGroupMHz
		}
		pl.Peaks, err = jc.table(pt, ax, gm)
	}
	if err != nil {
		return PeakList{}, err
	}
	if len(pl.Peaks) == 0 {
		return PeakList{}, jc.errAt(b.ldrs[0].pos, "##TITLE=", "PEAK TABLE", "the peak table is empty")
	}
	return pl, nil
}

func (jc *jcamp) shiftReference(b *jblock, ref ldr, ax *axis) error {
	v := strings.TrimSpace(ref.value)
	if !strings.HasPrefix(v, "(") || !strings.HasSuffix(v, ")") {
		return jc.errAt(ref.vpos, trimTok(ref.value), ref.raw, "expected (type, compound, point, shift)")
	}
	parts := strings.Split(v[1:len(v)-1], ",")
	if len(parts) != 4 {
		return jc.errAt(ref.vpos, trimTok(ref.value), ref.raw, "expected (type, compound, point, shift)")
	}
	point, ok1 := jnum(parts[2])
	shift, ok2 := jnum(parts[3])
	if !ok1 || !ok2 || point < 1 || point != math.Trunc(point) {
		return jc.errAt(ref.vpos, trimTok(ref.value), ref.raw, "malformed number")
	}
	ax.offset = shift
	first, hasFirst, err := jc.numberLDR(b, "FIRSTX")
	if err != nil {
		return err
	}
	delta, hasDelta, err := jc.numberLDR(b, "DELTAX")
	if err != nil {
		return err
	}
	if hasFirst && hasDelta {
		ax.xRef = first + (point-1)*delta
	}
	return nil
}

// varList reads the variable list "(XY..XY)" at the start of a value and
// returns its symbols and the rest of the value with its offset.
func (jc *jcamp) varList(r ldr) (vars string, rest string, restPos int, err error) {
	v := r.value
	lead := len(v) - len(strings.TrimLeft(v, " \t"))
	t := v[lead:]
	if !strings.HasPrefix(t, "(") {
		return "", "", 0, jc.errAt(r.vpos+lead, trimTok(t), r.raw, "expected a variable list such as (XY..XY)")
	}
	end := strings.IndexByte(t, ')')
	if end < 0 {
		return "", "", 0, jc.errAt(r.vpos+lead, trimTok(t), r.raw, "unclosed variable list")
	}
	list := strings.ToUpper(strings.ReplaceAll(t[1:end], " ", ""))
	if k := strings.Index(list, ".."); k >= 0 {
		if list[k+2:] != list[:k] {
			return "", "", 0, jc.errAt(r.vpos+lead, t[:end+1], r.raw, "malformed variable list")
		}
		list = list[:k]
	}
	return list, t[end+1:], r.vpos + lead + end + 1, nil
}

// field is one comma-separated value of an entry.
type jfield struct {
	text string
	pos  int
}

// splitEntry splits an entry at commas outside <...>, trimming space.
func splitEntry(s string, base int) []jfield {
	var out []jfield
	inText := false
	start := 0
	emit := func(end int) {
		seg := s[start:end]
		lead := len(seg) - len(strings.TrimLeft(seg, " \t\r\n"))
		out = append(out, jfield{text: strings.TrimSpace(seg), pos: base + start + lead})
	}
	for k := 0; k < len(s); k++ {
		switch s[k] {
		case '<':
			inText = true
		case '>':
			inText = false
		case ',':
			if !inText {
				emit(k)
				start = k + 1
			}
		}
	}
	emit(len(s))
	return out
}

// assignments reads ##PEAK ASSIGNMENTS= entries "(x, y, m, <a>)".
func (jc *jcamp) assignments(r ldr, ax axis) ([]Peak, error) {
	vars, rest, base, err := jc.varList(r)
	if err != nil {
		return nil, err
	}
	if !validVars(vars, true) {
		return nil, jc.errAt(r.vpos, trimTok(r.value), r.raw, "variable list must be (XYA), (XYMA), (XYWA) or (XYMWA)")
	}
	var peaks []Peak
	k := 0
	for k < len(rest) {
		c := rest[k]
		if c == ' ' || c == '\t' || c == '\r' || c == '\n' {
			k++
			continue
		}
		if c != '(' {
			return nil, jc.errAt(base+k, trimTok(peakWordAt(rest, k)), r.raw, "expected '(' starting an entry")
		}
		end := k + 1
		inText := false
		for end < len(rest) && (inText || rest[end] != ')') {
			switch rest[end] {
			case '<':
				inText = true
			case '>':
				inText = false
			}
			end++
		}
		if end >= len(rest) {
			return nil, jc.errAt(base+k, trimTok(rest[k:]), r.raw, "unclosed entry")
		}
		if len(peaks) == MaxPeaks {
			return nil, jc.errAt(base+k, trimTok(rest[k:]), r.raw, "more than 1000 peaks")
		}
		fields := splitEntry(rest[k+1:end], base+k+1)
		pk, err := jc.entry(r, vars, fields, ax, base+k, rest[k:end+1])
		if err != nil {
			return nil, err
		}
		if w := strings.IndexByte(vars, 'W'); w >= 0 && jc.nuc == H1 {
			// Height times width: the area of a Lorentzian line up to a
			// constant factor.
			y, okY := jnum(fields[1].text)
			wd, okW := jnum(fields[w].text)
			if okY && okW && y > 0 && wd > 0 {
				pk.Integral = y * wd
			}
		}
		peaks = append(peaks, pk)
		k = end + 1
	}
	return peaks, nil
}

// validVars checks a variable list: X first, then Y, then any of W, M
// (once each), and A last for assignments.
func validVars(vars string, assign bool) bool {
	if assign {
		if !strings.HasSuffix(vars, "A") {
			return false
		}
		vars = vars[:len(vars)-1]
	}
	if !strings.HasPrefix(vars, "XY") {
		return false
	}
	seen := map[rune]bool{}
	for _, c := range vars[2:] {
		if (c != 'W' && c != 'M') || seen[c] {
			return false
		}
		seen[c] = true
	}
	return true
}

// entry builds a peak from the fields of one entry.
func (jc *jcamp) entry(r ldr, vars string, fields []jfield, ax axis, pos int, text string) (Peak, error) {
	var pk Peak
	if len(fields) != len(vars) {
		return pk, jc.errAt(pos, trimTok(text), r.raw, fmt.Sprintf("entry has %d values, the variable list (%s) %d", len(fields), vars, len(vars)))
	}
	for k, f := range fields {
		switch vars[k] {
		case 'X':
			x, ok := jnum(f.text)
			if !ok {
				return pk, jc.errAt(f.pos, trimTok(f.text), r.raw, "malformed number")
			}
			s := ax.ppm(x)
			pk.setShift(s, s)
		case 'Y', 'W':
			if f.text == "" || f.text == "?" { // "?": value not known
				continue
			}
			if _, ok := jnum(f.text); !ok {
				return pk, jc.errAt(f.pos, trimTok(f.text), r.raw, "malformed number")
			}
		case 'M':
			if f.text == "" || f.text == "?" {
				continue
			}
			m, ok := parseMultiplicity(f.text)
			if !ok {
				return pk, jc.errAt(f.pos, trimTok(f.text), r.raw, "unknown multiplicity")
			}
			pk.Multiplicity = m
		case 'A':
			a := strings.TrimSpace(f.text)
			a = strings.TrimSuffix(strings.TrimPrefix(a, "<"), ">")
			pk.Label = strings.TrimSpace(a)
		}
	}
	pk.Pos, pk.Text = pos, strings.TrimSpace(text)
	if _, msg := checkPeak(jc.nuc, pk); msg != "" {
		return pk, jc.errAt(pos, trimTok(text), r.raw, msg)
	}
	return pk, nil
}

// line is one entry of a peak-picked table.
type jline struct {
	ppm, y, w float64
	pos       int
	text      string
}

// table reads ##PEAK TABLE= entries "x,y" (or "x,y,w", "x,y,m").
func (jc *jcamp) table(r ldr, ax axis, groupMHz float64) ([]Peak, error) {
	vars, rest, base, err := jc.varList(r)
	if err != nil {
		return nil, err
	}
	if !validVars(vars, false) {
		return nil, jc.errAt(r.vpos, trimTok(r.value), r.raw, "variable list must be (XY..XY), (XYW..XYW) or (XYM..XYM)")
	}
	hasM := strings.ContainsRune(vars, 'M')
	hasW := strings.ContainsRune(vars, 'W')
	var peaks []Peak
	var lines []jline
	for _, e := range tableEntries(rest, base) {
		if len(peaks)+len(lines) >= 8*MaxPeaks {
			return nil, jc.errAt(e.pos, trimTok(e.text), r.raw, "too many entries")
		}
		fields := splitEntry(e.text, e.pos)
		pk, err := jc.entry(r, vars, fields, ax, e.pos, e.text)
		if err != nil {
			return nil, err
		}
		if hasM || jc.nuc == C13 {
			peaks = append(peaks, pk)
			continue
		}
		y, _ := jnum(fields[1].text)
		w := 0.0
		if hasW {
			w, _ = jnum(fields[2].text)
		}
		lines = append(lines, jline{ppm: pk.Shift, y: y, w: w, pos: e.pos, text: pk.Text})
	}
	if hasM || jc.nuc == C13 {
		if len(peaks) > MaxPeaks {
			return nil, jc.errAt(r.vpos, trimTok(r.value), r.raw, "more than 1000 peaks")
		}
		return peaks, nil
	}
	peaks = groupLines(lines, groupMHz, hasW)
	if len(peaks) > MaxPeaks {
		return nil, jc.errAt(r.vpos, trimTok(r.value), r.raw, "more than 1000 peaks")
	}
	return peaks, nil
}

// tableEntries splits (XY..XY) data into entries: groups separated by
// white space or semicolons, with the values of a group joined by commas
// (spaces around the commas allowed).
func tableEntries(s string, base int) []jfield {
	var out []jfield
	k := 0
	for k < len(s) {
		c := s[k]
		if c == ' ' || c == '\t' || c == '\r' || c == '\n' || c == ';' {
			k++
			continue
		}
		start := k
		for k < len(s) {
			c := s[k]
			if c == ';' {
				break
			}
			if c == ' ' || c == '\t' || c == '\r' || c == '\n' {
				// A space belongs to the entry when a comma is next to it.
				j := k
				for j < len(s) && (s[j] == ' ' || s[j] == '\t' || s[j] == '\r' || s[j] == '\n') {
					j++
				}
				prevComma := k > start && s[k-1] == ','
				nextComma := j < len(s) && s[j] == ','
				if !prevComma && !nextComma {
					break
				}
				k = j
				continue
			}
			k++
		}
		out = append(out, jfield{text: s[start:k], pos: base + start})
	}
	return out
}

// groupLines groups the lines of a peak-picked table into signals.
func groupLines(lines []jline, mhz float64, hasW bool) []Peak {
	sort.SliceStable(lines, func(i, j int) bool { return lines[i].ppm > lines[j].ppm })
	gap := lineGapHz / mhz
	var peaks []Peak
	for i := 0; i < len(lines); {
		j := i + 1
		for j < len(lines) && lines[j-1].ppm-lines[j].ppm <= gap {
			j++
		}
		peaks = append(peaks, multiplet(lines[i:j], mhz, hasW))
		i = j
	}
	return peaks
}

// binomial[n] are the n+1-rule line intensities of n lines.
var binomial = [][]float64{
	nil, {1}, {1, 1}, {1, 2, 1}, {1, 3, 3, 1}, {1, 4, 6, 4, 1},
	{1, 5, 10, 10, 5, 1}, {1, 6, 15, 20, 15, 6, 1},
}

// multiplet builds one signal from its lines (sorted high to low ppm).
func multiplet(ls []jline, mhz float64, hasW bool) Peak {
	var pk Peak
	sumY, sumXY, area := 0.0, 0.0, 0.0
	for _, l := range ls {
		y := math.Max(l.y, 0)
		sumY += y
		sumXY += y * l.ppm
		area += y * l.w
	}
	lo, hi := ls[len(ls)-1].ppm, ls[0].ppm
	centre := (lo + hi) / 2
	if sumY > 0 {
		centre = sumXY / sumY
	}
	pk.Multiplicity, pk.J = firstOrder(ls, mhz)
	if pk.Multiplicity.IsMultiplet() {
		// A multiplet is reported as the range of its lines.
		pk.ShiftLo, pk.ShiftHi, pk.Shift = lo, hi, (lo+hi)/2
	} else {
		c := roundPPM(centre)
		pk.ShiftLo, pk.ShiftHi, pk.Shift = c, c, c
	}
	if hasW && area > 0 {
		pk.Integral = area
	}
	pk.Pos = ls[0].pos
	texts := make([]string, len(ls))
	for i, l := range ls {
		texts[i] = l.text
	}
	pk.Text = strings.Join(texts, " ")
	return pk
}

// firstOrder recognises n+1-rule patterns and doublets of doublets in a
// group of lines: spacings equal within 0.5 Hz (or 10 %), intensities
// within 30 % of the pattern. Anything else is "m".
func firstOrder(ls []jline, mhz float64) (Multiplicity, []float64) {
	n := len(ls)
	if n == 1 {
		return Singlet(), nil
	}
	sp := make([]float64, n-1)
	for i := range sp {
		sp[i] = (ls[i].ppm - ls[i+1].ppm) * mhz
	}
	near := func(a, b float64) bool { return math.Abs(a-b) <= math.Max(0.5, 0.1*math.Max(a, b)) }
	y := make([]float64, n)
	for i, l := range ls {
		y[i] = l.y
	}
	if n < len(binomial) {
		equal := true
		for _, s := range sp {
			if !near(s, sp[0]) {
				equal = false
			}
		}
		// A doublet keeps its name under the roof effect.
		mean := 0.0
		for _, s := range sp {
			mean += s
		}
		mean = roundJ(mean / float64(len(sp)))
		if equal && mean > 0 && (n == 2 || intensitiesFit(y, binomial[n])) {
			return Split(n), []float64{mean}
		}
	}
	if n == 4 && roundJ(sp[0]) > 0 && near(sp[0], sp[2]) && !near(sp[0], sp[1]) && intensitiesFit(y, []float64{1, 1, 1, 1}) {
		return Split(2, 2), []float64{roundJ(sp[0] + sp[1]), roundJ(sp[0])}
	}
	return Multiplet(), nil
}

func intensitiesFit(y, want []float64) bool {
	sy, sw := 0.0, 0.0
	for i := range y {
		sy += y[i]
		sw += want[i]
	}
	if sy <= 0 {
		return false
	}
	for i := range y {
		e := want[i] / sw
		if math.Abs(y[i]/sy-e) > 0.30*e {
			return false
		}
	}
	return true
}

// roundJ rounds a coupling measured from line positions to 0.1 Hz, the
// precision journals report (common practice).
func roundJ(j float64) float64 { return math.Round(j*10) / 10 }

func latin1ToUTF8(b []byte) string {
	var sb strings.Builder
	for _, c := range b {
		sb.WriteRune(rune(c))
	}
	return sb.String()
}
