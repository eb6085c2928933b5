package screen

import (
	"context"
	"encoding/json"
	"math"
	"slices"
	"testing"

	"cyclopair/fmo"
	"cyclopair/fmo/internal/testsupport"
	"cyclopair/fmo/rate"
	"cyclopair/fmo/substrates"
	"cyclopair/presets"
)

// analyzeAtPlain is the row analysis written out the plain way, as the pair command does it:
// a full Analyze of the diene with the free dienophile for the activation effect, and side
// channels without any cache. AnalyzeAt must give the same rows byte for byte.
func analyzeAtPlain(p *Prepared, d, e, a int) (*fmo.Pair, error) {
	v := p.Variants[e][a]
	diene := p.Dienes[d]
	pair, err := fmo.Analyze(diene, v, p.Opts)
	if err != nil {
		return nil, err
	}
	if mode := p.Activations[a]; mode != fmo.ActivateNone {
		free, err := fmo.Analyze(diene, p.Dienophiles[e], p.Opts)
		if err != nil {
			free = nil
		}
		pair.Activated = fmo.Effect(p.Dienophiles[e], v, mode, free, pair, p.Opts)
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
		if free, err := fmo.Analyze(diene, p.Dienophiles[e], p.Opts); err == nil {
			if d, err := rate.FromPair(free, diene.Mol); err == nil {
				v := pair.Rate.Log10KRel - p.rate.Predict(&d).Log10KRel
				v = math.Round(v*1e6) / 1e6
				pair.Rate.Log10VsFree = &v
			}
		}
	}
	pair.AttachSideChannels(fmo.SideChannels(diene, p.Dienophiles[e], pair, p.Opts))
	pair.DieneName = p.DieneRows[d].Name
	pair.DienophileName = p.DphRows[e].Name
	pair.DieneNotes = p.DieneRows[d].Notes
	pair.DienophileNotes = p.DphRows[e].Notes
	return pair, nil
}

// The shortcuts of the row analysis (the free pair from QuickScore, cached side channels,
// adduct keys compared by a graph invariant before their canonical SMILES) change no byte:
// every row of the demo library under every activation mode and of a synthetic library with
// several reacting units per molecule equals the plain analysis, twice over (warm caches).
func TestAnalyzeAtActivatedMatchesFullFree(t *testing.T) {
	name, data := presets.DemoFile()
	demo, bad, err := substrates.ParseLibrary(data, FileOptions(name))
	if err != nil || len(bad) > 0 {
		t.Fatal(err, bad)
	}
	synth := testsupport.SyntheticLibrary(8, 8, 11)
	for _, lib := range []*substrates.Library{demo, synth} {
		lib.Activations = fmo.Modes()
		p, err := Prepare(context.Background(), lib, screenOpts(t), PrepareOptions{Workers: 2})
		if err != nil {
			t.Fatal(err)
		}
		rows := 0
		for range 2 {
			for d := range p.Dienes {
				for e := range p.Dienophiles {
					for a := range p.Activations {
						if p.Variants[e][a] == nil {
							continue
						}
						got, err1 := p.AnalyzeAt(d, e, a)
						want, err2 := analyzeAtPlain(p, d, e, a)
						if (err1 == nil) != (err2 == nil) {
							t.Fatalf("%d/%d/%d: errors %v / %v", d, e, a, err1, err2)
						}
						g, _ := json.Marshal(got)
						w, _ := json.Marshal(want)
						if string(g) != string(w) {
							t.Fatalf("%s + %s (%s): row differs from the plain analysis\n got %s\nwant %s",
								p.Dienes[d].SMILES, p.Dienophiles[e].SMILES, p.Activations[a], g, w)
						}
						checkDetailBest(t, p, d, e, a, want)
						checkDetailRow(t, p, d, e, a, want)
						rows++
					}
				}
			}
		}
		if rows < 100 {
			t.Errorf("only %d rows compared", rows)
		}
	}
}

