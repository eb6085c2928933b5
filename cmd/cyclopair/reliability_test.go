package main

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// The CLI half of the reliability suite of issue 14 (bad input, big input): every case
// runs the whole program in-process through run(args, stdin, stdout, stderr). The library
// half is huckel/limits_test.go and huckel/smiles/limits_test.go.

// checkOneLineError asserts the shape of a refused input: exit 2, nothing on stdout, one
// line on stderr starting "cyclopair: ", bounded in size, no stack trace, and the given
// fragments.
func checkOneLineError(t *testing.T, name, out, errOut string, code int, want ...string) {
	t.Helper()
	if code != exitUsage {
		t.Errorf("%s: exit %d, want %d (stderr %.300q)", name, code, exitUsage, errOut)
	}
	if out != "" {
		t.Errorf("%s: %d bytes on stdout, want none", name, len(out))
	}
	lines := strings.Split(strings.TrimSuffix(errOut, "\n"), "\n")
	if len(lines) != 1 || !strings.HasPrefix(lines[0], "cyclopair: ") || !strings.HasSuffix(errOut, "\n") {
		t.Errorf("%s: stderr is not one error line: %.500q", name, errOut)
	}
	if len(errOut) > 600 {
		t.Errorf("%s: %d bytes on stderr, want at most 600", name, len(errOut))
	}
	if strings.Contains(errOut, "goroutine ") || strings.Contains(errOut, "panic") {
		t.Errorf("%s: stack trace on stderr: %.500s", name, errOut)
	}
	for _, w := range want {
		if !strings.Contains(errOut, w) {
			t.Errorf("%s: stderr %q lacks %q", name, errOut, w)
		}
	}
}

// TestCrashOnSize: the reproducer of issue 14, a 100,002-byte polyene SMILES, used to die
// in a runtime out-of-memory crash with a stack trace in orbitals, pair and draw. Now each
// command refuses it with one line naming the limit and the flag; with the length limit
// raised, the centre limit refuses it (in linear time) instead.
func TestCrashOnSize(t *testing.T) {
	huge := strings.Repeat("C=C", 33334)
	for _, args := range [][]string{
		{"orbitals", huge},
		{"orbitals", "--format", "json", huge},
		{"pair", "--diene", huge, "--dienophile", "C=CC=O"},
		{"pair", "--diene", "C=CC=C", "--dienophile", huge},
		{"draw", huge},
		{"draw", "--diene", huge, "--dienophile", "C=C"},
		{"diagram", "--diene", huge, "--dienophile", "C=C"},
	} {
		out, errOut, code := runCLI(t, "", args...)
		checkOneLineError(t, args[0]+" "+args[1], out, errOut, code,
			"(input of 100002 characters)", "column 4097", "SMILES of 100002 bytes is longer than the limit of 4096 bytes", "--max-smiles-length")
	}
	// The same on stdin.
	out, errOut, code := runCLI(t, huge+"\n", "orbitals", "-")
	if code != exitPartial || out != "" || len(errOut) > 600 || !strings.Contains(errOut, "line 1, column 4097") {
		t.Errorf("orbitals - : exit %d, stdout %d bytes, stderr %.600q", code, len(out), errOut)
	}
	// With the length limit raised, the π system is too large.
	for _, args := range [][]string{
		{"orbitals", "--max-smiles-length", "200000", huge},
		{"draw", "--max-smiles-length", "200000", huge},
	} {
		out, errOut, code := runCLI(t, "", args...)
		checkOneLineError(t, args[0]+" raised", out, errOut, code,
			"the π system has 66668 centres, more than the limit of 500", "--max-centres")
	}
	out, errOut, code = runCLI(t, "", "pair", "--max-smiles-length", "200000", "--diene", huge, "--dienophile", "C=C")
	// pair has its own, lower centre limit (fmo.DefaultMaxPairCentres) and says how to raise it
	checkOneLineError(t, "pair raised", out, errOut, code, "the π system has 66668 centres, more than the limit of 200", "--max-centres")
	// A raised centre limit is honoured.
	out, errOut, code = runCLI(t, "", "orbitals", "--max-centres", "502", "--format", "csv", strings.Repeat("C=C", 251))
	if code != exitOK || !strings.Contains(out, ",502,1,") {
		t.Errorf("--max-centres 502: exit %d, stderr %q", code, errOut)
	}
}

