package huckel_test

import (
	"errors"
	"strings"
	"testing"

	"cyclopair/huckel"

	"gonum.org/v1/gonum/floats/scalar"
)

// Points on exact lines are recovered exactly (r² = 1, RMSE = 0); EV applies the right map.
func TestFitCalibrationExactLines(t *testing.T) {
	var pts []huckel.CalibrationPoint
	for _, x := range []float64{0.2, 0.5, 1.0, 1.3} {
		pts = append(pts, huckel.CalibrationPoint{Occupied: true, X: x, EnergyEV: -6 - 3*x})
		pts = append(pts, huckel.CalibrationPoint{Occupied: false, X: -x, EnergyEV: -1.5 - 3.5*(-x)})
	}
	c, err := huckel.FitCalibration(pts)
	if err != nil {
		t.Fatal(err)
	}
	const tol = 1e-12 // eV, exact data
	for _, v := range []struct {
		name      string
		got, want float64
	}{
		{"HOMO intercept", c.HOMOIntercept, -6}, {"HOMO slope", c.HOMOSlope, -3},
		{"LUMO intercept", c.LUMOIntercept, -1.5}, {"LUMO slope", c.LUMOSlope, -3.5},
		{"r²", c.R2, 1}, {"RMSE", c.RMSE, 0}, {"EV occupied", c.EV(0.618, true), -6 - 3*0.618},
		{"EV empty", c.EV(-0.618, false), -1.5 + 3.5*0.618},
	} {
		if !scalar.EqualWithinAbs(v.got, v.want, tol) {
			t.Errorf("%s = %.15g, want %.15g", v.name, v.got, v.want)
		}
	}
	if c.N != 8 || c.HOMON != 4 || c.LUMON != 4 {
		t.Errorf("counts N=%d HOMO=%d LUMO=%d", c.N, c.HOMON, c.LUMON)
	}
}

func TestFitCalibrationTooFewPoints(t *testing.T) {
	_, err := huckel.FitCalibration([]huckel.CalibrationPoint{{Occupied: true, X: 1, EnergyEV: -9}})
	if !errors.Is(err, huckel.ErrCalibration) {
		t.Errorf("err = %v, want ErrCalibration", err)
	}
}

// TestGapDecimals: eV figures are quoted to the decimal place of the first significant
// digit of their uncertainty (common practice in quoting a value with its uncertainty, no
// source); a gap's uncertainty is √(RMSE_occ² + RMSE_empty²) for independent errors.
func TestGapDecimals(t *testing.T) {
	for _, tc := range []struct {
		c           huckel.Calibration
		gap, occ    int
		description string
	}{
		{huckel.Calibration{HOMORMSE: 0.80, LUMORMSE: 0.53, HOMON: 32, LUMON: 17}, 1, 1, "default-like: gap ±0.96 eV"},
		{huckel.Calibration{HOMORMSE: 0.05, LUMORMSE: 0.05, HOMON: 5, LUMON: 5}, 2, 2, "gap ±0.071 eV and level ±0.05 eV: 0.01"},
		{huckel.Calibration{HOMORMSE: 0.02, LUMORMSE: 0.01, HOMON: 5, LUMON: 5}, 2, 2, "gap ±0.022 eV"},
		{huckel.Calibration{HOMORMSE: 1.5, LUMORMSE: 1.5, HOMON: 5, LUMON: 5}, 0, 0, "gap ±2.1 eV: whole eV"},
		{huckel.Calibration{RMSE: 0.3, N: 10}, 1, 1, "pooled figures only"},
		{huckel.Calibration{}, 2, 2, "no statistics: two decimals as before"},
		{huckel.DirectScale("ppp", -11.16, 2.39, "test"), 1, 1, "PPP Koopmans: 0.1 eV"},
	} {
		if g := tc.c.GapDecimals(); g != tc.gap {
			t.Errorf("%s: GapDecimals %d, want %d", tc.description, g, tc.gap)
		}
		if o := tc.c.EVDecimals(true); o != tc.occ {
			t.Errorf("%s: EVDecimals(occupied) %d, want %d", tc.description, o, tc.occ)
		}
	}
	c := huckel.Calibration{Name: "x", HOMOSlope: -2.9, LUMOSlope: -3.4, N: 49, R2: 0.702, RMSE: 0.71,
		HOMON: 32, HOMOR2: 0.451, HOMORMSE: 0.80, LUMON: 17, LUMOR2: 0.899, LUMORMSE: 0.53}
	d := c.Detail()
	for _, want := range []string{"occupied N = 32, r² = 0.451", "empty N = 17, r² = 0.899", "eV figures to 0.1 eV"} {
		if !strings.Contains(d, want) {
			t.Errorf("Detail %q lacks %q", d, want)
		}
	}
}
