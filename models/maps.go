package models

import (
	"errors"
	"math"
)

// Henon is the Hénon (1976) map x' = 1 − a x² + y, y' = b x, from M. Hénon, "A two-dimensional
// mapping with a strange attractor", Commun. Math. Phys. 50, 69 (1976). The usual chaotic
// parameters are a = 1.4, b = 0.3. Its Jacobian determinant is the constant −b.
type Henon struct{ A, B float64 }

// Dim returns 2.
func (Henon) Dim() int { return 2 }

// Step writes the image of x into dst.
func (m Henon) Step(dst, x []float64) {
	dst[0] = 1 - m.A*x[0]*x[0] + x[1]
	dst[1] = m.B * x[0]
}

// Jacobian writes the Jacobian at x into jac (row-major 2×2).
func (m Henon) Jacobian(jac, x []float64) {
	jac[0], jac[1] = -2*m.A*x[0], 1
	jac[2], jac[3] = m.B, 0
}

// Logistic is the logistic map x' = r x (1 − x) (R. M. May, "Simple mathematical models with
// very complicated dynamics", Nature 261, 459, 1976). For 0 ≤ r ≤ 4 it maps [0, 1] into itself;
// at r = 4 its Lyapunov exponent is exactly ln 2.
type Logistic struct{ R float64 }

// Dim returns 1.
func (Logistic) Dim() int { return 1 }

// Step writes the image of x into dst.
func (m Logistic) Step(dst, x []float64) { dst[0] = m.R * x[0] * (1 - x[0]) }

// Jacobian writes the derivative r(1 − 2x) into jac[0].
func (m Logistic) Jacobian(jac, x []float64) { jac[0] = m.R * (1 - 2*x[0]) }

// Tent is the tent map x' = μ min(x, 1 − x) on [0, 1], whose Lyapunov exponent is ln μ because
// |f′| = μ everywhere (textbook; e.g. E. Ott, Chaos in Dynamical Systems, 2nd ed. 2002). At
// μ = 2 floating-point orbits collapse to 0 within about 50 steps, so the default is μ = 1.99.
type Tent struct{ Mu float64 }

// Dim returns 1.
func (Tent) Dim() int { return 1 }

// Step writes the image of x into dst.
func (m Tent) Step(dst, x []float64) { dst[0] = m.Mu * math.Min(x[0], 1-x[0]) }

// Jacobian writes the derivative ±μ into jac[0].
func (m Tent) Jacobian(jac, x []float64) {
	if x[0] < 0.5 {
		jac[0] = m.Mu
	} else {
		jac[0] = -m.Mu
	}
}

// Lozi is the Lozi (1978) map x' = 1 − a|x| + y, y' = b x, the piecewise-linear relative of the
// Hénon map (R. Lozi, "Un attracteur étrange (?) du type attracteur de Hénon", J. Phys.
// Colloques 39, C5-9, 1978). The usual parameters are a = 1.7, b = 0.5; det J = −b.
type Lozi struct{ A, B float64 }

// Dim returns 2.
func (Lozi) Dim() int { return 2 }

// Step writes the image of x into dst.
func (m Lozi) Step(dst, x []float64) {
	dst[0] = 1 - m.A*math.Abs(x[0]) + x[1]
	dst[1] = m.B * x[0]
}

// Jacobian writes the Jacobian at x into jac (row-major 2×2).
func (m Lozi) Jacobian(jac, x []float64) {
	s := 1.0
	if x[0] < 0 {
		s = -1
	}
	jac[0], jac[1] = -m.A*s, 1
	jac[2], jac[3] = m.B, 0
}

// Ikeda is the Ikeda map of a ring optical cavity, in the real form
//
//	x' = 1 + u(x cos t − y sin t),  y' = u(x sin t + y cos t),  t = 0.4 − 6/(1 + x² + y²),
//
// after K. Ikeda, Opt. Commun. 30, 257 (1979), in the form of S. M. Hammel, C. K. R. T. Jones &
// J. V. Moloney, J. Opt. Soc. Am. B 2, 552 (1985). The usual chaotic parameter is u = 0.9; the
// Jacobian determinant is u², so the exponents sum to 2 ln u.
type Ikeda struct{ U float64 }

// Dim returns 2.
func (Ikeda) Dim() int { return 2 }

// Step writes the image of x into dst.
func (m Ikeda) Step(dst, x []float64) {
	t := 0.4 - 6/(1+x[0]*x[0]+x[1]*x[1])
	s, c := math.Sincos(t)
	dst[0] = 1 + m.U*(x[0]*c-x[1]*s)
	dst[1] = m.U * (x[0]*s + x[1]*c)
}

// Jacobian writes the Jacobian at x into jac (row-major 2×2).
func (m Ikeda) Jacobian(jac, x []float64) {
	q := 1 + x[0]*x[0] + x[1]*x[1]
	t := 0.4 - 6/q
	s, c := math.Sincos(t)
	tx, ty := 12*x[0]/(q*q), 12*x[1]/(q*q) // ∂t/∂x, ∂t/∂y
	a := x[0]*s + x[1]*c                   // −∂(x cos t − y sin t)/∂t
	b := x[0]*c - x[1]*s                   // ∂(x sin t + y cos t)/∂t
	jac[0], jac[1] = m.U*(c-a*tx), m.U*(-s-a*ty)
	jac[2], jac[3] = m.U*(s+b*tx), m.U*(c+b*ty)
}

