package huckel_test

import (
	"errors"
	"math"
	"runtime"
	"strconv"
	"strings"
	"testing"

	"cyclopair/huckel"
	"cyclopair/huckel/smiles"
	"cyclopair/presets"
)

// The reliability suite of issue 14 ("hold under bad input, big input and signals") at the
// library level: size limits, unsupported atoms and extra parts, parameter and calibration
// sanity, and safe error text. The CLI half is cmd/cyclopair/reliability_test.go.

// TestCentreLimit: Perceive refuses a π system above the limit with ErrTooManyCentres,
// naming the atom of the first centre beyond it, the size and the limit; PerceiveOptions
// raises the limit, and the system it accepted carries the limit on to Solve.
func TestCentreLimit(t *testing.T) {
	p := noAlkyl(t)
	parse := func(s string) *huckel.PiSystem {
		t.Helper()
		m, err := smiles.ParseOptions{MaxLength: 1 << 20}.Parse(s)
		if err != nil {
			t.Fatal(err)
		}
		ps, err := huckel.PerceiveOptions{MaxCentres: 1 << 30}.Perceive(m, p)
		if err != nil {
			t.Fatal(err)
		}
		return ps
	}
	for _, tc := range []struct {
		name    string
		smiles  string
		limit   int // PerceiveOptions.MaxCentres
		centres int
		atom    int // atom named by the error, -1 when accepted
	}{
		{"default limit, 501 centres", strings.Repeat("C=C", 250) + "[CH2+]", 0, 501, 500},
		{"default limit, exactly 500", strings.Repeat("C=C", 250), 0, 500, -1},
		// the 100,002-byte SMILES of issue 14: 66,668 centres, refused in linear time
		{"issue reproducer", strings.Repeat("C=C", 33334), 0, 66668, 500},
		{"lowered", "C=CC=CC=C", 4, 6, 4},
		{"raised", strings.Repeat("C=C", 300), 600, 600, -1},
		// an sp3 carbon is no centre: the error names the atom, not the centre index
		{"atom index", "CC=CC=CC=C", 4, 6, 5},
	} {
		m, err := smiles.ParseOptions{MaxLength: 1 << 20}.Parse(tc.smiles)
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		ps, err := huckel.PerceiveOptions{MaxCentres: tc.limit}.Perceive(m, p)
		if tc.atom < 0 {
			if err != nil {
				t.Errorf("%s: %v", tc.name, err)
				continue
			}
			want := tc.limit
			if want == 0 {
				want = huckel.DefaultMaxCentres
			}
			if len(ps.Centres) != tc.centres || ps.MaxCentres != want {
				t.Errorf("%s: %d centres, MaxCentres %d; want %d, %d", tc.name, len(ps.Centres), ps.MaxCentres, tc.centres, want)
			}
			continue
		}
		var pe *huckel.PerceiveError
		if !errors.Is(err, huckel.ErrTooManyCentres) || !errors.As(err, &pe) {
			t.Errorf("%s: got %v, want a *PerceiveError wrapping ErrTooManyCentres", tc.name, err)
			continue
		}
		if pe.Atom != tc.atom {
			t.Errorf("%s: error names atom %d, want %d", tc.name, pe.Atom, tc.atom)
		}
		limit := tc.limit
		if limit == 0 {
			limit = huckel.DefaultMaxCentres
		}
		for _, want := range []string{strconv.Itoa(tc.centres) + " centres", "limit of " + strconv.Itoa(limit)} {
			if !strings.Contains(err.Error(), want) {
				t.Errorf("%s: %q lacks %q", tc.name, err, want)
			}
		}
	}

	// Solve honours the limit the system was perceived with, Without keeps it, and a
	// hand-built system (MaxCentres 0) gets the default.
	ps := parse("C=CC=CC=C")
	ps.MaxCentres = 6
	if _, err := huckel.Solve(ps); err != nil {
		t.Errorf("Solve at the limit: %v", err)
	}
	if w := ps.Without(0); w.MaxCentres != 6 {
		t.Errorf("Without dropped MaxCentres: %d", w.MaxCentres)
	}
	ps.MaxCentres = 5
	if _, err := huckel.Solve(ps); !errors.Is(err, huckel.ErrTooManyCentres) {
		t.Errorf("Solve over the limit: %v", err)
	}
	var s huckel.Solver
	var o huckel.Orbitals
	if err := s.Solve(ps, &o); !errors.Is(err, huckel.ErrTooManyCentres) {
		t.Errorf("Solver.Solve over the limit: %v", err)
	}
	var pe *huckel.PerceiveError
	if err := ps.CheckSize(); !errors.As(err, &pe) || pe.Atom != 5 {
		t.Errorf("CheckSize over the limit: %v, want the error to name atom 5", err)
	}
}

