package main

import (
	"fmt"
	"os"
	"path/filepath"
	"strconv"

	"github.com/spf13/cobra"

	"unfold/regime"
	"unfold/series"
)

type nullsOptions struct {
	in        inputOptions
	method    string
	count     int
	out       string
	maxIter   int
	matchEnds bool
}

func newNullsCmd(a *app) *cobra.Command {
	o := &nullsOptions{}
	cmd := &cobra.Command{
		Use:   "nulls FILE",
		Short: "Surrogate series (random-phase, AAFT, IAAFT) for tests against a linear null",
		Long: `nulls writes K surrogate series of the signal, each as a CSV file (t, x) in the output
directory, plus summary.json with the method, seed, the segment used and each surrogate's
convergence. The methods:

  phase  random Fourier phases (Theiler et al. 1992): the periodogram is kept exactly;
         null: a stationary linear Gaussian process.
  aaft   amplitude-adjusted (Theiler et al. 1992): the sorted values are kept exactly;
         null: a linear Gaussian process seen through a static monotone function.
  iaaft  iterated AAFT (Schreiber & Schmitz 1996): the same null with the spectrum matched far
         better; iterations stop when the rank order no longer changes (converged) or at
         --max-iter. The spectral error Σ(|S_k|−|X_k|)²/Σ|X_k|² is reported per surrogate.

The Fourier length has only prime factors ≤ 7, so a record whose length has a larger factor is
shortened to the longest such length (said on stderr and in summary.json). --match-ends picks
the segment whose ends match best (Schreiber & Schmitz 2000), cutting at most 10 %.

For a rank test at 5 %: 19 surrogates one-sided, 39 two-sided. Each surrogate has its own
random stream derived from --seed, so the files do not depend on --threads. Files are written
atomically; the input is never overwritten.`,
		Example: `  # 19 IAAFT surrogates of the column x into nulls/ (nulls/surrogate-001.csv … and nulls/summary.json)
  unfold nulls --column x --method iaaft --surrogates 19 -o nulls lorenz.csv
  # 39 random-phase surrogates with end-point matching, seed 7
  unfold nulls --method phase --surrogates 39 --match-ends --seed 7 -o ft signal.csv`,
		Args: exactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			return a.runNulls(args[0], o)
		},
	}
	addInputFlags(cmd, &o.in)
	f := cmd.Flags()
	f.StringVar(&o.method, "method", "iaaft", "surrogate method: phase, aaft or iaaft")
	f.IntVar(&o.count, "surrogates", 19, "number of surrogates K")
	aliasFlag(f, "count", "surrogates")
	f.StringVarP(&o.out, "output", "o", "", "output directory (created if missing)")
	f.IntVar(&o.maxIter, "max-iter", 200, "largest number of IAAFT iterations per surrogate")
	f.BoolVar(&o.matchEnds, "match-ends", false, "use the segment whose first and last values and slopes match best (Schreiber & Schmitz 2000)")
	return cmd
}

type nullsParams struct {
	Column    string `json:"column"`
	Method    string `json:"method"`
	Count     int    `json:"count"`
	MaxIter   int    `json:"max_iter"`
	MatchEnds bool   `json:"match_ends"`
	Seed      uint64 `json:"seed"`
	Output    string `json:"output"`
}

type nullsFile struct {
	File          string  `json:"file"`
	Iterations    int     `json:"iterations"`
	SpectralError float64 `json:"spectral_error"`
	Converged     bool    `json:"converged"`
}

type nullsResult struct {
	Method      string      `json:"method"`
	Seed        uint64      `json:"seed"`
	Start       int         `json:"start"`
	Length      int         `json:"length"`
	EndMismatch float64     `json:"end_mismatch"`
	Surrogates  []nullsFile `json:"surrogates"`
	Cautions    []string    `json:"cautions"`
}

func (a *app) runNulls(path string, o *nullsOptions) error {
	m, err := regime.ParseMethod(o.method)
	if err != nil {
		return usagef("nulls: --method: %v", err)
	}
	if o.count < 1 || o.count > 100000 {
		return usagef("nulls: --surrogates %d: want 1…100000", o.count)
	}
	if o.out == "" {
		return usagef("nulls: give the output directory with -o DIR")
	}
	if o.maxIter < 1 {
		return usagef("nulls: --max-iter %d: want ≥ 1", o.maxIter)
	}
	s, in, err := a.loadInput(path, &o.in)
	if err != nil {
		return err
	}
	if err := series.CheckVariable(s.Values); err != nil {
		return err
	}
	set, err := regime.Surrogates(s.Values, regime.SurrogateOptions{Method: m, Count: o.count, Seed: a.global.Seed,
		MaxIter: o.maxIter, MatchEnds: o.matchEnds, Threads: a.threads()})
	if err != nil {
		return noAnswer(fmt.Errorf("nulls: %s: %w", path, err))
	}
	if err := os.MkdirAll(o.out, 0o755); err != nil {
		return fmt.Errorf("nulls: %w", err)
	}
	name := s.Name
	if name == "" {
		name = "x"
	}
	width := len(strconv.Itoa(o.count))
	res := nullsResult{Method: m.String(), Seed: a.global.Seed, Start: set.Start, Length: set.Length,
		EndMismatch: set.EndMismatch, Cautions: set.Cautions}
	if res.Cautions == nil {
		res.Cautions = []string{}
	}
	t := make([]float64, set.Length)
	for i := range t {
		t[i] = s.Time(set.Start + i)
	}
	for i, sg := range set.Surrogates {
		file := filepath.Join(o.out, fmt.Sprintf("surrogate-%0*d.csv", max(width, 3), i+1))
		if err := writeCSVFile(file, path, []string{"t", name}, t, sg.Values); err != nil {
			return fmt.Errorf("nulls: %w", err)
		}
		res.Surrogates = append(res.Surrogates, nullsFile{File: file, Iterations: sg.Iterations, SpectralError: sg.SpectralError, Converged: sg.Converged})
	}
	params := nullsParams{Column: s.Name, Method: m.String(), Count: o.count, MaxIter: o.maxIter, MatchEnds: o.matchEnds, Seed: a.global.Seed, Output: o.out}
	summary, err := buildJSON("nulls", in, params, res) // non-finite numbers as null, with a caution
	if err != nil {
		return fmt.Errorf("nulls: %w", err)
	}
	if err := writeBytesFile(filepath.Join(o.out, "summary.json"), path, summary); err != nil {
		return fmt.Errorf("nulls: %w", err)
	}
	for _, c := range res.Cautions {
		a.notef("caution: %s", c)
	}
	if a.global.JSON {
		return a.emitJSON("nulls", in, params, res)
	}
	conv, worst := 0, 0.0
	for _, f := range res.Surrogates {
		if f.Converged {
			conv++
		}
		worst = max(worst, f.SpectralError)
	}
	rows := [][]string{
		{"file", path},
		{"method", m.String()},
		{"surrogates", fmt.Sprintf("%d in %s (summary.json beside them)", o.count, o.out)},
		{"segment", fmt.Sprintf("samples %d…%d (%d of %d), end mismatch %.3g", set.Start, set.Start+set.Length-1, set.Length, s.Len(), set.EndMismatch)},
		{"converged", fmt.Sprintf("%d of %d; largest spectral error %.3g", conv, o.count, worst)},
		{"seed", strconv.FormatUint(a.global.Seed, 10)},
	}
	if err := a.table(rows); err != nil {
		return err
	}
	return nil
}
