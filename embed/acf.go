package embed

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/dsp/fourier"
)

// Autocorrelation is the sample autocorrelation function of a record and the two decay times
// read from it.
type Autocorrelation struct {
	// R[k] is the autocorrelation at lag k samples, k = 0 … MaxLag (R[0] = 1). It is the
	// biased estimator Σ(x_t − x̄)(x_{t+k} − x̄) / Σ(x_t − x̄)², which is positive
	// semi-definite (Box & Jenkins, "Time Series Analysis", 1970, §2.1.5).
	R []float64
	// FirstZero is the first lag where R changes sign (R[k] ≤ 0), 0 when R stays positive
	// up to MaxLag.
	FirstZero int
	// DecayTime is the first lag where R falls below 1/e, 0 when it stays above up to MaxLag.
	DecayTime int
}

// AutocorrelationFFT computes the autocorrelation of x up to maxLag samples (at most len(x)−1)
// by the Wiener–Khinchin theorem: the inverse transform of the periodogram of the mean-removed
// record, zero padded to at least 2·len(x) so that it is not circular (gonum/dsp/fourier).
// It costs O(N log N) whatever maxLag is.
func AutocorrelationFFT(x []float64, maxLag int) (*Autocorrelation, error) {
	n := len(x)
	if n < 2 {
		return nil, fmt.Errorf("autocorrelation: %d samples are too few (need at least 2)", n)
	}
	if maxLag < 0 || maxLag > n-1 {
		maxLag = n - 1
	}
	// R is scale-free: work on x·2^−e with the largest magnitude near 1, so that the squares
	// of values near ±1e308 do not overflow and those of denormal values do not vanish.
	var big float64
	for _, v := range x {
		big = math.Max(big, math.Abs(v))
	}
	e := 0
	if big > 0 && !math.IsInf(big, 0) {
		_, e = math.Frexp(big)
	}
	var mean float64
	for _, v := range x {
		mean += math.Ldexp(v, -e)
	}
	mean /= float64(n)
	nfft := smoothLength(2 * n)
	buf := make([]float64, nfft)
	for i, v := range x {
		buf[i] = math.Ldexp(v, -e) - mean
	}
	fft := fourier.NewFFT(nfft)
	c := fft.Coefficients(nil, buf)
	for k := range c {
		c[k] = complex(real(c[k])*real(c[k])+imag(c[k])*imag(c[k]), 0)
	}
	acov := fft.Sequence(buf, c)
	r0 := acov[0]
	if !(r0 > 0) {
		return nil, fmt.Errorf("autocorrelation: the record is constant")
	}
	a := &Autocorrelation{R: make([]float64, maxLag+1)}
	for k := range a.R {
		a.R[k] = acov[k] / r0
	}
	a.R[0] = 1
	for k := 1; k <= maxLag; k++ {
		if a.FirstZero == 0 && a.R[k] <= 0 {
			a.FirstZero = k
		}
		if a.DecayTime == 0 && a.R[k] < 1/math.E {
			a.DecayTime = k
		}
	}
	return a, nil
}

// smoothLength returns the smallest 5-smooth number (only prime factors 2, 3, 5) ≥ n, a length
// the mixed-radix FFT handles fast.
func smoothLength(n int) int {
	for k := max(n, 1); ; k++ {
		r := k
		for _, f := range [...]int{2, 3, 5} {
			for r%f == 0 {
				r /= f
			}
		}
		if r == 1 {
			return k
		}
	}
}
