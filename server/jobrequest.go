package server

import (
	"bytes"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"errors"
	"fmt"
	"net/url"
	"strings"
	"time"
	"unicode/utf8"

	"shiftrank/isomers"
	"shiftrank/molecule"
	"shiftrank/ranker"
	"shiftrank/spectrum"
)

// JobRequest is the body of POST /v1/jobs. Field names are part of the
// public contract.
type JobRequest struct {
	// Formula is the molecular formula, e.g. "C4H8O2" (required).
	Formula string `json:"formula"`
	// Peaks is the observed peak list (required): a string of journal text
	// such as "4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H)", possibly with a
	// 13C section ("...; 13C NMR (101 MHz, CDCl3) δ 171.1, ..."), or of a
	// JCAMP-DX file (starting with ##TITLE= or ##JCAMP-DX=); or a JSON
	// array of {"shift" or "range", "multiplicity", "j", "integral"}
	// objects. All are read by spectrum.Read. A 1H list is required; a 13C
	// list is checked and passed on, not scored yet.
	Peaks json.RawMessage `json:"peaks"`
	// MHz is the spectrometer 1H frequency; 0 means the peak-list header's
	// or 400.
	MHz float64 `json:"mhz,omitempty"`
	// Solvent is the NMR solvent, e.g. "CDCl3"; "" means the peak-list
	// header's or CDCl3.
	Solvent string `json:"solvent,omitempty"`
	// Options tune the ranking.
	Options JobOptions `json:"options"`
	// Reference is the client's own label (a notebook sample id), stored
	// and echoed; at most 200 characters.
	Reference string `json:"reference,omitempty"`
	// CallbackURL, if set, receives a signed POST of the job summary when
	// the job ends. Only http and https URLs.
	CallbackURL string `json:"callback_url,omitempty"`
}

// JobOptions are the ranking options of a JobRequest.
type JobOptions struct {
	TopK             int      `json:"top_k,omitempty"`              // candidates kept, 1..MaxTopK; 0 = 10
	Filter           string   `json:"filter,omitempty"`             // isomer plausibility rules; "" = "plausible"
	Require          []string `json:"require,omitempty"`            // SMILES fragments every candidate must contain
	Forbid           []string `json:"forbid,omitempty"`             // SMILES fragments no candidate may contain
	KeepSolventPeaks bool     `json:"keep_solvent_peaks,omitempty"` // do not drop residual solvent and water peaks
	// AllIsomers searches every plausible isomer of the formula instead of
	// only those fitting what the spectrum says (the readings).
	AllIsomers bool `json:"all_isomers,omitempty"`
	// Disable lists IDs of constraints read from the spectrum to switch
	// off (the "constraints" of a result's "search" report).
	Disable []string `json:"disable,omitempty"`
	// MaxNodes is the search budget in generator nodes; 0 means the
	// default (ranker.DefaultMaxNodes), at most maxNodesLimit.
	MaxNodes int64 `json:"max_nodes,omitempty"`
	// Neutral leaves out charge-separated groups (nitro, N-oxide, azide,
	// diazo, isonitrile).
	Neutral bool `json:"neutral,omitempty"`
}

// Request limits that do not depend on the configuration.
const (
	MaxTopK         = ranker.MaxTopK
	maxReferenceLen = 200
	maxFragments    = 20
	maxFragmentLen  = 200
	maxURLLen       = 2000
	maxDisable      = 100
	maxDisableLen   = 100
	maxNodesLimit   = 10 * ranker.DefaultMaxNodes
	minMHz, maxMHz  = 20, 2000
)

// limits are the configured bounds a job request is validated against.
type limits struct {
	maxHeavyAtoms int
	maxCandidates int64
	timeBudget    time.Duration
}

