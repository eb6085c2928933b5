// Package render turns screening results (fmo.Pair values) into reports: an aligned text
// table, CSV, JSON Lines and Markdown, plus the SVG energy-level diagram (diagram.go).
//
// Every report format carries the parameter set, the calibration that produced the eV figures
// and the Caution line, worded once in this package. Writers stream: a row is written as soon
// as it is given, so memory does not grow with the number of rows (the table writer aligns
// its columns with widths fixed in advance from the Layout, not by buffering rows).
//
// Output is deterministic: floats use fixed precision, nothing is emitted in map order, and
// the same rows give the same bytes.
package render

import (
	"errors"
	"fmt"
	"io"
	"strings"

	"cyclopair/fmo"
)

// Caution is the one sentence every report carries. Keep it in this one place.
const Caution = "Estimates for planning only, not a safety assessment: check the SDS, a hazard review and local rules before any lab work."

// Format names a report format.
type Format string

// The report formats.
const (
	Table    Format = "table"
	CSV      Format = "csv"
	JSON     Format = "json"
	Markdown Format = "markdown"
	// SDF writes each row's product as an SD record with 2D coordinates and the row's
	// figures as data items (sdf.go).
	SDF Format = "sdf"
)

// BestOnly reports whether the format shows no orientation of a row but the preferred one
// (its product SMILES, label and figures) and the pair's own fields: such rows can be
// analysed at fmo.DetailRow, which skips the stereo forms, the follow-up steps and the
// isolated product's SMILES (the side-channel check reads the adduct as built) and, where
// every adduct would be listed, the other orientations. JSON (and
// the HTML report, which is not a Format) print every orientation.
func (f Format) BestOnly() bool {
	switch f {
	case Table, CSV, Markdown, SDF:
		return true
	}
	return false
}

// Formats lists the row formats in the order help texts show them.
var Formats = []Format{Table, CSV, JSON, Markdown}

// ErrUnknownFormat is returned by ParseFormat for a name it does not know.
var ErrUnknownFormat = errors.New("unknown report format")

// ParseFormat accepts a format name ("md" is short for markdown, "jsonl" for json).
func ParseFormat(s string) (Format, error) {
	switch strings.ToLower(strings.TrimSpace(s)) {
	case "table", "text", "":
		return Table, nil
	case "csv":
		return CSV, nil
	case "json", "jsonl":
		return JSON, nil
	case "markdown", "md":
		return Markdown, nil
	case "sdf", "sd":
		return SDF, nil
	}
	return "", fmt.Errorf("%w %q (choose table, csv, json, markdown or sdf)", ErrUnknownFormat, s)
}

// Report describes the screen a set of rows comes from. It is printed in the header of the
// table and Markdown formats and as columns or keys of the CSV and JSON formats.
type Report struct {
	Title             string   // e.g. "demo: the fictional ..."; may be empty
	Source            string   // input file name, "-" for stdin; may be empty
	Params            string   // parameter set name
	Calibration       string   // calibration name (every eV figure comes from it)
	CalibrationDetail string   // e.g. "E/eV = -6.25 - 2.44·x (fit on 9 molecules, r² 0.93)"; may be empty
	RankBy            string   // ranking key, "" or "none" for the unranked pair order
	Filters           []string // human-readable filters in force, in order
	Shard             string   // "2/4" when the screen is one shard of a split run; may be empty
}

// Row is one output row: the rank (1-based position in the ranked output, or the pair's
// 1-based number in the pair space when unranked) and the full analysis.
type Row struct {
	Rank int
	// Number is the 1-based position of the pair in the whole pair space of the screen
	// (diene × dienophile × activation, in file order), 0 when unknown. Rankings break ties
	// by it, so ranked shard outputs merge into the unsharded ranking by (key, number).
	Number int64
	Pair   *fmo.Pair
}

// Summary is printed at the end of the human formats.
type Summary struct {
	Pairs    int // pairs scored
	Passed   int // pairs that passed the filters
	Shown    int // rows written
	Failed   int // inputs (molecules or pairs) that failed and are listed on stderr
	Canceled bool
}

// Layout fixes column widths of the table format in advance so the table can be streamed.
// A longer name still prints in full; only the alignment of that row suffers.
type Layout struct {
	DieneWidth      int // widest diene name
	DienophileWidth int // widest dienophile name
	ActivationWidth int // widest activation name
}

