package neighbors

import (
	"errors"
	"math"
	"math/rand/v2"
	"slices"
	"strings"
	"sync"
	"testing"
)

// dataset is one point set of the property tests.
type dataset struct {
	name string
	pts  []float64
	dim  int
}

// datasets returns random, duplicated and attractor point sets of dimension dim.
func datasets(rng *rand.Rand, n, dim int) []dataset {
	u := uniform(rng, n, dim)
	ds := []dataset{
		{"uniform", u, dim},
		{"duplicates", withDuplicates(rng, u, dim), dim},
		{"henon", delay(henonX(n+dim-1), 1, dim), dim},
	}
	lag := 5
	ds = append(ds, dataset{"lorenz", delay(lorenzX(n+(dim-1)*lag, 0.02), lag, dim), dim})
	return ds
}

func equalNeighbors(a, b []Neighbor) bool {
	if len(a) != len(b) {
		return false
	}
	for i := range a {
		if a[i].Index != b[i].Index || a[i].Dist != b[i].Dist {
			return false
		}
	}
	return true
}

// randomQuery draws a query restriction: Theiler 0…100, sometimes an index range.
func randomQuery(rng *rand.Rand, n, self int) Query {
	q := Query{Self: self, Theiler: rng.IntN(101)}
	if rng.IntN(4) == 0 {
		q.Theiler = 0
	}
	switch rng.IntN(5) {
	case 0:
		q.Lo = rng.IntN(n / 2)
	case 1:
		q.Hi = n/2 + rng.IntN(n/2)
	case 2:
		q.Lo, q.Hi = rng.IntN(n/3), n/3+rng.IntN(n/3)+1
	}
	return q
}

// TestKNNRadiusCountMatchBruteForce is the property test of the issue: for random, duplicated
// and attractor data (m = 1…12, both norms, k = 1…20, w = 0…100) the tree returns exactly the
// brute-force neighbour lists, distances and counts (exact result: both enumerate the same
// finite set).
func TestKNNRadiusCountMatchBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	n := 700
	queries := 60
	if testing.Short() {
		queries = 20
	}
	for dim := 1; dim <= 12; dim++ {
		for _, ds := range datasets(rng, n, dim) {
			for _, norm := range []Norm{Euclidean, Max} {
				ix, err := Build(ds.pts, dim, norm)
				if err != nil {
					t.Fatal(err)
				}
				s := ix.NewSearcher()
				var got []Neighbor
				q := make([]float64, dim)
				for range queries {
					self := rng.IntN(n)
					copy(q, ds.pts[self*dim:self*dim+dim])
					if rng.IntN(6) == 0 { // a point outside the index, near the data
						self = -1
						for d := range q {
							q[d] += rng.NormFloat64() * 0.05
						}
					}
					opt := randomQuery(rng, n, self)
					k := 1 + rng.IntN(20)
					want := bruteKNN(ds.pts, dim, norm, q, k, opt)
					got = s.KNN(q, k, opt, got)
					if !equalNeighbors(got, want) {
						t.Fatalf("%s m=%d %v KNN k=%d %+v:\n got %v\nwant %v", ds.name, dim, norm, k, opt, got, want)
					}
					// Radius at exactly the k-th distance, so that ties at the boundary occur.
					if len(want) == 0 {
						continue
					}
					r := want[len(want)-1].Dist
					if rng.IntN(3) == 0 {
						r *= 1.5
					}
					wantR := bruteRadius(ds.pts, dim, norm, q, r, opt)
					got = s.Radius(q, r, opt, got)
					if !equalNeighbors(got, wantR) {
						t.Fatalf("%s m=%d %v Radius r=%v %+v:\n got %v\nwant %v", ds.name, dim, norm, r, opt, got, wantR)
					}
					if c := s.Count(q, r, opt); c != len(wantR) {
						t.Fatalf("%s m=%d %v Count r=%v %+v: got %d want %d", ds.name, dim, norm, r, opt, c, len(wantR))
					}
				}
			}
		}
	}
}

