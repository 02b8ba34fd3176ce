package denoise

import (
	"math"
	"math/rand/v2"
)

// henonX returns n samples of the Hénon map's x (a = 1.4, b = 0.3; Hénon 1976, Commun. Math.
// Phys. 50, 69) after a transient of 1000 steps from (0.1, 0.1).
func henonX(n int) []float64 {
	x, y := 0.1, 0.1
	out := make([]float64, n)
	for i := -1000; i < n; i++ {
		x, y = 1-1.4*x*x+y, 0.3*x
		if i >= 0 {
			out[i] = x
		}
	}
	return out
}

// lorenzX returns n samples of the Lorenz system's x (σ = 10, ρ = 28, β = 8/3; Lorenz 1963,
// J. Atmos. Sci. 20, 130) every dt time units, integrated by RK4 with 10 sub-steps, after a
// transient of 50 time units.
func lorenzX(n int, dt float64) []float64 {
	s := [3]float64{1, 1, 20}
	f := func(v [3]float64) [3]float64 {
		return [3]float64{10 * (v[1] - v[0]), v[0]*(28-v[2]) - v[1], v[0]*v[1] - 8.0/3*v[2]}
	}
	h := dt / 10
	step := func() {
		k1 := f(s)
		var t [3]float64
		for i := range t {
			t[i] = s[i] + h/2*k1[i]
		}
		k2 := f(t)
		for i := range t {
			t[i] = s[i] + h/2*k2[i]
		}
		k3 := f(t)
		for i := range t {
			t[i] = s[i] + h*k3[i]
		}
		k4 := f(t)
		for i := range s {
			s[i] += h / 6 * (k1[i] + 2*k2[i] + 2*k3[i] + k4[i])
		}
	}
	for range int(50 / h) {
		step()
	}
	out := make([]float64, n)
	for i := range out {
		out[i] = s[0]
		for range 10 {
			step()
		}
	}
	return out
}

// addNoise returns x plus Gaussian noise of standard deviation frac·std(x), and that standard
// deviation.
func addNoise(x []float64, frac float64, seed uint64) ([]float64, float64) {
	r := rand.New(rand.NewPCG(seed, 7))
	sd := stdOf(x) * frac
	y := make([]float64, len(x))
	for i, v := range x {
		y[i] = v + sd*r.NormFloat64()
	}
	return y, sd
}

func stdOf(x []float64) float64 {
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

// rmsDiff is the root mean square of a − b.
func rmsDiff(a, b []float64) float64 {
	var ss float64
	for i := range a {
		d := a[i] - b[i]
		ss += d * d
	}
	return math.Sqrt(ss / float64(len(a)))
}
