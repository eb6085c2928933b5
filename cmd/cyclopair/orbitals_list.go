package main

import (
	"fmt"
	"strings"

	"github.com/spf13/cobra"

	"cyclopair/fmo/substrates"
)

// addOrbitalsListFlags adds --input-format and --name-field to 'orbitals', for '-': stdin
// read by the substrate list reader (fmo/substrates) in the named format. Without
// --input-format stdin is SMILES lines ("SMILES name"), the same layout as a .smi list.
func addOrbitalsListFlags(cmd *cobra.Command, o *orbitalsOptions) {
	var names []string
	for _, f := range substrates.Formats {
		names = append(names, string(f))
	}
	cmd.Flags().StringVar(&o.listFormat, "input-format", "", "`format` of '-' (stdin): "+strings.Join(names, ", ")+" (default smiles lines)")
	cmd.Flags().StringVar(&o.nameField, "name-field", "", "SD `property` holding each molecule's name, with --input-format sdf (default: the title line)")
}

// readOrbitalsList reads stdin as a list in opts.listFormat and hands every good row to
// handle (its SMILES: for SD records the Kekulé SMILES of the graph read, whose atom
// numbers the output uses). Bad rows are printed as they are found; bad counts them.
func readOrbitalsList(s *streams, opts *orbitalsOptions, handle func(orbitalsInput) error) (n, bad int, err error) {
	f, err := substrates.ParseFormat(opts.listFormat)
	if err != nil {
		return 0, 0, &usageError{fmt.Errorf("--input-format: %v", err)}
	}
	subs, errs, err := substrates.LoadListAs(s.in, "stdin", substrates.ListOptions{Format: f, NameField: opts.nameField})
	if err != nil {
		return 0, 0, &inputError{err}
	}
	for _, e := range errs {
		fmt.Fprintf(s.err, "cyclopair: %v\n", e)
	}
	for _, sub := range subs {
		line := sub.Line
		if line == 0 {
			line = 1
		}
		if err := handle(orbitalsInput{smiles: sub.SMILES, name: sub.Name, line: line}); err != nil {
			return n, len(errs), err
		}
		n++
	}
	return n, len(errs), nil
}
