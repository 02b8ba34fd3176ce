package embed

import (
	"fmt"
	"math"
)

// Lag-choice rules, as reported in LagChoice.Method and the JSON "method" key.
const (
	// MethodFirstMinimum: the first local minimum of the mutual information that is
	// significant, i.e. the curve rises after it by more than Z standard errors (Fraser &
	// Swinney 1986 choose the first minimum; the significance test is ours).
	MethodFirstMinimum = "mi-first-significant-minimum"
	// MethodBiasLevel: the information at lag 1 is already at the level an independent pair
	// gives (within Z null standard errors of the bias), so no lag carries more than noise;
	// lag 1 is used (white noise).
	MethodBiasLevel = "mi-at-bias-level-lag-1"
	// MethodDecorrelated: no significant minimum, and the autocorrelation has already fallen
	// below 1/e at lag 1, so the record decorrelates within one sample (a map, or a flow
	// sampled more coarsely than its correlation time); lag 1 is used (common practice: maps
	// are embedded with unit delay).
	MethodDecorrelated = "decorrelated-within-one-sample-lag-1"
	// MethodOneOverE: no significant minimum; the first lag where the information falls
	// below 1/e of its lag-0 value.
	MethodOneOverE = "mi-below-1/e-of-lag-0"
	// MethodACF: the information never falls below 1/e of its lag-0 value within the lags
	// scanned (a record whose image is a curve, such as a pure sine); the first zero of the
	// autocorrelation is used instead, else its 1/e decay time.
	MethodACF = "autocorrelation"
)

// LagOptions set how the lag is chosen. The zero value works.
type LagOptions struct {
	// MaxLag is the largest lag scanned, in samples; 0 chooses DefaultMaxLag.
	MaxLag int
	// MI says how the mutual information is estimated.
	MI MIOptions
	// Z is the significance of a minimum in standard errors; 0 means 3.
	//
	// With the KSG estimator a zero MI.Theiler is replaced by the 1/e decay time of the
	// autocorrelation (at least 1); a negative MI.Theiler excludes only the point itself.
	Z float64
}

// LagChoice is the chosen lag with the curves it was read from.
type LagChoice struct {
	// Lag is the chosen delay in samples.
	Lag int
	// Method is the rule that gave it (one of the Method… constants).
	Method string
	// Reason says in words why, with the numbers.
	Reason string
	// Z is the significance used, in standard errors.
	Z float64
	// MaxLag is the largest lag scanned.
	MaxLag int
	// MI is the mutual-information curve, lags 0 … MaxLag.
	MI *MICurve
	// ACF is the autocorrelation, lags 0 … MaxLag.
	ACF *Autocorrelation
	// Cautions are plain-word warnings.
	Cautions []string
}

// DefaultMaxLag returns the default largest lag for a record of n samples whose
// autocorrelation is a: max(20, 2·first zero, 4·(1/e decay time)), capped at 500 and n/4.
// It reaches past the first minimum of the information of a flow (which lies near the first
// zero of the autocorrelation for a nearly periodic signal) with room to see the rise after it.
func DefaultMaxLag(n int, a *Autocorrelation) int {
	m := 20
	if a != nil {
		m = max(m, 2*a.FirstZero, 4*a.DecayTime)
		if a.FirstZero == 0 || a.DecayTime == 0 {
			m = 500
		}
	}
	return max(1, min(m, 500, n/4))
}

// ChooseLag computes the mutual information and the autocorrelation of x and chooses the lag
// by the first rule that applies:
//
//  1. MethodBiasLevel — I(1) − bias ≤ Z·null error: lag 1;
//  2. MethodFirstMinimum — the first local minimum k (I(k) < I(k−1), I(k) ≤ I(k+1)) after
//     which the curve rises, before going lower than I(k), by more than Z standard errors
//     of the difference (see firstSignificantMinimum): lag k;
//  3. MethodDecorrelated — the autocorrelation is below 1/e at lag 1: lag 1;
//  4. MethodOneOverE — the first lag with I(k) < I(0)/e;
//  5. MethodACF — the first zero of the autocorrelation (common practice, and a quarter
//     period for a sine), else its 1/e decay time (or MaxLag) with a caution.
func ChooseLag(x []float64, opt LagOptions) (*LagChoice, error) {
	if len(x) < 16 {
		return nil, fmt.Errorf("lag: %d samples are too few (need at least 16): %w", len(x), ErrTooShort)
	}
	full, err := AutocorrelationFFT(x, len(x)/2)
	if err != nil {
		return nil, fmt.Errorf("lag: %w", err)
	}
	maxLag := opt.MaxLag
	if maxLag <= 0 {
		maxLag = DefaultMaxLag(len(x), full)
	}
	if maxLag >= len(x)/2 {
		return nil, fmt.Errorf("lag: maximum lag %d needs more than %d samples (have %d)", maxLag, 2*maxLag, len(x))
	}
	z := opt.Z
	if z <= 0 {
		z = 3
	}
	miOpt := opt.MI
	if miOpt.Estimator == KSG && miOpt.Theiler == 0 {
		// Pairs close in time are neighbours along the trajectory, not in the state space;
		// leave them out (Theiler 1986) with the default window of this record.
		miOpt.Theiler = max(full.DecayTime, 1)
	}
	mi, err := MutualInformation(x, maxLag, miOpt)
	if err != nil {
		return nil, fmt.Errorf("lag: %w", err)
	}
	acf := &Autocorrelation{R: full.R[:maxLag+1]}
	for k := 1; k <= maxLag; k++ {
		if acf.FirstZero == 0 && acf.R[k] <= 0 {
			acf.FirstZero = k
		}
		if acf.DecayTime == 0 && acf.R[k] < 1/math.E {
			acf.DecayTime = k
		}
	}
	c := &LagChoice{Z: z, MaxLag: maxLag, MI: mi, ACF: acf}
	chooseLag(c)
	if mi.Blocks > 0 && mi.Blocks < 8 {
		c.Reason += fmt.Sprintf("; short record (%d samples): lags scanned up to %d and the information's standard error from %d blocks instead of 8", len(x), maxLag, mi.Blocks)
	}
	return c, nil
}

