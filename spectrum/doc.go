// Package spectrum reads and checks what the chemist observed: 1H and 13C
// NMR peak lists.
//
// # Reading
//
// Read is the one reader the command line and the HTTP service share. It
// tells the format by the first character (DetectFormat) and returns every
// list it finds, in input order:
//
//   - journal text (ParseText), as pasted from an experimental section,
//     one list per section: "1H NMR (400 MHz, CDCl3) δ 4.12 (q, J = 7.1 Hz,
//     2H), ...; 13C NMR (101 MHz, CDCl3) δ 171.1 (C), 129.3 (2C, CH), ...";
//   - JSON (ParseJSON): an array of 1H peaks, a list object with its
//     "nucleus", or an array of list objects;
//   - JCAMP-DX (ParseJCAMP): each 1H or 13C peak-table block, chosen by
//     its ##.OBSERVE NUCLEUS= record.
//
// Pick and ReadList select the list of one nucleus. Bad input is a
// *PeakError naming the field, the token, its byte position and its line.
//
// # Values
//
// A PeakList has a Nucleus (H1 or C13), the spectrometer frequency, the
// solvent and its Peaks. A Peak carries its shift or range in ppm, its
// Multiplicity, J values in Hz, and for 1H a relative integral, for 13C a
// carbon count and a DEPT class. Multiplicity is the one vocabulary of
// splitting patterns in shiftrank: parsed once by ParseMultiplicity into
// n+1 factors (or singlet, multiplet, not reported) with broad and
// apparent marks, and compared as a value by predict and the scorer. The
// accepted shift and coupling ranges depend on the nucleus
// (Nucleus.ShiftRange, Nucleus.MaxJ).
//
// # Solvent and integrals
//
// FlagSolvent marks the residual solvent, water and reference signals of
// a list's nucleus (Gottlieb, Kotlyar, Nudelman, J. Org. Chem. 1997, 62,
// 7512; Fulmer et al., Organometallics 2010, 29, 2176) so that they can be
// left out of scoring, and ScaleIntegrals turns the relative integrals of
// a 1H list into hydrogen counts for the formula.
//
// The package is pure: it performs no I/O beyond what its callers hand it
// and holds no global mutable state.
package spectrum
