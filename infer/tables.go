package infer

import "shiftrank/isomers"

// Shift regions of 1H signals in CDCl3, ppm (Pretsch, Bühlmann,
// Badertscher, Structure Determination of Organic Compounds, 1H chart of
// shift ranges; Silverstein, Webster, Kiemle, Spectrometric Identification
// of Organic Compounds, ch. 3; from memory). The boundaries are chosen so
// that a region excludes what it is used to exclude with a margin.
const (
	// Above aromaticMin a sharp signal is an aromatic, heteroaromatic,
	// alkene or imine C–H (sp2): no sp3 C–H comes above 6.3 ppm unless
	// it carries two or three halogens (CHCl2 5.8, CHCl3 7.3).
	aromaticMin = 6.3
	// Between sp3Max and aromaticMin lie alkene C–H (4.5–6.3), acetal and
	// O–CH–O hydrogens (4.4–6.0) and CH with two electronegative groups.
	sp3Max = 4.4
	// aldehydeMin–aldehydeMax: CHO of aldehydes (9.4–10.2; 10.4 for some
	// aromatic aldehydes); formate and formamide H come near 8.0–8.3.
	aldehydeMin, aldehydeMax = 9.3, 10.6
	// Above acidMin a hydrogen is a carboxylic acid or chelated
	// (intramolecularly hydrogen-bonded) O–H, both on an unsaturated carbon.
	acidMin = 10.6
	// A broad signal above exchangeableOnUnsaturated is an O–H or N–H on an
	// unsaturated atom (COOH 10–13, chelated phenol OH 10.5–12.5, amide and
	// aromatic N–H 5.5–9; alcohol OH and amine NH stay below 5.5).
	exchangeableOnUnsaturated = 5.6
	// Alkyne C–H: 1.7–3.2 (terminal alkynes 1.8–2.1, aryl alkynes ~3.1).
	alkyneMin, alkyneMax = 1.7, 3.3
	// Terminal =CH2 of alkenes: 4.5–6.5 (acrylates up to 6.4).
	methyleneMin, methyleneMax = 4.5, 6.5
	// The =CH2 of a vinyl group on O or N comes down to 3.9–4.6 (ethyl
	// vinyl ether 4.17/3.97, vinyl acetate 4.88/4.57); a vinyl group,
	// read from its three couplings, may have its =CH2 from vinylCH2Min.
	vinylCH2Min = 3.8
	// tert-Butyl, gem-dimethyl and isopropyl methyls on sp3 carbon:
	// 0.8–1.6 ppm.
	alkylMethylMax = 1.6
)

// Coupling constants, Hz (Pretsch et al., 1H coupling-constant tables;
// Friebolin, Basic One- and Two-Dimensional NMR Spectroscopy; from
// memory).
const (
	// Vicinal sp3 couplings are 6–8 Hz in open chains and 2–12 Hz in
	// rings; a coupling of at least vicinalSP3 Hz in the sp3 region is
	// taken to be vicinal (or geminal, see geminalMin).
	vicinalSP3 = 5.5
	// Ortho couplings in benzenes are 7–9 Hz, alkene cis 6–12 and trans
	// 12–18; heteroaromatic vicinal couplings can be as small as 1.8
	// (furan H2–H3), so only couplings of at least vicinalSP2 Hz prove a
	// vicinal partner on an sp2 carbon.
	vicinalSP2 = 6.5
	// Geminal couplings of sp3 CH2 are 10–18 Hz; of =CH2 0–3 Hz.
	geminalMin, geminalMax = 10.5, 19.0
	// Alkene trans couplings 12–18 Hz, cis 6–12 Hz; a pair of sp2 peaks
	// sharing a coupling of at least alkenePairMin Hz are the two
	// hydrogens of a CH=CH (aromatic ortho couplings stay below 9.5).
	alkenePairMin = 10.5
	// Two reported J values within jMatch Hz are taken to be the same
	// coupling seen from both partners.
	jMatch = 0.6
	// Ortho coupling of a para-disubstituted ring's AA'BB' "doublets":
	// 7.5–9.5 Hz.
	paraJMin, paraJMax = 7.5, 9.5
)

// Additive α-increments for sp3 C–H, ppm. A CHn carbon's shift is about
// base[n] plus one increment per neighbour, by the kind of neighbour
// (Shoolery's rule and its extension to CH3 and CH: Pretsch et al., tables
// of 1H shifts of CH3–X, CH2XY and CHXYZ and of the substituent constants;
// Silverstein et al., Appendix D; from memory). Each kind has the range
// its common substituents span; with base values for alkyl neighbours:
//
//	CH3: 0.86 (ethane); CH2: 1.30 (propane 1.33); CH: 1.55 (isobutane 1.7).
//
// The ranges below are wide on purpose: a shift window prunes a structure
// only when no substituent of those kinds could give the observed shift.
var baseShift = [4]float64{3: 0.86, 2: 1.30, 1: 1.55}

