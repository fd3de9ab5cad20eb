// Package predict estimates the 1H NMR spectrum of a molecular graph: which
// hydrogens are equivalent, where each set resonates (chemical shift δ in
// ppm with an uncertainty), how many hydrogens it integrates for, and how it
// is split by its neighbours (multiplicity and coupling constants in Hz).
//
// # Environments
//
// Hydrogens are grouped by the automorphism orbits of the heavy atoms that
// carry them (molecule.Canonicalize). Two refinements follow common
// practice of the trade:
//
//   - restricted rotation about the C–N bond of amides, carbamates and
//     ureas makes the two substituents on the nitrogen inequivalent on the
//     NMR time scale at room temperature (the two N-methyls of
//     N,N-dimethylformamide give two singlets);
//   - the two hydrogens of a terminal =CH2 are split into two environments
//     when the other alkene carbon carries two different substituents (one
//     hydrogen is cis, the other trans, to a given group).
//
// CH2 groups in a molecule with a stereocentre, in a ring whose faces
// differ, or next to a prochiral centre that replacing one of their H
// would make a second stereocentre (the OCH2 of an acetal CH(OEt)2), are
// flagged Diastereotopic but kept as one environment.
//
// # Shifts
//
// Shifts come from published additive increment schemes: sp3 C–H from a
// base value for CH3/CH2/CH plus α and β substituent increments (the scheme
// of Pretsch, Bühlmann and Badertscher, "Structure Determination of Organic
// Compounds: Tables of Spectral Data", and Shoolery's rule for CH2XY);
// alkene H from the Pascual–Meier–Simon increments
// δ = 5.25 + Z_gem + Z_cis + Z_trans; benzene-ring H from 7.26 plus ortho,
// meta and para substituent increments; tabulated base values for H on
// heteroaromatic rings (Pretsch; Silverstein, Webster and Kiemle,
// "Spectrometric Identification of Organic Compounds"). Table values were
// recalled from memory and are marked so beside each table; the tests check
// them against published spectra.
//
// Each Environment carries its Breakdown (the base value and every named
// increment) when Options.Explain is set, and Reasons saying why the shift
// and multiplicity are what they are. Hydrogen types outside the tables get
// a generic value with a wide Sigma and a Reason saying so: Predict never
// returns a silent zero.
//
// # Multiplicity
//
// The n+1 rule counts hydrogens on neighbouring atoms three bonds away
// (H–C–C–H), never those on O, N or S (exchangeable hydrogens are broad
// singlets that neither split nor are split). Coupling constants are
// estimated by kind (vicinal sp3 ~7 Hz, alkene cis ~10.5 and trans ~17,
// aromatic ortho ~8, meta ~2, ring vicinal by the Karplus relation with a
// typical dihedral). The constitution fixes no E/Z configuration: an
// acyclic 1,2-disubstituted alkene gets the mean of the cis and trans
// couplings (~13.5 Hz, so either observed value lies within ~3 Hz) and a
// shift averaged over both configurations, with the range in
// ShiftMin/ShiftMax; a double bond in a ring of up to seven atoms is cis.
// Ring CH–CH couplings whose cis/trans relation is not fixed are averaged
// likewise. Couplings with alike J are merged into one n+1 factor
// (the middle CH2 of a propyl chain is a sextet), unlike ones are kept
// apart (dd, dt, td, ...). Couplings smaller than the resolution (line
// width) are dropped, and "m" is reported where strong coupling (Δν/J
// small at the given field) or too many lines would make the pattern
// unrecognisable. Long-range couplings (4J allylic, W couplings) are
// usually unresolved and are not predicted, except meta couplings in
// aromatic rings. Couplings to 19F and 31P (spin-1/2, 100 % abundance) are
// predicted; couplings to 11B, 14N, 29Si and 33S are not.
//
// # Simulation
//
// Simulate turns a Spectrum into a line spectrum with Lorentzian lines:
// first order from the multiplets, and a full spin-Hamiltonian calculation
// (diagonalised with gonum) for strongly coupled spin systems of up to
// MaxSpinSystem spins.
//
// Predictions are estimates: a ranking built on them is a hypothesis to be
// confirmed against an authentic sample or further spectra.
package predict