// decodeJobRequest decodes and validates a POST /v1/jobs body. It returns
// the request, its ranker form, and an *Error naming every bad field.
func decodeJobRequest(data []byte, lim limits) (JobRequest, ranker.Request, error) {
	var jr JobRequest
	if err := unmarshalStrict(data, &jr); err != nil {
		return jr, ranker.Request{}, err
	}
	rr, fields := jr.rankerRequest(lim)
	if len(fields) > 0 {
		return jr, rr, invalidFields(fields)
	}
	return jr, rr, nil
}

// rankerRequest validates jr and builds the ranker request. Every problem
// found is reported, not only the first.
func (jr JobRequest) rankerRequest(lim limits) (ranker.Request, []FieldError) {
	var fields []FieldError
	bad := func(field, detail string) { fields = append(fields, FieldError{Field: field, Detail: detail}) }

	rr := ranker.Request{
		Formula:          strings.TrimSpace(jr.Formula),
		MHz:              jr.MHz,
		Solvent:          strings.TrimSpace(jr.Solvent),
		TopK:             jr.Options.TopK,
		Filter:           jr.Options.Filter,
		Require:          jr.Options.Require,
		Forbid:           jr.Options.Forbid,
		MaxCandidates:    lim.maxCandidates,
		KeepSolventPeaks: jr.Options.KeepSolventPeaks,
		MaxHeavyAtoms:    lim.maxHeavyAtoms,
		Unconstrained:    jr.Options.AllIsomers,
		Disable:          jr.Options.Disable,
		MaxNodes:         jr.Options.MaxNodes,
		Neutral:          jr.Options.Neutral,
	}
	rr.TimeBudget = lim.timeBudget

	if strings.TrimSpace(jr.Formula) == "" {
		bad("/formula", "required: a molecular formula such as C4H8O2")
	} else if _, err := molecule.ParseFormulaLimit(jr.Formula, lim.maxHeavyAtoms); err != nil {
		fields = append(fields, formulaField(err))
	}

	pl, carbon, fe := parsePeaksField(jr.Peaks)
	fields = append(fields, fe...)
	rr.Peaks, rr.Carbon = pl, carbon

	if jr.MHz != 0 && (jr.MHz < minMHz || jr.MHz > maxMHz) {
		bad("/mhz", fmt.Sprintf("spectrometer frequency %g MHz is outside %d..%d", jr.MHz, minMHz, maxMHz))
	}
	if rr.Solvent != "" {
		if c, ok := spectrum.CanonicalSolvent(rr.Solvent); ok {
			rr.Solvent = c
		} else {
			bad("/solvent", fmt.Sprintf("unknown solvent %q (e.g. CDCl3, DMSO-d6, D2O, CD3OD, C6D6, acetone-d6)", truncate(rr.Solvent, 50)))
		}
	}
	if jr.Options.TopK < 0 || jr.Options.TopK > MaxTopK {
		bad("/options/top_k", fmt.Sprintf("must be between 1 and %d (0 or absent means %d)", MaxTopK, ranker.DefaultTopK))
	}
	if jr.Options.Filter != "" {
		if _, err := isomers.ParseFilter(jr.Options.Filter); err != nil {
			fields = append(fields, filterField("/options/filter", err))
		}
	}
	if jr.Options.MaxNodes < 0 || jr.Options.MaxNodes > maxNodesLimit {
		bad("/options/max_nodes", fmt.Sprintf("must be between 1 and %d (0 or absent means %d)", int64(maxNodesLimit), int64(ranker.DefaultMaxNodes)))
	}
	fields = append(fields, disableFields(jr.Options.Disable)...)
	fields = append(fields, fragmentFields("/options/require", jr.Options.Require)...)
	fields = append(fields, fragmentFields("/options/forbid", jr.Options.Forbid)...)
	if utf8.RuneCountInString(jr.Reference) > maxReferenceLen {
		bad("/reference", fmt.Sprintf("longer than %d characters", maxReferenceLen))
	}
	if jr.CallbackURL != "" {
		if err := checkCallbackURL(jr.CallbackURL); err != nil {
			bad("/callback_url", err.Error())
		}
	}
	return rr, fields
}

