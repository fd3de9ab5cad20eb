package spectrum

import (
	"math"
	"sort"
	"strings"
	"unicode"
)

// Canonical solvent names returned by CanonicalSolvent and stored in
// PeakList.Solvent.
const (
	SolventCDCl3   = "CDCl3"
	SolventDMSO    = "DMSO-d6"
	SolventAcetone = "acetone-d6"
	SolventCD3OD   = "CD3OD"
	SolventD2O     = "D2O"
	SolventC6D6    = "C6D6"
	SolventCD3CN   = "CD3CN"
	SolventCD2Cl2  = "CD2Cl2"
)

// solventAliases maps a solvent spelling, reduced by solventKey (lower
// case, letters and digits only), to its canonical name. The spellings are
// those in common use in experimental sections.
var solventAliases = map[string]string{
	"cdcl3": SolventCDCl3, "chloroformd": SolventCDCl3, "chloroformd1": SolventCDCl3,
	"dchloroform": SolventCDCl3, "d1chloroform": SolventCDCl3, "deuterochloroform": SolventCDCl3,
	"deuteriochloroform": SolventCDCl3, "chloroform": SolventCDCl3,

	"dmsod6": SolventDMSO, "d6dmso": SolventDMSO, "dmso": SolventDMSO, "cd32so": SolventDMSO,
	"dimethylsulfoxided6": SolventDMSO, "dimethylsulphoxided6": SolventDMSO,
	"d6dimethylsulfoxide": SolventDMSO, "dmsod": SolventDMSO,

	"acetoned6": SolventAcetone, "d6acetone": SolventAcetone, "acetone": SolventAcetone,
	"cd32co": SolventAcetone, "acetoned": SolventAcetone,

	"cd3od": SolventCD3OD, "methanold4": SolventCD3OD, "d4methanol": SolventCD3OD,
	"meod": SolventCD3OD, "meodd4": SolventCD3OD, "methanold": SolventCD3OD,
	"cd3oh": SolventCD3OD, "methanol": SolventCD3OD,

	"d2o": SolventD2O, "deuteriumoxide": SolventD2O, "water-d2": SolventD2O, "waterd2": SolventD2O,

	"c6d6": SolventC6D6, "benzened6": SolventC6D6, "d6benzene": SolventC6D6, "benzene": SolventC6D6,

	"cd3cn": SolventCD3CN, "acetonitriled3": SolventCD3CN, "d3acetonitrile": SolventCD3CN,
	"acetonitrile": SolventCD3CN,

	"cd2cl2": SolventCD2Cl2, "dichloromethaned2": SolventCD2Cl2, "d2dichloromethane": SolventCD2Cl2,
	"methylenechlorided2": SolventCD2Cl2, "d2methylenechloride": SolventCD2Cl2,
}

// solventKey reduces a solvent spelling to lower-case letters and digits,
// with subscript digits read as digits: "[D6]DMSO" → "d6dmso",
// "CDCl₃" → "cdcl3".
func solventKey(s string) string {
	var b strings.Builder
	for _, r := range s {
		switch {
		case r >= '₀' && r <= '₉':
			b.WriteRune('0' + (r - '₀'))
		case r < 128 && (unicode.IsLetter(r) || unicode.IsDigit(r)):
			b.WriteRune(unicode.ToLower(r))
		}
	}
	return b.String()
}

// CanonicalSolvent returns the canonical name of a deuterated NMR solvent
// written in any common spelling ("chloroform-d", "[D6]DMSO", "d6-DMSO",
// "methanol-d4", "C6D6", ...), and false if the name is not recognised.
// Case, spaces, brackets, hyphens and subscript digits do not matter. The
// recognised solvents are CDCl3, DMSO-d6, acetone-d6, CD3OD, D2O, C6D6,
// CD3CN and CD2Cl2.
func CanonicalSolvent(name string) (string, bool) {
	c, ok := solventAliases[solventKey(name)]
	return c, ok
}

