package neighbors

import (
	"math"
	"runtime"
	"sort"
	"sync"
	"sync/atomic"

	"unfold/internal/workers"
)

// resolveThreads returns the number of goroutines to use for threads (<= 0: all cores).
func resolveThreads(threads int) int {
	if threads <= 0 {
		threads = runtime.GOMAXPROCS(0)
	}
	return max(threads, 1)
}

// parallel runs over [0, total) in chunks on threads goroutines; each goroutine calls setup once
// with its own Searcher and runs the chunk function setup returns. progress, when not nil, is
// called serially with the number of items done.
func (ix *Index) parallel(total, chunk, threads int, progress func(done, total int), setup func(s *Searcher) func(start, end int)) {
	if total <= 0 {
		return
	}
	threads = min(resolveThreads(threads), (total+chunk-1)/chunk)
	var next atomic.Int64
	var mu sync.Mutex
	done := 0
	work := func() {
		body := setup(ix.NewSearcher())
		for {
			start := int(next.Add(1)-1) * chunk
			if start >= total {
				return
			}
			end := min(start+chunk, total)
			body(start, end)
			if progress != nil {
				mu.Lock()
				done += end - start
				progress(done, total)
				mu.Unlock()
			}
		}
	}
	if threads == 1 {
		work()
		return
	}
	var wg sync.WaitGroup
	var g workers.Guard
	for range threads {
		wg.Go(func() { g.Run(work) })
	}
	wg.Wait()
	g.Repanic()
}

// each turns a chunk body that needs only the goroutine's Searcher into parallel's setup form.
func each(body func(s *Searcher, start, end int)) func(s *Searcher) func(start, end int) {
	return func(s *Searcher) func(start, end int) {
		return func(start, end int) { body(s, start, end) }
	}
}

// chunkFor returns a chunk size for n point queries.
func chunkFor(n int) int { return min(max(n/256, 64), 2048) }

// ForEach runs fn(s, i) once for every point i in [0, Len()) on threads goroutines (<= 0: all
// cores); s is the calling goroutine's own Searcher. The points are visited in chunks in tree
// order (neighbouring points together, for cache locality), not in index order; results that
// fn writes by index are deterministic for any thread count. progress may be nil.
func (ix *Index) ForEach(threads int, progress func(done, total int), fn func(s *Searcher, i int)) {
	ix.parallel(ix.n, chunkFor(ix.n), threads, progress, each(func(s *Searcher, start, end int) {
		for p := start; p < end; p++ {
			fn(s, int(ix.perm[p]))
		}
	}))
}

// ForEachWorker is ForEach for work that needs scratch space of its own beside the Searcher:
// each goroutine calls setup once with its Searcher and runs the function it returns for every
// point it is given, in the same chunks and order as ForEach.
func (ix *Index) ForEachWorker(threads int, progress func(done, total int), setup func(s *Searcher) func(i int)) {
	ix.parallel(ix.n, chunkFor(ix.n), threads, progress, func(s *Searcher) func(start, end int) {
		fn := setup(s)
		return func(start, end int) {
			for p := start; p < end; p++ {
				fn(int(ix.perm[p]))
			}
		}
	})
}

// AllKNN finds the k nearest neighbours of every point i with Theiler window theiler, among the
// candidates j with lo <= j < hi (hi == 0 means Len()), on threads goroutines (<= 0: all cores).
// It returns flat n×k arrays: row i (idx[i*k : (i+1)*k]) holds the neighbours of point i sorted
// by (distance, index); missing entries have index −1 and distance +Inf. The result is identical
// for any thread count. progress may be nil.
func (ix *Index) AllKNN(k int, theiler int, lo, hi int, threads int, progress func(done, total int)) (idx []int32, dist []float64) {
	if k <= 0 {
		return []int32{}, []float64{}
	}
	n := ix.n
	idx = make([]int32, n*k)
	dist = make([]float64, n*k)
	if k == 1 {
		ix.allNN1(theiler, lo, hi, threads, progress, idx, dist)
		return idx, dist
	}
	dim := ix.dim
	ix.parallel(n, chunkFor(n), threads, progress, each(func(s *Searcher, start, end int) {
		buf := s.nbuf
		defer func() { s.nbuf = buf }()
		for p := start; p < end; p++ {
			i := int(ix.perm[p])
			buf = s.KNN(ix.pts[p*dim:p*dim+dim], k, Query{Self: i, Theiler: theiler, Lo: lo, Hi: hi}, buf)
			ri, rd := idx[i*k:i*k+k], dist[i*k:i*k+k]
			for c := range ri {
				if c < len(buf) {
					ri[c], rd[c] = int32(buf[c].Index), buf[c].Dist
				} else {
					ri[c], rd[c] = -1, math.Inf(1)
				}
			}
		}
	}))
	return idx, dist
}

