package main

import (
	"cyclopair/cmd/cyclopair/internal/render"
	"encoding/csv"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"text/tabwriter"

	"cyclopair/huckel"
)

// num is a float written with at most 6 decimals and never as "-0", so that JSON and CSV
// output is deterministic across platforms (FMA and summation order differ in the last bits).
type num float64

func round6(v float64) float64 {
	r := math.Round(v*1e6) / 1e6
	if r == 0 {
		return 0 // drops the sign of −0
	}
	return r
}

func (n num) MarshalJSON() ([]byte, error) {
	v := float64(n)
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return []byte("null"), nil
	}
	return appendRound6(nil, v), nil
}

func fmtNum(v float64) string { return string(appendRound6(nil, v)) }

// appendRound6 appends strconv.AppendFloat(b, round6(v), 'f', -1, 64) for finite v: the
// shortest decimal that reads back as round6(v). round6(v) is the double nearest to k/10⁶,
// k = round(v·10⁶); below 10⁹ doubles are closer than 10⁻⁶, so that decimal is k/10⁶ itself
// with its trailing zeros dropped (a shorter one would be another multiple of 10⁻⁶ reading
// back as the same double), which integer arithmetic writes without the shortest-digits
// search. Larger magnitudes take strconv. TestAppendRound6 compares both on random and
// edge values.
func appendRound6(b []byte, v float64) []byte {
	k := math.Round(v * 1e6)
	if !(math.Abs(k) < 1e15) {
		return strconv.AppendFloat(b, round6(v), 'f', -1, 64)
	}
	n := int64(k)
	if n == 0 {
		return append(b, '0') // round6 drops the sign of −0
	}
	if n < 0 {
		b = append(b, '-')
		n = -n
	}
	b = strconv.AppendInt(b, n/1e6, 10)
	if f := n % 1e6; f != 0 {
		var d [7]byte
		d[0] = '.'
		for i := 6; i >= 1; i-- {
			d[i] = byte('0' + f%10)
			f /= 10
		}
		end := 7
		for d[end-1] == '0' {
			end--
		}
		b = append(b, d[:end]...)
	}
	return b
}

// JSON Lines record (contract in DEVELOPERS.md: smiles, homo, lumo, levels, centres,
// pi_energy, electrons; the other keys are additions).
type orbitalsJSON struct {
	SMILES      string          `json:"smiles"`
	Name        string          `json:"name,omitempty"`
	Params      string          `json:"params"`
	Method      string          `json:"method"`
	Electrons   int             `json:"electrons"`
	PiEnergy    num             `json:"pi_energy"`
	HOMO        *frontierJSON   `json:"homo"`
	LUMO        *frontierJSON   `json:"lumo"`
	SOMO        *frontierJSON   `json:"somo,omitempty"`
	Gap         *gapJSON        `json:"gap"`
	OpenShell   bool            `json:"open_shell"`
	Omega       num             `json:"omega"`
	Iterations  int             `json:"omega_iterations,omitempty"`
	SCFCycles   int             `json:"scf_cycles,omitempty"` // PPP-SCF cycles (method ppp)
	Levels      []levelJSON     `json:"levels"`
	Centres     []centreJSON    `json:"centres"`
	Fragments   int             `json:"fragments"`
	Warnings    []string        `json:"warnings"`
	Calibration calibrationJSON `json:"calibration"`
}

type frontierJSON struct {
	Index      int   `json:"index"`
	X          num   `json:"x"`
	EV         num   `json:"ev"`
	Degenerate bool  `json:"degenerate"`
	Degeneracy int   `json:"degeneracy"`
	Set        []int `json:"set"` // indices of the levels of its degenerate set
}

type gapJSON struct {
	Beta num `json:"beta"`
	EV   num `json:"ev"`
}

type levelJSON struct {
	X            num   `json:"x"`
	EV           num   `json:"ev"`
	Occupancy    num   `json:"occupancy"`
	Degeneracy   int   `json:"degeneracy"`
	Fragment     int   `json:"fragment"`
	Coefficients []num `json:"coefficients"`
}

