package regime

import (
	"reflect"
	"testing"

	"unfold/models"
)

// TestVerdicts checks the verdict on our own test signals (not the demo data) for several
// seeds; the expected regimes are the known dynamics of each model (CHECKS.md §1: logistic
// r = 4 chaotic, r = 3.5 period 4; Lorenz chaotic; a sine periodic; two sines in the
// golden-mean ratio quasiperiodic; Rössler chaotic; AR(1) and its cube linear Gaussian through a static
// monotone function, hence stochastic).
func TestVerdicts(t *testing.T) {
	n := 3000
	seeds := []uint64{1, 2}
	if testing.Short() {
		seeds = seeds[:1]
	}
	cases := []struct {
		name string
		x    func(seed uint64) []float64
		dt   float64
		want string
	}{
		{"logistic 4", func(s uint64) []float64 {
			return simulate(t, "logistic", "x", models.Values{"r": {4}}, n, 0, s)
		}, 1, Chaotic},
		{"logistic 3.5", func(s uint64) []float64 {
			return simulate(t, "logistic", "x", models.Values{"r": {3.5}}, n, 0, s)
		}, 1, Periodic},
		{"sine", func(uint64) []float64 { return sine(n, 37.7) }, 1, Periodic},
		{"two sines", func(uint64) []float64 { return twoSines(n) }, 1, Quasiperiodic},
		{"ar1", func(s uint64) []float64 { return ar1(n, 0.9, s) }, 1, Stochastic},
		{"ar1 cubed", func(s uint64) []float64 { return cubed(ar1(n, 0.9, s)) }, 1, Stochastic},
		{"lorenz", func(s uint64) []float64 {
			return simulate(t, "lorenz", "x", nil, 2*n, 0.05, s)
		}, 0.05, Chaotic},
		// Rössler (0.2, 0.2, 5.7) is chaotic (λ1 = 0.0714, CHECKS.md §2, V): phase-coherent,
		// with strong spectral lines on a broadband floor.
		{"rossler", func(s uint64) []float64 {
			return simulate(t, "rossler", "x", nil, n, 0.2, s)
		}, 0.2, Chaotic},
	}
	for _, c := range cases {
		for _, seed := range seeds {
			x := c.x(seed)
			threads := 1 + int(seed%2) // threads alternate: the verdict must not depend on them
			a, err := Analyze(x, c.dt, Options{Seed: seed * 7, Threads: threads, Surrogates: 19})
			if err != nil {
				t.Fatalf("%s: %v", c.name, err)
			}
			v := a.Verdict
			t.Logf("%-12s seed %d: %s (%.2f) rule %s; lag %d dim %d", c.name, seed, v.Regime, v.Confidence, v.Rule, a.Evidence.Lag, a.Evidence.Dim)
			for k, it := range v.Evidence {
				t.Logf("    %s: %s -> %s [used %v: %s]", k, it.Detail, it.PointsTo, it.Used, it.Why)
			}
			if v.Regime != c.want {
				t.Errorf("%s seed %d: verdict %s, want %s", c.name, seed, v.Regime, c.want)
			}
		}
	}
}

// TestAnalyzeThreadIndependent: identical evidence for 1 and 2 threads (DESIGN.md §5).
func TestAnalyzeThreadIndependent(t *testing.T) {
	x := simulate(t, "henon", "x", nil, 2000, 0, 1)
	a1, err := Analyze(x, 1, Options{Seed: 5, Threads: 1, Surrogates: 9})
	if err != nil {
		t.Fatal(err)
	}
	a2, err := Analyze(x, 1, Options{Seed: 5, Threads: 2, Surrogates: 9})
	if err != nil {
		t.Fatal(err)
	}
	if !reflect.DeepEqual(a1.Verdict, a2.Verdict) || !reflect.DeepEqual(a1.Evidence.Prediction, a2.Evidence.Prediction) {
		t.Errorf("verdict differs between 1 and 2 threads:\n%+v\n%+v", a1.Verdict, a2.Verdict)
	}
}

