package spectrum

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
)

// ParseJSON reads peak lists in JSON. The input is one of
//
//   - an array of peaks, a 1H list:
//     [{"shift": 4.12, "multiplicity": "q", "j": [7.1], "integral": 2},
//     {"range": [7.35, 7.20], "multiplicity": "m", "integral": 5}]
//   - a list object {"nucleus": "13C", "mhz": 101, "solvent": "CDCl3",
//     "peaks": [...]} ("nucleus" "1H" or "13C", default "1H"; "mhz" and
//     "solvent" optional);
//   - an array of list objects, one per nucleus or measurement.
//
// A peak has exactly one of "shift" (ppm) and "range" (two shifts in ppm,
// either order), and optionally "multiplicity" (any spelling
// ParseMultiplicity accepts, or ""), "apparent" (bool), "j" (Hz) and
// "label" (free text); a 1H peak "integral" (relative area, positive), a
// 13C peak "count" (number of carbons, a whole number from 1) and "dept"
// ("CH3", "CH2", "CH", "C"): {"shift": 129.3, "dept": "CH", "count": 2}.
// The parser is strict: unknown or repeated fields, wrong types, trailing
// data, a list without peaks and the checks of ParseText (shift range of
// the nucleus, J on a singlet, ...) give a *PeakError whose Field is the
// path of the offending value ("peaks[1].j", "[0].color",
// "[1].peaks[0].dept") and whose Pos is its byte offset.
func ParseJSON(b []byte) ([]PeakList, error) { return parseJSON(b, H1) }

// parseJSON is ParseJSON with def the nucleus of a bare array of peaks and
// of a list object without "nucleus".
func parseJSON(b []byte, def Nucleus) ([]PeakList, error) {
	jp := &jsonPeaks{in: b, dec: json.NewDecoder(bytes.NewReader(b)), def: def}
	jp.dec.UseNumber()
	if len(b) > MaxPeakInput {
		return nil, jp.errAt(0, "", "", "input longer than 1 MiB")
	}
	return jp.top()
}

type jsonPeaks struct {
	in  []byte
	dec *json.Decoder
	def Nucleus // nucleus of a list that names none
}

func (jp *jsonPeaks) errAt(pos int, tok, field, msg string) error {
	return newPeakError(string(jp.in), pos, tok, field, msg)
}

// next returns the next token and its start offset.
func (jp *jsonPeaks) next(field string) (json.Token, int, error) {
	pos := int(jp.dec.InputOffset())
	for pos < len(jp.in) && bytes.IndexByte([]byte(" \t\r\n,:"), jp.in[pos]) >= 0 {
		pos++
	}
	t, err := jp.dec.Token()
	if err != nil {
		var se *json.SyntaxError
		switch {
		case errors.As(err, &se):
			off := int(se.Offset)
			return nil, off, jp.errAt(off, jsonTokenAt(jp.in, off), field, "JSON syntax: "+se.Error())
		case errors.Is(err, io.EOF), errors.Is(err, io.ErrUnexpectedEOF):
			return nil, len(jp.in), jp.errAt(len(jp.in), "", field, "unexpected end of JSON")
		default:
			return nil, pos, jp.errAt(pos, jsonTokenAt(jp.in, pos), field, "JSON: "+err.Error())
		}
	}
	return t, pos, nil
}

// jsonTokenAt returns up to 20 bytes of b at off, for error messages.
func jsonTokenAt(b []byte, off int) string {
	if off < 0 || off >= len(b) {
		return ""
	}
	end := min(len(b), off+20)
	return string(b[off:end])
}

func (jp *jsonPeaks) tokText(pos int) string {
	end := int(jp.dec.InputOffset())
	if pos < 0 || end > len(jp.in) || end < pos {
		return ""
	}
	return string(jp.in[pos:end])
}

// listKeys are the members of a list object; a peak object has none of
// them, so the first key of an array element tells the two forms apart.
var listKeys = map[string]bool{"nucleus": true, "mhz": true, "solvent": true, "peaks": true}

// key is an object member name and the offset just past its opening
// quote.
type key struct {
	name string
	pos  int
}

// nextKey reads the next member name of an object, or returns ok false at
// its end (after consuming the '}').
func (jp *jsonPeaks) nextKey(path string) (k key, ok bool, err error) {
	if !jp.dec.More() {
		if _, _, err := jp.next(path); err != nil { // '}'
			return key{}, false, err
		}
		return key{}, false, nil
	}
	t, pos, err := jp.next(path)
	if err != nil {
		return key{}, false, err
	}
	name, _ := t.(string)
	return key{name: name, pos: pos + 1}, true, nil
}

