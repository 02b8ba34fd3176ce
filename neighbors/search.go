package neighbors

import (
	"cmp"
	"math"
	"slices"
)

// Query restricts the candidates j of a search (original numbering).
//
// Self is the index of the query point when it belongs to the index; candidates with
// |Self − j| <= Theiler are excluded (Theiler 0 excludes only j == Self; a negative Theiler is
// treated as 0). Self < 0 means the query point is not in the index and nothing is excluded by
// the window. Only candidates with Lo <= j < Hi are considered; Hi == 0 means Len(), Lo < 0 is
// treated as 0 and Hi > Len() as Len().
type Query struct {
	Self, Theiler, Lo, Hi int
}

// cand is a candidate neighbour: comparison key (see Index.key) and original index.
type cand struct {
	key float64
	idx int32
}

func cmpCand(a, b cand) int {
	if c := cmp.Compare(a.key, b.key); c != 0 {
		return c
	}
	return cmp.Compare(a.idx, b.idx)
}

// A Searcher runs queries against one Index. It holds the scratch space of one goroutine, so
// that queries allocate nothing once dst buffers have grown; use one Searcher per goroutine.
type Searcher struct {
	ix  *Index
	q   []float64
	off []float64 // per-dimension lower bound of |q_d − p_d| over the current subtree

	// candidate filter: j is admissible when lo <= j < hi and not wlo <= j <= whi
	lo, hi   int
	wlo, whi int
	span     uint // hi − lo
	wspan    uint // whi − wlo

	nbuf []Neighbor // scratch of the all-points drivers

	// k nearest neighbours: best is sorted by (key, idx) and holds at most k entries
	k         int
	best      []cand
	worstKey  float64
	worstIdx  int
	thresh    float64 // radius threshold (key units)
	cands     []cand
	count     int
	countOnly bool
}

// NewSearcher returns a Searcher over ix.
func (ix *Index) NewSearcher() *Searcher {
	return &Searcher{ix: ix, off: make([]float64, ix.dim)}
}

// Index returns the index the Searcher searches.
func (s *Searcher) Index() *Index { return s.ix }

// setup prepares the filter and the root offsets; it reports false when no candidate can exist.
func (s *Searcher) setup(q []float64, opt Query) bool {
	ix := s.ix
	if ix.n == 0 {
		return false
	}
	if len(q) < ix.dim {
		panic("neighbors: query point has fewer coordinates than the index dimension")
	}
	s.q = q[:ix.dim]
	s.lo, s.hi = max(opt.Lo, 0), opt.Hi
	if s.hi == 0 || s.hi > ix.n {
		s.hi = ix.n
	}
	if s.lo >= s.hi {
		return false
	}
	if opt.Self >= 0 {
		w := max(opt.Theiler, 0)
		s.wlo, s.whi = opt.Self-w, opt.Self+w
	} else {
		s.wlo, s.whi = -2, -2 // j − (−2) > 0 for every j >= 0
	}
	s.span, s.wspan = uint(s.hi-s.lo), uint(s.whi-s.wlo)
	return true
}

// admissible reports whether original index j passes the filter.
func (s *Searcher) admissible(j int) bool {
	return uint(j-s.lo) < s.span && uint(j-s.wlo) > s.wspan
}

// excludedNode reports whether every point of nd fails the filter.
func (s *Searcher) excludedNode(nd *node) bool {
	mn, mx := int(nd.minIdx), int(nd.maxIdx)
	return mx < s.lo || mn >= s.hi || (mn >= s.wlo && mx <= s.whi)
}

// clearNode reports whether every point of nd passes the filter.
func (s *Searcher) clearNode(nd *node) bool {
	mn, mx := int(nd.minIdx), int(nd.maxIdx)
	return mn >= s.lo && mx < s.hi && (mx < s.wlo || mn > s.whi)
}

// rootOffsets fills s.off with the distances from q to the root box per dimension and returns
// the resulting lower bound (key units).
func (s *Searcher) rootOffsets() float64 {
	dim := s.ix.dim
	lo := s.ix.box[:dim]
	hi := s.ix.box[dim : 2*dim]
	for d, v := range s.q {
		s.off[d] = max(0, lo[d]-v, v-hi[d])
	}
	return s.bound()
}

