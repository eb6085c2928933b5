package main

import (
	"bufio"
	"bytes"
	"cmp"
	"encoding/json"
	"encoding/xml"
	"io"
	"os"
	"path/filepath"
	"slices"
	"strings"
	"testing"

	"cyclopair/cmd/cyclopair/internal/render"
)

const smallScreen = "../../testdata/screen/small.yaml"

// Golden output of every format for a small screen with one bad row: the bad row is listed
// on stderr with its position, the good rows are screened, and the exit code is 1.
func TestScreenGoldenFormats(t *testing.T) {
	for _, f := range []string{"table", "csv", "json", "markdown"} {
		t.Run(f, func(t *testing.T) {
			out, errOut, code := runCLI(t, "", "screen", smallScreen, "--format", f, "--workers", "2")
			if code != exitPartial {
				t.Errorf("exit code %d, want %d; stderr:\n%s", code, exitPartial, errOut)
			}
			if !strings.Contains(errOut, `small.yaml: 8:38: dienes[3] "broken": SMILES "C1=CC=C(C1" column 11: unclosed branch`) {
				t.Errorf("stderr does not list the bad row with its position:\n%s", errOut)
			}
			if strings.Contains(errOut, "\r") || strings.Contains(errOut, "eta ") {
				t.Error("progress drawn on a stderr that is not a terminal")
			}
			if !strings.Contains(errOut, "1 of ") {
				t.Errorf("stderr lacks the failure count:\n%s", errOut)
			}
			if !strings.Contains(out, render.Caution) {
				t.Error("report lacks the caution")
			}
			checkGolden(t, "screen/small."+f, []byte(out))
		})
	}
}

// The demo runs the real analysis on the embedded invented scenario (golden table).
func TestDemoGolden(t *testing.T) {
	out, errOut, code := runCLI(t, "", "demo")
	if code != exitOK {
		t.Fatalf("demo exit code %d:\n%s", code, errOut)
	}
	if !strings.Contains(out, "fictional") || !strings.Contains(out, render.Caution) {
		t.Error("demo output lacks the scenario title or the caution")
	}
	checkGolden(t, "screen/demo.table", []byte(out))
	file, _, _ := runCLI(t, "", "demo", "--print-file")
	if !strings.Contains(file, "INVENTED") {
		t.Error("demo --print-file does not print the demo file")
	}
}

// Same output, byte for byte, with 1 and with 8 workers.
func TestScreenWorkersByteIdentical(t *testing.T) {
	for _, args := range [][]string{
		{"demo", "--format", "json", "--top", "30"},
		{"demo", "--format", "csv", "--rank-by", "none", "--top", "40"},
		{"demo", "--format", "table", "--rank-by", "regio_margin", "--top", "12"},
	} {
		one, _, _ := runCLI(t, "", append(args, "--workers", "1")...)
		eight, _, _ := runCLI(t, "", append(args, "--workers", "8")...)
		if one != eight || one == "" {
			t.Errorf("%v: 1 and 8 workers differ", args)
		}
	}
}

// Concatenating the JSON Lines of shards 1..n equals the unsharded unranked stream.
func TestScreenShardsConcatenateCLI(t *testing.T) {
	// --max-gap keeps the full analyses (the slow part) few; the shards still cut all 98 pairs.
	whole, _, code := runCLI(t, "", "demo", "--format", "json", "--rank-by", "none", "--top", "0", "--max-gap", "0.35")
	if code != exitOK {
		t.Fatal("unsharded run failed")
	}
	var cat strings.Builder
	for _, sh := range []string{"1/3", "2/3", "3/3"} {
		part, _, code := runCLI(t, "", "demo", "--format", "json", "--rank-by", "none", "--top", "0", "--max-gap", "0.35", "--shard", sh)
		if code != exitOK {
			t.Fatalf("shard %s failed", sh)
		}
		cat.WriteString(part)
	}
	if cat.String() != whole {
		t.Error("shards do not concatenate to the unsharded stream")
	}
	// Every line is a Pair object with the batch keys.
	sc := bufio.NewScanner(strings.NewReader(whole))
	sc.Buffer(nil, 1<<20)
	n := 0
	for sc.Scan() {
		var m map[string]any
		if err := json.Unmarshal(sc.Bytes(), &m); err != nil {
			t.Fatalf("line %d: %v", n+1, err)
		}
		for _, k := range []string{"diene_name", "dienophile_name", "demand", "gap_normal", "gap_inverse", "orientations", "allowed", "warnings", "activation"} {
			if _, ok := m[k]; !ok {
				t.Errorf("line %d lacks %q", n+1, k)
			}
		}
		n++
	}
	if n < 10 {
		t.Errorf("only %d lines pass --max-gap 0.35", n)
	}
}

