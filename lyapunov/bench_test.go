package lyapunov

import (
	"flag"
	"math"
	"strings"
	"testing"

	"unfold/neighbors"
)

// bruteCurves computes the divergence curves by exhaustive search (O(N²), one goroutine):
// the reference implementation of the neighbour part of Divergence. It returns S(k) per curve.
func bruteCurves(x []float64, o Options) [][]float64 {
	nv := len(x) - (o.Dim-1)*o.Lag
	nref := nv - o.Horizon
	key := func(i, j int) float64 {
		var s float64
		for c := range o.Dim {
			t := x[i+c*o.Lag] - x[j+c*o.Lag]
			s += t * t
		}
		return s
	}
	ne := 1
	if o.Method == Kantz {
		ne = len(o.Eps)
	}
	sum := make([][]float64, ne)
	cnt := make([][]float64, ne)
	for e := range sum {
		sum[e] = make([]float64, o.Horizon+1)
		cnt[e] = make([]float64, o.Horizon+1)
	}
	type nb struct {
		k float64
		j int
	}
	kmax := o.MaxNeighbors
	if o.Method == Rosenstein {
		kmax = 1
	}
	best := make([]nb, 0, kmax)
	for i := range nref {
		best = best[:0]
		for j := range nref {
			if j >= i-o.Theiler && j <= i+o.Theiler {
				continue
			}
			k := key(i, j)
			if len(best) == kmax && !(k < best[kmax-1].k) {
				continue
			}
			p := len(best)
			if p < kmax {
				best = append(best, nb{})
			} else {
				p = kmax - 1
			}
			for p > 0 && best[p-1].k > k {
				best[p] = best[p-1]
				p--
			}
			best[p] = nb{k, j}
		}
		if o.Method == Rosenstein {
			for s := 0; s <= o.Horizon; s++ {
				if d := key(i+s, best[0].j+s); d > 0 {
					sum[0][s] += 0.5 * math.Log(d)
					cnt[0][s]++
				}
			}
			continue
		}
		for e, eps := range o.Eps {
			c := 0
			for c < len(best) && math.Sqrt(best[c].k) <= eps {
				c++
			}
			if c == 0 {
				continue
			}
			for s := 0; s <= o.Horizon; s++ {
				var acc float64
				for _, b := range best[:c] {
					acc += math.Sqrt(key(i+s, b.j+s))
				}
				if acc > 0 {
					sum[e][s] += math.Log(acc / float64(c))
					cnt[e][s]++
				}
			}
		}
	}
	out := make([][]float64, ne)
	for e := range out {
		out[e] = make([]float64, o.Horizon+1)
		for s := range out[e] {
			out[e][s] = sum[e][s] / cnt[e][s]
		}
	}
	return out
}

func TestDivergenceMatchesBruteForce(t *testing.T) {
	// Reference: exhaustive neighbour search (bruteCurves) gives the same curves up to the
	// order of summation.
	x := lorenzX(3000, 0.01)
	for _, m := range []Method{Rosenstein, Kantz} {
		o := Options{Lag: 10, Dim: 3, Theiler: 20, Horizon: 40, Dt: 0.01, Method: m, Eps: []float64{0.3, 0.6, 1.2}}
		r, err := Divergence(x, o)
		if err != nil {
			t.Fatalf("%v: %v", m, err)
		}
		o.MaxNeighbors = r.MaxNeighbors
		want := bruteCurves(x, o)
		for e := range want {
			for k, w := range want[e] {
				if g := r.Curves[e].MeanLog[k]; math.Abs(g-w) > 1e-9*math.Max(1, math.Abs(w)) {
					t.Fatalf("%v curve %d step %d: %v, brute force %v", m, e, k, g, w)
				}
			}
		}
	}
}

