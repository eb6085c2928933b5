package main

import (
	"fmt"
	"io"
	"strings"
	"text/tabwriter"

	"cyclopair/cmd/cyclopair/internal/render"
	"cyclopair/fmo"
	"cyclopair/huckel"
)

// pairTableRows is how many orientations the table shows; JSON always has all of them.
const pairTableRows = 10

// pairCaution closes every human-readable pair report: the project's one caution sentence
// (render.Caution), so every output says the same.
const pairCaution = "caution: " + render.Caution

func yesNo(b bool) string {
	if b {
		return "yes"
	}
	return "no"
}

// writePairTable prints one analysed pair for people. Every number is formatted with a fixed
// precision and nothing is printed in map order, so the output is deterministic.
func writePairTable(s *streams, p *fmo.Pair, calDetail string) {
	w := render.TerminalSafe(s.out) // names and SMILES come from the user
	named := func(name, smi string) string {
		if name == "" || name == smi {
			return smi
		}
		return name + " (" + smi + ")"
	}
	fmt.Fprintf(w, "pair: %s + %s (activation: %s)\n", named(p.DieneName, p.Diene), named(p.DienophileName, p.Dienophile), p.Activation)
	if p.ActivatedDienophile != "" {
		fmt.Fprintf(w, "activated dienophile: %s\n", p.ActivatedDienophile)
	}
	if e := p.Activated; e != nil {
		fmt.Fprintf(w, "activation effect (vs the free dienophile): LUMO lowered by %.3f |β| (%s eV); c²(Cβ) − c²(Cα) of the LUMO %.3f → %.3f; c² at the carbonyl carbon %.3f → %.3f; endo term %+.5f |β|\n",
			e.LUMOLowering.Beta, evText(p, e.LUMOLowering.EV), e.BetaAsymmetryFree, e.BetaAsymmetry, e.CarbonylLUMOFree, e.CarbonylLUMO, e.EndoChange)
	}
	if p.Method != "" && p.Method != huckel.MethodHuckel {
		fmt.Fprintf(w, "parameters: %s (perception and k), π method %s\n", p.Params, p.Method)
	} else {
		fmt.Fprintf(w, "parameters: %s\n", p.Params)
	}
	if calDetail == "" {
		calDetail = p.Calibration
	}
	fmt.Fprintf(w, "calibration: %s\n", calDetail)
	fmt.Fprintf(w, "gap normal  LUMO(dienophile) − HOMO(diene): %.3f |β|  %s eV\n", p.GapNormal.Beta, evText(p, p.GapNormal.EV))
	fmt.Fprintf(w, "gap inverse LUMO(diene) − HOMO(dienophile): %.3f |β|  %s eV\n", p.GapInverse.Beta, evText(p, p.GapInverse.EV))
	fmt.Fprintf(w, "demand: %s (Sustmann type %s; neutral/type II when the gaps differ by less than %.3f |β|)\n",
		p.Demand, p.SustmannType, p.DemandThreshold)
	fmt.Fprintf(w, "allowed (supra–supra, thermal): %s: %s\n", yesNo(p.Allowed), p.AllowedReason)
	for _, l := range rateLines(p) {
		fmt.Fprintln(w, l)
	}
	best := p.Orientations[0]
	rel := func(x float64) string {
		if best.FrontierTerm <= 0 {
			return "-"
		}
		return fmt.Sprintf("%.1f%%", 100*x/best.FrontierTerm)
	}
	label := best.Label
	if label == "" {
		label = "no ortho/meta/para label"
	}
	fmt.Fprintf(w, "preferred: %s %s, %s; product %s\n", best.Kind, best.Site, label, best.Product)
	for _, sp := range best.StereoProducts {
		mark := ""
		if sp.Preferred {
			mark = " (preferred)"
		}
		fmt.Fprintf(w, "  %s adduct%s: %s\n", sp.Approach, mark, sp.SMILES)
	}
	for _, st := range best.FollowUp {
		step := st.Kind
		if step == fmo.StepRetroDA {
			step = "retro-Diels–Alder"
		}
		fmt.Fprintf(w, "  then %s, losing %s (%s): %s\n", step, st.LostName, st.Lost, st.Product)
	}
	if len(best.FollowUp) > 0 {
		fmt.Fprintf(w, "  isolated product: %s\n", best.IsolatedProduct)
	}
	fmt.Fprintf(w, "regioselectivity: %s (margin %.5f |β| = %s of the frontier term; clear ≥ %.0f%%, slight ≥ %.0f%%)\n",
		p.RegioConfidence, p.RegioMargin, rel(p.RegioMargin), 100*p.RegioThresholds[0], 100*p.RegioThresholds[1])
	if p.SiteMargin > 0 {
		fmt.Fprintf(w, "site margin: %.5f |β| to the best different adduct at other reacting units\n", p.SiteMargin)
	}
	if p.EndoNote != "" {
		fmt.Fprintf(w, "endo: %s (%s)\n", p.Endo, p.EndoNote)
	} else {
		fmt.Fprintf(w, "endo: %s (secondary term %.5f |β| = %s of the frontier term; yes ≥ %.0f%%, weak ≥ %.0f%%; γ_s = %.2f β)\n",
			p.Endo, best.EndoOverlap, rel(best.EndoOverlap), 100*p.EndoThresholds[0], 100*p.EndoThresholds[1], p.SecondaryBeta)
	}
	charge := "off"
	if p.ChargeTermOn {
		charge = "on"
	}
	if len(p.Confidence) > 0 {
		fmt.Fprintln(w, "check set (bundled literature cases, default options):")
		for _, n := range p.Confidence {
			fmt.Fprintf(w, "  - %s\n", n.Text)
		}
	}
	fmt.Fprintf(w, "score: frontier + charge (%s) − %.2f·localization − %.2f·controlling gap; forming bonds γ = %.2f β\n", charge, p.LocalizationWeight, p.GapWeight, p.FormingBeta)

	fmt.Fprintln(w)
	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', 0)
	fmt.Fprintln(tw, "rank\tsite\tlabel\tscore\tfrontier\tnormal\tinverse\tlocalization\tendo\tmethod\tproduct")
	for i, o := range p.Orientations {
		if i >= pairTableRows {
			break
		}
		mark := ""
		if o.Preferred {
			mark = "*"
		}
		lbl := o.Label
		if lbl == "" {
			lbl = "-"
		}
		fmt.Fprintf(tw, "%d%s\t%s\t%s\t%.5f\t%.5f\t%.5f\t%.5f\t%.4f\t%.5f\t%s\t%s\n",
			i+1, mark, o.Site, lbl, o.Score, o.FrontierTerm, o.NormalTerm, o.InverseTerm, o.Localization, o.EndoOverlap, o.Method, o.Product)
	}
	tw.Flush()
	if n := len(p.Orientations) - pairTableRows; n > 0 {
		fmt.Fprintf(w, "... %d more orientations (--format json lists all)\n", n)
	}
	writeSideChannels(w, p, p.SideChannels)
	if len(p.Warnings) > 0 {
		fmt.Fprintln(w, "warnings:")
		for _, x := range p.Warnings {
			fmt.Fprintf(w, "  - %s\n", x)
		}
	}
	fmt.Fprintln(w, pairCaution)
	fmt.Fprintln(w)
}

// evText formats an eV figure of p with the decimals its calibration supports
// (Pair.EVDecimals; huckel.Calibration.GapDecimals gives the rule).
func evText(p *fmo.Pair, ev float64) string {
	return fmt.Sprintf("%.*f", p.EVDecimals, ev)
}

func writeSideChannels(w io.Writer, p *fmo.Pair, sc []fmo.SideChannel) {
	if len(sc) == 0 {
		return
	}
	fmt.Fprintln(w, "side channels:")
	for _, c := range sc {
		verdict := "does not compete"
		if c.Competes {
			verdict = "COMPETES"
		}
		if note := strings.TrimSpace(c.Note); note != "" {
			fmt.Fprintf(w, "  - %s: %s\n", c.Kind, note)
			continue
		}
		fmt.Fprintf(w, "  - %s: gap %.3f |β| (%s eV), margin %+.3f |β|: %s\n", c.Kind, c.Gap.Beta, evText(p, c.Gap.EV), c.Margin, verdict)
	}
}
