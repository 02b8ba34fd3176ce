package regime

import (
	"math"
	"testing"

	"unfold/internal/testsignals"
	"unfold/models"
)

// TestLinesWeakToneNearStrong: sin t + A sin φt (φ the golden mean, incommensurate) is
// quasiperiodic with exactly two independent lines for every amplitude A > 0 (exact: a torus
// with two frequencies, 1/(2π) and φ/(2π) cycles per time unit). On 2000 samples at Δt = 0.25
// the default Welch segment puts the tones about 3 bins apart, where the stronger tone's main
// lobe once hid the weaker one (A = 0.3: a "periodic" spectrum with 8 % broadband power).
func TestLinesWeakToneNearStrong(t *testing.T) {
	for _, a := range []float64{0.3, 1, 3} {
		x := testsignals.Sines(2000, 0.25, testsignals.Tone{Amp: 1, Omega: 1}, testsignals.Tone{Amp: a, Omega: models.GoldenMean})
		l, err := LineAnalysis(x, 0.25, LineOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if l.Kind != LinesQuasiperiodic || len(l.Fundamentals) != 2 {
			t.Errorf("A = %v: %s with fundamentals %v; want quasiperiodic with two", a, l.Kind, l.Fundamentals)
			continue
		}
		f1, f2 := math.Min(l.Fundamentals[0], l.Fundamentals[1]), math.Max(l.Fundamentals[0], l.Fundamentals[1])
		// Half a bin of the full-length periodogram: 0.5/(L·Δt) with L ≤ 2000.
		tol := 0.5 / (1800 * 0.25)
		if math.Abs(f1-1/(2*math.Pi)) > tol || math.Abs(f2-models.GoldenMean/(2*math.Pi)) > tol {
			t.Errorf("A = %v: fundamentals %v, %v; want 1/(2π) = %.5f and φ/(2π) = %.5f", a, f1, f2, 1/(2*math.Pi), models.GoldenMean/(2*math.Pi))
		}
	}
}
