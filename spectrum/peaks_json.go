package spectrum

import (
	"bytes"
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"strconv"
)

// ParsePeaksJSON reads a peak list in JSON, either an array of peaks
//
//	[{"shift": 4.12, "multiplicity": "q", "j": [7.1], "integral": 2},
//	 {"range": [7.35, 7.20], "multiplicity": "m", "integral": 5}]
//
// or an object {"mhz": 400, "solvent": "CDCl3", "peaks": [...]}. A peak has
// exactly one of "shift" (ppm) and "range" (two shifts in ppm, either
// order), and optionally "multiplicity" (any spelling ParseMultiplicity
// accepts, or ""), "apparent" (bool), "j" (Hz), "integral" (relative area,
// positive) and "label" (free text). The parser is strict: unknown or
// repeated fields, wrong types, trailing data and the checks of ParsePeaks
// (shift range, J on a singlet, ...) give a *PeakError whose Field is the
// path of the offending value ("peaks[1].j", "[0].color") and whose Pos is
// its byte offset.
func ParsePeaksJSON(b []byte) (PeakList, error) {
	jp := &jsonPeaks{in: b, dec: json.NewDecoder(bytes.NewReader(b))}
	jp.dec.UseNumber()
	if len(b) > MaxPeakInput {
		return PeakList{}, jp.errAt(0, "", "", "input longer than 1 MiB")
	}
	pl, err := jp.top()
	if err != nil {
		return PeakList{}, err
	}
	if len(pl.Peaks) == 0 {
		return PeakList{}, jp.errAt(0, string(b[:min(len(b), 40)]), "peaks", "no peaks")
	}
	return pl, nil
}

type jsonPeaks struct {
	in  []byte
	dec *json.Decoder
}

