package models

import (
	"errors"
	"fmt"
	"math"
	"sort"
)

// Spectrum is a Lyapunov spectrum computed from the equations of a model.
type Spectrum struct {
	// Exponents are the Lyapunov exponents in descending order, in nats per time unit for a
	// flow and nats per iteration for a map.
	Exponents []float64
	// KaplanYorke is the Kaplan–Yorke (Lyapunov) dimension of the spectrum.
	KaplanYorke float64
	// Time is the span the exponents were averaged over (time units; iterations for maps).
	Time float64
	// Intervals is the number of QR re-orthonormalisations averaged over.
	Intervals int
	// Step is the integration step of a flow (0 for a map).
	Step float64
}

// Spectrum computes the model's Lyapunov spectrum from its variational equations by the method
// of G. Benettin, L. Galgani, A. Giorgilli & J.-M. Strelcyn, "Lyapunov characteristic exponents
// for smooth dynamical systems and for Hamiltonian systems; a method for computing all of them",
// Meccanica 15, 9 and 21 (1980): a full set of tangent vectors is carried along the orbit and
// re-orthonormalised by Gram–Schmidt (a QR factorisation) after every interval; the exponents
// are the time averages of the logarithms of the diagonal of R.
//
// Options are read as for Simulate, with these meanings: N is the number of intervals averaged
// over (0 takes Spec.SpectrumN), Dt the interval between re-orthonormalisations (the model's
// output interval by default; 1 iteration for maps), Substeps the RK4 steps per interval, and
// Transient the time run before averaging starts, during which the tangent vectors already
// align. Seed and Noise do not apply. Processes have no spectrum from equations.
func (s Spec) Spectrum(params Values, opt Options) (*Spectrum, error) {
	sys, err := s.New(params)
	if err != nil {
		return nil, err
	}
	if s.Kind == KindProcess {
		return nil, fmt.Errorf("model %s is a %s without state-space equations: it has no Lyapunov spectrum from equations", s.Name, s.Kind)
	}
	if opt.N == 0 {
		opt.N = s.SpectrumN
	}
	opt.Noise = 0
	opt, err = s.check(opt)
	if err != nil {
		return nil, fmt.Errorf("spectrum %s: %w", s.Name, err)
	}
	x0 := s.initial(opt)
	var sp *Spectrum
	if sys.Flow != nil {
		h := opt.Dt / float64(opt.Substeps)
		sp, err = FlowSpectrum(sys.Flow, x0, h, opt.Substeps, opt.N, int(math.Round(opt.Transient/h)))
	} else {
		sp, err = MapSpectrum(sys.Map, x0, opt.N, int(math.Round(opt.Transient)))
	}
	if err != nil {
		return nil, fmt.Errorf("spectrum %s: %w", s.Name, err)
	}
	return sp, nil
}

// FlowSpectrum returns the Lyapunov spectrum of the flow f by the Benettin et al. (1980) QR
// method: the flow and its variational equation Q̇ = J(x)Q are integrated together by RK4 with
// step h from x0; the tangent vectors are re-orthonormalised every `every` steps; the first
// `skip` steps are run without averaging; then `intervals` intervals are averaged over.
// x0 is not modified.
func FlowSpectrum(f Flow, x0 []float64, h float64, every, intervals, skip int) (*Spectrum, error) {
	n := f.Dim()
	if len(x0) != n {
		return nil, fmt.Errorf("initial condition has %d values, the flow has %d state variables", len(x0), n)
	}
	if !(h > 0) || every < 1 || intervals < 1 || skip < 0 {
		return nil, errors.New("need a positive step, at least one step per interval and at least one interval")
	}
	jac := make([]float64, n*n)
	aug := func(dst, y []float64) {
		x, q := y[:n], y[n:]
		f.Field(dst[:n], x)
		f.Jacobian(jac, x)
		dq := dst[n:]
		for i := 0; i < n; i++ {
			for j := 0; j < n; j++ {
				var s float64
				for k := 0; k < n; k++ {
					s += jac[i*n+k] * q[k*n+j]
				}
				dq[i*n+j] = s
			}
		}
	}
	y := make([]float64, n+n*n)
	copy(y, x0)
	q := y[n:]
	for i := 0; i < n; i++ {
		q[i*n+i] = 1
	}
	rk := newRK4(n+n*n, aug)
	sums := make([]float64, n)
	// Transient: run and re-orthonormalise, discarding the growth rates.
	for done := 0; done < skip; done += every {
		rk.Advance(y, h, min(every, skip-done))
		gramSchmidt(q, n, nil)
	}
	for it := 0; it < intervals; it++ {
		rk.Advance(y, h, every)
		if !gramSchmidt(q, n, sums) {
			return nil, &EscapeError{Sample: it}
		}
	}
	T := float64(intervals) * float64(every) * h
	return finish(sums, T, intervals, h), nil
}

