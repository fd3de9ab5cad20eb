package main

import (
	"context"
	"encoding/json"
	"errors"
	"flag"
	"fmt"
	"io"
	"math"
	"os"
	"regexp"
	"strconv"
	"strings"

	"shiftrank/ranker"
	"shiftrank/spectrum"
)

// stringList is a repeatable string flag.
type stringList []string

func (s *stringList) String() string     { return strings.Join(*s, ",") }
func (s *stringList) Set(v string) error { *s = append(*s, v); return nil }

// runRank ranks the isomers of a formula against an observed peak list.
func runRank(ctx context.Context, args []string, e env) error {
	fs := flag.NewFlagSet("rank", flag.ContinueOnError)
	formula := fs.String("formula", "", "molecular formula, e.g. C4H8O2 (required)")
	peaks := fs.String("peaks", "", "observed peak lists: journal text (1H, and 13C sections), @FILE, or - for stdin; JSON and JCAMP-DX are recognised; a 13C list is scored with the 1H list (required)")
	carbonArg := fs.String("carbon", "", "observed 13C peak list: journal text (a header such as \"13C NMR (101 MHz, CDCl3) δ\" is optional), JSON or JCAMP-DX, or @FILE; scored with the 1H list (not together with a 13C section in --peaks)")
	mhz := fs.Float64("mhz", 0, "spectrometer 1H frequency in MHz (default: from the peak list header, else 400)")
	solvent := fs.String("solvent", "", "NMR solvent (default: from the peak list header, else CDCl3)")
	top := fs.Int("top", ranker.DefaultTopK, "number of candidates to show")
	filter := fs.String("filter", ranker.DefaultFilter, `plausibility filter: "plausible", "none", or edits such as "plausible,-RULE"`)
	var require, forbid stringList
	fs.Var(&require, "require", "fragment SMILES every candidate must contain (repeatable)")
	fs.Var(&forbid, "forbid", "fragment SMILES no candidate may contain (repeatable)")
	maxCand := fs.Int64("max-candidates", ranker.DefaultMaxCandidates, "stop after this many isomers")
	budget := fs.Duration("time-budget", ranker.DefaultTimeBudget, "stop generating after this long")
	keepSolvent := fs.Bool("keep-solvent", false, "score peaks that match the solvent or water signals")
	var disable stringList
	fs.Var(&disable, "disable", "switch off a constraint read from the spectrum, by its ID as printed (repeatable)")
	allIsomers := fs.Bool("all-isomers", false, "search every plausible isomer, ignoring the constraints read from the spectrum")
	maxNodes := fs.Int64("max-nodes", ranker.DefaultMaxNodes, "search budget in generator nodes (the same input stops at the same place on any machine)")
	neutral := fs.Bool("neutral", false, "leave out charge-separated groups (nitro, N-oxides, azides, diazo compounds, isonitriles)")
	asJSON := fs.Bool("json", false, "print the result as JSON")
	positional, help, err := parseArgs(fs, args, rankHelp(), e)
	if help || err != nil {
		return err
	}
	if len(positional) > 0 {
		rankHelp().writeShort(e.stderr)
		return badInputf("rank: unexpected argument %q (quote the peak list and pass it with --peaks)", positional[0])
	}
	if *formula == "" {
		return badInputf("rank: --formula is required")
	}
	if *peaks == "" {
		return badInputf("rank: --peaks is required")
	}
	if *top < 1 || *top > ranker.MaxTopK {
		return badInputf("rank: --top %d: want 1–%d", *top, ranker.MaxTopK)
	}
	pl, carbon, peaksText, err := readPeakLists(*peaks, e.stdin)
	if err != nil {
		return err
	}
	carbonText := peaksText
	if *carbonArg != "" {
		if len(carbon.Peaks) > 0 {
			return badInputf("rank: --peaks already holds a 13C list: give it there or with --carbon, not both")
		}
		if carbon, carbonText, err = readCarbonList(*carbonArg); err != nil {
			return err
		}
	}
	req := ranker.Request{
		Formula: *formula, Peaks: pl, Carbon: carbon, MHz: *mhz, Solvent: *solvent, TopK: *top, Filter: *filter,
		Require: require, Forbid: forbid, MaxCandidates: *maxCand, TimeBudget: *budget,
		KeepSolventPeaks: *keepSolvent, Disable: disable, Unconstrained: *allIsomers, MaxNodes: *maxNodes, Neutral: *neutral,
	}
	var progress func(ranker.Progress)
	if e.stderrTTY {
		progress = func(p ranker.Progress) {
			fmt.Fprintf(e.stderr, "\rgenerated %d, scored %d ", p.Generated, p.Scored)
		}
	}
	res, err := ranker.New(ranker.Options{}).Rank(ctx, req, progress)
	if e.stderrTTY {
		fmt.Fprintln(e.stderr)
	}
	if err != nil {
		var re *ranker.RequestError
		if errors.As(err, &re) {
			// Positions in a peak list refer to the text read.
			switch {
			case strings.HasPrefix(re.Field, "carbon"):
				err = withInput(err, carbonText)
			case strings.HasPrefix(re.Field, "peaks"):
				err = withInput(err, peaksText)
			}
			return badInput(err)
		}
		return fmt.Errorf("rank: %w", err)
	}
	if *asJSON {
		enc := json.NewEncoder(e.stdout)
		enc.SetIndent("", "  ")
		return enc.Encode(res)
	}
	fw := &fitWriter{w: e.stdout}
	writeResult(fw, res)
	return fw.Flush()
}

