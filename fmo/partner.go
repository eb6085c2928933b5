package fmo

import (
	"errors"
	"fmt"
	"math"
	"runtime"
	"slices"

	"cyclopair/huckel"
	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"
)

// Partner is one cycloaddition partner, ready for analysis: parsed, perceived, solved, with
// its candidate reacting units and the per-unit frontier data that Analyze and QuickScore
// read. A Partner is immutable after construction and safe for concurrent use.
type Partner struct {
	Name, SMILES string
	Role         Role
	// Mol is the molecule as parsed, UNACTIVATED: products are built from it.
	Mol *molecule.Molecule
	// Activation is "none" unless the partner was activated.
	Activation string
	// Active is the molecule whose orbitals are used (== Mol when not activated). Activation
	// preserves atom indices 0..len(Mol.Atoms)-1 and only appends atoms.
	Active   *molecule.Molecule
	Pi       *huckel.PiSystem
	Orb      *huckel.Orbitals
	Units    []Unit
	Warnings []string

	data  []unitData // parallel to Units
	fast  []fastUnit // parallel to Units: data[i].fast, contiguous for the screening loop
	endo  []endoUnit // parallel to Units: secondary-orbital projector elements
	sides []*side    // parallel to Units: the partner's half of each adduct
	// eHuckel is the Hückel π energy of Pi (|β|), the reference of the localisation
	// energy under every method.
	eHuckel float64
	// freePi is the unactivated partner's π system (nil when not activated).
	freePi *huckel.PiSystem
	// noConj skips the conjugation loss of every unit (left NaN): set only for the
	// side-channel partners (analyseSide), whose preferred orientation and score read the
	// localisation but never the conjugation loss, which was about half of their
	// preparation (a second set of residue solves on the alkyl-free π system).
	noConj bool
	// unitMapsT memoises unitMaps per pair of units (unitswap.go).
	unitMapsT *unitMapTable
}

// slot layout of unitData: for a diene a,b,c,d; for a dipole a,b,c,- ; for a 2π unit
// x, y, x', y' where x' and y' are the conjugated substituent centres used for the
// secondary-orbital (endo) term (-1 when absent).
const nSlots = 4

// frontierSet is one frontier level set (a degenerate set is summed over its members)
// restricted to the unit's slots: P[i][j] = Σ_members c_i c_j.
type frontierSet struct {
	X float64 // x of the set (E = α + xβ)
	P [nSlots][nSlots]float64
	// Level is the index into Orb.Levels of the set's first member, -1 if there is none.
	Level int
	N     int // members
}

// unitData is the precomputed per-unit data (independent of Options).
type unitData struct {
	slots [nSlots]int // atom index per slot, -1 if unused
	homo  frontierSet
	lumo  frontierSet
	q     [nSlots]float64 // π charges per slot
	loc   float64         // localisation energy, |β|
	conj  float64         // conjugation loss (localisation without alkyl pseudo-atoms), |β|
	ok    bool            // both frontier sets present
	fast  fastUnit        // the ranking-score part, laid out for the screening loop
}

// NewPartnerFromMolecule perceives and solves m with opts.Params and finds its reacting
// units for the given role. Errors: perception and solver errors from package huckel,
// *SiteError from Sites.
func NewPartnerFromMolecule(name string, m *molecule.Molecule, role Role, opts *Options) (*Partner, error) {
	smi := m.Source
	if name == "" {
		name = smi
	}
	p := &Partner{Name: name, SMILES: smi, Role: role, Mol: m, Activation: "none", Active: m}
	if err := p.prepare(opts); err != nil {
		return nil, err
	}
	return p, nil
}