// PairCounts returns, for every radius radii[k], the number of unordered pairs of points i < j
// with j − i > theiler whose distance is <= radii[k]: the pair counts of the correlation sum of
// Grassberger & Procaccia (1983) with Theiler's (1986) window. The counts are exact integers.
// The radii should be ascending (any order is accepted; counts are returned in the order
// given); negative or NaN radii count nothing.
//
// All pairs are counted in one dual-tree traversal over the radii at once, in which two nodes
// whose boxes are separated by distances falling between the same consecutive radii are counted
// as a whole without visiting their points (Gray & Moore 2001); the pairs inside the window are
// then counted directly and subtracted. Work runs on threads goroutines (<= 0: all cores);
// progress may be nil.
func (ix *Index) PairCounts(radii []float64, theiler int, threads int, progress func(done, total int)) []int64 {
	out := make([]int64, len(radii))
	n := ix.n
	if n < 2 || len(radii) == 0 {
		return out
	}
	// Sorted thresholds in key units; bin b of a key is the first sorted threshold >= key.
	order, ts := ix.sortedThresholds(radii)
	pc := pairCounter{ix: ix, ts: ts, tmax: ts[len(ts)-1]}
	if pc.tmax < 0 {
		return out
	}

	// Plan: the top of the traversal runs here and emits tasks of bounded size.
	top := make([]int64, len(ts)+1)
	var tasks []pairTask
	cutoff := max(4*leafSize, n/512)
	pc.plan(0, -1, cutoff, top, &tasks)

	w := max(theiler, 0)
	w = min(w, n-1)
	nw := 0
	if w > 0 {
		nw = (n + 1023) / 1024
	}
	total := len(tasks) + nw
	threads = resolveThreads(threads)
	hists := newHists(threads, len(ts)+1)
	var next atomic.Int64
	var mu sync.Mutex
	done := 0
	tick := func() {
		if progress != nil {
			mu.Lock()
			done++
			progress(done, total)
			mu.Unlock()
		}
	}
	work := func(h []int64) {
		for {
			t := int(next.Add(1) - 1)
			if t >= total {
				return
			}
			if t < len(tasks) {
				tk := tasks[t]
				if tk.b < 0 {
					pc.self(tk.a, h)
				} else {
					pc.cross(tk.a, tk.b, h)
				}
			} else {
				// Pairs inside the window, subtracted: (i, i+l), 1 <= l <= w.
				start := (t - len(tasks)) * 1024
				end := min(start+1024, n)
				for i := start; i < end; i++ {
					a := ix.Coords(i)
					for j := i + 1; j <= min(i+w, n-1); j++ {
						if b := pc.bin(ix.key(a, ix.Coords(j)), 0); b < len(ts) {
							h[b]--
						}
					}
				}
			}
			tick()
		}
	}
	if threads == 1 {
		work(hists[0])
	} else {
		var wg sync.WaitGroup
		var g workers.Guard
		for t := range threads {
			h := hists[t]
			wg.Go(func() { g.Run(func() { work(h) }) })
		}
		wg.Wait()
		g.Repanic()
	}
	cumulate(out, order, top, hists)
	return out
}

// pairTask is a unit of PairCounts work: the pairs within node a (b < 0) or between a and b.
type pairTask struct{ a, b int32 }

// pairCounter holds the sorted thresholds of one PairCounts call.
type pairCounter struct {
	ix   *Index
	ts   []float64
	tmax float64
}

// bin returns the first threshold index >= from whose value is >= key (len(ts) if none).
func (pc *pairCounter) bin(key float64, from int) int {
	b := from
	for b < len(pc.ts) && pc.ts[b] < key {
		b++
	}
	return b
}

func (pc *pairCounter) size(id int32) int64 {
	nd := &pc.ix.nodes[id]
	return int64(nd.end - nd.start)
}