func TestScreenStdinAndLists(t *testing.T) {
	data, err := os.ReadFile(smallScreen)
	if err != nil {
		t.Fatal(err)
	}
	fromFile, _, _ := runCLI(t, "", "screen", smallScreen, "--format", "csv")
	fromStdin, _, code := runCLI(t, string(data), "screen", "-", "--format", "csv")
	if code != exitPartial || strings.ReplaceAll(fromStdin, "stdin", smallScreen) == "" || len(fromStdin) != len(fromFile) {
		t.Errorf("stdin run differs from the file run (code %d)", code)
	}
	out, errOut, code := runCLI(t, "", "screen", "--dienes", "../../testdata/screen/dienes.csv",
		"--dienophiles", "../../testdata/screen/dienophiles.txt", "--activate", "none,lewis", "--format", "csv")
	if code != exitPartial || !strings.Contains(errOut, `dienes.csv: 4:22: "not a molecule": SMILES "C1=CC(" column 7`) {
		t.Errorf("list screen: code %d, stderr:\n%s", code, errOut)
	}
	if !strings.Contains(out, "2,3-dimethylbutadiene") || !strings.Contains(out, "maleic anhydride") {
		t.Errorf("list screen output lacks rows:\n%s", out)
	}
	checkGolden(t, "screen/lists.csv", []byte(out))
}

func TestScreenErrors(t *testing.T) {
	cases := []struct {
		args []string
		code int
		want string
	}{
		{[]string{"screen", "../../testdata/screen/fatal.yaml"}, exitUsage, "fatal.yaml: 5:10: rank_by: unknown ranking key"},
		{[]string{"screen", "no-such-file.yaml"}, exitUsage, "no-such-file.yaml: cannot open"},
		{[]string{"screen", "../../testdata/screen/badparams.yaml"}, exitUsage, "badparams.yaml: 5:9: params: nosuchset: no such parameter set"},
		{[]string{"screen", smallScreen, "--format", "pdf"}, exitUsage, "--format"},
		{[]string{"screen", smallScreen, "--shard", "4/3"}, exitUsage, "--shard"},
		{[]string{"screen", smallScreen, "--activate", "photo"}, exitUsage, `unknown mode "photo"`},
		{[]string{"screen", smallScreen, "--rank-by", "speed"}, exitUsage, "--rank-by"},
		{[]string{"screen"}, exitUsage, "give a substrate file"},
		{[]string{"diagram", "--diene", "C=CC=C"}, exitUsage, "give both"},
		{[]string{"diagram", "--diene", "C1=CC(", "--dienophile", "C=C"}, exitUsage, "C1=CC("},
	}
	for _, c := range cases {
		_, errOut, code := runCLI(t, "", c.args...)
		if code != c.code || !strings.Contains(errOut, c.want) || strings.Contains(errOut, "goroutine") {
			t.Errorf("%v: code %d, stderr %q; want code %d containing %q", c.args, code, errOut, c.code, c.want)
		}
	}
}

// The diagram command writes well-formed SVG with one level line per π level per column.
func TestDiagramCommand(t *testing.T) {
	dir := t.TempDir()
	path := filepath.Join(dir, "d.svg")
	_, errOut, code := runCLI(t, "", "diagram", "--diene", "cyclopentadiene", "--dienophile", "C=CC=O",
		"--activate", "none,lewis", "-o", path)
	if code != exitOK {
		t.Fatalf("code %d: %s", code, errOut)
	}
	svg, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	// cyclopentadiene: 4 π centres, plus the CH2 pseudo-atom when the parameter set models
	// hyperconjugation; acrolein 4 centres, 4 levels; Lewis-bound acrolein the same 4
	// centres. Count per column from the drawing and compare with the orbitals command.
	counts := map[string]int{}
	dec := xml.NewDecoder(bytes.NewReader(svg))
	col := ""
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("not XML: %v", err)
		}
		if e, ok := tok.(xml.StartElement); ok {
			for _, a := range e.Attr {
				if e.Name.Local == "g" && a.Name.Local == "data-column" {
					col = a.Value
				}
				if e.Name.Local == "line" && a.Name.Local == "class" && a.Value == "level" {
					counts[col]++
				}
			}
		}
	}
	want := map[string]int{"0": levelCount(t, "C1=CC=CC1"), "1": levelCount(t, "C=CC=O"), "2": levelCount(t, "C=CC=O")}
	for c, n := range want {
		if counts[c] != n {
			t.Errorf("column %s: %d level lines, want %d", c, counts[c], n)
		}
	}
}