func (jp *jsonPeaks) top() ([]PeakList, error) {
	var lists []PeakList
	t, pos, err := jp.next("")
	if err != nil {
		return nil, err
	}
	switch t {
	case json.Delim('['):
		if lists, err = jp.topArray(pos); err != nil {
			return nil, err
		}
	case json.Delim('{'):
		k, ok, err := jp.nextKey("")
		if err != nil {
			return nil, err
		}
		pl, err := jp.listBody("", pos, k, ok)
		if err != nil {
			return nil, err
		}
		lists = []PeakList{pl}
	default:
		return nil, jp.errAt(pos, jp.tokText(pos), "", "expected an array of peaks, a peak list object or an array of them")
	}
	// Nothing may follow the value.
	if _, err := jp.dec.Token(); err != io.EOF {
		off := int(jp.dec.InputOffset())
		for off < len(jp.in) && bytes.IndexByte([]byte(" \t\r\n"), jp.in[off]) >= 0 {
			off++
		}
		return nil, jp.errAt(off, jsonTokenAt(jp.in, off), "", "unexpected data after the JSON value")
	}
	return lists, nil
}

// topArray reads a top-level array after its '[': the peaks of one 1H
// list, or list objects.
func (jp *jsonPeaks) topArray(start int) ([]PeakList, error) {
	var peaks []jsonPeak
	var lists []PeakList
	for i := 0; jp.dec.More(); i++ {
		path := fmt.Sprintf("[%d]", i)
		t, epos, err := jp.next(path)
		if err != nil {
			return nil, err
		}
		if t != json.Delim('{') {
			return nil, jp.errAt(epos, jp.tokText(epos), path, "expected a peak object")
		}
		k, ok, err := jp.nextKey(path)
		if err != nil {
			return nil, err
		}
		isList := ok && listKeys[k.name]
		switch {
		case i > 0 && isList != (lists != nil):
			return nil, jp.errAt(epos, "{", path, "an array holds either peaks or peak lists, not both")
		case isList:
			pl, err := jp.listBody(path, epos, k, ok)
			if err != nil {
				return nil, err
			}
			lists = append(lists, pl)
		default:
			if len(peaks) == MaxPeaks {
				return nil, jp.errAt(epos, "{", "", "more than 1000 peaks")
			}
			pk, err := jp.peakBody(path, epos, k, ok)
			if err != nil {
				return nil, err
			}
			peaks = append(peaks, pk)
		}
	}
	if _, _, err := jp.next(""); err != nil { // ']'
		return nil, err
	}
	if lists != nil {
		return lists, nil
	}
	if len(peaks) == 0 {
		return nil, jp.errAt(start, string(jp.in[start:min(len(jp.in), start+40)]), "peaks", "no peaks")
	}
	pl := PeakList{Nucleus: jp.def, Pos: start}
	if err := jp.finish(&pl, peaks); err != nil {
		return nil, err
	}
	return []PeakList{pl}, nil
}

