package series

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

func TestDescribeSinePeriod(t *testing.T) {
	// A sine with a period of 50 samples at Dt = 0.1 has its periodogram peak at 5 time units
	// (exact: the record holds a whole number of periods).
	n := 5000
	x := make([]float64, n)
	for i := range x {
		x[i] = 3 + 2*math.Sin(2*math.Pi*float64(i)/50)
	}
	sm, err := Describe(&Series{Values: x, Dt: 0.1})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(sm.DominantPeriod-5) > 1e-6 {
		t.Errorf("dominant period %g, want 5", sm.DominantPeriod)
	}
	// mean 3 and standard deviation 2/√2 of a sine over whole periods (exact).
	if math.Abs(sm.Mean-3) > 1e-9 || math.Abs(sm.Std-math.Sqrt2) > 1e-9 {
		t.Errorf("mean %g std %g, want 3 and √2", sm.Mean, sm.Std)
	}
	if math.Abs(sm.Duration-499.9) > 1e-9 {
		t.Errorf("duration %g, want 499.9", sm.Duration)
	}
	if !sm.Stationarity.Stationary {
		t.Errorf("a sine was reported non-stationary: %+v", sm.Stationarity)
	}
}

func TestDescribePeriodNonIntegerBins(t *testing.T) {
	// A period of 37.3 samples does not fall on a bin; the parabolic refinement must bring the
	// estimate within 1% (common practice for peak interpolation).
	n := 4099 // prime length: the transform is zero padded
	x := make([]float64, n)
	for i := range x {
		x[i] = math.Cos(2 * math.Pi * float64(i) / 37.3)
	}
	sm, err := Describe(&Series{Values: x, Dt: 1})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(sm.DominantPeriod-37.3)/37.3 > 0.01 {
		t.Errorf("dominant period %g, want 37.3 within 1%%", sm.DominantPeriod)
	}
}

func TestDescribeQuantization(t *testing.T) {
	// Values rounded to two decimals have a quantisation step of 0.01 (exact by construction).
	r := rand.New(rand.NewPCG(1, 2))
	x := make([]float64, 2000)
	for i := range x {
		x[i] = math.Round(r.NormFloat64()*100) / 100
	}
	sm, err := Describe(&Series{Values: x, Dt: 1})
	if err != nil {
		t.Fatal(err)
	}
	if sm.Quantization != 0.01 {
		t.Errorf("quantization %v, want 0.01", sm.Quantization)
	}
}

func TestCorrelationTimeAR1(t *testing.T) {
	// The integrated autocorrelation time of an AR(1) process with coefficient φ is
	// (1+φ)/(1−φ) (textbook: Priestley 1981, Spectral Analysis and Time Series); φ = 0.9 gives 19.
	r := rand.New(rand.NewPCG(3, 4))
	n := 200000
	x := make([]float64, n)
	for i := 1; i < n; i++ {
		x[i] = 0.9*x[i-1] + r.NormFloat64()
	}
	m, s := meanStd(x)
	if tau := correlationTime(x, m, s); math.Abs(tau-19)/19 > 0.1 {
		t.Errorf("correlation time %g, want 19 within 10%%", tau)
	}
	sm, err := Describe(&Series{Values: x, Dt: 1})
	if err != nil {
		t.Fatal(err)
	}
	if !sm.Stationarity.Stationary {
		t.Errorf("a stationary AR(1) was reported non-stationary: %+v", sm.Stationarity)
	}
}

func TestDescribeTrendCaution(t *testing.T) {
	r := rand.New(rand.NewPCG(5, 6))
	x := make([]float64, 4000)
	for i := range x {
		x[i] = r.NormFloat64() + 0.002*float64(i)
	}
	sm, err := Describe(&Series{Values: x, Dt: 1})
	if err != nil {
		t.Fatal(err)
	}
	if sm.Stationarity.Stationary {
		t.Fatalf("a trend of 8σ over the record was not flagged: %+v", sm.Stationarity)
	}
	found := false
	for _, c := range sm.Cautions {
		found = found || strings.Contains(c, "non-stationary")
	}
	if !found {
		t.Errorf("no non-stationarity caution in %q", sm.Cautions)
	}
}

func TestDescribeWhiteNoiseStationary(t *testing.T) {
	// Seeded white noise: no segment should differ beyond 4 standard errors.
	for seed := uint64(1); seed <= 5; seed++ {
		r := rand.New(rand.NewPCG(seed, 9))
		x := make([]float64, 10000)
		for i := range x {
			x[i] = r.NormFloat64()
		}
		sm, err := Describe(&Series{Values: x, Dt: 1})
		if err != nil {
			t.Fatal(err)
		}
		if !sm.Stationarity.Stationary {
			t.Errorf("seed %d: white noise reported non-stationary: %+v", seed, sm.Stationarity)
		}
	}
}

func TestDescribeConstant(t *testing.T) {
	x := make([]float64, 100)
	for i := range x {
		x[i] = 7
	}
	sm, err := Describe(&Series{Values: x, Dt: 1})
	if err != nil {
		t.Fatal(err)
	}
	if sm.Std != 0 || len(sm.Cautions) == 0 {
		t.Errorf("constant signal: std %g cautions %q", sm.Std, sm.Cautions)
	}
	if err := CheckVariable(x); err == nil {
		t.Error("CheckVariable accepted a constant signal")
	}
	if _, err := Describe(&Series{Values: x[:3], Dt: 1}); err == nil {
		t.Error("Describe accepted 3 samples")
	}
}

func TestFFTLength(t *testing.T) {
	cases := map[int]int{240: 240, 468: 468, 4099: 4320, 1 << 20: 1 << 20}
	for n, want := range cases {
		if got := fftLength(n); got != want {
			t.Errorf("fftLength(%d) = %d, want %d", n, got, want)
		}
	}
}

func TestCorrelationTimeSegmented(t *testing.T) {
	// Longer than one stretch: the summed autocovariance of several stretches must still give
	// the AR(1) value (1+φ)/(1−φ) = 9 for φ = 0.8 (Priestley 1981).
	r := rand.New(rand.NewPCG(7, 8))
	n := 3*acfSegment + 1000
	x := make([]float64, n)
	for i := 1; i < n; i++ {
		x[i] = 0.8*x[i-1] + r.NormFloat64()
	}
	m, s := meanStd(x)
	if tau := correlationTime(x, m, s); math.Abs(tau-9)/9 > 0.05 {
		t.Errorf("correlation time %g, want 9 within 5%%", tau)
	}
}
