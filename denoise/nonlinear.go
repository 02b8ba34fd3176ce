package denoise

import (
	"fmt"
	"math"
	"slices"
	"sync/atomic"

	"gonum.org/v1/gonum/blas"
	"gonum.org/v1/gonum/blas/blas64"
	"gonum.org/v1/gonum/lapack"
	"gonum.org/v1/gonum/lapack/lapack64"

	"unfold/neighbors"
)

// Method is a nonlinear noise-reduction method.
type Method int

const (
	// Projective is local projective noise reduction (Grassberger et al. 1993).
	Projective Method = iota
	// Constant is locally constant noise reduction (Schreiber 1993).
	Constant
)

// String returns "projective" or "constant".
func (m Method) String() string {
	switch m {
	case Projective:
		return "projective"
	case Constant:
		return "constant"
	}
	return fmt.Sprintf("Method(%d)", int(m))
}

// ParseMethod returns the method named "projective" or "constant".
func ParseMethod(s string) (Method, error) {
	switch s {
	case "projective", "":
		return Projective, nil
	case "constant":
		return Constant, nil
	}
	return 0, fmt.Errorf("%w: unknown noise-reduction method %q (want projective or constant)", ErrInput, s)
}

// Defaults used when an Options field is zero.
const (
	DefaultDim        = 7    // embedding dimension m
	DefaultLag        = 1    // delay in samples
	DefaultQ          = 2    // local manifold dimension q
	DefaultIterations = 5    // largest number of iterations
	DefaultEndWeight  = 1000 // weight of the first and last coordinates (projective)
	// DefaultEpsFactor is ε / σ̂: the neighbourhood radius in units of the estimated noise
	// level (CHECKS.md §12 recommends 2–3 σ_noise; judgement, not published).
	DefaultEpsFactor = 3
)

// Options are the parameters of Reduce. Zero values select the documented defaults.
type Options struct {
	// Method is Projective (default) or Constant.
	Method Method
	// Dim is the embedding dimension m (default DefaultDim); Lag the delay in samples
	// (default DefaultLag).
	Dim, Lag int
	// Q is the dimension of the local manifold (projective method; default DefaultQ, must be
	// below Dim). The noise-level estimate uses it for both methods.
	Q int
	// Eps is the neighbourhood radius in signal units (default: EpsFactor times the noise
	// level estimated by EstimateNoise).
	Eps float64
	// EpsFactor is ε in units of the estimated noise level when Eps is 0 (default
	// DefaultEpsFactor).
	EpsFactor float64
	// Iterations is the largest number of iterations (default DefaultIterations). Iteration
	// stops early when the rms correction stops shrinking.
	Iterations int
	// MinNeighbors is the smallest neighbourhood (not counting the point itself) for which a
	// point is corrected (default 2·Dim for Projective, 2 for Constant); smaller ones are left.
	MinNeighbors int
	// MaxNeighbors, when > 0, caps the neighbourhood at the MaxNeighbors nearest ε-neighbours
	// (found by a k-nearest-neighbour search), which bounds the work per point on long records;
	// 0 (default) uses every ε-neighbour.
	MaxNeighbors int
	// Theiler excludes neighbours j with 0 < |i−j| <= Theiler (default 0: only the point itself
	// is not its own neighbour; it is always counted as a member of its neighbourhood).
	Theiler int
	// Euclidean selects the Euclidean norm; the default is the maximum norm (Schreiber 1993).
	Euclidean bool
	// EndWeight is the weight r of the first and last coordinates in the projective method's
	// covariance (default DefaultEndWeight; the other coordinates have weight 1).
	EndWeight float64
	// Threads is the number of goroutines (<= 0: all cores). The result is identical for any
	// number.
	Threads int
	// Progress, when not nil, is called with (done, total) points during each iteration.
	Progress func(done, total int)
}

