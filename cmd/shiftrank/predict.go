package main

import (
	"bufio"
	"context"
	"encoding/json"
	"flag"
	"fmt"
	"io"
	"math"
	"strings"

	"shiftrank/molecule"
	"shiftrank/predict"
)

// runPredict predicts the 1H and 13C spectra of one SMILES:
//
//	shiftrank predict SMILES [--mhz 400] [--linewidth 1.0] [--json]
//
// The human table lists each 1H environment (δ, σ, H count, multiplicity
// with J, the neighbouring environments that split it, and the shift
// breakdown), then each 13C signal (δ, σ, CH_n class, number of
// equivalent carbons, kind and atoms, and the shift breakdown); --json
// writes the same as one JSON object, the 13C signals under "carbon".
// Bad SMILES or an unsupported element is bad input (exit status 2).
func runPredict(ctx context.Context, args []string, e env) error {
	fs := flag.NewFlagSet("predict", flag.ContinueOnError)
	mhz := fs.Float64("mhz", predict.DefaultMHz, "spectrometer 1H frequency in MHz")
	lw := fs.Float64("linewidth", predict.DefaultLineWidthHz, "line width in Hz (couplings below it are unresolved)")
	asJSON := fs.Bool("json", false, "write JSON instead of a table")
	page := predictHelp()
	positional, help, err := parseArgs(fs, args, page, e)
	if help || err != nil {
		return err
	}
	if len(positional) != 1 {
		page.writeShort(e.stderr)
		if len(positional) == 0 {
			return badInputf("predict: missing SMILES")
		}
		return badInputf("predict: expected one SMILES, got %d arguments", len(positional))
	}
	if !(*mhz >= 20 && *mhz <= 2000) {
		return badInputf("predict: --mhz must be between 20 and 2000, got %g", *mhz)
	}
	if !(*lw > 0 && *lw <= 100) {
		return badInputf("predict: --linewidth must be above 0 and at most 100 Hz, got %g", *lw)
	}
	smi := positional[0]
	g, err := molecule.ParseSMILES(smi)
	if err != nil {
		return badInput(err)
	}
	p := predict.New(predict.Options{MHz: *mhz, LineWidthHz: *lw, Explain: true})
	sp, err := p.Predict(g)
	if err != nil {
		return badInput(fmt.Errorf("predict %q: %w", smi, err))
	}
	csp, err := p.Carbon(g)
	if err != nil {
		return badInput(fmt.Errorf("predict 13C of %q: %w", smi, err))
	}
	out := predictOutput{Report: predict.NewReport(smi, g, *mhz, sp), Carbon: newCarbonReport(csp)}
	if *asJSON {
		enc := json.NewEncoder(e.stdout)
		enc.SetIndent("", "  ")
		return enc.Encode(out)
	}
	return writePredictTable(e.stdout, out)
}

// predictOutput is the predict command's JSON: the 1H report and the 13C
// prediction.
type predictOutput struct {
	predict.Report
	Carbon carbonReport `json:"carbon"`
}

// carbonReport is the predicted proton-decoupled 13C spectrum.
type carbonReport struct {
	Signals []carbonSignal `json:"signals"`
	Notes   []string       `json:"notes,omitempty"`
}

// carbonSignal is one predicted 13C line: a set of equivalent carbons
// (atom indices in SMILES order), shift and σ in ppm, CH_n class ("C",
// "CH", "CH2", "CH3").
type carbonSignal struct {
	ID        int            `json:"id"`
	Atoms     []int          `json:"atoms"`
	Carbons   int            `json:"carbons"`
	Class     string         `json:"class"`
	Kind      string         `json:"kind"`
	Shift     float64        `json:"shift"`
	Sigma     float64        `json:"sigma"`
	Breakdown []predict.Term `json:"breakdown"`
	Reasons   []string       `json:"reasons"`
}

func newCarbonReport(sp *predict.CarbonSpectrum) carbonReport {
	out := carbonReport{Signals: make([]carbonSignal, 0, len(sp.Signals)), Notes: sp.Notes}
	for _, s := range sp.Signals {
		cs := carbonSignal{ID: s.ID, Atoms: s.Atoms, Carbons: len(s.Atoms), Class: s.Class.String(), Kind: s.Kind,
			Shift: s.Shift, Sigma: s.Sigma, Breakdown: s.Breakdown, Reasons: s.Reasons}
		if cs.Breakdown == nil {
			cs.Breakdown = []predict.Term{}
		}
		if cs.Reasons == nil {
			cs.Reasons = []string{}
		}
		out.Signals = append(out.Signals, cs)
	}
	return out
}

