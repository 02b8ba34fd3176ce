package embed

import (
	"testing"

	"unfold/neighbors"
)

// Benchmarks of the dimension scan (FNN + Cao from one kd-tree search per dimension) against
// the exhaustive O(N²) scan in the same run. Commands (see the report):
//
//	go test -run '^$' -bench 'FNN(Scan100k|Brute20k|Scan20k)$' -benchtime 1x ./embed/
//	go test -run '^$' -bench 'FNNScan1M$' -benchtime 1x ./embed/     # 10^6 points, explicit
//
// Lorenz x, Δt = 0.01, lag 12, m = 1 … 8, Theiler window 30, Euclidean norm, all cores.

func benchScan(b *testing.B, n int) {
	x := lorenzX(n, 0.01)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		c, err := ChooseDimension(x, DimOptions{Lag: 12, MaxDim: 8, Theiler: 30})
		if err != nil {
			b.Fatal(err)
		}
		if c.Dimension != 3 {
			b.Fatalf("dimension %d, want 3", c.Dimension)
		}
	}
	b.ReportMetric(float64(n), "points")
}

// BenchmarkFNNScan20k is the tree scan at the brute-force size, for the ratio.
func BenchmarkFNNScan20k(b *testing.B) { benchScan(b, 20000) }

// BenchmarkFNNScan100k is the tree scan at N = 10^5.
func BenchmarkFNNScan100k(b *testing.B) { benchScan(b, 100000) }

// BenchmarkFNNScan1M is the tree scan at N = 10^6; it runs only when named (-bench
// 'FNNScan1M$'), since a plain -bench . should stay short.
func BenchmarkFNNScan1M(b *testing.B) { benchScan(b, 1000000) }

// BenchmarkFNNBrute20k is the exhaustive scan (bruteFNN, single goroutine) at N = 2·10^4.
func BenchmarkFNNBrute20k(b *testing.B) {
	x := lorenzX(20000, 0.01)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		r := bruteFNN(x, 12, 8, 30, 15, 2, neighbors.Euclidean)
		if r[2].Fraction >= 0.01 {
			b.Fatalf("FNN(3) = %v", r[2].Fraction)
		}
	}
	b.ReportMetric(20000, "points")
}

// BenchmarkHistogramMI100k is the histogram mutual information for N = 10^5, lags 0 … 100.
func BenchmarkHistogramMI100k(b *testing.B) {
	x := lorenzX(100000, 0.01)
	b.ReportAllocs()
	b.ResetTimer()
	for i := 0; i < b.N; i++ {
		if _, err := MutualInformation(x, 100, MIOptions{Threads: 2}); err != nil {
			b.Fatal(err)
		}
	}
}
