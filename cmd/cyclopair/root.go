package main

import (
	"context"
	"errors"
	"fmt"
	"io"
	"os"
	"os/signal"
	"strings"

	"cyclopair/huckel/errtext"

	"github.com/spf13/cobra"
)

// Exit codes (DEVELOPERS.md, "Output contracts"): 0 success, 1 the analysis ran but some inputs failed,
// 2 bad usage or unreadable input.
const (
	exitOK      = 0
	exitPartial = 1
	exitUsage   = 2
)

// streams carries the command's input and outputs so tests can run the whole CLI in-process.
type streams struct {
	in  io.Reader
	out io.Writer // data only: tables, JSON, CSV, SVG, HTML
	err io.Writer // people: warnings, progress, errors
	// errIsTerminal reports whether err is an interactive terminal (progress bars draw only then).
	errIsTerminal bool
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
		Version:       version(),
	}
	root.SetVersionTemplate("cyclopair {{.Version}}\n")
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
		newStarterCmd(s),
	)
	return root
}

// run is the whole program: it builds a fresh command tree, executes it and maps errors to
// exit codes. Every error is printed once, to stderr, as "cyclopair: ...".
func run(args []string, stdin io.Reader, stdout, stderr io.Writer) int {
	s := &streams{in: stdin, out: stdout, err: stderr, errIsTerminal: isTerminal(stderr)}
	root := newRootCmd(s)
	root.SetArgs(args)
	root.SetIn(stdin)
	root.SetOut(stdout)
	root.SetErr(stderr)
	ctx, stop := signal.NotifyContext(context.Background(), os.Interrupt)
	defer stop()
	err := root.ExecuteContext(ctx)
	if err == nil {
		return exitOK
	}
	var pe *partialError
	if errors.As(err, &pe) {
		fmt.Fprintf(stderr, "cyclopair: %v\n", err)
		return exitPartial
	}
	msg := strings.TrimPrefix(err.Error(), "cyclopair: ")
	fmt.Fprintf(stderr, "cyclopair: %s\n", escapeLines(msg))
	var ue *usageError
	if errors.As(err, &ue) || isCobraUsage(err) {
		fmt.Fprintf(stderr, "run 'cyclopair %s --help' for usage\n", commandPath(root, args))
	}
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