// SolventSignal is a known signal of an NMR solvent: the residual
// protio-solvent peak (1H) or the solvent's own carbons (13C), dissolved
// water (1H), or the TMS reference.
type SolventSignal struct {
	Solvent      string       // canonical solvent name
	Nucleus      Nucleus      // 1H or 13C
	Kind         string       // "residual", "water" or "reference"
	Name         string       // the species: "CHCl3", "H2O", "HOD", "TMS", ...
	Shift        float64      // ppm
	Multiplicity Multiplicity // as observed: s, quint (CHD2 groups), br s; 13C: the C–D splitting
	Tolerance    float64      // ppm: a peak this close to Shift is flagged
}

// Tolerances for FlagSolvent, ppm. The residual and TMS signals are sharp
// and reproducible to about ±0.01 ppm; the water signal moves with
// concentration, temperature and hydrogen bonding by up to about 0.1 ppm
// (Gottlieb, Kotlyar, Nudelman, J. Org. Chem. 1997, 62, 7512, discussion
// of the water signal; from memory).
//
// 13C solvent signals are referenced inconsistently: CDCl3 is set to
// 77.16 (Gottlieb et al. 1997) or to the older 77.0 (common practice), so
// a 13C solvent peak is flagged within 0.2 ppm.
const (
	residualTolerance      = 0.03
	waterTolerance         = 0.10
	carbonSolventTolerance = 0.2
)

// solventTable lists the residual and water signals of each solvent:
// Gottlieb, H. E.; Kotlyar, V.; Nudelman, A. "NMR Chemical Shifts of Common
// Laboratory Solvents as Trace Impurities", J. Org. Chem. 1997, 62,
// 7512–7515, Table 1 (1H). Values from memory. TMS is at 0.00 ppm by
// definition in the organic solvents; in D2O the reference is DSS or TSP
// at 0.00 (common practice).
var solventTable = map[string][]SolventSignal{
	SolventCDCl3: {
		{Kind: "residual", Name: "CHCl3", Shift: 7.26, Multiplicity: Singlet()},
		{Kind: "water", Name: "H2O", Shift: 1.56, Multiplicity: Singlet()},
		{Kind: "reference", Name: "TMS", Shift: 0.00, Multiplicity: Singlet()},
	},
	SolventDMSO: {
		{Kind: "residual", Name: "DMSO-d5", Shift: 2.50, Multiplicity: Split(5)},
		{Kind: "water", Name: "H2O", Shift: 3.33, Multiplicity: Singlet()},
		{Kind: "reference", Name: "TMS", Shift: 0.00, Multiplicity: Singlet()},
	},
	SolventAcetone: {
		{Kind: "residual", Name: "acetone-d5", Shift: 2.05, Multiplicity: Split(5)},
		{Kind: "water", Name: "H2O", Shift: 2.84, Multiplicity: Singlet()},
		{Kind: "reference", Name: "TMS", Shift: 0.00, Multiplicity: Singlet()},
	},
	SolventCD3OD: {
		{Kind: "residual", Name: "CHD2OD", Shift: 3.31, Multiplicity: Split(5)},
		// The solvent OH (CD3OH/HOD exchange) and dissolved water give one
		// signal at 4.87.
		{Kind: "water", Name: "H2O/OH", Shift: 4.87, Multiplicity: Singlet()},
		{Kind: "reference", Name: "TMS", Shift: 0.00, Multiplicity: Singlet()},
	},
	SolventD2O: {
		{Kind: "water", Name: "HOD", Shift: 4.79, Multiplicity: Singlet()},
		{Kind: "reference", Name: "DSS", Shift: 0.00, Multiplicity: Singlet()},
	},
	SolventC6D6: {
		{Kind: "residual", Name: "C6D5H", Shift: 7.16, Multiplicity: Singlet()},
		{Kind: "water", Name: "H2O", Shift: 0.40, Multiplicity: Singlet()},
		{Kind: "reference", Name: "TMS", Shift: 0.00, Multiplicity: Singlet()},
	},
	SolventCD3CN: {
		{Kind: "residual", Name: "CHD2CN", Shift: 1.94, Multiplicity: Split(5)},
		{Kind: "water", Name: "H2O", Shift: 2.13, Multiplicity: Singlet()},
		{Kind: "reference", Name: "TMS", Shift: 0.00, Multiplicity: Singlet()},
	},
	SolventCD2Cl2: {
		{Kind: "residual", Name: "CHDCl2", Shift: 5.32, Multiplicity: Split(3)},
		{Kind: "water", Name: "H2O", Shift: 1.52, Multiplicity: Singlet()},
		{Kind: "reference", Name: "TMS", Shift: 0.00, Multiplicity: Singlet()},
	},
}

