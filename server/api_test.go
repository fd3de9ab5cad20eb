package server_test

import (
	"context"
	"crypto/hmac"
	"crypto/sha256"
	"encoding/hex"
	"encoding/json"
	"fmt"
	"io"
	"net/http"
	"net/http/httptest"
	"slices"
	"strconv"
	"strings"
	"sync"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/server"
	"shiftrank/store"
)

func TestSubmitPollCandidates(t *testing.T) {
	forEachStore(t, func(t *testing.T, st testStore) {
		rk := &fakeRanker{}
		_, hs := startServer(t, st, rk, server.Config{AllowAnonymous: true, BaseURL: "https://nmr.example.org", TimeBudget: 7 * time.Second})
		c := client{t: t, base: hs.URL}

		r := c.do("POST", "/v1/jobs", ethanolJob())
		if r.status != http.StatusAccepted {
			t.Fatalf("POST /v1/jobs = %d %s, want 202", r.status, r.body)
		}
		var j server.JobView
		r.decode(t, &j)
		if want := "https://nmr.example.org/v1/jobs/" + j.ID; r.header.Get("Location") != want {
			t.Errorf("Location = %q, want %q", r.header.Get("Location"), want)
		}
		if j.Status != store.StatusQueued && j.Status != store.StatusRunning {
			t.Errorf("new job status = %q, want queued", j.Status)
		}
		if j.Reference != "NB-0042-a" || j.CreatedAt == nil {
			t.Errorf("new job = %+v, want reference echoed and created_at set", j)
		}
		// The contract's member names are all present, null or not.
		var raw map[string]json.RawMessage
		r.decode(t, &raw)
		for _, k := range []string{"id", "status", "progress", "created_at", "started_at", "finished_at", "error", "reference"} {
			if _, ok := raw[k]; !ok {
				t.Errorf("job JSON lacks %q: %s", k, r.body)
			}
		}

		done := c.waitJob(j.ID, 10*time.Second)
		if done.Status != store.StatusSucceeded || done.StartedAt == nil || done.FinishedAt == nil || done.Error != nil {
			t.Fatalf("finished job = %+v, want succeeded with timestamps and no error", done)
		}
		if done.Progress.Scored != 3 {
			t.Errorf("progress = %+v, want scored 3", done.Progress)
		}
		if got := rk.reqs[0]; got.Formula != "C2H6O" || len(got.Peaks.Peaks) != 3 || got.TimeBudget != 7*time.Second {
			t.Errorf("ranker request = %+v, want C2H6O, 3 peaks, 7s budget", got)
		}

		r = c.do("GET", "/v1/jobs/"+j.ID+"/candidates?limit=2&offset=1", nil)
		if r.status != http.StatusOK {
			t.Fatalf("GET candidates = %d %s", r.status, r.body)
		}
		var cl struct {
			JobID        string                   `json:"job_id"`
			IsomersTotal int64                    `json:"isomers_total"`
			Total        int                      `json:"total"`
			Candidates   []map[string]interface{} `json:"candidates"`
			Caution      string                   `json:"caution"`
		}
		r.decode(t, &cl)
		if cl.JobID != j.ID || cl.IsomersTotal != 3 || cl.Total != 3 || len(cl.Candidates) != 2 || cl.Candidates[0]["smiles"] != "COC" {
			t.Errorf("candidates page = %+v, want job %s, 3 isomers, ranks 2..3", cl, j.ID)
		}
		if !strings.Contains(cl.Caution, "hypothesis") {
			t.Errorf("caution = %q", cl.Caution)
		}
		var members map[string]json.RawMessage
		r.decode(t, &members)
		for _, k := range []string{"job_id", "isomers_total", "candidates", "peaks", "warnings", "complete", "scored", "formula", "dbe"} {
			if _, ok := members[k]; !ok {
				t.Errorf("candidates JSON lacks %q: %s", k, r.body)
			}
		}

		r = c.do("GET", "/v1/jobs/"+j.ID+"/candidates/3", nil)
		var cand map[string]any
		r.decode(t, &cand)
		if r.status != http.StatusOK || cand["smiles"] != "OCC" || cand["rank"] != 3.0 {
			t.Errorf("GET candidates/3 = %d %s, want rank 3 OCC", r.status, r.body)
		}
		for _, tc := range []struct {
			path   string
			status int
		}{
			{"/candidates/4", http.StatusNotFound},
			{"/candidates/0", http.StatusBadRequest},
			{"/candidates/x", http.StatusBadRequest},
			{"/candidates?limit=0", http.StatusBadRequest},
			{"/candidates?offset=-1", http.StatusBadRequest},
			{"/candidates?offset=10", http.StatusOK},
		} {
			if r := c.do("GET", "/v1/jobs/"+j.ID+tc.path, nil); r.status != tc.status {
				t.Errorf("GET %s = %d %s, want %d", tc.path, r.status, r.body, tc.status)
			}
		}
		if r := c.do("GET", "/v1/jobs/nosuchjob", nil); r.status != http.StatusNotFound {
			t.Errorf("GET unknown job = %d, want 404", r.status)
		}
	})
}

