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
	// section is passed on to the ranking as CarbonPeaks would be.
	Peaks json.RawMessage `json:"peaks"`
	// CarbonPeaks is the observed 13C peak list, optional: journal text
	// with or without a "13C NMR" header ("171.1 (C), 60.4 (CH2), 21.0
	// (CH3)"), JCAMP-DX text, a JSON array of {"shift" or "range", "count",
	// "dept"} objects or a list object {"nucleus", "mhz", "solvent",
	// "peaks"}. A list that names no nucleus is read as 13C
	// (spectrum.ReadAs). At most one of Peaks and CarbonPeaks may carry a
	// 13C list.
	CarbonPeaks json.RawMessage `json:"carbon_peaks,omitempty"`
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
	// TimeBudget is the ranking's time limit in seconds (a safety stop,
	// reported as such); 0 means the server's --time-budget, which is
	// also the most allowed.
	TimeBudget float64 `json:"time_budget,omitempty"`
	// MaxCandidates stops the search after this many isomers; 0 means the
	// server's --max-candidates, which is also the most allowed.
	MaxCandidates int64 `json:"max_candidates,omitempty"`
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
	if tb := jr.Options.TimeBudget; tb > 0 && time.Duration(tb*float64(time.Second)) < lim.timeBudget {
		rr.TimeBudget = time.Duration(tb * float64(time.Second))
	}
	if mc := jr.Options.MaxCandidates; mc > 0 && (lim.maxCandidates <= 0 || mc < lim.maxCandidates) {
		rr.MaxCandidates = mc
	}

	if strings.TrimSpace(jr.Formula) == "" {
		bad("/formula", "required: a molecular formula such as C4H8O2")
	} else if norm, err := molecule.NormalizeFormula(jr.Formula); err != nil {
		fields = append(fields, formulaField(err))
	} else if f, err := molecule.ParseFormulaLimit(norm, lim.maxHeavyAtoms); err != nil {
		if norm != strings.TrimSpace(jr.Formula) {
			// Positions in the rewritten text do not point into the
			// client's; name the rewritten formula instead.
			var fe *molecule.FormulaError
			if errors.As(err, &fe) {
				fe.Msg += " (in " + norm + ", as read from the formula given)"
				fe.Pos, fe.Token = 0, jr.Formula
			}
		}
		fields = append(fields, formulaField(err))
	} else {
		// The ranker gets the formula in Hill order, as read.
		rr.Formula = f.String()
	}

	pl, carbon, fe := parsePeaksField(jr.Peaks)
	fields = append(fields, fe...)
	rr.Peaks, rr.Carbon = pl, carbon
	if c, present, fe := parseCarbonField(jr.CarbonPeaks); present {
		fields = append(fields, fe...)
		switch {
		case len(fe) > 0:
		case len(carbon.Peaks) > 0:
			pos := carbon.Pos
			fields = append(fields, FieldError{Field: "/carbon_peaks", Token: "13C",
				Detail: fmt.Sprintf("the peaks text already has a 13C list (at character %d of peaks): give the 13C list once, in carbon_peaks or in peaks", pos+1)})
		default:
			rr.Carbon = c
		}
	}

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
	if tb := jr.Options.TimeBudget; tb < 0 || tb > lim.timeBudget.Seconds() || tb > 0 && tb < 1 {
		bad("/options/time_budget", fmt.Sprintf("must be between 1 and %g seconds, this server's limit (0 or absent means the limit)", lim.timeBudget.Seconds()))
	}
	if mc := jr.Options.MaxCandidates; mc < 0 || lim.maxCandidates > 0 && mc > lim.maxCandidates {
		bad("/options/max_candidates", fmt.Sprintf("must be between 1 and %d, this server's limit (0 or absent means the limit)", lim.maxCandidates))
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
	lists, fe := readPeaksMember("/peaks", raw, spectrum.H1)
	if fe != nil {
		return h, c, fe
	}
	var found bool
	h, found, err := spectrum.Pick(lists, spectrum.H1)
	if err == nil && !found {
		return h, c, []FieldError{{Field: "/peaks", Detail: fmt.Sprintf("no 1H peak list (found %s): the ranking needs one", lists[0].Nucleus)}}
	}
	if err == nil {
		c, _, err = spectrum.Pick(lists, spectrum.C13)
	}
	if err != nil {
		return h, c, []FieldError{peakField("/peaks", raw, err)}
	}
	return h, c, nil
}

