package ranker

import (
	"context"
	"os"
	"testing"

	"shiftrank/infer"
	"shiftrank/isomers"
)

func BenchmarkReadingQuinoline(b *testing.B) {
	if os.Getenv("SHIFTRANK_DIAG") == "" {
		b.Skip("diagnostic")
	}
	r := New(Options{})
	j, err := r.prepare(Request{Formula: "C9H7N", Peaks: mustPeaks(b, "1H NMR (400 MHz, CDCl3) δ 8.91 (dd, J = 4.2, 1.7 Hz, 1H), 8.16–8.10 (m, 2H), 7.81 (d, J = 8.1 Hz, 1H), 7.71 (ddd, J = 8.4, 6.9, 1.5 Hz, 1H), 7.54 (ddd, J = 8.1, 6.9, 1.2 Hz, 1H), 7.38 (dd, J = 8.3, 4.2 Hz, 1H)")})
	if err != nil {
		b.Fatal(err)
	}
	an := infer.Infer(j.formula, j.inferPeaks(), infer.Options{})
	for b.Loop() {
		st, _ := isomers.Count(context.Background(), j.formula, isomers.Options{Spec: &an.Readings[0].Spec, Workers: 1})
		b.ReportMetric(float64(st.Nodes), "nodes")
		b.ReportMetric(float64(st.Emitted), "structures")
	}
}

func BenchmarkReadingAcetonaphthone(b *testing.B) {
	if os.Getenv("SHIFTRANK_DIAG") == "" {
		b.Skip("diagnostic")
	}
	r := New(Options{})
	j, err := r.prepare(Request{Formula: "C12H10O", Peaks: mustPeaks(b, "1H NMR (400 MHz, CDCl3) δ 8.46 (s, 1H), 8.03 (dd, J = 8.6, 1.7 Hz, 1H), 7.96 (d, J = 8.0 Hz, 1H), 7.92–7.85 (m, 2H), 7.62–7.52 (m, 2H), 2.72 (s, 3H)")})
	if err != nil {
		b.Fatal(err)
	}
	an := infer.Infer(j.formula, j.inferPeaks(), infer.Options{})
	for b.Loop() {
		st, _ := isomers.Count(context.Background(), j.formula, isomers.Options{Spec: &an.Readings[0].Spec, Workers: 1, NodeLimit: 2_000_000})
		b.ReportMetric(float64(st.Nodes), "nodes")
		b.ReportMetric(float64(st.Emitted), "structures")
		b.ReportMetric(float64(st.Duplicates), "dups")
	}
}

func BenchmarkReadingDEET(b *testing.B) {
	if os.Getenv("SHIFTRANK_DIAG") == "" {
		b.Skip("diagnostic")
	}
	r := New(Options{})
	j, err := r.prepare(Request{Formula: "C12H17NO", Peaks: mustPeaks(b, "1H NMR (400 MHz, CDCl3) δ 7.28–7.24 (m, 1H), 7.20–7.12 (m, 3H), 3.53 (br s, 2H), 3.25 (br s, 2H), 2.36 (s, 3H), 1.24 (br s, 3H), 1.10 (br s, 3H)")})
	if err != nil {
		b.Fatal(err)
	}
	an := infer.Infer(j.formula, j.inferPeaks(), infer.Options{})
	for i, c := range an.Readings[0].Spec.Classes {
		b.Logf("class %d: %v slots=%d vic=%v bonds=%v nbr=%v sum=%v", i, c, len(c.Slots), c.Vicinal, c.Bonds, c.Neighbours, c.Sum != nil)
		for _, s := range c.Slots {
			b.Logf("   slot %+v", s)
		}
	}
	for b.Loop() {
		st, _ := isomers.Count(context.Background(), j.formula, isomers.Options{Spec: &an.Readings[0].Spec, Workers: 1, NodeLimit: 300_000})
		b.ReportMetric(float64(st.Nodes), "nodes")
		b.ReportMetric(float64(st.Emitted), "structures")
	}
}
