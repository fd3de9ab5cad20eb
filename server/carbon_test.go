package server_test

import (
	"context"
	"encoding/json"
	"net/http"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/ranker"
	"shiftrank/server"
	"shiftrank/spectrum"
	"shiftrank/store"
)

// Ethyl acetate in CDCl3 (Gottlieb, Kotlyar, Nudelman, J. Org. Chem. 1997,
// 62, 7512, Tables 1 and 2; from memory): the 1H list and the 13C shifts.
const ethylAcetateH = "4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, J = 7.1 Hz, 3H)"

var ethylAcetateC = []float64{171.36, 60.49, 21.04, 14.19}

// ethylAcetateCJCAMP is the 13C list as a JCAMP-DX peak table.
const ethylAcetateCJCAMP = "##TITLE= NB-0107 ethyl acetate 13C\n##JCAMP-DX= 5.01\n##DATA TYPE= NMR PEAK TABLE\n" +
	"##.OBSERVE FREQUENCY= 100.61\n##.OBSERVE NUCLEUS= ^13C\n##XUNITS= PPM\n##YUNITS= ARBITRARY UNITS\n" +
	"##PEAK TABLE= (XY..XY)\n171.36,20 60.49,50 21.04,45 14.19,48\n##END=\n"

// TestJobCarbonPeaks submits the 13C list of one job in each form the
// carbon_peaks member takes and checks what reaches the ranker and what
// the job echoes.
func TestJobCarbonPeaks(t *testing.T) {
	tests := []struct {
		name   string
		carbon any
		dept   []spectrum.DEPT // nil: not given
		counts []int           // nil: not given
	}{
		{"journal text without a header", "171.36, 60.49, 21.04, 14.19", nil, nil},
		{"journal text with DEPT and counts", "δ 171.36 (C), 60.49 (CH2), 21.04 (CH3), 14.19 (1C, CH3)",
			[]spectrum.DEPT{spectrum.Cq, spectrum.CH2, spectrum.CH3, spectrum.CH3}, []int{0, 0, 0, 1}},
		{"journal text with a 13C header", "13C NMR (101 MHz, CDCl3) δ 171.36, 60.49, 21.04, 14.19", nil, nil},
		{"JSON array of peak objects", []any{
			map[string]any{"shift": 171.36, "dept": "C"}, map[string]any{"shift": 60.49, "dept": "CH2"},
			map[string]any{"shift": 21.04, "dept": "CH3", "count": 1}, map[string]any{"shift": 14.19, "dept": "CH3"},
		}, []spectrum.DEPT{spectrum.Cq, spectrum.CH2, spectrum.CH3, spectrum.CH3}, []int{0, 0, 1, 0}},
		{"JSON list object", map[string]any{"nucleus": "13C", "mhz": 101, "peaks": []any{
			map[string]any{"shift": 171.36}, map[string]any{"shift": 60.49}, map[string]any{"shift": 21.04}, map[string]any{"shift": 14.19},
		}}, nil, nil},
		{"JCAMP-DX", ethylAcetateCJCAMP, nil, nil},
	}
	forEachStore(t, func(t *testing.T, st testStore) {
		rk := &fakeRanker{}
		_, hs := startServer(t, st, rk, server.Config{AllowAnonymous: true})
		c := client{t: t, base: hs.URL}
		for i, tc := range tests {
			t.Run(tc.name, func(t *testing.T) {
				r := c.do("POST", "/v1/jobs", map[string]any{"formula": "C4H8O2", "peaks": ethylAcetateH, "carbon_peaks": tc.carbon})
				require.Equal(t, http.StatusAccepted, r.status, "POST: %s", r.body)
				var j server.JobView
				r.decode(t, &j)
				done := c.waitJob(j.ID, 10*time.Second)
				require.Equal(t, store.StatusSucceeded, done.Status)
				var echo struct {
					CarbonPeaks json.RawMessage `json:"carbon_peaks"`
				}
				require.NoError(t, json.Unmarshal(done.Request, &echo))
				assert.NotEmpty(t, echo.CarbonPeaks, "the job's request echoes carbon_peaks")

				rk.mu.Lock()
				req := rk.reqs[i]
				rk.mu.Unlock()
				assert.Equal(t, spectrum.H1, req.Peaks.Nucleus)
				assert.Len(t, req.Peaks.Peaks, 3)
				require.Equal(t, spectrum.C13, req.Carbon.Nucleus)
				require.Len(t, req.Carbon.Peaks, len(ethylAcetateC))
				for k, p := range req.Carbon.Peaks {
					assert.InDelta(t, ethylAcetateC[k], p.Shift, 1e-9, "13C peak %d (source: Gottlieb et al. 1997, Table 2)", k)
					if tc.dept != nil {
						assert.Equal(t, tc.dept[k], p.DEPT, "13C peak %d DEPT", k)
					}
					if tc.counts != nil {
						assert.Equal(t, tc.counts[k], p.Count, "13C peak %d count", k)
					}
				}
			})
		}
	})
}

