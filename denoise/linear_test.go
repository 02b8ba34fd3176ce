package denoise

import (
	"math"
	"math/cmplx"
	"testing"
)

// db returns 20·log10|h|.
func db(h complex128) float64 { return 20 * math.Log10(cmplx.Abs(h)) }

// TestButterworthCorner checks the magnitude of one pass at the corner frequencies:
// |H(fc)|² = 1/2, i.e. −3.01 dB, for every order (Butterworth 1930, |H|² = 1/(1+(ω/ωc)^(2N)),
// which the bilinear transform with prewarping keeps exactly at the corner: Oppenheim &
// Schafer 1989, §7.1). Asserted: −3.01 ± 0.1 dB for one pass, and the same point of the
// forward–backward pair at −6.02 ± 0.1 dB (|H|²).
func TestButterworthCorner(t *testing.T) {
	const dt = 0.01 // 100 samples per time unit, Nyquist 50
	cases := []struct {
		band    Band
		corners []float64
	}{
		{LowPass, []float64{5}},
		{LowPass, []float64{40}},
		{HighPass, []float64{2}},
		{HighPass, []float64{30}},
		{BandPass, []float64{3, 8}},
		{BandPass, []float64{0.5, 45}},
	}
	for _, c := range cases {
		for _, order := range []int{1, 2, 3, 4, 5, 8} {
			f, err := Butterworth(c.band, order, c.corners, dt)
			if err != nil {
				t.Fatal(err)
			}
			for _, fc := range c.corners {
				g := db(f.Response(fc))
				if math.Abs(g-(-3.0103)) > 0.1 {
					t.Errorf("%s order %d corners %v: |H(%g)| = %.4f dB, want −3.01 ± 0.1 (Butterworth 1930)", c.band, order, c.corners, fc, g)
				}
				if gg := 2 * g; math.Abs(gg-(-6.0206)) > 0.1 {
					t.Errorf("%s order %d: forward–backward %.4f dB at %g, want −6.02 ± 0.1", c.band, order, gg, fc)
				}
			}
			// pass band: unit gain at the reference frequency; stop band: falls off
			var pass, stop float64
			switch c.band {
			case LowPass:
				pass, stop = 0, math.Min(c.corners[0]*4, 49)
			case HighPass:
				pass, stop = 50, c.corners[0]/4
			case BandPass:
				pass = 2 * math.Atan(math.Sqrt(math.Tan(math.Pi*c.corners[0]*dt)*math.Tan(math.Pi*c.corners[1]*dt))) / (2 * math.Pi * dt)
				stop = c.corners[0] / 4
			}
			if g := db(f.Response(pass)); math.Abs(g) > 1e-9 {
				t.Errorf("%s order %d: gain %.3g dB at %g, want 0 (exact by normalisation)", c.band, order, g, pass)
			}
			if g := db(f.Response(stop)); g > -3.0103-float64(order) {
				t.Errorf("%s order %d: gain %.2f dB at %g in the stop band", c.band, order, g, stop)
			}
		}
	}
}

// TestButterworthMagnitudeShape compares the low-pass magnitude with the analogue Butterworth
// formula at the prewarped frequency: |H(f)|² = 1/(1+(tan(πf dt)/tan(πfc dt))^(2N)) — exact for
// the bilinear transform (Oppenheim & Schafer 1989, §7.1).
func TestButterworthMagnitudeShape(t *testing.T) {
	const dt, fc, n = 1.0, 0.1, 6
	f, err := Butterworth(LowPass, n, []float64{fc}, dt)
	if err != nil {
		t.Fatal(err)
	}
	for _, fr := range []float64{0.01, 0.05, 0.09, 0.1, 0.12, 0.2, 0.3, 0.45} {
		r := math.Tan(math.Pi*fr*dt) / math.Tan(math.Pi*fc*dt)
		want := 1 / math.Sqrt(1+math.Pow(r, 2*n))
		if got := cmplx.Abs(f.Response(fr)); math.Abs(got-want) > 1e-9 {
			t.Errorf("|H(%g)| = %.12f, want %.12f", fr, got, want)
		}
	}
}

