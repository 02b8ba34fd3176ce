package regime

import (
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/dsp/fourier"

	"unfold/models"
)

// noisySim returns the first column of the named model with measurement noise of the given
// fraction of its standard deviation (package models adds it).
func noisySim(t testing.TB, name string, p models.Values, n int, dt, noise float64, seed uint64) []float64 {
	t.Helper()
	spec, err := models.Lookup(name)
	if err != nil {
		t.Fatal(err)
	}
	opt := spec.DefaultOptions()
	opt.N, opt.Seed, opt.Noise = n, seed, noise
	if dt > 0 {
		opt.Dt = dt
	}
	tr, err := spec.Simulate(p, opt)
	if err != nil {
		t.Fatal(err)
	}
	return tr.Data[0]
}

// chirp returns n samples of sin(2π(f0·t + (f1 − f0)·t²/(2n))): the frequency sweeps
// linearly from f0 to f1 cycles per sample.
func chirp(n int, f0, f1 float64) []float64 {
	x := make([]float64, n)
	for i := range x {
		t := float64(i)
		x[i] = math.Sin(2 * math.Pi * (f0*t + (f1-f0)*t*t/(2*float64(n))))
	}
	return x
}

// phaseDiffusion returns n samples of sin φ_t with φ_{t+1} = φ_t + 2π f + σ ξ_t, ξ standard
// Gaussian: a noisy limit cycle whose phase performs a random walk.
func phaseDiffusion(n int, f, sigma float64, seed uint64) []float64 {
	rng := rand.New(rand.NewPCG(seed, 1))
	x := make([]float64, n)
	phi := 0.0
	for i := range x {
		x[i] = math.Sin(phi)
		phi += 2*math.Pi*f + sigma*rng.NormFloat64()
	}
	return x
}

// powerLaw returns n samples of Gaussian noise with power spectrum ∝ 1/f^beta, made by
// spectral synthesis (random phases, amplitudes f^(−β/2)).
func powerLaw(n int, beta float64, seed uint64) []float64 {
	rng := rand.New(rand.NewPCG(seed, 2))
	fft := fourier.NewFFT(n)
	c := make([]complex128, n/2+1)
	for k := 1; k < len(c); k++ {
		a := math.Pow(float64(k), -beta/2) * rng.NormFloat64()
		b := math.Pow(float64(k), -beta/2) * rng.NormFloat64()
		c[k] = complex(a, b)
	}
	return fft.Sequence(nil, c)
}