func TestJobCarbonPeakErrors(t *testing.T) {
	withC := ethylAcetateH + "; 13C NMR δ 171.36, 60.49"
	badText := "171.36, 60.49 (0C), 21.04"
	hText := "4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H)"
	tests := []struct {
		name   string
		peaks  string
		carbon any
		field  string
		pos    int // -1: no position
		token  string
		detail string // substring
	}{
		{"13C list in both members", withC, "21.04, 14.19", "/carbon_peaks", -1, "13C", "give the 13C list once"},
		{"1H list in carbon_peaks", ethylAcetateH, "1H NMR δ 2.05 (s, 3H)", "/carbon_peaks", 0, "1H", "give it in peaks"},
		{"zero carbon count in text", ethylAcetateH, badText, "/carbon_peaks", strings.Index(badText, "0C"), "0C", ""},
		{"integral in a header-less list", ethylAcetateH, hText, "/carbon_peaks", strings.Index(hText, "2H"), "2H", "integral"},
		{"shift out of the 13C range", ethylAcetateH, "171.36, 318.4", "/carbon_peaks", len("171.36, "), "318.4", "outside"},
		{"bad DEPT in a JSON array", ethylAcetateH, []any{map[string]any{"shift": 171.36}, map[string]any{"shift": 60.49, "dept": "CH5"}},
			"/carbon_peaks/1/dept", -1, "", ""},
		{"integral in a JSON array", ethylAcetateH, []any{map[string]any{"shift": 171.36, "integral": 1}},
			"/carbon_peaks/0/integral", -1, "", ""},
		{"bad DEPT in a list object", ethylAcetateH, map[string]any{"peaks": []any{map[string]any{"shift": 171.36, "dept": "CH5"}}},
			"/carbon_peaks/peaks/0/dept", -1, "", ""},
		{"empty text", ethylAcetateH, "  ", "/carbon_peaks", -1, "", "empty"},
		{"a number", ethylAcetateH, 171.36, "/carbon_peaks", -1, "", "must be"},
	}
	forEachStore(t, func(t *testing.T, st testStore) {
		_, hs := startServer(t, st, &fakeRanker{}, server.Config{AllowAnonymous: true})
		c := client{t: t, base: hs.URL}
		for _, tc := range tests {
			t.Run(tc.name, func(t *testing.T) {
				r := c.do("POST", "/v1/jobs", map[string]any{"formula": "C4H8O2", "peaks": tc.peaks, "carbon_peaks": tc.carbon})
				require.Equal(t, http.StatusBadRequest, r.status, "POST: %s", r.body)
				p := problemOf(t, r)
				require.Len(t, p.Errors, 1, "%s", r.body)
				f := p.Errors[0]
				assert.Equal(t, tc.field, f.Field, "%s", r.body)
				assert.Contains(t, f.Detail, tc.detail)
				if tc.token != "" {
					assert.Equal(t, tc.token, f.Token, "%s", r.body)
				}
				if tc.pos >= 0 {
					require.NotNil(t, f.Position, "%s", r.body)
					assert.Equal(t, tc.pos, *f.Position)
				}
			})
		}
		jobs, _, err := st.ListJobs(context.Background(), "", 10, "")
		require.NoError(t, err)
		assert.Empty(t, jobs, "a refused request stores no job")
	})
}

// searchRanker returns a fixed ranking whose search report is search.
type searchRanker struct{ search ranker.SearchReport }

func (f searchRanker) Rank(ctx context.Context, req ranker.Request, progress func(ranker.Progress)) (*ranker.Result, error) {
	if err := ctx.Err(); err != nil {
		return nil, err
	}
	progress(ranker.Progress{Generated: 2, Scored: 2})
	return &ranker.Result{
		Formula: req.Formula, IsomersTotal: 2, Scored: 2, Complete: f.search.Status != ranker.StatusStopped,
		Candidates: []ranker.Candidate{{Rank: 1, SMILES: "CCO", Score: -1, Probability: 0.9}, {Rank: 2, SMILES: "COC", Score: -3, Probability: 0.1}},
		Warnings:   []string{}, Search: f.search,
	}, nil
}

