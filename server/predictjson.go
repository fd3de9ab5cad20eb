package server

import "shiftrank/predict"

// PredictOutput is the answer of POST /v1/predict. Atom numbers are 0-based
// indices of the heavy atoms in the order written in the submitted SMILES.
type PredictOutput struct {
	SMILES       string            `json:"smiles"`
	MHz          float64           `json:"mhz"`
	Environments []EnvironmentJSON `json:"environments"`
	Notes        []string          `json:"notes"`
}

// EnvironmentJSON is one set of equivalent hydrogens with its predicted
// signal: shift and sigma in ppm, J in Hz.
type EnvironmentJSON struct {
	ID             int             `json:"id"`
	Atoms          []int           `json:"atoms"`
	H              int             `json:"h"`
	Kind           string          `json:"kind"`
	Shift          float64         `json:"shift"`
	Sigma          float64         `json:"sigma"`
	ShiftMin       float64         `json:"shift_min"`
	ShiftMax       float64         `json:"shift_max"`
	Multiplicity   string          `json:"multiplicity"`
	J              []float64       `json:"j"`
	Exchangeable   bool            `json:"exchangeable"`
	Diastereotopic bool            `json:"diastereotopic"`
	Neighbours     []NeighbourJSON `json:"neighbours"`
	Breakdown      []predict.Term  `json:"breakdown"`
	Reasons        []string        `json:"reasons"`
}

// NeighbourJSON is one coupling of an environment's hydrogen: Env is the
// coupled environment's id (-1 for a heteronucleus named by Nucleus).
type NeighbourJSON struct {
	Env     int     `json:"env"`
	N       int     `json:"n"`
	J       float64 `json:"j"`
	Label   string  `json:"label"`
	Nucleus string  `json:"nucleus,omitempty"`
}

func predictOutput(smiles string, mhz float64, s *predict.Spectrum) PredictOutput {
	out := PredictOutput{SMILES: smiles, MHz: mhz, Environments: []EnvironmentJSON{}, Notes: s.Notes}
	if out.Notes == nil {
		out.Notes = []string{}
	}
	for _, e := range s.Environments {
		ej := EnvironmentJSON{
			ID: e.ID, Atoms: e.Atoms, H: e.H, Kind: e.Kind,
			Shift: e.Shift, Sigma: e.Sigma, ShiftMin: e.ShiftMin, ShiftMax: e.ShiftMax,
			Multiplicity: e.Multiplicity, J: e.J, Exchangeable: e.Exchangeable, Diastereotopic: e.Diastereotopic,
			Neighbours: []NeighbourJSON{}, Breakdown: e.Breakdown, Reasons: e.Reasons,
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
			ej.Neighbours = append(ej.Neighbours, NeighbourJSON{Env: c.Env, N: c.N, J: c.J, Label: c.Label, Nucleus: c.Nucleus})
		}
		out.Environments = append(out.Environments, ej)
	}
	return out
}
