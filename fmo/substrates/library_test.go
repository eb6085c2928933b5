package substrates

import (
	"errors"
	"strings"
	"testing"
	"time"

	"cyclopair/fmo"
	"cyclopair/huckel/smiles"
	"cyclopair/presets"
)

// withVocab adds the screen's vocabularies (activation modes, ranking keys) to o, as
// package screen does.
func withVocab(o LoadOptions) LoadOptions {
	o.Modes = fmo.Modes()
	o.RankKeys = []string{"rate", "normal_gap", "gap", "stabilization", "regio_margin", "score", "none"}
	return o
}

const goodLibrary = `title: test screen
dienes:
  - name: cyclopentadiene
    smiles: C1=CC=CC1
  - preset: isoprene
  - {name: mapped, smiles: "[CH2:1]=CC=[CH2:4]", pin: [1, 4], notes: pinned termini}
dienophiles:
  - {name: acrolein, smiles: C=CC=O}
  - preset: Maleic anhydride
activations: [none, lewis, lewis]
params: streitwieser1961
calibration: default
filter: {demand: normal, min_regio_margin: 0.01, max_gap: 1.5, allowed_only: true, in_domain: true}
rank_by: stabilization
top: 7
`

func TestLoadLibraryGood(t *testing.T) {
	lib, bad, err := LoadLibrary(strings.NewReader(goodLibrary), withVocab(LoadOptions{Name: "good.yaml"}))
	if err != nil || len(bad) > 0 {
		t.Fatalf("err = %v, bad = %v", err, bad)
	}
	if len(lib.Dienes) != 3 || len(lib.Dienophiles) != 2 {
		t.Fatalf("got %d dienes, %d dienophiles", len(lib.Dienes), len(lib.Dienophiles))
	}
	if d := lib.Dienes[1]; d.Name != "isoprene" || d.SMILES != "CC(=C)C=C" || d.Preset != "isoprene" || d.Line != 5 {
		t.Errorf("preset row = %+v", d)
	}
	if d := lib.Dienophiles[1]; d.Name != "maleic-anhydride" {
		t.Errorf("preset name not normalised: %q", d.Name)
	}
	m := lib.Dienes[2]
	if len(m.Pin) != 2 || m.Mol == nil || len(m.Mol.AtomByMap(1)) != 1 || m.Notes != "pinned termini" {
		t.Errorf("pinned row = %+v", m)
	}
	if got := strings.Join(lib.Activations, ","); got != "none,lewis" {
		t.Errorf("activations = %q (duplicates must collapse)", got)
	}
	want := Filter{Demand: "normal", MinRegioMargin: 0.01, MaxGap: 1.5, AllowedOnly: true, InDomain: true}
	if lib.Filter != want || lib.RankBy != "stabilization" || lib.Top != 7 || lib.Params != "streitwieser1961" || lib.Calibration != "default" || lib.Title != "test screen" {
		t.Errorf("settings = %+v", lib)
	}
}

func TestLoadLibraryDefaults(t *testing.T) {
	lib, _, err := LoadLibrary(strings.NewReader("dienes: [{smiles: C=CC=C}]\ndienophiles: [{smiles: C=C}]\n"), withVocab(LoadOptions{}))
	if err != nil {
		t.Fatal(err)
	}
	if lib.RankBy != "rate" || len(lib.Activations) != 1 || lib.Activations[0] != "none" || lib.Dienes[0].Name != "C=CC=C" {
		t.Errorf("defaults = %+v", lib)
	}
}