func (jp *jsonPeaks) errAt(pos int, tok, field, msg string) error {
	return &PeakError{Input: string(jp.in), Pos: pos, Token: tok, Field: field, Msg: msg}
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

func (jp *jsonPeaks) top() (PeakList, error) {
	var pl PeakList
	t, pos, err := jp.next("")
	if err != nil {
		return pl, err
	}
	switch t {
	case json.Delim('['):
		if pl.Peaks, err = jp.peakArray(""); err != nil {
			return pl, err
		}
	case json.Delim('{'):
		seen := map[string]bool{}
		for jp.dec.More() {
			kt, kpos, err := jp.next("")
			if err != nil {
				return pl, err
			}
			key, _ := kt.(string)
			kpos++ // past the opening quote
			if seen[key] {
				return pl, jp.errAt(kpos, key, key, "repeated field")
			}
			seen[key] = true
			switch key {
			case "peaks":
				t, vpos, err := jp.next(key)
				if err != nil {
					return pl, err
				}
				if t != json.Delim('[') {
					return pl, jp.errAt(vpos, jp.tokText(vpos), key, "expected an array of peaks")
				}
				if pl.Peaks, err = jp.peakArray("peaks"); err != nil {
					return pl, err
				}
			case "mhz":
				v, vpos, err := jp.number(key)
				if err != nil {
					return pl, err
				}
				if v < 1 || v > 2000 {
					return pl, jp.errAt(vpos, jp.tokText(vpos), key, "spectrometer frequency outside 1 to 2000 MHz")
				}
				pl.MHz = v
			case "solvent":
				s, vpos, err := jp.str(key)
				if err != nil {
					return pl, err
				}
				if s != "" {
					c, ok := CanonicalSolvent(s)
					if !ok {
						return pl, jp.errAt(vpos, s, key, "unknown solvent")
					}
					pl.Solvent = c
				}
			default:
				return pl, jp.errAt(kpos, key, key, "unknown field")
			}
		}
		if _, _, err := jp.next(""); err != nil { // '}'
			return pl, err
		}
		if !seen["peaks"] {
			return pl, jp.errAt(pos, "{", "peaks", "missing field")
		}
	default:
		return pl, jp.errAt(pos, jp.tokText(pos), "", "expected an array of peaks or an object with \"peaks\"")
	}
	// Nothing may follow the value.
	if _, err := jp.dec.Token(); err != io.EOF {
		off := int(jp.dec.InputOffset())
		for off < len(jp.in) && bytes.IndexByte([]byte(" \t\r\n"), jp.in[off]) >= 0 {
			off++
		}
		return pl, jp.errAt(off, jsonTokenAt(jp.in, off), "", "unexpected data after the JSON value")
	}
	return pl, nil
}

func (jp *jsonPeaks) peakArray(path string) ([]Peak, error) {
	var out []Peak
	for jp.dec.More() {
		if len(out) == MaxPeaks {
			return nil, jp.errAt(int(jp.dec.InputOffset()), "", path, "more than 1000 peaks")
		}
		pk, err := jp.peak(fmt.Sprintf("%s[%d]", path, len(out)))
		if err != nil {
			return nil, err
		}
		out = append(out, pk)
	}
	if _, _, err := jp.next(path); err != nil { // ']'
		return nil, err
	}
	return out, nil
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

func (jp *jsonPeaks) peak(path string) (Peak, error) {
	var pk Peak
	t, start, err := jp.next(path)
	if err != nil {
		return pk, err
	}
	if t != json.Delim('{') {
		return pk, jp.errAt(start, jp.tokText(start), path, "expected a peak object")
	}
	seen := map[string]int{}
	apparent := false // "apparent": true, which may come before "multiplicity"
	var shift float64
	var rng []float64
	jPos := -1
	for jp.dec.More() {
		kt, kpos, err := jp.next(path)
		if err != nil {
			return pk, err
		}
		key, _ := kt.(string)
		kpos++ // past the opening quote
		field := path + "." + key
		if _, dup := seen[key]; dup {
			return pk, jp.errAt(kpos, key, field, "repeated field")
		}
		switch key {
		case "shift":
			v, vpos, err := jp.number(field)
			if err != nil {
				return pk, err
			}
			if v < MinShift || v > MaxShift {
				return pk, jp.errAt(vpos, jp.tokText(vpos), field, "shift outside -1 to 16 ppm")
			}
			shift, seen[key] = v, vpos
		case "range":
			vs, ps, err := jp.numbers(field)
			if err != nil {
				return pk, err
			}
			if len(vs) != 2 {
				return pk, jp.errAt(kpos, key, field, "a range needs two shifts")
			}
			for i, v := range vs {
				if v < MinShift || v > MaxShift {
					return pk, jp.errAt(ps[i], peakNum(v), field, "shift outside -1 to 16 ppm")
				}
			}
			rng, seen[key] = vs, kpos
		case "multiplicity":
			s, vpos, err := jp.str(field)
			if err != nil {
				return pk, err
			}
			if s != "" {
				m, ok := parseMultiplicity(s)
				if !ok {
					return pk, jp.errAt(vpos, s, field, "unknown multiplicity")
				}
				pk.Multiplicity = m.WithApparent(m.Apparent() || apparent)
			}
			seen[key] = vpos
		case "apparent":
			t, vpos, err := jp.next(field)
			if err != nil {
				return pk, err
			}
			b, ok := t.(bool)
			if !ok {
				return pk, jp.errAt(vpos, jp.tokText(vpos), field, "expected true or false")
			}
			apparent = apparent || b
			pk.Multiplicity = pk.Multiplicity.WithApparent(pk.Multiplicity.Apparent() || b)
			seen[key] = vpos
		case "j":
			vs, ps, err := jp.numbers(field)
			if err != nil {
				return pk, err
			}
			for i, v := range vs {
				if !(v > 0) || v > MaxJ {
					return pk, jp.errAt(ps[i], peakNum(v), field, "J outside 0 to 100 Hz")
				}
			}
			if len(vs) > 0 {
				pk.J = vs
				jPos = kpos
			}
			seen[key] = kpos
		case "integral":
			v, vpos, err := jp.number(field)
			if err != nil {
				return pk, err
			}
			if v < 0 {
				return pk, jp.errAt(vpos, jp.tokText(vpos), field, "negative integral")
			}
			pk.Integral, seen[key] = v, vpos
		case "label":
			s, vpos, err := jp.str(field)
			if err != nil {
				return pk, err
			}
			pk.Label, seen[key] = s, vpos
		default:
			return pk, jp.errAt(kpos, key, field, "unknown field")
		}
	}
	if _, _, err := jp.next(path); err != nil { // '}'
		return pk, err
	}
	_, hasShift := seen["shift"]
	_, hasRange := seen["range"]
	switch {
	case hasShift && hasRange:
		return pk, jp.errAt(seen["range"], "range", path+".range", "give either shift or range, not both")
	case hasShift:
		pk.setShift(shift, shift)
	case hasRange:
		pk.setShift(rng[0], rng[1])
	default:
		return pk, jp.errAt(start, "{", path+".shift", "missing field")
	}
	if len(pk.J) > 0 && pk.Multiplicity.IsSinglet() {
		return pk, jp.errAt(jPos, "j", path+".j", "J given for a singlet")
	}
	pk.Pos = start
	end := int(jp.dec.InputOffset())
	if end > len(jp.in) {
		end = len(jp.in)
	}
	pk.Text = string(jp.in[start:end])
	if field, msg := checkPeak(pk); msg != "" {
		return pk, jp.errAt(start, pk.Text, path+"."+field, msg)
	}
	return pk, nil
}

// jsonPeak is the JSON form of a Peak written by MarshalJSON.
type jsonPeak struct {
	Shift        *float64  `json:"shift,omitempty"`
	Range        []float64 `json:"range,omitempty"`
	Multiplicity string    `json:"multiplicity,omitempty"`
	Apparent     bool      `json:"apparent,omitempty"`
	J            []float64 `json:"j,omitempty"`
	Integral     float64   `json:"integral,omitempty"`
	Label        string    `json:"label,omitempty"`
}

// MarshalJSON writes the object form read by ParsePeaksJSON:
// {"mhz": 400, "solvent": "CDCl3", "peaks": [...]} (mhz and solvent
// omitted when unknown). A range is written high to low.
func (pl PeakList) MarshalJSON() ([]byte, error) {
	out := struct {
		MHz     float64    `json:"mhz,omitempty"`
		Solvent string     `json:"solvent,omitempty"`
		Peaks   []jsonPeak `json:"peaks"`
	}{MHz: pl.MHz, Solvent: pl.Solvent, Peaks: make([]jsonPeak, len(pl.Peaks))}
	for i, p := range pl.Peaks {
		jpk := jsonPeak{Multiplicity: p.Multiplicity.Code(), Apparent: p.Multiplicity.Apparent(), J: p.J,
			Integral: p.Integral, Label: p.Label}
		if p.IsRange() {
			jpk.Range = []float64{p.ShiftHi, p.ShiftLo}
		} else {
			s := p.Shift
			jpk.Shift = &s
		}
		out.Peaks[i] = jpk
	}
	return json.Marshal(out)
}

// UnmarshalJSON reads either JSON form with ParsePeaksJSON.
func (pl *PeakList) UnmarshalJSON(b []byte) error {
	v, err := ParsePeaksJSON(b)
	if err != nil {
		return err
	}
	*pl = v
	return nil
}
