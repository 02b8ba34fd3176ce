package neighbors

import (
	"errors"
	"fmt"
	"math"
	"sync"

	"unfold/internal/workers"
)

// Norm selects the distance between two points.
type Norm int

const (
	// Euclidean is the ℓ2 norm, sqrt(Σ (a_d − b_d)²).
	Euclidean Norm = iota
	// Max is the maximum (Chebyshev, ℓ∞) norm, max_d |a_d − b_d|.
	Max
)

// String returns "euclidean" or "max".
func (n Norm) String() string {
	switch n {
	case Euclidean:
		return "euclidean"
	case Max:
		return "max"
	}
	return fmt.Sprintf("Norm(%d)", int(n))
}

// Neighbor is one result of a search: the point's index in the caller's numbering and its true
// (not squared) distance from the query point.
type Neighbor struct {
	Index int
	Dist  float64
}

// leafSize is the largest number of points in a leaf bucket (32 measured faster than 16 and 8
// for the all-points nearest-neighbour search and the sampled pair counts on 3·10^5 Lorenz
// vectors).
const leafSize = 32

// node is one kd-tree node. Points of the subtree occupy tree positions [start, end).
type node struct {
	start, end     int32
	left, right    int32   // child node ids; left < 0 for a leaf
	split          int32   // split dimension
	minIdx, maxIdx int32   // smallest and largest original index in the subtree
	lmax, rmin     float64 // largest coordinate of the left child and smallest of the right child in the split dimension
}

// Index is an immutable kd-tree over n points of dimension dim. It is safe for concurrent use
// by many Searchers.
type Index struct {
	n, dim int
	norm   Norm
	pts    []float64 // n×dim, tree order
	perm   []int32   // tree position → original index
	inv    []int32   // original index → tree position
	nodes  []node
	box    []float64 // per node 2·dim values: lower corner then upper corner
}

// ErrInput is wrapped by every error about unusable input points or parameters.
var ErrInput = errors.New("neighbors: bad input")

// Build returns an index over n = len(points)/dim points stored row-major (point i is
// points[i*dim : (i+1)*dim]). The points are copied; NaN or infinite coordinates are rejected.
// n = 0 gives an empty index on which every query returns nothing.
func Build(points []float64, dim int, norm Norm) (*Index, error) {
	if dim < 1 {
		return nil, fmt.Errorf("%w: dimension %d, want >= 1", ErrInput, dim)
	}
	if len(points)%dim != 0 {
		return nil, fmt.Errorf("%w: %d coordinates is not a multiple of dimension %d", ErrInput, len(points), dim)
	}
	n := len(points) / dim
	for i, v := range points {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("%w: point %d, coordinate %d is %v", ErrInput, i/dim, i%dim, v)
		}
	}
	return build(points, n, dim, dim, 1, norm)
}

// FromEmbedding returns an index over the delay vectors v_i = (x[i], x[i+lag], …,
// x[i+(dim−1)lag]) for i = 0 … N−(dim−1)lag−1, N = len(x). The vectors are copied once, in tree
// order. NaN or infinite samples among those used are rejected.
func FromEmbedding(x []float64, lag, dim int, norm Norm) (*Index, error) {
	if lag < 1 {
		return nil, fmt.Errorf("%w: lag %d, want >= 1", ErrInput, lag)
	}
	if dim < 1 {
		return nil, fmt.Errorf("%w: dimension %d, want >= 1", ErrInput, dim)
	}
	n := len(x) - (dim-1)*lag
	if n < 1 {
		return nil, fmt.Errorf("%w: %d samples give no delay vector with lag %d and dimension %d", ErrInput, len(x), lag, dim)
	}
	for i, v := range x {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return nil, fmt.Errorf("%w: sample %d is %v", ErrInput, i, v)
		}
	}
	return build(x, n, dim, 1, lag, norm)
}

