// Package dimension estimates the correlation dimension D2 of a reconstructed attractor: the
// correlation sums C(r) for embedding dimensions m = 1…M at log-spaced radii with a Theiler
// window, their local slopes d log C / d log r, D2 read from the scaling range that package fit
// finds (with a bootstrap interval), whether D2 saturates as m grows, and the Takens
// maximum-likelihood estimate as a second opinion.
//
// C(r) at dimension m is the fraction of pairs of delay vectors i ≠ j with |j − i| > w (the
// Theiler window) whose maximum-norm (by default) distance is at most r. Two ways of counting
// are offered:
//
//   - Sampled (the default): R reference points (Options.ReferencePoints, default
//     DefaultReferencePoints), one drawn uniformly at random from each of R equal stretches of
//     the record with the seed, each against all N partners outside its window
//     (neighbors.Index.ReferencePairCountsUntil). C(r) is the fraction of those pairs within
//     r: an unbiased estimate of the all-pairs sum, whose error comes from the spread of the
//     local densities over the references rather than from the number of pairs. The result
//     states R in ReferencePoints and says so in Sampling; when R ≥ N every point is a
//     reference and the count is exact. Each radius stops early: the references are taken in
//     a random order, and once a radius has as many pairs as one with C = 0.005 would get from
//     all R, or 2·10^6 pairs if fewer (but never before R/16 references), it and every larger
//     radius stop (Curve.References states the references behind every radius). Large radii,
//     where counting costs most and pairs are plentiful, are thus read from fewer references.
//   - Exact (Options.Exact): all N(N−1)/2 pairs in one dual-tree traversal per m
//     (neighbors.Index.PairCounts).
//
// With the automatic radii, pairs are only counted up to the radius where C(r) passes ½ at the
// largest m (the median distance of 4096 random pairs, times 1.5, rounded up to the grid):
// radii above it never enter the fit (see the scaling-range rule below), and the large radii
// are where pair counting costs most.
//
// Cost as a function of N (for M dimensions, K radii): sampled, O(M·(N log N + R·(log N +
// n_K))) time, where n_K is the number of points within a tree leaf of one of the K radius
// spheres around a reference point (about N^(1−1/D2)·C(r) per radius, and the early stop
// keeps C(r)·R_k bounded) — for a fixed R it grows less than linearly in N, not as N²;
// exact, O(M·N²) pairs in the worst case (whole subtrees within one radius bin are counted
// without visiting their points, so attractors of low dimension cost less). Memory O(N·m) for
// the tree of one dimension at a time plus O(K) per goroutine; no N×N or N×K structure is held.
//
// The decision rules, each shown in the result:
//   - Scaling range: the longest range of radii whose local slopes of log C against log r are
//     stable (fit.ScalingRange, tolerance 10 % of the median slope, retried at 20 %), among
//     radii whose pair count is at least 50. D2(m) is the least-squares slope there.
//   - Interval: the 95 % percentile bootstrap of the slope over the range's points (fit.Bootstrap),
//     widened to cover the spread of D2(m) over the dimensions it is read from.
//   - Saturated: D2(m) of the three largest fitted dimensions agree within max(0.1, 5 %) and
//     lie at least 1 below the embedding dimension. D2 is then their median; otherwise D2 is the
//     value at the largest fitted dimension and Saturated is false.
//   - Caution when D2 > 2·log10(N): no record of N points can show a larger dimension
//     (Eckmann & Ruelle 1992).
//
// References: P. Grassberger and I. Procaccia (1983), "Characterization of strange
// attractors", Physical Review Letters 50, 346–349, and "Measuring the strangeness of strange
// attractors", Physica D 9, 189–208; J. Theiler (1986), "Spurious dimension from correlation
// algorithms applied to limited time-series data", Physical Review A 34, 2427–2432; F. Takens
// (1985), "On the numerical determination of the dimension of an attractor", Lecture Notes in
// Mathematics 1125, 99–106; J.-P. Eckmann and D. Ruelle (1992), "Fundamental limitations for
// estimating dimensions and Lyapunov exponents in dynamical systems", Physica D 56, 185–187.
package dimension

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"slices"

	"unfold/fit"
	"unfold/neighbors"
)

