package testsignals

import (
	"math"
	"math/rand/v2"
	"testing"

	"unfold/models"
)

// TestSamplingConvention: Every k takes every k-th state of Every 1, and a loop that steps
// before it records is the same sequence with Skip one interval larger (exact: the same RK4
// steps in the same order).
func TestSamplingConvention(t *testing.T) {
	const n, k, skip = 200, 5, 300
	fine := LorenzX(n*k, Sampling{Step: 0.002, Skip: skip})
	coarse := LorenzX(n, Sampling{Step: 0.002, Every: k, Skip: skip})
	later := LorenzX(n-1, Sampling{Step: 0.002, Every: k, Skip: skip + k})
	for i := range coarse {
		if coarse[i] != fine[i*k] {
			t.Fatalf("sample %d: Every %d gives %v, every %d-th step %v", i, k, coarse[i], k, fine[i*k])
		}
		if i > 0 && later[i-1] != coarse[i] {
			t.Fatalf("sample %d: Skip + Every gives %v, want %v", i, later[i-1], coarse[i])
		}
	}
	x, _, z := LorenzXYZ(n, Sampling{Step: 0.01, Skip: 5000})
	if y := LorenzX(n, Sampling{Step: 0.01, Skip: 5000}); x[n-1] != y[n-1] {
		t.Errorf("LorenzX and LorenzXYZ differ: %v, %v", y[n-1], x[n-1])
	}
	// the Lorenz attractor lies in 0 < z < 50 (from memory; loose bound)
	for i, v := range z {
		if !(v > 0 && v < 50) {
			t.Fatalf("z[%d] = %v off the attractor", i, v)
		}
	}
	if h := HenonX(10, 1001); h[0] != HenonX(11, 1000)[1] {
		t.Error("HenonX: skip + 1 is not the sequence shifted by one")
	}
}

// TestLogisticExponent: at r = 4 the mean of ln|f′(x)| = ln|4(1 − 2x)| along an orbit is ln 2
// (exact; e.g. Ott, Chaos in Dynamical Systems, 2002). 10⁵ samples, tolerance 0.01 (common
// practice for an ergodic average of this length).
func TestLogisticExponent(t *testing.T) {
	x := Logistic(100000, 4, 0.3, 1000)
	var s float64
	for _, v := range x {
		if !(v >= 0 && v <= 1) {
			t.Fatalf("logistic value %v outside [0, 1]", v)
		}
		s += math.Log(math.Abs(4 * (1 - 2*v)))
	}
	if l := s / float64(len(x)); math.Abs(l-math.Ln2) > 0.01 {
		t.Errorf("mean ln|f′| = %.4f, want ln 2 = %.4f", l, math.Ln2)
	}
}

// TestHenonOnAttractor: after the transient the orbit stays on the attractor, |x| < 1.3 (from
// memory: the attractor spans about −1.28 … 1.27 in x).
func TestHenonOnAttractor(t *testing.T) {
	for i, v := range HenonX(20000, 1000) {
		if !(math.Abs(v) < 1.3) {
			t.Fatalf("x[%d] = %v off the Hénon attractor", i, v)
		}
	}
}

// TestNoiseMoments: white noise has mean 0 and variance 1; both AR(1) forms have variance
// 1/(1 − φ²) and lag-1 autocorrelation φ (Box & Jenkins 1970). 2·10⁵ samples, tolerances of a
// few standard errors (common practice).
func TestNoiseMoments(t *testing.T) {
	const n, phi = 200000, 0.8
	m, v, _ := moments(WhiteNoise(n, rand.New(rand.NewPCG(1, 2))))
	if math.Abs(m) > 0.01 || math.Abs(v-1) > 0.015 {
		t.Errorf("white noise: mean %.4f variance %.4f, want 0 and 1", m, v)
	}
	for name, x := range map[string][]float64{
		"AR1":           AR1(n, phi, 500, rand.New(rand.NewPCG(3, 7))),
		"AR1Stationary": AR1Stationary(n, phi, rand.New(rand.NewPCG(3, 1))),
	} {
		_, v, r1 := moments(x)
		if want := 1 / (1 - phi*phi); math.Abs(v-want) > 0.05*want {
			t.Errorf("%s: variance %.4f, want %.4f", name, v, want)
		}
		if math.Abs(r1-phi) > 0.01 {
			t.Errorf("%s: lag-1 autocorrelation %.4f, want %.2f", name, r1, phi)
		}
	}
	y, sd := AddNoise(make([]float64, n), 0.5, rand.New(rand.NewPCG(4, 7)))
	if sd != 0 || StdDev(y) != 0 {
		t.Errorf("noise on a constant: sd %v, want 0 (a fraction of a zero spread)", sd)
	}
	x := Sine(n, 50, 0)
	y, sd = AddNoise(x, 0.1, rand.New(rand.NewPCG(4, 7)))
	if want := 0.1 * math.Sqrt(0.5); math.Abs(sd-want) > 1e-6 {
		t.Errorf("AddNoise: sd %.6f, want 0.1·std(sine) = %.6f", sd, want)
	}
	for i := range y {
		y[i] -= x[i]
	}
	if _, v, _ := moments(y); math.Abs(math.Sqrt(v)-sd) > 0.01*sd {
		t.Errorf("AddNoise: residual sd %.5f, want %.5f", math.Sqrt(v), sd)
	}
}