// alphaIncrements[n] are the α-increment ranges for a CHn carbon.
var alphaIncrements = [4][isomers.NumKinds]isomers.Interval{
	3: { // CH3–X: CH3–Ar 2.2–2.7 (2-methylquinoline 2.75), CH3–C=C 1.6–1.8, CH3–C=O 1.9–2.7, CH3–CN 2.0, CH3–C≡C 1.8, CH3–N 2.2–3.8, CH3–NO2 4.3, CH3–O 3.2–4.0, CH3–S 2.0–3.1, CH3–F 4.3, CH3–Cl 3.05, CH3–Br 2.7, CH3–I 2.2, CH3–P 1.1–1.9, CH3–Si 0.0–0.5
		isomers.KindCarbonSP3: {Lo: 0, Hi: 0},
		isomers.KindCarbonC2:  {Lo: 0.65, Hi: 1.95},
		isomers.KindCarbonyl:  {Lo: 0.95, Hi: 1.9},
		isomers.KindCarbonSP:  {Lo: 0.8, Hi: 1.3},
		isomers.KindN:         {Lo: 1.25, Hi: 3.0},
		isomers.KindNPlus:     {Lo: 2.2, Hi: 3.55},
		isomers.KindO:         {Lo: 2.3, Hi: 3.2},
		isomers.KindS:         {Lo: 1.05, Hi: 2.3},
		isomers.KindF:         {Lo: 3.2, Hi: 3.55},
		isomers.KindCl:        {Lo: 2.05, Hi: 2.35},
		isomers.KindBr:        {Lo: 1.7, Hi: 1.95},
		isomers.KindI:         {Lo: 1.2, Hi: 1.45},
		isomers.KindP:         {Lo: 0.15, Hi: 1.15},
		isomers.KindSi:        {Lo: -0.95, Hi: -0.35},
		isomers.KindB:         {Lo: -0.6, Hi: 0.6},
	},
	2: { // CH2XY: CH2–Ar 2.5–2.8 (ArCH2Ar 3.95), allylic 1.9–2.3, CH2–C=O 2.2–3.0, CH2–CN 2.35, CH2–N 2.4–4.0 (aziridine 1.6), CH2–NO2 4.4, CH2–O 3.4–4.2 (oxirane 2.5, acetal O–CH2–O 4.6–5.9), CH2–S 2.5–3.1, CH2F 4.4, CH2Cl 3.5, CH2Br 3.4, CH2I 3.2
		isomers.KindCarbonSP3: {Lo: 0, Hi: 0},
		isomers.KindCarbonC2:  {Lo: 0.5, Hi: 1.75},
		isomers.KindCarbonyl:  {Lo: 0.75, Hi: 1.8},
		isomers.KindCarbonSP:  {Lo: 0.7, Hi: 1.4},
		isomers.KindN:         {Lo: 0.3, Hi: 2.5},
		isomers.KindNPlus:     {Lo: 2.4, Hi: 3.3},
		isomers.KindO:         {Lo: 1.15, Hi: 3.05},
		isomers.KindS:         {Lo: 0.85, Hi: 2.0},
		isomers.KindF:         {Lo: 2.1, Hi: 3.3},
		isomers.KindCl:        {Lo: 1.75, Hi: 2.5},
		isomers.KindBr:        {Lo: 1.55, Hi: 2.3},
		isomers.KindI:         {Lo: 1.05, Hi: 2.0},
		isomers.KindP:         {Lo: 0.2, Hi: 1.3},
		isomers.KindSi:        {Lo: -1.4, Hi: -0.4},
		isomers.KindB:         {Lo: -0.8, Hi: 0.6},
	},
	1: { // CHXYZ: CH–Ar 2.6–3.0, CH–C=O 2.3–2.7, CH–N 2.5–3.9, CH–O 3.4–4.2, CH–OC(O) 4.8–5.1 (oxirane CH 2.9), CHCl 4.0, CHBr 4.1, CHI 4.2
		isomers.KindCarbonSP3: {Lo: 0, Hi: 0},
		isomers.KindCarbonC2:  {Lo: 0.45, Hi: 1.65},
		isomers.KindCarbonyl:  {Lo: 0.55, Hi: 1.65},
		isomers.KindCarbonSP:  {Lo: 0.55, Hi: 1.4},
		isomers.KindN:         {Lo: 0.3, Hi: 2.4},
		isomers.KindNPlus:     {Lo: 2.2, Hi: 3.2},
		isomers.KindO:         {Lo: 1.15, Hi: 3.6},
		isomers.KindS:         {Lo: 0.85, Hi: 2.0},
		isomers.KindF:         {Lo: 2.1, Hi: 3.4},
		isomers.KindCl:        {Lo: 1.55, Hi: 2.7},
		isomers.KindBr:        {Lo: 1.55, Hi: 2.8},
		isomers.KindI:         {Lo: 1.15, Hi: 2.9},
		isomers.KindP:         {Lo: 0, Hi: 1.25},
		isomers.KindSi:        {Lo: -1.4, Hi: 0},
		isomers.KindB:         {Lo: -0.8, Hi: 0.6},
	},
}

