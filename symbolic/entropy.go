package symbolic

import (
	"fmt"
	"math"
	"sort"

	"gonum.org/v1/gonum/mathext"
)

// Estimator is a block-entropy estimator.
type Estimator int

// The block-entropy estimators.
const (
	// Grassberger is the estimator of Grassberger (2003), "Entropy estimates from insufficient
	// samplings", arXiv:physics/0307138: Ĥ = ln N − (1/N) Σ n_i G(n_i) with
	// G(n) = ψ(n) + ½(−1)^n [ψ((n+1)/2) − ψ(n/2)]. It is the default.
	Grassberger Estimator = iota
	// MillerMadow is the plug-in estimate plus (M − 1)/(2N), M the number of words seen
	// (Miller 1955).
	MillerMadow
	// Plugin is the maximum-likelihood (naive) estimate −Σ p_i ln p_i.
	Plugin
)

// String returns the estimator's name as the command line spells it.
func (e Estimator) String() string {
	switch e {
	case Grassberger:
		return "grassberger"
	case MillerMadow:
		return "miller-madow"
	case Plugin:
		return "plugin"
	}
	return fmt.Sprintf("Estimator(%d)", int(e))
}

// ParseEstimator returns the estimator named s (grassberger, miller-madow or plugin).
func ParseEstimator(s string) (Estimator, error) {
	switch s {
	case "grassberger", "":
		return Grassberger, nil
	case "miller-madow", "millermadow", "mm":
		return MillerMadow, nil
	case "plugin", "plug-in", "ml":
		return Plugin, nil
	}
	return 0, fmt.Errorf("unknown entropy estimator %q (want grassberger, miller-madow or plugin)", s)
}

// grassbergerG returns G(n) of Grassberger (2003), eq. for the estimator Ĥ_G.
func grassbergerG(n int64) float64 {
	fn := float64(n)
	g := mathext.Digamma(fn)
	d := 0.5 * (mathext.Digamma((fn+1)/2) - mathext.Digamma(fn/2))
	if n%2 == 0 {
		return g + d
	}
	return g - d
}

// EntropyNats returns the entropy estimate, in nats, of a distribution observed as counts (zero
// counts are ignored).
func EntropyNats(counts []int64, est Estimator) float64 {
	var n int64
	m := 0
	for _, c := range counts {
		if c > 0 {
			n += c
			m++
		}
	}
	if n == 0 {
		return 0
	}
	fn := float64(n)
	switch est {
	case Grassberger:
		var s float64
		cache := map[int64]float64{}
		for _, c := range counts {
			if c <= 0 {
				continue
			}
			g, ok := cache[c]
			if !ok {
				g = grassbergerG(c)
				cache[c] = g
			}
			s += float64(c) * g
		}
		return math.Log(fn) - s/fn
	default:
		var s float64
		for _, c := range counts {
			if c > 0 {
				s += float64(c) * math.Log(float64(c))
			}
		}
		h := math.Log(fn) - s/fn
		if est == MillerMadow {
			h += float64(m-1) / (2 * fn)
		}
		return h
	}
}

// denseLimit is the largest number of possible words of one length counted in an array; more
// are counted in a map.
const denseLimit = 1 << 18

// BlockCounter counts the words (blocks) of lengths 1 … MaxLength of a symbol sequence fed to
// it piece by piece, in memory bounded by the number of distinct words, not by the length of
// the sequence. Words are counted with overlap: a sequence of N symbols has N − L + 1 words of
// length L.
type BlockCounter struct {
	k      int
	maxL   int
	pow    []uint64 // pow[L] = k^L
	code   uint64   // the last maxL symbols, base k, most recent last
	seen   int64
	dense  [][]int64
	sparse []map[uint64]int64
}

// MaxWordLength returns the longest word length whose words over k symbols fit the counter's
// 63-bit codes.
func MaxWordLength(k int) int {
	if k <= 1 {
		return 64
	}
	l := 0
	p := uint64(1)
	for p <= math.MaxInt64/uint64(k) {
		p *= uint64(k)
		l++
	}
	return l
}

// NewBlockCounter returns a counter of words of lengths 1 … maxL over an alphabet of k symbols.
func NewBlockCounter(k, maxL int) (*BlockCounter, error) {
	if k < 1 || k > 256 {
		return nil, fmt.Errorf("symbolic: alphabet size %d must be between 1 and 256", k)
	}
	if maxL < 1 {
		return nil, fmt.Errorf("symbolic: the longest word length %d must be at least 1", maxL)
	}
	if lim := MaxWordLength(k); maxL > lim {
		return nil, fmt.Errorf("symbolic: word length %d is too long for %d symbols (at most %d)", maxL, k, lim)
	}
	c := &BlockCounter{k: k, maxL: maxL, pow: make([]uint64, maxL+1),
		dense: make([][]int64, maxL+1), sparse: make([]map[uint64]int64, maxL+1)}
	c.pow[0] = 1
	for l := 1; l <= maxL; l++ {
		c.pow[l] = c.pow[l-1] * uint64(k)
		if c.pow[l] <= denseLimit {
			c.dense[l] = make([]int64, c.pow[l])
		} else {
			c.sparse[l] = map[uint64]int64{}
		}
	}
	return c, nil
}