// Iteration reports one pass of noise reduction.
type Iteration struct {
	// Iteration counts from 1.
	Iteration int `json:"iteration"`
	// RMSCorrection is the root mean square of the corrections over all samples, in signal
	// units.
	RMSCorrection float64 `json:"rms_correction"`
	// Uncorrected counts delay vectors left alone for having fewer than MinNeighbors neighbours.
	Uncorrected int `json:"uncorrected"`
	// Applied is false for the pass whose correction did not shrink: it is discarded and
	// iteration stops.
	Applied bool `json:"applied"`
}

// Result is the outcome of Reduce.
type Result struct {
	// Values are the cleaned samples (same length as the input).
	Values []float64
	// Method, Dim, Lag, Q, Eps, MinNeighbors, MaxNeighbors, Theiler, Norm and EndWeight are the parameters
	// used (chosen or given). Norm is "max" or "euclidean".
	Method       Method
	Dim, Lag, Q  int
	Eps          float64
	MinNeighbors int
	MaxNeighbors int
	Theiler      int
	Norm         string
	EndWeight    float64
	// EpsRule says how Eps was chosen.
	EpsRule string
	// Noise is the noise estimate when Eps was chosen from it (nil when Eps was given).
	Noise *NoiseEstimate
	// Iterations are the passes run, in order.
	Iterations []Iteration
	// RMSCorrection is the rms difference between Values and the input, in signal units.
	RMSCorrection float64
	// Cautions are plain-words warnings.
	Cautions []string
}

// resolve fills defaults and validates.
func (o Options) resolve(n int) (Options, error) {
	if o.Dim == 0 {
		o.Dim = DefaultDim
	}
	if o.Lag == 0 {
		o.Lag = DefaultLag
	}
	if o.Q == 0 {
		o.Q = min(DefaultQ, max(o.Dim-1, 1))
	}
	if o.Iterations == 0 {
		o.Iterations = DefaultIterations
	}
	if o.EndWeight == 0 {
		o.EndWeight = DefaultEndWeight
	}
	if o.EpsFactor == 0 {
		o.EpsFactor = DefaultEpsFactor
	}
	if o.MinNeighbors == 0 {
		if o.Method == Projective {
			o.MinNeighbors = 2 * o.Dim
		} else {
			o.MinNeighbors = 2
		}
	}
	switch {
	case o.Method != Projective && o.Method != Constant:
		return o, fmt.Errorf("%w: unknown method %d", ErrInput, int(o.Method))
	case o.Dim < 2 || o.Dim > 64:
		return o, fmt.Errorf("%w: embedding dimension %d, want 2 … 64", ErrInput, o.Dim)
	case o.Lag < 1:
		return o, fmt.Errorf("%w: lag %d, want >= 1", ErrInput, o.Lag)
	case o.Q < 1 || o.Q >= o.Dim:
		return o, fmt.Errorf("%w: manifold dimension q = %d, want 1 … m−1 = %d", ErrInput, o.Q, o.Dim-1)
	case !(o.Eps >= 0) || math.IsInf(o.Eps, 0):
		return o, fmt.Errorf("%w: neighbourhood radius ε = %v, want > 0 (or 0 for the default)", ErrInput, o.Eps)
	case !(o.EpsFactor > 0) || math.IsInf(o.EpsFactor, 0):
		return o, fmt.Errorf("%w: ε factor %v, want > 0", ErrInput, o.EpsFactor)
	case o.Iterations < 1:
		return o, fmt.Errorf("%w: iterations %d, want >= 1", ErrInput, o.Iterations)
	case o.MinNeighbors < 1:
		return o, fmt.Errorf("%w: minimum neighbours %d, want >= 1", ErrInput, o.MinNeighbors)
	case o.MaxNeighbors < 0 || (o.MaxNeighbors > 0 && o.MaxNeighbors < o.MinNeighbors):
		return o, fmt.Errorf("%w: maximum neighbours %d, want 0 (no cap) or >= the minimum %d", ErrInput, o.MaxNeighbors, o.MinNeighbors)
	case o.Theiler < 0:
		return o, fmt.Errorf("%w: Theiler window %d, want >= 0", ErrInput, o.Theiler)
	case !(o.EndWeight > 0) || math.IsInf(o.EndWeight, 0):
		return o, fmt.Errorf("%w: end weight %v, want > 0", ErrInput, o.EndWeight)
	}
	if nv := n - (o.Dim-1)*o.Lag; nv < 2*(o.MinNeighbors+1) {
		return o, fmt.Errorf("%w: %d samples give %d delay vectors with m = %d, lag = %d: too few for neighbourhoods of %d points", ErrInput, n, max(nv, 0), o.Dim, o.Lag, o.MinNeighbors+1)
	}
	return o, nil
}

