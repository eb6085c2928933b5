package main

import (
	"cyclopair/cmd/cyclopair/internal/htmlreport"
	"cyclopair/cmd/cyclopair/internal/render"
	"cyclopair/fmo"
	"cyclopair/huckel"
)

// pairHTML is the --format html output of 'cyclopair pair': one self-contained page with
// every activation variant as a row, pictures of the pair and of the frontier orbitals, the
// parameter set, the calibration and the check-set accuracy (package htmlreport).
type pairHTML struct {
	w *htmlreport.Writer
	n int
}

func newPairHTML(s *streams, diene, dienophile *fmo.Partner, fo *fmo.Options, act *fmo.ActivateOptions, cal huckel.Calibration) *pairHTML {
	rep := render.Report{
		Title:             nameOrSMILES(diene) + " + " + nameOrSMILES(dienophile),
		Params:            fo.Params.Name,
		Calibration:       cal.Name,
		CalibrationDetail: cal.Detail(),
	}
	figures := 0 // default: the first few variants get pictures
	return &pairHTML{w: htmlreport.New(s.out, rep, htmlreport.Config{
		Options: fo, Activate: act, Calibration: &cal, Figures: figures, Kind: "pair",
	})}
}

// add writes one analysed variant (rows are numbered in the order given).
func (h *pairHTML) add(p *fmo.Pair) error {
	h.n++
	return h.w.WriteRow(render.Row{Rank: h.n, Pair: p})
}

// close writes the page.
func (h *pairHTML) close() error { return h.w.Close(render.Summary{Shown: h.n}) }

func nameOrSMILES(p *fmo.Partner) string {
	if p.Name != "" {
		return p.Name
	}
	return p.SMILES
}
