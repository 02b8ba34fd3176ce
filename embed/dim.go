package embed

import (
	"encoding/binary"
	"fmt"
	"math"

	"unfold/neighbors"
)

// Dimension-choice rules, as reported in DimChoice.Method.
const (
	// DimFNN: the smallest m whose false-neighbour fraction is below the threshold.
	DimFNN = "false-neighbors"
	// DimCao: the smallest m where Cao's E1 saturates (E1 > 0.9 and changing by less than 5 %).
	DimCao = "cao-e1-saturation"
	// DimBoth: both rules give the same m.
	DimBoth = "false-neighbors+cao-e1-saturation"
	// DimNoiseLimited: neither rule applies because noise keeps the false-neighbour fraction
	// above the threshold; the dimension is where the fraction and Cao's E1 stop improving.
	DimNoiseLimited = "noise-limited"
	// DimPeriodic: neither rule can be read because every nearest neighbour is an exact
	// duplicate, and the record repeats exactly with some period P (an exactly periodic orbit,
	// as a map settled on a stable cycle gives); the dimension is the smallest m whose P delay
	// vectors of one period are all distinct.
	DimPeriodic = "exact-period"
)

// TrendLimit is the |correlation| of a record with time above which it counts as trended
// for the dimension choice (judgement: a monotone trend then dominates the variance).
const TrendLimit = 0.5

// DimOptions set the dimension scan. Lag is required; the zero value of the rest gives the
// defaults.
type DimOptions struct {
	// Lag is the delay in samples (≥ 1).
	Lag int
	// MaxDim is the largest dimension scanned; 0 means 10.
	MaxDim int
	// Theiler excludes temporal neighbours |i−j| ≤ Theiler (samples); 0 excludes only the
	// point itself. (The commands default it to DefaultTheiler.)
	Theiler int
	// RTol is the first FNN criterion, |x_{i+mτ} − x_{j+mτ}| / R_m > RTol; 0 means 15
	// (Kennel, Brown & Abarbanel 1992).
	RTol float64
	// ATol is the second FNN criterion, R_{m+1} / R_A > ATol with R_A the RMS deviation of the
	// record from its mean; 0 means 2 (KBA 1992).
	ATol float64
	// Threshold is the false fraction below which a dimension is accepted; 0 means 0.01.
	Threshold float64
	// Norm is the distance of the neighbour search (neighbors.Euclidean, KBA 1992's choice,
	// is the zero value; Cao 1997 used the maximum norm).
	Norm neighbors.Norm
	// Threads is the number of goroutines for the searches (0 = all cores).
	Threads int
	// Progress, when not nil, is called with (done, total) query counts over the whole scan.
	Progress func(done, total int)
}

// FNNPoint is the false-neighbour result in one dimension.
type FNNPoint struct {
	Dim int
	// Fraction is the fraction of points whose nearest neighbour is false by either
	// criterion; Criterion1 and Criterion2 are the fractions for each alone.
	Fraction, Criterion1, Criterion2 float64
	// Points is the number of points counted (pairs at distance 0 are left out).
	Points int
}

// CaoPoint is Cao's (1997) E1(d) = E(d+1)/E(d) and E2(d) = E*(d+1)/E*(d).
type CaoPoint struct {
	Dim    int
	E1, E2 float64
}

// DimChoice is the chosen dimension with the curves it was read from.
type DimChoice struct {
	// Dimension is the chosen embedding dimension (0 when no rule applied).
	Dimension int
	// Method is DimFNN, DimCao or DimBoth ("" when no rule applied).
	Method string
	// Reason says in words why, with the numbers.
	Reason string
	// FNNDim and CaoDim are the dimensions each rule gives (0 when it does not apply).
	FNNDim, CaoDim int
	// Lag, Theiler, RTol, ATol, Threshold, MaxDim and Norm are the parameters used.
	Lag, Theiler          int
	RTol, ATol, Threshold float64
	MaxDim                int
	Norm                  neighbors.Norm
	FNN                   []FNNPoint // m = 1 … MaxDim
	Cao                   []CaoPoint // d = 1 … MaxDim−1
	E                     []float64  // Cao's E(d), d = 1 … MaxDim (index d−1)
	EStar                 []float64  // Cao's E*(d), d = 1 … MaxDim
	// Trend is the Pearson correlation of the record with time; |Trend| > TrendLimit skips
	// m = 1, which a monotone trend makes look sufficient (neighbours in value are
	// neighbours in time).
	Trend float64
	// NoiseLike is true when |E2(d) − 1| < 0.1 for every d: "consistent with noise" (Cao
	// 1997: for random data E2 ≈ 1 for all d; the 0.1 band is CHECKS.md §5's tolerance).
	NoiseLike bool
	// Period is the exact period of the record in samples (x_{i+P} = x_i for every i) when
	// the dimension was read from it (DimPeriodic); 0 otherwise.
	Period   int
	Cautions []string
}