// TestJobViewSearchStatus checks that GET /v1/jobs/{id} of a succeeded job
// says how far its search went, as the candidates' search report does.
func TestJobViewSearchStatus(t *testing.T) {
	tests := []struct {
		name, scope, status, reason string
		wantReason                  string
	}{
		{"complete over all isomers", ranker.ScopeAll, ranker.StatusComplete, "", ""},
		{"complete within the constraints", ranker.ScopeConstrained, ranker.StatusCompleteWithin, "", ""},
		{"stopped early by the node budget", ranker.ScopeAll, ranker.StatusStopped, "node budget", "node budget"},
		{"a stop reason without a stop is not shown", ranker.ScopeAll, ranker.StatusComplete, "node budget", ""},
		{"no search report", "", "", "", ""},
	}
	forEachStore(t, func(t *testing.T, st testStore) {
		for _, tc := range tests {
			t.Run(tc.name, func(t *testing.T) {
				rk := searchRanker{ranker.SearchReport{Scope: tc.scope, Status: tc.status, StopReason: tc.reason, Summary: "invented summary"}}
				_, hs := startServer(t, st, rk, server.Config{AllowAnonymous: true})
				c := client{t: t, base: hs.URL}
				r := c.do("POST", "/v1/jobs", ethanolJob())
				require.Equal(t, http.StatusAccepted, r.status, "POST: %s", r.body)
				var queued map[string]any
				r.decode(t, &queued)
				assert.NotContains(t, queued, "search_status", "a queued job has no search status")
				done := c.waitJob(queued["id"].(string), 10*time.Second)
				require.Equal(t, store.StatusSucceeded, done.Status)
				assert.Equal(t, tc.status, done.SearchStatus)
				assert.Equal(t, tc.wantReason, done.SearchStopReason)

				var cl struct {
					Search struct {
						Status string `json:"status"`
						Scope  string `json:"scope"`
					} `json:"search"`
				}
				r = c.do("GET", "/v1/jobs/"+done.ID+"/candidates", nil)
				require.Equal(t, http.StatusOK, r.status)
				r.decode(t, &cl)
				assert.Equal(t, tc.status, cl.Search.Status, "the job view agrees with the candidates")
				assert.Equal(t, tc.scope, cl.Search.Scope)
			})
		}
	})
}

// TestJobSearchOptionsReachTheRanker: the search options of a job request
// reach the ranker as given, and the time and candidate limits of a job
// are the smaller of the request's and the server's.
func TestJobSearchOptionsReachTheRanker(t *testing.T) {
	rk := &fakeRanker{}
	_, hs := startServer(t, store.NewMemory(), rk, server.Config{AllowAnonymous: true, TimeBudget: 30 * time.Second, MaxCandidates: 5000})
	c := client{t: t, base: hs.URL}
	r := c.do("POST", "/v1/jobs", map[string]any{"formula": "C4H8O2", "peaks": ethylAcetateH, "options": map[string]any{
		"all_isomers": true, "disable": []string{"peak-2-shift"}, "max_nodes": 12345, "neutral": true,
		"time_budget": 5, "max_candidates": 100,
	}})
	require.Equal(t, http.StatusAccepted, r.status, "POST: %s", r.body)
	var j server.JobView
	r.decode(t, &j)
	c.waitJob(j.ID, 10*time.Second)
	r = c.do("POST", "/v1/jobs", map[string]any{"formula": "C4H8O2", "peaks": ethylAcetateH})
	require.Equal(t, http.StatusAccepted, r.status, "POST: %s", r.body)
	r.decode(t, &j)
	c.waitJob(j.ID, 10*time.Second)

	rk.mu.Lock()
	defer rk.mu.Unlock()
	require.Len(t, rk.reqs, 2)
	got := rk.reqs[0]
	assert.True(t, got.Unconstrained)
	assert.Equal(t, []string{"peak-2-shift"}, got.Disable)
	assert.Equal(t, int64(12345), got.MaxNodes)
	assert.True(t, got.Neutral)
	assert.Equal(t, 5*time.Second, got.TimeBudget)
	assert.Equal(t, int64(100), got.MaxCandidates)
	def := rk.reqs[1]
	assert.Equal(t, 30*time.Second, def.TimeBudget, "no time_budget: the server's")
	assert.Equal(t, int64(5000), def.MaxCandidates, "no max_candidates: the server's")
}