// MapSpectrum returns the Lyapunov spectrum of the map m by the Benettin et al. (1980) QR
// method: tangent vectors are multiplied by the Jacobian along the orbit from x0 and
// re-orthonormalised after every iteration; the first skip iterations are not averaged.
// x0 is not modified.
func MapSpectrum(m Map, x0 []float64, iterations, skip int) (*Spectrum, error) {
	n := m.Dim()
	if len(x0) != n {
		return nil, fmt.Errorf("initial condition has %d values, the map has %d state variables", len(x0), n)
	}
	if iterations < 1 || skip < 0 {
		return nil, errors.New("need at least one iteration")
	}
	x := append([]float64(nil), x0...)
	y := make([]float64, n)
	jac := make([]float64, n*n)
	q := make([]float64, n*n)
	tmp := make([]float64, n*n)
	for i := 0; i < n; i++ {
		q[i*n+i] = 1
	}
	sums := make([]float64, n)
	for it := -skip; it < iterations; it++ {
		m.Jacobian(jac, x)
		m.Step(y, x)
		x, y = y, x
		for i := 0; i < n; i++ {
			for j := 0; j < n; j++ {
				var s float64
				for k := 0; k < n; k++ {
					s += jac[i*n+k] * q[k*n+j]
				}
				tmp[i*n+j] = s
			}
		}
		q, tmp = tmp, q
		acc := sums
		if it < 0 {
			acc = nil
		}
		if !gramSchmidt(q, n, acc) {
			return nil, &EscapeError{Sample: it + skip}
		}
	}
	return finish(sums, float64(iterations), iterations, 0), nil
}

// gramSchmidt orthonormalises the columns of the row-major n×n matrix q in place by modified
// Gram–Schmidt (q = Q·R) and, when sums is not nil, adds ln R_jj to sums[j]. It reports false
// when a column vanishes or is not finite.
func gramSchmidt(q []float64, n int, sums []float64) bool {
	for j := 0; j < n; j++ {
		for k := 0; k < j; k++ {
			var d float64
			for i := 0; i < n; i++ {
				d += q[i*n+k] * q[i*n+j]
			}
			for i := 0; i < n; i++ {
				q[i*n+j] -= d * q[i*n+k]
			}
		}
		var nr float64
		for i := 0; i < n; i++ {
			nr += q[i*n+j] * q[i*n+j]
		}
		nr = math.Sqrt(nr)
		if !(nr > 0) || math.IsInf(nr, 0) {
			return false
		}
		for i := 0; i < n; i++ {
			q[i*n+j] /= nr
		}
		if sums != nil {
			sums[j] += math.Log(nr)
		}
	}
	return true
}

func finish(sums []float64, T float64, intervals int, h float64) *Spectrum {
	ex := make([]float64, len(sums))
	for i, s := range sums {
		ex[i] = s / T
	}
	sort.Sort(sort.Reverse(sort.Float64Slice(ex)))
	return &Spectrum{Exponents: ex, KaplanYorke: KaplanYorke(ex), Time: T, Intervals: intervals, Step: h}
}

// KaplanYorke returns the Kaplan–Yorke (Lyapunov) dimension of a Lyapunov spectrum,
//
//	D_KY = j + (λ_1 + … + λ_j)/|λ_{j+1}|,
//
// where the exponents are sorted in descending order and j is the largest index with
// λ_1 + … + λ_j ≥ 0 (J. L. Kaplan & J. A. Yorke, "Chaotic behavior of multidimensional difference
// equations", in Functional Differential Equations and Approximation of Fixed Points, Lecture
// Notes in Mathematics 730, 204, Springer 1979). It is 0 when λ_1 < 0 and the number of
// exponents when their total sum is non-negative. The input is not modified.
func KaplanYorke(exponents []float64) float64 {
	ex := append([]float64(nil), exponents...)
	sort.Sort(sort.Reverse(sort.Float64Slice(ex)))
	var s float64
	for j, l := range ex {
		if s+l < 0 {
			return float64(j) + s/math.Abs(l)
		}
		s += l
	}
	return float64(len(ex))
}