func (o Options) norm() neighbors.Norm {
	if o.Euclidean {
		return neighbors.Euclidean
	}
	return neighbors.Max
}

func (o Options) normName() string {
	if o.Euclidean {
		return "euclidean"
	}
	return "max"
}

// Reduce runs nonlinear noise reduction on x and returns the cleaned record with the parameters
// used and the rms correction of every iteration. See the package comment for the methods and
// their references.
//
// Each iteration embeds the current record (vector i is (x_i, x_{i+lag}, …,
// x_{i+(m−1)lag})), builds a neighbour index and finds for every vector its ε-neighbours.
// Constant: the middle coordinate x_{i+k0·lag}, k0 = ⌊(m−1)/2⌋, is replaced by its mean over
// the neighbourhood (the vector itself included); the first k0·lag and last (m−1−k0)·lag samples
// are never middle coordinates and stay as they are. Projective: with the neighbourhood's
// centre of mass ξ̄ and covariance C, the weighted matrix Γ = R C R (R = diag(r, 1, …, 1, r),
// r = EndWeight) is diagonalised (LAPACK dsyev through gonum, the routine behind
// mat.EigenSym), and the vector is corrected by θ = R⁻¹ Σ_k e_k e_kᵀ R (ξ̄ − v) over the m−q
// eigenvectors e_k of smallest eigenvalue; the correction of sample n is the mean of the
// corrections of the coordinates that hold it. All corrections of an iteration are computed from
// the previous iterate and applied together. Iteration stops after Iterations passes or as soon
// as a pass's rms correction is not smaller than the previous one's (that pass is discarded).
func Reduce(x []float64, opt Options) (*Result, error) {
	o, err := opt.resolve(len(x))
	if err != nil {
		return nil, err
	}
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("%w: sample %d is %v", ErrInput, i, v)
		}
	}
	res := &Result{Method: o.Method, Dim: o.Dim, Lag: o.Lag, Q: o.Q, MinNeighbors: o.MinNeighbors, MaxNeighbors: o.MaxNeighbors,
		Theiler: o.Theiler, Norm: o.normName(), EndWeight: o.EndWeight}
	cur := append([]float64(nil), x...)
	ix, err := neighbors.FromEmbedding(cur, o.Lag, o.Dim, o.norm())
	if err != nil {
		return nil, fmt.Errorf("denoise: %w", err)
	}
	if o.Eps == 0 {
		ne, err := estimateNoise(ix, x, o)
		if err != nil {
			return nil, err
		}
		res.Noise = ne
		o.Eps = ne.Eps
		res.EpsRule = fmt.Sprintf("ε = %g × estimated noise level %.4g (%s)", o.EpsFactor, ne.Sigma, ne.Rule)
		if ne.Sigma == 0 || ne.Eps == 0 {
			return nil, fmt.Errorf("%w: the noise level estimate is zero (is the record quantised to a few values?); give ε explicitly", ErrInput)
		}
		res.Cautions = append(res.Cautions, ne.Cautions...)
	} else {
		res.EpsRule = "given"
	}
	res.Eps = o.Eps

	n := len(x)
	nv := n - (o.Dim-1)*o.Lag
	theta := make([]float64, nv*o.Dim) // per-vector corrections (projective) or new middle values (constant)
	okv := make([]bool, nv)
	corr := make([]float64, n)
	prev := math.Inf(1)
	for it := 1; it <= o.Iterations; it++ {
		if it > 1 {
			if ix, err = neighbors.FromEmbedding(cur, o.Lag, o.Dim, o.norm()); err != nil {
				return nil, fmt.Errorf("denoise: iteration %d: %w", it, err)
			}
		}
		uncorrected := o.pass(ix, cur, theta, okv)
		o.gather(cur, theta, okv, corr)
		var ss float64
		for _, c := range corr {
			ss += c * c
		}
		rms := math.Sqrt(ss / float64(n))
		rec := Iteration{Iteration: it, RMSCorrection: rms, Uncorrected: uncorrected}
		if rms >= prev || rms == 0 {
			rec.Applied = rms == 0
			res.Iterations = append(res.Iterations, rec)
			break
		}
		rec.Applied = true
		res.Iterations = append(res.Iterations, rec)
		for i, c := range corr {
			cur[i] += c
		}
		prev = rms
	}
	var ss float64
	for i := range cur {
		d := cur[i] - x[i]
		ss += d * d
	}
	res.Values = cur
	res.RMSCorrection = math.Sqrt(ss / float64(n))
	if last := res.Iterations[len(res.Iterations)-1]; last.Uncorrected > nv/2 {
		res.Cautions = append(res.Cautions, fmt.Sprintf("%d of %d delay vectors had fewer than %d neighbours within ε = %.4g and were left uncorrected: ε is small for this record", last.Uncorrected, nv, o.MinNeighbors, o.Eps))
	}
	return res, nil
}