// TestDecideRule exercises the decision rule directly (package comment).
func TestDecideRule(t *testing.T) {
	surr := make([]float64, 19) // 19 surrogates: the one-sided 5 % level (Theiler & Prichard 1996)
	for i := range surr {
		surr[i] = 0.9 + 0.01*float64(i)
	}
	notRejected := &RankTest{Data: 0.95, Surrogates: surr, P: 0.5, Sigmas: 0.5}
	rejected := &RankTest{Data: 0.1, Surrogates: surr, P: 0.05, Sigmas: 10}
	broadband := &Lines{Kind: LinesBroadband}
	chaos := &ZeroOneResult{K: 0.99}
	// Step 2: a signal the surrogates cannot tell from the linear null is stochastic whatever
	// its λ1 says (issue 6).
	v := Decide(&Evidence{N: 5000, Dt: 1, Lag: 1, Stationary: true, Lines: broadband, ZeroOne: chaos,
		Prediction: notRejected, Reversal: notRejected, Lyapunov: &Exponent{Value: 0.5, Lo: 0.4, Hi: 0.6}})
	if v.Regime != Stochastic {
		t.Errorf("null not rejected, λ1 > 0: %s, want stochastic", v.Regime)
	}
	// Step 3: rejected null, K ≈ 1 and λ1 > 0: chaotic.
	v = Decide(&Evidence{N: 5000, Dt: 1, Lag: 1, Stationary: true, Lines: broadband, ZeroOne: chaos,
		Prediction: rejected, Reversal: notRejected, Lyapunov: &Exponent{Value: 0.5, Lo: 0.4, Hi: 0.6}})
	if v.Regime != Chaotic || !(v.Confidence > 0.5) {
		t.Errorf("rejected null, K ≈ 1, λ1 > 0: %s (%.2f), want chaotic", v.Regime, v.Confidence)
	}
	// Step 3: rejected null but λ1 ≤ 0: undetermined, confidence 0.
	v = Decide(&Evidence{N: 5000, Dt: 1, Lag: 1, Stationary: true, Lines: broadband, ZeroOne: chaos,
		Prediction: rejected, Lyapunov: &Exponent{Value: -0.2, Lo: -0.3, Hi: -0.1}})
	if v.Regime != Undetermined || v.Confidence != 0 {
		t.Errorf("λ1 < 0 with K ≈ 1: %s (%.2f), want undetermined (0)", v.Regime, v.Confidence)
	}
	// Step 1: a line spectrum with one fundamental and K ≈ 0 is periodic.
	v = Decide(&Evidence{N: 5000, Dt: 1, Stationary: true, Lines: &Lines{Kind: LinesPeriodic, LineFraction: 1, Fundamentals: []float64{0.1}},
		ZeroOne: &ZeroOneResult{K: 0.01}})
	if v.Regime != Periodic || v.Confidence != 1 {
		t.Errorf("lines + K ≈ 0: %s (%.2f), want periodic (1)", v.Regime, v.Confidence)
	}
}

// TestNullRejectionRate: for linear Gaussian AR(1) data the rank test of the prediction error
// against 19 IAAFT surrogates rejects at about α = 5 % (Theiler et al. 1992; CHECKS.md §7,
// "null check", tag E statistical); Hénon data are rejected every time. With 20 records the
// count of rejections is Binomial(20, 0.05): P(≥ 5) ≈ 0.3 %.
func TestNullRejectionRate(t *testing.T) {
	if testing.Short() {
		t.Skip("statistical null check")
	}
	po := PredictOptions{Lag: 1, Dim: 3, Horizon: 1, References: 500}
	rejects := func(x []float64, seed uint64) bool {
		set, err := Surrogates(x, SurrogateOptions{Method: IAAFT, Count: 19, Seed: seed, Threads: 2})
		if err != nil {
			t.Fatal(err)
		}
		d, err := PredictionError(x[:set.Length], po)
		if err != nil {
			t.Fatal(err)
		}
		s := make([]float64, 19)
		for i, sg := range set.Surrogates {
			if s[i], err = PredictionError(sg.Values, po); err != nil {
				t.Fatal(err)
			}
		}
		return Rank("npe", d, s, Smaller).Rejects(0.05, 0)
	}
	count := 0
	for r := range 20 {
		if rejects(ar1(1024, 0.9, uint64(100+r)), uint64(r)) {
			count++
		}
	}
	if count >= 5 {
		t.Errorf("AR(1): %d of 20 rejections at 5 %%", count)
	}
	if !rejects(simulate(t, "henon", "x", nil, 1024, 0, 1), 1) {
		t.Error("Hénon data not rejected")
	}
	t.Logf("AR(1) rejections: %d of 20", count)
}