// chain returns a hand-built linear chain of n carbon centres (k = 1).
func chain(n int) *huckel.PiSystem {
	cs := make([]huckel.Centre, n)
	bs := make([]huckel.PiBond, n-1)
	for i := range cs {
		cs[i] = huckel.Centre{Atom: i, Element: "C", Type: huckel.CSp2, Electrons: 1}
		if i > 0 {
			bs[i-1] = huckel.PiBond{I: i - 1, J: i, K: 1}
		}
	}
	return huckel.NewPiSystem(cs, bs)
}

// TestSolveRefusesBeforeAllocating: a hand-built system above DefaultMaxCentres is refused
// before the dense solve's O(n²) buffers exist (a 3,000-centre solve would allocate about
// 550 MB and take about a minute).
func TestSolveRefusesBeforeAllocating(t *testing.T) {
	ps := chain(3000)
	var before, after runtime.MemStats
	runtime.GC()
	runtime.ReadMemStats(&before)
	const calls = 10
	for range calls {
		if _, err := huckel.Solve(ps); !errors.Is(err, huckel.ErrTooManyCentres) {
			t.Fatalf("Solve of 3000 centres: %v", err)
		}
	}
	runtime.ReadMemStats(&after)
	if per := (after.TotalAlloc - before.TotalAlloc) / calls; per > 64<<10 {
		t.Errorf("refusing 3000 centres allocated %d bytes per call", per)
	}
}

// TestUnsupportedAtomsAndParts: what the π system leaves out is said in a warning, never
// silently (issue 14): a metal atom, named with its column, with a pointer to the modelled
// Lewis-acid forms; parts of the input without π centres, naming the part analysed;
// several molecules with π systems, solved side by side. Main-group σ substituents and the
// modelled Lewis-acid complex stay quiet.
func TestUnsupportedAtomsAndParts(t *testing.T) {
	p := defaultParams(t)
	for _, tc := range []struct {
		smiles string
		want   []string // fragments of one warning each, in order; nil = no warning
	}{
		{"[Fe]", []string{"atom 0 (Fe, column 1): no π parameters for Fe"}},
		{"C=C[Fe]", []string{"atom 2 (Fe, column 4): no π parameters for Fe; the atom is left out of the π system"}},
		{"C=CC=O.[Al](Cl)(Cl)Cl", []string{"atom 4 (Al, column 8)", "--activate lewis"}},
		{"C=C[Sn](C)(C)C", []string{"atom 2 (Sn, column 4)"}},
		{"C=CC=[O+][Al-](Cl)(Cl)Cl", nil}, // the modelled Lewis-acid complex (O=LA)
		{"C=C[Si](C)(C)C", nil},           // main-group σ substituent
		{"COC=CC(=C)O[Si](C)(C)C", nil},   // (E)-1-methoxy-3-trimethylsilyloxy-1,3-butadiene
		{"C=CC=[N+]1CCCC1.[Cl-]", []string{"the input has 2 separate parts: the π system is that of the part at column 1 (C=CC=[N+]1CCCC1); the part at column 17 ([Cl-]) has no π centres and is left out"}},
		{"[Na+].[O-]C(=O)C=C", []string{"the π system is that of the part at column 7 ([O-]C(=O)C=C); the part at column 1 ([Na+])", "metal salt"}},
		{"C=C.C=CC=C", []string{"2 separate molecules with π systems (the parts at column 1 (C=C) and column 5 (C=CC=C)): they are solved side by side"}},
		{"C=C.C=C.O", []string{"2 separate molecules", "the part at column 9 (O) has no π centres"}},
		{"CC.CC", nil}, // no π system at all: the caller says so
	} {
		m, err := smiles.Parse(tc.smiles)
		if err != nil {
			t.Fatalf("%s: %v", tc.smiles, err)
		}
		ps, err := huckel.Perceive(m, p)
		if err != nil {
			t.Errorf("%s: %v", tc.smiles, err)
			continue
		}
		if tc.want == nil {
			if len(ps.Warnings) > 0 {
				t.Errorf("%s: unexpected warnings %q", tc.smiles, ps.Warnings)
			}
			continue
		}
		all := strings.Join(ps.Warnings, "\n")
		for _, w := range tc.want {
			if !strings.Contains(all, w) {
				t.Errorf("%s: warnings %q lack %q", tc.smiles, ps.Warnings, w)
			}
		}
	}
}

