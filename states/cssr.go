package states

import (
	"errors"
	"fmt"
	"math"
)

// Options are the parameters of a reconstruction. The zero value is the default.
type Options struct {
	// MaxLength is L, the longest history used; 0 chooses it with DefaultMaxLength.
	MaxLength int
	// Significance is α, the level of the χ² homogeneity test; 0 means 0.001
	// (Shalizi & Klinkner 2004 use 0.001 to 0.05).
	Significance float64
}

// DefaultOptions returns the defaults: automatic L and α = 0.001.
func DefaultOptions() Options { return Options{Significance: 0.001} }

// WordsPerCell is the number of symbols per word of length L+1 that the automatic history
// length asks for: K^(L+1) ≤ N/WordsPerCell, so that every possible word could be seen
// WordsPerCell times (common practice: the χ² test wants expected cell counts well above 5, and
// CSSR's error falls with the count per history, Shalizi & Klinkner 2004 §4).
const WordsPerCell = 50

// FalseSplits bounds the expected number of wrong splits of the automatic history length:
// CSSR makes about K^(L+1) homogeneity tests, each wrong with probability α when the
// histories do not differ, and one wrong split adds spurious states, so the automatic L also
// keeps α·K^(L+1) ≤ FalseSplits (our rule; it keeps L ≤ 5 for K = 2 and α = 0.001).
const FalseSplits = 0.1

// MinPerCell is the number of symbols per word of length L+1 below which a stated L is refused:
// N ≥ MinPerCell·K^(L+1) (common practice: expected χ² cell counts of at least 5, W. G. Cochran
// 1954, "Some methods for strengthening the common χ² tests", Biometrics 10, 417).
const MinPerCell = 5

// MaxWords bounds K^(L+1), the size of the word-count table of the longest length.
const MaxWords = 1 << 26

// LengthRule states the rule of DefaultMaxLength.
const LengthRule = "the largest L with K^(L+1) ≤ N/50 (common practice) and α·K^(L+1) ≤ 0.1 (at most 0.1 false splits expected)"

// DefaultMaxLength returns the automatic history length for n symbols over k letters at
// significance alpha: the largest L ≥ 1 with k^(L+1) ≤ n/WordsPerCell and
// alpha·k^(L+1) ≤ FalseSplits (and k^(L+1) ≤ MaxWords), or 1 when even L = 1 does not fit
// (Reconstruct then refuses the stream as too short).
func DefaultMaxLength(n, k int, alpha float64) int {
	l := 1
	for {
		w := pow(k, l+2)
		if w < 0 || w > MaxWords || w*WordsPerCell > n || alpha*float64(w) > FalseSplits {
			return l
		}
		l++
	}
}

// MinSymbols returns the fewest symbols accepted for history length l over k letters,
// MinPerCell·k^(l+1), or -1 when k^(l+1) exceeds MaxWords.
func MinSymbols(l, k int) int {
	w := pow(k, l+1)
	if w < 0 || w > MaxWords {
		return -1
	}
	return MinPerCell * w
}

// pow returns k^e, or -1 on overflow past 2^40.
func pow(k, e int) int {
	p := 1
	for range e {
		p *= k
		if p > 1<<40 {
			return -1
		}
	}
	return p
}

// ErrTooShort is returned when the stream is too short for the history length.
type ErrTooShort struct {
	Have, Need, Length, K int
}

func (e *ErrTooShort) Error() string {
	msg := fmt.Sprintf("%d symbols are too few for histories of length %d over %d letters: at least %d are needed (%d·%d^%d)",
		e.Have, e.Length, e.K, e.Need, MinPerCell, e.K, e.Length+1)
	if e.Length > 1 {
		msg += ", or give a shorter length"
	}
	return msg
}

// State is one recurrent causal state.
type State struct {
	// ID numbers the states 0, 1, … in order of falling probability.
	ID int `json:"id"`
	// Probability is π(s), the stationary probability of the state.
	Probability float64 `json:"probability"`
	// Count is the number of positions of the stream whose history of length L lies in the state.
	Count int64 `json:"count"`
	// Next[a] is P(next symbol = a | s).
	Next []float64 `json:"next"`
	// Suffixes are the shortest histories that identify the state (oldest symbol first): the
	// state holds every history that ends with one of them (up to length L), except those
	// listed in other states with a longer suffix. At most MaxSuffixes are listed.
	Suffixes [][]uint8 `json:"-"`
	// SuffixCount is the number of such shortest histories (len(Suffixes) may be less).
	SuffixCount int `json:"suffix_count"`
}

// MaxSuffixes bounds State.Suffixes.
const MaxSuffixes = 64

// Transition is one edge of the state machine: in state From, symbol Symbol comes with
// probability Probability and leads to state To.
type Transition struct {
	From        int     `json:"from"`
	Symbol      int     `json:"symbol"`
	To          int     `json:"to"`
	Probability float64 `json:"probability"`
}

// Result is a reconstructed causal-state machine.
type Result struct {
	// K is the alphabet size, N the number of symbols.
	K int `json:"alphabet_size"`
	N int `json:"symbols"`
	// HistoryLength is L and LengthRule how it was chosen ("given" or the automatic rule).
	HistoryLength int    `json:"history_length"`
	LengthRule    string `json:"length_rule"`
	// Significance is α of the χ² homogeneity test.
	Significance float64 `json:"significance"`
	// States are the recurrent states, most probable first; Transitions their edges.
	States      []State      `json:"states"`
	Transitions []Transition `json:"transitions"`
	// Transient is the number of transient states removed.
	Transient int `json:"transient_removed"`
	// StatisticalComplexity is Cμ = H[π] in bits.
	StatisticalComplexity float64 `json:"statistical_complexity"`
	// EntropyRate is hμ = Σ π(s) H[next | s] in bits per symbol (≤ log2 K).
	EntropyRate float64 `json:"entropy_rate"`
	// Cautions say where the result is weak.
	Cautions []string `json:"cautions"`
}