// carbonSolventTable lists the 13C signals of each solvent: Gottlieb,
// Kotlyar, Nudelman, J. Org. Chem. 1997, 62, 7512, Table 2 (13C), and for
// CD2Cl2 Fulmer, Miller, Sherden, Gottlieb, Nudelman, Stoltz, Bercaw,
// Goldberg, Organometallics 2010, 29, 2176, Table 2. Values from memory.
// The splitting is by deuterium (spin 1: 2n + 1 lines for n equivalent D):
// CDCl3 and C6D6 triplets, CD2Cl2 a quintet, CD3 groups septets; the
// carbonyl of acetone-d6 and the nitrile carbon of CD3CN show no resolved
// splitting. D2O has no carbon. TMS is at 0.00 by definition in the
// organic solvents (common practice).
var carbonSolventTable = map[string][]SolventSignal{
	SolventCDCl3: {
		{Kind: "residual", Name: "CDCl3", Shift: 77.16, Multiplicity: Split(3)},
		{Kind: "reference", Name: "TMS", Shift: 0.00, Multiplicity: Singlet()},
	},
	SolventDMSO: {
		{Kind: "residual", Name: "DMSO-d6", Shift: 39.52, Multiplicity: Split(7)},
		{Kind: "reference", Name: "TMS", Shift: 0.00, Multiplicity: Singlet()},
	},
	SolventAcetone: {
		{Kind: "residual", Name: "acetone-d6 CO", Shift: 206.26, Multiplicity: Singlet()},
		{Kind: "residual", Name: "acetone-d6 CD3", Shift: 29.84, Multiplicity: Split(7)},
		{Kind: "reference", Name: "TMS", Shift: 0.00, Multiplicity: Singlet()},
	},
	SolventCD3OD: {
		{Kind: "residual", Name: "CD3OD", Shift: 49.00, Multiplicity: Split(7)},
		{Kind: "reference", Name: "TMS", Shift: 0.00, Multiplicity: Singlet()},
	},
	SolventD2O: {},
	SolventC6D6: {
		{Kind: "residual", Name: "C6D6", Shift: 128.06, Multiplicity: Split(3)},
		{Kind: "reference", Name: "TMS", Shift: 0.00, Multiplicity: Singlet()},
	},
	SolventCD3CN: {
		{Kind: "residual", Name: "CD3CN CN", Shift: 118.26, Multiplicity: Singlet()},
		{Kind: "residual", Name: "CD3CN CD3", Shift: 1.32, Multiplicity: Split(7)},
		{Kind: "reference", Name: "TMS", Shift: 0.00, Multiplicity: Singlet()},
	},
	SolventCD2Cl2: {
		{Kind: "residual", Name: "CD2Cl2", Shift: 53.84, Multiplicity: Split(5)},
		{Kind: "reference", Name: "TMS", Shift: 0.00, Multiplicity: Singlet()},
	},
}

// Solvents returns the canonical names of the solvents SolventPeaks knows,
// sorted.
func Solvents() []string {
	names := make([]string, 0, len(solventTable))
	for n := range solventTable {
		names = append(names, n)
	}
	sort.Strings(names)
	return names
}

// SolventPeaks returns the signals of a solvent (any spelling
// CanonicalSolvent accepts) in spectra of nucleus n: for 1H the residual,
// water and reference signals (Gottlieb, Kotlyar, Nudelman, J. Org. Chem.
// 1997, 62, 7512, Table 1), for 13C the solvent and reference signals
// (Table 2 there; Fulmer et al., Organometallics 2010, 29, 2176 for
// CD2Cl2); values from memory. It returns nil for an unknown solvent and
// an empty slice for a solvent without signals of n (D2O in 13C). The
// result is a fresh slice.
func SolventPeaks(solvent string, n Nucleus) []SolventSignal {
	c, ok := CanonicalSolvent(solvent)
	if !ok {
		return nil
	}
	src := solventTable[c]
	if n == C13 {
		src = carbonSolventTable[c]
	}
	out := make([]SolventSignal, len(src))
	for i, s := range src {
		s.Solvent, s.Nucleus = c, n
		switch {
		case n == C13:
			s.Tolerance = carbonSolventTolerance
		case s.Kind == "water":
			s.Tolerance = waterTolerance
		default:
			s.Tolerance = residualTolerance
		}
		out[i] = s
	}
	return out
}

