package main

import (
	"bytes"
	"errors"
	"fmt"
	"os"
	"strings"

	"cyclopair/cmd/cyclopair/internal/render"
	"cyclopair/fmo"
	"cyclopair/huckel"

	"github.com/spf13/cobra"
)

type diagramOptions struct {
	diene, dienophile string
	activate          string
	params            string
	calibration       string
	out               string
	methodOptions
	limits inputLimits
}

func newDiagramCmd(s *streams) *cobra.Command {
	o := &diagramOptions{}
	cmd := &cobra.Command{
		Use:   "diagram --diene SMILES|NAME --dienophile SMILES|NAME [--activate MODES] [-o FILE.svg]",
		Short: "Draw the π energy levels of a pair, with both frontier gaps, as SVG",
		Long: `Diagram draws the π levels of the 4π partner and of the 2π partner side by side (one column
per activation variant with --activate none,lewis,...), with electrons, the HOMO and LUMO
of each column marked, and both frontier gaps — normal demand LUMO(2π) − HOMO(4π), solid;
inverse demand LUMO(4π) − HOMO(2π), dashed — labelled in |β| and in eV (calibration named
on the picture). Higher on the page is higher in energy (E = α + xβ, β < 0).

Partners are SMILES or names of common substrates ('maleic-anhydride'). The SVG goes to
stdout, or to FILE with -o. Line styles and labels carry the meaning, so it prints in grey.`,
		Example: `  cyclopair diagram --diene cyclopentadiene --dienophile acrolein -o cpd-acrolein.svg
  cyclopair diagram --diene C=CC=C --dienophile C=CC=O --activate none,lewis,iminium > levels.svg`,
		Args: cobra.NoArgs,
		RunE: func(c *cobra.Command, args []string) error {
			if o.diene == "" || o.dienophile == "" {
				return &usageError{errors.New("give both --diene and --dienophile")}
			}
			if err := o.limits.check(); err != nil {
				return err
			}
			return runDiagram(s, o)
		},
	}
	f := cmd.Flags()
	f.StringVar(&o.diene, "diene", "", "4π partner: SMILES or substrate `name`")
	f.StringVar(&o.dienophile, "dienophile", "", "2π partner: SMILES or substrate `name`")
	f.StringVar(&o.activate, "activate", "none", "activation `modes` of the dienophile, comma-separated, one column each")
	f.StringVar(&o.params, "params", "", "parameter set `name` or YAML file")
	f.StringVar(&o.calibration, "calibration", "", "x → eV calibration: default or a `file` from 'cyclopair calibrate --out'")
	f.StringVarP(&o.out, "output", "o", "", "write the SVG to `FILE` instead of stdout")
	_ = cmd.MarkFlagFilename("output", "svg")
	addMethodFlags(f, &o.methodOptions, defaultMethod)
	o.limits.flags(cmd, 0)
	return cmd
}

func runDiagram(s *streams, o *diagramOptions) error {
	mod, err := resolveSolveModel(s, o.params, o.calibration, o.methodOptions)
	if err != nil {
		return err
	}
	p, cal := mod.params, mod.cal
	opts := mod.options()
	var modes []string
	for _, m := range strings.Split(o.activate, ",") {
		if m = strings.ToLower(strings.TrimSpace(m)); m != "" && !contains(modes, m) {
			if !contains(fmo.Modes(), m) {
				return &usageError{fmt.Errorf("--activate: unknown mode %q (modes: %s)", m, strings.Join(fmo.Modes(), ", "))}
			}
			modes = append(modes, m)
		}
	}
	if len(modes) == 0 {
		modes = []string{fmo.ActivateNone}
	}
	d, err := pairPartner(o.diene, fmo.RoleDiene, opts, &o.limits)
	if err != nil {
		return err
	}
	e, err := pairPartner(o.dienophile, fmo.RoleDienophile, opts, &o.limits)
	if err != nil {
		return err
	}
	var variants []*fmo.Partner
	var pairs []*fmo.Pair
	for _, m := range modes {
		v, err := e.WithActivation(m, nil, opts)
		if errors.Is(err, fmo.ErrNothingToActivate) && len(modes) > 1 {
			fmt.Fprintf(s.err, "cyclopair: note: %s: --activate %s skipped: %v\n", e.SMILES, m, err)
			continue
		}
		if err != nil {
			return &inputError{fmt.Errorf("%s: --activate %s: %v", e.SMILES, m, err)}
		}
		pair, err := fmo.Analyze(d, v, opts)
		if err != nil {
			return &inputError{fmt.Errorf("%s + %s: %v", d.SMILES, e.SMILES, err)}
		}
		variants = append(variants, v)
		pairs = append(pairs, pair)
	}
	if len(variants) == 0 {
		return &inputError{fmt.Errorf("%s: --activate %s: no mode applies to this dienophile", e.SMILES, o.activate)}
	}
	dg := pairDiagram(d, variants, pairs, p.Name, cal)
	var buf bytes.Buffer
	if err := render.WriteDiagram(&buf, dg); err != nil {
		return err
	}
	if o.out == "" {
		_, err := s.out.Write(buf.Bytes())
		return err
	}
	if err := os.WriteFile(o.out, buf.Bytes(), 0o644); err != nil {
		return &inputError{fmt.Errorf("%s: cannot write (%v)", o.out, unwrapPathError(err))}
	}
	fmt.Fprintf(s.err, "cyclopair: wrote %s\n", o.out)
	return nil
}

