package spectral

import (
	"fmt"

	"gonum.org/v1/gonum/dsp/fourier"
)

// Spectrum is a one-sided power spectral density estimate.
type Spectrum struct {
	// Freq are the bin frequencies in cycles per time unit (k/(SegLen·Dt)).
	Freq []float64
	// Power is the one-sided density in signal units² per (cycle per time unit); its sum
	// times Resolution is the variance of the (demeaned) signal.
	Power []float64
	// SegLen is the segment length in samples and Segments the number of segments averaged.
	SegLen, Segments int
	// Resolution is the bin width, 1/(SegLen·Dt), in cycles per time unit.
	Resolution float64
	// DOF is the approximate number of degrees of freedom of each bin's estimate (Welch 1967;
	// for Hann windows with 50 % overlap about 2·Segments·0.95, a figure of common practice).
	DOF float64
}

// WelchOptions configure Welch; the zero value uses the defaults.
type WelchOptions struct {
	// SegLen is the segment length in samples; ≤ 0 chooses the largest power of two ≤ N/8
	// (at least 64, at most 16384), which averages about 15 segments.
	SegLen int
	// Symmetric selects the symmetric Hann window (zero at both ends) instead of the
	// periodic one (see Hann).
	Symmetric bool
}

// DefaultSegLen is the segment length Welch chooses for n samples when none is given: the
// largest power of two ≤ n/8, at least 64 and at most 16384.
func DefaultSegLen(n int) int {
	segLen := 64
	for segLen*2 <= n/8 && segLen < 16384 {
		segLen *= 2
	}
	return segLen
}

// Welch returns the Welch (1967) power spectrum of x sampled every dt time units (dt ≤ 0 means
// 1): the mean of the Hann-windowed periodograms of segments of SegLen samples overlapping by
// half, after the mean of the whole record is removed, scaled to a one-sided density so that
// Σ Power·Resolution equals the variance (Parseval's theorem). It refuses records shorter than
// one segment and segments shorter than 8 samples.
//
// Reference: P. D. Welch (1967), "The use of fast Fourier transform for the estimation of power
// spectra: a method based on time averaging over short, modified periodograms", IEEE
// Transactions on Audio and Electroacoustics 15(2), 70–73.
func Welch(x []float64, dt float64, opt WelchOptions) (*Spectrum, error) {
	n := len(x)
	if dt <= 0 {
		dt = 1
	}
	segLen := opt.SegLen
	if segLen <= 0 {
		segLen = DefaultSegLen(n)
	}
	if n < segLen || segLen < 8 {
		return nil, fmt.Errorf("spectrum: %d samples with segments of %d: need at least one full segment of 8 or more", n, segLen)
	}
	mean := meanOf(x)
	w := make([]float64, segLen)
	wss := Hann(w, opt.Symmetric)
	fft := fourier.NewFFT(segLen)
	buf := make([]float64, segLen)
	coef := make([]complex128, segLen/2+1)
	pw := make([]float64, segLen/2+1)
	step := segLen / 2
	segs := 0
	for s := 0; s+segLen <= n; s += step {
		for i := range buf {
			buf[i] = (x[s+i] - mean) * w[i]
		}
		fft.Coefficients(coef, buf)
		for k, c := range coef {
			pw[k] += real(c)*real(c) + imag(c)*imag(c)
		}
		segs++
	}
	sp := &Spectrum{SegLen: segLen, Segments: segs, Resolution: 1 / (float64(segLen) * dt),
		Freq: make([]float64, len(pw)), Power: pw, DOF: 2 * float64(segs) * 0.95}
	if segs == 1 {
		sp.DOF = 2
	}
	norm := dt / (wss * float64(segs))
	for k := range pw {
		sp.Freq[k] = float64(k) * sp.Resolution
		f := 2.0
		if k == 0 || (segLen%2 == 0 && k == len(pw)-1) {
			f = 1 // zero and Nyquist frequency have no mirror image
		}
		pw[k] *= f * norm
	}
	return sp, nil
}

// meanOf returns the arithmetic mean of x (0 for an empty x), summed in index order.
func meanOf(x []float64) float64 {
	if len(x) == 0 {
		return 0
	}
	var m float64
	for _, v := range x {
		m += v
	}
	return m / float64(len(x))
}
