package embed

import (
	"math"

	"unfold/spectral"
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
// by the Wiener–Khinchin theorem (spectral.Autocorrelation: the inverse transform of the
// periodogram of the mean-removed record, zero padded to at least 2·len(x) so that it is not
// circular) and reads its first zero and 1/e decay time. It costs O(N log N) whatever maxLag is.
func AutocorrelationFFT(x []float64, maxLag int) (*Autocorrelation, error) {
	r, err := spectral.Autocorrelation(x, maxLag)
	if err != nil {
		return nil, err
	}
	a := &Autocorrelation{R: r}
	for k := 1; k < len(r); k++ {
		if a.FirstZero == 0 && a.R[k] <= 0 {
			a.FirstZero = k
		}
		if a.DecayTime == 0 && a.R[k] < 1/math.E {
			a.DecayTime = k
		}
	}
	return a, nil
}
