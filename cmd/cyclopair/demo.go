package main

import (
	"cyclopair/presets"

	"github.com/spf13/cobra"
)

func newDemoCmd(s *streams) *cobra.Command {
	o := &screenOptions{}
	cmd := &cobra.Command{
		Use:   "demo",
		Short: "Run the built-in demo screen (an invented planning scenario) and print the ranked report",
		Long: `Demo screens the embedded substrate file presets/demo.yaml: a fictional team choosing a
Diels–Alder step for a made-up target compares seven real dienes with six real dienophiles,
each free, bound to a Lewis acid, or (aldehydes and ketones) as a pyrrolidine iminium ion.
The scenario is invented; the molecules and the analysis are real.

It is 'cyclopair screen' on that file, so it takes the same flags: --format, --top,
--rank-by, --activate, --params, the filters, --workers; --print-file prints the demo file
itself, a starting point for a substrate file of your own.

Results are estimates for planning, not safety assessments.`,
		Example: `  cyclopair demo
  cyclopair demo --format markdown > demo.md
  cyclopair demo --rank-by stabilization --top 10
  cyclopair demo --print-file > my-screen.yaml   # a starting point for your own file`,
		Args: cobra.NoArgs,
		RunE: func(c *cobra.Command, args []string) error {
			name, data := presets.DemoFile()
			if printFile, _ := c.Flags().GetBool("print-file"); printFile {
				_, err := s.out.Write(data)
				return err
			}
			o.file = name
			o.changed = c.Flags().Changed
			return runScreen(c.Context(), s, o, data)
		},
	}
	addScreenFlags(cmd, o)
	cmd.Flags().Bool("print-file", false, "print the demo substrate file instead of screening it")
	return cmd
}
