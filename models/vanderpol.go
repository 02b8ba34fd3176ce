package models

// VanDerPol is the unforced van der Pol oscillator
//
//	ẍ − μ(1 − x²)ẋ + x = 0,
//
// written as the flow (x, v): ẋ = v, v̇ = μ(1 − x²)v − x, from B. van der Pol, "On
// relaxation-oscillations", Phil. Mag. (7) 2, 978 (1926). For μ > 0 every orbit except the
// fixed point at the origin tends to one limit cycle, so its largest Lyapunov exponent is 0;
// μ = 1 is the usual textbook value.
type VanDerPol struct{ Mu float64 }

// Dim returns 2 (position, velocity).
func (VanDerPol) Dim() int { return 2 }

// Field writes the van der Pol vector field at x = (x, v) into dst.
func (f VanDerPol) Field(dst, x []float64) {
	dst[0] = x[1]
	dst[1] = f.Mu*(1-x[0]*x[0])*x[1] - x[0]
}

// Jacobian writes the Jacobian of the van der Pol field at x into jac (row-major 2×2).
func (f VanDerPol) Jacobian(jac, x []float64) {
	jac[0], jac[1] = 0, 1
	jac[2], jac[3] = -2*f.Mu*x[0]*x[1]-1, f.Mu*(1-x[0]*x[0])
}
