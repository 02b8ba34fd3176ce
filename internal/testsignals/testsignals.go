// Package testsignals holds the synthetic signals that the tests of every package share: the
// Lorenz, Rössler and van der Pol flows, the Hénon and logistic maps, AR(1) and white noise,
// sines and sums of sines, and Gaussian measurement noise. The flows and maps are the
// published model systems of package models run through its one integrator (models.RK4), so
// that a test signal and `unfold simulate` come from the same equations and the same
// arithmetic.
//
// Every generator states its equations, parameters, initial condition and the transient it
// drops; every random signal takes an explicit *rand.Rand, so its seed and stream stay in the
// caller's sight. The sampling is given explicitly (step, steps per sample, steps dropped)
// rather than as a time span, because the tests check published values with tolerances and
// each test's sequence must stay exactly the one it was written against.
//
// Convention for flows and maps: the first sample is the state after Skip steps (iterations);
// each further sample is Every steps (one iteration) later. A loop that steps before it records
// is the same sequence with Skip one sampling interval larger.
package testsignals

import (
	"math"
	"math/rand/v2"

	"unfold/models"
)

// Sampling says how a flow is integrated and sampled: classical RK4 (models.RK4) at step Step
// from Initial, Skip steps dropped, then one sample every Every steps.
type Sampling struct {
	// Initial is the initial state; nil takes the generator's default (given in its comment).
	Initial []float64
	// Step is the RK4 step h in time units.
	Step float64
	// Every is the number of RK4 steps between samples; 0 means 1 (the sampling interval is
	// Every·Step).
	Every int
	// Skip is the number of RK4 steps dropped before the first sample (the transient).
	Skip int
}

// Steps returns the number of steps of length h in the time span t, rounded to the nearest
// integer: the usual way to turn a transient in time units into Sampling.Skip.
func Steps(t, h float64) int { return int(math.Round(t / h)) }

// Sub returns the sampling at interval dt with k RK4 steps per sample (step dt/k), from the
// generator's default initial state, dropping the transient t (time units, rounded to whole
// steps by Steps).
func Sub(dt float64, k int, t float64) Sampling {
	h := dt / float64(k)
	return Sampling{Step: h, Every: k, Skip: Steps(t, h)}
}

// Flow integrates f as s says, from init when s.Initial is nil, and returns n samples of the
// state variables cols (all of them when cols is empty), one slice per variable.
func Flow(f models.Flow, init []float64, n int, s Sampling, cols ...int) [][]float64 {
	x := append([]float64(nil), init...)
	if s.Initial != nil {
		x = append(x[:0], s.Initial...)
	}
	if len(cols) == 0 {
		cols = make([]int, f.Dim())
		for i := range cols {
			cols[i] = i
		}
	}
	every := max(s.Every, 1)
	rk := models.NewRK4(f)
	rk.Advance(x, s.Step, s.Skip)
	out := make([][]float64, len(cols))
	for c := range out {
		out[c] = make([]float64, n)
	}
	for i := 0; i < n; i++ {
		if i > 0 {
			rk.Advance(x, s.Step, every)
		}
		for c, j := range cols {
			out[c][i] = x[j]
		}
	}
	return out
}

// lorenz63 is the Lorenz (1963) flow at its usual chaotic parameters σ = 10, ρ = 28, β = 8/3
// (E. N. Lorenz, "Deterministic nonperiodic flow", J. Atmos. Sci. 20, 130, 1963).
func lorenz63() models.Lorenz { return models.Lorenz{Sigma: 10, Rho: 28, Beta: 8.0 / 3} }

// LorenzXYZ returns n samples of x, y and z of the Lorenz (1963) flow
//
//	ẋ = σ(y − x),  ẏ = x(ρ − z) − y,  ż = xy − βz,  σ = 10, ρ = 28, β = 8/3,
//
// integrated and sampled as s says, from (1, 1, 1) unless s.Initial is set. Its largest
// Lyapunov exponent is 0.9056 per time unit (CHECKS.md §2).
func LorenzXYZ(n int, s Sampling) (x, y, z []float64) {
	c := Flow(lorenz63(), []float64{1, 1, 1}, n, s)
	return c[0], c[1], c[2]
}

