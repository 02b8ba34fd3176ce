package models

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
)

// GoldenMean is (1 + √5)/2, the default frequency ratio of the quasiperiodic signal: the most
// irrational number, so the two tones never lock.
const GoldenMean = 1.6180339887498949

// Sines is a quasiperiodic signal x(t) = Σ_k A_k sin(r_k ω t): tones at frequencies in the given
// ratios to the base angular frequency ω. With incommensurate ratios (the golden mean by default)
// the motion lies on a torus, is not periodic, and all its Lyapunov exponents are 0.
type Sines struct {
	Omega      float64   // base angular frequency, rad per time unit
	Ratios     []float64 // frequency ratios r_k
	Amplitudes []float64 // amplitudes A_k, one per ratio
}

// Generate fills dst with samples at t = (skip + i)·dt.
func (p Sines) Generate(dst []float64, dt float64, skip int, _ *rand.Rand) {
	for i := range dst {
		t := float64(skip+i) * dt
		var s float64
		for k, r := range p.Ratios {
			s += p.Amplitudes[k] * math.Sin(r*p.Omega*t)
		}
		dst[i] = s
	}
}

// AR is the linear Gaussian autoregressive process of order p,
//
//	x_t = φ_1 x_{t−1} + … + φ_p x_{t−p} + σ e_t,  e_t i.i.d. N(0, 1),
//
// (G. U. Yule, Phil. Trans. R. Soc. A 226, 267, 1927; G. E. P. Box & G. M. Jenkins, Time Series
// Analysis, 1970). An AR(1) process has variance σ²/(1 − φ²). It is the usual linear null: a
// coloured Gaussian signal with no determinism.
type AR struct {
	Phi   []float64 // coefficients φ_1 … φ_p
	Sigma float64   // innovation standard deviation
}

// Generate fills dst with samples of the process started from zeros, after discarding skip
// samples (the burn-in). dt does not enter: the process is defined per sample.
func (p AR) Generate(dst []float64, _ float64, skip int, rng *rand.Rand) {
	n := len(p.Phi)
	hist := make([]float64, n) // hist[j] = x_{t−1−j}
	for i := -skip; i < len(dst); i++ {
		x := p.Sigma * rng.NormFloat64()
		for j, phi := range p.Phi {
			x += phi * hist[j]
		}
		if n > 0 {
			copy(hist[1:], hist[:n-1])
			hist[0] = x
		}
		if i >= 0 {
			dst[i] = x
		}
	}
}

// Stationary reports whether the AR coefficients describe a stationary process (all roots of
// 1 − φ_1 z − … − φ_p z^p outside the unit circle). It runs the Levinson–Durbin recursion
// backwards (the step-down or Schur–Cohn test): the process is stationary exactly when every
// partial autocorrelation has modulus below 1 (F. L. Ramsey, Ann. Statist. 2, 1296, 1974).
func (p AR) Stationary() bool {
	a := append([]float64(nil), p.Phi...)
	for k := len(a); k >= 1; k-- {
		kap := a[k-1]
		if !(math.Abs(kap) < 1) {
			return false
		}
		d := 1 - kap*kap
		b := make([]float64, k-1)
		for j := 1; j <= k-1; j++ {
			b[j-1] = (a[j-1] + kap*a[k-j-1]) / d
		}
		a = b
	}
	return true
}

// WhiteNoise is Gaussian white noise: i.i.d. samples N(Mean, Sigma²).
type WhiteNoise struct{ Mean, Sigma float64 }

// Generate fills dst with independent Gaussian samples.
func (p WhiteNoise) Generate(dst []float64, _ float64, _ int, rng *rand.Rand) {
	for i := range dst {
		dst[i] = p.Mean + p.Sigma*rng.NormFloat64()
	}
}

func sinesSpec() Spec {
	return Spec{
		Name:      "sines",
		Title:     "quasiperiodic sum of sines",
		Kind:      KindProcess,
		Equations: "x(t) = Σ_k A_k sin(r_k·ω·t)",
		Reference: "quasiperiodic motion on a torus; golden-mean ratio by default",
		Params: []Param{
			{Name: "omega", Symbol: "ω", Doc: "base angular frequency (rad per time unit)", Default: []float64{1}},
			{Name: "ratios", Symbol: "r", Doc: "frequency ratios r_k", Default: []float64{1, GoldenMean}, List: true},
			{Name: "amplitudes", Symbol: "A", Doc: "amplitudes A_k (one value applies to every tone)", Default: []float64{1}, List: true},
		},
		Columns:   []string{"x"},
		Initial:   nil,
		Dt:        0.25,
		Transient: 0,
		build: func(v Values) (System, error) {
			ratios := v["ratios"]
			amps := v["amplitudes"]
			if len(amps) == 1 && len(ratios) > 1 {
				a := make([]float64, len(ratios))
				for i := range a {
					a[i] = amps[0]
				}
				amps = a
			}
			if len(amps) != len(ratios) {
				return System{}, fmt.Errorf("%d amplitudes for %d frequency ratios", len(amps), len(ratios))
			}
			return System{Process: Sines{Omega: one(v, "omega"), Ratios: ratios, Amplitudes: amps}}, nil
		},
	}
}

func arSpec() Spec {
	return Spec{
		Name:      "ar",
		Title:     "linear Gaussian autoregressive process AR(p)",
		Kind:      KindProcess,
		Equations: "x_t = φ_1·x_{t−1} + … + φ_p·x_{t−p} + σ·e_t,  e_t ~ N(0, 1) i.i.d.",
		Reference: "G. U. Yule, Phil. Trans. R. Soc. A 226, 267 (1927); Box & Jenkins, Time Series Analysis (1970)",
		Params: []Param{
			{Name: "phi", Symbol: "φ", Doc: "coefficients φ_1 … φ_p (the order p is their number)", Default: []float64{0.9}, List: true},
			{Name: "sigma", Symbol: "σ", Doc: "innovation standard deviation", Default: []float64{1}},
		},
		Columns:   []string{"x"},
		Dt:        1,
		Transient: 1000,
		build: func(v Values) (System, error) {
			p := AR{Phi: v["phi"], Sigma: one(v, "sigma")}
			if !(p.Sigma >= 0) {
				return System{}, errors.New("sigma must be non-negative")
			}
			if !p.Stationary() {
				return System{}, fmt.Errorf("coefficients %v give a non-stationary process (a root of the characteristic polynomial lies on or inside the unit circle)", p.Phi)
			}
			return System{Process: p}, nil
		},
	}
}

func noiseSpec() Spec {
	return Spec{
		Name:      "noise",
		Title:     "Gaussian white noise",
		Kind:      KindProcess,
		Equations: "x_t ~ N(μ, σ²) i.i.d.",
		Reference: "the trivial stochastic null",
		Params: []Param{
			{Name: "mean", Symbol: "μ", Doc: "mean", Default: []float64{0}},
			{Name: "sigma", Symbol: "σ", Doc: "standard deviation", Default: []float64{1}},
		},
		Columns:   []string{"x"},
		Dt:        1,
		Transient: 0,
		build: func(v Values) (System, error) {
			p := WhiteNoise{Mean: one(v, "mean"), Sigma: one(v, "sigma")}
			if !(p.Sigma >= 0) {
				return System{}, errors.New("sigma must be non-negative")
			}
			return System{Process: p}, nil
		},
	}
}
