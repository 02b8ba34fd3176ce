package series

import (
	"fmt"
	"math"
	"slices"
	"strconv"

	"gonum.org/v1/gonum/dsp/fourier"

	"unfold/spectral"
)

// Summary is what `unfold inspect` reports about a record: size, sampling, statistics, the
// quantisation step, the dominant period and a stationarity hint.
type Summary struct {
	Samples  int     // number of samples
	Dt       float64 // sampling interval (time units)
	Duration float64 // (N−1)·Dt
	Mean     float64
	Std      float64 // population standard deviation
	Min, Max float64
	// Quantization is the smallest step between distinct values (an ADC's resolution, or the
	// rounding of a written file), in signal units; 0 when all values are equal.
	Quantization float64
	// DominantPeriod is 1/f of the largest periodogram peak above zero frequency, in time
	// units (0 when there is none).
	DominantPeriod float64
	GapsFilled     int
	Stationarity   Stationarity
	// Cautions are plain-words warnings for the user.
	Cautions []string
}

// Stationarity compares the halves and quarters of a record with their sampling error.
//
// The sampling error of a segment mean is σ·√(τ/n) for a segment of n samples, with τ the
// integrated autocorrelation time 1 + 2·Σρ(k) summed up to the first negative ρ(k) (common
// practice; Sokal 1997, "Monte Carlo methods in statistical mechanics", uses a similar window).
// A segment mean more than 4 standard errors from the whole mean, or a segment variance whose
// log ratio to the whole variance exceeds 4·√(2τ/n), is reported as non-stationary.
type Stationarity struct {
	HalfMeans       []float64 `json:"half_means"`
	HalfStds        []float64 `json:"half_stds"`
	QuarterMeans    []float64 `json:"quarter_means"`
	QuarterStds     []float64 `json:"quarter_stds"`
	CorrelationTime float64   `json:"correlation_time"` // integrated autocorrelation time τ, in samples
	MeanShift       float64   `json:"mean_shift"`       // largest |segment mean − mean| in standard errors
	VarianceShift   float64   `json:"variance_shift"`   // largest |ln(segment var / var)| in standard errors
	Stationary      bool      `json:"stationary"`       // no shift beyond 4 standard errors
	// FluctuationRatio is the RMS of the first differences over the last third divided by
	// that over the first third (0 below 48 samples): far from 1 when the short-term
	// fluctuations — a seasonal cycle, the noise — grow or shrink with time, as when they
	// are proportional to a trending level.
	FluctuationRatio float64 `json:"fluctuation_ratio"`
}

// FluctuationLimit is the factor by which the short-term fluctuations of the first and last
// thirds may differ before Describe cautions (judgement: a doubling is far beyond the
// sampling error of an RMS over a third of a record of 48 or more samples for most records).
const FluctuationLimit = 2

// shiftLimit is the number of standard errors beyond which a segment is reported as different
// (about a 1-in-15000 false alarm per segment for Gaussian errors; common practice).
const shiftLimit = 4