// Allowances beyond the α-increments, ppm: β and γ substituents raise an
// sp3 C–H by up to about 0.5 each (β-OAc, β-C=O, β-aryl 0.2–0.4; β-NO2
// 0.7; β-halogens 0.4–0.6 each, CH3CCl3 2.7), ring strain by up to 0.7
// (cyclobutane 1.96, norbornane bridgeheads 2.2); shielding (cyclopropane
// 0.2, aromatic ring currents over a CH) lowers it by up to about 0.7
// (Pretsch et al., from memory). shiftTolerance covers referencing and
// rounding of the reported shift.
const (
	raiseAllowance        = 0.75
	raisePerHalogen       = 0.4
	maxHalogenAllowance   = 3
	lowerAllowance        = 0.7
	shiftTolerance        = 0.1
	singletConfidenceSP3  = 0.97
	singletConfidenceSP2  = 0.9
	patternConfidenceSP3  = 0.95
	patternConfidenceSP2  = 0.88
	fragmentConfidence    = 0.9
	shiftWindowConfidence = 0.98
)

// A C–H next to a ring nitrogen (see withRingN): the shift window, the
// coupling window and the confidence of the reading. Pyridine H-2/H-6
// 8.4–8.8 ppm, quinoline H-2 8.9, J(2,3) 4.2–5.5 Hz (Pretsch, Bühlmann,
// Badertscher, Structure Determination of Organic Compounds; from
// memory).
const (
	ringNMinShift   = 8.25
	ringNMaxShift   = 9.4
	ringNJLo        = 4.0
	ringNJHi        = 5.6
	ringNConfidence = 0.9
	// pyridylJHi bounds J(2,3) when four aromatic H are read as a
	// monosubstituted pyridine ring (4-substituted pyridines 5–6 Hz); the
	// ring's other H must not be benzene-like, which the count of four
	// and the far-downfield H already make unlikely.
	pyridylJHi = 6.2
)

// naphthylMin, ppm: the ring hydrogens of naphthalenes lie at 7.0–8.9
// (naphthalene 7.47/7.84, 2-methoxynaphthalene down to 7.1; Pretsch et
// al., from memory); seven aromatic H all above it, with the DBE of a
// bicyclic aromatic, read as a monosubstituted naphthalene.
const naphthylMin = 6.9

// benzeneMin–benzeneMax, ppm: the ring hydrogens of substituted benzenes
// (an amino or two alkoxy groups ortho/para bring them down to 6.2–6.5,
// nitro and carbonyl groups up to 8.2–8.4; Pretsch et al., from memory):
// four aromatic H inside it, with no other pattern read, are read as a
// disubstituted benzene ring.
const benzeneMin, benzeneMax = 6.4, 8.4

// envelopeMax, ppm: unresolved multiplets up to here are the alkyl
// "envelope" of ring and chain CH2/CH (1.0–2.5 ppm; CH next to O, N or a
// carbonyl above keep their own signals); envelopePrior is the prior of
// the reading that takes them together against the best reading that
// reads them one by one.
const (
	envelopeMax   = 2.5
	envelopePrior = 0.3
)

// methylMaxSpread, ppm: a peak reported as a range wider than this is
// read as a methyl only with a low prior. A CH3 gives one signal whose
// lines span at most J-sized couplings (under 0.05 ppm at 400 MHz), so a
// range such as "2.00–1.65 (m, 3H)" holds several CH or CH2 hydrogens
// (common practice).
const methylMaxSpread = 0.1

// Ortho (three-bond) coupling in benzene rings, Hz (6.5–9.5; Pretsch,
// Bühlmann, Badertscher, Structure Determination of Organic Compounds,
// from memory): what tells the ends of a run of four ring CH (one ortho
// partner) from its middle (two).
const (
	orthoJMin = 6.5
	orthoJMax = 9.5
)
