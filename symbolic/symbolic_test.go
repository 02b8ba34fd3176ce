package symbolic

import (
	"bytes"
	"errors"
	"io"
	"math"
	"math/rand/v2"
	"strings"
	"testing"

	"unfold/internal/testsignals"
	"unfold/series"
)

// logistic returns n iterates of x' = 4x(1−x) from x0 = 0.3 after 1000 transient steps, the
// first one step past it (internal/testsignals; CHECKS.md §13).
func logistic(n int) []float64 { return testsignals.Logistic(n, 4, 0.3, 1001) }

func fairSymbols(n int, seed uint64) []uint8 {
	rng := rand.New(rand.NewPCG(seed, 7))
	s := make([]uint8, n)
	for i := range s {
		s[i] = uint8(rng.IntN(2))
	}
	return s
}

func TestFairCoin(t *testing.T) {
	s := fairSymbols(200_000, 1)
	res, err := BlockEntropies(s, 2, 0, Grassberger)
	if err != nil {
		t.Fatal(err)
	}
	// CHECKS.md §9 (E): fair coin, h = 1 bit, E = 0 (statistical tolerance).
	if math.Abs(res.EntropyRate-1) > 0.01 {
		t.Errorf("fair coin: h = %.4f bits, want 1 ± 0.01 (L* = %d)", res.EntropyRate, res.RateLength)
	}
	if math.Abs(res.ExcessEntropy) > 0.1 {
		t.Errorf("fair coin: E = %.4f bits, want 0 ± 0.1", res.ExcessEntropy)
	}
	if len(res.Cautions) == 0 {
		t.Errorf("lengths above the supported one should give a caution")
	}
	// Block entropy H(1) = 1 bit: CHECKS.md §9 row 1 (E).
	if math.Abs(res.Blocks[0].Bits-1) > 1e-3 {
		t.Errorf("H(1) = %.5f, want 1", res.Blocks[0].Bits)
	}
}

func TestPeriodic(t *testing.T) {
	// CHECKS.md §9 (E): a period-p sequence has h = 0 and E = log2 p bits.
	for _, pat := range []string{"01", "011", "00101", "0120112"} {
		p := len(pat)
		k := 0
		for _, c := range pat {
			k = max(k, int(c-'0')+1)
		}
		s := make([]uint8, 100_000)
		for i := range s {
			s[i] = pat[i%p] - '0'
		}
		for _, est := range []Estimator{Plugin, Grassberger, MillerMadow} {
			res, err := BlockEntropies(s, k, 12, est)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(res.EntropyRate) > 1e-3 {
				t.Errorf("period %s (%v): h = %.5f, want 0", pat, est, res.EntropyRate)
			}
			if math.Abs(res.ExcessEntropy-math.Log2(float64(p))) > 1e-3 {
				t.Errorf("period %s (%v): E = %.5f, want log2 %d = %.5f", pat, est, res.ExcessEntropy, p, math.Log2(float64(p)))
			}
		}
	}
}

func TestMarkovChain(t *testing.T) {
	// Exact: for a stationary first-order Markov chain h = Σ_i π_i H(P_i·) and H(L) =
	// H(π) + (L−1)h, so h(L) = h for L ≥ 2 and E = H(π) − h (CHECKS.md §9, i.i.d./Markov rows, E).
	P := [3][3]float64{{0.5, 0.3, 0.2}, {0.1, 0.8, 0.1}, {0.4, 0.4, 0.2}}
	// stationary distribution by power iteration
	pi := [3]float64{1. / 3, 1. / 3, 1. / 3}
	for it := 0; it < 1000; it++ {
		var q [3]float64
		for i := 0; i < 3; i++ {
			for j := 0; j < 3; j++ {
				q[j] += pi[i] * P[i][j]
			}
		}
		pi = q
	}
	var h, hpi float64
	for i := 0; i < 3; i++ {
		hpi -= pi[i] * math.Log2(pi[i])
		for j := 0; j < 3; j++ {
			h -= pi[i] * P[i][j] * math.Log2(P[i][j])
		}
	}
	rng := rand.New(rand.NewPCG(3, 4))
	s := make([]uint8, 400_000)
	state := 0
	for i := range s {
		u := rng.Float64()
		j, c := 0, P[state][0]
		for u > c && j < 2 {
			j++
			c += P[state][j]
		}
		state = j
		s[i] = uint8(state)
	}
	res, err := BlockEntropies(s, 3, 0, Grassberger)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(res.EntropyRate-h) > 0.01 {
		t.Errorf("Markov chain: h = %.4f bits, want Σ π_i H(P_i·) = %.4f", res.EntropyRate, h)
	}
	if math.Abs(res.ExcessEntropy-(hpi-h)) > 0.08 {
		t.Errorf("Markov chain: E = %.4f bits, want H(π) − h = %.4f", res.ExcessEntropy, hpi-h)
	}
}

