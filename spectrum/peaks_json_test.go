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

func TestParsePeaksJSON(t *testing.T) {
	for _, c := range loadCases(t, "json.json") {
		t.Run(c.Name, func(t *testing.T) {
			pl, err := ParsePeaksJSON([]byte(c.Input))
			if c.Err != nil {
				if err == nil {
					t.Fatalf("ParsePeaksJSON(%s) = %v, want an error", c.Input, pl)
				}
				checkErr(t, c.Name, err, *c.Err)
				return
			}
			if err != nil {
				t.Fatalf("ParsePeaksJSON(%s): %v", c.Input, err)
			}
			checkList(t, c.Name, pl, *c.Want)
			b, err := json.Marshal(pl)
			if err != nil {
				t.Fatal(err)
			}
			again, err := ParsePeaksJSON(b)
			if err != nil {
				t.Fatalf("ParsePeaksJSON(Marshal = %s): %v", b, err)
			}
			if !samePeaks(pl, again) {
				t.Errorf("JSON round trip:\n got %v\nwant %v", again, pl)
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
