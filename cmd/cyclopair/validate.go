package main

import (
	"encoding/json"
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"cyclopair/cmd/cyclopair/internal/render"
	"cyclopair/fmo"
	"cyclopair/fmo/check"
	"cyclopair/huckel"
	"cyclopair/huckel/ppp"
	"cyclopair/presets"

	"github.com/spf13/cobra"
)

// validateOptions are the flags of 'cyclopair validate'.
type validateOptions struct {
	params      string
	calibration string
	format      string // table, json, markdown
	cases       string // a check-set file instead of the bundled one
	strict      bool
	methodOptions
}

func newValidateCmd(s *streams) *cobra.Command {
	opts := &validateOptions{}
	cmd := &cobra.Command{
		Use:   "validate",
		Short: "Measure the method on the bundled literature check set",
		Long: `Run the literature check set — experimental regiochemistry (Diels–Alder, hetero-Diels–Alder,
1,3-dipolar), reacting-site, endo/exo and electron-demand (Sustmann type) outcomes, each with
its source and confidence — through the pair analysis, and print per category how many cases
the method gets right, the Spearman rank correlation of the measured reactivity series, and
every miss with its recorded reason. A case whose expected outcome the method misses is
kept as a documented known miss; nothing is tuned to pass a case.

The known misses are recorded for the default parameter set and options; with another
--params the differences show as "unexpected hit" or "miss".

--method ppp runs the pair analysis on PPP-SCF orbitals instead of Hückel ones (the known
misses are recorded for Hückel, so differences show as "miss" or "unexpected hit").
Whatever the method, the report ends with the π orbital energies of both methods against
gas-phase ionisation energies and electron affinities (presets/reference/pi-levels.yaml):
r², RMSE and mean error, PPP as computed (Koopmans), Hückel through a line fitted on the
same points.

--cases FILE runs a check set of your own in the same format (see the header of
presets/literature/cases.yaml). With --strict the exit status is 1 when a result differs
from the record (a new miss, or a known miss that now hits); without it, 1 only when a case
cannot be analysed.

Results are estimates for planning, not safety assessments.`,
		Example: `  cyclopair validate
  cyclopair validate --format markdown > accuracy.md
  cyclopair validate --params vancatledge1980 --format json | jq '.categories'
  cyclopair validate --method ppp`,
		Args: cobra.NoArgs,
		RunE: func(c *cobra.Command, args []string) error {
			switch opts.format {
			case "table", "json", "markdown":
			default:
				return &usageError{fmt.Errorf("--format %q: want table, json or markdown", opts.format)}
			}
			return runValidate(s, opts)
		},
	}
	f := cmd.Flags()
	f.StringVar(&opts.params, "params", presets.DefaultParams, "parameter set: a built-in name (see 'cyclopair params') or a YAML file")
	f.StringVar(&opts.calibration, "calibration", "default", "x → eV calibration: default, or a file from 'cyclopair calibrate --out'")
	f.StringVar(&opts.format, "format", "table", "output format: table, json or markdown")
	f.StringVar(&opts.cases, "cases", "", "check-set YAML file to run instead of the bundled one")
	f.BoolVar(&opts.strict, "strict", false, "exit 1 when any result differs from the check set's record")
	_ = cmd.MarkFlagFilename("cases", "yaml", "yml")
	addMethodFlags(f, &opts.methodOptions, defaultMethod)
	return cmd
}