// problemOf decodes a problem details reply and checks its media type.
func problemOf(t *testing.T, r reply) server.Problem {
	t.Helper()
	if ct := r.header.Get("Content-Type"); ct != "application/problem+json" {
		t.Errorf("Content-Type = %q, want application/problem+json (body %s)", ct, r.body)
	}
	var p server.Problem
	r.decode(t, &p)
	if p.Status != r.status {
		t.Errorf("problem status %d != HTTP status %d", p.Status, r.status)
	}
	return p
}

func fieldNames(p server.Problem) []string {
	var out []string
	for _, f := range p.Errors {
		out = append(out, f.Field)
	}
	return out
}

func TestValidationNamesFields(t *testing.T) {
	st := store.NewMemory()
	_, hs := startServer(t, st, &fakeRanker{}, server.Config{AllowAnonymous: true, AnonymousSecret: []byte("0123456789abcdef"), MaxBodyBytes: 4096, MaxHeavyAtoms: 12})
	c := client{t: t, base: hs.URL}
	tests := []struct {
		name   string
		body   string
		status int
		fields []string
		pos    int    // position reported for the first field, -1 = none expected
		token  string // token reported for the first field
	}{
		{"unknown element", `{"formula":"C2H6Xy","peaks":"1.2 (s, 3H)"}`, 400, []string{"/formula"}, 4, "Xy"},
		{"too many heavy atoms", `{"formula":"C13H28","peaks":"1.2 (s, 3H)"}`, 400, []string{"/formula"}, 0, "C13H28"},
		{"missing formula and peaks", `{}`, 400, []string{"/formula", "/peaks"}, -1, ""},
		{"peaks not text", `{"formula":"C2H6O","peaks":12}`, 400, []string{"/peaks"}, -1, ""},
		{"bad peak text", `{"formula":"C2H6O","peaks":"3.69 (q, 2H), abc"}`, 400, []string{"/peaks"}, 14, ""},
		{"structured peak bad j", `{"formula":"C2H6O","peaks":[{"shift":1.2,"multiplicity":"t","j":[7]},{"shift":3.7,"multiplicity":"q","j":"x"}]}`, 400, []string{"/peaks/1/j"}, -1, ""},
		{"structured peak unknown member", `{"formula":"C2H6O","peaks":[{"shift":1.2,"colour":"red"}]}`, 400, []string{"/peaks/0/colour"}, -1, ""},
		{"bad fragments", `{"formula":"C2H6O","peaks":"1.2 (s)","options":{"require":["C=O","C(("],"forbid":["[Xx]"]}}`, 400, []string{"/options/require/1", "/options/forbid/0"}, -1, ""},
		{"unknown filter rule", `{"formula":"C2H6O","peaks":"1.2 (s)","options":{"filter":"plausible,-no-such-rule"}}`, 400, []string{"/options/filter"}, -1, ""},
		{"mhz out of range", `{"formula":"C2H6O","peaks":"1.2 (s)","mhz":5}`, 400, []string{"/mhz"}, -1, ""},
		{"unknown solvent", `{"formula":"C2H6O","peaks":"1.2 (s)","solvent":"ink"}`, 400, []string{"/solvent"}, -1, ""},
		{"top_k negative", `{"formula":"C2H6O","peaks":"1.2 (s)","options":{"top_k":-1}}`, 400, []string{"/options/top_k"}, -1, ""},
		{"time budget over the server's", `{"formula":"C2H6O","peaks":"1.2 (s)","options":{"time_budget":3600}}`, 400, []string{"/options/time_budget"}, -1, ""},
		{"time budget under a second", `{"formula":"C2H6O","peaks":"1.2 (s)","options":{"time_budget":0.5}}`, 400, []string{"/options/time_budget"}, -1, ""},
		{"max candidates over the server's", `{"formula":"C2H6O","peaks":"1.2 (s)","options":{"max_candidates":999999999}}`, 400, []string{"/options/max_candidates"}, -1, ""},
		{"max nodes negative", `{"formula":"C2H6O","peaks":"1.2 (s)","options":{"max_nodes":-5}}`, 400, []string{"/options/max_nodes"}, -1, ""},
		{"disable with an empty ID", `{"formula":"C2H6O","peaks":"1.2 (s)","options":{"disable":["peak-1-shift",""]}}`, 400, []string{"/options/disable/1"}, -1, ""},
		{"callback scheme", `{"formula":"C2H6O","peaks":"1.2 (s)","callback_url":"ftp://example.org/x"}`, 400, []string{"/callback_url"}, -1, ""},
		{"callback relative", `{"formula":"C2H6O","peaks":"1.2 (s)","callback_url":"/hook"}`, 400, []string{"/callback_url"}, -1, ""},
		{"reference too long", `{"formula":"C2H6O","peaks":"1.2 (s)","reference":"` + strings.Repeat("x", 201) + `"}`, 400, []string{"/reference"}, -1, ""},
		{"several at once", `{"formula":"Xx","peaks":"","callback_url":"mailto:a@b"}`, 400, []string{"/formula", "/peaks", "/callback_url"}, 0, "Xx"},
		{"unknown member", `{"formula":"C2H6O","peaks":"1.2 (s)","formla":"C2"}`, 400, []string{"/formla"}, -1, ""},
		{"unknown nested member", `{"formula":"C2H6O","peaks":"1.2 (s)","options":{"topk":3}}`, 400, []string{"/options/topk"}, -1, ""},
		{"several unknown and mistyped members", `{"formula":"C2H6O","formla":"C2","peaks":"1.2 (s)","options":{"topk":3,"top_k":"ten","require":"C=O","forbid":["C#N",7]},"mhz":"400"}`, 400,
			[]string{"/formla", "/options/topk", "/options/top_k", "/options/require", "/options/forbid/1", "/mhz"}, -1, ""},
		{"wrong type", `{"formula":"C2H6O","peaks":"1.2 (s)","options":{"top_k":"ten"}}`, 400, []string{"/options/top_k"}, -1, ""},
		{"trailing data", `{"formula":"C2H6O","peaks":"1.2 (s)"} {}`, 400, []string{""}, -1, ""},
		{"malformed", `{"formula":`, 400, []string{""}, -1, ""},
		{"empty body", ``, 400, []string{""}, -1, ""},
		{"array body", `[]`, 400, []string{""}, -1, ""},
		{"too large", `{"formula":"C2H6O","peaks":"` + strings.Repeat("1.2 (s), ", 600) + `"}`, 413, nil, -1, ""},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := c.do("POST", "/v1/jobs", tc.body)
			if r.status != tc.status {
				t.Fatalf("POST %s = %d %s, want %d", tc.body, r.status, r.body, tc.status)
			}
			p := problemOf(t, r)
			if got := fieldNames(p); !slices.Equal(got, tc.fields) {
				t.Fatalf("problem fields = %q, want %q (%s)", got, tc.fields, r.body)
			}
			if tc.pos >= 0 {
				f := p.Errors[0]
				if f.Position == nil || *f.Position != tc.pos || (tc.token != "" && f.Token != tc.token) {
					t.Errorf("first error = %+v, want position %d token %q", f, tc.pos, tc.token)
				}
			}
			if p.Detail == "" || p.Title == "" || p.Type == "" {
				t.Errorf("problem lacks title/type/detail: %s", r.body)
			}
		})
	}

	r := c.do("POST", "/v1/jobs", "formula=C2H6O", "Content-Type", "text/plain")
	if r.status != http.StatusUnsupportedMediaType {
		t.Errorf("text/plain body = %d, want 415", r.status)
	}
	problemOf(t, r)
}

