package htmlreport_test

import (
	"bytes"
	"fmt"
	"strings"

	"cyclopair/cmd/cyclopair/internal/htmlreport"
	"cyclopair/cmd/cyclopair/internal/render"
	"cyclopair/fmo"
	"cyclopair/presets"
)

// Write a one-row report for cyclopentadiene + maleic anhydride: the page carries the
// caution, the table and pictures, with nothing fetched from outside.
func ExampleNew() {
	p, _ := presets.Params(presets.DefaultParams)
	cal, _ := presets.Calibration(p)
	opts := fmo.NewOptions(p, cal, cal.Name)
	d, _ := fmo.NewPartner("cyclopentadiene", "C1=CC=CC1", fmo.RoleDiene, opts)
	e, _ := fmo.NewPartner("maleic anhydride", "O=C1OC(=O)C=C1", fmo.RoleDienophile, opts)
	pair, _ := fmo.Analyze(d, e, opts)

	var buf bytes.Buffer
	w := htmlreport.New(&buf, render.Report{Title: "one pair", Params: p.Name, Calibration: cal.Name},
		htmlreport.Config{Options: opts, Calibration: &cal, Kind: "pair", NoValidation: true})
	_ = w.WriteRow(render.Row{Rank: 1, Pair: pair})
	_ = w.Close(render.Summary{Shown: 1})

	page := buf.String()
	fmt.Println(strings.HasPrefix(page, "<!DOCTYPE html>"), strings.Contains(page, render.Caution))
	fmt.Println("scripts:", strings.Count(page, "<script"), "pictures:", strings.Count(page, "<svg "))
	// Output:
	// true true
	// scripts: 0 pictures: 6
}
