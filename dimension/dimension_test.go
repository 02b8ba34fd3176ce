package dimension

import (
	"math"
	"math/rand/v2"
	"testing"

	"unfold/internal/testsignals"
	"unfold/models"
)

// simulate returns the first column of n samples of the named model at its defaults (seed 1),
// at sampling interval dt (0: the model's) (internal/testsignals).
func simulate(t testing.TB, name string, n int, dt float64) []float64 {
	t.Helper()
	x, err := testsignals.Model(name, "", nil, n, dt, 1)
	if err != nil {
		t.Fatal(err)
	}
	return x
}

func TestHenonD2(t *testing.T) {
	x := simulate(t, "henon", 10000, 0)
	r, err := CorrelationDimension(x, Options{Lag: 1, MaxDim: 5, Theiler: 2, Threads: 2})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range r.Curves {
		t.Logf("m=%d fitted=%v D2=%.3f [%.3f, %.3f] takens=%.3f range %d..%d", c.Dim, c.Fitted, c.D2, c.Lo, c.Hi, c.Takens, c.From, c.To)
	}
	t.Logf("D2=%.3f [%.3f,%.3f] sat=%v takens=%.3f cautions=%v", r.D2, r.Lo, r.Hi, r.Saturated, r.Takens, r.Cautions)
	// Hénon D2 = 1.21 ± 0.01 (GP 1983 via Sprott) or 1.25 ± 0.02 (GP 1983 via MathWorld);
	// CHECKS.md §4, tag V; the brief's tolerance 0.1 around either.
	if !(r.D2 > 1.11 && r.D2 < 1.35) || !r.Saturated {
		t.Errorf("Hénon D2 = %.3f (saturated %v), want 1.21–1.25 ± 0.1", r.D2, r.Saturated)
	}
	if !(r.Takens > 1.0 && r.Takens < 1.45) {
		t.Errorf("Hénon Takens estimate %.3f", r.Takens)
	}
}

func TestLorenzD2(t *testing.T) {
	x := simulate(t, "lorenz", 10000, 0.05)
	r, err := CorrelationDimension(x, Options{Lag: 3, MaxDim: 6, Theiler: 20, Threads: 2})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range r.Curves {
		t.Logf("m=%d fitted=%v D2=%.3f [%.3f, %.3f] takens=%.3f range %d..%d", c.Dim, c.Fitted, c.D2, c.Lo, c.Hi, c.Takens, c.From, c.To)
	}
	// Lorenz D2 = 2.05 ± 0.01 (GP 1983, CHECKS.md §4, tag M) and 2.055 ± 0.004 (Sprott, V):
	// within 0.1.
	if math.Abs(r.D2-2.05) > 0.1 || !r.Saturated {
		t.Errorf("Lorenz D2 = %.3f (saturated %v), want 2.05 ± 0.1", r.D2, r.Saturated)
	}
}

func TestTorusD2(t *testing.T) {
	n := 6000
	x := make([]float64, n)
	for i := range x {
		tt := float64(i) * 0.7
		x[i] = math.Sin(tt) + math.Sin(models.GoldenMean*tt)
	}
	r, err := CorrelationDimension(x, Options{Lag: 2, MaxDim: 6, Theiler: 10, Threads: 2})
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range r.Curves {
		t.Logf("m=%d fitted=%v D2=%.3f range %d..%d", c.Dim, c.Fitted, c.D2, c.From, c.To)
	}
	// A golden-mean 2-torus has D2 = 2 (exact: smooth invariant measure on a 2-torus);
	// tolerance 0.15 from the brief.
	if math.Abs(r.D2-2) > 0.15 {
		t.Errorf("torus D2 = %.3f, want 2 ± 0.15", r.D2)
	}
}

func TestWhiteNoiseNotSaturated(t *testing.T) {
	rng := rand.New(rand.NewPCG(1, 2))
	x := make([]float64, 2500)
	for i := range x {
		x[i] = rng.Float64()
	}
	r, _ := CorrelationDimension(x, Options{Lag: 1, MaxDim: 6, Threads: 2})
	for _, c := range r.Curves {
		t.Logf("m=%d fitted=%v D2=%.3f", c.Dim, c.Fitted, c.D2)
	}
	// i.i.d. noise fills every embedding dimension: D2(m) ≈ m (CHECKS.md §4, tag E), so it
	// does not saturate.
	if r.Saturated {
		t.Errorf("white noise reported saturated at D2 = %.2f", r.D2)
	}
	// m = 1 of i.i.d. uniform data: D2 = 1 (exact), ±0.1 (CHECKS.md §4).
	if c := r.Curves[0]; !c.Fitted || math.Abs(c.D2-1) > 0.1 {
		t.Errorf("uniform noise m=1 D2 = %.3f (fitted %v), want 1 ± 0.1", c.D2, c.Fitted)
	}
}

func TestLogisticD2(t *testing.T) {
	x := simulate(t, "logistic", 8000, 0)
	r, err := CorrelationDimension(x, Options{Lag: 1, MaxDim: 4, Theiler: 1, Threads: 2})
	if err != nil {
		t.Fatal(err)
	}
	// Logistic r = 4: D2 = 1 with logarithmic corrections; assert [0.9, 1.05] (CHECKS.md §4,
	// tag E with caution).
	if !(r.D2 >= 0.9 && r.D2 <= 1.05) {
		t.Errorf("logistic r = 4 D2 = %.3f, want [0.9, 1.05]", r.D2)
	}
	// The Takens estimate is a second opinion on the same scaling (Takens 1985): within 0.15.
	if math.Abs(r.Takens-r.D2) > 0.15 {
		t.Errorf("Takens %.3f far from D2 %.3f", r.Takens, r.D2)
	}
}
