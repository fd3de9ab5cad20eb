package server

import (
	"shiftrank/molecule"
	"shiftrank/predict"
)

// PredictCaution accompanies every prediction the API returns.
const PredictCaution = predict.Caution

// PredictOutput is the answer of POST /v1/predict, the same document as
// the predict command's JSON output (see predict.Report).
type PredictOutput = predict.Report

// EnvironmentJSON is one environment of a PredictOutput.
type EnvironmentJSON = predict.ReportEnvironment

// CouplingJSON is one coupling of an EnvironmentJSON.
type CouplingJSON = predict.ReportCoupling

func predictOutput(smiles string, g *molecule.Graph, mhz float64, s *predict.Spectrum) PredictOutput {
	return predict.NewReport(smiles, g, mhz, s)
}
