package predict

import "shiftrank/molecule"

// exch fills an exchangeable result: broad singlet over a wide range.
// Ranges are common practice in CDCl3 (alcohol ~0.5–5, phenol ~4–8,
// carboxylic acid ~10–13, amine ~0.5–5, amide ~5–9 ppm).
func exch(r *shiftResult, ac *acc, kind string, shift, lo, hi float64) {
	r.kind = kind
	r.exch, r.broad = true, true
	ac.add("typical "+kind, shift)
	r.lo, r.hi = lo, hi
	r.sigma = (hi - lo) / 4
}

func (p *Predictor) exchangeable(m *mol, gr *hgroup, r *shiftResult, ac *acc) {
	g := m.g
	x := gr.atom
	a := g.Atoms[x]
	nbs := g.Neighbors(x)
	if p.opts.Explain {
		defer func() {
			r.reasons = append(r.reasons, "exchangeable hydrogen: broad singlet, neither split nor splitting (fast exchange), shift depends on concentration, solvent and temperature")
		}()
	}
	switch a.Element {
	case molecule.O:
		if len(nbs) == 0 {
			exch(r, ac, "H2O", 1.56, 1.5, 4.8) // water in CDCl3, Gottlieb 1997
			return
		}
		y := nbs[0].Atom
		ey := g.Atoms[y].Element
		switch {
		case ey == molecule.C && m.arom[y]:
			if v, what := m.chelatedPhenol(y); v > 0 {
				exch(r, ac, "OH (phenol, H-bonded to "+what+")", v, v-1.5, v+1.5)
				if p.opts.Explain {
					r.reasons = append(r.reasons, "intramolecular hydrogen bond to the ortho "+what+": the OH is a sharp singlet far downfield, little dependent on concentration")
				}
				return
			}
			exch(r, ac, "OH (phenol)", 5.5, 4, 8)
		case ey == molecule.C && (m.carbonylOf(y) >= 0 || m.thioCarbonylOf(y) >= 0):
			exch(r, ac, "COOH (acid)", 11.5, 10, 13)
		case ey == molecule.C && m.multi[y] > 0:
			exch(r, ac, "OH (enol)", 6.0, 4, 16)
		case ey == molecule.C:
			exch(r, ac, "OH (alcohol)", 2.0, 0.5, 5)
		case ey == molecule.O:
			exch(r, ac, "OOH (hydroperoxide)", 7.8, 6.5, 9.5)
		case ey == molecule.N:
			if m.multi[y] > 0 {
				exch(r, ac, "N–OH (oxime)", 9.0, 7, 11)
			} else {
				exch(r, ac, "N–OH (hydroxylamine)", 6.0, 4, 8)
			}
		case ey == molecule.S:
			exch(r, ac, "S–OH (sulfonic/sulfinic acid)", 10.5, 8, 13)
		case ey == molecule.P:
			exch(r, ac, "P–OH (phosphorus acid)", 10.0, 7, 13)
		case ey == molecule.B:
			exch(r, ac, "B–OH (boronic acid)", 5.0, 4, 8)
		case ey == molecule.Si:
			exch(r, ac, "Si–OH (silanol)", 2.0, 1, 4)
		default:
			exch(r, ac, "O–H (unusual)", 5.0, 1, 11)
			r.reasons = append(r.reasons, "O–H on an unusual atom: estimate")
		}
	case molecule.N:
		if m.arom[x] {
			// Pyrrole-type NH (pyrrole ~8.0; azoles 10–13).
			azole := false
			for _, y := range m.aromRing(x) {
				if y != x && g.Atoms[y].Element == molecule.N {
					azole = true
				}
			}
			if azole {
				exch(r, ac, "NH (azole)", 11.0, 9, 14)
			} else {
				exch(r, ac, "NH (pyrrole)", 8.0, 7, 11)
			}
			return
		}
		if m.multi[x] > 0 {
			exch(r, ac, "=NH (imine)", 8.0, 5, 11)
			return
		}
		acyl, aryl, sulfonyl, nn, no, acylHet := 0, false, false, false, false, false
		for _, nb := range nbs {
			y := nb.Atom
			switch g.Atoms[y].Element {
			case molecule.C:
				if m.carbonylOf(y) >= 0 || m.thioCarbonylOf(y) >= 0 {
					acyl++
					for _, n2 := range g.Neighbors(y) {
						if n2.Atom != x && n2.Order == molecule.Single {
							if e := g.Atoms[n2.Atom].Element; e == molecule.O || e == molecule.N {
								acylHet = true
							}
						}
					}
				} else if m.arom[y] {
					aryl = true
				}
			case molecule.S:
				if m.doubleCount(y) > 0 {
					sulfonyl = true
				}
			case molecule.N:
				nn = true
			case molecule.O:
				no = true
			}
		}
		switch {
		case acyl >= 2:
			exch(r, ac, "NH (imide)", 8.5, 7.5, 11)
		case acyl == 1 && acylHet:
			exch(r, ac, "NH (carbamate/urea)", 5.0, 4, 7.5)
		case acyl == 1 && gr.split == 2:
			v := 5.7
			if gr.side == 2 {
				v = 6.2
			}
			exch(r, ac, "NH2 (amide)", v, 5, 8)
		case acyl == 1 && aryl:
			exch(r, ac, "NH (anilide)", 7.4, 6.5, 9.5)
		case acyl == 1:
			exch(r, ac, "NH (amide)", 6.0, 5, 9)
		case sulfonyl:
			exch(r, ac, "NH (sulfonamide)", 5.0, 4, 8)
		case aryl:
			exch(r, ac, "NH (arylamine)", 3.7, 3, 6)
		case no:
			exch(r, ac, "NH (hydroxylamine)", 5.0, 3.5, 8)
		case nn:
			exch(r, ac, "NH (hydrazine)", 3.2, 2, 5)
		case len(nbs) == 0:
			exch(r, ac, "NH3", 0.6, 0.3, 1.5)
		default:
			exch(r, ac, "NH (amine)", 1.3, 0.5, 5)
		}
	case molecule.S:
		if g.Valence(x) > 2 {
			r.kind = "S–H (hypervalent)"
			ac.add("estimate: H on hypervalent S", 4.0)
			r.lo, r.hi, r.sigma = 1, 10, 2.5
			r.broad = true
			r.reasons = append(r.reasons, "H on a hypervalent sulfur is outside the tables: estimate with a wide range")
			return
		}
		if len(nbs) == 0 {
			exch(r, ac, "H2S", 0.9, 0.5, 1.5)
			return
		}
		y := nbs[0].Atom
		switch {
		case m.arom[y]:
			exch(r, ac, "SH (thiophenol)", 3.4, 3, 4)
		case g.Atoms[y].Element == molecule.C && (m.carbonylOf(y) >= 0 || m.thioCarbonylOf(y) >= 0):
			exch(r, ac, "SH (thioacid)", 4.5, 3, 6)
		default:
			exch(r, ac, "SH (thiol)", 1.4, 1, 2)
		}
		r.sigma = (r.hi - r.lo) / 3
	}
}

