package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"math"
	"slices"
	"strings"

	"cyclopair/fmo"
	"cyclopair/fmo/rate"
	"cyclopair/huckel"
	"cyclopair/huckel/errtext"
	"cyclopair/presets"

	"github.com/spf13/cobra"
)

// pairOptions are the flags of 'cyclopair pair'.
type pairOptions struct {
	diene, dienophile string
	activate          []string
	amine             string
	params            string
	format            string
	chargeTerm        bool
	allOrbitals       bool
	svg               string  // --svg FILE: also write the energy-level diagram (diagram.go)
	lewisH            float64 // --lewis-h: h(O=LA) for --activate lewis (0 = the parameter set's)
	calibration       string  // --calibration: default or a file from 'cyclopair calibrate --out'
	rateModel         string  // --rate-model FILE: a model from 'cyclopair calibrate --rates' ("" = bundled)
	temperature       float64 // --temperature: °C for the isomer shares
	methodOptions
	limits inputLimits
}

func newPairCmd(s *streams) *cobra.Command {
	opts := &pairOptions{}
	cmd := &cobra.Command{
		Use:   "pair --diene SMILES --dienophile SMILES",
		Short: "Frontier-orbital analysis of one cycloaddition pair",
		Long: `Analyse one 4π partner (--diene: a diene, hetero-diene or 1,3-dipole) with one 2π partner
(--dienophile) by Hückel frontier-orbital perturbation theory: the normal and inverse
frontier gaps (x in E = α + xβ, reported in |β| and in eV through the named calibration;
with --method ppp the orbitals come from PPP-SCF and eV from Koopmans' theorem),
the demand and Sustmann type, every candidate pair of reacting units in both
regio-orientations ranked best first with the adduct SMILES, the regio margin and
confidence, the endo (secondary-orbital) verdict, whether the supra–supra thermal pairing is
symmetry-allowed, and warnings.

Ranking score, per orientation (all in |β|):
  score = frontier_term + charge_term − λ·localization − w·min(gap_normal, gap_inverse)
  frontier_term = Σ over both frontier pairings of 2(γ Σ_bonds c_r c_s)² / gap,
                  first-order 2|γ Σ c c| where the gap is at or below |γ Σ c c|
with γ (forming_beta), λ (localization_weight) and w (gap_weight) printed with every result.
The localisation and gap terms are equal for both orientations of one site, so
regiochemistry comes from the frontier term alone.

Atom indices (bonds, diene_atoms, dienophile_atoms) are 0-based positions in each SMILES as
written; site names count from 1 (C1 is atom 0), as chemists number atoms. Atom maps ([CH2:1]) pin the
reacting atoms: map both termini of the unit you mean. With several --activate modes one
result is printed per mode (JSON: one object per line, each with its "activation").

Results are estimates for planning, not safety assessments: check the SDS, a hazard review
and local rules before any lab work.`,
		Example: `  cyclopair pair --diene 'C=CC(C)=C' --dienophile 'C=CC(=O)OC'
  cyclopair pair --diene C1=CC=CC1 --dienophile 'O=C1OC(=O)C=C1' --format json
  cyclopair pair --diene 'C=CC=C' --dienophile 'C=CC=O' --activate none,lewis,iminium
  cyclopair pair --diene 'COC(=O)c1nnc(C(=O)OC)nn1' --dienophile 'C=COCC'
  cyclopair pair --diene cyclopentadiene --dienophile maleic-anhydride`,
		Args: cobra.NoArgs,
		RunE: func(c *cobra.Command, args []string) error {
			switch opts.format {
			case "table", "json", "html", "sdf":
			default:
				return &usageError{fmt.Errorf("--format %q: want table, json, html or sdf", opts.format)}
			}
			if strings.TrimSpace(opts.diene) == "" || strings.TrimSpace(opts.dienophile) == "" {
				return &usageError{errors.New("both --diene and --dienophile are required")}
			}
			if len(opts.activate) == 0 {
				opts.activate = []string{fmo.ActivateNone}
			}
			for _, m := range opts.activate {
				if !slices.Contains(fmo.Modes(), m) {
					return &usageError{fmt.Errorf("--activate %q: unknown mode (want %s)", m, strings.Join(fmo.Modes(), ", "))}
				}
			}
			if opts.amine != "" && !slices.Contains(opts.activate, fmo.ActivateIminium) {
				return &usageError{errors.New("--amine is only used with --activate iminium")}
			}
			if c.Flags().Changed("lewis-h") && (!slices.Contains(opts.activate, fmo.ActivateLewis) || !(opts.lewisH > 0 && opts.lewisH <= 5)) {
				return &usageError{fmt.Errorf("--lewis-h %g: needs --activate lewis and a value in (0, 5] (h of the Lewis-acid-bound carbonyl O; free C=O 1.0, protonated 2.5)", opts.lewisH)}
			}
			if err := opts.methodOptions.check(); err != nil {
				return err
			}
			if opts.method == huckel.MethodPPP && opts.lewisH != 0 {
				return &usageError{errors.New("--lewis-h sets a Hückel h value; PPP-SCF takes the O=LA centre from --ppp-params: drop --lewis-h with --method ppp")}
			}
			if err := opts.limits.check(); err != nil {
				return err
			}
			return runPair(s, opts)
		},
	}
	f := cmd.Flags()
	f.StringVar(&opts.diene, "diene", "", "SMILES (or built-in substrate name) of the 4π partner: diene, hetero-diene or 1,3-dipole")
	f.StringVar(&opts.dienophile, "dienophile", "", "SMILES (or built-in substrate name) of the 2π partner")
	f.StringSliceVar(&opts.activate, "activate", []string{fmo.ActivateNone}, "dienophile activation(s), comma-separated: "+strings.Join(fmo.Modes(), ", "))
	f.StringVar(&opts.amine, "amine", "", "secondary amine SMILES for --activate iminium (default pyrrolidine, "+fmo.DefaultAmineSMILES+")")
	f.Float64Var(&opts.lewisH, "lewis-h", 0, "Lewis-acid strength for --activate lewis: h of the bound carbonyl O (default: the parameter set's O=LA value)")
	f.StringVar(&opts.calibration, "calibration", "default", "x → eV calibration: default, or a file from 'cyclopair calibrate --out'")
	f.StringVar(&opts.params, "params", presets.DefaultParams, "parameter set: a built-in name (see 'cyclopair params') or a YAML file")
	f.StringVar(&opts.format, "format", "table", "output format: table, json (JSON Lines, one object per activation), html (one self-contained page with pictures) or sdf (the product of each activation as an SD record with the figures as data items)")
	f.StringVar(&opts.svg, "svg", "", "also write the energy-level diagram (SVG) to `FILE`")
	f.BoolVar(&opts.allOrbitals, "all-orbitals", false, "sum the orbital term over every occupied × empty level pair instead of the frontier levels only")
	f.BoolVar(&opts.chargeTerm, "charge-term", false, "include the Coulomb term −Σ q_r q_s/(εR) of the Klopman–Salem equation (off by default)")
	addRateFlags(f, &opts.rateModel, &opts.temperature)
	addMethodFlags(f, &opts.methodOptions, defaultMethod)
	opts.limits.flags(cmd, fmo.DefaultMaxPairCentres)
	return cmd
}

