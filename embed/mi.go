package embed

import (
	"cmp"
	"fmt"
	"math"
	"slices"
	"sync"

	"unfold/internal/workers"
)

// Estimators of the mutual information.
const (
	// Histogram is the plug-in estimator on equiprobable (rank) bins (Fraser & Swinney 1986
	// partition the plane adaptively; equal-occupancy marginal bins are the common
	// simplification).
	Histogram = "hist"
	// KSG is the k-nearest-neighbour estimator, algorithm 1 of Kraskov, Stögbauer &
	// Grassberger 2004, "Estimating mutual information", PRE 69, 066138.
	KSG = "ksg"
)

// MIOptions set how the mutual information is estimated. The zero value uses the histogram
// estimator with the bin count chosen from N.
type MIOptions struct {
	// Estimator is Histogram ("hist", the default when empty) or KSG ("ksg").
	Estimator string
	// Bins is the number of equiprobable bins per axis for Histogram; 0 chooses BinCount(N).
	Bins int
	// K is the number of neighbours for KSG; 0 means 4 (KSG 2004 recommend k = 2 … 4).
	K int
	// MaxPoints caps the number of pairs KSG uses per lag (evenly spaced in time); 0 means
	// 20000. The histogram estimator always uses every pair.
	MaxPoints int
	// Theiler excludes temporal neighbours |i−j| ≤ Theiler (in samples) from the KSG
	// neighbour search and counts; 0 or negative excludes only the point itself (but see
	// LagOptions for the default of ChooseLag).
	Theiler int
	// Progress, when not nil, is called with (lags done, lags in all) as the histogram
	// estimator finishes each lag, from one goroutine at a time.
	Progress func(done, total int)
	// Blocks is the number of contiguous blocks used for the standard error; 0 means 8, or
	// as many blocks of 16 pairs as the record allows (at least 2) when it is shorter.
	Blocks int
	// Threads is the number of goroutines (0 = 1 for the histogram; all cores for KSG queries
	// through the neighbour index). Results do not depend on it.
	Threads int
}

// MICurve is the mutual information between x_t and x_{t+k} for k = 0 … MaxLag.
type MICurve struct {
	Estimator string
	// Nats[k] is the estimate at lag k, in nats (Bits converts).
	Nats []float64
	// Err[k] is its standard error in nats, from the spread of the estimate over Blocks
	// contiguous blocks of the record (sd of block estimates / √Blocks). It includes the
	// effect of serial correlation, which an i.i.d. formula would not.
	Err []float64
	// Bias is the expected estimate for independent variables, in nats: (B−1)²/(2N) for the
	// histogram (the χ² limit of the plug-in estimator; Roulston 1999, "Estimating the errors
	// on measured entropy and mutual information", Physica D 125, 285) and 0 for KSG, which
	// is unbiased for independent variables (KSG 2004, §III).
	Bias float64
	// NullErr is the standard deviation of the estimate for independent variables, in nats:
	// (B−1)/(√2·N) for the histogram; for KSG the block error at the largest lags is used.
	NullErr float64
	// Bins is the bin count per axis (histogram), K the neighbour count (KSG).
	Bins, K int
	// Points is the number of pairs at lag 0 (N for the histogram, the subsample size for KSG).
	Points int
	// Blocks is the number of blocks behind Err.
	Blocks int
	// Theiler is the temporal exclusion window used by KSG, in samples (0 for the histogram).
	Theiler int
	// BlockNats[k][b] is the estimate at lag k from block b alone (nats); differences between
	// lags are much better determined than levels, because the blocks share their
	// fluctuations (DiffErr uses this).
	BlockNats [][]float64
	// GridErr[k] is the part of Err[k] that comes from where the bin edges fall (histogram:
	// half the difference between the grid and the half-bin shifted grid; 0 for KSG).
	GridErr []float64
}

// DiffErr returns the standard error of Nats[j] − Nats[k] in nats: the spread over blocks of
// the block differences, divided by √Blocks, combined with both grid errors.
func (c *MICurve) DiffErr(k, j int) float64 {
	bk, bj := c.BlockNats[k], c.BlockNats[j]
	nb := len(bk)
	var m float64
	for b := range bk {
		m += bj[b] - bk[b]
	}
	m /= float64(nb)
	var ss float64
	for b := range bk {
		d := bj[b] - bk[b] - m
		ss += d * d
	}
	se := math.Sqrt(ss/float64(nb-1)) / math.Sqrt(float64(nb))
	return math.Sqrt(se*se + c.GridErr[k]*c.GridErr[k] + c.GridErr[j]*c.GridErr[j])
}

// MaxLag returns the largest lag of the curve.
func (c *MICurve) MaxLag() int { return len(c.Nats) - 1 }

// Bits returns the estimate at lag k in bits.
func (c *MICurve) Bits(k int) float64 { return c.Nats[k] / math.Ln2 }

