package spectral

import (
	"math"
	"math/cmplx"
	"math/rand/v2"
	"testing"
)

// largestPrimeFactor is the definition Smooth is checked against (trial division).
func largestPrimeFactor(n int) int {
	largest := 1
	for p := 2; p*p <= n; p++ {
		for n%p == 0 {
			n /= p
			largest = p
		}
	}
	return max(largest, n)
}

func TestFFTLengths(t *testing.T) {
	for _, p := range []int{5, 7, 97} {
		for n := 1; n <= 3000; n++ {
			// Smooth is the definition: largest prime factor ≤ p (arithmetic).
			if got, want := Smooth(n, p), largestPrimeFactor(n) <= p; got != want {
				t.Fatalf("Smooth(%d, %d) = %v, want %v", n, p, got, want)
			}
			// LengthAtLeast is ≥ n, p-smooth and the smallest such (arithmetic).
			l := LengthAtLeast(n, p)
			if l < n || largestPrimeFactor(l) > p {
				t.Fatalf("LengthAtLeast(%d, %d) = %d is not a %d-smooth length ≥ n", n, p, l, p)
			}
			for k := n; k < l; k++ {
				if largestPrimeFactor(k) <= p {
					t.Fatalf("LengthAtLeast(%d, %d) = %d, but %d is smaller and smooth", n, p, l, k)
				}
			}
			// LengthAtMost is ≤ n, p-smooth and the largest such (arithmetic).
			u := LengthAtMost(n, p)
			if u > n || largestPrimeFactor(u) > p {
				t.Fatalf("LengthAtMost(%d, %d) = %d is not a %d-smooth length ≤ n", n, p, u, p)
			}
			for k := u + 1; k <= n; k++ {
				if largestPrimeFactor(k) <= p {
					t.Fatalf("LengthAtMost(%d, %d) = %d, but %d is larger and smooth", n, p, u, k)
				}
			}
		}
	}
	// 10007 is prime, 10000 = 2⁴·5⁴, 4320 = 2⁵·3³·5, 2¹⁰ = 1024 (arithmetic).
	for _, c := range []struct{ got, want int }{
		{LengthAtMost(10007, 7), 10000}, {LengthAtMost(4096, 7), 4096}, {LengthAtMost(97, 7), 96},
		{LengthAtMost(143, 7), 140}, {LengthAtLeast(4099, 5), 4320}, {LengthAtLeast(1000, 5), 1000},
		{LengthAtLeast(1<<20, 5), 1 << 20}, {LengthAtLeast(0, 5), 1}, {LengthAtMost(1, 7), 1},
	} {
		if c.got != c.want {
			t.Errorf("length %d, want %d", c.got, c.want)
		}
	}
}

func TestHann(t *testing.T) {
	for _, n := range []int{8, 63, 256, 1000} {
		// Periodic window: Σw = n/2 and Σw² = 3n/8, since the cosines sum to zero over whole
		// periods (arithmetic; Harris 1978).
		w := make([]float64, n)
		ss := Hann(w, false)
		var s, ss2 float64
		for _, v := range w {
			s += v
			ss2 += v * v
		}
		if math.Abs(s-float64(n)/2) > 1e-9 || math.Abs(ss-3*float64(n)/8) > 1e-9 || ss != ss2 {
			t.Errorf("periodic n=%d: Σw = %g (want %g), Σw² = %g (want %g, summed %g)", n, s, float64(n)/2, ss, 3*float64(n)/8, ss2)
		}
		if w[0] != 0 || math.Abs(w[n/2]-1) > 1e-12 && n%2 == 0 {
			t.Errorf("periodic n=%d: w[0] = %g, w[n/2] = %g, want 0 and 1", n, w[0], w[n/2])
		}
		// Symmetric window: zero at both ends, w_i = w_{n−1−i}, Σw² = 3(n−1)/8 (one whole
		// period of n−1 points plus the zero end point; arithmetic).
		ss = Hann(w, true)
		if w[0] != 0 || math.Abs(w[n-1]) > 1e-15 || math.Abs(ss-3*float64(n-1)/8) > 1e-9 {
			t.Errorf("symmetric n=%d: ends %g, %g; Σw² = %g, want %g", n, w[0], w[n-1], ss, 3*float64(n-1)/8)
		}
		for i := range w {
			if math.Abs(w[i]-w[n-1-i]) > 1e-12 {
				t.Fatalf("symmetric n=%d: w[%d] = %g ≠ w[%d] = %g", n, i, w[i], n-1-i, w[n-1-i])
			}
		}
	}
}