// siliconH: Si–H 3.5–4.7 (Et3SiH 3.6, (EtO)3SiH 4.2, PhSiH3 4.2, HSiCl3
// 6.1; Pretsch, from memory). Not exchangeable.
func (p *Predictor) siliconH(m *mol, gr *hgroup, r *shiftResult, ac *acc) {
	g := m.g
	r.kind = "Si–H"
	r.sigma = 0.4
	ac.add("base Si–H (trialkylsilane)", 3.7)
	for _, nb := range g.Neighbors(gr.atom) {
		s := m.classify(gr.atom, nb.Atom)
		switch {
		case s == subAryl || s == subHetAryl || s == subAlkenyl:
			ac.addSub("on Si: ", s, 0.25)
		case s >= subOH && s <= subOX, s >= subAmine && s <= subNArom:
			ac.addSub("on Si: ", s, 0.25)
		case s >= subF && s <= subI:
			ac.addSub("on Si: ", s, 0.8)
		}
	}
	if g.Atoms[gr.atom].HCount >= 3 {
		ac.add("SiH3", -0.2)
	}
}

// phosphorusH: P(III)–H 2.5–4 (PhPH2 4.0), P(V)–H 6.5–7.5 (dialkyl
// phosphites 6.8); split by 1J(P,H) 200 / 600 Hz (Pretsch, from memory).
func (p *Predictor) phosphorusH(m *mol, gr *hgroup, r *shiftResult, ac *acc) {
	g := m.g
	r.sigma = 0.6
	if g.Valence(gr.atom) >= 5 || m.multi[gr.atom] > 0 {
		r.kind = "P(V)–H"
		ac.add("base P(V)–H", 7.0)
		return
	}
	r.kind = "P(III)–H"
	ac.add("base P(III)–H", 2.8)
	for _, nb := range g.Neighbors(gr.atom) {
		if m.arom[nb.Atom] {
			ac.add("aryl on P", 1.0)
			break
		}
	}
}