// parseCarbonField parses the "carbon_peaks" member with spectrum.ReadAs,
// reading a list that names no nucleus as 13C. present is false when the
// member is absent or null. A 1H list in it is an error: it belongs in
// "peaks".
func parseCarbonField(raw json.RawMessage) (c spectrum.PeakList, present bool, _ []FieldError) {
	raw = bytes.TrimSpace(raw)
	if len(raw) == 0 || string(raw) == "null" {
		return c, false, nil
	}
	lists, fe := readPeaksMember("/carbon_peaks", raw, spectrum.C13)
	if fe != nil {
		return c, true, fe
	}
	for _, l := range lists {
		if l.Nucleus != spectrum.C13 {
			f := FieldError{Field: "/carbon_peaks", Token: l.Nucleus.String(),
				Detail: fmt.Sprintf("a %s peak list: give it in peaks; carbon_peaks takes the 13C list", l.Nucleus)}
			if raw[0] == '"' {
				pos := l.Pos
				f.Position = &pos
			}
			return c, true, []FieldError{f}
		}
	}
	c, _, err := spectrum.Pick(lists, spectrum.C13)
	if err != nil {
		return c, true, []FieldError{peakField("/carbon_peaks", raw, err)}
	}
	return c, true, nil
}

// readPeaksMember reads a peak-list member (field is its JSON Pointer): a
// JSON string of journal text or JCAMP-DX, a JSON array of peak objects
// or of list objects, or (for a default nucleus other than 1H) a list
// object. Lists naming no nucleus are read as def.
func readPeaksMember(field string, raw json.RawMessage, def spectrum.Nucleus) ([]spectrum.PeakList, []FieldError) {
	raw = bytes.TrimSpace(raw)
	if len(raw) == 0 || string(raw) == "null" {
		return nil, []FieldError{{Field: field, Detail: "required: journal text such as \"3.69 (q, 2H), 1.22 (t, 3H)\", JCAMP-DX text or an array of peak objects"}}
	}
	var input []byte
	switch {
	case raw[0] == '"':
		var text string
		if err := json.Unmarshal(raw, &text); err != nil {
			return nil, []FieldError{{Field: field, Detail: "not a valid JSON string"}}
		}
		if strings.TrimSpace(text) == "" {
			return nil, []FieldError{{Field: field, Detail: "required: the peak list is empty"}}
		}
		input = []byte(text)
	case raw[0] == '[' || raw[0] == '{' && def != spectrum.H1:
		input = raw
	case def != spectrum.H1:
		return nil, []FieldError{{Field: field, Detail: "must be a string of journal text or JCAMP-DX, an array of peak objects or a peak list object"}}
	default:
		return nil, []FieldError{{Field: field, Detail: "must be a string of journal text or JCAMP-DX, or an array of peak objects"}}
	}
	lists, err := spectrum.ReadAs(input, def)
	if err != nil {
		return nil, []FieldError{peakField(field, raw, err)}
	}
	return lists, nil
}

// peakField turns an error of the peak readers into a field error of the
// member field whose raw JSON is raw: the path inside a structured list
// becomes a JSON Pointer ("/peaks/1/j"); in text the token and its
// position are kept.
func peakField(field string, raw json.RawMessage, err error) FieldError {
	var pe *spectrum.PeakError
	if !errors.As(err, &pe) {
		return FieldError{Field: field, Detail: err.Error()}
	}
	pos := pe.Pos
	f := FieldError{Field: field, Detail: pe.Msg, Token: pe.Token, Position: &pos}
	raw = bytes.TrimSpace(raw)
	structured := len(raw) > 0 && raw[0] != '"'
	switch {
	case structured && pe.Field != "" && pe.Field != "nucleus":
		f.Field = pathPointer(field, pe.Field, field == "/peaks")
	case pe.Field != "":
		f.Detail = pe.Field + ": " + pe.Msg
	}
	if pe.Line > 1 {
		f.Detail = fmt.Sprintf("line %d: %s", pe.Line, f.Detail)
	}
	return f
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
	if cp := bytes.TrimSpace(c.CarbonPeaks); len(cp) == 0 || string(cp) == "null" {
		c.CarbonPeaks = nil
	} else if c.CarbonPeaks, err = normalizedPeaks(cp); err != nil {
		return nil, "", err
	}
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
func peakPathPointer(path string) string { return pathPointer("/peaks", path, true) }

// pathPointer turns the peak parser's path of a value inside the member
// base ("[1].j", "peaks[0].dept") into a JSON Pointer ("/carbon_peaks/1/j",
// "/carbon_peaks/peaks/0/dept"). With stripPeaks a leading "peaks" is the
// member itself ("peaks[1].j" → "/peaks/1/j").
func pathPointer(base, path string, stripPeaks bool) string {
	if stripPeaks {
		path = strings.TrimPrefix(path, "peaks")
	}
	var b strings.Builder
	b.WriteString(base)
	if path != "" && path[0] != '[' && path[0] != '.' {
		path = "." + path
	}
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
