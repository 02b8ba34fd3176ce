package regime

import (
	"math"
	"math/rand/v2"
	"slices"
	"testing"

	"gonum.org/v1/gonum/dsp/fourier"

	"unfold/internal/testsignals"
	"unfold/spectral"
)

// ar1 returns n samples of x_t = φ x_{t−1} + e_t with standard Gaussian e (PCG stream 7 of
// seed), started from 0 with 500 samples dropped (internal/testsignals).
func ar1(n int, phi float64, seed uint64) []float64 {
	return testsignals.AR1(n, phi, 500, rand.New(rand.NewPCG(seed, 7)))
}

func periodogram(x []float64) []float64 {
	c := fourier.NewFFT(len(x)).Coefficients(nil, x)
	p := make([]float64, len(c))
	for k, v := range c {
		p[k] = real(v)*real(v) + imag(v)*imag(v)
	}
	return p
}

func TestPhaseSurrogateKeepsPeriodogram(t *testing.T) {
	x := ar1(4096, 0.9, 1)
	set, err := Surrogates(x, SurrogateOptions{Method: Phase, Count: 3, Seed: 5})
	if err != nil {
		t.Fatal(err)
	}
	px := periodogram(x)
	var max float64
	for _, v := range px {
		max = math.Max(max, v)
	}
	for _, s := range set.Surrogates {
		ps := periodogram(s.Values)
		// The FT surrogate keeps |X_k|² exactly up to round-off (Theiler et al. 1992;
		// CHECKS.md §7, tag E).
		for k := range px {
			if math.Abs(ps[k]-px[k]) > 1e-9*max {
				t.Fatalf("bin %d: periodogram %g, data %g", k, ps[k], px[k])
			}
		}
		if s.SpectralError > 1e-20 {
			t.Errorf("spectral error %g, want round-off", s.SpectralError)
		}
		if slices.Equal(s.Values, x) {
			t.Fatal("surrogate equals the data")
		}
	}
}

func TestIAAFTKeepsValuesAndSpectrum(t *testing.T) {
	x := ar1(4096, 0.9, 2)
	for i := range x {
		x[i] = x[i] * x[i] * x[i] // static monotone transform of a Gaussian process
	}
	sorted := slices.Sorted(slices.Values(x))
	for _, m := range []Method{AAFT, IAAFT} {
		set, err := Surrogates(x, SurrogateOptions{Method: m, Count: 4, Seed: 9, Threads: 2})
		if err != nil {
			t.Fatal(err)
		}
		for _, s := range set.Surrogates {
			// AAFT and IAAFT keep the sorted values exactly (exact rank remap;
			// Schreiber & Schmitz 1996, CHECKS.md §7, tag E).
			if !slices.Equal(slices.Sorted(slices.Values(s.Values)), sorted) {
				t.Fatalf("%v: sorted values differ from the data's", m)
			}
			// IAAFT matches the Fourier amplitudes only approximately (Schreiber & Schmitz
			// 2000: both cannot be exact at finite N). Our stated tolerance: relative
			// amplitude mismatch below 1 % for this record; AAFT is looser.
			if m == IAAFT && s.SpectralError > 0.01 {
				t.Errorf("IAAFT spectral error %g > 0.01 after %d iterations", s.SpectralError, s.Iterations)
			}
		}
	}
}

func TestSurrogatesThreadIndependent(t *testing.T) {
	x := ar1(1000, 0.5, 3)
	a, err := Surrogates(x, SurrogateOptions{Method: IAAFT, Count: 5, Seed: 11, Threads: 1})
	if err != nil {
		t.Fatal(err)
	}
	b, err := Surrogates(x, SurrogateOptions{Method: IAAFT, Count: 5, Seed: 11, Threads: 3})
	if err != nil {
		t.Fatal(err)
	}
	for i := range a.Surrogates {
		// Per-surrogate seeds make results independent of the thread count (DESIGN.md §5).
		if !slices.Equal(a.Surrogates[i].Values, b.Surrogates[i].Values) {
			t.Fatalf("surrogate %d differs between 1 and 3 threads", i)
		}
	}
	if a.Length != 1000 {
		t.Errorf("length %d, want 1000 (2³·5³)", a.Length)
	}
}

func TestMatchEndsReducesMismatch(t *testing.T) {
	n := 2000
	x := make([]float64, n)
	for i := range x {
		x[i] = math.Sin(2 * math.Pi * float64(i) / 97.3)
	}
	set, err := Surrogates(x, SurrogateOptions{Method: Phase, Count: 1, MatchEnds: true})
	if err != nil {
		t.Fatal(err)
	}
	whole := endMismatch(x[:spectral.LengthAtMost(n, maxFactor)])
	if !(set.EndMismatch < whole/10) || set.Length < 1800 {
		t.Errorf("matched mismatch %g (length %d), whole-record %g", set.EndMismatch, set.Length, whole)
	}
}

func TestRadixRanksMatchSort(t *testing.T) {
	rng := rand.New(rand.NewPCG(4, 4))
	y := make([]float64, 5000)
	for i := range y {
		switch i % 5 {
		case 0:
			y[i] = float64(rng.IntN(7) - 3) // ties, negatives and zeros
		case 1:
			y[i] = math.Copysign(0, -1)
		default:
			y[i] = rng.NormFloat64() * math.Pow(10, float64(rng.IntN(20)-10))
		}
	}
	w := newGenerator(y).newWorker()
	got := make([]int32, len(y))
	w.ranksInto(got, y)
	p := make([]rankPair, len(y))
	for i, v := range y {
		p[i] = rankPair{v, int32(i)}
	}
	sortPairs(p)
	// The radix ranks equal a comparison sort by (value, index) (reference: slices.SortFunc).
	for r := range p {
		if got[r] != p[r].i {
			t.Fatalf("rank %d: radix %d, sort %d", r, got[r], p[r].i)
		}
	}
}
