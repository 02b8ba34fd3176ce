package main

import (
	"errors"
	"fmt"
	"os"
	"strconv"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"unfold/analysis"
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
the smallest and largest complexity possible at that entropy (Martin, Plastino & Rosso 2006).

Cost as a function of the stream length N: O(N · L) for the block counts up to length L, and
O(N) for the Lempel–Ziv phrases; memory O(min(N, K^L)) for the distinct blocks.`,
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
	d := analysis.DefaultEntropyOptions()
	f.IntVar(&o.maxLength, "max-length", d.MaxLength, "longest word length L (default: the supported length plus 2)")
	f.StringVar(&o.estimator, "estimator", d.Estimator, "block-entropy estimator: grassberger, miller-madow or plugin")
	f.IntVar(&o.permutation, "permutation", 0, "permutation entropy of order D (2 … 10) of a numeric signal instead of a symbol stream")
	f.IntVar(&o.delay, "delay", 1, "with --permutation: spacing of the samples of a pattern")
	f.IntVar(&o.lzMax, "lz-max", d.LZMax, "Lempel–Ziv complexity of the first N symbols only (it keeps them in memory, about 9·N bytes); block entropies always use the whole stream")
}

func (o *entropyOptions) options() analysis.EntropyOptions {
	return analysis.EntropyOptions{MaxLength: o.maxLength, Estimator: o.estimator, LZMax: o.lzMax}
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
	in, p, res, err := a.env(&o.in).Entropy(path, f, sc, o.options())
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