// boxKeys returns the smallest and largest keys between any point of box a and any of box b.
func (pc *pairCounter) boxKeys(a, b int32) (lo, hi float64) {
	dim := pc.ix.dim
	ba := pc.ix.box[int(a)*2*dim : int(a)*2*dim+2*dim]
	bb := pc.ix.box[int(b)*2*dim : int(b)*2*dim+2*dim]
	if pc.ix.norm == Euclidean {
		for d := range dim {
			g := max(0, bb[d]-ba[dim+d], ba[d]-bb[dim+d])
			f := max(ba[dim+d]-bb[d], bb[dim+d]-ba[d])
			lo += float64(g * g)
			hi += float64(f * f)
		}
		return lo, hi
	}
	for d := range dim {
		lo = max(lo, bb[d]-ba[dim+d], ba[d]-bb[dim+d])
		hi = max(hi, ba[dim+d]-bb[d], bb[dim+d]-ba[d])
	}
	return lo, hi
}

// plan runs the traversal of self(a) (b < 0) or cross(a, b) down to nodes of at most cutoff
// points, resolving whole node pairs into h and appending the rest to tasks.
func (pc *pairCounter) plan(a, b int32, cutoff int, h []int64, tasks *[]pairTask) {
	nodes := pc.ix.nodes
	if b < 0 {
		na := &nodes[a]
		if pc.size(a) <= int64(cutoff) || na.left < 0 {
			*tasks = append(*tasks, pairTask{a, -1})
			return
		}
		_, hi := pc.boxKeys(a, a)
		if k := pc.bin(hi, 0); k == pc.bin(0, 0) {
			if k < len(pc.ts) {
				s := pc.size(a)
				h[k] += s * (s - 1) / 2
			}
			return
		}
		pc.plan(na.left, -1, cutoff, h, tasks)
		pc.plan(na.right, -1, cutoff, h, tasks)
		pc.plan(na.left, na.right, cutoff, h, tasks)
		return
	}
	lo, hi := pc.boxKeys(a, b)
	kl := pc.bin(lo, 0)
	if kl == len(pc.ts) {
		return
	}
	if kh := pc.bin(hi, kl); kh == kl {
		h[kl] += pc.size(a) * pc.size(b)
		return
	}
	sa, sb := pc.size(a), pc.size(b)
	if sa <= int64(cutoff) && sb <= int64(cutoff) {
		*tasks = append(*tasks, pairTask{a, b})
		return
	}
	na, nb := &nodes[a], &nodes[b]
	if nb.left >= 0 && (sb > sa || na.left < 0) {
		pc.plan(a, nb.left, cutoff, h, tasks)
		pc.plan(a, nb.right, cutoff, h, tasks)
		return
	}
	pc.plan(na.left, b, cutoff, h, tasks)
	pc.plan(na.right, b, cutoff, h, tasks)
}

// self counts the pairs within node a into h.
func (pc *pairCounter) self(a int32, h []int64) {
	ix := pc.ix
	na := &ix.nodes[a]
	if na.left < 0 {
		dim := ix.dim
		for p := int(na.start); p < int(na.end); p++ {
			x := ix.pts[p*dim : p*dim+dim]
			for q := p + 1; q < int(na.end); q++ {
				if k := pc.bin(ix.key(x, ix.pts[q*dim:q*dim+dim]), 0); k < len(pc.ts) {
					h[k]++
				}
			}
		}
		return
	}
	_, hi := pc.boxKeys(a, a)
	if k := pc.bin(hi, 0); k == pc.bin(0, 0) {
		if k < len(pc.ts) {
			s := pc.size(a)
			h[k] += s * (s - 1) / 2
		}
		return
	}
	pc.self(na.left, h)
	pc.self(na.right, h)
	pc.cross(na.left, na.right, h)
}

// cross counts the pairs between nodes a and b into h.
func (pc *pairCounter) cross(a, b int32, h []int64) {
	ix := pc.ix
	lo, hi := pc.boxKeys(a, b)
	kl := pc.bin(lo, 0)
	if kl == len(pc.ts) {
		return
	}
	if kh := pc.bin(hi, kl); kh == kl {
		h[kl] += pc.size(a) * pc.size(b)
		return
	}
	na, nb := &ix.nodes[a], &ix.nodes[b]
	if na.left < 0 && nb.left < 0 {
		pc.leafPairs(na, b, kl, h)
		return
	}
	sa, sb := na.end-na.start, nb.end-nb.start
	if nb.left >= 0 && (sb > sa || na.left < 0) {
		pc.cross(a, nb.left, h)
		pc.cross(a, nb.right, h)
		return
	}
	pc.cross(na.left, b, h)
	pc.cross(na.right, b, h)
}

