package neighbors

import (
	"math/rand/v2"
	"testing"
)

// TestAllNN1MatchesKNN: the leaf-batched nearest-neighbour search of AllKNN (k = 1) gives, for
// every point, exactly the (index, distance) of the per-query KNN search, which the other tests
// check against brute force: with duplicates and ties, windows, index ranges, both norms, and
// 1 or 2 threads.
func TestAllNN1MatchesKNN(t *testing.T) {
	rng := rand.New(rand.NewPCG(11, 12))
	n := 1500
	for _, dim := range []int{1, 2, 3, 6} {
		for _, ds := range datasets(rng, n, dim) {
			for _, norm := range []Norm{Euclidean, Max} {
				ix, err := Build(ds.pts, dim, norm)
				if err != nil {
					t.Fatal(err)
				}
				s := ix.NewSearcher()
				for _, tc := range []struct{ w, lo, hi int }{{0, 0, 0}, {5, 0, 0}, {40, 100, 1200}, {3, 700, 0}, {1000, 0, 0}} {
					for _, threads := range []int{1, 2} {
						idx, dist := ix.AllKNN(1, tc.w, tc.lo, tc.hi, threads, nil)
						for i := range n {
							want := s.KNN(ix.Coords(i), 1, Query{Self: i, Theiler: tc.w, Lo: tc.lo, Hi: tc.hi}, nil)
							if len(want) == 0 {
								if idx[i] != -1 {
									t.Fatalf("%s m=%d %v %+v: point %d got %d, want none", ds.name, dim, norm, tc, i, idx[i])
								}
								continue
							}
							if int(idx[i]) != want[0].Index || dist[i] != want[0].Dist {
								t.Fatalf("%s m=%d %v %+v threads %d: point %d got (%d, %g), want (%d, %g)", ds.name, dim, norm, tc, threads, i, idx[i], dist[i], want[0].Index, want[0].Dist)
							}
						}
					}
				}
			}
		}
	}
}