// runValidate is the testable body of 'cyclopair validate'.
func runValidate(s *streams, opts *validateOptions) error {
	mo := opts.methodOptions
	if mo.method != huckel.MethodPPP {
		mo.pppParams = "" // with Hückel, --ppp-params only sets the PPP side of the π-level figures
	}
	mod, err := resolveSolveModel(s, opts.params, opts.calibration, mo)
	if err != nil {
		return err
	}
	pp, err := resolvePPP(opts.pppParams)
	if err != nil {
		return err
	}
	levels, err := piLevelFigures(mod.params, pp)
	if err != nil {
		return err
	}
	var set *check.CheckSet
	if opts.cases == "" {
		set, err = check.BundledCheckSet()
		if err != nil {
			return err
		}
	} else {
		r, done, name, err := openInput(s, opts.cases)
		if err != nil {
			return err
		}
		set, err = check.LoadCheckSet(r, name)
		done()
		if err != nil {
			return &inputError{err}
		}
	}
	fo := mod.options()
	rep := check.Validate(set, fo)
	switch opts.format {
	case "json":
		if err := writeValidateJSON(s.out, rep, levels); err != nil {
			return err
		}
	case "markdown":
		writeValidateMarkdown(s.out, rep)
		writeLevelsMarkdown(s.out, levels)
	default:
		writeValidateTable(s.out, rep)
		writeLevelsTable(s.out, levels)
		if opts.cases == "" {
			if err := writeRateValidation(s.out); err != nil {
				return err
			}
		}
	}
	errs, disagree := 0, 0
	for _, c := range rep.Cases {
		if c.Status == check.StatusError {
			errs++
			fmt.Fprintf(s.err, "cyclopair: %s: %s: cannot analyse: %s\n", set.File, c.ID, c.Error)
		}
		if !c.Agrees() {
			disagree++
		}
	}
	for _, sr := range rep.Series {
		if sr.Error != "" {
			errs++
			fmt.Fprintf(s.err, "cyclopair: %s: %s: cannot analyse: %s\n", set.File, sr.ID, sr.Error)
		} else if sr.Pass == (sr.KnownMiss != "") {
			disagree++
		}
	}
	total := len(rep.Cases) + len(rep.Series)
	switch {
	case errs > 0:
		return &partialError{failed: errs, total: total}
	case opts.strict && disagree > 0:
		return &partialError{failed: disagree, total: total}
	}
	return nil
}

type validateJSON struct {
	*check.ValidationReport
	Agrees   bool          `json:"agrees_with_record"`
	PiLevels *piLevelsJSON `json:"pi_levels,omitempty"`
	Caution  string        `json:"caution"`
}

func writeValidateJSON(w io.Writer, rep *check.ValidationReport, levels *ppp.Comparison) error {
	b, err := json.Marshal(validateJSON{ValidationReport: rep, Agrees: rep.Agrees(), PiLevels: levelsJSON(levels), Caution: render.Caution})
	if err != nil {
		return err
	}
	_, err = w.Write(append(b, '\n'))
	return err
}

func pct(hits, total int) string {
	if total == 0 {
		return "-"
	}
	return fmt.Sprintf("%.0f%%", 100*float64(hits)/float64(total))
}

func seriesVerdict(s check.SeriesResult) string {
	switch {
	case s.Error != "":
		return "error: " + s.Error
	case s.Pass && s.KnownMiss == "":
		return "pass"
	case s.Pass:
		return "pass (recorded as a known miss: update the record)"
	case s.KnownMiss != "":
		return "known miss"
	}
	return "MISS (not recorded)"
}

func writeValidateTable(w io.Writer, rep *check.ValidationReport) {
	if rep.Method != "" && rep.Method != huckel.MethodHuckel {
		fmt.Fprintf(w, "literature check set %s: parameter set %s, π method %s, calibration %s\n\n", rep.File, rep.Params, rep.Method, rep.Calibration)
	} else {
		fmt.Fprintf(w, "literature check set %s: parameter set %s, calibration %s\n\n", rep.File, rep.Params, rep.Calibration)
	}
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "category\thits\ttotal\trate\tknown misses\tnew misses\tunexpected hits\terrors")
	for _, c := range rep.Categories {
		fmt.Fprintf(tw, "%s\t%d\t%d\t%s\t%d\t%d\t%d\t%d\n", c.Category, c.Hits, c.Total, pct(c.Hits, c.Total), c.KnownMisses, c.Misses, c.UnexpectedHits, c.Errors)
	}
	tw.Flush()
	fmt.Fprintf(w, "\nadduct SMILES equal to the observed product: %d of %d cases that give one\n", rep.Products[0], rep.Products[1])
	if len(rep.Series) > 0 {
		fmt.Fprintln(w, "\nreactivity series (Spearman rank correlation of log k with the figure):")
		tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
		fmt.Fprintln(tw, "id\tseries\tfigure\tmembers\trho\tneeds\tverdict")
		for _, s := range rep.Series {
			fmt.Fprintf(tw, "%s\t%s\t%s\t%d\t%.3f\t%.2f\t%s\n", s.ID, s.Name, s.Figure, len(s.Points), s.Rho, s.MinRho, seriesVerdict(s))
		}
		tw.Flush()
	}
	var misses []check.CaseResult
	for _, c := range rep.Cases {
		if c.Status != check.StatusHit {
			misses = append(misses, c)
		}
	}
	if len(misses) > 0 {
		fmt.Fprintln(w, "\nmisses:")
		for _, c := range misses {
			fmt.Fprintf(w, "  %s [%s] %s + %s", c.ID, c.Status, c.Diene, c.Dienophile)
			if c.Activation != fmo.ActivateNone {
				fmt.Fprintf(w, " (%s)", c.Activation)
			}
			fmt.Fprintf(w, "\n    expected %s; got %s\n", c.Expected, c.Got)
			switch {
			case c.Error != "":
				fmt.Fprintf(w, "    error: %s\n", c.Error)
			case c.KnownMiss != "":
				fmt.Fprintf(w, "    why: %s\n", c.KnownMiss)
			}
		}
	}
	for _, s := range rep.Series {
		if s.KnownMiss != "" {
			fmt.Fprintf(w, "\n%s: %s\n", s.ID, s.KnownMiss)
		}
	}
	fmt.Fprintf(w, "\nSources and confidences are listed per case in the check set.\n")
}

