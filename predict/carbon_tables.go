package predict

// 13C increment tables. Sources: Pretsch, Bühlmann, Badertscher,
// "Structure Determination of Organic Compounds: Tables of Spectral Data"
// (13C chapters: alkanes, alkenes, alkynes, benzenes, carbonyl compounds);
// Kalinowski, Berger, Braun, "Carbon-13 NMR Spectroscopy"; Silverstein,
// Webster, Kiemle, "Spectrometric Identification of Organic Compounds"
// ch. 4; Ewing, Org. Magn. Reson. 1979, 12, 499 (benzene increments);
// Grant & Paul, J. Am. Chem. Soc. 1964, 86, 2984 (alkanes). All values
// were recalled from memory, not read from the books while writing; where
// a row is derived from the shifts of a few simple compounds, they are
// named beside it (CDCl3 unless stated). Rows marked "estimate" are our
// own judgement for groups the tables do not cover; predictions built on
// them get a wider sigma.

// Grant–Paul alkane scheme: δ = −2.3 + 9.1 nα + 9.4 nβ − 2.5 nγ + 0.3 nδ
// + steric corrections (Grant & Paul 1964; Pretsch).
const (
	gpBase  = -2.3
	gpAlpha = 9.1
	gpBeta  = 9.4
	gpGamma = -2.5
	gpDelta = 0.3
)

// gpSteric[i][j]: steric correction for an observed carbon with i carbon
// neighbours (1 = primary ... 4 = quaternary; 0 = methane) bonded to a
// carbon with j carbon neighbours (Grant & Paul 1964, as tabulated by
// Pretsch).
var gpSteric = [5][5]float64{
	1: {0, 0, 0, -1.1, -3.4},
	2: {0, 0, 0, -2.5, -7.2},
	3: {0, 0, -3.7, -9.5, -15.0},
	4: {0, -1.5, -8.4, -15.0, -25.0},
}

// ringCarbo[s]: correction for an sp3 carbon in an all-sp3-carbon ring of
// s atoms, so that the Grant–Paul counts (shortest paths) give the parent
// cycloalkanes: cyclopropane −2.8, cyclobutane 22.4, cyclopentane 25.8,
// cyclohexane 27.0, cycloheptane 28.5, cyclooctane 26.9 (Pretsch).
var ringCarbo = [9]float64{3: -18.7, 4: -2.9, 5: -8.9, 6: -5.2, 7: -1.2, 8: -3.1}

// ringHetero[s][k][d]: the same for a ring that also holds other atoms,
// by their kind k (ringHet: N, O, S ...; ringExo: a carbon with an
// exocyclic double bond, C=O; ringEndo: a carbon of an endocyclic double
// bond or a fused aromatic ring) and the distance d (1, 2, 3 or more
// bonds) from the observed carbon to the nearest of them. Fitted to the
// parent rings: THF 68.0/25.6, THP 68.7/26.6/23.6, pyrrolidine 47.0/25.7,
// piperidine 47.5/27.2/25.2, oxirane 40.6, oxetane 72.6/23.1,
// cyclobutanone 47.8/9.9 (thiirane 18.9: see carbon_sp3.go);
// cyclopentanone 38.3/23.3, cyclohexanone 42.0/27.1/25.1; cyclopentene
// 32.5/22.9, cyclohexene 25.2/22.8 (Pretsch; Gottlieb 1997; from memory).
const (
	ringHet = iota
	ringExo
	ringEndo
)

var ringHetero = [9][3][4]float64{
	3: {{0, -26, -26, -26}, {0, -20, -20, -20}, {0, -20, -20, -20}},
	4: {{0, -4, -4, -4}, {0, 1.5, -9, -9}, {0, -4, -4, -4}},
	5: {{0, -6.0, -1.5, -1.5}, {0, -5.0, -1.0, -1.0}, {0, -3.7, -6.2, -1.5}},
	6: {{0, -1.5, -3.9, -0.5}, {0, -1.5, 2.8, -4.6}, {0, -1.5, -7.0, -1.5}},
	7: {{0, 0, 0, 0}, {0, 0, 0, 0}, {0, 0, 0, 0}},
	8: {{0, -1, -1, -1}, {0, -1, -1, -1}, {0, -1, -1, -1}},
}

// zrow holds the effects of one substituent class on an sp3 carbon.
type zrow struct {
	// a[d] is Zα for a carbon with d other sp3-carbon neighbours (0 for
	// CH3–X, 1 RCH2–X, 2 R2CH–X, 3 R3C–X), measured against the
	// Grant–Paul value of the parent hydrocarbon (X replaced by H).
	a [4]float64
	// kb changes Zα per sp3 carbon β to the observed carbon (the α
	// effect falls with γ-gauche interactions of X).
	kb float64
	// b is Zβ, bb its change per extra carbon on the carbon bearing X.
	b, bb float64
	// g is Zγ.
	g float64
}

// xinfo is one substituent class across the increment tables.
type xinfo struct {
	name string
	sp3  zrow
	// ar: benzene ring increments {ipso, ortho, meta, para}, δ = 128.5 + Σ.
	ar [4]float64
	// ene: alkene increments {Z on the carbon bearing X, Z on the other},
	// δ = 123.3 + Σ.
	ene [2]float64
	// yne: alkyne increments {bearing, other}, δ = 71.9 + Σ.
	yne [2]float64
	est bool // some of the row is our estimate
}