// listBody reads the members of a list object whose '{' is at start and
// whose first member name k has been read (ok false: the object was
// empty). path is the object's own path ("" at the top).
func (jp *jsonPeaks) listBody(path string, start int, k key, ok bool) (PeakList, error) {
	pl := PeakList{Nucleus: jp.def, Pos: start}
	prefix := path
	if prefix != "" {
		prefix += "."
	}
	seen := map[string]bool{}
	var peaks []jsonPeak
	peaksAt := start
	var err error
	for ; ok; k, ok, err = jp.nextKey(path) {
		field := prefix + k.name
		if seen[k.name] {
			return pl, jp.errAt(k.pos, k.name, field, "repeated field")
		}
		seen[k.name] = true
		switch k.name {
		case "peaks":
			t, vpos, err := jp.next(field)
			if err != nil {
				return pl, err
			}
			if t != json.Delim('[') {
				return pl, jp.errAt(vpos, jp.tokText(vpos), field, "expected an array of peaks")
			}
			peaksAt = vpos
			for i := 0; jp.dec.More(); i++ {
				ppath := fmt.Sprintf("%s[%d]", field, i)
				if len(peaks) == MaxPeaks {
					return pl, jp.errAt(int(jp.dec.InputOffset()), "", field, "more than 1000 peaks")
				}
				t, ppos, err := jp.next(ppath)
				if err != nil {
					return pl, err
				}
				if t != json.Delim('{') {
					return pl, jp.errAt(ppos, jp.tokText(ppos), ppath, "expected a peak object")
				}
				pk0, pok, err := jp.nextKey(ppath)
				if err != nil {
					return pl, err
				}
				pk, err := jp.peakBody(ppath, ppos, pk0, pok)
				if err != nil {
					return pl, err
				}
				peaks = append(peaks, pk)
			}
			if _, _, err := jp.next(field); err != nil { // ']'
				return pl, err
			}
		case "nucleus":
			s, vpos, err := jp.str(field)
			if err != nil {
				return pl, err
			}
			n, err := ParseNucleus(s)
			if err != nil {
				return pl, jp.errAt(vpos, s, field, "unknown nucleus (want 1H or 13C)")
			}
			pl.Nucleus = n
		case "mhz":
			v, vpos, err := jp.number(field)
			if err != nil {
				return pl, err
			}
			if v < 1 || v > 2000 {
				return pl, jp.errAt(vpos, jp.tokText(vpos), field, "spectrometer frequency outside 1 to 2000 MHz")
			}
			pl.MHz = v
		case "solvent":
			s, vpos, err := jp.str(field)
			if err != nil {
				return pl, err
			}
			if s != "" {
				c, ok := CanonicalSolvent(s)
				if !ok {
					return pl, jp.errAt(vpos, s, field, "unknown solvent")
				}
				pl.Solvent = c
			}
		default:
			return pl, jp.errAt(k.pos, k.name, field, "unknown field")
		}
	}
	if err != nil {
		return pl, err
	}
	if !seen["peaks"] {
		return pl, jp.errAt(start, "{", prefix+"peaks", "missing field")
	}
	if len(peaks) == 0 {
		return pl, jp.errAt(peaksAt, "[", prefix+"peaks", "no peaks")
	}
	if err := jp.finish(&pl, peaks); err != nil {
		return pl, err
	}
	return pl, nil
}

func (jp *jsonPeaks) number(field string) (float64, int, error) {
	t, pos, err := jp.next(field)
	if err != nil {
		return 0, pos, err
	}
	n, ok := t.(json.Number)
	if !ok {
		return 0, pos, jp.errAt(pos, jp.tokText(pos), field, "expected a number")
	}
	v, err := strconv.ParseFloat(string(n), 64)
	if err != nil {
		return 0, pos, jp.errAt(pos, string(n), field, "malformed number")
	}
	return v, pos, nil
}

func (jp *jsonPeaks) str(field string) (string, int, error) {
	t, pos, err := jp.next(field)
	if err != nil {
		return "", pos, err
	}
	s, ok := t.(string)
	if !ok {
		return "", pos, jp.errAt(pos, jp.tokText(pos), field, "expected a string")
	}
	return s, pos + 1, nil // past the opening quote
}

// numbers reads an array of numbers.
func (jp *jsonPeaks) numbers(field string) ([]float64, []int, error) {
	t, pos, err := jp.next(field)
	if err != nil {
		return nil, nil, err
	}
	if t != json.Delim('[') {
		return nil, nil, jp.errAt(pos, jp.tokText(pos), field, "expected an array of numbers")
	}
	var vs []float64
	var ps []int
	for jp.dec.More() {
		if len(vs) == MaxJValues {
			return nil, nil, jp.errAt(int(jp.dec.InputOffset()), "", field, "more than 12 values")
		}
		v, p, err := jp.number(field)
		if err != nil {
			return nil, nil, err
		}
		vs, ps = append(vs, v), append(ps, p)
	}
	if _, _, err := jp.next(field); err != nil {
		return nil, nil, err
	}
	return vs, ps, nil
}

// jsonPeak is a peak read from JSON with the offsets its checks against
// the list's nucleus need, which may come after the peaks.
type jsonPeak struct {
	pk      Peak
	path    string
	at      map[string]int // offset of each member's value (of its name for arrays)
	shifts  []float64      // the shift, or the two range ends as written
	shiftAt []int          // their offsets
	jAt     []int          // offsets of the J values
}