// mdCell escapes a table cell for GitHub-flavoured Markdown.
func mdCell(s string) string {
	s = strings.ReplaceAll(s, "|", `\|`)
	return strings.ReplaceAll(s, "\n", " ")
}

func writeValidateMarkdown(w io.Writer, rep *check.ValidationReport) {
	fmt.Fprintf(w, "# Literature check: %s\n\n", mdCell(rep.File))
	if rep.Method != "" && rep.Method != huckel.MethodHuckel {
		fmt.Fprintf(w, "Parameter set `%s`, π method `%s`, calibration `%s`.\n\n", rep.Params, rep.Method, rep.Calibration)
	} else {
		fmt.Fprintf(w, "Parameter set `%s`, calibration `%s`.\n\n", rep.Params, rep.Calibration)
	}
	fmt.Fprintln(w, "| category | hits | total | rate | known misses | new misses | unexpected hits | errors |")
	fmt.Fprintln(w, "|---|---:|---:|---:|---:|---:|---:|---:|")
	for _, c := range rep.Categories {
		fmt.Fprintf(w, "| %s | %d | %d | %s | %d | %d | %d | %d |\n", c.Category, c.Hits, c.Total, pct(c.Hits, c.Total), c.KnownMisses, c.Misses, c.UnexpectedHits, c.Errors)
	}
	fmt.Fprintf(w, "\nAdduct SMILES equal to the observed product: %d of %d.\n", rep.Products[0], rep.Products[1])
	if len(rep.Series) > 0 {
		fmt.Fprint(w, "\n## Reactivity series\n\n")
		fmt.Fprintln(w, "| id | series | figure | members | Spearman ρ | needs | verdict |")
		fmt.Fprintln(w, "|---|---|---|---:|---:|---:|---|")
		for _, s := range rep.Series {
			fmt.Fprintf(w, "| %s | %s | %s | %d | %.3f | %.2f | %s |\n", s.ID, mdCell(s.Name), s.Figure, len(s.Points), s.Rho, s.MinRho, mdCell(seriesVerdict(s)))
		}
		for _, s := range rep.Series {
			if s.KnownMiss != "" {
				fmt.Fprintf(w, "\n%s: %s\n", s.ID, mdCell(s.KnownMiss))
			}
		}
	}
	fmt.Fprint(w, "\n## Cases\n\n")
	fmt.Fprintln(w, "| id | category | pair | activation | expected | got | status | note | source | confidence |")
	fmt.Fprintln(w, "|---|---|---|---|---|---|---|---|---|---|")
	for _, c := range rep.Cases {
		note := c.KnownMiss
		if c.Error != "" {
			note = c.Error
		}
		fmt.Fprintf(w, "| %s | %s | %s + %s | %s | %s | %s | %s | %s | %s | %s |\n", c.ID, c.Category, mdCell(c.Diene), mdCell(c.Dienophile),
			c.Activation, mdCell(c.Expected), mdCell(c.Got), c.Status, mdCell(note), mdCell(c.Source), c.Confidence)
	}
}

// piLevelFigures compares the HOMO and LUMO energies of both π methods with the bundled
// gas-phase ionisation energies and electron affinities (ppp.Compare).
func piLevelFigures(hp *huckel.Params, pp *ppp.Params) (*ppp.Comparison, error) {
	refs, err := presets.PiLevelReferences()
	if err != nil {
		return nil, err
	}
	c, err := ppp.Compare(refs, hp, pp)
	if err != nil {
		return nil, err
	}
	return &c, nil
}

