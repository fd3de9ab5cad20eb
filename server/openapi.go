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
func openAPIDoc(baseURL string) ([]byte, error) {
	if baseURL == "" {
		return []byte(openAPI), nil
	}
	var doc map[string]any
	if err := json.Unmarshal([]byte(openAPI), &doc); err != nil {
		return nil, fmt.Errorf("decode openapi.json: %w", err)
	}
	doc["servers"] = []map[string]string{{"url": baseURL}}
	return json.MarshalIndent(doc, "", "  ")
}

func (s *Server) handleOpenAPI(w http.ResponseWriter, r *http.Request) {
	if s.openapiErr != nil {
		s.writeError(w, r, internal(s.openapiErr))
		return
	}
	w.Header().Set("Content-Type", "application/json")
	_, _ = w.Write(s.openapi)
}