// pointBoxKeys returns the smallest and largest keys between point x and any point of box id.
func (pc *pairCounter) pointBoxKeys(x []float64, id int32) (lo, hi float64) {
	dim := pc.ix.dim
	b := pc.ix.box[int(id)*2*dim : int(id)*2*dim+2*dim]
	bl, bh := b[:len(x)], b[dim:dim+len(x)]
	euclid := pc.ix.norm == Euclidean
	for d, v := range x {
		a, c := bl[d]-v, v-bh[d] // at most one is positive
		g := fmax(fmax(a, c), 0)
		f := fmax(-a, -c)
		if euclid {
			lo += float64(g * g)
			hi += float64(f * f)
		} else {
			lo, hi = fmax(lo, g), fmax(hi, f)
		}
	}
	return lo, hi
}

// fmax is max for numbers that are never NaN (cheaper than the builtin, which orders NaN and −0).
func fmax(a, b float64) float64 {
	if a > b {
		return a
	}
	return b
}

// leafPairs counts the pairs between leaf na and leaf b, whose keys lie in bins >= kl: each
// point of na is first compared with b's box, so that b is counted whole when it can be.
func (pc *pairCounter) leafPairs(na *node, b int32, kl int, h []int64) {
	ix := pc.ix
	dim := ix.dim
	nb := &ix.nodes[b]
	sb := int64(nb.end - nb.start)
	K := len(pc.ts)
	euclid := ix.norm == Euclidean
	rows := ix.pts[int(nb.start)*dim : int(nb.end)*dim]
	for p := int(na.start); p < int(na.end); p++ {
		x := ix.pts[p*dim : p*dim+dim]
		lo, hi := pc.pointBoxKeys(x, b)
		k1 := pc.bin(lo, kl)
		if k1 == K {
			continue
		}
		k2 := pc.bin(hi, k1)
		if k1 == k2 {
			h[k1] += sb
			continue
		}
		// Keys of this point's pairs lie in bins k1 … k2 (k2 may be K: beyond every radius).
		// The key loops repeat Index.key (same operations, same order) so that they inline.
		for c := 0; c+dim <= len(rows); c += dim {
			r := rows[c : c+dim]
			r = r[:len(x)]
			var key float64
			if euclid {
				for d, v := range x {
					t := v - r[d]
					key += float64(t * t)
				}
			} else {
				for d, v := range x {
					if t := math.Abs(v - r[d]); t > key {
						key = t
					}
				}
			}
			k := k1
			for k < k2 && pc.ts[k] < key {
				k++
			}
			if k < K {
				h[k]++
			}
		}
	}
}

// ReferencePairCounts returns, for every radius radii[k], the number of ordered pairs (i, j)
// with i one of the reference points refs, j any point with |i − j| > theiler, and distance
// <= radii[k]: the pair counts of a correlation sum estimated from a sample of reference
// points against all partners. Each reference point costs one traversal of the tree that
// counts whole subtrees lying between two consecutive radii without visiting their points and
// never descends beyond the largest radius, so the cost is about len(refs)·(log N + the
// number of points near a radius' sphere), not N²; the 2·theiler+1 pairs inside each
// reference's window are then counted directly and subtracted. The counts are exact integers for the
// given references and do not depend on threads (<= 0: all cores). Radii may be in any
// order; negative or NaN radii count nothing. progress may be nil.
func (ix *Index) ReferencePairCounts(refs []int, radii []float64, theiler int, threads int, progress func(done, total int)) []int64 {
	out := make([]int64, len(radii))
	if ix.n < 2 || len(radii) == 0 || len(refs) == 0 {
		return out
	}
	order, ts := ix.sortedThresholds(radii)
	if ts[len(ts)-1] < 0 {
		return out
	}
	threads = resolveThreads(threads)
	hists := newHists(threads, len(ts)+1)
	w := max(theiler, 0)
	var slot atomic.Int64
	chunk := max(min(len(refs)/(8*threads), 256), 1)
	ix.parallel(len(refs), chunk, threads, progress, func(s *Searcher) func(start, end int) {
		h := hists[int(slot.Add(1)-1)]
		return func(start, end int) {
			for _, i := range refs[start:end] {
				s.countReference(i, w, ts, h)
			}
		}
	})
	top := make([]int64, len(ts)+1)
	cumulate(out, order, top, hists)
	return out
}

