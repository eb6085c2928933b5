package screen

import (
	"context"
	"errors"
	"fmt"
	"math"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"

	"cyclopair/fmo"
	"cyclopair/fmo/rate"
	"cyclopair/fmo/substrates"
	"cyclopair/huckel/molecule"
)

// Prepared is a library with every molecule prepared, ready to be screened any number of
// times (with different ranking, filters, shards). It is safe for concurrent use.
type Prepared struct {
	Opts        *fmo.Options
	Activations []string
	Dienes      []*fmo.Partner // one per good diene row, in file order
	DieneRows   []substrates.Substrate
	Dienophiles []*fmo.Partner // free dienophiles, one per good row
	DphRows     []substrates.Substrate
	// Variants[j][a] is dienophile j under Activations[a]; nil when the mode does not apply
	// to it (nothing to activate) or failed (then it is in Failures).
	Variants [][]*fmo.Partner
	Failures []ScreenFailure // preparation failures, in file order
	// NotApplicable counts (dienophile, mode) combinations skipped because the mode has
	// nothing to act on (e.g. iminium activation of acrylonitrile).
	NotApplicable int
	activate      *fmo.ActivateOptions
	quick         *fmo.QuickKernel
	rate          *rate.Model           // the rate model for the rate key and the rows' rate
	temperatureC  float64               // of the isomer shares
	dieneConf     [][]rate.Conformation // per diene, per reacting unit
	sides         fmo.SideChannelCache  // dimerisation per diene, shared by every row of that diene

	// compactForm: Dienes, Dienophiles and Variants hold fmo.Partner.Compact copies and
	// the full partners are rebuilt on demand (full), from dieneSrc and dphSrc.
	compactForm      bool
	full             *fullCache
	dieneSrc, dphSrc []partnerSource
}

// Space is the pair space of the prepared library.
func (p *Prepared) Space() PairSpace {
	return PairSpace{Dienes: len(p.Dienes), Dienophiles: len(p.Dienophiles), Activations: len(p.Activations)}
}

// PrepareOptions tune Prepare.
type PrepareOptions struct {
	Workers  int                  // ≤ 0: runtime.GOMAXPROCS(0)
	Activate *fmo.ActivateOptions // nil: defaults (pyrrolidine for iminium, the set's O=LA for Lewis)
	// Progress, if not nil, is called concurrently from workers with the number of
	// molecules (or activated variants) just prepared.
	Progress func(n int64)
	// RateModel is the rate model for the rate key and every row's rate (nil: the bundled
	// model, rate.Default).
	RateModel *rate.Model
	// TemperatureC is the temperature of the predicted isomer shares (0: 25 °C).
	TemperatureC float64
	// Compact keeps only the screening data of each partner (fmo.Partner.Compact: about
	// 1 kB per molecule instead of some 30 kB with orbitals, π system and molecule) in
	// Dienes, Dienophiles and Variants. The full partners of a printed row are rebuilt, once
	// each, by AnalyzeAt and by Diene, Dienophile and Variant, which give the full partner
	// either way. Meant for ranked screens with a top K, where few partners are ever
	// printed; a screen that prints every row rebuilds every partner once.
	Compact bool
}

