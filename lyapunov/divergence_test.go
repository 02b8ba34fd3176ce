package lyapunov

import (
	"errors"
	"math"
	"slices"
	"strings"
	"testing"

	"unfold/fit"
)

func TestDivergenceLogistic(t *testing.T) {
	// Logistic map r = 4: λ = ln 2 exactly (CHECKS.md §1, tag E; conjugacy to the tent map);
	// from data within 5 % (CHECKS.md §3, Rosenstein 1993 / Kantz 1994 row, tolerance M/E).
	x := logisticX(5000)
	for _, m := range []Method{Rosenstein, Kantz} {
		r, err := Divergence(x, Options{Lag: 1, Dim: 1, Theiler: 1, Method: m, Seed: 1})
		if err != nil {
			t.Fatalf("%v: %v", m, err)
		}
		if math.Abs(r.Lambda-math.Ln2) > 0.05*math.Ln2 {
			t.Errorf("%v: λ = %.4f, want ln 2 = 0.6931 ± 5%%", m, r.Lambda)
		}
		if !(r.Interval[0] < r.Lambda && r.Lambda < r.Interval[1]) {
			t.Errorf("%v: interval %v does not contain λ = %v", m, r.Interval, r.Lambda)
		}
		if r.From < 0 || r.To-r.From < 5 || r.To > 14 {
			t.Errorf("%v: fit range %d…%d, want the rise before saturation (about 0…12)", m, r.From, r.To)
		}
		if len(r.Curves[r.Chosen].MeanLog) != r.Horizon+1 {
			t.Errorf("%v: curve has %d points, want horizon+1 = %d", m, len(r.Curves[r.Chosen].MeanLog), r.Horizon+1)
		}
	}
}

func TestDivergenceHenon(t *testing.T) {
	// Hénon a = 1.4, b = 0.3: λ1 = 0.4192 (Sprott 2003, Chaos and Time-Series Analysis, App. A;
	// CHECKS.md §2, tag M + C); from data within 10 % (issue 5).
	x := henonX(5000)
	for _, m := range []Method{Rosenstein, Kantz} {
		r, err := Divergence(x, Options{Lag: 1, Dim: 2, Theiler: 1, Method: m})
		if err != nil {
			t.Fatalf("%v: %v", m, err)
		}
		if math.Abs(r.Lambda-0.4192) > 0.1*0.4192 {
			t.Errorf("%v: λ = %.4f, want 0.4192 ± 10%%", m, r.Lambda)
		}
		if r.Method == Kantz && len(r.Curves) != 4 {
			t.Errorf("Kantz: %d curves, want one per default ε (4)", len(r.Curves))
		}
	}
}

func TestDivergenceLorenz(t *testing.T) {
	// Lorenz (10, 28, 8/3), x sampled at Δt = 0.01: λ1 = 0.9056 per time unit (Sprott 2003
	// App. A, CHECKS.md §2, tag V + C); from data within 15 % (issue 5).
	x := lorenzX(10000, 0.01)
	for _, m := range []Method{Rosenstein, Kantz} {
		r, err := Divergence(x, Options{Lag: 12, Dim: 3, Theiler: 20, Dt: 0.01, Method: m})
		if err != nil {
			t.Fatalf("%v: %v", m, err)
		}
		if math.Abs(r.Lambda-0.9056) > 0.15*0.9056 {
			t.Errorf("%v: λ = %.4f per time unit (fit %d…%d), want 0.9056 ± 15%%", m, r.Lambda, r.From, r.To)
		}
		if math.Abs(r.Lambda-r.LambdaPerSample/0.01) > 1e-12 {
			t.Errorf("%v: λ = %v per time unit but %v per sample at Δt = 0.01", m, r.Lambda, r.LambdaPerSample)
		}
	}
}

func TestDivergenceBounded(t *testing.T) {
	// A quasiperiodic sum of two sines (all exponents 0: motion on a torus) and a limit cycle
	// (van der Pol, largest exponent 0): λ1 within 0.02 of 0 per time unit or negative, never
	// significantly positive (issue 5; exact: neutral flows have zero exponents).
	cases := []struct {
		name string
		x    []float64
		o    Options
	}{
		{"two sines", sinesX(10000, 0.1), Options{Lag: 8, Dim: 3, Theiler: 10, Dt: 0.1}},
		{"limit cycle", vanDerPolX(10000, 0.05), Options{Lag: 20, Dim: 2, Theiler: 30, Dt: 0.05}},
	}
	for _, c := range cases {
		for _, m := range []Method{Rosenstein, Kantz} {
			o := c.o
			o.Method = m
			r, err := Divergence(c.x, o)
			if err != nil {
				if errors.Is(err, fit.ErrNoRange) {
					continue // no exponent is not a positive exponent
				}
				t.Fatalf("%s %v: %v", c.name, m, err)
			}
			if r.Lambda > 0.02 && r.Interval[0] > 0 {
				t.Errorf("%s %v: λ = %.4f per time unit, interval %v: significantly positive", c.name, m, r.Lambda, r.Interval)
			}
		}
	}
}