// xtab: substituent increments per class. Each sp3 row is derived from
// the CH3X / CH3CH2X / (CH3)2CHX / (CH3)3CX shifts named beside it
// (Pretsch; Kalinowski; from memory) against the Grant–Paul parents
// (methane −2.3, ethane 6.8, propane C2 15.9, isobutane C2 25.0), with
// the γ effect across the group (gammaAcross) taken out: the O–R, N and
// S rows stand for a methyl on the far side.
var xtab = [numX]xinfo{
	xAlkyl: {name: "alkyl"},
	// propene 19.4, 1-butene 26.9, 3-methyl-1-butene 32.0,
	// 3,3-dimethyl-1-butene 33.7; 1-butene CH3 13.4; styrene ring;
	// butadiene 137.2/116.6.
	xVinyl: {name: "C=C", sp3: zrow{a: [4]float64{21.7, 20.1, 16.1, 8.7}, kb: -0.1, b: 6.6, bb: -1.0, g: -2.1},
		ar: [4]float64{8.9, -2.3, -0.1, -0.8}, ene: [2]float64{13.9, -6.7}, yne: [2]float64{10.5, 6.0}},
	// propyne 3.5, 1-hexyne C3 18.2; phenylacetylene ring; vinylacetylene
	// 117.3/126.9; butadiyne 68.8/67.9.
	xAlkynyl: {name: "C≡C", sp3: zrow{a: [4]float64{5.8, 5.0, 4.4, 3.5}, b: 5.6, bb: -0.5, g: -3.4},
		ar: [4]float64{-6.2, 3.6, -0.4, -0.3}, ene: [2]float64{-6.0, 3.6}, yne: [2]float64{-3.1, -4.0}},
	// toluene 21.4, ethylbenzene 28.9/15.6, cumene 34.2/24.0,
	// tert-butylbenzene 34.6/31.3; biphenyl 141.2/127.2/128.7/127.2;
	// styrene 136.9/113.8; phenylacetylene 83.7/77.2.
	xAryl: {name: "aryl", sp3: zrow{a: [4]float64{23.7, 22.1, 18.3, 9.6}, kb: -0.2, b: 8.8, bb: -1.0, g: -2.3},
		ar: [4]float64{13.1, -1.1, 0.5, -1.1}, ene: [2]float64{13.6, -9.5}, yne: [2]float64{11.8, 5.3}},
	// as aryl, with ring-position corrections (carbon_sp3.go); the ring
	// increments from 2-phenylpyridine 139.4/126.9/128.7/128.9.
	xHetAryl: {name: "heteroaryl", sp3: zrow{a: [4]float64{23.7, 22.1, 18.3, 9.6}, kb: -0.2, b: 8.8, bb: -1.0, g: -2.3},
		ar: [4]float64{11.0, -1.5, 0.3, -0.3}, ene: [2]float64{13.0, -8.0}, yne: [2]float64{11.0, 6.0}},
	// acetaldehyde 31.2, propanal 37.3/6.0, isobutyraldehyde 41.1/15.5,
	// pivalaldehyde 42.5/23.4; benzaldehyde 136.4/129.7/129.0/134.4;
	// acrolein 136.4/137.1 (Pretsch 13.1/12.7).
	xCHO: {name: "CHO", sp3: zrow{a: [4]float64{33.5, 30.5, 25.2, 17.5}, kb: -0.9, b: -0.6, bb: -0.3, g: -2.6},
		ar: [4]float64{7.9, 1.2, 0.5, 5.9}, ene: [2]float64{13.1, 12.7}, yne: [2]float64{8.0, 10.5}},
	// acetone 30.8, butanone 36.9/7.9, 3-methyl-2-butanone 41.6/18.2,
	// pinacolone 44.3/26.5; acetophenone ring 137.1/128.3/128.6/133.1;
	// methyl vinyl ketone 137.1/128.0 (Pretsch 13.8/4.7).
	xKetone: {name: "C(=O)R", sp3: zrow{a: [4]float64{33.1, 30.1, 25.7, 19.3}, kb: -0.6, b: 1.5, bb: 0.3, g: -2.5},
		ar: [4]float64{8.6, -0.2, 0.1, 4.6}, ene: [2]float64{13.8, 4.7}, yne: [2]float64{10.0, 7.0}},
	// acetophenone 26.6, propiophenone 31.8/8.3, isobutyrophenone 35.4;
	// benzophenone ring 137.6/130.0/128.3/132.4.
	xConjKetone: {name: "C(=O)Ar", sp3: zrow{a: [4]float64{28.9, 25.0, 19.5, 17.5}, kb: -0.6, b: 1.5, bb: 0.3, g: -2.5},
		ar: [4]float64{9.1, 1.5, -0.2, 3.9}, ene: [2]float64{14.5, 3.5}, yne: [2]float64{10.0, 7.0}},
	// acetic acid 20.8, propanoic 27.6/9.0, isobutyric 34.0/18.8,
	// pivalic 38.7; benzoic acid 129.4/130.3/128.5/133.9; acrylic acid
	// 128.0/132.8 (Pretsch 5.0/9.8).
	xCOOH: {name: "COOH", sp3: zrow{a: [4]float64{23.1, 20.8, 18.1, 13.7}, kb: -0.8, b: 2.2, bb: 0.2, g: -2.5},
		ar: [4]float64{0.9, 1.8, 0.0, 5.4}, ene: [2]float64{5.0, 9.8}, yne: [2]float64{2.7, 3.0}},
	// acetate ion 24.1 (D2O); estimate for the rest.
	xCOOMinus: {name: "COO⁻", sp3: zrow{a: [4]float64{26.5, 24.0, 21.0, 16.5}, kb: -0.8, b: 3.5, g: -2.5},
		ar: [4]float64{8.0, 1.0, 0.0, 2.0}, ene: [2]float64{9.0, 5.0}, yne: [2]float64{6.0, 2.0}, est: true},
	// methyl acetate 20.7, methyl propanoate 27.5/9.2, methyl
	// isobutyrate 34.0, methyl pivalate 38.7; methyl benzoate
	// 130.2/129.6/128.4/132.9; methyl acrylate 128.3/130.6 (Pretsch
	// 6.3/7.0); methyl propiolate 74.6/75.0.
	xEster: {name: "C(=O)OR", sp3: zrow{a: [4]float64{23.0, 20.7, 18.1, 13.7}, kb: -0.9, b: 2.2, bb: 0.2, g: -2.5},
		ar: [4]float64{1.7, 1.1, -0.1, 4.4}, ene: [2]float64{5.5, 7.2}, yne: [2]float64{2.7, 3.1}},
	// acetic anhydride 22.1, propionic anhydride 28.6; benzoic anhydride
	// ring 128.9/130.6/128.9/134.7.
	xAnhydride: {name: "C(=O)OC(=O)", sp3: zrow{a: [4]float64{24.4, 21.8, 19.0, 14.5}, kb: -0.9, b: 1.6, g: -2.5},
		ar: [4]float64{0.4, 2.1, 0.4, 6.2}, ene: [2]float64{4.0, 9.0}, yne: [2]float64{2.0, 5.0}},
	// N,N-dimethylacetamide 21.5, acetamide 22.5, propanamide 28.9/9.7,
	// isobutyramide 34.5, pivalamide 38.5; N-methylbenzamide
	// 134.6/126.9/128.5/131.3; acrylamide 131.0/127.5.
	xAmide: {name: "C(=O)N", sp3: zrow{a: [4]float64{24.3, 21.0, 18.6, 13.5}, kb: -0.8, b: 2.6, bb: 0.2, g: -2.6},
		ar: [4]float64{6.1, -1.5, 0.0, 2.8}, ene: [2]float64{7.7, 4.2}, yne: [2]float64{4.0, 5.0}},
	// acetyl chloride 33.7, propionyl chloride 41.0/9.2, isobutyryl
	// chloride 46.7, pivaloyl chloride 49.5; benzoyl chloride
	// 133.2/131.2/128.8/135.1 (Pretsch 4.7/2.7/0.3/6.6); acryloyl
	// chloride (Pretsch 8.1/14.0).
	xAcylCl: {name: "C(=O)Cl", sp3: zrow{a: [4]float64{36.0, 34.2, 30.8, 24.5}, kb: -1.0, b: 2.3, g: -3.6},
		ar: [4]float64{4.7, 2.7, 0.3, 6.6}, ene: [2]float64{8.1, 14.0}, yne: [2]float64{3.0, 8.0}},
	// S-methyl thioacetate CH3CO 30.2; the rest estimate.
	xThioester: {name: "C(=O)S", sp3: zrow{a: [4]float64{32.5, 30.0, 26.0, 21.0}, kb: -0.8, b: 1.5, g: -2.5},
		ar: [4]float64{8.5, -0.8, 0.2, 5.0}, ene: [2]float64{12.0, 5.0}, yne: [2]float64{8.0, 6.0}, est: true},
	xAcylOther: {name: "C(=O)X", sp3: zrow{a: [4]float64{30, 27, 23, 18}, b: 1.5, g: -2.5},
		ar: [4]float64{8.0, 0, 0, 4.0}, ene: [2]float64{10, 6}, yne: [2]float64{6, 6}, est: true},
	// acetonitrile 1.9, propionitrile 10.9/10.6, isobutyronitrile
	// 19.8/19.9, pivalonitrile 28.1; benzonitrile 112.4/132.1/129.1/132.8;
	// acrylonitrile 107.7/137.5.
	xCN: {name: "C≡N", sp3: zrow{a: [4]float64{4.2, 4.1, 3.9, 3.1}, kb: -1.0, b: 3.2, bb: -0.2, g: -3.0},
		ar: [4]float64{-16.1, 3.6, 0.6, 4.3}, ene: [2]float64{-15.6, 14.2}, yne: [2]float64{-15.0, 10.0}},
	// oximes and imines: acetone oxime 15/22 (syn/anti), benzaldoxime
	// ring 131.9/127.1/128.9/130.1.
	xImineC: {name: "C=N", sp3: zrow{a: [4]float64{17.5, 15.0, 12.0, 8.0}, kb: -0.5, b: 2.0, g: -2.5},
		ar: [4]float64{4.5, -1.0, 0.3, 2.0}, ene: [2]float64{11, 5}, yne: [2]float64{8, 6}},
	// thioacetamide CH3 33.0; the rest estimate.
	xThioC: {name: "C=S", sp3: zrow{a: [4]float64{35, 32, 28, 22}, b: 2, g: -2.5},
		ar: [4]float64{17, -1, 0, 3}, ene: [2]float64{15, 5}, yne: [2]float64{10, 6}, est: true},
	xCOther: {name: "C=X (unusual)", sp3: zrow{a: [4]float64{20, 18, 15, 10}, b: 2, g: -2.5},
		ar: [4]float64{5, 0, 0, 0}, ene: [2]float64{8, 0}, yne: [2]float64{5, 0}, est: true},
	// fluoromethane 75.0, fluoroethane, 2-fluoropropane 87.3,
	// tert-butyl fluoride 93.5; fluorobenzene 162.8/115.4/129.9/124.1;
	// vinyl fluoride (Pretsch 24.9/−34.3).
	xF: {name: "F", sp3: zrow{a: [4]float64{77.3, 72.5, 71.4, 68.5}, kb: -2.5, b: 7.8, bb: -1.0, g: -6.8},
		ar: [4]float64{34.8, -13.0, 1.6, -4.4}, ene: [2]float64{24.9, -34.3}, yne: [2]float64{20, -50}},
	// chloromethane 25.6, chloroethane 39.9/18.7, 2-chloropropane
	// 53.9/27.3, tert-butyl chloride 67.1/34.5, 1-chlorobutane
	// 44.7/34.9/20.2; chlorobenzene 134.3/128.6/129.7/126.4 (Pretsch
	// 6.2/0.4/1.3/−1.9); vinyl chloride 126.1/117.2.
	xCl: {name: "Cl", sp3: zrow{a: [4]float64{27.9, 33.1, 38.0, 42.1}, kb: -2.4, b: 11.5, bb: -0.8, g: -5.1},
		ar: [4]float64{6.2, 0.4, 1.3, -1.9}, ene: [2]float64{2.8, -6.1}, yne: [2]float64{-15, -12}},
	// bromomethane 10.2, bromoethane 28.3, 2-bromopropane 45.4,
	// tert-butyl bromide 62.5, 1-bromobutane 33.4/34.8/21.4;
	// bromobenzene 122.6/131.6/130.0/126.9; vinyl bromide 115.6/122.1.
	xBr: {name: "Br", sp3: zrow{a: [4]float64{12.3, 21.3, 29.5, 37.5}, kb: -1.6, b: 11.5, bb: -0.3, g: -3.8},
		ar: [4]float64{-5.5, 3.4, 1.7, -1.6}, ene: [2]float64{-8.6, -0.9}, yne: [2]float64{-28, -12}},
	// iodomethane −21.0, iodoethane −1.1/20.6, 2-iodopropane 21.3,
	// tert-butyl iodide 43.4, 1-iodobutane 6.7/35.5/23.6; iodobenzene
	// 94.4/137.4/130.1/127.3; vinyl iodide 85.3/130.3.
	xI: {name: "I", sp3: zrow{a: [4]float64{-18.7, -7.9, 5.4, 18.4}, kb: 1.0, b: 11.5, g: -1.5},
		ar: [4]float64{-34.1, 8.9, 1.6, -1.1}, ene: [2]float64{-38.1, 7.0}, yne: [2]float64{-70, 20}},
	// methanol 50.4, ethanol 58.3/18.4, 2-propanol 64.5/25.1,
	// tert-butanol 69.1/31.2, 1-butanol 62.5/35.0/19.0 (Gottlieb,
	// Kotlyar, Nudelman, J. Org. Chem. 1997, 62, 7512); phenol
	// 155.0/115.3/129.5/120.8.
	xOH: {name: "OH", sp3: zrow{a: [4]float64{52.7, 51.5, 48.6, 44.1}, kb: -3.5, b: 11.2, bb: -2.3, g: -6.2},
		ar: [4]float64{26.6, -13.0, 1.2, -7.6}, ene: [2]float64{26.0, -35.0}, yne: [2]float64{18, -49}},
	// dimethyl ether 60.0, diethyl ether 65.9/15.3, diisopropyl ether
	// 68.5, MTBE C 72.7, dibutyl ether 70.7/31.9/19.4; anisole
	// 159.9/114.1/129.5/120.7; methyl vinyl ether 152.7/84.2; ethoxyacetylene
	// 89.8/23.0.
	xOR: {name: "O–R", sp3: zrow{a: [4]float64{62.3, 62.7, 59.8, 47.7}, kb: -2.1, b: 7.5, bb: -2.0, g: -5.8},
		ar: [4]float64{31.4, -14.4, 1.0, -7.7}, ene: [2]float64{29.4, -38.9}, yne: [2]float64{17.9, -48.9}},
	// anisole OCH3 55.1, phenetole 63.3/14.8, isopropyl phenyl ether
	// 69.8; diphenyl ether 157.3/118.9/129.8/123.3; phenyl vinyl ether
	// 148.0/95.2.
	xOAr: {name: "O–Ar", sp3: zrow{a: [4]float64{57.4, 56.5, 53.9, 53.2}, kb: -2.1, b: 8.0, bb: -1.5, g: -5.8},
		ar: [4]float64{28.8, -9.6, 1.3, -5.2}, ene: [2]float64{24.7, -28.1}, yne: [2]float64{15, -40}},
	// methyl vinyl ether OCH3 52.5, ethyl vinyl ether 63.5; the ring and
	// alkene rows estimate.
	xOVinyl: {name: "O–C=C", sp3: zrow{a: [4]float64{54.8, 56.7, 53.0, 48.0}, kb: -2.1, b: 7.5, bb: -2.0, g: -5.8},
		ar: [4]float64{28.5, -11.0, 1.2, -5.0}, ene: [2]float64{26, -33}, yne: [2]float64{15, -40}},
	// methyl acetate 51.6, ethyl acetate 60.4/14.2, isopropyl acetate
	// 67.6/21.8, tert-butyl acetate 80.1/28.1, butyl acetate 64.4;
	// phenyl acetate 150.8/121.6/129.4/125.8; vinyl acetate 141.2/96.6.
	xOAcyl: {name: "O–C(=O)R", sp3: zrow{a: [4]float64{53.9, 53.6, 51.7, 55.1}, kb: -3.2, b: 7.0, bb: -1.9, g: -6.0},
		ar: [4]float64{22.3, -6.9, 0.9, -2.7}, ene: [2]float64{17.9, -26.7}, yne: [2]float64{12, -35}},
	// dimethyl carbonate 54.8, diethyl carbonate 63.9, ethyl carbamate
	// 60.9, Boc C(CH3)3 79.2; diphenyl carbonate ring 151.2/121.0/129.6/126.1.
	xOCarbonyl2: {name: "O–C(=O)X", sp3: zrow{a: [4]float64{56.0, 55.5, 53.5, 54.2}, kb: -3.0, b: 6.8, bb: -1.9, g: -6.0},
		ar: [4]float64{22.7, -7.5, 1.1, -2.4}, ene: [2]float64{17, -26}, yne: [2]float64{12, -35}},
	// methoxytrimethylsilane 49.8, ethoxytrimethylsilane 58.3/18.7;
	// phenoxytrimethylsilane ring 155.5/120.1/129.4/121.4.
	xOSi: {name: "O–Si", sp3: zrow{a: [4]float64{52.1, 51.5, 50.0, 47.0}, kb: -2.5, b: 11.5, bb: -2.0, g: -6.0},
		ar: [4]float64{27.1, -8.4, 0.9, -7.1}, ene: [2]float64{26, -30}, yne: [2]float64{15, -40}},
	// methyl mesylate OCH3 56.0, ethyl mesylate 66.8/15.0; phenyl
	// mesylate ring 149.2/122.0/130.0/127.3.
	xOS: {name: "O–S", sp3: zrow{a: [4]float64{58.3, 60.0, 57.0, 55.0}, kb: -2.5, b: 8.0, bb: -2.0, g: -6.0},
		ar: [4]float64{20.7, -6.5, 1.5, -1.2}, ene: [2]float64{16, -23}, yne: [2]float64{10, -35}},
	// trimethyl phosphate 54.4, triethyl phosphate 63.7/16.1; triphenyl
	// phosphate ring 150.6/120.2/129.9/125.6.
	xOP: {name: "O–P", sp3: zrow{a: [4]float64{56.7, 57.0, 55.0, 52.0}, kb: -2.5, b: 9.3, bb: -2.0, g: -6.0},
		ar: [4]float64{22.1, -8.3, 1.4, -2.9}, ene: [2]float64{18, -25}, yne: [2]float64{12, -35}},
	// O-methyl oxime OCH3 61.5; the rest estimate.
	xON: {name: "O–N", sp3: zrow{a: [4]float64{63.8, 62.0, 58.0, 55.0}, kb: -2.5, b: 8.0, bb: -2.0, g: -6.0},
		ar: [4]float64{30, -13, 1, -6}, ene: [2]float64{25, -30}, yne: [2]float64{15, -40}, est: true},
	// tert-butyl hydroperoxide C 80.6; the rest estimate.
	xOO: {name: "O–O", sp3: zrow{a: [4]float64{66, 64, 60, 55}, kb: -2.5, b: 6, bb: -2.0, g: -6},
		ar: [4]float64{30, -13, 1, -6}, ene: [2]float64{25, -30}, yne: [2]float64{15, -40}, est: true},
	// trimethyl borate 51.3; the rest estimate.
	xOB: {name: "O–B", sp3: zrow{a: [4]float64{53.6, 53, 51, 48}, kb: -2.5, b: 10, bb: -2.0, g: -6},
		ar: [4]float64{26, -10, 1, -6}, ene: [2]float64{24, -30}, yne: [2]float64{15, -40}, est: true},
	xOMinus: {name: "O⁻", sp3: zrow{a: [4]float64{55, 54, 50, 46}, kb: -2.5, b: 10, g: -6},
		ar: [4]float64{39, -8, 1.5, -12}, ene: [2]float64{30, -40}, yne: [2]float64{20, -50}, est: true},
	// methylamine 28.3, ethylamine 36.9/19.0, isopropylamine 42.8/26.2,
	// tert-butylamine 47.2/32.8, butylamine 42.2/36.7/20.1; aniline
	// 146.4/115.1/129.3/118.5.
	xNH2: {name: "NH2", sp3: zrow{a: [4]float64{30.6, 30.1, 26.9, 22.2}, kb: -1.7, b: 12.0, bb: -2.0, g: -5.1},
		ar: [4]float64{17.9, -13.4, 0.8, -10.0}, ene: [2]float64{22, -28}, yne: [2]float64{15, -30}},
	// dimethylamine 38.2, diethylamine 44.1/15.3, diisopropylamine
	// 45.2/23.6; N-methylaniline ring 149.4/112.4/129.2/117.2.
	xNHR: {name: "NHR", sp3: zrow{a: [4]float64{40.5, 40.9, 36.5, 31.0}, kb: -2.0, b: 8.5, bb: -1.5, g: -4.6},
		ar: [4]float64{20.9, -16.1, 0.7, -11.3}, ene: [2]float64{25, -30}, yne: [2]float64{15, -30}},
	// trimethylamine 47.5, triethylamine 46.5/11.8; N,N-dimethylaniline
	// 150.7/112.7/129.0/116.7; enamines (Pretsch 28/−32).
	xNR2: {name: "NR2", sp3: zrow{a: [4]float64{49.8, 46.7, 41.0, 35.0}, kb: -2.0, b: 5.3, bb: -1.0, g: -4.6},
		ar: [4]float64{22.2, -15.8, 0.5, -11.8}, ene: [2]float64{28.0, -32.0}, yne: [2]float64{18, -32}},
	// N-methylaniline NCH3 30.7, N-ethylaniline 38.5/14.9,
	// N-isopropylaniline 44.2; diphenylamine 143.1/117.8/129.3/121.0.
	xNHAr: {name: "NH–Ar", sp3: zrow{a: [4]float64{33.0, 31.7, 28.3, 26.4}, kb: -2.0, b: 8.1, bb: -1.5, g: -4.6},
		ar: [4]float64{14.6, -10.7, 0.8, -7.5}, ene: [2]float64{20, -25}, yne: [2]float64{15, -30}},
	// N,N-dimethylaniline NCH3 40.6, N,N-diethylaniline 44.3/12.6;
	// N-methyldiphenylamine 149.1/120.4/129.2/121.2.
	xNArR: {name: "NR–Ar", sp3: zrow{a: [4]float64{42.9, 41.1, 36.5, 31.5}, kb: -2.0, b: 5.8, bb: -1.0, g: -4.6},
		ar: [4]float64{20.6, -8.1, 0.7, -7.3}, ene: [2]float64{24, -28}, yne: [2]float64{15, -30}},
	// N-methylacetamide 26.3, N-ethylacetamide 34.4/14.8,
	// N-isopropylacetamide 41.3, N-tert-butylacetamide 51.1; acetanilide
	// 138.0/120.0/128.9/124.3; N-vinylacetamide estimate.
	xAmideNH: {name: "NH–C(=O)", sp3: zrow{a: [4]float64{28.6, 27.6, 25.4, 26.1}, kb: -1.8, b: 8.0, bb: -1.8, g: -4.6},
		ar: [4]float64{9.5, -8.5, 0.4, -4.2}, ene: [2]float64{6.5, -29}, yne: [2]float64{10, -20}},
	// N,N-dimethylacetamide 35.0/38.0, N,N-diethylacetamide 40.0/42.0
	// and 13.0/14.2 (mean of the rotamers); N-methylacetanilide
	// 144.7/127.1/129.7/127.7; N-vinylpyrrolidone 129.5/94.5.
	xAmideNR: {name: "NR–C(=O)", sp3: zrow{a: [4]float64{38.8, 37.8, 32.5, 29.5}, kb: -1.8, b: 6.8, bb: -1.5, g: -4.6},
		ar: [4]float64{16.2, -1.4, 1.2, -0.8}, ene: [2]float64{6.2, -28.8}, yne: [2]float64{10, -20}},
	// N-methyl imines CH3 48.2, N-isopropyl 61.5, N-tert-butyl 57.1;
	// N-benzylideneaniline N-phenyl 152.1/120.9/129.2/125.9.
	xImineN: {name: "N=C", sp3: zrow{a: [4]float64{50.5, 48.7, 45.6, 32.1}, kb: -2.0, b: 8.0, bb: -2.0, g: -4.6},
		ar: [4]float64{23.6, -7.6, 0.7, -2.6}, ene: [2]float64{15, -10}, yne: [2]float64{10, -10}, est: true},
	// nitromethane 62.5, nitroethane 70.6/12.3, 1-nitropropane
	// 77.4/21.2/10.6, 2-nitropropane 78.8, 2-methyl-2-nitropropane 85.0;
	// nitrobenzene 148.5/123.5/129.4/134.7; nitroethylene (Pretsch
	// 22.3/−0.9).
	xNitro: {name: "NO2", sp3: zrow{a: [4]float64{64.8, 63.8, 62.9, 60.0}, kb: -2.6, b: 4.5, bb: -1.0, g: -4.6},
		ar: [4]float64{20.0, -5.0, 0.9, 6.1}, ene: [2]float64{22.3, -0.9}, yne: [2]float64{10, 5}},
	xNO: {name: "N–O", sp3: zrow{a: [4]float64{48, 46, 42, 38}, kb: -2.0, b: 6, g: -4.6},
		ar: [4]float64{20, -13, 1, -8}, ene: [2]float64{20, -25}, yne: [2]float64{15, -25}, est: true},
	// phenylhydrazine ring 151.2/112.6/129.1/119.8; the sp3 row estimate.
	xNN: {name: "N–N", sp3: zrow{a: [4]float64{42, 40, 36, 32}, kb: -2.0, b: 8, g: -4.6},
		ar: [4]float64{22.4, -16.5, 0.7, -9.0}, ene: [2]float64{20, -25}, yne: [2]float64{15, -25}, est: true},
	// methyl azide 39.2, ethyl azide 46.0, 1-azidobutane 51.2; phenyl
	// azide 140.0/119.0/129.7/124.8.
	xAzide: {name: "N3", sp3: zrow{a: [4]float64{41.5, 39.2, 35.0, 30.0}, kb: -2.0, b: 8.5, bb: -1.5, g: -4.6},
		ar: [4]float64{11.5, -9.5, 1.2, -3.7}, ene: [2]float64{10, -15}, yne: [2]float64{10, -15}, est: true},
	// azobenzene 152.6/122.8/129.0/130.9; the sp3 row estimate.
	xAzo: {name: "N=N", sp3: zrow{a: [4]float64{58, 55, 50, 45}, kb: -2.0, b: 6, g: -4.6},
		ar: [4]float64{24.1, -5.7, 0.5, 2.4}, ene: [2]float64{20, -10}, yne: [2]float64{15, -10}, est: true},
	// methyl isocyanide 26.8; phenyl isocyanide ring estimate.
	xIsoCN: {name: "N≡C", sp3: zrow{a: [4]float64{29.1, 29.6, 28, 26}, kb: -2.0, b: 8, g: -4.6},
		ar: [4]float64{-1.8, -2.2, 1.4, 1.2}, ene: [2]float64{5, -10}, yne: [2]float64{5, -10}, est: true},
	// methyl isocyanate 26.4, ethyl isocyanate 37.4, tert-butyl
	// isocyanate 58.6; phenyl isocyanate 133.7/124.8/129.8/125.9.
	xNCX: {name: "N=C=O", sp3: zrow{a: [4]float64{28.7, 30.6, 32.0, 33.6}, kb: -2.0, b: 8.5, g: -4.6},
		ar: [4]float64{5.2, -3.7, 1.3, -2.6}, ene: [2]float64{10, -15}, yne: [2]float64{10, -15}, est: true},
	// N-methylpyrrole 36.1, N-methylimidazole 33.2, N-methylindole 32.7,
	// N-methylpyrazole 38.9, N-ethylpyrrole 44.3/16.5, N-tert-butylpyrrole
	// 55.4; N-phenylpyrrole ring 140.8/120.6/129.6/125.6.
	xNArom: {name: "N (azole)", sp3: zrow{a: [4]float64{36.0, 37.5, 33.5, 30.4}, kb: -2.0, b: 9.5, bb: -1.5, g: -4.6},
		ar: [4]float64{12.3, -7.9, 1.1, -2.9}, ene: [2]float64{10, -20}, yne: [2]float64{10, -20}},
	// N-methylmethanesulfonamide NCH3 29.3; methanesulfonanilide ring
	// 136.9/120.6/129.7/125.4.
	xNS: {name: "N–S", sp3: zrow{a: [4]float64{31.6, 31.0, 28.0, 26.0}, kb: -2.0, b: 8, bb: -1.5, g: -4.6},
		ar: [4]float64{8.4, -7.9, 1.2, -3.1}, ene: [2]float64{10, -20}, yne: [2]float64{10, -20}, est: true},
	// tetramethylammonium 55.6; anilinium estimate.
	xNPlus: {name: "N⁺", sp3: zrow{a: [4]float64{57.9, 55.0, 50.0, 45.0}, kb: -2.0, b: 6, g: -4.6},
		ar: [4]float64{19.9, -7.6, 1.7, 2.8}, ene: [2]float64{20, -10}, yne: [2]float64{10, -10}, est: true},
	// methanethiol 6.5, ethanethiol 19.1/19.7, 2-propanethiol 30.1,
	// 2-methyl-2-propanethiol 41.1, 1-butanethiol 24.2/36.0; thiophenol
	// 130.5/129.3/128.9/125.4.
	xSH: {name: "SH", sp3: zrow{a: [4]float64{8.8, 12.3, 14.2, 16.1}, kb: -1.8, b: 11.4, bb: -0.5, g: -3.6},
		ar: [4]float64{2.1, 0.7, 0.3, -3.2}, ene: [2]float64{8, -10}, yne: [2]float64{5, -10}, est: true},
	// dimethyl sulfide 18.2, diethyl sulfide 25.5/14.8, diisopropyl
	// sulfide 33.5; thioanisole 138.5/126.7/128.8/124.9; methyl vinyl
	// sulfide 133.7/110.2.
	xSR: {name: "S–R", sp3: zrow{a: [4]float64{20.5, 20.7, 21.6, 20.0}, kb: -2.0, b: 8.0, bb: -1.0, g: -2.7},
		ar: [4]float64{10.0, -1.9, 0.2, -3.6}, ene: [2]float64{10.4, -13.1}, yne: [2]float64{5, -10}},
	// thioanisole SCH3 15.9, ethyl phenyl sulfide 27.5/14.4; diphenyl
	// sulfide 135.8/131.0/129.2/127.0.
	xSAr: {name: "S–Ar", sp3: zrow{a: [4]float64{18.2, 20.7, 21.0, 21.0}, kb: -2.0, b: 7.6, bb: -1.0, g: -2.7},
		ar: [4]float64{7.3, 2.5, 0.7, -1.5}, ene: [2]float64{8, -10}, yne: [2]float64{5, -10}},
	// dimethyl disulfide 22.0, diethyl disulfide 32.9/14.5; diphenyl
	// disulfide 137.0/127.5/129.0/127.1.
	xSS: {name: "S–S", sp3: zrow{a: [4]float64{24.3, 26.1, 27.0, 28.0}, kb: -2.0, b: 7.7, bb: -1.0, g: -3.0},
		ar: [4]float64{8.5, -1.0, 0.5, -1.4}, ene: [2]float64{8, -10}, yne: [2]float64{5, -10}},
	// S-methyl thioacetate SCH3 11.6, S-ethyl 23.4/14.8; S-phenyl
	// thioacetate ring 127.9/134.4/129.2/129.4.
	xSAcyl: {name: "S–C(=O)", sp3: zrow{a: [4]float64{13.9, 16.6, 20.0, 24.0}, kb: -2.0, b: 8.0, bb: -1.0, g: -3.0},
		ar: [4]float64{-0.6, 5.9, 0.7, 0.9}, ene: [2]float64{5, -5}, yne: [2]float64{5, -5}},
	// DMSO 40.8 (Gottlieb 1997), diethyl sulfoxide 46.2/6.6; methyl
	// phenyl sulfoxide ring 145.6/123.5/129.4/131.0.
	xSO: {name: "S(=O)", sp3: zrow{a: [4]float64{43.1, 41.4, 38.0, 34.0}, kb: -2.0, b: 0.0, g: -3.0},
		ar: [4]float64{17.1, -5.0, 0.9, 2.5}, ene: [2]float64{18, 0}, yne: [2]float64{10, 0}},
	// dimethyl sulfone 42.6, diethyl sulfone 46.6/6.5; methyl phenyl
	// sulfone 140.6/127.3/129.4/133.7.
	xSO2: {name: "SO2", sp3: zrow{a: [4]float64{44.9, 41.8, 38.0, 34.0}, kb: -2.0, b: 0.0, g: -3.0},
		ar: [4]float64{12.1, -1.2, 0.9, 5.2}, ene: [2]float64{14, 4}, yne: [2]float64{10, 5}},
	// methanesulfonyl chloride 52.8, methyl mesylate S-CH3 37.4;
	// benzenesulfonyl chloride 144.1/126.8/129.7/135.3, benzenesulfonamide
	// 143.8/125.6/128.9/131.8.
	xSO2X: {name: "SO2X", sp3: zrow{a: [4]float64{42.0, 45.0, 48.0, 50.0}, kb: -2.0, b: 2.0, g: -3.0},
		ar: [4]float64{15.0, -2.0, 1.0, 4.5}, ene: [2]float64{14, 5}, yne: [2]float64{10, 5}, est: true},
	xSOther: {name: "S (hypervalent)", sp3: zrow{a: [4]float64{40, 38, 35, 32}, b: 2, g: -3},
		ar: [4]float64{12, -2, 1, 3}, ene: [2]float64{12, 0}, yne: [2]float64{10, 0}, est: true},
	// tetramethylsilane 0.0, ethyltrimethylsilane 8.5/7.6;
	// phenyltrimethylsilane 140.2/133.3/127.8/128.8;
	// vinyltrimethylsilane 139.5/131.4; trimethylsilylacetylene.
	xSi: {name: "Si", sp3: zrow{a: [4]float64{2.3, 1.7, 3.0, 5.0}, kb: -1.0, b: 0.8, g: -1.0},
		ar: [4]float64{11.7, 4.8, -0.7, 0.3}, ene: [2]float64{16.2, 8.1}, yne: [2]float64{18, 21.7}},
	// triphenylphosphine 137.2/133.7/128.5/128.7; the sp3 row estimate.
	xP3: {name: "P(III)", sp3: zrow{a: [4]float64{17, 15, 12, 10}, b: 6, g: -2},
		ar: [4]float64{8.7, 5.2, 0.0, 0.2}, ene: [2]float64{12, 5}, yne: [2]float64{10, 5}, est: true},
	// dimethyl methylphosphonate P-CH3 10.4; triphenylphosphine oxide
	// 132.6/132.1/128.5/131.9.
	xP5: {name: "P(V)", sp3: zrow{a: [4]float64{12.7, 12, 10, 8}, b: 6, g: -2},
		ar: [4]float64{4.1, 3.6, 0.0, 3.4}, ene: [2]float64{8, 8}, yne: [2]float64{5, 5}, est: true},
	// phenylboronic acid ring (ipso not observed)/135.6/127.8/131.3.
	xB: {name: "B", sp3: zrow{a: [4]float64{10, 8, 6, 4}, b: 4, g: -2},
		ar: [4]float64{1.5, 7.1, -0.7, 2.8}, ene: [2]float64{10, 10}, yne: [2]float64{5, 5}, est: true},
}