// ChooseDimension scans m = 1 … MaxDim: in each dimension one kd-tree is built over the
// N − m·τ delay vectors that have an (m+1)-th coordinate, every vector's nearest neighbour
// outside the Theiler window is found in parallel, and that one search gives both the
// false-neighbour test of Kennel, Brown & Abarbanel (1992, PRA 45, 3403: a neighbour is false
// when |x_{i+mτ} − x_{j+mτ}| / R_m > RTol or R_{m+1} / R_A > ATol) and Cao's (1997, Physica
// D 110, 43) a(i, m) = R_{m+1}/R_m and |x_{i+mτ} − x_{j+mτ}|, whose means are E(m) and E*(m).
//
// The dimension is the smallest m whose false fraction is below Threshold, or the smallest d
// with E1(d) > 0.9 and |E1(d+1) − E1(d)| < 0.05·E1(d), whichever is smaller; Method says
// which rule gave it. When neither applies (noise keeps some neighbours false in every
// dimension), the dimension is where the false fraction and E1 stop improving
// (DimNoiseLimited, with a caution). A trended record (|correlation with time| >
// TrendLimit) never gets m = 1.
//
// Cost as a function of N: for each m, building the tree, O(N log N · m), and one
// nearest-neighbour search per vector, O(log N) each on low-dimensional attractors
// (neighbors.Index.AllKNN searches the vectors of one tree leaf together); in all
// O(M · N log N · m) time and O(N · m) memory for the tree of one dimension at a time, plus
// the N nearest indices and distances. The fractions do not depend on Threads.
func ChooseDimension(x []float64, opt DimOptions) (*DimChoice, error) {
	c, err := dimCurves(x, opt)
	if err != nil {
		return nil, err
	}
	c.decide(x)
	return c, nil
}

// FalseNeighbors returns the false-nearest-neighbour fractions for m = 1 … MaxDim at the lag
// opt.Lag (Kennel, Brown & Abarbanel 1992, "Determining embedding dimension for phase-space
// reconstruction using a geometrical construction", Physical Review A 45, 3403–3411): the
// nearest neighbour of a delay vector in dimension m, outside the Theiler window, is false when
// adding the (m+1)-th coordinate stretches the distance, |x_{i+mτ} − x_{j+mτ}| / R_m > RTol, or
// when the new distance is large against the size of the attractor, R_{m+1} / R_A > ATol. The
// curve is the one ChooseDimension reads (DimChoice.FNN); it makes no choice.
func FalseNeighbors(x []float64, opt DimOptions) ([]FNNPoint, error) {
	c, err := dimCurves(x, opt)
	if err != nil {
		return nil, err
	}
	return c.FNN, nil
}

// Cao returns Cao's E1(d) = E(d+1)/E(d) and E2(d) = E*(d+1)/E*(d) for d = 1 … MaxDim−1 at the
// lag opt.Lag (L. Cao 1997, "Practical method for determining the minimum embedding dimension
// of a scalar time series", Physica D 110, 43–50), where E(d) is the mean of R_{d+1}/R_d over
// the nearest neighbours in dimension d and E*(d) the mean of |x_{i+dτ} − x_{j+dτ}|. E1 stops
// changing from the minimum embedding dimension on; E2 stays near 1 for every d for random
// data. The curve is the one ChooseDimension reads (DimChoice.Cao); it makes no choice.
// Cao used the maximum norm: set opt.Norm to neighbors.Max for his definition.
func Cao(x []float64, opt DimOptions) ([]CaoPoint, error) {
	c, err := dimCurves(x, opt)
	if err != nil {
		return nil, err
	}
	return c.Cao, nil
}