// bound returns the lower bound implied by s.off, with the operations of Index.key.
func (s *Searcher) bound() float64 {
	var b float64
	if s.ix.norm == Euclidean {
		for _, t := range s.off {
			b += float64(t * t)
		}
		return b
	}
	for _, t := range s.off {
		b = max(b, t)
	}
	return b
}

// KNN appends to dst[:0] the k nearest admissible neighbours of q, sorted by (Dist, Index), and
// returns it. Fewer than k are returned when there are not enough candidates.
func (s *Searcher) KNN(q []float64, k int, opt Query, dst []Neighbor) []Neighbor {
	dst = dst[:0]
	if k <= 0 || !s.setup(q, opt) {
		return dst
	}
	s.k = k
	s.best = s.best[:0]
	s.worstKey, s.worstIdx = math.Inf(1), math.MaxInt
	rd := s.rootOffsets()
	s.knn(0, rd)
	for _, c := range s.best {
		dst = append(dst, Neighbor{Index: int(c.idx), Dist: s.ix.dist(c.key)})
	}
	return dst
}

// boundSlack is the relative error allowed for the incrementally updated Euclidean lower bound:
// each update rd − old² + new² errs by a few units in the last place of the (nondecreasing)
// bound, and a path has fewer than 64 updates. Decisions within the slack use the exact sum.
const boundSlack = 1e-12

// childBound returns the lower bound of a child whose offset in one dimension grows from old to
// off, given the parent's bound rd: exact for the maximum norm, within boundSlack otherwise.
func (s *Searcher) childBound(rd, old, off float64) float64 {
	if s.ix.norm == Max {
		return fmax(rd, off)
	}
	return rd + (float64(off*off) - float64(old*old))
}

// exactBound returns the bound to compare with t: rd itself when it is exact or clearly on one
// side of t, otherwise the exact sum over s.off.
func (s *Searcher) exactBound(rd, t float64) float64 {
	if s.ix.norm == Max || rd > t*(1+boundSlack) || rd < t*(1-boundSlack) {
		return rd
	}
	return s.bound()
}

// pruneKNN reports whether a subtree with (approximate) lower bound rd cannot improve the
// current k best.
func (s *Searcher) pruneKNN(nd *node, rd float64) bool {
	if s.excludedNode(nd) {
		return true
	}
	b := s.exactBound(rd, s.worstKey)
	return b > s.worstKey || (b == s.worstKey && int(nd.minIdx) > s.worstIdx)
}

func (s *Searcher) knn(id int32, rd float64) {
	ix := s.ix
	nd := &ix.nodes[id]
	if nd.left < 0 {
		s.leafKNN(nd)
		return
	}
	d := nd.split
	qd := s.q[d]
	old := s.off[d]
	offL := fmax(old, qd-nd.lmax)
	offR := fmax(old, nd.rmin-qd)
	first, second := nd.left, nd.right
	offF, offS := offL, offR
	if offR < offL || (offR == offL && qd-nd.lmax > nd.rmin-qd) {
		first, second = second, first
		offF, offS = offS, offF
	}
	s.visitKNN(first, d, old, offF, rd)
	s.visitKNN(second, d, old, offS, rd)
}

// visitKNN descends into child id whose offset in dimension d is off (parent offset old and
// parent bound rd).
func (s *Searcher) visitKNN(id int32, d int32, old, off, rd float64) {
	nd := &s.ix.nodes[id]
	if off != old {
		s.off[d] = off
		rd = s.childBound(rd, old, off)
	}
	if !s.pruneKNN(nd, rd) {
		s.knn(id, rd)
	}
	s.off[d] = old
}

func (s *Searcher) leafKNN(nd *node) {
	ix := s.ix
	dim := ix.dim
	start, end := int(nd.start), int(nd.end)
	perm := ix.perm[start:end]
	pts := ix.pts[start*dim : end*dim]
	q := s.q[:dim]
	euclid := ix.norm == Euclidean
	lo, span, wlo, wspan := s.lo, s.span, s.wlo, s.wspan
points:
	for c, j32 := range perm {
		j := int(j32)
		if uint(j-lo) >= span || uint(j-wlo) <= wspan {
			continue
		}
		row := pts[c*dim : c*dim+dim]
		row = row[:len(q)]
		worst := s.worstKey
		var key float64
		if euclid {
			for d, v := range q {
				t := v - row[d]
				key += float64(t * t)
				if key > worst {
					continue points
				}
			}
		} else {
			for d, v := range q {
				t := math.Abs(v - row[d])
				if t > key {
					if t > worst {
						continue points
					}
					key = t
				}
			}
		}
		if key == worst && j > s.worstIdx {
			continue
		}
		s.insert(cand{key, int32(j)})
	}
}