// TestLimitFlags: the limit flags reject values outside their ranges as usage errors.
func TestLimitFlags(t *testing.T) {
	for _, args := range [][]string{
		{"orbitals", "--max-centres", "0", "C=C"},
		{"orbitals", "--max-centres", "20000", "C=C"},
		{"orbitals", "--max-smiles-length", "0", "C=C"},
		{"draw", "--max-smiles-length", "2000000", "C=C"},
		{"pair", "--max-smiles-length", "-1", "--diene", "C=CC=C", "--dienophile", "C=C"},
	} {
		_, errOut, code := runCLI(t, "", args...)
		if code != exitUsage || !strings.Contains(errOut, "--max-") || !strings.Contains(errOut, "for usage") {
			t.Errorf("%q: exit %d, stderr %q", args, code, errOut)
		}
	}
}

// TestErrorTextIsSafe: control bytes in a SMILES, a parameter-set name or a file name are
// shown escaped, never raw (issue 14), and an error in a 200,000-character input quotes at
// most about 100 characters of it with the total length.
func TestErrorTextIsSafe(t *testing.T) {
	long := strings.Repeat("C", 100000) + "!" + strings.Repeat("C", 99999)
	for _, tc := range []struct {
		stdin string
		args  []string
		want  string
	}{
		{"", []string{"orbitals", "C\x1b[2JC\x07"}, `C\x1b[2JC\x07: column 2: unexpected byte 0x1b`},
		{"", []string{"orbitals", "CC\x00"}, `CC\x00: column 3`},
		{"", []string{"draw", "C\x1b]0;pwned\x07C"}, `C\x1b]0;pwned\x07C: column 2`},
		{"", []string{"pair", "--diene", "C=CC=C\x07", "--dienophile", "C=C"}, `C=CC=C\x07: column 7`},
		{"", []string{"orbitals", "--params", "set\x1b[31m\x07", "C=C"}, `set\x1b[31m\x07: no such parameter set`},
		{"", []string{"orbitals", "--params", "set\x00", "C=C"}, `set\x00: invalid argument`},
		{"", []string{"orbitals", "--calibration", "cal\x1b[2J.yaml", "C=C"}, `cal\x1b[2J.yaml`},
		{"C\x1b[2JC name\x07\n", []string{"orbitals", "-"}, `line 1, column 2`},
		{"", []string{"orbitals", "--max-smiles-length", "300000", long}, "(input of 200000 characters)"},
	} {
		_, errOut, _ := runCLI(t, tc.stdin, tc.args...)
		for _, r := range errOut {
			if r < 0x20 && r != '\n' || r == 0x7f || r >= 0x80 && r < 0xa0 {
				t.Errorf("%q: raw control character %U on stderr: %q", tc.args, r, errOut)
				break
			}
		}
		if !strings.Contains(errOut, tc.want) {
			t.Errorf("%q: stderr %q lacks %q", tc.args, errOut, tc.want)
		}
		for _, l := range strings.Split(errOut, "\n") {
			if len(l) > 400 {
				t.Errorf("%q: stderr line of %d bytes: %.200q…", tc.args, len(l), l)
			}
		}
	}
}

// TestStdinByteOrderMark: a UTF-8 byte-order mark at the start of 'orbitals -' input (as
// some editors write) is skipped instead of being reported as a bad SMILES.
func TestStdinByteOrderMark(t *testing.T) {
	out, errOut, code := runCLI(t, "\ufeffC=CC=C butadiene\nC=CC=O acrolein\n", "orbitals", "-", "--format", "csv")
	if code != exitOK || !strings.Contains(out, "\nC=CC=C,butadiene,") || !strings.Contains(out, "\nC=CC=O,acrolein,") {
		t.Errorf("exit %d, stdout %q, stderr %q", code, out, errOut)
	}
	// Only the first line may carry one: a BOM later is a bad character, reported.
	_, errOut, code = runCLI(t, "C=CC=C\n\ufeffC=CC=O\n", "orbitals", "-")
	if code != exitPartial || !strings.Contains(errOut, `line 2, column 1: unexpected byte 0xef`) || !strings.Contains(errOut, `\ufeffC=CC=O`) {
		t.Errorf("BOM on line 2: exit %d, stderr %q", code, errOut)
	}
}

