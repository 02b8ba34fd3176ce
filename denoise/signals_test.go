package denoise

import (
	"math"
	"math/rand/v2"

	"unfold/internal/testsignals"
)

// The test signals of this package, from the shared generators of internal/testsignals (their
// equations, parameters and sources are documented there).

// henonX returns n samples of the Hénon map's x (a = 1.4, b = 0.3; Hénon 1976, Commun. Math.
// Phys. 50, 69) after a transient of 1000 steps from (0.1, 0.1), the first sample one step past
// it.
func henonX(n int) []float64 { return testsignals.HenonX(n, 1001) }

// lorenzX returns n samples of the Lorenz system's x (σ = 10, ρ = 28, β = 8/3; Lorenz 1963,
// J. Atmos. Sci. 20, 130) every dt time units, integrated by RK4 with 10 sub-steps from
// (1, 1, 20), after a transient of 50 time units.
func lorenzX(n int, dt float64) []float64 {
	h := dt / 10
	return testsignals.LorenzX(n, testsignals.Sampling{Initial: []float64{1, 1, 20}, Step: h, Every: 10, Skip: testsignals.Steps(50, h)})
}

// addNoise returns x plus Gaussian noise of standard deviation frac·std(x) (PCG stream 7 of
// seed), and that standard deviation.
func addNoise(x []float64, frac float64, seed uint64) ([]float64, float64) {
	return testsignals.AddNoise(x, frac, rand.New(rand.NewPCG(seed, 7)))
}

// stdOf is the population standard deviation of x.
func stdOf(x []float64) float64 { return testsignals.StdDev(x) }

// rmsDiff is the root mean square of a − b.
func rmsDiff(a, b []float64) float64 {
	var ss float64
	for i := range a {
		d := a[i] - b[i]
		ss += d * d
	}
	return math.Sqrt(ss / float64(len(a)))
}
