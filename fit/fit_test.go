package fit

import (
	"errors"
	"math"
	"math/rand/v2"
	"testing"

	"gonum.org/v1/gonum/stat"
)

func TestLeastSquaresAnscombe(t *testing.T) {
	// Anscombe (1973), "Graphs in statistical analysis", The American Statistician 27, 17,
	// data set I: fitted line y = 3.00 + 0.500x, standard error of the slope 0.118, R² 0.67
	// (the printed digits; from memory).
	x := []float64{10, 8, 13, 9, 11, 14, 6, 4, 12, 7, 5}
	y := []float64{8.04, 6.95, 7.58, 8.81, 8.33, 9.96, 7.24, 4.26, 10.84, 4.82, 5.68}
	l, err := LeastSquares(x, y)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(l.Slope-0.500) > 0.0005 || math.Abs(l.Intercept-3.00) > 0.005 {
		t.Errorf("line %.4f + %.4f x, want 3.00 + 0.500 x", l.Intercept, l.Slope)
	}
	if math.Abs(l.SlopeSE-0.118) > 0.0005 {
		t.Errorf("slope SE %.4f, want 0.118", l.SlopeSE)
	}
	if math.Abs(l.R2-0.67) > 0.005 {
		t.Errorf("R² %.4f, want 0.67", l.R2)
	}
	// Reference library: gonum stat.LinearRegression and stat.RSquared.
	a, b := stat.LinearRegression(x, y, nil, false)
	if math.Abs(a-l.Intercept) > 1e-12 || math.Abs(b-l.Slope) > 1e-12 {
		t.Errorf("line %v + %v x, gonum gives %v + %v x", l.Intercept, l.Slope, a, b)
	}
	if r2 := stat.RSquared(x, y, nil, a, b); math.Abs(r2-l.R2) > 1e-12 {
		t.Errorf("R² %v, gonum gives %v", l.R2, r2)
	}
	if l.N != 11 || l.At(10) != l.Intercept+10*l.Slope {
		t.Errorf("N = %d, At(10) = %v", l.N, l.At(10))
	}
}

func TestLeastSquaresExactAndErrors(t *testing.T) {
	// Exact: collinear points give the line exactly, zero standard errors and R² = 1.
	x := []float64{1e6, 1e6 + 1, 1e6 + 2, 1e6 + 3}
	y := []float64{-2, 1, 4, 7}
	l, err := LeastSquares(x, y)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(l.Slope-3) > 1e-9 || math.Abs(l.At(1e6)+2) > 1e-6 || l.SlopeSE > 1e-9 || l.R2 != 1 {
		t.Errorf("exact line: %+v", l)
	}
	if _, err := LeastSquares([]float64{1, 1}, []float64{1, 2}); !errors.Is(err, ErrDegenerate) {
		t.Errorf("equal x: err = %v, want ErrDegenerate", err)
	}
	if _, err := LeastSquares([]float64{1}, []float64{1}); !errors.Is(err, ErrDegenerate) {
		t.Errorf("one point: err = %v, want ErrDegenerate", err)
	}
	if _, err := LeastSquares([]float64{1, 2}, []float64{1, math.Inf(-1)}); err == nil {
		t.Error("infinite y accepted")
	}
	if _, err := LeastSquares([]float64{1, 2}, []float64{1}); err == nil {
		t.Error("length mismatch accepted")
	}
}

func seq(n int, x0, dx float64) []float64 {
	x := make([]float64, n)
	for i := range x {
		x[i] = x0 + dx*float64(i)
	}
	return x
}