// TestParamsRanges: parameter files with absurd numbers fail with their position instead
// of loading (issue 14: ±1e308 used to load and print 310-digit levels), and every shipped
// set lies inside the ranges.
func TestParamsRanges(t *testing.T) {
	for _, tc := range []struct{ name, src, want string }{
		{"huge h", "name: x\nh:\n  - {type: C, h: 1e308, source: s}\n", "x.yaml: 3:18: h entry 1 (C): h = 1e+308 is outside -5…5"},
		{"negative huge h", "name: x\nh:\n  - {type: \"N=\", h: -1e308, source: s}\n", "h = -1e+308 is outside -5…5"},
		{"h just over", "name: x\nh:\n  - {type: F, h: 5.01, source: s}\n", "outside -5…5"},
		{"huge k", "name: x\nk:\n  - {types: [C, C], k: 1e308, source: s}\n", "k = 1e+308 must be in (0, 3]"},
		{"k just over", "name: x\nk:\n  - {types: [C, C], k: 3.2, source: s}\n", "k = 3.2 must be in (0, 3]"},
		{"zero k", "name: x\nk:\n  - {types: [C, C], k: 0, source: s}\n", "must be in (0, 3]"},
		{"escape in name", "name: \"x\\e[2J\"\n", "x.yaml: 1:7: name contains the control character \"\\x1b\""},
		{"bell in title", "name: x\ntitle: \"a\\ab\"\n", "title contains the control character \"\\a\""},
		{"NUL in a source", "name: x\nh:\n  - {type: C, h: 0, source: \"a\\0b\"}\n", "h entry 1: source contains the control character \"\\x00\""},
		{"long name", "name: " + strings.Repeat("n", 101) + "\n", "name is 101 characters long; at most 100"},
		{"long unknown type", "name: x\nh:\n  - {type: " + strings.Repeat("Q", 5000) + ", h: 1, source: s}\n", "(input of 5000 characters)"},
	} {
		_, err := huckel.ParseParams([]byte(tc.src), "x.yaml")
		if !errors.Is(err, huckel.ErrParams) {
			t.Errorf("%s: got %v, want ErrParams", tc.name, err)
			continue
		}
		if !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: error\n  %s\nwant it to contain\n  %s", tc.name, err, tc.want)
		}
		if len(err.Error()) > 400 {
			t.Errorf("%s: error of %d bytes", tc.name, len(err.Error()))
		}
	}
	// limits that are physical are accepted
	ok := "name: x\nh:\n  - {type: F, h: 5, source: s}\n  - {type: B, h: -5, source: s}\nk:\n  - {types: [C, C], k: 3, source: s}\n"
	if _, err := huckel.ParseParams([]byte(ok), "ok.yaml"); err != nil {
		t.Errorf("values at the range limits: %v", err)
	}
	for _, name := range presets.ParamNames() {
		p, err := presets.Params(name)
		if err != nil {
			t.Errorf("%s: %v", name, err)
			continue
		}
		for _, e := range p.HEntries {
			if math.Abs(e.H) > huckel.MaxAbsH {
				t.Errorf("%s: h(%s) = %g outside the range", name, e.Type, e.H)
			}
		}
		for _, e := range p.KEntries {
			if e.K <= 0 || e.K > huckel.MaxK {
				t.Errorf("%s: k(%s,%s) = %g outside the range", name, e.A, e.B, e.K)
			}
		}
	}
}