// Options configure CorrelationDimension. Lag must be set; the rest have defaults.
type Options struct {
	// Lag is the delay in samples (≥ 1).
	Lag int
	// MaxDim is the largest embedding dimension (0 means 8).
	MaxDim int
	// Theiler excludes pairs with |i − j| ≤ Theiler samples (0 excludes only i = j).
	Theiler int
	// Radii are the radii in signal units, ascending; nil chooses NumRadii log-spaced radii
	// from 10^−3.5 of the record's range up to its range.
	Radii []float64
	// NumRadii is the number of automatic radii (0 means 40).
	NumRadii int
	// Euclidean uses the Euclidean norm instead of the maximum norm.
	Euclidean bool
	// Seed seeds the bootstrap.
	Seed uint64
	// Threads is the number of goroutines for pair counting (0 = all cores).
	Threads int
	// Progress, when not nil, is called with (done, total) over each dimension's pass.
	Progress func(done, total int)
	// ReferencePoints is the number of reference points of the sampled correlation sums (0
	// means DefaultReferencePoints); when it is at least the number of delay vectors every
	// point is a reference. Ignored when Exact is set.
	ReferencePoints int
	// Exact counts all pairs (cost O(N²) per dimension) instead of sampling reference points.
	Exact bool
	// Index, when not nil, returns the neighbour index of the delay vectors of x at dimension
	// m (lag Lag, the norm of Euclidean), for example one already built by another estimator
	// on the same record; nil builds it with neighbors.FromEmbedding. The result is the same
	// either way; an index of the wrong shape or norm is an error.
	Index func(m int) (*neighbors.Index, error)
}

// DefaultReferencePoints is the default number of sampled reference points: 4000 against all
// N partners gives 4000·N pairs, about 4·10^8 at N = 10^5, enough for counts of hundreds of
// pairs at radii where C(r) is near 10^−6 (common practice: the statistical error of a
// correlation sum is governed by the number of pairs counted, and a few thousand reference
// points suffice for dimensions below about 5).
const DefaultReferencePoints = 4000

// Curve is the correlation sum at one embedding dimension.
type Curve struct {
	Dim int `json:"dimension"`
	// C[k] is the correlation sum at Radii[k]; Pairs[k] the pair count behind it.
	C     []float64 `json:"c"`
	Pairs []int64   `json:"pairs"`
	// Slopes[k] is the local slope d log C / d log r at Radii[k] (three-point least squares;
	// NaN where C is zero or at the ends).
	Slopes []float64 `json:"local_slopes"`
	// Fitted is true when a scaling range was found; D2 is then the fitted slope over radii
	// From…To (indices into Radii) and Lo, Hi its bootstrap interval.
	Fitted   bool    `json:"fitted"`
	D2       float64 `json:"d2"`
	Lo       float64 `json:"lo"`
	Hi       float64 `json:"hi"`
	From, To int     `json:"-"`
	// Takens is the maximum-likelihood dimension at the top of the scaling range.
	Takens float64 `json:"takens"`
	// References[k] is the number of reference points C[k] was counted from (sampled sums
	// only: large radii stop early, see the package comment); nil for exact sums.
	References []int `json:"references,omitempty"`
	// Reason says why a curve has no D2 when it is not fitted for a reason other than the
	// lack of a scaling range (a slope above the embedding dimension).
	Reason string `json:"reason,omitempty"`
}

// Result is the outcome of CorrelationDimension.
type Result struct {
	Radii  []float64
	Curves []Curve
	// D2 is the correlation dimension, with its interval [Lo, Hi] and the radii [RLo, RHi]
	// of the scaling range it was read from (at dimension Dim).
	D2, Lo, Hi float64
	RLo, RHi   float64
	Dim        int
	// Saturated is true when D2 stops growing with m (see the package comment).
	Saturated bool
	// Takens is the Takens (1985) maximum-likelihood estimate at dimension Dim.
	Takens float64
	// Lag, Theiler, MaxDim and Norm are the parameters used ("max" or "euclidean").
	Lag, Theiler, MaxDim int
	Norm                 string
	// Points is the number of delay vectors at the largest dimension.
	Points int
	// ReferencePoints is the number of reference points the correlation sums were counted
	// from: Points when every point was a reference (exact), fewer when sampled.
	ReferencePoints int `json:"reference_points"`
	// Sampling says in words how the pairs were counted (sampled reference points or all
	// pairs), for the page and the JSON.
	Sampling string `json:"sampling"`
	Cautions []string
}