// gemPair is the correction for two non-alkyl substituents on one sp3
// carbon, by kind: CH2(OMe)2 97.9 and HC(OMe)3 112.9 against MeOMe 60.0;
// CH2F2 109.8 and CHF3 118.5 against CH3F; CH2Cl2 54.0, CHCl3 77.7, CCl4
// 96.1 against CH3Cl 25.6; CH2Br2 21.6, CHBr3 12.3 against CH3Br 10.2;
// a heteroatom next to a C=O or C≡N (ethyl chloroacetate CH2 40.9, ethyl
// bromoacetate 25.8, methoxyacetic acid 69.3, ethyl glycinate 44.0) or
// next to an aryl or vinyl group (benzyl alcohol 65.2, benzyl chloride
// 46.3, benzylamine 46.5); Pretsch; Kalinowski; Gottlieb 1997; from
// memory.
func gemPair(a, b xsub) float64 {
	ea, eb := gemElem(a), gemElem(b)
	if ea > eb {
		ea, eb = eb, ea
		a, b = b, a
	}
	switch {
	case ea == 'O' && eb == 'O':
		return -24
	case ea == 'N' && eb == 'O', ea == 'N' && eb == 'N':
		return -18
	case ea == 'F' && eb == 'F':
		return -38
	case ea == 'F':
		return -15
	case ea == 'C' && eb == 'C':
		return -1.5
	case ea == 'B' && eb == 'B':
		return -8
	}
	// One heteroatom and one carbon group (b).
	if eb == 'c' {
		acyl := isAcyl(b)
		switch ea {
		case 'O':
			if acyl {
				return -12
			}
			return -8
		case 'N':
			if acyl {
				return -8
			}
			return -5.5
		case 'C', 'B':
			if acyl {
				return -7
			}
			return -3
		case 'S':
			return -4
		}
		return -2
	}
	switch {
	case ea == 'B' || eb == 'B':
		return -5
	case ea == 'O' || eb == 'O':
		return -8
	case ea == 'S' || eb == 'S':
		return -4
	}
	return -3
}

