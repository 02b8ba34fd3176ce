package main

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"io"
	"os"
	"strconv"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"unfold/series"
	"unfold/symbolic"
)

type entropyOptions struct {
	in          inputOptions
	maxLength   int
	estimator   string
	permutation int
	delay       int
	lzMax       int
}

func newEntropyCmd(a *app) *cobra.Command {
	o := &entropyOptions{}
	cmd := &cobra.Command{
		Use:   "entropy FILE.sym | entropy --permutation D FILE",
		Short: "Block entropies, entropy rate, excess entropy and complexity of a symbol stream",
		Long: `entropy reads a symbol stream written by unfold symbols (checking it against its sidecar) and
reports, in bits:
  block entropies H(L) of words of L symbols, L = 1 … --max-length, bias-corrected by
    Grassberger (2003) by default (--estimator grassberger, miller-madow or plugin);
  entropy-rate estimates h(L) = H(L) − H(L−1); the entropy rate is h(L*) at the longest length
    L* that the data support (K^L* ≤ N/10), and lengths beyond it get a caution;
  the excess entropy E = H(L*) − L*·h (Grassberger 1986, effective measure complexity);
  the Lempel–Ziv (1976) complexity c(n) (Kaspar & Schuster 1987 phrase counting), normalised by
    n/log_K n (about 1 for random symbols, about 0 for periodic ones).
With --permutation D it reads a numeric signal instead and reports the permutation entropy of
order D (Bandt & Pompe 2002): the entropy of the ordinal patterns of D samples, in bits,
normalised by log2(D!), and its Jensen–Shannon statistical complexity (Rosso et al. 2007) with
the smallest and largest complexity possible at that entropy (Martin, Plastino & Rosso 2006).`,
		Example: `  unfold symbols --alphabet 2 logistic.csv -o logistic.sym
  unfold entropy logistic.sym
  unfold entropy --json --max-length 12 logistic.sym
  # permutation entropy of order 4 of a numeric record
  unfold entropy --permutation 4 --column x lorenz.csv`,
		Args: exactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			if o.permutation != 0 {
				return a.runPermutation(args[0], o)
			}
			return a.runEntropy(args[0], o)
		},
	}
	addInputFlags(cmd, &o.in)
	addEntropyFlags(cmd.Flags(), o)
	return cmd
}

// addEntropyFlags binds the flags of entropy (the report takes their defaults from here).
func addEntropyFlags(f *pflag.FlagSet, o *entropyOptions) {
	f.IntVar(&o.maxLength, "max-length", 0, "longest word length L (default: the supported length plus 2)")
	f.StringVar(&o.estimator, "estimator", "grassberger", "block-entropy estimator: grassberger, miller-madow or plugin")
	f.IntVar(&o.permutation, "permutation", 0, "permutation entropy of order D (2 … 10) of a numeric signal instead of a symbol stream")
	f.IntVar(&o.delay, "delay", 1, "with --permutation: spacing of the samples of a pattern")
	f.IntVar(&o.lzMax, "lz-max", 20_000_000, "Lempel–Ziv complexity of the first N symbols only (it keeps them in memory, about 9·N bytes); block entropies always use the whole stream")
}

type entropyParams struct {
	Estimator     string `json:"estimator"`
	MaxLength     int    `json:"max_length"`
	RateLength    int    `json:"rate_length"`
	Alphabet      string `json:"alphabet"`
	Extrapolation string `json:"extrapolation"`
	LZMax         int    `json:"lz_max"`
}

type lz76JSON struct {
	Phrases    int     `json:"phrases"`
	Normalized float64 `json:"normalized"`
}

type entropyResult struct {
	EntropyRate    float64                `json:"entropy_rate"`
	ExcessEntropy  float64                `json:"excess_entropy"`
	BlockEntropies []symbolic.Block       `json:"block_entropies"`
	EntropyRates   []symbolic.Rate        `json:"entropy_rates"`
	LZ76           float64                `json:"lz76"`
	LZ76Detail     lz76JSON               `json:"lz76_phrases"`
	Partition      symbolic.PartitionInfo `json:"partition"`
	Source         symbolic.Source        `json:"source"`
	Cautions       []string               `json:"cautions"`
}

