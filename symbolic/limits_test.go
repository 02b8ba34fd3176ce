package symbolic

import (
	"math"
	"math/rand/v2"
	"testing"
)

// markov2 returns n symbols of the binary Markov chain with P(0→1) = p and P(1→0) = q.
func markov2(n int, p, q float64, seed uint64) []uint8 {
	rng := rand.New(rand.NewPCG(seed, 3))
	s := make([]uint8, n)
	for i := 1; i < n; i++ {
		switch {
		case s[i-1] == 0 && rng.Float64() < p:
			s[i] = 1
		case s[i-1] == 1 && rng.Float64() >= q:
			s[i] = 1
		}
	}
	return s
}

func h2(p float64) float64 { return -p*math.Log2(p) - (1-p)*math.Log2(1-p) }

// TestExcessEntropyMarkov: for a first-order Markov chain h(L) = h from L = 2 on, so the
// excess entropy is E = H(1) − h exactly (Crutchfield & Feldman 2003, "Regularities unseen,
// randomness observed", Chaos 13, 25: E of an order-R Markov chain is H(R) − R·h). It must be
// read where h(L) has converged, not at the longest supported length where undersampling
// bias is multiplied by L (issue 18). Tolerance 0.02 bits: sampling error of H(1) on 20 000
// correlated symbols is a few thousandths (common practice: a few standard errors).
func TestExcessEntropyMarkov(t *testing.T) {
	p, q := 0.1, 0.3
	pi1 := p / (p + q)
	h := (1-pi1)*h2(p) + pi1*h2(q)
	want := h2(pi1) - h
	e, err := BlockEntropies(markov2(20000, p, q, 1), 2, 0, Grassberger)
	if err != nil {
		t.Fatal(err)
	}
	t.Logf("h = %.4f (exact %.4f), E = %.4f at L = %d (exact %.4f); %s", e.EntropyRate, h, e.ExcessEntropy, e.ExcessLength, want, e.Extrapolation)
	if math.Abs(e.ExcessEntropy-want) > 0.02 {
		t.Errorf("E = %.4f, want %.4f ± 0.02", e.ExcessEntropy, want)
	}
	if math.Abs(e.EntropyRate-h) > 0.02 {
		t.Errorf("h = %.4f, want %.4f ± 0.02", e.EntropyRate, h)
	}
}

// TestEntropyLimitsShortStream: on short streams (170 fair coin flips, the size of the demo's
// stream in issue 18) no rate may exceed log2 K = 1 bit and the excess entropy may not be
// negative (both are impossible for any source; Cover & Thomas 2006, "Elements of
// Information Theory", §2.6 and §4.2).
func TestEntropyLimitsShortStream(t *testing.T) {
	for seed := range uint64(20) {
		rng := rand.New(rand.NewPCG(seed, 4))
		s := make([]uint8, 170)
		for i := range s {
			s[i] = uint8(rng.IntN(2))
		}
		e, err := BlockEntropies(s, 2, 0, Grassberger)
		if err != nil {
			t.Fatal(err)
		}
		if e.EntropyRate > 1 || e.ExcessEntropy < 0 {
			t.Errorf("seed %d: h = %.4f bits, E = %.4f bits", seed, e.EntropyRate, e.ExcessEntropy)
		}
		for _, r := range e.Rates {
			if r.Bits > 1 {
				t.Errorf("seed %d: h(%d) = %.4f bits > log2 2", seed, r.Length, r.Bits)
			}
		}
	}
}