// gemElem groups classes for gemPair: 'O' oxygen, 'N' nitrogen, 'F', 'C'
// chlorine, 'B' bromine or iodine, 'S' sulfur, 'c' carbon groups, 'x' other.
func gemElem(s xsub) byte {
	switch {
	case s >= xOH && s <= xOMinus:
		return 'O'
	case s >= xNH2 && s <= xNPlus:
		return 'N'
	case s == xF:
		return 'F'
	case s == xCl:
		return 'C'
	case s == xBr || s == xI:
		return 'B'
	case s >= xSH && s <= xSOther:
		return 'S'
	case s >= xVinyl && s <= xCOther:
		return 'c'
	}
	return 'x'
}

// Alkyl groups on a benzene ring: CH3 {9.3, 0.7, −0.1, −2.9} (toluene
// 137.8/129.2/128.4/125.6) plus, for the further substituents of the
// benzylic carbon, the differences of ethylbenzene, cumene and
// tert-butylbenzene (144.2/127.9/128.4/125.7, 148.8/126.4/128.4/125.8,
// 151.0/125.2/128.0/125.5) and of the benzylic compounds named in
// arBenzylic (Ewing 1979; Pretsch; from memory).
var (
	arMethyl      = [4]float64{9.3, 0.7, -0.1, -2.9}
	arBenzylicC   = [4][4]float64{{}, {6.3, -1.2, 0.1, 0.3}, {10.8, -2.7, 0.1, 0.4}, {12.9, -4.1, -0.5, -0.2}}
	arTrifluoroMe = [4]float64{2.6, -3.1, 0.4, 3.4} // benzotrifluoride 131.1/125.4/128.9/131.9
)

