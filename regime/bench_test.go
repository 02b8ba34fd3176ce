package regime

import "testing"

// BenchmarkAnalyze1e5 runs the whole verdict on 10⁵ samples of the Lorenz x coordinate
// (dt = 0.05) with 19 IAAFT surrogates on 2 threads. Reference for the surrogate part:
// BenchmarkIAAFTReference below (the surrogates alone).
func BenchmarkAnalyze1e5(b *testing.B) {
	x := simulate(b, "lorenz", "x", nil, 100000, 0.05, 1)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Analyze(x, 0.05, Options{Seed: 1, Threads: 2, Surrogates: 19}); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkIAAFTReference generates 19 IAAFT surrogates of 10⁵ samples on 2 threads.
func BenchmarkIAAFTReference(b *testing.B) {
	x := simulate(b, "lorenz", "x", nil, 100000, 0.05, 1)
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Surrogates(x, SurrogateOptions{Method: IAAFT, Count: 19, Seed: 1, Threads: 2}); err != nil {
			b.Fatal(err)
		}
	}
}
