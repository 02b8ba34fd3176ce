package models

// RK4 integrates a vector field with the classical fourth-order Runge–Kutta method at a fixed
// step (Kutta 1901; e.g. E. Hairer, S. P. Nørsett & G. Wanner, Solving Ordinary Differential
// Equations I, 1993, §II.1). The global error falls as h⁴. An RK4 holds its work buffers, so
// stepping allocates nothing; it is not safe for concurrent use.
type RK4 struct {
	field              func(dst, x []float64)
	k1, k2, k3, k4, xt []float64
}

// NewRK4 returns an integrator for the flow f.
func NewRK4(f Flow) *RK4 { return newRK4(f.Dim(), f.Field) }

func newRK4(dim int, field func(dst, x []float64)) *RK4 {
	buf := make([]float64, 5*dim)
	return &RK4{field: field,
		k1: buf[:dim], k2: buf[dim : 2*dim], k3: buf[2*dim : 3*dim], k4: buf[3*dim : 4*dim], xt: buf[4*dim:]}
}

// Step advances x in place by one step of length h.
func (r *RK4) Step(x []float64, h float64) {
	r.field(r.k1, x)
	for i := range x {
		r.xt[i] = x[i] + 0.5*h*r.k1[i]
	}
	r.field(r.k2, r.xt)
	for i := range x {
		r.xt[i] = x[i] + 0.5*h*r.k2[i]
	}
	r.field(r.k3, r.xt)
	for i := range x {
		r.xt[i] = x[i] + h*r.k3[i]
	}
	r.field(r.k4, r.xt)
	for i := range x {
		x[i] += h / 6 * (r.k1[i] + 2*r.k2[i] + 2*r.k3[i] + r.k4[i])
	}
}

// Advance takes steps steps of length h, in place.
func (r *RK4) Advance(x []float64, h float64, steps int) {
	for s := 0; s < steps; s++ {
		r.Step(x, h)
	}
}
