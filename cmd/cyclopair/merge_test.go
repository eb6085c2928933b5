package main

import (
	"os"
	"path/filepath"
	"strconv"
	"strings"
	"testing"
)

// Shard outputs merged equal the unsharded run, byte for byte, for JSON Lines and CSV and for
// keys whose printed numbers are rounded (CSV) or differ from the kernel's in the last bit
// (stabilization), and for the rate key (the default): merge recomputes the keys.
func TestMergeEqualsUnsharded(t *testing.T) {
	dir := t.TempDir()
	for _, format := range []string{"json", "csv"} {
		for _, key := range []string{"rate", "normal_gap", "stabilization", "score"} {
			base := []string{"screen", "../../presets/demo.yaml", "--activate", "none,lewis,iminium", "--rank-by", key,
				"--top", "12", "--format", format, "--workers", "2"}
			whole, _, code := runCLI(t, "", base...)
			if code != 0 || strings.Count(whole, "\n") < 12 {
				t.Fatalf("%s %s: unsharded run: exit %d\n%s", format, key, code, whole)
			}
			args := []string{"merge", "--rank-by", key, "--top", "12"}
			for i := 1; i <= 4; i++ {
				part, _, code := runCLI(t, "", append(base, "--shard", strconv.Itoa(i)+"/4")...)
				if code != 0 {
					t.Fatalf("shard %d: exit %d", i, code)
				}
				name := filepath.Join(dir, key+strconv.Itoa(i)+"."+format)
				if err := os.WriteFile(name, []byte(part), 0o644); err != nil {
					t.Fatal(err)
				}
				args = append(args, name)
			}
			merged, errOut, code := runCLI(t, "", args...)
			if code != 0 || merged != whole {
				t.Errorf("%s %s: merged shards differ from the unsharded run (exit %d, %s)\nmerged:\n%s\nwhole:\n%s",
					format, key, code, errOut, merged, whole)
			}
		}
	}
}

func TestMergeErrors(t *testing.T) {
	dir := t.TempDir()
	table := filepath.Join(dir, "t.txt")
	os.WriteFile(table, []byte("# a table\nrank diene\n"), 0o644)
	for _, c := range []struct {
		args []string
		code int
		want string
	}{
		{[]string{"merge", table}, exitUsage, "neither JSON Lines nor the screen's CSV"},
		{[]string{"merge", filepath.Join(dir, "missing.jsonl")}, exitUsage, "cannot open"},
		{[]string{"merge", table, "--rank-by", "speed"}, exitUsage, "--rank-by"},
		{[]string{"merge", table, "--rate-model", filepath.Join(dir, "missing.yaml")}, exitUsage, "cannot read the rate model"},
	} {
		_, errOut, code := runCLI(t, "", c.args...)
		if code != c.code || !strings.Contains(errOut, c.want) || !strings.HasPrefix(errOut, "cyclopair: ") {
			t.Errorf("%v: exit %d, stderr %q (want %d, %q)", c.args, code, errOut, c.code, c.want)
		}
	}
}
