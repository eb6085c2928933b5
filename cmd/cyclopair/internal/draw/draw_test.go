package draw

import (
	"bytes"
	"encoding/xml"
	"errors"
	"io"
	"math"
	"os"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"cyclopair/cmd/cyclopair/internal/golden"
	"cyclopair/fmo"
	"cyclopair/huckel"
	"cyclopair/huckel/smiles"
	"cyclopair/presets"
)

// wellFormed runs the encoding/xml decoder over the whole document.
func wellFormed(t *testing.T, doc []byte) {
	t.Helper()
	d := xml.NewDecoder(bytes.NewReader(doc))
	d.Strict = true
	for {
		_, err := d.Token()
		if errors.Is(err, io.EOF) {
			return
		}
		if err != nil {
			t.Fatalf("not well-formed: %v\n%s", err, doc)
		}
	}
}

// dump writes pictures to $CYCLOPAIR_DRAW_DIR for looking at them (not used in CI).
func dump(t *testing.T, name string, doc []byte) {
	if dir := os.Getenv("CYCLOPAIR_DRAW_DIR"); dir != "" {
		if err := os.WriteFile(filepath.Join(dir, name), doc, 0o644); err != nil {
			t.Fatal(err)
		}
	}
}

func solve(t *testing.T, smi string) *huckel.Orbitals {
	t.Helper()
	m, err := smiles.Parse(smi)
	if err != nil {
		t.Fatal(err)
	}
	p, err := presets.Params(presets.DefaultParams)
	if err != nil {
		t.Fatal(err)
	}
	pi, err := huckel.Perceive(m, p)
	if err != nil {
		t.Fatal(err)
	}
	o, err := huckel.Solve(pi)
	if err != nil {
		t.Fatal(err)
	}
	return o
}

func TestOrbitalPictures(t *testing.T) {
	for i, tc := range []struct{ smi, which string }{
		{"C=CC=C", "HOMO"},
		{"C=CC=O", "LUMO"},
		{"c1ccccc1", "HOMO"},
		{"O=C1C=CC(=O)N1C", "LUMO"},
		{"COC=CC=C", "HOMO"},
		{"[O-][N+](=O)c1ccc(N)cc1", "HOMO"},
		{"C=CC=[N+]1CCCC1", "LUMO"},
	} {
		o := solve(t, tc.smi)
		lv := o.HOMO
		if tc.which == "LUMO" {
			lv = o.LUMO
		}
		svg, err := Orbital(o, lv, OrbitalOptions{SMILES: tc.smi, Which: tc.which, Params: "test", IDPrefix: "t"})
		if err != nil {
			t.Fatal(err)
		}
		wellFormed(t, svg)
		// one circle per π centre with |c| above the drawing threshold, per member drawn
		want := 0
		for _, li := range o.DegenerateSet(lv) {
			for a := range o.Pi.Mol.Atoms {
				if c := o.Coefficient(li, a); c > lobeMin || c < -lobeMin {
					want++
				}
			}
		}
		if got := strings.Count(string(svg), "<circle") - 2; got != want { // 2 legend circles
			t.Errorf("%s: %d lobe circles, want %d", tc.smi, got, want)
		}
		dump(t, "orbital"+string(rune('a'+i))+".svg", svg)
	}
}

func TestDegenerateDrawnSideBySide(t *testing.T) {
	o := solve(t, "c1ccccc1")
	set := o.DegenerateSet(o.HOMO)
	if len(set) != 2 { // benzene HOMO e1g is doubly degenerate (Hückel 1931; any textbook)
		t.Fatalf("benzene HOMO set %v, want 2 members", set)
	}
	svg, err := Orbital(o, o.HOMO, OrbitalOptions{SMILES: "c1ccccc1", Which: "HOMO"})
	if err != nil {
		t.Fatal(err)
	}
	for _, s := range []string{"member 1 of 2", "member 2 of 2", "Degenerate set of 2"} {
		if !strings.Contains(string(svg), s) {
			t.Errorf("benzene HOMO picture lacks %q", s)
		}
	}
}

func TestEscaping(t *testing.T) {
	o := solve(t, "C=CC=C")
	name := `<script>alert("x")</script> & co`
	svg, err := Orbital(o, o.HOMO, OrbitalOptions{Name: name, SMILES: "C=CC=C", Which: "HOMO", IDPrefix: `"><x`})
	if err != nil {
		t.Fatal(err)
	}
	wellFormed(t, svg)
	if strings.Contains(string(svg), "<script") {
		t.Fatalf("user text emitted as markup:\n%s", svg)
	}
	if !strings.Contains(string(svg), "&lt;script&gt;") {
		t.Errorf("name not shown as escaped text")
	}
}

func TestNoLevel(t *testing.T) {
	o := solve(t, "C=C")
	if _, err := Orbital(o, 7, OrbitalOptions{Which: "level 7"}); !errors.Is(err, ErrNoLevel) {
		t.Errorf("level out of range: %v, want ErrNoLevel", err)
	}
}