// entropyCompute reads the symbol stream r (named path, checked against its sidecar sc) and
// returns the JSON input, parameters and body of `entropy`; the command and the report both
// use it. The input's SHA-256 is that of the stream's bytes as read.
func (a *app) entropyCompute(path string, r io.Reader, sc *symbolic.Sidecar, o *entropyOptions) (*inputInfo, entropyParams, entropyResult, error) {
	est, err := symbolic.ParseEstimator(o.estimator)
	if err != nil {
		return nil, entropyParams{}, entropyResult{}, usagef("entropy: --estimator: %v", err)
	}
	h := sha256.New()
	sr, err := symbolic.NewReader(io.TeeReader(r, h), sc, path)
	if err != nil {
		return nil, entropyParams{}, entropyResult{}, err
	}
	k := sc.AlphabetSize
	maxL := o.maxLength
	if maxL == 0 {
		maxL = symbolic.DefaultMaxLength(sc.Count, k)
	}
	if lim := symbolic.MaxWordLength(k); maxL > lim {
		return nil, entropyParams{}, entropyResult{}, usagef("entropy: --max-length %d is too long for %d symbols (at most %d)", maxL, k, lim)
	}
	if k < 2 {
		return nil, entropyParams{}, entropyResult{}, noAnswer(fmt.Errorf("entropy: %s: the alphabet has one symbol: every entropy is 0", path))
	}
	bc, err := symbolic.NewBlockCounter(k, maxL)
	if err != nil {
		return nil, entropyParams{}, entropyResult{}, usagef("entropy: %v", err)
	}
	// block counts stream over the whole stream; LZ76 needs its symbols in memory, so it
	// keeps at most --lz-max of them
	if o.lzMax < 2 {
		return nil, entropyParams{}, entropyResult{}, usagef("entropy: --lz-max must be ≥ 2")
	}
	all := make([]uint8, 0, min(sc.Count, int64(o.lzMax)))
	var total int64
	buf := make([]uint8, 1<<15)
	for {
		n, err := sr.Read(buf)
		if n > 0 {
			if err := bc.Add(buf[:n]); err != nil {
				return nil, entropyParams{}, entropyResult{}, err
			}
			total += int64(n)
			if room := o.lzMax - len(all); room > 0 {
				all = append(all, buf[:min(n, room)]...)
			}
		}
		if err == io.EOF {
			break
		}
		if err != nil {
			return nil, entropyParams{}, entropyResult{}, err
		}
	}
	if len(all) < 2 {
		return nil, entropyParams{}, entropyResult{}, noAnswer(fmt.Errorf("entropy: %s: %d symbols are too few", path, len(all)))
	}
	res, err := symbolic.Analyze(bc, est)
	if err != nil {
		return nil, entropyParams{}, entropyResult{}, noAnswer(fmt.Errorf("entropy: %s: %w", path, err))
	}
	lz, err := symbolic.Complexity(all, k)
	if err != nil {
		return nil, entropyParams{}, entropyResult{}, noAnswer(fmt.Errorf("entropy: %s: %w", path, err))
	}
	cautions := res.Cautions
	if int64(len(all)) < total {
		cautions = append(cautions, fmt.Sprintf("the Lempel–Ziv complexity is of the first %d of %d symbols (--lz-max)", len(all), total))
	}
	if cautions == nil {
		cautions = []string{}
	}
	in := &inputInfo{Path: path, SHA256: hex.EncodeToString(h.Sum(nil)), Samples: int(total), Dt: 1}
	return in,
		entropyParams{Estimator: res.Estimator, MaxLength: maxL, RateLength: res.RateLength, Alphabet: sc.Alphabet, Extrapolation: res.Extrapolation, LZMax: o.lzMax},
		entropyResult{EntropyRate: res.EntropyRate, ExcessEntropy: res.ExcessEntropy, BlockEntropies: res.Blocks,
			EntropyRates: res.Rates, LZ76: lz.Normalized, LZ76Detail: lz76JSON{Phrases: lz.Phrases, Normalized: lz.Normalized},
			Partition: sc.Partition, Source: sc.Source, Cautions: cautions}, nil
}