// Add counts the words that end in the symbols s (each below the alphabet size).
func (c *BlockCounter) Add(s []uint8) error {
	k := uint64(c.k)
	top := c.pow[c.maxL]
	for i, v := range s {
		if int(v) >= c.k {
			return fmt.Errorf("symbolic: symbol %d at position %d is outside the alphabet of %d", v, c.seen+int64(i), c.k)
		}
	}
	for _, v := range s {
		c.code = (c.code*k + uint64(v)) % top
		c.seen++
		lmax := c.maxL
		if c.seen < int64(lmax) {
			lmax = int(c.seen)
		}
		for l := 1; l <= lmax; l++ {
			w := c.code % c.pow[l]
			if d := c.dense[l]; d != nil {
				d[w]++
			} else {
				c.sparse[l][w]++
			}
		}
	}
	return nil
}

// Symbols returns the number of symbols counted.
func (c *BlockCounter) Symbols() int64 { return c.seen }

// AlphabetSize returns k.
func (c *BlockCounter) AlphabetSize() int { return c.k }

// MaxLength returns the longest word length counted.
func (c *BlockCounter) MaxLength() int { return c.maxL }

// Counts returns the non-zero counts of the words of length l (1 ≤ l ≤ MaxLength), in no
// particular order.
func (c *BlockCounter) Counts(l int) []int64 {
	if l < 1 || l > c.maxL {
		return nil
	}
	var out []int64
	if d := c.dense[l]; d != nil {
		for _, v := range d {
			if v > 0 {
				out = append(out, v)
			}
		}
		return out
	}
	out = make([]int64, 0, len(c.sparse[l]))
	for _, v := range c.sparse[l] {
		out = append(out, v)
	}
	sort.Slice(out, func(i, j int) bool { return out[i] < out[j] }) // deterministic sums
	return out
}

// SupportRatio is how many words a length must have per possible word to count as supported
// by the data: length L is supported when K^L ≤ N/SupportRatio (common practice: K^L ≪ N).
const SupportRatio = 10

// SupportedLength returns the longest word length L with k^L ≤ n/SupportRatio (at least 1).
func SupportedLength(n int64, k int) int {
	if k <= 1 {
		return 1
	}
	lim := float64(n) / SupportRatio
	l := 0
	p := 1.0
	for p*float64(k) <= lim && l < MaxWordLength(k) {
		p *= float64(k)
		l++
	}
	return max(l, 1)
}

// Block is the entropy of the words of one length.
type Block struct {
	// Length is the word length L in symbols.
	Length int `json:"length"`
	// Bits is the block entropy H(L) in bits.
	Bits float64 `json:"bits"`
	// Words is the number of (overlapping) words counted, N − L + 1.
	Words int64 `json:"words"`
	// Distinct is the number of different words seen.
	Distinct int `json:"distinct"`
	// Supported is false when k^L > N/SupportRatio: too few words for a trustworthy estimate.
	Supported bool `json:"supported"`
}

// Rate is one entropy-rate estimate h(L) = H(L) − H(L−1).
type Rate struct {
	Length int     `json:"length"`
	Bits   float64 `json:"bits"`
}

// Entropies is the result of the block-entropy analysis of one symbol sequence.
type Entropies struct {
	// Estimator is the block-entropy estimator used.
	Estimator string
	// Symbols is the length N of the sequence; AlphabetSize is K.
	Symbols      int64
	AlphabetSize int
	// Blocks holds H(L) for L = 1 … the longest length counted; H(0) = 0.
	Blocks []Block
	// Rates holds h(L) = H(L) − H(L−1) for the same lengths (h(1) = H(1)), bits per symbol.
	Rates []Rate
	// RateLength is the length L* the entropy rate is read at: the longest supported length.
	RateLength int
	// EntropyRate is h(L*) in bits per symbol. For a stationary source h(L) does not increase
	// with L, so this is the estimate nearest the limit that the data support (the stated
	// extrapolation: the last supported point of the h(L) curve is taken as its plateau).
	EntropyRate float64
	// ExcessEntropy is Σ_{L=1}^{Lc} (h(L) − h) = H(Lc) − Lc·h in bits, Grassberger's (1986)
	// effective measure complexity truncated at Lc = ExcessLength, the shortest length where
	// h(L) has converged to h: reading it at the longest length would multiply the
	// undersampling bias of H(L) by L. Never negative (an estimate below 0 is reported as 0
	// with a caution).
	ExcessEntropy float64
	// ExcessLength is the length Lc the excess entropy is read at.
	ExcessLength int
	// Extrapolation states in words how EntropyRate and ExcessEntropy were read.
	Extrapolation string
	// Cautions are plain-word warnings (lengths the data do not support, slow convergence).
	Cautions []string
}