type centreJSON struct {
	Atom      int    `json:"atom"`
	Element   string `json:"element"`
	Type      string `json:"type"`
	H         num    `json:"h"`
	Electrons int    `json:"electrons"`
	Charge    num    `json:"charge"`
	Fragment  int    `json:"fragment"`
}

type calibrationJSON struct {
	Name          string `json:"name"`
	HOMOIntercept num    `json:"occupied_intercept_ev"`
	HOMOSlope     num    `json:"occupied_slope_ev"`
	LUMOIntercept num    `json:"empty_intercept_ev"`
	LUMOSlope     num    `json:"empty_slope_ev"`
	R2            num    `json:"r2"`
	RMSE          num    `json:"rmse_ev"`
	N             int    `json:"n"`
	Source        string `json:"source"`
}

func calJSON(c huckel.Calibration) calibrationJSON {
	return calibrationJSON{Name: c.Name, HOMOIntercept: num(c.HOMOIntercept), HOMOSlope: num(c.HOMOSlope),
		LUMOIntercept: num(c.LUMOIntercept), LUMOSlope: num(c.LUMOSlope), R2: num(c.R2), RMSE: num(c.RMSE),
		N: c.N, Source: c.Source}
}

// levelEV converts a level to eV: occupied (occupancy > 0) levels use the occupied map.
func levelEV(cal huckel.Calibration, l huckel.Level) float64 {
	return cal.EV(l.X, l.Occupancy > 0)
}

func frontier(o *huckel.Orbitals, i int, cal huckel.Calibration) *frontierJSON {
	if i < 0 {
		return nil
	}
	l := o.Levels[i]
	return &frontierJSON{Index: i, X: num(l.X), EV: num(levelEV(cal, l)), Degenerate: l.Degenerate > 1,
		Degeneracy: l.Degenerate, Set: o.DegenerateSet(i)}
}

func toJSON(r *orbitalsResult, p *huckel.Params, cal huckel.Calibration) orbitalsJSON {
	o := r.orb
	j := orbitalsJSON{SMILES: r.in.smiles, Name: r.in.name, Params: p.Name, Method: o.Method, Electrons: o.Electrons,
		PiEnergy: num(o.PiEnergy), HOMO: frontier(o, o.HOMO, cal), LUMO: frontier(o, o.LUMO, cal),
		SOMO: frontier(o, o.SOMO, cal), OpenShell: o.Partial, Omega: num(r.ps.Omega), Iterations: o.Iterations,
		Fragments: len(r.ps.Fragments), Warnings: o.Warnings, Calibration: calJSON(cal)}
	if j.Warnings == nil {
		j.Warnings = []string{}
	}
	if o.Method != huckel.MethodHuckel {
		j.Iterations, j.SCFCycles = 0, o.Iterations
	}
	if o.HOMO >= 0 && o.LUMO >= 0 {
		hl, ll := o.Levels[o.HOMO], o.Levels[o.LUMO]
		j.Gap = &gapJSON{Beta: num(hl.X - ll.X), EV: num(levelEV(cal, ll) - levelEV(cal, hl))}
	}
	for _, l := range o.Levels {
		cs := make([]num, len(l.Coeffs))
		for i, c := range l.Coeffs {
			cs[i] = num(c)
		}
		j.Levels = append(j.Levels, levelJSON{X: num(l.X), EV: num(levelEV(cal, l)), Occupancy: num(l.Occupancy),
			Degeneracy: l.Degenerate, Fragment: l.Fragment, Coefficients: cs})
	}
	for i, c := range r.ps.Centres {
		j.Centres = append(j.Centres, centreJSON{Atom: c.Atom, Element: c.Element, Type: string(c.Type),
			H: num(o.H[i]), Electrons: c.Electrons, Charge: num(o.Charges[i]), Fragment: c.Fragment})
	}
	return j
}

// orbitalsWriter renders results in one format.
type orbitalsWriter struct {
	w      io.Writer
	format string
	p      *huckel.Params
	cal    huckel.Calibration
	csv    *csv.Writer
	n      int
	buf    []byte // the JSON line being written
}