func TestAnonymousCallbackNeedsSecret(t *testing.T) {
	_, hs := startServer(t, store.NewMemory(), &fakeRanker{}, server.Config{AllowAnonymous: true})
	c := client{t: t, base: hs.URL}
	job := ethanolJob()
	job["callback_url"] = "http://127.0.0.1:1/hook"
	r := c.do("POST", "/v1/jobs", job)
	if got := fieldNames(problemOf(t, r)); r.status != 400 || !slices.Equal(got, []string{"/callback_url"}) {
		t.Errorf("anonymous callback without secret = %d %s, want 400 naming /callback_url", r.status, r.body)
	}
}

func TestAuthAndIsolation(t *testing.T) {
	forEachStore(t, func(t *testing.T, st testStore) {
		ctx := context.Background()
		keyA, _, err := st.CreateAPIKey(ctx, "eln-a")
		if err != nil {
			t.Fatal(err)
		}
		keyB, _, err := st.CreateAPIKey(ctx, "eln-b")
		if err != nil {
			t.Fatal(err)
		}
		keyC, _, err := st.CreateAPIKey(ctx, "eln-c")
		if err != nil {
			t.Fatal(err)
		}
		if _, err := st.RevokeAPIKey(ctx, "eln-c"); err != nil {
			t.Fatal(err)
		}
		_, hs := startServer(t, st, &fakeRanker{}, server.Config{})
		anon := client{t: t, base: hs.URL}
		a := client{t: t, base: hs.URL, key: keyA}
		b := client{t: t, base: hs.URL, key: keyB}

		for name, c := range map[string]client{"no key": anon, "unknown key": {t: t, base: hs.URL, key: "sr_nope"}, "revoked key": {t: t, base: hs.URL, key: keyC}} {
			r := c.do("POST", "/v1/jobs", ethanolJob())
			if r.status != http.StatusUnauthorized {
				t.Errorf("%s: POST /v1/jobs = %d, want 401", name, r.status)
				continue
			}
			if p := problemOf(t, r); p.Code != server.CodeUnauthorized || r.header.Get("WWW-Authenticate") == "" {
				t.Errorf("%s: problem %+v, WWW-Authenticate %q", name, p, r.header.Get("WWW-Authenticate"))
			}
		}
		if r := anon.do("GET", "/v1/jobs", nil, "Authorization", "Basic abc"); r.status != http.StatusUnauthorized {
			t.Errorf("Basic auth = %d, want 401", r.status)
		}
		for _, path := range []string{"/healthz", "/readyz", "/v1/openapi.json"} {
			if r := anon.do("GET", path, nil); r.status != http.StatusOK {
				t.Errorf("GET %s without key = %d, want 200", path, r.status)
			}
		}

		r := a.do("POST", "/v1/jobs", ethanolJob())
		if r.status != http.StatusAccepted {
			t.Fatalf("POST with key A = %d %s", r.status, r.body)
		}
		var j server.JobView
		r.decode(t, &j)
		a.waitJob(j.ID, 10*time.Second)

		for _, req := range []struct{ method, path string }{
			{"GET", "/v1/jobs/" + j.ID},
			{"GET", "/v1/jobs/" + j.ID + "/candidates"},
			{"GET", "/v1/jobs/" + j.ID + "/candidates/1"},
			{"POST", "/v1/jobs/" + j.ID + "/cancel"},
		} {
			if r := b.do(req.method, req.path, nil); r.status != http.StatusNotFound {
				t.Errorf("key B %s %s = %d, want 404", req.method, req.path, r.status)
			}
			if r := a.do(req.method, req.path, nil); r.status >= 300 {
				t.Errorf("key A %s %s = %d %s, want success", req.method, req.path, r.status, r.body)
			}
		}
		var la, lb server.JobList
		a.do("GET", "/v1/jobs", nil).decode(t, &la)
		b.do("GET", "/v1/jobs", nil).decode(t, &lb)
		if len(la.Jobs) != 1 || la.Jobs[0].ID != j.ID || len(lb.Jobs) != 0 {
			t.Errorf("lists: A %+v, B %+v; want A's job only in A's", la, lb)
		}
	})
}