// prepare perceives and solves p.Active and fills units and per-unit data.
func (p *Partner) prepare(opts *Options) error {
	limit := opts.maxCentres()
	pi, err := huckel.PerceiveOptions{MaxCentres: limit}.Perceive(p.Active, opts.Params)
	if err != nil {
		if errors.Is(err, huckel.ErrTooManyCentres) {
			return fmt.Errorf("%s: %w (the pair analysis takes at most %d π centres per partner by default: its cost grows about as n^3.3, some 4 s of CPU at 200 centres; cyclopair pair --max-centres raises it)", p.Name, err, limit)
		}
		return fmt.Errorf("%s: %w", p.Name, err)
	}
	orb := new(huckel.Orbitals)
	method := opts.NewMethod
	if method == nil {
		// The default Hückel solver keeps only workspace between solves (the orbitals go
		// into orb): reuse one from a pool instead of growing a new one per partner.
		s := huckelSolvers.Get()
		defer huckelSolvers.Put(s)
		method = func() huckel.Method { return s }
	}
	if err := method().Solve(pi, orb); err != nil {
		return fmt.Errorf("%s: %w", p.Name, err)
	}
	p.Pi, p.Orb = pi, orb
	p.eHuckel = orb.PiEnergy
	if orb.Method != huckel.MethodHuckel {
		// Another method solved the orbitals: the Hückel π energy for the localisation.
		ho, err := huckel.Solve(pi)
		if err != nil {
			return fmt.Errorf("%s: %w", p.Name, err)
		}
		p.eHuckel = ho.PiEnergy
	}
	p.Warnings = append(p.Warnings, pi.Warnings...)
	p.Warnings = append(p.Warnings, orb.Warnings...)
	if orb.Partial {
		p.Warnings = append(p.Warnings, fmt.Sprintf("%s: open-shell π system (partly filled frontier shell): perturbation estimates are unreliable", p.Name))
	}
	units, sides, err := sites(p.Name, p.Mol, pi, p.Role)
	if err != nil {
		return err
	}
	p.Units = units
	p.sides = sides
	p.unitMapsT = newUnitMapTable(len(units))
	p.data = make([]unitData, len(units))
	w := locWorkPool.Get()
	defer w.release()
	for i, u := range units {
		d, err := p.unitData(u, i, w)
		if err != nil {
			return err
		}
		p.data[i] = d
	}
	p.fast = make([]fastUnit, len(units))
	p.endo = make([]endoUnit, len(units))
	for i := range p.data {
		p.fast[i] = p.data[i].fast
		p.endo[i] = p.data[i].endoUnit(units[i].Kind)
	}
	return nil
}

// fragmentFrontier returns the HOMO and LUMO level indices of π fragment f (-1 if absent).
func fragmentFrontier(o *huckel.Orbitals, f int) (homo, lumo int) {
	homo, lumo = -1, -1
	for i, l := range o.Levels { // X descending
		if l.Fragment != f {
			continue
		}
		if l.Occupancy > 0 {
			homo = i
		} else if lumo < 0 {
			lumo = i
		}
	}
	return homo, lumo
}

