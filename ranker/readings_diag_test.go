package ranker

import (
	"context"
	"fmt"
	"os"
	"strings"
	"testing"
	"time"

	"shiftrank/infer"
	"shiftrank/isomers"
	"shiftrank/molecule"
	"shiftrank/spectrum"
)

func TestReadingsDiag(t *testing.T) {
	if os.Getenv("SHIFTRANK_DIAG") == "" {
		t.Skip("diagnostic: set SHIFTRANK_DIAG=1")
	}
	b, err := os.ReadFile("../testdata/realsize.json")
	if err != nil {
		t.Fatal(err)
	}
	set, err := ParseReferenceSet(b)
	if err != nil {
		t.Fatal(err)
	}
	r := New(Options{})
	found, first := 0, 0
	only := os.Getenv("SHIFTRANK_DIAG_ONLY")
	for _, c := range set.Compounds {
		if only != "" && !strings.Contains(only, c.Name) {
			continue
		}
		req := Request{Formula: c.Formula, Peaks: diagPeaks(t, c.Peaks)}
		if os.Getenv("SHIFTRANK_DIAG_CARBON") != "" && c.Carbon != "" {
			cl, err := spectrum.ReadList([]byte(c.Carbon), spectrum.C13)
			if err != nil {
				t.Fatal(err)
			}
			req.Carbon = cl
		}
		j, err := r.prepare(req)
		if err != nil {
			t.Errorf("%s: %v", c.Name, err)
			continue
		}
		g, _ := molecule.ParseSMILES(c.SMILES)
		an := infer.Infer(j.formula, j.inferPeaks(), infer.Options{Carbon: j.inferCarbon()})
		hit := -1
		var why []string
		for k, rd := range an.Readings {
			ok, w := rd.Spec.Explain(g)
			if ok {
				hit = k
				break
			}
			if k < 3 {
				why = append(why, w)
			}
		}
		size := ""
		if hit >= 0 {
			found++
			if hit == 0 {
				first++
			}
			t0 := time.Now()
			st, _ := isomers.Count(context.Background(), j.formula, isomers.Options{Spec: &an.Readings[hit].Spec, NodeLimit: diagNodes()})
			size = fmt.Sprintf("size %d complete=%v nodes=%d %.1fs", st.Emitted, st.Complete, st.Nodes, time.Since(t0).Seconds())
		}
		fmt.Printf("%-40s %-10s readings=%2d hit=%2d %s\n", c.Name, c.Formula, len(an.Readings), hit, size)
		if hit != 0 {
			if len(an.Readings) > 0 {
				fmt.Printf("    top: %s\n", an.Readings[0].Name)
			}
			for _, w := range why {
				fmt.Printf("    why: %s\n", w)
			}
			for _, n := range an.Notes {
				fmt.Printf("    note: %s\n", n)
			}
		}
	}
	fmt.Printf("truth in a reading: %d/%d, in the first: %d\n", found, len(set.Compounds), first)
}

func diagPeaks(t *testing.T, s string) spectrum.PeakList {
	pl, err := spectrum.ReadList([]byte(s), spectrum.H1)
	if err != nil {
		t.Fatal(err)
	}
	return pl
}

func diagNodes() int64 {
	if v := os.Getenv("SHIFTRANK_DIAG_NODES"); v != "" {
		var n int64
		fmt.Sscan(v, &n)
		return n
	}
	return 5_000_000
}
