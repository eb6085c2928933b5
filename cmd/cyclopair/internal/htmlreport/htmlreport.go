// Package htmlreport writes a screen or pair analysis as one self-contained HTML file to
// share: the ranked table, the energy-level diagram, pictures of the top pairs (the pair in
// its preferred orientation and the frontier orbitals of each partner), the parameter set,
// the calibration, the accuracy of the method on the literature check set, and the caution
// that the results are planning estimates.
//
// The file has inline CSS and inline SVG only: no scripts, no fonts, images or style sheets
// fetched from anywhere, so it opens offline and can be mailed or archived as is. It is
// written as XHTML-compatible HTML5 (every element closed, only XML entities), so an XML
// decoder reads it as well as a browser; every text that comes from the user (names, SMILES,
// file names, warnings) is escaped with encoding/xml.EscapeText. The CSS prints well (no
// backgrounds needed, figures kept whole on a page) and uses one dark hue plus patterns, so
// the page reads in grey print and for colour-blind readers.
//
// The Writer has the same two methods as the render package's writers (WriteRow, Close), so
// a command switches to HTML by constructing this Writer instead. Rows are kept until Close
// because the page puts the table after the summary sections; memory grows with the number
// of rows (use --top for big screens).
package htmlreport

import (
	"bytes"
	"encoding/xml"
	"fmt"
	"io"
	"regexp"
	"strconv"
	"strings"

	"cyclopair/cmd/cyclopair/internal/draw"
	"cyclopair/cmd/cyclopair/internal/render"
	"cyclopair/fmo"
	"cyclopair/fmo/check"
	"cyclopair/huckel"
)

// DefaultFigures is the number of top pairs that get pictures when Config.Figures is 0.
const DefaultFigures = 3

// Config is what the report needs besides the rows.
type Config struct {
	// Options are the analysis options the rows were computed with. They rebuild the
	// partners of the top pairs for the pictures and name the parameter set. Required.
	Options *fmo.Options
	// Activate are the activation options the rows were computed with (nil: defaults).
	Activate *fmo.ActivateOptions
	// Calibration is the x → eV calibration, described in its own section; nil leaves only
	// the name from the report header.
	Calibration *huckel.Calibration
	// Figures is how many top rows get pictures (0: DefaultFigures; negative: none).
	Figures int
	// Validation is the literature check-set run to summarise. When nil, Close runs the
	// bundled check set (check.BundledCheckSet, a few tens of milliseconds) with Options, so the
	// accuracy shown is that of the parameter set and options of this report.
	Validation *check.ValidationReport
	// NoValidation leaves the check set out (the section then says it was not run).
	NoValidation bool
	// Diagram, if set, draws the energy-level diagram (inline SVG) of the rows.
	Diagram func(rows []render.Row) ([]byte, error)
	// Kind is "screen" or "pair"; it only changes headings.
	Kind string
}

// Writer collects rows and writes the page on Close.
type Writer struct {
	w    io.Writer
	rep  render.Report
	cfg  Config
	rows []render.Row
}

// New returns a Writer for rep. It panics if cfg.Options is nil (programmer error).
func New(w io.Writer, rep render.Report, cfg Config) *Writer {
	if cfg.Options == nil || cfg.Options.Params == nil {
		panic("htmlreport.New: Config.Options with Params is required")
	}
	if cfg.Figures == 0 {
		cfg.Figures = DefaultFigures
	}
	if cfg.Kind == "" {
		cfg.Kind = "screen"
	}
	return &Writer{w: w, rep: rep, cfg: cfg}
}

// WriteRow keeps one row for the page.
func (w *Writer) WriteRow(r render.Row) error {
	if r.Pair == nil {
		panic("htmlreport: row without a Pair")
	}
	w.rows = append(w.rows, r)
	return nil
}

// Close writes the whole page.
func (w *Writer) Close(s render.Summary) error {
	var b page
	w.write(&b, s)
	_, err := w.w.Write(b.Bytes())
	return err
}

