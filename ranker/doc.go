// Package ranker ranks the constitutional isomers of a molecular formula
// against an observed 1H NMR peak list and, when given, a 13C peak list
// (read by package spectrum).
//
// It generates the isomers, predicts each one's spectra, assigns each
// candidate's predicted 1H environments and 13C signals to the observed
// peaks by exact assignments, scores the match with a likelihood (Model,
// CarbonModel: the joint score is the sum of the 1H and 13C
// log-likelihoods), turns scores into probabilities and explains the best
// candidates peak by peak. Bench runs the ranking over a reference set of
// published spectra.
//
// The package is pure: it performs no I/O beyond what its callers hand it
// and holds no global mutable state.
package ranker