func TestLogisticGeneratingPartition(t *testing.T) {
	// CHECKS.md §9 (E, C): logistic r = 4 cut at x = 1/2: H(L) = L bits, h = 1 bit, E = 0.
	x := logistic(200_000)
	s := make([]uint8, len(x))
	for i, v := range x {
		if v >= 0.5 {
			s[i] = 1
		}
	}
	res, err := BlockEntropies(s, 2, 0, Grassberger)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(res.EntropyRate-1) > 0.01 {
		t.Errorf("logistic at 1/2: h = %.4f, want 1 bit/symbol", res.EntropyRate)
	}
	// CHECKS.md §9 (E, qualitative): a cut at 0.3 is not generating, h < ln 2 nats = 1 bit.
	for i, v := range x {
		s[i] = 0
		if v >= 0.3 {
			s[i] = 1
		}
	}
	res, _ = BlockEntropies(s, 2, 0, Grassberger)
	if res.EntropyRate > 0.97 {
		t.Errorf("logistic at 0.3: h = %.4f, want clearly below 1 bit", res.EntropyRate)
	}
}

func TestGrassbergerG(t *testing.T) {
	// Grassberger 2003 (from memory): G(1) = −γ − ln 2, G(2) = 2 − γ − ln 2, and the
	// recursion G(2n+1) = G(2n), G(2n+2) = G(2n) + 2/(2n+1).
	const euler = 0.5772156649015329
	if g := grassbergerG(1); math.Abs(g-(-euler-math.Ln2)) > 1e-9 {
		t.Errorf("G(1) = %v", g)
	}
	if g := grassbergerG(2); math.Abs(g-(2-euler-math.Ln2)) > 1e-9 {
		t.Errorf("G(2) = %v", g)
	}
	for n := int64(1); n < 40; n++ {
		if a, b := grassbergerG(2*n+1), grassbergerG(2*n); math.Abs(a-b) > 1e-10 {
			t.Errorf("G(%d) = %v ≠ G(%d) = %v", 2*n+1, a, 2*n, b)
		}
		if a, b := grassbergerG(2*n+2), grassbergerG(2*n)+2/float64(2*n+1); math.Abs(a-b) > 1e-10 {
			t.Errorf("G(%d) recursion: %v vs %v", 2*n+2, a, b)
		}
	}
	// Undersampled uniform distribution over 1000 cells, 500 draws: the corrected estimates
	// are closer to ln 1000 than the plug-in one (common practice: bias corrections reduce
	// the downward bias).
	rng := rand.New(rand.NewPCG(5, 5))
	cnt := make([]int64, 1000)
	for i := 0; i < 500; i++ {
		cnt[rng.IntN(1000)]++
	}
	want := math.Log(1000)
	pl, mm, gr := EntropyNats(cnt, Plugin), EntropyNats(cnt, MillerMadow), EntropyNats(cnt, Grassberger)
	if !(want-gr < want-mm && want-mm < want-pl) {
		t.Errorf("bias order: plug-in %.3f, Miller–Madow %.3f, Grassberger %.3f, true %.3f", pl, mm, gr, want)
	}
}

// ksComplexity is the quadratic algorithm of Kaspar & Schuster (1987), as a reference.
func ksComplexity(s []uint8) int {
	n := len(s)
	if n < 2 {
		return n
	}
	c, l, i, k, kmax := 1, 1, 0, 1, 1
	for {
		if s[i+k-1] == s[l+k-1] {
			k++
			if l+k > n {
				c++
				break
			}
		} else {
			if k > kmax {
				kmax = k
			}
			i++
			if i == l {
				c++
				l += kmax
				if l+1 > n {
					break
				}
				i, k, kmax = 0, 1, 1
			} else {
				k = 1
			}
		}
	}
	return c
}

func bits(s string) []uint8 {
	out := make([]uint8, len(s))
	for i := range s {
		out[i] = s[i] - '0'
	}
	return out
}