// sortedThresholds returns the thresholds of radii in key units in ascending order (ts) and,
// for each, the index of its radius (order: ts[i] is the threshold of radii[order[i]]); ties
// keep the order of radii.
func (ix *Index) sortedThresholds(radii []float64) (order []int, ts []float64) {
	order = make([]int, len(radii))
	for i := range order {
		order[i] = i
	}
	th := make([]float64, len(radii))
	for i, r := range radii {
		th[i] = ix.threshold(r)
	}
	sort.SliceStable(order, func(a, b int) bool { return th[order[a]] < th[order[b]] })
	ts = make([]float64, len(radii))
	for i, o := range order {
		ts[i] = th[o]
	}
	return order, ts
}

// newHists returns one histogram of bins counts per thread.
func newHists(threads, bins int) [][]int64 {
	hists := make([][]int64, threads)
	for t := range hists {
		hists[t] = make([]int64, bins)
	}
	return hists
}

// cumulate adds the threads' histograms to top and writes the cumulative counts to out in
// the order of the radii: out[order[i]] = top[0] + … + top[i].
func cumulate(out []int64, order []int, top []int64, hists [][]int64) {
	for _, h := range hists {
		for b := range top {
			top[b] += h[b]
		}
	}
	var cum int64
	for i, o := range order {
		cum += top[i]
		out[o] = cum
	}
}

// countReference adds to h[b] the pairs of reference i whose key lies in bin b of the
// ascending thresholds ts, less the pairs inside its Theiler window w (i itself included); a
// reference outside the index counts nothing. All points are counted (kd-tree nodes mix
// distant times, so the window would keep every node from being counted whole); the pairs
// inside the window are then counted directly and subtracted. It allocates nothing.
func (s *Searcher) countReference(i, w int, ts []float64, h []int64) {
	ix := s.ix
	if i < 0 || i >= ix.n {
		return
	}
	a := ix.Coords(i)
	s.binCounts(a, ts, Query{Self: -1}, h)
	for j := max(i-w, 0); j <= min(i+w, ix.n-1); j++ {
		k := 0
		for key := ix.key(a, ix.Coords(j)); k < len(ts) && ts[k] < key; k++ {
		}
		if k < len(ts) {
			h[k]--
		}
	}
}

// binCounts adds to h[b] the number of admissible points whose key lies in bin b of the
// ascending thresholds ts (bin b: ts[b−1] < key <= ts[b]); points beyond the last threshold are
// not counted and subtrees beyond it are never visited.
func (s *Searcher) binCounts(q []float64, ts []float64, opt Query, h []int64) {
	if !s.setup(q, opt) {
		return
	}
	s.thresh = ts[len(ts)-1]
	rd := s.rootOffsets()
	if rd <= s.thresh {
		s.binNode(0, rd, ts, 0, len(ts), h)
	}
}

// boxKeys returns the smallest and largest keys from the query point to node id's box,
// computed with the operations of Index.key, so they bound every point's key exactly.
func (s *Searcher) boxKeys(id int32) (lo, hi float64) {
	dim := s.ix.dim
	b := s.ix.box[int(id)*2*dim : int(id)*2*dim+2*dim]
	bl, bh := b[:len(s.q)], b[dim:dim+len(s.q)]
	if s.ix.norm == Euclidean {
		for d, v := range s.q {
			a, c := bl[d]-v, v-bh[d]
			g := fmax(fmax(a, c), 0)
			f := fmax(-a, -c)
			lo += float64(g * g)
			hi += float64(f * f)
		}
		return lo, hi
	}
	for d, v := range s.q {
		a, c := bl[d]-v, v-bh[d]
		lo = fmax(lo, fmax(a, c))
		hi = fmax(hi, fmax(-a, -c))
	}
	return lo, hi
}

