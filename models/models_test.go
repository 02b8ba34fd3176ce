package models

import (
	"math"
	"math/rand/v2"
	"strings"
	"testing"
)

// oscillator is the harmonic oscillator ẋ = v, v̇ = −x, with exact solution x = cos t, v = −sin t
// from (1, 0).
type oscillator struct{}

func (oscillator) Dim() int                  { return 2 }
func (oscillator) Field(dst, x []float64)    { dst[0], dst[1] = x[1], -x[0] }
func (oscillator) Jacobian(jac, _ []float64) { jac[0], jac[1], jac[2], jac[3] = 0, 1, -1, 0 }

// linearFlow is ẋ = A x with A = [[0.5, 1], [0, −2]]: its exponents are the eigenvalues 0.5, −2.
type linearFlow struct{}

func (linearFlow) Dim() int { return 2 }
func (linearFlow) Field(dst, x []float64) {
	dst[0], dst[1] = 0.5*x[0]+x[1], -2*x[1]
}
func (linearFlow) Jacobian(jac, _ []float64) { jac[0], jac[1], jac[2], jac[3] = 0.5, 1, 0, -2 }

// catMap is Arnold's cat map (x, y) → (2x + y, x + y) mod 1, with constant Jacobian [[2,1],[1,1]].
type catMap struct{}

func (catMap) Dim() int { return 2 }
func (catMap) Step(dst, x []float64) {
	dst[0] = math.Mod(2*x[0]+x[1], 1)
	dst[1] = math.Mod(x[0]+x[1], 1)
}
func (catMap) Jacobian(jac, _ []float64) { jac[0], jac[1], jac[2], jac[3] = 2, 1, 1, 1 }

func oscillatorError(h float64) float64 {
	x := []float64{1, 0}
	const T = 10.0
	steps := int(math.Round(T / h))
	NewRK4(oscillator{}).Advance(x, h, steps)
	return math.Hypot(x[0]-math.Cos(T), x[1]+math.Sin(T))
}

func TestRK4Order(t *testing.T) {
	// Classical RK4 has global error O(h⁴): halving h divides the error by 2⁴ = 16
	// (Hairer, Nørsett & Wanner 1993, §II.1; exact solution cos t of the harmonic oscillator).
	for _, h := range []float64{0.2, 0.1, 0.05} {
		e1, e2 := oscillatorError(h), oscillatorError(h/2)
		ratio := e1 / e2
		if ratio < 14.5 || ratio > 17.5 {
			t.Errorf("h=%g: error ratio %.3f on halving the step, want ≈16 (errors %.3g, %.3g)", h, ratio, e1, e2)
		}
	}
	// And the error itself is small (exact solution, h = 0.01, T = 10).
	if e := oscillatorError(0.01); e > 1e-8 {
		t.Errorf("RK4 error %.3g at h = 0.01, want < 1e-8", e)
	}
}

func TestRK4NoAllocs(t *testing.T) {
	rk := NewRK4(Lorenz{10, 28, 8.0 / 3})
	x := []float64{1, 1, 1}
	if a := testing.AllocsPerRun(100, func() { rk.Advance(x, 0.001, 10) }); a != 0 {
		t.Errorf("RK4.Advance allocates %v times per call, want 0", a)
	}
}

