package main

import (
	"cyclopair/cmd/cyclopair/internal/render"
	"cyclopair/fmo"
	"cyclopair/huckel"
)

// pairSDF is the --format sdf output of 'cyclopair pair': one SD record per activation
// variant, the product with 2D coordinates and the figures as data items (render.SDF).
type pairSDF struct {
	w render.Writer
	n int
}

func newPairSDF(s *streams, fo *fmo.Options, cal huckel.Calibration) *pairSDF {
	w, err := render.New(render.SDF, s.out, render.Report{Params: fo.Params.Name, Calibration: cal.Name}, render.Layout{})
	if err != nil {
		panic(err) // render.SDF is always known
	}
	return &pairSDF{w: w}
}

// add writes one analysed variant (rows are numbered in the order given).
func (p *pairSDF) add(pair *fmo.Pair) error {
	p.n++
	return p.w.WriteRow(render.Row{Rank: p.n, Pair: pair})
}
