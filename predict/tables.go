package predict

// Increment tables. Values are handbook values recalled from memory
// (Pretsch, Bühlmann, Badertscher, "Structure Determination of Organic
// Compounds: Tables of Spectral Data", 4th ed., the 1H chapters on alkanes,
// alkenes and benzenes; Silverstein, Webster, Kiemle, "Spectrometric
// Identification of Organic Compounds", 7th ed., ch. 3 and appendices) or
// derived from shifts of simple compounds recalled from the same books and
// from Gottlieb, Kotlyar, Nudelman, J. Org. Chem. 1997, 62, 7512 (CDCl3).
// Rows marked "estimate" are our own judgement for groups those tables do
// not cover; they carry a larger uncertainty (unusual[]).

// sp3 C–H base values, ppm: CH3–C 0.86 (Pretsch), C–CH2–C 1.30 (between
// Pretsch's 1.37 and Silverstein's 1.25; heptane/hexane in CDCl3 1.26),
// CH 1.55 (Pretsch 1.50), CH4 0.23 (methane, common practice).
const (
	baseCH4 = 0.23
	baseCH3 = 0.86
	baseCH2 = 1.30
	baseCH  = 1.55
)

// alphaInc[s] = {CH3, CH2, CH}: increment of one non-alkyl substituent
// replacing an alkyl group on the sp3 carbon, derived from CH3X, CH3CH2X
// and (CH3)2CHX shifts (Silverstein Table "CH3X / RCH2X / R2CHX"; Gottlieb
// 1997 for the solvents) minus the base values above. From memory.
var alphaInc = [numSub][3]float64{
	subAlkyl:      {0, 0, 0},
	subAlkenyl:    {0.85, 0.72, 0.70},    // propene 1.71, 1-butene 2.04
	subAlkynyl:    {0.94, 0.86, 0.95},    // propyne 1.80, 1-butyne 2.16
	subAryl:       {1.50, 1.33, 1.35},    // toluene 2.36, ethylbenzene 2.63, cumene 2.90
	subHetAryl:    {1.60, 1.43, 1.45},    // 2-picoline 2.55, 2-methylthiophene 2.50
	subCHO:        {1.34, 1.16, 0.87},    // acetaldehyde 2.20, propanal 2.46
	subKetone:     {1.31, 1.14, 1.03},    // acetone 2.17, butanone 2.44
	subArKetone:   {1.74, 1.68, 2.00},    // acetophenone 2.60, propiophenone 2.98
	subCOOH:       {1.24, 1.08, 1.01},    // acetic acid 2.10, propanoic acid 2.38
	subEster:      {1.19, 1.02, 1.00},    // ethyl acetate 2.05, methyl propanoate 2.32
	subAmideC:     {1.20, 0.95, 0.85},    // N,N-dimethylacetamide 2.09
	subAcylX:      {1.80, 1.60, 1.45},    // acetyl chloride 2.66
	subThioester:  {1.47, 1.25, 1.15},    // S-methyl thioacetate 2.33
	subAcylOther:  {1.40, 1.20, 1.10},    // estimate
	subCN:         {1.24, 1.06, 1.15},    // acetonitrile 2.10, propionitrile 2.36
	subImineC:     {1.09, 0.90, 0.85},    // acetone oxime 1.9
	subThioC:      {1.70, 1.50, 1.40},    // estimate
	subCOther:     {0.90, 0.75, 0.70},    // estimate
	subF:          {3.40, 3.16, 3.25},    // CH3F 4.26
	subCl:         {2.19, 2.27, 2.59},    // CH3Cl 3.05, EtCl 3.57, iPrCl 4.14
	subBr:         {1.83, 2.13, 2.66},    // CH3Br 2.69, EtBr 3.43, iPrBr 4.21
	subI:          {1.30, 1.90, 2.69},    // CH3I 2.16, EtI 3.20, iPrI 4.24
	subOH:         {2.63, 2.42, 2.49},    // methanol 3.49, ethanol 3.72, 2-propanol 4.04
	subOR:         {2.47, 2.18, 2.10},    // methyl propyl ether 3.33 (Me2O 3.24, MTBE 3.22), Et2O 3.48, iPr2O 3.65
	subOAr:        {2.94, 2.72, 2.98},    // anisole 3.80, phenetole 4.02
	subOVinyl:     {2.64, 2.45, 2.55},    // methyl vinyl ether 3.5
	subOAcyl:      {2.81, 2.82, 3.46},    // methyl acetate 3.67, ethyl acetate 4.12, iPrOAc 5.01
	subOFormyl:    {2.90, 2.91, 3.55},    // methyl formate 3.76, ethyl formate 4.21
	subOAroyl:     {3.05, 3.08, 3.67},    // methyl benzoate 3.91, ethyl benzoate 4.38
	subOCarbonate: {2.93, 2.89, 3.35},    // dimethyl carbonate 3.79
	subOCarbamate: {2.82, 2.82, 3.35},    // methyl carbamate 3.68
	subOO:         {3.00, 2.70, 2.65},    // estimate (dialkyl peroxides ~3.9–4.0)
	subON:         {2.80, 2.60, 2.65},    // methoxyamine ~3.6
	subOS:         {3.05, 2.95, 3.25},    // dimethyl sulfate 3.97, methyl mesylate 3.94
	subOP:         {2.92, 2.80, 3.05},    // trimethyl phosphate 3.78
	subOSi:        {2.59, 2.35, 2.45},    // methoxytrimethylsilane 3.45
	subOB:         {2.64, 2.55, 2.75},    // trimethyl borate 3.50
	subOX:         {2.90, 2.70, 2.70},    // estimate
	subAmine:      {1.44, 1.35, 1.42},    // methylamine 2.47, trimethylamine 2.22, Et3N 2.53
	subNAryl:      {2.02, 1.85, 2.05},    // N,N-dimethylaniline 2.93, N-ethylaniline 3.15
	subAmideN:     {2.06, 2.00, 2.50},    // DMF 2.88/2.96, N,N-diethylacetamide 3.3
	subImineN:     {2.50, 2.25, 1.95},    // N-methylimines 3.3–3.5
	subIsoCN:      {2.30, 2.10, 2.20},    // estimate (methyl isocyanide ~3.1)
	subAzo:        {2.85, 2.55, 2.30},    // azomethane 3.7
	subNitroso:    {3.20, 3.00, 3.00},    // estimate
	subNitro:      {3.43, 3.07, 3.12},    // nitromethane 4.29, nitroethane 4.37, 2-nitropropane 4.67
	subNN:         {1.65, 1.45, 1.50},    // methylhydrazine 2.5
	subNO:         {1.80, 1.60, 1.60},    // N-methylhydroxylamine 2.6
	subNS:         {1.90, 1.75, 1.90},    // N-methylsulfonamides 2.7–2.8
	subNArom:      {2.75, 2.65, 3.00},    // N-methylpyrrole 3.6, N-methylimidazole 3.65
	subSR:         {1.20, 1.20, 1.38},    // Me2S 2.09, MeSH 2.0, Et2S 2.50
	subSAr:        {1.61, 1.62, 1.80},    // thioanisole 2.47
	subSS:         {1.55, 1.40, 1.40},    // dimethyl disulfide 2.41
	subSAcyl:      {1.44, 1.58, 2.05},    // S-methyl thioesters 2.30
	subSO:         {1.76, 1.40, 1.35},    // DMSO 2.62 (Gottlieb 1997)
	subSO2:        {2.13, 1.70, 1.55},    // dimethyl sulfone 3.0
	subSOther:     {1.90, 1.60, 1.50},    // estimate
	subP3:         {0.12, 0.15, 0.15},    // trimethylphosphine ~1.0
	subP5:         {0.62, 0.45, 0.45},    // trimethylphosphine oxide 1.48
	subSi:         {-0.86, -0.80, -0.70}, // TMS 0.00, tetraethylsilane 0.5
	subB:          {-0.10, -0.10, -0.10}, // trimethylborane 0.76
}