func TestLZ76Examples(t *testing.T) {
	cases := []struct {
		s    string
		want int
		src  string
	}{
		{"1001111011000010", 6, "CHECKS.md §10 row 1 (V, C)"},
		{"0001101001000101", 6, "CHECKS.md §10 row 2 (M, C)"},
		{"0000000000000000", 2, "CHECKS.md §10 constant string (C)"},
		{"00", 2, "CHECKS.md §10 constant string n = 2 (C)"},
		{"0101010101010101", 3, "CHECKS.md §10 alternating n = 16 (C)"},
	}
	for _, c := range cases {
		got, err := Complexity(bits(c.s), 2)
		if err != nil {
			t.Fatal(err)
		}
		if got.Phrases != c.want {
			t.Errorf("%s: c = %d, want %d (%s)", c.s, got.Phrases, c.want, c.src)
		}
		if r := ksComplexity(bits(c.s)); r != c.want {
			t.Errorf("%s: reference Kaspar–Schuster gives %d, want %d", c.s, r, c.want)
		}
	}
}

func TestLZ76AgainstKasparSchuster(t *testing.T) {
	// The linear-time automaton must agree with the Kaspar–Schuster scan (the reference).
	rng := rand.New(rand.NewPCG(11, 12))
	for trial := 0; trial < 300; trial++ {
		n := 1 + rng.IntN(300)
		k := 2 + rng.IntN(3)
		if trial%5 == 0 {
			k = 9 + rng.IntN(20) // map-stored transitions
		}
		s := make([]uint8, n)
		bias := rng.Float64()
		for i := range s {
			if rng.Float64() < bias {
				s[i] = uint8(rng.IntN(k))
			} else if i > 3 {
				s[i] = s[i-1-rng.IntN(3)]
			}
		}
		got, _ := Complexity(s, k)
		if want := ksComplexity(s); got.Phrases != want {
			t.Fatalf("n=%d k=%d: automaton %d, Kaspar–Schuster %d: %v", n, k, got.Phrases, want, s)
		}
	}
}

func TestLZ76Random(t *testing.T) {
	// CHECKS.md §10 (C): normalised LZ76 of fair random bits: n = 10^3 in 1.04–1.10 (±0.06
	// around 1), n = 10^4 in 1.018–1.029 (±0.04 around 1).
	for _, c := range []struct {
		n   int
		tol float64
	}{{1000, 0.1}, {10_000, 0.04}, {100_000, 0.03}} {
		for seed := uint64(1); seed <= 3; seed++ {
			r, err := Complexity(fairSymbols(c.n, seed), 2)
			if err != nil {
				t.Fatal(err)
			}
			if math.Abs(r.Normalized-1) > c.tol {
				t.Errorf("n = %d seed %d: normalised c = %.4f, want 1 ± %.2f", c.n, seed, r.Normalized, c.tol)
			}
		}
	}
	// Periodic sequences → 0 (Lempel & Ziv 1976; CHECKS.md §10 normalisation row).
	s := make([]uint8, 100_000)
	for i := range s {
		s[i] = uint8(i % 3 % 2)
	}
	r, _ := Complexity(s, 2)
	if r.Normalized > 0.01 {
		t.Errorf("periodic: normalised %.4f, want ≈ 0", r.Normalized)
	}
}

func TestPermutationWorkedExample(t *testing.T) {
	x := []float64{4, 7, 9, 10, 6, 11, 3}
	// CHECKS.md §11 rows 1–2 (M, C): H(2) = 0.918296, H(3) = 1.521928 bits.
	p2, err := PermutationEntropy(x, 2, 1)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(p2.Bits-0.918296) > 1e-6 {
		t.Errorf("H(2) = %.6f, want 0.918296", p2.Bits)
	}
	p3, _ := PermutationEntropy(x, 3, 1)
	if math.Abs(p3.Bits-1.521928) > 1e-6 {
		t.Errorf("H(3) = %.6f, want 1.521928", p3.Bits)
	}
	// strictly monotone series: H = 0 (CHECKS.md §11, E)
	m := []float64{1, 2, 3, 4, 5, 6, 7, 8}
	if p, _ := PermutationEntropy(m, 4, 1); p.Bits != 0 {
		t.Errorf("monotone: H = %v", p.Bits)
	}
	if PatternIndex([]float64{1, 2, 3}) != 0 || PatternIndex([]float64{3, 2, 1}) != 5 {
		t.Errorf("pattern indices of increasing/decreasing")
	}
}