func TestIdempotency(t *testing.T) {
	forEachStore(t, func(t *testing.T, st testStore) {
		_, hs := startServer(t, st, &fakeRanker{}, server.Config{AllowAnonymous: true})
		c := client{t: t, base: hs.URL}
		body := `{"formula":"C2H6O","peaks":"` + ethanolPeaks + `"}`
		r1 := c.do("POST", "/v1/jobs", body, "Idempotency-Key", "nb-7-run-1")
		if r1.status != http.StatusAccepted {
			t.Fatalf("first POST = %d %s", r1.status, r1.body)
		}
		var j1, j2 server.JobView
		r1.decode(t, &j1)
		// Same body, other layout: the same job, answered 200.
		r2 := c.do("POST", "/v1/jobs", "{ \"peaks\": \""+ethanolPeaks+"\",\n \"formula\": \"C2H6O\" }", "Idempotency-Key", "nb-7-run-1")
		r2.decode(t, &j2)
		if r2.status != http.StatusOK || j2.ID != j1.ID || r2.header.Get("Location") == "" {
			t.Errorf("repeat POST = %d id %s, want 200 with id %s and a Location", r2.status, j2.ID, j1.ID)
		}
		r3 := c.do("POST", "/v1/jobs", `{"formula":"C2H6O","peaks":"1.2 (s, 6H)"}`, "Idempotency-Key", "nb-7-run-1")
		if r3.status != http.StatusConflict || problemOf(t, r3).Code != server.CodeConflict {
			t.Errorf("POST with same key, other body = %d %s, want 409", r3.status, r3.body)
		}
		var j4 server.JobView
		r4 := c.do("POST", "/v1/jobs", body, "Idempotency-Key", "nb-7-run-2")
		r4.decode(t, &j4)
		if r4.status != http.StatusAccepted || j4.ID == j1.ID {
			t.Errorf("POST with a new key = %d id %s, want a new job", r4.status, j4.ID)
		}
		if r := c.do("POST", "/v1/jobs", body, "Idempotency-Key", strings.Repeat("k", 256)); r.status != http.StatusBadRequest {
			t.Errorf("overlong Idempotency-Key = %d, want 400", r.status)
		}
	})
}