// readPeakLists reads --peaks: inline text, @FILE or - (stdin), in any
// format spectrum.Read recognises. It returns the 1H list, which must be
// there, the 13C list (empty when absent) and the text read.
func readPeakLists(arg string, stdin io.Reader) (h, c spectrum.PeakList, text string, err error) {
	var data []byte
	switch {
	case arg == "-":
		b, err := io.ReadAll(io.LimitReader(stdin, spectrum.MaxPeakInput+1))
		if err != nil {
			return h, c, "", fmt.Errorf("read peaks from stdin: %w", err)
		}
		data = b
	case strings.HasPrefix(arg, "@"):
		b, err := os.ReadFile(arg[1:])
		if err != nil {
			return h, c, "", badInputf("--peaks: %w", err)
		}
		data = b
	default:
		data = []byte(arg)
	}
	if len(data) > spectrum.MaxPeakInput {
		return h, c, "", badInputf("--peaks: input exceeds %d bytes", spectrum.MaxPeakInput)
	}
	text = string(data)
	lists, err := spectrum.Read(data)
	if err != nil {
		return h, c, "", badInputf("--peaks: %w", err)
	}
	h, found, err := spectrum.Pick(lists, spectrum.H1)
	if err == nil && !found {
		return h, c, text, badInputf("--peaks: no 1H peak list (found %s): the ranking needs one", lists[0].Nucleus)
	}
	if err == nil {
		c, _, err = spectrum.Pick(lists, spectrum.C13)
	}
	if err != nil {
		return h, c, text, badInputf("--peaks: %w", err)
	}
	return h, c, text, nil
}

// carbonHeader is put before a --carbon text without a header of its own,
// so that a bare list of shifts reads as a 13C list.
const carbonHeader = "13C NMR "

