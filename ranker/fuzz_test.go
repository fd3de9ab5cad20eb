package ranker

import (
	"errors"
	"testing"

	"shiftrank/spectrum"
)

// FuzzParseReferenceSet checks that reading an accuracy-set file never
// panics, and that every error is a *RequestError.
func FuzzParseReferenceSet(f *testing.F) {
	f.Add([]byte(`{"compounds":[{"name":"ethyl acetate","formula":"C4H8O2","smiles":"CCOC(C)=O","peaks":"4.12 (q, 2H)","source":"x"}]}`))
	f.Add([]byte(`{"compounds":[]}`))
	f.Add([]byte(`{"compounds":[{"name":1}]}`))
	f.Add([]byte(`{"compounds":[{}]} x`))
	f.Add([]byte(`[`))
	f.Fuzz(func(t *testing.T, b []byte) {
		set, err := ParseReferenceSet(b)
		if err != nil {
			var re *RequestError
			if !errors.As(err, &re) {
				t.Fatalf("error %v is %T, want *RequestError", err, err)
			}
			return
		}
		if len(set.Compounds) == 0 {
			t.Fatal("accepted a set without compounds")
		}
	})
}

// FuzzPrepare feeds arbitrary formula, filter, fragment and peak text to
// the request validation: it must return a job or a *RequestError, never
// panic.
func FuzzPrepare(f *testing.F) {
	f.Add("C4H8O2", "plausible", "C(=O)O", "CC", "4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H)", 400.0, "CDCl3")
	f.Add("C8H10", "none", "c1ccccc1", "", "7.26 (s, 1H), 7.05 (s, 4H)", 0.0, "")
	f.Add("CH4O", "plausible,-x", "[OH", "%99", "3.49 (s, 3H)", -5.0, "DMSO")
	f.Add("Xy", "", "", "", "", 1e9, "D2O")
	r := New(Options{Workers: 1})
	f.Fuzz(func(t *testing.T, formula, filter, require, forbid, peaks string, mhz float64, solvent string) {
		pl, err := spectrum.ReadList([]byte(peaks), spectrum.H1)
		if err != nil {
			return
		}
		req := Request{Formula: formula, Peaks: pl, Filter: filter, MHz: mhz, Solvent: solvent}
		if require != "" {
			req.Require = []string{require}
		}
		if forbid != "" {
			req.Forbid = []string{forbid}
		}
		j, err := r.prepare(req)
		if err != nil {
			var re *RequestError
			if !errors.As(err, &re) {
				t.Fatalf("prepare error %v is %T, want *RequestError", err, err)
			}
			return
		}
		if len(j.obs) == 0 || len(j.obs) != len(j.scored) {
			t.Fatalf("prepared %d scored peaks for %d indices", len(j.obs), len(j.scored))
		}
	})
}