// page is a buffer with escaping helpers.
type page struct{ bytes.Buffer }

// t writes escaped text.
func (b *page) t(s string) { _ = xml.EscapeText(b, []byte(s)) }

// el writes <tag>escaped text</tag>; attrs is trusted markup from this package.
func (b *page) el(tag, attrs, text string) {
	b.WriteString("<" + tag)
	if attrs != "" {
		b.WriteString(" " + attrs)
	}
	b.WriteString(">")
	b.t(text)
	b.WriteString("</" + tag + ">")
}

func (b *page) raw(s string) { b.WriteString(s) }

func f(v float64, prec int) string {
	s := strconv.FormatFloat(v, 'f', prec, 64)
	if z := strconv.FormatFloat(0, 'f', prec, 64); s == "-"+z {
		return z
	}
	return s
}

func (w *Writer) title() string {
	if w.rep.Title != "" {
		return "cyclopair " + w.cfg.Kind + ": " + w.rep.Title
	}
	if w.rep.Source != "" {
		return "cyclopair " + w.cfg.Kind + ": " + w.rep.Source
	}
	return "cyclopair " + w.cfg.Kind + " report"
}

func (w *Writer) write(b *page, s render.Summary) {
	b.raw("<!DOCTYPE html>\n<html xmlns=\"http://www.w3.org/1999/xhtml\" lang=\"en\">\n<head>\n<meta charset=\"utf-8\"/>\n")
	b.raw("<meta name=\"viewport\" content=\"width=device-width, initial-scale=1\"/>\n")
	b.raw("<link rel=\"icon\" href=\"data:,\"/>\n")
	b.el("title", "", w.title())
	b.raw("\n<style>\n" + css + "</style>\n</head>\n<body>\n")

	b.el("h1", "", w.title())
	b.raw("\n")
	w.caution(b)
	b.raw(`<nav class="small">Contents: <a href="#summary">what was analysed</a> · <a href="#ranking">table</a> · `)
	if w.cfg.Diagram != nil && len(w.rows) > 0 {
		b.raw(`<a href="#levels">levels</a> · `)
	}
	if min(w.cfg.Figures, len(w.rows)) > 0 {
		b.raw(`<a href="#pictures">pictures</a> · `)
	}
	if w.hasNotes() {
		b.raw(`<a href="#notes">notes</a> · `)
	}
	b.raw(`<a href="#parameters">parameters</a> · <a href="#calibration">calibration</a> · <a href="#accuracy">accuracy</a></nav>` + "\n")
	w.summary(b, s)
	w.table(b)
	w.diagram(b)
	w.figures(b)
	w.notes(b)
	w.params(b)
	w.calibration(b)
	w.validation(b)
	b.raw("<footer>\n")
	w.caution(b)
	b.el("p", `class="small"`, "Written by cyclopair. Energies are Hückel x values (E = α + xβ, β < 0, bonding levels have x > 0) and eV through the stated linear calibration; stabilisation and gaps are in units of |β|.")
	b.raw("\n</footer>\n</body>\n</html>\n")
}

func (w *Writer) caution(b *page) {
	b.raw(`<div class="caution" role="note"><strong>Caution.</strong> `)
	b.t(render.Caution + " These are Hückel and frontier-orbital estimates for planning: they rank and explain, they do not predict yields, rates or hazards. Defer to the SDS, a hazard review, local rules and licensed practice.")
	b.raw("</div>\n")
}

