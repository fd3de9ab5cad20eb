package spectrum

import (
	"fmt"
	"math"
	"sort"
)

// Thresholds of ScaleIntegrals, in hydrogens.
const (
	// minorPeakH: a peak whose scaled integral stays below this is taken to
	// be an impurity, a satellite or noise rather than a signal of the
	// compound; it does not count as holding a hydrogen.
	minorPeakH = 0.4
	// poorFitRMS: above this rms difference (in H) between the scaled
	// integrals and their whole numbers the fit is reported as poor.
	// Routine integration is good to about ±10 % (common practice), which
	// keeps the rms of a sound list near or below 0.1 H.
	poorFitRMS = 0.15
	// wholeTolerance: integrals within this of whole numbers are read as
	// hydrogen counts the chemist has already scaled.
	wholeTolerance = 0.15
	// missingPenalty is added to the rms misfit for each hydrogen the fit
	// leaves unobserved, so that the full count wins unless a smaller one
	// fits clearly better.
	missingPenalty = 0.08
	// maxMissing is how many hydrogens (exchangeable OH, NH, COOH
	// broadened into the baseline or exchanged with D2O/CD3OD) the fit
	// may leave unobserved.
	maxMissing = 4
)

// ScaleIntegrals converts the relative integrals of pl into hydrogen
// counts for a formula with hTotal hydrogens. pl should already be
// without solvent peaks (see ExcludeFlagged).
//
// The scale is a least-squares fit. Peaks without an integral are set
// aside, each holding at least 1 H; peaks whose scaled integral stays
// below 0.4 H are minor (impurities, satellites) and do not constrain
// the fit. For each total T of the integrated peaks, from the hydrogens
// available down to four fewer (exchangeable OH, NH and COOH hydrogens are
// often not observed), the integrals are rounded to whole numbers of at
// least 1 H per peak summing to T and the scale is refitted by least
// squares to those whole numbers; the T with the smallest rms misfit plus
// a penalty of 0.08 H per unobserved hydrogen wins. When the integrals are
// already whole numbers their own total is preferred. implied[i] is the
// integral of peak i times the fitted scale (fractional hydrogens; 0 for a
// peak without an integral).
//
// Warnings are readable sentences: a total below hTotal ("integrals sum
// to 5.0 H of 6: one exchangeable H not observed?"), the hydrogens left to
// peaks without an integral, a poor fit (rms above 0.15 H), and minor
// peaks. If no peak has an integral, implied is all zeros with a warning.
//
// It returns a *PeakError (Field "nucleus") for a list that is not 1H, and
// (Field "integral") when the formula cannot hold
// the peaks: more peaks of at least about 1 H than hTotal. The error names
// the first peak in excess with its Pos and Text from the original input
// (Input is empty). hTotal < 1 is an error too.
func ScaleIntegrals(pl PeakList, hTotal int) (implied []float64, warnings []string, err error) {
	if pl.Nucleus != H1 {
		return nil, nil, &PeakError{Token: pl.Nucleus.String(), Field: "nucleus",
			Msg: "integrals are scaled for 1H lists only"}
	}
	implied = make([]float64, len(pl.Peaks))
	if hTotal < 1 {
		return nil, nil, &PeakError{Token: fmt.Sprint(hTotal), Field: "integral",
			Msg: "the formula has no hydrogens"}
	}
	var given []int
	var missing []string
	sum := 0.0
	for i, p := range pl.Peaks {
		if p.Integral > 0 {
			given = append(given, i)
			sum += p.Integral
		} else {
			missing = append(missing, peakNum(p.Shift))
		}
	}
	if len(given) == 0 {
		w := "no integrals given: hydrogen counts not checked"
		if len(pl.Peaks) > hTotal {
			w += fmt.Sprintf("; %d peaks for %d H, so some are impurities or a mixture", len(pl.Peaks), hTotal)
		}
		return implied, []string{w}, nil
	}

	// Separate minor peaks (impurities) from signals: iterate because the
	// scale depends on which peaks count.
	major := given
	for range 3 {
		msum := 0.0
		for _, i := range major {
			msum += pl.Peaks[i].Integral
		}
		s := float64(hTotal) / msum
		var next []int
		for _, i := range given {
			if pl.Peaks[i].Integral*s >= minorPeakH {
				next = append(next, i)
			}
		}
		if len(next) == len(major) || len(next) == 0 {
			break
		}
		major = next
	}
	// Each peak without an integral holds at least one hydrogen.
	hAvail := hTotal - len(missing)
	if len(major) > hAvail {
		p := pl.Peaks[major[max(hAvail, 0)]]
		return nil, nil, &PeakError{Pos: p.Pos, Token: p.Text, Field: "integral",
			Msg: fmt.Sprintf("%d peaks of at least 1 H but the formula has only %d H", len(major)+len(missing), hTotal)}
	}
	a := make([]float64, len(major))
	asum := 0.0
	whole := true // the integrals read as hydrogen counts already
	for k, i := range major {
		a[k] = pl.Peaks[i].Integral
		asum += a[k]
		whole = whole && math.Abs(a[k]-math.Round(a[k])) <= wholeTolerance
	}
	userT := -1
	if whole {
		userT = int(math.Round(asum))
	}

	bestT, bestScore, bestScale, bestRMS := 0, math.Inf(1), 0.0, 0.0
	for t := hAvail; t >= max(len(major), hAvail-maxMissing, 1); t-- {
		n := roundToSum(a, t)
		scale, rms := fitScale(a, n)
		score := rms + missingPenalty*float64(hAvail-t)
		if t == userT {
			// The chemist's own scale: no penalty, and it wins ties.
			score = rms - 0.01
		}
		if score < bestScore-1e-12 {
			bestT, bestScore, bestScale, bestRMS = t, score, scale, rms
		}
	}
	for _, i := range given {
		implied[i] = pl.Peaks[i].Integral * bestScale
	}
	total := 0.0
	for _, i := range major {
		total += implied[i]
	}
	if len(missing) > 0 {
		warnings = append(warnings, fmt.Sprintf("no integral for the peak(s) at %s ppm: they hold the remaining %.1f H",
			joinList(missing), float64(hTotal)-total))
	} else if bestT < hTotal {
		warnings = append(warnings, fmt.Sprintf("integrals sum to %.1f H of %d: %s exchangeable H not observed?",
			total, hTotal, countWord(hTotal-bestT)))
	}
	if bestRMS > poorFitRMS {
		warnings = append(warnings, fmt.Sprintf("integrals fit whole hydrogen counts poorly (rms %.2f H over %d H): check the integration or the formula",
			bestRMS, bestT))
	}
	var minor []string
	for _, i := range given {
		if implied[i] < minorPeakH {
			minor = append(minor, fmt.Sprintf("%s ppm (%.2f H)", peakNum(pl.Peaks[i].Shift), implied[i]))
		}
	}
	if len(minor) > 0 {
		warnings = append(warnings, fmt.Sprintf("minor peak(s) at %s: impurity, satellite or noise?", joinList(minor)))
	}
	return implied, warnings, nil
}

