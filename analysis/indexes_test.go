package analysis

import (
	"encoding/json"
	"testing"

	"unfold/embed"
	"unfold/series"
)

// henon returns n iterates of the Hénon map's x (a = 1.4, b = 0.3; Hénon 1976) after 100
// iterates of transient.
func henon(n int) []float64 {
	x := make([]float64, n)
	u, v := 0.1, 0.1
	for i := -100; i < n; i++ {
		u, v = 1-1.4*u*u+v, 0.3*u
		if i >= 0 {
			x[i] = u
		}
	}
	return x
}

// TestIndexCacheIdentical: the lyapunov and fractal stages give byte-identical JSON whether
// they share one neighbour index (the chain's cache) or build their own, and the shared index
// is really reused (one build, one hit) and released after its last use.
func TestIndexCacheIdentical(t *testing.T) {
	s := &series.Series{Values: henon(6000), Dt: 1, Name: "x"}
	c := &embed.Choice{Lag: embed.Chosen{Value: 1, Rule: embed.RuleGiven}, Dim: embed.Chosen{Value: 2, Rule: embed.RuleGiven},
		Theiler: embed.Chosen{Value: 1, Rule: embed.RuleGiven}}
	lo := DefaultLyapunovOptions()
	lo.Norm = "max"
	fo := DefaultFractalOptions()
	fo.MaxDim = 4
	run := func(e *Env) []byte {
		_, lp, lb, lerr := e.Lyapunov("henon", s, lo, c, nil)
		_, fp, fb, ferr := e.Fractal("henon", s, fo, c, nil)
		if lerr != nil || ferr != nil {
			t.Fatalf("lyapunov: %v; fractal: %v", lerr, ferr)
		}
		b, err := json.Marshal([]any{lp, lb, fp, fb})
		if err != nil {
			t.Fatal(err)
		}
		return b
	}
	own := run(&Env{Threads: 2, Seed: 1})
	ic := shareIndexes(s.Values, c, lo.Norm, fo)
	if ic == nil {
		t.Fatal("lyapunov (max norm, m = 2) and fractal (max norm, m ≤ 4) share no index")
	}
	shared := run(&Env{Threads: 2, Seed: 1, Indexes: ic})
	if string(own) != string(shared) {
		t.Errorf("results differ with a shared index:\nown    %.300s\nshared %.300s", own, shared)
	}
	if ic.hits != 1 || len(ic.ix) != 0 || len(ic.uses) != 0 {
		t.Errorf("cache: %d hits (want 1), %d indexes and %d shares left (want 0)", ic.hits, len(ic.ix), len(ic.uses))
	}
	// Different norms share nothing.
	if shareIndexes(s.Values, c, "euclidean", fo) != nil {
		t.Error("lyapunov (Euclidean) and fractal (max norm) should share no index")
	}
}
