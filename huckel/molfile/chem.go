package molfile

import (
	"fmt"
	"strings"

	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"
)

// defaultValences is the valence model for an atom without a valence field: the SMILES
// reader's organic-subset defaults for neutral B C N O P S F Cl Br I (smiles.DefaultValences),
// and for charged atoms and the other main-group elements the valences of the
// isoelectronic neutral element (smiles.AllowedValences: N+ like C, O- like F, C- like N,
// B- like C), which is the usual MDL convention for charged atoms. checked is false for
// metals and noble gases, which get no implicit hydrogens.
func defaultValences(el string, q int) (vals []int, checked, ok bool) {
	if q == 0 {
		if v := smiles.DefaultValences(el); v != nil {
			return v, true, true
		}
	}
	return smiles.AllowedValences(el, q)
}

// nextValence returns the smallest value in vals that is ≥ s, or -1.
func nextValence(vals []int, s int) int {
	for _, v := range vals {
		if v >= s {
			return v
		}
	}
	return -1
}

// chargedName spells an element with its charge: "N", "N+", "O-", "Fe+3".
func chargedName(el string, q int) string {
	switch {
	case q == 0:
		return el
	case q == 1:
		return el + "+"
	case q == -1:
		return el + "-"
	}
	return fmt.Sprintf("%s%+d", el, q)
}

// radicalNames names the M  RAD and RAD= values 1-3 (CTfile formats).
var radicalNames = [4]string{"", "singlet carbene", "doublet radical", "triplet carbene"}

// build turns the connection table into the molecule: charges, isotopes, bonds,
// kekulisation of aromatic bonds, hydrogen counts and valence checks, then the record.
func (p *recParser) build(ct *ctab, props []Prop) (*Record, error) {
	m := p.graph(ct)
	if len(p.errs) > 0 {
		return nil, p.errors()
	}
	m.Reindex()
	if !p.kekulize(ct, m) {
		return nil, p.errors()
	}
	p.hydrogens(ct, m)
	if len(p.errs) > 0 {
		return nil, p.errors()
	}
	n := len(m.Atoms)
	kept := make([]int, n)
	for i := range kept {
		kept[i] = i
	}
	if !p.opts.KeepHydrogens {
		m, kept = foldHydrogens(m, false)
	}
	rec := &Record{
		Mol:       m,
		Title:     p.title,
		Props:     props,
		Coords:    make([]Point3, len(kept)),
		FileAtoms: make([]int, len(kept)),
		Version:   ct.version,
		Index:     p.index,
		Line:      p.first,
		Notes:     ct.notes(),
	}
	for i, k := range kept {
		a := ct.atoms[k]
		rec.Coords[i] = Point3{a.x, a.y, a.z}
		rec.FileAtoms[i] = k + 1
	}
	m.Name = p.title
	if p.opts.NameProp != "" {
		if v, ok := rec.Prop(p.opts.NameProp); ok {
			first, _, _ := strings.Cut(v, "\n")
			if first = strings.TrimSpace(first); first != "" {
				m.Name = first
			}
		}
	}
	m.Source = smiles.Write(m)
	return rec, nil
}

// graph builds the atoms and bonds: charges (M  CHG and M  RAD supersede the atom-block
// codes), isotopes (M  ISO supersedes the mass differences), radicals rejected, bond
// types 1-3 as orders and type 4 as an aromatic bond of order 1 for now.
func (p *recParser) graph(ct *ctab) *molecule.Molecule {
	n := len(ct.atoms)
	m := &molecule.Molecule{
		Atoms: make([]molecule.Atom, n),
		Bonds: make([]molecule.Bond, 0, len(ct.bonds)),
	}
	for k := range ct.atoms {
		a := &ct.atoms[k]
		at := molecule.Atom{Element: a.el, Map: a.mapn, Pos: -1, Isotope: a.iso}
		rad := a.radical
		switch {
		case ct.v3000 || ct.mChg:
			at.Charge = a.charge
		case a.chgCode == 4:
			rad = 2 // charge code 4: doublet radical
		default:
			at.Charge = chargeCodes[a.chgCode]
		}
		if !ct.v3000 && !ct.mIso && a.massDiff != 0 {
			base := a.iso // D and T
			if base == 0 {
				base = mostCommonIsotope(a.el)
			}
			switch {
			case base == 0:
				p.atomErrorf(k, a.line, 35, ErrUnsupported, "give the isotope with an \"M  ISO\" line",
					"atom %d %s: mass difference %+d, but %s has no reference isotope here", k+1, a.el, a.massDiff, a.el)
			case base+a.massDiff < 1:
				p.atomErrorf(k, a.line, 35, ErrSyntax, "the mass difference is added to the most common isotope's mass number",
					"atom %d %s: mass difference %+d gives no isotope", k+1, a.el, a.massDiff)
			default:
				at.Isotope = base + a.massDiff
			}
		}
		if rad != 0 {
			p.atomErrorf(k, a.line, a.col, ErrRadical, "radicals and carbenes cannot enter the Hückel stages; give the closed-shell structure, with H or a charge",
				"atom %d %s is a %s; radicals and carbenes are not supported", k+1, chargedName(a.el, at.Charge), radicalNames[rad])
		}
		m.Atoms[k] = at
	}
	seen := make(map[[2]int]int, len(ct.bonds))
	for k, b := range ct.bonds {
		key := [2]int{min(b.a, b.b), max(b.a, b.b)}
		if prev, dup := seen[key]; dup {
			p.errorf(b.line, 1, ErrSyntax, "two atoms share one bond; give double and triple bonds as types 2 and 3",
				"bond %d joins atoms %d and %d, already joined by bond %d", k+1, b.a+1, b.b+1, prev+1)
			continue
		}
		seen[key] = k
		bd := molecule.Bond{A: b.a, B: b.b, Order: b.typ}
		if b.typ == 4 {
			bd.Order = 1
			bd.Aromatic = true
			m.Atoms[b.a].Aromatic = true
			m.Atoms[b.b].Aromatic = true
		}
		m.Bonds = append(m.Bonds, bd)
	}
	return m
}