func TestDivergenceNoise(t *testing.T) {
	// Gaussian white noise has no deterministic divergence: a positive exponent must come with
	// a caution, and the Kantz curves must show their ε dependence (issue 5; Kantz 1994).
	for seed := uint64(1); seed <= 3; seed++ {
		x := noiseX(4000, seed)
		for _, m := range []Method{Rosenstein, Kantz} {
			r, err := Divergence(x, Options{Lag: 1, Dim: 3, Theiler: 1, Method: m})
			if errors.Is(err, fit.ErrNoRange) {
				continue
			}
			if err != nil {
				t.Fatal(err)
			}
			if r.Lambda > 0 && len(r.Cautions) == 0 {
				t.Errorf("seed %d %v: λ = %v with no caution", seed, m, r.Lambda)
			}
			if m == Kantz && !slices.ContainsFunc(r.Cautions, func(s string) bool { return strings.Contains(s, "depends strongly on ε") }) {
				t.Errorf("seed %d Kantz: no ε-dependence caution in %q", seed, r.Cautions)
			}
			if !slices.ContainsFunc(r.Cautions, func(s string) bool { return strings.Contains(s, "first step") }) {
				t.Errorf("seed %d %v: no first-step saturation caution in %q", seed, m, r.Cautions)
			}
		}
	}
}

func TestDivergenceThreadsAndOverride(t *testing.T) {
	// Determinism (DESIGN.md §5): the same result for any number of threads.
	x := henonX(3000)
	var prev *Result
	for _, th := range []int{1, 2, 3} {
		r, err := Divergence(x, Options{Lag: 1, Dim: 2, Theiler: 1, Threads: th, Seed: 7})
		if err != nil {
			t.Fatal(err)
		}
		if prev != nil {
			for e := range r.Curves {
				if !slices.Equal(r.Curves[e].MeanLog, prev.Curves[e].MeanLog) {
					t.Fatalf("threads %d: curve %d differs", th, e)
				}
			}
			if r.Lambda != prev.Lambda || r.Interval != prev.Interval {
				t.Fatalf("threads %d: λ %v %v, before %v %v", th, r.Lambda, r.Interval, prev.Lambda, prev.Interval)
			}
		}
		prev = r
	}
	// --fit-from/--fit-to: the slope is the least-squares slope over exactly that range.
	r, err := Divergence(x, Options{Lag: 1, Dim: 2, Theiler: 1, Method: Rosenstein, FitFrom: 2, FitTo: 8})
	if err != nil {
		t.Fatal(err)
	}
	c := r.Curves[0].MeanLog
	steps := []float64{2, 3, 4, 5, 6, 7, 8}
	l, _ := fit.LeastSquares(steps, c[2:9])
	if r.From != 2 || r.To != 8 || r.AutoRange || math.Abs(r.LambdaPerSample-l.Slope) > 1e-12 {
		t.Errorf("override: range %d…%d auto %v slope %v, want 2…8, false, %v", r.From, r.To, r.AutoRange, r.LambdaPerSample, l.Slope)
	}
	// No linear range under an impossible tolerance: the error wraps fit.ErrNoRange and the
	// curves are still returned.
	r, err = Divergence(x, Options{Lag: 1, Dim: 2, Theiler: 1, Method: Rosenstein,
		Range: fit.RangeOptions{RelTol: 1e-12, AbsTol: 1e-15}})
	if !errors.Is(err, fit.ErrNoRange) || r == nil || len(r.Curves) != 1 {
		t.Errorf("impossible tolerance: err = %v, result %v", err, r != nil)
	}
}

func TestDivergenceBadOptions(t *testing.T) {
	x := henonX(500)
	bad := []Options{
		{Lag: 0, Dim: 2},
		{Lag: 1, Dim: 2, Theiler: -1},
		{Lag: 1, Dim: 2, Horizon: 1},
		{Lag: 1, Dim: 2, Dt: -1},
		{Lag: 1, Dim: 2, Eps: []float64{0.2, 0.1}},
		{Lag: 1, Dim: 2, Eps: []float64{0}},
		{Lag: 1, Dim: 2, FitFrom: 5, FitTo: 3},
		{Lag: 1, Dim: 2, Theiler: 400},
		{Lag: 1, Dim: 2, Method: Method(7)},
	}
	for _, o := range bad {
		if _, err := Divergence(x, o); err == nil {
			t.Errorf("options %+v accepted", o)
		}
	}
	if m, err := ParseMethod("rosenstein"); err != nil || m != Rosenstein || m.String() != "rosenstein" {
		t.Errorf("ParseMethod(rosenstein) = %v, %v", m, err)
	}
	if _, err := ParseMethod("wolf"); err == nil {
		t.Error("unknown method accepted")
	}
}
