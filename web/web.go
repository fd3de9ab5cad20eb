// Package web provides shiftrank's browser page: a single-page application
// (plain HTML, CSS and JavaScript, no build step) embedded in the binary,
// with the vendored RDKit MinimalLib WebAssembly build it draws structures
// with.
//
// Handler serves the page at "/" and at "/jobs/{id}" (the same document; the
// script routes on the path, so a deep link to a job works on reload) and the
// assets under "/static/". The page talks only to the service's /v1 API on
// the same origin; the handler itself has no state and no dependencies.
package web

import (
	"embed"
	"io/fs"
	"net/http"
	"strings"
)

// content holds index.html and the assets under static/. An embed.FS is
// read-only.
//
//go:embed static
var content embed.FS

// Handler returns the page's handler. Mount it at "/" below the API routes
// (it answers 404 for any path it does not serve, including /v1/...):
//
//	GET /                 the page (submit form)
//	GET /jobs/{id}        the page (job view; the script reads the id from the path)
//	GET /static/...       the page's assets (JavaScript, CSS, vendored RDKit)
//
// Only GET and HEAD are served; other methods get 405.
func Handler() http.Handler {
	static, err := fs.Sub(content, "static")
	if err != nil {
		panic("web: embedded static directory missing: " + err.Error())
	}
	index, err := fs.ReadFile(static, "index.html")
	if err != nil {
		panic("web: embedded index.html missing: " + err.Error())
	}
	assets := http.StripPrefix("/static/", http.FileServerFS(static))
	return http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		if r.Method != http.MethodGet && r.Method != http.MethodHead {
			w.Header().Set("Allow", "GET, HEAD")
			http.Error(w, "method not allowed", http.StatusMethodNotAllowed)
			return
		}
		p := r.URL.Path
		switch {
		case p == "/" || p == "/index.html" || isJobPath(p):
			h := w.Header()
			h.Set("Content-Type", "text/html; charset=utf-8")
			h.Set("Cache-Control", "no-cache")
			h.Set("X-Content-Type-Options", "nosniff")
			h.Set("Referrer-Policy", "same-origin")
			h.Set("Content-Security-Policy", contentSecurityPolicy)
			if r.Method == http.MethodHead {
				return
			}
			w.Write(index)
		case strings.HasPrefix(p, "/static/") && !strings.HasSuffix(p, "/") && p != "/static/index.html":
			h := w.Header()
			h.Set("X-Content-Type-Options", "nosniff")
			if strings.HasPrefix(p, "/static/vendor/") {
				// Vendored files change only with their version (in the path's README).
				h.Set("Cache-Control", "public, max-age=86400")
			} else {
				h.Set("Cache-Control", "no-cache")
			}
			assets.ServeHTTP(w, r)
		default:
			http.NotFound(w, r)
		}
	})
}

// contentSecurityPolicy keeps the page to its own origin: no inline or
// third-party scripts. RDKit's WebAssembly glue builds its bindings with
// new Function, hence 'unsafe-eval'; the drawings and bars carry inline
// style attributes, hence 'unsafe-inline' for styles only.
const contentSecurityPolicy = "default-src 'self'; script-src 'self' 'unsafe-eval' 'wasm-unsafe-eval'; " +
	"style-src 'self' 'unsafe-inline'; img-src 'self' data: blob:; connect-src 'self'; object-src 'none'; " +
	"base-uri 'none'; form-action 'self'; frame-ancestors 'none'"

// isJobPath reports whether p is /jobs/{id} with a non-empty id made of
// URL-safe characters and no further segments.
func isJobPath(p string) bool {
	id, ok := strings.CutPrefix(p, "/jobs/")
	if !ok || id == "" || len(id) > 128 {
		return false
	}
	for _, c := range id {
		if !(c >= 'a' && c <= 'z' || c >= 'A' && c <= 'Z' || c >= '0' && c <= '9' || c == '-' || c == '_') {
			return false
		}
	}
	return true
}
