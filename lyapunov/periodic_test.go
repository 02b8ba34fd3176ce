package lyapunov

import (
	"math"
	"strings"
	"testing"

	"unfold/internal/testsignals"
	"unfold/models"
)

// benettin returns λ1 of the logistic map at r from the equations (models.MapSpectrum, the QR
// method of Benettin et al. 1980): an independent check value.
func benettin(t *testing.T, r float64) float64 {
	t.Helper()
	sp, err := models.MapSpectrum(models.Logistic{R: r}, []float64{0.3}, 200000, 1000)
	if err != nil {
		t.Fatal(err)
	}
	return sp.Exponents[0]
}

// TestDivergenceExactlyPeriodic: on a stable periodic orbit of the logistic map x' = r x(1 − x)
// λ1 < 0 (the orbit attracts; CHECKS.md §1: −0.8725 at r = 3.5, period 4; −0.37 at r = 3.83,
// period 3, inside the window opening at 1 + √8 = 3.8284, exact). After a long transient the
// floating-point orbit repeats exactly, so neighbours stay at distance 0 and no slope can be
// read: the answer is the bound λ1 ≤ 0 (0 with the interval [0, 0]), flagged, bounded for the
// verdict, with the caution — never a positive number and never no answer.
func TestDivergenceExactlyPeriodic(t *testing.T) {
	for _, r := range []float64{3.5, 3.835} {
		x := testsignals.Logistic(3000, r, 0.3, 5000)
		if b := benettin(t, r); !(b < 0) {
			t.Fatalf("r = %v: λ1 from the equations %v, want < 0", r, b)
		}
		for _, m := range []Method{Kantz, Rosenstein} {
			res, err := Divergence(x, Options{Lag: 1, Dim: 1, Theiler: 1, Method: m, Seed: 1})
			if err != nil {
				t.Fatalf("r = %v, %v: %v", r, m, err)
			}
			if !res.Repeats || res.Lambda != 0 || res.Interval[1] > 0 || res.Interval[0] > res.Interval[1] {
				t.Errorf("r = %v, %v: repeats %v, λ1 %v, interval %v; want the bound 0 with an interval ending at 0", r, m, res.Repeats, res.Lambda, res.Interval)
			}
			if !strings.Contains(strings.Join(res.Cautions, "\n"), "periodic orbit: ") {
				t.Errorf("r = %v, %v: no periodic-orbit caution in %q", r, m, res.Cautions)
			}
			if rc := res.CheckRange(); !rc.Bounded {
				t.Errorf("r = %v, %v: range check %+v, want bounded", r, m, rc)
			}
			for k, v := range res.Curves[res.Chosen].MeanLog {
				if math.IsNaN(v) || math.IsInf(v, 0) {
					t.Fatalf("r = %v, %v: the drawn curve is %v at step %d", r, m, v, k)
				}
			}
		}
	}
}

// TestDivergenceConvergingPeriodic: at r = 3.54 the period-8 orbit attracts slowly (λ1 from the
// equations about −0.024, computed here), so after 1000 transient steps neighbours sit just
// above the round-off floor and still converge. The local slopes scatter too much for a stable
// range, but the curve is bounded: the mean growth over the horizon is read, and it is
// negative with an interval below zero that holds the value from the equations.
func TestDivergenceConvergingPeriodic(t *testing.T) {
	want := benettin(t, 3.54)
	x := testsignals.Logistic(4000, 3.54, 0.3, 1000)
	res, err := Divergence(x, Options{Lag: 1, Dim: 1, Theiler: 1, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	if res.Repeats || !(res.Interval[1] < 0) {
		t.Errorf("λ1 %v [%v, %v] (repeats %v); want an interval below 0", res.Lambda, res.Interval[0], res.Interval[1], res.Repeats)
	}
	if !(res.Interval[0] <= want && want <= res.Interval[1]) {
		t.Errorf("interval [%v, %v] does not hold λ1 = %v from the equations", res.Interval[0], res.Interval[1], want)
	}
	if rc := res.CheckRange(); !rc.Bounded {
		t.Errorf("range check %+v, want bounded (no exponential range)", rc)
	}
}

// TestDivergenceLogisticCoverage: λ = ln 2 at r = 4 (exact: conjugacy to the tent map;
// CHECKS.md §1). The interval must hold ln 2 on records of 4000 samples from different initial
// conditions: the bootstrap over reference points alone is too narrow (it ignores the
// dependence on ε); the interval covering every ε's slope holds it. The estimate itself is
// within ±5 % (CHECKS.md §3, suggested tolerance for maps with N = 2000–5000).
func TestDivergenceLogisticCoverage(t *testing.T) {
	miss := 0
	for s := range 8 {
		x := testsignals.Logistic(4000, 4, 0.13+0.1*float64(s), 1001)
		r, err := Divergence(x, Options{Lag: 1, Dim: 1, Theiler: 1, Seed: 1})
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(r.Lambda-math.Ln2) > 0.05*math.Ln2 {
			t.Errorf("x0 = %.2f: λ1 = %v, want ln 2 ± 5 %%", 0.13+0.1*float64(s), r.Lambda)
		}
		if !(r.Interval[0] <= math.Ln2 && math.Ln2 <= r.Interval[1]) {
			miss++
			t.Logf("x0 = %.2f: interval [%v, %v] misses ln 2", 0.13+0.1*float64(s), r.Interval[0], r.Interval[1])
		}
		if r.Interval[0] > r.Bootstrap.Lo || r.Interval[1] < r.Bootstrap.Hi {
			t.Errorf("interval %v does not cover the bootstrap interval [%v, %v]", r.Interval, r.Bootstrap.Lo, r.Bootstrap.Hi)
		}
	}
	// A 95 % interval may miss now and then; more than one miss in 8 (probability about 6 %
	// at 95 % coverage) says it is too narrow (common practice).
	if miss > 1 {
		t.Errorf("the interval misses ln 2 in %d of 8 records", miss)
	}
}

// TestDivergenceTorusInterval: on a torus (sin t + sin φt, φ the golden mean) λ1 = 0 (exact:
// quasiperiodic motion; CHECKS.md §6 lists it as regular). The divergence stays bounded, so a
// slightly positive mean growth must not come with an interval above zero.
func TestDivergenceTorusInterval(t *testing.T) {
	x := sinesX(4000, 0.25)
	r, err := Divergence(x, Options{Lag: 5, Dim: 4, Theiler: 10, Dt: 0.25, Seed: 1})
	if err != nil {
		t.Fatal(err)
	}
	if rc := r.CheckRange(); !rc.Bounded {
		t.Fatalf("range check %+v, want bounded", rc)
	}
	if !(r.Interval[0] <= 0 && 0 <= r.Interval[1]) {
		t.Errorf("λ1 = %v [%v, %v] on a torus; want an interval holding 0", r.Lambda, r.Interval[0], r.Interval[1])
	}
}