// readCarbonList reads --carbon: inline text or @FILE, in any format
// spectrum.Read recognises. Journal text without a 13C header is read as
// a 13C list. It must hold one 13C list and no 1H list. It returns the
// list and the text read.
func readCarbonList(arg string) (spectrum.PeakList, string, error) {
	var data []byte
	if strings.HasPrefix(arg, "@") {
		b, err := os.ReadFile(arg[1:])
		if err != nil {
			return spectrum.PeakList{}, "", badInputf("--carbon: %w", err)
		}
		data = b
	} else {
		data = []byte(arg)
	}
	if len(data) > spectrum.MaxPeakInput {
		return spectrum.PeakList{}, "", badInputf("--carbon: input exceeds %d bytes", spectrum.MaxPeakInput)
	}
	lists, err := spectrum.Read(data)
	c, found := spectrum.PeakList{}, false
	if err == nil {
		c, found, err = spectrum.Pick(lists, spectrum.C13)
	}
	if !found && spectrum.DetectFormat(data) == spectrum.FormatText {
		// No 13C header: read the text as a 13C list, with error
		// positions in the text as given.
		lists, err = spectrum.Read(append([]byte(carbonHeader), data...))
		if err == nil {
			c, found, err = spectrum.Pick(lists, spectrum.C13)
			c.Pos = max(c.Pos-len(carbonHeader), 0)
			for i := range c.Peaks {
				c.Peaks[i].Pos -= len(carbonHeader)
			}
		}
		var pe *spectrum.PeakError
		if errors.As(err, &pe) {
			fixed := *pe
			fixed.Input = string(data)
			fixed.Pos = max(pe.Pos-len(carbonHeader), 0)
			err = &fixed
		}
	}
	if err != nil {
		return spectrum.PeakList{}, "", badInputf("--carbon: %w", err)
	}
	if !found {
		return spectrum.PeakList{}, "", badInputf("--carbon: no 13C peak list")
	}
	if _, h, _ := spectrum.Pick(lists, spectrum.H1); h {
		return spectrum.PeakList{}, "", badInputf("--carbon: the input holds a 1H list too: give it with --peaks")
	}
	return c, string(data), nil
}

// writeResult prints a ranking for a reader.
func writeResult(w io.Writer, res *ranker.Result) {
	fmt.Fprintln(w, res.Search.Summary)
	fmt.Fprintf(w, "%s (DBE %d), %d scored", res.Formula, res.DBE, res.Scored)
	if !res.Complete {
		fmt.Fprint(w, " — STOPPED EARLY")
	}
	fmt.Fprintf(w, "\n%.0f MHz, %s, filter %s; prior %s; %.1f s\n", res.MHz, res.Solvent, res.Filter, res.Prior, res.ElapsedSeconds)
	writeSearch(w, &res.Search)
	if len(res.Require) > 0 {
		fmt.Fprintf(w, "required fragments: %s\n", strings.Join(res.Require, ", "))
	}
	if len(res.Forbid) > 0 {
		fmt.Fprintf(w, "forbidden fragments: %s\n", strings.Join(res.Forbid, ", "))
	}
	fmt.Fprintln(w)
	if len(res.CarbonPeaks) > 0 {
		fmt.Fprintf(w, "scored with the 1H list (%d peaks) and the 13C list (%d peaks)\n", len(res.Peaks), len(res.CarbonPeaks))
	}
	switch {
	case len(res.Candidates) > 0 && len(res.CarbonPeaks) > 0:
		fmt.Fprintln(w, "rank  probability  score     of which 13C  SMILES")
		for _, c := range res.Candidates {
			fmt.Fprintf(w, "%4d  %11s  %8.2f  %12.2f  %s\n", c.Rank, formatPercent(c.Probability), c.Score, c.CarbonScore, c.SMILES)
		}
	case len(res.Candidates) > 0:
		fmt.Fprintln(w, "rank  probability  score     SMILES")
		for _, c := range res.Candidates {
			fmt.Fprintf(w, "%4d  %11s  %8.2f  %s\n", c.Rank, formatPercent(c.Probability), c.Score, c.SMILES)
		}
	}
	if len(res.Candidates) > 0 {
		fmt.Fprintln(w, "\nPeaks, environments, signals and atoms are numbered from 1 (atoms in SMILES order);")
		fmt.Fprintln(w, "the --json output keeps the 0-based indices.")
	}
	for _, c := range res.Candidates {
		fmt.Fprintln(w)
		writeCandidate(w, res, &c)
	}
	if len(res.Warnings) > 0 {
		fmt.Fprintln(w, "\nwarnings:")
		for _, s := range res.Warnings {
			fmt.Fprintf(w, "  - %s\n", s)
		}
	}
	fmt.Fprintf(w, "\nCaution: %s\n", res.Caution)
}