// TestJacobians compares every model's Jacobian with central finite differences of its field or
// step (common practice).
func TestJacobians(t *testing.T) {
	rng := rand.New(rand.NewPCG(3, 4))
	for _, spec := range Catalog() {
		if spec.Kind == KindProcess {
			continue
		}
		sys, err := spec.New(nil)
		if err != nil {
			t.Fatal(err)
		}
		var n int
		var eval func(dst, x []float64)
		var jacf func(jac, x []float64)
		if sys.Flow != nil {
			n, eval, jacf = sys.Flow.Dim(), sys.Flow.Field, sys.Flow.Jacobian
		} else {
			n, eval, jacf = sys.Map.Dim(), sys.Map.Step, sys.Map.Jacobian
		}
		jac := make([]float64, n*n)
		fp, fm := make([]float64, n), make([]float64, n)
		for trial := 0; trial < 20; trial++ {
			x := make([]float64, n)
			for i := range x {
				x[i] = 0.05 + 0.9*rng.Float64() // inside [0,1] for the interval maps, away from kinks
				if spec.Kind == KindFlow {
					x[i] = 20*rng.Float64() - 10
				}
			}
			if spec.Name == "tent" && math.Abs(x[0]-0.5) < 1e-3 {
				continue
			}
			jacf(jac, x)
			for j := 0; j < n; j++ {
				const d = 1e-6
				xp := append([]float64(nil), x...)
				xm := append([]float64(nil), x...)
				xp[j] += d
				xm[j] -= d
				eval(fp, xp)
				eval(fm, xm)
				for i := 0; i < n; i++ {
					fd := (fp[i] - fm[i]) / (2 * d)
					if math.Abs(fd-jac[i*n+j]) > 1e-5*(1+math.Abs(fd)) {
						t.Errorf("%s: ∂F%d/∂x%d at %v = %g, finite difference %g", spec.Name, i, j, x, jac[i*n+j], fd)
					}
				}
			}
		}
	}
}

func TestHenonDeterminant(t *testing.T) {
	// det J = −b at every point (Hénon 1976; CHECKS §1, E).
	m := Henon{A: 1.4, B: 0.3}
	jac := make([]float64, 4)
	rng := rand.New(rand.NewPCG(1, 2))
	for i := 0; i < 100; i++ {
		x := []float64{4*rng.Float64() - 2, rng.Float64() - 0.5}
		m.Jacobian(jac, x)
		if det := jac[0]*jac[3] - jac[1]*jac[2]; math.Abs(det+0.3) > 1e-15 {
			t.Fatalf("det J at %v = %g, want −0.3", x, det)
		}
	}
}

func TestIkedaDeterminant(t *testing.T) {
	// det J = u² at every point (CHECKS §1, E).
	m := Ikeda{U: 0.9}
	jac := make([]float64, 4)
	rng := rand.New(rand.NewPCG(5, 6))
	for i := 0; i < 100; i++ {
		x := []float64{4*rng.Float64() - 2, 4*rng.Float64() - 2}
		m.Jacobian(jac, x)
		if det := jac[0]*jac[3] - jac[1]*jac[2]; math.Abs(det-0.81) > 1e-12 {
			t.Fatalf("det J at %v = %.15g, want 0.81", x, det)
		}
	}
}

func TestLogisticOrbitInUnitInterval(t *testing.T) {
	// For 0 ≤ r ≤ 4 the logistic map sends [0, 1] into itself (May 1976; exact).
	spec, _ := Lookup("logistic")
	for _, r := range []float64{2.5, 3.5, 3.83, 3.9, 4} {
		opt := spec.DefaultOptions()
		opt.N = 100000
		tr, err := spec.Simulate(Values{"r": {r}}, opt)
		if err != nil {
			t.Fatal(err)
		}
		for i, x := range tr.Data[0] {
			if x < 0 || x > 1 {
				t.Fatalf("r=%g: x[%d] = %g outside [0, 1]", r, i, x)
			}
		}
	}
}

func spectrum(t *testing.T, name string, params Values, mod func(*Options)) *Spectrum {
	t.Helper()
	spec, err := Lookup(name)
	if err != nil {
		t.Fatal(err)
	}
	opt := spec.DefaultOptions()
	opt.N = 0 // the model's spectrum length
	if mod != nil {
		mod(&opt)
	}
	sp, err := spec.Spectrum(params, opt)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("%s %v: exponents %v, D_KY %.5f, T %g", name, params, sp.Exponents, sp.KaplanYorke, sp.Time)
	return sp
}

func sum(x []float64) float64 {
	var s float64
	for _, v := range x {
		s += v
	}
	return s
}

func near(t *testing.T, what string, got, want, tol float64) {
	t.Helper()
	if math.Abs(got-want) > tol {
		t.Errorf("%s = %.7g, want %.7g ± %g", what, got, want, tol)
	}
}

