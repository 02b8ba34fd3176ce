package states

import (
	"errors"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"unfold/internal/testsignals"
)

func h2(p float64) float64 {
	if p <= 0 || p >= 1 {
		return 0
	}
	return -p*math.Log2(p) - (1-p)*math.Log2(1-p)
}

// markov2 draws n symbols of a binary first-order Markov chain with P(0→1) = a, P(1→0) = b.
func markov2(n int, a, b float64, seed uint64) []uint8 {
	r := rand.New(rand.NewPCG(seed, 7))
	x := make([]uint8, n)
	s := uint8(0)
	for i := range x {
		if s == 0 && r.Float64() < a {
			s = 1
		} else if s == 1 && r.Float64() < b {
			s = 0
		}
		x[i] = s
	}
	return x
}

// goldenMean: no two 1s in a row; after a 0, 0 or 1 with probability 1/2.
func goldenMean(n int, seed uint64) []uint8 { return markov2(n, 0.5, 1, seed) }

// even: 1s come in blocks of even length (state A emits 0 or 1 with 1/2; 1 leads to B, which
// emits 1 and returns to A).
func even(n int, seed uint64) []uint8 {
	r := rand.New(rand.NewPCG(seed, 9))
	x := make([]uint8, n)
	inB := false
	for i := range x {
		switch {
		case inB:
			x[i], inB = 1, false
		case r.Float64() < 0.5:
			x[i], inB = 1, true
		default:
			x[i] = 0
		}
	}
	return x
}

func checkResult(t *testing.T, name string, r *Result, states int, cmu, hmu float64) {
	t.Helper()
	if len(r.States) != states || math.Abs(r.StatisticalComplexity-cmu) > 0.03 || math.Abs(r.EntropyRate-hmu) > 0.02 {
		t.Errorf("%s: %d states, Cμ = %.4f, hμ = %.4f; want %d, %.4f, %.4f (L = %d, cautions %q)",
			name, len(r.States), r.StatisticalComplexity, r.EntropyRate, states, cmu, hmu, r.HistoryLength, r.Cautions)
	}
	if r.EntropyRate > math.Log2(float64(r.K)) || r.StatisticalComplexity < 0 {
		t.Errorf("%s: impossible values Cμ = %g, hμ = %g", name, r.StatisticalComplexity, r.EntropyRate)
	}
}

// Exact results from CHECKS.md ("Causal states and statistical complexity"): Crutchfield &
// Feldman 2003 (Chaos 13, 25) and Shalizi & Klinkner 2004.
func TestFairCoin(t *testing.T) {
	// fair coin: one causal state, Cμ = 0, hμ = 1 bit (exact)
	// 10^6 symbols with the automatic L (the "done when" size of issue 16)
	r := rand.New(rand.NewPCG(3, 4))
	x := make([]uint8, 1_000_000)
	for i := range x {
		x[i] = uint8(r.IntN(2))
	}
	res, err := Reconstruct(x, 2, Options{})
	if err != nil {
		t.Fatal(err)
	}
	checkResult(t, "fair coin", res, 1, 0, 1)
}

func TestPeriodic(t *testing.T) {
	// period-k sequences: k states, Cμ = log2 k, hμ = 0 (exact)
	for _, pat := range [][]uint8{{0, 1}, {0, 0, 1}, {0, 0, 1, 1}, {0, 1, 2, 1, 0}} {
		k := 2
		for _, s := range pat {
			k = max(k, int(s)+1)
		}
		x := make([]uint8, 20_000)
		for i := range x {
			x[i] = pat[i%len(pat)]
		}
		res, err := Reconstruct(x, k, Options{MaxLength: len(pat)})
		if err != nil {
			t.Fatal(err)
		}
		checkResult(t, "period "+string(rune('0'+len(pat))), res, len(pat), math.Log2(float64(len(pat))), 0)
	}
}

func TestGoldenMean(t *testing.T) {
	// golden mean: 2 states, π = (2/3, 1/3), Cμ = H(1/3) = 0.9183 bit, hμ = 2/3 bit (exact)
	res, err := Reconstruct(goldenMean(200_000, 1), 2, Options{})
	if err == nil && res.LengthRule != LengthRule {
		t.Errorf("length rule %q, want the automatic one", res.LengthRule)
	}
	if err != nil {
		t.Fatal(err)
	}
	checkResult(t, "golden mean (default L)", res, 2, h2(1.0/3), 2.0/3)
}

func TestEvenProcess(t *testing.T) {
	// even process: 2 recurrent states, Cμ = H(1/3) = 0.9183 bit, hμ = 2/3 bit (exact)
	// 10^6 symbols with the automatic L (the "done when" size of issue 16)
	res, err := Reconstruct(even(1_000_000, 2), 2, Options{})
	if err != nil {
		t.Fatal(err)
	}
	checkResult(t, "even process", res, 2, h2(1.0/3), 2.0/3)
}

func TestMarkovChain(t *testing.T) {
	// binary Markov chain P(0→1) = a = 0.2, P(1→0) = b = 0.4: π = (b, a)/(a+b) = (2/3, 1/3),
	// Cμ = H(π), hμ = π0 H(a) + π1 H(b) (exact)
	a, b := 0.2, 0.4
	res, err := Reconstruct(markov2(200_000, a, b, 5), 2, Options{MaxLength: 5})
	if err != nil {
		t.Fatal(err)
	}
	p0 := b / (a + b)
	checkResult(t, "Markov chain", res, 2, h2(p0), p0*h2(a)+(1-p0)*h2(b))
}

