package render

import (
	"bufio"

	"cyclopair/fmo"
	"fmt"
	"io"
	"strconv"
	"strings"
	"unicode/utf8"
)

// tableCol is one column of the text table: header, width, right alignment.
type tableCol struct {
	head  string
	width int
	right bool
}

type tableWriter struct {
	w            *bufio.Writer
	cols         []tableCol
	err          error
	extrapolated int // rows whose rate lies outside the model's applicability domain
}

func newTable(w io.Writer, rep Report, lay Layout) (*tableWriter, error) {
	t := &tableWriter{w: bufio.NewWriter(w)}
	t.cols = []tableCol{
		{"rank", 4, true},
		{"diene", max(lay.DieneWidth, 5), false},
		{"dienophile", max(lay.DienophileWidth, 10), false},
		{"activation", max(lay.ActivationWidth, 10), false},
		{"log k_rel", 9, true},
		{"demand", 7, false},
		{"type", 4, false},
		{"gap/|β|", 7, true},
		{"gap/eV", 6, true},
		{"orient", 6, false},
		{"margin/|β|", 10, true},
		{"regio", 13, false},
		{"endo", 4, false},
		{"allowed", 7, false},
		{"warn", 4, true},
		{"product", 0, false},
	}
	if rep.Title != "" {
		t.printf("# cyclopair screen: %s\n", orDash(rep.Title))
	}
	for _, l := range headerLines(rep) {
		t.printf("# %s\n", l)
	}
	t.printf("# %s\n", Caution)
	heads := make([]string, len(t.cols))
	for i, c := range t.cols {
		heads[i] = c.head
	}
	t.line(heads)
	return t, t.err
}

func (t *tableWriter) printf(format string, args ...any) {
	if t.err != nil {
		return
	}
	_, t.err = fmt.Fprintf(t.w, format, args...)
}

// line writes cells padded to the column widths (widths count runes, not bytes, so "β" and
// "−" align).
func (t *tableWriter) line(cells []string) {
	var b strings.Builder
	for i, c := range t.cols {
		s := cells[i]
		pad := c.width - utf8.RuneCountInString(s)
		last := i == len(t.cols)-1
		if i > 0 {
			b.WriteString("  ")
		}
		if c.right && pad > 0 {
			b.WriteString(strings.Repeat(" ", pad))
		}
		b.WriteString(s)
		if !c.right && pad > 0 && !last {
			b.WriteString(strings.Repeat(" ", pad))
		}
	}
	t.printf("%s\n", strings.TrimRight(b.String(), " "))
}

func (t *tableWriter) WriteRow(r Row) error {
	p := r.Pair
	g := Controlling(p)
	if Extrapolated(p.Rate) {
		t.extrapolated++
	}
	label, product, margin, conf := "-", "-", "-", orDash(p.RegioConfidence)
	if o := best(p); o != nil {
		label = orDash(o.Label)
		product = orDash(o.Product)
		margin = f3(p.RegioMargin)
	}
	t.line([]string{
		strconv.Itoa(r.Rank),
		orDash(p.DieneName),
		orDash(p.DienophileName),
		orDash(p.Activation),
		rateCell(p.Rate, "-"),
		orDash(p.Demand),
		orDash(p.SustmannType),
		f3(g.Beta),
		fixed(g.EV, p.EVDecimals),
		label,
		margin,
		conf,
		orDash(p.Endo),
		yesNo(p.Allowed),
		strconv.Itoa(len(p.Warnings)),
		product,
	})
	return t.err
}

func (t *tableWriter) Close(s Summary) error {
	if t.extrapolated > 0 {
		t.printf("# %s\n", extrapolatedText(t.extrapolated))
	}
	t.printf("# %s\n", summaryText(s))
	if t.err == nil {
		t.err = t.w.Flush()
	}
	return t.err
}

// rateCell is the predicted log10 k relative to the rate model's reference reaction, two
// decimals, or dash when no rate model was applied; a value outside the model's
// applicability domain carries ExtrapolatedMark.
func rateCell(r *fmo.RateEstimate, dash string) string {
	if r == nil {
		return dash
	}
	if Extrapolated(r) {
		return f2(r.Log10KRel) + ExtrapolatedMark
	}
	return f2(r.Log10KRel)
}

// ExtrapolatedMark follows a rate cell (table, Markdown) outside the rate model's
// applicability domain; the footer says what it means.
const ExtrapolatedMark = "*"

// Extrapolated reports whether a rate lies outside the model's applicability domain.
func Extrapolated(r *fmo.RateEstimate) bool { return r != nil && !r.InDomain }

// extrapolatedText is the footer line of the table and Markdown formats.
func extrapolatedText(n int) string {
	return fmt.Sprintf("%s %d of the rates shown are extrapolated: outside the rate model's applicability domain (a negative or first-order frontier gap, a descriptor outside its fitted range, or a high leverage; the rate_domain_note CSV column and the JSON rate.domain_note say which); they still rank by the point estimate, with a widened interval", ExtrapolatedMark, n)
}
