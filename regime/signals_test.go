package regime

import (
	"math"
	"testing"

	"unfold/models"
)

// simulate returns column col of the named model from package models (parameters in p, the
// model's defaults otherwise) with n samples at sampling interval dt (0: the model's).
func simulate(t testing.TB, name, col string, p models.Values, n int, dt float64, seed uint64) []float64 {
	t.Helper()
	spec, err := models.Lookup(name)
	if err != nil {
		t.Fatal(err)
	}
	opt := spec.DefaultOptions()
	opt.N, opt.Seed = n, seed
	if dt > 0 {
		opt.Dt = dt
	}
	tr, err := spec.Simulate(p, opt)
	if err != nil {
		t.Fatal(err)
	}
	x := tr.Column(col)
	if x == nil {
		x = tr.Data[0]
	}
	return x
}

// sine returns n samples of sin(2π t/period) + phase offset.
func sine(n int, period float64) []float64 {
	x := make([]float64, n)
	for i := range x {
		x[i] = math.Sin(2*math.Pi*float64(i)/period + 0.3)
	}
	return x
}

// twoSines returns n samples of sin(ω t) + 0.8 sin(φ ω t + 1) with φ the golden mean, ω = 0.3.
func twoSines(n int) []float64 {
	x := make([]float64, n)
	for i := range x {
		t := float64(i)
		x[i] = math.Sin(0.3*t) + 0.8*math.Sin(0.3*models.GoldenMean*t+1)
	}
	return x
}

// cubed returns x³ elementwise (a static monotone measurement function).
func cubed(x []float64) []float64 {
	y := make([]float64, len(x))
	for i, v := range x {
		y[i] = v * v * v
	}
	return y
}
