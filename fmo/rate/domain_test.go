package rate

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"cyclopair/fmo"
	"cyclopair/presets"
)

// Leverage against the closed form of a straight-line fit with an intercept: for the design
// rows (1, x_i), h_i = 1/n + (x_i − x̄)²/Σ_j (x_j − x̄)², and the leverages of the rows sum to
// p = 2, the trace of the hat matrix (D. C. Montgomery, E. A. Peck, G. G. Vining, Introduction
// to Linear Regression Analysis, Wiley, ch. 6; from memory). The same formula holds for a
// point outside the rows.
func TestLeverageClosedForm(t *testing.T) {
	xs := []float64{1, 2, 4, 7}
	var design [][]float64
	mean := 0.0
	for _, x := range xs {
		design = append(design, []float64{1, x})
		mean += x / float64(len(xs))
	}
	sxx := 0.0
	for _, x := range xs {
		sxx += (x - mean) * (x - mean)
	}
	a, err := LeverageMatrix(design)
	if err != nil {
		t.Fatal(err)
	}
	const tol = 1e-12 // pure arithmetic on small integers
	sum := 0.0
	for _, x := range append(xs, 10, -3) {
		want := 1/float64(len(xs)) + (x-mean)*(x-mean)/sxx
		got := Leverage(a, []float64{1, x})
		if math.Abs(got-want) > tol {
			t.Errorf("x = %g: leverage %.15g, closed form %.15g", x, got, want)
		}
	}
	for _, row := range design {
		sum += Leverage(a, row)
	}
	if math.Abs(sum-2) > tol {
		t.Errorf("trace of the hat matrix %.15g, want p = 2", sum)
	}
	if _, err := LeverageMatrix([][]float64{{1, 2}, {1, 2}}); err == nil {
		t.Error("a rank-deficient design was accepted")
	}
}

// Every row the bundled model was fitted on lies inside its domain: within the descriptor
// ranges by construction, and (checked here, not by construction) below the warning
// leverage 3p/n of Tropsha, Gramatica & Gombar (QSAR Comb. Sci. 2003, 22, 69; from memory).
// Measured: 0 of 49 fitted rows flagged, the largest leverage 0.224 (tetrazine-tco-diphenyl,
// the most conjugated dienes of the set) against h* = 0.245.
func TestDomainFittedRows(t *testing.T) {
	m, err := Default()
	if err != nil {
		t.Fatal(err)
	}
	if m.Domain == nil {
		t.Fatal("the bundled model stores no applicability domain")
	}
	obs := bundledObs(t)
	n, flagged, hMax := 0, 0, 0.0
	for _, s := range obs {
		if !s.InModel() {
			continue
		}
		for _, r := range s.Rows {
			n++
			e := m.Predict(&r.D)
			hMax = max(hMax, e.Domain.Leverage)
			if !e.Domain.In {
				flagged++
				t.Errorf("%s: %s: fitted row outside the domain: %s", s.ID, r.Name, e.Domain.Note())
			}
		}
	}
	if n != m.Domain.Rows {
		t.Errorf("%d fitted rows, the domain counts %d", n, m.Domain.Rows)
	}
	t.Logf("%d of %d fitted rows outside the domain; largest leverage %.3f, warning leverage %.3f", flagged, n, hMax, m.Domain.Warning)
}

func analyse(t *testing.T, diene, dienophile, mode string) Descriptors {
	t.Helper()
	opts, err := fmo.DefaultOptions()
	if err != nil {
		t.Fatal(err)
	}
	_, _, desc := analysePair(t, opts, diene, dienophile, mode)
	return desc
}

