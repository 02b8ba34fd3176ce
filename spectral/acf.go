package spectral

import (
	"fmt"
	"math"

	"gonum.org/v1/gonum/dsp/fourier"
)

// Autocovariance computes (scaled) lagged-product sums Σ_t (x_t − m)(x_{t+k} − m) of records of up to N
// samples by the Wiener–Khinchin theorem: the inverse Fourier transform of the periodogram of
// the zero-padded, mean-removed record. With a transform length of at least 2N − 1 the result
// is not circular. It costs O(L log L) per record whatever the number of lags, and reuses its
// buffers, so that a long record cut into stretches is summed without allocating per stretch.
// An Autocovariance is not safe for concurrent use.
type Autocovariance struct {
	n    int
	fft  *fourier.FFT
	buf  []float64
	coef []complex128
	seq  []float64
}

// NewAutocovariance prepares an Autocovariance for records of up to n samples with transform
// length nfft; nfft ≤ 0 chooses LengthAtLeast(2n, 5). nfft below 2n − 1 wraps lags around
// (circular autocovariance).
func NewAutocovariance(n, nfft int) *Autocovariance {
	if nfft <= 0 {
		nfft = LengthAtLeast(2*n, 5)
	}
	nfft = max(nfft, n, 1)
	return &Autocovariance{n: n, fft: fourier.NewFFT(nfft), buf: make([]float64, nfft)}
}

// Len returns the transform length.
func (a *Autocovariance) Len() int { return len(a.buf) }

// Add adds L·Σ_t (x_t − mean)(x_{t+k} − mean) to dst[k] for every k < len(dst) (at most the
// transform length L = Len()); x holds at most the n samples the Autocovariance was made for.
// The factor L is that of gonum's unnormalised inverse transform; ratios such as the
// autocorrelation need no correction, and leaving it in keeps the sums bit for bit those of a
// single transform.
func (a *Autocovariance) Add(dst, x []float64, mean float64) {
	if len(x) > a.n {
		panic(fmt.Sprintf("spectral: Autocovariance for %d samples given %d", a.n, len(x)))
	}
	clear(a.buf)
	for i, v := range x {
		a.buf[i] = v - mean
	}
	a.coef = a.fft.Coefficients(a.coef, a.buf)
	for k, c := range a.coef {
		a.coef[k] = complex(real(c)*real(c)+imag(c)*imag(c), 0)
	}
	a.seq = a.fft.Sequence(a.seq, a.coef)
	for k := range min(len(dst), len(a.seq)) {
		dst[k] += a.seq[k]
	}
}

// Autocorrelation returns the sample autocorrelation r_k = c_k / c_0, k = 0 … maxLag, of x
// (maxLag < 0 or above len(x) − 1 means len(x) − 1), where c_k = Σ_t (x_t − x̄)(x_{t+k} − x̄) is
// the biased autocovariance sum computed by the Wiener–Khinchin theorem with zero padding to
// the smallest 5-smooth length ≥ 2·len(x) (see Autocovariance). r_0 is exactly 1. It refuses
// fewer than 2 samples and a constant record.
//
// References: N. Wiener (1930), "Generalized harmonic analysis"; A. Khinchin (1934),
// "Korrelationstheorie der stationären stochastischen Prozesse"; the biased estimator is
// positive semi-definite (Box & Jenkins 1970, "Time Series Analysis", §2.1.5).
func Autocorrelation(x []float64, maxLag int) ([]float64, error) {
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
	if big > 0 && !math.IsInf(big, 0) {
		if _, e := math.Frexp(big); e != 0 {
			y := make([]float64, n)
			for i, v := range x {
				y[i] = math.Ldexp(v, -e)
			}
			x = y
		}
	}
	r := make([]float64, maxLag+1)
	NewAutocovariance(n, 0).Add(r, x, meanOf(x))
	r0 := r[0]
	if !(r0 > 0) {
		return nil, fmt.Errorf("autocorrelation: the record is constant")
	}
	for k := range r {
		r[k] /= r0
	}
	r[0] = 1
	return r, nil
}