// Whole-file problems: err is non-nil, wraps the sentinel, and names the position.
func TestLoadLibraryFatal(t *testing.T) {
	bomb := "a: &a [x, x, x, x, x, x, x, x, x]\nb: &b [*a, *a, *a, *a, *a, *a, *a, *a, *a]\nc: &c [*b, *b, *b, *b, *b, *b, *b, *b, *b]\nd: &d [*c, *c, *c, *c, *c, *c, *c, *c, *c]\ne: &e [*d, *d, *d, *d, *d, *d, *d, *d, *d]\nf: &f [*e, *e, *e, *e, *e, *e, *e, *e, *e]\ng: &g [*f, *f, *f, *f, *f, *f, *f, *f, *f]\nh: &h [*g, *g, *g, *g, *g, *g, *g, *g, *g]\ndienes: *h\ndienophiles: *h\n"
	cases := []struct {
		name, src string
		kind      error
		want      string // substring of the message
	}{
		{"empty", "", ErrMissing, "empty file"},
		{"top-level list", "- a\n- b\n", ErrWrongType, "1:1: the top level is a list"},
		{"unknown top key", "dienes: []\ndienophiles: []\nrank-by: gap\n", ErrUnknownKey, `3:1: unknown key "rank-by"`},
		{"suggestion", "dienes: []\ndienophiles: []\nactivation: [none]\n", ErrUnknownKey, `did you mean "activations"?`},
		{"dienes not a list", "dienes: C=CC=C\ndienophiles: []\n", ErrWrongType, "1:9: dienes: is a single value"},
		{"missing dienophiles", "dienes: []\n", ErrMissing, "no dienophiles list"},
		{"bad activation", "dienes: []\ndienophiles: []\nactivations: [none, photo]\n", ErrBadValue, `3:21: activations[1]: unknown activation mode "photo"`},
		{"bad rank key", "dienes: []\ndienophiles: []\nrank_by: speed\n", ErrBadValue, "3:10: rank_by:"},
		{"top not a number", "dienes: []\ndienophiles: []\ntop: ten\n", ErrWrongType, `3:6: top: is a single value "ten", want a whole number`},
		{"top negative", "dienes: []\ndienophiles: []\ntop: -3\n", ErrBadValue, "negative"},
		{"filter unknown", "dienes: []\ndienophiles: []\nfilter: {demnd: normal}\n", ErrUnknownKey, `did you mean "demand"?`},
		{"filter demand", "dienes: []\ndienophiles: []\nfilter: {demand: reverse}\n", ErrBadValue, "unknown demand"},
		{"filter margin type", "dienes: []\ndienophiles: []\nfilter: {min_regio_margin: [1]}\n", ErrWrongType, "want a number"},
		{"filter nan", "dienes: []\ndienophiles: []\nfilter: {max_gap: .nan}\n", ErrBadValue, "not a finite number"},
		{"filter bool", "dienes: []\ndienophiles: []\nfilter: {allowed_only: maybe}\n", ErrWrongType, "want true or false"},
		{"duplicate key", "dienes: []\ndienes: []\ndienophiles: []\n", ErrBadValue, "key given twice"},
		{"params and file", "dienes: []\ndienophiles: []\nparams: a\nparams_file: b.yaml\n", ErrBadValue, "both params and params_file"},
		{"alias bomb", bomb, ErrAlias, "anchor or alias"},
		{"anchor", "dienes: &x []\ndienophiles: []\n", ErrAlias, "anchor or alias"},
		{"syntax", "dienes: [\n  - a\n", ErrFileSyntax, "YAML syntax"},
		{"tabs", "dienes:\n\t- {smiles: C}\n", ErrFileSyntax, "YAML syntax"},
		{"latin1", "title: caf\xe9\ndienes: []\ndienophiles: []\n", ErrNotUTF8, "1:11: byte 0xE9 is not valid UTF-8"},
		{"utf16", "\xff\xfed\x00i\x00", ErrNotUTF8, "UTF-16"},
		{"nul", "dienes: []\x00\n", ErrNotUTF8, "NUL"},
		{"deep nesting", "dienes: " + strings.Repeat("[", 20000) + strings.Repeat("]", 20000) + "\ndienophiles: []\n", ErrFileSyntax, "YAML syntax"},
		{"filter key twice", "dienes: []\ndienophiles: []\nfilter: {demand: normal, demand: inverse}\n", ErrBadValue, `3:26: filter: key "demand" given twice`},
		{"two documents", "dienes: []\ndienophiles: []\n---\ndienes: []\n", ErrFileSyntax, "a second YAML document"},
		{"huge title", "title: " + strings.Repeat("x", 5000) + "\ndienes: []\ndienophiles: []\n", ErrBadValue, "5000 bytes long"},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			done := make(chan struct{})
			var err error
			go func() {
				defer close(done)
				_, _, err = LoadLibrary(strings.NewReader(c.src), withVocab(LoadOptions{Name: "x.yaml"}))
			}()
			select {
			case <-done:
			case <-time.After(10 * time.Second):
				t.Fatal("loader hung")
			}
			if err == nil {
				t.Fatal("no error")
			}
			if !errors.Is(err, c.kind) {
				t.Errorf("error %q does not wrap %v", err, c.kind)
			}
			if !strings.Contains(err.Error(), c.want) || !strings.HasPrefix(err.Error(), "x.yaml") {
				t.Errorf("error %q lacks %q or the file name", err, c.want)
			}
		})
	}
}

