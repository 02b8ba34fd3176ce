package lyapunov

import (
	"fmt"
	"testing"

	"unfold/neighbors"
)

// TestGivenIndex: the divergence curves on an index handed in through Options.Index equal
// those on the index Divergence builds, and an index of another norm is refused.
func TestGivenIndex(t *testing.T) {
	x := make([]float64, 3000)
	x[0] = 0.3
	for i := 1; i < len(x); i++ { // logistic map at r = 4 (λ = ln 2)
		x[i] = 4 * x[i-1] * (1 - x[i-1])
	}
	opt := Options{Lag: 1, Dim: 2, Theiler: 1, Seed: 1, Threads: 2}
	own, err := Divergence(x, opt)
	if err != nil {
		t.Fatal(err)
	}
	if opt.Index, err = neighbors.FromEmbedding(x, 1, 2, neighbors.Euclidean); err != nil {
		t.Fatal(err)
	}
	given, err := Divergence(x, opt)
	if err != nil {
		t.Fatal(err)
	}
	if fmt.Sprint(own.Curves) != fmt.Sprint(given.Curves) || own.Lambda != given.Lambda || own.Interval != given.Interval {
		t.Errorf("a given index changes the result: λ %v vs %v", given.Lambda, own.Lambda)
	}
	if opt.Index, err = neighbors.FromEmbedding(x, 1, 2, neighbors.Max); err != nil {
		t.Fatal(err)
	}
	if _, err := Divergence(x, opt); err == nil {
		t.Error("an index of another norm was accepted")
	}
}
