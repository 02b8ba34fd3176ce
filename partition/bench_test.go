package partition

import "testing"

// BenchmarkSearch is the binary partition search on 2·10^4 logistic iterates.
func BenchmarkSearch(b *testing.B) {
	x := iterate(logisticMap, 0.3, 20000)
	b.ReportAllocs()
	for b.Loop() {
		Search(x, SearchOptions{})
	}
}

// BenchmarkSection is the hyperplane section (cubic) of 10^6 samples of a sawtooth.
func BenchmarkSection(b *testing.B) {
	x := make([]float64, 1_000_000)
	for i := range x {
		x[i] = float64(i%137) / 137
	}
	b.ReportAllocs()
	for b.Loop() {
		TakeSection(x, 1, 0, SectionOptions{Lag: 5, Dim: 3, Interp: Cubic, Direction: 1})
	}
}