// TestSines: exact values of the tones at chosen times.
func TestSines(t *testing.T) {
	if s := Sine(20, 8, 0); math.Abs(s[2]-1) > 1e-15 || math.Abs(s[6]+1) > 1e-15 {
		t.Errorf("Sine period 8: s[2] = %v, s[6] = %v, want 1 and −1", s[2], s[6])
	}
	x := Sines(100, 0.1, Tone{Amp: 2, Omega: 1}, Tone{Amp: 1, Omega: models.GoldenMean, Phase: 0.5})
	tt := 3.7
	if want := 2*math.Sin(tt) + math.Sin(models.GoldenMean*tt+0.5); math.Abs(x[37]-want) > 1e-12 {
		t.Errorf("Sines at t = 3.7: %v, want %v", x[37], want)
	}
	if got := StdDev([]float64{1, 2, 3, 4}); got != math.Sqrt(1.25) {
		t.Errorf("StdDev(1, 2, 3, 4) = %v, want √1.25", got)
	}
}

// TestLimitCycleAndRossler: van der Pol (μ = 1) settles on its cycle of amplitude about 2.009
// (from memory; ±0.02); the Rössler orbit stays bounded, |x| < 15 (from memory; loose).
func TestLimitCycleAndRossler(t *testing.T) {
	var amp float64
	for _, v := range VanDerPolX(2000, 1, Sampling{Step: 0.01, Skip: 10000}) {
		amp = max(amp, math.Abs(v))
	}
	if math.Abs(amp-2.009) > 0.02 {
		t.Errorf("van der Pol amplitude %.4f, want about 2.009", amp)
	}
	for i, v := range RosslerX(5000, Sampling{Step: 0.01, Every: 10, Skip: 10000}) {
		if !(math.Abs(v) < 15) {
			t.Fatalf("Rössler x[%d] = %v unbounded", i, v)
		}
	}
	if s := Sub(0.05, 10, 50); s.Step != 0.005 || s.Every != 10 || s.Skip != 10000 {
		t.Errorf("Sub(0.05, 10, 50) = %+v", s)
	}
}

func moments(x []float64) (mean, variance, r1 float64) {
	for _, v := range x {
		mean += v
	}
	mean /= float64(len(x))
	var c0, c1 float64
	for i, v := range x {
		c0 += (v - mean) * (v - mean)
		if i > 0 {
			c1 += (v - mean) * (x[i-1] - mean)
		}
	}
	return mean, c0 / float64(len(x)), c1 / c0
}

// TestOpenRecord: R's co2 (help(co2)) has 468 monthly values, the first 315.42 ppm, and the
// ECG of testdata/ecg starts at -0.245 mV (both read off the files' first data rows).
func TestOpenRecord(t *testing.T) {
	co2 := OpenRecord(t, "r/co2.csv", 1)
	if len(co2) != 468 || co2[0] != 315.42 {
		t.Errorf("co2: %d values, first %v; want 468, first 315.42", len(co2), co2[0])
	}
	if ecg := OpenRecord(t, "ecg/ecg.csv", 1); len(ecg) == 0 || ecg[0] != -0.245 {
		t.Errorf("ecg: %d values, want the first -0.245", len(ecg))
	}
}
