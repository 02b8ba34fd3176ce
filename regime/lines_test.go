package regime

import (
	"math"
	"testing"

	"unfold/models"
)

func TestLineAnalysis(t *testing.T) {
	cases := []struct {
		name string
		x    []float64
		want LineKind
		nf   int
	}{
		// A sine has one line (exact).
		{"sine", sine(8000, 37.7), LinesPeriodic, 1},
		// Logistic r = 3.5 is period 4 (CHECKS.md §1, tag E): lines at 1/4 and 1/2.
		{"logistic 3.5", simulate(t, "logistic", "x", models.Values{"r": {3.5}}, 8000, 0, 1), LinesPeriodic, 1},
		// Two sines in the golden-mean ratio: a 2-torus (exact).
		{"two sines", twoSines(8000), LinesQuasiperiodic, 2},
		// Logistic r = 4 has a flat spectrum (conjugacy to the tent map; CHECKS.md §1, E).
		{"logistic 4", simulate(t, "logistic", "x", models.Values{"r": {4}}, 8000, 0, 1), LinesBroadband, 0},
		// AR(1) has a continuous spectrum (exact).
		{"ar1", ar1(8000, 0.9, 1), LinesBroadband, 0},
	}
	for _, c := range cases {
		l, err := LineAnalysis(c.x, 1, LineOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if l.Kind != c.want || len(l.Fundamentals) != c.nf {
			t.Errorf("%s: kind %s with %d fundamentals, want %s with %d", c.name, l.Kind, len(l.Fundamentals), c.want, c.nf)
		}
	}
	l, _ := LineAnalysis(sine(8000, 37.7), 0.5, LineOptions{})
	// The fundamental of a sine of period 37.7 samples at dt = 0.5 is 1/(37.7·0.5) (exact);
	// tolerance half a bin of the full periodogram.
	if f := l.Fundamentals[0]; math.Abs(f-1/(37.7*0.5)) > 0.5/8000/0.5 {
		t.Errorf("fundamental %g, want %g", f, 1/(37.7*0.5))
	}
}

func TestZeroOne(t *testing.T) {
	cases := []struct {
		name   string
		x      []float64
		sub    int
		chaos  bool
		source string
	}{
		{"logistic 3.97", simulate(t, "logistic", "x", models.Values{"r": {3.97}}, 10000, 0, 1), 1, true, "K near 1: Gottwald & Melbourne 2004; CHECKS.md §6 (E/C-derived)"},
		{"logistic 4", simulate(t, "logistic", "x", models.Values{"r": {4}}, 10000, 0, 1), 1, true, "CHECKS.md §6"},
		{"logistic 3.55", simulate(t, "logistic", "x", models.Values{"r": {3.55}}, 10000, 0, 1), 1, false, "K near 0: Gottwald & Melbourne 2004"},
		{"logistic 3.83", simulate(t, "logistic", "x", models.Values{"r": {3.83}}, 10000, 0, 1), 1, false, "period 3, resonant c absorbed by the median: CHECKS.md §6 (V)"},
		{"two sines", twoSines(10000), 1, false, "quasiperiodic: GM 2009 validity paper, CHECKS.md §6 (V)"},
		{"lorenz subsampled", simulate(t, "lorenz", "x", nil, 40000, 0.01, 1), 16, true, "flows subsampled as GM 2009 advise; CHECKS.md §6 (M)"},
	}
	for _, c := range cases {
		r, err := ZeroOne(c.x, ZeroOneOptions{Subsample: c.sub, Cs: 40, Seed: 3})
		if err != nil {
			t.Fatal(err)
		}
		// Tolerances K > 0.9 and K < 0.1 for N = 10⁴: CHECKS.md §6.
		if c.chaos && !(r.K > 0.9) || !c.chaos && !(r.K < 0.1) {
			t.Errorf("%s: K = %.3f (%s)", c.name, r.K, c.source)
		}
	}
}

func TestRankAndReversal(t *testing.T) {
	// Rank p-values (Theiler et al. 1992): data below all 19 surrogates gives 1/20 (exact).
	surr := make([]float64, 19)
	for i := range surr {
		surr[i] = float64(i + 1)
	}
	if r := Rank("e", 0, surr, Smaller); r.P != 0.05 || !r.Rejects(0.05, 0) {
		t.Errorf("one-sided p = %g", r.P)
	}
	if r := Rank("e", 10, surr, TwoSided); r.P != 1 {
		t.Errorf("two-sided p of the median = %g, want 1", r.P)
	}
	// A time-symmetric signal has Q ≈ 0 (exact up to the 1000/20 = 50 whole periods plus end
	// effects of order 1/N).
	if q := ReversalAsymmetry(sine(1000, 20), 1); math.Abs(q) > 1e-2 {
		t.Errorf("sine asymmetry %g", q)
	}
	// Logistic r = 4 is irreversible: slow rises, fast falls, Q clearly non-zero (derived).
	if q := ReversalAsymmetry(simulate(t, "logistic", "x", models.Values{"r": {4}}, 5000, 0, 1), 1); math.Abs(q) < 0.3 {
		t.Errorf("logistic asymmetry %g", q)
	}
}
