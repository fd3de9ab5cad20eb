package main

import (
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"os"

	"shiftrank/ranker"
)

// runBench runs the accuracy benchmark over a reference file.
func runBench(ctx context.Context, args []string, e env) error {
	fs := flag.NewFlagSet("bench", flag.ContinueOnError)
	top := fs.Int("top", 5, "candidates explained per compound")
	maxCand := fs.Int64("max-candidates", ranker.DefaultMaxCandidates, "per compound: stop after this many isomers")
	budget := fs.Duration("time-budget", ranker.DefaultTimeBudget, "per compound: stop generating after this long")
	filter := fs.String("filter", ranker.DefaultFilter, "plausibility filter")
	carbon := fs.Bool("carbon", false, "score each compound with its 13C list (the file's \"carbon\" field) as well as its 1H list")
	asJSON := fs.Bool("json", false, "print the report as JSON")
	page := benchHelp()
	positional, help, err := parseArgs(fs, args, page, e)
	if help || err != nil {
		return err
	}
	if len(positional) != 1 {
		page.writeShort(e.stderr)
		return badInputf("bench: want one reference file (e.g. testdata/accuracy.json), got %d arguments", len(positional))
	}
	file := positional[0]
	b, err := os.ReadFile(file)
	if err != nil {
		return badInputf("bench: %w", err)
	}
	set, err := ranker.ParseReferenceSet(b)
	if err != nil {
		return badInputf("bench: %s: %w", file, withInput(err, string(b)))
	}
	opts := ranker.BenchOptions{TopK: *top, MaxCandidates: *maxCand, TimeBudget: *budget, Filter: *filter, Carbon: *carbon}
	var done func(int, ranker.BenchCase)
	if e.stderrTTY {
		done = func(i int, c ranker.BenchCase) {
			fmt.Fprintf(e.stderr, "\r%d/%d %-30s", i+1, len(set.Compounds), c.Name)
		}
	}
	rep, err := ranker.New(ranker.Options{}).Bench(ctx, set, opts, done)
	if e.stderrTTY {
		fmt.Fprintln(e.stderr)
	}
	if err != nil {
		return fmt.Errorf("bench: %w", err)
	}
	if *asJSON {
		enc := json.NewEncoder(e.stdout)
		enc.SetIndent("", "  ")
		return enc.Encode(rep)
	}
	writeBench(e.stdout, rep)
	return nil
}

// writeBench prints a benchmark report: one line per compound, each miss
// with its explanation, then the figures.
func writeBench(w io.Writer, rep *ranker.BenchReport) {
	fmt.Fprintln(w, "rank   p(true)    p(top)   scored  compound (formula)")
	for _, c := range rep.Cases {
		rank := "-"
		if c.Rank > 0 {
			rank = fmt.Sprint(c.Rank)
		}
		fmt.Fprintf(w, "%4s  %8s  %8s  %7d  %s (%s)", rank, formatPercent(c.Probability), formatPercent(c.TopProbability), c.Scored, c.Name, c.Formula)
		if !c.Complete && c.Error == "" {
			fmt.Fprint(w, " [stopped early]")
		}
		if c.Excluded != "" {
			fmt.Fprintf(w, " [not scored: %s]", c.Excluded)
		}
		fmt.Fprintf(w, " %.1f s", c.Seconds)
		if c.Error != "" {
			fmt.Fprintf(w, " ERROR: %s", c.Error)
		}
		fmt.Fprintln(w)
	}
	misses := 0
	for _, c := range rep.Cases {
		if c.Rank == 1 {
			continue
		}
		if misses == 0 {
			fmt.Fprintln(w, "\nmisses:")
		}
		misses++
		fmt.Fprintf(w, "\n== %s (%s), true %s ranked %d; source: %s\n", c.Name, c.Formula, c.SMILES, c.Rank, c.Source)
		fmt.Fprintf(w, "   peaks: %s\n", c.Peaks)
		if c.Top != nil {
			writeCandidate(w, nil, c.Top)
		}
		if c.True != nil {
			fmt.Fprintln(w, "   the true structure:")
			writeCandidate(w, nil, c.True)
		}
	}
	fmt.Fprintf(w, "\n%d compounds: top-1 %.1f %%, top-3 %.1f %%, mean reciprocal rank %.3f\n",
		rep.N, 100*rep.Top1, 100*rep.Top3, rep.MRR)
	if rep.WithCarbon > 0 {
		fmt.Fprintf(w, "scored with the 1H and 13C lists: %d of %d compounds (the others with the 1H list only)\n", rep.WithCarbon, rep.N)
	}
	fmt.Fprintf(w, "searches complete (over all isomers or within the constraints): %.1f %%; time per compound median %.1f s, max %.1f s\n",
		100*rep.CompleteShare, rep.MedianSeconds, rep.MaxSeconds)
	fmt.Fprintf(w, "calibration: mean probability of the top candidate %.3f vs observed top-1 rate %.3f; mean probability of the true structure %.3f\n",
		rep.MeanTopProbability, rep.Top1, rep.MeanTrueProbability)
	fmt.Fprintln(w, "  p(top) range   compounds  mean p(top)  top-1 rate")
	for _, b := range rep.Calibration {
		if b.N == 0 {
			continue
		}
		fmt.Fprintf(w, "  %.2f–%.2f     %9d  %11.3f  %10.3f\n", b.Lo, b.Hi, b.N, b.MeanProbability, b.Top1)
	}
	fmt.Fprintf(w, "%.1f s\n", rep.Seconds)
	fmt.Fprintf(w, "\nCaution: %s\n", ranker.Caution)
}

// benchHelp is the help page of bench.
func benchHelp() helpPage {
	return helpPage{
		name:     "bench",
		synopsis: []string{"shiftrank bench [flags] FILE"},
		about: `Ranks every compound of a reference file (JSON: {"compounds": [{"name", "formula", "smiles",
"peaks", "carbon", "source"}, ...]}) and reports where the true structure ranked: top-1 and top-3
rates, mean reciprocal rank, calibration of the probabilities, and each miss explained.`,
		examples: []string{
			"shiftrank bench testdata/accuracy.json",
			"shiftrank bench --carbon --top 3 testdata/accuracy.json",
			"shiftrank bench --json testdata/validation.json > NB-2291-bench.json",
		},
	}
}
