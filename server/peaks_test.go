package server_test

import (
	"net/http"
	"strings"
	"testing"
	"time"

	"github.com/stretchr/testify/assert"
	"github.com/stretchr/testify/require"

	"shiftrank/server"
	"shiftrank/spectrum"
	"shiftrank/store"
)

// ethanolJCAMP is ethanol's 1H peak list (Gottlieb, Kotlyar, Nudelman,
// J. Org. Chem. 1997, 62, 7512, Table 1; from memory) as a JCAMP-DX peak
// assignment block.
const ethanolJCAMP = "##TITLE= NB-0042-b ethanol\n##JCAMP-DX= 5.01\n##DATA TYPE= NMR PEAK ASSIGNMENTS\n" +
	"##.OBSERVE FREQUENCY= 400.13\n##.OBSERVE NUCLEUS= ^1H\n##.SOLVENT NAME= CDCl3\n##XUNITS= PPM\n" +
	"##PEAK ASSIGNMENTS= (XYMA)\n(3.72, 20, q, <CH2>)\n(1.32, 5, br s, <OH>)\n(1.24, 30, t, <CH3>)\n##END=\n"

// TestJobPeakFormats submits the peaks of one job as journal text with a
// 13C section and as JCAMP-DX, and checks what reaches the ranker.
func TestJobPeakFormats(t *testing.T) {
	rk := &fakeRanker{}
	_, hs := startServer(t, store.NewMemory(), rk, server.Config{AllowAnonymous: true})
	c := client{t: t, base: hs.URL}
	tests := []struct {
		name          string
		peaks         string
		h, c          int // peaks in the 1H and 13C lists
		mhz           float64
		solvent       string
		carbonSolvent string
	}{
		// Ethanol in CDCl3: 13C 58.28, 18.41 (Gottlieb et al. 1997, Table 2; from memory).
		{"journal text with a 13C section", "1H NMR (400 MHz, CDCl3) δ 3.72 (q, J = 7.0 Hz, 2H), 1.32 (br s, 1H), 1.24 (t, J = 7.0 Hz, 3H); 13C NMR (101 MHz, CDCl3) δ 58.28 (CH2), 18.41 (CH3)",
			3, 2, 400, "CDCl3", "CDCl3"},
		{"JCAMP-DX", ethanolJCAMP, 3, 0, 400.13, "CDCl3", ""},
	}
	for i, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := c.do("POST", "/v1/jobs", map[string]any{"formula": "C2H6O", "peaks": tc.peaks})
			require.Equal(t, http.StatusAccepted, r.status, "POST: %s", r.body)
			var j server.JobView
			r.decode(t, &j)
			done := c.waitJob(j.ID, 10*time.Second)
			require.Equal(t, store.StatusSucceeded, done.Status)
			rk.mu.Lock()
			req := rk.reqs[i]
			rk.mu.Unlock()
			assert.Equal(t, spectrum.H1, req.Peaks.Nucleus)
			assert.Len(t, req.Peaks.Peaks, tc.h)
			assert.Equal(t, tc.mhz, req.Peaks.MHz)
			assert.Equal(t, tc.solvent, req.Peaks.Solvent)
			assert.Len(t, req.Carbon.Peaks, tc.c)
			if tc.c > 0 {
				assert.Equal(t, spectrum.C13, req.Carbon.Nucleus)
				assert.Equal(t, tc.carbonSolvent, req.Carbon.Solvent)
			}
		})
	}
}

func TestJobPeakErrors(t *testing.T) {
	_, hs := startServer(t, store.NewMemory(), &fakeRanker{}, server.Config{AllowAnonymous: true})
	c := client{t: t, base: hs.URL}
	badJCAMP := strings.Replace(ethanolJCAMP, "(1.24, 30, t, <CH3>)", "(1.24, 30, x, <CH3>)", 1)
	tests := []struct {
		name   string
		peaks  any
		field  string
		pos    int
		token  string
		detail string // substring
	}{
		{"JCAMP-DX with an unknown multiplicity", badJCAMP, "/peaks", strings.Index(badJCAMP, "x, <CH3>"), "x", "line 11: PEAK ASSIGNMENTS: unknown multiplicity"},
		{"JCAMP-DX without ##END=", strings.TrimSuffix(ethanolJCAMP, "##END=\n"), "/peaks", len(ethanolJCAMP) - len("##END=\n"), "", "missing ##END="},
		{"13C list only", "13C NMR (101 MHz, CDCl3) δ 58.28, 18.41", "/peaks", -1, "", "no 1H peak list"},
		{"two 1H lists", "1H NMR (CDCl3) δ 1.24 (t, 3H); 1H NMR (DMSO-d6) δ 1.06 (t, 3H)", "/peaks", len("1H NMR (CDCl3) δ 1.24 (t, 3H); "), "1H", "second 1H peak list"},
		{"13C shift out of range", "1H NMR δ 1.24 (t, 3H); 13C NMR δ 58.28, 318.4", "/peaks", strings.Index("1H NMR δ 1.24 (t, 3H); 13C NMR δ 58.28, 318.4", "318.4"), "318.4", "outside"},
		{"13C count in JSON", []any{map[string]any{"shift": 1.24, "count": 2}}, "/peaks/0/count", -1, "", "carbon count"},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			r := c.do("POST", "/v1/jobs", map[string]any{"formula": "C2H6O", "peaks": tc.peaks})
			require.Equal(t, http.StatusBadRequest, r.status, "POST: %s", r.body)
			p := problemOf(t, r)
			require.Len(t, p.Errors, 1, "%s", r.body)
			f := p.Errors[0]
			assert.Equal(t, tc.field, f.Field)
			assert.Contains(t, f.Detail, tc.detail)
			if tc.pos >= 0 {
				require.NotNil(t, f.Position, "%s", r.body)
				assert.Equal(t, tc.pos, *f.Position)
				assert.Equal(t, tc.token, f.Token)
			}
		})
	}
}
