package embed

import (
	"math"
	"math/rand/v2"
)

// Test signals generated locally so that the tests stand alone (CHECKS.md §13 parameters).

// lorenzX returns n samples of x of the Lorenz system (σ = 10, r = 28, β = 8/3), RK4 with
// step dt, from (1, 1, 1) after a transient of 50 time units.
func lorenzX(n int, dt float64) []float64 {
	const sigma, r, beta = 10.0, 28.0, 8.0 / 3
	f := func(s [3]float64) [3]float64 {
		return [3]float64{sigma * (s[1] - s[0]), s[0]*(r-s[2]) - s[1], s[0]*s[1] - beta*s[2]}
	}
	add := func(a, b [3]float64, h float64) [3]float64 {
		return [3]float64{a[0] + h*b[0], a[1] + h*b[1], a[2] + h*b[2]}
	}
	s := [3]float64{1, 1, 1}
	step := func() {
		k1 := f(s)
		k2 := f(add(s, k1, dt/2))
		k3 := f(add(s, k2, dt/2))
		k4 := f(add(s, k3, dt))
		for i := range s {
			s[i] += dt / 6 * (k1[i] + 2*k2[i] + 2*k3[i] + k4[i])
		}
	}
	for i := 0; i < int(50/dt); i++ {
		step()
	}
	x := make([]float64, n)
	for i := range x {
		x[i] = s[0]
		step()
	}
	return x
}

// henonX returns n samples of x of the Hénon map (a = 1.4, b = 0.3) from (0.1, 0.1) after
// 1000 iterations.
func henonX(n int) []float64 {
	x, y := 0.1, 0.1
	for i := 0; i < 1000; i++ {
		x, y = 1-1.4*x*x+y, 0.3*x
	}
	out := make([]float64, n)
	for i := range out {
		out[i] = x
		x, y = 1-1.4*x*x+y, 0.3*x
	}
	return out
}

// logisticX returns n samples of the logistic map x' = 4x(1−x) from 0.3 after 1000 steps.
func logisticX(n int) []float64 {
	x := 0.3
	for i := 0; i < 1000; i++ {
		x = 4 * x * (1 - x)
	}
	out := make([]float64, n)
	for i := range out {
		out[i] = x
		x = 4 * x * (1 - x)
	}
	return out
}

// ar1 returns n samples of x_t = φ x_{t−1} + e_t with standard Gaussian e_t, started from the
// stationary distribution.
func ar1(n int, phi float64, seed uint64) []float64 {
	rng := rand.New(rand.NewPCG(seed, 1))
	out := make([]float64, n)
	x := rng.NormFloat64() / math.Sqrt(1-phi*phi)
	for i := range out {
		out[i] = x
		x = phi*x + rng.NormFloat64()
	}
	return out
}

// whiteNoise returns n independent standard Gaussian samples.
func whiteNoise(n int, seed uint64) []float64 {
	rng := rand.New(rand.NewPCG(seed, 2))
	out := make([]float64, n)
	for i := range out {
		out[i] = rng.NormFloat64()
	}
	return out
}

// sine returns n samples of sin(2πt/period + 0.3) for t = 0, 1, ….
func sine(n int, period float64) []float64 {
	out := make([]float64, n)
	for i := range out {
		out[i] = math.Sin(2*math.Pi*float64(i)/period + 0.3)
	}
	return out
}

// rosslerX returns n samples of x of the Rössler system (a = b = 0.2, c = 5.7), RK4 with step
// h, sampled every `every` steps, from (1, 1, 1) after a transient of 100 time units.
func rosslerX(n int, h float64, every int) []float64 {
	const a, b, c = 0.2, 0.2, 5.7
	f := func(s [3]float64) [3]float64 {
		return [3]float64{-s[1] - s[2], s[0] + a*s[1], b + s[2]*(s[0]-c)}
	}
	add := func(p, q [3]float64, k float64) [3]float64 {
		return [3]float64{p[0] + k*q[0], p[1] + k*q[1], p[2] + k*q[2]}
	}
	s := [3]float64{1, 1, 1}
	step := func() {
		k1 := f(s)
		k2 := f(add(s, k1, h/2))
		k3 := f(add(s, k2, h/2))
		k4 := f(add(s, k3, h))
		for i := range s {
			s[i] += h / 6 * (k1[i] + 2*k2[i] + 2*k3[i] + k4[i])
		}
	}
	for i := 0; i < int(100/h); i++ {
		step()
	}
	x := make([]float64, n)
	for i := range x {
		x[i] = s[0]
		for j := 0; j < every; j++ {
			step()
		}
	}
	return x
}