// piLevelsJSON is the "pi_levels" block of the validate JSON.
type piLevelsJSON struct {
	Reference    string        `json:"reference"`
	PPPParams    string        `json:"ppp_params"`
	HuckelParams string        `json:"huckel_params"`
	PPPHOMO      levelStatJSON `json:"ppp_homo"`
	HuckelHOMO   levelStatJSON `json:"huckel_homo"`
	PPPLUMO      levelStatJSON `json:"ppp_lumo"`
	HuckelLUMO   levelStatJSON `json:"huckel_lumo"`
	Failed       []string      `json:"failed"`
	Note         string        `json:"note"`
}

type levelStatJSON struct {
	N          int `json:"n"`
	R2         num `json:"r2"`
	RMSE       num `json:"rmse_ev"`
	MeanSigned num `json:"mean_error_ev"`
	PearsonR2  num `json:"correlation_r2"`
}

const levelsReference = "presets/reference/pi-levels.yaml (gas-phase π ionisation energies and electron affinities, source per row)"

const levelsNote = "PPP: Koopmans orbital energies as computed, no fit. Hückel: x through a straight line fitted on these same points (in-sample, so its r² is the best a calibration can reach). r² = 1 − SS_res/SS_tot; correlation r² is the squared Pearson coefficient."

func levelStat(f ppp.FitStats) levelStatJSON {
	return levelStatJSON{N: f.N, R2: num(f.R2), RMSE: num(f.RMSE), MeanSigned: num(f.MeanSigned), PearsonR2: num(f.PearsonR2)}
}

func levelsJSON(c *ppp.Comparison) *piLevelsJSON {
	if c == nil {
		return nil
	}
	j := &piLevelsJSON{Reference: levelsReference, PPPParams: c.PPPParams, HuckelParams: c.HuckelParams,
		PPPHOMO: levelStat(c.PPPHOMO), HuckelHOMO: levelStat(c.HuckelHOMO), PPPLUMO: levelStat(c.PPPLUMO),
		HuckelLUMO: levelStat(c.HuckelLUMO), Failed: c.Failed, Note: levelsNote}
	if j.Failed == nil {
		j.Failed = []string{}
	}
	return j
}

// levelRows are the four comparison lines in print order.
func levelRows(c *ppp.Comparison) []struct {
	what string
	f    ppp.FitStats
	how  string
} {
	return []struct {
		what string
		f    ppp.FitStats
		how  string
	}{
		{"PPP HOMO vs −IE", c.PPPHOMO, "Koopmans, no fit"},
		{"Hückel HOMO vs −IE", c.HuckelHOMO, "line fitted on these points"},
		{"PPP LUMO vs −EA", c.PPPLUMO, "Koopmans, no fit"},
		{"Hückel LUMO vs −EA", c.HuckelLUMO, "line fitted on these points"},
	}
}

func writeLevelsTable(w io.Writer, c *ppp.Comparison) {
	fmt.Fprintf(w, "\nπ orbital energies against %s\n(PPP set %s, Hückel set %s):\n", levelsReference, c.PPPParams, c.HuckelParams)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "figure\tN\tr²\tRMSE/eV\tmean error/eV\tcorrelation r²\teV from")
	for _, r := range levelRows(c) {
		fmt.Fprintf(tw, "%s\t%d\t%.3f\t%.2f\t%+.2f\t%.3f\t%s\n", r.what, r.f.N, r.f.R2, r.f.RMSE, r.f.MeanSigned, r.f.PearsonR2, r.how)
	}
	tw.Flush()
	for _, f := range c.Failed {
		fmt.Fprintf(w, "  not computed: %s\n", f)
	}
	fmt.Fprintf(w, "%s\n\n%s\n", levelsNote, render.Caution)
}

func writeLevelsMarkdown(w io.Writer, c *ppp.Comparison) {
	fmt.Fprintf(w, "\n## π orbital energies\n\nAgainst %s; PPP set `%s`, Hückel set `%s`.\n\n", levelsReference, c.PPPParams, c.HuckelParams)
	fmt.Fprintln(w, "| figure | N | r² | RMSE/eV | mean error/eV | correlation r² | eV from |")
	fmt.Fprintln(w, "|---|---:|---:|---:|---:|---:|---|")
	for _, r := range levelRows(c) {
		fmt.Fprintf(w, "| %s | %d | %.3f | %.2f | %+.2f | %.3f | %s |\n", r.what, r.f.N, r.f.R2, r.f.RMSE, r.f.MeanSigned, r.f.PearsonR2, r.how)
	}
	for _, f := range c.Failed {
		fmt.Fprintf(w, "\nNot computed: %s\n", mdCell(f))
	}
	fmt.Fprintf(w, "\n%s\n\n%s\n", levelsNote, render.Caution)
}