func TestSpectrumLinear(t *testing.T) {
	// Linear flow ẋ = Ax: exponents are Re eig(A) = 0.5, −2 (CHECKS §1 "linear flow", E; 1e-8).
	sp, err := FlowSpectrum(linearFlow{}, []float64{1, 1}, 0.01, 10, 1000, 0)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "linear flow λ1", sp.Exponents[0], 0.5, 1e-8)
	near(t, "linear flow λ2", sp.Exponents[1], -2, 1e-8)
	// Cat map: ±2 ln φ = ±0.9624237 with a constant Jacobian (CHECKS §1, E; 1e-10).
	sm, err := MapSpectrum(catMap{}, []float64{0.1, 0.2}, 10000, 100)
	if err != nil {
		t.Fatal(err)
	}
	lphi := 2 * math.Log(GoldenMean)
	near(t, "cat map λ1", sm.Exponents[0], lphi, 1e-10)
	near(t, "cat map λ2", sm.Exponents[1], -lphi, 1e-10)
}

func TestSpectrumLogisticTent(t *testing.T) {
	// Logistic r = 4: λ = ln 2 (CHECKS §1, E, C; ±0.001 for N ≥ 10⁶).
	sp := spectrum(t, "logistic", nil, nil)
	near(t, "logistic r=4 λ", sp.Exponents[0], math.Ln2, 1e-3)
	// Logistic r = 3.5, stable period 4: λ = −0.8725 (CHECKS §1 logistic table, C; ±0.005).
	sp = spectrum(t, "logistic", Values{"r": {3.5}}, nil)
	near(t, "logistic r=3.5 λ", sp.Exponents[0], -0.8725, 0.005)
	// Tent μ = 1.99: |f′| = μ everywhere so λ = ln μ at every step (CHECKS §1, E).
	sp = spectrum(t, "tent", nil, nil)
	near(t, "tent μ=1.99 λ", sp.Exponents[0], math.Log(1.99), 1e-9) // 10⁶ rounded additions
}

func TestSpectrumHenonLoziIkeda(t *testing.T) {
	// Hénon 1.4, 0.3: λ1 = 0.41922, λ2 = −1.62319 (Sprott 2003 App. A, CHECKS §2, M + C;
	// ±0.005 from equations); λ1 + λ2 = ln 0.3 (CHECKS §1, E; 1e-9).
	sp := spectrum(t, "henon", nil, nil)
	near(t, "Hénon λ1", sp.Exponents[0], 0.4192, 0.005)
	near(t, "Hénon λ2", sp.Exponents[1], -1.6232, 0.005)
	near(t, "Hénon λ1+λ2", sum(sp.Exponents), math.Log(0.3), 1e-9)
	// Hénon D_KY = 1.25827 (Sprott 2003, CHECKS §2, M + C).
	near(t, "Hénon D_KY", sp.KaplanYorke, 1.25827, 0.005)

	// Lozi 1.7, 0.5: λ1 = 0.47023 (Sprott 2003, CHECKS §2, M + C; ±0.005); sum ln 0.5 (E; 1e-9).
	sp = spectrum(t, "lozi", nil, nil)
	near(t, "Lozi λ1", sp.Exponents[0], 0.47023, 0.005)
	near(t, "Lozi λ1+λ2", sum(sp.Exponents), math.Log(0.5), 1e-9)

	// Ikeda u = 0.9: λ1 = 0.5076 (Sprott 2003 p. 424 via a secondary page, CHECKS §2, V + C;
	// ±0.005); sum 2 ln u (CHECKS §1, E; 1e-9).
	sp = spectrum(t, "ikeda", nil, nil)
	near(t, "Ikeda λ1", sp.Exponents[0], 0.5076, 0.005)
	near(t, "Ikeda λ1+λ2", sum(sp.Exponents), 2*math.Log(0.9), 1e-9)
}

