package main

import (
	"errors"
	"fmt"
	"os"
	"strconv"
	"strings"

	"cyclopair/cmd/cyclopair/internal/draw"
	"cyclopair/fmo"
	"cyclopair/huckel"
	"cyclopair/huckel/errtext"
	"cyclopair/huckel/smiles"
	"cyclopair/presets"

	"github.com/spf13/cobra"
)

type drawOptions struct {
	orbital    string // homo, lumo, homo-1, lumo+2, or a 0-based level index
	diene      string
	dienophile string
	activate   string
	params     string
	name       string
	rank       int    // orientation to draw in a pair picture, 1 = preferred
	svg        string // output file; stdout when empty or "-"
	numbers    bool
	methodOptions
	limits inputLimits
}

func newDrawCmd(s *streams) *cobra.Command {
	opts := &drawOptions{}
	cmd := &cobra.Command{
		Use:   "draw SMILES|NAME --orbital homo|lumo|N | draw --diene SMILES --dienophile SMILES",
		Short: "SVG picture of an orbital on a molecule, or of a cycloaddition pair",
		Long: `Draw one π orbital on the structure of a molecule, or a cycloaddition pair in its
preferred orientation, as SVG (to stdout, or to the file named by --svg).

Orbital picture: each π centre gets a circle whose AREA is proportional to c² (the π density
the orbital puts there; the radius is proportional to |c|). Solid dark circles are c > 0,
white hatched circles with a dark outline are c < 0. A level in a degenerate set is drawn
with every member of the set side by side. --orbital takes homo, lumo, homo-1, lumo+1, … or
a 0-based level index (most bonding level first, as "index" in 'orbitals --format json').

Pair picture: the 4π partner (diene, hetero-diene or 1,3-dipole) on top, the 2π partner
below, joined by the two forming bonds (dashed) of the preferred orientation (or of the
one --orientation names); the endo secondary contact is dotted; the lobes are the frontier
orbitals of the controlling pairing (diene HOMO and dienophile LUMO for normal demand, the
other two for inverse demand). An activated dienophile is drawn with its proton, Lewis acid
or amine. The molecule, --diene and --dienophile take a SMILES or the name of a built-in
substrate.

For one shareable page with these pictures, the ranked table, the parameters, the
calibration and the accuracy on the literature check set, use 'cyclopair pair ... --format
html' or 'cyclopair screen FILE --format html'.

Results are estimates for planning, not safety assessments: check the SDS, a hazard review
and local rules before any lab work.`,
		Example: `  cyclopair draw C=CC=O --orbital lumo --svg acrolein-lumo.svg
  cyclopair draw c1ccccc1 --orbital homo > benzene-homo.svg
  cyclopair draw --diene C1=CC=CC1 --dienophile 'O=C1OC(=O)C=C1' --svg pair.svg
  cyclopair draw --diene isoprene --dienophile methyl-acrylate --orientation 2 --svg meta.svg
  cyclopair draw --diene 'COC=CC=C' --dienophile 'C=CC(=O)OC' --activate lewis --svg lewis.svg`,
		Args: cobra.MaximumNArgs(1),
		RunE: func(c *cobra.Command, args []string) error {
			pair := opts.diene != "" || opts.dienophile != ""
			switch {
			case pair && len(args) > 0:
				return &usageError{errors.New("give either a SMILES with --orbital or --diene and --dienophile, not both")}
			case pair && (opts.diene == "" || opts.dienophile == ""):
				return &usageError{errors.New("a pair picture needs both --diene and --dienophile")}
			case pair && opts.orbital != "":
				return &usageError{errors.New("--orbital applies to a single molecule; the pair picture shows the controlling frontier orbitals")}
			case !pair && len(args) == 0:
				return &usageError{errors.New("give a SMILES (with --orbital) or --diene and --dienophile")}
			case !pair && c.Flags().Changed("activate"):
				return &usageError{errors.New("--activate applies to the dienophile of a pair picture")}
			case !pair && c.Flags().Changed("orientation"):
				return &usageError{errors.New("--orientation applies to a pair picture")}
			case opts.rank < 1:
				return &usageError{fmt.Errorf("--orientation %d: want 1 (preferred) or more", opts.rank)}
			}
			if !pair && opts.orbital == "" {
				opts.orbital = "homo"
			}
			if err := opts.limits.check(); err != nil {
				return err
			}
			return runDraw(s, opts, args)
		},
	}
	f := cmd.Flags()
	f.StringVar(&opts.orbital, "orbital", "", "orbital to draw: homo, lumo, homo-N, lumo+N, somo or a 0-based level index (default homo)")
	f.StringVar(&opts.diene, "diene", "", "4π partner (diene, hetero-diene or 1,3-dipole): SMILES or built-in substrate name")
	f.StringVar(&opts.dienophile, "dienophile", "", "2π partner: SMILES or built-in substrate name")
	f.StringVar(&opts.activate, "activate", "none", "activation of the dienophile: "+strings.Join(fmo.Modes(), ", "))
	f.StringVar(&opts.params, "params", presets.DefaultParams, "parameter set: a built-in name (see 'cyclopair params') or a YAML file")
	f.StringVar(&opts.name, "name", "", "molecule name for the heading (orbital picture)")
	f.StringVar(&opts.svg, "svg", "", "write the SVG to this file instead of stdout")
	f.IntVar(&opts.rank, "orientation", 1, "pair picture: which orientation to draw, 1 = preferred, 2 = runner-up, … (as listed by 'cyclopair pair')")
	f.BoolVar(&opts.numbers, "numbers", false, "print 1-based atom positions next to the atoms (C1, C2 … as in site names)")
	addMethodFlags(f, &opts.methodOptions, defaultMethod)
	opts.limits.flags(cmd, huckel.DefaultMaxCentres)
	f.Lookup("max-centres").Usage += "; orbital pictures only (pair pictures keep the default)"
	return cmd
}

