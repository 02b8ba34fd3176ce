package denoise

import (
	"fmt"
	"math"
)

// ResampleHalfWidth is the half-width of the resampling kernel in zero crossings of its sinc.
const ResampleHalfWidth = 16

// resampleBeta is the Kaiser window's shape parameter (about −80 dB side lobes; Kaiser 1974).
const resampleBeta = 8.6

// Resample returns x (sampled every dt, first sample at time 0) resampled every newDt by
// Kaiser-windowed sinc interpolation (Kaiser 1974): sample j at time t = j·newDt is
//
//	y_j = Σ_k x_k h(t − k·dt) / Σ_k h(t − k·dt),   h(τ) = sinc(2 fc τ)·w(τ),
//
// with w a Kaiser window (β = 8.6) reaching zero at ResampleHalfWidth zero crossings of the
// sinc. Anti-alias rule: the cutoff fc is the lower of the two Nyquist frequencies,
// min(1/(2·dt), 1/(2·newDt)), so when downsampling the kernel is widened to remove what the new
// grid cannot represent; the response is −6 dB at fc and content in the transition band just
// below it is attenuated. Dividing by the sum of the weights keeps a constant exact, also at
// the ends where the kernel is cut off by the record. The new record covers the same time
// span: ⌊(len(x)−1)·dt/newDt⌋ + 1 samples.
func Resample(x []float64, dt, newDt float64) ([]float64, error) {
	if !(dt > 0) || math.IsInf(dt, 0) || !(newDt > 0) || math.IsInf(newDt, 0) {
		return nil, fmt.Errorf("%w: resampling from dt %v to %v: both must be positive and finite", ErrInput, dt, newDt)
	}
	if len(x) < 2 {
		return nil, fmt.Errorf("%w: resampling needs at least 2 samples, got %d", ErrInput, len(x))
	}
	span := float64(len(x)-1) * dt
	m := int(math.Floor(span/newDt*(1+1e-12))) + 1
	if m < 1 || m > 1<<31 {
		return nil, fmt.Errorf("%w: resampling to dt %g gives %d samples", ErrInput, newDt, m)
	}
	fc := min(0.5/dt, 0.5/newDt)
	half := ResampleHalfWidth / (2 * fc) // kernel half-width in time units
	i0 := besselI0(resampleBeta)
	y := make([]float64, m)
	for j := range y {
		t := float64(j) * newDt
		lo := max(int(math.Ceil((t-half)/dt)), 0)
		hi := min(int(math.Floor((t+half)/dt)), len(x)-1)
		var num, den float64
		for k := lo; k <= hi; k++ {
			tau := t - float64(k)*dt
			r := tau / half
			if r <= -1 || r >= 1 {
				continue
			}
			a := 2 * fc * tau
			s := 1.0
			if a != 0 {
				s = math.Sin(math.Pi*a) / (math.Pi * a)
			}
			h := s * besselI0(resampleBeta*math.Sqrt(1-r*r)) / i0
			num += h * x[k]
			den += h
		}
		if den == 0 {
			return nil, fmt.Errorf("%w: resampling: empty kernel at sample %d", ErrInput, j)
		}
		y[j] = num / den
	}
	return y, nil
}

// besselI0 is the modified Bessel function of the first kind of order zero, by its power
// series Σ ((x/2)^k / k!)² (converges for all x; used for β ≤ 20).
func besselI0(x float64) float64 {
	sum, term := 1.0, 1.0
	q := x * x / 4
	for k := 1; k < 200; k++ {
		term *= q / float64(k*k)
		sum += term
		if term < 1e-17*sum {
			break
		}
	}
	return sum
}
