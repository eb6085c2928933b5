package stats

import (
	"math"
	"slices"
	"testing"
)

// Mid-ranks: textbook convention (M. G. Kendall, Rank Correlation Methods, 1948, ch. 3).
func TestRanksTies(t *testing.T) {
	v := []float64{3, 1, 4, 1, 5, 1 + 1e-12}
	if got, want := Ranks(v, 0), []float64{4, 1.5, 5, 1.5, 6, 3}; !slices.Equal(got, want) {
		t.Errorf("exact ties: %v, want %v", got, want)
	}
	if got, want := Ranks(v, 1e-9), []float64{4, 2, 5, 2, 6, 2}; !slices.Equal(got, want) {
		t.Errorf("tolerance ties: %v, want %v", got, want)
	}
}

// Closed form without ties: ρ = 1 − 6Σd²/(n(n²−1)) (C. Spearman, Am. J. Psychol. 1904, 15, 72).
// For mid-ranks the sums are exact, so the result must also equal the direct Pearson formula
// bit for bit (fmo/rate computed it that way before this package existed).
func TestSpearman(t *testing.T) {
	x := []float64{10, 20, 30, 40, 50}
	y := []float64{2, 1, 4, 3, 5} // d = 1,1,1,1,0 → Σd² = 4 → ρ = 1 − 24/120 = 0.8
	if got := Spearman(x, y, 0); math.Abs(got-0.8) > 1e-15 {
		t.Errorf("ρ = %v, want 0.8", got)
	}
	ties := []float64{1, 2, 2, 3, 7, 7, 7, 4}
	other := []float64{5, 3, 8, 8, 1, 2, 9, 4}
	rx, ry := Ranks(ties, 0), Ranks(other, 0)
	var sxy, sxx, syy float64
	mx, my := 4.5, 4.5 // (n+1)/2, exact for mid-ranks
	for i := range rx {
		sxy += (rx[i] - mx) * (ry[i] - my)
		sxx += (rx[i] - mx) * (rx[i] - mx)
		syy += (ry[i] - my) * (ry[i] - my)
	}
	if got, want := Spearman(ties, other, 0), sxy/math.Sqrt(sxx*syy); got != want {
		t.Errorf("ρ = %v, direct Pearson of mid-ranks %v", got, want)
	}
	if got := Spearman([]float64{1, 1, 1}, []float64{1, 2, 3}, 0); !math.IsNaN(got) {
		t.Errorf("no spread: %v, want NaN", got)
	}
}