func TestPairPictures(t *testing.T) {
	opts, err := fmo.DefaultOptions()
	if err != nil {
		t.Fatal(err)
	}
	for i, tc := range []struct{ diene, dienophile, act string }{
		{"C=CC=C", "C=CC=O", "none"},
		{"C1=CC=CC1", "O=C1OC(=O)C=C1", "none"},
		{"COC=CC=C", "C=CC(=O)OC", "lewis"},
		{"c1nncnn1", "C=COCC", "none"},
		{"C=[N+]([O-])C", "C=CC#N", "none"},
		{"c1ccc2cc3ccccc3cc2c1", "O=C1C=CC(=O)N1C", "none"},
	} {
		d, err := fmo.NewPartner("", tc.diene, fmo.RoleDiene, opts)
		if err != nil {
			t.Fatal(err)
		}
		e, err := fmo.NewPartner(`dienophile <b>`+tc.dienophile, tc.dienophile, fmo.RoleDienophile, opts)
		if err != nil {
			t.Fatal(err)
		}
		if tc.act != "none" {
			if e, err = e.WithActivation(tc.act, nil, opts); err != nil {
				t.Fatal(err)
			}
		}
		p, err := fmo.Analyze(d, e, opts)
		if err != nil {
			t.Fatal(err)
		}
		svg, err := Pair(d, e, p, PairOptions{IDPrefix: "p"})
		if err != nil {
			t.Fatal(err)
		}
		wellFormed(t, svg)
		if strings.Contains(string(svg), "<b>") {
			t.Errorf("name emitted as markup")
		}
		if n := strings.Count(string(svg), `stroke-dasharray="7 4"`); n != 2 {
			t.Errorf("%s + %s: %d forming bonds drawn, want 2", tc.diene, tc.dienophile, n)
		}
		dump(t, "pair"+string(rune('a'+i))+".svg", svg)
	}
}

// TestPairClearance checks that the two partners never overlap in the pair picture, also
// for ring dienes whose other rings hang below the reacting termini (anthracene).
func TestPairClearance(t *testing.T) {
	opts, err := fmo.DefaultOptions()
	if err != nil {
		t.Fatal(err)
	}
	for _, tc := range []struct{ diene, dienophile string }{
		{"c1ccc2cc3ccccc3cc2c1", "O=C1C=CC(=O)C=C1"},
		{"c1ccc2cc3ccccc3cc2c1", "O=C1OC(=O)C=C1"},
		{"C1=CC=CC1", "O=C1OC(=O)C=C1"},
		{"c1ccoc1", "O=C1OC(=O)C=C1"},
		{"C=C(C)C(C)=C", "C=CC(=O)OC"},
	} {
		d, err := fmo.NewPartner("", tc.diene, fmo.RoleDiene, opts)
		if err != nil {
			t.Fatal(err)
		}
		e, err := fmo.NewPartner("", tc.dienophile, fmo.RoleDienophile, opts)
		if err != nil {
			t.Fatal(err)
		}
		p, err := fmo.Analyze(d, e, opts)
		if err != nil {
			t.Fatal(err)
		}
		g, err := pairGeometry(d, e, p, 0)
		if err != nil {
			t.Fatal(err)
		}
		if md := minDist(g.top.pos, g.bot.pos); md < clearance-1e-9 {
			t.Errorf("%s + %s: partners %.2f bond lengths apart, want at least %.2f", tc.diene, tc.dienophile, md, clearance)
		}
	}
}

// TestOrbitalGolden pins the bytes of one picture (butadiene HOMO: all-carbon, so the
// coefficients are the closed-form Hückel values 0.372/0.602 and do not move with parameter
// sets; no calibration so no eV figure). Refresh with -update after a deliberate change, and
// look at the picture first.
func TestOrbitalGolden(t *testing.T) {
	o := solve(t, "C=CC=C")
	a, err := Orbital(o, o.HOMO, OrbitalOptions{Name: "butadiene", SMILES: "C=CC=C", Which: "HOMO", Params: "test", IDPrefix: "g"})
	if err != nil {
		t.Fatal(err)
	}
	b, _ := Orbital(solve(t, "C=CC=C"), o.HOMO, OrbitalOptions{Name: "butadiene", SMILES: "C=CC=C", Which: "HOMO", Params: "test", IDPrefix: "g"})
	if !bytes.Equal(a, b) {
		t.Fatal("same picture twice gives different bytes")
	}
	golden.Check(t, "butadiene-homo.svg", a)
}

