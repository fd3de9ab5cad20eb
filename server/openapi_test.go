package server_test

import (
	"encoding/json"
	"net/http"
	"slices"
	"strings"
	"testing"

	"github.com/go-chi/chi/v5"

	"shiftrank/server"
	"shiftrank/store"
)

// notAPI are routes outside the OpenAPI description: the web page.
var notAPI = []string{"/*"}

func TestOpenAPICoversEveryRoute(t *testing.T) {
	srv := server.New(quietLogger(t), store.NewMemory(), &fakeRanker{}, server.Config{})
	routes := map[string]bool{}
	err := chi.Walk(srv.Router(), func(method, route string, _ http.Handler, _ ...func(http.Handler) http.Handler) error {
		route = strings.TrimSuffix(route, "/")
		if slices.Contains(notAPI, route) || strings.HasSuffix(route, "/*") {
			return nil
		}
		routes[strings.ToLower(method)+" "+route] = true
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	var doc struct {
		OpenAPI string                                `json:"openapi"`
		Info    struct{ Description string }          `json:"info"`
		Paths   map[string]map[string]json.RawMessage `json:"paths"`
		Hooks   map[string]json.RawMessage            `json:"webhooks"`
	}
	rec := httptestRecorder(srv, "GET", "/v1/openapi.json")
	if rec.Code != http.StatusOK {
		t.Fatalf("GET /v1/openapi.json = %d", rec.Code)
	}
	if err := json.Unmarshal(rec.Body.Bytes(), &doc); err != nil {
		t.Fatalf("openapi.json is not JSON: %v", err)
	}
	if !strings.HasPrefix(doc.OpenAPI, "3.1") {
		t.Errorf("openapi = %q, want 3.1.x", doc.OpenAPI)
	}
	documented := map[string]bool{}
	for path, ops := range doc.Paths {
		for method := range ops {
			if method == "parameters" || method == "summary" || method == "description" {
				continue
			}
			documented[method+" "+path] = true
		}
	}
	for r := range routes {
		if !documented[r] {
			t.Errorf("route %s is not in openapi.json", r)
		}
	}
	for d := range documented {
		if !routes[d] {
			t.Errorf("openapi.json documents %s, which the router does not serve", d)
		}
	}
	if len(routes) < 11 {
		t.Errorf("walked only %d routes: %v", len(routes), routes)
	}
	for _, want := range []string{"hypothesis", "authentic sample", "forensic, clinical or safety", server.SignatureHeader, "Bearer"} {
		if !strings.Contains(doc.Info.Description, want) {
			t.Errorf("API description lacks %q", want)
		}
	}
	if _, ok := doc.Hooks["jobFinished"]; !ok {
		t.Error("the callback is not described under webhooks")
	}
}
