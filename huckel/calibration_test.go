package huckel_test

import (
	"errors"
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
