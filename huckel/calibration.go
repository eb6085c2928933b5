package huckel

import (
	"errors"
	"fmt"
	"math"

	"gonum.org/v1/gonum/stat"
)

// Calibration maps Hückel x values to orbital energies in eV with two straight lines, one
// for occupied levels (fitted to −IE, Koopmans-type) and one for empty levels (fitted to
// −EA): E(eV) = intercept + slope·x. Slopes are negative for real data (x > 0 is bonding,
// so it lies lower). The fit statistics must be printed with every eV figure.
type Calibration struct {
	Name          string
	HOMOIntercept float64 // eV
	HOMOSlope     float64 // eV per unit x
	LUMOIntercept float64
	LUMOSlope     float64
	Source        string // where the points come from
	// R2 and RMSE pool both maps: R2 = 1 − (SSres_HOMO + SSres_LUMO)/(SStot_HOMO + SStot_LUMO)
	// with each SStot about its own mean; RMSE (eV) over all N points.
	R2, RMSE float64
	N        int
	// Per-map statistics.
	HOMOR2, HOMORMSE, LUMOR2, LUMORMSE float64
	HOMON, LUMON                       int
	// Direct marks the exact map of a method that computes eV itself (PPP-SCF, Koopmans'
	// theorem): both lines are ε = α_C + x·β₀, the inverse of the method's own x scale, so
	// EV returns the method's orbital energies unchanged. No fit is involved and the fit
	// statistics are zero; Detail says so instead of printing them.
	Direct bool
}

// DirectDetail is the header wording for eV figures of a method that computes eV itself.
const DirectDetail = "eV from Koopmans' theorem (PPP), no calibration"

// DirectScale returns the Direct map ε = alphaEV + x·betaEV (both branches) named name:
// the exact inverse of the x scale of Orbitals filled by an eV method (Orbitals.AlphaEV,
// Orbitals.BetaEV), for code that converts x to eV through a Calibration.
func DirectScale(name string, alphaEV, betaEV float64, source string) Calibration {
	return Calibration{Name: name, HOMOIntercept: alphaEV, HOMOSlope: betaEV,
		LUMOIntercept: alphaEV, LUMOSlope: betaEV, Source: source, Direct: true}
}

// EV converts x to eV with the occupied-level map (occupied = true) or the empty-level map.
func (c Calibration) EV(x float64, occupied bool) float64 {
	if occupied {
		return c.HOMOIntercept + c.HOMOSlope*x
	}
	return c.LUMOIntercept + c.LUMOSlope*x
}

// String is a one-line description for output next to eV values.
func (c Calibration) String() string { return c.Name + ": " + c.Detail() }

// Detail is String without the name: the two fitted lines and the fit statistics.
func (c Calibration) Detail() string {
	if c.Direct {
		return fmt.Sprintf("%s (ε = %.3f %+.3f·x eV, the method's own x scale)", DirectDetail, c.HOMOIntercept, c.HOMOSlope)
	}
	return fmt.Sprintf("E_occ = %.3f %+.3f·x eV, E_virt = %.3f %+.3f·x eV (N = %d, r² = %.3f, RMSE = %.2f eV)",
		c.HOMOIntercept, c.HOMOSlope, c.LUMOIntercept, c.LUMOSlope, c.N, c.R2, c.RMSE)
}

// CalibrationPoint is one reference molecule: the Hückel x of its HOMO (Occupied) or LUMO
// and the measured orbital-energy proxy in eV (−IE or −EA).
type CalibrationPoint struct {
	ID       string
	Name     string
	SMILES   string
	Occupied bool
	X        float64
	EnergyEV float64
}

// ErrCalibration reports a fit that cannot be made (too few or degenerate points).
var ErrCalibration = errors.New("calibration fit impossible")

// MinCalibrationPoints is the least number of points per map FitCalibration accepts.
const MinCalibrationPoints = 3

// FitCalibration fits the two lines by ordinary least squares (gonum stat.LinearRegression)
// and returns them with their statistics. Name and Source are left for the caller. It
// fails with ErrCalibration if either map has fewer than MinCalibrationPoints points or
// all its x values are equal.
func FitCalibration(points []CalibrationPoint) (Calibration, error) {
	var hx, hy, lx, ly []float64
	for _, p := range points {
		if p.Occupied {
			hx, hy = append(hx, p.X), append(hy, p.EnergyEV)
		} else {
			lx, ly = append(lx, p.X), append(ly, p.EnergyEV)
		}
	}
	var c Calibration
	var ssResH, ssTotH, ssResL, ssTotL float64
	var err error
	c.HOMOIntercept, c.HOMOSlope, ssResH, ssTotH, err = fitLine(hx, hy, "occupied")
	if err != nil {
		return c, err
	}
	c.LUMOIntercept, c.LUMOSlope, ssResL, ssTotL, err = fitLine(lx, ly, "empty")
	if err != nil {
		return c, err
	}
	c.HOMON, c.LUMON, c.N = len(hx), len(lx), len(hx)+len(lx)
	c.HOMOR2, c.HOMORMSE = 1-ssResH/ssTotH, math.Sqrt(ssResH/float64(len(hx)))
	c.LUMOR2, c.LUMORMSE = 1-ssResL/ssTotL, math.Sqrt(ssResL/float64(len(lx)))
	c.R2 = 1 - (ssResH+ssResL)/(ssTotH+ssTotL)
	c.RMSE = math.Sqrt((ssResH + ssResL) / float64(c.N))
	return c, nil
}

func fitLine(x, y []float64, which string) (a, b, ssRes, ssTot float64, err error) {
	if len(x) < MinCalibrationPoints {
		return 0, 0, 0, 0, fmt.Errorf("huckel: %w: %d %s-level points, need at least %d",
			ErrCalibration, len(x), which, MinCalibrationPoints)
	}
	same := true
	for _, v := range x[1:] {
		if math.Abs(v-x[0]) > 1e-12 {
			same = false
		}
	}
	if same {
		return 0, 0, 0, 0, fmt.Errorf("huckel: %w: all %s-level points have the same x", ErrCalibration, which)
	}
	a, b = stat.LinearRegression(x, y, nil, false)
	my := stat.Mean(y, nil)
	for i := range x {
		r := y[i] - (a + b*x[i])
		ssRes += r * r
		ssTot += (y[i] - my) * (y[i] - my)
	}
	if ssTot == 0 {
		ssTot = math.SmallestNonzeroFloat64
	}
	return a, b, ssRes, ssTot, nil
}