// Describe computes the Summary of s. It needs at least 8 samples.
//
// The statistics are computed on the record scaled by a power of two that brings its largest
// magnitude near 1 (exact for every normal number), so values near ±1.5e308 do not overflow a
// sum and denormal values (1e−310) do not underflow a square; results are in the input's
// units. Only a record whose samples are all equal (−0 equals +0) is called constant.
func Describe(s *Series) (*Summary, error) {
	n := len(s.Values)
	if n < 8 {
		return nil, fmt.Errorf("describe: %d samples are too few (need at least 8)", n)
	}
	sm := &Summary{Samples: n, Dt: s.Dt, Duration: s.Duration(), GapsFilled: s.GapsFilled}
	x, e := scaled(s.Values)
	back := func(v float64) float64 { return math.Ldexp(v, e) }
	sm.Min, sm.Max = s.Values[0], s.Values[0]
	for _, v := range s.Values {
		sm.Min = math.Min(sm.Min, v)
		sm.Max = math.Max(sm.Max, v)
	}
	if constant(s.Values) {
		sm.Mean = s.Values[0]
		sm.Cautions = append(sm.Cautions, "the signal is constant: there is nothing to analyse")
		sm.Stationarity.Stationary = true
		return sm, nil
	}
	m, sd := meanStd(x)
	sm.Mean, sm.Std = back(m), back(sd)
	sm.Quantization = roundStep(back(quantization(x)))
	defer func() {
		st := &sm.Stationarity
		for _, v := range [][]float64{st.HalfMeans, st.HalfStds, st.QuarterMeans, st.QuarterStds} {
			for i := range v {
				v[i] = back(v[i])
			}
		}
	}()
	if sm.Quantization > 0 && sm.Std/sm.Quantization < 10 {
		sm.Cautions = append(sm.Cautions, fmt.Sprintf("coarse quantisation: the standard deviation is only %.1f quantisation steps; neighbour-based estimates at small scales will see the steps", sm.Std/sm.Quantization))
	}
	p, nfft := dominantPeriod(x, m)
	if p > 0 {
		sm.DominantPeriod = p * s.Dt
		if p >= 0.5*float64(nfft) {
			sm.Cautions = append(sm.Cautions, "the strongest periodogram component is as long as the record: a trend or a very slow drift dominates; try --detrend linear")
		}
	}
	sm.Stationarity = stationarity(x, m, sd)
	if n >= 48 {
		r := fluctuationRatio(x)
		sm.Stationarity.FluctuationRatio = r
		if r > FluctuationLimit || (r > 0 && r < 1/FluctuationLimit) {
			sm.Cautions = append(sm.Cautions, fmt.Sprintf("the short-term fluctuations (first differences) are %.1f times as large in the last third as in the first: the size of the variation changes with time (e.g. a seasonal cycle growing with the level); a log transform may make it steady", r))
		}
	}
	if !sm.Stationarity.Stationary {
		sm.Cautions = append(sm.Cautions, fmt.Sprintf("the record looks non-stationary: segment means differ by up to %.1f and variances by up to %.1f standard errors of sampling (limit %d); a trend, a drift or a change of regime will bias every estimate — consider --detrend or a shorter --from/--to range", sm.Stationarity.MeanShift, sm.Stationarity.VarianceShift, shiftLimit))
	}
	return sm, nil
}

// MeanStd returns the mean and the population standard deviation of x, computed on x scaled
// by a power of two so that neither overflows for values near ±1.8e308 nor underflows for
// denormal values; both are in the units of x. It returns NaN, NaN for an empty x.
func MeanStd(x []float64) (mean, std float64) {
	if len(x) == 0 {
		return math.NaN(), math.NaN()
	}
	e := scaleExp(x)
	m, sd := scaledMeanStd(x, e)
	return math.Ldexp(m, e), math.Ldexp(sd, e)
}

// scaledMeanStd returns the mean and standard deviation of x·2^−e.
func scaledMeanStd(x []float64, e int) (mean, std float64) {
	var s float64
	for _, v := range x {
		s += math.Ldexp(v, -e)
	}
	m := s / float64(len(x))
	var ss float64
	for _, v := range x {
		d := math.Ldexp(v, -e) - m
		ss += d * d
	}
	return m, math.Sqrt(ss / float64(len(x)))
}

// ScaleExponent returns e such that x·2^−e has its largest magnitude in [0.5, 1) (0 when x is
// all zeros or holds a non-finite value). Multiplying by a power of two is exact for normal
// numbers, so an analysis can run on x·2^−e — no overflow for values near ±1.8e308, no
// underflow for denormal values — and state its results in the input's units by multiplying
// quantities in signal units by 2^e (math.Ldexp). Scale-free results (lags, dimensions,
// exponents per time, D2) are unchanged.
func ScaleExponent(x []float64) int { return scaleExp(x) }

