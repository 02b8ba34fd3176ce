package analysis

import (
	"sync"

	"unfold/embed"
	"unfold/neighbors"
)

// IndexCache shares the neighbour indexes of delay vectors (neighbors.FromEmbedding) between
// the stages of one run of the chain that embed the same record with the same lag, dimension
// and norm — the lyapunov stage and the fractal stage at the chosen dimension when both use the
// same norm — so that each such index is built once. The Theiler window is not part of the
// key: it is applied by the searches, not by the index. Only the keys announced with Share are
// kept, each for the number of uses announced, and released after its last use, so the cache
// holds at most the indexes that will be asked for again (memory O(N·m) each). A nil
// *IndexCache builds every index afresh. The results are identical either way (an index
// depends only on the points and the norm).
type IndexCache struct {
	mu   sync.Mutex
	x    []float64
	lag  int
	uses map[indexKey]int
	ix   map[indexKey]*neighbors.Index
	hits int
}

type indexKey struct {
	dim  int
	norm neighbors.Norm
}

// NewIndexCache returns an empty cache for the delay vectors of x with the given lag.
func NewIndexCache(x []float64, lag int) *IndexCache {
	return &IndexCache{x: x, lag: lag, uses: map[indexKey]int{}, ix: map[indexKey]*neighbors.Index{}}
}

// Share announces that the index at dimension dim with norm will be asked for uses times in
// all; it is kept until then.
func (c *IndexCache) Share(dim int, norm neighbors.Norm, uses int) {
	c.mu.Lock()
	defer c.mu.Unlock()
	c.uses[indexKey{dim, norm}] += uses
}

// Get returns the index of the delay vectors of x with lag, dim and norm: the cached one when
// the key was shared (x and lag must be the cache's), else a new one.
func (c *IndexCache) Get(x []float64, lag, dim int, norm neighbors.Norm) (*neighbors.Index, error) {
	if c == nil || lag != c.lag || len(x) != len(c.x) || len(x) == 0 || &x[0] != &c.x[0] {
		return neighbors.FromEmbedding(x, lag, dim, norm)
	}
	k := indexKey{dim, norm}
	c.mu.Lock()
	defer c.mu.Unlock()
	left := c.uses[k]
	if left <= 0 {
		return neighbors.FromEmbedding(x, lag, dim, norm)
	}
	ix := c.ix[k]
	if ix != nil {
		c.hits++
	} else {
		var err error
		if ix, err = neighbors.FromEmbedding(x, lag, dim, norm); err != nil {
			return nil, err
		}
	}
	if left == 1 {
		delete(c.uses, k)
		delete(c.ix, k)
	} else {
		c.uses[k], c.ix[k] = left-1, ix
	}
	return ix, nil
}

// provider returns the dimension.Options.Index callback for the correlation sums of x with lag
// (maximum norm unless euclid), or nil (build every index) when c is nil.
func (c *IndexCache) provider(x []float64, lag int, euclid bool) func(m int) (*neighbors.Index, error) {
	if c == nil {
		return nil
	}
	norm := neighbors.Max
	if euclid {
		norm = neighbors.Euclidean
	}
	return func(m int) (*neighbors.Index, error) { return c.Get(x, lag, m, norm) }
}

// shareIndexes returns the cache of the chain on x with the embedding choice c: the lyapunov
// stage's index (dimension c.Dim, norm lyapNorm) is shared with the fractal stage when the
// fractal options fo count at that dimension with the same norm; nil when nothing is shared.
func shareIndexes(x []float64, c *embed.Choice, lyapNorm string, fo FractalOptions) *IndexCache {
	if c == nil || c.Lag.Value < 1 || c.Dim.Value < 1 || c.Dim.Value > fo.MaxDim {
		return nil
	}
	norm, err := ParseNorm(lyapNorm)
	if err != nil || (norm == neighbors.Euclidean) != fo.Euclidean {
		return nil
	}
	ic := NewIndexCache(x, c.Lag.Value)
	ic.Share(c.Dim.Value, norm, 2)
	return ic
}