// pairDiagram builds the diagram of one 4π partner with one or more 2π variants; pairs[i]
// is the analysis of diene with variants[i] and supplies the frontier levels the gaps use.
func pairDiagram(diene *fmo.Partner, variants []*fmo.Partner, pairs []*fmo.Pair, params string, cal huckel.Calibration) *render.Diagram {
	dg := &render.Diagram{Params: params, Calibration: cal.Name, EVDecimals: cal.GapDecimals()}
	names := []string{}
	col := func(p *fmo.Partner, sub string, homo, lumo fmo.Frontier) render.DiagramColumn {
		c := render.DiagramColumn{Title: p.Name, Subtitle: sub, HOMO: homo.Index, LUMO: lumo.Index, HOMOEV: homo.EV, LUMOEV: lumo.EV}
		for _, l := range p.Orb.Levels {
			c.Levels = append(c.Levels, render.DiagramLevel{X: l.X, Occupancy: l.Occupancy, Degenerate: l.Degenerate})
		}
		return c
	}
	dg.Columns = append(dg.Columns, col(diene, diene.SMILES, pairs[0].DieneHOMO, pairs[0].DieneLUMO))
	for i, v := range variants {
		sub := "free"
		if v.Activation != fmo.ActivateNone {
			sub = "activation: " + v.Activation
		}
		pr := pairs[i]
		dg.Columns = append(dg.Columns, col(v, sub, pr.DienophileHOMO, pr.DienophileLUMO))
		dg.Gaps = append(dg.Gaps, render.DiagramGap{Column: i + 1,
			Normal:      render.Energy{Beta: pr.GapNormal.Beta, EV: pr.GapNormal.EV},
			Inverse:     render.Energy{Beta: pr.GapInverse.Beta, EV: pr.GapInverse.EV},
			Controlling: pr.Demand})
		if !contains(names, v.Name) {
			names = append(names, v.Name)
		}
	}
	dg.Title = "π levels: " + diene.Name + " + " + strings.Join(names, ", ")
	return dg
}

// writePairSVG writes the energy-level diagram of a pair command's results to path: the
// diene and one column per activation variant that succeeded (rebuilt from dienophile).
// It is the --svg option of 'cyclopair pair'.
func writePairSVG(s *streams, path string, diene, dienophile *fmo.Partner, variants []fmo.Variant,
	act *fmo.ActivateOptions, opts *fmo.Options, cal huckel.Calibration) error {
	var parts []*fmo.Partner
	var pairs []*fmo.Pair
	for _, v := range variants {
		if v.Err != nil || v.Pair == nil {
			continue
		}
		vp, err := dienophile.WithActivation(v.Mode, act, opts)
		if err != nil {
			continue
		}
		parts = append(parts, vp)
		pairs = append(pairs, v.Pair)
	}
	if len(parts) == 0 {
		return &inputError{fmt.Errorf("%s: --svg: no analysis to draw", path)}
	}
	var buf bytes.Buffer
	if err := render.WriteDiagram(&buf, pairDiagram(diene, parts, pairs, opts.Params.Name, cal)); err != nil {
		return err
	}
	if path == "-" {
		_, err := s.out.Write(buf.Bytes())
		return err
	}
	if err := os.WriteFile(path, buf.Bytes(), 0o644); err != nil {
		return &inputError{fmt.Errorf("%s: cannot write (%v)", path, unwrapPathError(err))}
	}
	fmt.Fprintf(s.err, "cyclopair: wrote %s\n", path)
	return nil
}
