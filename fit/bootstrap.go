package fit

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"
)

// Interval is a two-sided bootstrap percentile interval.
type Interval struct {
	Lo, Hi float64 // the (1−Level)/2 and (1+Level)/2 percentiles of the bootstrap statistics
	Level  float64 // nominal coverage, e.g. 0.95
	Reps   int     // resamples whose statistic was finite (the ones the percentiles use)
	Failed int     // resamples whose statistic was NaN or infinite, left out
}

// Bootstrap computes a percentile bootstrap interval (Efron & Tibshirani 1993, An Introduction
// to the Bootstrap, ch. 13) for a statistic of n items: it draws reps resamples of n indices in
// [0, n) uniformly with replacement from rng, calls stat with each (the slice is reused between
// calls; stat must not keep it), and returns the (1−level)/2 and (1+level)/2 percentiles of
// the results. Statistics that come back NaN or infinite are left out and counted in Failed; if
// fewer than half of the resamples succeed the interval is refused.
//
// The resamples depend only on rng's state, so a seeded rng gives a reproducible interval.
func Bootstrap(rng *rand.Rand, n, reps int, level float64, stat func(idx []int) float64) (Interval, error) {
	switch {
	case rng == nil:
		return Interval{}, fmt.Errorf("fit: bootstrap needs a random source")
	case n < 2:
		return Interval{}, fmt.Errorf("fit: bootstrap needs at least 2 items, got %d", n)
	case reps < 2:
		return Interval{}, fmt.Errorf("fit: bootstrap needs at least 2 resamples, got %d", reps)
	case !(level > 0 && level < 1):
		return Interval{}, fmt.Errorf("fit: interval level %g must lie strictly between 0 and 1", level)
	}
	idx := make([]int, n)
	vals := make([]float64, 0, reps)
	failed := 0
	for range reps {
		for i := range idx {
			idx[i] = rng.IntN(n)
		}
		v := stat(idx)
		if math.IsNaN(v) || math.IsInf(v, 0) {
			failed++
			continue
		}
		vals = append(vals, v)
	}
	if 2*len(vals) < reps {
		return Interval{}, fmt.Errorf("fit: the statistic failed on %d of %d bootstrap resamples", failed, reps)
	}
	slices.Sort(vals)
	return Interval{
		Lo:    Quantile(vals, (1-level)/2),
		Hi:    Quantile(vals, (1+level)/2),
		Level: level, Reps: len(vals), Failed: failed,
	}, nil
}

// Quantile returns the p-quantile (0 ≤ p ≤ 1) of sorted values by linear interpolation between
// order statistics (the definition h = (n−1)p, Hyndman & Fan 1996, "Sample quantiles in
// statistical packages", The American Statistician 50, 361, type 7). It returns NaN for an
// empty slice.
func Quantile(sorted []float64, p float64) float64 {
	n := len(sorted)
	if n == 0 || math.IsNaN(p) {
		return math.NaN()
	}
	p = math.Min(math.Max(p, 0), 1)
	h := float64(n-1) * p
	lo := int(math.Floor(h))
	if lo >= n-1 {
		return sorted[n-1]
	}
	return sorted[lo] + (h-float64(lo))*(sorted[lo+1]-sorted[lo])
}