func TestLogisticCritical(t *testing.T) {
	// logistic map r = 4 cut at its critical point x = 1/2: a fair coin, one state, Cμ = 0,
	// hμ = 1 bit (exact, by the conjugacy x = sin²(πθ) to the doubling map θ → 2θ mod 1,
	// whose binary digits are the symbols). The float64 orbit is a pseudo-orbit of the map.
	x := make([]uint8, 200_000)
	for i, v := range testsignals.Logistic(len(x), 4, 0.1234567, 1) {
		if v >= 0.5 {
			x[i] = 1
		}
	}
	res, err := Reconstruct(x, 2, Options{MaxLength: 5})
	if err != nil {
		t.Fatal(err)
	}
	checkResult(t, "logistic r = 4 at x = 1/2", res, 1, 0, 1)
}

func TestTooShort(t *testing.T) {
	// a stream shorter than MinSymbols(L, K) is refused with the length it needs
	_, err := Reconstruct(goldenMean(100, 1), 2, Options{MaxLength: 8})
	var ts *ErrTooShort
	if !errors.As(err, &ts) || ts.Need != 5*512 {
		t.Fatalf("got %v, want a refusal needing %d symbols", err, 5*512)
	}
}

func TestDefaultMaxLength(t *testing.T) {
	// the stated rule: K^(L+1) ≤ N/50 and α·K^(L+1) ≤ 0.1
	for _, c := range []struct {
		n, k  int
		alpha float64
		want  int
	}{{1_000_000, 2, 0.001, 5}, {1_000_000, 2, 0.0001, 8}, {10_000, 2, 0.0001, 6}, {100_000, 4, 0.001, 2}, {10, 2, 0.001, 1}} {
		if got := DefaultMaxLength(c.n, c.k, c.alpha); got != c.want {
			t.Errorf("DefaultMaxLength(%d, %d, %g) = %d, want %d", c.n, c.k, c.alpha, got, c.want)
		}
	}
}

func TestScan(t *testing.T) {
	rows, err := Scan(goldenMean(100_000, 3), 2, Options{MaxLength: 5})
	if err != nil {
		t.Fatal(err)
	}
	if len(rows) != 5 {
		t.Fatalf("%d rows, want 5", len(rows))
	}
	for _, r := range rows {
		// golden mean is order-1 Markov: exact from L = 1 on (Crutchfield & Feldman 2003)
		if r.States != 2 || math.Abs(r.StatisticalComplexity-h2(1.0/3)) > 0.03 {
			t.Errorf("L = %d: %d states, Cμ %.4f", r.Length, r.States, r.StatisticalComplexity)
		}
	}
}

func TestChiSquare(t *testing.T) {
	// identical proportions give χ² = 0, p = 1; a 2×2 table [[30,10],[10,30]] has χ² = 20 with
	// 1 degree of freedom, p = erfc(√10) = 7.74e-6 (exact for df = 1)
	if p := ChiSquareTest([]int64{10, 20}, []int64{20, 40}); math.Abs(p-1) > 1e-12 {
		t.Errorf("p = %g, want 1", p)
	}
	if p, want := ChiSquareTest([]int64{30, 10}, []int64{10, 30}), math.Erfc(math.Sqrt(10)); math.Abs(p-want) > 1e-9 {
		t.Errorf("p = %g, want %g", p, want)
	}
}

func TestWriteDOT(t *testing.T) {
	res, err := Reconstruct(goldenMean(50_000, 4), 2, Options{MaxLength: 3})
	if err != nil {
		t.Fatal(err)
	}
	var b strings.Builder
	if err := WriteDOT(&b, res, "01"); err != nil {
		t.Fatal(err)
	}
	out := b.String()
	// golden mean: 2 states and 3 transitions (A -0-> A, A -1-> B, B -0-> A), exact
	if n := strings.Count(out, " -> "); n != 3 || !strings.HasPrefix(out, "digraph") || !strings.Contains(out, `s0 -> s1 [label="1 | 0.`) || !strings.Contains(out, `s1 [label="1\n0.33`) {
		t.Errorf("DOT output:\n%s", out)
	}
	if got := SuffixString([]uint8{0, 1, 1}, "ab"); got != "abb" {
		t.Errorf("SuffixString = %q", got)
	}
}

func TestCautionUnsettled(t *testing.T) {
	// period 4 (0011): two symbols fix the phase (00, 01, 11, 10 each occur at one phase), one
	// does not, so there are 4 states at L = 2 (exact) but not at L = 1, and the change between
	// L − 1 and L is cautioned
	x := make([]uint8, 10_000)
	for i := range x {
		x[i] = []uint8{0, 0, 1, 1}[i%4]
	}
	res, err := Reconstruct(x, 2, Options{MaxLength: 2})
	if err != nil {
		t.Fatal(err)
	}
	found := false
	for _, c := range res.Cautions {
		found = found || strings.Contains(c, "changes between L = 1 and L = 2")
	}
	if len(res.States) != 4 || !found {
		t.Errorf("%d states, cautions %q; want 4 states and a caution on the change from L = 1", len(res.States), res.Cautions)
	}
}
