package partition

import (
	"math"
	"testing"

	"unfold/models"
)

func iterate(f func(float64) float64, x0 float64, n int) []float64 {
	x := x0
	for i := 0; i < 1000; i++ {
		x = f(x)
	}
	out := make([]float64, n)
	for i := range out {
		x = f(x)
		out[i] = x
	}
	return out
}

// fromModel turns a one-dimensional map of package models into a function.
func fromModel(m models.Map) func(float64) float64 {
	dst, src := make([]float64, 1), make([]float64, 1)
	return func(x float64) float64 {
		src[0] = x
		m.Step(dst, src)
		return dst[0]
	}
}

var (
	// logistic map r = 4 (models.Logistic; CHECKS.md §13)
	logisticMap = fromModel(models.Logistic{R: 4})
	// tent map with μ = 1.99 (CHECKS.md §1: μ = 2 collapses in floating point; use μ below 2)
	tentMap = fromModel(models.Tent{Mu: 1.99})
)

// skewed is our own unimodal map, conjugate to the logistic map r = 4 by φ(x) = x²:
// g(x) = sqrt(4x²(1−x²)) = 2x·sqrt(1−x²), with its maximum at x = 1/√2 ≈ 0.7071 (exact: the
// critical point of g is φ⁻¹(1/2)), so its generating cut is at 1/√2 and its entropy ln 2.
func skewed(x float64) float64 { return 2 * x * math.Sqrt(math.Max(1-x*x, 0)) }