func TestSpectrumLorenz(t *testing.T) {
	// Lorenz 10, 28, 8/3, T = 1000, RK4 h = 0.001, renormalised every 0.01.
	sp := spectrum(t, "lorenz", nil, nil)
	// (0.9056, 0, −14.5723): Sprott 2003 App. A; Sprott's web page (0.906, 0, −14.572)
	// (CHECKS §2, V + C); within 1 %.
	near(t, "Lorenz λ1", sp.Exponents[0], 0.9056, 0.01*0.9056)
	near(t, "Lorenz λ3", sp.Exponents[2], -14.5723, 0.01*14.5723)
	// One zero exponent for an autonomous flow (CHECKS §1, E, C; |λ| < 5e-3 at T = 10³).
	near(t, "Lorenz λ2", sp.Exponents[1], 0, 5e-3)
	// Σλ = −(σ + 1 + β) = −13.666667 (CHECKS §1, E; 1e-3).
	near(t, "Lorenz Σλ", sum(sp.Exponents), -(10 + 1 + 8.0/3), 1e-3)
	// D_KY = 2.06215 (Sprott, CHECKS §2, V: 2.062); within 0.01.
	near(t, "Lorenz D_KY", sp.KaplanYorke, 2.06215, 0.01)
	if !testing.Short() {
		// A longer run (T = 5000) gets closer: λ1 within 0.5 %.
		sp := spectrum(t, "lorenz", nil, func(o *Options) { o.N = 500000 })
		near(t, "Lorenz λ1 (T = 5000)", sp.Exponents[0], 0.9056, 0.005*0.9056)
	}
}

func TestSpectrumRossler(t *testing.T) {
	// Rössler 0.2, 0.2, 5.7: (0.0714, 0, −5.3943), "as given by Prof. Sprott" via a secondary page
	// (CHECKS §2, V (secondary) + C); λ1 ±0.005 at T ≥ 4·10³; zero exponent (CHECKS §1, E).
	sp := spectrum(t, "rossler", nil, func(o *Options) { o.N, o.Substeps = 400000, 2 }) // T = 4000, h = 0.005
	near(t, "Rössler λ1", sp.Exponents[0], 0.0714, 0.005)
	near(t, "Rössler λ2", sp.Exponents[1], 0, 5e-3)
	near(t, "Rössler λ3", sp.Exponents[2], -5.3943, 0.02)
	// D_KY = 2.0132 (Sprott 2003, CHECKS §4 row, M); loose.
	near(t, "Rössler D_KY", sp.KaplanYorke, 2.0132, 0.002)
}

func TestSpectrumDuffing(t *testing.T) {
	// Ueda δ = 0.05, γ = 7.5 (phase as third variable), T = 3000: λ1 = 0.1034 (Sprott 2003 App. A,
	// CHECKS §2, M + C 0.0997; ±0.01, it converges slowly); Σλ = −δ (CHECKS §1, E; 1e-3);
	// one zero exponent from the phase (E).
	sp := spectrum(t, "duffing", nil, nil)
	near(t, "Ueda λ1", sp.Exponents[0], 0.1034, 0.01)
	near(t, "Ueda λ2", sp.Exponents[1], 0, 1e-9)
	near(t, "Ueda Σλ", sum(sp.Exponents), -0.05, 1e-3)
	// Two-well δ = 0.25, α = −1, β = 1, γ = 0.4: CHECKS §2 cautions that the recalled 0.1474 and
	// an independent 0.1621 disagree, so only λ1 ∈ [0.13, 0.18] (M/C) and Σλ = −0.25 (E).
	sp = spectrum(t, "duffing", Values{"delta": {0.25}, "alpha": {-1}, "gamma": {0.4}}, nil)
	if l := sp.Exponents[0]; l < 0.13 || l > 0.18 {
		t.Errorf("two-well Duffing λ1 = %.4f, want in [0.13, 0.18]", l)
	}
	near(t, "two-well Σλ", sum(sp.Exponents), -0.25, 1e-3)
}

