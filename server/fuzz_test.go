package server

import (
	"bytes"
	"encoding/json"
	"errors"
	"testing"
	"time"
)

func FuzzDecodeJobRequest(f *testing.F) {
	seeds := []string{
		`{"formula":"C2H6O","peaks":"3.69 (q, 2H), 1.22 (t, 3H), 2.6 (br s, 1H)"}`,
		`{"formula":"C4H8O2","peaks":"4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H)","mhz":400,"solvent":"CDCl3","options":{"top_k":10,"filter":"plausible","require":["C=O"],"forbid":["OO"]},"reference":"NB-7","callback_url":"https://eln.example.org/hook"}`,
		`{"formula":"C2H6O","peaks":[{"shift":1.2,"multiplicity":"t","j":[7],"integral":3},{"range":[3.8,3.6],"multiplicity":"m"}]}`,
		`{"formula":"Xy","peaks":12}`,
		`{"formula":"C2H6O","peaks":"1.2 (s)"} trailing`,
		`{"formula":"C2H6O","peaks":"1.2 (s)","options":{"top_k":"x"}}`,
		`{"formula":"C2H6O","peaks":"1.2 (s)","unknown":1}`,
		`{"formula":"C2H6O","peaks":"1H NMR (CDCl3) δ 3.72 (q, 2H), 1.24 (t, 3H); 13C NMR δ 58.3 (CH2), 18.4 (CH3)"}`,
		`{"formula":"C2H6O","peaks":"##TITLE= x
##JCAMP-DX= 5.01
##.OBSERVE NUCLEUS= ^1H
##XUNITS= PPM
##PEAK TABLE= (XYM..XYM)
3.72,20,q 1.24,30,t
##END=
"}`,
		`[]`, `null`, ``, `{`,
	}
	for _, s := range seeds {
		f.Add([]byte(s))
	}
	lim := limits{maxHeavyAtoms: 12, maxCandidates: 1000, timeBudget: time.Second}
	f.Fuzz(func(t *testing.T, data []byte) {
		jr, _, err := decodeJobRequest(data, lim)
		if err != nil {
			var ae *Error
			if !errors.As(err, &ae) || ae.Code != CodeInvalid || len(ae.Fields) == 0 {
				t.Fatalf("decodeJobRequest(%q) error %v is not an invalid-request error naming a field", data, err)
			}
			for _, fe := range ae.Fields {
				if fe.Field != "" && fe.Field[0] != '/' {
					t.Fatalf("field %q is not a JSON Pointer", fe.Field)
				}
			}
			return
		}
		// A valid request's canonical form decodes to the same canonical form.
		canon, hash, err := jr.canonical()
		if err != nil {
			t.Fatalf("canonical(%q): %v", data, err)
		}
		jr2, _, err := decodeJobRequest(canon, lim)
		if err != nil {
			t.Fatalf("canonical form %s of a valid request is rejected: %v", canon, err)
		}
		canon2, hash2, err := jr2.canonical()
		if err != nil || !bytes.Equal(canon, canon2) || hash != hash2 {
			t.Fatalf("canonical form not stable: %s then %s", canon, canon2)
		}
		if !json.Valid(canon) {
			t.Fatalf("canonical form %s is not JSON", canon)
		}
	})
}
