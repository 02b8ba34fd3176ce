package lyapunov

import (
	"math/rand/v2"

	"unfold/internal/testsignals"
	"unfold/models"
)

// The test signals of this package, from the shared generators of internal/testsignals (their
// equations, parameters and sources are documented there). Each samples after stepping, so the
// first sample is one sampling interval past the transient.

// logisticX iterates the logistic map x' = 4x(1−x) from x0 = 0.3 after 1000 dropped steps
// (CHECKS.md §13).
func logisticX(n int) []float64 { return testsignals.Logistic(n, 4, 0.3, 1001) }

// henonX iterates the Hénon map (a = 1.4, b = 0.3) from (0.1, 0.1) after 1000 dropped steps and
// records x (CHECKS.md §13).
func henonX(n int) []float64 { return testsignals.HenonX(n, 1001) }

// lorenzX integrates the Lorenz system (10, 28, 8/3) with RK4 (10 substeps per sample) from
// (1, 1, 1), drops t = 50 and records x every dt (CHECKS.md §13).
func lorenzX(n int, dt float64) []float64 {
	h := dt / 10
	return testsignals.LorenzX(n, testsignals.Sampling{Step: h, Every: 10, Skip: testsignals.Steps(50, h) + 10})
}

// sinesX is the quasiperiodic sum sin(t) + sin(φt) with φ the golden mean, sampled at dt.
func sinesX(n int, dt float64) []float64 {
	return testsignals.Sines(n, dt, testsignals.Tone{Amp: 1, Omega: 1}, testsignals.Tone{Amp: 1, Omega: models.GoldenMean})
}

// vanDerPolX is a limit cycle: x of the van der Pol oscillator x” − μ(1 − x²)x' + x = 0 with
// μ = 1 (RK4, 10 substeps per sample) from (2, 0), after a transient of 100 time units, sampled
// at dt.
func vanDerPolX(n int, dt float64) []float64 {
	h := dt / 10
	return testsignals.VanDerPolX(n, 1, testsignals.Sampling{Step: h, Every: 10, Skip: testsignals.Steps(100, h) + 10})
}

// noiseX is Gaussian white noise N(0, 1) (PCG stream 1 of seed).
func noiseX(n int, seed uint64) []float64 {
	return testsignals.WhiteNoise(n, rand.New(rand.NewPCG(seed, 1)))
}