// LorenzX returns n samples of x of the Lorenz (1963) flow, as LorenzXYZ.
func LorenzX(n int, s Sampling) []float64 {
	return Flow(lorenz63(), []float64{1, 1, 1}, n, s, 0)[0]
}

// RosslerX returns n samples of x of the Rössler (1976) flow
//
//	ẋ = −y − z,  ẏ = x + a y,  ż = b + z(x − c),  a = b = 0.2, c = 5.7
//
// (O. E. Rössler, "An equation for continuous chaos", Phys. Lett. A 57, 397, 1976), integrated
// and sampled as s says, from (1, 1, 1) unless s.Initial is set. One loop takes about 6 time
// units.
func RosslerX(n int, s Sampling) []float64 {
	return Flow(models.Rossler{A: 0.2, B: 0.2, C: 5.7}, []float64{1, 1, 1}, n, s, 0)[0]
}

// VanDerPolX returns n samples of x of the van der Pol oscillator ẍ − μ(1 − x²)ẋ + x = 0
// (models.VanDerPol; B. van der Pol, Phil. Mag. 2, 978, 1926), integrated and sampled as s
// says, from (x, x') = (2, 0) unless s.Initial is set. After the transient it is a limit
// cycle: a periodic signal with largest Lyapunov exponent 0.
func VanDerPolX(n int, mu float64, s Sampling) []float64 {
	return Flow(models.VanDerPol{Mu: mu}, []float64{2, 0}, n, s, 0)[0]
}

// Iterate runs the map m from init, drops skip iterations and returns n samples of the state
// variables cols (all of them when cols is empty): sample i is the state after skip + i
// iterations.
func Iterate(m models.Map, init []float64, n, skip int, cols ...int) [][]float64 {
	x := append([]float64(nil), init...)
	y := make([]float64, len(x))
	if len(cols) == 0 {
		cols = make([]int, m.Dim())
		for i := range cols {
			cols[i] = i
		}
	}
	for k := 0; k < skip; k++ {
		m.Step(y, x)
		x, y = y, x
	}
	out := make([][]float64, len(cols))
	for c := range out {
		out[c] = make([]float64, n)
	}
	for i := 0; i < n; i++ {
		if i > 0 {
			m.Step(y, x)
			x, y = y, x
		}
		for c, j := range cols {
			out[c][i] = x[j]
		}
	}
	return out
}

// HenonX returns n samples of x of the Hénon (1976) map
//
//	x' = 1 − a x² + y,  y' = b x,  a = 1.4, b = 0.3
//
// (M. Hénon, "A two-dimensional mapping with a strange attractor", Commun. Math. Phys. 50, 69,
// 1976) from (0.1, 0.1): sample i is x after skip + i iterations. Its Lyapunov exponents are
// 0.419 and −1.623 per iteration (CHECKS.md §2), its correlation dimension about 1.21 (§4).
func HenonX(n, skip int) []float64 {
	return Iterate(models.Henon{A: 1.4, B: 0.3}, []float64{0.1, 0.1}, n, skip, 0)[0]
}

// Logistic returns n samples of the logistic map x' = r x(1 − x) (R. M. May, "Simple
// mathematical models with very complicated dynamics", Nature 261, 459, 1976) from x0: sample
// i is x after skip + i iterations. At r = 4 the Lyapunov exponent is exactly ln 2.
func Logistic(n int, r, x0 float64, skip int) []float64 {
	return Iterate(models.Logistic{R: r}, []float64{x0}, n, skip)[0]
}

// WhiteNoise returns n independent standard Gaussian samples N(0, 1) drawn from rng
// (models.WhiteNoise).
func WhiteNoise(n int, rng *rand.Rand) []float64 {
	x := make([]float64, n)
	models.WhiteNoise{Mean: 0, Sigma: 1}.Generate(x, 1, 0, rng)
	return x
}

