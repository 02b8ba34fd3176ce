package analysis_test

import (
	"context"
	"testing"

	"unfold/analysis"
	"unfold/internal/testsignals"
	"unfold/series"
)

// TestOneLambda: the chain shows one λ1. The lyapunov stage's interval is the one the regime
// evidence uses (regime.ExponentOf): the bootstrap interval when the fit range is sure, the
// spread across ε when CheckRange calls it unsure (issue 18). On 5000 samples of the Lorenz x
// (50 time units) the divergence rises by less than one nat over the automatic range, so the
// range is unsure and the interval is widened and says so; on the Hénon map it is not.
func TestOneLambda(t *testing.T) {
	if testing.Short() {
		t.Skip("two chains")
	}
	for _, tc := range []struct {
		name  string
		x     []float64
		dt    float64
		widen bool
	}{
		{"lorenz", testsignals.LorenzX(5000, testsignals.Sub(0.01, 10, 50)), 0.01, true},
		{"henon", testsignals.HenonX(3000, 100), 1, false},
	} {
		res, err := analysis.Run(context.Background(), &series.Series{Values: tc.x, Dt: tc.dt, Name: "x"}, analysis.Options{Threads: 2})
		if err != nil {
			t.Fatal(err)
		}
		if res.Lyapunov == nil || res.Lyapunov.Body.Interval == nil || res.Regime == nil || res.Regime.Analysis.Evidence.Lyapunov == nil {
			t.Fatalf("%s: no λ1 in the lyapunov stage or the regime evidence: %v", tc.name, res.Err())
		}
		b, ev := res.Lyapunov.Body, res.Regime.Analysis.Evidence.Lyapunov
		if iv := *b.Interval; iv[0] != ev.Lo || iv[1] != ev.Hi || *b.LambdaMax != ev.Value {
			t.Errorf("%s: lyapunov stage λ1 %v %v, regime evidence %v [%v, %v]", tc.name, *b.LambdaMax, iv, ev.Value, ev.Lo, ev.Hi)
		}
		rc := b.RangeCheck
		if rc == nil || rc.Widened != tc.widen || rc.Widened != ev.Unsure {
			t.Fatalf("%s: range check %+v, want widened %v (evidence unsure %v)", tc.name, rc, tc.widen, ev.Unsure)
		}
		if rc.Widened && (rc.Spread != *b.Interval || !(rc.Spread[0] <= rc.Bootstrap[0] && rc.Spread[1] >= rc.Bootstrap[1])) {
			t.Errorf("%s: widened interval %v does not cover the bootstrap %v", tc.name, *b.Interval, rc.Bootstrap)
		}
	}
}