func TestHannLeakage(t *testing.T) {
	// The bound is |W(d)/W(0)|² of the window's transform sinc(d)/(1 − d²), reached at
	// half-integer d where |sin πd| = 1 (Harris 1978; arithmetic). Checked against the
	// discrete-time transform of a long periodic Hann window, which approaches it as 1/N².
	const n = 4096
	w := make([]float64, n)
	Hann(w, false)
	dtft := func(d float64) float64 {
		var s complex128
		for i, v := range w {
			s += complex(v, 0) * cmplx.Exp(complex(0, -2*math.Pi*d*float64(i)/n))
		}
		return real(s)*real(s) + imag(s)*imag(s)
	}
	w0 := dtft(0)
	for _, d := range []float64{2.5, 3.5, 5.5, 10.5} {
		got := dtft(d) / w0
		if want := HannLeakage(d); math.Abs(got/want-1) > 1e-3 {
			t.Errorf("leakage at %g bins: transform %g, bound %g", d, got, want)
		}
	}
	if HannLeakage(1) != 1 {
		t.Error("HannLeakage inside the main lobe is not 1")
	}
}

func TestWelchParseval(t *testing.T) {
	r := rand.New(rand.NewPCG(1, 2))
	x := make([]float64, 5000)
	for i := 1; i < len(x); i++ {
		x[i] = 0.5*x[i-1] + r.NormFloat64()
	}
	for _, sym := range []bool{false, true} {
		const seg = 512
		sp, err := Welch(x, 0.25, WelchOptions{SegLen: seg, Symmetric: sym})
		if err != nil {
			t.Fatal(err)
		}
		var integral float64
		for _, p := range sp.Power {
			integral += p * sp.Resolution
		}
		// Parseval's theorem per segment: Σ_k |X_k|²/L = Σ_i (x_i w_i)², so ∫PSD is exactly
		// the mean over segments of the window-weighted variance Σ(x_i − x̄)²w_i²/Σw_i²
		// (arithmetic; Welch 1967).
		w := make([]float64, seg)
		wss := Hann(w, sym)
		m := meanOf(x)
		var want float64
		segs := 0
		for s := 0; s+seg <= len(x); s += seg / 2 {
			for i, v := range w {
				d := (x[s+i] - m) * v
				want += d * d / wss
			}
			segs++
		}
		want /= float64(segs)
		if segs != sp.Segments || math.Abs(integral/want-1) > 1e-12 {
			t.Errorf("symmetric=%v: ∫PSD = %.15g over %d segments, Parseval %.15g over %d", sym, integral, sp.Segments, want, segs)
		}
		if sp.Resolution != 1/(seg*0.25) || sp.Freq[3] != 3*sp.Resolution {
			t.Errorf("resolution %g, want %g", sp.Resolution, 1/(seg*0.25))
		}
	}
}