// worker is the scratch space of one goroutine: nothing is allocated per point.
type worker struct {
	s     *neighbors.Searcher
	nb    []neighbors.Neighbor
	mean  []float64
	cov   []float64 // m×m, row-major
	w     []float64 // eigenvalues
	work  []float64 // LAPACK workspace
	delta []float64
	r     []float64 // coordinate weights
	cap   int       // MaxNeighbors (0: no cap)
}

func newWorker(ix *neighbors.Index, m int, endWeight float64) *worker {
	return newWorkerWith(ix.NewSearcher(), m, endWeight)
}

// newWorkerWith is newWorker around a Searcher the caller already has.
func newWorkerWith(s *neighbors.Searcher, m int, endWeight float64) *worker {
	wk := &worker{s: s, mean: make([]float64, m), cov: make([]float64, m*m),
		w: make([]float64, m), delta: make([]float64, m), r: make([]float64, m)}
	for a := range wk.r {
		wk.r[a] = 1
	}
	wk.r[0], wk.r[m-1] = endWeight, endWeight
	q := []float64{0}
	lapack64.Syev(lapack.EVCompute, blas64.Symmetric{N: m, Stride: m, Data: wk.cov, Uplo: blas.Upper}, wk.w, q, -1)
	wk.work = make([]float64, max(int(q[0]), 3*m))
	return wk
}

// neighbourhood finds the ε-neighbours of vector i into wk.nb and fills wk.mean and wk.cov (the
// covariance, divided by the number of members) over the neighbours and i itself, each
// coordinate multiplied by weight[a] when weight is not nil. It returns the number of
// neighbours (not counting i).
func (wk *worker) neighbourhood(ix *neighbors.Index, i int, eps float64, theiler int, weight []float64) int {
	return wk.neighbourhoodCov(ix, i, eps, theiler, weight, true)
}

// neighbourhoodCov is neighbourhood; with cov false only wk.mean is computed.
func (wk *worker) neighbourhoodCov(ix *neighbors.Index, i int, eps float64, theiler int, weight []float64, cov bool) int {
	v := ix.Coords(i)
	if wk.cap > 0 {
		wk.nb = wk.s.KNN(v, wk.cap, neighbors.Query{Self: i, Theiler: theiler}, wk.nb)
		k := len(wk.nb)
		for k > 0 && wk.nb[k-1].Dist > eps {
			k--
		}
		wk.nb = wk.nb[:k]
	} else {
		wk.nb = wk.s.Radius(v, eps, neighbors.Query{Self: i, Theiler: theiler}, wk.nb)
	}
	m := len(v)
	k := float64(len(wk.nb) + 1)
	copy(wk.mean, v)
	for _, nb := range wk.nb {
		u := ix.Coords(nb.Index)
		for a := range m {
			wk.mean[a] += u[a]
		}
	}
	for a := range m {
		wk.mean[a] /= k
	}
	if !cov {
		return len(wk.nb)
	}
	clear(wk.cov)
	add := func(u []float64) {
		for a := range m {
			wk.delta[a] = u[a] - wk.mean[a]
			if weight != nil {
				wk.delta[a] *= weight[a]
			}
		}
		for a := range m {
			da := wk.delta[a]
			row := wk.cov[a*m : a*m+m]
			for b := a; b < m; b++ {
				row[b] += da * wk.delta[b]
			}
		}
	}
	add(v)
	for _, nb := range wk.nb {
		add(ix.Coords(nb.Index))
	}
	for a := range m {
		for b := a; b < m; b++ {
			wk.cov[a*m+b] /= k
		}
	}
	return len(wk.nb)
}