func TestCancel(t *testing.T) {
	forEachStore(t, func(t *testing.T, st testStore) {
		rk := &fakeRanker{block: true}
		_, hs := startServer(t, st, rk, server.Config{AllowAnonymous: true, Workers: 1})
		c := client{t: t, base: hs.URL}
		var j server.JobView
		c.do("POST", "/v1/jobs", ethanolJob()).decode(t, &j)
		deadline := time.Now().Add(10 * time.Second)
		for {
			var cur server.JobView
			c.do("GET", "/v1/jobs/"+j.ID, nil).decode(t, &cur)
			if cur.Status == store.StatusRunning && cur.Progress.Generated > 0 {
				break
			}
			if time.Now().After(deadline) {
				t.Fatalf("job never ran with progress: %+v", cur)
			}
			time.Sleep(20 * time.Millisecond)
		}
		start := time.Now()
		r := c.do("POST", "/v1/jobs/"+j.ID+"/cancel", nil)
		if r.status != http.StatusAccepted {
			t.Fatalf("cancel = %d %s", r.status, r.body)
		}
		var asked server.JobView
		r.decode(t, &asked)
		if asked.Status == store.StatusRunning && !asked.CancelRequested {
			t.Errorf("cancel answer = %+v, want cancel_requested set while running", asked)
		}
		done := c.waitJob(j.ID, 5*time.Second)
		if took := time.Since(start); done.Status != store.StatusCancelled || took > time.Second {
			t.Errorf("after cancel: status %s after %v, want cancelled within 1s", done.Status, took)
		}
		if r := c.do("GET", "/v1/jobs/"+j.ID+"/candidates", nil); r.status != http.StatusConflict {
			t.Errorf("candidates of a cancelled job = %d, want 409", r.status)
		}
	})
}

// TestCancelKeepsPartialRanking checks that a job cancelled while it ran
// keeps the ranking its ranker hands back with the cancel, marked as
// cancelled: the job stays cancelled, its search stopped early by the
// cancel, and its candidates can be read.
func TestCancelKeepsPartialRanking(t *testing.T) {
	forEachStore(t, func(t *testing.T, st testStore) {
		rk := &fakeRanker{block: true, partial: true}
		_, hs := startServer(t, st, rk, server.Config{AllowAnonymous: true, Workers: 1})
		c := client{t: t, base: hs.URL}
		var j server.JobView
		c.do("POST", "/v1/jobs", ethanolJob()).decode(t, &j)
		require.Eventually(t, func() bool {
			var cur server.JobView
			c.do("GET", "/v1/jobs/"+j.ID, nil).decode(t, &cur)
			return cur.Status == store.StatusRunning && cur.Progress.Generated > 0
		}, 10*time.Second, 20*time.Millisecond, "job never ran with progress")
		r := c.do("POST", "/v1/jobs/"+j.ID+"/cancel", nil)
		require.Equal(t, http.StatusAccepted, r.status, "cancel: %s", r.body)
		done := c.waitJob(j.ID, 5*time.Second)
		require.Equal(t, store.StatusCancelled, done.Status)
		var view server.JobView
		c.do("GET", "/v1/jobs/"+j.ID, nil).decode(t, &view)
		assert.Equal(t, "stopped early", view.SearchStatus, "job view search_status")
		assert.Equal(t, server.StopReasonCancelled, view.SearchStopReason, "job view search_stop_reason")
		require.NotNil(t, view.Error)
		assert.Equal(t, server.CancelledKeptMessage, *view.Error)
		assert.Equal(t, "C2H6O", view.Formula, "job view formula")

		r = c.do("GET", "/v1/jobs/"+j.ID+"/candidates", nil)
		require.Equal(t, http.StatusOK, r.status, "candidates of a cancelled job with a kept ranking: %s", r.body)
		var list struct {
			Total    int  `json:"total"`
			Complete bool `json:"complete"`
			Search   struct {
				Status     string `json:"status"`
				StopReason string `json:"stop_reason"`
			} `json:"search"`
			Warnings []string `json:"warnings"`
		}
		r.decode(t, &list)
		assert.Equal(t, 3, list.Total, "candidates kept")
		assert.False(t, list.Complete)
		assert.Equal(t, "stopped early", list.Search.Status)
		assert.Equal(t, server.StopReasonCancelled, list.Search.StopReason)
		require.NotEmpty(t, list.Warnings)
		assert.Contains(t, list.Warnings[len(list.Warnings)-1], "cancelled on request")
	})
}

// TestForgivingFormula checks that the service reads the formula forms
// molecule.NormalizeFormula accepts (lower case, spaces, subscript digits)
// and hands the ranker the Hill formula, and refuses an ambiguous lower
// case at /formula.
func TestForgivingFormula(t *testing.T) {
	for _, tc := range []struct {
		name, formula string
		ok            bool
	}{
		{"lower case", "c2h6o", true},
		{"spaces", "C2 H6 O", true},
		{"subscript digits", "C₂H₆O", true},
		{"Hill order from any order", "H6OC2", true},
		{"ambiguous lower case", "c2h4co", false},
	} {
		t.Run(tc.name, func(t *testing.T) {
			rk := &fakeRanker{}
			_, hs := startServer(t, store.NewMemory(), rk, server.Config{AllowAnonymous: true, Workers: 1})
			c := client{t: t, base: hs.URL}
			job := ethanolJob()
			job["formula"] = tc.formula
			r := c.do("POST", "/v1/jobs", job)
			if !tc.ok {
				require.Equal(t, http.StatusBadRequest, r.status, "POST formula %q: %s", tc.formula, r.body)
				assert.Contains(t, string(r.body), "/formula")
				assert.Contains(t, string(r.body), "ambiguous")
				return
			}
			require.Equal(t, http.StatusAccepted, r.status, "POST formula %q: %s", tc.formula, r.body)
			var j server.JobView
			r.decode(t, &j)
			c.waitJob(j.ID, 5*time.Second)
			rk.mu.Lock()
			defer rk.mu.Unlock()
			require.NotEmpty(t, rk.reqs)
			assert.Equal(t, "C2H6O", rk.reqs[len(rk.reqs)-1].Formula, "formula handed to the ranker for %q", tc.formula)
		})
	}
}