// writeCandidate prints one candidate's per-peak table.
func writeCandidate(w io.Writer, res *ranker.Result, c *ranker.Candidate) {
	fmt.Fprintf(w, "#%d %s  (probability %s, score %.2f)\n", c.Rank, c.SMILES, formatPercent(c.Probability), c.Score)
	if c.Summary != "" {
		fmt.Fprintf(w, "  %s\n", c.Summary)
	}
	fmt.Fprintln(w, "  peak  δ obs        δ pred  mult obs/pred   H obs/exp  share  atoms  env")
	for _, a := range c.Assignments {
		obs := fmt.Sprintf("%.2f", a.ObservedShift)
		if len(a.ObservedRange) == 2 {
			obs = fmt.Sprintf("%.2f–%.2f", a.ObservedRange[0], a.ObservedRange[1])
		}
		mult := orDash(a.ObservedMultiplicity) + " / " + a.PredictedMultiplicity
		oh := "-"
		if a.ObservedH > 0 {
			oh = fmt.Sprintf("%.1f", a.ObservedH)
		}
		fmt.Fprintf(w, "  %4d  %-11s  %6.2f  %-14s  %4s/%-4d  %+5.1f  %-5s  %s\n",
			a.Peak+1, obs, a.PredictedShift, mult, oh, a.ExpectedH, a.ScoreShare, joinIDs(a.Atoms), joinIDs(a.Environments))
		if a.MultiplicityReason != "" {
			fmt.Fprintf(w, "        multiplicity: %s\n", renumberAtoms(a.MultiplicityReason))
		}
		if len(a.Breakdown) > 0 {
			parts := make([]string, len(a.Breakdown))
			for i, t := range a.Breakdown {
				parts[i] = fmt.Sprintf("%s %+.2f", t.Term, t.PPM)
			}
			fmt.Fprintf(w, "        shift: %s\n", renumberAtoms(strings.Join(parts, ", ")))
		}
	}
	for _, u := range c.UnexplainedPeaks {
		fmt.Fprintf(w, "  peak %d (δ %.2f, %s) unexplained: %+.1f\n", u.Peak+1, u.ObservedShift, orDash(u.Multiplicity), u.ScoreShare)
	}
	for _, u := range c.UnobservedEnvironments {
		fmt.Fprintf(w, "  environment %d (%s, %d H, δ %.2f %s, atoms %s) not observed: %+.1f — %s\n",
			u.Environment+1, u.Kind, u.H, u.PredictedShift, u.PredictedMultiplicity, joinIDs(u.Atoms), u.ScoreShare, renumberAtoms(u.Reason))
	}
	writeCarbon(w, c)
	for _, n := range c.Notes {
		fmt.Fprintf(w, "  note: %s\n", n)
	}
}