// TestPairCountsMatchBruteForce: the dual-tree histogram equals the O(N²) pair count exactly,
// with radii placed exactly on pair distances (exact result: same finite set of pairs).
func TestPairCountsMatchBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	n := 900
	for _, dim := range []int{1, 2, 3, 5, 8, 12} {
		for _, ds := range datasets(rng, n, dim) {
			for _, norm := range []Norm{Euclidean, Max} {
				ix, err := Build(ds.pts, dim, norm)
				if err != nil {
					t.Fatal(err)
				}
				var radii []float64
				for range 12 {
					i, j := rng.IntN(n), rng.IntN(n)
					radii = append(radii, bruteDist(ds.pts[i*dim:i*dim+dim], ds.pts[j*dim:j*dim+dim], norm))
				}
				radii = append(radii, 0, -1, math.Inf(1), 1e-300)
				slices.Sort(radii)
				for _, w := range []int{0, 1, 7, 100} {
					want := brutePairs(ds.pts, dim, norm, radii, w)
					for _, threads := range []int{1, 2} {
						got := ix.PairCounts(radii, w, threads, nil)
						if !slices.Equal(got, want) {
							t.Fatalf("%s m=%d %v w=%d threads=%d:\n got %v\nwant %v", ds.name, dim, norm, w, threads, got, want)
						}
					}
				}
			}
		}
	}
}

// TestPairCountsUnsortedRadii: counts come back in the order of the radii given.
func TestPairCountsUnsortedRadii(t *testing.T) {
	rng := rand.New(rand.NewPCG(5, 6))
	pts := uniform(rng, 500, 3)
	ix, _ := Build(pts, 3, Max)
	radii := []float64{0.3, 0.05, 0.9, 0.1}
	got := ix.PairCounts(radii, 2, 1, nil)
	want := brutePairs(pts, 3, Max, radii, 2)
	if !slices.Equal(got, want) {
		t.Fatalf("got %v want %v", got, want)
	}
}

// TestAllKNNThreadsAndBrute: AllKNN is identical for 1 and 2 threads and equals brute force,
// including missing entries when the window leaves fewer than k candidates.
func TestAllKNNThreadsAndBrute(t *testing.T) {
	x := lorenzX(3000, 0.01)
	for _, norm := range []Norm{Euclidean, Max} {
		for _, tc := range []struct{ k, w, lo, hi int }{{1, 50, 0, 0}, {10, 50, 0, 0}, {4, 0, 0, 2000}, {3, 10, 100, 0}} {
			ix, err := FromEmbedding(x, 10, 3, norm)
			if err != nil {
				t.Fatal(err)
			}
			i1, d1 := ix.AllKNN(tc.k, tc.w, tc.lo, tc.hi, 1, nil)
			calls := 0
			last := 0
			i2, d2 := ix.AllKNN(tc.k, tc.w, tc.lo, tc.hi, 2, func(done, total int) {
				calls++
				if done < last || total != ix.Len() {
					t.Errorf("progress %d/%d after %d", done, total, last)
				}
				last = done
			})
			if !slices.Equal(i1, i2) || !slices.Equal(d1, d2) {
				t.Fatalf("%v %+v: threads 1 and 2 differ", norm, tc)
			}
			if calls == 0 || last != ix.Len() {
				t.Fatalf("progress called %d times, last %d", calls, last)
			}
			pts := delay(x, 10, 3)
			for i := 0; i < ix.Len(); i += 37 {
				want := bruteKNN(pts, 3, norm, pts[i*3:i*3+3], tc.k, Query{Self: i, Theiler: tc.w, Lo: tc.lo, Hi: tc.hi})
				for c := range tc.k {
					wi, wd := int32(-1), math.Inf(1)
					if c < len(want) {
						wi, wd = int32(want[c].Index), want[c].Dist
					}
					if i1[i*tc.k+c] != wi || d1[i*tc.k+c] != wd {
						t.Fatalf("%v %+v point %d col %d: got (%d,%v) want (%d,%v)", norm, tc, i, c, i1[i*tc.k+c], d1[i*tc.k+c], wi, wd)
					}
				}
			}
		}
	}
	// Window wider than the data: every entry missing.
	ix, _ := Build([]float64{0, 1, 2, 3}, 1, Euclidean)
	idx, dist := ix.AllKNN(2, 10, 0, 0, 2, nil)
	for c := range idx {
		if idx[c] != -1 || !math.IsInf(dist[c], 1) {
			t.Fatalf("entry %d: (%d,%v), want (-1,+Inf)", c, idx[c], dist[c])
		}
	}
}