// Analyze computes the block entropies, entropy rates and excess entropy from the counts in c.
func Analyze(c *BlockCounter, est Estimator) (*Entropies, error) {
	n := c.Symbols()
	if n < 2 {
		return nil, fmt.Errorf("symbolic: %d symbols are too few for block entropies (need at least 2)", n)
	}
	res := &Entropies{Estimator: est.String(), Symbols: n, AlphabetSize: c.k}
	sup := SupportedLength(n, c.k)
	prev := 0.0
	lmax := min(c.maxL, int(n))
	for l := 1; l <= lmax; l++ {
		cnt := c.Counts(l)
		h := EntropyNats(cnt, est) / math.Ln2
		b := Block{Length: l, Bits: h, Words: n - int64(l) + 1, Distinct: len(cnt), Supported: l <= sup}
		res.Blocks = append(res.Blocks, b)
		res.Rates = append(res.Rates, Rate{Length: l, Bits: h - prev})
		prev = h
	}
	ls := min(sup, lmax)
	res.RateLength = ls
	// No rate may exceed log2 K, the entropy of independent equiprobable letters: a larger
	// estimate is estimator bias on too few words.
	top := math.Log2(float64(c.k))
	clamped := 0
	for i := range res.Rates {
		if res.Rates[i].Bits > top {
			res.Rates[i].Bits = top
			clamped++
		}
	}
	if clamped > 0 {
		res.Cautions = append(res.Cautions, fmt.Sprintf("%d block-entropy differences exceeded log2 K = %.3g bits (estimator bias on too few words) and are reported as log2 K", clamped, top))
	}
	res.EntropyRate = min(max(res.Rates[ls-1].Bits, 0), top)
	// Read E where h(L) has converged: the shortest L whose rate is within
	// max(0.01 bits, 5 %) of h (judgement, the same tolerance as the convergence caution).
	lc := ls
	for l := 1; l <= ls; l++ {
		if res.Rates[l-1].Bits-res.EntropyRate <= math.Max(0.01, 0.05*res.EntropyRate) {
			lc = l
			break
		}
	}
	res.ExcessLength = lc
	res.ExcessEntropy = res.Blocks[lc-1].Bits - float64(lc)*res.EntropyRate
	if res.ExcessEntropy < 0 {
		res.Cautions = append(res.Cautions, fmt.Sprintf("the excess entropy estimate %.3g bits is negative (estimation error on %d symbols) and is reported as 0", res.ExcessEntropy, n))
		res.ExcessEntropy = 0
	}
	res.Extrapolation = fmt.Sprintf("h = h(L*) = H(L*) − H(L*−1) at L* = %d, the longest word length with K^L ≤ N/%d (K = %d, N = %d); E = H(Lc) − Lc·h at Lc = %d, the shortest length where h(L) is within max(0.01 bits, 5 %%) of h", ls, SupportRatio, c.k, n, lc)
	if lmax > sup {
		res.Cautions = append(res.Cautions, fmt.Sprintf("word lengths above %d are not supported by %d symbols over %d letters (K^L > N/%d): their block entropies are biased low; the entropy rate is read at L = %d", sup, n, c.k, SupportRatio, ls))
	}
	if ls >= 3 {
		d := res.Rates[ls-2].Bits - res.Rates[ls-1].Bits
		if d > 0.05*math.Max(res.EntropyRate, 0.05) && d > 0.01 {
			res.Cautions = append(res.Cautions, fmt.Sprintf("h(L) has not converged at L = %d (it fell by %.3g bits from L = %d): the entropy rate may be lower and the excess entropy higher", ls, d, ls-1))
		}
	}
	if ls < 2 {
		res.Cautions = append(res.Cautions, fmt.Sprintf("only words of length 1 are supported by %d symbols: the entropy rate is the single-symbol entropy, an upper bound", n))
	}
	return res, nil
}

// BlockEntropies counts the words of lengths 1 … maxL of s over k symbols and analyses them;
// maxL ≤ 0 chooses the supported length plus 2 (to show where support ends), capped by
// MaxWordLength and by 24.
func BlockEntropies(s []uint8, k, maxL int, est Estimator) (*Entropies, error) {
	if maxL <= 0 {
		maxL = DefaultMaxLength(int64(len(s)), k)
	}
	c, err := NewBlockCounter(k, maxL)
	if err != nil {
		return nil, err
	}
	if err := c.Add(s); err != nil {
		return nil, err
	}
	return Analyze(c, est)
}

// DefaultMaxLength returns the default longest word length for n symbols over k letters: the
// supported length (SupportedLength) plus 2, capped by MaxWordLength(k) and 24.
func DefaultMaxLength(n int64, k int) int {
	return max(1, min(SupportedLength(n, k)+2, MaxWordLength(k), 24))
}
