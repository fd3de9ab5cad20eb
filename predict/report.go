package predict

import (
	"slices"

	"shiftrank/molecule"
)

// Caution accompanies every prediction shown to a user.
const Caution = "Predicted values are estimates from additive increment tables; confirm structures against an " +
	"authentic sample or further spectra. Not for forensic, clinical or safety decisions on its own."

// Report is the JSON document of one prediction, shared by the predict
// command (--json) and the service's POST /v1/predict. Atom numbers are
// 0-based indices of the heavy atoms in the order written in SMILES.
type Report struct {
	SMILES          string              `json:"smiles"`
	CanonicalSMILES string              `json:"canonical_smiles"`
	Formula         string              `json:"formula"`
	MHz             float64             `json:"mhz"`
	Environments    []ReportEnvironment `json:"environments"`
	Notes           []string            `json:"notes,omitempty"`
	Caution         string              `json:"caution"`
}

// ReportEnvironment is one set of equivalent hydrogens with its predicted
// signal: shift and sigma in ppm, J in Hz. Neighbours lists the
// environments it is resolved-coupled to; Couplings every coupling.
type ReportEnvironment struct {
	ID             int       `json:"id"`
	Atoms          []int     `json:"atoms"`
	H              int       `json:"h"`
	Kind           string    `json:"kind"`
	Shift          float64   `json:"shift"`
	Sigma          float64   `json:"sigma"`
	ShiftMin       float64   `json:"shift_min"`
	ShiftMax       float64   `json:"shift_max"`
	Multiplicity   string    `json:"multiplicity"`
	J              []float64 `json:"j"`
	Exchangeable   bool      `json:"exchangeable"`
	Diastereotopic bool      `json:"diastereotopic"`
	// SlowExchangeH: see Environment.SlowExchangeH.
	SlowExchangeH int `json:"slow_exchange_h,omitempty"`
	// LongRangeH: see Environment.LongRangeH.
	LongRangeH int              `json:"long_range_h,omitempty"`
	Neighbours []int            `json:"neighbours"`
	Couplings  []ReportCoupling `json:"couplings"`
	Breakdown  []Term           `json:"breakdown"`
	Reasons    []string         `json:"reasons"`
}

// ReportCoupling is one coupling of an environment's hydrogen: Env is the
// coupled environment's id (-1 for a heteronucleus named by Nucleus), J in
// Hz.
type ReportCoupling struct {
	Env      int     `json:"env"`
	N        int     `json:"n"`
	J        float64 `json:"j"`
	Label    string  `json:"label"`
	Nucleus  string  `json:"nucleus,omitempty"`
	Resolved bool    `json:"resolved"`
	Atoms    []int   `json:"atoms"`
}

// NewReport builds the Report of spectrum s, predicted for graph g (parsed
// from smiles) at mhz MHz. Empty lists are written as [] rather than null.
func NewReport(smiles string, g *molecule.Graph, mhz float64, s *Spectrum) Report {
	out := Report{
		SMILES:          smiles,
		CanonicalSMILES: molecule.CanonicalSMILES(g),
		Formula:         g.Formula().String(),
		MHz:             mhz,
		Environments:    make([]ReportEnvironment, 0, len(s.Environments)),
		Notes:           s.Notes,
		Caution:         Caution,
	}
	for _, e := range s.Environments {
		re := ReportEnvironment{
			ID: e.ID, Atoms: e.Atoms, H: e.H, Kind: e.Kind,
			Shift: e.Shift, Sigma: e.Sigma, ShiftMin: e.ShiftMin, ShiftMax: e.ShiftMax,
			Multiplicity: e.Multiplicity, J: e.J, Exchangeable: e.Exchangeable, Diastereotopic: e.Diastereotopic, SlowExchangeH: e.SlowExchangeH, LongRangeH: e.LongRangeH,
			Neighbours: []int{}, Couplings: []ReportCoupling{}, Breakdown: e.Breakdown, Reasons: e.Reasons,
		}
		if re.J == nil {
			re.J = []float64{}
		}
		if re.Breakdown == nil {
			re.Breakdown = []Term{}
		}
		if re.Reasons == nil {
			re.Reasons = []string{}
		}
		for _, c := range e.Couplings {
			re.Couplings = append(re.Couplings, ReportCoupling{Env: c.Env, N: c.N, J: c.J, Label: c.Label, Nucleus: c.Nucleus, Resolved: c.Resolved, Atoms: c.Atoms})
			if c.Resolved && c.Env >= 0 && !slices.Contains(re.Neighbours, c.Env) {
				re.Neighbours = append(re.Neighbours, c.Env)
			}
		}
		out.Environments = append(out.Environments, re)
	}
	return out
}