// Writer writes rows of one report.
type Writer interface {
	// WriteRow writes one row. Rows are written in the order given.
	WriteRow(r Row) error
	// Close writes the footer (human formats) and flushes. It must be called once.
	Close(s Summary) error
}

// New returns a Writer for format f that writes to w. The header is written at once (so an
// empty screen still says what was screened and carries the Caution).
func New(f Format, w io.Writer, rep Report, lay Layout) (Writer, error) {
	switch f {
	case Table:
		return newTable(TerminalSafe(w), rep, lay)
	case CSV:
		return newCSV(w, rep)
	case JSON:
		return newJSON(w, rep), nil
	case Markdown:
		return newMarkdown(TerminalSafe(w), rep)
	case SDF:
		return newSDF(w, rep), nil
	}
	return nil, fmt.Errorf("%w %q", ErrUnknownFormat, string(f))
}

// Controlling returns the controlling frontier gap of p: the normal-demand gap unless the
// demand is inverse.
func Controlling(p *fmo.Pair) fmo.Energy {
	if p.Demand == "inverse" {
		return p.GapInverse
	}
	if p.Demand == "neutral" && p.GapInverse.Beta < p.GapNormal.Beta {
		return p.GapInverse
	}
	return p.GapNormal
}

// best returns the preferred orientation of p, or nil when the analysis found none.
func best(p *fmo.Pair) *fmo.Orientation {
	if len(p.Orientations) == 0 {
		return nil
	}
	return &p.Orientations[0]
}

// f3 formats a number with three decimals, fixed, and never "-0.000".
func f3(v float64) string { return fixed(v, 3) }

// f2 formats a number with two decimals, fixed, and never "-0.00".
func f2(v float64) string { return fixed(v, 2) }

func fixed(v float64, prec int) string {
	s := fmt.Sprintf("%.*f", prec, v)
	if strings.HasPrefix(s, "-") && strings.Trim(s, "-0.") == "" {
		return s[1:]
	}
	return s
}

func yesNo(b bool) string {
	if b {
		return "yes"
	}
	return "no"
}

// orDash stands "-" in for an empty cell and turns control characters (a line break in a
// name) into spaces so one row stays one line.
func orDash(s string) string {
	if s == "" {
		return "-"
	}
	return strings.Map(func(r rune) rune {
		if r < 0x20 || r == 0x7f {
			return ' '
		}
		return r
	}, s)
}

// headerLines are the metadata lines shared by the human formats, without decoration.
func headerLines(rep Report) []string {
	var out []string
	if rep.Source != "" {
		out = append(out, "input: "+rep.Source)
	}
	if rep.Shard != "" {
		out = append(out, "shard: "+rep.Shard+" of the pair space")
	}
	out = append(out, "parameter set: "+orDash(rep.Params))
	c := "calibration: " + orDash(rep.Calibration)
	if rep.CalibrationDetail != "" {
		c += " (" + rep.CalibrationDetail + ")"
	}
	out = append(out, c)
	if rep.RankBy == "" || rep.RankBy == "none" {
		out = append(out, "order: pair order of the input (unranked)")
	} else {
		out = append(out, "ranked by: "+rankByText(rep.RankBy))
	}
	if len(rep.Filters) > 0 {
		out = append(out, "filters: "+strings.Join(rep.Filters, "; "))
	}
	return out
}

// rankByText explains a ranking key in words.
func rankByText(key string) string {
	switch key {
	case "rate":
		return "rate (predicted log10 k relative to cyclopentadiene + acrylonitrile, fastest first; fitted model, see validate)"
	case "normal_gap":
		return "normal_gap (LUMO(dienophile) − HOMO(diene), smallest first)"
	case "gap":
		return "gap (controlling frontier gap, smallest first)"
	case "stabilization":
		return "stabilization (perturbation energy of the best orientation, largest first)"
	case "regio_margin":
		return "regio_margin (margin of the best regio-orientation, largest first)"
	case "score":
		return "score (stabilization − λ·localization of the best orientation, largest first)"
	}
	return key
}

func summaryText(s Summary) string {
	var b strings.Builder
	fmt.Fprintf(&b, "%d pairs scored, %d passed the filters, %d shown", s.Pairs, s.Passed, s.Shown)
	if s.Failed > 0 {
		fmt.Fprintf(&b, ", failed inputs: %d (listed on stderr)", s.Failed)
	}
	if s.Canceled {
		b.WriteString(", stopped early (canceled)")
	}
	return b.String()
}
