package embed

import (
	"math"
	"testing"
)

func TestChooseLag(t *testing.T) {
	noisySine := sine(20000, 60.37)
	for i, w := range whiteNoise(20000, 5) {
		noisySine[i] += 0.2 * w
	}
	cases := []struct {
		name   string
		x      []float64
		lo, hi int
		method string // "" = any
		source string
	}{
		// A sine: a quarter period (common practice). Period 60.37 samples → 15.1.
		{"sine", sine(20000, 60.37), 14, 16, "", "common practice: quarter period"},
		{"noisy sine", noisySine, 13, 17, MethodFirstMinimum, "common practice: quarter period"},
		// A flow sampled about 60 times per cycle (Rössler, period ≈ 6.07 time units, Δt = 0.1):
		// about a quarter cycle, 15 samples (issue acceptance; common practice).
		{"rossler 60/cycle", rosslerX(20000, 0.01, 10), 12, 18, MethodFirstMinimum, "common practice: quarter cycle"},
		// Lorenz x, Δt = 0.01: first minimum of the information in [8, 20] samples
		// (CHECKS.md §5, Fraser & Swinney 1986, tag M: a broad range only).
		{"lorenz", lorenzX(50000, 0.01), 8, 20, MethodFirstMinimum, "Fraser & Swinney 1986 (M)"},
		// Maps get lag 1 (issue acceptance; common practice).
		{"henon", henonX(20000), 1, 1, "", "common practice: maps use unit delay"},
		{"logistic", logisticX(20000), 1, 1, "", "common practice: maps use unit delay"},
		// Independent noise: the information is at the bias level at lag 1 (exact: I = 0).
		{"noise", whiteNoise(20000, 3), 1, 1, MethodBiasLevel, "exact: independent samples"},
	}
	for _, tc := range cases {
		c, err := ChooseLag(tc.x, LagOptions{MI: MIOptions{Threads: 2}})
		if err != nil {
			t.Fatalf("%s: %v", tc.name, err)
		}
		if c.Lag < tc.lo || c.Lag > tc.hi || (tc.method != "" && c.Method != tc.method) {
			t.Errorf("%s: lag %d by %s, want [%d, %d] by %q (%s); %s", tc.name, c.Lag, c.Method, tc.lo, tc.hi, tc.method, tc.source, c.Reason)
		}
		t.Logf("%s: lag %d, %s: %s", tc.name, c.Lag, c.Method, c.Reason)
	}
}

// TestChooseLagOneOverE: an AR(1) process has a monotone information curve, −½ln(1−φ^{2k})
// (Cover & Thomas), so it has no minimum and is correlated beyond lag 1 for φ = 0.95; the 1/e
// rule must apply, and the lag it gives must be the first below I(0)/e on the curve itself.
func TestChooseLagOneOverE(t *testing.T) {
	x := ar1(10000, 0.95, 4)
	c, err := ChooseLag(x, LagOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if c.Method != MethodOneOverE {
		t.Fatalf("method %s, want %s: %s", c.Method, MethodOneOverE, c.Reason)
	}
	I := c.MI.Nats
	if !(I[c.Lag] < I[0]/math.E) || (c.Lag > 1 && I[c.Lag-1] < I[0]/math.E) {
		t.Errorf("lag %d is not the first with I < I(0)/e: %v", c.Lag, I[:c.Lag+1])
	}
}

// TestAutocorrelationExtremeMagnitudes: R is scale-free and the record is scaled by a power
// of two before the transform, so records of the same small integers times 2^−1060 (denormal)
// or 2^1000 (near 1e301) give the R of the unit-scale record exactly (arithmetic), not "the
// record is constant" or NaN.
func TestAutocorrelationExtremeMagnitudes(t *testing.T) {
	x := make([]float64, 300)
	for i := range x {
		x[i] = float64((i*i)%11) - 5
	}
	ref, err := AutocorrelationFFT(x, 40)
	if err != nil {
		t.Fatal(err)
	}
	for _, k := range []int{-1060, 1000} {
		y := make([]float64, len(x))
		for i, v := range x {
			y[i] = math.Ldexp(v, k)
		}
		a, err := AutocorrelationFFT(y, 40)
		if err != nil {
			t.Fatalf("2^%d: %v", k, err)
		}
		for j := range ref.R {
			if a.R[j] != ref.R[j] {
				t.Fatalf("2^%d: R[%d] = %v, want %v", k, j, a.R[j], ref.R[j])
			}
		}
	}
}