// roundToSum returns whole numbers n[i] >= 1 close to a[i]·T/Σa with
// Σn = T (T >= len(a)): round each, then move single hydrogens where the
// rounding error is largest.
func roundToSum(a []float64, t int) []int {
	sum := 0.0
	for _, v := range a {
		sum += v
	}
	x := make([]float64, len(a))
	n := make([]int, len(a))
	got := 0
	for i, v := range a {
		x[i] = v * float64(t) / sum
		n[i] = max(1, int(math.Floor(x[i]+0.5)))
		got += n[i]
	}
	order := make([]int, len(a))
	for ; got < t; got++ {
		for i := range order {
			order[i] = i
		}
		sort.SliceStable(order, func(p, q int) bool {
			return x[order[p]]-float64(n[order[p]]) > x[order[q]]-float64(n[order[q]])
		})
		n[order[0]]++
	}
	for ; got > t; got-- {
		k := -1
		for i := range n {
			if n[i] > 1 && (k < 0 || x[i]-float64(n[i]) < x[k]-float64(n[k])) {
				k = i
			}
		}
		if k < 0 {
			break
		}
		n[k]--
	}
	return n
}

// fitScale returns the least-squares scale s minimising Σ(a·s − n)² and
// the rms residual in hydrogens.
func fitScale(a []float64, n []int) (scale, rms float64) {
	num, den := 0.0, 0.0
	for i := range a {
		num += a[i] * float64(n[i])
		den += a[i] * a[i]
	}
	scale = num / den
	ss := 0.0
	for i := range a {
		d := a[i]*scale - float64(n[i])
		ss += d * d
	}
	return scale, math.Sqrt(ss / float64(len(a)))
}

func countWord(n int) string {
	words := []string{"no", "one", "two", "three", "four"}
	if n >= 0 && n < len(words) {
		return words[n]
	}
	return fmt.Sprint(n)
}

func joinList(items []string) string {
	out := ""
	for i, s := range items {
		if i > 0 {
			out += ", "
		}
		out += s
	}
	return out
}