// AR1 returns n samples of the AR(1) process x_t = φ x_{t−1} + e_t, e_t i.i.d. N(0, 1) drawn
// from rng (models.AR; Yule 1927), started from 0 with the first burn samples dropped; its
// variance is 1/(1 − φ²).
func AR1(n int, phi float64, burn int, rng *rand.Rand) []float64 {
	x := make([]float64, n)
	models.AR{Phi: []float64{phi}, Sigma: 1}.Generate(x, 1, burn, rng)
	return x
}

// AR1Stationary returns n samples of the AR(1) process x_t = φ x_{t−1} + e_t, e_t i.i.d.
// N(0, 1) drawn from rng, started exactly in the stationary distribution: x_0 = e_0/√(1 − φ²),
// so no burn-in is needed. It needs |φ| < 1.
func AR1Stationary(n int, phi float64, rng *rand.Rand) []float64 {
	out := make([]float64, n)
	x := rng.NormFloat64() / math.Sqrt(1-phi*phi)
	for i := range out {
		out[i] = x
		x = phi*x + rng.NormFloat64()
	}
	return out
}

// Sine returns n samples of sin(2π i/period + phase), i = 0, 1, …: a pure tone of the given
// period in samples.
func Sine(n int, period, phase float64) []float64 {
	out := make([]float64, n)
	for i := range out {
		out[i] = math.Sin(2*math.Pi*float64(i)/period + phase)
	}
	return out
}

// Tone is one term A sin(ω t + φ) of a sum of sines.
type Tone struct {
	Amp, Omega, Phase float64 // amplitude A, angular frequency ω (rad per time unit), phase φ
}

// Sines returns n samples at t = i·dt of Σ_k A_k sin(ω_k t + φ_k). With incommensurate
// frequencies (ratio models.GoldenMean, say) the signal is quasiperiodic: motion on a torus,
// all Lyapunov exponents 0.
func Sines(n int, dt float64, tones ...Tone) []float64 {
	out := make([]float64, n)
	for i := range out {
		t := float64(i) * dt
		var s float64
		for _, tn := range tones {
			s += tn.Amp * math.Sin(tn.Omega*t+tn.Phase)
		}
		out[i] = s
	}
	return out
}

// AddNoise returns x plus Gaussian measurement noise of standard deviation frac·std(x) (the
// population standard deviation) drawn from rng, and that standard deviation.
func AddNoise(x []float64, frac float64, rng *rand.Rand) ([]float64, float64) {
	sd := StdDev(x) * frac
	y := make([]float64, len(x))
	for i, v := range x {
		y[i] = v + sd*rng.NormFloat64()
	}
	return y, sd
}

// StdDev returns the population standard deviation of x (0 for an empty x).
func StdDev(x []float64) float64 {
	if len(x) == 0 {
		return 0
	}
	var m, ss float64
	for _, v := range x {
		m += v
	}
	m /= float64(len(x))
	for _, v := range x {
		ss += (v - m) * (v - m)
	}
	return math.Sqrt(ss / float64(len(x)))
}

// Model returns column col (the first column when col is "" or absent) of n samples of the
// built-in model called name, simulated by models.Spec.Simulate at the model's default sampling
// (models.Spec.DefaultOptions: its initial condition, transient and RK4 substeps), with the
// parameters p laid over its defaults, sampling interval dt (0: the model's) and the given
// seed: the signal `unfold simulate` writes.
func Model(name, col string, p models.Values, n int, dt float64, seed uint64) ([]float64, error) {
	spec, err := models.Lookup(name)
	if err != nil {
		return nil, err
	}
	opt := spec.DefaultOptions()
	opt.N, opt.Seed = n, seed
	if dt > 0 {
		opt.Dt = dt
	}
	tr, err := spec.Simulate(p, opt)
	if err != nil {
		return nil, err
	}
	if x := tr.Column(col); x != nil {
		return x, nil
	}
	return tr.Data[0], nil
}
