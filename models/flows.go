package models

import (
	"errors"
	"math"
)

// Lorenz is the Lorenz (1963) convection flow
//
//	ẋ = σ(y − x),  ẏ = x(ρ − z) − y,  ż = xy − βz,
//
// from E. N. Lorenz, "Deterministic nonperiodic flow", J. Atmos. Sci. 20, 130 (1963). The usual
// chaotic parameters are σ = 10, ρ = 28, β = 8/3. Its divergence is the constant −(σ + 1 + β).
type Lorenz struct{ Sigma, Rho, Beta float64 }

// Dim returns 3.
func (Lorenz) Dim() int { return 3 }

// Field writes the Lorenz vector field at x into dst.
func (f Lorenz) Field(dst, x []float64) {
	dst[0] = f.Sigma * (x[1] - x[0])
	dst[1] = x[0]*(f.Rho-x[2]) - x[1]
	dst[2] = x[0]*x[1] - f.Beta*x[2]
}

// Jacobian writes the Jacobian of the Lorenz field at x into jac (row-major 3×3).
func (f Lorenz) Jacobian(jac, x []float64) {
	jac[0], jac[1], jac[2] = -f.Sigma, f.Sigma, 0
	jac[3], jac[4], jac[5] = f.Rho-x[2], -1, -x[0]
	jac[6], jac[7], jac[8] = x[1], x[0], -f.Beta
}

// Rossler is the Rössler (1976) flow
//
//	ẋ = −y − z,  ẏ = x + a y,  ż = b + z(x − c),
//
// from O. E. Rössler, "An equation for continuous chaos", Phys. Lett. A 57, 397 (1976). The usual
// chaotic parameters are a = 0.2, b = 0.2, c = 5.7.
type Rossler struct{ A, B, C float64 }

// Dim returns 3.
func (Rossler) Dim() int { return 3 }

// Field writes the Rössler vector field at x into dst.
func (f Rossler) Field(dst, x []float64) {
	dst[0] = -x[1] - x[2]
	dst[1] = x[0] + f.A*x[1]
	dst[2] = f.B + x[2]*(x[0]-f.C)
}

// Jacobian writes the Jacobian of the Rössler field at x into jac (row-major 3×3).
func (f Rossler) Jacobian(jac, x []float64) {
	jac[0], jac[1], jac[2] = 0, -1, -1
	jac[3], jac[4], jac[5] = 1, f.A, 0
	jac[6], jac[7], jac[8] = x[2], 0, x[0]-f.C
}

// Duffing is the forced Duffing oscillator
//
//	ẍ + δẋ + αx + βx³ = γ cos(ωt),
//
// written as the autonomous flow (x, v, θ): ẋ = v, v̇ = −δv − αx − βx³ + γ cos θ, θ̇ = ω, so the
// forcing phase θ = ωt is the third state variable and contributes one zero Lyapunov exponent.
// With α = 0, β = 1, δ = 0.05, γ = 7.5, ω = 1 it is Ueda's oscillator (Y. Ueda, "Randomly
// transitional phenomena in the system governed by Duffing's equation", J. Stat. Phys. 20, 181,
// 1979); with δ = 0.25, α = −1, β = 1, γ = 0.4, ω = 1 it is the two-well (buckled beam) form of
// F. C. Moon & P. J. Holmes, "A magnetoelastic strange attractor", J. Sound Vib. 65, 275 (1979).
// The divergence is the constant −δ.
type Duffing struct{ Delta, Alpha, Beta, Gamma, Omega float64 }

// Dim returns 3 (position, velocity, forcing phase).
func (Duffing) Dim() int { return 3 }

// Field writes the Duffing vector field at x = (x, v, θ) into dst.
func (f Duffing) Field(dst, x []float64) {
	p, v := x[0], x[1]
	dst[0] = v
	dst[1] = -f.Delta*v - f.Alpha*p - f.Beta*p*p*p + f.Gamma*math.Cos(x[2])
	dst[2] = f.Omega
}

// Jacobian writes the Jacobian of the Duffing field at x into jac (row-major 3×3).
func (f Duffing) Jacobian(jac, x []float64) {
	p := x[0]
	jac[0], jac[1], jac[2] = 0, 1, 0
	jac[3], jac[4], jac[5] = -f.Alpha-3*f.Beta*p*p, -f.Delta, -f.Gamma*math.Sin(x[2])
	jac[6], jac[7], jac[8] = 0, 0, 0
}