func formulaField(err error) FieldError {
	var fe *molecule.FormulaError
	if errors.As(err, &fe) {
		pos := fe.Pos
		return FieldError{Field: "/formula", Detail: fe.Msg, Position: &pos, Token: fe.Token}
	}
	return FieldError{Field: "/formula", Detail: err.Error()}
}

// parsePeaksField parses the "peaks" member with spectrum.Read: a JSON
// string of journal text or JCAMP-DX, or a JSON array of peak objects. It
// returns the 1H list and the 13C list (empty when absent).
func parsePeaksField(raw json.RawMessage) (h, c spectrum.PeakList, _ []FieldError) {
	raw = bytes.TrimSpace(raw)
	if len(raw) == 0 || string(raw) == "null" {
		return h, c, []FieldError{{Field: "/peaks", Detail: "required: journal text such as \"3.69 (q, 2H), 1.22 (t, 3H)\", JCAMP-DX text or an array of peak objects"}}
	}
	var input []byte
	switch raw[0] {
	case '"':
		var text string
		if err := json.Unmarshal(raw, &text); err != nil {
			return h, c, []FieldError{{Field: "/peaks", Detail: "not a valid JSON string"}}
		}
		if strings.TrimSpace(text) == "" {
			return h, c, []FieldError{{Field: "/peaks", Detail: "required: the peak list is empty"}}
		}
		input = []byte(text)
	case '[':
		input = raw
	default:
		return h, c, []FieldError{{Field: "/peaks", Detail: "must be a string of journal text or JCAMP-DX, or an array of peak objects"}}
	}
	lists, err := spectrum.Read(input)
	if err == nil {
		var found bool
		if h, found, err = spectrum.Pick(lists, spectrum.H1); err == nil && !found {
			return h, c, []FieldError{{Field: "/peaks", Detail: fmt.Sprintf("no 1H peak list (found %s): the ranking needs one", lists[0].Nucleus)}}
		}
	}
	if err == nil {
		c, _, err = spectrum.Pick(lists, spectrum.C13)
	}
	if err != nil {
		var pe *spectrum.PeakError
		if errors.As(err, &pe) {
			pos := pe.Pos
			f := FieldError{Field: "/peaks", Detail: pe.Msg, Token: pe.Token, Position: &pos}
			switch {
			case raw[0] == '[' && pe.Field != "" && pe.Field != "nucleus":
				f.Field = peakPathPointer(pe.Field)
			case pe.Field != "":
				f.Detail = pe.Field + ": " + pe.Msg
			}
			if pe.Line > 1 {
				f.Detail = fmt.Sprintf("line %d: %s", pe.Line, f.Detail)
			}
			return h, c, []FieldError{f}
		}
		return h, c, []FieldError{{Field: "/peaks", Detail: err.Error()}}
	}
	return h, c, nil
}

// disableFields checks the constraint IDs of options.disable: short,
// printable and at most maxDisable of them. Whether an ID names a
// constraint depends on the spectrum; the ranking warns about one that
// does not.
func disableFields(ids []string) []FieldError {
	if len(ids) > maxDisable {
		return []FieldError{{Field: "/options/disable", Detail: fmt.Sprintf("at most %d constraint IDs", maxDisable)}}
	}
	var fields []FieldError
	for i, id := range ids {
		field := fmt.Sprintf("/options/disable/%d", i)
		switch {
		case strings.TrimSpace(id) == "":
			fields = append(fields, FieldError{Field: field, Detail: "empty constraint ID"})
		case len(id) > maxDisableLen:
			fields = append(fields, FieldError{Field: field, Detail: fmt.Sprintf("longer than %d characters", maxDisableLen)})
		default:
			for k, r := range id {
				if r < 0x20 || r == 0x7f || r == utf8.RuneError {
					pos := k
					fields = append(fields, FieldError{Field: field, Detail: "control character in a constraint ID", Position: &pos, Token: fmt.Sprintf("%q", r)})
					break
				}
			}
		}
	}
	return fields
}

