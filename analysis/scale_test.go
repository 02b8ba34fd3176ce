package analysis

import (
	"math"
	"testing"

	"unfold/series"
)

// TestScaledForChain: only extreme magnitudes are rescaled, by an exact power of two.
func TestScaledForChain(t *testing.T) {
	s := &series.Series{Values: []float64{1, -2, 3}}
	if c, e := scaledForChain(s); e != 0 || c != s {
		t.Errorf("ordinary magnitudes were rescaled (e = %d)", e)
	}
	d := &series.Series{Values: []float64{1e-310, 0, 2e-310}}
	c, e := scaledForChain(d)
	if e == 0 {
		t.Fatal("denormal magnitudes were not rescaled")
	}
	for i, v := range c.Values {
		if math.Ldexp(v, e) != d.Values[i] {
			t.Errorf("value %d: %g·2^%d ≠ %g (the scaling is not exact)", i, v, e, d.Values[i])
		}
	}
}

// TestUnscale: quantities in signal units return to the input's units (×2^e, logs +e·ln 2);
// scale-free ones stay.
func TestUnscale(t *testing.T) {
	eps := 0.25
	lam := 0.9
	res := &Result{Lyapunov: &LyapunovStage{}, Fractal: &FractalStage{}}
	res.Lyapunov.Body = LyapunovResult{Eps: &eps, LambdaMax: &lam, Divergence: []DivergencePoint{{Step: 1, MeanLog: -2}}}
	res.Fractal.Body = FractalResult{D2: 2.05, ScalingRange: [2]float64{0.125, 0.5}, CorrelationSum: []CsumPoint{{Dimension: 3, R: 0.5, C: 0.1}}}
	Unscale(res, -1000)
	l, f := res.Lyapunov.Body, res.Fractal.Body
	if *l.Eps != math.Ldexp(0.25, -1000) || *l.LambdaMax != 0.9 {
		t.Errorf("lyapunov: eps %g, λ %g", *l.Eps, *l.LambdaMax)
	}
	if want := -2 - 1000*math.Ln2; math.Abs(l.Divergence[0].MeanLog-want) > 1e-9 {
		t.Errorf("mean log %g, want %g", l.Divergence[0].MeanLog, want)
	}
	if f.D2 != 2.05 || f.ScalingRange[1] != math.Ldexp(0.5, -1000) || f.CorrelationSum[0].R != math.Ldexp(0.5, -1000) || f.CorrelationSum[0].C != 0.1 {
		t.Errorf("fractal: %+v", f)
	}
	if len(l.Cautions) != 1 || len(f.Cautions) != 1 {
		t.Error("no caution says the record ran scaled")
	}
}