func (w *Writer) summary(b *page, s render.Summary) {
	b.raw("<section id=\"summary\">\n<h2>What was analysed</h2>\n<dl>\n")
	item := func(k, v string) {
		if v == "" {
			return
		}
		b.el("dt", "", k)
		b.el("dd", "", v)
		b.raw("\n")
	}
	item("Input", w.rep.Source)
	item("Parameter set", w.rep.Params)
	cal := w.rep.Calibration
	if w.rep.CalibrationDetail != "" {
		cal += " — " + w.rep.CalibrationDetail
	}
	item("Calibration", cal)
	if w.rep.RankBy != "" && w.rep.RankBy != "none" {
		item("Ranked by", w.rep.RankBy)
	}
	if len(w.rep.Filters) > 0 {
		item("Filters", strings.Join(w.rep.Filters, "; "))
	}
	item("Shard", w.rep.Shard)
	if s.Pairs > 0 || s.Shown > 0 || s.Failed > 0 {
		txt := fmt.Sprintf("%d pairs scored, %d passed the filters, %d shown", s.Pairs, s.Passed, len(w.rows))
		if s.Pairs == 0 {
			txt = fmt.Sprintf("%d shown", len(w.rows))
		}
		if s.Failed > 0 {
			txt += fmt.Sprintf("; %d inputs failed (listed on stderr of the run)", s.Failed)
		}
		if s.Canceled {
			txt += "; the run was interrupted, so the list is incomplete"
		}
		item("Result", txt)
	}
	b.raw("</dl>\n</section>\n")
}

func (w *Writer) table(b *page) {
	b.raw("<section id=\"ranking\">\n")
	if w.cfg.Kind == "pair" {
		b.el("h2", "", "Result")
	} else {
		b.el("h2", "", "Ranked pairs")
	}
	b.raw("\n")
	if len(w.rows) == 0 {
		b.el("p", "", "No pair passed the filters.")
		b.raw("\n</section>\n")
		return
	}
	b.raw("<table class=\"rank\">\n<thead><tr>")
	for _, h := range []string{"#", "4π partner", "2π partner", "activation", "demand", "gap |β|", "gap eV", "preferred site", "regio", "stabil. |β|", "regio margin", "endo", "allowed", "notes"} {
		b.el("th", `scope="col"`, h)
	}
	b.raw("</tr></thead>\n<tbody>\n")
	for _, r := range w.rows {
		p := r.Pair
		g := render.Controlling(p)
		site, label, stab := "—", "", ""
		if len(p.Orientations) > 0 {
			o := p.Orientations[0]
			site, label, stab = o.Site, o.Label, f(o.Stabilization, 4)
		}
		b.raw("<tr>")
		b.el("td", `class="num"`, strconv.Itoa(r.Rank))
		b.el("td", "", nameOr(p.DieneName, p.Diene))
		b.el("td", "", nameOr(p.DienophileName, p.Dienophile))
		b.el("td", "", p.Activation)
		b.el("td", "", p.Demand+" ("+p.SustmannType+")")
		b.el("td", `class="num"`, f(g.Beta, 3))
		b.el("td", `class="num"`, f(g.EV, p.EVDecimals))
		b.el("td", `class="smiles"`, site)
		b.el("td", "", orDash(label)+" · "+orDash(p.RegioConfidence))
		b.el("td", `class="num"`, stab)
		b.el("td", `class="num"`, f(p.RegioMargin, 4))
		b.el("td", "", p.Endo)
		b.el("td", "", yesNo(p.Allowed))
		notes := ""
		if n := len(p.Warnings); n > 0 {
			notes = fmt.Sprintf("%d warning", n)
			if n > 1 {
				notes += "s"
			}
		}
		for _, sc := range p.SideChannels {
			if sc.Competes {
				if notes != "" {
					notes += "; "
				}
				notes += "side channel: " + sc.Kind
			}
		}
		b.el("td", "", notes)
		b.raw("</tr>\n")
	}
	b.raw("</tbody>\n</table>\n")
	b.el("p", `class="small"`, "gap: the controlling frontier gap (normal demand: LUMO(2π) − HOMO(4π); inverse: LUMO(4π) − HOMO(2π)); Sustmann type in brackets. Stabilisation: second-order perturbation energy of the preferred orientation, larger is better. Site atoms are 1-based positions in each SMILES.")
	b.raw("\n</section>\n")
}