// kekulize gives the aromatic (type 4) bonds a Kekulé structure with the SMILES reader's
// matcher. An atom needs a double bond when its valence (the valence field, or the
// default valence above its bond orders, aromatic bonds counting 1) leaves room for one
// and no explicit double or triple bond supplies it, exactly as for an aromatic atom
// written without brackets in SMILES (a valence field counts as that atom's only
// valence). A pyrrole-type N therefore needs its hydrogen drawn as an atom, as it needs
// [nH] in SMILES; a file cannot say otherwise which nitrogen of an imidazole carries it.
func (p *recParser) kekulize(ct *ctab, m *molecule.Molecule) bool {
	hasArom := false
	for _, b := range m.Bonds {
		hasArom = hasArom || b.Aromatic
	}
	if !hasArom {
		return true
	}
	inRing := smiles.RingBonds(m)
	for bi, b := range m.Bonds {
		if b.Aromatic && !inRing[bi] {
			p.errorf(ct.bondLine(b), 1, ErrKekulize, "only ring bonds can be aromatic; give it as type 1 or 2",
				"aromatic bond (type 4) between atoms %d and %d lies in no ring", b.A+1, b.B+1)
		}
	}
	if len(p.errs) > 0 {
		return false
	}
	need := make([]bool, len(m.Atoms))
	for i, a := range m.Atoms {
		if !a.Aromatic {
			continue
		}
		s := 0
		multiple := false
		for _, e := range m.Neighbors(i) {
			b := m.Bonds[e.Bond]
			s += b.Order
			multiple = multiple || (!b.Aromatic && b.Order > 1)
		}
		if multiple {
			continue
		}
		if v := ct.atoms[i].val; v >= 0 {
			need[i] = v-s >= 1
			continue
		}
		vals, checked, ok := defaultValences(a.Element, a.Charge)
		if !checked || !ok {
			continue
		}
		if v := nextValence(vals, s); v >= 0 && v-s >= 1 {
			need[i] = true
		}
	}
	if u := smiles.Kekulize(m, need); u >= 0 {
		a := m.Atoms[u]
		system := smiles.AromaticSystem(m, need, u)
		why := ""
		if len(system)%2 == 1 {
			why = fmt.Sprintf("; %d atoms of this ring system need one, an odd number", len(system))
		}
		hint := "save the file with Kekulé bonds, types 1 and 2, instead of type 4"
		for _, i := range system {
			if b := m.Atoms[i]; (b.Element == "N" || b.Element == "P") && b.Charge == 0 && m.Degree(i) == 2 {
				hint = fmt.Sprintf("if atom %d %s is a pyrrole-type N-H, draw that hydrogen as an atom; or save the file with Kekulé bonds", i+1, b.Element)
				break
			}
		}
		ra := ct.atoms[u]
		p.atomErrorf(u, ra.line, ra.col, ErrKekulize, hint,
			"aromatic bonds cannot be kekulised: atom %d %s gets no double bond%s", u+1, chargedName(a.Element, a.Charge), why)
		return false
	}
	return true
}

// bondLine finds the file line of a bond (by its atoms) for messages.
func (ct *ctab) bondLine(b molecule.Bond) int {
	for _, r := range ct.bonds {
		if (r.a == b.A && r.b == b.B) || (r.a == b.B && r.b == b.A) {
			return r.line
		}
	}
	return 0
}

