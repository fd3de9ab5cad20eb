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

// runPredict predicts the 1H spectrum of one SMILES:
//
//	shiftrank predict SMILES [--mhz 400] [--linewidth 1.0] [--json]
//
// The human table lists each environment (δ, σ, H count, multiplicity with
// J, the neighbouring environments that split it, and the shift
// breakdown); --json writes the same as one JSON object. Bad SMILES or an
// unsupported element is bad input (exit status 2).
func runPredict(ctx context.Context, args []string, e env) error {
	fs := flag.NewFlagSet("predict", flag.ContinueOnError)
	fs.SetOutput(e.stderr)
	mhz := fs.Float64("mhz", predict.DefaultMHz, "spectrometer 1H frequency in MHz")
	lw := fs.Float64("linewidth", predict.DefaultLineWidthHz, "line width in Hz (couplings below it are unresolved)")
	asJSON := fs.Bool("json", false, "write JSON instead of a table")
	fs.Usage = func() {
		fmt.Fprintln(e.stderr, "usage: shiftrank predict SMILES [--mhz 400] [--linewidth 1.0] [--json]")
		fs.PrintDefaults()
	}
	positional, help, err := parseInterspersed(fs, args)
	if help || err != nil {
		return err
	}
	if len(positional) != 1 {
		fs.Usage()
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
	out := predict.NewReport(smi, g, *mhz, sp)
	if *asJSON {
		enc := json.NewEncoder(e.stdout)
		enc.SetIndent("", "  ")
		return enc.Encode(out)
	}
	return writePredictTable(e.stdout, out)
}

func writePredictTable(w io.Writer, out predict.Report) error {
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
				parts[i] = fmt.Sprint(n)
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
		fmt.Fprintf(bw, "%-4d %-13s %-5.2f %-3d %-24s %-11s %s, atoms %v\n", en.ID, shift, en.Sigma, en.H, mult, by, kind, en.Atoms)
		if len(en.Breakdown) > 0 {
			parts := make([]string, len(en.Breakdown))
			sum := 0.0
			for i, t := range en.Breakdown {
				sum += t.PPM
				if i == 0 {
					parts[i] = fmt.Sprintf("%s %.2f", t.Term, t.PPM)
				} else {
					parts[i] = fmt.Sprintf("%s %+.2f", t.Term, t.PPM)
				}
			}
			fmt.Fprintf(bw, "     = %s", strings.Join(parts, "; "))
			if math.Abs(sum-en.Shift) > 0.005 {
				fmt.Fprintf(bw, " (sum %.2f)", sum)
			}
			fmt.Fprintln(bw)
		}
		for _, r := range en.Reasons {
			fmt.Fprintf(bw, "     · %s\n", r)
		}
	}
	for _, n := range out.Notes {
		fmt.Fprintf(bw, "\nnote: %s\n", n)
	}
	fmt.Fprintf(bw, "\n%s\n", out.Caution)
	return bw.Flush()
}
