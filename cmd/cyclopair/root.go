package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"strings"
	"sync/atomic"
	"syscall"

	"cyclopair/huckel/errtext"

	"github.com/spf13/cobra"

	"cyclopair/cmd/cyclopair/internal/render"
)

// Exit codes (../shared/DESIGN.md, README "Limits and exit codes"): 0 success, 1 the analysis
// ran but some inputs failed, 2 bad usage, unreadable input or output that could not be
// written, 128+N stopped by signal N (130 SIGINT, 143 SIGTERM) after flushing every complete
// row.
const (
	exitOK      = 0
	exitPartial = 1
	exitUsage   = 2
	exitSignal  = 128 // + the signal number
)

// streams carries the command's input and outputs so tests can run the whole CLI in-process.
type streams struct {
	in  io.Reader
	out io.Writer // data only: tables, JSON, CSV, SVG, HTML
	err io.Writer // people: warnings, errors (control characters escaped, render.TerminalSafe)
	// rawErr is stderr unescaped, for the progress bar's carriage returns.
	rawErr io.Writer
	// errIsTerminal reports whether err is an interactive terminal (progress bars draw only then).
	errIsTerminal bool
	// cancellable, when set by a command (screen, demo) once it watches its context, makes
	// SIGINT/SIGTERM cancel that context so the command flushes its complete rows and stops;
	// before that, and for commands that do not watch it, a signal ends the process at once.
	cancellable atomic.Bool
}

// interruptedError is a command stopped by a signal after writing what it had: the exit
// code is 128 + the signal number.
type interruptedError struct {
	sig  syscall.Signal
	what string // e.g. "128 rows written before the stop"
}

func (e *interruptedError) Error() string {
	return fmt.Sprintf("interrupted by %s: %s", signalName(e.sig), e.what)
}

func signalName(s syscall.Signal) string {
	switch s {
	case syscall.SIGINT:
		return "SIGINT"
	case syscall.SIGTERM:
		return "SIGTERM"
	}
	return s.String()
}

// signalCause is the cancellation cause recorded when a signal stops a command.
type signalCause struct{ sig syscall.Signal }

func (c signalCause) Error() string { return "stopped by " + signalName(c.sig) }

// interrupted builds the error a cancellable command returns once ctx was canceled: the
// signal comes from the context's cause (SIGINT when the cause is not a signal).
func interrupted(ctx context.Context, what string) error {
	sig := syscall.SIGINT
	var sc signalCause
	if errors.As(context.Cause(ctx), &sc) {
		sig = sc.sig
	}
	return &interruptedError{sig: sig, what: what}
}

// watchSignals routes SIGINT and SIGTERM: while s.cancellable is set the first one cancels
// the returned context (a second one kills the process, the default action); otherwise the
// process says so on stderr and exits with 128 + the signal number at once.
func watchSignals(s *streams) (context.Context, func()) {
	ctx, cancel := context.WithCancelCause(context.Background())
	ch := make(chan os.Signal, 1)
	signal.Notify(ch, os.Interrupt, syscall.SIGTERM)
	done := make(chan struct{})
	go func() {
		select {
		case <-done:
			return
		case v := <-ch:
			sig, _ := v.(syscall.Signal)
			signal.Stop(ch)
			if s.cancellable.Load() {
				cancel(signalCause{sig})
				return
			}
			fmt.Fprintf(s.err, "cyclopair: interrupted by %s\n", signalName(sig))
			os.Exit(exitSignal + int(sig))
		}
	}()
	return ctx, func() {
		signal.Stop(ch)
		close(done)
		cancel(nil)
	}
}

// usageError marks a bad flag or argument: usage is printed and the exit code is 2.
type usageError struct{ err error }

func (e *usageError) Error() string { return e.err.Error() }
func (e *usageError) Unwrap() error { return e.err }

// inputError marks unreadable or invalid input (bad SMILES, unreadable YAML): exit code 2,
// no usage text.
type inputError struct{ err error }

func (e *inputError) Error() string { return e.err.Error() }
func (e *inputError) Unwrap() error { return e.err }

// partialError means the batch ran but some rows failed and were reported: exit code 1.
type partialError struct{ failed, total int }

func (e *partialError) Error() string {
	return fmt.Sprintf("%d of %d inputs failed (listed above)", e.failed, e.total)
}