// insert puts c into the sorted best list, dropping the worst entry when it is full.
func (s *Searcher) insert(c cand) {
	b := s.best
	if len(b) < s.k {
		b = append(b, c)
	} else {
		b[len(b)-1] = c
	}
	i := len(b) - 1
	for ; i > 0 && (c.key < b[i-1].key || (c.key == b[i-1].key && c.idx < b[i-1].idx)); i-- {
		b[i] = b[i-1]
	}
	b[i] = c
	s.best = b
	if len(b) == s.k {
		s.worstKey, s.worstIdx = b[len(b)-1].key, int(b[len(b)-1].idx)
	}
}

// Radius appends to dst[:0] every admissible neighbour of q with Dist <= r, sorted by
// (Dist, Index), and returns it.
func (s *Searcher) Radius(q []float64, r float64, opt Query, dst []Neighbor) []Neighbor {
	dst = dst[:0]
	t := s.ix.threshold(r)
	if t < 0 || !s.setup(q, opt) {
		return dst
	}
	s.thresh = t
	s.cands = s.cands[:0]
	s.countOnly = false
	rd := s.rootOffsets()
	if rd <= t {
		s.radius(0, rd)
	}
	slices.SortFunc(s.cands, cmpCand)
	for _, c := range s.cands {
		dst = append(dst, Neighbor{Index: int(c.idx), Dist: s.ix.dist(c.key)})
	}
	return dst
}

// Count returns the number of admissible neighbours of q with Dist <= r. Subtrees whose box lies
// within r and whose points are all admissible are counted without visiting their points.
func (s *Searcher) Count(q []float64, r float64, opt Query) int {
	t := s.ix.threshold(r)
	if t < 0 || !s.setup(q, opt) {
		return 0
	}
	s.thresh = t
	s.count = 0
	s.countOnly = true
	rd := s.rootOffsets()
	if rd <= t {
		s.radius(0, rd)
	}
	return s.count
}

// farKey returns the largest key from q to any point of node id's box.
func (s *Searcher) farKey(id int32) float64 {
	dim := s.ix.dim
	b := s.ix.box[int(id)*2*dim : int(id)*2*dim+2*dim]
	var f float64
	if s.ix.norm == Euclidean {
		for d, v := range s.q {
			t := max(v-b[d], b[dim+d]-v)
			f += float64(t * t)
		}
		return f
	}
	for d, v := range s.q {
		f = max(f, v-b[d], b[dim+d]-v)
	}
	return f
}

func (s *Searcher) radius(id int32, rd float64) {
	ix := s.ix
	nd := &ix.nodes[id]
	if s.excludedNode(nd) {
		return
	}
	if s.countOnly && s.clearNode(nd) && s.farKey(id) <= s.thresh {
		s.count += int(nd.end - nd.start)
		return
	}
	if nd.left < 0 {
		dim := ix.dim
		for p := int(nd.start); p < int(nd.end); p++ {
			j := int(ix.perm[p])
			if !s.admissible(j) {
				continue
			}
			key := ix.key(s.q, ix.pts[p*dim:p*dim+dim])
			if key <= s.thresh {
				if s.countOnly {
					s.count++
				} else {
					s.cands = append(s.cands, cand{key, int32(j)})
				}
			}
		}
		return
	}
	d := nd.split
	qd := s.q[d]
	old := s.off[d]
	for side := 0; side < 2; side++ {
		child, off := nd.left, fmax(old, qd-nd.lmax)
		if side == 1 {
			child, off = nd.right, fmax(old, nd.rmin-qd)
		}
		crd := rd
		if off != old {
			s.off[d] = off
			crd = s.childBound(rd, old, off)
		}
		if s.exactBound(crd, s.thresh) <= s.thresh {
			s.radius(child, crd)
		}
		s.off[d] = old
	}
}
