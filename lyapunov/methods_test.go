package lyapunov

import (
	"math"
	"testing"
)

// TestMethodEntryPoints: KantzExponent and RosensteinExponent are Divergence with the method
// set (the same result whatever opt.Method held), and both give ln 2 on the logistic map at
// r = 4 (exact, CHECKS.md §1, tag E; within 5 % from data, CHECKS.md §3, M/E).
func TestMethodEntryPoints(t *testing.T) {
	x := logisticX(3000)
	opt := Options{Lag: 1, Dim: 1, Theiler: 1, Seed: 1, Threads: 2}
	for _, c := range []struct {
		m  Method
		fn func([]float64, Options) (*Result, error)
	}{{Kantz, KantzExponent}, {Rosenstein, RosensteinExponent}} {
		o := opt
		o.Method = c.m
		want, err := Divergence(x, o)
		if err != nil {
			t.Fatal(err)
		}
		o.Method = 1 - c.m // the other method: the entry point must override it
		got, err := c.fn(x, o)
		if err != nil {
			t.Fatal(err)
		}
		if got.Method != c.m || got.Lambda != want.Lambda || got.Interval != want.Interval {
			t.Errorf("%v entry point: method %v, λ = %v %v; Divergence gives %v %v", c.m, got.Method, got.Lambda, got.Interval, want.Lambda, want.Interval)
		}
		if math.Abs(got.Lambda-math.Ln2) > 0.05*math.Ln2 {
			t.Errorf("%v: λ = %.4f, want ln 2 = 0.6931 ± 5%%", c.m, got.Lambda)
		}
	}
}
