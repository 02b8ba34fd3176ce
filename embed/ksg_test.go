package embed

import (
	"math"
	"testing"
)

// TestKSGAR1: the KSG estimator on a Gaussian AR(1) process against the exact
// I(k) = −½·ln(1 − φ^{2k}) nats (Cover & Thomas 2006, §8.4; CHECKS.md §5, tag E). KSG 2004
// (Fig. 4) show errors of a few 0.01 nats for Gaussians at N = 10^4 and k = 4 (from memory);
// the stated tolerance is 0.03 nats plus three standard errors.
func TestKSGAR1(t *testing.T) {
	const phi = 0.8
	x := ar1(20000, phi, 21)
	c, err := MutualInformation(x, 4, MIOptions{Estimator: KSG, MaxPoints: 10000, Threads: 2})
	if err != nil {
		t.Fatal(err)
	}
	for k := 1; k <= 4; k++ {
		want := -0.5 * math.Log(1-math.Pow(phi, 2*float64(k)))
		tol := 0.03 + 3*c.Err[k]
		if math.Abs(c.Nats[k]-want) > tol {
			t.Errorf("lag %d: KSG %.4f nats, want %.4f ± %.4f (Cover & Thomas)", k, c.Nats[k], want, tol)
		}
		t.Logf("lag %d: %.4f ± %.4f, want %.4f", k, c.Nats[k], c.Err[k], want)
	}
}

// TestKSGNoise: independent noise gives ≈ 0 (exact I = 0; KSG is unbiased for independent
// variables, KSG 2004 §III): within 4 standard errors and below 0.01 nats.
func TestKSGNoise(t *testing.T) {
	x := whiteNoise(20000, 23)
	c, err := MutualInformation(x, 3, MIOptions{Estimator: KSG, MaxPoints: 10000, Threads: 2})
	if err != nil {
		t.Fatal(err)
	}
	for k := 1; k <= 3; k++ {
		if math.Abs(c.Nats[k]) > math.Max(0.01, 4*c.Err[k]) {
			t.Errorf("lag %d: KSG %.5f ± %.5f nats for independent noise, want ≈ 0", k, c.Nats[k], c.Err[k])
		}
	}
}

// TestKSGLagChoice: the lag rule with the KSG estimator on the maps and the flow of
// TestChooseLag (maps: lag 1; a flow sampled ~60 times per cycle: about a quarter cycle;
// common practice).
func TestKSGLagChoice(t *testing.T) {
	for _, tc := range []struct {
		name   string
		x      []float64
		lo, hi int
	}{
		{"henon", henonX(5000), 1, 1},
		{"rossler 60/cycle", rosslerX(10000, 0.01, 10), 12, 18},
	} {
		c, err := ChooseLag(tc.x, LagOptions{MaxLag: 30, MI: MIOptions{Estimator: KSG, MaxPoints: 5000, Threads: 2}})
		if err != nil {
			t.Fatal(err)
		}
		if c.Lag < tc.lo || c.Lag > tc.hi {
			t.Errorf("%s: KSG lag %d by %s, want [%d, %d]: %s", tc.name, c.Lag, c.Method, tc.lo, tc.hi, c.Reason)
		}
		t.Logf("%s: %d %s: %s", tc.name, c.Lag, c.Method, c.Reason)
	}
}

// TestStrictCount checks the open-interval count (definition).
func TestStrictCount(t *testing.T) {
	s := []float64{0, 1, 1, 2, 3, 3, 4}
	if got := strictCount(s, 2, 1); got != 1 {
		t.Errorf("|v−2| < 1: %d, want 1", got)
	}
	if got := strictCount(s, 2, 1.5); got != 5 {
		t.Errorf("|v−2| < 1.5: %d, want 5", got)
	}
}
