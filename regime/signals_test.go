package regime

import (
	"testing"

	"unfold/internal/testsignals"
	"unfold/models"
)

// simulate returns column col of the named model from package models (parameters in p, the
// model's defaults otherwise) with n samples at sampling interval dt (0: the model's)
// (internal/testsignals).
func simulate(t testing.TB, name, col string, p models.Values, n int, dt float64, seed uint64) []float64 {
	t.Helper()
	x, err := testsignals.Model(name, col, p, n, dt, seed)
	if err != nil {
		t.Fatal(err)
	}
	return x
}

// sine returns n samples of sin(2π t/period + 0.3), t = 0, 1, … (internal/testsignals).
func sine(n int, period float64) []float64 { return testsignals.Sine(n, period, 0.3) }

// twoSines returns n samples of sin(ω t) + 0.8 sin(φ ω t + 1) with φ the golden mean, ω = 0.3
// (internal/testsignals).
func twoSines(n int) []float64 {
	return testsignals.Sines(n, 1, testsignals.Tone{Amp: 1, Omega: 0.3},
		testsignals.Tone{Amp: 0.8, Omega: 0.3 * models.GoldenMean, Phase: 1})
}

// cubed returns x³ elementwise (a static monotone measurement function).
func cubed(x []float64) []float64 {
	y := make([]float64, len(x))
	for i, v := range x {
		y[i] = v * v * v
	}
	return y
}