// betaInc[s]: increment of a non-alkyl substituent on an sp3 carbon next to
// the H-bearing carbon (CH3–CH2–X type; scaled 0.85 for CH2 and 0.8 for CH
// targets, halved when the target carbon already carries a non-alkyl
// substituent). Derived from CH3CH2X methyl shifts minus 0.86; from memory.
var betaInc = [numSub]float64{
	subAlkyl: 0, subAlkenyl: 0.14, subAlkynyl: 0.29, subAryl: 0.38, subHetAryl: 0.40,
	subCHO: 0.27, subKetone: 0.20, subArKetone: 0.36, subCOOH: 0.30, subEster: 0.28, subAmideC: 0.28,
	subAcylX: 0.38, subThioester: 0.30, subAcylOther: 0.30, subCN: 0.44, subImineC: 0.20, subThioC: 0.30,
	subCOther: 0.20,
	subF:      0.20, subCl: 0.62, subBr: 0.81, subI: 0.97,
	subOH: 0.37, subOR: 0.35, subOAr: 0.54, subOVinyl: 0.40, subOAcyl: 0.40, subOFormyl: 0.44,
	subOAroyl: 0.52, subOCarbonate: 0.45, subOCarbamate: 0.40, subOO: 0.35, subON: 0.40, subOS: 0.55,
	subOP: 0.48, subOSi: 0.35, subOB: 0.35, subOX: 0.45,
	subAmine: 0.19, subNAryl: 0.35, subAmideN: 0.28, subImineN: 0.35, subIsoCN: 0.55, subAzo: 0.45,
	subNitroso: 0.60, subNitro: 0.70, subNN: 0.20, subNO: 0.30, subNS: 0.35, subNArom: 0.57,
	subSR: 0.42, subSAr: 0.45, subSS: 0.45, subSAcyl: 0.40, subSO: 0.42, subSO2: 0.52, subSOther: 0.45,
	subP3: 0.15, subP5: 0.30, subSi: 0.08, subB: 0.10,
}

