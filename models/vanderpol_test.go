package models

import (
	"math"
	"math/rand/v2"
	"testing"
)

// TestVanDerPolJacobian compares the Jacobian with central finite differences of the field
// (common practice).
func TestVanDerPolJacobian(t *testing.T) {
	f := VanDerPol{Mu: 1.5}
	rng := rand.New(rand.NewPCG(5, 6))
	jac := make([]float64, 4)
	fp, fm := make([]float64, 2), make([]float64, 2)
	for trial := 0; trial < 20; trial++ {
		x := []float64{8*rng.Float64() - 4, 8*rng.Float64() - 4}
		f.Jacobian(jac, x)
		for j := 0; j < 2; j++ {
			const d = 1e-6
			xp := append([]float64(nil), x...)
			xm := append([]float64(nil), x...)
			xp[j] += d
			xm[j] -= d
			f.Field(fp, xp)
			f.Field(fm, xm)
			for i := 0; i < 2; i++ {
				fd := (fp[i] - fm[i]) / (2 * d)
				if math.Abs(fd-jac[i*2+j]) > 1e-5*(1+math.Abs(fd)) {
					t.Errorf("∂F%d/∂x%d at %v = %g, finite difference %g", i, j, x, jac[i*2+j], fd)
				}
			}
		}
	}
}

// TestVanDerPolLimitCycle: at μ = 1 the orbit from (2, 0) settles on the limit cycle, whose
// largest Lyapunov exponent is 0 (a periodic orbit of an autonomous flow) and whose amplitude
// is about 2.009 (from memory; checked loosely, ±0.02).
func TestVanDerPolLimitCycle(t *testing.T) {
	f := VanDerPol{Mu: 1}
	sp, err := FlowSpectrum(f, []float64{2, 0}, 0.01, 10, 5000, 10000)
	if err != nil {
		t.Fatal(err)
	}
	if l := sp.Exponents[0]; math.Abs(l) > 0.01 {
		t.Errorf("largest exponent %.4f, want 0 ± 0.01", l)
	}
	if l := sp.Exponents[1]; !(l < -0.5) {
		t.Errorf("second exponent %.4f, want clearly negative (the cycle attracts)", l)
	}
	rk := NewRK4(f)
	x := []float64{2, 0}
	rk.Advance(x, 0.01, 10000)
	var amp float64
	for range 2000 { // 20 time units, about three periods of 6.66
		rk.Step(x, 0.01)
		amp = max(amp, math.Abs(x[0]))
	}
	if math.Abs(amp-2.009) > 0.02 {
		t.Errorf("amplitude %.4f, want about 2.009", amp)
	}
}