// build constructs the tree over n points whose coordinate d of point i is
// src[i*rowStride + d*colStride]. The points are first copied contiguously in their own order;
// the construction then reorders these rows in place (with the permutation), so every scan and
// selection reads memory sequentially and the rows end up in tree order without another copy.
func build(src []float64, n, dim, rowStride, colStride int, norm Norm) (*Index, error) {
	if norm != Euclidean && norm != Max {
		return nil, fmt.Errorf("%w: unknown norm %d", ErrInput, int(norm))
	}
	if n > math.MaxInt32-1 {
		return nil, fmt.Errorf("%w: %d points exceed the limit of %d", ErrInput, n, math.MaxInt32-1)
	}
	ix := &Index{n: n, dim: dim, norm: norm}
	ix.perm = make([]int32, n)
	ix.pts = make([]float64, n*dim)
	for i := range ix.perm {
		ix.perm[i] = int32(i)
		row := ix.pts[i*dim : i*dim+dim]
		base := i * rowStride
		for d := range row {
			row[d] = src[base+d*colStride]
		}
	}
	if n > 0 {
		nn := nodeCount(n)
		ix.nodes = make([]node, nn)
		ix.box = make([]float64, nn*2*dim)
		b := builder{ix: ix}
		b.node(0, 0, n, 0)
	}
	ix.inv = make([]int32, n)
	for p, i := range ix.perm {
		ix.inv[i] = int32(p)
	}
	return ix, nil
}

// nodeCount returns the number of nodes of the subtree over size points. Node ids are assigned
// in preorder from it, so subtrees can be built concurrently and the tree does not depend on
// the order in which they finish.
func nodeCount(size int) int {
	if size <= leafSize {
		return 1
	}
	h := size / 2
	return 1 + nodeCount(h) + nodeCount(size-h)
}

type builder struct {
	ix *Index
}

// parallelBuildSize is the smallest subtree whose two halves are built on separate goroutines.
const parallelBuildSize = 1 << 15

// node builds node id over tree positions [start, end) at the given depth.
func (b *builder) node(id, start, end, depth int) {
	ix := b.ix
	dim := ix.dim
	nd := &ix.nodes[id]
	*nd = node{start: int32(start), end: int32(end), left: -1, right: -1}
	lo := ix.box[id*2*dim : id*2*dim+dim]
	hi := ix.box[id*2*dim+dim : id*2*dim+2*dim]
	for d := range dim {
		lo[d], hi[d] = math.Inf(1), math.Inf(-1)
	}
	rows := ix.pts[start*dim : end*dim]
	for c := 0; c < len(rows); c += dim {
		row := rows[c : c+dim]
		for d, v := range row {
			if v < lo[d] {
				lo[d] = v
			}
			if v > hi[d] {
				hi[d] = v
			}
		}
	}
	if end-start <= leafSize {
		mn, mx := int32(math.MaxInt32), int32(-1)
		for _, i := range ix.perm[start:end] {
			mn, mx = min(mn, i), max(mx, i)
		}
		nd.minIdx, nd.maxIdx = mn, mx
		return
	}
	split, width := 0, -1.0
	for d := range dim {
		if hi[d]-lo[d] > width {
			split, width = d, hi[d]-lo[d]
		}
	}
	mid := start + (end-start)/2
	b.selectNth(start, end, split, mid-start)
	l := id + 1
	r := l + nodeCount(mid-start)
	if end-start >= parallelBuildSize && depth < 4 {
		var wg sync.WaitGroup
		var g workers.Guard
		wg.Go(func() { g.Run(func() { b.node(l, start, mid, depth+1) }) })
		b.node(r, mid, end, depth+1)
		wg.Wait()
		g.Repanic()
	} else {
		b.node(l, start, mid, depth+1)
		b.node(r, mid, end, depth+1)
	}
	nd.left, nd.right, nd.split = int32(l), int32(r), int32(split)
	nd.minIdx = min(ix.nodes[l].minIdx, ix.nodes[r].minIdx) // the children's index ranges
	nd.maxIdx = max(ix.nodes[l].maxIdx, ix.nodes[r].maxIdx)
	nd.lmax = ix.box[l*2*dim+dim+split]
	nd.rmin = ix.box[r*2*dim+split]
}