// unusual marks classes outside the handbook tables (estimates): shifts
// built on them get a wider sigma and a Reason.
var unusual = [numSub]bool{
	subAcylOther: true, subThioC: true, subCOther: true, subOO: true, subOX: true, subIsoCN: true,
	subNitroso: true, subSOther: true,
}

// benzeneInc[s] = {ortho, meta, para}: substituent increments for H on a
// benzene ring, δ = 7.26 + Σ (Pretsch; Silverstein). From memory; rows
// marked estimate are our own.
var benzeneInc = [numSub][3]float64{
	subAlkyl:      {-0.17, -0.09, -0.19}, // CH3 −0.18/−0.11/−0.21, CH2R −0.14/−0.06/−0.17
	subAlkenyl:    {0.06, -0.03, -0.10},
	subAlkynyl:    {0.15, -0.02, -0.01},
	subAryl:       {0.37, 0.20, 0.10},
	subHetAryl:    {0.40, 0.20, 0.12},
	subCHO:        {0.56, 0.22, 0.29},
	subKetone:     {0.62, 0.14, 0.21},
	subArKetone:   {0.47, 0.13, 0.22},
	subCOOH:       {0.85, 0.18, 0.27},
	subEster:      {0.71, 0.11, 0.21},
	subAmideC:     {0.61, 0.10, 0.17},
	subAcylX:      {0.84, 0.22, 0.36},
	subThioester:  {0.65, 0.15, 0.25}, // estimate
	subAcylOther:  {0.60, 0.15, 0.25}, // estimate
	subCN:         {0.36, 0.18, 0.28},
	subImineC:     {0.50, 0.10, 0.15}, // estimate
	subThioC:      {0.60, 0.15, 0.25}, // estimate
	subCOther:     {0.20, 0.05, 0.05}, // estimate
	subF:          {-0.26, 0.00, -0.20},
	subCl:         {0.03, -0.02, -0.09},
	subBr:         {0.18, -0.08, -0.04},
	subI:          {0.39, -0.21, 0.00},
	subOH:         {-0.56, -0.12, -0.45},
	subOR:         {-0.48, -0.09, -0.44},
	subOAr:        {-0.29, -0.05, -0.23},
	subOVinyl:     {-0.35, -0.05, -0.30}, // estimate
	subOAcyl:      {-0.25, 0.03, -0.13},
	subOFormyl:    {-0.20, 0.05, -0.10},
	subOAroyl:     {-0.09, 0.09, -0.08},
	subOCarbonate: {-0.20, 0.05, -0.10},
	subOCarbamate: {-0.20, 0.05, -0.10},
	subOO:         {-0.20, 0.00, -0.20},  // estimate
	subON:         {-0.30, 0.00, -0.25},  // estimate
	subOS:         {-0.05, 0.07, -0.01},  // aryl sulfonates
	subOP:         {-0.10, 0.05, -0.05},  // estimate
	subOSi:        {-0.45, -0.10, -0.40}, // estimate (like OR)
	subOB:         {-0.30, -0.05, -0.25}, // estimate
	subOX:         {-0.20, 0.00, -0.20},  // estimate
	subAmine:      {-0.75, -0.25, -0.65},
	subNAryl:      {-0.45, -0.10, -0.40}, // diphenylamine
	subAmideN:     {0.12, -0.07, -0.28},
	subImineN:     {-0.20, 0.05, -0.10}, // estimate
	subIsoCN:      {0.10, 0.10, 0.10},   // estimate
	subAzo:        {0.67, 0.20, 0.20},
	subNitroso:    {0.58, 0.31, 0.37},
	subNitro:      {0.95, 0.26, 0.38},    // nitrobenzene 8.23, 7.56, 7.71
	subNN:         {-0.55, -0.15, -0.50}, // phenylhydrazine
	subNO:         {-0.30, -0.05, -0.30}, // estimate
	subNS:         {-0.10, 0.00, -0.10},  // estimate
	subNArom:      {0.14, 0.16, 0.00},    // N-phenylpyrrole
	subSR:         {-0.08, -0.10, -0.24},
	subSAr:        {0.06, -0.09, -0.15},
	subSS:         {0.23, 0.02, -0.05},
	subSAcyl:      {0.15, 0.05, 0.05}, // estimate
	subSO:         {0.39, 0.25, 0.25},
	subSO2:        {0.60, 0.25, 0.33},
	subSOther:     {0.40, 0.20, 0.25}, // estimate
	subP3:         {0.10, 0.00, 0.00}, // estimate (PPh2)
	subP5:         {0.45, 0.10, 0.20}, // estimate (P(=O)R2)
	subSi:         {0.22, -0.02, -0.02},
	subB:          {0.60, 0.10, 0.20}, // estimate (B(OH)2)
}

