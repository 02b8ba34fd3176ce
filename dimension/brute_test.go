package dimension

import (
	"math"
	"testing"
)

// bruteC returns the correlation sum at dimension m by the definition: the fraction of pairs
// i < j, j − i > w, with maximum-norm distance ≤ r (Grassberger & Procaccia 1983).
func bruteC(x []float64, lag, m, w int, radii []float64) []float64 {
	n := len(x) - (m-1)*lag
	cnt := make([]float64, len(radii))
	var total float64
	for i := 0; i < n; i++ {
		for j := i + w + 1; j < n; j++ {
			total++
			var d float64
			for k := 0; k < m; k++ {
				d = math.Max(d, math.Abs(x[i+k*lag]-x[j+k*lag]))
			}
			for q, r := range radii {
				if d <= r {
					cnt[q]++
				}
			}
		}
	}
	for q := range cnt {
		cnt[q] /= total
	}
	return cnt
}

func TestCorrelationSumMatchesBruteForce(t *testing.T) {
	x := simulate(t, "henon", 1500, 0)
	r, err := CorrelationDimension(x, Options{Lag: 1, MaxDim: 3, Theiler: 4, NumRadii: 12, Threads: 2})
	if r == nil {
		t.Fatal(err)
	}
	for _, c := range r.Curves {
		want := bruteC(x, 1, c.Dim, 4, r.Radii)
		for k := range want {
			// Exact pair counts (brute-force definition): equal up to the division's rounding.
			if math.Abs(c.C[k]-want[k]) > 1e-12 {
				t.Fatalf("m = %d, r = %g: C = %g, brute force %g", c.Dim, r.Radii[k], c.C[k], want[k])
			}
		}
	}
}

// BenchmarkCorrelationSums compares the correlation sums of 4000 Hénon points at m = 1…4
// (one pair-counting pass per m) with the brute-force double loop in the same run.
func BenchmarkCorrelationSums(b *testing.B) {
	x := simulate(b, "henon", 4000, 0)
	b.Run("index", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, err := CorrelationDimension(x, Options{Lag: 1, MaxDim: 4, Theiler: 2, Threads: 1}); err != nil {
				b.Fatal(err)
			}
		}
	})
	radii := make([]float64, 40)
	for k := range radii {
		radii[k] = 2.5 * math.Pow(10, -3.5+3.5*float64(k)/39)
	}
	b.Run("brute", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			for m := 1; m <= 4; m++ {
				bruteC(x, 1, m, 2, radii)
			}
		}
	})
}