// peakBody reads the members of a peak object whose '{' is at start and
// whose first member name k has been read (ok false: the object was
// empty). Checks that depend on the nucleus are left to finish.
func (jp *jsonPeaks) peakBody(path string, start int, k key, ok bool) (jsonPeak, error) {
	r := jsonPeak{path: path, at: map[string]int{}}
	pk := &r.pk
	apparent := false // "apparent": true, which may come before "multiplicity"
	var err error
	for ; ok; k, ok, err = jp.nextKey(path) {
		field := path + "." + k.name
		if _, dup := r.at[k.name]; dup {
			return r, jp.errAt(k.pos, k.name, field, "repeated field")
		}
		switch k.name {
		case "shift":
			v, vpos, err := jp.number(field)
			if err != nil {
				return r, err
			}
			r.shifts, r.at[k.name], r.shiftAt = []float64{v}, vpos, []int{vpos}
		case "range":
			vs, ps, err := jp.numbers(field)
			if err != nil {
				return r, err
			}
			if len(vs) != 2 {
				return r, jp.errAt(k.pos, k.name, field, "a range needs two shifts")
			}
			r.shifts, r.at[k.name], r.shiftAt = vs, k.pos, ps
		case "multiplicity":
			s, vpos, err := jp.str(field)
			if err != nil {
				return r, err
			}
			if s != "" {
				m, ok := parseMultiplicity(s)
				if !ok {
					return r, jp.errAt(vpos, s, field, "unknown multiplicity")
				}
				pk.Multiplicity = m.WithApparent(m.Apparent() || apparent)
			}
			r.at[k.name] = vpos
		case "apparent":
			t, vpos, err := jp.next(field)
			if err != nil {
				return r, err
			}
			b, ok := t.(bool)
			if !ok {
				return r, jp.errAt(vpos, jp.tokText(vpos), field, "expected true or false")
			}
			apparent = apparent || b
			pk.Multiplicity = pk.Multiplicity.WithApparent(pk.Multiplicity.Apparent() || b)
			r.at[k.name] = vpos
		case "j":
			vs, ps, err := jp.numbers(field)
			if err != nil {
				return r, err
			}
			if len(vs) > 0 {
				pk.J = vs
			}
			r.at[k.name], r.jAt = k.pos, ps
		case "integral":
			v, vpos, err := jp.number(field)
			if err != nil {
				return r, err
			}
			if v < 0 {
				return r, jp.errAt(vpos, jp.tokText(vpos), field, "negative integral")
			}
			pk.Integral, r.at[k.name] = v, vpos
		case "count":
			v, vpos, err := jp.number(field)
			if err != nil {
				return r, err
			}
			if v != math.Trunc(v) || v < 1 || v > MaxCount {
				return r, jp.errAt(vpos, jp.tokText(vpos), field, fmt.Sprintf("carbon count must be a whole number from 1 to %d", MaxCount))
			}
			pk.Count, r.at[k.name] = int(v), vpos
		case "dept":
			s, vpos, err := jp.str(field)
			if err != nil {
				return r, err
			}
			d, err := ParseDEPT(s)
			if err != nil {
				return r, jp.errAt(vpos, s, field, "unknown DEPT class (want CH3, CH2, CH or C)")
			}
			pk.DEPT, r.at[k.name] = d, vpos
		case "label":
			s, vpos, err := jp.str(field)
			if err != nil {
				return r, err
			}
			pk.Label, r.at[k.name] = s, vpos
		default:
			return r, jp.errAt(k.pos, k.name, field, "unknown field")
		}
	}
	if err != nil {
		return r, err
	}
	_, hasShift := r.at["shift"]
	_, hasRange := r.at["range"]
	switch {
	case hasShift && hasRange:
		return r, jp.errAt(r.at["range"], "range", path+".range", "give either shift or range, not both")
	case hasShift || hasRange:
		pk.setShift(r.shifts[0], r.shifts[len(r.shifts)-1])
	default:
		return r, jp.errAt(start, "{", path+".shift", "missing field")
	}
	if len(pk.J) > 0 && pk.Multiplicity.IsSinglet() {
		return r, jp.errAt(r.at["j"], "j", path+".j", "J given for a singlet")
	}
	pk.Pos = start
	end := min(int(jp.dec.InputOffset()), len(jp.in))
	pk.Text = string(jp.in[start:end])
	return r, nil
}