// TestLobeAreaIsDensity: circle radius ∝ |c| (so area ∝ c²). Butadiene HOMO coefficients in
// closed form are c_r = √(2/5)·sin(2πr/5): 0.6015 on C1/C4, 0.3717 on C2/C3 (linear polyene
// formula; Coulson 1938, any textbook, e.g.
// Streitwieser 1961, ch. 2).
func TestLobeAreaIsDensity(t *testing.T) {
	o := solve(t, "C=CC=C")
	svg, err := Orbital(o, o.HOMO, OrbitalOptions{SMILES: "C=CC=C", Which: "HOMO"})
	if err != nil {
		t.Fatal(err)
	}
	re := regexp.MustCompile(`<circle cx="[^"]+" cy="[^"]+" r="([0-9.]+)"`)
	var radii []float64
	for _, m := range re.FindAllStringSubmatch(string(svg), -1) {
		r, _ := strconv.ParseFloat(m[1], 64)
		radii = append(radii, r)
	}
	if len(radii) < 4 {
		t.Fatalf("%d circles", len(radii))
	}
	want := []float64{0.6015, 0.3717, 0.3717, 0.6015}
	const tol = 0.01 // px: coordinates are written with two decimals
	for i, c := range want {
		if r := lobeRadius * c * scale; math.Abs(radii[i]-r) > tol {
			t.Errorf("lobe %d radius %.2f px, want %.2f (|c| = %.4f)", i, radii[i], r, c)
		}
	}
}

// TestEveryPresetSubstrate draws the HOMO and LUMO of every built-in substrate and checks each
// picture is well-formed and its molecule meets the layout contract (no atoms closer than
// half a bond).
func TestEveryPresetSubstrate(t *testing.T) {
	p, err := presets.Params(presets.DefaultParams)
	if err != nil {
		t.Fatal(err)
	}
	n := 0
	for _, sub := range presets.Substrates() {
		m, err := smiles.Parse(sub.SMILES)
		if err != nil {
			t.Errorf("%s: %v", sub.Name, err)
			continue
		}
		pi, err := huckel.Perceive(m, p)
		if err != nil || len(pi.Centres) == 0 {
			continue // not every substrate need have a π system the perceiver accepts
		}
		o, err := huckel.Solve(pi)
		if err != nil {
			t.Errorf("%s: %v", sub.Name, err)
			continue
		}
		for _, lv := range []int{o.HOMO, o.LUMO} {
			if lv < 0 {
				continue
			}
			svg, err := Orbital(o, lv, OrbitalOptions{Name: sub.Name, SMILES: sub.SMILES, Which: "level"})
			if err != nil {
				t.Errorf("%s: %v", sub.Name, err)
				continue
			}
			wellFormed(t, svg)
			n++
		}
	}
	if n < 20 {
		t.Errorf("only %d pictures drawn from the presets", n)
	}
}

// TestDemoPairs draws the preferred orientation of every diene × dienophile × activation of
// the demo scenario's substrates and checks the partners never overlap.
func TestDemoPairs(t *testing.T) {
	opts, dienes, dienophiles := presetPartners(t)
	drawn := 0
	for _, d := range dienes {
		for _, e0 := range dienophiles {
			for _, mode := range fmo.Modes() {
				e, err := e0.WithActivation(mode, nil, opts)
				if err != nil {
					continue // mode has nothing to act on
				}
				pr, err := fmo.Analyze(d, e, opts)
				if err != nil || len(pr.Orientations) == 0 {
					continue
				}
				svg, err := Pair(d, e, pr, PairOptions{})
				if err != nil {
					t.Errorf("%s + %s (%s): %v", d.Name, e.Name, mode, err)
					continue
				}
				wellFormed(t, svg)
				g, _ := pairGeometry(d, e, pr, 0)
				if md := minDist(g.top.pos, g.bot.pos); md < clearance-1e-9 {
					t.Errorf("%s + %s (%s): partners %.2f apart", d.Name, e.Name, mode, md)
				}
				drawn++
			}
		}
	}
	t.Logf("%d pair pictures drawn", drawn)
	if drawn < 20 {
		t.Errorf("only %d pair pictures drawn", drawn)
	}
}

// presetPartners prepares every named preset substrate in its role with the default
// parameter set (no calibration: pictures need no eV), skipping any that cannot be prepared.
func presetPartners(t *testing.T) (opts *fmo.Options, dienes, dienophiles []*fmo.Partner) {
	t.Helper()
	p, err := presets.Params(presets.DefaultParams)
	if err != nil {
		t.Fatal(err)
	}
	opts = fmo.NewOptions(p, nil, "")
	for _, sub := range presets.Substrates() {
		switch sub.Role {
		case "diene", "dipole":
			if d, err := fmo.NewPartner(sub.Name, sub.SMILES, fmo.RoleDiene, opts); err == nil {
				dienes = append(dienes, d)
			}
		case "dienophile":
			if e, err := fmo.NewPartner(sub.Name, sub.SMILES, fmo.RoleDienophile, opts); err == nil {
				dienophiles = append(dienophiles, e)
			}
		}
	}
	return opts, dienes, dienophiles
}