// Prepare builds every partner of lib with opts. Each distinct SMILES (with the same pins)
// of a role is perceived and solved once. Failures are collected in the result; the error
// is non-nil only when ctx is canceled.
func Prepare(ctx context.Context, lib *substrates.Library, opts *fmo.Options, po PrepareOptions) (*Prepared, error) {
	workers, act := po.Workers, po.Activate
	if workers <= 0 {
		workers = runtime.GOMAXPROCS(0)
	}
	tick := func() {
		if po.Progress != nil {
			po.Progress(1)
		}
	}
	p := &Prepared{Opts: opts, Activations: slices.Clone(lib.Activations), activate: act, quick: fmo.NewQuickKernel(opts),
		rate: po.RateModel, temperatureC: po.TemperatureC, compactForm: po.Compact}
	if p.rate == nil {
		m, err := rate.Default()
		if err != nil {
			return nil, err
		}
		p.rate = m
	}
	if p.temperatureC == 0 {
		p.temperatureC = 25
	}
	if len(p.Activations) == 0 {
		p.Activations = []string{fmo.ActivateNone}
	}
	type job struct {
		sub  *substrates.Substrate
		role fmo.Role
	}
	rows := make([]job, 0, len(lib.Dienes)+len(lib.Dienophiles))
	for i := range lib.Dienes {
		rows = append(rows, job{&lib.Dienes[i], fmo.RoleDiene})
	}
	for i := range lib.Dienophiles {
		rows = append(rows, job{&lib.Dienophiles[i], fmo.RoleDienophile})
	}
	// Distinct molecules per role: rows with the same SMILES and pins share one partner.
	type molKey struct {
		role fmo.Role
		smi  string
		pin  string
	}
	first := map[molKey]int{}
	owner := make([]int, len(rows)) // row -> row index that builds the partner
	same := map[int][]int{}         // owner row -> the other rows of its molecule
	for i, r := range rows {
		k := molKey{r.role, r.sub.SMILES, fmt.Sprint(r.sub.Pin)}
		if f, ok := first[k]; ok {
			owner[i] = f
			same[f] = append(same[f], i)
		} else {
			first[k] = i
			owner[i] = i
		}
	}
	// One job per distinct molecule builds its partner, every row's activated variants
	// (a duplicate row's under its own name) and the diene conformations, then keeps the
	// compact form when asked: the full partners of one molecule are garbage as soon as its
	// job ends, so a compact preparation never holds every full partner at once.
	na := len(p.Activations)
	built := make([]*fmo.Partner, len(rows))      // per row: the partner (a duplicate: renamed copy)
	variants := make([][]*fmo.Partner, len(rows)) // per dienophile row, per mode
	verrs := make([][]error, len(rows))
	conf := make([][]rate.Conformation, len(rows))
	errs := make([]error, len(rows))
	err := parallelFor(ctx, workers, len(rows), func(i int) {
		defer tick()
		if owner[i] != i {
			return
		}
		r := rows[i]
		m := r.sub.Mol
		if m == nil {
			errs[i] = fmt.Errorf("%w: row was not parsed", substrates.ErrBadSMILES)
			return
		}
		part, err := fmo.NewPartnerFromMolecule(r.sub.Name, m, r.role, opts)
		if err != nil {
			errs[i] = err
			return
		}
		part.SMILES = r.sub.SMILES
		for _, ri := range append([]int{i}, same[i]...) {
			rp := part
			if ri != i { // same molecule under another name
				c := *part
				c.Name = rows[ri].sub.Name
				rp = &c
			}
			if r.role == fmo.RoleDiene {
				conf[ri] = rate.PartnerConformations(rp)
			} else {
				variants[ri] = make([]*fmo.Partner, na)
				verrs[ri] = make([]error, na)
				for a, mode := range p.Activations {
					if mode == fmo.ActivateNone {
						continue // the free partner itself, set below
					}
					v, err := rp.WithActivation(mode, act, opts)
					if err != nil {
						verrs[ri][a] = err
						continue
					}
					variants[ri][a] = p.compact(v)
				}
				if po.Progress != nil {
					po.Progress(int64(na))
				}
			}
			built[ri] = p.compact(rp)
			if r.role == fmo.RoleDienophile {
				for a, mode := range p.Activations {
					if mode == fmo.ActivateNone {
						variants[ri][a] = built[ri]
					}
				}
			}
		}
	})
	if err != nil {
		return nil, err
	}
	for i, r := range rows {
		o := owner[i]
		what := fmt.Sprintf("%s %q", r.role, r.sub.Name)
		if errs[o] != nil {
			p.Failures = append(p.Failures, ScreenFailure{Where: r.sub.Where(), What: what, Err: errs[o]})
			continue
		}
		src := partnerSource{mol: rows[o].sub.Mol, buildName: rows[o].sub.Name, role: r.role}
		if r.role == fmo.RoleDiene {
			p.Dienes = append(p.Dienes, built[i])
			p.DieneRows = append(p.DieneRows, *r.sub)
			p.dieneConf = append(p.dieneConf, conf[i])
			p.dieneSrc = append(p.dieneSrc, src)
		} else {
			p.Dienophiles = append(p.Dienophiles, built[i])
			p.DphRows = append(p.DphRows, *r.sub)
			p.Variants = append(p.Variants, variants[i])
			p.dphSrc = append(p.dphSrc, src)
		}
	}
	for j, r := range rows[len(lib.Dienes):] {
		i := len(lib.Dienes) + j
		if errs[owner[i]] != nil {
			continue
		}
		for a, e := range verrs[i] {
			if e == nil {
				continue
			}
			if errors.Is(e, fmo.ErrNothingToActivate) {
				p.NotApplicable++
				continue
			}
			p.Failures = append(p.Failures, ScreenFailure{Where: r.sub.Where(),
				What: fmt.Sprintf("dienophile %q activated (%s)", r.sub.Name, p.Activations[a]), Err: e})
		}
	}
	if p.compactForm {
		p.full = &fullCache{dienes: make([]fullOnce, len(p.Dienes)), free: make([]fullOnce, len(p.Dienophiles)),
			variants: make([]fullOnce, len(p.Dienophiles)*na)}
	}
	return p, nil
}