// dimCurves computes the curves of ChooseDimension (false-neighbour fractions, Cao's E, E*,
// E1 and E2, with the parameters used and the cautions of the scan) without choosing.
func dimCurves(x []float64, opt DimOptions) (*DimChoice, error) {
	if opt.Lag < 1 {
		return nil, fmt.Errorf("dimension: lag %d must be at least 1", opt.Lag)
	}
	c := &DimChoice{Lag: opt.Lag, Theiler: max(opt.Theiler, 0), RTol: opt.RTol, ATol: opt.ATol,
		Threshold: opt.Threshold, MaxDim: opt.MaxDim, Norm: opt.Norm}
	if c.RTol <= 0 {
		c.RTol = 15
	}
	if c.ATol <= 0 {
		c.ATol = 2
	}
	if c.Threshold <= 0 {
		c.Threshold = 0.01
	}
	if c.MaxDim <= 0 {
		c.MaxDim = 10
	}
	n, lag := len(x), opt.Lag
	// At least 2·Theiler + 32 vectors in the largest dimension; records under 128 samples
	// need only 2·Theiler + max(16, N/4), so that short records still scan a few dimensions.
	minVec := 2*c.Theiler + min(32, max(16, n/4))
	for c.MaxDim > 1 && n-c.MaxDim*lag < minVec {
		c.MaxDim--
	}
	if n-c.MaxDim*lag < minVec {
		return nil, fmt.Errorf("dimension: %d samples are too few for lag %d and Theiler window %d: %w", n, lag, c.Theiler, ErrTooShort)
	}
	if c.MaxDim < opt.MaxDim {
		c.Cautions = append(c.Cautions, fmt.Sprintf("the record is too short for dimension %d at lag %d; scanned up to %d", opt.MaxDim, lag, c.MaxDim))
	}
	var mean, ss float64
	for _, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("dimension: the record contains %v", v)
		}
		mean += v
	}
	mean /= float64(n)
	for _, v := range x {
		ss += (v - mean) * (v - mean)
	}
	ra := math.Sqrt(ss / float64(n))
	if ra == 0 {
		return nil, fmt.Errorf("dimension: the record is constant")
	}
	c.Trend = timeCorrelation(x, mean, ss)
	total := 0
	for m := 1; m <= c.MaxDim; m++ {
		total += n - m*lag
	}
	done := 0
	// Repeated values make exact-duplicate neighbours in low dimensions (quantised data do
	// that in dimension 1 as a matter of course); they are worth a caution only where they
	// persist, in dimension 2 and above.
	zeroPairs, zeroDim := 0, 0
	for m := 1; m <= c.MaxDim; m++ {
		cnt := n - m*lag
		// The vectors of x[:n−lag] in dimension m are exactly the N − m·τ vectors that have
		// an (m+1)-th coordinate in x.
		ix, err := neighbors.FromEmbedding(x[:n-lag], lag, m, opt.Norm)
		if err != nil {
			return nil, fmt.Errorf("dimension: %w", err)
		}
		var prog func(d, t int)
		if opt.Progress != nil {
			off := done
			prog = func(d, _ int) { opt.Progress(off+d, total) }
		}
		idx, dist := ix.AllKNN(1, c.Theiler, 0, 0, opt.Threads, prog)
		done += cnt
		p, e, es, zeros := scoreNeighbors(x, lag, m, idx, dist, ra, c.RTol, c.ATol, opt.Norm)
		if m >= 2 && zeros > zeroPairs {
			zeroPairs, zeroDim = zeros, m
		}
		p.Dim = m
		c.FNN = append(c.FNN, p)
		c.E = append(c.E, e)
		c.EStar = append(c.EStar, es)
	}
	if zeroPairs > 0 {
		c.Cautions = append(c.Cautions, fmt.Sprintf("in dimension %d, %d points had a neighbour at distance 0 (repeated stretches of the signal, or coarse quantisation) and were left out of the false-neighbour count", zeroDim, zeroPairs))
	}
	for d := 1; d < c.MaxDim; d++ {
		cp := CaoPoint{Dim: d, E1: c.E[d] / c.E[d-1], E2: c.EStar[d] / c.EStar[d-1]}
		c.Cao = append(c.Cao, cp)
	}
	return c, nil
}

