package main

import (
	"fmt"
	"io"
	"math"
	"os"
	"strings"
	"text/tabwriter"

	"cyclopair/fmo"
	"cyclopair/fmo/rate"
	"cyclopair/presets"

	"github.com/spf13/pflag"
)

// addRateFlags adds --rate-model and --temperature (pair, screen, demo).
func addRateFlags(f *pflag.FlagSet, model *string, temp *float64) {
	f.StringVar(model, "rate-model", "", "rate model `FILE` from 'cyclopair calibrate --rates' (default: the bundled fit)")
	f.Float64Var(temp, "temperature", 25, "temperature in °C for the predicted isomer shares (the rate factor is for the fit's 20–30 °C)")
}

// loadRateModel reads --rate-model, or the bundled model when path is "".
func loadRateModel(path string) (*rate.Model, error) {
	if path == "" {
		return rate.Default()
	}
	b, err := os.ReadFile(path)
	if err != nil {
		return nil, &inputError{fmt.Errorf("%s: cannot read the rate model (%v)", path, err)}
	}
	m, err := rate.ParseModel(b, path)
	if err != nil {
		return nil, &inputError{err}
	}
	return m, nil
}

// rateLines describes a pair's rate and ratios in words for the table output.
func rateLines(p *fmo.Pair) []string {
	var out []string
	if p.Rate != nil {
		r := p.Rate
		line := fmt.Sprintf("rate: k/k_ref ~10^%.1f (90%% interval 10^%.1f–10^%.1f), reference %s", r.Log10KRel, r.Interval[0], r.Interval[1], r.Reference)
		if r.Log10VsFree != nil {
			line += fmt.Sprintf("; %s: %s than without activation", activationWord(p.Activation), factorWords(*r.Log10VsFree))
		}
		out = append(out, line)
		if !r.InDomain {
			out = append(out, r.DomainNote+"; the interval reaches back to the prediction at the edge of the fitted range: treat the factor as a rough guess")
		}
	}
	if len(p.Orientations) > 1 && p.FractionInterval != nil {
		best := p.Orientations[0]
		var other *fmo.Orientation
		for i := 1; i < len(p.Orientations); i++ {
			if p.Orientations[i].Fraction > 0 {
				other = &p.Orientations[i]
				break
			}
		}
		if other != nil {
			name := best.Label
			if name == "" {
				name = "preferred orientation"
			}
			iv := p.FractionInterval
			out = append(out, fmt.Sprintf("regio ratio at %.0f °C: %s %s (%s–%s)", p.RatioTemperatureC, name,
				ratioWords(best.Fraction), ratioWords(iv[0]), ratioWords(iv[1])))
		}
	}
	if p.EndoFraction != nil && p.EndoFractionInterval != nil {
		iv := p.EndoFractionInterval
		out = append(out, fmt.Sprintf("endo:exo at %.0f °C: %s (%s–%s)", p.RatioTemperatureC, ratioWords(*p.EndoFraction), ratioWords(iv[0]), ratioWords(iv[1])))
	}
	return out
}

func ratioWords(f float64) string {
	a := math.Round(f * 100)
	return fmt.Sprintf("%.0f:%.0f", a, 100-a)
}

func activationWord(mode string) string {
	switch mode {
	case fmo.ActivateLewis:
		return "Lewis acid"
	case fmo.ActivateProton:
		return "Brønsted acid"
	case fmo.ActivateIminium:
		return "iminium ion"
	}
	return mode
}

func factorWords(l10 float64) string {
	switch {
	case l10 >= 0.5:
		return fmt.Sprintf("~10^%.0f× faster", l10)
	case l10 <= -0.5:
		return fmt.Sprintf("~10^%.0f× slower", -l10)
	}
	return strings.TrimSpace(fmt.Sprintf("about as fast (×%.1f)", math.Pow(10, l10)))
}

