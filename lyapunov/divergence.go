package lyapunov

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
	"runtime"
	"slices"
	"sync"
	"sync/atomic"

	"unfold/fit"
	"unfold/neighbors"

	"unfold/internal/workers"
)

// Method selects the divergence curve.
type Method int

const (
	// Kantz is the curve of Kantz (1994): for every reference point, the logarithm of the mean
	// distance, Δn steps later, to all its neighbours within ε (outside the Theiler window),
	// averaged over the reference points; one curve per ε. It is the zero value (the default).
	Kantz Method = iota
	// Rosenstein is the curve of Rosenstein, Collins & De Luca (1993): for every reference
	// point, the logarithm of the distance, Δn steps later, to its nearest neighbour outside the
	// Theiler window, averaged over the reference points.
	Rosenstein
)

// String returns "kantz" or "rosenstein".
func (m Method) String() string {
	switch m {
	case Kantz:
		return "kantz"
	case Rosenstein:
		return "rosenstein"
	}
	return fmt.Sprintf("Method(%d)", int(m))
}

// ParseMethod returns the Method named s ("kantz" or "rosenstein").
func ParseMethod(s string) (Method, error) {
	switch s {
	case "kantz":
		return Kantz, nil
	case "rosenstein":
		return Rosenstein, nil
	}
	return 0, fmt.Errorf("lyapunov: unknown method %q (want kantz or rosenstein)", s)
}

// Options set the embedding, the curve and the fit of Divergence. Lag and Dim are required;
// every other zero value selects the default stated beside the field.
type Options struct {
	Lag, Dim int // delay (samples, ≥ 1) and embedding dimension (≥ 1)
	// Theiler excludes temporal neighbours |i−j| ≤ Theiler (samples); 0 excludes only the point
	// itself. Flows need at least their autocorrelation time (embed.DefaultTheiler).
	Theiler int
	Method  Method
	// Norm is the distance between delay vectors (neighbors.Euclidean is the zero value).
	Norm neighbors.Norm
	// Horizon is the number of steps each pair is followed (default DefaultHorizonFor: at most
	// a quarter of the delay vectors, so that a short record keeps reference points).
	Horizon int
	// Eps are the Kantz neighbourhood radii in signal units (sorted ascending; default
	// DefaultEps). Ignored by Rosenstein.
	Eps []float64
	// MaxNeighbors caps the Kantz neighbourhood: at most this many nearest neighbours within ε
	// are averaged (default 32), which bounds the work per reference point.
	MaxNeighbors int
	// Dt is the sampling interval in time units (default 1).
	Dt float64
	// Blocks is the number of contiguous blocks of reference points whose sums are kept for the
	// bootstrap (default 100; at most one block per 4 reference points).
	Blocks int
	// Reps is the number of bootstrap resamples (default 500); Level the interval's coverage
	// (default 0.95); Seed seeds the resampling.
	Reps  int
	Level float64
	Seed  uint64
	// FitFrom and FitTo override the automatic fit range (steps, both included) when FitTo > 0.
	FitFrom, FitTo int
	// Range tunes the automatic range (package fit); zero fields take the defaults of
	// DefaultRangeOptions.
	Range fit.RangeOptions
	// Threads is the number of goroutines (0 = all cores); Progress, when not nil, is called
	// with (reference points done, total).
	Threads  int
	Progress func(done, total int)
	// ReferencePoints is the number of reference points whose neighbourhoods are followed (0
	// means DefaultReferencePoints; a negative value means every admissible point). When
	// fewer than the admissible points, one is drawn at random with Seed from each of
	// ReferencePoints equal stretches of the record; their neighbours are sought among all
	// admissible points. Result.ReferencePoints states the number used.
	ReferencePoints int
	// Index, when not nil, is a prebuilt neighbour index of the delay vectors of x with Lag,
	// Dim and Norm (neighbors.FromEmbedding), for example one shared with another estimator on
	// the same record; the result is the same as with the index Divergence would build. An
	// index of another shape or norm is an error.
	Index *neighbors.Index
}

// DefaultReferencePoints is the default number of reference points: 4000 averaged
// logarithms per step give the mean divergence curve to a standard error of about 1.6 % of the
// spread of ln-distances, far below the curve's rise over a fit range (common practice: the
// block bootstrap over reference points states the remaining uncertainty), and bound the cost
// of the curves independently of N.
const DefaultReferencePoints = 4000

// DefaultHorizonFor returns the default horizon for a record of n samples: DefaultHorizon,
// but at most a quarter of the n − (dim−1)·lag delay vectors (and at least 2), so that three
// quarters of the vectors remain reference points on short records.
func DefaultHorizonFor(n, lag, dim int) int {
	nv := n - (dim-1)*lag
	return max(min(DefaultHorizon(lag, dim), nv/4), 2)
}