// TestZeroPhase filters sines and checks: a pass-band sine keeps its phase (zero shift; the
// cross-correlation lag estimated from the fitted phase is below 1e-3 rad) and its amplitude
// (|H|² ≈ 1), and a sine at the corner comes out at −6.02 ± 0.1 dB (forward–backward, |H|²;
// Butterworth 1930). Edge handling (odd reflection + steady-state start) is checked by the
// error in the first and last 5 % of the record. Common practice for the assertions.
func TestZeroPhase(t *testing.T) {
	const dt, n = 0.01, 4000
	f, err := Butterworth(LowPass, 4, []float64{5}, dt)
	if err != nil {
		t.Fatal(err)
	}
	for _, c := range []struct {
		freq, wantDB, tolDB float64
	}{
		{0.7, 0, 0.01},
		{2, 0, 0.01},
		{5, -6.0206, 0.1},
	} {
		x := make([]float64, n)
		for i := range x {
			x[i] = math.Sin(2*math.Pi*c.freq*float64(i)*dt + 0.3)
		}
		y, err := f.ZeroPhase(x)
		if err != nil {
			t.Fatal(err)
		}
		// least-squares amplitude and phase of y on sin/cos over the interior
		var ss, sc, cc, ys, yc float64
		for i := n / 10; i < n-n/10; i++ {
			ph := 2*math.Pi*c.freq*float64(i)*dt + 0.3
			s, co := math.Sin(ph), math.Cos(ph)
			ss += s * s
			sc += s * co
			cc += co * co
			ys += y[i] * s
			yc += y[i] * co
		}
		det := ss*cc - sc*sc
		a := (ys*cc - yc*sc) / det
		b := (yc*ss - ys*sc) / det
		amp := math.Hypot(a, b)
		phase := math.Atan2(b, a)
		if g := 20 * math.Log10(amp); math.Abs(g-c.wantDB) > c.tolDB {
			t.Errorf("sine at %g: gain %.4f dB, want %.4f ± %g", c.freq, g, c.wantDB, c.tolDB)
		}
		if math.Abs(phase) > 1e-3 {
			t.Errorf("sine at %g: phase shift %.3g rad, want 0 (zero-phase filtering)", c.freq, phase)
		}
		if c.wantDB == 0 {
			var worst float64
			for i := range y {
				worst = max(worst, math.Abs(y[i]-x[i]))
			}
			if worst > 0.02 {
				t.Errorf("sine at %g: largest deviation %.3g including the edges, want < 0.02", c.freq, worst)
			}
		}
	}
}

// TestZeroPhaseEdges: a straight line through a low-pass filter stays a straight line (odd
// reflection makes the padded signal a line too, and the steady-state start removes the
// transient) — an exact property of the edge rule, up to the 1e-6 decay of the padding.
func TestZeroPhaseEdges(t *testing.T) {
	f, err := Butterworth(LowPass, 4, []float64{0.05}, 1)
	if err != nil {
		t.Fatal(err)
	}
	x := make([]float64, 500)
	for i := range x {
		x[i] = 3 + 0.01*float64(i)
	}
	y, err := f.ZeroPhase(x)
	if err != nil {
		t.Fatal(err)
	}
	for i := range y {
		if math.Abs(y[i]-x[i]) > 1e-5 {
			t.Fatalf("line: y[%d] = %.9g, want %.9g", i, y[i], x[i])
		}
	}
}