// The case of issue 10: a triaminofuran with a Lewis-acid-bound trinitro-quinone (molecules of
// the synthetic screening library, invented) has a negative frontier gap, so the prediction
// (about 10^20 times the reference) is outside the domain by definition, the note names the
// gap and its fitted range, and the interval reaches down to the prediction at the edge of
// the fitted gap range. The reference reaction itself is inside with log10 k_rel 0.
func TestDomainFlagsExtrapolation(t *testing.T) {
	m, err := Default()
	if err != nil {
		t.Fatal(err)
	}
	ref := analyse(t, DefaultReference.Diene, DefaultReference.Dienophile, fmo.ActivateNone)
	if e := m.Predict(&ref); !e.Domain.In || math.Abs(e.Log10KRel) > 1e-4 { // the file rounds to 1e-6
		t.Errorf("reference reaction: in domain %v, log10 k_rel %g (%s)", e.Domain.In, e.Log10KRel, e.Domain.Note())
	}
	d := analyse(t, "CC(C)c1c(N(C)C)oc(N(C)C)c1N(C)C",
		"COC(=O)C1=C([N+](=O)[O-])C(=O)C([N+](=O)[O-])=C([N+](=O)[O-])C1=O", fmo.ActivateLewis)
	if d.Gap >= 0 {
		t.Fatalf("gap %g: the case no longer has a negative gap", d.Gap)
	}
	e := m.Predict(&d)
	note := e.Domain.Note()
	if e.Domain.In {
		t.Fatalf("log10 k_rel %.1f with gap %.3f reported inside the domain", e.Log10KRel, d.Gap)
	}
	for _, want := range []string{"extrapolated: ", "negative frontier gap", "controlling frontier gap", "outside the fitted range (0.304 to 1.150 |β|)"} {
		if !strings.Contains(note, want) {
			t.Errorf("note lacks %q: %s", want, note)
		}
	}
	y, half := m.predictVector(d.Vector())
	if e.Log10KRel != y || e.Hi < y+half-1e-9 || e.Lo > y-half-1e-9 {
		t.Errorf("estimate %+v, want the point %g and at least ±%g", e, y, half)
	}
	yc, hc := m.predictVector(e.Domain.Clamped)
	if e.Lo > yc-hc+1e-9 || yc >= y {
		t.Errorf("interval %g–%g does not reach the edge-of-range prediction %g − %g", e.Lo, e.Hi, yc, hc)
	}
	t.Logf("log10 k_rel %.2f, interval %.2f–%.2f (extrapolated interval %.2f–%.2f), leverage %.2f: %s",
		e.Log10KRel, e.Lo, e.Hi, y-half, y+half, e.Domain.Leverage, note)
}

// A model file written before the domain was stored still loads; its predictions are not
// claimed inside a domain it does not know. A stored domain survives the round trip.
func TestDomainFile(t *testing.T) {
	m, err := Default()
	if err != nil {
		t.Fatal(err)
	}
	b := presets.RateModelYAML()
	i := bytes.Index(b, []byte("\ndomain:\n"))
	if i < 0 {
		t.Fatal("the bundled model file has no domain key")
	}
	old, err := ParseModel(b[:i+1], "old")
	if err != nil {
		t.Fatalf("a model file without domain: %v", err)
	}
	d := Descriptors{Gap: 0.6, GapNormal: 0.6, GapInverse: 1.5, DieneConjugation: 2.5, Conformation: Conformation{SCis: -1.7}}
	if e := old.Predict(&d); e.Domain.In || !strings.Contains(e.Domain.Note(), "no applicability domain") {
		t.Errorf("old file: %+v", e.Domain)
	}
	back, err := ParseModel(b, "bundled")
	if err != nil {
		t.Fatal(err)
	}
	a, c := m.Predict(&d), back.Predict(&d)
	if !a.Domain.In || a.Domain.In != c.Domain.In || math.Abs(a.Domain.Leverage-c.Domain.Leverage) > 1e-6 {
		t.Errorf("round trip: %+v, back %+v", a.Domain, c.Domain)
	}
	bad := bytes.Replace(b, []byte("leverage_terms:\n    - neg_gap"), []byte("leverage_terms:\n    - gap"), 1)
	if _, err := ParseModel(bad, "bad"); err == nil || !strings.Contains(err.Error(), "leverage term") {
		t.Errorf("an unknown leverage term: %v", err)
	}
}