// DefaultHorizon returns the default number of steps followed: 10·lag·(dim−1) clamped to
// [30, 500] (common practice: several embedding windows, enough for a map's curve to saturate
// and for a flow's to show a few Lyapunov times at usual sampling).
func DefaultHorizon(lag, dim int) int {
	return min(max(10*lag*max(dim-1, 1), 30), 500)
}

// DefaultRangeOptions returns the automatic-range criterion for a divergence curve of
// horizon+1 points whose total rise is rise (nats): local slopes over windows of
// max(3, horizon/25) steps, within 20 % of their median plus 5 % of the curve's mean slope
// rise/horizon, over at least max(window+2, 5) points; a range that raises the separation by
// less than a factor e (1 nat) counts as a plateau (fit.RangeOptions.FlatRise), because a
// bounded, oscillating separation (periodic or quasiperiodic motion) can look straight over a
// few steps, but exponential divergence is read over at least one e-folding (common practice).
func DefaultRangeOptions(horizon int, rise float64) fit.RangeOptions {
	w := max(3, horizon/25)
	return fit.RangeOptions{Window: w, RelTol: 0.2, AbsTol: 0.05 * math.Abs(rise) / float64(horizon),
		MinPoints: max(w+2, 5), FlatRise: 1}
}

// Curve is one divergence curve: S(k), k = 0 … Horizon.
type Curve struct {
	Eps     float64   // Kantz radius (signal units); 0 for Rosenstein
	MeanLog []float64 // S(k) in nats; NaN where no pair contributed
	Pairs   []int64   // reference points contributing at step k
	// References is the number of reference points with at least one neighbour.
	References int
	// Repeating is the number of those whose neighbours stay at distance 0 at every step of
	// the horizon: the record repeats itself exactly there (an exactly periodic orbit).
	Repeating int
	// Fit is the linear range and line; FitErr says why there is none (wraps fit.ErrNoRange).
	Fit    fit.Range
	FitErr error
}

// Result is the largest Lyapunov exponent read from a divergence curve.
type Result struct {
	Method                     Method
	Lag, Dim, Theiler, Horizon int
	Dt                         float64
	Norm                       neighbors.Norm
	Vectors, ReferencePoints   int // delay vectors; reference points queried
	Blocks, Reps, MaxNeighbors int
	Level                      float64
	Seed                       uint64
	Curves                     []Curve // one (Rosenstein) or one per ε (Kantz)
	Chosen                     int     // index of the curve the answer is read from
	From, To                   int     // fit range (steps, both included)
	AutoRange                  bool    // the range was found automatically
	LambdaPerSample, Lambda    float64 // slope in nats per step and per time unit
	// IntervalPerSample and Interval cover the bootstrap interval and the slopes of every ε.
	IntervalPerSample, Interval [2]float64
	Bootstrap                   fit.Interval
	EpsSlopes                   []float64 // Kantz: the slope of every curve (NaN when it has no range)
	Cautions                    []string
	RangeOptions                fit.RangeOptions // the criterion used for the chosen curve
	FirstStepRise, TotalRise    float64          // S(1)−S(0) and max S − S(0) of the chosen curve
	// Repeats is true when the answer is the bound λ1 ≤ 0 of an exactly repeating record: no
	// curve has a range and the neighbours of at least half the reference points of the chosen
	// curve stay at distance 0 over the whole horizon (see Divergence). Lambda is then 0, the
	// upper bound, with the interval [0, 0]; Resolution is the distance that stands for 0 in
	// the drawn curve.
	Repeats    bool
	Resolution float64
}