func (w *Writer) diagram(b *page) {
	if w.cfg.Diagram == nil || len(w.rows) == 0 {
		return
	}
	svg, err := w.cfg.Diagram(w.rows)
	b.raw("<section id=\"levels\">\n")
	b.el("h2", "", "Frontier levels")
	b.raw("\n")
	if err != nil {
		b.el("p", `class="error"`, "The energy-level diagram could not be drawn: "+err.Error())
	} else {
		b.raw("<figure class=\"diagram\">\n" + string(inlineSVG(svg, "levels")) + "</figure>\n")
	}
	b.raw("</section>\n")
}

func (w *Writer) figures(b *page) {
	n := min(w.cfg.Figures, len(w.rows))
	if n <= 0 {
		return
	}
	b.raw("<section id=\"pictures\">\n")
	b.el("h2", "", "Pictures of the top pairs")
	b.raw("\n")
	b.el("p", `class="small"`, "Circle area ∝ c², the π density an orbital puts on the atom; solid dark circles: c > 0; white hatched circles: c < 0. Dashed lines: the two forming bonds of the preferred orientation; dotted: the endo secondary contact.")
	b.raw("\n")
	for i := 0; i < n; i++ {
		r := w.rows[i]
		p := r.Pair
		b.raw("<article class=\"pair\">\n")
		b.el("h3", "", fmt.Sprintf("#%d %s + %s (%s)", r.Rank, nameOr(p.DieneName, p.Diene), nameOr(p.DienophileName, p.Dienophile), p.Activation))
		b.raw("\n")
		figs, err := w.pictures(p, fmt.Sprintf("r%d", i+1))
		if err != nil {
			b.el("p", `class="error"`, "Pictures could not be drawn: "+err.Error())
			b.raw("\n")
		}
		for _, fg := range figs {
			// the SVG carries its own heading and caption; the figure only groups it
			b.raw("<figure class=\"" + fg.class + "\" aria-label=\"")
			b.t(fg.caption)
			b.raw("\">\n" + string(fg.svg) + "</figure>\n")
		}
		if len(p.Confidence) > 0 {
			b.raw("<ul class=\"confidence\">\n")
			for _, n := range p.Confidence {
				b.el("li", "", "check set: "+n.Text)
				b.raw("\n")
			}
			b.raw("</ul>\n")
		}
		if len(p.Warnings) > 0 {
			b.raw("<ul class=\"warnings\">\n")
			for _, wn := range p.Warnings {
				b.el("li", "", wn)
				b.raw("\n")
			}
			b.raw("</ul>\n")
		}
		b.raw("</article>\n")
	}
	b.raw("</section>\n")
}

// hasNotes reports whether any row has warnings or a competing side channel.
func (w *Writer) hasNotes() bool {
	for _, r := range w.rows {
		if len(r.Pair.Warnings) > 0 {
			return true
		}
		for _, sc := range r.Pair.SideChannels {
			if sc.Competes {
				return true
			}
		}
	}
	return false
}

// notes lists, for every row, its warnings and competing side channels.
func (w *Writer) notes(b *page) {
	if !w.hasNotes() {
		return
	}
	b.raw("<section id=\"notes\">\n")
	b.el("h2", "", "Warnings and competing side reactions")
	b.raw("\n<dl class=\"notes\">\n")
	for _, r := range w.rows {
		p := r.Pair
		var items []string
		items = append(items, p.Warnings...)
		for _, sc := range p.SideChannels {
			if sc.Competes {
				items = append(items, fmt.Sprintf("side channel %s competes (gap %s |β|, margin %s |β|): %s", sc.Kind, f(sc.Gap.Beta, 3), f(sc.Margin, 3), sc.Note))
			}
		}
		if len(items) == 0 {
			continue
		}
		b.el("dt", "", fmt.Sprintf("#%d %s + %s (%s)", r.Rank, nameOr(p.DieneName, p.Diene), nameOr(p.DienophileName, p.Dienophile), p.Activation))
		b.raw("\n<dd><ul>")
		for _, it := range items {
			b.el("li", "", it)
		}
		b.raw("</ul></dd>\n")
	}
	b.raw("</dl>\n</section>\n")
}