// boronH: B–H is broadened by the quadrupolar 11B nucleus; trialkylborane
// and borane adducts 0.5–2.5, H–B(OR)2 ~4 (Pretsch, from memory).
func (p *Predictor) boronH(m *mol, gr *hgroup, r *shiftResult, ac *acc) {
	g := m.g
	r.kind = "B–H"
	r.broad = true
	r.sigma = 1.0
	onO := false
	for _, nb := range g.Neighbors(gr.atom) {
		if e := g.Atoms[nb.Atom].Element; e == molecule.O || e == molecule.N {
			onO = true
		}
	}
	if onO {
		ac.add("base H–B(OR)2", 4.0)
	} else {
		ac.add("base B–H (borane)", 1.8)
	}
	r.half = 1.5
	if p.opts.Explain {
		r.reasons = append(r.reasons, "B–H: broadened by the quadrupolar 11B nucleus; reported as a broad singlet, couplings not resolved")
	}
}

// chelatedPhenol: for the aromatic carbon y carrying an OH, the shift of an
// OH held by an intramolecular hydrogen bond to an acceptor on an ortho
// ring carbon, and the acceptor's name; 0 if there is none. Aldehyde 11.0
// and ester 10.8 from salicylaldehyde (11.03) and methyl salicylate (10.76)
// (testdata/classes/hbonded_oh.json, tuning part); ketones, acids and
// amides 11.5, the middle of the 10.5–12.5 ppm range of such OH (common
// practice); o-nitrophenol 10.6 and o-hydroxyaryl imines 13.0 (from
// memory).
func (m *mol) chelatedPhenol(y int) (float64, string) {
	g := m.g
	best, what := 0.0, ""
	for _, n1 := range g.Neighbors(y) {
		z := n1.Atom
		if !m.arom[z] || m.ringBond[n1.Bond] == 0 {
			continue
		}
		for _, n2 := range g.Neighbors(z) {
			w := n2.Atom
			if w == y || m.ringBond[n2.Bond] != 0 || n2.Order != molecule.Single {
				continue
			}
			var v float64
			var name string
			switch g.Atoms[w].Element {
			case molecule.C:
				switch s := m.classify(z, w); {
				case s == subCHO:
					v, name = 11.0, "C=O (aldehyde)"
				case s == subEster:
					v, name = 10.8, "C=O (ester)"
				case s >= subKetone && s <= subAmideC:
					v, name = 11.5, "C=O"
				case s == subImineC:
					v, name = 13.0, "C=N"
				}
			case molecule.N:
				if m.classify(z, w) == subNitroso || m.nitro(w) {
					v, name = 10.6, "NO2"
				}
			}
			if v > best {
				best, what = v, name
			}
		}
	}
	return best, what
}

// nitro reports whether N atom w is a nitro group (two O on N, one or both
// doubly bonded, charge-separated or not).
func (m *mol) nitro(w int) bool {
	o := 0
	for _, nb := range m.g.Neighbors(w) {
		if m.g.Atoms[nb.Atom].Element == molecule.O && m.g.Degree(nb.Atom) == 1 && m.g.Atoms[nb.Atom].HCount == 0 {
			o++
		}
	}
	return o == 2
}