func TestCancelQueued(t *testing.T) {
	secret := []byte("anonymous-callback-secret")
	got := make(chan server.CallbackPayload, 1)
	recv := httptest.NewServer(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
		body, _ := io.ReadAll(r.Body)
		if !signedBy(secret, r, body) {
			http.Error(w, "bad signature", http.StatusUnauthorized)
			return
		}
		var p server.CallbackPayload
		_ = json.Unmarshal(body, &p)
		got <- p
	}))
	defer recv.Close()
	_, hs := startServer(t, store.NewMemory(), &fakeRanker{}, server.Config{AllowAnonymous: true, AnonymousSecret: secret, Workers: -1})
	c := client{t: t, base: hs.URL}
	var j, after server.JobView
	job := ethanolJob()
	job["callback_url"] = recv.URL
	c.do("POST", "/v1/jobs", job).decode(t, &j)
	r := c.do("POST", "/v1/jobs/"+j.ID+"/cancel", nil)
	r.decode(t, &after)
	if r.status != http.StatusAccepted || after.Status != store.StatusCancelled {
		t.Errorf("cancel queued job = %d %s, want 202 cancelled", r.status, r.body)
	}
	select {
	case p := <-got:
		if p.Job.ID != j.ID || p.Job.Status != store.StatusCancelled {
			t.Errorf("callback payload = %+v, want the cancelled job", p)
		}
	case <-time.After(5 * time.Second):
		t.Error("no callback for a job cancelled while queued")
	}
}

func TestCallbackSigned(t *testing.T) {
	forEachStore(t, func(t *testing.T, st testStore) {
		key, k, err := st.CreateAPIKey(context.Background(), "eln-callbacks")
		if err != nil {
			t.Fatal(err)
		}
		var (
			mu       sync.Mutex
			received []server.CallbackPayload
			badSig   int
		)
		got := make(chan struct{}, 1)
		recv := httptest.NewServer(http.HandlerFunc(func(w http.ResponseWriter, r *http.Request) {
			body, _ := io.ReadAll(r.Body)
			mu.Lock()
			defer mu.Unlock()
			if !signedBy(k.Secret, r, body) {
				badSig++
				http.Error(w, "bad signature", http.StatusUnauthorized)
				return
			}
			var p server.CallbackPayload
			_ = json.Unmarshal(body, &p)
			received = append(received, p)
			if len(received) == 1 {
				// Refuse the first delivery so that the retry path runs.
				http.Error(w, "try later", http.StatusServiceUnavailable)
				return
			}
			w.WriteHeader(http.StatusNoContent)
			got <- struct{}{}
		}))
		defer recv.Close()

		_, hs := startServer(t, st, &fakeRanker{}, server.Config{})
		c := client{t: t, base: hs.URL, key: key}
		job := ethanolJob()
		job["callback_url"] = recv.URL + "/shiftrank-hook?sample=NB-0042-a"
		var j server.JobView
		if r := c.do("POST", "/v1/jobs", job); r.status != http.StatusAccepted {
			t.Fatalf("POST = %d %s", r.status, r.body)
		} else {
			r.decode(t, &j)
		}
		select {
		case <-got:
		case <-time.After(10 * time.Second):
			t.Fatal("no callback within 10 s")
		}
		mu.Lock()
		defer mu.Unlock()
		if badSig != 0 || len(received) != 2 {
			t.Fatalf("received %d callbacks, %d with a bad signature; want 2 good ones", len(received), badSig)
		}
		p := received[1]
		if p.Event != "job.finished" || p.Attempt != 2 || p.Job.ID != j.ID || p.Job.Status != store.StatusSucceeded || p.Job.Reference != "NB-0042-a" {
			t.Errorf("payload = %+v, want job.finished attempt 2 for succeeded job %s", p, j.ID)
		}
		var ds []store.Delivery
		for deadline := time.Now().Add(2 * time.Second); time.Now().Before(deadline); time.Sleep(20 * time.Millisecond) {
			if ds, err = st.Deliveries(context.Background(), j.ID); err == nil && len(ds) == 2 {
				break
			}
		}
		if len(ds) != 2 || ds[0].StatusCode != 503 || ds[1].StatusCode != 204 || ds[1].Attempt != 2 {
			t.Errorf("deliveries = %+v, want attempts 1 (503) and 2 (204)", ds)
		}
	})
}