// finish applies the checks that depend on the nucleus and fills pl.Peaks.
func (jp *jsonPeaks) finish(pl *PeakList, peaks []jsonPeak) error {
	lo, hi := pl.Nucleus.ShiftRange()
	pl.Peaks = make([]Peak, len(peaks))
	for i, r := range peaks {
		pk := r.pk
		for k, v := range r.shifts {
			if !(v >= lo && v <= hi) {
				field := r.path + ".shift"
				if len(r.shifts) == 2 {
					field = r.path + ".range"
				}
				return jp.errAt(r.shiftAt[k], jsonValueAt(jp.in, r.shiftAt[k]), field, shiftRangeMsg(pl.Nucleus, v))
			}
		}
		for k, v := range pk.J {
			if !(v > 0) || v > pl.Nucleus.MaxJ() {
				return jp.errAt(r.jAt[k], jsonValueAt(jp.in, r.jAt[k]), r.path+".j", fmt.Sprintf("J outside 0 to %g Hz", pl.Nucleus.MaxJ()))
			}
		}
		if field, msg := checkPeak(pl.Nucleus, pk); msg != "" {
			pos, tok := pk.Pos, pk.Text
			if at, ok := r.at[field]; ok {
				pos, tok = at, jsonValueAt(jp.in, at)
			}
			return jp.errAt(pos, tok, r.path+"."+field, msg)
		}
		pl.Peaks[i] = pk
	}
	return nil
}

// jsonValueAt returns the JSON value at off for error messages: a number
// or literal, or the contents of a string when off is just past its
// opening quote.
func jsonValueAt(b []byte, off int) string {
	if off < 0 || off >= len(b) {
		return ""
	}
	end := off
	if off > 0 && b[off-1] == '"' {
		for end < len(b) && b[end] != '"' {
			if b[end] == '\\' {
				end++
			}
			end++
		}
		return string(b[off:min(end, len(b))])
	}
	for end < len(b) && bytes.IndexByte([]byte(",]} \t\r\n"), b[end]) < 0 {
		end++
	}
	return string(b[off:end])
}

// peakJSON is the JSON form of a Peak written by MarshalJSON.
type peakJSON struct {
	Shift        *float64  `json:"shift,omitempty"`
	Range        []float64 `json:"range,omitempty"`
	Multiplicity string    `json:"multiplicity,omitempty"`
	Apparent     bool      `json:"apparent,omitempty"`
	J            []float64 `json:"j,omitempty"`
	Integral     float64   `json:"integral,omitempty"`
	Count        int       `json:"count,omitempty"`
	DEPT         string    `json:"dept,omitempty"`
	Label        string    `json:"label,omitempty"`
}

// MarshalJSON writes the object form read by ParseJSON:
// {"nucleus": "13C", "mhz": 101, "solvent": "CDCl3", "peaks": [...]}
// (nucleus omitted for 1H, mhz and solvent when unknown). A range is
// written high to low.
func (pl PeakList) MarshalJSON() ([]byte, error) {
	out := struct {
		Nucleus string     `json:"nucleus,omitempty"`
		MHz     float64    `json:"mhz,omitempty"`
		Solvent string     `json:"solvent,omitempty"`
		Peaks   []peakJSON `json:"peaks"`
	}{MHz: pl.MHz, Solvent: pl.Solvent, Peaks: make([]peakJSON, len(pl.Peaks))}
	if pl.Nucleus != H1 {
		out.Nucleus = pl.Nucleus.String()
	}
	for i, p := range pl.Peaks {
		pj := peakJSON{Multiplicity: p.Multiplicity.Code(), Apparent: p.Multiplicity.Apparent(), J: p.J,
			Integral: p.Integral, Count: p.Count, DEPT: p.DEPT.String(), Label: p.Label}
		if p.IsRange() {
			pj.Range = []float64{p.ShiftHi, p.ShiftLo}
		} else {
			s := p.Shift
			pj.Shift = &s
		}
		out.Peaks[i] = pj
	}
	return json.Marshal(out)
}

// UnmarshalJSON reads one list in any form ParseJSON accepts; input
// holding several lists is an error.
func (pl *PeakList) UnmarshalJSON(b []byte) error {
	lists, err := ParseJSON(b)
	if err != nil {
		return err
	}
	if len(lists) != 1 {
		return newPeakError(string(b), lists[1].Pos, "{", "", fmt.Sprintf("%d peak lists where one is expected", len(lists)))
	}
	*pl = lists[0]
	return nil
}
