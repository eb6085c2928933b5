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
		rate: po.RateModel, temperatureC: po.TemperatureC}
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
	for i, r := range rows {
		k := molKey{r.role, r.sub.SMILES, fmt.Sprint(r.sub.Pin)}
		if f, ok := first[k]; ok {
			owner[i] = f
		} else {
			first[k] = i
			owner[i] = i
		}
	}
	built := make([]*fmo.Partner, len(rows))
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
		built[i] = part
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
		part := built[o]
		if o != i { // same molecule under another name
			c := *part
			c.Name = r.sub.Name
			part = &c
		}
		if r.role == fmo.RoleDiene {
			p.Dienes = append(p.Dienes, part)
			p.DieneRows = append(p.DieneRows, *r.sub)
		} else {
			p.Dienophiles = append(p.Dienophiles, part)
			p.DphRows = append(p.DphRows, *r.sub)
		}
	}
	p.dieneConf = make([][]rate.Conformation, len(p.Dienes))
	for i, d := range p.Dienes {
		p.dieneConf[i] = rate.PartnerConformations(d)
	}
	// Activated variants, one per (dienophile, mode).
	na := len(p.Activations)
	p.Variants = make([][]*fmo.Partner, len(p.Dienophiles))
	verr := make([]error, len(p.Dienophiles)*na)
	for j := range p.Variants {
		p.Variants[j] = make([]*fmo.Partner, na)
	}
	err = parallelFor(ctx, workers, len(p.Dienophiles)*na, func(i int) {
		defer tick()
		j, a := i/na, i%na
		mode := p.Activations[a]
		if mode == fmo.ActivateNone {
			p.Variants[j][a] = p.Dienophiles[j]
			return
		}
		v, err := p.Dienophiles[j].WithActivation(mode, act, opts)
		if err != nil {
			verr[i] = err
			return
		}
		p.Variants[j][a] = v
	})
	if err != nil {
		return nil, err
	}
	for i, e := range verr {
		if e == nil {
			continue
		}
		j, a := i/na, i%na
		if errors.Is(e, fmo.ErrNothingToActivate) {
			p.NotApplicable++
			continue
		}
		p.Failures = append(p.Failures, ScreenFailure{Where: p.DphRows[j].Where(),
			What: fmt.Sprintf("dienophile %q activated (%s)", p.DphRows[j].Name, p.Activations[a]), Err: e})
	}
	return p, nil
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
	return p.AnalyzeAtDetail(d, e, a, fmo.DetailAll)
}

// AnalyzeAtDetail is AnalyzeAt with the pair analysed at the given detail (fmo.AnalyzeDetail).
func (p *Prepared) AnalyzeAtDetail(d, e, a int, detail fmo.Detail) (*fmo.Pair, error) {
	v := p.Variants[e][a]
	if v == nil {
		return nil, fmt.Errorf("activation %s does not apply to %s", p.Activations[a], p.Dienophiles[e].Name)
	}
	diene := p.Dienes[d]
	pair, err := fmo.AnalyzeDetail(diene, v, p.Opts, detail)
	if err != nil {
		return nil, err
	}
	if mode := p.Activations[a]; mode != fmo.ActivateNone {
		pair.Activated = fmo.Effect(p.Dienophiles[e], v, mode, p.freePair(diene, p.Dienophiles[e]), pair, p.Opts)
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
		if q := p.quick.Score(diene, p.Dienophiles[e]); q.OK {
			fd := rate.FromQuick(&q, p.dieneConf[d][q.DieneUnit], fmo.ActivateNone)
			v := pair.Rate.Log10KRel - p.rate.Predict(&fd).Log10KRel
			v = math.Round(v*1e6) / 1e6
			pair.Rate.Log10VsFree = &v
		}
	}
	pair.AttachSideChannels(p.sides.SideChannels(diene, p.Dienophiles[e], pair, p.Opts))
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