// BinCount returns the default number of equiprobable bins per axis for n samples:
// round(n^(1/3)) clamped to [4, 128]. With it the independence bias (B−1)²/(2n) falls like
// n^(−1/3) (0.02 nats at n = 10^4, 0.01 at 10^5, 0.005 at 10^6) while the resolution grows;
// a cube-root rule is common practice for histogram estimators (it is the optimal bin-width
// scaling for density histograms, Scott 1979, "On optimal and data-based histograms",
// Biometrika 66, 605).
func BinCount(n int) int {
	b := int(math.Round(math.Cbrt(float64(n))))
	return min(max(b, 4), 128)
}

// MutualInformation estimates the mutual information between x_t and x_{t+k} for
// k = 0 … maxLag (samples).
func MutualInformation(x []float64, maxLag int, opt MIOptions) (*MICurve, error) {
	switch opt.Estimator {
	case "", Histogram:
		return histogramMI(x, maxLag, opt)
	case KSG:
		return ksgMI(x, maxLag, opt)
	}
	return nil, fmt.Errorf("mutual information: unknown estimator %q (want %q or %q)", opt.Estimator, Histogram, KSG)
}

func checkMIInput(x []float64, maxLag, minPairs int) error {
	if maxLag < 0 {
		return fmt.Errorf("mutual information: maximum lag %d is negative", maxLag)
	}
	if len(x)-maxLag < minPairs {
		return fmt.Errorf("mutual information: %d samples leave fewer than %d pairs at lag %d: %w", len(x), minPairs, maxLag, ErrTooShort)
	}
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return fmt.Errorf("mutual information: sample %d is %v", i+1, v)
		}
	}
	return nil
}

// RankBins returns the equiprobable bin of every sample: bin = ⌊rank·B/N⌋ with rank the
// position in sorted order. Tied values share the bin of their first rank, so a quantised
// record does not get information from the order of equal values.
func RankBins(x []float64, bins int) []uint16 {
	n := len(x)
	idx := make([]int32, n)
	for i := range idx {
		idx[i] = int32(i)
	}
	slices.SortFunc(idx, func(a, b int32) int {
		if c := cmp.Compare(x[a], x[b]); c != 0 {
			return c
		}
		return cmp.Compare(a, b)
	})
	out := make([]uint16, n)
	first := 0
	for r, i := range idx {
		if r > 0 && x[i] != x[idx[r-1]] {
			first = r
		}
		out[i] = uint16(first * bins / n)
	}
	return out
}

func histogramMI(x []float64, maxLag int, opt MIOptions) (*MICurve, error) {
	blocks := opt.Blocks
	if blocks <= 0 {
		// 8 blocks of at least 16 pairs; a short record gets fewer blocks (at least 2), so
		// that records of a few dozen samples still get a curve.
		blocks = min(8, max(2, (len(x)-maxLag)/16))
	}
	if blocks < 2 {
		return nil, fmt.Errorf("mutual information: %d blocks: want at least 2", blocks)
	}
	if err := checkMIInput(x, maxLag, 16*blocks); err != nil {
		return nil, err
	}
	n := len(x)
	bins := opt.Bins
	if bins <= 0 {
		bins = BinCount(n)
	}
	if bins < 2 || bins > 65534 {
		return nil, fmt.Errorf("mutual information: %d bins: want 2 … 65534", bins)
	}
	b, bs := rankBins2(x, bins)
	c := &MICurve{
		Estimator: Histogram, Nats: make([]float64, maxLag+1), Err: make([]float64, maxLag+1),
		Bias: float64((bins-1)*(bins-1)) / (2 * float64(n)), NullErr: float64(bins-1) / (math.Sqrt2 * float64(n)),
		Bins: bins, Points: n, Blocks: blocks,
		BlockNats: make([][]float64, maxLag+1), GridErr: make([]float64, maxLag+1),
	}
	threads := max(opt.Threads, 1)
	threads = min(threads, maxLag+1)
	var wg sync.WaitGroup
	var g workers.Guard
	var mu sync.Mutex
	done := 0
	for w := 0; w < threads; w++ {
		wg.Add(1)
		go func(w int) {
			defer wg.Done()
			g.Run(func() {
				h := newHistWork(bins, blocks)
				for k := w; k <= maxLag; k += threads {
					var blockSE float64
					c.Nats[k], blockSE, c.GridErr[k], c.BlockNats[k] = h.lag(b, bs, k)
					if k == 0 {
						// I(X;X) on one grid is the entropy of the binned record, ln B for
						// equiprobable bins without ties; the two grids are not comparable here.
						c.Nats[0], c.BlockNats[0] = h.lagZero(b)
						c.GridErr[0] = 0
						blockSE = 0
					}
					c.Err[k] = math.Hypot(blockSE, c.GridErr[k])
					if opt.Progress != nil {
						mu.Lock()
						done++
						opt.Progress(done, maxLag+1)
						mu.Unlock()
					}
				}
			})
		}(w)
	}
	wg.Wait()
	g.Repanic()
	return c, nil
}