// TestPolyDetrend: an exact polynomial of the given order is removed to round-off (exact
// result of least squares on a polynomial of that order).
func TestPolyDetrend(t *testing.T) {
	for _, order := range []int{0, 1, 2, 3, 5, 8} {
		n := 1000
		x := make([]float64, n)
		var scale float64
		for i := range x {
			u := float64(i) / 100
			v := 2.0
			for k := 1; k <= order; k++ {
				v += math.Pow(-0.7, float64(k)) * math.Pow(u-4, float64(k)) / float64(k)
			}
			x[i] = v
			scale = max(scale, math.Abs(v))
		}
		r, trend, err := PolyDetrend(x, order)
		if err != nil {
			t.Fatal(err)
		}
		for i := range r {
			if math.Abs(r[i]) > 1e-10*scale || math.Abs(trend[i]+r[i]-x[i]) > 1e-12*scale {
				t.Fatalf("order %d: residual[%d] = %.3g (scale %.3g), want round-off", order, i, r[i], scale)
			}
		}
	}
	// a sine is not removed by a straight line: the residual keeps its variance (common practice)
	x := make([]float64, 1000)
	for i := range x {
		x[i] = math.Sin(2*math.Pi*float64(i)/50) + 0.01*float64(i)
	}
	r, _, err := PolyDetrend(x, 1)
	if err != nil {
		t.Fatal(err)
	}
	var ss float64
	for _, v := range r {
		ss += v * v
	}
	if rms := math.Sqrt(ss / 1000); math.Abs(rms-math.Sqrt(0.5)) > 0.02 {
		t.Errorf("line detrend of sine + line: rms %.4f, want %.4f", rms, math.Sqrt(0.5))
	}
	if _, _, err := PolyDetrend(x[:3], 3); err == nil {
		t.Error("order 3 on 3 samples: want an error")
	}
}

// TestResample checks Kaiser-windowed sinc resampling: upsampling a band-limited sine matches
// the analytic sine in the interior (band-limited interpolation, Shannon 1949; tolerance for a
// 16-zero-crossing kernel, common practice); a constant stays exact everywhere (weights are
// normalised); downsampling removes a sine above the new Nyquist frequency (anti-alias rule).
func TestResample(t *testing.T) {
	const dt = 0.1
	n := 2000
	x := make([]float64, n)
	for i := range x {
		x[i] = math.Sin(2*math.Pi*0.7*float64(i)*dt) + 0.5*math.Cos(2*math.Pi*1.9*float64(i)*dt)
	}
	y, err := Resample(x, dt, 0.037)
	if err != nil {
		t.Fatal(err)
	}
	if want := int(math.Floor(float64(n-1)*dt/0.037)) + 1; len(y) != want {
		t.Fatalf("len %d, want %d", len(y), want)
	}
	for j := range y {
		tt := float64(j) * 0.037
		if tt < 5 || tt > float64(n-1)*dt-5 {
			continue
		}
		want := math.Sin(2*math.Pi*0.7*tt) + 0.5*math.Cos(2*math.Pi*1.9*tt)
		if math.Abs(y[j]-want) > 2e-3 {
			t.Fatalf("upsampled y(%g) = %.6f, want %.6f", tt, y[j], want)
		}
	}
	c := make([]float64, 300)
	for i := range c {
		c[i] = 4.25
	}
	for _, nd := range []float64{0.03, 0.1, 0.35} {
		yc, err := Resample(c, dt, nd)
		if err != nil {
			t.Fatal(err)
		}
		for j, v := range yc {
			if math.Abs(v-4.25) > 1e-12 {
				t.Fatalf("constant resampled to %g: y[%d] = %.15g", nd, j, v)
			}
		}
	}
	// downsample to dt 0.5 (Nyquist 1): the 1.9 component must go, the 0.7 one stay
	z, err := Resample(x, dt, 0.5)
	if err != nil {
		t.Fatal(err)
	}
	var worst float64
	for j := range z {
		tt := float64(j) * 0.5
		if tt < 10 || tt > float64(n-1)*dt-10 {
			continue
		}
		worst = max(worst, math.Abs(z[j]-math.Sin(2*math.Pi*0.7*tt)))
	}
	if worst > 0.01 {
		t.Errorf("downsampled: deviation from the 0.7 component %.3g, want < 0.01 (the 1.9 component must be removed, not aliased)", worst)
	}
}
