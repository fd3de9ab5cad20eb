package server_test

import (
	"bytes"
	"encoding/json"
	"net/http"
	"net/http/httptest"
	"testing"

	"shiftrank/server"
	"shiftrank/store"
)

// FuzzAPIRequests posts arbitrary bodies to the endpoints that decode
// JSON: no input may cause a 5xx, and every refusal is a problem document.
func FuzzAPIRequests(f *testing.F) {
	seeds := []struct {
		path string
		body string
	}{
		{"/v1/jobs", `{"formula":"C2H6O","peaks":"3.69 (q, 2H), 1.22 (t, 3H), 2.6 (br s, 1H)"}`},
		{"/v1/jobs", `{"formula":"C2H6O","peaks":[{"shift":1.2,"multiplicity":"t","j":[7]}],"options":{"require":["CO"]}}`},
		{"/v1/predict", `{"smiles":"CCOC(C)=O"}`},
		{"/v1/predict", `{"smiles":"c1ccccc1O","mhz":600}`},
		{"/v1/isomers:count", `{"formula":"C5H12","filter":"none"}`},
		{"/v1/isomers:count", `{"formula":"C4H8O","filter":"plausible,-no-enol","limit":50}`},
	}
	for i, s := range seeds {
		f.Add(uint8(i%3), []byte(s.body))
	}
	paths := []string{"/v1/jobs", "/v1/predict", "/v1/isomers:count"}
	st := store.NewMemory()
	srv := server.New(quietLogger(f), st, &fakeRanker{}, server.Config{
		AllowAnonymous: true, Workers: -1, MaxHeavyAtoms: 8, MaxCountLimit: 2000, MaxBodyBytes: 1 << 14,
	})
	f.Fuzz(func(t *testing.T, which uint8, body []byte) {
		path := paths[int(which)%len(paths)]
		req := httptest.NewRequest("POST", path, bytes.NewReader(body))
		req.Header.Set("Content-Type", "application/json")
		rec := httptest.NewRecorder()
		srv.ServeHTTP(rec, req)
		switch {
		case rec.Code >= 500:
			t.Fatalf("POST %s %q = %d %s", path, body, rec.Code, rec.Body.Bytes())
		case rec.Code >= 400:
			var p server.Problem
			if rec.Header().Get("Content-Type") != "application/problem+json" || json.Unmarshal(rec.Body.Bytes(), &p) != nil || p.Status != rec.Code {
				t.Fatalf("POST %s %q = %d with a body that is not a problem: %s", path, body, rec.Code, rec.Body.Bytes())
			}
		case rec.Code != http.StatusOK && rec.Code != http.StatusAccepted:
			t.Fatalf("POST %s %q = %d", path, body, rec.Code)
		}
	})
}