// runPair is the testable body of 'cyclopair pair'.
func runPair(s *streams, opts *pairOptions) error {
	mod, err := resolveSolveModel(s, opts.params, opts.calibration, opts.methodOptions)
	if err != nil {
		return err
	}
	cal := mod.cal
	fo := mod.options()
	fo.ChargeTerm = opts.chargeTerm
	fo.AllOrbitals = opts.allOrbitals
	fo.MaxCentres = opts.limits.maxCentres
	diene, err := pairPartner(opts.diene, fmo.RoleDiene, fo, &opts.limits)
	if err != nil {
		return err
	}
	dienophile, err := pairPartner(opts.dienophile, fmo.RoleDienophile, fo, &opts.limits)
	if err != nil {
		return err
	}
	var act *fmo.ActivateOptions
	if opts.amine != "" {
		am, err := opts.limits.parse(opts.amine)
		if err != nil {
			return smilesErr(opts.amine, err)
		}
		act = &fmo.ActivateOptions{Amine: am}
	}
	if opts.lewisH != 0 {
		if act == nil {
			act = &fmo.ActivateOptions{}
		}
		act.LewisStrength = opts.lewisH
	}
	variants := fmo.AnalyzeVariants(diene, dienophile, opts.activate, act, fo)
	if opts.svg != "" {
		if err := writePairSVG(s, opts.svg, diene, dienophile, variants, act, fo, cal); err != nil {
			return err
		}
	}
	var page *pairHTML // --format html (draw_html.go)
	if opts.format == "html" {
		page = newPairHTML(s, diene, dienophile, fo, act, cal)
	}
	var sdf *pairSDF // --format sdf (pair_sdf.go)
	if opts.format == "sdf" {
		sdf = newPairSDF(s, fo, cal)
	}
	// Are the partners in the right roles? Checked once, on the unactivated substrates (the
	// "none" variant when it was asked for, else analysed here).
	var base *fmo.Pair
	for _, v := range variants {
		if v.Mode == fmo.ActivateNone && v.Err == nil {
			base = v.Pair
		}
	}
	if base == nil {
		base, _ = fmo.Analyze(diene, dienophile, fo)
	}
	roleWarning := fmo.RoleCheck(diene, dienophile, base, fo)
	rm, err := loadRateModel(opts.rateModel)
	if err != nil {
		return err
	}
	var freeRate *float64
	if !rate.AppliesTo(diene.Orb.Method) {
		fmt.Fprintf(s.err, "cyclopair: note: no rate or isomer shares: %v\n", rate.ErrMethod)
	} else if base != nil {
		if d, err := rate.FromPair(base, diene.Mol); err == nil {
			v := rm.Predict(&d).Log10KRel
			freeRate = &v
		}
	}
	failed := 0
	var firstErr error
	for _, v := range variants {
		if v.Err != nil {
			failed++
			err := fmt.Errorf("%s: --activate %s: %v", errtext.Clip(opts.dienophile), v.Mode, v.Err)
			if firstErr == nil {
				firstErr = err
			}
			if len(variants) > 1 {
				fmt.Fprintf(s.err, "cyclopair: %v\n", err)
			}
			continue
		}
		pair := v.Pair
		if err := rm.Annotate(pair, diene, opts.temperature); err != nil {
			return err
		}
		if v.Mode != fmo.ActivateNone && freeRate != nil && pair.Rate != nil {
			d := math.Round((pair.Rate.Log10KRel-*freeRate)*1e6) / 1e6
			pair.Rate.Log10VsFree = &d
		}
		pair.AttachSideChannels(fmo.SideChannels(diene, dienophile, pair, fo))
		if roleWarning != "" {
			pair.Warnings = append(pair.Warnings, roleWarning)
		}
		switch opts.format {
		case "json":
			b, err := json.Marshal(pair)
			if err != nil {
				return err
			}
			s.out.Write(append(b, '\n'))
		case "html":
			if err := page.add(pair); err != nil {
				return err
			}
		case "sdf":
			if err := sdf.add(pair); err != nil {
				return err
			}
		default:
			writePairTable(s, pair, cal.String())
		}
	}
	if page != nil {
		if err := page.close(); err != nil {
			return err
		}
	}
	switch {
	case failed == len(variants):
		return &inputError{firstErr}
	case failed > 0:
		return &partialError{failed: failed, total: len(variants)}
	}
	return nil
}

