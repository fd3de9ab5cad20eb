package server_test

import (
	"encoding/json"
	"net/http"
	"reflect"
	"slices"
	"strings"
	"testing"

	"github.com/go-chi/chi/v5"

	"shiftrank/ranker"
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
	for _, want := range []string{"hypothesis", "authentic sample", "forensic, clinical or safety", server.SignatureHeader, server.TimestampHeader, "Bearer", "429"} {
		if !strings.Contains(doc.Info.Description, want) {
			t.Errorf("API description lacks %q", want)
		}
	}
	if _, ok := doc.Hooks["jobFinished"]; !ok {
		t.Error("the callback is not described under webhooks")
	}
}

// TestOpenAPISchemasMatchTypes checks that the schemas of the response types
// name exactly the JSON members the Go types write.
func TestOpenAPISchemasMatchTypes(t *testing.T) {
	var doc struct {
		Components struct {
			Schemas map[string]struct {
				Properties map[string]json.RawMessage `json:"properties"`
				Required   []string                   `json:"required"`
			} `json:"schemas"`
		} `json:"components"`
	}
	rec := httptestRecorder(server.New(quietLogger(t), store.NewMemory(), &fakeRanker{}, server.Config{}), "GET", "/v1/openapi.json")
	if err := json.Unmarshal(rec.Body.Bytes(), &doc); err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct {
		schema string
		typ    any
	}{
		{"CandidateList", server.CandidateList{}},
		{"JobRequest", server.JobRequest{}},
		{"Job", server.JobView{}},
		{"ObservedPeak", ranker.ObservedPeak{}},
	} {
		sc, ok := doc.Components.Schemas[tc.schema]
		if !ok {
			t.Errorf("schema %s missing", tc.schema)
			continue
		}
		members := map[string]bool{}
		rt := reflect.TypeOf(tc.typ)
		for i := range rt.NumField() {
			name, _, _ := strings.Cut(rt.Field(i).Tag.Get("json"), ",")
			if name == "" || name == "-" {
				continue
			}
			members[name] = true
			if _, ok := sc.Properties[name]; !ok {
				t.Errorf("schema %s lacks %q, which %s writes", tc.schema, name, rt.Name())
			}
		}
		for name := range sc.Properties {
			if !members[name] {
				t.Errorf("schema %s describes %q, which %s does not write", tc.schema, name, rt.Name())
			}
		}
		for _, name := range sc.Required {
			if !members[name] {
				t.Errorf("schema %s requires %q, which %s does not write", tc.schema, name, rt.Name())
			}
		}
	}
}