// Benchmarks of the divergence curves against the exhaustive search in the same run. Lorenz x,
// Δt = 0.01, lag 12, m = 5, horizon 50, Theiler window 30, Euclidean norm, all cores.
// Commands (see the report):
//
//	go test -run '^$' -bench 'Divergence(Kantz|Rosenstein)(20k|100k)$|DivergenceBrute' -benchtime 1x ./lyapunov/
//	go test -run '^$' -bench 'DivergenceKantz1M$' -benchtime 1x -benchmem ./lyapunov/   # 10^6, explicit

func benchOptions(m Method) Options {
	return Options{Lag: 12, Dim: 5, Theiler: 30, Horizon: 50, Dt: 0.01, Method: m, Reps: 200}
}

func benchDivergence(b *testing.B, n int, m Method) {
	x := lorenzX(n, 0.01)
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		if _, err := Divergence(x, benchOptions(m)); err != nil && !strings.Contains(err.Error(), "linear") {
			b.Fatal(err)
		}
	}
	b.ReportMetric(float64(n), "points")
}

// BenchmarkDivergenceKantz20k is the tree search at the brute-force size, for the ratio.
func BenchmarkDivergenceKantz20k(b *testing.B) { benchDivergence(b, 20000, Kantz) }

// BenchmarkDivergenceRosenstein20k is the tree search at the brute-force size, for the ratio.
func BenchmarkDivergenceRosenstein20k(b *testing.B) { benchDivergence(b, 20000, Rosenstein) }

// BenchmarkDivergenceKantz100k is Kantz's curves at N = 10^5.
func BenchmarkDivergenceKantz100k(b *testing.B) { benchDivergence(b, 100000, Kantz) }

// BenchmarkDivergenceRosenstein100k is Rosenstein's curve at N = 10^5.
func BenchmarkDivergenceRosenstein100k(b *testing.B) { benchDivergence(b, 100000, Rosenstein) }

// BenchmarkDivergenceKantz1M is Kantz's curves at N = 10^6. It runs only when the -bench
// pattern names it (contains "1M"), so that a plain -bench . stays short.
func BenchmarkDivergenceKantz1M(b *testing.B) {
	if f := flag.Lookup("test.bench"); f == nil || !strings.Contains(f.Value.String(), "1M") {
		b.Skip("10^6 points: run with -bench 'DivergenceKantz1M$'")
	}
	benchDivergence(b, 1000000, Kantz)
}

// BenchmarkDivergenceBruteKantz20k is the exhaustive search (bruteCurves, one goroutine) at
// N = 2·10^4 with the radii the tree run chooses.
func BenchmarkDivergenceBruteKantz20k(b *testing.B) {
	x := lorenzX(20000, 0.01)
	o := benchOptions(Kantz)
	o.MaxNeighbors = 32
	ix, err := neighbors.FromEmbedding(x, o.Lag, o.Dim, neighbors.Euclidean)
	if err != nil {
		b.Fatal(err)
	}
	o.Eps = DefaultEps(ix, ix.Len()-o.Horizon, o.Theiler, o.MaxNeighbors)
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		bruteCurves(x, o)
	}
	b.ReportMetric(20000, "points")
}

// BenchmarkDivergenceBruteRosenstein20k is the exhaustive nearest-neighbour search at N = 2·10^4.
func BenchmarkDivergenceBruteRosenstein20k(b *testing.B) {
	x := lorenzX(20000, 0.01)
	o := benchOptions(Rosenstein)
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		bruteCurves(x, o)
	}
	b.ReportMetric(20000, "points")
}

// BenchmarkSpectrum100k is the spectrum from local maps at N = 10^5 (Lorenz x, lag 5, m = 3,
// Theiler 50, 20 neighbours, evolve 5): go test -run '^$' -bench 'Spectrum100k$' -benchtime 1x ./lyapunov/
func BenchmarkSpectrum100k(b *testing.B) {
	x := lorenzX(100000, 0.01)
	b.ReportAllocs()
	b.ResetTimer()
	for range b.N {
		if _, err := Spectrum(x, SpectrumOptions{Lag: 5, Dim: 3, Theiler: 50, Dt: 0.01}); err != nil {
			b.Fatal(err)
		}
	}
	b.ReportMetric(100000, "points")
}