func TestKaplanYorke(t *testing.T) {
	cases := []struct {
		name string
		ex   []float64
		want float64
		tol  float64
	}{
		// Kaplan–Yorke map α = 0.2: 1 + ln 2/|ln 0.2| = 1.430677 (Kaplan & Yorke 1979; CHECKS §1, E).
		{"Kaplan–Yorke map", []float64{math.Ln2, math.Log(0.2)}, 1.430677, 1e-6},
		// Lorenz published spectrum → 2.06215 (Sprott 2003; CHECKS §2, V; the formula reproduces it).
		{"Lorenz", []float64{0.9056, 0, -14.5723}, 2.06215, 1e-4},
		// Hénon published spectrum → 1.25827 (Sprott 2003; CHECKS §2, M, internally consistent).
		{"Hénon", []float64{0.41922, -1.62319}, 1.25827, 1e-4},
		// Order of the input does not matter (definition).
		{"unsorted", []float64{-14.5723, 0.9056, 0}, 2.06215, 1e-4},
		// A stable fixed point has dimension 0; an expanding volume fills all dimensions (definition).
		{"all negative", []float64{-0.1, -1}, 0, 0},
		{"non-negative sum", []float64{0.5, -0.2}, 2, 0},
		// A limit cycle: (0, −1) → 1 (definition).
		{"limit cycle", []float64{0, -1}, 1, 0},
	}
	for _, c := range cases {
		if got := KaplanYorke(c.ex); math.Abs(got-c.want) > c.tol {
			t.Errorf("%s: D_KY(%v) = %.7g, want %.7g", c.name, c.ex, got, c.want)
		}
	}
}

func TestARVariance(t *testing.T) {
	// AR(1) x_t = φx_{t−1} + e_t has variance 1/(1 − φ²) = 5.263 and lag-1 autocorrelation φ
	// (Box & Jenkins 1970; exact). N = 2·10⁵: the standard error of the variance is ≈1 %; allow 4 %.
	spec, _ := Lookup("ar")
	opt := spec.DefaultOptions()
	opt.N = 200000
	opt.Seed = 42
	tr, err := spec.Simulate(nil, opt)
	if err != nil {
		t.Fatal(err)
	}
	x := tr.Data[0]
	v := stdDev(x) * stdDev(x)
	near(t, "AR(1) variance", v, 1/(1-0.81), 0.04/(1-0.81))
	var m, c float64
	for _, xi := range x {
		m += xi
	}
	m /= float64(len(x))
	for i := 1; i < len(x); i++ {
		c += (x[i] - m) * (x[i-1] - m)
	}
	near(t, "AR(1) lag-1 autocorrelation", c/float64(len(x)-1)/v, 0.9, 0.01)
}

func TestARStationary(t *testing.T) {
	// AR(2) is stationary inside the triangle φ2 > −1, φ1 + φ2 < 1, φ2 − φ1 < 1 (Box & Jenkins 1970;
	// exact); AR(1) iff |φ| < 1.
	cases := []struct {
		phi  []float64
		want bool
	}{
		{[]float64{0.9}, true}, {[]float64{1}, false}, {[]float64{-1.01}, false},
		{[]float64{0.5, 0.3}, true}, {[]float64{0.5, 0.6}, false}, {[]float64{-0.5, -0.9}, true},
		{[]float64{0.2, -1}, false}, {[]float64{-0.7, 0.4}, false}, {[]float64{1.8, -0.9}, true},
		{nil, true},
	}
	for _, c := range cases {
		if got := (AR{Phi: c.phi}).Stationary(); got != c.want {
			t.Errorf("AR%v stationary = %v, want %v", c.phi, got, c.want)
		}
	}
	spec, _ := Lookup("ar")
	if _, err := spec.New(Values{"phi": {0.5, 0.6}}); err == nil || !strings.Contains(err.Error(), "non-stationary") {
		t.Errorf("non-stationary AR accepted: %v", err)
	}
}