func newRootCmd(s *streams) *cobra.Command {
	root := &cobra.Command{
		Use:   "cyclopair",
		Short: "Frontier-orbital screening of thermal cycloaddition partners",
		Long: `cyclopair estimates, with Hückel theory and frontier-orbital perturbation theory,
which frontier gap controls a thermal cycloaddition (normal or inverse demand), which
regioisomer and which face (endo/exo) are favoured, how activation of the dienophile
changes that, and whether side channels compete.

Energies are given as x in E = α + xβ (β < 0, bonding levels have x > 0) and in eV through
a stated linear calibration. Results are estimates for planning, not safety assessments.`,
		SilenceUsage:  true,
		SilenceErrors: true,
	}
	root.SetFlagErrorFunc(func(c *cobra.Command, err error) error { return &usageError{err} })
	root.AddCommand(
		// Each command is built by its own constructor in its own file.
		newOrbitalsCmd(s),
		newParamsCmd(s),
		newDrawCmd(s),
		newScreenCmd(s),
		newDemoCmd(s),
		newDiagramCmd(s),
		newPairCmd(s),
		newCalibrateCmd(s),
		newValidateCmd(s),
		newServeCmd(s),
	)
	return root
}

// run is the whole program: it builds a fresh command tree, executes it and maps errors to
// exit codes. Every error is printed once, to stderr, as "cyclopair: ...".
func run(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	out := &checkedWriter{w: stdout}
	s := &streams{in: stdin, out: out, err: render.TerminalSafe(stderr), rawErr: stderr, errIsTerminal: isTerminal(stderr)}
	stderr = s.err // every message below is escaped too
	root := newRootCmd(s)
	root.SetArgs(args)
	root.SetIn(stdin)
	root.SetOut(out)
	root.SetErr(stderr)
	ctx, stop := watchSignals(s)
	defer stop()
	err := root.ExecuteContext(ctx)
	if out.err != nil {
		// One line whatever the command made of the failed write (the write error itself, a
		// partial batch): what was written is incomplete, so the run did not succeed.
		fmt.Fprintf(stderr, "cyclopair: standard output: %s (the output is incomplete)\n", writeErrText(out.err))
		return exitUsage
	}
	if err == nil {
		return exitOK
	}
	var pe *partialError
	if errors.As(err, &pe) {
		fmt.Fprintf(stderr, "cyclopair: %v\n", err)
		return exitPartial
	}
	var ie *interruptedError
	if errors.As(err, &ie) {
		fmt.Fprintf(stderr, "cyclopair: %v\n", err)
		return exitSignal + int(ie.sig)
	}
	msg := strings.TrimPrefix(err.Error(), "cyclopair: ")
	var ue *usageError
	if errors.As(err, &ue) || isCobraUsage(err) {
		// one line, the hint in the rule's "(<hint>)" place
		msg += fmt.Sprintf(" (run '%s --help' for usage)", strings.TrimSpace("cyclopair "+commandPath(root, args)))
	}
	fmt.Fprintf(stderr, "cyclopair: %s\n", escapeLines(msg))
	return exitUsage
}

// escapeLines makes control characters in an error message visible (errtext.Escape), line
// by line, so that no input echoed in a message — a flag value, a file name, a name read
// from a file — can drive the terminal; the line breaks of a SMILES excerpt are kept.
func escapeLines(msg string) string {
	lines := strings.Split(msg, "\n")
	for i, l := range lines {
		lines[i] = errtext.Escape(l)
	}
	return strings.Join(lines, "\n")
}

// isCobraUsage recognises cobra's own argument errors (unknown command, wrong arg count).
func isCobraUsage(err error) bool {
	m := err.Error()
	return strings.HasPrefix(m, "unknown command") || strings.HasPrefix(m, "accepts ") ||
		strings.HasPrefix(m, "requires at least") || strings.HasPrefix(m, "unknown flag") ||
		strings.HasPrefix(m, "invalid argument")
}

func commandPath(root *cobra.Command, args []string) string {
	c, _, err := root.Find(args)
	if err != nil || c == root {
		return ""
	}
	return strings.TrimPrefix(c.CommandPath(), "cyclopair ")
}

// checkedWriter keeps the first write error on standard output; later writes fail at once
// with it, so a command stops producing rows nobody receives, and run reports it once.
type checkedWriter struct {
	w   io.Writer
	err error
}

func (c *checkedWriter) Write(p []byte) (int, error) {
	if c.err != nil {
		return 0, c.err
	}
	n, err := c.w.Write(p)
	if err == nil && n < len(p) {
		err = io.ErrShortWrite
	}
	if err != nil {
		c.err = err
	}
	return n, err
}

// writeErrText is a write error without the file name Go adds ("write /dev/stdout: ...").
func writeErrText(err error) string {
	var pe *os.PathError
	if errors.As(err, &pe) {
		return "write failed: " + pe.Err.Error()
	}
	return "write failed: " + err.Error()
}
