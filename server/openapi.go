package server

import (
	_ "embed"
	"encoding/json"
	"fmt"
	"net/http"
)

// openAPI is the OpenAPI 3.1 description of every endpoint. A test walks
// the router and checks that each route is documented and vice versa.
//
//go:embed openapi.json
var openAPI string

// openAPIDoc returns the description with "servers" set to the public base
// URL when one is configured.
func (s *Server) openAPIDoc() ([]byte, error) {
	if s.cfg.BaseURL == "" {
		return []byte(openAPI), nil
	}
	var doc map[string]any
	if err := json.Unmarshal([]byte(openAPI), &doc); err != nil {
		return nil, fmt.Errorf("decode openapi.json: %w", err)
	}
	doc["servers"] = []map[string]string{{"url": s.cfg.BaseURL}}
	return json.MarshalIndent(doc, "", "  ")
}

func (s *Server) handleOpenAPI(w http.ResponseWriter, r *http.Request) {
	b, err := s.openAPIDoc()
	if err != nil {
		s.writeError(w, r, internal(err))
		return
	}
	w.Header().Set("Content-Type", "application/json")
	_, _ = w.Write(b)
}