// pairPartner reads one partner; errors come back in the CLI's one-line form naming the SMILES.
// The value may be a built-in substrate name (presets.Substrates, as for 'cyclopair draw') instead of a SMILES.
func pairPartner(v string, role fmo.Role, o *fmo.Options, lim *inputLimits) (*fmo.Partner, error) {
	name, smi := partnerInput(v)
	m, err := lim.parse(smi)
	if err != nil {
		return nil, smilesErr(smi, err)
	}
	if name == "" {
		name = smi
	}
	m.Name = name
	pt, err := fmo.NewPartnerFromMolecule(name, m, role, o)
	if err != nil {
		var se *fmo.SiteError
		if errors.As(err, &se) {
			return nil, &inputError{fmt.Errorf("%s: %s: %v", errtext.Clip(smi), role, pairSiteMessage(se))}
		}
		return nil, &inputError{fmt.Errorf("%s: %v", errtext.Clip(smi), strings.TrimPrefix(err.Error(), smi+": "))}
	}
	pt.SMILES = smi
	return pt, nil
}

// pairSiteMessage is the site error without the partner name (the CLI prefixes the SMILES).
func pairSiteMessage(se *fmo.SiteError) string {
	msg := se.Err.Error()
	if len(se.Mapped) > 0 {
		var b strings.Builder
		for i, a := range se.Mapped {
			if i > 0 {
				b.WriteString(", ")
			}
			fmt.Fprintf(&b, "%d", a)
		}
		msg += " (mapped atoms " + b.String() + ")"
	}
	if se.Detail != "" {
		msg += " (" + se.Detail + ")"
	}
	return msg
}