// Divergence computes the divergence curves of x, finds the linear range of each, and reads
// the largest Lyapunov exponent from it with a bootstrap interval.
//
// Delay vectors v_i = (x_i, x_{i+τ}, …) are indexed with package neighbors. Reference points
// and their neighbours are the vectors i < N_v − Horizon, so every pair can be followed for the
// whole horizon. Rosenstein: the nearest neighbour j of i with |i−j| > Theiler, and
// S(k) = ⟨ln ‖v_{i+k} − v_{j+k}‖⟩_i. Kantz: the neighbours U_i(ε) within ε (at most
// MaxNeighbors nearest), and S_ε(k) = ⟨ln (mean_{j∈U_i} ‖v_{i+k} − v_{j+k}‖)⟩_i. Zero distances
// (repeated values) are left out of the logarithm.
//
// Reference points: at most ReferencePoints (default DefaultReferencePoints) of the admissible
// vectors, sampled one per equal stretch of the record with Seed (all of them when there are
// fewer); their neighbours are sought among all admissible vectors. Kantz's radii share one
// k-nearest-neighbour search per reference point (the MaxNeighbors nearest, counted per ε).
//
// Cost as a function of N (R reference points, H the horizon, K = MaxNeighbors, m the
// dimension): O(N log N · m) to build the index, O(R · log N) for the neighbour searches and
// O(R · H · K · m) to follow the pairs; with the default R bounded, about linear in N.
//
// Memory: the curves are not kept per reference point. The reference points are split into
// Blocks contiguous blocks and the sums of the logarithms and their counts are accumulated per
// block, so memory is O(N·m) for the index plus O(Blocks·Horizon·len(Eps)). Each block is
// summed by one goroutine in index order, so the result is identical for any thread count.
//
// The interval is the range of the slopes of every Kantz curve that has a linear range (the
// dependence on ε), widened to cover a moving-block bootstrap interval over reference points
// (Künsch 1989, "The jackknife and the bootstrap for general stationary observations", Annals
// of Statistics 17, 1217; Result.Bootstrap keeps it alone): the
// blocks are resampled with replacement, the mean curve recomputed, and the slope refitted
// over the same range; the percentiles go through Level. Blocks of neighbouring reference
// points, not single points, are resampled because consecutive reference points share their
// neighbourhoods and are not independent. The range itself is held fixed.
//
// For Kantz the answer is the curve whose slope is the median of the slopes of the curves that
// have a linear range (the lower middle one for an even count); the spread of the slopes over
// ε is a caution.
//
// An exactly repeating record (an orbit settled on a stable periodic cycle to the last bit) has
// neighbours at distance 0 that stay at distance 0: their logarithm does not exist and no
// curve can be fitted. When no curve has a range and the neighbours of at least half the
// reference points of a curve never separate, the separation evidently does not grow, and the
// answer is the bound λ1 ≤ 0 (Result.Repeats): Lambda = 0 with the interval [0, 0], and the
// curve drawn flat at the record's resolution (the floating-point spacing at its largest
// magnitude, standing for distance 0). For a map this is only an upper bound: a stable
// periodic orbit has λ1 < 0 (its multiplier is below 1 in magnitude), which a record that
// lies exactly on the orbit cannot measure; for a flow sampled commensurately with its cycle,
// λ1 = 0.
//
// When no curve has a linear range otherwise, Divergence returns the result with its curves
// (so that they can still be written and drawn) and an error wrapping fit.ErrNoRange that says
// why.
func Divergence(x []float64, opt Options) (*Result, error) {
	o, err := opt.check(len(x))
	if err != nil {
		return nil, err
	}
	ix := o.Index
	if ix == nil {
		if ix, err = neighbors.FromEmbedding(x, o.Lag, o.Dim, o.Norm); err != nil {
			return nil, fmt.Errorf("lyapunov: %w", err)
		}
	} else if ix.Dim() != o.Dim || ix.Norm() != o.Norm || ix.Len() != len(x)-(o.Dim-1)*o.Lag {
		return nil, fmt.Errorf("lyapunov: %w: the index given is not of the %d-dimensional delay vectors with lag %d (%s norm)", neighbors.ErrInput, o.Dim, o.Lag, o.Norm)
	}
	nv := ix.Len()
	nref := nv - o.Horizon
	if o.Method == Kantz && len(o.Eps) == 0 {
		o.Eps = DefaultEps(ix, nref, o.Theiler, o.MaxNeighbors)
	}
	refs := sampleReferences(nref, o.ReferencePoints, o.Seed)
	r := &Result{Method: o.Method, Lag: o.Lag, Dim: o.Dim, Theiler: o.Theiler, Horizon: o.Horizon,
		Dt: o.Dt, Norm: o.Norm, Vectors: nv, ReferencePoints: len(refs), Blocks: o.Blocks, Reps: o.Reps,
		MaxNeighbors: o.MaxNeighbors, Level: o.Level, Seed: o.Seed}
	if o.Method == Rosenstein {
		r.MaxNeighbors = 1
	}
	acc := o.accumulate(x, ix, nref, refs)
	ne := acc.ne
	r.Curves = make([]Curve, ne)
	for e := range ne {
		c := &r.Curves[e]
		if o.Method == Kantz {
			c.Eps = o.Eps[e]
		}
		c.References = acc.refs[e]
		c.Repeating = acc.repeating[e]
		c.MeanLog, c.Pairs = acc.mean(e, nil)
		c.Fit, c.FitErr = o.fitCurve(c.MeanLog)
	}
	// Choose the curve.
	var ok []int
	for e := range r.Curves {
		if r.Curves[e].FitErr == nil {
			ok = append(ok, e)
		}
	}
	if o.Method == Kantz {
		r.EpsSlopes = make([]float64, ne)
		for e := range r.Curves {
			r.EpsSlopes[e] = math.NaN()
			if r.Curves[e].FitErr == nil {
				r.EpsSlopes[e] = r.Curves[e].Fit.Line.Slope
			}
		}
	}
	if len(ok) == 0 && r.repeats(x, o) {
		r.cautions(o)
		return r, nil
	}
	if len(ok) == 0 {
		r.Chosen = 0
		for e := range r.Curves { // the curve with the most reference points, for drawing
			if r.Curves[e].References > r.Curves[r.Chosen].References {
				r.Chosen = e
			}
		}
		r.cautions(o)
		return r, fmt.Errorf("lyapunov: %w", r.Curves[r.Chosen].FitErr)
	}
	slices.SortStableFunc(ok, func(a, b int) int {
		return cmpFloat(r.Curves[a].Fit.Line.Slope, r.Curves[b].Fit.Line.Slope)
	})
	r.Chosen = ok[(len(ok)-1)/2]
	ch := &r.Curves[r.Chosen]
	r.From, r.To, r.AutoRange = ch.Fit.From, ch.Fit.To, o.FitTo == 0
	r.RangeOptions = o.rangeOptions(ch.MeanLog)
	r.LambdaPerSample = ch.Fit.Line.Slope
	r.Lambda = r.LambdaPerSample / o.Dt

	// Block bootstrap of the slope over the fixed range.
	rng := rand.New(rand.NewPCG(o.Seed, 0x6c79617075)) // second word: a fixed stream id
	steps := make([]float64, r.To-r.From+1)
	for k := range steps {
		steps[k] = float64(r.From + k)
	}
	ys := make([]float64, len(steps))
	sum := make([]float64, len(steps))
	cnt := make([]float64, len(steps))
	nb := acc.blocks
	iv, err := fit.Bootstrap(rng, nb, o.Reps, o.Level, func(idx []int) float64 {
		clear(sum)
		clear(cnt)
		for _, b := range idx {
			s, c := acc.block(r.Chosen, b)
			for k := range ys {
				sum[k] += s[r.From+k]
				cnt[k] += float64(c[r.From+k])
			}
		}
		for k := range ys {
			if cnt[k] == 0 {
				return math.NaN()
			}
			ys[k] = sum[k] / cnt[k]
		}
		l, err := fit.LeastSquares(steps, ys)
		if err != nil {
			return math.NaN()
		}
		return l.Slope
	})
	if err != nil {
		return nil, fmt.Errorf("lyapunov: interval: %w", err)
	}
	r.Bootstrap = iv
	// The bootstrap holds the radius fixed, so it states only the sampling of reference
	// points; the choice of ε moves the slope more (Kantz's curves are parallel only
	// approximately), and on the logistic map at r = 4 (λ = ln 2, exact) the bootstrap
	// interval alone held ln 2 in 11 of 30 records of 4000 samples. The interval is widened
	// to cover the slope of every ε that has a range, which held it in 30 of 30.
	lo, hi := iv.Lo, iv.Hi
	for _, sl := range r.EpsSlopes {
		if !math.IsNaN(sl) {
			lo, hi = math.Min(lo, sl), math.Max(hi, sl)
		}
	}
	// A curve read over the whole horizon because it stays bounded (it never rises by a
	// factor e) is no evidence of a positive exponent: bounded motion on a torus or a limit
	// cycle has λ1 = 0 and its separation may still creep up a little. Such an interval is
	// extended down to 0. A falling bounded curve (neighbours converging onto a stable orbit)
	// keeps its interval: convergence is evidence of λ1 < 0.
	if ch.Fit.Plateau && r.AutoRange && r.From == 1 && r.To == o.Horizon && lo > 0 {
		lo = 0
	}
	r.IntervalPerSample = [2]float64{lo, hi}
	r.Interval = [2]float64{lo / o.Dt, hi / o.Dt}
	r.cautions(o)
	return r, nil
}