func henonSpec() Spec {
	return Spec{
		Name:      "henon",
		Title:     "Hénon (1976) map",
		Kind:      KindMap,
		Equations: "x' = 1 − a·x² + y,  y' = b·x",
		Reference: "M. Hénon, A two-dimensional mapping with a strange attractor, Commun. Math. Phys. 50, 69 (1976)",
		Params: []Param{
			{Name: "a", Symbol: "a", Doc: "nonlinearity", Default: []float64{1.4}},
			{Name: "b", Symbol: "b", Doc: "contraction (det J = −b)", Default: []float64{0.3}},
		},
		Columns:   []string{"x", "y"},
		Initial:   []float64{0.1, 0.1},
		Dt:        1,
		Transient: 1000,
		SpectrumN: 1000000,
		build: func(v Values) (System, error) {
			return System{Map: Henon{A: one(v, "a"), B: one(v, "b")}}, nil
		},
	}
}

func logisticSpec() Spec {
	return Spec{
		Name:      "logistic",
		Title:     "logistic map",
		Kind:      KindMap,
		Equations: "x' = r·x(1 − x)",
		Reference: "R. M. May, Simple mathematical models with very complicated dynamics, Nature 261, 459 (1976)",
		Params: []Param{
			{Name: "r", Symbol: "r", Doc: "growth rate, 0 ≤ r ≤ 4", Default: []float64{4}},
		},
		Columns:   []string{"x"},
		Initial:   []float64{0.3},
		Dt:        1,
		Transient: 1000,
		SpectrumN: 1000000,
		build: func(v Values) (System, error) {
			r := one(v, "r")
			if !(r >= 0 && r <= 4) {
				return System{}, errors.New("r must lie in [0, 4] for orbits to stay in [0, 1]")
			}
			return System{Map: Logistic{R: r}}, nil
		},
	}
}

func tentSpec() Spec {
	return Spec{
		Name:      "tent",
		Title:     "tent map",
		Kind:      KindMap,
		Equations: "x' = μ·min(x, 1 − x)",
		Reference: "textbook (e.g. E. Ott, Chaos in Dynamical Systems, 2002); λ = ln μ",
		Params: []Param{
			{Name: "mu", Symbol: "μ", Doc: "slope, 0 ≤ μ ≤ 2 (at 2 floating-point orbits collapse to 0)", Default: []float64{1.99}},
		},
		Columns:   []string{"x"},
		Initial:   []float64{0.3},
		Dt:        1,
		Transient: 1000,
		SpectrumN: 1000000,
		build: func(v Values) (System, error) {
			mu := one(v, "mu")
			if !(mu >= 0 && mu <= 2) {
				return System{}, errors.New("mu must lie in [0, 2] for orbits to stay in [0, 1]")
			}
			return System{Map: Tent{Mu: mu}}, nil
		},
	}
}

func loziSpec() Spec {
	return Spec{
		Name:      "lozi",
		Title:     "Lozi (1978) map",
		Kind:      KindMap,
		Equations: "x' = 1 − a·|x| + y,  y' = b·x",
		Reference: "R. Lozi, Un attracteur étrange (?) du type attracteur de Hénon, J. Phys. Colloques 39, C5-9 (1978)",
		Params: []Param{
			{Name: "a", Symbol: "a", Doc: "slope", Default: []float64{1.7}},
			{Name: "b", Symbol: "b", Doc: "contraction (det J = −b)", Default: []float64{0.5}},
		},
		Columns:   []string{"x", "y"},
		Initial:   []float64{0.1, 0.1},
		Dt:        1,
		Transient: 1000,
		SpectrumN: 1000000,
		build: func(v Values) (System, error) {
			return System{Map: Lozi{A: one(v, "a"), B: one(v, "b")}}, nil
		},
	}
}

func ikedaSpec() Spec {
	return Spec{
		Name:      "ikeda",
		Title:     "Ikeda ring-cavity map",
		Kind:      KindMap,
		Equations: "x' = 1 + u(x·cos t − y·sin t),  y' = u(x·sin t + y·cos t),  t = 0.4 − 6/(1 + x² + y²)",
		Reference: "K. Ikeda, Opt. Commun. 30, 257 (1979); real form of Hammel, Jones & Moloney, J. Opt. Soc. Am. B 2, 552 (1985)",
		Params: []Param{
			{Name: "u", Symbol: "u", Doc: "cavity loss factor (det J = u²)", Default: []float64{0.9}},
		},
		Columns:   []string{"x", "y"},
		Initial:   []float64{0.1, 0.1},
		Dt:        1,
		Transient: 1000,
		SpectrumN: 1000000,
		build: func(v Values) (System, error) {
			return System{Map: Ikeda{U: one(v, "u")}}, nil
		},
	}
}