func TestSearchLogistic(t *testing.T) {
	x := iterate(logisticMap, 0.3, 20000)
	r, err := Search(x, SearchOptions{})
	if err != nil {
		t.Fatal(err)
	}
	// issue 7 / CHECKS.md §9 (E): the generating partition of the logistic map r = 4 is the
	// cut at the critical point 1/2; the search must find 0.5 ± 0.02.
	if c := r.Thresholds[0]; math.Abs(c-0.5) > 0.02 {
		t.Errorf("logistic: search cut %.4f, want 0.5 ± 0.02 (score %.4f)", c, r.Score)
	}
	// h = 1 bit (Pesin; λ = ln 2, CHECKS.md §1 E) — Miller–Madow estimate at N = 2·10⁴.
	if math.Abs(r.EntropyRate-1) > 0.02 {
		t.Errorf("logistic: entropy rate %.4f, want 1 bit", r.EntropyRate)
	}
	// CHECKS.md §9 symbolic-FNN row (M): ≈ 0 at ½, > 0 for a shifted cut.
	shift, _ := Threshold([]float64{0.6})
	f, _, err := Score(x, shift, SearchOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if !(f > 5*r.Score+0.01) {
		t.Errorf("SFNN at 0.6 = %.4f, should clearly exceed the one at the best cut (%.4f)", f, r.Score)
	}
}

func TestSearchTentAndSkewed(t *testing.T) {
	cases := []struct {
		name string
		f    func(float64) float64
		want float64
	}{
		{"tent μ = 1.99", tentMap, 0.5},              // the maximum of the tent map (exact)
		{"skewed 2x√(1−x²)", skewed, 1 / math.Sqrt2}, // its maximum (exact, see skewed)
	}
	for _, c := range cases {
		x := iterate(c.f, 0.3, 20000)
		r, err := Search(x, SearchOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(r.Thresholds[0]-c.want) > 0.02 {
			t.Errorf("%s: search cut %.4f, want %.4f ± 0.02", c.name, r.Thresholds[0], c.want)
		}
		cr, err := CriticalPoint(x, CriticalOptions{})
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(cr.Cut-c.want) > 0.01 || cr.Extremum != "maximum" {
			t.Errorf("%s: critical cut %.4f (%s), want the maximum at %.4f ± 0.01", c.name, cr.Cut, cr.Extremum, c.want)
		}
	}
	x := iterate(logisticMap, 0.3, 20000)
	cr, err := CriticalPoint(x, CriticalOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(cr.Cut-0.5) > 0.005 {
		t.Errorf("logistic: critical cut %.4f, want 0.5 (exact)", cr.Cut)
	}
	// a monotone "map" has no critical point
	mono := make([]float64, 500)
	for i := range mono {
		mono[i] = float64(i)
	}
	if _, err := CriticalPoint(mono, CriticalOptions{}); err == nil {
		t.Errorf("monotone record: expected an error")
	}
}

func TestSearchAlphabet3(t *testing.T) {
	// three symbols on the logistic map: every refinement of the generating cut at ½ is
	// generating, so the best 3-symbol partition keeps a cut near ½ and has h ≥ 1 bit
	// (common practice; h_KS = 1 bit is a lower bound for any generating refinement's rate).
	x := iterate(logisticMap, 0.3, 20000)
	r, err := Search(x, SearchOptions{Alphabet: 3})
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Thresholds) != 2 {
		t.Fatalf("thresholds %v", r.Thresholds)
	}
	near := math.Min(math.Abs(r.Thresholds[0]-0.5), math.Abs(r.Thresholds[1]-0.5))
	if near > 0.03 {
		t.Errorf("3 symbols: cuts %v, one should be near 0.5", r.Thresholds)
	}
}

func TestPartitions(t *testing.T) {
	p, err := Threshold([]float64{2, 1})
	if err != nil {
		t.Fatal(err)
	}
	got := p.Apply([]float64{0.5, 1, 1.5, 2, 3}, nil)
	want := []uint8{0, 1, 1, 2, 2}
	for i := range want {
		if got[i] != want[i] {
			t.Fatalf("Apply = %v, want %v", got, want)
		}
	}
	if _, err := Threshold([]float64{1, 1}); err == nil {
		t.Error("duplicate thresholds accepted")
	}
	x := make([]float64, 1000)
	for i := range x {
		x[i] = float64(i)
	}
	q, err := Quantile(x, 4)
	if err != nil {
		t.Fatal(err)
	}
	s := q.Apply(x, nil)
	var c [4]int
	for _, v := range s {
		c[v]++
	}
	for k, n := range c {
		if n != 250 {
			t.Errorf("quantile symbol %d has %d values, want 250 (equal populations by construction)", k, n)
		}
	}
}

func TestSectionSine(t *testing.T) {
	// x(t) = sin(2π t / P) sampled at dt: upward crossings of 0 at t = k P exactly; the
	// in-plane coordinate at lag τ is sin(2π τ dt / P) (exact).
	const P, dt = 3.7, 0.05
	n := 4000
	x := make([]float64, n)
	for i := range x {
		x[i] = math.Sin(2 * math.Pi * float64(i) * dt / P)
	}
	for _, m := range []Interp{Linear, Cubic} {
		s, err := TakeSection(x, dt, 0, SectionOptions{Lag: 10, Dim: 2, Level: 0, LevelSet: true, Direction: 1, Interp: m})
		if err != nil {
			t.Fatal(err)
		}
		tol := map[Interp]float64{Linear: 2e-3, Cubic: 2e-5}[m]
		for k, tk := range s.Times {
			want := float64(k+1) * P
			if math.Abs(tk-want) > tol {
				t.Fatalf("%v: crossing %d at %.6f, want %.6f", m, k, tk, want)
			}
		}
		u := math.Sin(2 * math.Pi * 10 * dt / P)
		if v := s.Values()[0]; math.Abs(v-u) > 10*tol {
			t.Errorf("%v: in-plane value %.6f, want %.6f", m, v, u)
		}
		if math.Abs(s.MeanReturn-P) > tol {
			t.Errorf("%v: mean return %.5f, want %.5f", m, s.MeanReturn, P)
		}
		if len(s.Cautions) == 0 {
			t.Errorf("%v: %d crossings should give a caution", m, s.Len())
		}
	}
	// maxima at t = P/4 + kP, height 1 (exact); parabola refinement error O(dt²)
	s, err := TakeSection(x, dt, 0, SectionOptions{Maxima: true})
	if err != nil {
		t.Fatal(err)
	}
	for k, tk := range s.Times {
		if math.Abs(tk-(P/4+float64(k)*P)) > 1e-3 || math.Abs(s.Points[k]-1) > 1e-4 {
			t.Fatalf("maximum %d at %.5f height %.6f", k, tk, s.Points[k])
		}
	}
}

func TestDecideRecord(t *testing.T) {
	x := iterate(logisticMap, 0.3, 5000)
	if r := DecideRecord(x, 1); r.Kind != "map" {
		t.Errorf("logistic: %s", r.Reason)
	}
	y := make([]float64, 5000)
	for i := range y {
		y[i] = math.Sin(float64(i) * 0.05)
	}
	if r := DecideRecord(y, 31); r.Kind != "flow" {
		t.Errorf("sine: %s", r.Reason)
	}
}

func TestSearchQuantised(t *testing.T) {
	// logistic iterates rounded to 1/500: many repeated values; the cut must still be found
	// at 0.5 ± 0.02 (CHECKS.md §9 generating partition, E).
	x := iterate(logisticMap, 0.3, 20000)
	for i, v := range x {
		x[i] = math.Round(v*500) / 500
	}
	r, err := Search(x, SearchOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(r.Thresholds[0]-0.5) > 0.02 {
		t.Errorf("quantised logistic: cut %.4f, want 0.5 ± 0.02 (score %.4f)", r.Thresholds[0], r.Score)
	}
}

func TestSearchNoiseCaution(t *testing.T) {
	// i.i.d. uniform noise has no generating partition in a 2-dimensional return map: its
	// symbolic neighbours are mostly false, so the search must say so (common practice).
	x := iterate(func(float64) float64 { return 0 }, 0, 5000)
	state := uint64(12345)
	for i := range x {
		state = state*6364136223846793005 + 1442695040888963407
		x[i] = float64(state>>11) / (1 << 53)
	}
	r, err := Search(x, SearchOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if r.Score < 0.1 || len(r.Cautions) == 0 {
		t.Errorf("noise: SFNN %.3f, cautions %v; want > 0.1 with a caution", r.Score, r.Cautions)
	}
}
