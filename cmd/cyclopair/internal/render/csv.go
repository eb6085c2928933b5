package render

import (
	"encoding/csv"
	"io"
	"strconv"
	"strings"
)

// csvHeader is the first CSV record. Energies are in units of |β| (…_beta) and eV (…_ev).
var csvHeader = []string{
	"rank", "pair_number", "diene_name", "diene", "dienophile_name", "dienophile", "activation",
	"demand", "sustmann_type", "gap_beta", "gap_ev", "gap_normal_beta", "gap_normal_ev",
	"gap_inverse_beta", "gap_inverse_ev", "label", "product", "stabilization_beta",
	"regio_margin_beta", "regio_confidence", "endo", "allowed", "warnings_count", "warnings",
	"params", "calibration", "caution", "log10_k_rel", "log10_k_rel_lo", "log10_k_rel_hi",
	"rate_in_domain", "rate_domain_note", // the rate model's applicability domain (empty without a rate)
	"diene_notes", "dienophile_notes", // the partners' notes from the substrate list (extra columns, SD data items)
}

type csvWriter struct {
	w   *csv.Writer
	rep Report
}

func newCSV(w io.Writer, rep Report) (*csvWriter, error) {
	c := &csvWriter{w: csv.NewWriter(w), rep: rep}
	if err := c.w.Write(csvHeader); err != nil {
		return nil, err
	}
	return c, nil
}

func (c *csvWriter) WriteRow(r Row) error {
	return c.w.Write(csvRecord(r))
}

// csvRecord is the row's fields in csvHeader order (the SD writer uses them too).
func csvRecord(r Row) []string {
	p := r.Pair
	g := Controlling(p)
	label, product, stab := "", "", ""
	if o := best(p); o != nil {
		label, product, stab = o.Label, o.Product, f3(o.Stabilization)
	}
	t := SafeCell // text cells only: numbers keep their sign
	rec := []string{
		strconv.Itoa(r.Rank), pairNumber(r.Number), t(p.DieneName), t(p.Diene), t(p.DienophileName), t(p.Dienophile),
		t(p.Activation), p.Demand, p.SustmannType, f3(g.Beta), f2(g.EV),
		f3(p.GapNormal.Beta), f2(p.GapNormal.EV), f3(p.GapInverse.Beta), f2(p.GapInverse.EV),
		label, t(product), stab, f3(p.RegioMargin), p.RegioConfidence, p.Endo,
		strconv.FormatBool(p.Allowed), strconv.Itoa(len(p.Warnings)),
		t(strings.Join(p.Warnings, " | ")), t(p.Params), t(p.Calibration), Caution, "", "", "", "", "",
	}
	if p.Rate != nil {
		n := len(rec)
		rec[n-5], rec[n-4], rec[n-3] = f3(p.Rate.Log10KRel), f3(p.Rate.Interval[0]), f3(p.Rate.Interval[1])
		rec[n-2], rec[n-1] = strconv.FormatBool(p.Rate.InDomain), t(p.Rate.DomainNote)
	}
	return append(rec, t(p.DieneNotes), t(p.DienophileNotes))
}

func (c *csvWriter) Close(Summary) error {
	c.w.Flush()
	return c.w.Error()
}

func pairNumber(n int64) string {
	if n <= 0 {
		return ""
	}
	return strconv.FormatInt(n, 10)
}

// SafeCell neutralises a CSV text cell that a spreadsheet would read as a formula: a cell
// starting with =, +, -, @, a tab or a carriage return gets a leading apostrophe, which
// spreadsheets show as text (OWASP, "CSV Injection", owasp.org/www-community/attacks/
// CSV_Injection). Only text cells (names, SMILES, notes, warnings) go through it; numeric
// cells are written as they are, so −0.5 stays a number. A consumer that wants the original
// text strips one leading apostrophe from a text cell that starts with "'" followed by one
// of those characters.
func SafeCell(s string) string {
	if s == "" {
		return s
	}
	switch s[0] {
	case '=', '+', '-', '@', '\t', '\r':
		return "'" + s
	}
	return s
}
