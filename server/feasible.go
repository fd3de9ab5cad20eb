package server

import (
	"bytes"
	"context"
	"encoding/json"
	"errors"
	"fmt"
	"regexp"
	"strings"
	"time"
	"unicode/utf8"

	"shiftrank/ranker"
)

// Submission-time checks of a job request that parses: what would make the
// ranking fail once a worker runs it is refused at once, with the field
// that causes it, so that nothing is stored that can never succeed.

// maxPeakLabelLen bounds the assignment note of one peak ("OCH2", "H-3'",
// "exch. D2O"): such notes are a few words.
const maxPeakLabelLen = 60

// multiplicityLike matches a peak note made only of multiplicity letters
// ("dtdtdt", "sd"): a multiplicity that is not one, rather than a note.
var multiplicityLike = regexp.MustCompile(`^(?i:(br|app)?[sdtqm]{2,})$`)

// feasibilityFields checks a job request that passed rankerRequest: each
// peak's note must be short and must not be a malformed multiplicity, and
// the ranker must accept the request as it will run it (a formula without
// hydrogens, more peaks than the formula has hydrogens, integrals that
// cannot be scaled are refused here). The ranker is asked with a context
// that is already cancelled: Rank validates its request first and, for a
// valid one, returns ctx.Err() without ranking (its documented contract),
// which costs about 50 µs.
func (s *Server) feasibilityFields(jr JobRequest, rr ranker.Request) []FieldError {
	structured := len(bytes.TrimSpace(jr.Peaks)) > 0 && bytes.TrimSpace(jr.Peaks)[0] == '['
	var fields []FieldError
	for i, p := range rr.Peaks.Peaks {
		if p.Label == "" {
			continue
		}
		f := FieldError{Field: "/peaks", Token: truncate(p.Label, 40)}
		if structured {
			f.Field = fmt.Sprintf("/peaks/%d/label", i)
		} else {
			pos := p.Pos
			f.Position = &pos
		}
		switch {
		case utf8.RuneCountInString(p.Label) > maxPeakLabelLen:
			f.Detail = fmt.Sprintf("peak %d: the note %q is longer than %d characters (a multiplicity, or a short assignment such as OCH2)", i+1, truncate(p.Label, 20), maxPeakLabelLen)
		case multiplicityLike.MatchString(strings.ReplaceAll(p.Label, " ", "")):
			f.Detail = fmt.Sprintf("peak %d: %q is not a multiplicity (s, d, t, q, quint, sext, sept, m, br s, or up to five of d, t, q such as dt or ddd)", i+1, truncate(p.Label, 20))
		default:
			continue
		}
		fields = append(fields, f)
	}
	if len(fields) > 0 {
		return fields
	}
	ctx, cancel := context.WithCancel(context.Background())
	cancel()
	_, err := s.rank(ctx, rr, func(ranker.Progress) {})
	var re *ranker.RequestError
	if errors.As(err, &re) {
		carbon := "/peaks"
		if cp := bytes.TrimSpace(jr.CarbonPeaks); len(cp) > 0 && string(cp) != "null" {
			carbon = "/carbon_peaks"
		}
		return []FieldError{requestErrorField(re, structured, carbon)}
	}
	return nil
}

// requestErrorField maps a ranker.RequestError onto the request's JSON:
// "formula" → /formula, "top" → /options/top_k, "require[2]" →
// /options/require/2, "peaks[3].j" → /peaks/3/j for a structured peak list
// (else /peaks, with the position in the text), "carbon..." → carbon, the
// member the 13C list came from (/carbon_peaks or /peaks).
func requestErrorField(re *ranker.RequestError, structured bool, carbon string) FieldError {
	f := FieldError{Detail: re.Msg, Token: re.Token}
	if re.Token != "" || re.Pos > 0 {
		pos := re.Pos
		f.Position = &pos
	}
	name := re.Field
	switch {
	case name == "formula" || name == "mhz" || name == "solvent":
		f.Field = "/" + name
	case name == "top":
		f.Field = "/options/top_k"
	case name == "filter":
		f.Field = "/options/filter"
	case strings.HasPrefix(name, "require[") || strings.HasPrefix(name, "forbid["):
		base, idx, _ := strings.Cut(strings.TrimSuffix(name, "]"), "[")
		f.Field = "/options/" + base + "/" + idx
	case name == "peaks" || strings.HasPrefix(name, "peaks.") || strings.HasPrefix(name, "peaks["):
		f.Field = "/peaks"
		if structured && strings.HasPrefix(name, "peaks[") {
			f.Field = peakPathPointer(name)
		} else if rest := strings.TrimPrefix(strings.TrimPrefix(name, "peaks"), "."); rest != "" {
			f.Detail = rest + ": " + re.Msg
		}
	case name == "carbon" || strings.HasPrefix(name, "carbon."):
		f.Field = carbon
		if rest := strings.TrimPrefix(strings.TrimPrefix(name, "carbon"), "."); rest != "" {
			f.Detail = rest + ": " + re.Msg
		}
	default:
		// A limit of the server's own (max_candidates, time_budget): the
		// client cannot have caused it.
		f.Field = ""
		f.Detail = re.Error()
	}
	return f
}

// normalizedPeaks returns the peaks member re-encoded: escapes are written
// out (a lone surrogate becomes U+FFFD, as the peak parsers read it) and
// numbers kept as written, so the stored request holds only text both
// stores keep.
func normalizedPeaks(raw json.RawMessage) (json.RawMessage, error) {
	dec := json.NewDecoder(bytes.NewReader(raw))
	dec.UseNumber()
	var v any
	if err := dec.Decode(&v); err != nil {
		return nil, fmt.Errorf("decode peaks: %w", err)
	}
	var buf bytes.Buffer
	enc := json.NewEncoder(&buf)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(v); err != nil {
		return nil, fmt.Errorf("encode peaks: %w", err)
	}
	return bytes.TrimRight(buf.Bytes(), "\n"), nil
}

// queueRetryAfter is the Retry-After of a submission refused because the
// key's queue is full: a small job takes seconds.
const queueRetryAfter = 10 * time.Second