// ErrNoScaling reports that no dimension had a scaling range.
var ErrNoScaling = errors.New("no scaling range in any correlation sum")

// minPairs is the fewest pairs a radius needs to enter the fit (common practice: below a few
// dozen pairs the counting noise dominates the slope).
const minPairs = 50

// CorrelationDimension computes the correlation sums of x for m = 1…MaxDim and the correlation
// dimension read from them (see the package comment for the rules).
func CorrelationDimension(x []float64, opt Options) (*Result, error) {
	if opt.Lag < 1 {
		return nil, fmt.Errorf("correlation dimension: lag %d: want ≥ 1", opt.Lag)
	}
	if opt.MaxDim <= 0 {
		opt.MaxDim = 8
	}
	if opt.NumRadii <= 0 {
		opt.NumRadii = 40
	}
	if opt.Theiler < 0 {
		opt.Theiler = 0
	}
	n := len(x)
	lo, hi := math.Inf(1), math.Inf(-1)
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("correlation dimension: sample %d is %v", i, v)
		}
		lo, hi = math.Min(lo, v), math.Max(hi, v)
	}
	for opt.MaxDim > 1 && n-(opt.MaxDim-1)*opt.Lag < 2*opt.Theiler+100 {
		opt.MaxDim--
	}
	if n-(opt.MaxDim-1)*opt.Lag < 2*opt.Theiler+100 {
		return nil, fmt.Errorf("correlation dimension: %d samples are too few for lag %d and Theiler window %d", n, opt.Lag, opt.Theiler)
	}
	if !(hi > lo) {
		return nil, errors.New("correlation dimension: the record is constant")
	}
	norm, normName := neighbors.Max, "max"
	if opt.Euclidean {
		norm, normName = neighbors.Euclidean, "euclidean"
	}
	radii := slices.Clone(opt.Radii)
	if radii == nil {
		top := hi - lo
		if opt.Euclidean {
			top *= math.Sqrt(float64(opt.MaxDim))
		}
		radii = make([]float64, opt.NumRadii)
		for k := range radii {
			radii[k] = top * math.Pow(10, -3.5+3.5*float64(k)/float64(opt.NumRadii-1))
		}
	} else {
		slices.Sort(radii)
		if len(radii) < 5 || radii[0] <= 0 {
			return nil, fmt.Errorf("correlation dimension: need at least 5 positive radii, got %d", len(radii))
		}
	}
	rng := rand.New(rand.NewPCG(opt.Seed, 0x64696d656e73696f))
	npMax := n - (opt.MaxDim-1)*opt.Lag
	if opt.Radii == nil {
		radii = truncateRadii(x, opt.Lag, opt.MaxDim, opt.Theiler, opt.Euclidean, radii, opt.Seed)
	}
	var refs []int
	nrefs := npMax
	if !opt.Exact {
		r := opt.ReferencePoints
		if r <= 0 {
			r = DefaultReferencePoints
		}
		if r < npMax {
			refs = sampleReferences(npMax, r, opt.Seed)
			nrefs = r
		}
	}
	res := &Result{Radii: radii, Lag: opt.Lag, Theiler: opt.Theiler, MaxDim: opt.MaxDim, Norm: normName,
		ReferencePoints: nrefs}
	if refs != nil {
		res.Sampling = fmt.Sprintf("sampled: %d reference points (one drawn at random from each of %d equal stretches of the record, seed %d) against all %d partners outside the Theiler window", nrefs, nrefs, opt.Seed, npMax)
	} else {
		res.Sampling = "exact: all pairs outside the Theiler window"
	}
	logr := make([]float64, len(radii))
	for k, r := range radii {
		logr[k] = math.Log(r)
	}
	for m := 1; m <= opt.MaxDim; m++ {
		ix, err := embedIndex(x, opt, m, norm)
		if err != nil {
			return nil, fmt.Errorf("correlation dimension: m = %d: %w", m, err)
		}
		np := ix.Len()
		res.Points = np
		cv := Curve{Dim: m, C: make([]float64, len(radii))}
		if refs == nil {
			cv.Pairs = ix.PairCounts(radii, opt.Theiler, opt.Threads, opt.Progress)
			w := int64(np - opt.Theiler - 1)
			total := float64(w) * float64(w+1) / 2
			for k, c := range cv.Pairs {
				cv.C[k] = float64(c) / total
			}
		} else {
			cv.Pairs, cv.References = sampledCounts(ix, refs, radii, opt, cv.C)
		}
		logc := make([]float64, len(radii))
		for k := range cv.C {
			logc[k] = math.Log(cv.C[k]) // −Inf for zero counts
		}
		cv.Slopes = localSlopes(logr, logc)
		fitCurve(&cv, logr, logc, cv.Pairs, rng)
		if cv.Fitted && cv.D2 > float64(m) {
			// A correlation dimension cannot exceed the dimension of the space the points
			// lie in; such a slope is counting noise or too few pairs, not a dimension.
			cv.Reason = fmt.Sprintf("the fitted slope %.3g exceeds the embedding dimension %d: no dimension can be read from it", cv.D2, m)
			cv.Fitted, cv.D2, cv.Lo, cv.Hi, cv.Takens = false, 0, 0, 0, 0
		}
		if cv.Fitted {
			cv.Hi = math.Min(cv.Hi, float64(m)) // the interval does not reach above m either
			// A correlation sum never decreases with r, so its slope is never negative: a
			// negative fit is round-off on a flat curve (an exactly periodic record, whose
			// pairs sit at distance 0), and D2 = 0 there.
			cv.D2, cv.Lo, cv.Hi = math.Max(cv.D2, 0), math.Max(cv.Lo, 0), math.Max(cv.Hi, 0)
		}
		res.Curves = append(res.Curves, cv)
	}
	if err := res.decide(n); err != nil {
		return res, err
	}
	return res, nil
}