// repeats gives the answer of an exactly repeating record when some curve qualifies (at least
// half of its reference points with a neighbour have neighbours that never separate): the
// bound λ1 ≤ 0, with the curve that has the most repeating reference points drawn flat at the
// record's resolution where no pair had a positive distance. It reports whether it did.
func (r *Result) repeats(x []float64, o Options) bool {
	best := -1
	for e, c := range r.Curves {
		if c.References > 0 && 2*c.Repeating >= c.References && (best < 0 || c.Repeating > r.Curves[best].Repeating) {
			best = e
		}
	}
	if best < 0 {
		return false
	}
	scale := 0.0
	for _, v := range x {
		scale = math.Max(scale, math.Abs(v))
	}
	res := math.Nextafter(scale, math.Inf(1)) - scale
	if !(res > 0) || math.IsInf(res, 0) {
		return false
	}
	r.Repeats, r.Resolution, r.Chosen = true, res, best
	ch := &r.Curves[best]
	for k, v := range ch.MeanLog {
		if math.IsNaN(v) {
			ch.MeanLog[k] = math.Log(res)
			ch.Pairs[k] = int64(ch.Repeating)
		}
	}
	ch.FitErr = nil
	ch.Fit = fit.Range{From: 1, To: o.Horizon, Plateau: true}
	ch.Fit.Line.Intercept = math.Log(res)
	r.From, r.To, r.AutoRange = 1, o.Horizon, o.FitTo == 0
	if o.FitTo > 0 {
		r.From, r.To = o.FitFrom, o.FitTo
		ch.Fit.From, ch.Fit.To = o.FitFrom, o.FitTo
	}
	r.RangeOptions = o.rangeOptions(ch.MeanLog)
	r.LambdaPerSample, r.Lambda = 0, 0
	r.IntervalPerSample, r.Interval = [2]float64{0, 0}, [2]float64{0, 0}
	r.Bootstrap = fit.Interval{Level: o.Level}
	if r.Method == Kantz {
		r.EpsSlopes[best] = 0
	}
	return true
}

