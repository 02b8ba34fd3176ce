package embed

import (
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
)

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
	// NoiseLike is true when |E2(d) − 1| < 0.1 for every d: "consistent with noise" (Cao
	// 1997: for random data E2 ≈ 1 for all d; the 0.1 band is CHECKS.md §5's tolerance).
	NoiseLike bool
	Cautions  []string
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
// which rule gave it.
//
// Cost as a function of N: for each m, building the tree, O(N log N · m), and one
// nearest-neighbour search per vector, O(log N) each on low-dimensional attractors
// (neighbors.Index.AllKNN searches the vectors of one tree leaf together); in all
// O(M · N log N · m) time and O(N · m) memory for the tree of one dimension at a time, plus
// the N nearest indices and distances. The fractions do not depend on Threads.
func ChooseDimension(x []float64, opt DimOptions) (*DimChoice, error) {
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
	// At least 2·Theiler + 32 vectors in the largest dimension.
	for c.MaxDim > 1 && n-c.MaxDim*lag < 2*c.Theiler+32 {
		c.MaxDim--
	}
	if n-c.MaxDim*lag < 2*c.Theiler+32 {
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
	c.decide()
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

func (c *DimChoice) decide() {
	for _, p := range c.FNN {
		if p.Points > 0 && p.Fraction < c.Threshold {
			c.FNNDim = p.Dim
			break
		}
	}
	for i := 0; i+1 < len(c.Cao); i++ {
		e1, next := c.Cao[i].E1, c.Cao[i+1].E1
		if e1 > 0.9 && math.Abs(next-e1) < 0.05*e1 {
			c.CaoDim = c.Cao[i].Dim
			break
		}
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
			c.Reason += fmt.Sprintf("; the false-neighbour fraction never falls below %.3g (lowest %.4f)", c.Threshold, c.minFNN())
		}
	default:
		c.Reason = fmt.Sprintf("no dimension up to %d: the false-neighbour fraction never falls below %.3g (lowest %.4f) and Cao's E1 does not saturate", c.MaxDim, c.Threshold, c.minFNN())
	}
	if c.NoiseLike {
		c.Cautions = append(c.Cautions, "consistent with noise: Cao's E2 stays within 0.1 of 1 for every dimension, as for a random signal (Cao 1997)")
	}
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