// runDraw builds the picture and writes it. It is the testable body of the command.
func runDraw(s *streams, opts *drawOptions, args []string) error {
	mod, err := resolveSolveModel(s, opts.params, "", opts.methodOptions)
	if err != nil {
		return err
	}
	var svg []byte
	if len(args) == 1 {
		svg, err = drawOrbital(args[0], opts, mod)
	} else {
		svg, err = drawPair(opts, mod)
	}
	if err != nil {
		return err
	}
	if opts.svg == "" || opts.svg == "-" {
		_, err = s.out.Write(svg)
		return err
	}
	if err := os.WriteFile(opts.svg, svg, 0o644); err != nil {
		return &inputError{fmt.Errorf("%s: %v (check the directory exists and is writable)", opts.svg, err)}
	}
	fmt.Fprintf(s.err, "cyclopair: wrote %s\n", opts.svg)
	return nil
}

// smilesErr formats a SMILES reader error as "<SMILES>: column N: what (hint)" plus the
// excerpt with a caret; the SMILES is shortened and escaped (errtext.Clip).
func smilesErr(smi string, err error) error {
	var se *smiles.Error
	if errors.As(err, &se) {
		return &inputError{fmt.Errorf("%s: %s%s", errtext.Clip(smi), se.Error(), excerptLines(se))}
	}
	return &inputError{fmt.Errorf("%s: %v", errtext.Clip(smi), err)}
}

func drawOrbital(arg string, opts *drawOptions, mod *solveModel) ([]byte, error) {
	p, cal := mod.params, mod.cal
	name, smi := partnerInput(arg)
	if opts.name == "" {
		opts.name = name
	}
	m, err := opts.limits.parse(smi)
	if err != nil {
		return nil, smilesErr(smi, err)
	}
	where := errtext.Clip(smi)
	ps, err := opts.limits.perceive(m, p)
	if err != nil {
		return nil, &inputError{fmt.Errorf("%s: %v", where, err)}
	}
	if len(ps.Centres) == 0 {
		return nil, &inputError{fmt.Errorf("%s: %s", where, noPiSystem(ps, "draw"))}
	}
	orb := new(huckel.Orbitals)
	if err := mod.solver().Solve(ps, orb); err != nil {
		return nil, &inputError{fmt.Errorf("%s: %v", where, err)}
	}
	level, which, err := pickLevel(orb, opts.orbital)
	if err != nil {
		return nil, &usageError{fmt.Errorf("%s: --orbital %s: %v", where, errtext.Clip(opts.orbital), err)}
	}
	svg, err := draw.Orbital(orb, level, draw.OrbitalOptions{
		Name: opts.name, SMILES: smi, Which: which, Params: p.Name,
		Calibration: cal, CalName: cal.Name, IDPrefix: "orb", Numbers: opts.numbers,
	})
	if err != nil {
		return nil, &inputError{fmt.Errorf("%s: %v", where, err)}
	}
	return svg, nil
}