func cmpFloat(a, b float64) int {
	switch {
	case a < b:
		return -1
	case a > b:
		return 1
	}
	return 0
}

// check validates the options against a record of n samples and fills in the defaults.
func (o Options) check(n int) (Options, error) {
	if o.Lag < 1 || o.Dim < 1 {
		return o, fmt.Errorf("lyapunov: lag %d and dimension %d must be at least 1", o.Lag, o.Dim)
	}
	if o.Theiler < 0 {
		return o, fmt.Errorf("lyapunov: Theiler window %d must not be negative", o.Theiler)
	}
	if o.Method != Kantz && o.Method != Rosenstein {
		return o, fmt.Errorf("lyapunov: unknown method %d", int(o.Method))
	}
	if o.Horizon == 0 {
		o.Horizon = DefaultHorizonFor(n, o.Lag, o.Dim)
	}
	if o.Horizon < 2 {
		return o, fmt.Errorf("lyapunov: horizon %d must be at least 2 steps", o.Horizon)
	}
	if o.Dt == 0 {
		o.Dt = 1
	}
	if !(o.Dt > 0) || math.IsInf(o.Dt, 0) {
		return o, fmt.Errorf("lyapunov: sampling interval %g must be positive", o.Dt)
	}
	if o.MaxNeighbors == 0 {
		o.MaxNeighbors = 32
	}
	if o.MaxNeighbors < 1 {
		return o, fmt.Errorf("lyapunov: at most %d neighbours: must be at least 1", o.MaxNeighbors)
	}
	if o.Blocks == 0 {
		o.Blocks = 100
	}
	if o.Reps == 0 {
		o.Reps = 500
	}
	if o.Level == 0 {
		o.Level = 0.95
	}
	if o.Blocks < 2 || o.Reps < 2 || !(o.Level > 0 && o.Level < 1) {
		return o, fmt.Errorf("lyapunov: bootstrap needs at least 2 blocks and 2 resamples and a level in (0, 1), got %d, %d, %g", o.Blocks, o.Reps, o.Level)
	}
	for i, e := range o.Eps {
		if !(e > 0) || math.IsInf(e, 0) {
			return o, fmt.Errorf("lyapunov: radius ε = %g must be positive", e)
		}
		if i > 0 && e <= o.Eps[i-1] {
			return o, fmt.Errorf("lyapunov: radii ε must be strictly ascending (%g after %g)", e, o.Eps[i-1])
		}
	}
	nv := n - (o.Dim-1)*o.Lag
	nref := nv - o.Horizon
	if need := 2*o.Theiler + 2 + 8; nref < need || nref < 8 {
		return o, fmt.Errorf("lyapunov: %d samples give %d reference points with lag %d, dimension %d and horizon %d; need at least %d (Theiler window %d): record too short",
			n, max(nref, 0), o.Lag, o.Dim, o.Horizon, max(need, 8), o.Theiler)
	}
	if o.FitTo > 0 && (o.FitFrom < 0 || o.FitFrom >= o.FitTo || o.FitTo > o.Horizon) {
		return o, fmt.Errorf("lyapunov: fit range %d…%d must satisfy 0 ≤ from < to ≤ horizon %d", o.FitFrom, o.FitTo, o.Horizon)
	}
	if o.ReferencePoints == 0 {
		o.ReferencePoints = DefaultReferencePoints
	}
	if o.ReferencePoints < 0 || o.ReferencePoints > nref {
		o.ReferencePoints = nref
	}
	if o.ReferencePoints < 8 {
		return o, fmt.Errorf("lyapunov: %d reference points: want at least 8", o.ReferencePoints)
	}
	o.Blocks = max(min(o.Blocks, o.ReferencePoints/4), 2)
	return o, nil
}