// partnerSource is how a prepared partner was built: from mol under buildName (the first
// row of its molecule), renamed to its row's name when that differs.
type partnerSource struct {
	mol       *molecule.Molecule
	buildName string
	role      fmo.Role
}

// compact returns the form of part that p keeps.
func (p *Prepared) compact(part *fmo.Partner) *fmo.Partner {
	if !p.compactForm {
		return part
	}
	return part.Compact(p.Opts.AllOrbitals)
}

// fullCache holds the full partners rebuilt for a compact preparation, each built once.
type fullCache struct {
	dienes   []fullOnce // per diene
	free     []fullOnce // per dienophile
	variants []fullOnce // per dienophile and activation (e·len(Activations) + a)
}

type fullOnce struct {
	once sync.Once
	p    *fmo.Partner
	err  error
}

// rebuild builds the full partner of a prepared molecule again, as Prepare built it.
func (p *Prepared) rebuild(src *partnerSource, name, smi string) (*fmo.Partner, error) {
	part, err := fmo.NewPartnerFromMolecule(src.buildName, src.mol, src.role, p.Opts)
	if err != nil {
		return nil, err
	}
	part.SMILES = smi
	if name != src.buildName {
		c := *part
		c.Name = name
		part = &c
	}
	return part, nil
}

// Diene returns diene d as a full partner (rebuilt once when the preparation is compact).
func (p *Prepared) Diene(d int) (*fmo.Partner, error) {
	if !p.compactForm {
		return p.Dienes[d], nil
	}
	f := &p.full.dienes[d]
	f.once.Do(func() { f.p, f.err = p.rebuild(&p.dieneSrc[d], p.Dienes[d].Name, p.Dienes[d].SMILES) })
	return f.p, f.err
}

// Dienophile returns the free dienophile e as a full partner.
func (p *Prepared) Dienophile(e int) (*fmo.Partner, error) {
	if !p.compactForm {
		return p.Dienophiles[e], nil
	}
	f := &p.full.free[e]
	f.once.Do(func() { f.p, f.err = p.rebuild(&p.dphSrc[e], p.Dienophiles[e].Name, p.Dienophiles[e].SMILES) })
	return f.p, f.err
}

// Variant returns dienophile e under Activations[a] as a full partner, nil when the mode
// does not apply (Variants[e][a] is nil).
func (p *Prepared) Variant(e, a int) (*fmo.Partner, error) {
	if p.Variants[e][a] == nil {
		return nil, nil
	}
	if !p.compactForm {
		return p.Variants[e][a], nil
	}
	if p.Activations[a] == fmo.ActivateNone {
		return p.Dienophile(e)
	}
	f := &p.full.variants[e*len(p.Activations)+a]
	f.once.Do(func() {
		free, err := p.Dienophile(e)
		if err != nil {
			f.err = err
			return
		}
		f.p, f.err = free.WithActivation(p.Activations[a], p.activate, p.Opts)
	})
	return f.p, f.err
}