// unitFrontier returns the frontier levels of a reacting unit with termini t0 and t1 in π
// fragment f: the occupied and the empty level (first member of a degenerate set; -1 if
// absent) that contribute most to the termini's superdelocalizability,
//
//	occupied: max over sets of  w/x,     empty: max over sets of  w/|x|,
//	w = Σ_set (c_t0² + c_t1²),
//
// i.e. the level whose second-order interaction with a reagent level at α (the energy zero
// of Hückel theory) is largest at the atoms that form the new bonds (K. Fukui, T. Yonezawa,
// C. Nagata, J. Chem. Phys. 1957, 26, 831: superdelocalizability S_r = 2Σ_occ c_r²/x; from
// memory). In a molecule whose top level sits on the unit this is the fragment's HOMO and
// LUMO. When the top level lives elsewhere (the phenyl ring of N-phenylmaleimide or of a
// cinnamoyl group, with little amplitude at the reacting C=C), or has a node at the termini
// (the Hückel LUMO of 1,2,4,5-tetrazine at C3/C6), a level with its weight on the unit is
// taken instead: the "frontier orbital effective for reaction" (R. R. da Silva,
// T. C. Ramalho, J. M. Santos, J. D. Figueroa-Villar, J. Phys. Chem. A 2006, 110, 1031; from
// memory) and Fleming's point that the orbital with the large coefficient at the reacting
// atoms, not necessarily the molecule's HOMO, is the one that matters (I. Fleming, Molecular
// Orbitals and Organic Chemical Reactions, Wiley, 2009; from memory). There is no threshold
// to choose. An occupied level at or above α (x ≤ 0: anions, non-bonding levels) or an empty
// level at or below it (x ≥ 0: cations) sits at the reference energy and is taken directly
// (the highest such occupied, the lowest such empty level); ties go to the level nearer the
// gap.
func unitFrontier(o *huckel.Orbitals, f, t0, t1 int) (homo, lumo int) {
	homo, lumo = -1, -1
	bestH, bestL := -1.0, -1.0
	// Levels are sorted by X descending and equal X by fragment, so the members of a
	// degenerate set of one fragment are contiguous (huckel.Orbitals.Levels).
	for i, next := 0, 0; i < len(o.Levels); i = next {
		l := o.Levels[i]
		next = i + 1
		for next < len(o.Levels) && o.Levels[next].X == l.X && o.Levels[next].Fragment == l.Fragment {
			next++
		}
		if l.Fragment != f {
			continue
		}
		w := 0.0
		for li := i; li < next; li++ {
			c0, c1 := o.Coefficient(li, t0), o.Coefficient(li, t1)
			w += c0*c0 + c1*c1
		}
		if l.Occupancy > 0 {
			v := math.Inf(1)
			if l.X > 0 {
				v = w / l.X
			}
			if homo < 0 || v >= bestH { // X descending: a tie goes to the later, higher level
				homo, bestH = i, v
			}
		} else {
			v := math.Inf(1)
			if l.X < 0 {
				v = w / -l.X
			}
			if lumo < 0 || v > bestL { // a tie keeps the earlier, lower level
				lumo, bestL = i, v
			}
		}
	}
	return homo, lumo
}

// locWork is the scratch of the localisation energies of one partner's units: an
// energy-only Hückel solver and a residue system reused for every unit (no allocation per
// solve once warm), and the alkyl-free system of the conjugation loss with its π energy,
// computed once per partner rather than once per unit.
type locWork struct {
	energy huckel.EnergySolver
	rest   huckel.PiSystem
	// base is the partner's π system without alkyl pseudo-atoms (nil until needed; it
	// points at baseSys, reused between partners), baseE its π energy.
	base      *huckel.PiSystem
	baseSys   huckel.PiSystem
	alkyl     []int
	baseE     float64
	baseAlkyl bool // the partner has alkyl pseudo-atoms (valid once base is set or hasBase)
	hasBase   bool // base, baseE and baseAlkyl are set for the current partner
	// rings caches benzenoidRings of the (at most two) π systems the units are localised
	// on: the partner's and the alkyl-free one.
	rings [2]struct {
		pi    *huckel.PiSystem
		rings [][6]int
	}
}

// ringsOf returns benzenoidRings(pi), computed once per π system of the current partner.
func (w *locWork) ringsOf(pi *huckel.PiSystem) [][6]int {
	for i := range w.rings {
		if w.rings[i].pi == pi {
			return w.rings[i].rings
		}
	}
	for i := range w.rings {
		if w.rings[i].pi == nil {
			w.rings[i].pi, w.rings[i].rings = pi, benzenoidRings(pi)
			return w.rings[i].rings
		}
	}
	return benzenoidRings(pi)
}

var locWorkPool = newFreeList(func() *locWork {
	w := new(locWork)
	w.energy.Memo = true // a partner's residues share every fragment the unit does not touch
	return w
})

// huckelSolvers holds Hückel solver workspaces for prepare.
var huckelSolvers = newFreeList(func() *huckel.Solver { return new(huckel.Solver) })

