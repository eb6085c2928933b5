package huckel

import (
	"errors"
	"fmt"
	"math"
	"strings"

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
		return fmt.Sprintf("%s (ε = %.3f %+.3f·x eV, the method's own x scale; eV figures to %s eV)", DirectDetail, c.HOMOIntercept, c.HOMOSlope, decimalStep(c.GapDecimals()))
	}
	s := fmt.Sprintf("E_occ = %.3f %+.3f·x eV, E_virt = %.3f %+.3f·x eV (N = %d, r² = %.3f, RMSE = %.2f eV",
		c.HOMOIntercept, c.HOMOSlope, c.LUMOIntercept, c.LUMOSlope, c.N, c.R2, c.RMSE)
	if c.HOMON > 0 && c.LUMON > 0 {
		s += fmt.Sprintf("; occupied N = %d, r² = %.3f, RMSE = %.2f eV; empty N = %d, r² = %.3f, RMSE = %.2f eV",
			c.HOMON, c.HOMOR2, c.HOMORMSE, c.LUMON, c.LUMOR2, c.LUMORMSE)
	}
	return s + fmt.Sprintf("; eV figures to %s eV)", decimalStep(c.GapDecimals()))
}

// Rounding of eV figures. A calibrated eV figure is worth no more decimals than the
// uncertainty of the map that made it: it is rounded to the decimal place of the first
// significant digit of the branch RMSE (the usual way of quoting a value with its
// uncertainty; common practice, no source), i.e. decimals = ⌈−log10 RMSE⌉ held to 0–3. A
// gap, a difference of an occupied and an empty level, takes √(RMSE_occ² + RMSE_empty²)
// (independent errors). RMSE 0.5–0.8 eV gives 0.1 eV. The exact map of a method that
// computes eV itself (Direct, PPP-SCF with Koopmans' theorem) has no fit statistics; its
// π ionisation energies are off by a few tenths of an eV (from memory), so it also gets
// 0.1 eV. A calibration without statistics (RMSE 0) keeps 2 decimals. JSON output keeps
// full precision; human formats round.

// EVDecimals is how many decimals an eV level of the occupied (occupied = true) or empty
// branch deserves.
func (c Calibration) EVDecimals(occupied bool) int {
	r := c.LUMORMSE
	if occupied {
		r = c.HOMORMSE
	}
	if c.HOMON == 0 && c.LUMON == 0 {
		r = c.RMSE // a calibration that records only the pooled figures
	}
	return c.decimalsFor(r)
}

// GapDecimals is how many decimals an eV gap (empty minus occupied level) deserves.
func (c Calibration) GapDecimals() int {
	r := math.Hypot(c.HOMORMSE, c.LUMORMSE)
	if c.HOMON == 0 && c.LUMON == 0 {
		r = math.Sqrt2 * c.RMSE
	}
	return c.decimalsFor(r)
}

func (c Calibration) decimalsFor(rmse float64) int {
	switch {
	case c.Direct:
		return 1
	case !(rmse > 0) || math.IsInf(rmse, 0):
		return 2
	}
	d := int(math.Ceil(-math.Log10(rmse) - 1e-9))
	return max(0, min(3, d))
}