func TestWelchSine(t *testing.T) {
	// A sine of amplitude A with 16 whole cycles per 256-sample segment: the periodic Hann
	// window confines it to bins 15–17 exactly, and those bins integrate to the variance A²/2
	// (Parseval with whole cycles; arithmetic).
	const a, seg, k0 = 3.0, 256, 16
	x := make([]float64, 16*seg)
	for i := range x {
		x[i] = a * math.Sin(2*math.Pi*k0*float64(i)/seg+0.3)
	}
	sp, err := Welch(x, 1, WelchOptions{SegLen: seg})
	if err != nil {
		t.Fatal(err)
	}
	var line float64
	for k, p := range sp.Power {
		if k >= k0-1 && k <= k0+1 {
			line += p * sp.Resolution
		} else if p > 1e-20 {
			t.Errorf("bin %d holds %g, want 0 (periodic Hann, whole cycles)", k, p)
		}
	}
	if math.Abs(line/(a*a/2)-1) > 1e-12 {
		t.Errorf("line power %.15g, want A²/2 = %g", line, a*a/2)
	}
	if sp.Segments != 31 || sp.DOF != 2*31*0.95 {
		t.Errorf("%d segments, DOF %g; want 31 half-overlapping segments", sp.Segments, sp.DOF)
	}
	// Defaults: the largest power of two ≤ N/8 within [64, 16384] (the documented rule).
	if DefaultSegLen(4096) != 512 || DefaultSegLen(100) != 64 || DefaultSegLen(1<<30) != 16384 {
		t.Errorf("DefaultSegLen: %d %d %d", DefaultSegLen(4096), DefaultSegLen(100), DefaultSegLen(1<<30))
	}
	if _, err := Welch(x[:100], 1, WelchOptions{SegLen: 128}); err == nil {
		t.Error("Welch accepted a record shorter than one segment")
	}
}

func TestAutocorrelationOfSine(t *testing.T) {
	// x_t = sin(ωt) with whole cycles: Σ_{t<n−k} x_t x_{t+k} = ½(n−k)cos ωk − ½ sin((n−k)ω)
	// cos((n−1)ω)/sin ω and Σ x_t² = n/2 (trigonometric sums; arithmetic), so the biased
	// autocorrelation is a cosine tapered by 1 − k/n plus a small edge term.
	const n, period = 2000, 40.0
	om := 2 * math.Pi / period
	x := make([]float64, n)
	for i := range x {
		x[i] = math.Sin(om * float64(i))
	}
	r, err := Autocorrelation(x, 200)
	if err != nil {
		t.Fatal(err)
	}
	if len(r) != 201 || r[0] != 1 {
		t.Fatalf("%d lags, r0 = %g", len(r), r[0])
	}
	for k := range r {
		num := 0.5*float64(n-k)*math.Cos(om*float64(k)) - 0.5*math.Sin(float64(n-k)*om)*math.Cos(float64(n-1)*om)/math.Sin(om)
		if want := num / (n / 2); math.Abs(r[k]-want) > 1e-10 {
			t.Fatalf("lag %d: r = %.12f, want %.12f", k, r[k], want)
		}
	}
	if _, err := Autocorrelation(make([]float64, 10), 3); err == nil {
		t.Error("Autocorrelation accepted a constant record")
	}
	if _, err := Autocorrelation([]float64{1}, 3); err == nil {
		t.Error("Autocorrelation accepted one sample")
	}
}

func TestAutocovarianceStretches(t *testing.T) {
	// Summing stretches: each stretch's lagged products by the direct sum (definition).
	r := rand.New(rand.NewPCG(3, 4))
	x := make([]float64, 3*300)
	for i := range x {
		x[i] = r.NormFloat64() + 2
	}
	const seg, lags, mean = 300, 40, 2.0
	for _, nfft := range []int{0, 600, 2 * 7 * 61} { // 2·seg = 600 = 2³·3·5², 854 = 2·7·61
		a := NewAutocovariance(seg, nfft)
		got := make([]float64, lags)
		for lo := 0; lo < len(x); lo += seg {
			a.Add(got, x[lo:lo+seg], mean)
		}
		for k := range lags {
			var want float64
			for lo := 0; lo < len(x); lo += seg {
				for i := lo; i+k < lo+seg; i++ {
					want += (x[i] - mean) * (x[i+k] - mean)
				}
			}
			want *= float64(a.Len()) // Add's documented scale
			if math.Abs(got[k]-want) > 1e-9*math.Abs(want)+1e-9 {
				t.Fatalf("nfft %d lag %d: FFT %.12g, direct %.12g", a.Len(), k, got[k], want)
			}
		}
	}
}
