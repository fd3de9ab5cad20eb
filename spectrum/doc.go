// Package spectrum reads and checks what the chemist observed: NMR peak
// lists.
//
// ParsePeaks reads the journal notation pasted from an experimental
// section ("1H NMR (400 MHz, CDCl3) δ 4.12 (q, J = 7.1 Hz, 2H), ..."),
// ParsePeaksJSON a JSON form of the same, and ParseJCAMP the peak table of
// a JCAMP-DX file; all three give a PeakList of Peaks (shift or range in
// ppm, normalised multiplicity, J in Hz, relative integral) and report bad
// input as a *PeakError naming the token and its byte position.
// ScaleIntegrals turns relative integrals into hydrogen counts for the
// formula, and FlagSolvent marks the residual solvent, water and reference
// signals (Gottlieb, Kotlyar, Nudelman, J. Org. Chem. 1997, 62, 7512) so
// that they can be left out of scoring.
//
// The package is pure: it performs no I/O beyond what its callers hand it
// and holds no global mutable state.
package spectrum
