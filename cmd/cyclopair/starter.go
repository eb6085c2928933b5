package main

import (
	"fmt"
	"io"
	"runtime/debug"
	"strings"

	"cyclopair/fmo"
	"cyclopair/fmo/screen"
	"cyclopair/presets"

	"github.com/spf13/cobra"
)

func newStarterCmd(s *streams) *cobra.Command {
	return &cobra.Command{
		Use:   "starter",
		Short: "Print a commented example substrate file to start a screen of your own",
		Long: `Starter prints a substrate file (YAML) with every key explained in a comment: a few
dienes and dienophiles from the built-in substrates (one written as SMILES, one pinned by
atom maps), the activations, parameter set, calibration, filters, ranking key and row count,
and at the end the names of all built-in substrates by their usual role. Edit it and run
'cyclopair screen' on it. The file loads as printed.`,
		Example: `  cyclopair starter > my-screen.yaml
  cyclopair screen my-screen.yaml --top 20`,
		Args: cobra.NoArgs,
		RunE: func(c *cobra.Command, args []string) error {
			return writeStarter(s.out)
		},
	}
}

// writeStarter writes the starter substrate file; the keys and vocabularies come from the
// packages that read them (activation modes, ranking keys, parameter sets, presets), so the
// file stays loadable when those grow.
func writeStarter(w io.Writer) error {
	var b strings.Builder
	p := func(format string, a ...any) { fmt.Fprintf(&b, format, a...) }
	p("# my-screen.yaml — a substrate file for 'cyclopair screen' (written by 'cyclopair starter').\n")
	p("# Every key except dienes and dienophiles is optional. Results are estimates for planning,\n")
	p("# not safety assessments: check the SDS, a hazard review and local rules before lab work.\n")
	p("title: my first screen                    # printed in the report header\n")
	p("description: free text for your own notes # ignored\n\n")
	p("dienes:                                   # 4π partners: dienes, hetero-dienes, 1,3-dipoles\n")
	p("  - preset: cyclopentadiene               # a built-in substrate (names listed at the end)\n")
	p("  - preset: isoprene\n")
	p("  - preset: dimethyl-tetrazine-dicarboxylate\n")
	p("    name: tetrazine diester               # optional: your own name for the row\n")
	p("  - name: 1-methoxybutadiene (typed)\n")
	p("    smiles: COC=CC=C                       # any SMILES; quote it if it starts with [ or has # : or spaces\n")
	p("  - name: isoprene, termini pinned\n")
	p("    smiles: \"[CH2:1]=C(C)C=[CH2:4]\"\n")
	p("    pin: [1, 4]                           # atom-map numbers of the atoms that must react\n")
	p("    notes: only the terminal carbons may react\n\n")
	p("dienophiles:                              # 2π partners\n")
	p("  - preset: acrolein\n")
	p("  - preset: methyl-acrylate\n")
	p("  - preset: maleic-anhydride\n")
	p("  - {name: ethyl vinyl ether, smiles: C=COCC}\n\n")
	modes := fmo.Modes()
	p("activations: [%s]                       # of the dienophile; one of: %s\n\n", modes[0], strings.Join(modes, ", "))
	p("params: %s                      # built-in parameter set; others: %s\n", presets.DefaultParams, strings.Join(presets.ParamNames(), ", "))
	p("# params_file: my-params.yaml             # ... or a parameter file, relative to this file\n")
	p("calibration: default                      # or a file written by 'cyclopair calibrate --out'\n\n")
	p("filter:                                   # all optional\n")
	p("  demand: any                             # normal | inverse | neutral | any\n")
	p("  # min_regio_margin: 0.005               # |β|\n")
	p("  # max_gap: 1.2                          # controlling gap, |β|\n")
	p("  allowed_only: false                     # true: symmetry-allowed pairings only\n")
	p("  # in_domain: true                       # only rates inside the rate model's applicability domain\n\n")
	keys := screen.RankKeyNames()
	p("rank_by: %s                       # one of: %s\n", keys[0], strings.Join(keys, ", "))
	p("top: 20                                   # best 20 rows; 0 = all\n\n")
	p("# Built-in substrates (use with 'preset:'), by their usual role:\n")
	for _, role := range []string{"diene", "dipole", "dienophile"} {
		var names []string
		for _, sub := range presets.Substrates() {
			if sub.Role == role {
				names = append(names, sub.Name)
			}
		}
		p("#   %s: %s\n", role, strings.Join(names, ", "))
	}
	_, err := io.WriteString(w, b.String())
	return err
}

// version is the module version from the build information (a tagged release installed with
// 'go install', or the VCS revision of a checkout build), "(devel)" style fallbacks otherwise.
func version() string {
	bi, ok := debug.ReadBuildInfo()
	if !ok {
		return "unknown (no build information)"
	}
	v := bi.Main.Version
	var rev, modified string
	for _, s := range bi.Settings {
		switch s.Key {
		case "vcs.revision":
			rev = s.Value
		case "vcs.modified":
			modified = s.Value
		}
	}
	if v == "" || v == "(devel)" {
		v = "devel"
	}
	if rev != "" && !strings.Contains(v, rev[:min(12, len(rev))]) {
		v += " " + rev[:min(12, len(rev))]
		if modified == "true" {
			v += "+modified"
		}
	}
	return v + " " + bi.GoVersion
}