// embedIndex returns the index of the delay vectors of x at dimension m: opt.Index's when it is
// set (checked against the shape and norm wanted), else a new one.
func embedIndex(x []float64, opt Options, m int, norm neighbors.Norm) (*neighbors.Index, error) {
	if opt.Index == nil {
		return neighbors.FromEmbedding(x, opt.Lag, m, norm)
	}
	ix, err := opt.Index(m)
	if err != nil {
		return nil, err
	}
	if ix == nil || ix.Dim() != m || ix.Norm() != norm || ix.Len() != len(x)-(m-1)*opt.Lag {
		return nil, fmt.Errorf("%w: the index given is not of the %d-dimensional delay vectors with lag %d (%s norm)", neighbors.ErrInput, m, opt.Lag, norm)
	}
	return ix, nil
}

// sampleReferences returns r reference points among n delay vectors: the record is cut into r
// equal stretches and one point is drawn uniformly from each (stratified sampling: every part
// of the record is represented), then the points are put in a random order, so that every
// prefix of the list is spread over the whole record; both with a generator seeded from seed.
func sampleReferences(n, r int, seed uint64) []int {
	rng := rand.New(rand.NewPCG(seed, 0x7265666572656e63)) // second word: a fixed stream id
	refs := make([]int, r)
	for s := range refs {
		lo, hi := s*n/r, (s+1)*n/r
		refs[s] = lo + rng.IntN(max(hi-lo, 1))
	}
	rng.Shuffle(len(refs), func(i, j int) { refs[i], refs[j] = refs[j], refs[i] })
	return refs
}

// Early stop of the sampled sums: a radius whose pairs from the references counted so far
// reach those a radius with C = earlyStopC would collect from all R references, or
// earlyStopPairs, whichever is fewer, stops, but not before R/earlyStopFloor references
// (common practice: the relative error of a correlation sum falls with the number of pairs,
// and a few million pairs put the counting error near 0.1 %; the floor keeps a few hundred
// references behind every radius so that the spread of local densities is still averaged).
const (
	earlyStopC     = 0.005
	earlyStopPairs = 2_000_000
	earlyStopFloor = 16
)

