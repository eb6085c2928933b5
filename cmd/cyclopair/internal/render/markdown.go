package render

import (
	"bufio"
	"fmt"
	"io"
	"strconv"
	"strings"
)

type markdownWriter struct {
	w            *bufio.Writer
	err          error
	extrapolated int
}

func newMarkdown(w io.Writer, rep Report) (*markdownWriter, error) {
	m := &markdownWriter{w: bufio.NewWriter(w)}
	title := "cyclopair screen"
	if rep.Title != "" {
		title += ": " + rep.Title
	}
	m.printf("## %s\n\n", mdEscape(title))
	for _, l := range headerLines(rep) {
		k, v, _ := strings.Cut(l, ": ")
		m.printf("- **%s:** %s\n", strings.ToUpper(k[:1])+k[1:], mdEscape(v))
	}
	m.printf("\n> **Caution.** %s\n\n", Caution)
	m.printf("| Rank | Diene | Dienophile | Activation | log k_rel | Demand | Sustmann type | Gap (\\|β\\|) | Gap (eV) | Orientation | Product | Regio margin (\\|β\\|) | Regio confidence | Endo | Allowed | Warnings |\n")
	m.printf("|---:|---|---|---|---:|---|---|---:|---:|---|---|---:|---|---|---|---:|\n")
	return m, m.err
}

func (m *markdownWriter) printf(format string, args ...any) {
	if m.err != nil {
		return
	}
	_, m.err = fmt.Fprintf(m.w, format, args...)
}

func (m *markdownWriter) WriteRow(r Row) error {
	p := r.Pair
	g := Controlling(p)
	label, product, margin := "–", "–", "–"
	if o := best(p); o != nil {
		if o.Label != "" {
			label = o.Label
		}
		if o.Product != "" {
			product = mdCode(o.Product)
		}
		margin = f3(p.RegioMargin)
	}
	cells := []string{
		strconv.Itoa(r.Rank), mdEscape(mdDash(p.DieneName)), mdEscape(mdDash(p.DienophileName)),
		mdEscape(mdDash(p.Activation)), mdEscape(rateCell(p.Rate, "–")), mdDash(p.Demand), mdDash(p.SustmannType),
		f3(g.Beta), fixed(g.EV, p.EVDecimals), label, product, margin, mdEscape(mdDash(p.RegioConfidence)),
		mdDash(p.Endo), yesNo(p.Allowed), strconv.Itoa(len(p.Warnings)),
	}
	if Extrapolated(p.Rate) {
		m.extrapolated++
	}
	m.printf("| %s |\n", strings.Join(cells, " | "))
	return m.err
}

func (m *markdownWriter) Close(s Summary) error {
	if m.extrapolated > 0 {
		m.printf("\n%s.\n", mdEscape(extrapolatedText(m.extrapolated)))
	}
	m.printf("\n%s.\n", summaryText(s))
	if m.err == nil {
		m.err = m.w.Flush()
	}
	return m.err
}

// mdDash stands an en dash in for an empty cell.
func mdDash(s string) string {
	if s == "" {
		return "–"
	}
	return s
}

// mdEscape makes user text safe inside a Markdown table cell: characters with Markdown
// meaning are backslash-escaped, and line breaks become spaces.
func mdEscape(s string) string {
	var b strings.Builder
	for _, r := range s {
		switch r {
		case '\\', '|', '*', '_', '`', '[', ']', '<', '>', '#', '~':
			b.WriteByte('\\')
			b.WriteRune(r)
		case '\n', '\r', '\t':
			b.WriteByte(' ')
		default:
			b.WriteRune(r)
		}
	}
	return b.String()
}

// mdCode puts a SMILES in a code span; '|' still needs its table escape inside it (GitHub
// Flavored Markdown splits cells before it parses code spans).
func mdCode(s string) string {
	return "`" + strings.ReplaceAll(strings.ReplaceAll(s, "`", "'"), "|", "\\|") + "`"
}