type fig struct {
	class, caption string
	svg            []byte
}

// pictures rebuilds the partners of p with the report's options and draws the pair and the
// HOMO and LUMO of each partner.
func (w *Writer) pictures(p *fmo.Pair, id string) ([]fig, error) {
	opts := w.cfg.Options
	d, err := fmo.NewPartner(p.DieneName, p.Diene, fmo.RoleDiene, opts)
	if err != nil {
		return nil, err
	}
	e, err := fmo.NewPartner(p.DienophileName, p.Dienophile, fmo.RoleDienophile, opts)
	if err != nil {
		return nil, err
	}
	if p.Activation != "" && p.Activation != "none" {
		if e, err = e.WithActivation(p.Activation, w.cfg.Activate, opts); err != nil {
			return nil, err
		}
	}
	// Re-analyse so the picture shows exactly what these partners give (the row came from
	// the same options, so the result is the same analysis).
	q, err := fmo.Analyze(d, e, opts)
	if err != nil {
		return nil, err
	}
	var out []fig
	svg, err := draw.Pair(d, e, q, draw.PairOptions{IDPrefix: id + "p"})
	if err != nil {
		return nil, err
	}
	out = append(out, fig{"wide", "The pair in its preferred orientation with the frontier orbitals of the controlling pairing.", svg})
	if dg, err := levelDiagram(d, e, q, id); err == nil {
		out = append(out, fig{"wide", "π energy levels of both partners with the normal and inverse frontier gaps.", dg})
	} else {
		return out, err
	}
	frontiers := [2][2]fmo.Frontier{{q.DieneHOMO, q.DieneLUMO}, {q.DienophileHOMO, q.DienophileLUMO}}
	for k, part := range []*fmo.Partner{d, e} {
		for j, which := range []string{"HOMO", "LUMO"} {
			lv := frontiers[k][j].Index
			if lv < 0 || lv >= len(part.Orb.Levels) {
				continue
			}
			svg, err := draw.Orbital(part.Orb, lv, draw.OrbitalOptions{
				Name: part.Name, SMILES: part.SMILES, Which: which, Params: opts.Params.Name,
				Calibration: opts.Calibration, CalName: opts.CalibrationName,
				IDPrefix: fmt.Sprintf("%so%d%s", id, k, which),
			})
			if err != nil {
				return out, err
			}
			out = append(out, fig{"small", which + " of " + nameOr(part.Name, part.SMILES), svg})
		}
	}
	return out, nil
}

// levelDiagram draws the π levels of the two partners with both frontier gaps (the render
// package's diagram). The SVG is made ready for inlining: its XML declaration is dropped and
// its ids get the figure's prefix, so several diagrams can share the page.
func levelDiagram(d, e *fmo.Partner, q *fmo.Pair, id string) ([]byte, error) {
	col := func(p *fmo.Partner, sub string, homo, lumo fmo.Frontier) render.DiagramColumn {
		c := render.DiagramColumn{Title: nameOr(p.Name, p.SMILES), Subtitle: sub, HOMO: homo.Index, LUMO: lumo.Index, HOMOEV: homo.EV, LUMOEV: lumo.EV}
		for _, l := range p.Orb.Levels {
			c.Levels = append(c.Levels, render.DiagramLevel{X: l.X, Occupancy: l.Occupancy, Degenerate: l.Degenerate})
		}
		return c
	}
	sub := "free"
	if e.Activation != "" && e.Activation != fmo.ActivateNone {
		sub = "activation: " + e.Activation
	}
	dg := &render.Diagram{
		Title:       "π levels: " + nameOr(d.Name, d.SMILES) + " + " + nameOr(e.Name, e.SMILES),
		Params:      q.Params,
		Calibration: q.Calibration,
		EVDecimals:  q.EVDecimals,
		Columns:     []render.DiagramColumn{col(d, d.SMILES, q.DieneHOMO, q.DieneLUMO), col(e, sub, q.DienophileHOMO, q.DienophileLUMO)},
		Gaps: []render.DiagramGap{{Column: 1,
			Normal:      render.Energy{Beta: q.GapNormal.Beta, EV: q.GapNormal.EV},
			Inverse:     render.Energy{Beta: q.GapInverse.Beta, EV: q.GapInverse.EV},
			Controlling: q.Demand}},
	}
	var buf bytes.Buffer
	if err := render.WriteDiagram(&buf, dg); err != nil {
		return nil, err
	}
	return inlineSVG(buf.Bytes(), id), nil
}