// sampledCounts counts the pairs of the sampled references refs (in their random order)
// against all partners at every radius, the large radii stopping early (see earlyStopC), and
// writes C[k] = pairs / partners over the references radius k was counted from.
func sampledCounts(ix *neighbors.Index, refs []int, radii []float64, opt Options, c []float64) ([]int64, []int) {
	np, w := ix.Len(), opt.Theiler
	r := len(refs)
	enough := min(int64(earlyStopC*float64(r)*float64(np)), earlyStopPairs)
	floor := max(r/earlyStopFloor, 1)
	stop := func(k, used int, count int64) bool { return used >= floor && count >= enough }
	counts, used := ix.ReferencePairCountsUntil(refs, radii, w, max(r/64, 16), stop, opt.Threads, opt.Progress)
	// partners[u] = partners of the first u references.
	partners := make([]float64, r+1)
	for u, i := range refs {
		partners[u+1] = partners[u] + float64(np-1-min(i, w)-min(np-1-i, w))
	}
	for k := range c {
		c[k] = float64(counts[k]) / partners[used[k]]
	}
	return counts, used
}

// pilotPairs is the number of random pairs whose median distance sets the largest radius
// counted (the median of 4096 draws lies within about ±2 % in probability of the true one).
const pilotPairs = 4096

// truncateRadii drops the automatic radii above the one where C(r) has surely passed ½ at the
// largest dimension: the first radius at least 1.5 times the median distance of pilotPairs
// random pairs outside the Theiler window (at least 8 radii are kept). C(r) decreases with m at
// every r, so at every smaller m C has passed ½ there too, and radii where C > ½ never enter
// the scaling range (fitCurve).
func truncateRadii(x []float64, lag, m, theiler int, euclid bool, radii []float64, seed uint64) []float64 {
	np := len(x) - (m-1)*lag
	rng := rand.New(rand.NewPCG(seed, 0x70696c6f74)) // second word: a fixed stream id
	d := make([]float64, 0, pilotPairs)
	for len(d) < pilotPairs {
		i, j := rng.IntN(np), rng.IntN(np)
		if j-i <= theiler && i-j <= theiler {
			continue
		}
		var s float64
		for c := range m {
			t := x[i+c*lag] - x[j+c*lag]
			if euclid {
				s += t * t
			} else {
				s = math.Max(s, math.Abs(t))
			}
		}
		if euclid {
			s = math.Sqrt(s)
		}
		d = append(d, s)
	}
	slices.Sort(d)
	stop := 1.5 * d[len(d)/2]
	k := 0
	for k < len(radii)-1 && radii[k] < stop {
		k++
	}
	return radii[:max(k+1, min(8, len(radii)))]
}

// localSlopes returns the three-point least-squares slope at every radius (NaN at the ends and
// where a count is zero).
func localSlopes(x, y []float64) []float64 {
	s := make([]float64, len(x))
	for k := range s {
		s[k] = math.NaN()
		if k == 0 || k == len(x)-1 {
			continue
		}
		if math.IsInf(y[k-1], 0) || math.IsInf(y[k+1], 0) || math.IsInf(y[k], 0) {
			continue
		}
		s[k] = (y[k+1] - y[k-1]) / (x[k+1] - x[k-1])
	}
	return s
}

// fitCurve finds the scaling range of one correlation sum and fills D2, its interval and the
// Takens estimate.
func fitCurve(cv *Curve, logr, logc []float64, counts []int64, rng *rand.Rand) {
	from := 0
	for from < len(counts) && counts[from] < minPairs {
		from++
	}
	// Exclude the saturated top (C within 1 % of 1: the attractor's size, not its scaling).
	to := len(counts)
	for to > from && cv.C[to-1] > 0.5 {
		to--
	}
	if to-from < 5 {
		return
	}
	var rg fit.Range
	var err error
	for _, tol := range []float64{0.1, 0.2} {
		rg, err = fit.ScalingRange(logr, logc, fit.RangeOptions{RelTol: tol, From: from, To: to})
		if err == nil {
			break
		}
	}
	if err != nil {
		return
	}
	cv.Fitted = true
	cv.From, cv.To = rg.From, rg.To
	cv.D2 = rg.Line.Slope
	xs := logr[rg.From : rg.To+1]
	ys := logc[rg.From : rg.To+1]
	bx := make([]float64, len(xs))
	by := make([]float64, len(xs))
	iv, err := fit.Bootstrap(rng, len(xs), 200, 0.95, func(idx []int) float64 {
		for i, j := range idx {
			bx[i], by[i] = xs[j], ys[j]
		}
		l, err := fit.LeastSquares(bx, by)
		if err != nil {
			return math.NaN()
		}
		return l.Slope
	})
	if err == nil {
		cv.Lo, cv.Hi = iv.Lo, iv.Hi
	} else {
		cv.Lo, cv.Hi = cv.D2-2*rg.Line.SlopeSE, cv.D2+2*rg.Line.SlopeSE
	}
	cv.Takens = takens(logr, cv.C, rg.To)
}