// freeList keeps up to GOMAXPROCS+2 idle workspaces across garbage collections: a
// sync.Pool empties at every collection, which would throw away the solvers' eigen memos
// (huckel/internal/eigmemo, up to 2 MiB each) that make a screen's repeated fragments
// cheap. Get never blocks: with every kept workspace in use it makes a new one.
type freeList[T any] struct {
	idle chan *T
	make func() *T
}

func newFreeList[T any](f func() *T) *freeList[T] {
	return &freeList[T]{idle: make(chan *T, runtime.GOMAXPROCS(0)+2), make: f}
}

// Get returns an idle workspace or a new one.
func (l *freeList[T]) Get() *T {
	select {
	case x := <-l.idle:
		return x
	default:
		return l.make()
	}
}

// Put keeps x for the next Get, or drops it when enough are kept.
func (l *freeList[T]) Put(x *T) {
	select {
	case l.idle <- x:
	default:
	}
}

// release forgets the partner (its π system must not stay reachable from the pool) and
// returns w to the pool.
func (w *locWork) release() {
	w.base, w.hasBase = nil, false
	for i := range w.rings {
		w.rings[i].pi, w.rings[i].rings = nil, nil
	}
	w.rest.Mol, w.rest.Params, w.rest.Warnings = nil, nil, nil
	w.baseSys.Mol, w.baseSys.Params, w.baseSys.Warnings = nil, nil, nil
	locWorkPool.Put(w)
}

func (p *Partner) unitData(u Unit, ui int, w *locWork) (unitData, error) {
	var d unitData
	for i := range d.slots {
		d.slots[i] = -1
	}
	copy(d.slots[:], u.Atoms)
	if u.Kind == UnitPi && !p.noConj { // a side-channel partner's score reads no endo term
		d.slots[2] = p.endoSubstituent(u, u.Atoms[0], u.Atoms[1])
		d.slots[3] = p.endoSubstituent(u, u.Atoms[1], u.Atoms[0])
	}
	frag := p.Pi.Centres[p.Pi.AtomCentre[u.Atoms[0]]].Fragment
	t0, t1 := u.Termini()
	h, l := unitFrontier(p.Orb, frag, t0, t1)
	d.homo = p.frontier(h, d.slots)
	d.lumo = p.frontier(l, d.slots)
	d.ok = h >= 0 && l >= 0
	for i, a := range d.slots {
		if a >= 0 {
			if c := p.Pi.AtomCentre[a]; c >= 0 {
				d.q[i] = p.Orb.Charges[c]
			}
		}
	}
	loc, err := p.localization(u, p.sides[ui], w)
	if err != nil {
		return d, err
	}
	d.loc = loc
	if p.noConj {
		d.conj = math.NaN()
	} else if d.conj, err = p.conjugationLoss(u, p.sides[ui], w, loc); err != nil {
		return d, err
	}
	tEnd := len(u.Atoms) - 1
	d.fast = d.fastUnit(tEnd)
	d.fast.all = new(unitLevels)
	for li, lv := range p.Orb.Levels {
		if lv.Fragment != frag {
			continue
		}
		tl := termLevel{x: lv.X, c0: p.Orb.Coefficient(li, u.Atoms[0]), c1: p.Orb.Coefficient(li, u.Atoms[tEnd])}
		if lv.Occupancy > 0 {
			d.fast.all.occ = append(d.fast.all.occ, tl)
		} else {
			d.fast.all.emp = append(d.fast.all.emp, tl)
		}
	}
	return d, nil
}

// frontier builds the slot projector of the degenerate set containing level.
func (p *Partner) frontier(level int, slots [nSlots]int) frontierSet {
	fs := frontierSet{Level: level}
	if level < 0 {
		return fs
	}
	fs.X = p.Orb.Levels[level].X
	set := p.Orb.DegenerateSet(level)
	fs.Level = set[0]
	fs.N = len(set)
	for _, li := range set {
		for i, ai := range slots {
			if ai < 0 {
				continue
			}
			ci := p.Orb.Coefficient(li, ai)
			for j, aj := range slots {
				if aj < 0 {
					continue
				}
				fs.P[i][j] += ci * p.Orb.Coefficient(li, aj)
			}
		}
	}
	return fs
}