// scoreNeighbors evaluates the nearest neighbours found in dimension m: the FNN fractions,
// Cao's E(m) = ⟨R_{m+1}/R_m⟩ and E*(m) = ⟨|x_{i+mτ} − x_{j+mτ}|⟩, and the number of points
// left out for lack of a neighbour at positive distance.
func scoreNeighbors(x []float64, lag, m int, idx []int32, dist []float64, ra, rtol, atol float64, norm neighbors.Norm) (p FNNPoint, e, es float64, zeros int) {
	var f1, f2, f12, cnt int
	var sumA, sumE float64
	for i, jj := range idx {
		if jj < 0 {
			continue
		}
		j := int(jj)
		r := dist[i]
		extra := math.Abs(x[i+m*lag] - x[j+m*lag])
		if !(r > 0) {
			zeros++
			continue
		}
		var r1 float64
		if norm == neighbors.Max {
			r1 = math.Max(r, extra)
		} else {
			r1 = math.Sqrt(r*r + extra*extra)
		}
		c1 := extra/r > rtol
		c2 := r1/ra > atol
		if c1 {
			f1++
		}
		if c2 {
			f2++
		}
		if c1 || c2 {
			f12++
		}
		cnt++
		sumA += r1 / r
		sumE += extra
	}
	if cnt == 0 {
		return FNNPoint{}, math.NaN(), math.NaN(), zeros
	}
	fc := float64(cnt)
	return FNNPoint{Fraction: float64(f12) / fc, Criterion1: float64(f1) / fc, Criterion2: float64(f2) / fc, Points: cnt},
		sumA / fc, sumE / fc, zeros
}

// timeCorrelation returns the Pearson correlation of x with its sample index.
func timeCorrelation(x []float64, mean, ss float64) float64 {
	n := float64(len(x))
	tm := (n - 1) / 2
	var sxt, stt float64
	for i, v := range x {
		d := float64(i) - tm
		sxt += d * (v - mean)
		stt += d * d
	}
	if stt == 0 || ss == 0 {
		return 0
	}
	return sxt / math.Sqrt(stt*ss)
}

