package spectrum

import (
	"encoding/json"
	"os"
	"testing"
)

func readJSON(t *testing.T, path string, v any) {
	t.Helper()
	b, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if err := json.Unmarshal(b, v); err != nil {
		t.Fatalf("%s: %v", path, err)
	}
}

func TestParseJSON(t *testing.T) {
	for _, c := range loadCases(t, "json.json") {
		t.Run(c.Name, func(t *testing.T) {
			lists, err := ParseJSON([]byte(c.Input))
			if c.Err != nil {
				if err == nil {
					t.Fatalf("ParseJSON(%s) = %v, want an error", c.Input, lists)
				}
				checkErr(t, c.Name, err, *c.Err)
				return
			}
			if err != nil {
				t.Fatalf("ParseJSON(%s): %v", c.Input, err)
			}
			checkLists(t, c.Name, lists, c.wantLists())
			b, err := json.Marshal(lists)
			if err != nil {
				t.Fatal(err)
			}
			again, err := ParseJSON(b)
			if err != nil {
				t.Fatalf("ParseJSON(Marshal = %s): %v", b, err)
			}
			if !sameLists(lists, again) {
				t.Errorf("JSON round trip:\n got %v\nwant %v", again, lists)
			}
		})
	}
}

func TestPeakListUnmarshal(t *testing.T) {
	var req struct {
		Formula string   `json:"formula"`
		Peaks   PeakList `json:"peaks"`
	}
	in := `{"formula": "C4H8O2", "peaks": {"mhz": 400, "solvent": "CDCl3", "peaks": [{"shift": 2.05, "multiplicity": "s", "integral": 3}]}}`
	if err := json.Unmarshal([]byte(in), &req); err != nil {
		t.Fatalf("Unmarshal: %v", err)
	}
	if req.Peaks.MHz != 400 || len(req.Peaks.Peaks) != 1 || req.Peaks.Peaks[0].Integral != 3 {
		t.Errorf("Unmarshal peaks = %v", req.Peaks)
	}
}
