package spectrum

import (
	"bytes"
	"errors"
	"fmt"
	"unicode"
	"unicode/utf8"
)

// Format is the form of a peak-list input.
type Format uint8

// The input formats Read tells apart.
const (
	FormatText  Format = iota // journal text (ParseText)
	FormatJSON                // JSON (ParseJSON)
	FormatJCAMP               // JCAMP-DX (ParseJCAMP)
)

// String returns "journal text", "JSON" or "JCAMP-DX".
func (f Format) String() string {
	switch f {
	case FormatJSON:
		return "JSON"
	case FormatJCAMP:
		return "JCAMP-DX"
	}
	return "journal text"
}

// DetectFormat tells the format of a peak-list input by its first
// character after white space and a byte-order mark: "##" starts a
// JCAMP-DX file (its ##TITLE= or ##JCAMP-DX= record), "[" or "{" JSON, and
// anything else is journal text.
func DetectFormat(input []byte) Format {
	b := bytes.TrimPrefix(input, []byte("\ufeff"))
	for len(b) > 0 {
		r, n := utf8.DecodeRune(b)
		if !unicode.IsSpace(r) {
			break
		}
		b = b[n:]
	}
	switch {
	case bytes.HasPrefix(b, []byte("##")):
		return FormatJCAMP
	case bytes.HasPrefix(b, []byte("[")) || bytes.HasPrefix(b, []byte("{")):
		return FormatJSON
	}
	return FormatText
}

// Read reads every 1H and 13C peak list in input, whatever its format
// (see DetectFormat): the sections of journal text (ParseText), the lists
// of a JSON document (ParseJSON) or the peak-table blocks of a JCAMP-DX
// file (ParseJCAMP). The lists come in input order, each with its Nucleus;
// there is at least one. Errors are those of the format's reader: a
// *PeakError naming the field, the token, its byte position and line.
func Read(input []byte) ([]PeakList, error) { return ReadAs(input, H1) }

// ReadAs is Read for input whose lists are of nucleus def unless they say
// otherwise: journal text whose first section has no header naming a
// nucleus (a header-less "171.1, 60.4, 21.0" or "δ 171.1, ..."; "δH" and
// "δC" still name one), a JSON array of peaks or a list object without
// "nucleus", and a JCAMP-DX NMR block without ##.OBSERVE NUCLEUS= are
// read as def. A list that names its nucleus keeps it, so a pasted
// "1H NMR ..." section in a field meant for 13C still reads as 1H, and
// the caller can tell. ReadAs(input, H1) is Read(input).
func ReadAs(input []byte, def Nucleus) ([]PeakList, error) {
	switch DetectFormat(input) {
	case FormatJCAMP:
		return parseJCAMP(input, def)
	case FormatJSON:
		if bytes.HasPrefix(input, []byte("\ufeff")) {
			// A byte-order mark, blanked to keep the offsets.
			input = append([]byte("   "), input[3:]...)
		}
		return parseJSON(input, def)
	}
	return parseText(string(input), def)
}

// Pick returns the list of nucleus n among lists; found is false when
// there is none. Several lists of n are an error, a *PeakError (Field
// "nucleus") positioned at the second: shiftrank reads one measurement
// of each nucleus.
func Pick(lists []PeakList, n Nucleus) (pl PeakList, found bool, err error) {
	for _, l := range lists {
		if l.Nucleus != n {
			continue
		}
		if found {
			return PeakList{}, false, &PeakError{Pos: l.Pos, Token: n.String(), Field: "nucleus",
				Msg: fmt.Sprintf("a second %s peak list: give one list per nucleus", n)}
		}
		pl, found = l, true
	}
	return pl, found, nil
}

// ReadList reads input with Read and returns its only list of nucleus n.
// Input without such a list, or with several, is a *PeakError (Field
// "nucleus").
func ReadList(input []byte, n Nucleus) (PeakList, error) {
	lists, err := Read(input)
	if err != nil {
		return PeakList{}, err
	}
	pl, found, err := Pick(lists, n)
	if err != nil {
		var pe *PeakError
		if errors.As(err, &pe) {
			err = newPeakError(string(input), pe.Pos, pe.Token, pe.Field, pe.Msg)
		}
		return PeakList{}, err
	}
	if !found {
		return PeakList{}, newPeakError(string(input), lists[0].Pos, lists[0].Nucleus.String(), "nucleus",
			fmt.Sprintf("no %s peak list (found %s)", n, lists[0].Nucleus))
	}
	return pl, nil
}