// checkDetailBest: a row analysed at fmo.DetailBest equals the full row want except that the
// orientations after the preferred one carry no product, stereo forms, follow-up steps or
// isolated product; in particular every CSV/table column (margins, warnings with the side
// channels, the preferred product, the rate) is the same.
func checkDetailBest(t *testing.T, p *Prepared, d, e, a int, want *fmo.Pair) {
	t.Helper()
	got, err := p.AnalyzeAtDetail(d, e, a, fmo.DetailBest)
	if err != nil {
		t.Fatalf("%d/%d/%d: DetailBest failed: %v", d, e, a, err)
	}
	for i := 1; i < len(got.Orientations); i++ {
		o := &got.Orientations[i]
		if o.Product != "" || o.StereoProducts != nil || o.FollowUp != nil || o.IsolatedProduct != "" {
			t.Fatalf("%d/%d/%d: orientation %d has extras at DetailBest: %+v", d, e, a, i, o)
		}
	}
	blank := *want
	blank.Orientations = slices.Clone(want.Orientations)
	for i := 1; i < len(blank.Orientations); i++ {
		o := &blank.Orientations[i]
		o.Product, o.StereoProducts, o.FollowUp, o.IsolatedProduct = "", nil, nil, ""
	}
	g, _ := json.Marshal(got)
	w, _ := json.Marshal(&blank)
	if string(g) != string(w) {
		t.Fatalf("%s + %s (%s): DetailBest row differs from the full row\n got %s\nwant %s",
			p.Dienes[d].SMILES, p.Dienophiles[e].SMILES, p.Activations[a], g, w)
	}
}

// checkDetailRow: a row analysed at fmo.DetailRow equals the full row want in every field the
// row formats print: the preferred orientation (without its stereo forms, follow-up steps
// and isolated product, which no row format prints, but with its product) and every
// field of the Pair itself (margins, verdicts, warnings with the side channels, rate); when
// every candidate would be listed it lists the preferred orientation alone, so the regio
// fractions (not printed by those formats) are left out of the comparison.
func checkDetailRow(t *testing.T, p *Prepared, d, e, a int, want *fmo.Pair) {
	t.Helper()
	got, err := p.AnalyzeAtDetail(d, e, a, fmo.DetailRow)
	if err != nil {
		t.Fatalf("%d/%d/%d: DetailRow failed: %v", d, e, a, err)
	}
	if len(got.Orientations) == 0 || got.Orientations[0].Product == "" || got.Orientations[0].IsolatedProduct != "" {
		t.Fatalf("%d/%d/%d: DetailRow lacks the preferred product: %+v", d, e, a, got.Orientations)
	}
	if len(got.Orientations) != 1 && len(got.Orientations) != len(want.Orientations) {
		t.Fatalf("%d/%d/%d: DetailRow lists %d orientations, want 1 or %d", d, e, a, len(got.Orientations), len(want.Orientations))
	}
	blank := *want
	blank.Orientations = slices.Clone(want.Orientations[:len(got.Orientations)])
	for i := range blank.Orientations {
		o := &blank.Orientations[i]
		if i > 0 {
			o.Product = ""
		}
		o.StereoProducts, o.FollowUp, o.IsolatedProduct = nil, nil, ""
	}
	// The side channels' adduct is the same π system in another atom order at DetailRow:
	// figures equal to rounding, notes (not printed by the row formats) numbered otherwise.
	if len(got.SideChannels) != len(want.SideChannels) {
		t.Fatalf("%d/%d/%d: %d side channels at DetailRow, %d in full", d, e, a, len(got.SideChannels), len(want.SideChannels))
	}
	near := func(x, y float64) bool { return math.Abs(x-y) <= 1e-9 }
	for i, w := range want.SideChannels {
		g := got.SideChannels[i]
		if g.Kind != w.Kind || g.Competes != w.Competes || !near(g.Gap.Beta, w.Gap.Beta) || !near(g.Gap.EV, w.Gap.EV) ||
			!near(g.Margin, w.Margin) || !near(g.ScoreMargin, w.ScoreMargin) {
			t.Fatalf("%d/%d/%d: side channel %d at DetailRow %+v, full %+v", d, e, a, i, g, w)
		}
	}
	blank.SideChannels = nil
	g2 := *got
	g2.SideChannels = nil
	g2.Orientations = slices.Clone(got.Orientations)
	if len(got.Orientations) == 1 {
		g2.Orientations[0].Fraction, blank.Orientations[0].Fraction = 0, 0
		g2.FractionInterval, blank.FractionInterval = nil, nil
	}
	g, _ := json.Marshal(&g2)
	w, _ := json.Marshal(&blank)
	if string(g) != string(w) {
		t.Fatalf("%s + %s (%s): DetailRow row differs from the full row\n got %s\nwant %s",
			p.Dienes[d].SMILES, p.Dienophiles[e].SMILES, p.Activations[a], g, w)
	}
}
