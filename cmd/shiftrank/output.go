package main

import (
	"bytes"
	"fmt"
	"io"
	"math"
	"strings"
	"unicode/utf8"
)

// formatPercent formats a probability (0–1) as the web page does
// (pctText in web/static/app.js): "> 99.9 %" when it would round to
// 100.0 %, "< 0.1 %" for a positive value below 0.1 %, else the
// percentage with one decimal, halves rounded up as JavaScript's toFixed
// does.
func formatPercent(p float64) string {
	v := 100 * p
	switch {
	case v >= 99.95:
		return "> 99.9 %"
	case v > 0 && v < 0.1:
		return "< 0.1 %"
	}
	// Go rounds an exact half to even, toFixed away from zero; an exact
	// half in binary at one decimal is a value with .25 or .75.
	if q := v * 4; q == math.Trunc(q) && math.Mod(q, 2) == 1 {
		v = math.Floor(v*10+0.5) / 10
	}
	return fmt.Sprintf("%.1f %%", v)
}

// fitWriter keeps lines within lineWidth characters: a longer line is
// broken at spaces and continued under itself with a hanging indent
// (its own indent plus four spaces, or plus two after a "- " bullet).
// A word longer than a line (a long SMILES) is not broken.
type fitWriter struct {
	w   io.Writer
	buf []byte
	err error
}

func (f *fitWriter) Write(p []byte) (int, error) {
	f.buf = append(f.buf, p...)
	for {
		i := bytes.IndexByte(f.buf, '\n')
		if i < 0 {
			break
		}
		f.writeLine(string(f.buf[:i]))
		f.buf = f.buf[i+1:]
	}
	return len(p), f.err
}

// Flush writes an unterminated last line and returns the first write
// error.
func (f *fitWriter) Flush() error {
	if len(f.buf) > 0 {
		f.writeLine(string(f.buf))
		f.buf = nil
	}
	return f.err
}

func (f *fitWriter) writeLine(line string) {
	if f.err != nil {
		return
	}
	for _, l := range fitLine(line, lineWidth) {
		if _, err := io.WriteString(f.w, l+"\n"); err != nil {
			f.err = err
			return
		}
	}
}

// fitLine breaks line into lines of at most width characters at spaces,
// keeping the spacing of each part; continuation lines get a hanging
// indent.
func fitLine(line string, width int) []string {
	if utf8.RuneCountInString(line) <= width {
		return []string{line}
	}
	body := strings.TrimLeft(line, " ")
	indent := strings.Repeat(" ", len(line)-len(body)+4)
	if strings.HasPrefix(body, "- ") {
		indent = strings.Repeat(" ", len(line)-len(body)+2)
	}
	var out []string
	minCut := len(line) - len(body) // do not break inside the indent
	for utf8.RuneCountInString(line) > width {
		// the byte offset just past the width-th character
		end, n := 0, 0
		for end < len(line) && n < width {
			_, sz := utf8.DecodeRuneInString(line[end:])
			end += sz
			n++
		}
		cut := strings.LastIndexByte(line[:min(end+1, len(line))], ' ')
		if cut <= minCut {
			// no space within the width: break after the long word
			next := strings.IndexByte(line[end:], ' ')
			if next < 0 {
				break
			}
			cut = end + next
		}
		head := strings.TrimRight(line[:cut], " ")
		rest := strings.TrimLeft(line[cut:], " ")
		if rest == "" {
			line = head
			break
		}
		out = append(out, head)
		line = indent + rest
		minCut = len(indent)
	}
	return append(out, line)
}