// arBenzylic returns the ring increments {ipso, ortho, meta, para} of a
// group s on the benzylic carbon, relative to CH3 (benzyl alcohol
// 141.0/127.0/128.5/127.6, benzyl methyl ether 138.3/127.7/128.4/127.6,
// benzyl acetate 136.0/128.3/128.6/128.2, benzylamine
// 143.3/127.1/128.5/126.8, N-benzylacetamide 138.2/127.8/128.7/127.5,
// N,N-dimethylbenzylamine 139.0/129.0/128.2/127.0, benzyl chloride
// 137.5/128.6/128.7/128.4, benzyl bromide 137.8/129.0/128.8/128.4,
// phenylacetic acid 133.3/129.4/128.6/127.3, benzyl cyanide
// 129.9/128.0/129.1/127.9, diphenylmethane 141.1/128.9/128.4/126.0,
// allylbenzene 140.1/128.5/128.4/126.0, benzyl methyl sulfide
// 138.4/128.8/128.4/126.9; from memory).
func arBenzylic(s xsub) [4]float64 {
	switch {
	case s == xOH:
		return [4]float64{3.2, -2.2, 0.1, 2.0}
	case s == xOR || s == xOAr || s == xOSi || s == xOVinyl:
		return [4]float64{0.5, -1.5, 0.0, 2.0}
	case s >= xOH && s <= xOMinus:
		return [4]float64{-1.8, -0.9, 0.2, 2.6}
	case s == xNH2 || s == xNHR:
		return [4]float64{5.5, -2.1, 0.1, 1.2}
	case s == xAmideNH || s == xAmideNR || s == xNS || s == xNArom:
		return [4]float64{0.4, -1.4, 0.3, 1.9}
	case s >= xNH2 && s <= xNPlus && s != xNitro:
		return [4]float64{1.2, -0.2, -0.2, 1.4}
	case s == xNitro || s == xCN:
		return [4]float64{-7.9, -1.2, 0.7, 2.3}
	case s == xF:
		return [4]float64{-1.5, -1.6, 0.3, 3.2}
	case s == xCl:
		return [4]float64{-0.3, -0.6, 0.3, 2.8}
	case s == xBr:
		return [4]float64{0.0, -0.2, 0.4, 2.8}
	case s == xI:
		return [4]float64{1.5, -0.4, 0.4, 2.3}
	case isAcyl(s):
		return [4]float64{-4.0, 0.2, 0.2, 1.6}
	case s == xAryl || s == xHetAryl:
		return [4]float64{3.3, -0.3, 0.0, 0.4}
	case s == xVinyl || s == xAlkynyl || s == xImineC:
		return [4]float64{2.3, -0.7, 0.0, 0.4}
	case s >= xSH && s <= xSOther:
		return [4]float64{0.6, -0.4, 0.0, 1.3}
	}
	return [4]float64{0, 0, 0, 0}
}

