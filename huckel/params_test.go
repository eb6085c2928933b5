package huckel_test

import (
	"errors"
	"strings"
	"testing"

	"cyclopair/huckel"
)

func TestParseParamsErrors(t *testing.T) {
	tests := []struct {
		name, src, want string
	}{
		{"unknown key", "name: x\nhh: 1\n", "x.yaml: 2:1: unknown key \"hh\" at the top level (keys: name,"},
		{"unknown entry key", "name: x\nh:\n  - {type: C, hh: 1, source: s}\n", "x.yaml: 3:15: unknown key \"hh\" in an h entry (keys: type, h, source)"},
		{"not a number", "name: x\nh:\n  - {type: C, h: one, source: s}\n", "x.yaml: 3:18: cannot unmarshal !!str `one` into a number"},
		{"unknown type", "name: x\nh:\n  - {type: Q, h: 1, source: s}\n", "x.yaml: 3:12: h entry 1: unknown centre type \"Q\""},
		{"missing source", "name: x\nh:\n  - {type: C, h: 1}\n", "x.yaml: 3:5: h entry 1 (C): missing source"},
		{"duplicate h", "name: x\nh:\n  - {type: C, h: 1, source: s}\n  - {type: C, h: 2, source: s}\n", "x.yaml: 4:5: h entry 2: duplicate entry for type C"},
		{"bad k arity", "name: x\nk:\n  - {types: [C], k: 1, source: s}\n", "x.yaml: 3:5: k entry 1: types must list exactly two"},
		{"negative k", "name: x\nk:\n  - {types: [C, C], k: -1, source: s}\n", "x.yaml: 3:24: k entry 1 (C–C): k = -1 must be in (0, 3]"},
		{"bad order", "name: x\nk:\n  - {types: [C, C], order: 4, k: 1, source: s}\n", "k entry 1: order must be 1, 2 or 3"},
		{"wrong kind", "name: x\nh: 3\n", "x.yaml: 2:4: cannot unmarshal !!int `3` into a list of h entries"},
		{"syntax", "name: [x\n", "x.yaml: not valid YAML"},
		{"alias", "name: &a x\ntitle: *a\n", "x.yaml: 2:8: YAML aliases are not allowed"},
		{"omega range", "name: x\nomega: 9\n", "x.yaml: 2:8: omega must be between 0 and 5"},
		{"empty", "", "x.yaml: empty file"},
	}
	for _, tc := range tests {
		_, err := huckel.ParseParams([]byte(tc.src), "x.yaml")
		if err == nil {
			t.Errorf("%s: no error", tc.name)
			continue
		}
		if !errors.Is(err, huckel.ErrParams) {
			t.Errorf("%s: %v does not wrap ErrParams", tc.name, err)
		}
		if !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error\n  %s\nwant it to contain\n  %s", tc.name, err, tc.want)
		}
	}
}

func TestParamsLookupAndMerge(t *testing.T) {
	base, err := huckel.ParseParams([]byte(`
name: base
title: Base
source: test scenario
alkyl: true
k_like: {"C+": C}
k_fallback: geometric-mean
k_fallback_source: "assumed"
h:
  - {type: C, h: 0, source: s}
  - {type: "N=", h: 0.5, source: s}
  - {type: "O=", h: 1.0, source: s}
k:
  - {types: [C, C], k: 1, source: s}
  - {types: [C, C], order: 2, k: 1.1, source: s}
  - {types: ["N=", C], k: 1.0, source: s}
  - {types: [C, "O="], k: 0.64, source: s}
`), "base.yaml")
	if err != nil {
		t.Fatal(err)
	}
	check := func(name string, got float64, ok bool, want float64) {
		t.Helper()
		if !ok || got != want {
			t.Errorf("%s = %g (ok=%v), want %g", name, got, ok, want)
		}
	}
	k, ok := base.K(huckel.CSp2, huckel.CSp2, 1)
	check("k(C,C,1) falls back to any order", k, ok, 1)
	k, ok = base.K(huckel.CSp2, huckel.CSp2, 2)
	check("k(C,C,2)", k, ok, 1.1)
	k, ok = base.K(huckel.CCation, huckel.NPyridine, 1)
	check("k(C+,N=) via k_like", k, ok, 1.0)
	k, ok = base.K(huckel.NPyridine, huckel.OCarbonyl, 2)
	check("k(N=,O=) geometric mean", k, ok, 0.8)
	k, ok = base.K(huckel.OCarbonyl, huckel.NPyridine, 0)
	check("k symmetric", k, ok, 0.8)
	if _, ok := base.K(huckel.CSp2, huckel.Fluoro, 1); ok {
		t.Error("k(C,F) defined without an entry")
	}
	over, err := huckel.ParseParams([]byte(`
alkyl: false
h:
  - {type: "N=", h: 0.7, source: user}
k:
  - {types: [C, C], order: 2, k: 1.2, source: user}
`), "over.yaml")
	if err != nil {
		t.Fatal(err)
	}
	m := base.Merge(over)
	h, ok := m.H(huckel.NPyridine)
	check("merged h(N=)", h, ok, 0.7)
	h, ok = m.H(huckel.OCarbonyl)
	check("inherited h(O=)", h, ok, 1.0)
	k, ok = m.K(huckel.CSp2, huckel.CSp2, 2)
	check("merged k(C,C,2)", k, ok, 1.2)
	if m.Alkyl || !base.Alkyl || m.Name != "base" {
		t.Errorf("merge: alkyl %v (base %v), name %q", m.Alkyl, base.Alkyl, m.Name)
	}
	if h, _ := base.H(huckel.NPyridine); h != 0.5 {
		t.Error("Merge modified its receiver")
	}
	repl, _ := huckel.ParseParams([]byte("replace: true\nname: only\nh:\n  - {type: C, h: 0, source: s}\n"), "r.yaml")
	if r := base.Merge(repl); r.Name != "only" || len(r.HEntries) != 1 {
		t.Errorf("replace: %q with %d h entries", r.Name, len(r.HEntries))
	}
}

func TestWithH(t *testing.T) {
	p := defaultParams(t)
	strong := p.WithH(huckel.OLewis, 2.4, "test scenario: a stronger Lewis acid")
	if h, _ := strong.H(huckel.OLewis); h != 2.4 {
		t.Errorf("h(O=LA) = %g", h)
	}
	if h, _ := p.H(huckel.OLewis); h != 2.0 {
		t.Errorf("WithH modified its receiver: %g", h)
	}
	if !strong.Alkyl || strong.Name != p.Name {
		t.Errorf("WithH lost settings: alkyl %v name %q", strong.Alkyl, strong.Name)
	}
}

// FuzzParseParams: arbitrary bytes never panic the parameter loader; anything accepted
// can be merged and queried.
func FuzzParseParams(f *testing.F) {
	f.Add([]byte("name: x\nh:\n  - {type: C, h: 0, source: s}\nk:\n  - {types: [C, C], k: 1, source: s}\n"))
	f.Add([]byte("alkyl: false\nomega: 1.4\n"))
	f.Add([]byte("replace: true\nk_like: {\"C+\": C}\nk_fallback: geometric-mean\n"))
	f.Add([]byte("name: [x\n"))
	f.Add([]byte("a: &a [*a]\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		p, err := huckel.ParseParams(data, "fuzz.yaml")
		if err != nil {
			return
		}
		m := (&huckel.Params{}).Merge(p)
		for _, a := range huckel.AllCentreTypes {
			m.H(a)
			for _, b := range huckel.AllCentreTypes {
				m.K(a, b, 2)
			}
		}
	})
}