// endoSubstituent picks, for dienophile atom x of unit u, the conjugated substituent centre
// that can lie under the diene in an endo approach: a one-electron π centre bonded to x, not
// in the unit (the carbonyl C of an acrylate, the nitrile C, an aryl ipso C). Among several,
// the one with the largest frontier amplitude (c² summed over the HOMO and LUMO sets of the
// fragment) is chosen; -1 when x has no such substituent. The endo term is then computed
// from that atom for every orientation; the SMILES carries no stereo that would tell which
// substituents are cis, so the most favourable pair is assumed to be cis-disposed.
func (p *Partner) endoSubstituent(u Unit, x, y int) int {
	best, bestW := -1, -1.0
	frag := p.Pi.Centres[p.Pi.AtomCentre[x]].Fragment
	h, l := fragmentFrontier(p.Orb, frag)
	for _, e := range p.Mol.Neighbors(x) {
		s := e.To
		if s == y {
			continue
		}
		c := p.Pi.CentreOf(s)
		if c < 0 || !oneElectron(p.Pi.Centres[c]) {
			continue
		}
		w := 0.0
		for _, lv := range []int{h, l} {
			if lv < 0 {
				continue
			}
			for _, li := range p.Orb.DegenerateSet(lv) {
				cf := p.Orb.Coefficient(li, s)
				w += cf * cf
			}
		}
		if w > bestW+1e-12 {
			best, bestW = s, w
		}
	}
	return best
}

// localization is the π energy the partner loses when the unit's termini become sp3:
//
//	L = E_π(partner) − E_π(partner without the two termini) − Σ_termini Δh_t   (|β|, a cost)
//
// both from the same Hückel matrix (huckel.PiSystem.Without). The residual π system holds two
// π electrons fewer than the partner (they go into the new σ bonds, counted at α like every
// σ electron, plus the activator's shift Δh_t of an activated terminus; see below). For a
// 1,3-dipole the termini carry three π electrons (one is the anionic lone pair); the third
// stays on the middle atom, which keeps a lone pair in the adduct (the N of an
// isoxazolidine or triazoline). Residual centres keep their h values. A heteroatom terminus
// thus costs its electronegativity h_r as well: the Hückel form of the stronger π bond of
// C=O, C=N and C≡N that makes them poorer dienophiles than C=C. A ring of six π centres that
// the reaction breaks pays its whole delocalisation energy (localizeBenzenoid).
//
// L is a Hückel quantity whatever method solved the partner's orbitals (Options.NewMethod):
// the PPP total energy of the residue would depend on the core charges left behind by the
// two sp3 termini and on a geometry the 2D layout does not give, so no PPP form of the
// localisation energy is offered. Under PPP both terms come from Hückel solves of the same
// PiSystem, so L is the same number under either method.
func (p *Partner) localization(u Unit, sd *side, w *locWork) (float64, error) {
	return p.localizationOf(p.Pi, p.eHuckel, u, sd, w)
}

