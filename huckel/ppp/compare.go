package ppp

import (
	"fmt"
	"math"
	"strings"

	"cyclopair/huckel"
	"cyclopair/huckel/smiles"

	"gonum.org/v1/gonum/stat"
)

// Reference is one measured orbital-energy proxy: −IE for a HOMO (Occupied), −EA or the
// ETS attachment energy for a LUMO (see presets/reference/pi-levels.yaml).
type Reference struct {
	ID, Name, SMILES string
	Occupied         bool
	EnergyEV         float64
	Source           string
}

// FitStats compares computed orbital energies with measured ones over N points.
type FitStats struct {
	N int
	// R2 is 1 − SS_res/SS_tot of the computed values taken as they are (no fit) for PPP,
	// and of the fitted line for Hückel; RMSE (eV) likewise.
	R2, RMSE float64
	// MeanSigned is the mean of computed − measured (eV): the systematic offset.
	MeanSigned float64
	// PearsonR2 is the squared correlation coefficient: the R2 a straight-line fit of the
	// computed values would reach. Slope and Intercept are that line (measured =
	// Intercept + Slope·computed), for information.
	PearsonR2, Slope, Intercept float64
}

// ComparisonRow is one reference with both methods' values.
type ComparisonRow struct {
	Ref        Reference
	PPP        float64 // PPP orbital energy (eV, Koopmans)
	HuckelX    float64 // Hückel x of the same level
	HuckelEV   float64 // through the calibration fitted on these references
	Level      int     // index in the PPP Levels of the HOMO or LUMO
	Degenerate int
}

// Comparison holds the figures of Compare.
type Comparison struct {
	PPPParams, HuckelParams string
	PPPHOMO, PPPLUMO        FitStats
	HuckelHOMO, HuckelLUMO  FitStats
	Calibration             huckel.Calibration // the Hückel lines fitted on the references
	Rows                    []ComparisonRow
	Failed                  []string // "ID name: error" for references that could not be computed
}

// Compare computes the HOMO (occupied references) or LUMO (the others) of every reference
// with PPP-SCF (parameter set pp; eV straight from the orbital energies, no fit) and with
// Hückel (set hp; eV through huckel.FitCalibration on these same references, so Hückel's
// figures are in-sample best-line figures), and summarises both. Both methods perceive the
// π system with hp. A reference that cannot be parsed, perceived or solved by either
// method is listed in Failed and left out of both statistics.
func Compare(refs []Reference, hp *huckel.Params, pp *Params) (Comparison, error) {
	c := Comparison{PPPParams: pp.Name, HuckelParams: hp.Name}
	s := NewSolver(pp)
	var hs huckel.Solver
	var o, h huckel.Orbitals
	var pts []huckel.CalibrationPoint
	for _, r := range refs {
		fail := func(err error) { c.Failed = append(c.Failed, fmt.Sprintf("%s %s: %v", r.ID, r.Name, err)) }
		m, err := smiles.Parse(r.SMILES)
		if err != nil {
			fail(err)
			continue
		}
		m.Name = r.Name
		ps, err := huckel.Perceive(m, hp)
		if err != nil {
			fail(err)
			continue
		}
		if err := s.Solve(ps, &o); err != nil {
			fail(err)
			continue
		}
		if err := hs.Solve(ps, &h); err != nil {
			fail(err)
			continue
		}
		li, hi := o.LUMO, h.LUMO
		if r.Occupied {
			li, hi = o.HOMO, h.HOMO
		}
		if li < 0 || hi < 0 {
			fail(fmt.Errorf("no %s", map[bool]string{true: "HOMO", false: "LUMO"}[r.Occupied]))
			continue
		}
		c.Rows = append(c.Rows, ComparisonRow{Ref: r, PPP: o.Levels[li].EV, HuckelX: h.Levels[hi].X, Level: li, Degenerate: o.Levels[li].Degenerate})
		pts = append(pts, huckel.CalibrationPoint{ID: r.ID, Name: r.Name, SMILES: r.SMILES, Occupied: r.Occupied, X: h.Levels[hi].X, EnergyEV: r.EnergyEV})
	}
	cal, err := huckel.FitCalibration(pts)
	if err != nil {
		return c, fmt.Errorf("ppp: Hückel calibration on the references: %w", err)
	}
	c.Calibration = cal
	var ph, pe, hh, he, lh, le, ql, qe []float64
	for i := range c.Rows {
		row := &c.Rows[i]
		row.HuckelEV = cal.EV(row.HuckelX, row.Ref.Occupied)
		if row.Ref.Occupied {
			ph, pe, hh, he = append(ph, row.PPP), append(pe, row.Ref.EnergyEV), append(hh, row.HuckelEV), append(he, row.Ref.EnergyEV)
		} else {
			lh, le, ql, qe = append(lh, row.PPP), append(le, row.Ref.EnergyEV), append(ql, row.HuckelEV), append(qe, row.Ref.EnergyEV)
		}
	}
	c.PPPHOMO, c.HuckelHOMO = stats(ph, pe), stats(hh, he)
	c.PPPLUMO, c.HuckelLUMO = stats(lh, le), stats(ql, qe)
	return c, nil
}

// stats compares calc with meas (no fit).
func stats(calc, meas []float64) FitStats {
	fs := FitStats{N: len(calc)}
	if len(calc) < 2 {
		return fs
	}
	mm := stat.Mean(meas, nil)
	var res, tot, signed float64
	for i := range calc {
		d := calc[i] - meas[i]
		res += d * d
		tot += (meas[i] - mm) * (meas[i] - mm)
		signed += d
	}
	fs.R2 = 1 - res/tot
	fs.RMSE = math.Sqrt(res / float64(len(calc)))
	fs.MeanSigned = signed / float64(len(calc))
	r := stat.Correlation(calc, meas, nil)
	fs.PearsonR2 = r * r
	fs.Intercept, fs.Slope = stat.LinearRegression(calc, meas, nil, false)
	return fs
}

// Summary is a short multi-line report of the comparison, for `validate`-style output.
func (c Comparison) Summary() string {
	var b strings.Builder
	line := func(what string, f FitStats, note string) {
		fmt.Fprintf(&b, "%-22s N = %2d  r² = %.3f  RMSE = %.2f eV  mean error %+.2f eV  (correlation r² %.3f)%s\n",
			what, f.N, f.R2, f.RMSE, f.MeanSigned, f.PearsonR2, note)
	}
	line("PPP HOMO vs −IE", c.PPPHOMO, "  Koopmans, no fit")
	line("Hückel HOMO vs −IE", c.HuckelHOMO, "  linear calibration fitted on these points")
	line("PPP LUMO vs −EA", c.PPPLUMO, "  Koopmans, no fit")
	line("Hückel LUMO vs −EA", c.HuckelLUMO, "  linear calibration fitted on these points")
	fmt.Fprintf(&b, "(PPP set %s, Hückel set %s", c.PPPParams, c.HuckelParams)
	if len(c.Failed) > 0 {
		fmt.Fprintf(&b, "; %d references failed: %s", len(c.Failed), strings.Join(c.Failed, "; "))
	}
	b.WriteString(")\n")
	return b.String()
}