func fragmentFields(base string, frags []string) []FieldError {
	var fields []FieldError
	if len(frags) > maxFragments {
		return []FieldError{{Field: base, Detail: fmt.Sprintf("at most %d fragments", maxFragments)}}
	}
	for i, s := range frags {
		field := fmt.Sprintf("%s/%d", base, i)
		if len(s) > maxFragmentLen {
			fields = append(fields, FieldError{Field: field, Detail: fmt.Sprintf("longer than %d characters", maxFragmentLen)})
			continue
		}
		if _, err := molecule.ParseFragment(s); err != nil {
			var se *molecule.SMILESError
			if errors.As(err, &se) {
				pos := se.Pos
				fields = append(fields, FieldError{Field: field, Detail: se.Msg, Position: &pos, Token: se.Token})
			} else {
				fields = append(fields, FieldError{Field: field, Detail: err.Error()})
			}
		}
	}
	return fields
}

// checkCallbackURL accepts absolute http and https URLs with a host and
// no user information.
func checkCallbackURL(s string) error {
	if len(s) > maxURLLen {
		return fmt.Errorf("longer than %d characters", maxURLLen)
	}
	u, err := url.Parse(s)
	if err != nil {
		return errors.New("not a valid URL")
	}
	if u.Scheme != "http" && u.Scheme != "https" {
		return errors.New("must be an http or https URL")
	}
	if u.Host == "" || u.Hostname() == "" {
		return errors.New("must be an absolute URL with a host")
	}
	if u.User != nil {
		return errors.New("must not carry user information")
	}
	return checkURLHostPort(u)
}

// canonical returns the request as compact JSON with a fixed member order,
// and the hex SHA-256 of it (used to recognise an idempotent repeat).
func (jr JobRequest) canonical() (json.RawMessage, string, error) {
	c := jr
	c.Formula = strings.TrimSpace(c.Formula)
	c.Solvent = strings.TrimSpace(c.Solvent)
	peaks, err := normalizedPeaks(c.Peaks)
	if err != nil {
		return nil, "", err
	}
	c.Peaks = peaks
	b, err := json.Marshal(c)
	if err != nil {
		return nil, "", fmt.Errorf("encode request: %w", err)
	}
	sum := sha256.Sum256(b)
	return b, hex.EncodeToString(sum[:]), nil
}

// truncate shortens s to at most n runes for echoing in messages.
func truncate(s string, n int) string {
	if utf8.RuneCountInString(s) <= n {
		return s
	}
	return string([]rune(s)[:n]) + "…"
}

// peakPathPointer turns the peak parser's path of a structured peak list
// ("peaks[1].j", "[0].color") into a JSON Pointer into the request
// ("/peaks/1/j", "/peaks/0/color").
func peakPathPointer(path string) string {
	path = strings.TrimPrefix(path, "peaks")
	var b strings.Builder
	b.WriteString("/peaks")
	for path != "" {
		switch path[0] {
		case '[':
			end := strings.IndexByte(path, ']')
			if end < 0 {
				return b.String()
			}
			b.WriteString("/" + path[1:end])
			path = path[end+1:]
		case '.':
			path = path[1:]
			end := strings.IndexAny(path, ".[")
			if end < 0 {
				end = len(path)
			}
			b.WriteString("/" + escapePointer(path[:end]))
			path = path[end:]
		default:
			return b.String()
		}
	}
	return b.String()
}

func filterField(field string, err error) FieldError {
	var fe *isomers.FilterError
	if errors.As(err, &fe) {
		pos := fe.Pos
		return FieldError{Field: field, Detail: fe.Msg, Position: &pos, Token: fe.Token}
	}
	return FieldError{Field: field, Detail: err.Error()}
}
