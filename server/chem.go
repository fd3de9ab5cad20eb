package server

import (
	"context"
	"errors"
	"fmt"
	"net/http"
	"strings"
	"time"

	"shiftrank/isomers"
	"shiftrank/molecule"
	"shiftrank/predict"
)

// PredictRequest is the body of POST /v1/predict.
type PredictRequest struct {
	SMILES string  `json:"smiles"`        // one molecule (required)
	MHz    float64 `json:"mhz,omitempty"` // spectrometer frequency; 0 = 400
}

const (
	maxSMILESLen      = 500
	maxPredictHeavy   = 100
	countTimeout      = 30 * time.Second
	defaultCountLimit = 100_000
)

func (s *Server) handlePredict(w http.ResponseWriter, r *http.Request) {
	var req PredictRequest
	if err := decodeJSON(w, r, s.cfg.MaxBodyBytes, &req); err != nil {
		s.writeError(w, r, err)
		return
	}
	var fields []FieldError
	g, err := parseSMILESField(req.SMILES)
	if err != nil {
		fields = append(fields, *err)
	}
	if req.MHz != 0 && (req.MHz < minMHz || req.MHz > maxMHz) {
		fields = append(fields, FieldError{Field: "/mhz", Detail: fmt.Sprintf("spectrometer frequency %g MHz is outside %d..%d", req.MHz, minMHz, maxMHz)})
	}
	if len(fields) > 0 {
		s.writeError(w, r, invalidFields(fields))
		return
	}
	mhz := req.MHz
	if mhz == 0 {
		mhz = 400
	}
	spec, perr := predict.New(predict.Options{MHz: mhz, Explain: true}).Predict(g)
	if perr != nil {
		s.writeError(w, r, invalidFields([]FieldError{{Field: "/smiles", Detail: perr.Error()}}))
		return
	}
	s.writeJSON(w, http.StatusOK, predictOutput(strings.TrimSpace(req.SMILES), g, mhz, spec))
}

func parseSMILESField(smi string) (*molecule.Graph, *FieldError) {
	smi = strings.TrimSpace(smi)
	switch {
	case smi == "":
		return nil, &FieldError{Field: "/smiles", Detail: "required: one molecule as SMILES, e.g. CCO"}
	case len(smi) > maxSMILESLen:
		return nil, &FieldError{Field: "/smiles", Detail: fmt.Sprintf("longer than %d characters", maxSMILESLen)}
	}
	g, err := molecule.ParseSMILES(smi)
	if err != nil {
		var se *molecule.SMILESError
		if errors.As(err, &se) {
			pos := se.Pos
			return nil, &FieldError{Field: "/smiles", Detail: se.Msg, Position: &pos, Token: se.Token}
		}
		return nil, &FieldError{Field: "/smiles", Detail: err.Error()}
	}
	if heavy := len(g.Atoms); heavy > maxPredictHeavy {
		return nil, &FieldError{Field: "/smiles", Detail: fmt.Sprintf("%d heavy atoms; at most %d", heavy, maxPredictHeavy)}
	}
	return g, nil
}

// CountRequest is the body of POST /v1/isomers:count.
type CountRequest struct {
	Formula string `json:"formula"`          // required
	Filter  string `json:"filter,omitempty"` // plausibility rules; "" = "plausible"
	Limit   int64  `json:"limit,omitempty"`  // stop after this many structures; 0 = 100,000; at most the server's limit
}

// CountResponse is the answer of POST /v1/isomers:count. Count is exact
// when Complete is true, else a lower bound (the limit or the time bound
// was reached).
type CountResponse struct {
	Formula   string           `json:"formula"`
	Filter    string           `json:"filter"`
	Count     int64            `json:"count"`
	Complete  bool             `json:"complete"`
	Generated int64            `json:"generated"`
	Removed   map[string]int64 `json:"removed"`
	Limit     int64            `json:"limit"`
}

func (s *Server) handleCount(w http.ResponseWriter, r *http.Request) {
	var req CountRequest
	if err := decodeJSON(w, r, s.cfg.MaxBodyBytes, &req); err != nil {
		s.writeError(w, r, err)
		return
	}
	var fields []FieldError
	var f molecule.Formula
	if strings.TrimSpace(req.Formula) == "" {
		fields = append(fields, FieldError{Field: "/formula", Detail: "required: a molecular formula such as C4H8O2"})
	} else {
		var err error
		if f, err = molecule.ParseFormulaLimit(req.Formula, s.cfg.MaxHeavyAtoms); err != nil {
			fields = append(fields, formulaField(err))
		}
	}
	filterName := req.Filter
	if filterName == "" {
		filterName = "plausible"
	}
	filter, err := isomers.ParseFilter(filterName)
	if err != nil {
		fields = append(fields, filterField("/filter", err))
	}
	limit := req.Limit
	if limit == 0 {
		limit = min(defaultCountLimit, s.cfg.MaxCountLimit)
	}
	if limit < 0 || limit > s.cfg.MaxCountLimit {
		fields = append(fields, FieldError{Field: "/limit", Detail: fmt.Sprintf("must be between 1 and %d", s.cfg.MaxCountLimit)})
	}
	if len(fields) > 0 {
		s.writeError(w, r, invalidFields(fields))
		return
	}
	ctx, cancel := context.WithTimeout(r.Context(), countTimeout)
	defer cancel()
	st, err := isomers.Count(ctx, f, isomers.Options{Filter: filter, Limit: limit, Workers: 1})
	if err != nil && ctx.Err() == nil {
		s.writeError(w, r, internal(fmt.Errorf("count isomers of %s: %w", f, err)))
		return
	}
	removed := st.Removed
	if removed == nil {
		removed = map[string]int64{}
	}
	s.writeJSON(w, http.StatusOK, CountResponse{
		Formula:   f.String(),
		Filter:    filterName,
		Count:     st.Emitted,
		Complete:  st.Complete && err == nil,
		Generated: st.Generated,
		Removed:   removed,
		Limit:     limit,
	})
}
