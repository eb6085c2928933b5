package render_test

import (
	"os"

	"cyclopair/cmd/cyclopair/internal/render"
	"cyclopair/fmo"
)

// A Markdown report of one hand-made row (numbers invented for the example).
func ExampleNew() {
	w, _ := render.New(render.Markdown, os.Stdout, render.Report{Params: "streitwieser1961", Calibration: "default-streitwieser1961", RankBy: "normal_gap"}, render.Layout{})
	_ = w.WriteRow(render.Row{Rank: 1, Pair: &fmo.Pair{
		DieneName: "isoprene", DienophileName: "methyl acrylate", Activation: "none",
		Demand: "normal", SustmannType: "I", GapNormal: fmo.Energy{Beta: 0.9, EV: 8.2}, GapInverse: fmo.Energy{Beta: 1.7, EV: 10.4},
		Orientations: []fmo.Orientation{{Label: "para", Product: "CC1=CCC(CC1)C(=O)OC"}},
		RegioMargin:  0.011, RegioConfidence: "clear", Endo: "weak", Allowed: true, EVDecimals: 1,
	}})
	_ = w.Close(render.Summary{Pairs: 1, Passed: 1, Shown: 1})
	// Output:
	// ## cyclopair screen
	//
	// - **Parameter set:** streitwieser1961
	// - **Calibration:** default-streitwieser1961
	// - **Ranked by:** normal\_gap (LUMO(dienophile) − HOMO(diene), smallest first)
	//
	// > **Caution.** Estimates for planning only, not a safety assessment: check the SDS, a hazard review and local rules before any lab work.
	//
	// | Rank | Diene | Dienophile | Activation | log k_rel | Demand | Sustmann type | Gap (\|β\|) | Gap (eV) | Orientation | Product | Regio margin (\|β\|) | Regio confidence | Endo | Allowed | Warnings |
	// |---:|---|---|---|---:|---|---|---:|---:|---|---|---:|---|---|---|---:|
	// | 1 | isoprene | methyl acrylate | none | – | normal | I | 0.900 | 8.2 | para | `CC1=CCC(CC1)C(=O)OC` | 0.011 | clear | weak | yes | 0 |
	//
	// 1 pairs scored, 1 passed the filters, 1 shown.
}
