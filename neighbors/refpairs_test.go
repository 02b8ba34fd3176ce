package neighbors

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"
)

// bruteRefPairs counts, by the definition, the ordered pairs (i, j) with i in refs,
// |i − j| > w and distance <= radii[k].
func bruteRefPairs(pts []float64, dim int, norm Norm, refs []int, radii []float64, w int) []int64 {
	n := len(pts) / dim
	out := make([]int64, len(radii))
	for _, i := range refs {
		for j := range n {
			if j-i <= w && i-j <= w {
				continue
			}
			d := bruteDist(pts[i*dim:i*dim+dim], pts[j*dim:j*dim+dim], norm)
			for k, r := range radii {
				if d <= r {
					out[k]++
				}
			}
		}
	}
	return out
}

// TestReferencePairCountsMatchBruteForce: the per-reference counts equal the double loop
// exactly (same finite set of pairs), with radii placed exactly on pair distances, duplicates,
// every window and 1 or 2 threads.
func TestReferencePairCountsMatchBruteForce(t *testing.T) {
	rng := rand.New(rand.NewPCG(7, 8))
	n := 700
	for _, dim := range []int{1, 2, 3, 6} {
		for _, ds := range datasets(rng, n, dim) {
			for _, norm := range []Norm{Euclidean, Max} {
				ix, err := Build(ds.pts, dim, norm)
				if err != nil {
					t.Fatal(err)
				}
				var radii []float64
				for range 10 {
					i, j := rng.IntN(n), rng.IntN(n)
					radii = append(radii, bruteDist(ds.pts[i*dim:i*dim+dim], ds.pts[j*dim:j*dim+dim], norm))
				}
				radii = append(radii, 0, -1, math.Inf(1), 1e-300)
				refs := []int{0, 3, 50, 51, 52, 349, 699}
				for range 20 {
					refs = append(refs, rng.IntN(n))
				}
				for _, w := range []int{0, 1, 7, 100} {
					want := bruteRefPairs(ds.pts, dim, norm, refs, radii, w)
					for _, threads := range []int{1, 2} {
						got := ix.ReferencePairCounts(refs, radii, w, threads, nil)
						if !slices.Equal(got, want) {
							t.Fatalf("%s m=%d %v w=%d threads=%d:\n got %v\nwant %v", ds.name, dim, norm, w, threads, got, want)
						}
					}
				}
			}
		}
	}
}

// TestReferencePairCountsAllPoints: with every point as a reference, each unordered pair is
// counted twice, so the counts are twice PairCounts (exact identity).
func TestReferencePairCountsAllPoints(t *testing.T) {
	x := lorenzX(4000, 0.01)
	ix, err := FromEmbedding(x, 10, 3, Max)
	if err != nil {
		t.Fatal(err)
	}
	refs := make([]int, ix.Len())
	for i := range refs {
		refs[i] = i
	}
	radii := []float64{0.1, 0.3, 1, 3, 10}
	pc := ix.PairCounts(radii, 20, 2, nil)
	rc := ix.ReferencePairCounts(refs, radii, 20, 2, nil)
	for k := range pc {
		if rc[k] != 2*pc[k] {
			t.Fatalf("r = %g: reference counts %d, twice the pair counts %d", radii[k], rc[k], 2*pc[k])
		}
	}
}

// TestReferencePairCountsUntil: every radius' count equals the exact count over the prefix
// of references it reports (brute force), the early stops happen from the top down, and the
// result is the same for 1 and 2 threads.
func TestReferencePairCountsUntil(t *testing.T) {
	x := lorenzX(3000, 0.01)
	for _, norm := range []Norm{Euclidean, Max} {
		ix, err := FromEmbedding(x, 10, 3, norm)
		if err != nil {
			t.Fatal(err)
		}
		rng := rand.New(rand.NewPCG(9, 10))
		refs := rng.Perm(ix.Len())[:300]
		radii := []float64{0.05, 0.2, 0.5, 1, 2, 5, 10, 20}
		stop := func(k, used int, count int64) bool { return count >= int64(used)*200 }
		var prev []int64
		for _, threads := range []int{1, 2} {
			got, used := ix.ReferencePairCountsUntil(refs, radii, 15, 32, stop, threads, nil)
			for k := range radii {
				if k > 0 && used[k] > used[k-1] {
					t.Fatalf("used %v: not nonincreasing", used)
				}
				pts := delay(x, 10, 3)
				w := bruteRefPairs(pts, 3, norm, refs[:used[k]], radii[k:k+1], 15)
				if got[k] != w[0] {
					t.Fatalf("%v threads %d r = %g over %d references: %d, brute force %d", norm, threads, radii[k], used[k], got[k], w[0])
				}
			}
			if used[len(used)-1] == len(refs) || used[0] != len(refs) {
				t.Errorf("used %v: want the top radii stopped early and the smallest counted over all %d", used, len(refs))
			}
			if prev != nil && !slices.Equal(prev, got) {
				t.Fatalf("threads %d: %v, before %v", threads, got, prev)
			}
			prev = got
		}
	}
}
