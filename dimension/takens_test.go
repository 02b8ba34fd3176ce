package dimension

import (
	"math"
	"testing"
)

func TestTakensPowerLaw(t *testing.T) {
	// C(r) = (r/R)^D on radii spaced by h in ln r: the trapezoid rule integrates e^{Du} with the
	// factor (hD/2)·coth(hD/2), so the estimate is exactly D / ((hD/2)·coth(hD/2)) (arithmetic;
	// Takens 1985 for D = C(r0)/∫C d ln r).
	for _, d := range []float64{0.8, 1.26, 2.05} {
		const n, h = 30, 0.1
		radii := make([]float64, n)
		c := make([]float64, n)
		for k := range radii {
			radii[k] = math.Exp(-3 + h*float64(k))
			c[k] = math.Pow(radii[k]/radii[n-1], d)
		}
		hd := h * d / 2
		want := d / (hd / math.Tanh(hd))
		if got := Takens(radii, c, n-5); math.Abs(got-want) > 1e-10 {
			t.Errorf("D = %g: Takens %.12f, want %.12f", d, got, want)
		}
	}
	if !math.IsNaN(Takens([]float64{1, 2, 3}, []float64{0, 0, 0}, 2)) {
		t.Error("Takens of an empty correlation sum is not NaN")
	}
}

// TestTakensMatchesResult: the exported estimator gives the value CorrelationDimension reports
// for every fitted curve (the same computation, bit for bit).
func TestTakensMatchesResult(t *testing.T) {
	x := simulate(t, "henon", 3000, 0)
	r, err := CorrelationDimension(x, Options{Lag: 1, MaxDim: 3, Theiler: 2, Threads: 2})
	if err != nil {
		t.Fatal(err)
	}
	fitted := 0
	for _, cv := range r.Curves {
		if !cv.Fitted {
			continue
		}
		fitted++
		if got := Takens(r.Radii, cv.C, cv.To); got != cv.Takens {
			t.Errorf("m = %d: Takens %v, result %v", cv.Dim, got, cv.Takens)
		}
	}
	if fitted == 0 {
		t.Fatal("no fitted curve on the Hénon map")
	}
}