func TestScalingRangeExactLine(t *testing.T) {
	// Exact: a straight line is one stable range covering every point.
	x := seq(40, -3, 0.25)
	y := make([]float64, len(x))
	for i := range x {
		y[i] = 0.7*x[i] - 2
	}
	r, err := ScalingRange(x, y, RangeOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if r.From != 0 || r.To != 39 {
		t.Errorf("range [%d, %d], want [0, 39]", r.From, r.To)
	}
	if math.Abs(r.Line.Slope-0.7) > 1e-12 || math.Abs(r.Median-0.7) > 1e-12 || r.Spread > 1e-12 {
		t.Errorf("slope %v, median %v, spread %v; want 0.7, 0.7, 0", r.Line.Slope, r.Median, r.Spread)
	}
}

func TestScalingRangeNoisyLine(t *testing.T) {
	// A line with small Gaussian noise: the range covers most of the curve and the slope lies
	// within 4 standard errors of the true one (least-squares theory, Draper & Smith 1998 ch. 1).
	rng := rand.New(rand.NewPCG(1, 2))
	for trial := range 20 {
		x := seq(60, 0, 1)
		y := make([]float64, len(x))
		for i := range x {
			y[i] = 0.42*x[i] + 1 + 0.01*rng.NormFloat64()
		}
		r, err := ScalingRange(x, y, RangeOptions{})
		if err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		if r.To-r.From+1 < 48 {
			t.Errorf("trial %d: range [%d, %d] covers less than 80%% of a straight line", trial, r.From, r.To)
		}
		if d := math.Abs(r.Line.Slope - 0.42); d > 4*r.Line.SlopeSE || r.Line.SlopeSE == 0 {
			t.Errorf("trial %d: slope %v ± %v, want 0.42", trial, r.Line.Slope, r.Line.SlopeSE)
		}
	}
}

func TestScalingRangeKnee(t *testing.T) {
	// Exact: a line up to point 20, then a plateau longer than the line. The range must end at
	// the knee (the first window straddling it has half the slope and breaks the tolerance) and
	// must be the rising part, not the longer plateau.
	const knee = 20
	x := seq(100, 0, 1)
	y := make([]float64, len(x))
	for i := range x {
		y[i] = 0.9 * math.Min(x[i], knee)
	}
	r, err := ScalingRange(x, y, RangeOptions{AbsTol: 1e-3})
	if err != nil {
		t.Fatal(err)
	}
	if r.From != 0 || r.To != knee {
		t.Errorf("range [%d, %d], want [0, %d]", r.From, r.To, knee)
	}
	if math.Abs(r.Line.Slope-0.9) > 1e-12 {
		t.Errorf("slope %v, want 0.9", r.Line.Slope)
	}

	// The same with noise and a curved start (a parabolic transient over the first 4 points,
	// steeper than the line): the range starts after the transient and ends within a point of
	// the knee.
	rng := rand.New(rand.NewPCG(3, 4))
	for trial := range 20 {
		for i := range x {
			v := 0.9 * math.Min(x[i], knee)
			if i < 4 {
				d := 4 - x[i]
				v = 3.6 - 0.9*d - 0.5*d*d
			}
			y[i] = v + 0.005*rng.NormFloat64()
		}
		r, err := ScalingRange(x, y, RangeOptions{AbsTol: 0.05})
		if err != nil {
			t.Fatalf("trial %d: %v", trial, err)
		}
		if r.From > 5 || r.From < 3 || r.To < knee-1 || r.To > knee+1 {
			t.Errorf("trial %d: range [%d, %d], want about [4, %d]", trial, r.From, r.To, knee)
		}
		if math.Abs(r.Line.Slope-0.9) > 0.01 {
			t.Errorf("trial %d: slope %v, want 0.9", trial, r.Line.Slope)
		}
	}
}

func TestScalingRangePlateauRules(t *testing.T) {
	// Exact: a steep straight stretch of 10 points (slope 2), a longer one (slope 1, 40 points)
	// and a plateau of 50 points. The longer non-plateau stretch wins over the steep early one
	// and over the longest piece, the plateau.
	x := seq(100, 0, 1)
	y := make([]float64, len(x))
	for i := range x {
		switch {
		case i <= 10:
			y[i] = 2 * x[i]
		case i <= 50:
			y[i] = 20 + (x[i] - 10)
		default:
			y[i] = 60
		}
	}
	r, err := ScalingRange(x, y, RangeOptions{AbsTol: 1e-3})
	if err != nil {
		t.Fatal(err)
	}
	if r.From != 10 || r.To != 50 || math.Abs(r.Line.Slope-1) > 1e-12 || r.Plateau {
		t.Errorf("range [%d, %d] slope %v, want [10, 50] slope 1", r.From, r.To, r.Line.Slope)
	}
	// With FlatRise 50 both rising stretches count as plateaus (they rise by 20 and 40), so the
	// longest of all, the true plateau [50, 99], is returned.
	r, err = ScalingRange(x, y, RangeOptions{AbsTol: 1e-3, FlatRise: 50})
	if err != nil || r.From != 50 || r.To != 99 || !r.Plateau {
		t.Errorf("FlatRise 50: range [%d, %d] (%v), want [50, 99]", r.From, r.To, err)
	}
	// A flat curve is an answer: its flat range is returned (slope 0).
	for i := range y {
		y[i] = 3
	}
	r, err = ScalingRange(x, y, RangeOptions{AbsTol: 1e-6})
	if err != nil || r.From != 0 || r.To != 99 || r.Line.Slope != 0 {
		t.Errorf("flat: range [%d, %d] slope %v (%v), want [0, 99] slope 0", r.From, r.To, r.Line.Slope, err)
	}
}

func TestScalingRangeNone(t *testing.T) {
	// An exponential has no linear range: neighbouring local slopes differ by the factor e,
	// far beyond a 20 % tolerance (exact).
	x := seq(30, 0, 1)
	y := make([]float64, len(x))
	for i := range x {
		y[i] = math.Exp(x[i])
	}
	if _, err := ScalingRange(x, y, RangeOptions{}); !errors.Is(err, ErrNoRange) {
		t.Errorf("exponential: err = %v, want ErrNoRange", err)
	}
	// White noise around zero: local slopes change sign at random, no range is stable with a
	// relative tolerance only (common practice: a slope of noise is not a slope).
	rng := rand.New(rand.NewPCG(5, 6))
	for i := range y {
		y[i] = rng.NormFloat64()
	}
	_, err := ScalingRange(x, y, RangeOptions{})
	if !errors.Is(err, ErrNoRange) {
		t.Errorf("noise: err = %v, want ErrNoRange", err)
	}
	// A curve too short for any range.
	if _, err := ScalingRange(x[:4], y[:4], RangeOptions{}); !errors.Is(err, ErrNoRange) {
		t.Errorf("4 points: err = %v, want ErrNoRange", err)
	}
}

func TestScalingRangeOptions(t *testing.T) {
	x := seq(50, 0, 1)
	y := make([]float64, len(x))
	for i := range x {
		y[i] = 2 * x[i]
	}
	// Exact: a -Inf (log 0) at point 10 splits the line into [0, 9] and the longer [11, 49];
	// From/To restrict the search.
	y[10] = math.Inf(-1)
	r, err := ScalingRange(x, y, RangeOptions{})
	if err != nil {
		t.Fatal(err)
	}
	if r.From != 11 || r.To != 49 {
		t.Errorf("with -Inf at 10: range [%d, %d], want [11, 49]", r.From, r.To)
	}
	r, err = ScalingRange(x, y, RangeOptions{To: 10})
	if err != nil || r.From != 0 || r.To != 9 {
		t.Errorf("To 10: range [%d, %d] (%v), want [0, 9]", r.From, r.To, err)
	}
	r, err = ScalingRange(x, y, RangeOptions{From: 15, To: 40})
	if err != nil {
		t.Fatal(err)
	}
	if r.From != 15 || r.To != 39 {
		t.Errorf("From 15, To 40: range [%d, %d], want [15, 39]", r.From, r.To)
	}
	bad := []RangeOptions{{Window: 1}, {RelTol: -1}, {From: 30, To: 20}, {To: 51}, {Window: 6, MinPoints: 4}}
	for _, o := range bad {
		if _, err := ScalingRange(x, y, o); err == nil || errors.Is(err, ErrNoRange) {
			t.Errorf("options %+v: err = %v, want an option error", o, err)
		}
	}
	xd := seq(50, 0, 1)
	xd[20] = xd[19]
	if _, err := ScalingRange(xd, y, RangeOptions{}); err == nil {
		t.Error("non-increasing x accepted")
	}
	if s := LocalSlopes(x[:5], []float64{0, 1, 2, 3, 4}, 2); len(s) != 4 || s[0] != 1 || s[3] != 1 {
		t.Errorf("LocalSlopes = %v, want [1 1 1 1]", s)
	}
}

func TestBootstrapMean(t *testing.T) {
	// The percentile interval of a mean of n i.i.d. N(0,1) values has half-width close to
	// 1.96/√n (central limit theorem; Efron & Tibshirani 1993 ch. 13); allow 15 %.
	const n = 2000
	rng := rand.New(rand.NewPCG(7, 8))
	v := make([]float64, n)
	for i := range v {
		v[i] = rng.NormFloat64()
	}
	mean := func(idx []int) float64 {
		var s float64
		for _, i := range idx {
			s += v[i]
		}
		return s / float64(len(idx))
	}
	iv, err := Bootstrap(rand.New(rand.NewPCG(1, 1)), n, 1000, 0.95, mean)
	if err != nil {
		t.Fatal(err)
	}
	half := (iv.Hi - iv.Lo) / 2
	if want := 1.96 / math.Sqrt(n); math.Abs(half-want) > 0.15*want {
		t.Errorf("half-width %v, want %v ± 15%%", half, want)
	}
	m := stat.Mean(v, nil)
	if !(iv.Lo < m && m < iv.Hi) {
		t.Errorf("interval [%v, %v] does not contain the sample mean %v", iv.Lo, iv.Hi, m)
	}
	if iv.Reps != 1000 || iv.Failed != 0 || iv.Level != 0.95 {
		t.Errorf("reps %d failed %d level %v", iv.Reps, iv.Failed, iv.Level)
	}
	// Reproducible: the same seed gives the same interval.
	iv2, _ := Bootstrap(rand.New(rand.NewPCG(1, 1)), n, 1000, 0.95, mean)
	if iv2 != iv {
		t.Errorf("same seed, different intervals: %+v and %+v", iv, iv2)
	}
	// Failures are counted and too many refuse the interval.
	k := 0
	flaky := func(idx []int) float64 {
		k++
		if k%4 == 0 {
			return math.NaN()
		}
		return mean(idx)
	}
	iv3, err := Bootstrap(rand.New(rand.NewPCG(1, 1)), n, 100, 0.9, flaky)
	if err != nil || iv3.Failed != 25 || iv3.Reps != 75 {
		t.Errorf("flaky statistic: %+v, %v; want 25 failed, 75 used", iv3, err)
	}
	if _, err := Bootstrap(rand.New(rand.NewPCG(1, 1)), n, 10, 0.9, func([]int) float64 { return math.NaN() }); err == nil {
		t.Error("all-NaN statistic gave an interval")
	}
	if _, err := Bootstrap(nil, n, 10, 0.9, mean); err == nil {
		t.Error("nil rng accepted")
	}
	if _, err := Bootstrap(rng, n, 10, 1, mean); err == nil {
		t.Error("level 1 accepted")
	}
}

func TestQuantile(t *testing.T) {
	// Hyndman & Fan (1996) type 7 on 1..5: exact order statistics and midpoints.
	s := []float64{1, 2, 3, 4, 5}
	for _, c := range []struct{ p, want float64 }{{0, 1}, {0.25, 2}, {0.5, 3}, {0.1, 1.4}, {1, 5}, {2, 5}} {
		if got := Quantile(s, c.p); math.Abs(got-c.want) > 1e-12 {
			t.Errorf("Quantile(%v) = %v, want %v", c.p, got, c.want)
		}
	}
	if !math.IsNaN(Quantile(nil, 0.5)) {
		t.Error("empty slice: want NaN")
	}
}