// binNode counts node id's points into h; the keys of its points lie in bins kmin … kmax (the
// parent's range: a child's box lies inside its parent's).
func (s *Searcher) binNode(id int32, rd float64, ts []float64, kmin, kmax int, h []int64) {
	ix := s.ix
	nd := &ix.nodes[id]
	if s.excludedNode(nd) {
		return
	}
	K := len(ts)
	// Tight keys from the node's box (the descent bound rd uses the cells' split planes only).
	lo, hi := s.boxKeys(id)
	k1 := kmin
	for k1 < kmax && ts[k1] < lo {
		k1++
	}
	if k1 == K {
		return
	}
	k2 := k1
	for k2 < kmax && ts[k2] < hi {
		k2++
	}
	if k2 == k1 && s.clearNode(nd) {
		h[k1] += int64(nd.end - nd.start)
		return
	}
	if nd.left < 0 {
		dim := ix.dim
		q := s.q[:dim]
		euclid := ix.norm == Euclidean
		lo, span, wlo, wspan := s.lo, s.span, s.wlo, s.wspan
		tmax := s.thresh
		for p := int(nd.start); p < int(nd.end); p++ {
			j := int(ix.perm[p])
			if uint(j-lo) >= span || uint(j-wlo) <= wspan {
				continue
			}
			row := ix.pts[p*dim : p*dim+dim]
			row = row[:len(q)]
			var key float64
			if euclid {
				for d, v := range q {
					t := v - row[d]
					key += float64(t * t)
				}
			} else {
				for d, v := range q {
					if t := math.Abs(v - row[d]); t > key {
						key = t
					}
				}
			}
			if key > tmax {
				continue
			}
			k := k1
			for k < k2 && ts[k] < key {
				k++
			}
			h[k]++
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
			s.binNode(child, crd, ts, k1, k2, h)
		}
		s.off[d] = old
	}
}

// ReferencePairCountsUntil is ReferencePairCounts for ascending radii in which each radius
// stops early: the references are counted in the order given, in batches of batch references
// (the last one shorter), and after every batch, starting from the largest radius still
// counted, a radius k stops when stop(k, used, count) reports true, where used is the number
// of references counted so far and count the pairs within radii[k] so far (stopping goes
// down from the top and ends at the first radius that continues, so the radii still counted
// are always a prefix and no traversal goes beyond the largest of them). It returns the pair
// counts and, per radius, the number of references, a prefix of refs, they were counted
// over. Batches are split among threads (<= 0: all cores) and stop decisions are taken
// between batches on integer totals, so the result does not depend on threads. progress may
// be nil; it is called with references done.
func (ix *Index) ReferencePairCountsUntil(refs []int, radii []float64, theiler, batch int, stop func(k, used int, count int64) bool, threads int, progress func(done, total int)) (counts []int64, used []int) {
	K := len(radii)
	counts = make([]int64, K)
	used = make([]int, K)
	if ix.n < 2 || K == 0 || len(refs) == 0 {
		return counts, used
	}
	ts := make([]float64, K)
	for k, r := range radii {
		ts[k] = ix.threshold(r)
		if k > 0 && !(ts[k] >= ts[k-1]) {
			panic("neighbors: ReferencePairCountsUntil needs ascending radii")
		}
	}
	active := K
	for active > 0 && ts[active-1] < 0 {
		active--
	}
	batch = max(batch, 1)
	threads = resolveThreads(threads)
	w := max(theiler, 0)
	hists := newHists(threads, K+1)
	searchers := make([]*Searcher, threads)
	for t := range searchers {
		searchers[t] = ix.NewSearcher()
	}
	done := 0
	for start := 0; start < len(refs) && active > 0; start += batch {
		part := refs[start:min(start+batch, len(refs))]
		tsa := ts[:active]
		body := func(t int) {
			s, h := searchers[t], hists[t]
			for c := t; c < len(part); c += threads {
				s.countReference(part[c], w, tsa, h)
			}
		}
		if threads == 1 || len(part) == 1 {
			body(0)
		} else {
			var wg sync.WaitGroup
			var g workers.Guard
			for t := range min(threads, len(part)) {
				wg.Go(func() { g.Run(func() { body(t) }) })
			}
			wg.Wait()
			g.Repanic()
		}
		var cum int64
		for k := range active {
			for _, h := range hists {
				cum += h[k]
				h[k] = 0
			}
			counts[k] += cum
			used[k] += len(part)
		}
		done += len(part)
		if progress != nil {
			progress(done, len(refs))
		}
		for active > 0 && stop(active-1, used[active-1], counts[active-1]) {
			active--
		}
	}
	return counts, used
}
