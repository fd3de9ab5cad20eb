package main

import (
	"bufio"
	"context"
	"flag"
	"fmt"
	"io"
	"sort"
	"sync/atomic"
	"time"

	"shiftrank/isomers"
	"shiftrank/molecule"
)

// runIsomers lists (or counts) the constitutional isomers of a formula:
//
//	shiftrank isomers FORMULA [--count] [--filter=plausible|none|EDITS] [--limit N] [--max-heavy N]
//
// One canonical SMILES per line goes to stdout, in a deterministic order.
// The per-rule counts of the plausibility filter go to stderr at the end;
// a throttled progress line goes to stderr while it runs, only when stderr
// is a terminal.
func runIsomers(ctx context.Context, args []string, e env) error {
	fs := flag.NewFlagSet("isomers", flag.ContinueOnError)
	count := fs.Bool("count", false, "print only the number of isomers")
	filterExpr := fs.String("filter", "plausible", "plausibility filter: plausible, none, or edits such as plausible,-no-enol or none,+no-peroxide")
	limit := fs.Int64("limit", 0, "stop after N structures (0 = no limit)")
	maxHeavy := fs.Int("max-heavy", molecule.DefaultMaxHeavyAtoms, "refuse formulas with more than N heavy atoms")
	listRules := fs.Bool("rules", false, "list the filter rules with their reasons and exit")
	charged := fs.Bool("charge-separated", false, "also make the charge-separated groups: "+isomers.ChargeSeparatedGroups)
	page := isomersHelp()
	positional, help, err := parseArgs(fs, args, page, e)
	if help || err != nil {
		return err
	}
	if *listRules {
		w := bufio.NewWriter(e.stdout)
		for _, r := range isomers.Rules() {
			fmt.Fprintf(w, "%s\n    %s\n", r.Name, r.Reason)
		}
		return w.Flush()
	}
	if len(positional) != 1 {
		page.writeShort(e.stderr)
		if len(positional) == 0 {
			return badInputf("isomers: missing FORMULA")
		}
		return badInputf("isomers: expected one FORMULA, got %d arguments", len(positional))
	}
	if *limit < 0 {
		return badInputf("isomers: --limit must be 0 or more, got %d", *limit)
	}
	if *maxHeavy < 1 || *maxHeavy > isomers.MaxAtoms {
		return badInputf("isomers: --max-heavy must be between 1 and %d, got %d", isomers.MaxAtoms, *maxHeavy)
	}
	f, err := molecule.ParseFormulaLimit(positional[0], *maxHeavy)
	if err != nil {
		return badInput(err)
	}
	filter, err := isomers.ParseFilter(*filterExpr)
	if err != nil {
		return badInput(err)
	}
	opts := isomers.Options{Filter: filter, Limit: *limit, ChargeSeparated: *charged}

	var progress *progressLine
	if e.stderrTTY {
		progress = newProgressLine(e.stderr)
	}
	var st isomers.Stats
	switch {
	case *count && progress == nil:
		st, err = isomers.Count(ctx, f, opts)
	case *count:
		var n atomic.Int64
		stop, done := make(chan struct{}), make(chan struct{})
		go func() {
			progress.watch(stop, &n)
			close(done)
		}()
		st, err = isomers.GenerateConcurrent(ctx, f, opts, func(int, *molecule.Graph) bool {
			n.Add(1)
			return true
		})
		close(stop)
		<-done
	default:
		w := bufio.NewWriterSize(e.stdout, 1<<16)
		var c molecule.Canonicalizer
		var n int64
		var werr error
		st, err = isomers.Generate(ctx, f, opts, func(g *molecule.Graph) bool {
			s, _ := c.CanonicalSMILES(g)
			if _, werr = io.WriteString(w, s); werr == nil {
				werr = w.WriteByte('\n')
			}
			n++
			if progress != nil && n&1023 == 0 {
				progress.show(n)
			}
			return werr == nil
		})
		if ferr := w.Flush(); werr == nil {
			werr = ferr
		}
		if progress != nil {
			progress.clear()
		}
		if werr != nil {
			return fmt.Errorf("isomers: write: %w", werr)
		}
	}
	if progress != nil {
		progress.clear()
	}
	if err != nil {
		return fmt.Errorf("isomers %s: %w", f, err)
	}
	if *count {
		fmt.Fprintln(e.stdout, st.Emitted)
	}
	reportFilter(e.stderr, f, filter, st)
	return nil
}

// reportFilter writes the filter summary: how many structures each rule
// removed.
func reportFilter(w io.Writer, f molecule.Formula, filter isomers.Filter, st isomers.Stats) {
	status := "complete"
	if !st.Complete {
		status = fmt.Sprintf("stopped early, about %.0f%% of the search covered", 100*st.Fraction)
	}
	fmt.Fprintf(w, "isomers %s: %d structures, %d emitted after filter %q (%s)\n", f, st.Generated, st.Emitted, filter.String(), status)
	names := make([]string, 0, len(st.Removed))
	for name := range st.Removed {
		names = append(names, name)
	}
	// rule order, as isomers.Rules lists them
	order := map[string]int{}
	for i, r := range isomers.Rules() {
		order[r.Name] = i
	}
	sort.Slice(names, func(i, j int) bool { return order[names[i]] < order[names[j]] })
	for _, name := range names {
		fmt.Fprintf(w, "  removed %8d  %s\n", st.Removed[name], name)
	}
	if st.Complete && st.Generated == 0 {
		fmt.Fprintln(w, "  no neutral structure fits this formula with the valences C 4, N 3, O 2, S 2/4/6, P 3/5, Si 4, B 3, halogens 1; charged or radical species (CO, nitro groups, N-oxides) are outside the generator's model")
	}
}

// progressLine rewrites one status line on a terminal, at most a few
// times a second.
type progressLine struct {
	w     io.Writer
	start time.Time
	last  time.Time
	shown bool
}

func newProgressLine(w io.Writer) *progressLine {
	return &progressLine{w: w, start: time.Now()}
}

func (p *progressLine) show(n int64) {
	now := time.Now()
	if now.Sub(p.last) < 250*time.Millisecond {
		return
	}
	p.last = now
	el := now.Sub(p.start).Seconds()
	rate := 0.0
	if el > 0 {
		rate = float64(n) / el
	}
	fmt.Fprintf(p.w, "\r%d structures, %.0f/s, %.1f s ", n, rate, el)
	p.shown = true
}

func (p *progressLine) clear() {
	if p.shown {
		fmt.Fprint(p.w, "\r\033[K")
		p.shown = false
	}
}

// watch shows the counter n until stop is closed.
func (p *progressLine) watch(stop <-chan struct{}, n *atomic.Int64) {
	t := time.NewTicker(250 * time.Millisecond)
	defer t.Stop()
	for {
		select {
		case <-stop:
			return
		case <-t.C:
			p.show(n.Load())
		}
	}
}

// isomersHelp is the help page of isomers.
func isomersHelp() helpPage {
	return helpPage{
		name:     "isomers",
		synopsis: []string{"shiftrank isomers FORMULA [--count] [--filter EXPR] [--limit N] [--max-heavy N]", "shiftrank isomers --rules"},
		about: `Lists the constitutional isomers of FORMULA (neutral, closed-shell), one canonical SMILES a
line on standard output, in a fixed order; --count prints only their number. What the
plausibility filter removed, rule by rule, goes to standard error.`,
		examples: []string{
			"shiftrank isomers C4H10O",
			"shiftrank isomers C6H12O2 --count",
			"shiftrank isomers C5H10O --filter plausible,-no-enol --limit 100",
			"shiftrank isomers --rules",
		},
	}
}
