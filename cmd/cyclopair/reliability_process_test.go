package main

// Reliability suite, part 2 (issue 14: signals, failed output, readers, CSV and terminal
// safety); part 1, reliability_test.go, holds the size limits and safe error text.

// Reliability suite (issue 14): each reproducer of the issue as a test. The cases that need
// a real process (signals, closed or full stdout) build the binary once into a temporary
// directory; they are skipped with -short.

import (
	"bufio"
	"bytes"
	"encoding/csv"
	"errors"
	"fmt"
	"io"
	"os"
	"os/exec"
	"path/filepath"
	"regexp"
	"strconv"
	"strings"
	"sync"
	"syscall"
	"testing"
	"time"
)

var (
	binOnce sync.Once
	binPath string
	binErr  error
)

// cliBinary builds cmd/cyclopair once per test run into a temporary directory.
func cliBinary(t *testing.T) string {
	t.Helper()
	if testing.Short() {
		t.Skip("builds and runs the binary; skipped with -short")
	}
	binOnce.Do(func() {
		dir, err := os.MkdirTemp("", "cyclopair-bin-")
		if err != nil {
			binErr = err
			return
		}
		binPath = filepath.Join(dir, "cyclopair")
		out, err := exec.Command("go", "build", "-o", binPath, ".").CombinedOutput()
		if err != nil {
			binErr = fmt.Errorf("go build: %v\n%s", err, out)
		}
	})
	if binErr != nil {
		t.Fatal(binErr)
	}
	return binPath
}

func TestMain(m *testing.M) {
	code := m.Run()
	if binPath != "" {
		os.RemoveAll(filepath.Dir(binPath))
	}
	os.Exit(code)
}

