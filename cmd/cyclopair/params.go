package main

import (
	"encoding/json"
	"errors"
	"fmt"
	"io"
	"os"
	"slices"
	"strings"
	"text/tabwriter"

	"cyclopair/huckel"
	"cyclopair/huckel/errtext"
	"cyclopair/presets"

	"github.com/spf13/cobra"
	"go.yaml.in/yaml/v3"
)

// maxParamsFile caps a user parameter file read from disk.
const maxParamsFile = 1 << 20

// resolveParams turns a --params value into a parameter set: the name of a built-in set,
// or a YAML file in the same format, which overrides the entries of its base: set (the
// default set when it names none) or, with replace: true, stands alone. Empty means the
// default set. Errors are inputErrors in the CLI's one-line format.
func resolveParams(spec string) (*huckel.Params, error) {
	if spec == "" {
		spec = presets.DefaultParams
	}
	if slices.Contains(presets.ParamNames(), spec) {
		return presets.Params(spec)
	}
	f, err := openRegular(spec, "parameter file")
	if err != nil {
		var ie *inputError
		switch {
		case errors.As(err, &ie):
			return nil, err
		case errors.Is(err, os.ErrNotExist):
			return nil, &inputError{fmt.Errorf("%s: no such parameter set or file (built-in sets: %s)",
				errtext.Clip(spec), strings.Join(presets.ParamNames(), ", "))}
		}
		return nil, &inputError{fmt.Errorf("%s: %v (check the path and permissions)", errtext.Clip(spec), unwrapPathError(err))}
	}
	defer f.Close()
	data, err := io.ReadAll(io.LimitReader(f, maxParamsFile+1))
	if err != nil {
		return nil, &inputError{fmt.Errorf("%s: %v (check the file)", errtext.Clip(spec), unwrapPathError(err))}
	}
	if len(data) > maxParamsFile {
		return nil, &inputError{fmt.Errorf("%s: larger than %d bytes (a parameter file is a few kilobytes)", errtext.Clip(spec), maxParamsFile)}
	}
	if err := yamlMappingCheck(data, errtext.Clip(spec), "parameter file"); err != nil {
		return nil, err
	}
	user, err := huckel.ParseParams(data, spec)
	if err != nil {
		return nil, &inputError{fmt.Errorf("%v (see 'cyclopair params show %s --format yaml' for the format)", err, presets.DefaultParams)}
	}
	p, err := presets.ResolveParams(user)
	if err != nil {
		return nil, &inputError{fmt.Errorf("%s: %v", errtext.Clip(spec), err)}
	}
	if user.Name == "" {
		p.Name = spec
	}
	return p, nil
}

type paramsShowOptions struct {
	format string
}

func newParamsCmd(s *streams) *cobra.Command {
	cmd := &cobra.Command{
		Use:   "params",
		Short: "List the built-in Hückel parameter sets",
		Long: `List the built-in Hückel parameter sets (name, title, source). The default set is
marked. Any command taking --params accepts one of these names or a YAML file in the same
format; a file overrides entries of its base set (base: NAME, default otherwise) unless it
says replace: true.`,
		Example: `  cyclopair params
  cyclopair params show streitwieser1961
  cyclopair params show vancatledge1980 --format yaml > myset.yaml`,
		Args: cobra.NoArgs,
		RunE: func(c *cobra.Command, args []string) error { return listParams(s.out) },
	}
	cmd.AddCommand(newParamsShowCmd(s))
	return cmd
}

func newParamsShowCmd(s *streams) *cobra.Command {
	opts := &paramsShowOptions{}
	cmd := &cobra.Command{
		Use:   "show NAME|FILE",
		Short: "Print one parameter set: every h and k value with its source",
		Example: `  cyclopair params show streitwieser1961
  cyclopair params show mine.yaml --format json`,
		Args: cobra.ExactArgs(1),
		RunE: func(c *cobra.Command, args []string) error {
			switch opts.format {
			case "table", "yaml", "json":
			default:
				return &usageError{fmt.Errorf("--format %q: want table, yaml or json", opts.format)}
			}
			p, err := resolveParams(args[0])
			if err != nil {
				return err
			}
			return showParams(s.out, p, opts.format)
		},
	}
	cmd.Flags().StringVar(&opts.format, "format", "table", "output format: table, yaml or json")
	return cmd
}

func listParams(w io.Writer) error {
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "NAME\tDEFAULT\tTITLE\tSOURCE")
	for _, n := range presets.ParamNames() {
		p, err := presets.Params(n)
		if err != nil {
			return err
		}
		def := ""
		if n == presets.DefaultParams {
			def = "yes"
		}
		fmt.Fprintf(tw, "%s\t%s\t%s\t%s\n", n, def, p.Title, p.Source)
	}
	return tw.Flush()
}

