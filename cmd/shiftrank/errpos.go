package main

import (
	"errors"
	"fmt"
	"strings"
	"unicode/utf8"

	"shiftrank/isomers"
	"shiftrank/molecule"
	"shiftrank/ranker"
	"shiftrank/spectrum"
)

// The parse errors of the core carry 0-based byte offsets (Pos), right for
// programs. People count characters from 1, as the web page does ("at
// character 5"), so the CLI rewrites the positions of the messages it
// prints, without touching the errors' types or values.

// charPos returns the 1-based character (rune) position of the 0-based
// byte offset pos in s. An offset past the end counts to the end; one
// inside a multi-byte character counts that character.
func charPos(s string, pos int) int {
	pos = min(max(pos, 0), len(s))
	for pos > 0 && pos < len(s) && !utf8.RuneStart(s[pos]) {
		pos--
	}
	return utf8.RuneCountInString(s[:pos]) + 1
}

// lineCharPos returns the 1-based line and the 1-based character
// position within that line of the byte offset pos in s.
func lineCharPos(s string, pos int) (line, char int) {
	pos = min(max(pos, 0), len(s))
	start := strings.LastIndexByte(s[:pos], '\n') + 1
	return 1 + strings.Count(s[:pos], "\n"), charPos(s[start:], pos-start)
}

// inputError attaches the text a positioned error refers to, for errors
// whose type does not carry it (a ranker.RequestError about a peak list
// the CLI read).
type inputError struct {
	err   error
	input string
}

func (e inputError) Error() string { return e.err.Error() }
func (e inputError) Unwrap() error { return e.err }

// withInput attaches input to err (nil stays nil).
func withInput(err error, input string) error {
	if err == nil {
		return nil
	}
	return inputError{err, input}
}

// humanError is an error whose message has 1-based character positions;
// it unwraps to the original, so errors.As still finds usageError and the
// core's types.
type humanError struct {
	msg string
	err error
}

func (e humanError) Error() string { return e.msg }
func (e humanError) Unwrap() error { return e.err }

// humanizeError rewrites the "at position N" of the core's parse errors
// in err's message as "at character N+1" (counted in characters of the
// input, not bytes; with the line and the character within it for input
// of several lines). Other errors are returned unchanged.
func humanizeError(err error) error {
	if err == nil {
		return nil
	}
	msg := err.Error()
	input := ""
	changed := false
	// Walk the chain (single Unwrap; the CLI wraps with one %w), from the
	// outside in: a RequestError's message does not contain its cause's,
	// so each positioned error is rewritten where it appears.
	for e := err; e != nil; e = errors.Unwrap(e) {
		if ie, ok := e.(inputError); ok {
			input = ie.input
			continue
		}
		old, repl, ok := positionText(e, input)
		if ok && strings.Contains(msg, old) {
			msg = strings.Replace(msg, old, repl, 1)
			changed = true
		}
	}
	if !changed {
		return err
	}
	return humanError{msg: msg, err: err}
}

// positionText returns the message of e when it is one of the core's
// positioned errors, and the same message with a 1-based character
// position. fallback is the input text for errors that do not carry it.
func positionText(e error, fallback string) (old, repl string, ok bool) {
	switch pe := e.(type) {
	case *molecule.FormulaError:
		if pe.Token == pe.Input {
			return pe.Error(), fmt.Sprintf("formula %q: %s", pe.Input, pe.Msg), true
		}
		return pe.Error(), fmt.Sprintf("formula %q: %s at %s (%q)", pe.Input, pe.Msg, where(pe.Input, pe.Pos, true), pe.Token), true
	case *molecule.SMILESError:
		return pe.Error(), fmt.Sprintf("SMILES %q: %s at %s (%q)", pe.Input, pe.Msg, where(pe.Input, pe.Pos, true), pe.Token), true
	case *isomers.FilterError:
		return pe.Error(), fmt.Sprintf("filter %q: %s at %s (%q)", pe.Input, pe.Msg, where(pe.Input, pe.Pos, true), pe.Token), true
	case *spectrum.PeakError:
		field := ""
		if pe.Field != "" {
			field = pe.Field + ": "
		}
		in := pe.Input
		if in == "" {
			in = fallback
		}
		if pe.Pos < 0 {
			return pe.Error(), fmt.Sprintf("peak list: %s%s (%q)", field, pe.Msg, pe.Token), true
		}
		return pe.Error(), fmt.Sprintf("peak list: %s%s at %s (%q)", field, pe.Msg, where(in, pe.Pos, in != ""), pe.Token), true
	case *ranker.RequestError:
		if pe.Token == "" {
			return "", "", false
		}
		in, known := causeInput(pe)
		if !known && fallback != "" {
			in, known = fallback, true
		}
		if !known && pe.Pos == 0 {
			// The token is the whole field (or its position is unknown):
			// a position would add nothing.
			if strings.Contains(pe.Msg, pe.Token) {
				return pe.Error(), pe.Field + ": " + pe.Msg, true
			}
			return pe.Error(), fmt.Sprintf("%s: %s (%q)", pe.Field, pe.Msg, pe.Token), true
		}
		return pe.Error(), fmt.Sprintf("%s: %s at %s (%q)", pe.Field, pe.Msg, where(in, pe.Pos, known), pe.Token), true
	}
	return "", "", false
}

// where describes the byte offset pos of input for a reader: "character
// N", or "line L, character N" for input of several lines. Without the
// input (known false) the offset is taken as a character count.
func where(input string, pos int, known bool) string {
	if !known {
		return fmt.Sprintf("character %d", max(pos, 0)+1)
	}
	if strings.Contains(input, "\n") {
		l, c := lineCharPos(input, pos)
		return fmt.Sprintf("line %d, character %d", l, c)
	}
	return fmt.Sprintf("character %d", charPos(input, pos))
}

// causeInput returns the input text of a RequestError's positioned cause,
// when the cause carries it at the same position.
func causeInput(re *ranker.RequestError) (string, bool) {
	var fe *molecule.FormulaError
	var se *molecule.SMILESError
	var pe *spectrum.PeakError
	switch {
	case errors.As(re.Err, &fe) && fe.Pos == re.Pos:
		return fe.Input, true
	case errors.As(re.Err, &se) && se.Pos == re.Pos:
		return se.Input, true
	case errors.As(re.Err, &pe) && pe.Pos == re.Pos && pe.Input != "":
		return pe.Input, true
	}
	return "", false
}
