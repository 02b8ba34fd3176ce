package main

import (
	"fmt"
	"strconv"

	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"unfold/analysis"
	"unfold/embed"
	"unfold/figure"
	"unfold/report"
)

type regimeOptions struct {
	in         inputOptions
	lag        int
	dim        int
	theiler    int
	surrogates int
	noLyap     bool
	plot       string
}

// regimeRule is the decision rule, shown in --help (the package comment of regime, shortened).
var regimeRule = `Decision rule, in order (a deterministic verdict needs evidence specific to it; the 0-1
test, D2, Cao's E2 and time reversal only support, and are listed as unused with the reason):
  1. Lines. If significant spectral lines explain at least 90 % of the variance and are the
     harmonics of one fundamental, the regime is periodic; combinations of two or three
     incommensurate fundamentals, quasiperiodic — unless the chaos evidence of step 3 holds.
     A noisy oscillation goes on to step 2 with its dominant cycle named.
  2. Null. K IAAFT surrogates (--surrogates, ` + strconv.Itoa(analysis.DefaultRegimeOptions().Surrogates) + ` by default: enough for the two-sided
     time-reversal test at 5 %, Theiler & Prichard 1996) are compared with the data by a
     nonlinear prediction error (one-sided rank test at 5 %: at least 19 surrogates). If it does
     not reject, the regime is stochastic, whatever λ1 or K say; the rank result alone decides.
  3. Chaos. The null is rejected: chaotic when λ1's interval lies above zero and its divergence
     curve has an exponential range; undetermined when it does not, or when the spectra of the
     first and last thirds differ (non-stationarity alone can reject the null).
Confidence is the weighted share of the evidence (lines 3, prediction error 3, 0-1 test 2,
λ1 2, D2 1.5, reversal 1, Cao E2 1) that points to the regime, times 0.8 for records under
2000 samples and 0.9 for non-stationary ones; undetermined has confidence 0.`

func newRegimeCmd(a *app) *cobra.Command {
	o := &regimeOptions{}
	cmd := &cobra.Command{
		Use:   "regime FILE",
		Short: "Verdict: periodic, quasiperiodic, chaotic, stochastic or undetermined, with evidence and cautions",
		Long: `regime gathers the evidence — Welch spectrum and line analysis, the 0-1 test for chaos
(Gottwald & Melbourne 2004, 2009; an oversampled record is first subsampled to every
⌈τ/2⌉-th sample, τ the delay), IAAFT surrogate tests (Schreiber & Schmitz 1996) of a nonlinear
prediction error (Farmer & Sidorowich 1987) and of time-reversal asymmetry, the largest
Lyapunov exponent (Kantz 1994) with its interval, the correlation dimension D2 and its
saturation, and Cao's E2 — and decides the regime.

` + regimeRule + `

The lag, dimension and Theiler window are chosen as 'unfold lag' and 'unfold dim' do unless
given, and printed. The embedding choices, λ1 and the surrogate tests use at most the first
20 000 samples, D2 the first 10 000; the spectrum and the 0-1 test use the whole record (the 0-1 test at most 20 000
samples after subsampling).

Cost as a function of N: the spectra and the line analysis take O(N log N) on the whole record;
everything else runs on at most the first 20 000 samples (the JSON's "samples_used" and
"surrogate_segment" say which), so its cost does not grow with N; memory O(N).`,
		Example: `  # a simulated Lorenz record: chaotic
  unfold simulate lorenz --n 20000 -o lorenz.csv
  unfold regime --column x lorenz.csv
  # JSON with the evidence table, another seed, the evidence drawn
  unfold regime --json --seed 7 --plot evidence.png --column x lorenz.csv`,
		Args: exactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			return a.runRegime(args[0], o)
		},
	}
	addInputFlags(cmd, &o.in)
	addRegimeFlags(cmd.Flags(), o)
	return cmd
}

// addRegimeFlags binds the flags of `regime` (besides the input flags) to o, with their defaults.
func addRegimeFlags(f *pflag.FlagSet, o *regimeOptions) {
	d := analysis.DefaultRegimeOptions()
	f.IntVar(&o.lag, "lag", d.Lag, "delay in samples (default: chosen from the mutual information)")
	f.IntVar(&o.dim, "dim", d.Dim, "embedding dimension (default: chosen by false neighbours and Cao's E1)")
	f.IntVar(&o.theiler, "theiler", d.Theiler, "Theiler window in samples (default: 1/e decay time of the autocorrelation; 0 excludes only the point itself)")
	f.IntVar(&o.surrogates, "surrogates", d.Surrogates, "number of IAAFT surrogates (at least 19 for the one-sided prediction test at 5 %, 39 for the two-sided time-reversal test)")
	f.BoolVar(&o.noLyap, "no-lyapunov", d.NoLyapunov, "leave the Lyapunov exponent out of the evidence")
	f.StringVar(&o.plot, "plot", "", "draw the evidence: the spectrum with its lines and the surrogate distributions (.png or .svg)")
}

func (o *regimeOptions) options() analysis.RegimeOptions {
	return analysis.RegimeOptions{Lag: o.lag, Dim: o.dim, Theiler: o.theiler, Surrogates: o.surrogates, NoLyapunov: o.noLyap}
}

func (a *app) runRegime(path string, o *regimeOptions) error {
	if err := checkFigurePath(o.plot); err != nil {
		return err
	}
	if err := analysis.CheckRegime(o.options()); err != nil {
		return err
	}
	s, in, err := a.loadInput(path, &o.in)
	if err != nil {
		return err
	}
	an, p, res, err := a.env(&o.in).Regime(path, s, o.options(), analysis.RegimeEvidence{})
	if err != nil {
		return err
	}
	ev, v := an.Evidence, an.Verdict
	if an.LagMethod != "given" {
		a.notef("lag %d chosen (%s)", ev.Lag, an.LagMethod)
	}
	if an.DimMethod != "given" {
		a.notef("dimension %d chosen (%s)", ev.Dim, an.DimMethod)
	}
	if o.theiler == embed.TheilerAuto {
		a.notef("Theiler window %d samples (autocorrelation 1/e decay time)", ev.Theiler)
	}
	if o.plot != "" {
		rows, err := figure.Evidence(an, figureName(path), s.TimeUnit)
		if err != nil {
			return err
		}
		if err := writeFigureFile(o.plot, path, rows); err != nil {
			return err
		}
	}
	if a.global.JSON {
		return a.emitJSON("regime", in, p, res)
	}
	rows := [][]string{
		{"file", path},
		{"regime", v.Regime},
		{"confidence", strconv.FormatFloat(v.Confidence, 'f', 2, 64)},
		{"rule", v.Rule},
		{"embedding", fmt.Sprintf("lag %d (%s), dimension %d (%s), Theiler %d", ev.Lag, an.LagMethod, ev.Dim, an.DimMethod, ev.Theiler)},
		{"", ""},
		{"evidence", "points to (weight): detail"},
	}
	for _, r := range report.EvidenceRows(v) {
		rows = append(rows, []string{"  " + r[0], r[1]})
	}
	if err := a.table(rows); err != nil {
		return err
	}
	for _, c := range v.Cautions {
		fmt.Fprintf(a.stdout, "caution: %s\n", c)
	}
	return nil
}