func TestWhiteNoise(t *testing.T) {
	// i.i.d. N(μ, σ²): sample mean within 4σ/√N, std within 2 % (N = 10⁵; exact statistics).
	spec, _ := Lookup("noise")
	opt := spec.DefaultOptions()
	opt.N = 100000
	tr, err := spec.Simulate(Values{"mean": {3}, "sigma": {2}}, opt)
	if err != nil {
		t.Fatal(err)
	}
	near(t, "noise mean", sum(tr.Data[0])/1e5, 3, 4*2/math.Sqrt(1e5))
	near(t, "noise std", stdDev(tr.Data[0]), 2, 0.04)
}

func TestSines(t *testing.T) {
	// x(t) = sin t + sin(φt) by construction.
	spec, _ := Lookup("sines")
	opt := spec.DefaultOptions()
	opt.N = 100
	tr, err := spec.Simulate(nil, opt)
	if err != nil {
		t.Fatal(err)
	}
	for i, x := range tr.Data[0] {
		tt := float64(i) * 0.25
		if want := math.Sin(tt) + math.Sin(GoldenMean*tt); math.Abs(x-want) > 1e-12 {
			t.Fatalf("x(%g) = %g, want %g", tt, x, want)
		}
	}
	if _, err := spec.New(Values{"ratios": {1, 2, 3}, "amplitudes": {1, 2}}); err == nil {
		t.Error("mismatched amplitudes accepted")
	}
}

func TestSimulateNoiseAndSeed(t *testing.T) {
	spec, _ := Lookup("henon")
	opt := spec.DefaultOptions()
	clean, err := spec.Simulate(nil, opt)
	if err != nil {
		t.Fatal(err)
	}
	opt.Noise, opt.Seed = 0.02, 7
	noisy, _ := spec.Simulate(nil, opt)
	again, _ := spec.Simulate(nil, opt)
	for c := range clean.Data {
		d := make([]float64, clean.Len())
		for i := range d {
			d[i] = noisy.Data[c][i] - clean.Data[c][i]
			if noisy.Data[c][i] != again.Data[c][i] {
				t.Fatal("the same seed gave different output")
			}
		}
		// The added noise has standard deviation 2 % of the column's (construction; N = 10⁴ gives
		// a relative standard error of 0.7 %, allow 3 %).
		near(t, "noise fraction "+clean.Columns[c], stdDev(d)/stdDev(clean.Data[c]), 0.02, 0.02*0.03)
	}
}

func TestSimulateFlowStart(t *testing.T) {
	// With no transient the first sample is the initial condition, and the next is one RK4
	// interval later.
	spec, _ := Lookup("lorenz")
	opt := spec.DefaultOptions()
	opt.N, opt.Transient, opt.Initial = 3, 0, []float64{2, 3}
	tr, err := spec.Simulate(nil, opt)
	if err != nil {
		t.Fatal(err)
	}
	if tr.Data[0][0] != 2 || tr.Data[1][0] != 3 || tr.Data[2][0] != 1 {
		t.Errorf("first sample (%g, %g, %g), want (2, 3, 1)", tr.Data[0][0], tr.Data[1][0], tr.Data[2][0])
	}
	x := []float64{2, 3, 1}
	NewRK4(Lorenz{10, 28, 8.0 / 3}).Advance(x, 0.001, 10)
	if tr.Data[0][1] != x[0] {
		t.Errorf("second sample x = %g, want %g", tr.Data[0][1], x[0])
	}
}