// rangeOptions returns the fit criterion for curve y: DefaultRangeOptions overridden by the
// non-zero fields of o.Range.
func (o Options) rangeOptions(y []float64) fit.RangeOptions {
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, v := range y {
		if !math.IsNaN(v) {
			lo, hi = math.Min(lo, v), math.Max(hi, v)
		}
	}
	rise := 0.0
	if hi > lo {
		rise = hi - lo
	}
	d := DefaultRangeOptions(o.Horizon, rise)
	if o.Range.Window != 0 {
		d.Window = o.Range.Window
		if o.Range.MinPoints == 0 {
			d.MinPoints = max(d.Window+2, 5)
		}
	}
	if o.Range.RelTol != 0 {
		d.RelTol = o.Range.RelTol
	}
	if o.Range.AbsTol != 0 {
		d.AbsTol = o.Range.AbsTol
	}
	if o.Range.MinPoints != 0 {
		d.MinPoints = o.Range.MinPoints
	}
	if o.Range.FlatFraction != 0 {
		d.FlatFraction = o.Range.FlatFraction
	}
	if o.Range.FlatRise != 0 {
		d.FlatRise = o.Range.FlatRise
	}
	d.From, d.To = o.Range.From, o.Range.To
	return d
}

// fitCurve fits the line over the given or the automatic range.
func (o Options) fitCurve(y []float64) (fit.Range, error) {
	steps := make([]float64, len(y))
	for k := range steps {
		steps[k] = float64(k)
	}
	if o.FitTo > 0 {
		for k := o.FitFrom; k <= o.FitTo; k++ {
			if math.IsNaN(y[k]) {
				return fit.Range{}, fmt.Errorf("%w: no pair contributes at step %d of the given fit range", fit.ErrNoRange, k)
			}
		}
		l, err := fit.LeastSquares(steps[o.FitFrom:o.FitTo+1], y[o.FitFrom:o.FitTo+1])
		if err != nil {
			return fit.Range{}, err
		}
		return fit.Range{From: o.FitFrom, To: o.FitTo, Line: l, Median: l.Slope}, nil
	}
	ro := o.rangeOptions(y)
	rg, err := fit.ScalingRange(steps, y, ro)
	if err != nil {
		if errors.Is(err, fit.ErrNoRange) {
			if l, ok := boundedSlope(steps, y, o.Horizon, ro.FlatRise); ok {
				// The local slopes scatter too much for any stable range, but the curve
				// stays bounded: the same mean growth as for a bounded plateau below
				// (a stable periodic orbit whose neighbours sit at the round-off floor
				// and slowly converge gives such a curve).
				return fit.Range{From: 1, To: o.Horizon, Line: l, Median: l.Slope, Plateau: true}, nil
			}
			return fit.Range{}, fmt.Errorf("divergence curve: %w", err)
		}
		return fit.Range{}, err
	}
	if rg.Plateau && o.Horizon >= 3 {
		// No stable range raises the separation by a factor e. Only when the curve itself
		// rises by less than that over the whole horizon is it bounded, and its mean growth
		// rate is read over the whole horizon after the first step; a curve that does rise
		// (noise delays the exponential stretch) keeps the finder's longest stable range.
		top := math.Inf(-1)
		for k := 1; k <= o.Horizon; k++ {
			if math.IsNaN(y[k]) {
				return rg, nil
			}
			top = math.Max(top, y[k])
		}
		if ro.FlatRise > 0 && top-y[1] >= ro.FlatRise {
			// The curve does rise by a factor e but no stretch of it is stable: noise bends
			// the exponential stretch, or it saturates early. Read the mean growth over its
			// rising part, from step 1 to where it first completes 70 % of its rise (judgement:
			// below the bend into the saturation plateau), rather than over the longest stable
			// stretch, which is then the plateau itself (noisy Lorenz gave λ1 ≈ 0 that way).
			target := y[1] + 0.7*(top-y[1])
			end := 1
			for end < o.Horizon && y[end] < target {
				end++
			}
			if end-1 < 4 {
				return rg, nil
			}
			l, err := fit.LeastSquares(steps[1:end+1], y[1:end+1])
			if err != nil {
				return fit.Range{}, err
			}
			return fit.Range{From: 1, To: end, Line: l, Median: l.Slope, Plateau: true}, nil
		}
		l, err := fit.LeastSquares(steps[1:], y[1:])
		if err != nil {
			return fit.Range{}, err
		}
		return fit.Range{From: 1, To: o.Horizon, Line: l, Median: l.Slope, Plateau: true}, nil
	}
	return rg, nil
}

// boundedSlope fits the mean growth over steps 1 … horizon of a curve that is finite there and
// rises by less than flatRise above its value at step 1 (a bounded separation); ok is false
// otherwise.
func boundedSlope(steps, y []float64, horizon int, flatRise float64) (fit.Line, bool) {
	if horizon < 3 || !(flatRise > 0) {
		return fit.Line{}, false
	}
	top := math.Inf(-1)
	for k := 1; k <= horizon; k++ {
		if math.IsNaN(y[k]) {
			return fit.Line{}, false
		}
		top = math.Max(top, y[k])
	}
	if top-y[1] >= flatRise {
		return fit.Line{}, false
	}
	l, err := fit.LeastSquares(steps[1:horizon+1], y[1:horizon+1])
	return l, err == nil
}