// conjugationLoss is the localisation energy of the unit with the hyperconjugative alkyl
// pseudo-atoms (centre type huckel.Alkyl) left out of the π system before and after: the π
// conjugation (aromaticity, donor and acceptor conjugation) the reaction destroys, without
// the hyperconjugation the heteroatom model of alkyl groups adds. That model's h and k are
// chosen to reproduce orbital energies (ionisation potentials, spectra; A. Streitwieser,
// Molecular Orbital Theory for Organic Chemists, Wiley 1961, ch. 5; from memory), not ground-state
// stabilisation, which for hyperconjugation is small (M. J. S. Dewar, H. N. Schmeising,
// Tetrahedron 1959, 5, 166; from memory): with them, cyclopentadiene's two C–CH2 links
// would cost 0.51 |β| more than butadiene, more than furan's aromaticity (0.45 |β|).
// Equal to localization (loc, already computed for u) when the partner has no alkyl
// pseudo-atom. The alkyl-free system and its π energy are computed at the first unit and
// kept in w for the partner's other units.
func (p *Partner) conjugationLoss(u Unit, sd *side, w *locWork, loc float64) (float64, error) {
	if !w.hasBase {
		w.alkyl = w.alkyl[:0]
		for i, c := range p.Pi.Centres {
			if c.Type == huckel.Alkyl {
				w.alkyl = append(w.alkyl, i)
			}
		}
		w.baseAlkyl = len(w.alkyl) > 0
		if w.baseAlkyl {
			p.Pi.WithoutInto(&w.baseSys, w.alkyl...)
			w.base = &w.baseSys
			w.baseE = 0
			if len(w.base.Centres) > 0 {
				e, err := w.energy.PiEnergy(w.base)
				if err != nil {
					return 0, fmt.Errorf("%s: conjugation loss at %s: %w", p.Name, u.Describe(p.Mol), err)
				}
				w.baseE = e
			}
		}
		w.hasBase = true
	}
	if !w.baseAlkyl {
		return loc, nil
	}
	return p.localizationOf(w.base, w.baseE, u, sd, w)
}

// localizationOf is localization on the π system pi of π energy ePi (|β|).
// The residue is built in w.rest and solved for its energy only (huckel.EnergySolver, equal
// to huckel.Solve's PiEnergy bit for bit).
func (p *Partner) localizationOf(pi *huckel.PiSystem, ePi float64, u Unit, sd *side, w *locWork) (float64, error) {
	t0, t1 := u.Termini()
	c0, c1 := pi.CentreOf(t0), pi.CentreOf(t1)
	removed := pi.Centres[c0].Electrons + pi.Centres[c1].Electrons
	rest := &w.rest
	pi.WithoutInto(rest, c0, c1)
	if extra := removed - 2; extra > 0 {
		// give the surplus to the inner atom(s) next to the termini
		for _, a := range u.Atoms[1 : len(u.Atoms)-1] {
			c := rest.CentreOf(a)
			for extra > 0 && c >= 0 && rest.Centres[c].Electrons < 2 {
				rest.Centres[c].Electrons++
				extra--
			}
		}
		if extra > 0 {
			return 0, fmt.Errorf("%s: unit %s: cannot place %d π electrons of the termini", p.Name, u.Describe(p.Mol), extra)
		}
	}
	if sd != nil {
		localizeBenzenoid(pi, rest, sd, t0, t1, w.ringsOf(pi))
	}
	eRest := 0.0
	if len(rest.Centres) > 0 {
		e, err := w.energy.PiEnergy(rest)
		if err != nil {
			return 0, fmt.Errorf("%s: localisation at %s: %w", p.Name, u.Describe(p.Mol), err)
		}
		eRest = e
	}
	// An activator bound at a terminus (the Lewis acid on a carbonyl O, the proton of an
	// oxocarbenium ion) stays bound in the adduct, so the shift it gives that atom's Coulomb
	// integral, Δh = h(activated) − h(free), is counted for the electron the terminus puts
	// into its new σ bond as well: that electron sits at α + Δh·β, not at α. Without this a
	// Lewis acid (O=LA h 2.0 against 1.0 for a free carbonyl O) raised the C=O localisation
	// of benzaldehyde by 1.68 |β| and made the activated C=O less reactive, against experiment
	// (S. Danishefsky, J. F. Kerwin, S. Kobayashi, J. Am. Chem. Soc. 1982, 104, 358). The free
	// atom's own h stays a cost: crediting it too (σ electron at α + h·β) makes an isolated
	// C=O cost √(h² + 4k²) ≈ 2.2 |β| against 2 for C=C, far below the real gap between the
	// two π bonds (about 93 against 65 kcal/mol; from memory), and on the check set turns
	// quinones into hetero-dienophiles at C=O (measured: site-03, site-04, site-06, endo-04
	// and 2-methoxy-p-benzoquinone + butadiene become misses).
	credit := 0.0
	if p.freePi != nil {
		for _, t := range [2]int{t0, t1} {
			if fc := p.freePi.CentreOf(t); fc >= 0 {
				credit += pi.Centres[pi.CentreOf(t)].H - p.freePi.Centres[fc].H
			}
		}
	}
	loc := ePi - eRest - credit
	if math.IsNaN(loc) {
		return 0, fmt.Errorf("%s: localisation at %s is not a number", p.Name, u.Describe(p.Mol))
	}
	return loc, nil
}

