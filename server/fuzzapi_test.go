package server_test

import (
	"bytes"
	"encoding/json"
	"net/http"
	"net/http/httptest"
	"net/url"
	"os"
	"testing"

	"shiftrank/server"
	"shiftrank/store"
	"shiftrank/store/pgtest"
)

// fuzzRequests are the requests FuzzAPIRequests sends, the fuzzed bytes
// going into the body, the job ID, the cursor or the Idempotency-Key.
var fuzzRequests = []func(data []byte) *http.Request{
	func(data []byte) *http.Request { return jsonPost("/v1/jobs", data) },
	func(data []byte) *http.Request { return jsonPost("/v1/predict", data) },
	func(data []byte) *http.Request { return jsonPost("/v1/isomers:count", data) },
	func(data []byte) *http.Request {
		r := httptest.NewRequest("GET", "/", nil)
		r.URL.Path = "/v1/jobs/" + string(data)
		return r
	},
	func(data []byte) *http.Request {
		return httptest.NewRequest("GET", "/v1/jobs?cursor="+url.QueryEscape(string(data)), nil)
	},
	func(data []byte) *http.Request {
		r := jsonPost("/v1/jobs", []byte(`{"formula":"C2H6O","peaks":"1.2 (s, 6H)"}`))
		r.Header["Idempotency-Key"] = []string{string(data)}
		return r
	},
}

func jsonPost(path string, body []byte) *http.Request {
	r := httptest.NewRequest("POST", path, bytes.NewReader(body))
	r.Header.Set("Content-Type", "application/json")
	return r
}

// FuzzAPIRequests sends arbitrary bodies, job IDs, cursors and idempotency
// keys to the API on the in-memory store and, when TEST_DATABASE_URL is set
// (always in CI), on PostgreSQL too: no input may cause a 5xx, every
// refusal is a problem document, and both stores answer every request with
// the same status.
func FuzzAPIRequests(f *testing.F) {
	seeds := []struct {
		which int
		data  string
	}{
		{0, `{"formula":"C2H6O","peaks":"3.69 (q, 2H), 1.22 (t, 3H), 2.6 (br s, 1H)"}`},
		{0, `{"formula":"C2H6O","peaks":[{"shift":1.2,"multiplicity":"t","j":[7]}],"options":{"require":["CO"]}}`},
		{0, `{"formula":"C2H6O","peaks":"1.2 (s, 6H)","reference":"NB\u0000-7"}`},
		{0, `{"formula":"C2H6O","peaks":"1.2 (s, 6H) \ud800","solvent":"CDCl3"}`},
		{0, `{"formula":"C2H6O","peaks":[{"shift":1.2,"label":"\udc00"}]}`},
		{0, "{\"formula\":\"C2H6O\",\"peaks\":\"1.2 (s, 6H)\",\"reference\":\"\xff\"}"},
		{0, `{"FORMULA":"C2H6O","formula":"C2H6O","formula":"C3H8O","peaks":"1.2 (s)"}`},
		{0, `{"formula":"N40","peaks":"1.2 (s)"}`},
		{0, `{"formula":"CH4O","peaks":"1.1 (s), 1.2 (s), 1.3 (s), 1.4 (s), 1.5 (s)"}`},
		{0, `{"formula":"C2H6O","peaks":"1.2 (s)","options":{"top_k":1e30,"require":["[C@@@@H]"]}}`},
		{0, `{"formula":"C2H6O","peaks":"1.2 (s)","callback_url":"http://[::ffff:169.254.169.254]:99999/"}`},
		{1, `{"smiles":"CCOC(C)=O"}`},
		{1, `{"smiles":"c1ccccc1O","mhz":600}`},
		{1, `{"smiles":"C\u0000C"}`},
		{2, `{"formula":"C5H12","filter":"none"}`},
		{2, `{"formula":"C4H8O","filter":"plausible,-no-enol","limit":50}`},
		{3, "\x00"},
		{3, "aaaaaaaaaaaaaaaaaaaaaaaaaa"},
		{3, "abc/candidates/1"},
		{4, "MTIzNC4A"},
		{4, "MTIzNC5hYWFhYWFhYWFhYWFhYWFhYWFhYWFhYWFhYQ"},
		{5, "nb-7\x00"},
		{5, "nb-7-run-1"},
	}
	for _, s := range seeds {
		f.Add(uint8(s.which), []byte(s.data))
	}
	cfg := server.Config{AllowAnonymous: true, Workers: -1, MaxHeavyAtoms: 8, MaxCountLimit: 2000, MaxBodyBytes: 1 << 14,
		MaxQueuedPerKey: -1, Resolver: callbackHosts()}
	type target struct {
		name string
		srv  *server.Server
	}
	targets := []target{{"memory", server.New(quietLogger(f), store.NewMemory(), &fakeRanker{}, cfg)}}
	if os.Getenv(pgtest.EnvURL) != "" || os.Getenv("CI") == "true" {
		base, schema := pgtest.Schema(f)
		pg, err := store.OpenSchema(f.Context(), base, schema)
		if err != nil {
			f.Fatalf("open PostgreSQL store: %v", err)
		}
		f.Cleanup(pg.Close)
		targets = append(targets, target{"postgres", server.New(quietLogger(f), pg, &fakeRanker{}, cfg)})
	} else {
		f.Logf("%s not set: fuzzing the in-memory store only", pgtest.EnvURL)
	}
	f.Fuzz(func(t *testing.T, which uint8, data []byte) {
		mk := fuzzRequests[int(which)%len(fuzzRequests)]
		var statuses []int
		for _, tg := range targets {
			req := mk(data)
			rec := httptest.NewRecorder()
			tg.srv.ServeHTTP(rec, req)
			switch {
			case rec.Code >= 500:
				t.Fatalf("%s: %s %s %q = %d %s", tg.name, req.Method, req.URL, data, rec.Code, rec.Body.Bytes())
			case rec.Code >= 400:
				var p server.Problem
				if rec.Header().Get("Content-Type") != "application/problem+json" || json.Unmarshal(rec.Body.Bytes(), &p) != nil || p.Status != rec.Code {
					t.Fatalf("%s: %s %s %q = %d with a body that is not a problem: %s", tg.name, req.Method, req.URL, data, rec.Code, rec.Body.Bytes())
				}
			case rec.Code != http.StatusOK && rec.Code != http.StatusAccepted:
				t.Fatalf("%s: %s %s %q = %d", tg.name, req.Method, req.URL, data, rec.Code)
			}
			statuses = append(statuses, rec.Code)
		}
		for i := 1; i < len(statuses); i++ {
			if statuses[i] != statuses[0] {
				t.Fatalf("request %d %q: %s answers %d, %s %d", which, data, targets[0].name, statuses[0], targets[i].name, statuses[i])
			}
		}
	})
}