// DefaultEps returns the default Kantz radii for an index: four radii spaced geometrically
// from d_1, the median distance from a reference point to its nearest neighbour outside the
// Theiler window, to d_K, the median distance to its K-th nearest (K = maxNeighbors), over up
// to 1000 evenly spaced reference points among the first nref. At d_1 about half the reference
// points have a neighbour; at d_K about half reach the cap, so every radius sees a different
// neighbourhood and the ε dependence can show (common practice: ε small against the attractor
// but holding several neighbours). When d_K < 2·d_1 (distances concentrate, as for
// high-dimensional noise) the radii span d_1 … 2·d_1.
func DefaultEps(ix *neighbors.Index, nref, theiler, maxNeighbors int) []float64 {
	s := ix.NewSearcher()
	step := max(nref/1000, 1)
	var d1, dk []float64
	var buf []neighbors.Neighbor
	for i := 0; i < nref; i += step {
		buf = s.KNN(ix.Coords(i), maxNeighbors, neighbors.Query{Self: i, Theiler: theiler, Hi: nref}, buf)
		if len(buf) > 0 && buf[0].Dist > 0 {
			d1 = append(d1, buf[0].Dist)
			dk = append(dk, buf[len(buf)-1].Dist)
		}
	}
	if len(d1) == 0 {
		return []float64{1, 2, 4, 8}
	}
	slices.Sort(d1)
	slices.Sort(dk)
	lo, hi := fit.Quantile(d1, 0.5), fit.Quantile(dk, 0.5)
	hi = max(hi, 2*lo)
	r := math.Pow(hi/lo, 1.0/3)
	return []float64{lo, lo * r, lo * r * r, hi}
}

// sums holds the per-block sums: for curve e, block b and step k, sum of logarithms and counts.
type sums struct {
	ne, blocks, h1 int
	sum            []float64
	cnt            []int64
	refs           []int // reference points with a neighbour, per curve
	repeating      []int // of those, the ones whose neighbours never separate, per curve
}

func (a *sums) block(e, b int) ([]float64, []int64) {
	off := (e*a.blocks + b) * a.h1
	return a.sum[off : off+a.h1], a.cnt[off : off+a.h1]
}

// mean returns the mean curve of e over the blocks listed (nil: all).
func (a *sums) mean(e int, blocks []int) ([]float64, []int64) {
	s := make([]float64, a.h1)
	c := make([]int64, a.h1)
	add := func(b int) {
		bs, bc := a.block(e, b)
		for k := range s {
			s[k] += bs[k]
			c[k] += bc[k]
		}
	}
	if blocks == nil {
		for b := range a.blocks {
			add(b)
		}
	} else {
		for _, b := range blocks {
			add(b)
		}
	}
	for k := range s {
		if c[k] > 0 {
			s[k] /= float64(c[k])
		} else {
			s[k] = math.NaN()
		}
	}
	return s, c
}

// sampleReferences returns r reference points among the first nref vectors, ascending: all of
// them when r ≥ nref, otherwise one drawn uniformly from each of r equal stretches, with a
// generator seeded from seed (stratified: every part of the record is represented).
func sampleReferences(nref, r int, seed uint64) []int {
	refs := make([]int, min(r, nref))
	if r >= nref {
		for i := range refs {
			refs[i] = i
		}
		return refs
	}
	rng := rand.New(rand.NewPCG(seed, 0x7265666572656e63)) // second word: a fixed stream id
	for s := range refs {
		lo, hi := s*nref/r, (s+1)*nref/r
		refs[s] = lo + rng.IntN(max(hi-lo, 1))
	}
	return refs
}

// accumulate runs the neighbour searches from the reference points refs (ascending; their
// neighbours are sought among the first nref vectors) and fills the per-block sums. Each ε
// reuses the one k-nearest-neighbour search of its reference point.
func (o Options) accumulate(x []float64, ix *neighbors.Index, nref int, refs []int) *sums {
	ne := 1
	if o.Method == Kantz {
		ne = len(o.Eps)
	}
	h1 := o.Horizon + 1
	a := &sums{ne: ne, blocks: o.Blocks, h1: h1,
		sum: make([]float64, ne*o.Blocks*h1), cnt: make([]int64, ne*o.Blocks*h1)}
	withNb := make([]int64, ne*o.Blocks) // reference points with a neighbour, per curve and block
	frozen := make([]int64, ne*o.Blocks) // of those, the ones whose neighbours never separate
	threads := o.Threads
	if threads <= 0 {
		threads = runtimeThreads()
	}
	threads = min(threads, o.Blocks)
	var next atomic.Int64
	var mu sync.Mutex
	done := 0
	var wg sync.WaitGroup
	var g workers.Guard
	for range threads {
		wg.Go(func() {
			g.Run(func() {
				w := newWorker(o, x, ix, nref, ne)
				for {
					b := int(next.Add(1) - 1)
					if b >= o.Blocks {
						return
					}
					lo, hi := b*len(refs)/o.Blocks, (b+1)*len(refs)/o.Blocks
					for e := range ne {
						s, c := a.block(e, b)
						w.sum[e], w.cnt[e] = s, c
					}
					for _, i := range refs[lo:hi] {
						w.reference(i)
					}
					for e := range ne {
						withNb[e*o.Blocks+b] = w.refs[e]
						frozen[e*o.Blocks+b] = w.frozen[e]
						w.refs[e], w.frozen[e] = 0, 0
					}
					if o.Progress != nil {
						mu.Lock()
						done += hi - lo
						o.Progress(done, len(refs))
						mu.Unlock()
					}
				}
			})
		})
	}
	wg.Wait()
	g.Repanic()
	a.refs = make([]int, ne)
	a.repeating = make([]int, ne)
	for e := range ne {
		for b := range o.Blocks {
			a.refs[e] += int(withNb[e*o.Blocks+b])
			a.repeating[e] += int(frozen[e*o.Blocks+b])
		}
	}
	return a
}