func lorenzSpec() Spec {
	return Spec{
		Name:      "lorenz",
		Title:     "Lorenz (1963) convection flow",
		Kind:      KindFlow,
		Equations: "x' = σ(y − x),  y' = x(ρ − z) − y,  z' = xy − βz",
		Reference: "E. N. Lorenz, Deterministic nonperiodic flow, J. Atmos. Sci. 20, 130 (1963)",
		Params: []Param{
			{Name: "sigma", Symbol: "σ", Doc: "Prandtl number", Default: []float64{10}},
			{Name: "rho", Symbol: "ρ", Doc: "reduced Rayleigh number", Default: []float64{28}},
			{Name: "beta", Symbol: "β", Doc: "geometric factor", Default: []float64{8.0 / 3.0}},
		},
		Columns:   []string{"x", "y", "z"},
		Initial:   []float64{1, 1, 1},
		Dt:        0.01,
		Transient: 50,
		SpectrumN: 100000, // T = 1000 at dt = 0.01
		build: func(v Values) (System, error) {
			return System{Flow: Lorenz{Sigma: one(v, "sigma"), Rho: one(v, "rho"), Beta: one(v, "beta")}}, nil
		},
	}
}

func rosslerSpec() Spec {
	return Spec{
		Name:      "rossler",
		Title:     "Rössler (1976) flow",
		Kind:      KindFlow,
		Equations: "x' = −y − z,  y' = x + a·y,  z' = b + z(x − c)",
		Reference: "O. E. Rössler, An equation for continuous chaos, Phys. Lett. A 57, 397 (1976)",
		Params: []Param{
			{Name: "a", Symbol: "a", Doc: "feedback of y", Default: []float64{0.2}},
			{Name: "b", Symbol: "b", Doc: "constant injection", Default: []float64{0.2}},
			{Name: "c", Symbol: "c", Doc: "threshold", Default: []float64{5.7}},
		},
		Columns:   []string{"x", "y", "z"},
		Initial:   []float64{1, 1, 1},
		Dt:        0.01,
		Transient: 100,
		SpectrumN: 500000, // T = 5000 at dt = 0.01
		build: func(v Values) (System, error) {
			return System{Flow: Rossler{A: one(v, "a"), B: one(v, "b"), C: one(v, "c")}}, nil
		},
	}
}

func duffingSpec() Spec {
	return Spec{
		Name:  "duffing",
		Title: "forced Duffing oscillator (defaults: Ueda's form; two-well form: --delta 0.25 --alpha -1 --gamma 0.4)",
		Kind:  KindFlow,
		Equations: "x'' + δx' + αx + βx³ = γ cos(ωt), integrated as x' = v, v' = −δv − αx − βx³ + γ cos θ, θ' = ω " +
			"(the forcing phase θ is a state variable, so one exponent is 0)",
		Reference: "Y. Ueda, J. Stat. Phys. 20, 181 (1979); two-well form: F. C. Moon & P. J. Holmes, J. Sound Vib. 65, 275 (1979)",
		Params: []Param{
			{Name: "delta", Symbol: "δ", Doc: "damping", Default: []float64{0.05}},
			{Name: "alpha", Symbol: "α", Doc: "linear stiffness (negative: two wells)", Default: []float64{0}},
			{Name: "beta", Symbol: "β", Doc: "cubic stiffness", Default: []float64{1}},
			{Name: "gamma", Symbol: "γ", Doc: "forcing amplitude", Default: []float64{7.5}},
			{Name: "omega", Symbol: "ω", Doc: "forcing angular frequency (rad per time unit)", Default: []float64{1}},
		},
		Columns:   []string{"x", "v"},
		Initial:   []float64{2.5, 0, 0},
		Dt:        0.1,
		Transient: 500,
		SpectrumN: 30000, // T = 3000 at dt = 0.1
		build: func(v Values) (System, error) {
			f := Duffing{Delta: one(v, "delta"), Alpha: one(v, "alpha"), Beta: one(v, "beta"),
				Gamma: one(v, "gamma"), Omega: one(v, "omega")}
			if f.Omega == 0 {
				return System{}, errors.New("the forcing frequency omega must not be 0")
			}
			return System{Flow: f}, nil
		},
	}
}
