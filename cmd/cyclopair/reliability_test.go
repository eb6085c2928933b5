package main

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

// TestClosedOrFullStdoutProcess runs the real binary with standard output closed (>&-) and
// on /dev/full: one stderr line, exit 2. A write-only /dev/null stays a success.
func TestClosedOrFullStdoutProcess(t *testing.T) {
	bin := cliBinary(t)
	dienes, dienophiles := bigLists(t, 3)
	for _, tc := range []struct {
		name, redirect string
		args           []string
		code           int
		want           string
	}{
		{"validate closed", ">&-", []string{"validate"}, 2, "cyclopair: standard output: closed when the program started"},
		{"screen closed", ">&-", []string{"screen", "--dienes", dienes, "--dienophiles", dienophiles}, 2, "cyclopair: standard output: closed when the program started"},
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
