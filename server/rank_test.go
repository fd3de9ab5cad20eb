package server_test

import (
	"encoding/json"
	"net/http"
	"testing"
	"time"

	"shiftrank/molecule"
	"shiftrank/ranker"
	"shiftrank/server"
	"shiftrank/store"
)

// TestRealRankingEthanol runs the real ranker through the API on C2H6O,
// which has exactly two constitutional isomers, ethanol and dimethyl ether
// (common practice). The observed list is ethanol's: a CH2 quartet near
// 3.69 ppm and a CH3 triplet near 1.22 ppm (Gottlieb et al. 1997, ethanol
// in CDCl3: 3.72 q, 1.25 t), so ethanol must rank first.
func TestRealRankingEthanol(t *testing.T) {
	forEachStore(t, func(t *testing.T, st testStore) {
		_, hs := startServer(t, st, ranker.New(ranker.Options{Workers: 1}), server.Config{AllowAnonymous: true, Workers: 1})
		c := client{t: t, base: hs.URL}
		r := c.do("POST", "/v1/jobs", map[string]any{
			"formula": "C2H6O", "peaks": ethanolPeaks, "mhz": 400, "solvent": "CDCl3",
			"options": map[string]any{"top_k": 5}, "reference": "NB-0042-a",
		})
		if r.status != http.StatusAccepted {
			t.Fatalf("submit = %d %s", r.status, r.body)
		}
		var j server.JobView
		r.decode(t, &j)
		done := c.waitJob(j.ID, 60*time.Second)
		if done.Status != store.StatusSucceeded {
			t.Fatalf("job = %+v", done)
		}
		var cl struct {
			IsomersTotal int64 `json:"isomers_total"`
			Complete     bool  `json:"complete"`
			Candidates   []struct {
				Rank             int               `json:"rank"`
				SMILES           string            `json:"smiles"`
				Probability      float64           `json:"probability"`
				Assignments      []json.RawMessage `json:"assignments"`
				UnexplainedPeaks []json.RawMessage `json:"unexplained_peaks"`
			} `json:"candidates"`
		}
		c.do("GET", "/v1/jobs/"+j.ID+"/candidates", nil).decode(t, &cl)
		if cl.IsomersTotal != 2 || !cl.Complete || len(cl.Candidates) != 2 {
			t.Fatalf("C2H6O ranking: %d isomers (complete %v), %d candidates; want 2 of each", cl.IsomersTotal, cl.Complete, len(cl.Candidates))
		}
		ethanol := canonical(t, "CCO")
		if top := cl.Candidates[0]; canonical(t, top.SMILES) != ethanol || top.Rank != 1 || top.Probability <= cl.Candidates[1].Probability || len(top.Assignments) == 0 {
			t.Errorf("rank 1 = %+v, want ethanol with the higher probability and assignments", top)
		}
		var one struct {
			Rank   int    `json:"rank"`
			SMILES string `json:"smiles"`
		}
		c.do("GET", "/v1/jobs/"+j.ID+"/candidates/2", nil).decode(t, &one)
		if canonical(t, one.SMILES) != canonical(t, "COC") {
			t.Errorf("rank 2 = %+v, want dimethyl ether", one)
		}
	})
}

func canonical(t *testing.T, smi string) string {
	t.Helper()
	g, err := molecule.ParseSMILES(smi)
	if err != nil {
		t.Fatalf("ParseSMILES(%q): %v", smi, err)
	}
	return molecule.CanonicalSMILES(g)
}