func TestPermutationWhiteNoise(t *testing.T) {
	// CHECKS.md §11 (E, C): i.i.d. noise gives H(m) → log2(m!).
	rng := rand.New(rand.NewPCG(8, 9))
	x := make([]float64, 300_000)
	for i := range x {
		x[i] = rng.NormFloat64()
	}
	for _, d := range []int{3, 4, 5} {
		p, err := PermutationEntropy(x, d, 1)
		if err != nil {
			t.Fatal(err)
		}
		f := 1.0
		for i := 2; i <= d; i++ {
			f *= float64(i)
		}
		if math.Abs(p.Bits-math.Log2(f)) > 2e-3 {
			t.Errorf("order %d: H = %.5f, want log2(%d!) = %.5f", d, p.Bits, d, math.Log2(f))
		}
	}
}

func TestPermutationLogistic(t *testing.T) {
	x := logistic(1_000_000)
	p, err := PermutationEntropy(x, 3, 1)
	if err != nil {
		t.Fatal(err)
	}
	n := float64(p.Patterns)
	// CHECKS.md §11 (E derived, C): probabilities ±0.002 for N = 10^6.
	want := []struct {
		w    []float64
		prob float64
	}{
		{[]float64{1, 2, 3}, 1. / 3},  // increasing
		{[]float64{2, 3, 1}, 4. / 15}, // x_{t+2} < x_t < x_{t+1}
		{[]float64{3, 1, 2}, 1. / 5},  // x_{t+1} < x_{t+2} < x_t
		{[]float64{2, 1, 3}, 2. / 15}, // x_{t+1} < x_t < x_{t+2}
		{[]float64{1, 3, 2}, 1. / 15}, // x_t < x_{t+2} < x_{t+1}
		{[]float64{3, 2, 1}, 0},       // decreasing: forbidden (Amigó et al. 2007, M)
	}
	for _, w := range want {
		got := float64(p.Counts[PatternIndex(w.w)]) / n
		if math.Abs(got-w.prob) > 0.002 {
			t.Errorf("pattern %v: p = %.4f, want %.4f", w.w, got, w.prob)
		}
	}
	if p.Forbidden != 1 {
		t.Errorf("forbidden patterns: %d, want 1", p.Forbidden)
	}
	// H(3) = 1.489750 nats (CHECKS.md §11, E/C)
	if math.Abs(p.Bits*math.Ln2-1.489750) > 0.003 {
		t.Errorf("H(3) = %.5f nats, want 1.489750", p.Bits*math.Ln2)
	}
	// CHECKS.md §11 (C, N = 2·10⁶): observed patterns 2, 5, 12, 31 for m = 2 … 5, and
	// H(m)/(m−1) = 0.6366, 0.7450, 0.7831, 0.8137 nats (±0.005).
	for _, c := range []struct {
		m        int
		observed int
		perStep  float64
	}{{2, 2, 0.6366}, {3, 5, 0.7450}, {4, 12, 0.7831}, {5, 31, 0.8137}} {
		q, err := PermutationEntropy(x, c.m, 1)
		if err != nil {
			t.Fatal(err)
		}
		if q.Observed != c.observed {
			t.Errorf("order %d: %d patterns observed, want %d", c.m, q.Observed, c.observed)
		}
		if got := q.PerSymbol * math.Ln2; math.Abs(got-c.perStep) > 0.005 {
			t.Errorf("order %d: H/(m−1) = %.4f nats, want %.4f", c.m, got, c.perStep)
		}
	}
}

func writeStream(t *testing.T, s []uint8, alphabet string) (stream []byte, sidecar []byte) {
	t.Helper()
	var buf, sc bytes.Buffer
	w, err := NewWriter(&buf, alphabet)
	if err != nil {
		t.Fatal(err)
	}
	for i := 0; i < len(s); i += 777 {
		if err := w.Write(s[i:min(i+777, len(s))]); err != nil {
			t.Fatal(err)
		}
	}
	if err := w.Close(); err != nil {
		t.Fatal(err)
	}
	side := w.Sidecar(PartitionInfo{Kind: "threshold", Thresholds: []float64{0.5}}, Source{Path: "x.csv"}, "unfold symbols x.csv -o x.sym", "test")
	if err := WriteSidecar(&sc, side); err != nil {
		t.Fatal(err)
	}
	return buf.Bytes(), sc.Bytes()
}

func readStream(stream, sidecar []byte) ([]uint8, error) {
	sc, err := ReadSidecar(bytes.NewReader(sidecar), "x.sym.json")
	if err != nil {
		return nil, err
	}
	r, err := NewReader(bytes.NewReader(stream), sc, "x.sym")
	if err != nil {
		return nil, err
	}
	return r.ReadAll()
}