// scaleExp returns the exponent e with 2^e just above the largest magnitude of x (0 when x is
// all zeros or holds a non-finite value).
func scaleExp(x []float64) int {
	var big float64
	for _, v := range x {
		big = math.Max(big, math.Abs(v))
	}
	if big == 0 || math.IsInf(big, 0) || math.IsNaN(big) {
		return 0
	}
	_, e := math.Frexp(big)
	return e
}

// scaled returns x·2^−e, a copy whose largest magnitude is in [0.5, 1), and e.
func scaled(x []float64) ([]float64, int) {
	e := scaleExp(x)
	y := make([]float64, len(x))
	for i, v := range x {
		y[i] = math.Ldexp(v, -e)
	}
	return y, e
}

// constant reports whether every value of x equals the first (−0 and +0 are equal).
func constant(x []float64) bool {
	for _, v := range x {
		if v != x[0] {
			return false
		}
	}
	return true
}

// fluctuationRatio returns the RMS of the first differences of the last third of x divided
// by that of the first third (0 when the first third has none).
func fluctuationRatio(x []float64) float64 {
	n3 := len(x) / 3
	rms := func(y []float64) float64 {
		var s float64
		for i := 1; i < len(y); i++ {
			d := y[i] - y[i-1]
			s += d * d
		}
		return math.Sqrt(s / float64(len(y)-1))
	}
	a, b := rms(x[:n3]), rms(x[len(x)-n3:])
	if a == 0 {
		return 0
	}
	return b / a
}

// meanStd is the mean and population standard deviation of x without scaling (x is already
// of order one).
func meanStd(x []float64) (mean, std float64) {
	for _, v := range x {
		mean += v
	}
	mean /= float64(len(x))
	var ss float64
	for _, v := range x {
		d := v - mean
		ss += d * d
	}
	return mean, math.Sqrt(ss / float64(len(x)))
}

// quantization returns the smallest positive difference between sorted values (0 when all are
// equal).
func quantization(x []float64) float64 {
	v := slices.Clone(x)
	slices.Sort(v)
	q := math.Inf(1)
	for i := 1; i < len(v); i++ {
		if d := v[i] - v[i-1]; d > 0 && d < q {
			q = d
		}
	}
	if math.IsInf(q, 1) {
		return 0
	}
	return q
}

// roundStep rounds a quantisation step to ten significant digits so that decimal rounding in
// a file reads as its step (0.01, not 0.0099999).
func roundStep(q float64) float64 {
	r, err := strconv.ParseFloat(strconv.FormatFloat(q, 'g', 10, 64), 64)
	if err != nil {
		return q
	}
	return r
}

// fftLength returns n when its largest prime factor is small enough (≤ 97) for a fast
// mixed-radix transform, and otherwise the next 5-smooth number above n (zero padding).
func fftLength(n int) int {
	if spectral.Smooth(n, 97) {
		return n
	}
	return spectral.LengthAtLeast(n, 5)
}

// dominantPeriod returns the period in samples of the largest periodogram peak above zero
// frequency, refined by a parabola through the log power of the peak bin and its neighbours
// (common practice), and the transform length used.
func dominantPeriod(x []float64, mean float64) (float64, int) {
	nfft := fftLength(len(x))
	buf := make([]float64, nfft)
	for i, v := range x {
		buf[i] = v - mean
	}
	fft := fourier.NewFFT(nfft)
	c := fft.Coefficients(nil, buf)
	pow := func(k int) float64 { return real(c[k])*real(c[k]) + imag(c[k])*imag(c[k]) }
	best, bi := 0.0, 0
	for k := 1; k < len(c); k++ {
		if p := pow(k); p > best {
			best, bi = p, k
		}
	}
	if bi == 0 || best == 0 {
		return 0, nfft
	}
	f := float64(bi)
	if bi > 1 && bi < len(c)-1 && pow(bi-1) > 1e-10*best && pow(bi+1) > 1e-10*best {
		a, b, g := math.Log(pow(bi-1)), math.Log(best), math.Log(pow(bi+1))
		if den := a - 2*b + g; den < 0 {
			f += 0.5 * (a - g) / den
		}
	}
	return float64(nfft) / f, nfft
}

