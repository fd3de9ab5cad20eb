package web

import (
	"fmt"
	"io"
	"net/http"
	"net/http/httptest"
	"strings"
	"testing"
)

func TestHandlerRoutes(t *testing.T) {
	h := Handler()
	tests := []struct {
		name, method, path string
		status             int
		contentType        string // prefix
		body               string // substring
	}{
		{"page at root", "GET", "/", 200, "text/html", `id="submit-form"`},
		{"job deep link", "GET", "/jobs/3q7kx2m9a1", 200, "text/html", `id="view-job"`},
		{"job id with dash and underscore", "GET", "/jobs/ab-c_d", 200, "text/html", "<!doctype html>"},
		{"head of the page", "HEAD", "/", 200, "text/html", ""},
		{"script", "GET", "/static/app.js", 200, "text/javascript", "import "},
		{"style", "GET", "/static/app.css", 200, "text/css", ":root"},
		{"rdkit loader", "GET", "/static/vendor/rdkit/RDKit_minimal.js", 200, "text/javascript", "initRDKitModule"},
		{"rdkit wasm", "GET", "/static/vendor/rdkit/RDKit_minimal.wasm", 200, "application/wasm", "\x00asm"},
		{"rdkit licence", "GET", "/static/vendor/rdkit/LICENSE", 200, "", "Redistribution and use"},
		{"unknown path", "GET", "/nope", 404, "", ""},
		{"api paths are not ours", "GET", "/v1/jobs", 404, "", ""},
		{"job path with extra segment", "GET", "/jobs/abc/candidates", 404, "", ""},
		{"empty job id", "GET", "/jobs/", 404, "", ""},
		{"job id with odd characters", "GET", "/jobs/a.b", 404, "", ""},
		{"no directory listings", "GET", "/static/vendor/", 404, "", ""},
		{"post is refused", "POST", "/", 405, "", ""},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			rec := httptest.NewRecorder()
			h.ServeHTTP(rec, httptest.NewRequest(tc.method, tc.path, nil))
			res := rec.Result()
			body, _ := io.ReadAll(res.Body)
			if res.StatusCode != tc.status {
				t.Fatalf("%s %s: status %d, want %d", tc.method, tc.path, res.StatusCode, tc.status)
			}
			if ct := res.Header.Get("Content-Type"); !strings.HasPrefix(ct, tc.contentType) {
				t.Errorf("%s %s: Content-Type %q, want prefix %q", tc.method, tc.path, ct, tc.contentType)
			}
			if !strings.Contains(string(body), tc.body) {
				t.Errorf("%s %s: body lacks %q", tc.method, tc.path, tc.body)
			}
			if tc.contentType == "text/html" && !strings.Contains(res.Header.Get("Content-Security-Policy"), "default-src 'self'") {
				t.Errorf("%s %s: no same-origin Content-Security-Policy", tc.method, tc.path)
			}
			if tc.method == "HEAD" && len(body) != 0 {
				t.Errorf("HEAD %s: body of %d bytes, want none", tc.path, len(body))
			}
		})
	}
}

// TestPageLabelsEveryField checks that each form control in the page has a
// <label for=...> naming it (the table rows the script adds label
// themselves; the e2e test checks those).
func TestPageLabelsEveryField(t *testing.T) {
	b, err := content.ReadFile("static/index.html")
	if err != nil {
		t.Fatal(err)
	}
	page := string(b)
	for _, tag := range []string{"<input", "<select", "<textarea"} {
		rest := page
		for {
			i := strings.Index(rest, tag)
			if i < 0 {
				break
			}
			rest = rest[i:]
			end := strings.IndexByte(rest, '>')
			elem := rest[:end]
			rest = rest[end:]
			j := strings.Index(elem, `id="`)
			if j < 0 {
				t.Errorf("%s without an id: %s", tag, elem)
				continue
			}
			id := elem[j+4:]
			id = id[:strings.IndexByte(id, '"')]
			if !strings.Contains(page, `for="`+id+`"`) {
				t.Errorf("field %q has no <label for=%q>", id, id)
			}
		}
	}
}

func TestPageCarriesTheCaution(t *testing.T) {
	b, err := content.ReadFile("static/index.html")
	if err != nil {
		t.Fatal(err)
	}
	for _, phrase := range []string{"hypothesis", "authentic sample", "further spectra", "forensic, clinical or safety"} {
		if !strings.Contains(string(b), phrase) {
			t.Errorf("page lacks the caution phrase %q", phrase)
		}
	}
}

func ExampleHandler() {
	mux := http.NewServeMux()
	// The API's routes go first; the page takes everything else.
	mux.Handle("/", Handler())
	rec := httptest.NewRecorder()
	mux.ServeHTTP(rec, httptest.NewRequest("GET", "/jobs/abc123", nil))
	fmt.Println(rec.Code, rec.Header().Get("Content-Type"))
	// Output: 200 text/html; charset=utf-8
}