func decimalStep(d int) string {
	if d <= 0 {
		return "1"
	}
	return "0." + strings.Repeat("0", d-1) + "1"
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

// ErrCalibrationRange is wrapped by the error of Calibration.Check.
var ErrCalibrationRange = errors.New("calibration value outside its physical range")

// Physical ranges of a calibration, enforced by Check.
const (
	// CalInterceptMin and CalInterceptMax bound both intercepts (eV). The intercept is the
	// orbital energy at x = 0, on the scale of −IE (occupied map) or −EA (empty map).
	// First ionisation energies of neutral atoms and molecules lie between about 3.9 eV
	// (Cs) and 24.6 eV (He), electron affinities between about −4 eV (temporary anions
	// seen in electron transmission spectra) and 3.6 eV (Cl) (NIST Chemistry WebBook;
	// from memory), so an intercept outside
	// −25…+10 eV describes no molecule.
	CalInterceptMin, CalInterceptMax = -25.0, 10.0
	// CalSlopeMin and CalSlopeMax bound both slopes (eV per unit x): the slope is −|β|.
	// Empirical |β| ranges from about 0.7 eV (thermochemical) to about 3.5 eV
	// (spectroscopic and ionisation fits) (A. Streitwieser, Molecular Orbital Theory for
	// Organic Chemists, 1961, ch. 8; from memory); the bounds leave a factor of about 3 on
	// either side. A slope of zero or above would put bonding levels (x > 0) higher in
	// energy than antibonding ones.
	CalSlopeMin, CalSlopeMax = -10.0, -0.1
	// CalRMSEMax bounds the RMSE (eV): the calibration data span about 5–12 eV, so a
	// larger scatter than 10 eV is not a fit of them.
	CalRMSEMax = 10.0
)

// Check reports the first number of c outside its physical range (see the Cal*
// constants): intercepts and slopes of both maps, r² of the pooled and per-map fits in
// [0, 1] (least squares with an intercept cannot do worse than the mean), RMSEs in [0,
// CalRMSEMax], point counts not negative and, when both per-map counts are given, adding
// up to N; every float must be finite, and Name and Source hold no control characters.
// Calibrations read from files should be checked before use: a value such as 1e308
// would otherwise print as a 310-digit figure. The error wraps ErrCalibrationRange.
func (c Calibration) Check() error {
	bad := func(format string, args ...any) error {
		return fmt.Errorf("%w: %s", ErrCalibrationRange, fmt.Sprintf(format, args...))
	}
	for _, f := range []struct {
		what   string
		v      float64
		lo, hi float64
		why    string
	}{
		{"occupied-level intercept", c.HOMOIntercept, CalInterceptMin, CalInterceptMax, "eV; −IE of real molecules lies between −25 and −4 eV"},
		{"empty-level intercept", c.LUMOIntercept, CalInterceptMin, CalInterceptMax, "eV; −EA of real molecules lies between about −4 and +4 eV"},
		{"occupied-level slope", c.HOMOSlope, CalSlopeMin, CalSlopeMax, "eV per unit x; the slope is −|β|, and |β| lies between about 0.7 and 3.5 eV"},
		{"empty-level slope", c.LUMOSlope, CalSlopeMin, CalSlopeMax, "eV per unit x; the slope is −|β|, and |β| lies between about 0.7 and 3.5 eV"},
		{"r²", c.R2, 0, 1, "a least-squares fit with an intercept has 0 ≤ r² ≤ 1"},
		{"occupied-level r²", c.HOMOR2, 0, 1, "a least-squares fit with an intercept has 0 ≤ r² ≤ 1"},
		{"empty-level r²", c.LUMOR2, 0, 1, "a least-squares fit with an intercept has 0 ≤ r² ≤ 1"},
		{"RMSE", c.RMSE, 0, CalRMSEMax, "eV"},
		{"occupied-level RMSE", c.HOMORMSE, 0, CalRMSEMax, "eV"},
		{"empty-level RMSE", c.LUMORMSE, 0, CalRMSEMax, "eV"},
	} {
		const slack = 1e-9 // rounding in a file written with fixed decimals
		if math.IsNaN(f.v) || math.IsInf(f.v, 0) || f.v < f.lo-slack || f.v > f.hi+slack {
			return bad("%s %g is outside %g…%g (%s)", f.what, f.v, f.lo, f.hi, f.why)
		}
	}
	for _, n := range []struct {
		what string
		v    int
	}{{"N", c.N}, {"occupied-level N", c.HOMON}, {"empty-level N", c.LUMON}} {
		if n.v < 0 {
			return bad("%s = %d is negative (a count of reference points)", n.what, n.v)
		}
	}
	if c.HOMON > 0 && c.LUMON > 0 && c.N != c.HOMON+c.LUMON {
		return bad("N = %d is not the sum of the per-map counts %d + %d", c.N, c.HOMON, c.LUMON)
	}
	for _, t := range []struct{ what, v string }{{"name", c.Name}, {"source", c.Source}} {
		for _, r := range t.v {
			if r < 0x20 && r != '\n' && r != '\t' || r >= 0x7f && r < 0xa0 {
				return bad("%s contains the control character %U (write plain text)", t.what, r)
			}
		}
	}
	return nil
}
