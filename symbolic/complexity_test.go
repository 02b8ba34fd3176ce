package symbolic

import (
	"math"
	"math/rand/v2"
	"testing"
)

func TestComplexityEndpoints(t *testing.T) {
	// both curves are 0 at H = 0 and H = 1 (Martin, Plastino & Rosso 2006, exact): at H = 0 the
	// distribution is a delta, at H = 1 it is uniform
	for _, n := range []int{2, 6, 24, 720} {
		for _, h := range []float64{0, 1} {
			if lo, hi := ComplexityBounds(n, h); lo != 0 || hi != 0 {
				t.Errorf("N = %d, H = %g: bounds %g, %g; want 0, 0", n, h, lo, hi)
			}
		}
		// a delta has Q_J = 1 by the choice of Q0 and H = 0, so C = 0; the uniform has H = 1, C = 0
		delta := make([]int64, n)
		delta[0] = 5
		if pt, _ := JensenShannonComplexity(delta); pt.Entropy != 0 || pt.Complexity != 0 {
			t.Errorf("delta over %d: %+v", n, pt)
		}
		uni := make([]int64, n)
		for i := range uni {
			uni[i] = 3
		}
		if pt, _ := JensenShannonComplexity(uni); math.Abs(pt.Entropy-1) > 1e-12 || math.Abs(pt.Complexity) > 1e-12 {
			t.Errorf("uniform over %d: %+v", n, pt)
		}
		// the curves bound each other and the family points (exact by construction)
		for _, h := range []float64{0.1, 0.3, 0.5, 0.7, 0.9} {
			lo, hi := ComplexityBounds(n, h)
			if !(lo >= 0 && lo <= hi+1e-12 && hi < 1) {
				t.Errorf("N = %d, H = %g: bounds %g, %g", n, h, lo, hi)
			}
		}
	}
	// every distribution lies between the curves (Martin, Plastino & Rosso 2006, exact)
	r := rand.New(rand.NewPCG(5, 6))
	for trial := 0; trial < 200; trial++ {
		c := make([]int64, 24)
		for i := range c {
			if r.IntN(3) > 0 {
				c[i] = int64(r.IntN(1000 * (1 + trial%7)))
			}
		}
		c[0]++
		pt, _ := JensenShannonComplexity(c)
		lo, hi := ComplexityBounds(24, pt.Entropy)
		if pt.Complexity < lo-1e-9 || pt.Complexity > hi+1e-9 {
			t.Errorf("counts %v: H = %.4f, C = %.4f outside %.4f … %.4f", c, pt.Entropy, pt.Complexity, lo, hi)
		}
	}
	// Q0 normalisation: the Jensen–Shannon divergence of a delta from the uniform, times Q0, is 1
	// (Rosso et al. 2007, definition of Q0)
	n := 24
	pe := 1 / float64(n)
	js := -(xlogx((1+pe)/2) + float64(n-1)*xlogx(pe/2)) - 0 - math.Log(float64(n))/2
	if q := jsQ0(n) * js; math.Abs(q-1) > 1e-12 {
		t.Errorf("Q0·J[δ, Pe] = %g, want 1", q)
	}
}

func TestComplexityWhiteNoise(t *testing.T) {
	// white noise: H ≈ 1 and C ≈ 0 (Rosso et al. 2007, Fig. 1: noise at the lower-right corner)
	r := rand.New(rand.NewPCG(1, 2))
	x := make([]float64, 200_000)
	for i := range x {
		x[i] = r.NormFloat64()
	}
	p, err := PermutationEntropy(x, 5, 1)
	if err != nil {
		t.Fatal(err)
	}
	pt := p.Complexity()
	if pt.Entropy < 0.99 || pt.Complexity > 0.01 {
		t.Errorf("white noise D = 5: H = %.4f, C = %.4f; want H ≈ 1, C ≈ 0", pt.Entropy, pt.Complexity)
	}
}

func TestComplexityLogistic(t *testing.T) {
	// logistic map r = 4, D = 6: between the curves and near the maximum one (Rosso et al. 2007,
	// Fig. 1, from memory: the chaotic maps lie close to the upper curve); "near" is taken as
	// more than three quarters of the way from the lower curve to the upper one
	x := make([]float64, 200_000)
	v := 0.3
	for i := range x {
		v = 4 * v * (1 - v)
		x[i] = v
	}
	p, err := PermutationEntropy(x, 6, 1)
	if err != nil {
		t.Fatal(err)
	}
	pt := p.Complexity()
	lo, hi := ComplexityBounds(720, pt.Entropy)
	if !(pt.Complexity > lo && pt.Complexity <= hi) || (pt.Complexity-lo) < 0.75*(hi-lo) {
		t.Errorf("logistic D = 6: H = %.4f, C = %.4f; curves %.4f … %.4f", pt.Entropy, pt.Complexity, lo, hi)
	}
	t.Logf("logistic D = 6: H = %.4f, C = %.4f; curves %.4f … %.4f", pt.Entropy, pt.Complexity, lo, hi)
}
