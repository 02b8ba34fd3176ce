package embed

import (
	"fmt"
	"math"
	"slices"
	"sort"

	"gonum.org/v1/gonum/mathext"

	"unfold/neighbors"
)

// ksgMI is algorithm 1 of Kraskov, Stögbauer & Grassberger (2004, PRE 69, 066138, eq. 8):
//
//	I = ψ(k) + ψ(N) − ⟨ψ(n_x + 1) + ψ(n_y + 1)⟩,
//
// where ε_i is the max-norm distance from pair i = (x_t, x_{t+lag}) to its k-th neighbour in
// the joint plane and n_x, n_y count the points strictly closer than ε_i in each marginal. The
// joint search uses the kd-tree of package neighbors; the marginal counts binary-search the
// sorted marginals. With a Theiler window w the pairs with |t − t'| ≤ w are left out of both
// (then N is the number of admissible points of each pair). At most MaxPoints pairs evenly
// spaced in time are used per lag.
func ksgMI(x []float64, maxLag int, opt MIOptions) (*MICurve, error) {
	blocks := opt.Blocks
	if blocks <= 0 {
		blocks = 8
	}
	if blocks < 2 {
		return nil, fmt.Errorf("mutual information: %d blocks: want at least 2", blocks)
	}
	k := opt.K
	if k <= 0 {
		k = 4
	}
	if err := checkMIInput(x, maxLag, max(16*blocks, 4*k)); err != nil {
		return nil, err
	}
	maxPts := opt.MaxPoints
	if maxPts <= 0 {
		maxPts = 20000
	}
	avail := len(x) - maxLag
	stride := max(1, (avail+maxPts-1)/maxPts)
	m := (avail + stride - 1) / stride
	if m < 16*blocks || m <= 2*k {
		return nil, fmt.Errorf("mutual information: %d pairs are too few for the KSG estimator: %w", m, ErrTooShort)
	}
	w := max(opt.Theiler, 0) / stride // window in subsample index units
	c := &MICurve{Estimator: KSG, Nats: make([]float64, maxLag+1), Err: make([]float64, maxLag+1),
		K: k, Points: m, Blocks: blocks, Theiler: w * stride,
		BlockNats: make([][]float64, maxLag+1), GridErr: make([]float64, maxLag+1)}
	pts := make([]float64, 2*m)
	xs := make([]float64, m)
	ys := make([]float64, m)
	contrib := make([]float64, m)
	psiK := mathext.Digamma(float64(k))
	for lag := 0; lag <= maxLag; lag++ {
		for i := 0; i < m; i++ {
			t := i * stride
			pts[2*i], pts[2*i+1] = x[t], x[t+lag]
		}
		ix, err := neighbors.Build(pts, 2, neighbors.Max)
		if err != nil {
			return nil, fmt.Errorf("mutual information: %w", err)
		}
		_, dist := ix.AllKNN(k, w, 0, 0, opt.Threads, nil)
		for i := 0; i < m; i++ {
			xs[i], ys[i] = pts[2*i], pts[2*i+1]
		}
		slices.Sort(xs)
		slices.Sort(ys)
		for i := 0; i < m; i++ {
			eps := dist[i*k+k-1]
			xi, yi := pts[2*i], pts[2*i+1]
			nx := strictCount(xs, xi, eps) - 1
			ny := strictCount(ys, yi, eps) - 1
			admissible := m
			for j := max(0, i-w); j <= min(m-1, i+w); j++ {
				if j == i {
					continue
				}
				admissible--
				if math.Abs(pts[2*j]-xi) < eps {
					nx--
				}
				if math.Abs(pts[2*j+1]-yi) < eps {
					ny--
				}
			}
			if math.IsInf(eps, 1) {
				return nil, fmt.Errorf("mutual information: fewer than %d admissible neighbours (Theiler window %d too wide): %w", k, opt.Theiler, ErrTooShort)
			}
			contrib[i] = psiK + mathext.Digamma(float64(admissible)) - mathext.Digamma(float64(nx+1)) - mathext.Digamma(float64(ny+1))
		}
		c.Nats[lag], c.Err[lag], c.BlockNats[lag] = meanBlockError(contrib, blocks)
	}
	if maxLag >= 1 {
		c.NullErr = c.Err[1]
	} else {
		c.NullErr = c.Err[0]
	}
	return c, nil
}

// strictCount returns the number of values v of the sorted slice s with |v − c| < r.
func strictCount(s []float64, c, r float64) int {
	lo := sort.SearchFloat64s(s, c-r) // first v ≥ c − r
	for lo < len(s) && s[lo] <= c-r {
		lo++
	}
	hi := sort.SearchFloat64s(s, c+r) // first v ≥ c + r
	return hi - lo
}

// meanBlockError returns the mean of v, its standard error from the spread of the means of
// `blocks` contiguous blocks (sd of block means / √blocks) and the block means.
func meanBlockError(v []float64, blocks int) (mean, se float64, bm []float64) {
	n := len(v)
	bm = make([]float64, blocks)
	for b := range bm {
		lo, hi := b*n/blocks, (b+1)*n/blocks
		var s float64
		for _, u := range v[lo:hi] {
			s += u
			mean += u
		}
		bm[b] = s / float64(hi-lo)
	}
	mean /= float64(n)
	var ss float64
	for _, u := range bm {
		ss += (u - mean) * (u - mean)
	}
	return mean, math.Sqrt(ss/float64(blocks-1)) / math.Sqrt(float64(blocks)), bm
}