// bigLists writes a diene and a dienophile list (CSV name,smiles) of n entries each: n²
// pairs, far more than the test lets run (homologous alkyl chains; invented data).
func bigLists(t *testing.T, n int) (dienes, dienophiles string) {
	dir := t.TempDir()
	var d, e strings.Builder
	for i := range n {
		fmt.Fprintf(&d, "diene%d,C=CC=C%s\n", i, strings.Repeat("C", i%40+1))
		fmt.Fprintf(&e, "dienophile%d,C=CC(=O)O%s\n", i, strings.Repeat("C", i%40+1))
	}
	dienes, dienophiles = filepath.Join(dir, "dienes.csv"), filepath.Join(dir, "dienophiles.csv")
	if err := os.WriteFile(dienes, []byte(d.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(dienophiles, []byte(e.String()), 0o644); err != nil {
		t.Fatal(err)
	}
	return dienes, dienophiles
}

// TestSignalFlushesCompleteRows: a streamed screen stopped by SIGTERM (what batch schedulers
// and timeout(1) send) or SIGINT writes every complete row, says how many on stderr and exits
// with 128 + the signal number. Reproducer of issue 14: SIGTERM left an empty file.
func TestSignalFlushesCompleteRows(t *testing.T) {
	bin := cliBinary(t)
	dienes, dienophiles := bigLists(t, 150) // 22,500 pairs: minutes if left to run
	for _, sig := range []syscall.Signal{syscall.SIGTERM, syscall.SIGINT} {
		t.Run(signalName(sig), func(t *testing.T) {
			cmd := exec.Command(bin, "screen", "--dienes", dienes, "--dienophiles", dienophiles,
				"--rank-by", "none", "--top", "0", "--format", "csv", "--workers", "2")
			var stderr bytes.Buffer
			cmd.Stderr = &stderr
			pipe, err := cmd.StdoutPipe()
			if err != nil {
				t.Fatal(err)
			}
			if err := cmd.Start(); err != nil {
				t.Fatal(err)
			}
			// Wait for the first rows (the CSV writer flushes every 4 KiB), then signal.
			var out bytes.Buffer
			br := bufio.NewReader(pipe)
			for lines := 0; lines < 20; lines++ {
				line, err := br.ReadBytes('\n')
				out.Write(line)
				if err != nil {
					t.Fatalf("stdout ended after %d lines: %v (stderr %q)", lines, err, stderr.String())
				}
			}
			if err := cmd.Process.Signal(sig); err != nil {
				t.Fatal(err)
			}
			rest, _ := io.ReadAll(br)
			out.Write(rest)
			err = cmd.Wait()
			var ee *exec.ExitError
			if !errors.As(err, &ee) || ee.ExitCode() != 128+int(sig) {
				t.Fatalf("exit %v, want code %d (stderr %q)", err, 128+int(sig), stderr.String())
			}
			recs, err := csvRecords(out.Bytes())
			if err != nil {
				t.Fatalf("output is not complete CSV rows: %v", err)
			}
			rows := len(recs) - 1
			m := regexp.MustCompile(`cyclopair: interrupted by ` + signalName(sig) + `: (\d+) complete rows written before the stop\n`).FindStringSubmatch(stderr.String())
			if m == nil {
				t.Fatalf("stderr %q lacks the interruption line", stderr.String())
			}
			if n, _ := strconv.Atoi(m[1]); n != rows || rows < 19 || rows >= 150*150 {
				t.Errorf("stderr says %s rows, stdout has %d (want ≥ 19 and fewer than all)", m[1], rows)
			}
			for i, r := range recs[1:] {
				if r[0] != strconv.Itoa(i+1) {
					t.Fatalf("row %d has rank %q: rows lost or out of order", i+1, r[0])
				}
			}
		})
	}
}

// csvRecords parses a whole screen CSV output, every record with the header's field count.
func csvRecords(b []byte) ([][]string, error) {
	r := csv.NewReader(bytes.NewReader(b))
	return r.ReadAll()
}

// cliProcess runs the binary with stdin from in and the given stdout, returning stderr and
// the exit code.
func cliProcess(t *testing.T, stdout *os.File, args ...string) (string, int) {
	t.Helper()
	cmd := exec.Command(cliBinary(t), args...)
	var stderr bytes.Buffer
	cmd.Stdout, cmd.Stderr = stdout, &stderr
	done := make(chan error, 1)
	if err := cmd.Start(); err != nil {
		t.Fatal(err)
	}
	go func() { done <- cmd.Wait() }()
	select {
	case err := <-done:
		var ee *exec.ExitError
		if errors.As(err, &ee) {
			return stderr.String(), ee.ExitCode()
		}
		if err != nil {
			t.Fatal(err)
		}
		return stderr.String(), 0
	case <-time.After(2 * time.Minute):
		cmd.Process.Kill()
		t.Fatalf("%q did not finish", args)
	}
	return "", -1
}

// failWriter fails every write after the first limit bytes, like a full disk.
type failWriter struct{ limit int }

func (f *failWriter) Write(p []byte) (int, error) {
	if len(p) <= f.limit {
		f.limit -= len(p)
		return len(p), nil
	}
	n := f.limit
	f.limit = 0
	return n, syscall.ENOSPC
}

// TestFailedOutputIsAnError: every command whose standard output fails (at once, or after
// some bytes) says so in one line and exits 2. Reproducer of issue 14: validate > /dev/full
// exited 0.
func TestFailedOutputIsAnError(t *testing.T) {
	dir := t.TempDir()
	lib := filepath.Join(dir, "lib.yaml")
	if err := os.WriteFile(lib, []byte("dienes:\n  - {name: isoprene, smiles: C=CC(C)=C}\ndienophiles:\n  - {name: acrolein, smiles: C=CC=O}\n"), 0o644); err != nil {
		t.Fatal(err)
	}
	for _, args := range [][]string{
		{"orbitals", "C=CC=C"},
		{"orbitals", "--format", "json", "C=CC=O"},
		{"pair", "--diene", "C=CC=C", "--dienophile", "C=CC=O"},
		{"pair", "--diene", "C=CC=C", "--dienophile", "C=CC=O", "--format", "json"},
		{"params"},
		{"params", "show", "streitwieser1961"},
		{"draw", "C=CC=C"},
		{"screen", lib},
		{"screen", lib, "--format", "csv"},
		{"screen", lib, "--format", "json"},
		{"screen", lib, "--format", "markdown"},
		{"screen", lib, "--format", "html"},
		{"demo"},
		{"validate"},
		{"diagram", "--diene", "C=CC=C", "--dienophile", "C=CC=O"},
		{"calibrate", "testdata/calibrate/data.yaml"},
	} {
		for _, limit := range []int{0, 100} {
			var stderr bytes.Buffer
			code := run(args, strings.NewReader(""), &failWriter{limit: limit}, &stderr)
			// the one line about the output comes last (a batch lists its bad rows before it)
			lines := strings.Split(strings.TrimSuffix(stderr.String(), "\n"), "\n")
			last := lines[len(lines)-1]
			if code != exitUsage || strings.Count(stderr.String(), "standard output") != 1 || !strings.HasPrefix(last, "cyclopair: standard output: write failed: no space left on device") {
				t.Errorf("%q after %d bytes: exit %d, stderr %q; want exit 2 and one last line about standard output", args, limit, code, stderr.String())
			}
		}
	}
}

// TestClosedOrFullStdoutProcess runs the real binary on /dev/full: one stderr line, exit 2.
// /dev/null stays a success. A stdout closed at start (>&-) is not tested: the Go runtime
// reopens it as /dev/null (see main.go), so it reads as the /dev/null case.
func TestClosedOrFullStdoutProcess(t *testing.T) {
	bin := cliBinary(t)
	dienes, dienophiles := bigLists(t, 3)
	for _, tc := range []struct {
		name, redirect string
		args           []string
		code           int
		want           string
	}{
		{"validate full", ">/dev/full", []string{"validate"}, 2, "cyclopair: standard output: write failed: no space left on device"},
		{"screen full", ">/dev/full", []string{"screen", "--dienes", dienes, "--dienophiles", dienophiles, "--format", "csv"}, 2, "cyclopair: standard output: write failed: no space left on device"},
		{"screen null", ">/dev/null", []string{"screen", "--dienes", dienes, "--dienophiles", dienophiles}, 0, ""},
	} {
		t.Run(tc.name, func(t *testing.T) {
			if _, err := os.Stat("/dev/full"); err != nil && strings.Contains(tc.redirect, "full") {
				t.Skip("no /dev/full")
			}
			cmd := exec.Command("/bin/sh", append([]string{"-c", `exec "$0" "$@" ` + tc.redirect, bin}, tc.args...)...)
			var stderr bytes.Buffer
			cmd.Stderr = &stderr
			err := cmd.Run()
			code := 0
			var ee *exec.ExitError
			if errors.As(err, &ee) {
				code = ee.ExitCode()
			} else if err != nil {
				t.Fatal(err)
			}
			lines := strings.Split(strings.TrimSuffix(stderr.String(), "\n"), "\n")
			if tc.want == "" {
				if code != 0 || stderr.Len() != 0 {
					t.Errorf("exit %d, stderr %q; want 0 and nothing", code, stderr.String())
				}
				return
			}
			if code != tc.code || len(lines) != 1 || !strings.HasPrefix(lines[0], tc.want) {
				t.Errorf("exit %d, stderr %q; want %d and one line %q…", code, stderr.String(), tc.code, tc.want)
			}
		})
	}
}

// TestReliabilityReproducers holds the in-process reproducers of issue 14: each gives the
// documented exit code and a one-line error (checked: the first stderr line starts with
// "cyclopair: " and contains want; no "goroutine" trace), or completes with the checks in
// check.
func TestReliabilityReproducers(t *testing.T) {
	dir := t.TempDir()
	write := func(name, body string) string {
		p := filepath.Join(dir, name)
		if err := os.WriteFile(p, []byte(body), 0o644); err != nil {
			t.Fatal(err)
		}
		return p
	}
	fifo := filepath.Join(dir, "fifo.yaml")
	if err := syscall.Mkfifo(fifo, 0o600); err != nil {
		t.Fatal(err)
	}
	dienophiles := write("e.csv", "acrolein,C=CC=O\n")
	// A fitted calibration file (from the committed fixture), for the BOM case; the range
	// checks of calibration files are TestAbsurdCalibration's.
	calOut, calErr, code := runCLI(t, "", "calibrate", "testdata/calibrate/data.yaml", "--out", filepath.Join(dir, "cal.yaml"))
	if code != exitPartial && code != exitOK {
		t.Fatalf("calibrate: exit %d: %s%s", code, calOut, calErr)
	}
	calText, err := os.ReadFile(filepath.Join(dir, "cal.yaml"))
	if err != nil {
		t.Fatal(err)
	}
	cal := string(calText)
	paramsOut, _, _ := runCLI(t, "", "params", "show", "vancatledge1980", "--format", "yaml")
	bomParams := write("bom-params.yaml", "\uFEFF"+paramsOut)
	bomCal := write("bom-cal.yaml", "\uFEFF"+cal)

	cases := []struct {
		name  string
		stdin string
		args  []string
		code  int
		want  string                   // in the first stderr line ("" = nothing on stderr)
		check func(out, errOut string) // optional further checks
	}{
		{name: "CSV unterminated quote resynchronises",
			args: []string{"screen", "--format", "csv", "--dienophiles", dienophiles, "--dienes",
				write("quote.csv", "name,smiles\nbutadiene,C=CC=C\n\"broken,C=CC(C)=C\nisoprene,C=CC(C)=C\n\"bad\"x,C=C\npiperylene,C=CC=CC\n")},
			code: exitPartial, want: "quote.csv: 3:",
			check: func(out, errOut string) {
				for _, n := range []string{"butadiene", "isoprene", "piperylene"} {
					if !strings.Contains(out, n) {
						t.Errorf("row %s lost after the bad quote", n)
					}
				}
				if !strings.Contains(errOut, "quote.csv: 5:") {
					t.Errorf("second bad row (line 5) not listed: %q", errOut)
				}
			}},
		{name: "BOM in a CSV list", args: []string{"screen", "--format", "csv", "--dienophiles", dienophiles,
			"--dienes", write("bom.csv", "\uFEFFname,smiles\nbutadiene,C=CC=C\n")}, code: exitOK},
		{name: "BOM in a substrate file", args: []string{"screen", write("bom.yaml",
			"\uFEFFdienes:\n  - {name: b, smiles: C=CC=C}\ndienophiles:\n  - {name: e, smiles: C=C}\n")}, code: exitOK},
		{name: "BOM in a parameter file", args: []string{"orbitals", "C=C", "--params", bomParams}, code: exitOK},
		{name: "BOM in a calibration file", args: []string{"orbitals", "C=C", "--calibration", bomCal}, code: exitOK},
		{name: "FIFO as --params", args: []string{"orbitals", "C=C", "--params", fifo}, code: exitUsage, want: "named pipe (FIFO)"},
		{name: "FIFO as params_file", args: []string{"screen", write("pf.yaml", "params_file: fifo.yaml\ndienes: [{smiles: C=CC=C}]\ndienophiles: [{smiles: C=C}]\n")},
			code: exitUsage, want: "params_file: " + fifo + ": cannot use as parameter file: not a regular file, it is a named pipe (FIFO)"},
		{name: "directory as --calibration", args: []string{"orbitals", "C=C", "--calibration", dir}, code: exitUsage, want: "it is a directory"},
		{name: "device as --params", args: []string{"orbitals", "C=C", "--params", os.DevNull}, code: exitUsage, want: "character device"},
		{name: "another file as params: is not quoted", args: []string{"screen", write("p2.yaml", "params: "+write("secret.txt", "s3cr3t-token-line\nmore\n")+"\ndienes: [{smiles: C=CC=C}]\ndienophiles: [{smiles: C=C}]\n")},
			code: exitUsage, want: "not a parameter file: the top level is not a YAML mapping",
			check: func(_, errOut string) {
				if strings.Contains(errOut, "s3cr3t") {
					t.Errorf("error quotes the other file: %q", errOut)
				}
			}},
		{name: "usage error is one line", args: []string{"pair", "--bogus"}, code: exitUsage, want: "unknown flag: --bogus (run 'cyclopair pair --help' for usage)",
			check: func(_, errOut string) {
				if strings.Count(errOut, "\n") != 1 {
					t.Errorf("usage error takes %d lines: %q", strings.Count(errOut, "\n"), errOut)
				}
			}},
		{name: "CSV formula cells neutralised, numbers kept", args: []string{"screen", "--format", "csv", "--dienophiles", dienophiles,
			"--dienes", write("formula.csv", "=HYPERLINK(1),C=CC=C\n+1,C=CC(C)=C\n-x,C=CC=CC\n@SUM(A1),C=C(C)C(C)=C\nplain,C1=CCC=C1\n")},
			code: exitOK,
			check: func(out, _ string) {
				recs, err := csvRecords([]byte(out))
				if err != nil {
					t.Fatal(err)
				}
				for _, r := range recs[1:] {
					if name := r[2]; strings.ContainsRune("=+-@", rune(name[0])) {
						t.Errorf("name cell %q starts a formula", name)
					}
					if r[2] != "plain" && r[2][0] != '\'' {
						t.Errorf("name cell %q lost its apostrophe", r[2])
					}
				}
				// numeric cells keep a leading minus (gap_normal of no row is negative, so
				// check the regio margin field format only: a number, never quoted)
				for _, r := range recs[1:] {
					if _, err := strconv.ParseFloat(r[9], 64); err != nil {
						t.Errorf("gap_beta %q is not a number", r[9])
					}
				}
			}},
		{name: "control characters escaped in the table and on stderr", args: []string{"screen", "--dienophiles", dienophiles,
			"--dienes", write("ctl.csv", "bad\x1b[31mname\x07,C=CC=C\nx,C=C\x1bC\n")}, code: exitUsage, want: "ctl.csv: 1:",
			check: func(out, errOut string) {
				if strings.ContainsAny(out+errOut, "\x1b\x07") {
					t.Errorf("raw ESC/BEL reached the terminal: %q / %q", out, errOut)
				}
				if !strings.Contains(errOut, `\x1b`) {
					t.Errorf("escaped ESC missing from stderr: %q", errOut)
				}
			}},
		{name: "control characters in a set name refused, not echoed", args: []string{"pair", "--diene", "C=CC=C", "--dienophile", "C=CC=O",
			"--params", write("ctl-params.yaml", "name: \"set\\e[31m\\a\"\nbase: vancatledge1980\n")}, code: exitUsage, want: "control character",
			check: func(out, errOut string) {
				if strings.ContainsAny(out+errOut, "\x1b\x07") {
					t.Errorf("raw ESC/BEL reached the terminal: %q / %q", out, errOut)
				}
			}},
	}
	for _, tc := range cases {
		t.Run(tc.name, func(t *testing.T) {
			out, errOut, code := runCLI(t, tc.stdin, tc.args...)
			if code != tc.code {
				t.Errorf("exit %d, want %d (stderr %q)", code, tc.code, errOut)
			}
			if strings.Contains(errOut, "goroutine ") || strings.Contains(errOut, "panic") {
				t.Fatalf("trace on stderr: %q", errOut)
			}
			if tc.want != "" {
				first, _, _ := strings.Cut(errOut, "\n")
				if !strings.HasPrefix(first, "cyclopair: ") || !strings.Contains(first, tc.want) {
					t.Errorf("first stderr line %q, want cyclopair: …%s…", first, tc.want)
				}
			}
			if tc.check != nil {
				tc.check(out, errOut)
			}
		})
	}
}