// paramsDoc is the file format of a parameter set, for yaml and json output (the same keys
// ParseParams reads, so the output is a valid --params file).
type paramsDoc struct {
	Name            string            `yaml:"name" json:"name"`
	Title           string            `yaml:"title,omitempty" json:"title,omitempty"`
	Source          string            `yaml:"source,omitempty" json:"source,omitempty"`
	Notes           string            `yaml:"notes,omitempty" json:"notes,omitempty"`
	Alkyl           bool              `yaml:"alkyl" json:"alkyl"`
	Omega           float64           `yaml:"omega" json:"omega"`
	Auxiliary       float64           `yaml:"auxiliary,omitempty" json:"auxiliary,omitempty"`
	KLike           map[string]string `yaml:"k_like,omitempty" json:"k_like,omitempty"`
	KFallback       string            `yaml:"k_fallback,omitempty" json:"k_fallback,omitempty"`
	KFallbackSource string            `yaml:"k_fallback_source,omitempty" json:"k_fallback_source,omitempty"`
	H               []paramsDocH      `yaml:"h" json:"h"`
	K               []paramsDocK      `yaml:"k" json:"k"`
}

type paramsDocH struct {
	Type   string  `yaml:"type" json:"type"`
	H      float64 `yaml:"h" json:"h"`
	Source string  `yaml:"source" json:"source"`
}

type paramsDocK struct {
	Types  []string `yaml:"types,flow" json:"types"`
	Order  int      `yaml:"order,omitempty" json:"order,omitempty"`
	K      float64  `yaml:"k" json:"k"`
	Source string   `yaml:"source" json:"source"`
}

func docOf(p *huckel.Params) paramsDoc {
	d := paramsDoc{Name: p.Name, Title: p.Title, Source: p.Source, Notes: strings.TrimSpace(p.Notes),
		Alkyl: p.Alkyl, Omega: p.Omega, Auxiliary: p.Auxiliary, KFallback: p.KFallback, KFallbackSource: p.KFallbackSource}
	if len(p.KLike) > 0 {
		d.KLike = map[string]string{}
		for k, v := range p.KLike {
			d.KLike[string(k)] = string(v)
		}
	}
	for _, e := range p.HEntries {
		d.H = append(d.H, paramsDocH{Type: string(e.Type), H: e.H, Source: e.Source})
	}
	for _, e := range p.KEntries {
		d.K = append(d.K, paramsDocK{Types: []string{string(e.A), string(e.B)}, Order: e.Order, K: e.K, Source: e.Source})
	}
	return d
}

func showParams(w io.Writer, p *huckel.Params, format string) error {
	switch format {
	case "yaml":
		enc := yaml.NewEncoder(w)
		enc.SetIndent(2)
		if err := enc.Encode(docOf(p)); err != nil {
			return err
		}
		return enc.Close()
	case "json":
		b, err := json.MarshalIndent(docOf(p), "", "  ")
		if err != nil {
			return err
		}
		_, err = fmt.Fprintf(w, "%s\n", b)
		return err
	}
	fmt.Fprintf(w, "%s — %s\nsource: %s\n", p.Name, p.Title, p.Source)
	alkyl := "off"
	if p.Alkyl {
		alkyl = "on (sp3 C next to a π centre becomes a Me pseudo-atom)"
	}
	omega := "off"
	if p.Omega != 0 {
		omega = fmt.Sprintf("%g", p.Omega)
	}
	fmt.Fprintf(w, "alkyl hyperconjugation model: %s\nω-technique: %s\n", alkyl, omega)
	if p.Auxiliary != 0 {
		fmt.Fprintf(w, "auxiliary inductive parameter: h_C += %g·h_X for carbons bonded to heteroatom X\n", p.Auxiliary)
	}
	if len(p.KLike) > 0 {
		var parts []string
		for _, t := range huckel.AllCentreTypes {
			if l, ok := p.KLike[t]; ok {
				parts = append(parts, fmt.Sprintf("%s→%s", t, l))
			}
		}
		fmt.Fprintf(w, "k borrowed: %s\n", strings.Join(parts, ", "))
	}
	if p.KFallback != "" {
		fmt.Fprintf(w, "k fallback for other hetero pairs: %s — %s\n", p.KFallback, p.KFallbackSource)
	}
	fmt.Fprintln(w, "\nCoulomb parameters (α_X = α + h·β)")
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "TYPE\th\tSOURCE")
	for _, e := range p.HEntries {
		fmt.Fprintf(tw, "%s\t%.2f\t%s\n", e.Type, e.H, e.Source)
	}
	if err := tw.Flush(); err != nil {
		return err
	}
	fmt.Fprintln(w, "\nResonance parameters (β_XY = k·β)")
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "BOND\tORDER\tk\tSOURCE")
	for _, e := range p.KEntries {
		order := "any"
		if e.Order > 0 {
			order = fmt.Sprint(e.Order)
		}
		fmt.Fprintf(tw, "%s–%s\t%s\t%.2f\t%s\n", e.A, e.B, order, e.K, e.Source)
	}
	return tw.Flush()
}

// completeParams offers the built-in set names for a --params flag (files are completed
// by the shell as usual). Register it with
// cmd.RegisterFlagCompletionFunc("params", completeParams).
func completeParams(*cobra.Command, []string, string) ([]cobra.Completion, cobra.ShellCompDirective) {
	return presets.ParamNames(), cobra.ShellCompDirectiveDefault
}