// TestForEachVisitsEveryPointOnce and gives each goroutine a working Searcher.
func TestForEachVisitsEveryPointOnce(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	pts := uniform(rng, 5000, 4)
	ix, _ := Build(pts, 4, Euclidean)
	seen := make([]int32, ix.Len())
	nn := make([]int, ix.Len())
	ix.ForEach(2, nil, func(s *Searcher, i int) {
		seen[i]++
		r := s.KNN(ix.Coords(i), 1, Query{Self: i}, nil)
		nn[i] = r[0].Index
	})
	for i, c := range seen {
		if c != 1 {
			t.Fatalf("point %d visited %d times", i, c)
		}
	}
	idx, _ := ix.AllKNN(1, 0, 0, 0, 1, nil)
	for i := range nn {
		if int(idx[i]) != nn[i] {
			t.Fatalf("point %d: ForEach %d, AllKNN %d", i, nn[i], idx[i])
		}
	}
}

// TestForEachWorkerSetupOncePerGoroutine: every point is visited once, and setup runs once per
// goroutine (at most the thread count), with that goroutine's Searcher.
func TestForEachWorkerSetupOncePerGoroutine(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 10))
	pts := uniform(rng, 5000, 3)
	ix, _ := Build(pts, 3, Max)
	var mu sync.Mutex
	setups := 0
	seen := make([]int32, ix.Len())
	nn := make([]int, ix.Len())
	ix.ForEachWorker(2, nil, func(s *Searcher) func(i int) {
		mu.Lock()
		setups++
		mu.Unlock()
		return func(i int) {
			seen[i]++
			nn[i] = s.KNN(ix.Coords(i), 1, Query{Self: i}, nil)[0].Index
		}
	})
	if setups < 1 || setups > 2 {
		t.Errorf("setup ran %d times on 2 threads", setups)
	}
	idx, _ := ix.AllKNN(1, 0, 0, 0, 1, nil)
	for i, c := range seen {
		if c != 1 || int(idx[i]) != nn[i] {
			t.Fatalf("point %d: visited %d times, neighbour %d (AllKNN %d)", i, c, nn[i], idx[i])
		}
	}
}

// TestFromEmbeddingMatchesBuild: the delay view gives the same points as the dense matrix.
func TestFromEmbeddingMatchesBuild(t *testing.T) {
	x := henonX(1000)
	ix, err := FromEmbedding(x, 3, 4, Max)
	if err != nil {
		t.Fatal(err)
	}
	if ix.Len() != 1000-9 || ix.Dim() != 4 || ix.Norm() != Max {
		t.Fatalf("Len %d Dim %d Norm %v", ix.Len(), ix.Dim(), ix.Norm())
	}
	var buf []float64
	for i := range ix.Len() {
		buf = ix.Point(i, buf)
		for d := range 4 {
			if buf[d] != x[i+3*d] {
				t.Fatalf("point %d coord %d: %v want %v", i, d, buf[d], x[i+3*d])
			}
		}
	}
	dense, _ := Build(delay(x, 3, 4), 4, Max)
	a, da := ix.AllKNN(5, 3, 0, 0, 1, nil)
	b, db := dense.AllKNN(5, 3, 0, 0, 1, nil)
	if !slices.Equal(a, b) || !slices.Equal(da, db) {
		t.Fatal("FromEmbedding and Build differ")
	}
	if d := ix.Distance(0, 5); d != bruteDist(ix.Coords(0), ix.Coords(5), Max) {
		t.Fatalf("Distance %v", d)
	}
}