// TestParamsErrorText: a parameter-file error quotes the file name and the values in it
// without control characters and without flooding the terminal.
func TestParamsErrorText(t *testing.T) {
	file := "evil\x1b[2J\x07" + strings.Repeat("d/", 200) + "set.yaml"
	_, err := huckel.ParseParams([]byte("name: x\nh:\n  - {type: \"Q\\e\", h: 1, source: s}\n"), file)
	if err == nil {
		t.Fatal("no error")
	}
	msg := err.Error()
	if strings.ContainsAny(msg, "\x1b\x07") {
		t.Errorf("raw control bytes in %q", msg)
	}
	if !strings.Contains(msg, `evil\x1b[2J\x07`) || !strings.Contains(msg, "(input of 417 characters)") || !strings.Contains(msg, `"Q\x1b"`) {
		t.Errorf("error text %q", msg)
	}
	if len(msg) > 400 {
		t.Errorf("error of %d bytes", len(msg))
	}
}

// TestCalibrationCheck: the huckel-level calibration rejects numbers outside their
// physical ranges (issue 14: ±1e308 coefficients, r² = 5, n = −3 loaded and printed), and
// every built-in calibration passes.
func TestCalibrationCheck(t *testing.T) {
	var good huckel.Calibration
	for _, name := range presets.ParamNames() {
		p, err := presets.Params(name)
		if err != nil {
			t.Fatal(err)
		}
		c, err := presets.Calibration(p)
		if err != nil {
			t.Fatal(err)
		}
		if err := c.Check(); err != nil {
			t.Errorf("built-in calibration %s: %v", c.Name, err)
		}
		good = c
	}
	for _, tc := range []struct {
		name string
		edit func(c *huckel.Calibration)
		want string
	}{
		{"huge intercept", func(c *huckel.Calibration) { c.HOMOIntercept = 1e308 }, "occupied-level intercept 1e+308 is outside -25…10"},
		{"huge negative slope", func(c *huckel.Calibration) { c.LUMOSlope = -1e308 }, "empty-level slope -1e+308 is outside -10…-0.1"},
		{"positive slope", func(c *huckel.Calibration) { c.HOMOSlope = 2.5 }, "occupied-level slope 2.5"},
		{"zero slope", func(c *huckel.Calibration) { c.HOMOSlope = 0 }, "occupied-level slope 0"},
		{"r² = 5", func(c *huckel.Calibration) { c.R2 = 5 }, "r² 5 is outside 0…1"},
		{"negative per-map r²", func(c *huckel.Calibration) { c.LUMOR2 = -0.2 }, "empty-level r² -0.2"},
		{"n = -3", func(c *huckel.Calibration) { c.N = -3 }, "N = -3 is negative"},
		{"counts disagree", func(c *huckel.Calibration) { c.N = c.HOMON + c.LUMON + 1 }, "is not the sum"},
		{"NaN RMSE", func(c *huckel.Calibration) { c.RMSE = math.NaN() }, "RMSE NaN"},
		{"huge RMSE", func(c *huckel.Calibration) { c.HOMORMSE = 50 }, "occupied-level RMSE 50"},
		{"escape in name", func(c *huckel.Calibration) { c.Name = "x\x1b[2J" }, "name contains the control character U+001B"},
	} {
		c := good
		tc.edit(&c)
		err := c.Check()
		if !errors.Is(err, huckel.ErrCalibrationRange) {
			t.Errorf("%s: got %v, want ErrCalibrationRange", tc.name, err)
			continue
		}
		if !strings.Contains(err.Error(), tc.want) {
			t.Errorf("%s: %q lacks %q", tc.name, err, tc.want)
		}
	}
}