func newOrbitalsWriter(w io.Writer, format string, p *huckel.Params, cal huckel.Calibration) *orbitalsWriter {
	if format != "json" && format != "csv" {
		w = render.TerminalSafe(w) // the table shows names and SMILES as the user gave them
	}
	return &orbitalsWriter{w: w, format: format, p: p, cal: cal}
}

var orbitalsCSVHeader = []string{"smiles", "name", "params", "electrons", "pi_energy_beta",
	"homo_index", "homo_x", "homo_ev", "homo_degeneracy", "lumo_index", "lumo_x", "lumo_ev", "lumo_degeneracy",
	"gap_beta", "gap_ev", "open_shell", "centres", "fragments", "warnings", "calibration", "calibration_r2", "calibration_rmse_ev"}

func (ow *orbitalsWriter) write(r *orbitalsResult) error {
	ow.n++
	switch ow.format {
	case "json":
		if r.line != nil {
			_, err := ow.w.Write(r.line)
			line := r.line[:0]
			r.line = nil
			jsonLines.Put(&line)
			return err
		}
		j := toJSON(r, ow.p, ow.cal)
		ow.buf = append(appendOrbitalsJSON(ow.buf[:0], &j), '\n')
		_, err := ow.w.Write(ow.buf)
		return err
	case "csv":
		if ow.csv == nil {
			ow.csv = csv.NewWriter(ow.w)
			if err := ow.csv.Write(orbitalsCSVHeader); err != nil {
				return err
			}
		}
		return ow.csv.Write(csvRecord(r, ow.p, ow.cal))
	}
	return ow.table(r)
}

func (ow *orbitalsWriter) flush() error {
	if ow.csv != nil {
		ow.csv.Flush()
		return ow.csv.Error()
	}
	return nil
}

func csvRecord(r *orbitalsResult, p *huckel.Params, cal huckel.Calibration) []string {
	o := r.orb
	idx := func(i int) (string, string, string, string) {
		if i < 0 {
			return "", "", "", ""
		}
		l := o.Levels[i]
		return strconv.Itoa(i), fmtNum(l.X), fmtNum(levelEV(cal, l)), strconv.Itoa(l.Degenerate)
	}
	hi, hx, he, hd := idx(o.HOMO)
	li, lx, le, ld := idx(o.LUMO)
	gb, ge := "", ""
	if o.HOMO >= 0 && o.LUMO >= 0 {
		hl, ll := o.Levels[o.HOMO], o.Levels[o.LUMO]
		gb, ge = fmtNum(hl.X-ll.X), fmtNum(levelEV(cal, ll)-levelEV(cal, hl))
	}
	t := render.SafeCell // text cells only
	return []string{t(r.in.smiles), t(r.in.name), t(p.Name), strconv.Itoa(o.Electrons), fmtNum(o.PiEnergy),
		hi, hx, he, hd, li, lx, le, ld, gb, ge, strconv.FormatBool(o.Partial),
		strconv.Itoa(len(r.ps.Centres)), strconv.Itoa(len(r.ps.Fragments)), t(strings.Join(o.Warnings, " | ")),
		t(cal.Name), fmtNum(cal.R2), fmtNum(cal.RMSE)}
}