func TestSignature(t *testing.T) {
	// The MAC is HMAC-SHA256 (RFC 2104; the standard library's, checked here
	// against RFC 4231 test case 2) of the timestamp, a full stop and the
	// body.
	mac := hmac.New(sha256.New, []byte("Jefe"))
	mac.Write([]byte("what do ya want for nothing?"))
	if want := "5bdcc146bf60754e6a042426089575c75a003f089d2739839dec58b964ec3843"; hex.EncodeToString(mac.Sum(nil)) != want {
		t.Fatalf("HMAC-SHA256 differs from RFC 4231 test case 2")
	}
	mac = hmac.New(sha256.New, []byte("Jefe"))
	mac.Write([]byte("1764616166.what do ya want for nothing?"))
	if got, want := server.Sign([]byte("Jefe"), "1764616166", []byte("what do ya want for nothing?")), "sha256="+hex.EncodeToString(mac.Sum(nil)); got != want {
		t.Errorf("Sign = %s, want HMAC-SHA256 of timestamp, '.', body: %s", got, want)
	}

	secret := []byte("callback-secret-of-eln-lab-7")
	now := time.Date(2026, 12, 1, 19, 9, 26, 0, time.UTC)
	ts := strconv.FormatInt(now.Unix(), 10)
	body := []byte(`{"event":"job.finished"}`)
	sig := server.Sign(secret, ts, body)
	for _, tc := range []struct {
		name    string
		body    []byte
		ts, sig string
		at      time.Time
		maxAge  time.Duration
		want    error
	}{
		{"as sent", body, ts, sig, now, 0, nil},
		{"four minutes later", body, ts, sig, now.Add(4 * time.Minute), 0, nil},
		{"replayed an hour later", body, ts, sig, now.Add(time.Hour), 0, server.ErrStale},
		{"from the future", body, ts, sig, now.Add(-10 * time.Minute), 0, server.ErrStale},
		{"replayed within a short window", body, ts, sig, now.Add(2 * time.Minute), time.Minute, server.ErrStale},
		{"other body", []byte(`{"event":"job.finished "}`), ts, sig, now, 0, server.ErrBadSignature},
		{"other timestamp", body, strconv.FormatInt(now.Unix()+1, 10), sig, now, 0, server.ErrBadSignature},
		{"no timestamp", body, "", sig, now, 0, server.ErrStale},
		{"other secret", body, ts, server.Sign([]byte("another"), ts, body), now, 0, server.ErrBadSignature},
	} {
		if err := server.VerifySignature(secret, tc.body, tc.ts, tc.sig, tc.at, tc.maxAge); err != tc.want {
			t.Errorf("%s: VerifySignature = %v, want %v", tc.name, err, tc.want)
		}
	}
}

func TestListJobsPages(t *testing.T) {
	forEachStore(t, func(t *testing.T, st testStore) {
		_, hs := startServer(t, st, &fakeRanker{}, server.Config{AllowAnonymous: true, Workers: -1})
		c := client{t: t, base: hs.URL}
		var ids []string
		for i := range 5 {
			job := ethanolJob()
			job["reference"] = fmt.Sprintf("S-%d", i)
			var j server.JobView
			c.do("POST", "/v1/jobs", job).decode(t, &j)
			ids = append(ids, j.ID)
		}
		var seen []string
		cursor := ""
		for page := 0; page < 5; page++ {
			var l server.JobList
			r := c.do("GET", "/v1/jobs?limit=2&cursor="+cursor, nil)
			if r.status != http.StatusOK {
				t.Fatalf("list = %d %s", r.status, r.body)
			}
			r.decode(t, &l)
			for _, j := range l.Jobs {
				seen = append(seen, j.ID)
			}
			if l.NextCursor == "" {
				break
			}
			cursor = l.NextCursor
		}
		slices.Reverse(ids)
		if !slices.Equal(seen, ids) {
			t.Errorf("paged list = %v, want newest first %v", seen, ids)
		}
		for _, q := range []string{"limit=0", "limit=101", "limit=x", "cursor=%21%21bad"} {
			if r := c.do("GET", "/v1/jobs?"+q, nil); r.status != http.StatusBadRequest {
				t.Errorf("GET /v1/jobs?%s = %d, want 400", q, r.status)
			}
		}
	})
}

