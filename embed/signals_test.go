package embed

import (
	"math/rand/v2"

	"unfold/internal/testsignals"
)

// The test signals of this package, from the shared generators of internal/testsignals (their
// equations, parameters and sources are documented there; CHECKS.md §13 parameters).

// lorenzX returns n samples of x of the Lorenz system (σ = 10, ρ = 28, β = 8/3), RK4 with
// step dt, from (1, 1, 1) after a transient of 50 time units.
func lorenzX(n int, dt float64) []float64 {
	return testsignals.LorenzX(n, testsignals.Sampling{Step: dt, Skip: testsignals.Steps(50, dt)})
}

// henonX returns n samples of x of the Hénon map (a = 1.4, b = 0.3) from (0.1, 0.1) after
// 1000 iterations.
func henonX(n int) []float64 { return testsignals.HenonX(n, 1000) }

// logisticX returns n samples of the logistic map x' = 4x(1−x) from 0.3 after 1000 steps.
func logisticX(n int) []float64 { return testsignals.Logistic(n, 4, 0.3, 1000) }

// ar1 returns n samples of x_t = φ x_{t−1} + e_t with standard Gaussian e_t, started from the
// stationary distribution (PCG stream 1 of seed).
func ar1(n int, phi float64, seed uint64) []float64 {
	return testsignals.AR1Stationary(n, phi, rand.New(rand.NewPCG(seed, 1)))
}

// whiteNoise returns n independent standard Gaussian samples (PCG stream 2 of seed).
func whiteNoise(n int, seed uint64) []float64 {
	return testsignals.WhiteNoise(n, rand.New(rand.NewPCG(seed, 2)))
}

// sine returns n samples of sin(2πt/period + 0.3) for t = 0, 1, ….
func sine(n int, period float64) []float64 { return testsignals.Sine(n, period, 0.3) }

// rosslerX returns n samples of x of the Rössler system (a = b = 0.2, c = 5.7), RK4 with step
// h, sampled every `every` steps, from (1, 1, 1) after a transient of 100 time units.
func rosslerX(n int, h float64, every int) []float64 {
	return testsignals.RosslerX(n, testsignals.Sampling{Step: h, Every: every, Skip: testsignals.Steps(100, h)})
}