// hydrogens sets every atom's HCount from its valence field or the default valences and
// checks the result.
func (p *recParser) hydrogens(ct *ctab, m *molecule.Molecule) {
	for i := range m.Atoms {
		a := &m.Atoms[i]
		ra := ct.atoms[i]
		if a.Element == "*" {
			continue
		}
		s := m.BondOrderSum(i)
		name := chargedName(a.Element, a.Charge)
		if ra.val >= 0 {
			v := ra.val
			if v < s {
				p.atomErrorf(i, ra.line, ra.col, ErrValence, "correct the valence field or the bonds",
					"atom %d %s: the valence field gives %d but its bonds add up to %d", i+1, name, v, s)
				continue
			}
			a.HCount = v - s
			vals, checked, ok := smiles.AllowedValences(a.Element, a.Charge)
			if !checked {
				continue
			}
			if !ok {
				p.atomErrorf(i, ra.line, ra.col, ErrValence, "check the charge", "atom %d: charge %+d is impossible for %s", i+1, a.Charge, a.Element)
				continue
			}
			switch nv := nextValence(vals, v); {
			case nv == v:
			case nv < 0:
				p.atomErrorf(i, ra.line, ra.col, ErrValence, "check the bonds, the valence field and the charge",
					"atom %d %s has valence %d; %s allows at most %d", i+1, name, v, name, vals[len(vals)-1])
			default:
				p.atomErrorf(i, ra.line, ra.col, ErrRadical, "radicals and carbenes cannot enter the Hückel stages; correct the valence field, or add H or a charge",
					"atom %d %s: valence field %d leaves %d unpaired electron%s; radicals are not supported", i+1, name, v, nv-v, plural(nv-v))
			}
			continue
		}
		vals, checked, ok := defaultValences(a.Element, a.Charge)
		switch {
		case !checked:
			a.HCount = 0
		case !ok:
			p.atomErrorf(i, ra.line, ra.col, ErrValence, "check the charge", "atom %d: charge %+d is impossible for %s", i+1, a.Charge, a.Element)
		default:
			v := nextValence(vals, s)
			if v < 0 {
				p.atomErrorf(i, ra.line, ra.col, ErrValence, "check the bond orders and the charge",
					"atom %d %s has bonds adding up to %d; %s allows at most %d", i+1, name, s, name, vals[len(vals)-1])
				continue
			}
			a.HCount = v - s
		}
	}
}

// notes lists what was read and ignored, in a fixed order.
func (ct *ctab) notes() []string {
	var out []string
	if ct.stereoIgnored {
		out = append(out, "bond stereo marks (wedge, hash, either, CFG) read and ignored")
	}
	if ct.parityIgnored {
		out = append(out, "atom stereo parities read and ignored")
	}
	if ct.queryIgnored {
		out = append(out, "query fields (hydrogen count, substitution, unsaturation, ring bonds, topology) ignored")
	}
	if ct.sgroupsIgnored {
		out = append(out, "S-groups ignored; atoms and bonds read as drawn")
	}
	if len(ct.propsSeen) > 0 {
		out = append(out, "lines ignored: "+strings.Join(ct.propsSeen, ", "))
	}
	return out
}

// FoldHydrogens returns a copy of m in which every plain hydrogen atom (element H with no
// charge, isotope, atom map or hydrogens of its own, and exactly one bond, single, to an
// atom that is not hydrogen) is removed and counted in its neighbour's HCount, as if it had
// been left implicit. Other hydrogen atoms ([2H], [H+], H2, a bridging H) stay atoms, as a
// SMILES must write them as atoms too. kept[i] is the index in m of atom i of the copy;
// atoms keep their relative order. When atoms were removed, the copy's Source is
// smiles.Write of the copy and its Atom.Pos values are -1; otherwise Source and Pos are
// kept.
func FoldHydrogens(m *molecule.Molecule) (out *molecule.Molecule, kept []int) {
	return foldHydrogens(m, true)
}

// foldHydrogens is FoldHydrogens; the new Source is written only with setSource.
func foldHydrogens(m *molecule.Molecule, setSource bool) (out *molecule.Molecule, kept []int) {
	n := len(m.Atoms)
	fold := make([]bool, n)
	folded := false
	for i, a := range m.Atoms {
		if a.Element != "H" || a.Charge != 0 || a.Isotope != 0 || a.Map != 0 || a.HCount != 0 || m.Degree(i) != 1 {
			continue
		}
		e := m.Neighbors(i)[0]
		if m.Bonds[e.Bond].Order != 1 || m.Atoms[e.To].Element == "H" {
			continue
		}
		fold[i] = true
		folded = true
	}
	if !folded {
		c := m.Clone()
		kept = make([]int, n)
		for i := range kept {
			kept[i] = i
		}
		return c, kept
	}
	newIdx := make([]int, n)
	out = &molecule.Molecule{Name: m.Name}
	for i, a := range m.Atoms {
		if fold[i] {
			newIdx[i] = -1
			continue
		}
		newIdx[i] = len(kept)
		kept = append(kept, i)
		a.Pos = -1
		out.Atoms = append(out.Atoms, a)
	}
	for _, b := range m.Bonds {
		switch {
		case fold[b.A]:
			out.Atoms[newIdx[b.B]].HCount++
		case fold[b.B]:
			out.Atoms[newIdx[b.A]].HCount++
		default:
			b.A, b.B = newIdx[b.A], newIdx[b.B]
			out.Bonds = append(out.Bonds, b)
		}
	}
	out.Reindex()
	if setSource {
		out.Source = smiles.Write(out)
	}
	return out, kept
}
