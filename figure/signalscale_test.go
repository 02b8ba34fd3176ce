package figure

import (
	"math"
	"testing"
)

// TestWelchScaledUnits: scaling by a power of two is exact, so the spectrum of x·2^k is the
// spectrum of x times 2^2k (arithmetic); beyond float64 it is given relative to its peak.
func TestWelchScaledUnits(t *testing.T) {
	x := make([]float64, 256)
	for i := range x {
		x[i] = float64(i%7) - 3
	}
	_, ref, rel := welchScaled(x, 1)
	if rel {
		t.Fatal("unit record reported relative")
	}
	_, p, rel := welchScaled(scale2(x, 300), 1)
	for k := range p {
		if rel || p[k] != math.Ldexp(ref[k], 600) {
			t.Fatalf("2^300: bin %d power %g, want %g", k, p[k], math.Ldexp(ref[k], 600))
		}
	}
	_, p, rel = welchScaled(scale2(x, 1020), 1)
	peak := 0.0
	for _, v := range ref {
		peak = math.Max(peak, v)
	}
	for k := range p {
		if !rel || p[k] != ref[k]/peak {
			t.Fatalf("2^1020: relative %v, bin %d %g, want %g", rel, k, p[k], ref[k]/peak)
		}
	}
}

func scale2(x []float64, k int) []float64 {
	y := make([]float64, len(x))
	for i, v := range x {
		y[i] = math.Ldexp(v, k)
	}
	return y
}