// TestDegenerate covers all-equal coordinates, N < k, tiny and empty indexes.
func TestDegenerate(t *testing.T) {
	// All points equal: every distance is 0, so neighbours are the smallest admissible indices.
	pts := make([]float64, 300*3)
	for i := range pts {
		pts[i] = 2.5
	}
	for _, norm := range []Norm{Euclidean, Max} {
		ix, err := Build(pts, 3, norm)
		if err != nil {
			t.Fatal(err)
		}
		s := ix.NewSearcher()
		got := s.KNN(ix.Coords(150), 5, Query{Self: 150, Theiler: 2}, nil)
		want := []Neighbor{{0, 0}, {1, 0}, {2, 0}, {3, 0}, {4, 0}}
		if !equalNeighbors(got, want) {
			t.Fatalf("all-equal KNN: %v", got)
		}
		if c := s.Count(ix.Coords(0), 0, Query{Self: 0, Theiler: 0}); c != 299 {
			t.Fatalf("all-equal Count = %d, want 299", c)
		}
		if got := ix.PairCounts([]float64{0, 1}, 0, 2, nil); got[0] != 300*299/2 || got[1] != 300*299/2 {
			t.Fatalf("all-equal PairCounts %v", got)
		}
	}
	// N < k.
	ix, _ := Build([]float64{0, 0, 1, 0, 0, 3}, 2, Euclidean)
	got := ix.NewSearcher().KNN([]float64{0, 0}, 10, Query{Self: 0}, nil)
	if !equalNeighbors(got, []Neighbor{{1, 1}, {2, 3}}) {
		t.Fatalf("N<k: %v", got)
	}
	got = ix.NewSearcher().KNN([]float64{0, 0}, 10, Query{Self: -1}, nil)
	if !equalNeighbors(got, []Neighbor{{0, 0}, {1, 1}, {2, 3}}) {
		t.Fatalf("N<k external: %v", got)
	}
	// Single point and empty index.
	one, _ := Build([]float64{1, 2}, 2, Max)
	if r := one.NewSearcher().KNN([]float64{1, 2}, 1, Query{Self: 0}, nil); len(r) != 0 {
		t.Fatalf("single point: %v", r)
	}
	if c := one.PairCounts([]float64{1}, 0, 1, nil); c[0] != 0 {
		t.Fatalf("single point pairs %v", c)
	}
	empty, err := Build(nil, 3, Euclidean)
	if err != nil || empty.Len() != 0 {
		t.Fatalf("empty: %v %v", empty, err)
	}
	if r := empty.NewSearcher().KNN([]float64{0, 0, 0}, 3, Query{Self: -1}, nil); len(r) != 0 {
		t.Fatal("empty KNN returned neighbours")
	}
	if idx, _ := empty.AllKNN(3, 0, 0, 0, 2, nil); len(idx) != 0 {
		t.Fatal("empty AllKNN")
	}
}

// TestBuildErrors: NaN, Inf and bad shapes are rejected with an error naming the place.
func TestBuildErrors(t *testing.T) {
	cases := []struct {
		name string
		err  error
	}{
		{"nan", func() error { _, e := Build([]float64{0, 1, math.NaN(), 2}, 2, Euclidean); return e }()},
		{"inf", func() error { _, e := FromEmbedding([]float64{0, 1, math.Inf(-1)}, 1, 2, Max); return e }()},
		{"dim0", func() error { _, e := Build([]float64{1}, 0, Euclidean); return e }()},
		{"ragged", func() error { _, e := Build([]float64{1, 2, 3}, 2, Euclidean); return e }()},
		{"lag0", func() error { _, e := FromEmbedding([]float64{1, 2, 3}, 0, 2, Max); return e }()},
		{"short", func() error { _, e := FromEmbedding([]float64{1, 2, 3}, 2, 3, Max); return e }()},
		{"norm", func() error { _, e := Build([]float64{1, 2}, 2, Norm(7)); return e }()},
	}
	for _, c := range cases {
		if !errors.Is(c.err, ErrInput) {
			t.Errorf("%s: error %v, want ErrInput", c.name, c.err)
		}
	}
	_, err := Build([]float64{0, 1, math.NaN(), 2}, 2, Euclidean)
	if want := "point 1, coordinate 0"; err == nil || !strings.Contains(err.Error(), want) {
		t.Errorf("NaN error %q does not say %q", err, want)
	}
}

// TestQueriesAllocateNothing: with warmed-up buffers, KNN, Radius and Count allocate nothing.
func TestQueriesAllocateNothing(t *testing.T) {
	rng := rand.New(rand.NewPCG(9, 10))
	pts := uniform(rng, 2000, 3)
	ix, _ := Build(pts, 3, Euclidean)
	s := ix.NewSearcher()
	buf := make([]Neighbor, 0, 64)
	q := ix.Coords(10)
	buf = s.Radius(q, 0.1, Query{Self: 10}, buf)
	allocs := testing.AllocsPerRun(50, func() {
		buf = s.KNN(q, 10, Query{Self: 10, Theiler: 5}, buf)
		buf = s.Radius(q, 0.1, Query{Self: 10}, buf)
		_ = s.Count(q, 0.1, Query{Self: 10})
	})
	if allocs != 0 {
		t.Fatalf("%v allocations per query round", allocs)
	}
}
