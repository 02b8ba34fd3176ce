package lyapunov

import (
	"math"
	"math/rand/v2"

	"unfold/models"
)

// logisticX iterates the logistic map x' = 4x(1−x) from x0 = 0.3 after 1000 dropped steps
// (CHECKS.md §13).
func logisticX(n int) []float64 {
	x := 0.3
	out := make([]float64, n)
	for i := -1000; i < n; i++ {
		x = 4 * x * (1 - x)
		if i >= 0 {
			out[i] = x
		}
	}
	return out
}

// henonX iterates the Hénon map (a = 1.4, b = 0.3) from (0.1, 0.1) after 1000 dropped steps and
// records x (CHECKS.md §13).
func henonX(n int) []float64 {
	x, y := 0.1, 0.1
	out := make([]float64, n)
	for i := -1000; i < n; i++ {
		x, y = 1-1.4*x*x+y, 0.3*x
		if i >= 0 {
			out[i] = x
		}
	}
	return out
}

// lorenzX integrates the Lorenz system (10, 28, 8/3) with RK4 (10 substeps per sample) from
// (1, 1, 1), drops t = 50 and records x every dt (CHECKS.md §13).
func lorenzX(n int, dt float64) []float64 {
	f := models.Lorenz{Sigma: 10, Rho: 28, Beta: 8.0 / 3}
	rk := models.NewRK4(f)
	s := []float64{1, 1, 1}
	h := dt / 10
	rk.Advance(s, h, int(math.Round(50/h)))
	out := make([]float64, n)
	for i := range out {
		rk.Advance(s, h, 10)
		out[i] = s[0]
	}
	return out
}

// sinesX is the quasiperiodic sum sin(t) + sin(φt) with φ the golden mean, sampled at dt.
func sinesX(n int, dt float64) []float64 {
	out := make([]float64, n)
	for i := range out {
		t := float64(i) * dt
		out[i] = math.Sin(t) + math.Sin(models.GoldenMean*t)
	}
	return out
}

// vanDerPolX is a limit cycle: x of the van der Pol oscillator x” − μ(1 − x²)x' + x = 0 with
// μ = 1 (RK4), after a transient, sampled at dt.
func vanDerPolX(n int, dt float64) []float64 {
	s := []float64{2, 0}
	k := func(d, x []float64) { d[0] = x[1]; d[1] = (1-x[0]*x[0])*x[1] - x[0] }
	step := func(h float64) {
		k1, k2, k3, k4, t := make([]float64, 2), make([]float64, 2), make([]float64, 2), make([]float64, 2), make([]float64, 2)
		k(k1, s)
		t[0], t[1] = s[0]+h/2*k1[0], s[1]+h/2*k1[1]
		k(k2, t)
		t[0], t[1] = s[0]+h/2*k2[0], s[1]+h/2*k2[1]
		k(k3, t)
		t[0], t[1] = s[0]+h*k3[0], s[1]+h*k3[1]
		k(k4, t)
		for i := range s {
			s[i] += h / 6 * (k1[i] + 2*k2[i] + 2*k3[i] + k4[i])
		}
	}
	h := dt / 10
	for range int(100 / h) {
		step(h)
	}
	out := make([]float64, n)
	for i := range out {
		for range 10 {
			step(h)
		}
		out[i] = s[0]
	}
	return out
}

// noiseX is Gaussian white noise N(0, 1).
func noiseX(n int, seed uint64) []float64 {
	rng := rand.New(rand.NewPCG(seed, 1))
	out := make([]float64, n)
	for i := range out {
		out[i] = rng.NormFloat64()
	}
	return out
}
