// Package ranker ranks the constitutional isomers of a molecular formula
// against an observed 1H NMR peak list.
//
// The first half reads what the chemist observed. ParsePeaks reads the
// journal notation pasted from an experimental section
// ("1H NMR (400 MHz, CDCl3) δ 4.12 (q, J = 7.1 Hz, 2H), ..."),
// ParsePeaksJSON a JSON form of the same, and ParseJCAMP the peak table of a
// JCAMP-DX file; all three give a PeakList of Peaks (shift or range in ppm,
// normalised multiplicity, J in Hz, relative integral) and report bad
// input as a *PeakError naming the token and its byte position.
// ScaleIntegrals turns relative integrals into hydrogen counts for the
// formula, and FlagSolvent marks the residual solvent, water and reference
// signals (Gottlieb, Kotlyar, Nudelman, J. Org. Chem. 1997, 62, 7512) so
// that they are left out of scoring.
//
// The second half assigns each candidate's predicted environments to the
// observed peaks, scores the match and explains it.
//
// The package is pure: it performs no I/O beyond what its callers hand it
// and holds no global mutable state.
package ranker
