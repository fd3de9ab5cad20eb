package server_test

import (
	"io"
	"net/http"
	"strings"
	"testing"
	"time"

	"shiftrank/server"
	"shiftrank/store"
)

func TestCountIsomers(t *testing.T) {
	_, hs := startServer(t, store.NewMemory(), &fakeRanker{}, server.Config{AllowAnonymous: true, Workers: -1, MaxCountLimit: 1000})
	c := client{t: t, base: hs.URL}
	tests := []struct {
		body     string
		count    int64
		complete bool
		source   string
	}{
		{`{"formula":"C7H16","filter":"none"}`, 9, true, "OEIS A000602 (alkanes, n = 7)"},
		{`{"formula":"C10H22","filter":"none"}`, 75, true, "OEIS A000602 (alkanes, n = 10)"},
		{`{"formula":"C4H10O","filter":"none"}`, 7, true, "four butanols and three ethers (common practice)"},
		{`{"formula":"C10H22","filter":"none","limit":10}`, 10, false, "the limit stops the count"},
	}
	for _, tc := range tests {
		r := c.do("POST", "/v1/isomers:count", tc.body)
		if r.status != http.StatusOK {
			t.Errorf("count %s = %d %s", tc.body, r.status, r.body)
			continue
		}
		var got server.CountResponse
		r.decode(t, &got)
		if got.Count != tc.count || got.Complete != tc.complete {
			t.Errorf("count %s = %d (complete %v), want %d (complete %v); source: %s", tc.body, got.Count, got.Complete, tc.count, tc.complete, tc.source)
		}
	}
	for _, tc := range []struct{ body, field string }{
		{`{"formula":"C7H16","limit":5000}`, "/limit"},
		{`{"formula":"C7H16","filter":"nonsense"}`, "/filter"},
		{`{"formula":"C7Q"}`, "/formula"},
		{`{}`, "/formula"},
	} {
		r := c.do("POST", "/v1/isomers:count", tc.body)
		p := problemOf(t, r)
		if r.status != http.StatusBadRequest || len(p.Errors) == 0 || p.Errors[0].Field != tc.field {
			t.Errorf("count %s = %d %s, want 400 naming %s", tc.body, r.status, r.body, tc.field)
		}
	}
}

func TestPredict(t *testing.T) {
	_, hs := startServer(t, store.NewMemory(), &fakeRanker{}, server.Config{AllowAnonymous: true, Workers: -1})
	c := client{t: t, base: hs.URL}
	r := c.do("POST", "/v1/predict", `{"smiles":"CCO","mhz":400}`)
	if r.status != http.StatusOK {
		t.Fatalf("predict CCO = %d %s", r.status, r.body)
	}
	var out server.PredictOutput
	r.decode(t, &out)
	// Ethanol: CH3 triplet and CH2 quartet by the n+1 rule, an exchangeable
	// OH (common practice); 6 H in all.
	h := 0
	byAtom := map[int]server.EnvironmentJSON{}
	for _, e := range out.Environments {
		h += e.H
		for _, a := range e.Atoms {
			byAtom[a] = e
		}
	}
	if out.SMILES != "CCO" || out.Formula != "C2H6O" || out.CanonicalSMILES == "" || !strings.Contains(out.Caution, "authentic sample") {
		t.Errorf("predict CCO header = %+v", out)
	}
	if len(out.Environments) != 3 || h != 6 {
		t.Fatalf("predict CCO = %d environments with %d H: %s", len(out.Environments), h, r.body)
	}
	if e := byAtom[0]; e.H != 3 || e.Multiplicity != "t" {
		t.Errorf("CH3 = %+v, want 3H t (n+1 rule)", e)
	}
	if e := byAtom[1]; e.H != 2 || e.Multiplicity != "q" {
		t.Errorf("CH2 = %+v, want 2H q (n+1 rule)", e)
	}
	if e := byAtom[2]; e.H != 1 || !e.Exchangeable {
		t.Errorf("OH = %+v, want 1H exchangeable", e)
	}
	for _, tc := range []struct{ body, field string }{
		{`{"smiles":"C1CC"}`, "/smiles"},
		{`{"smiles":"CC.O"}`, "/smiles"},
		{`{"smiles":"CCO","mhz":3}`, "/mhz"},
		{`{"smiles":"CCO","solvent":"CDCl3"}`, "/solvent"},
	} {
		r := c.do("POST", "/v1/predict", tc.body)
		p := problemOf(t, r)
		if r.status != http.StatusBadRequest || len(p.Errors) == 0 || p.Errors[0].Field != tc.field {
			t.Errorf("predict %s = %d %s, want 400 naming %s", tc.body, r.status, r.body, tc.field)
		}
	}
}

// TestSyncRequestsBounded: with MaxSyncRequests 1, a second synchronous
// request while one runs gets 503 with Retry-After; after it, one is served.
func TestSyncRequestsBounded(t *testing.T) {
	_, hs := startServer(t, store.NewMemory(), &fakeRanker{}, server.Config{AllowAnonymous: true, Workers: -1, MaxSyncRequests: 1, MaxSyncPerKey: -1})
	// The first request holds its slot while the server waits for its body.
	pr, pw := io.Pipe()
	first := make(chan int, 1)
	go func() {
		resp, err := http.Post(hs.URL+"/v1/isomers:count", "application/json", pr)
		if err != nil {
			first <- 0
			return
		}
		resp.Body.Close()
		first <- resp.StatusCode
	}()
	c := client{t: t, base: hs.URL}
	var busy reply
	for deadline := time.Now().Add(5 * time.Second); ; time.Sleep(10 * time.Millisecond) {
		busy = c.do("POST", "/v1/predict", map[string]any{"smiles": "CCO"})
		if busy.status == http.StatusServiceUnavailable {
			break
		}
		if time.Now().After(deadline) {
			t.Fatalf("second synchronous request = %d %s, want 503 while the first runs", busy.status, busy.body)
		}
	}
	if busy.header.Get("Retry-After") == "" {
		t.Error("503 without Retry-After")
	}
	problemOf(t, busy)
	_, _ = pw.Write([]byte(`{"formula":"C4H10"}`))
	pw.Close()
	if code := <-first; code != http.StatusOK {
		t.Errorf("first request = %d, want 200", code)
	}
	if r := c.do("POST", "/v1/predict", map[string]any{"smiles": "CCO"}); r.status != http.StatusOK {
		t.Errorf("request after the first ended = %d %s, want 200", r.status, r.body)
	}
}