func TestBadInput(t *testing.T) {
	henon, _ := Lookup("henon")
	opt := henon.DefaultOptions()
	cases := []struct {
		name string
		run  func() error
		want string
	}{
		{"unknown model", func() error { _, err := Lookup("lorentz"); return err }, "models: lorenz"},
		{"unknown parameter", func() error { _, err := henon.New(Values{"sigma": {1}}); return err }, "its parameters: a, b"},
		{"two values for a scalar", func() error { _, err := henon.New(Values{"a": {1, 2}}); return err }, "one value"},
		{"dt for a map", func() error {
			o := opt
			o.Dt = 0.5
			_, err := henon.Simulate(nil, o)
			return err
		}, "per sample"},
		{"escaping orbit", func() error {
			o := opt
			o.Initial = []float64{10, 10}
			_, err := henon.Simulate(nil, o)
			return err
		}, "left to infinity"},
		{"too many initial values", func() error {
			o := opt
			o.Initial = []float64{1, 2, 3}
			_, err := henon.Simulate(nil, o)
			return err
		}, "2 state variables"},
		{"negative noise", func() error {
			o := opt
			o.Noise = -1
			_, err := henon.Simulate(nil, o)
			return err
		}, "noise"},
		{"logistic r > 4", func() error {
			s, _ := Lookup("logistic")
			_, err := s.New(Values{"r": {4.1}})
			return err
		}, "[0, 4]"},
		{"spectrum of a process", func() error {
			s, _ := Lookup("noise")
			_, err := s.Spectrum(nil, s.DefaultOptions())
			return err
		}, "no Lyapunov spectrum"},
	}
	for _, c := range cases {
		err := c.run()
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: error %v, want one containing %q", c.name, err, c.want)
		}
	}
}

func TestCatalog(t *testing.T) {
	seen := map[string]bool{}
	for _, s := range Catalog() {
		if seen[s.Name] {
			t.Errorf("duplicate model %s", s.Name)
		}
		seen[s.Name] = true
		sys, err := s.New(nil)
		if err != nil {
			t.Errorf("%s with defaults: %v", s.Name, err)
			continue
		}
		set := 0
		for _, ok := range []bool{sys.Flow != nil, sys.Map != nil, sys.Process != nil} {
			if ok {
				set++
			}
		}
		if set != 1 {
			t.Errorf("%s: %d of Flow, Map, Process set", s.Name, set)
		}
		if sys.Flow != nil && (s.Kind != KindFlow || sys.Flow.Dim() != len(s.Initial)) ||
			sys.Map != nil && (s.Kind != KindMap || sys.Map.Dim() != len(s.Initial)) {
			t.Errorf("%s: kind or initial condition does not match the system", s.Name)
		}
		if s.Kind != KindProcess && (len(s.Columns) > len(s.Initial) || s.SpectrumN < 1) {
			t.Errorf("%s: columns or spectrum length inconsistent", s.Name)
		}
		for _, p := range s.Params {
			if p.Doc == "" || p.Symbol == "" || len(p.Default) == 0 || !p.List && len(p.Default) != 1 {
				t.Errorf("%s: parameter %s incompletely described", s.Name, p.Name)
			}
		}
		opt := s.DefaultOptions()
		opt.N = 200
		if tr, err := s.Simulate(nil, opt); err != nil || tr.Len() != 200 || len(tr.Data) != len(s.Columns) {
			t.Errorf("%s: simulate with defaults: %v", s.Name, err)
		}
	}
	// The catalog is fresh on every call: modifying one copy does not change the next.
	c := Catalog()
	c[0].Params[0].Default[0] = -1
	if Catalog()[0].Params[0].Default[0] == -1 {
		t.Error("Catalog shares state between calls")
	}
}

func BenchmarkRK4Lorenz(b *testing.B) {
	b.ReportAllocs()
	rk := NewRK4(Lorenz{10, 28, 8.0 / 3})
	x := []float64{1, 1, 1}
	for b.Loop() {
		rk.Step(x, 0.001)
	}
}

func BenchmarkSpectrumLorenz(b *testing.B) {
	b.ReportAllocs()
	f := Lorenz{10, 28, 8.0 / 3}
	for b.Loop() {
		if _, err := FlowSpectrum(f, []float64{1, 1, 1}, 0.001, 10, 1000, 0); err != nil {
			b.Fatal(err)
		}
	}
}

func BenchmarkSpectrumHenon(b *testing.B) {
	b.ReportAllocs()
	m := Henon{1.4, 0.3}
	for b.Loop() {
		if _, err := MapSpectrum(m, []float64{0.1, 0.1}, 10000, 0); err != nil {
			b.Fatal(err)
		}
	}
}