func TestLoadLibraryTooLarge(t *testing.T) {
	_, _, err := LoadLibrary(strings.NewReader(strings.Repeat("#", 2000)), withVocab(LoadOptions{MaxBytes: 1000}))
	if !errors.Is(err, ErrFileTooLarge) {
		t.Errorf("err = %v, want ErrFileTooLarge", err)
	}
}

// Row problems: the good rows load, each bad row is reported with its position.
func TestLoadLibraryBadRows(t *testing.T) {
	src := `dienes:
  - {name: good, smiles: C=CC=C}
  - {name: unclosed, smiles: C1=CC=CC}
  - {name: quoted, smiles: "C=CC=C("}
  - {name: typo, smile: C=CC=C}
  - preset: unobtainium
  - preset: maleic-anhydrid
  - {name: both, preset: furan, smiles: c1ccoc1}
  - C=CC=C
  - {name: good, smiles: C=CC(C)=C}
  - {name: nosmiles}
  - {name: "tab	name", smiles: C=C}
  - {name: pinned, smiles: "[CH2:1]=CC=C", pin: [1, 9]}
  - {name: pintype, smiles: "[CH2:1]=CC=[CH2:2]", pin: "1,2"}
  - {name: elem, smiles: C=CXx}
  - {name: twice, smiles: C=C, smiles: C=CC=C}
dienophiles:
  - {name: ok, smiles: C=C}
  - {name: ok2, smiles: C=C, notes: [a]}
`
	lib, bad, err := LoadLibrary(strings.NewReader(src), withVocab(LoadOptions{Name: "rows.yaml"}))
	if err != nil {
		t.Fatal(err)
	}
	if len(lib.Dienes) != 1 || lib.Dienes[0].Name != "good" || len(lib.Dienophiles) != 1 {
		t.Fatalf("good rows: %d dienes, %d dienophiles", len(lib.Dienes), len(lib.Dienophiles))
	}
	want := []struct {
		kind error
		msg  string
	}{
		{ErrBadSMILES, `rows.yaml: 3:31: dienes[1] "unclosed": SMILES "C1=CC=CC" column 2: `},
		{ErrBadSMILES, `rows.yaml: 4:36: dienes[2] "quoted": SMILES "C=CC=C(" column 8:`},
		{ErrUnknownKey, `rows.yaml: 5:18: dienes[3]: unknown key "smile" (known keys: name, smiles, pin, notes, preset; did you mean "smiles"?)`},
		{ErrUnknownPreset, `rows.yaml: 6:13: dienes[4].preset: unknown substrate preset "unobtainium"`},
		{ErrUnknownPreset, `did you mean maleic-anhydride?`},
		{ErrBadValue, `8:41: dienes[6]: both preset and smiles given`},
		{ErrWrongType, `9:5: dienes[7]: is a single value`},
		{ErrDuplicateName, `10:5: dienes[8]: name "good" already used by dienes[0]`},
		{ErrMissing, `11:5: dienes[9]: no smiles`},
		{ErrBadValue, `control character`},
		{ErrBadValue, `13:53: dienes[11].pin[1]: no atom carries map number 9`},
		{ErrWrongType, `dienes[12].pin: is a single value, want a list of atom-map numbers`},
		{ErrBadSMILES, `15:29: dienes[13] "elem": SMILES "C=CXx" column 4`},
		{ErrBadValue, `16:32: dienes[14]: key "smiles" given twice`},
		{ErrWrongType, `19:37: dienophiles[1].notes: is a list, want text`},
	}
	if len(bad) != len(want) {
		for _, b := range bad {
			t.Log(b)
		}
		t.Fatalf("got %d bad rows, want %d", len(bad), len(want))
	}
	for i, w := range want {
		if !errors.Is(bad[i], w.kind) || !strings.Contains(bad[i].Error(), w.msg) {
			t.Errorf("bad[%d] = %q\n  want %v containing %q", i, bad[i], w.kind, w.msg)
		}
	}
	var se *smiles.Error
	if !errors.As(bad[0], &se) {
		t.Error("bad SMILES row does not expose the *smiles.Error")
	}
}