// table writes the human-readable block of one molecule.
func (ow *orbitalsWriter) table(r *orbitalsResult) error {
	o, ps, cal, w := r.orb, r.ps, ow.cal, ow.w
	if ow.n > 1 {
		fmt.Fprintln(w)
	}
	title := r.in.smiles
	if r.in.name != "" {
		title += "  (" + r.in.name + ")"
	}
	fmt.Fprintln(w, title)
	omega := ""
	if ps.Omega != 0 {
		omega = fmt.Sprintf(", ω-technique ω = %g (%d cycles)", ps.Omega, o.Iterations)
	}
	frag := ""
	if len(ps.Fragments) > 1 {
		frag = fmt.Sprintf(", %d separate π systems", len(ps.Fragments))
	}
	if o.Method != huckel.MethodHuckel {
		omega = fmt.Sprintf(", method %s (%d SCF cycles)", o.Method, o.Iterations)
	}
	fmt.Fprintf(w, "parameters %s, %d π centres, %d π electrons%s%s\n", ow.p.Name, len(ps.Centres), o.Electrons, frag, omega)
	sign := "+"
	if o.PiEnergy < 0 {
		sign = "−"
	}
	fmt.Fprintf(w, "E_π = %dα %s %.4fβ", o.Electrons, sign, math.Abs(o.PiEnergy))
	if g, ok := o.Gap(); ok {
		hl, ll := o.Levels[o.HOMO], o.Levels[o.LUMO]
		fmt.Fprintf(w, "; HOMO–LUMO gap %.4f|β| = %.2f eV", g, levelEV(cal, ll)-levelEV(cal, hl))
	}
	fmt.Fprintln(w)
	if cal.Direct {
		fmt.Fprintf(w, "%s; x = (ε − α_C)/β₀ with α_C = %.3f eV, β₀ = %.2f eV; h = the Fock diagonal on the same scale\n\n", huckel.DirectDetail, cal.HOMOIntercept, cal.HOMOSlope)
	} else {
		fmt.Fprintf(w, "eV from calibration %s (occupied: %.3f %+.3f·x, empty: %.3f %+.3f·x; N = %d, r² = %.3f, RMSE = %.2f eV)\n\n",
			cal.Name, cal.HOMOIntercept, cal.HOMOSlope, cal.LUMOIntercept, cal.LUMOSlope, cal.N, cal.R2, cal.RMSE)
	}

	tw := tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintln(tw, "level\tx\teV\toccupancy\tdegeneracy\t\t")
	for i, l := range o.Levels {
		mark := ""
		switch {
		case i == o.SOMO:
			mark = "SOMO"
		case i == o.HOMO:
			mark = "HOMO"
		case i == o.LUMO:
			mark = "LUMO"
		}
		if mark == "" && o.HOMO >= 0 && l.Fragment == o.Levels[o.HOMO].Fragment && l.X == o.Levels[o.HOMO].X && l.Degenerate > 1 {
			mark = "HOMO set"
		}
		if mark == "" && o.LUMO >= 0 && l.Fragment == o.Levels[o.LUMO].Fragment && l.X == o.Levels[o.LUMO].X && l.Degenerate > 1 {
			mark = "LUMO set"
		}
		fmt.Fprintf(tw, "%d\t%.4f\t%.2f\t%.2f\t%d\t%s\t\n", i, l.X, levelEV(cal, l), l.Occupancy, l.Degenerate, mark)
	}
	if err := tw.Flush(); err != nil {
		return err
	}

	// Frontier coefficients: every level of the HOMO and LUMO degenerate sets.
	var cols []int
	var heads []string
	if o.HOMO >= 0 {
		for _, i := range o.DegenerateSet(o.HOMO) {
			cols = append(cols, i)
			heads = append(heads, fmt.Sprintf("HOMO[%d]", i))
		}
	}
	if o.LUMO >= 0 {
		for _, i := range o.DegenerateSet(o.LUMO) {
			cols = append(cols, i)
			heads = append(heads, fmt.Sprintf("LUMO[%d]", i))
		}
	}
	fmt.Fprintln(w, "\nfrontier coefficients and π charges (atom = 0-based position in the SMILES)")
	tw = tabwriter.NewWriter(w, 0, 0, 2, ' ', tabwriter.AlignRight)
	fmt.Fprintf(tw, "atom\telement\ttype\th\t%s\tcharge\t\n", strings.Join(heads, "\t"))
	for i, c := range ps.Centres {
		var vals []string
		for _, l := range cols {
			vals = append(vals, fmt.Sprintf("%.4f", zero(o.Levels[l].Coeffs[i])))
		}
		fmt.Fprintf(tw, "%d\t%s\t%s\t%.2f\t%s\t%.4f\t\n", c.Atom, c.Element, c.Type, o.H[i], strings.Join(vals, "\t"), zero(o.Charges[i]))
	}
	return tw.Flush()
}

// zero maps −0 (and values that print as −0.0000) to 0 for stable tables.
func zero(v float64) float64 {
	if math.Abs(v) < 5e-5 {
		return 0
	}
	return v
}
