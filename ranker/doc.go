// Package ranker ranks the constitutional isomers of a molecular formula
// against an observed 1H NMR peak list (read by package spectrum).
//
// It generates the isomers, predicts each one's spectrum, assigns each
// candidate's predicted environments to the observed peaks by an exact
// assignment, scores the match with a likelihood, turns scores into
// probabilities and explains the best candidates peak by peak. Bench runs
// the ranking over a reference set of published spectra.
//
// The package is pure: it performs no I/O beyond what its callers hand it
// and holds no global mutable state.
package ranker