// eigen diagonalises wk.cov (upper triangle) in place: eigenvalues ascending in wk.w,
// eigenvector k in column k of wk.cov.
func (wk *worker) eigen(m int) bool {
	return lapack64.Syev(lapack.EVCompute, blas64.Symmetric{N: m, Stride: m, Data: wk.cov, Uplo: blas.Upper}, wk.w, wk.work, len(wk.work))
}

// pass computes the corrections of one iteration into theta (per vector) and okv, in parallel;
// it returns the number of vectors left uncorrected.
func (o Options) pass(ix *neighbors.Index, cur, theta []float64, okv []bool) int {
	m := o.Dim
	k0 := (m - 1) / 2
	var bad atomic.Int64
	ix.ForEachWorker(o.Threads, o.Progress, func(s *neighbors.Searcher) func(i int) {
		wk := newWorkerWith(s, m, o.EndWeight)
		wk.cap = o.MaxNeighbors
		return func(i int) {
			th := theta[i*m : i*m+m]
			if o.Method == Constant {
				if wk.neighbourhoodCov(ix, i, o.Eps, o.Theiler, nil, false) < o.MinNeighbors {
					okv[i] = false
					bad.Add(1)
					return
				}
				okv[i] = true
				th[0] = wk.mean[k0]
				return
			}
			if wk.neighbourhood(ix, i, o.Eps, o.Theiler, wk.r) < o.MinNeighbors || !wk.eigen(m) {
				okv[i] = false
				bad.Add(1)
				return
			}
			okv[i] = true
			v := ix.Coords(i)
			// wk.mean is the unweighted centre of mass; d = R(ξ̄ − v)
			for a := range m {
				wk.delta[a] = wk.r[a] * (wk.mean[a] - v[a])
			}
			clear(th)
			for k := 0; k < m-o.Q; k++ {
				var dot float64
				for a := range m {
					dot += wk.cov[a*m+k] * wk.delta[a]
				}
				for a := range m {
					th[a] += wk.cov[a*m+k] * dot
				}
			}
			for a := range m {
				th[a] /= wk.r[a]
			}
		}
	})
	return int(bad.Load())
}

// gather turns the per-vector results into per-sample corrections (serially, in a fixed order).
func (o Options) gather(cur, theta []float64, okv []bool, corr []float64) {
	m, lag := o.Dim, o.Lag
	clear(corr)
	if o.Method == Constant {
		k0 := (m - 1) / 2
		for i, ok := range okv {
			if ok {
				n := i + k0*lag
				corr[n] = theta[i*m] - cur[n]
			}
		}
		return
	}
	cnt := make([]int32, len(cur))
	for i, ok := range okv {
		if !ok {
			continue
		}
		for a := range m {
			n := i + a*lag
			corr[n] += theta[i*m+a]
			cnt[n]++
		}
	}
	for n, c := range cnt {
		if c > 0 {
			corr[n] /= float64(c)
		}
	}
}

// median returns the median of v (v is reordered).
func median(v []float64) float64 {
	slices.Sort(v)
	k := len(v)
	if k%2 == 1 {
		return v[k/2]
	}
	return (v[k/2-1] + v[k/2]) / 2
}