// selectNth reorders the rows at tree positions [start, end) (and the permutation with them)
// so that position start+k holds the point of rank k in coordinate d, with no larger
// coordinate before it and no smaller one after it (Hoare's selection; duplicates split
// evenly).
func (b *builder) selectNth(start, end, d, k int) {
	ix := b.ix
	dim := ix.dim
	perm := ix.perm[start:end]
	pts := ix.pts[start*dim : end*dim]
	at := func(p int) float64 { return pts[p*dim+d] }
	swap := func(p, q int) {
		perm[p], perm[q] = perm[q], perm[p]
		rp, rq := pts[p*dim:p*dim+dim], pts[q*dim:q*dim+dim]
		for c := range rp {
			rp[c], rq[c] = rq[c], rp[c]
		}
	}
	lo, hi := 0, len(perm)-1
	for hi > lo {
		m := lo + (hi-lo)/2
		x, y, z := at(lo), at(m), at(hi)
		pivot := max(min(x, y), min(max(x, y), z))
		i, j := lo, hi
		for i <= j {
			for at(i) < pivot {
				i++
			}
			for at(j) > pivot {
				j--
			}
			if i <= j {
				swap(i, j)
				i++
				j--
			}
		}
		switch {
		case k <= j:
			hi = j
		case k >= i:
			lo = i
		default:
			return
		}
	}
}

// Len returns the number of points.
func (ix *Index) Len() int { return ix.n }

// Dim returns the dimension of the points.
func (ix *Index) Dim() int { return ix.dim }

// Norm returns the norm the index measures distances with.
func (ix *Index) Norm() Norm { return ix.norm }

// Point appends the coordinates of point i (original numbering) to dst[:0] and returns it.
func (ix *Index) Point(i int, dst []float64) []float64 {
	return append(dst[:0], ix.Coords(i)...)
}

// Coords returns the coordinates of point i (original numbering) as a view into the index's
// storage, without copying. The caller must not modify it.
func (ix *Index) Coords(i int) []float64 {
	p := int(ix.inv[i]) * ix.dim
	return ix.pts[p : p+ix.dim : p+ix.dim]
}

// Distance returns the distance between points i and j (original numbering), computed exactly
// as the searches compute it.
func (ix *Index) Distance(i, j int) float64 {
	k := ix.key(ix.Coords(i), ix.Coords(j))
	if ix.norm == Euclidean {
		return math.Sqrt(k)
	}
	return k
}

// key is the comparison key of the distance between a and b: the squared distance for the
// Euclidean norm, the distance itself for the maximum norm. Every search computes point
// distances with this summation order so that results agree bit for bit.
func (ix *Index) key(a, b []float64) float64 {
	var s float64
	b = b[:len(a)]
	if ix.norm == Euclidean {
		for d, v := range a {
			t := v - b[d]
			s += float64(t * t)
		}
		return s
	}
	for d, v := range a {
		if t := math.Abs(v - b[d]); t > s {
			s = t
		}
	}
	return s
}

// threshold returns the largest key t such that a point with key k has distance <= r exactly
// when k <= t. It returns -1 when no distance qualifies (r negative or NaN).
func (ix *Index) threshold(r float64) float64 {
	if !(r >= 0) {
		return -1
	}
	if ix.norm == Max || math.IsInf(r, 1) {
		if ix.norm == Euclidean {
			return math.Inf(1)
		}
		return r
	}
	t := r * r
	for t > 0 && math.Sqrt(t) > r {
		t = math.Nextafter(t, math.Inf(-1))
	}
	for {
		u := math.Nextafter(t, math.Inf(1))
		if math.IsInf(u, 1) || math.Sqrt(u) > r {
			return t
		}
		t = u
	}
}

// dist converts a comparison key back to a distance.
func (ix *Index) dist(key float64) float64 {
	if ix.norm == Euclidean {
		return math.Sqrt(key)
	}
	return key
}
