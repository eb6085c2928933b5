package screen

import (
	"errors"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"cyclopair/fmo"
	"cyclopair/huckel"
	"cyclopair/presets"
)

// testRequest is a request with loaders that record what they were asked for and return
// the default parameter set and its built-in calibration.
func testRequest(t *testing.T, asked *[]string) Request {
	t.Helper()
	return Request{
		LoadParams: func(spec string) (*huckel.Params, error) {
			*asked = append(*asked, "params "+spec)
			return presets.Params(presets.DefaultParams)
		},
		LoadCalibration: func(spec string, p *huckel.Params) (huckel.Calibration, error) {
			*asked = append(*asked, "calibration "+spec)
			return presets.Calibration(p)
		},
	}
}

func ptr[T any](v T) *T { return &v }

// The file's settings hold unless a flag overrides them; defaults fill the rest.
func TestResolvePrecedence(t *testing.T) {
	var asked []string
	name, data := presets.DemoFile()
	req := testRequest(t, &asked)
	req.File, req.Data = name, data
	c, err := Resolve(req)
	if err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(c.Activations, []string{"none", "lewis", "iminium"}) || c.RankBy != RankRate || c.Top != 20 || c.Source != name {
		t.Errorf("file settings: activations %v, rank %s, top %d, source %q", c.Activations, c.RankBy, c.Top, c.Source)
	}
	if !slices.Equal(asked, []string{"params ", "calibration "}) || c.Options == nil || c.Activate != nil {
		t.Errorf("defaults: asked %q, options %v, activate %v", asked, c.Options, c.Activate)
	}

	req.Activate, req.RankBy, req.Top = ptr("lewis, none,lewis"), ptr("Score"), ptr(0)
	req.Demand, req.MaxGap, req.AllowedOnly = ptr("any"), ptr(1.5), ptr(true)
	req.Amine, req.Shard, req.Workers = "C1CCNCC1", "2/3", 2
	if c, err = Resolve(req); err != nil {
		t.Fatal(err)
	}
	if !slices.Equal(c.Activations, []string{"lewis", "none"}) || c.RankBy != RankScore || c.Top != 0 {
		t.Errorf("flags: activations %v, rank %s, top %d", c.Activations, c.RankBy, c.Top)
	}
	if c.Filter.Demand != "" || c.Filter.MaxGap != 1.5 || !c.Filter.AllowedOnly || c.Shard != (Shard{2, 3}) || c.Workers != 2 {
		t.Errorf("flags: filter %+v, shard %v, workers %d", c.Filter, c.Shard, c.Workers)
	}
	if c.Activate == nil || c.Activate.Amine == nil || len(c.Activate.Amine.Atoms) != 6 {
		t.Errorf("amine flag not applied: %+v", c.Activate)
	}
	if so := c.ScreenOptions(); so.RankBy != RankScore || so.Shard != c.Shard || so.Filter != c.Filter {
		t.Errorf("ScreenOptions = %+v", so)
	}
}

// Bad settings are usage errors; a bad amine keeps the parser's error for the CLI.
func TestResolveUsageErrors(t *testing.T) {
	name, data := presets.DemoFile()
	for _, tc := range []struct {
		set  func(*Request)
		want string
	}{
		{func(r *Request) { r.Activate = ptr("lewis,heat") }, `--activate: unknown mode "heat"`},
		{func(r *Request) { r.Activate = ptr(" , ") }, "--activate: no mode given"},
		{func(r *Request) { r.RankBy = ptr("speed") }, `--rank-by: unknown ranking key "speed"`},
		{func(r *Request) { r.Top = ptr(-1) }, "--top: must be 0"},
		{func(r *Request) { r.Demand = ptr("reverse") }, `--demand "reverse"`},
		{func(r *Request) { r.MinRegioMargin = ptr(-0.1) }, "--min-regio-margin"},
		{func(r *Request) { r.MaxGap = ptr(-1.0) }, "--max-gap"},
		{func(r *Request) { r.Shard = "4/3" }, "--shard: bad shard"},
		{func(r *Request) { r.Workers = -1 }, "--workers"},
	} {
		var asked []string
		req := testRequest(t, &asked)
		req.File, req.Data = name, data
		tc.set(&req)
		_, err := Resolve(req)
		var ue *UsageError
		if !errors.As(err, &ue) || !strings.HasPrefix(err.Error(), tc.want) {
			t.Errorf("err = %v, want a UsageError starting %q", err, tc.want)
		}
	}
	var asked []string
	req := testRequest(t, &asked)
	req.File, req.Data, req.Amine = name, data, "C1CCNC"
	_, err := Resolve(req)
	var ae *AmineError
	if !errors.As(err, &ae) || ae.SMILES != "C1CCNC" {
		t.Errorf("bad amine: err = %v, want an AmineError", err)
	}
}

// Paths in a substrate file are relative to the file; a failing loader is reported at the
// setting's position. List files replace the file's rows and may come from stdin.
func TestResolveFiles(t *testing.T) {
	dir := t.TempDir()
	file := filepath.Join(dir, "s.yaml")
	src := "dienes: [{smiles: C=CC=C}]\ndienophiles: [{smiles: C=C}]\nparams_file: p.yaml\ncalibration: c.yaml\n"
	if err := os.WriteFile(file, []byte(src), 0o644); err != nil {
		t.Fatal(err)
	}
	var asked []string
	req := testRequest(t, &asked)
	req.File = file
	if _, err := Resolve(req); err != nil {
		t.Fatal(err)
	}
	want := []string{"params " + filepath.Join(dir, "p.yaml"), "calibration " + filepath.Join(dir, "c.yaml")}
	if !slices.Equal(asked, want) {
		t.Errorf("loaders asked for %q, want %q", asked, want)
	}
	req.LoadParams = func(string) (*huckel.Params, error) { return nil, errors.New("no such set") }
	if _, err := Resolve(req); err == nil || err.Error() != file+": 3:14: params_file: no such set" {
		t.Errorf("failing params_file: %v", err)
	}

	req = testRequest(t, &asked)
	req.Dienes, req.Dienophiles, req.Stdin = "-", filepath.Join(dir, "missing.csv"), strings.NewReader("C=CC=C\n")
	if _, err := Resolve(req); err == nil || !strings.Contains(err.Error(), "missing.csv: cannot open") {
		t.Errorf("missing list: %v", err)
	}
	list := filepath.Join(dir, "e.csv")
	if err := os.WriteFile(list, []byte("name,smiles\nethylene,C=C\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	req.Dienophiles = list
	req.Stdin = strings.NewReader("C=CC=C butadiene\nC1=CC=CC1 cp\nC(\n")
	c, err := Resolve(req)
	if err != nil {
		t.Fatal(err)
	}
	if len(c.Library.Dienes) != 2 || len(c.Library.Dienophiles) != 1 || len(c.Bad) != 1 {
		t.Errorf("lists: %d dienes, %d dienophiles, bad %v", len(c.Library.Dienes), len(c.Library.Dienophiles), c.Bad)
	}
	if !slices.Equal(c.Activations, []string{fmo.ActivateNone}) || c.RankBy != RankRate || c.Source != "dienes from -, dienophiles from "+list {
		t.Errorf("lists only: activations %v, rank %s, source %q", c.Activations, c.RankBy, c.Source)
	}
}