// worker holds one goroutine's searcher and scratch space.
type worker struct {
	o        Options
	x        []float64
	ix       *neighbors.Index
	s        *neighbors.Searcher
	nref     int
	buf      []neighbors.Neighbor
	counts   []int       // Kantz: neighbours within each ε
	sum      [][]float64 // per curve: the current block's sums
	cnt      [][]int64
	refs     []int64
	frozen   []int64 // reference points whose neighbours never separate, per curve
	moved    []bool  // per curve: the current reference point's neighbourhood separated
	euclid   bool
	lag, dim int
}

func newWorker(o Options, x []float64, ix *neighbors.Index, nref, ne int) *worker {
	return &worker{o: o, x: x, ix: ix, s: ix.NewSearcher(), nref: nref,
		counts: make([]int, ne), sum: make([][]float64, ne), cnt: make([][]int64, ne),
		refs: make([]int64, ne), frozen: make([]int64, ne), moved: make([]bool, ne), euclid: o.Norm == neighbors.Euclidean, lag: o.Lag, dim: o.Dim}
}

// key returns the squared Euclidean distance or the maximum-norm distance between delay
// vectors i and j, read from the record.
func (w *worker) key(i, j int) float64 {
	x, lag := w.x, w.lag
	var s float64
	if w.euclid {
		for c := range w.dim {
			t := x[i+c*lag] - x[j+c*lag]
			s += t * t
		}
		return s
	}
	for c := range w.dim {
		s = math.Max(s, math.Abs(x[i+c*lag]-x[j+c*lag]))
	}
	return s
}

// logDist returns ln of the distance with key k.
func (w *worker) logDist(k float64) float64 {
	if w.euclid {
		return 0.5 * math.Log(k)
	}
	return math.Log(k)
}

// reference adds the contribution of reference point i to the current block.
func (w *worker) reference(i int) {
	o := w.o
	q := neighbors.Query{Self: i, Theiler: o.Theiler, Hi: w.nref}
	if o.Method == Rosenstein {
		w.buf = w.s.KNN(w.ix.Coords(i), 1, q, w.buf)
		if len(w.buf) == 0 {
			return
		}
		j := w.buf[0].Index
		w.refs[0]++
		s, c := w.sum[0], w.cnt[0]
		moved := false
		for k := range s {
			if d := w.key(i+k, j+k); d > 0 {
				s[k] += w.logDist(d)
				c[k]++
				moved = true
			}
		}
		if !moved {
			w.frozen[0]++
		}
		return
	}
	w.buf = w.s.KNN(w.ix.Coords(i), o.MaxNeighbors, q, w.buf)
	nmax := 0
	for e, eps := range o.Eps {
		c := 0
		for c < len(w.buf) && w.buf[c].Dist <= eps {
			c++
		}
		w.counts[e] = c
		nmax = c
		if c > 0 {
			w.refs[e]++
		}
	}
	if nmax == 0 {
		return
	}
	e0 := 0
	for w.counts[e0] == 0 {
		e0++
	}
	clear(w.moved)
	for k := 0; k <= o.Horizon; k++ {
		var acc float64
		e := e0
		for t := 0; t < nmax; t++ {
			d := w.key(i+k, w.buf[t].Index+k)
			if w.euclid {
				d = math.Sqrt(d)
			}
			acc += d
			for e < len(w.counts) && w.counts[e] == t+1 {
				if acc > 0 {
					w.sum[e][k] += math.Log(acc / float64(t+1))
					w.cnt[e][k]++
					w.moved[e] = true
				}
				e++
			}
		}
	}
	for e := e0; e < len(w.counts); e++ {
		if !w.moved[e] {
			w.frozen[e]++
		}
	}
}

func runtimeThreads() int { return runtime.GOMAXPROCS(0) }