func TestRoutingAndProblems(t *testing.T) {
	_, hs := startServer(t, store.NewMemory(), &fakeRanker{}, server.Config{AllowAnonymous: true})
	c := client{t: t, base: hs.URL}
	tests := []struct {
		method, path string
		status       int
	}{
		// chi treats ':' as an ordinary character: the literal route matches
		// and its neighbours do not.
		{"POST", "/v1/isomers:count", http.StatusUnsupportedMediaType}, // reaches the handler, which wants a JSON body
		{"GET", "/v1/isomers:count", http.StatusMethodNotAllowed},
		{"POST", "/v1/isomers", http.StatusNotFound},
		{"POST", "/v1/isomers:counts", http.StatusNotFound},
		{"POST", "/v1/isomers%3Acount", http.StatusNotFound}, // the colon must be sent as is
		{"GET", "/v1/nothing", http.StatusNotFound},
		{"DELETE", "/v1/jobs", http.StatusMethodNotAllowed},
	}
	for _, tc := range tests {
		r := c.do(tc.method, tc.path, nil)
		if r.status != tc.status {
			t.Errorf("%s %s = %d %s, want %d", tc.method, tc.path, r.status, r.body, tc.status)
			continue
		}
		problemOf(t, r)
	}
	r := c.do("POST", "/v1/isomers:count", `{"formula":"C2H6O","fliter":"none"}`)
	if got := fieldNames(problemOf(t, r)); r.status != 400 || !slices.Equal(got, []string{"/fliter"}) {
		t.Errorf("count with unknown member = %d %s", r.status, r.body)
	}
	r = c.do("POST", "/v1/predict", `{"smiles":""}`)
	if got := fieldNames(problemOf(t, r)); r.status != 400 || !slices.Equal(got, []string{"/smiles"}) {
		t.Errorf("predict without smiles = %d %s", r.status, r.body)
	}
	if r := c.do("GET", "/", nil); r.status != http.StatusOK {
		t.Errorf("GET / = %d, want the page", r.status)
	}
}

// panicStore panics on GetJob, to show the recover middleware at work.
type panicStore struct{ *store.Memory }

func (panicStore) GetJob(context.Context, string, string) (store.Job, error) { panic("boom") }

type downStore struct{ *store.Memory }

func (downStore) Ping(context.Context) error { return fmt.Errorf("connection refused") }

func TestPanicAndReadiness(t *testing.T) {
	_, hs := startServer(t, panicStore{store.NewMemory()}, &fakeRanker{}, server.Config{AllowAnonymous: true, Workers: -1})
	c := client{t: t, base: hs.URL}
	r := c.do("GET", "/v1/jobs/"+strings.Repeat("a", 26), nil)
	if p := problemOf(t, r); r.status != 500 || p.Code != server.CodeInternal || strings.Contains(string(r.body), "boom") {
		t.Errorf("panicking handler = %d %s, want a 500 problem that does not leak the panic", r.status, r.body)
	}
	_, hs = startServer(t, downStore{store.NewMemory()}, &fakeRanker{}, server.Config{AllowAnonymous: true, Workers: -1})
	c = client{t: t, base: hs.URL}
	if r := c.do("GET", "/readyz", nil); r.status != http.StatusServiceUnavailable {
		t.Errorf("readyz with the store down = %d, want 503", r.status)
	}
	if r := c.do("GET", "/healthz", nil); r.status != http.StatusOK {
		t.Errorf("healthz with the store down = %d, want 200", r.status)
	}
}

// panicRanker panics inside Rank.
type panicRanker struct{}

func (panicRanker) Rank(context.Context, rankerRequest, func(rankerProgress)) (*rankerResult, error) {
	panic("ranker bug")
}

func TestRankerPanicFailsJob(t *testing.T) {
	_, hs := startServer(t, store.NewMemory(), panicRanker{}, server.Config{AllowAnonymous: true})
	c := client{t: t, base: hs.URL}
	var j server.JobView
	c.do("POST", "/v1/jobs", ethanolJob()).decode(t, &j)
	done := c.waitJob(j.ID, 5*time.Second)
	if done.Status != store.StatusFailed || done.Error == nil || strings.Contains(*done.Error, "ranker bug") {
		t.Errorf("job with a panicking ranker = %+v, want failed with a safe message", done)
	}
}

func TestShutdownHandsBackRunningJobs(t *testing.T) {
	st := store.NewMemory()
	srv := server.New(quietLogger(t), st, &fakeRanker{block: true}, fastConfig(server.Config{AllowAnonymous: true, Workers: 1}))
	srv.Start()
	hs := httptest.NewServer(srv)
	defer hs.Close()
	c := client{t: t, base: hs.URL}
	var j server.JobView
	c.do("POST", "/v1/jobs", ethanolJob()).decode(t, &j)
	for deadline := time.Now().Add(5 * time.Second); ; time.Sleep(10 * time.Millisecond) {
		c.do("GET", "/v1/jobs/"+j.ID, nil).decode(t, &j)
		if j.Status == store.StatusRunning {
			break
		}
		if time.Now().After(deadline) {
			t.Fatal("job never started")
		}
	}
	ctx, cancel := context.WithTimeout(context.Background(), 200*time.Millisecond)
	defer cancel()
	start := time.Now()
	if err := srv.Shutdown(ctx); err != nil {
		t.Fatal(err)
	}
	if took := time.Since(start); took > 2*time.Second {
		t.Errorf("Shutdown took %v with a 200ms grace", took)
	}
	c.do("GET", "/v1/jobs/"+j.ID, nil).decode(t, &j)
	if j.Status != store.StatusQueued {
		t.Errorf("after shutdown the running job is %s, want queued (handed back)", j.Status)
	}
	if r := c.do("GET", "/readyz", nil); r.status != http.StatusServiceUnavailable {
		t.Errorf("readyz after Shutdown = %d, want 503 (drain)", r.status)
	}
}