func writePredictTable(w io.Writer, out predictOutput) error {
	bw := bufio.NewWriter(w)
	fmt.Fprintf(bw, "%s  (%s, canonical %s)  predicted 1H NMR at %g MHz\n\n", out.SMILES, out.Formula, out.CanonicalSMILES, out.MHz)
	if len(out.Environments) == 0 {
		fmt.Fprintln(bw, "no hydrogens")
	}
	fmt.Fprintf(bw, "%-4s %-13s %-5s %-3s %-24s %-11s %s\n", "env", "δ/ppm", "σ", "H", "multiplicity (J/Hz)", "split by", "kind, atoms")
	for _, en := range out.Environments {
		shift := fmt.Sprintf("%.2f", en.Shift)
		if en.ShiftMax-en.ShiftMin > 0.005 {
			shift = fmt.Sprintf("%.2f (%.1f–%.1f)", en.Shift, en.ShiftMin, en.ShiftMax)
			if en.ShiftMax-en.ShiftMin < 1 {
				shift = fmt.Sprintf("%.2f (%.2f–%.2f)", en.Shift, en.ShiftMin, en.ShiftMax)
			}
		}
		mult := en.Multiplicity
		if len(en.J) > 0 {
			js := make([]string, len(en.J))
			for i, v := range en.J {
				js[i] = fmt.Sprintf("%.1f", v)
			}
			mult += " (" + strings.Join(js, ", ") + ")"
		}
		by := "–"
		if len(en.Neighbours) > 0 {
			parts := make([]string, len(en.Neighbours))
			for i, n := range en.Neighbours {
				parts[i] = fmt.Sprint(n + 1)
			}
			by = strings.Join(parts, ",")
		}
		for _, c := range en.Couplings {
			if c.Resolved && c.Env < 0 && !strings.Contains(by, c.Nucleus) {
				if by == "–" {
					by = c.Nucleus
				} else {
					by += "," + c.Nucleus
				}
			}
		}
		kind := en.Kind
		if en.Diastereotopic {
			kind += ", diastereotopic"
		}
		fmt.Fprintf(bw, "%-4d %-13s %-5.2f %-3d %-24s %-11s %s, atoms %s\n", en.ID+1, shift, en.Sigma, en.H, mult, by, kind, joinIDs(en.Atoms))
		writeBreakdown(bw, en.Breakdown, en.Shift, 2)
		for _, r := range en.Reasons {
			fmt.Fprintf(bw, "     · %s\n", renumberAtoms(r))
		}
	}
	for _, n := range out.Notes {
		fmt.Fprintf(bw, "\nnote: %s\n", n)
	}
	writeCarbonTable(bw, out.Carbon)
	fmt.Fprintf(bw, "\n%s\n", out.Caution)
	return bw.Flush()
}

// writeBreakdown prints a shift's increments on one line ("= base 1.30;
// α: OH +2.49") with digits decimals, and their sum when it differs from
// the shift by more than the last digit shown.
func writeBreakdown(w io.Writer, terms []predict.Term, shift float64, digits int) {
	if len(terms) == 0 {
		return
	}
	parts := make([]string, len(terms))
	sum := 0.0
	for i, t := range terms {
		sum += t.PPM
		if i == 0 {
			parts[i] = fmt.Sprintf("%s %.*f", t.Term, digits, t.PPM)
		} else {
			parts[i] = fmt.Sprintf("%s %+.*f", t.Term, digits, t.PPM)
		}
	}
	fmt.Fprintf(w, "     = %s", strings.Join(parts, "; "))
	if math.Abs(sum-shift) > 0.5*math.Pow(10, -float64(digits)) {
		fmt.Fprintf(w, " (sum %.*f)", digits, sum)
	}
	fmt.Fprintln(w)
}

// writeCarbonTable prints the predicted 13C signals after the 1H table.
func writeCarbonTable(w io.Writer, c carbonReport) {
	fmt.Fprintf(w, "\npredicted 13C NMR (proton-decoupled)\n\n")
	if len(c.Signals) == 0 {
		fmt.Fprintln(w, "no carbons")
		return
	}
	fmt.Fprintf(w, "%-4s %-7s %-5s %-5s %-3s %s\n", "sig", "δ/ppm", "σ", "class", "C", "kind, atoms")
	for _, s := range c.Signals {
		fmt.Fprintf(w, "%-4d %-7.1f %-5.1f %-5s %-3d %s, atoms %s\n", s.ID+1, s.Shift, s.Sigma, s.Class, s.Carbons, s.Kind, joinIDs(s.Atoms))
		writeBreakdown(w, s.Breakdown, s.Shift, 1)
		for _, r := range s.Reasons {
			fmt.Fprintf(w, "     · %s\n", renumberAtoms(r))
		}
	}
	for _, n := range c.Notes {
		fmt.Fprintf(w, "\nnote: %s\n", n)
	}
}

// predictHelp is the help page of predict.
func predictHelp() helpPage {
	return helpPage{
		name:     "predict",
		synopsis: []string{"shiftrank predict SMILES [--mhz 400] [--linewidth 1.0] [--json]"},
		about: `Predicts the 1H spectrum of one structure (each environment's shift, multiplicity with J and
the increments behind the shift), then its proton-decoupled 13C spectrum. Quote the SMILES for
the shell.`,
		examples: []string{
			"shiftrank predict 'CCOC(C)=O'",
			"shiftrank predict 'CC(=O)c1ccccc1' --mhz 600",
			"shiftrank predict 'OCC(C)C' --json > NB-2291-07-predicted.json",
		},
	}
}