// TestLeftOutAtomsAreReported: unsupported metal atoms and extra fragments used to pass
// silently (issue 14); they now give warnings on stderr, and a metal alone is refused with
// the reason.
func TestLeftOutAtomsAreReported(t *testing.T) {
	for _, tc := range []struct {
		args []string
		code int
		want string
	}{
		{[]string{"orbitals", "[Fe]"}, exitUsage, "cyclopair: [Fe]: no π system, nothing to compute: atom 0 (Fe, column 1): no π parameters for Fe"},
		{[]string{"draw", "[Fe]"}, exitUsage, "no π system, nothing to draw: atom 0 (Fe, column 1)"},
		{[]string{"orbitals", "C=C[Fe]"}, exitOK, "cyclopair: C=C[Fe]: warning: atom 2 (Fe, column 4): no π parameters for Fe"},
		{[]string{"orbitals", "C=CC=O.[Al](Cl)(Cl)Cl"}, exitOK, "--activate lewis"},
		{[]string{"orbitals", "C=C.C=CC=C"}, exitOK, "warning: the input has 2 separate molecules with π systems"},
		{[]string{"pair", "--diene", "C=CC=C", "--dienophile", "C=CC=[N+]1CCCC1.[Cl-]", "--format", "json"}, exitOK, ""},
	} {
		out, errOut, code := runCLI(t, "", tc.args...)
		if code != tc.code || !strings.Contains(errOut, tc.want) {
			t.Errorf("%q: exit %d (want %d), stderr %q lacks %q", tc.args, code, tc.code, errOut, tc.want)
		}
		if tc.args[0] == "pair" && !strings.Contains(out, "the part at column 17 ([Cl-]) has no π centres and is left out") {
			t.Errorf("%q: the counter-ion warning is not among the pair's warnings: %.400s", tc.args, out)
		}
	}
}

// TestAbsurdCalibration: a calibration file with numbers outside their physical ranges
// (issue 14: ±1e308 coefficients, r² = 5, n = −3) is refused instead of printing
// 310-digit figures.
func TestAbsurdCalibration(t *testing.T) {
	good, err := os.ReadFile("testdata/calibrate/out.yaml")
	if err != nil {
		t.Fatal(err)
	}
	dir := t.TempDir()
	for _, tc := range []struct{ name, old, new, want string }{
		{"huge slope", "slope: -4.231225", "slope: -1e308", "occupied-level slope -1e+308 is outside -10…-0.1"},
		{"huge intercept", "intercept: -2.212106", "intercept: 1e308", "empty-level intercept 1e+308"},
		{"r2 = 5", "\nr2: 0.865599", "\nr2: 5", "r² 5 is outside 0…1"},
		{"n = -3", "\nn: 8", "\nn: -3", "N = -3 is negative"},
	} {
		src := strings.Replace(string(good), tc.old, tc.new, 1)
		if src == string(good) {
			t.Fatalf("%s: %q not in the calibration file", tc.name, tc.old)
		}
		file := filepath.Join(dir, strings.ReplaceAll(tc.name, " ", "_")+".yaml")
		if err := os.WriteFile(file, []byte(src), 0o644); err != nil {
			t.Fatal(err)
		}
		out, errOut, code := runCLI(t, "", "orbitals", "--calibration", file, "C=C")
		checkOneLineError(t, tc.name, out, errOut, code, tc.want)
	}
}

// TestPairCentreLimit: the issue-14 stall (a 100-centre polyene pair took 10 s, 200 centres
// over 100 s) is bounded: a partner over fmo.DefaultMaxPairCentres is refused with one line
// that says how to raise the limit, and --max-centres lets it through. The polyene is a
// closed-form-free stress input; only exit codes and the message are checked here.
func TestPairCentreLimit(t *testing.T) {
	polyene := strings.Repeat("C=C", 101) // 202 π centres
	out, errOut, code := runCLI(t, "", "pair", "--diene", polyene, "--dienophile", "C=CC=O")
	checkOneLineError(t, "pair over the centre limit", out, errOut, 2, "202 centres", "--max-centres")
	if _, _, code = runCLI(t, "", "pair", "--max-centres", "202", "--format", "json", "--diene", strings.Repeat("C=C", 101), "--dienophile", "C=CC=O"); code != 0 {
		t.Errorf("pair --max-centres 202 on 202 centres: exit %d, want 0", code)
	}
}