// writeCarbon prints a candidate's 13C assignment table (nothing when no
// 13C list was scored).
func writeCarbon(w io.Writer, c *ranker.Candidate) {
	if len(c.CarbonAssignments) == 0 && len(c.UnexplainedCarbonPeaks) == 0 {
		return
	}
	fmt.Fprintf(w, "  13C (%+.1f of the score):\n", c.CarbonScore)
	fmt.Fprintln(w, "  13C peak  δ obs         δ pred  DEPT obs/pred   C obs/pred  share  atoms  signal")
	for _, a := range c.CarbonAssignments {
		obs := fmt.Sprintf("%.2f", a.ObservedShift)
		if len(a.ObservedRange) == 2 {
			obs = fmt.Sprintf("%.1f–%.1f", a.ObservedRange[0], a.ObservedRange[1])
		}
		oc := "-"
		if a.ObservedCount > 0 {
			oc = fmt.Sprint(a.ObservedCount)
		}
		fmt.Fprintf(w, "  %8d  %-12s  %6.1f  %-14s  %4s/%-5d  %+5.1f  %-5s  %s\n",
			a.Peak+1, obs, a.PredictedShift, orDash(a.ObservedDEPT)+" / "+a.PredictedClass, oc, a.Carbons, a.ScoreShare, joinIDs(a.Atoms), joinIDs(a.Signals))
		if a.Reason != "" {
			fmt.Fprintf(w, "            why: %s\n", renumberAtoms(a.Reason))
		}
		if len(a.Breakdown) > 0 {
			parts := make([]string, len(a.Breakdown))
			for i, t := range a.Breakdown {
				parts[i] = fmt.Sprintf("%s %+.1f", t.Term, t.PPM)
			}
			fmt.Fprintf(w, "            shift: %s\n", strings.Join(parts, ", "))
		}
	}
	for _, u := range c.UnexplainedCarbonPeaks {
		fmt.Fprintf(w, "  13C peak %d (δ %.2f) unexplained: %+.1f — %s\n", u.Peak+1, u.ObservedShift, u.ScoreShare, u.Reason)
	}
	for _, u := range c.UnobservedCarbons {
		fmt.Fprintf(w, "  carbon signal %d (%s, %s, δ %.1f, atoms %s) not observed: %+.1f — %s\n",
			u.Signal+1, u.Class, u.Kind, u.PredictedShift, joinIDs(u.Atoms), u.ScoreShare, u.Reason)
	}
}

func orDash(s string) string {
	if s == "" {
		return "-"
	}
	return s
}

// atomRefs matches the atom and environment numbers in the core's
// explanations ("on atom 5", "of atoms 4,5", "env 3:"), which are 0-based
// indices.
var atomRefs = regexp.MustCompile(`\b(?:atoms?|env|environments?) \d+(?:, ?\d+)*`)

// renumberAtoms rewrites the 0-based atom and environment numbers of an
// explanation as the 1-based numbers of the human output.
func renumberAtoms(s string) string {
	return atomRefs.ReplaceAllStringFunc(s, func(m string) string {
		sp := strings.IndexByte(m, ' ')
		var ids []int
		for _, f := range strings.Split(m[sp+1:], ",") {
			n, err := strconv.Atoi(strings.TrimSpace(f))
			if err != nil {
				return m
			}
			ids = append(ids, n)
		}
		return m[:sp+1] + joinIDs(ids)
	})
}

// joinIDs lists 0-based indices (atoms, environments, signals) as the
// 1-based numbers people read, as the web page shows them.
func joinIDs(a []int) string {
	s := make([]string, len(a))
	for i, x := range a {
		s[i] = fmt.Sprint(x + 1)
	}
	return strings.Join(s, ",")
}

// writeSearch lists the constraints read from the spectrum and the
// readings searched.
func writeSearch(w io.Writer, s *ranker.SearchReport) {
	if len(s.Constraints) > 0 {
		fmt.Fprintln(w, "\nconstraints read from the spectrum (switch one off with --disable ID):")
		for _, c := range s.Constraints {
			state := ""
			if !c.Enabled {
				state = " [off]"
			}
			for _, l := range wrapText(c.Reason+state, lineWidth, fmt.Sprintf("  %-28s ", c.ID), strings.Repeat(" ", 31)) {
				fmt.Fprintln(w, l)
			}
		}
	}
	if s.EstimatedNodes > 0 {
		fit := "within the node budget of " + approx(float64(s.NodeBudget))
		if s.EstimatedNodes > s.NodeBudget {
			fit = "more than the node budget of " + approx(float64(s.NodeBudget)) + ": expect a stop"
		}
		structures := "about " + approx(float64(s.EstimatedStructures))
		if s.EstimatedStructures == 0 {
			structures = "too rare for the probes to count"
		}
		where := "in the strict readings"
		if s.Scope == ranker.ScopeAll {
			where = "over all isomers"
		}
		text := fmt.Sprintf("estimated before the run (Knuth's method, rough): about %s search nodes %s, %s; structures: %s",
			approx(float64(s.EstimatedNodes)), where, fit, structures)
		for _, l := range wrapText(text, lineWidth, "", "    ") {
			fmt.Fprintln(w, l)
		}
	}
	if len(s.Readings) > 0 {
		fmt.Fprintln(w, "readings searched, most plausible first (structures found; estimated structures/nodes):")
		for i, r := range s.Readings {
			est := "–"
			if e := r.Estimate; e != nil {
				est = approx(e.Structures) + "/" + approx(e.Nodes)
				if e.Structures == 0 && !e.Exact {
					est = "?/" + approx(e.Nodes)
				}
			}
			fmt.Fprintf(w, "  %2d. %-19s %6d  %-11s %s\n", i+1, r.State, r.Structures, est, r.Name)
		}
	}
	for _, n := range s.Notes {
		fmt.Fprintf(w, "note: %s\n", n)
	}
}