// takens returns the Takens (1985) maximum-likelihood dimension at radius index top:
// D = C(r0)/∫_0^{r0} C(r) d ln r, with the integral by the trapezoid rule in ln r over the
// computed radii and, below the smallest radius with pairs, the power-law tail C(r1)/D, which
// gives D = (C(r0) − C(r1)) / ∫_{r1}^{r0} C d ln r.
func takens(logr, c []float64, top int) float64 {
	first := 0
	for first < top && c[first] == 0 {
		first++
	}
	var integral float64
	for k := first; k < top; k++ {
		integral += 0.5 * (c[k] + c[k+1]) * (logr[k+1] - logr[k])
	}
	if integral <= 0 {
		return math.NaN()
	}
	return (c[top] - c[first]) / integral
}

// decide reads D2 from the fitted curves and sets saturation and cautions.
func (r *Result) decide(n int) error {
	var fitted []Curve
	for _, c := range r.Curves {
		if c.Fitted {
			fitted = append(fitted, c)
		}
	}
	if len(fitted) == 0 {
		r.Cautions = append(r.Cautions, "no correlation sum has a scaling range: the record may be noise, too short, or the radii miss the scaling region")
		return fmt.Errorf("correlation dimension: %w", ErrNoScaling)
	}
	last := fitted[len(fitted)-1]
	r.Dim, r.D2, r.Lo, r.Hi, r.Takens = last.Dim, last.D2, last.Lo, last.Hi, last.Takens
	r.RLo, r.RHi = r.Radii[last.From], r.Radii[last.To]
	if len(fitted) >= 3 {
		tail := fitted[len(fitted)-3:]
		d := []float64{tail[0].D2, tail[1].D2, tail[2].D2}
		lo, hi := slices.Min(d), slices.Max(d)
		med := d[0] + d[1] + d[2] - lo - hi
		if hi-lo <= math.Max(0.1, 0.05*med) && hi <= float64(tail[2].Dim)-1 {
			r.Saturated = true
			r.D2 = med
			mid := tail[1]
			for _, c := range tail {
				if c.D2 == med {
					mid = c
				}
			}
			r.Dim, r.Takens = mid.Dim, mid.Takens
			r.RLo, r.RHi = r.Radii[mid.From], r.Radii[mid.To]
			r.Lo = math.Min(slices.Min([]float64{tail[0].Lo, tail[1].Lo, tail[2].Lo}), lo)
			r.Hi = math.Max(slices.Max([]float64{tail[0].Hi, tail[1].Hi, tail[2].Hi}), hi)
		}
	}
	// A correlation sum in m dimensions cannot scale faster than r^m: a slope above m is no
	// dimension (a trend, non-stationarity or too few pairs at small radii). It is never
	// reported; D2 and its interval are capped at m, a lower bound, with a caution.
	if m := float64(r.Dim); r.D2 > m {
		r.Cautions = append(r.Cautions, fmt.Sprintf("the fitted slope exceeds the embedding dimension %d, which no correlation sum can do: no real scaling range (a trend, non-stationarity or too few points); D2 is reported as %d, a lower bound", r.Dim, r.Dim))
		r.D2, r.Lo, r.Hi = m, math.Min(r.Lo, m), math.Min(r.Hi, m)
	}
	// Nor can it be negative (a correlation sum never decreases with r).
	r.D2, r.Lo, r.Hi = math.Max(r.D2, 0), math.Max(r.Lo, 0), math.Max(r.Hi, 0)
	if !r.Saturated {
		r.Cautions = append(r.Cautions, fmt.Sprintf("D2 does not saturate up to dimension %d: the estimate %.2g is a lower bound of a high-dimensional or stochastic signal", last.Dim, r.D2))
	}
	if lim := 2 * math.Log10(float64(n)); r.D2 > lim {
		r.Cautions = append(r.Cautions, fmt.Sprintf("D2 = %.2f exceeds 2·log10(N) = %.2f, the largest dimension %d points can show (Eckmann & Ruelle 1992)", r.D2, lim, n))
	}
	return nil
}