// stationarity compares halves and quarters of x with their sampling errors.
func stationarity(x []float64, mean, std float64) Stationarity {
	st := Stationarity{CorrelationTime: segmentCorrelationTime(x)}
	variance := std * std
	check := func(parts int) (means, stds []float64) {
		n := len(x) / parts
		for p := 0; p < parts; p++ {
			m, s := meanStd(x[p*n : (p+1)*n])
			means = append(means, m)
			stds = append(stds, s)
			neff := float64(n) / st.CorrelationTime
			if se := std / math.Sqrt(neff); se > 0 {
				st.MeanShift = math.Max(st.MeanShift, math.Abs(m-mean)/se)
			}
			if s > 0 && variance > 0 {
				se := math.Sqrt(2 / neff)
				st.VarianceShift = math.Max(st.VarianceShift, math.Abs(math.Log(s*s/variance))/se)
			} else {
				st.VarianceShift = math.Inf(1)
			}
		}
		return means, stds
	}
	st.HalfMeans, st.HalfStds = check(2)
	st.QuarterMeans, st.QuarterStds = check(4)
	if math.IsInf(st.VarianceShift, 1) {
		st.VarianceShift = math.MaxFloat64
	}
	st.Stationary = st.MeanShift <= shiftLimit && st.VarianceShift <= shiftLimit
	return st
}

// segmentCorrelationTime estimates the correlation time after removing a straight line from
// each quarter of x, so that a trend or a step between quarters — what the test looks for — does
// not inflate the sampling error it is judged against.
func segmentCorrelationTime(x []float64) float64 {
	y := make([]float64, len(x))
	q := len(x) / 4
	for p := 0; p < 4; p++ {
		lo, hi := p*q, (p+1)*q
		if p == 3 {
			hi = len(x)
		}
		removeLine(x[lo:hi], y[lo:hi])
	}
	m, s := meanStd(y)
	if s == 0 {
		return 1
	}
	return correlationTime(y, m, s)
}

// removeLine writes x minus its least-squares straight line into y.
func removeLine(x, y []float64) {
	n := float64(len(x))
	var st, sx, stt, stx float64
	for i, v := range x {
		t := float64(i)
		st += t
		sx += v
		stt += t * t
		stx += t * v
	}
	den := n*stt - st*st
	b := 0.0
	if den != 0 {
		b = (n*stx - st*sx) / den
	}
	a := (sx - b*st) / n
	for i, v := range x {
		y[i] = v - a - b*float64(i)
	}
}

// acfSegment is the longest stretch over which correlationTime computes the autocovariance in
// one transform; longer records are cut into stretches of this length whose autocovariances
// are summed, which keeps memory bounded (a few times 2^18 numbers) for any record length.
const acfSegment = 1 << 18

// correlationTime returns the integrated autocorrelation time 1 + 2·Σρ(k), summed over k ≥ 1
// up to the first negative ρ(k) (and at most a quarter of the stretch length), from the
// autocovariance computed by FFT with zero padding (so it is not circular).
func correlationTime(x []float64, mean, std float64) float64 {
	seg := min(len(x), acfSegment)
	ac := spectral.NewAutocovariance(seg, fftLength(2*seg))
	acov := make([]float64, seg)
	for lo := 0; lo+seg <= len(x); lo += seg {
		ac.Add(acov, x[lo:lo+seg], mean)
	}
	r0 := acov[0]
	if r0 <= 0 {
		return 1
	}
	tau := 1.0
	for k := 1; k < seg/4; k++ {
		rho := acov[k] / r0
		if rho < 0 {
			break
		}
		tau += 2 * rho
	}
	return tau
}
