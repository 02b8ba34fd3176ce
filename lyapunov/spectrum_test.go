package lyapunov

import (
	"math"
	"slices"
	"testing"

	"unfold/models"
)

func TestSpectrumHenon(t *testing.T) {
	// Hénon a = 1.4, b = 0.3 from x alone, m = 2, τ = 1: λ1 = 0.4192 (Sprott 2003 App. A,
	// CHECKS.md §2, M + C) within 10 %; λ1 + λ2 = ln 0.3 = −1.2040 exactly for the map (det J =
	// −b, CHECKS.md §1, E), from data loosely (±0.15: local fits shrink the contracting
	// direction's estimate).
	r, err := Spectrum(henonX(10000), SpectrumOptions{Lag: 1, Dim: 2, Theiler: 1})
	if err != nil {
		t.Fatal(err)
	}
	if len(r.Exponents) != 2 || r.Exponents[0] < r.Exponents[1] {
		t.Fatalf("exponents %v, want two in descending order", r.Exponents)
	}
	if math.Abs(r.Exponents[0]-0.4192) > 0.1*0.4192 {
		t.Errorf("λ1 = %.4f, want 0.4192 ± 10%%", r.Exponents[0])
	}
	if s := r.Exponents[0] + r.Exponents[1]; math.Abs(s-math.Log(0.3)) > 0.15 {
		t.Errorf("λ1 + λ2 = %.4f, want ln 0.3 = %.4f ± 0.15", s, math.Log(0.3))
	}
	// Kaplan–Yorke 1.2583 (Sprott 2003 App. A, CHECKS.md §2), loosely; and the dimension is
	// exactly models.KaplanYorke of the exponents.
	if math.Abs(r.KaplanYorke-1.2583) > 0.05 || r.KaplanYorke != models.KaplanYorke(r.Exponents) {
		t.Errorf("Kaplan–Yorke %.4f, want 1.2583 ± 0.05", r.KaplanYorke)
	}
	if r.Note == "" {
		t.Error("no note on spurious exponents")
	}
}

func TestSpectrumLorenz(t *testing.T) {
	if testing.Short() {
		t.Skip("Lorenz spectrum from 20 000 samples")
	}
	// Lorenz (10, 28, 8/3), x at Δt = 0.01: λ1 = 0.9056 per time unit and D_KY = 2.06 (Sprott
	// 2003 App. A and Sprott's Lorenz page, CHECKS.md §2, V + C). From data: λ1 within 15 %,
	// Kaplan–Yorke loosely in [1.95, 2.25], the middle exponent near 0 (±0.25).
	r, err := Spectrum(lorenzX(20000, 0.01), SpectrumOptions{Lag: 5, Dim: 3, Theiler: 50, Dt: 0.01, Threads: 2})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(r.Exponents[0]-0.9056) > 0.15*0.9056 {
		t.Errorf("λ1 = %.4f, want 0.9056 ± 15%%", r.Exponents[0])
	}
	if math.Abs(r.Exponents[1]) > 0.25 {
		t.Errorf("λ2 = %.4f, want ≈ 0", r.Exponents[1])
	}
	if r.KaplanYorke < 1.95 || r.KaplanYorke > 2.25 {
		t.Errorf("Kaplan–Yorke %.4f, want ≈ 2.06", r.KaplanYorke)
	}
	if r.Evolve != 5 || r.Neighbors != 20 {
		t.Errorf("defaults: evolve %d, neighbours %d; want 5 (the lag) and 20", r.Evolve, r.Neighbors)
	}
	// Deterministic for any thread count.
	r1, err := Spectrum(lorenzX(20000, 0.01)[:5000], SpectrumOptions{Lag: 5, Dim: 3, Theiler: 50, Dt: 0.01, Threads: 1})
	if err != nil {
		t.Fatal(err)
	}
	r3, _ := Spectrum(lorenzX(20000, 0.01)[:5000], SpectrumOptions{Lag: 5, Dim: 3, Theiler: 50, Dt: 0.01, Threads: 3})
	if !slices.Equal(r1.Exponents, r3.Exponents) {
		t.Errorf("threads 1 and 3 differ: %v and %v", r1.Exponents, r3.Exponents)
	}
}

func TestSpectrumOptions(t *testing.T) {
	x := henonX(2000)
	bad := []SpectrumOptions{
		{Lag: 0, Dim: 2}, {Lag: 1, Dim: 2, Neighbors: 2}, {Lag: 1, Dim: 2, Exponents: 3},
		{Lag: 1, Dim: 2, Dt: -1}, {Lag: 1, Dim: 2, Theiler: -2}, {Lag: 1, Dim: 2, Theiler: 990},
	}
	for _, o := range bad {
		if _, err := Spectrum(x, o); err == nil {
			t.Errorf("options %+v accepted", o)
		}
	}
	// One exponent only: the largest (the QR chain of one vector is the classic
	// largest-exponent recursion), still close to 0.4192 (Sprott 2003, M + C).
	r, err := Spectrum(x, SpectrumOptions{Lag: 1, Dim: 2, Theiler: 1, Exponents: 1})
	if err != nil || len(r.Exponents) != 1 || math.Abs(r.Exponents[0]-0.4192) > 0.1*0.4192 {
		t.Errorf("one exponent: %v, %v", r, err)
	}
}
