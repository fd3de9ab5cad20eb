// Package predict estimates the 1H and 13C NMR spectra of a molecular
// graph. For 1H (Predict): which hydrogens are equivalent, where each set
// resonates (chemical shift δ in ppm with an uncertainty), how many
// hydrogens it integrates for, and how it is split by its neighbours
// (multiplicity and coupling constants in Hz). For 13C (Carbon): which
// carbons are equivalent, their shifts and their CH_n classes (see
// "13C spectra" below).
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
// # 13C spectra
//
// Carbon predicts the proton-decoupled 13C spectrum: one CarbonSignal per
// set of equivalent carbons (automorphism orbits, refined like the 1H
// environments: the two N-alkyl groups of an amide, and the two equal
// groups on one carbon of a C=C that are cis and trans to different
// groups, give separate lines), so the number of signals is the number of
// lines to expect. Each signal carries its CHClass (C, CH, CH2, CH3: what
// DEPT-135/90 and edited HSQC report), a shift with sigma and, with
// Options.Explain, a Breakdown whose named increments sum to the shift.
// The scheme is additive throughout (sources beside every table in
// carbon_tables.go; values recalled from the handbooks):
//
//   - sp3 carbons: the Grant–Paul value of the parent hydrocarbon
//     skeleton, δ = −2.3 + 9.1 nα + 9.4 nβ − 2.5 nγ + 0.3 nδ with the
//     steric branching corrections (Grant & Paul, J. Am. Chem. Soc. 1964,
//     86, 2984), ring corrections fitted to the cycloalkanes and to the
//     parent heterocycles and cyclic ketones and alkenes, then the α, β
//     and γ effects of every group (O, N, S, halogens, C=O types, C≡N,
//     aryl, vinyl, ...), with the α effect by the carbon's degree (CH3X,
//     RCH2X, R2CHX, R3CX) and corrections for geminal and vicinal groups,
//     anti (equatorial) γ relations in rings and allylic cis/trans groups;
//   - benzene carbons: 128.5 plus ipso/ortho/meta/para increments (Ewing,
//     Org. Magn. Reson. 1979, 12, 499; Pretsch), alkyl groups built from
//     the groups on the benzylic carbon; on fused six-membered systems
//     (naphthalene, quinoline) the ortho increments scale with the
//     Pauling bond order of the bond between and the para increments
//     take 0.65, and a peri group shields C8 by 4 ppm; corrections for
//     chelated salicyl units and for an
//     alkoxy group turned away from one ortho substituent;
//   - heteroaromatic carbons: the parent ring system (pyridine, pyrrole,
//     furan, thiophene, azoles, indole, quinoline, ... and N-oxides) is
//     found by stripping the substituents and looking up its canonical
//     form; substituents add the benzene increments, mapped onto
//     five-membered rings by conjugation path;
//   - alkene and alkyne carbons: 123.3 and 71.9 plus the Pretsch α/β/γ
//     alkyl increments and group increments; E/Z, which the constitution
//     does not fix, is averaged and widens sigma;
//   - carbonyl and nitrile carbons: a base value per type (ketone,
//     aldehyde, acid, carboxylate, ester, lactone, amide, lactam,
//     anhydride, acid halide, thioester, carbonate, carbamate, urea,
//     nitrile) plus the effects of α-branching, conjugation and α-groups;
//     C=N (imines, oximes, hydrazones), C=S and cumulated carbons
//     (isocyanates, allenes, ketenes, CO2, CS2) get tabulated estimates.
//
// Shifts are for CDCl3. On the handbook validation set
// (testdata/carbon_validation.json, 558 carbons, the set the increments
// were improved against) the mean absolute error is about 0.7 ppm and on
// the held-out set (testdata/carbon_holdout.json, 131 carbons never
// tuned against) about 1.0 ppm; TestCarbonValidation and
// TestCarbonHoldout print the table per class. Diastereotopic carbons
// (the methyls of an isopropyl group next to a stereocentre) are kept as
// one signal flagged Diastereotopic, with a Reason saying they may split.
// Groups outside the tables (peroxides, N–O, phosphorus, boron, charged
// atoms, strained and bridged rings) get an estimate with a wide sigma, a
// Reason and a Note. The prediction does not depend on the atom order or
// the Kekulé form of the input (TestCarbonAtomOrderIsomers).
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