func (c *DimChoice) decide(x []float64) {
	trended := math.Abs(c.Trend) > TrendLimit
	minDim := 1
	if trended {
		minDim = 2
	}
	for _, p := range c.FNN {
		if p.Dim >= minDim && p.Points > 0 && p.Fraction < c.Threshold {
			c.FNNDim = p.Dim
			break
		}
	}
	for i := 0; i+1 < len(c.Cao); i++ {
		e1, next := c.Cao[i].E1, c.Cao[i+1].E1
		if c.Cao[i].Dim >= minDim && e1 > 0.9 && math.Abs(next-e1) < 0.05*e1 {
			c.CaoDim = c.Cao[i].Dim
			break
		}
	}
	if trended {
		c.Cautions = append(c.Cautions, fmt.Sprintf("the record is trended (correlation with time %.2f): a monotone trend makes one dimension look sufficient, so m = 1 is not considered; remove the trend first (--detrend linear)", c.Trend))
	}
	c.NoiseLike = len(c.Cao) > 0
	for _, p := range c.Cao {
		if !(math.Abs(p.E2-1) < 0.1) {
			c.NoiseLike = false
		}
	}
	fnnText := func() string {
		return fmt.Sprintf("the false-neighbour fraction falls below %.3g at m = %d (%.4f)", c.Threshold, c.FNNDim, c.FNN[c.FNNDim-1].Fraction)
	}
	caoText := func() string {
		i := c.CaoDim - 1
		return fmt.Sprintf("Cao's E1 saturates at d = %d (E1 = %.3f, then %.3f)", c.CaoDim, c.Cao[i].E1, c.Cao[i+1].E1)
	}
	switch {
	case c.FNNDim > 0 && c.FNNDim == c.CaoDim:
		c.Dimension, c.Method = c.FNNDim, DimBoth
		c.Reason = fnnText() + ", and " + caoText()
	case c.FNNDim > 0 && (c.CaoDim == 0 || c.FNNDim < c.CaoDim):
		c.Dimension, c.Method = c.FNNDim, DimFNN
		c.Reason = fnnText()
		if c.CaoDim > 0 {
			c.Reason += fmt.Sprintf("; Cao's E1 saturates later, at d = %d", c.CaoDim)
		} else {
			c.Reason += "; Cao's E1 does not saturate within the scan"
		}
	case c.CaoDim > 0:
		c.Dimension, c.Method = c.CaoDim, DimCao
		c.Reason = caoText()
		if c.FNNDim > 0 {
			c.Reason += fmt.Sprintf("; the false-neighbour fraction falls below %.3g later, at m = %d", c.Threshold, c.FNNDim)
		} else {
			if lo := c.minFNN(); math.IsInf(lo, 1) {
				c.Reason += "; the false-neighbour fraction cannot be read (every nearest neighbour is an exact duplicate)"
			} else {
				c.Reason += fmt.Sprintf("; the false-neighbour fraction never falls below %.3g (lowest %.4f)", c.Threshold, lo)
			}
		}
	case math.IsInf(c.minFNN(), 1) && c.exactPeriod(x, minDim):
	case math.IsInf(c.minFNN(), 1):
		c.Reason = fmt.Sprintf("no dimension up to %d: in every dimension each point's nearest neighbour is an exact duplicate (distance 0), as in a signal of a few repeated values such as a square wave or a few-level signal, so neither the false-neighbour fraction nor Cao's E1 can be read", c.MaxDim)
	default:
		if m, why := c.noiseLimited(minDim); m > 0 {
			c.Dimension, c.Method = m, DimNoiseLimited
			c.Reason = why
			c.Cautions = append(c.Cautions, fmt.Sprintf("noise-limited dimension: the false-neighbour fraction stays above %.3g (lowest %.4f); m = %d is where it and Cao's E1 stop improving — noise or a high-dimensional signal", c.Threshold, c.minFNN(), m))
		} else if c.MaxDim <= minDim {
			c.Dimension, c.Method = c.MaxDim, DimNoiseLimited
			c.Reason = fmt.Sprintf("the record is too short to scan beyond dimension %d at lag %d: m = %d", c.MaxDim, c.Lag, c.MaxDim)
			c.Cautions = append(c.Cautions, fmt.Sprintf("dimension %d is only what the record's length allows at lag %d; a longer record or a shorter --lag is needed to test higher dimensions", c.MaxDim, c.Lag))
		} else {
			c.Reason = fmt.Sprintf("no dimension up to %d: the false-neighbour fraction never falls below %.3g (lowest %.4f) and Cao's E1 does not saturate", c.MaxDim, c.Threshold, c.minFNN())
		}
	}
	if c.NoiseLike {
		c.Cautions = append(c.Cautions, "consistent with noise: Cao's E2 stays within 0.1 of 1 for every dimension, as for a random signal (Cao 1997)")
	}
}

// noiseLimited returns the dimension where the false-neighbour fraction and Cao's E1 both
// stop improving, for records whose fraction never falls below the threshold (noise keeps
// some neighbours false in every dimension): the smallest m ≥ max(2, minDim) from which the
// fraction falls by less than a fifth of its value or by less than 0.005 at the next m, and
// the smallest d from which E1 changes by less than 5 % (the saturation rule of Cao 1997
// without its E1 > 0.9 condition); the larger of the two. The fifth and 0.005 are judgement.
// 0 when neither levels off within the scan.
func (c *DimChoice) noiseLimited(minDim int) (int, string) {
	lo := max(2, minDim)
	fnn := 0
	for i := 0; i+1 < len(c.FNN); i++ {
		p, q := c.FNN[i], c.FNN[i+1]
		if p.Dim < lo || p.Points == 0 || q.Points == 0 {
			continue
		}
		if d := p.Fraction - q.Fraction; d < 0.2*p.Fraction || d < 0.005 {
			fnn = p.Dim
			break
		}
	}
	cao := 0
	for i := 0; i+1 < len(c.Cao); i++ {
		e1, next := c.Cao[i].E1, c.Cao[i+1].E1
		if c.Cao[i].Dim >= lo && !math.IsNaN(e1) && math.Abs(next-e1) < 0.05*e1 {
			cao = c.Cao[i].Dim
			break
		}
	}
	switch {
	case fnn > 0 && cao > 0:
		m := max(fnn, cao)
		return m, fmt.Sprintf("noise-limited: the false-neighbour fraction never falls below %.3g but levels off from m = %d (%.4f), and Cao's E1 stops changing (by less than 5 %%) from d = %d (E1 = %.3f): m = %d",
			c.Threshold, fnn, c.FNN[fnn-1].Fraction, cao, c.Cao[cao-1].E1, m)
	case fnn > 0:
		return fnn, fmt.Sprintf("noise-limited: the false-neighbour fraction never falls below %.3g but levels off from m = %d (%.4f); Cao's E1 keeps changing within the scan", c.Threshold, fnn, c.FNN[fnn-1].Fraction)
	case cao > 0:
		return cao, fmt.Sprintf("noise-limited: the false-neighbour fraction never falls below %.3g (lowest %.4f) and keeps falling; Cao's E1 stops changing (by less than 5 %%) from d = %d (E1 = %.3f)", c.Threshold, c.minFNN(), cao, c.Cao[cao-1].E1)
	}
	best := 0
	for _, p := range c.FNN {
		if p.Dim >= lo && p.Points > 0 && (best == 0 || p.Fraction < c.FNN[best-1].Fraction) {
			best = p.Dim
		}
	}
	if best > 0 {
		return best, fmt.Sprintf("noise-limited: neither the false-neighbour fraction nor Cao's E1 levels off up to dimension %d; m = %d has the lowest false fraction (%.4f)", c.MaxDim, best, c.FNN[best-1].Fraction)
	}
	return 0, ""
}