// pickLevel resolves homo, lumo, homo-N, lumo+N, somo or a 0-based index to a level index.
// Levels are sorted bonding first, so homo-N counts towards smaller indices and lumo+N
// towards larger ones.
func pickLevel(orb *huckel.Orbitals, spec string) (int, string, error) {
	spec = strings.ToLower(strings.TrimSpace(spec))
	n := len(orb.Levels)
	for _, f := range []struct {
		name, word, sign, shown, other string
		base, step                     int
	}{
		{"homo", "HOMO", "-", "−", "lumo", orb.HOMO, -1},
		{"lumo", "LUMO", "+", "+", "homo", orb.LUMO, +1},
	} {
		rest, ok := strings.CutPrefix(spec, f.name)
		if !ok {
			continue
		}
		if f.base < 0 {
			kind := "occupied"
			if f.step > 0 {
				kind = "empty"
			}
			return 0, "", fmt.Errorf("the π system has no %s level (use %s or a level index)", kind, f.other)
		}
		if rest == "" {
			return f.base, f.word, nil
		}
		k, err := strconv.Atoi(strings.TrimPrefix(rest, f.sign))
		if err != nil || !strings.HasPrefix(rest, f.sign) || k < 0 {
			return 0, "", fmt.Errorf("want %[1]s, %[1]s%[2]s1, %[1]s%[2]s2, …", f.name, f.sign)
		}
		word := f.word
		if k > 0 {
			word = fmt.Sprintf("%s%s%d", f.word, f.shown, k)
		}
		return checkLevel(f.base+f.step*k, n, word)
	}
	if spec == "somo" {
		if orb.SOMO < 0 {
			return 0, "", errors.New("the π system has no singly occupied level (use homo or lumo)")
		}
		return orb.SOMO, "SOMO", nil
	}
	k, err := strconv.Atoi(spec)
	if err != nil {
		return 0, "", errors.New("want homo, lumo, homo-N, lumo+N, somo or a 0-based level index")
	}
	return checkLevel(k, n, fmt.Sprintf("level %d", k))
}

// checkLevel reports a level index outside the π system with the valid range.
func checkLevel(i, n int, word string) (int, string, error) {
	// A degenerate set is drawn whole, so homo-1 inside the HOMO's own set is still valid
	// (it names the same set); only the range is checked.
	if i < 0 || i >= n {
		return 0, "", fmt.Errorf("%s does not exist (levels 0 to %d)", word, n-1)
	}
	return i, word, nil
}

// partnerInput resolves a --diene/--dienophile value: a built-in substrate name or a SMILES.
func partnerInput(v string) (name, smi string) {
	if sub, ok := presets.LookupSubstrate(v); ok {
		if _, err := smiles.Parse(v); err != nil { // a name, not a SMILES that happens to match
			return sub.Name, sub.SMILES
		}
	}
	return "", v
}

func drawPair(opts *drawOptions, mod *solveModel) ([]byte, error) {
	o := mod.options()
	d, err := pairPartner(opts.diene, fmo.RoleDiene, o, &opts.limits)
	if err != nil {
		return nil, err
	}
	e, err := pairPartner(opts.dienophile, fmo.RoleDienophile, o, &opts.limits)
	if err != nil {
		return nil, err
	}
	if opts.activate != "" && opts.activate != "none" {
		act, err := e.WithActivation(opts.activate, nil, o)
		if err != nil {
			return nil, &inputError{fmt.Errorf("%s: --activate %s: %v (modes: %s)", e.SMILES, opts.activate, err, strings.Join(fmo.Modes(), ", "))}
		}
		e = act
	}
	pair, err := fmo.Analyze(d, e, o)
	if err != nil {
		return nil, &inputError{fmt.Errorf("%s + %s: %v", d.SMILES, e.SMILES, err)}
	}
	if opts.rank > len(pair.Orientations) {
		return nil, &usageError{fmt.Errorf("%s + %s: --orientation %d: the analysis found %d orientation(s)", d.SMILES, e.SMILES, opts.rank, len(pair.Orientations))}
	}
	svg, err := draw.Pair(d, e, pair, draw.PairOptions{IDPrefix: "pair", Numbers: opts.numbers, Orientation: opts.rank - 1})
	if err != nil {
		return nil, &inputError{fmt.Errorf("%s + %s: %v", d.SMILES, e.SMILES, err)}
	}
	return svg, nil
}