func chooseLag(c *LagChoice) {
	mi, z := c.MI, c.Z
	I := mi.Nats
	maxLag := c.MaxLag
	bits := func(v float64) float64 { return v / math.Ln2 }
	if maxLag >= 1 && I[1]-mi.Bias <= z*mi.NullErr {
		c.Lag, c.Method = 1, MethodBiasLevel
		c.Reason = fmt.Sprintf("the information at lag 1 (%.4f bits) is already at the level of independent samples (bias %.4f ± %.4f bits): lag 1",
			bits(I[1]), bits(mi.Bias), bits(mi.NullErr))
		c.Cautions = append(c.Cautions, "the record looks like independent noise at this sampling: no delay carries information")
		return
	}
	if k, pk, ok := firstSignificantMinimum(mi, z); ok {
		need := z * mi.DiffErr(k, pk)
		c.Lag, c.Method = k, MethodFirstMinimum
		c.Reason = fmt.Sprintf("first significant minimum of the mutual information at lag %d (%.4f bits; the curve rises by %.4f bits to lag %d, more than %.1f standard errors = %.4f bits)",
			k, bits(I[k]), bits(I[pk]-I[k]), pk, z, bits(need))
		return
	}
	if maxLag >= 1 && c.ACF.R[1] < 1/math.E {
		c.Lag, c.Method = 1, MethodDecorrelated
		c.Reason = fmt.Sprintf("no significant minimum of the mutual information, and the autocorrelation is %.3f < 1/e already at lag 1 (a map, or coarse sampling): lag 1", c.ACF.R[1])
		return
	}
	for k := 1; k <= maxLag; k++ {
		if I[k] < I[0]/math.E {
			c.Lag, c.Method = k, MethodOneOverE
			c.Reason = fmt.Sprintf("no significant minimum of the mutual information up to lag %d; lag %d is the first where it falls below 1/e of its lag-0 value (%.4f < %.4f bits)",
				maxLag, k, bits(I[k]), bits(I[0]/math.E))
			return
		}
	}
	c.Method = MethodACF
	switch {
	case c.ACF.FirstZero > 0:
		// The lag nearest to the sign change (the zero lies between FirstZero−1 and FirstZero).
		c.Lag = c.ACF.FirstZero
		if z := c.Lag; z > 1 && math.Abs(c.ACF.R[z-1]) < math.Abs(c.ACF.R[z]) {
			c.Lag = z - 1
		}
		c.Reason = fmt.Sprintf("no significant minimum of the mutual information and no fall below 1/e of its lag-0 value up to lag %d; lag %d is the nearest to the first zero of the autocorrelation", maxLag, c.Lag)
	case c.ACF.DecayTime > 0:
		c.Lag = c.ACF.DecayTime
		c.Reason = fmt.Sprintf("no significant minimum of the mutual information and no fall below 1/e of its lag-0 value up to lag %d; lag %d is where the autocorrelation falls below 1/e", maxLag, c.Lag)
		c.Cautions = append(c.Cautions, "the lag could not be read from the mutual information; a trend or a very slow drift may dominate (try --detrend linear or a larger --max-lag)")
	default:
		c.Lag = maxLag
		c.Reason = fmt.Sprintf("neither the mutual information nor the autocorrelation decays within %d lags; the largest lag scanned is used", maxLag)
		c.Cautions = append(c.Cautions, "the lag could not be read from the mutual information; a trend or a very slow drift may dominate (try --detrend linear or a larger --max-lag)")
	}
}

// firstSignificantMinimum returns the first local minimum k of the curve that is followed by
// a significant rise, and the lag pk of the rise. From k the curve is scanned forward; the
// valley of k ends when the curve goes below I(k), or at the next local minimum that cannot
// be told from I(k) (within Z combined standard errors: the two belong to one flat floor, as
// for the grid-alignment wiggles of a pure sine). The minimum is significant when, within its
// valley, the curve rises above I(k) by more than Z standard errors of the difference
// (MICurve.DiffErr).
func firstSignificantMinimum(mi *MICurve, z float64) (k, pk int, ok bool) {
	I := mi.Nats
	last := len(I) - 1
	for k = 1; k < last; k++ {
		if !(I[k] < I[k-1] && I[k] <= I[k+1]) {
			continue
		}
		for j := k + 1; j <= last && I[j] >= I[k]; j++ {
			d := z * mi.DiffErr(k, j)
			if I[j]-I[k] > d {
				return k, j, true
			}
			if j < last && I[j] <= I[j-1] && I[j] <= I[j+1] && I[j]-I[k] <= d {
				break
			}
		}
	}
	return 0, 0, false
}
