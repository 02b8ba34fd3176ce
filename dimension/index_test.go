package dimension

import (
	"fmt"
	"testing"

	"unfold/neighbors"
)

// TestGivenIndex (compared as printed: the local slopes hold NaN): correlation sums counted on indexes handed in through Options.Index equal
// those on indexes built here, and an index of the wrong dimension is refused.
func TestGivenIndex(t *testing.T) {
	x := make([]float64, 4000)
	u, v := 0.1, 0.1
	for i := -100; i < len(x); i++ { // Hénon map (a = 1.4, b = 0.3; Hénon 1976)
		u, v = 1-1.4*u*u+v, 0.3*u
		if i >= 0 {
			x[i] = u
		}
	}
	opt := Options{Lag: 1, MaxDim: 3, Theiler: 1, Seed: 1, Threads: 2}
	own, err := CorrelationDimension(x, opt)
	if err != nil {
		t.Fatal(err)
	}
	built := 0
	opt.Index = func(m int) (*neighbors.Index, error) {
		built++
		return neighbors.FromEmbedding(x, 1, m, neighbors.Max)
	}
	given, err := CorrelationDimension(x, opt)
	if err != nil {
		t.Fatal(err)
	}
	if built != 3 || fmt.Sprint(own.Curves) != fmt.Sprint(given.Curves) || own.D2 != given.D2 {
		t.Errorf("given indexes (%d asked for, want 3) change the result: D2 %v vs %v", built, given.D2, own.D2)
	}
	opt.Index = func(m int) (*neighbors.Index, error) { return neighbors.FromEmbedding(x, 1, m+1, neighbors.Max) }
	if _, err := CorrelationDimension(x, opt); err == nil {
		t.Error("an index of the wrong dimension was accepted")
	}
}