// approx writes an estimate with two significant digits ("~0", "48",
// "3.1k", "27M").
func approx(x float64) string {
	switch {
	case x < 0.5:
		return "~0"
	case x < 100:
		return fmt.Sprintf("%.0f", x)
	case x < 1e3:
		return fmt.Sprintf("%.0f", math.Round(x/10)*10)
	case x < 1e4:
		return fmt.Sprintf("%.1fk", x/1e3)
	case x < 1e6:
		return fmt.Sprintf("%.0fk", x/1e3)
	case x < 1e7:
		return fmt.Sprintf("%.1fM", x/1e6)
	case x < 1e9:
		return fmt.Sprintf("%.0fM", x/1e6)
	}
	return fmt.Sprintf("%.1fG", x/1e9)
}

// rankHelp is the help page of rank.
func rankHelp() helpPage {
	return helpPage{
		name:     "rank",
		synopsis: []string{"shiftrank rank --formula FORMULA --peaks TEXT|@FILE|- [--carbon TEXT|@FILE] [flags]"},
		about: `Ranks the constitutional isomers of FORMULA by how well their predicted spectra explain the
observed 1H peak list (and a 13C list, when given). The result is a hypothesis to be confirmed
against an authentic sample or further spectra.

Human output numbers peaks, environments, signals and atoms from 1 (atoms in SMILES order), as the
web page does; --json keeps the 0-based indices of the API.`,
		sections: []helpSection{{"Peak lists (--peaks, --carbon)", `  journal text  1H NMR (400 MHz, CDCl3) δ 4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H),
                1.26 (t, J = 7.1 Hz, 3H) — the header is optional (MHz and solvent are read
                from it); a range is written 3.62–3.55 (m, 2H); a "13C NMR ... δ" section
                after a ";" is the 13C list
  JSON          [{"shift": 4.12, "multiplicity": "q", "j": [7.1], "integral": 2},
                 {"range": [7.35, 7.20], "multiplicity": "m", "integral": 5}]
                or {"nucleus": "13C", "mhz": 101, "peaks": [...]}, or a list of such objects
  JCAMP-DX      a .jdx file with peak tables (##PEAK TABLE= or ##PEAK ASSIGNMENTS=); each block's
                ##.OBSERVE NUCLEUS= (^1H or ^13C) says which list it is
  --carbon      a 13C list: 171.4 (C), 60.5 (CH2), 21.0 (CH3), 14.2 (CH3) — shifts in ppm, each with
                an optional DEPT class (C, CH, CH2, CH3) and carbon count ("129.3 (2C, CH)")`}},
		examples: []string{
			`shiftrank rank --formula C4H8O2 --peaks '4.12 (q, J = 7.1 Hz, 2H), 2.05 (s, 3H), 1.26 (t, 3H)'`,
			`shiftrank rank --formula C9H10O2 --peaks @NB-2291-07.txt --carbon @NB-2291-07-13C.txt --top 10`,
			`shiftrank rank --formula C9H10O2 --peaks @NB-2291-07.jdx --json > NB-2291-07.json`,
			`cat NB-2291-12.txt | shiftrank rank --formula C5H10O --peaks - --require 'C=O' --top 3`,
		},
	}
}