// parallelFor calls f(i) for i in [0, n) on up to workers goroutines.
func parallelFor(ctx context.Context, workers, n int, f func(i int)) error {
	var next atomic.Int64
	var wg sync.WaitGroup
	for range min(workers, max(n, 1)) {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for ctx.Err() == nil {
				i := int(next.Add(1) - 1)
				if i >= n {
					return
				}
				f(i)
			}
		}()
	}
	wg.Wait()
	return ctx.Err()
}

// AnalyzeAt runs the full analysis of diene d with dienophile e under activation a (indices
// into Dienes, Dienophiles and Activations), as the pair command does: an activated pair
// carries the activation effect against the free dienophile and the diene cautions of the
// mode, and the side channels (diene dimerisation, product as dienophile) are checked.
func (p *Prepared) AnalyzeAt(d, e, a int) (*fmo.Pair, error) {
	if p.Variants[e][a] == nil {
		return nil, fmt.Errorf("activation %s does not apply to %s", p.Activations[a], p.Dienophiles[e].Name)
	}
	v, err := p.Variant(e, a)
	if err != nil {
		return nil, err
	}
	diene, err := p.Diene(d)
	if err != nil {
		return nil, err
	}
	free, err := p.Dienophile(e)
	if err != nil {
		return nil, err
	}
	pair, err := fmo.Analyze(diene, v, p.Opts)
	if err != nil {
		return nil, err
	}
	if mode := p.Activations[a]; mode != fmo.ActivateNone {
		pair.Activated = fmo.Effect(free, v, mode, p.freePair(diene, free), pair, p.Opts)
		for _, w := range fmo.DieneCautions(diene.Mol, mode) {
			if !slices.Contains(pair.Warnings, w) {
				pair.Warnings = append(pair.Warnings, w)
			}
		}
	}
	if err := p.rate.Annotate(pair, diene, p.temperatureC); err != nil {
		return nil, err
	}
	if mode := p.Activations[a]; mode != fmo.ActivateNone && pair.Rate != nil {
		// The free pair's rate from QuickScore: the same descriptors as a full analysis of
		// the free pair (checked on every prediction of rate's TestOrderings), without its adducts.
		if q := p.quick.Score(diene, free); q.OK {
			fd := rate.FromQuick(&q, p.dieneConf[d][q.DieneUnit], fmo.ActivateNone)
			v := pair.Rate.Log10KRel - p.rate.Predict(&fd).Log10KRel
			v = math.Round(v*1e6) / 1e6
			pair.Rate.Log10VsFree = &v
		}
	}
	pair.AttachSideChannels(p.sides.SideChannels(diene, free, pair, p.Opts))
	pair.DieneName = p.DieneRows[d].Name
	pair.DienophileName = p.DphRows[e].Name
	pair.DieneNotes = p.DieneRows[d].Notes
	pair.DienophileNotes = p.DphRows[e].Notes
	return pair, nil
}

// freePair stands for the analysis of the diene with the free dienophile that Effect compares
// an activated pair against. Effect reads only the preferred orientation's secondary-orbital
// term from it, and QuickScore gives that orientation and term exactly as Analyze does (same
// kernel, enumeration order and tie-breaking), so the row does not pay for a second full
// analysis with all its adducts (TestAnalyzeAtActivatedMatchesFullFree checks the rows).
// nil where Analyze would fail (no pair of units with both frontier levels).
func (p *Prepared) freePair(diene, free *fmo.Partner) *fmo.Pair {
	q := p.quick.Score(diene, free)
	if !q.OK {
		return nil
	}
	return &fmo.Pair{Orientations: []fmo.Orientation{{EndoOverlap: q.Endo}}}
}
