package presets

import (
	"strings"
	"testing"

	"cyclopair/huckel"
)

func TestParamSetsLoad(t *testing.T) {
	names := ParamNames()
	if len(names) < 3 {
		t.Fatalf("ParamNames = %v, want at least 3 sets", names)
	}
	for _, n := range names {
		p, err := Params(n)
		if err != nil {
			t.Fatalf("%s: %v", n, err)
		}
		if p.Title == "" || p.Source == "" {
			t.Errorf("%s: missing title or source", n)
		}
		// Every type perception can assign needs an h value in every built-in set.
		for _, typ := range huckel.AllCentreTypes {
			if typ == huckel.NAmmonioA { // reserved, never assigned by Perceive
				continue
			}
			if _, ok := p.H(typ); !ok {
				t.Errorf("%s: no h for %s", n, typ)
			}
			if _, ok := p.K(huckel.CSp2, typ, 1); !ok && typ != huckel.ONitro {
				t.Errorf("%s: no k for C–%s", n, typ)
			}
		}
	}
	def, err := Params(DefaultParams)
	if err != nil {
		t.Fatal(err)
	}
	if !def.Alkyl {
		t.Error("default set must switch on the alkyl hyperconjugation model (isoprene regiochemistry)")
	}
	bo, _ := Params("streitwieser1961-bondorder")
	k1, _ := bo.K(huckel.CSp2, huckel.CSp2, 1)
	k2, _ := bo.K(huckel.CSp2, huckel.CSp2, 2)
	kn, _ := bo.K(huckel.CSp2, huckel.NPyridine, 2) // inherited from the base set
	if k1 != 0.9 || k2 != 1.1 || kn != 1.0 {
		t.Errorf("bondorder variant: k(C–C,1)=%g k(C=C,2)=%g k(C=N)=%g, want 0.9 1.1 1.0", k1, k2, kn)
	}
}

func TestUnknownParamSet(t *testing.T) {
	_, err := Params("nosuchset")
	if err == nil || !strings.Contains(err.Error(), DefaultParams) {
		t.Errorf("error %v should list the known sets", err)
	}
}

func TestResolveUserFile(t *testing.T) {
	user, err := huckel.ParseParams([]byte(`
name: mine
h:
  - {type: "N=", h: 0.7, source: "test scenario"}
`), "mine.yaml")
	if err != nil {
		t.Fatal(err)
	}
	p, err := ResolveParams(user)
	if err != nil {
		t.Fatal(err)
	}
	if h, _ := p.H(huckel.NPyridine); h != 0.7 {
		t.Errorf("override h(N=) = %g, want 0.7", h)
	}
	base, err := Params(DefaultParams)
	if err != nil {
		t.Fatal(err)
	}
	if h, _ := p.H(huckel.OCarbonyl); h != must(base.H(huckel.OCarbonyl)) {
		t.Errorf("inherited h(O=) = %g, want %g from %s", h, must(base.H(huckel.OCarbonyl)), DefaultParams)
	}
}

// The default calibration: both slopes negative (bonding levels lie lower), enough points.
// Its quality is what the data give (printed with every eV figure, not asserted here
// beyond sanity: r² above 0.5 pooled).
func TestDefaultCalibration(t *testing.T) {
	p, _ := Params(DefaultParams)
	c, err := Calibration(p)
	if err != nil {
		t.Fatal(err)
	}
	if c.HOMOSlope >= 0 || c.LUMOSlope >= 0 || c.HOMON < 20 || c.LUMON < 10 || c.R2 < 0.5 {
		t.Errorf("calibration %v", c)
	}
}

func must(h float64, ok bool) float64 {
	if !ok {
		panic("presets test: missing parameter")
	}
	return h
}

// Every built-in PPP set loads by the name of its file (sets are parsed one by one on first
// use, so a broken file would otherwise show only when asked for).
func TestPPPSetsLoad(t *testing.T) {
	names := PPPNames()
	if len(names) == 0 {
		t.Fatal("no built-in PPP sets")
	}
	for _, n := range names {
		if _, err := PPPParams(n); err != nil {
			t.Errorf("%s: %v", n, err)
		}
	}
	if _, err := Params("no-such-set"); err == nil || !strings.Contains(err.Error(), DefaultParams) {
		t.Errorf("unknown set: error %v, want one listing the known sets", err)
	}
}
