package main

import (
	"fmt"
	"strings"

	"github.com/spf13/cobra"

	"cyclopair/fmo/substrates"
)

// addListFormatFlags adds --input-format and --name-field, which say how the list files
// of --dienes and --dienophiles are read (package fmo/substrates: never by sniffing).
func addListFormatFlags(cmd *cobra.Command, o *screenOptions) {
	var names []string
	for _, f := range substrates.Formats {
		names = append(names, string(f))
	}
	f := cmd.Flags()
	f.StringVar(&o.inputFormat, "input-format", "", "`format` of the --dienes/--dienophiles files: "+strings.Join(names, ", ")+" (default: from each file's extension; stdin: smiles)")
	f.StringVar(&o.nameField, "name-field", "", "SD `property` holding each molecule's name (default: the title line)")
	_ = cmd.MarkFlagFilename("dienes", "csv", "tsv", "txt", "smi", "smiles", "sdf", "sd", "mol")
	_ = cmd.MarkFlagFilename("dienophiles", "csv", "tsv", "txt", "smi", "smiles", "sdf", "sd", "mol")
}

// checkListFormat normalises --input-format (empty stays empty).
func checkListFormat(o *screenOptions) error {
	if o.inputFormat == "" {
		return nil
	}
	f, err := substrates.ParseFormat(o.inputFormat)
	if err != nil {
		return &usageError{fmt.Errorf("--input-format: %v", err)}
	}
	o.inputFormat = string(f)
	return nil
}