// writeRateValidation prints the bundled rate model's cross-validated figures (computed by
// the fit and stored with it; TestEmbeddedModel keeps them current) next to the plain-gap
// baseline.
func writeRateValidation(w io.Writer) error {
	m, err := rate.Default()
	if err != nil {
		return err
	}
	fmt.Fprintf(w, "\nrate model (presets/kinetics/model.yaml; log10 k relative to %s)\n", m.Reference.Name)
	fmt.Fprintf(w, "leave-one-series-out cross-validation; baseline: a gap-only line, and the Spearman ρ of −gap\n")
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "series\trows\tρ (model)\tRMSE log10 (model)\tρ (gap)\tRMSE log10 (gap)\tnote")
	for _, st := range m.Series {
		note := ""
		if !st.InModel {
			why := st.Outside
			if why == "" {
				why = "solvent only"
			}
			note = why + ": outside the model, not fitted"
		} else if st.Rows < 5 {
			note = "fewer than 5 rows: ρ not defined"
		}
		fmt.Fprintf(tw, "%s\t%d\t%.2f\t%.2f\t%.2f\t%.2f\t%s\n", st.ID, st.Rows, st.Spearman, st.RMSE, st.GapRho, st.GapRMSE, note)
	}
	tw.Flush()
	fmt.Fprintf(w, "all fitted rows: RMSE %.2f log10 (gap-only baseline %.2f)\n", m.CVRMSE, m.GapCVRMSE)
	if d := m.Domain; d != nil {
		fmt.Fprintf(w, "applicability domain over the %d fitted rows: %s; leverage of %s at most %.3f (3p/n); a negative or first-order gap is outside\n",
			d.Rows, strings.Join(m.DomainRanges(), ", "), strings.Join(m.DomainLeverageTerms(), ", "), d.Warning)
	}
	r := m.Ratios
	fmt.Fprintf(w, "regio ratios: MAE %.2f kcal/mol in ΔΔG‡ over %d measured ratios, leave-one-out (baseline no preference: %.2f); %d of %d single-isomer entries predicted beyond %.2f kcal/mol\n",
		r.RegioMAE, r.RegioNumeric, r.RegioBaseMAE, r.RegioCensorMet, r.RegioCensored, r.CensorKcal)
	fmt.Fprintf(w, "endo:exo ratios: MAE %.2f kcal/mol over %d measured ratios, leave-one-out (baseline 1:1: %.2f); %d of %d endo-only entries beyond the bound\n",
		r.EndoMAE, r.EndoNumeric, r.EndoBaseMAE, r.EndoCensorMet, r.EndoCensored)
	return nil
}

// runCalibrateRates fits the rate and ratio model to a user's rate file (and selectivity
// file) and writes the model (stdout, or --out).
func runCalibrateRates(s *streams, opts *calibrateOptions, path string) error {
	rates, err := os.ReadFile(path)
	if err != nil {
		return &inputError{fmt.Errorf("%s: cannot read (%v)", path, err)}
	}
	_, sel := presets.KineticsYAML()
	if opts.sel != "" {
		if sel, err = os.ReadFile(opts.sel); err != nil {
			return &inputError{fmt.Errorf("%s: cannot read (%v)", opts.sel, err)}
		}
	}
	k, err := presets.ParseKinetics(rates, sel)
	if err != nil {
		return &inputError{fmt.Errorf("%s: %v", path, err)}
	}
	p, cal, err := resolveModel(s, opts.params, "default")
	if err != nil {
		return err
	}
	m, err := rate.FitKinetics(k, fmo.NewOptions(p, cal, cal.Name), "")
	if err != nil {
		return &inputError{fmt.Errorf("%s: %v", path, err)}
	}
	b, err := m.Marshal(rate.ModelHeader)
	if err != nil {
		return err
	}
	if opts.out == "" {
		_, err = s.out.Write(b)
		return err
	}
	if err := os.WriteFile(opts.out, b, 0o644); err != nil {
		return &inputError{fmt.Errorf("%s: cannot write (%v)", opts.out, err)}
	}
	fmt.Fprintf(s.err, "cyclopair: rate model written to %s (cross-validated RMSE %.2f log10; use it with --rate-model %s)\n", opts.out, m.CVRMSE, opts.out)
	return nil
}