// levelCount asks the orbitals command how many π levels a molecule has.
func levelCount(t *testing.T, smi string) int {
	t.Helper()
	out, errOut, code := runCLI(t, "", "orbitals", smi, "--format", "json")
	if code != exitOK {
		t.Fatalf("orbitals %s: %s", smi, errOut)
	}
	var o struct {
		Levels []json.RawMessage `json:"levels"`
	}
	if err := json.Unmarshal([]byte(out), &o); err != nil {
		t.Fatal(err)
	}
	return len(o.Levels)
}

// pair --svg writes the diagram with one 2π column per activation that applies.
func TestPairSVG(t *testing.T) {
	path := filepath.Join(t.TempDir(), "p.svg")
	_, errOut, code := runCLI(t, "", "pair", "--diene", "C=CC=C", "--dienophile", "C=CC=O", "--activate", "none,lewis", "--svg", path)
	if code != exitOK {
		t.Fatalf("code %d: %s", code, errOut)
	}
	svg, err := os.ReadFile(path)
	if err != nil {
		t.Fatal(err)
	}
	if n := bytes.Count(svg, []byte(`class="column"`)); n != 3 {
		t.Errorf("%d columns, want 3 (diene, free, lewis)", n)
	}
	if err := xml.Unmarshal(svg, new(struct{})); err != nil {
		t.Errorf("not XML: %v", err)
	}
}

// --format html embeds the energy-level diagram of the top row (diene with every
// activation of its dienophile).
func TestScreenHTMLHasDiagram(t *testing.T) {
	out, errOut, code := runCLI(t, "", "demo", "--format", "html", "--top", "3")
	if code != exitOK {
		t.Fatalf("code %d: %s", code, errOut)
	}
	if !strings.Contains(out, `id="levels"`) || !strings.Contains(out, `class="level"`) || !strings.Contains(out, render.Caution) {
		t.Error("HTML screen report lacks the level diagram or the caution")
	}
}

// Ranked shards merge into the unsharded ranking: each shard's top K, sorted together by
// (key, pair_number) and cut to K, is the unsharded top K.
func TestScreenRankedShardsMerge(t *testing.T) {
	type row struct {
		Number    int64 `json:"pair_number"`
		GapNormal struct {
			Beta float64 `json:"beta"`
		} `json:"gap_normal"`
	}
	parse := func(out string) []row {
		var rows []row
		for _, l := range strings.Split(strings.TrimSpace(out), "\n") {
			var r row
			if err := json.Unmarshal([]byte(l), &r); err != nil {
				t.Fatal(err)
			}
			rows = append(rows, r)
		}
		return rows
	}
	whole, _, _ := runCLI(t, "", "demo", "--rank-by", "normal_gap", "--format", "json", "--top", "10")
	want := parse(whole)
	var merged []row
	for _, sh := range []string{"1/3", "2/3", "3/3"} {
		out, _, code := runCLI(t, "", "demo", "--rank-by", "normal_gap", "--format", "json", "--top", "10", "--shard", sh)
		if code != exitOK {
			t.Fatalf("shard %s failed", sh)
		}
		merged = append(merged, parse(out)...)
	}
	slices.SortStableFunc(merged, func(a, b row) int {
		if c := cmp.Compare(a.GapNormal.Beta, b.GapNormal.Beta); c != 0 {
			return c
		}
		return cmp.Compare(a.Number, b.Number)
	})
	merged = merged[:len(want)]
	for i := range want {
		if merged[i].Number != want[i].Number {
			t.Fatalf("merged shard ranking differs at row %d: pair %d, want %d", i+1, merged[i].Number, want[i].Number)
		}
	}
}