// rankBins2 returns RankBins(x, bins) and the same ranks on a grid shifted by half a bin,
// ⌊rank·B/N + ½⌋ (B+1 bins, the outer two of half the probability).
func rankBins2(x []float64, bins int) (b, shifted []uint16) {
	n := len(x)
	idx := make([]int32, n)
	for i := range idx {
		idx[i] = int32(i)
	}
	slices.SortFunc(idx, func(a, b int32) int {
		if c := cmp.Compare(x[a], x[b]); c != 0 {
			return c
		}
		return cmp.Compare(a, b)
	})
	b = make([]uint16, n)
	shifted = make([]uint16, n)
	first := 0
	for r, i := range idx {
		if r > 0 && x[i] != x[idx[r-1]] {
			first = r
		}
		b[i] = uint16(first * bins / n)
		shifted[i] = uint16((2*first*bins + n) / (2 * n))
	}
	return b, shifted
}

// histWork holds the per-goroutine count arrays of the histogram estimator. Rows are the bins
// of x_t (on either grid: B or B+1 rows), columns those of x_{t+k} (B columns).
type histWork struct {
	bins, blocks int
	joint        []int32 // blocks × (bins+1) × bins
	row, col     []int32
	total        []int32 // (bins+1) × bins
	blockMI      []float64
}

func newHistWork(bins, blocks int) *histWork {
	cells := (bins + 1) * bins
	return &histWork{bins: bins, blocks: blocks,
		joint: make([]int32, blocks*cells), row: make([]int32, bins+1), col: make([]int32, bins),
		total: make([]int32, cells), blockMI: make([]float64, blocks)}
}

// lag returns the estimate at lag k — the mean of the plug-in estimates on the grid and on
// the grid shifted by half a bin along x_t — with the standard error from the block spread,
// the grid error (half the difference between the two grids: the part of the estimate that
// depends on where the bin edges fall, large for curves such as a pure sine whose image is
// one-dimensional) and the block estimates (a new slice).
func (h *histWork) lag(b, bs []uint16, k int) (mi, blockSE, gridErr float64, blocks []float64) {
	m0, blk0 := h.grid(b, b, k, h.bins)
	s0 := slices.Clone(blk0)
	m1, blk1 := h.grid(bs, b, k, h.bins+1)
	var mean float64
	for i := range s0 {
		s0[i] = (s0[i] + blk1[i]) / 2
		mean += s0[i]
	}
	mean /= float64(h.blocks)
	var ss float64
	for _, v := range s0 {
		ss += (v - mean) * (v - mean)
	}
	blockSE = math.Sqrt(ss/float64(h.blocks-1)) / math.Sqrt(float64(h.blocks))
	return (m0 + m1) / 2, blockSE, math.Abs(m1-m0) / 2, s0
}

// lagZero returns the plug-in I(X;X) on the unshifted grid (the binned entropy) and its block
// estimates (a new slice).
func (h *histWork) lagZero(b []uint16) (float64, []float64) {
	m, blk := h.grid(b, b, 0, h.bins)
	return m, slices.Clone(blk)
}

// grid fills the per-block tables for rows from r (rows values) and columns from c and returns
// the plug-in estimate over all pairs and the per-block estimates (valid until the next call).
func (h *histWork) grid(r, c []uint16, k, rows int) (float64, []float64) {
	pairs := len(r) - k
	cells := rows * h.bins
	joint := h.joint[:h.blocks*cells]
	clear(joint)
	for blk := 0; blk < h.blocks; blk++ {
		lo, hi := blk*pairs/h.blocks, (blk+1)*pairs/h.blocks
		cell := joint[blk*cells : (blk+1)*cells]
		for t := lo; t < hi; t++ {
			cell[int(r[t])*h.bins+int(c[t+k])]++
		}
	}
	total := h.total[:cells]
	clear(total)
	for blk := 0; blk < h.blocks; blk++ {
		cell := joint[blk*cells : (blk+1)*cells]
		for i, v := range cell {
			total[i] += v
		}
		h.blockMI[blk] = h.plugin(cell, rows)
	}
	return h.plugin(total, rows), h.blockMI
}

// plugin returns Σ p_ij ln(p_ij / (p_i p_j)) for a rows×bins count table.
func (h *histWork) plugin(cell []int32, rows int) float64 {
	row := h.row[:rows]
	clear(row)
	clear(h.col)
	var n int64
	for i := 0; i < rows; i++ {
		r := cell[i*h.bins : (i+1)*h.bins]
		for j, v := range r {
			row[i] += v
			h.col[j] += v
		}
		n += int64(row[i])
	}
	if n == 0 {
		return 0
	}
	fn := float64(n)
	var s float64
	for i := 0; i < rows; i++ {
		if row[i] == 0 {
			continue
		}
		r := cell[i*h.bins : (i+1)*h.bins]
		ri := float64(row[i])
		for j, v := range r {
			if v == 0 {
				continue
			}
			fv := float64(v)
			s += fv * math.Log(fv*fn/(ri*float64(h.col[j])))
		}
	}
	return s / fn
}