func TestStreamRoundTrip(t *testing.T) {
	// A map signal written to symbols and read back reproduces the sidecar's counts (issue 7
	// acceptance).
	x := logistic(50_001)
	s := make([]uint8, len(x))
	var ones int64
	for i, v := range x {
		if v >= 0.5 {
			s[i] = 1
			ones++
		}
	}
	stream, side := writeStream(t, s, "01")
	sc, err := ReadSidecar(bytes.NewReader(side), "x.sym.json")
	if err != nil {
		t.Fatal(err)
	}
	if sc.Count != int64(len(s)) || sc.Counts[1] != ones || sc.Counts[0] != int64(len(s))-ones {
		t.Fatalf("sidecar counts %v (count %d), want [%d %d]", sc.Counts, sc.Count, int64(len(s))-ones, ones)
	}
	got, err := readStream(stream, side)
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(got, s) {
		t.Fatal("symbols read back differ from those written")
	}
	lines := strings.Split(strings.TrimSpace(string(stream)), "\n")
	if len(lines[0]) != DefaultLineWidth {
		t.Errorf("line width %d, want %d", len(lines[0]), DefaultLineWidth)
	}
}

func TestStreamMismatch(t *testing.T) {
	s := bits("0110100110010110")
	stream, side := writeStream(t, s, "01")
	var ie *series.InputError
	// a character outside the alphabet: line and column
	bad := []byte("0110\n01x0\n")
	if _, err := readStream(bad, side); !errors.As(err, &ie) || ie.Line != 2 || ie.Column != 3 {
		t.Errorf("bad character: %v, want line 2 column 3", err)
	}
	// one symbol fewer
	if _, err := readStream(stream[:len(stream)-2], side); !errors.As(err, &ie) || !strings.Contains(err.Error(), "sidecar") {
		t.Errorf("short stream: %v", err)
	}
	// same counts, different order
	swapped := append([]byte(nil), stream...)
	swapped[0], swapped[1] = swapped[1], swapped[0]
	if _, err := readStream(swapped, side); !errors.As(err, &ie) || !strings.Contains(err.Error(), "SHA-256") {
		t.Errorf("reordered stream: %v", err)
	}
	// a broken sidecar
	if _, err := readStream(stream, []byte(`{"format": 3}`)); !errors.As(err, &ie) {
		t.Errorf("broken sidecar: %v", err)
	}
	if _, err := readStream(stream, bytes.Replace(side, []byte(`"alphabet_size": 2`), []byte(`"alphabet_size": 3`), 1)); !errors.As(err, &ie) {
		t.Errorf("inconsistent sidecar: %v", err)
	}
	// streaming read of a valid stream ends with io.EOF
	sc, _ := ReadSidecar(bytes.NewReader(side), "x")
	r, _ := NewReader(bytes.NewReader(stream), sc, "x")
	buf := make([]uint8, 5)
	total := 0
	for {
		n, err := r.Read(buf)
		total += n
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatal(err)
		}
	}
	if total != len(s) {
		t.Errorf("streamed %d symbols, want %d", total, len(s))
	}
}

func FuzzReader(f *testing.F) {
	side := []byte(`{"format":"unfold symbol stream","format_version":1,"alphabet":"01","alphabet_size":2,"count":6,"counts":[3,3],"line_width":80,"stream_sha256":"","partition":{"kind":"threshold","thresholds":[0.5],"score":0},"source":{"path":"","sha256":""},"command":"","version":""}`)
	f.Add([]byte("010101\n"), side)
	f.Add([]byte("0101\r\n01"), side)
	f.Add([]byte("01x101\n"), side)
	f.Add([]byte(""), []byte(`{}`))
	f.Add([]byte("0"), []byte(`{"format":"unfold symbol stream","format_version":1,"alphabet":"0\n","alphabet_size":2,"count":1,"counts":[1,0]}`))
	f.Fuzz(func(t *testing.T, stream, sidecar []byte) {
		got, err := readStream(stream, sidecar)
		if err != nil {
			var ie *series.InputError
			if !errors.As(err, &ie) {
				t.Fatalf("error is not an input error: %v", err)
			}
			return
		}
		sc, _ := ReadSidecar(bytes.NewReader(sidecar), "x")
		if int64(len(got)) != sc.Count {
			t.Fatalf("accepted %d symbols against a count of %d", len(got), sc.Count)
		}
	})
}