// Alkene alkyl increments (Pretsch): δ = 123.3 + Σ; α 10.6, β 7.2,
// γ −1.5 on the observed carbon's side, α' −7.9, β' −1.8, γ' 1.5 on the
// other; corrections: two α on one carbon −4.8, two α' +1.7, an α/α'
// pair cis −1.1.
const (
	eneBase                    = 123.3
	eneA, eneB, eneG           = 10.6, 7.2, -1.5
	eneA1, eneB1, eneG1        = -7.9, -1.8, 1.5
	eneGem, eneGem1, eneCisCor = -4.8, 1.7, -1.1
)

// eneBeta returns {β, β'}: the effect of group s on the α carbon of an
// alkyl substituent, on the alkene carbon bearing it and on the other,
// in place of 7.2/−1.8 for a carbon (allyl alcohol 137.2/115.0, allyl
// methyl ether 134.7/116.9, allyl acetate 132.2/118.2, allylamine
// 140.0/113.4, N,N-dimethylallylamine 135.7/117.5, N-allylacetamide
// 134.3/116.2, allyl chloride 133.9/118.6, allyl bromide 134.3/118.9,
// allyl iodide 134.5/117.5, vinylacetic acid 129.9/119.0, allyl cyanide
// 126.8/120.0, allylbenzene 137.5/115.8, 1,4-pentadiene 136.9/115.1,
// allyl methyl sulfide 134.6/117.3, allyltrimethylsilane 135.0/112.8;
// from memory).
func eneBeta(s xsub) [2]float64 {
	switch {
	case s == xOH:
		return [2]float64{3.3, -0.4}
	case s == xOR || s == xOAr || s == xOSi || s == xOVinyl:
		return [2]float64{0.8, 1.5}
	case s >= xOH && s <= xOMinus:
		return [2]float64{-1.7, 2.8}
	case s == xNH2 || s == xNHR:
		return [2]float64{6.1, -2.0}
	case s == xAmideNH || s == xAmideNR || s == xNS || s == xNArom:
		return [2]float64{0.4, 0.8}
	case s == xNitro:
		return [2]float64{-6, 6}
	case s >= xNH2 && s <= xNPlus:
		return [2]float64{1.8, 2.1}
	case s == xF:
		return [2]float64{-2, 2}
	case s == xCl:
		return [2]float64{0.0, 3.2}
	case s == xBr:
		return [2]float64{0.4, 3.5}
	case s == xI:
		return [2]float64{0.6, 2.1}
	case s == xCN:
		return [2]float64{-7.1, 4.6}
	case isAcyl(s):
		return [2]float64{-4.0, 3.6}
	case s == xAryl || s == xHetAryl:
		return [2]float64{3.6, 0.4}
	case s == xVinyl || s == xAlkynyl || s == xImineC:
		return [2]float64{3.0, -0.3}
	case s >= xSH && s <= xSOther:
		return [2]float64{0.7, 1.9}
	case s == xSi:
		return [2]float64{1.1, -2.6}
	}
	return [2]float64{1.0, 1.0}
}

