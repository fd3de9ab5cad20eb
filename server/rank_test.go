package server_test

import (
	"encoding/json"
	"math"
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
		// The spectrum's readings (a CH3 triplet next to a CH2 quartet on
		// O) leave ethanol alone of the two C2H6O isomers (common practice).
		if cl.IsomersTotal != 1 || !cl.Complete || len(cl.Candidates) != 1 {
			t.Fatalf("C2H6O ranking: %d structures (complete %v), %d candidates; want 1 of each", cl.IsomersTotal, cl.Complete, len(cl.Candidates))
		}
		ethanol := canonical(t, "CCO")
		if top := cl.Candidates[0]; canonical(t, top.SMILES) != ethanol || top.Rank != 1 || len(top.Assignments) == 0 {
			t.Errorf("rank 1 = %+v, want ethanol with the higher probability and assignments", top)
		}
		// The ranking's summary and the peaks as the ranker read them.
		// C2H6O: DBE = C - H/2 + 1 = 0 (common practice); the integrals
		// 2 + 1 + 3 already sum to the formula's 6 H, so implied_h equals them.
		var sum struct {
			Formula  string   `json:"formula"`
			DBE      *int     `json:"dbe"`
			Scored   int64    `json:"scored"`
			Warnings []string `json:"warnings"`
			Peaks    []struct {
				Index        int     `json:"index"`
				Shift        float64 `json:"shift"`
				Multiplicity string  `json:"multiplicity"`
				ImpliedH     float64 `json:"implied_h"`
				Excluded     bool    `json:"excluded"`
			} `json:"peaks"`
		}
		c.do("GET", "/v1/jobs/"+j.ID+"/candidates?limit=1", nil).decode(t, &sum)
		if sum.Formula != "C2H6O" || sum.DBE == nil || *sum.DBE != 0 || sum.Scored != 1 || sum.Warnings == nil {
			t.Errorf("summary: formula %q, dbe %v, scored %d, warnings %v; want C2H6O, 0, 1, a list", sum.Formula, sum.DBE, sum.Scored, sum.Warnings)
		}
		wantPeaks := []struct {
			shift, h float64
			mult     string
		}{{3.69, 2, "q"}, {1.22, 3, "t"}, {2.6, 1, "br s"}}
		if len(sum.Peaks) != len(wantPeaks) {
			t.Fatalf("peaks = %+v, want %d", sum.Peaks, len(wantPeaks))
		}
		for i, w := range wantPeaks {
			p := sum.Peaks[i]
			if p.Index != i || math.Abs(p.Shift-w.shift) > 1e-9 || math.Abs(p.ImpliedH-w.h) > 1e-6 || p.Multiplicity != w.mult || p.Excluded {
				t.Errorf("peak %d = %+v, want δ %.2f %s %gH, scored", i, p, w.shift, w.mult, w.h)
			}
		}

		// A residual CHCl3 peak at 7.26 ppm in CDCl3 (Gottlieb et al. 1997)
		// is flagged and left out of the scoring.
		r = c.do("POST", "/v1/jobs", map[string]any{"formula": "C2H6O", "peaks": ethanolPeaks + ", 7.26 (s)", "solvent": "CDCl3"})
		var js server.JobView
		r.decode(t, &js)
		if done := c.waitJob(js.ID, 60*time.Second); done.Status != store.StatusSucceeded {
			t.Fatalf("job with a solvent peak = %+v", done)
		}
		var solv struct {
			Peaks []struct {
				Shift    float64 `json:"shift"`
				Solvent  string  `json:"solvent"`
				Excluded bool    `json:"excluded"`
			} `json:"peaks"`
		}
		c.do("GET", "/v1/jobs/"+js.ID+"/candidates?limit=1", nil).decode(t, &solv)
		if len(solv.Peaks) != 4 || !solv.Peaks[3].Excluded || solv.Peaks[3].Solvent == "" || solv.Peaks[0].Excluded {
			t.Errorf("peaks with a 7.26 ppm CHCl3 signal = %+v, want the fourth excluded as solvent, the others scored", solv.Peaks)
		}

		var one struct {
			Rank   int    `json:"rank"`
			SMILES string `json:"smiles"`
		}
		c.do("GET", "/v1/jobs/"+j.ID+"/candidates/1", nil).decode(t, &one)
		if canonical(t, one.SMILES) != canonical(t, "CCO") {
			t.Errorf("rank 1 = %+v, want ethanol", one)
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

// TestRealRankingCancelledWithinASecond cancels a long real ranking (the
// isomers of C12H24O2 run to millions) once it is under way: the job must be
// cancelled, its generator stopped, within a second, as the service promises.
func TestRealRankingCancelledWithinASecond(t *testing.T) {
	_, hs := startServer(t, store.NewMemory(), ranker.New(ranker.Options{Workers: 1}),
		server.Config{AllowAnonymous: true, Workers: 1, TimeBudget: 5 * time.Minute})
	c := client{t: t, base: hs.URL}
	var j server.JobView
	c.do("POST", "/v1/jobs", map[string]any{"formula": "C12H24O2",
		"peaks": "4.05 (t, 2H), 2.29 (t, 2H), 1.62 (m, 4H), 1.30 (m, 10H), 0.90 (t, 6H)"}).decode(t, &j)
	for deadline := time.Now().Add(30 * time.Second); ; time.Sleep(20 * time.Millisecond) {
		var cur server.JobView
		c.do("GET", "/v1/jobs/"+j.ID, nil).decode(t, &cur)
		if cur.Status == store.StatusRunning && cur.Progress.Generated > 0 {
			break
		}
		if cur.Status.Terminal() || time.Now().After(deadline) {
			t.Fatalf("job never ran with progress: %+v", cur)
		}
	}
	start := time.Now()
	if r := c.do("POST", "/v1/jobs/"+j.ID+"/cancel", nil); r.status != http.StatusAccepted {
		t.Fatalf("cancel = %d %s", r.status, r.body)
	}
	done := c.waitJob(j.ID, 10*time.Second)
	if took := time.Since(start); done.Status != store.StatusCancelled || took > time.Second {
		t.Errorf("after cancel: %s after %v, want cancelled within 1 s", done.Status, took)
	}
}