// exactPeriod handles a record whose nearest neighbours are all exact duplicates: when the
// record repeats exactly, x_{i+P} = x_i for every i, with a period P of at most a quarter of
// its length (at least four repeats), its motion is a periodic orbit of P states, and the
// dimension is the smallest m ≥ minDim whose P delay vectors x_i … x_{i+(m−1)τ}, i = 0 … P−1,
// are all distinct: every state then has its own point, so a neighbour at distance 0 is the
// same state a whole number of periods later and stays at distance 0 (no false neighbour in
// the sense of Kennel, Brown & Abarbanel 1992). It sets the choice and reports true; false
// when the record does not repeat exactly or its states cannot be told apart within MaxDim
// (a square wave, whose flat stretches make states that no delay vector separates).
func (c *DimChoice) exactPeriod(x []float64, minDim int) bool {
	n := len(x)
	p := 0
	for q := 1; q <= n/4 && p == 0; q++ {
		i := 0
		for i+q < n && x[i+q] == x[i] {
			i++
		}
		if i+q == n {
			p = q
		}
	}
	if p == 0 {
		return false
	}
	lag := c.Lag
	for m := minDim; m <= c.MaxDim; m++ {
		if p+(m-1)*lag > n {
			break
		}
		seen := make(map[string]bool, p)
		key := make([]byte, 0, 8*m)
		distinct := true
		for i := 0; i < p && distinct; i++ {
			key = key[:0]
			for k := range m {
				key = binary.LittleEndian.AppendUint64(key, math.Float64bits(x[i+k*lag]))
			}
			if seen[string(key)] {
				distinct = false
			}
			seen[string(key)] = true
		}
		if distinct {
			c.Dimension, c.Method, c.Period = m, DimPeriodic, p
			c.Reason = fmt.Sprintf("every nearest neighbour is an exact duplicate and the record repeats exactly with period %d samples (x(i+%d) = x(i) for every i: a periodic orbit); its %d states are distinct delay vectors from m = %d: m = %d", p, p, p, m, m)
			c.Cautions = append(c.Cautions, fmt.Sprintf("the record repeats exactly with period %d samples: a periodic orbit with no measurable spread, so the false-neighbour fraction and Cao's E1 cannot be read; the dimension only tells its %d states apart", p, p))
			return true
		}
	}
	return false
}

func (c *DimChoice) minFNN() float64 {
	lo := math.Inf(1)
	for _, p := range c.FNN {
		if p.Points > 0 {
			lo = math.Min(lo, p.Fraction)
		}
	}
	return lo
}

// DefaultTheiler returns the default Theiler window of a record whose autocorrelation is a:
// its 1/e decay time in samples (at least 1), the autocorrelation time that Theiler (1986)
// asks to exclude (common practice to read it at 1/e). When the autocorrelation does not fall
// below 1/e within the lags computed, the largest lag computed is returned.
func DefaultTheiler(a *Autocorrelation) int {
	if a.DecayTime > 0 {
		return a.DecayTime
	}
	return max(len(a.R)-1, 1)
}