var idAttr = regexp.MustCompile(`\bid="([^"]+)"`)

// inlineSVG drops an XML declaration and prefixes every id (and its url(#…) and href="#…"
// references) with prefix, so the picture can be inlined next to others.
func inlineSVG(svg []byte, prefix string) []byte {
	if i := bytes.Index(svg, []byte("?>")); bytes.HasPrefix(svg, []byte("<?xml")) && i >= 0 {
		svg = bytes.TrimLeft(svg[i+2:], "\r\n")
	}
	var ids [][]byte
	for _, m := range idAttr.FindAllSubmatch(svg, -1) {
		ids = append(ids, m[1])
	}
	for _, old := range ids {
		nu := []byte(prefix + "-" + string(old))
		svg = bytes.ReplaceAll(svg, []byte(`id="`+string(old)+`"`), []byte(`id="`+string(nu)+`"`))
		svg = bytes.ReplaceAll(svg, []byte(`url(#`+string(old)+`)`), []byte(`url(#`+string(nu)+`)`))
		svg = bytes.ReplaceAll(svg, []byte(`href="#`+string(old)+`"`), []byte(`href="#`+string(nu)+`"`))
	}
	return svg
}

func (w *Writer) params(b *page) {
	p := w.cfg.Options.Params
	o := w.cfg.Options
	b.raw("<section id=\"parameters\">\n")
	b.el("h2", "", "Parameter set and analysis constants")
	b.raw("\n<p>")
	b.t(p.Name)
	if p.Title != "" {
		b.t(" — " + p.Title)
	}
	if p.Source != "" {
		b.t(". Source: " + p.Source)
	}
	b.raw("</p>\n")
	b.el("p", "", fmt.Sprintf("Forming-bond resonance integral %s β, secondary (endo) contact %s β, localisation weight %s, demand threshold %s |β|; alkyl hyperconjugation model %s.",
		f(o.FormingBeta, 2), f(o.SecondaryBeta, 2), f(o.LocalizationWeight, 2), f(o.DemandThreshold, 2), onOff(p.Alkyl)))
	b.raw("\n<details open=\"open\"><summary>Coulomb (h) and resonance (k) parameters</summary>\n<div class=\"cols\">\n<table>\n<thead><tr>")
	for _, h := range []string{"centre type", "h", "source"} {
		b.el("th", `scope="col"`, h)
	}
	b.raw("</tr></thead>\n<tbody>\n")
	for _, e := range p.HEntries {
		b.raw("<tr>")
		b.el("td", `class="smiles"`, string(e.Type))
		b.el("td", `class="num"`, f(e.H, 2))
		b.el("td", "", e.Source)
		b.raw("</tr>\n")
	}
	b.raw("</tbody>\n</table>\n<table>\n<thead><tr>")
	for _, h := range []string{"bond", "order", "k", "source"} {
		b.el("th", `scope="col"`, h)
	}
	b.raw("</tr></thead>\n<tbody>\n")
	for _, e := range p.KEntries {
		order := "any"
		if e.Order > 0 {
			order = strconv.Itoa(e.Order)
		}
		b.raw("<tr>")
		b.el("td", `class="smiles"`, string(e.A)+"–"+string(e.B))
		b.el("td", "", order)
		b.el("td", `class="num"`, f(e.K, 2))
		b.el("td", "", e.Source)
		b.raw("</tr>\n")
	}
	b.raw("</tbody>\n</table>\n</div>\n</details>\n</section>\n")
}