// A user's data set whose domain descriptors are collinear (here the conjugation loss is
// twice the gap on every row) still gets a domain: the ranges, and an intercept-only leverage
// 1/n; a descriptor that does not vary is left out of the leverage.
func TestBuildDomainCollinear(t *testing.T) {
	var s SeriesObs
	for _, g := range []float64{0.5, 0.6, 0.7} {
		s.Rows = append(s.Rows, Observation{D: Descriptors{Gap: g, GapNormal: g, GapInverse: 2, DieneConjugation: 2 * g}})
	}
	d, err := BuildDomain([]SeriesObs{s}, DefaultFitOptions().Fit)
	if err != nil {
		t.Fatal(err)
	}
	if len(d.LevTerms) != 0 || len(d.LevInv) != 1 || math.Abs(d.LevInv[0][0]-1.0/3) > 1e-12 {
		t.Errorf("collinear rows: leverage terms %v, matrix %v", d.LevTerms, d.LevInv)
	}
	if d.Min[TermGap] != -0.7 || d.Max[TermGap] != -0.5 {
		t.Errorf("gap range %g to %g, want -0.7 to -0.5", d.Min[TermGap], d.Max[TermGap])
	}
}

// Inside is CheckDomain's verdict without the reasons (the screen filter's fast path): the two
// must agree on every fitted row and on rows moved in and out of the domain one descriptor at
// a time (each descriptor scaled from 0.5× to 2× and shifted by ±0.5), with and without
// the first-order flag and the Lewis-acid activation, and under a model without a domain.
func TestInsideAgreesWithCheckDomain(t *testing.T) {
	m, err := Default()
	if err != nil {
		t.Fatal(err)
	}
	obs := bundledObs(t)
	noDomain := *m
	noDomain.Domain = nil
	in, out := 0, 0
	check := func(name string, mm *Model, d *Descriptors) {
		t.Helper()
		c := mm.CheckDomain(d)
		if got := mm.Inside(d); got != c.In {
			t.Errorf("%s: Inside %v, CheckDomain.In %v (%s)", name, got, c.In, c.Note())
		}
		if c.In {
			in++
		} else {
			out++
		}
	}
	for _, s := range obs {
		for _, r := range s.Rows {
			d := r.D
			check(s.ID+"/"+r.Name, m, &d)
			check(s.ID+"/"+r.Name+" (no domain)", &noDomain, &d)
			for _, f := range []float64{0.5, 0.9, 1.1, 2} {
				for _, dx := range []float64{-0.5, 0, 0.5} {
					v := d
					v.Gap = d.Gap*f + dx
					v.Frontier = d.Frontier * f
					check(s.ID+"/"+r.Name+" (gap, frontier moved)", m, &v)
					v = d
					v.DieneConjugation = d.DieneConjugation*f + dx
					v.Conformation.SCis = d.Conformation.SCis * f
					v.Conformation.Reach = d.Conformation.Reach*f + dx
					check(s.ID+"/"+r.Name+" (diene moved)", m, &v)
				}
			}
			v := d
			v.FirstOrder = true
			check(s.ID+"/"+r.Name+" (first order)", m, &v)
			v = d
			v.Activation = fmo.ActivateLewis
			check(s.ID+"/"+r.Name+" (lewis)", m, &v)
		}
	}
	if in == 0 || out == 0 {
		t.Errorf("%d inside, %d outside: the test must see both verdicts", in, out)
	}
	t.Logf("%d descriptor sets inside, %d outside", in, out)
}

// bundledObs is the bundled kinetics set observed under the default options (descriptors of
// every row), as the fit sees it.
func bundledObs(t *testing.T) []SeriesObs {
	t.Helper()
	k, err := presets.Kinetics()
	if err != nil {
		t.Fatal(err)
	}
	opts, err := fmo.DefaultOptions()
	if err != nil {
		t.Fatal(err)
	}
	obs, err := Observe(k, opts)
	if err != nil {
		t.Fatal(err)
	}
	return obs
}
