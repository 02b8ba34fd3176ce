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
	delay       int // --lag (old spelling --delay)
	lzMax       int
	plot        string
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
the smallest and largest complexity possible at that entropy (Martin, Plastino & Rosso 2006);
--plot draws that plane with the record's point.

Cost as a function of the stream length N: O(N · L) for the block counts up to length L, and
O(N) for the Lempel–Ziv phrases; memory O(min(N, K^L)) for the distinct blocks.`,
		Example: `  unfold symbols --alphabet 2 logistic.csv -o logistic.sym
  unfold entropy logistic.sym
  unfold entropy --json --max-length 12 logistic.sym
  # permutation entropy of order 4 of a numeric record
  unfold entropy --permutation 4 --column x lorenz.csv
  # order 5 at lag 2, with the complexity–entropy plane drawn
  unfold entropy --permutation 5 --lag 2 --plot plane.svg --column x lorenz.csv`,
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
	f.IntVar(&o.delay, "lag", 1, "with --permutation: spacing of the samples of a pattern, in samples")
	aliasFlag(f, "delay", "lag")
	f.StringVar(&o.plot, "plot", "", "with --permutation: draw the complexity–entropy plane with this record's point (.png or .svg)")
	f.IntVar(&o.lzMax, "lz-max", d.LZMax, "Lempel–Ziv complexity of the first N symbols only (it keeps them in memory, about 9·N bytes); block entropies always use the whole stream")
}

func (o *entropyOptions) options() analysis.EntropyOptions {
	return analysis.EntropyOptions{MaxLength: o.maxLength, Estimator: o.estimator, LZMax: o.lzMax}
}

func (a *app) runEntropy(path string, o *entropyOptions) error {
	if _, err := symbolic.ParseEstimator(o.estimator); err != nil {
		return usagef("entropy: --estimator: %v", err)
	}
	if o.plot != "" {
		return usagef("entropy: --plot draws the complexity–entropy plane of --permutation D; a symbol stream has no plot")
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