func (w *Writer) calibration(b *page) {
	b.raw("<section id=\"calibration\">\n")
	b.el("h2", "", "Calibration (x → eV)")
	b.raw("\n")
	c := w.cfg.Calibration
	if c == nil {
		b.el("p", "", "Calibration: "+orDash(w.rep.Calibration)+". Every eV figure in this report comes from it.")
		b.raw("\n</section>\n")
		return
	}
	b.el("p", "", fmt.Sprintf("%s. Occupied levels: E = %s %s·x eV (fitted to ionisation energies, N = %d, r² = %s, RMSE %s eV); empty levels: E = %s %s·x eV (fitted to electron affinities, N = %d, r² = %s, RMSE %s eV).",
		orDash(c.Name), f(c.HOMOIntercept, 3), signedF(c.HOMOSlope), c.HOMON, f(c.HOMOR2, 3), f(c.HOMORMSE, 2),
		f(c.LUMOIntercept, 3), signedF(c.LUMOSlope), c.LUMON, f(c.LUMOR2, 3), f(c.LUMORMSE, 2)))
	b.raw("\n")
	b.el("p", "", fmt.Sprintf("Gaps in eV are rounded to %d decimal(s): the decimal place of the first significant digit of the gap's uncertainty √(RMSE_occ² + RMSE_empty²); the |β| figures are the computed values.", c.GapDecimals()))
	b.raw("\n")
	if c.Source != "" {
		b.el("p", `class="small"`, "Reference data: "+c.Source)
		b.raw("\n")
	}
	b.raw("</section>\n")
}

func (w *Writer) validation(b *page) {
	b.raw("<section id=\"accuracy\">\n")
	b.el("h2", "", "Accuracy on the literature check set")
	b.raw("\n")
	v := w.cfg.Validation
	if v == nil && !w.cfg.NoValidation {
		set, err := check.BundledCheckSet()
		if err != nil {
			b.el("p", `class="error"`, "The bundled literature check set could not be loaded: "+err.Error())
			b.raw("\n</section>\n")
			return
		}
		v = check.Validate(set, w.cfg.Options)
	}
	if v == nil {
		b.el("p", "", "The literature check set was not run for this report ('cyclopair validate' runs it).")
		b.raw("\n</section>\n")
		return
	}
	b.el("p", "", "How often the method, with the parameter set and options of this report, reproduces published outcomes (regiochemistry, reacting site, endo preference, demand type). Known misses are recorded disagreements kept as they are rather than tuned away.")
	b.raw("\n<table>\n<thead><tr>")
	for _, h := range []string{"category", "hits", "total", "hit rate", "known misses", "new misses", "errors"} {
		b.el("th", `scope="col"`, h)
	}
	b.raw("</tr></thead>\n<tbody>\n")
	for _, c := range v.Categories {
		rate := "—"
		if c.Total > 0 {
			rate = f(100*float64(c.Hits)/float64(c.Total), 0) + " %"
		}
		b.raw("<tr>")
		b.el("td", "", c.Category)
		b.el("td", `class="num"`, strconv.Itoa(c.Hits))
		b.el("td", `class="num"`, strconv.Itoa(c.Total))
		b.el("td", `class="num"`, rate)
		b.el("td", `class="num"`, strconv.Itoa(c.KnownMisses))
		b.el("td", `class="num"`, strconv.Itoa(c.Misses))
		b.el("td", `class="num"`, strconv.Itoa(c.Errors))
		b.raw("</tr>\n")
	}
	b.raw("</tbody>\n</table>\n")
	if v.Products[1] > 0 {
		b.el("p", "", fmt.Sprintf("Products: %d of %d expected cycloadducts reproduced.", v.Products[0], v.Products[1]))
		b.raw("\n")
	}
	for _, s := range v.Series {
		verdict := "passes"
		if !s.Pass {
			verdict = "misses"
			if s.KnownMiss != "" {
				verdict = "misses (known: " + s.KnownMiss + ")"
			}
		}
		b.el("p", "", fmt.Sprintf("Rate series %s: Spearman ρ = %s against log k (threshold %s), %s. Source: %s", nameOr(s.Name, s.ID), f(s.Rho, 2), f(s.MinRho, 2), verdict, s.Source))
		b.raw("\n")
	}
	b.raw("</section>\n")
}