// pms[s] = {Z_gem, Z_cis, Z_trans}: Pascual–Meier–Simon alkene increments,
// δ = 5.25 + ΣZ (Pascual, Meier, Simon, Helv. Chim. Acta 1966, 49, 164, as
// tabulated by Pretsch). Handbook values, from memory; estimates marked.
var pms = [numSub][3]float64{
	subAlkyl:      {0.45, -0.22, -0.28},
	subAlkenyl:    {1.00, -0.09, -0.23},
	subAlkynyl:    {0.47, 0.38, 0.12},
	subAryl:       {1.38, 0.36, -0.07},
	subHetAryl:    {1.30, 0.40, 0.00}, // estimate
	subCHO:        {1.02, 0.95, 1.17},
	subKetone:     {1.10, 1.12, 0.87},
	subArKetone:   {1.10, 1.12, 0.87},
	subCOOH:       {0.97, 1.41, 0.71},
	subEster:      {0.80, 1.18, 0.55},
	subAmideC:     {1.37, 0.98, 0.46},
	subAcylX:      {1.11, 1.46, 1.01},
	subThioester:  {1.00, 1.20, 0.70}, // estimate
	subAcylOther:  {1.00, 1.10, 0.80}, // estimate
	subCN:         {0.27, 0.75, 0.55},
	subImineC:     {1.00, 0.80, 0.60}, // estimate
	subThioC:      {1.10, 1.10, 0.90}, // estimate
	subCOther:     {0.80, 0.40, 0.30}, // estimate
	subF:          {1.54, -0.40, -1.02},
	subCl:         {1.08, 0.18, 0.13},
	subBr:         {1.07, 0.45, 0.55},
	subI:          {1.14, 0.81, 0.88},
	subOH:         {1.22, -1.07, -1.21}, // enol: as O–alkyl
	subOR:         {1.22, -1.07, -1.21},
	subOAr:        {1.15, -0.50, -0.95}, // estimate between OR and OC(=O)R
	subOVinyl:     {1.21, -0.60, -1.00},
	subOAcyl:      {2.11, -0.35, -0.64},
	subOFormyl:    {2.11, -0.35, -0.64},
	subOAroyl:     {2.11, -0.35, -0.64},
	subOCarbonate: {2.00, -0.40, -0.70}, // estimate
	subOCarbamate: {2.00, -0.40, -0.70}, // estimate
	subOO:         {1.30, -0.60, -0.80}, // estimate
	subON:         {1.30, -0.70, -0.90}, // estimate
	subOS:         {1.50, -0.30, -0.50}, // estimate
	subOP:         {1.50, -0.40, -0.60}, // estimate
	subOSi:        {1.22, -1.07, -1.21}, // estimate (as OR)
	subOB:         {1.20, -0.80, -1.00}, // estimate
	subOX:         {1.30, -0.50, -0.70}, // estimate
	subAmine:      {0.80, -1.26, -1.21},
	subNAryl:      {1.17, -0.53, -0.99},
	subAmideN:     {2.08, -0.57, -0.72},
	subImineN:     {0.90, 0.20, 0.20}, // estimate
	subIsoCN:      {0.80, 0.30, 0.20}, // estimate
	subAzo:        {1.50, 0.50, 0.40}, // estimate
	subNitroso:    {1.60, 0.60, 0.50}, // estimate
	subNitro:      {1.87, 1.32, 0.62},
	subNN:         {0.90, -1.00, -1.10}, // estimate (as amine)
	subNO:         {1.00, -0.90, -1.00}, // estimate
	subNS:         {1.20, -0.50, -0.70}, // estimate
	subNArom:      {1.40, -0.50, -0.80}, // N-vinylpyrrole, estimate
	subSR:         {1.11, -0.29, -0.13},
	subSAr:        {1.11, -0.29, -0.13},
	subSS:         {1.10, -0.10, 0.00}, // estimate
	subSAcyl:      {1.20, 0.10, 0.20},  // estimate
	subSO:         {1.27, 0.67, 0.41},
	subSO2:        {1.55, 1.16, 0.93},
	subSOther:     {1.40, 0.80, 0.60}, // estimate
	subP3:         {0.50, 0.30, 0.30}, // estimate
	subP5:         {0.66, 0.88, 0.67},
	subSi:         {0.77, 0.37, 0.62},
	subB:          {0.80, 0.70, 0.70}, // estimate
}

// pmsRingAlkyl: an alkyl substituent in a ring with the double bond
// (cycloalkenes), Pretsch "alkyl-ring" row; from memory.
var pmsRingAlkyl = [3]float64{0.69, -0.25, -0.28}