// UnitConjugationLoss returns the conjugation loss of reacting unit i: its localisation
// energy with the hyperconjugative alkyl pseudo-atoms left out (see conjugationLoss), |β|;
// what the rate model (fmo/rate) reads as the diene's aromaticity and conjugation cost.
func (p *Partner) UnitConjugationLoss(i int) float64 {
	if i < 0 || i >= len(p.fast) {
		return math.NaN()
	}
	return p.fast[i].conj // == data[i].conj (fastUnit), and kept by Compact
}

// UnitLocalization returns the localisation energy of reacting unit i (index into Units),
// |β|: the π energy this partner alone loses when the unit's termini become sp3 (see
// localization). An orientation's Localization is the sum of both partners' values.
func (p *Partner) UnitLocalization(i int) float64 {
	if i < 0 || i >= len(p.fast) {
		return math.NaN()
	}
	return p.fast[i].loc // == data[i].loc (fastUnit), and kept by Compact
}

// Compact returns a copy of p that keeps only what screening reads: Name, SMILES, Role,
// Activation, Units and the per-unit frontier data of QuickScore, Box, UnitHasFrontier,
// UnitLocalization and UnitConjugationLoss (a few hundred bytes per unit, against tens of
// kilobytes for the orbitals, π system and molecule of a full partner). Mol, Active, Pi,
// Orb and Warnings are nil: Analyze, Effect, WithActivation, side channels and drawings
// need the full partner, which a screen rebuilds for the rows it prints. allOrbitals keeps
// every level's terminus coefficients as well, for Options.AllOrbitals scoring. p is not
// changed.
func (p *Partner) Compact(allOrbitals bool) *Partner {
	q := &Partner{Name: p.Name, SMILES: p.SMILES, Role: p.Role, Activation: p.Activation, Units: p.Units,
		fast: slices.Clone(p.fast), endo: slices.Clone(p.endo), eHuckel: p.eHuckel}
	if !allOrbitals {
		for i := range q.fast {
			q.fast[i].all = nil
		}
	}
	return q
}

// IsCompact reports whether p is a Compact copy (no molecule, π system or orbitals).
func (p *Partner) IsCompact() bool { return p.Orb == nil }

// NewPartner parses smi (errors from the SMILES reader are returned unchanged, so a caller
// can report *smiles.Error positions) and builds the partner as NewPartnerFromMolecule does.
func NewPartner(name, smi string, role Role, opts *Options) (*Partner, error) {
	m, err := smiles.Parse(smi)
	if err != nil {
		return nil, err
	}
	if name == "" {
		name = smi
	}
	m.Name = name
	p, err := NewPartnerFromMolecule(name, m, role, opts)
	if err != nil {
		return nil, err
	}
	p.SMILES = smi
	return p, nil
}

// WithActivation returns a copy of the dienophile partner activated with mode ("none",
// "proton", "lewis", "iminium"; see Activate): its orbitals and reacting units come from the
// activated molecule, its products from the unactivated one. act may be nil (defaults).
// For "lewis" a non-zero act.LewisStrength is applied to the parameter set (LewisParams).
func (p *Partner) WithActivation(mode string, act *ActivateOptions, opts *Options) (*Partner, error) {
	if mode == "" || mode == ActivateNone {
		q := *p
		return &q, nil
	}
	am, warns, err := Activate(p.Mol, mode, act)
	if err != nil {
		return nil, err // Activate names the molecule
	}
	o := opts
	if mode == ActivateLewis && act != nil && act.LewisStrength != 0 {
		oc := *opts
		oc.Params = LewisParams(opts.Params, act.LewisStrength)
		o = &oc
	}
	q := &Partner{Name: p.Name, SMILES: p.SMILES, Role: p.Role, Mol: p.Mol, Activation: mode, Active: am, freePi: p.Pi}
	q.Warnings = append(q.Warnings, warns...)
	if err := q.prepare(o); err != nil {
		return nil, err
	}
	return q, nil
}