func nameOr(name, smi string) string {
	if name != "" {
		return name
	}
	return smi
}

func orDash(s string) string {
	if s == "" {
		return "—"
	}
	return s
}

func yesNo(v bool) string {
	if v {
		return "yes"
	}
	return "no"
}

func onOff(v bool) string {
	if v {
		return "on"
	}
	return "off"
}

func signedF(v float64) string {
	if v < 0 {
		return "− " + f(-v, 3)
	}
	return "+ " + f(v, 3)
}

// css is the page style: print-friendly, one dark hue, no external resources. It must not
// contain '<' or '&' (the page is also read as XML).
const css = `:root { --ink: #1b1f24; --accent: #2f4b6e; --rule: #b8bec8; }
body { font-family: "DejaVu Sans", Arial, Helvetica, sans-serif; color: var(--ink); background: #ffffff;
  margin: 1.5rem auto; max-width: 76rem; padding: 0 1rem; line-height: 1.4; font-size: 15px; }
h1 { font-size: 1.5rem; margin: 0 0 0.8rem; }
h2 { font-size: 1.2rem; border-bottom: 2px solid var(--accent); padding-bottom: 0.15rem; margin-top: 2rem; }
h3 { font-size: 1.05rem; margin: 1.2rem 0 0.4rem; }
.caution { border: 2px solid var(--ink); border-left-width: 8px; padding: 0.6rem 0.9rem; margin: 0.8rem 0; }
dl { display: grid; grid-template-columns: max-content 1fr; gap: 0.2rem 1rem; }
dl.notes { display: block; }
dl.notes dd ul { margin: 0.1rem 0 0.6rem; }
nav { margin: 0.6rem 0; }
a { color: var(--accent); }
dt { font-weight: bold; }
dd { margin: 0; }
table { border-collapse: collapse; margin: 0.5rem 0; font-size: 0.9rem; }
th, td { border: 1px solid var(--rule); padding: 0.2rem 0.45rem; text-align: left; vertical-align: top; }
th { border-bottom: 2px solid var(--ink); }
td.num { text-align: right; font-variant-numeric: tabular-nums; }
td.smiles { font-family: "DejaVu Sans Mono", monospace; font-size: 0.85rem; }
tbody tr:nth-child(even) td { background: #f2f4f7; }
.small { font-size: 0.85rem; }
.error { border-left: 4px solid var(--ink); padding-left: 0.5rem; font-style: italic; }
figure { display: inline-block; margin: 0.4rem 0.8rem 0.8rem 0; vertical-align: top; max-width: 100%; }
figure svg { max-width: 100%; height: auto; border: 1px solid var(--rule); }
figcaption { font-size: 0.85rem; margin-top: 0.2rem; }
article.pair { border-top: 1px solid var(--rule); }
.cols { display: flex; flex-wrap: wrap; gap: 1rem; align-items: flex-start; }
ul.warnings { font-size: 0.9rem; }
footer { margin-top: 2.5rem; border-top: 1px solid var(--rule); }
@media print {
  body { margin: 0; max-width: none; font-size: 11pt; }
  tbody tr:nth-child(even) td { background: none; }
  figure, table, .caution, article.pair h3 { break-inside: avoid; page-break-inside: avoid; }
  h2, h3 { break-after: avoid; page-break-after: avoid; }
  details { display: block; }
}
`
