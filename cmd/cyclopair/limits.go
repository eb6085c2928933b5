package main

import (
	"errors"
	"fmt"

	"cyclopair/huckel"
	"cyclopair/huckel/molecule"
	"cyclopair/huckel/smiles"

	"github.com/spf13/cobra"
)

// inputLimits are the size limits of a command that reads SMILES (DEVELOPERS.md, Limits):
// --max-smiles-length always, --max-centres where the command solves the molecule itself
// (default huckel.DefaultMaxCentres) or analyses a pair (default fmo.DefaultMaxPairCentres,
// passed on through fmo.Options.MaxCentres).
type inputLimits struct {
	maxLength  int  // --max-smiles-length
	maxCentres int  // --max-centres; 0 (huckel's default) where the command has no such flag
	centres    bool // the command has --max-centres
}

// Ceilings of the limit flags: --max-smiles-length up to the 1 MiB line limit of stdin;
// --max-centres up to 10,000 (a dense solve of n centres takes about 61·n² bytes,
// 6 GB at 10,000, and about (n/1000)³·2.4 s, 40 minutes, on the project's machine).
const (
	maxSMILESLengthCeiling = 1 << 20
	maxCentresCeiling      = 10000
)

// flags adds the limit flags; centres is the default of --max-centres, 0 for none.
func (l *inputLimits) flags(cmd *cobra.Command, centres int) {
	cmd.Flags().IntVar(&l.maxLength, "max-smiles-length", smiles.MaxLength, fmt.Sprintf("longest SMILES accepted, in bytes (at most %d)", maxSMILESLengthCeiling))
	l.centres = centres > 0
	if l.centres {
		cmd.Flags().IntVar(&l.maxCentres, "max-centres", centres, fmt.Sprintf("largest π system solved, in centres (at most %d; time grows as n³, memory as n²)", maxCentresCeiling))
	}
}

func (l *inputLimits) check() error {
	if l.maxLength < 1 || l.maxLength > maxSMILESLengthCeiling {
		return &usageError{fmt.Errorf("--max-smiles-length %d: want 1 to %d bytes", l.maxLength, maxSMILESLengthCeiling)}
	}
	if l.centres && (l.maxCentres < 1 || l.maxCentres > maxCentresCeiling) {
		return &usageError{fmt.Errorf("--max-centres %d: want 1 to %d (time grows as n³, memory as n²)", l.maxCentres, maxCentresCeiling)}
	}
	return nil
}

func (l *inputLimits) parse(smi string) (*molecule.Molecule, error) {
	return smiles.ParseOptions{MaxLength: l.maxLength}.Parse(smi)
}

// perceive applies --max-centres and says how to raise it when the molecule is too big.
func (l *inputLimits) perceive(m *molecule.Molecule, p *huckel.Params) (*huckel.PiSystem, error) {
	ps, err := huckel.PerceiveOptions{MaxCentres: l.maxCentres}.Perceive(m, p)
	if errors.Is(err, huckel.ErrTooManyCentres) {
		return nil, fmt.Errorf("%w (raise the limit with --max-centres)", err)
	}
	return ps, err
}