func TestLoadList(t *testing.T) {
	cases := []struct {
		name, file, src string
		names           []string
		bad             []string
	}{
		{"plain", "l.txt", "# dienes\nC1=CC=CC1 cyclopentadiene\n\nC=CC=C\tbutadiene\nC=CC(C)=C\nC1=CC(\n", []string{"cyclopentadiene", "butadiene", "C=CC(C)=C"},
			[]string{"l.txt: 6:7: \"C1=CC(\": SMILES \"C1=CC(\" column 7"}},
		{"csv with header", "l.csv", "name,smiles\ncpd,C1=CC=CC1\n\"a, b\",C=CC=C\nbad,C1\nx,y,z\n", []string{"cpd", "a, b"},
			[]string{"l.csv: 4:6: \"bad\": SMILES \"C1\" column 2", "l.csv: 5:1: 3 fields"}},
		{"csv without header", "l.csv", "cpd,C1=CC=CC1\ncpd,C=C\n", []string{"cpd"}, []string{"already used on line 1"}},
	}
	for _, c := range cases {
		t.Run(c.name, func(t *testing.T) {
			subs, bad, err := LoadList(strings.NewReader(c.src), c.file, 4, 0)
			if err != nil {
				t.Fatal(err)
			}
			var got []string
			for _, s := range subs {
				got = append(got, s.Name)
				if s.Mol == nil {
					t.Errorf("%s: no molecule", s.Name)
				}
			}
			if strings.Join(got, "|") != strings.Join(c.names, "|") {
				t.Errorf("names = %q, want %q", got, c.names)
			}
			if len(bad) != len(c.bad) {
				t.Fatalf("bad = %v, want %d", bad, len(c.bad))
			}
			for i, w := range c.bad {
				if !strings.Contains(bad[i].Error(), w) {
					t.Errorf("bad[%d] = %q, want %q", i, bad[i], w)
				}
			}
		})
	}
	if _, _, err := LoadList(strings.NewReader("C=C caf\xe9\n"), "l.txt", 4, 0); !errors.Is(err, ErrNotUTF8) {
		t.Errorf("non-UTF-8 list: err = %v", err)
	}
}

// The embedded demo file loads without a single bad row.
func TestDemoLibraryLoads(t *testing.T) {
	name, data := presets.DemoFile()
	lib, bad, err := ParseLibrary(data, withVocab(LoadOptions{Name: name}))
	if err != nil || len(bad) > 0 {
		t.Fatalf("err = %v, bad = %v", err, bad)
	}
	if len(lib.Dienes)*len(lib.Dienophiles) < 30 || len(lib.Activations) != 3 {
		t.Errorf("demo has %d×%d×%d pairs", len(lib.Dienes), len(lib.Dienophiles), len(lib.Activations))
	}
}

func FuzzLoadLibrary(f *testing.F) {
	f.Add([]byte(goodLibrary))
	f.Add([]byte("dienes: [{smiles: C=CC=C}]\ndienophiles: [{smiles: C=C}]\n"))
	f.Add([]byte("a: &a [x]\nb: [*a, *a]\ndienes: *a\n"))
	f.Add([]byte("dienes:\n  - {name: x, smiles: \"C1=C\\\\C\", pin: [1, 2]}\ndienophiles: []\n"))
	f.Add([]byte("dienes: [" + strings.Repeat("{", 50) + "\n"))
	f.Add([]byte("top: 99999999999999999999\nfilter: {max_gap: 1e400}\n"))
	f.Add([]byte("\xef\xbb\xbfdienes: []\ndienophiles: []\n"))
	f.Fuzz(func(t *testing.T, data []byte) {
		lib, bad, err := ParseLibrary(data, withVocab(LoadOptions{Name: "fuzz.yaml", MaxBytes: 1 << 16}))
		if err == nil && lib == nil {
			t.Fatal("nil library without error")
		}
		for _, b := range bad {
			if b.Err == nil || b.Error() == "" {
				t.Fatalf("bad row without kind or message: %#v", b)
			}
		}
		if err != nil && err.Error() == "" {
			t.Fatal("empty error message")
		}
		for _, name := range []string{"fuzz.txt", "fuzz.csv", "fuzz.tsv", "fuzz.sdf"} { // every list format
			_, _, _ = LoadList(strings.NewReader(string(data)), name, 4, 1<<16)
		}
	})
}

func TestLoadLibraryAmine(t *testing.T) {
	lib, _, err := ParseLibrary([]byte("dienes: []\ndienophiles: []\namine: C1CCNCC1\n"), withVocab(LoadOptions{}))
	if err != nil || lib.AmineMol == nil || lib.Amine != "C1CCNCC1" {
		t.Fatalf("amine not loaded: %v", err)
	}
	_, _, err = ParseLibrary([]byte("dienes: []\ndienophiles: []\namine: C1CCNCC\n"), withVocab(LoadOptions{Name: "a.yaml"}))
	if !errors.Is(err, ErrBadSMILES) || !strings.Contains(err.Error(), "a.yaml: 3:9: amine: SMILES") {
		t.Errorf("bad amine: %v", err)
	}
}