// Alkyne alkyl increments (Pretsch): δ = 71.9 + Σ; α 6.9, β 4.8,
// γ −0.1, α' −5.7, β' 2.3, γ' −1.3.
const (
	yneBase             = 71.9
	yneA, yneB, yneG    = 6.9, 4.8, -0.1
	yneA1, yneB1, yneG1 = -5.7, 2.3, -1.3
)

// yneBeta: {β, β'} of a group on the α carbon of an alkyl substituent of
// an alkyne, in place of 4.8/2.3 (propargyl alcohol 82.0/73.7,
// propargyl methyl ether 79.7/74.6, propargyl acetate 77.6/75.0,
// propargylamine 85.9/70.2, propargyl chloride 76.8/74.9,
// 3-phenylpropyne 81.9/70.6; from memory).
func yneBeta(s xsub) [2]float64 {
	switch {
	case s == xOH:
		return [2]float64{3.2, 7.5}
	case s == xOR || s == xOAr || s == xOSi:
		return [2]float64{0.9, 8.4}
	case s >= xOH && s <= xOMinus:
		return [2]float64{-1.2, 8.8}
	case s >= xNH2 && s <= xNPlus:
		return [2]float64{7.1, 4.0}
	case s >= xF && s <= xI:
		return [2]float64{-2.0, 8.7}
	case isAcyl(s):
		return [2]float64{-4.0, 6.0}
	case s == xAryl || s == xHetAryl:
		return [2]float64{3.1, 4.4}
	}
	return [2]float64{1.0, 4.0}
}
