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
