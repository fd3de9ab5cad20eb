package server

import (
	"slices"

	"shiftrank/molecule"
	"shiftrank/predict"
)

// PredictCaution accompanies every prediction the API returns.
const PredictCaution = "Predicted values are estimates from additive increment tables; confirm structures against an " +
	"authentic sample or further spectra. Not for forensic, clinical or safety decisions on its own."

// PredictOutput is the answer of POST /v1/predict, the same document as
// the predict command's JSON output. Atom numbers are 0-based indices of
// the heavy atoms in the order written in the submitted SMILES.
type PredictOutput struct {
	SMILES          string            `json:"smiles"`
	CanonicalSMILES string            `json:"canonical_smiles"`
	Formula         string            `json:"formula"`
	MHz             float64           `json:"mhz"`
	Environments    []EnvironmentJSON `json:"environments"`
	Notes           []string          `json:"notes,omitempty"`
	Caution         string            `json:"caution"`
}

// EnvironmentJSON is one set of equivalent hydrogens with its predicted
// signal: shift and sigma in ppm, J in Hz. Neighbours lists the
// environments it is resolved-coupled to; Couplings every coupling.
type EnvironmentJSON struct {
	ID             int            `json:"id"`
	Atoms          []int          `json:"atoms"`
	H              int            `json:"h"`
	Kind           string         `json:"kind"`
	Shift          float64        `json:"shift"`
	Sigma          float64        `json:"sigma"`
	ShiftMin       float64        `json:"shift_min"`
	ShiftMax       float64        `json:"shift_max"`
	Multiplicity   string         `json:"multiplicity"`
	J              []float64      `json:"j"`
	Exchangeable   bool           `json:"exchangeable"`
	Diastereotopic bool           `json:"diastereotopic"`
	Neighbours     []int          `json:"neighbours"`
	Couplings      []CouplingJSON `json:"couplings"`
	Breakdown      []predict.Term `json:"breakdown"`
	Reasons        []string       `json:"reasons"`
}

// CouplingJSON is one coupling of an environment's hydrogen: Env is the
// coupled environment's id (-1 for a heteronucleus named by Nucleus), J in
// Hz.
type CouplingJSON struct {
	Env      int     `json:"env"`
	N        int     `json:"n"`
	J        float64 `json:"j"`
	Label    string  `json:"label"`
	Nucleus  string  `json:"nucleus,omitempty"`
	Resolved bool    `json:"resolved"`
	Atoms    []int   `json:"atoms"`
}

func predictOutput(smiles string, g *molecule.Graph, mhz float64, s *predict.Spectrum) PredictOutput {
	out := PredictOutput{
		SMILES:          smiles,
		CanonicalSMILES: molecule.CanonicalSMILES(g),
		Formula:         g.Formula().String(),
		MHz:             mhz,
		Environments:    make([]EnvironmentJSON, 0, len(s.Environments)),
		Notes:           s.Notes,
		Caution:         PredictCaution,
	}
	for _, e := range s.Environments {
		ej := EnvironmentJSON{
			ID: e.ID, Atoms: e.Atoms, H: e.H, Kind: e.Kind,
			Shift: e.Shift, Sigma: e.Sigma, ShiftMin: e.ShiftMin, ShiftMax: e.ShiftMax,
			Multiplicity: e.Multiplicity, J: e.J, Exchangeable: e.Exchangeable, Diastereotopic: e.Diastereotopic,
			Neighbours: []int{}, Couplings: []CouplingJSON{}, Breakdown: e.Breakdown, Reasons: e.Reasons,
		}
		if ej.J == nil {
			ej.J = []float64{}
		}
		if ej.Breakdown == nil {
			ej.Breakdown = []predict.Term{}
		}
		if ej.Reasons == nil {
			ej.Reasons = []string{}
		}
		for _, c := range e.Couplings {
			ej.Couplings = append(ej.Couplings, CouplingJSON{Env: c.Env, N: c.N, J: c.J, Label: c.Label, Nucleus: c.Nucleus, Resolved: c.Resolved, Atoms: c.Atoms})
			if c.Resolved && c.Env >= 0 && !slices.Contains(ej.Neighbours, c.Env) {
				ej.Neighbours = append(ej.Neighbours, c.Env)
			}
		}
		out.Environments = append(out.Environments, ej)
	}
	return out
}