func (a *app) runEntropy(path string, o *entropyOptions) error {
	if _, err := symbolic.ParseEstimator(o.estimator); err != nil {
		return usagef("entropy: --estimator: %v", err)
	}
	if o.maxLength < 0 {
		return usagef("entropy: --max-length must be ≥ 1")
	}
	if path == "-" {
		return usagef("entropy: a symbol stream is read from a file with its sidecar, not from standard input")
	}
	sp := symbolic.SidecarPath(path)
	sf, err := os.Open(sp)
	if err != nil {
		if errors.Is(err, os.ErrNotExist) {
			return &series.InputError{Path: path, Msg: fmt.Sprintf("no sidecar %s: not a symbol stream written by unfold symbols (for a numeric signal use --permutation D)", sp)}
		}
		return err
	}
	sc, err := symbolic.ReadSidecar(sf, sp)
	sf.Close()
	if err != nil {
		return err
	}
	f, err := os.Open(path)
	if err != nil {
		return err
	}
	defer f.Close()
	in, p, res, err := a.entropyCompute(path, f, sc, o)
	if err != nil {
		return err
	}
	if a.global.JSON {
		return a.emitJSON("entropy", in, p, res)
	}
	g := func(v float64) string { return strconv.FormatFloat(v, 'f', 4, 64) }
	rows := [][]string{
		{"file", path},
		{"symbols", fmt.Sprintf("%d over %q (%s partition of %s)", in.Samples, sc.Alphabet, sc.Partition.Kind, sc.Source.Path)},
		{"entropy rate", g(res.EntropyRate) + " bits/symbol at L = " + strconv.Itoa(p.RateLength)},
		{"excess entropy", g(res.ExcessEntropy) + " bits"},
		{"LZ76", fmt.Sprintf("%s normalised (%d phrases)", g(res.LZ76), res.LZ76Detail.Phrases)},
		{"", ""},
		{"L", "H(L) bits", "h(L) bits", "words", "distinct", "supported"},
	}
	for i, b := range res.BlockEntropies {
		rows = append(rows, []string{strconv.Itoa(b.Length), g(b.Bits), g(res.EntropyRates[i].Bits),
			strconv.FormatInt(b.Words, 10), strconv.Itoa(b.Distinct), strconv.FormatBool(b.Supported)})
	}
	if err := a.table(rows); err != nil {
		return err
	}
	fmt.Fprintf(a.stdout, "estimate: %s\n", p.Extrapolation)
	for _, c := range res.Cautions {
		fmt.Fprintf(a.stdout, "caution: %s\n", c)
	}
	return nil
}

type permutationParams struct {
	Column string `json:"column"`
	Order  int    `json:"order"`
	Delay  int    `json:"delay"`
}

func (a *app) runPermutation(path string, o *entropyOptions) error {
	if o.permutation < 2 || o.permutation > symbolic.MaxOrder {
		return usagef("entropy: --permutation %d: want an order from 2 to %d", o.permutation, symbolic.MaxOrder)
	}
	if o.delay < 1 {
		return usagef("entropy: --delay must be ≥ 1")
	}
	s, in, err := a.loadInput(path, &o.in)
	if err != nil {
		return err
	}
	p, err := symbolic.PermutationEntropy(s.Values, o.permutation, o.delay)
	if err != nil {
		return noAnswer(fmt.Errorf("entropy: %s: %w", path, err))
	}
	var cautions []string
	f := 1
	for i := 2; i <= o.permutation; i++ {
		f *= i
	}
	if p.Patterns < 10*f {
		cautions = append(cautions, fmt.Sprintf("%d patterns for %d possible ones (fewer than 10 per pattern): the entropy is biased low and forbidden patterns may be only unseen", p.Patterns, f))
	}
	if cautions == nil {
		cautions = []string{}
	}
	// the complexity–entropy plane (Rosso et al. 2007) and its bounding curves at this entropy
	pt := p.Complexity()
	cmin, cmax := symbolic.ComplexityBounds(f, pt.Entropy)
	if a.global.JSON {
		return a.emitJSON("entropy", in, permutationParams{Column: s.Name, Order: o.permutation, Delay: o.delay},
			struct {
				Permutation *symbolic.Permutation `json:"permutation_entropy"`
				Complexity  float64               `json:"permutation_complexity"`
				MinCurve    float64               `json:"complexity_min"`
				MaxCurve    float64               `json:"complexity_max"`
				Cautions    []string              `json:"cautions"`
			}{p, pt.Complexity, cmin, cmax, cautions})
	}
	g := func(v float64) string { return strconv.FormatFloat(v, 'f', 4, 64) }
	rows := [][]string{
		{"file", path},
		{"order / delay", fmt.Sprintf("%d / %d", p.Order, p.Delay)},
		{"patterns", strconv.Itoa(p.Patterns)},
		{"permutation entropy", g(p.Bits) + " bits (normalised " + g(p.Normalized) + ", " + g(p.PerSymbol) + " bits per step)"},
		{"patterns seen", fmt.Sprintf("%d of %d (%d forbidden or unseen)", p.Observed, f, p.Forbidden)},
		{"complexity", g(pt.Complexity) + " (Jensen–Shannon; " + g(cmin) + " … " + g(cmax) + " possible at this entropy)"},
	}
	if err := a.table(rows); err != nil {
		return err
	}
	for _, c := range cautions {
		fmt.Fprintf(a.stdout, "caution: %s\n", c)
	}
	return nil
}