// localizeBenzenoid removes from rest (the π system left when the unit's termini t0, t1
// become sp3) the delocalisation across the remnant of every benzenoid ring the reaction
// breaks: a six-membered ring of one-electron π centres that holds a terminus and shares no
// atom with another such ring. In that ring the π bonds that are single in the adduct's
// Kekulé structure sd get k = 0, so the ring's remaining double bonds count as localised
// (each still conjugated with its substituents). An arene C=C as a 2π unit then pays the
// ring's whole delocalisation energy (benzene: L = 4 |β| instead of the Hückel 3.53, which
// credits the cyclohexadiene left behind with the delocalisation energy of a butadiene, 0.47
// |β|): acyclic conjugation carries next to no π stabilisation against which aromaticity is
// measured (M. J. S. Dewar, C. de Llano, J. Am. Chem. Soc. 1969, 91, 789; B. A. Hess,
// L. J. Schaad, J. Am. Chem. Soc. 1971, 93, 305). A benzo ring reacting as a 4π unit across
// its para positions (benzene: two isolated C=C left) is unchanged. Fused rings (naphthalene,
// anthracene) keep the plain Hückel residual: their remnant atoms stay in an intact ring.
//
// rings are benzenoidRings(pi).
func localizeBenzenoid(pi, rest *huckel.PiSystem, sd *side, t0, t1 int, rings [][6]int) {
	if sd == nil {
		return
	}
	for ri, r := range rings {
		if !slices.Contains(r[:], pi.CentreOf(t0)) && !slices.Contains(r[:], pi.CentreOf(t1)) {
			continue
		}
		fused := false
		for rj, q := range rings {
			if rj != ri && slices.ContainsFunc(q[:], func(c int) bool { return slices.Contains(r[:], c) }) {
				fused = true
			}
		}
		if fused {
			continue
		}
		in := func(a int) bool {
			c := pi.CentreOf(a)
			return c >= 0 && slices.Contains(r[:], c) && a != t0 && a != t1
		}
		for bi := range rest.Bonds {
			b := &rest.Bonds[bi]
			ai, aj := rest.Centres[b.I].Atom, rest.Centres[b.J].Atom
			if in(ai) && in(aj) && b.Bond >= 0 && b.Bond < len(sd.orders) && sd.orders[b.Bond] == 1 {
				b.K = 0
			}
		}
	}
}

// benzenoidRings returns every six-membered ring of one-electron π centres joined by π
// bonds, as sorted centre indices, each once.
func benzenoidRings(pi *huckel.PiSystem) [][6]int {
	nb := piNeighbours(pi)
	var out [][6]int
	var path [6]int
	var walk func(depth int)
	walk = func(depth int) {
		cur := path[depth-1]
		for _, nx := range nb[cur] {
			if !oneElectron(pi.Centres[nx]) {
				continue
			}
			if depth == 6 {
				if nx == path[0] {
					r := path
					slices.Sort(r[:])
					if !slices.Contains(out, r) {
						out = append(out, r)
					}
				}
				continue
			}
			if nx <= path[0] || slices.Contains(path[:depth], nx) {
				continue // rings are found from their smallest centre only
			}
			path[depth] = nx
			walk(depth + 1)
		}
	}
	for c := range pi.Centres {
		if !oneElectron(pi.Centres[c]) {
			continue
		}
		path[0] = c
		walk(1)
	}
	return out
}