// MinStateCount is the number of visits below which a state gets a caution (common practice).
const MinStateCount = 30

// Reconstruct runs CSSR on the symbols x (each < k) and returns the recurrent causal states.
// It refuses (ErrTooShort) a stream shorter than MinSymbols(L, k). With L ≥ 2 it also
// reconstructs at L−1 and cautions when the state count, Cμ or hμ changes.
func Reconstruct(x []uint8, k int, o Options) (*Result, error) {
	l, rule, alpha, err := check(x, k, o)
	if err != nil {
		return nil, err
	}
	c := count(x, k, l)
	res := c.reconstruct(l, alpha)
	res.LengthRule = rule
	if l >= 2 {
		prev := c.reconstruct(l-1, alpha)
		if len(prev.States) != len(res.States) || math.Abs(prev.StatisticalComplexity-res.StatisticalComplexity) > 0.05 ||
			math.Abs(prev.EntropyRate-res.EntropyRate) > 0.02 {
			res.Cautions = append(res.Cautions, fmt.Sprintf(
				"the result changes between L = %d and L = %d (%d → %d states, Cμ %.3f → %.3f bit, hμ %.3f → %.3f bit/symbol): it has not settled; see a scan over L",
				l-1, l, len(prev.States), len(res.States), prev.StatisticalComplexity, res.StatisticalComplexity, prev.EntropyRate, res.EntropyRate))
		}
	}
	return res, nil
}

// ScanRow is the reconstruction at one history length.
type ScanRow struct {
	Length                int     `json:"length"`
	States                int     `json:"states"`
	StatisticalComplexity float64 `json:"statistical_complexity"`
	EntropyRate           float64 `json:"entropy_rate"`
}

// Scan reconstructs at L = 1 … o.MaxLength (automatic when 0) from one count of the stream, so a
// user sees where the state count, Cμ and hμ settle.
func Scan(x []uint8, k int, o Options) ([]ScanRow, error) {
	lmax, _, alpha, err := check(x, k, o)
	if err != nil {
		return nil, err
	}
	c := count(x, k, lmax)
	rows := make([]ScanRow, 0, lmax)
	for l := 1; l <= lmax; l++ {
		r := c.reconstruct(l, alpha)
		rows = append(rows, ScanRow{Length: l, States: len(r.States), StatisticalComplexity: r.StatisticalComplexity, EntropyRate: r.EntropyRate})
	}
	return rows, nil
}

func check(x []uint8, k int, o Options) (l int, rule string, alpha float64, err error) {
	if k < 2 || k > 256 {
		return 0, "", 0, fmt.Errorf("states: alphabet size %d must be between 2 and 256", k)
	}
	for i, s := range x {
		if int(s) >= k {
			return 0, "", 0, fmt.Errorf("states: symbol %d at position %d is outside the alphabet of %d", s, i, k)
		}
	}
	alpha = o.Significance
	if alpha == 0 {
		alpha = DefaultOptions().Significance
	}
	if !(alpha > 0 && alpha < 1) {
		return 0, "", 0, fmt.Errorf("states: significance %g must lie between 0 and 1", alpha)
	}
	l, rule = o.MaxLength, "given"
	if l < 0 {
		return 0, "", 0, errors.New("states: the history length must be at least 1")
	}
	if l == 0 {
		l, rule = DefaultMaxLength(len(x), k, alpha), LengthRule
	}
	need := MinSymbols(l, k)
	if need < 0 {
		return 0, "", 0, fmt.Errorf("states: histories of length %d over %d letters need a table of more than %d words: give a shorter length", l, k, MaxWords)
	}
	if len(x) < need {
		return 0, "", 0, &ErrTooShort{Have: len(x), Need: need, Length: l, K: k}
	}
	return l, rule, alpha, nil
}

// counts holds the word counts: words[l][h·K+a] is the number of times history h (length l,
// code Σ h_i K^(l−1−i), oldest symbol most significant) is followed by a.
type counts struct {
	k, n  int
	pow   []int
	words [][]int64
}

// count tallies words of length 1 … lmax+1 in one pass; the loop allocates nothing.
func count(x []uint8, k, lmax int) *counts {
	c := &counts{k: k, n: len(x), pow: make([]int, lmax+2), words: make([][]int64, lmax+1)}
	c.pow[0] = 1
	for i := 1; i <= lmax+1; i++ {
		c.pow[i] = c.pow[i-1] * k
	}
	for l := 0; l <= lmax; l++ {
		c.words[l] = make([]int64, c.pow[l+1])
	}
	code := make([]int, lmax+2) // code[j]: the word of length j ending at the previous symbol
	for t, s := range x {
		top := min(t, lmax)
		for j := top; j >= 0; j-- {
			w := code[j]*k + int(s)
			c.words[j][w]++
			code[j+1] = w
		}
	}
	return c
}

// histCount returns the number of times history h of length l is followed by a symbol.
func (c *counts) histCount(l, h int) int64 {
	var n int64
	for _, v := range c.words[l][h*c.k : h*c.k+c.k] {
		n += v
	}
	return n
}