// PeakFlag marks an observed peak that matches a solvent signal.
type PeakFlag struct {
	Peak   int           // index in PeakList.Peaks
	Signal SolventSignal // the matching signal
	Delta  float64       // observed shift minus Signal.Shift, ppm
	// Exclude is true when the peak is taken to be the solvent signal
	// itself: a single shift within Signal.Tolerance whose multiplicity
	// (if given) fits; for water further than residualTolerance from the
	// tabulated shift, only a broad or unreported multiplicity or a peak
	// without an integral. It is false when the signal merely lies inside
	// a reported range or a multiplet of the compound, or may be the
	// compound's own sharp singlet, so that the peak's integral may
	// include it.
	Exclude bool
}

// FlagSolvent returns a flag for each peak of pl that matches a residual,
// water or reference signal of solvent (any spelling CanonicalSolvent
// accepts; "" means pl.Solvent) for the list's nucleus. A peak is flagged for the closest
// matching signal only. The result is nil for an unknown or empty
// solvent, and ordered by peak index. Scoring leaves out the peaks whose
// flag has Exclude set unless the user keeps them.
func FlagSolvent(pl PeakList, solvent string) []PeakFlag {
	if solvent == "" {
		solvent = pl.Solvent
	}
	signals := SolventPeaks(solvent, pl.Nucleus)
	var flags []PeakFlag
	for i, p := range pl.Peaks {
		best := -1
		var bestFlag PeakFlag
		for _, sig := range signals {
			f := PeakFlag{Peak: i, Signal: sig, Delta: p.Shift - sig.Shift}
			switch {
			case !p.IsRange() && math.Abs(f.Delta) <= sig.Tolerance && fitsSignal(p.Multiplicity, sig):
				// Water wanders, so its window is wide; a sharp singlet
				// with an integral away from the tabulated shift may be
				// the compound's (a methoxy group near water in DMSO-d6):
				// flag it without leaving it out.
				f.Exclude = sig.Kind != "water" || math.Abs(f.Delta) <= residualTolerance ||
					p.Integral == 0 || p.Multiplicity.Code() != "s"
			case p.ShiftLo-sig.Tolerance <= sig.Shift && sig.Shift <= p.ShiftHi+sig.Tolerance:
				// Inside a range, or near a peak of another multiplicity.
			default:
				continue
			}
			// Prefer an excluding match, then the closest one.
			rank := 0
			if f.Exclude {
				rank = 1
			}
			if best < 0 || rank > best || rank == best && math.Abs(f.Delta) < math.Abs(bestFlag.Delta) {
				best, bestFlag = rank, f
			}
		}
		if best >= 0 {
			flags = append(flags, bestFlag)
		}
	}
	return flags
}

// fitsSignal reports whether an observed multiplicity is consistent with a
// solvent signal: not reported, a singlet (residual CHD2 quintets are
// often reported as s or m at low resolution), or the signal's own pattern.
func fitsSignal(m Multiplicity, sig SolventSignal) bool {
	switch code := m.Code(); code {
	case "", "s", "br s":
		return true
	case sig.Multiplicity.Code():
		return true
	case "m":
		return sig.Kind == "residual" && !sig.Multiplicity.IsSinglet()
	}
	return false
}

// ExcludeFlagged returns pl without the peaks whose flag has Exclude set,
// and for each kept peak its index in pl.Peaks.
func ExcludeFlagged(pl PeakList, flags []PeakFlag) (PeakList, []int) {
	drop := make(map[int]bool, len(flags))
	for _, f := range flags {
		if f.Exclude {
			drop[f.Peak] = true
		}
	}
	out := PeakList{Nucleus: pl.Nucleus, MHz: pl.MHz, Solvent: pl.Solvent, Pos: pl.Pos}
	var idx []int
	for i, p := range pl.Peaks {
		if !drop[i] {
			out.Peaks = append(out.Peaks, p)
			idx = append(idx, i)
		}
	}
	return out, idx
}
