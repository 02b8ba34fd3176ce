package report

import (
	"encoding/json"
	"errors"
	"fmt"
	"slices"
	"strconv"
	"strings"
	"time"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"

	"unfold/analysis"
	"unfold/figure"
	"unfold/regime"
	"unfold/series"
)

// View is what the page shows besides the result: the 3-D view of the state-space picture and
// the lag given on the command line (0: chosen), named in the lag section.
type View struct {
	Azimuth, Elevation float64
	Lag                int
}

// Build renders res (the chain on s, analysis.Run) as the page's sections and returns the
// report: Run over Stages, each stage's wall time the chain's plus its drawing.
func Build(h Header, res *analysis.Result, s *series.Series, fig figure.Record, view View) *Result {
	r := Run(h, Stages(res, s, fig, view), nil, nil)
	r.Summary = Summarize(res, h.Input.Units)
	return r
}

func fmtG6(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }

const ln2 = 0.6931471805599453

// stageErr is the recorded error of the stage key of res (nil when it gave an answer).
func stageErr(res *analysis.Result, key string) error {
	r := res.Stage(key)
	if r == nil {
		return errors.New(key + ": did not run")
	}
	if r.Status == analysis.StatusSkipped {
		return analysis.Skip(errors.New(r.Error))
	}
	if r.Status != analysis.StatusOK {
		return errors.New(r.Error)
	}
	return nil
}

// stageTime is the compute time of the stage key of res.
func stageTime(res *analysis.Result, key string) time.Duration {
	if r := res.Stage(key); r != nil {
		return time.Duration(r.Seconds * float64(time.Second))
	}
	return 0
}

// reportStages renders the stages of res as the page's sections: each stage's JSON object is
// what its single command prints with --json.
func Stages(res *analysis.Result, s *series.Series, fig figure.Record, view View) []Stage {
	stages := []Stage{
		{Key: "inspect", Title: "The signal", Run: func() (*Section, error) {
			if res.Inspect == nil {
				return nil, stageErr(res, "inspect")
			}
			sm := res.Inspect.Summary
			js, err := json.Marshal(res.Inspect)
			if err != nil {
				return nil, err
			}
			f, err := SignalFigure("signal", s.Name, s.Unit, fig.TimeUnit, s.Values, s.Dt, 1500)
			if err != nil {
				return nil, fmt.Errorf("inspect: figure: %w", err)
			}
			g := fmtG6
			unit := ""
			if s.Unit != "" {
				unit = " " + s.Unit
			}
			tu := func(v float64) string { return g(v) + " " + timeUnits(fig.TimeUnit) }
			rows := [][2]string{
				{"signal", s.Name},
				{"samples", strconv.Itoa(sm.Samples)},
				{"sampling interval", tu(sm.Dt) + " (duration " + tu(sm.Duration) + ")"},
				{"mean ± std", g(sm.Mean) + " ± " + g(sm.Std) + unit},
				{"range", g(sm.Min) + " … " + g(sm.Max) + unit},
				{"quantization step", g(sm.Quantization) + unit},
				{"dominant period", tu(sm.DominantPeriod) + " (" + g(sm.DominantPeriod/sm.Dt) + " samples)"},
				{"gaps filled", strconv.Itoa(sm.GapsFilled)},
				{"stationary", fmt.Sprintf("%s (mean shift %.1f, variance shift %.1f standard errors)",
					yesNo(sm.Stationarity.Stationary), sm.Stationarity.MeanShift, sm.Stationarity.VarianceShift)},
			}
			for _, n := range res.Inspect.Body.Notes {
				rows = append(rows, [2]string{"reading", n})
			}
			return &Section{JSON: js, Figures: []Figure{f}, Cautions: sm.Cautions, Summary: rows}, nil
		}},
		{Key: "lag", Title: "Delay: mutual information and autocorrelation", Run: func() (*Section, error) {
			if res.Lag == nil {
				return nil, stageErr(res, "lag")
			}
			c, p, b := res.Lag.Choice, res.Lag.Params, res.Lag.Body
			js, err := json.Marshal(res.Lag)
			if err != nil {
				return nil, err
			}
			rows, err := figure.LagPlots(c, fig)
			if err != nil {
				return nil, fmt.Errorf("lag: figure: %w", err)
			}
			sum := [][2]string{
				{"chosen lag", fmt.Sprintf("%d samples = %s %s", c.Lag, fmtG6(b.LagTime), timeUnits(fig.TimeUnit))},
				{"rule", c.Reason},
				{"estimator", p.Estimator},
				{"autocorrelation", acfText(b.AutocorrelationZero, b.AutocorrelationDecay, p.MaxLag)},
				{"suggested Theiler window", strconv.Itoa(b.Theiler) + " samples"},
			}
			if view.Lag > 0 {
				sum = append(sum, [2]string{"lag used downstream", strconv.Itoa(view.Lag) + " samples (given with --lag)"})
			}
			return &Section{JSON: js, Summary: sum, Cautions: b.Cautions, Figures: []Figure{{Name: "lag",
				Caption: "Mutual information (bits) and autocorrelation against the delay; the chosen lag is marked.",
				Width:   figure.Width, Height: figure.HeightFor(len(rows)), Rows: rows}}}, nil
		}},
		{Key: "dim", Title: "Dimension: false neighbours and Cao's E1/E2", Run: func() (*Section, error) {
			if res.Dim == nil {
				return nil, stageErr(res, "dim")
			}
			c, p, b := res.Dim.Choice, res.Dim.Params, res.Dim.Body
			js, err := json.Marshal(res.Dim)
			if err != nil {
				return nil, err
			}
			rows, err := figure.DimPlots(c, fig)
			if err != nil {
				return nil, fmt.Errorf("dim: figure: %w", err)
			}
			chosen := "none up to " + strconv.Itoa(c.MaxDim)
			if c.Dimension > 0 {
				chosen = strconv.Itoa(c.Dimension)
			}
			return &Section{JSON: js, Cautions: b.Cautions, Summary: [][2]string{
				{"chosen dimension", chosen},
				{"rule", c.Reason},
				{"false neighbours / Cao", dimText(c.FNNDim, c.MaxDim) + " / " + dimText(c.CaoDim, c.MaxDim)},
				{"consistent with noise (E2 ≈ 1)", yesNo(c.NoiseLike)},
				{"lag, Theiler window", fmt.Sprintf("%d samples, %d samples", p.Lag, p.Theiler)},
			}, Figures: []Figure{{Name: "dim",
				Caption: "False-neighbour fraction and Cao's E1, E2 against the dimension; the chosen dimension is marked.",
				Width:   figure.Width, Height: figure.HeightFor(len(rows)), Rows: rows}}}, stageErr(res, "dim")
		}},
		{Key: "embed", Title: "State-space picture", Run: func() (*Section, error) {
			if res.Embed == nil {
				return nil, stageErr(res, "embed")
			}
			e, p, b := res.Embed.Embedding, res.Embed.Params, res.Embed.Body
			js, err := json.Marshal(res.Embed)
			if err != nil {
				return nil, err
			}
			rows, err := figure.StateSpacePlots(e, fig, figure.StateSpaceOptions{Azimuth: view.Azimuth, Elevation: view.Elevation, DensityAbove: 3000, Bins: 140})
			if err != nil {
				return nil, fmt.Errorf("embed: figure: %w", err)
			}
			w, h := figure.SizeFor(rows)
			return &Section{JSON: js, Cautions: b.Cautions, Summary: [][2]string{
				{"delay vectors", fmt.Sprintf("%d of dimension %d at lag %d samples (%s %s)", b.Vectors, b.Dimension, b.Lag, fmtG6(b.LagTime), timeUnits(fig.TimeUnit))},
				{"lag / dimension from", ruleWords(p.LagMethod) + " / " + ruleWords(p.DimMethod)},
			}, Figures: []Figure{{Name: "embed",
				Caption: "The delay plot x(t+τ) against x(t) and, for m ≥ 3, an oblique view of (x(t), x(t+τ), x(t+2τ)).",
				Width:   w, Height: h, Rows: rows}}}, nil
		}},
		lyapunovStage(res, fig),
		fractalStage(res, fig),
		regimeStage(res, fig),
		symbolsStage(res, fig.Title),
		entropyStage(res),
		statesStage(res),
	}
	for i := range stages {
		stages[i].Took = stageTime(res, stages[i].Key)
	}
	return stages
}

// ruleWords puts an embedding rule's code in words ("mi-first-significant-minimum" → "first
// significant minimum of the mutual information"); an unknown code loses its hyphens.
func ruleWords(code string) string {
	switch code {
	case "mi-first-significant-minimum":
		return "first significant minimum of the mutual information"
	case "mi-at-bias-level-lag-1":
		return "lag 1 (the mutual information is at its bias level)"
	case "decorrelated-within-one-sample-lag-1":
		return "lag 1 (decorrelated within one sample)"
	case "cao-e1-saturation":
		return "saturation of Cao's E1"
	case "given":
		return "given on the command line"
	}
	return strings.ReplaceAll(code, "-", " ")
}

// yesNo is "yes" or "no".
func yesNo(b bool) string {
	if b {
		return "yes"
	}
	return "no"
}

// timeUnits names a time unit in a table: the unit, or "time units" when unknown.
func timeUnits(u string) string {
	if u == "" {
		return "time units"
	}
	return u
}

// signalUnits names the signal's unit in a table: the unit, or "signal units" when unknown.
func signalUnits(u string) string {
	if u == "" {
		return "signal units"
	}
	return u
}

// dimText is a dimension found by one criterion, or "none up to MAX" when it found none.
func dimText(d, maxDim int) string {
	if d <= 0 {
		return "none up to " + strconv.Itoa(maxDim)
	}
	return strconv.Itoa(d)
}

// acfText describes the autocorrelation's first zero and 1/e decay (0 = not reached in the scan).
func acfText(zero, decay, maxLag int) string {
	z, d := "no zero up to lag "+strconv.Itoa(maxLag), "no 1/e decay up to lag "+strconv.Itoa(maxLag)
	if zero > 0 {
		z = "first zero at lag " + strconv.Itoa(zero)
	}
	if decay > 0 {
		d = "1/e decay at lag " + strconv.Itoa(decay)
	}
	return z + ", " + d
}

// lyapunovStage renders the chain's "lyapunov" stage: the divergence curve with the fit range
// shaded.
func lyapunovStage(res *analysis.Result, fig figure.Record) Stage {
	title := fig.Title
	return Stage{Key: "lyapunov", Title: "Largest Lyapunov exponent: divergence curve", Run: func() (*Section, error) {
		noFit := stageErr(res, "lyapunov")
		if res.Lyapunov == nil {
			return nil, noFit
		}
		run, p, b := res.Lyapunov.Run, res.Lyapunov.Params, res.Lyapunov.Body
		js, err := json.Marshal(res.Lyapunov)
		if err != nil {
			return nil, err
		}
		pl, err := figure.Lyapunov(run, title, fig.TimeUnit)
		if err != nil {
			return nil, err
		}
		r := run.R
		g := func(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }
		sum := [][2]string{
			{"embedding", fmt.Sprintf("lag %d samples, dimension %d, Theiler window %d samples", p.Lag, p.Dim, p.Theiler)},
			{"curve", fmt.Sprintf("%s, horizon %d steps (%s %s), %d reference points", p.Method, r.Horizon, g(float64(r.Horizon)*r.Dt), timeUnits(fig.TimeUnit), r.ReferencePoints)},
			{"reference points", b.Sampling},
		}
		if b.LambdaMax != nil {
			sum = append(sum,
				[2]string{"λ1 (largest exponent)", fmt.Sprintf("%s %s (%s bits per %s; %s nats per sample)", sig3(r.Lambda), PerTime(fig.TimeUnit), sig3(r.Lambda/ln2), timeWord(fig.TimeUnit), sig3(r.LambdaPerSample))},
				[2]string{"interval", lyapunovIntervalText(b, r.Level, r.Reps, PerTime(fig.TimeUnit))},
				[2]string{"fit range", fmt.Sprintf("steps %d … %d (%s)", r.From, r.To, b.Fit.Criterion)})
		} else {
			sum = append(sum, [2]string{"λ1 (largest exponent)", "no answer: " + b.Reason})
		}
		return &Section{JSON: js, Summary: sum, Cautions: b.Cautions, Figures: []Figure{{Name: "lyapunov",
			Caption: "Mean log separation of initially close delay vectors against the steps ahead; the fit range is shaded and λ_max is the slope there.",
			Width:   figure.Width, Height: figure.Height, Rows: [][]*plot.Plot{{pl}}}}}, noFit
	}}
}

// lyapunovIntervalText is the page's λ1 interval: the stage's (the one the regime evidence
// uses), said to be the spread across ε when an unsure fit range widened it.
func lyapunovIntervalText(b analysis.LyapunovResult, level float64, reps int, per string) string {
	iv := *b.Interval
	t := fmt.Sprintf("[%s, %s] %s (%.0f %%, block bootstrap, %d resamples)", sig3(iv[0]), sig3(iv[1]), per, 100*level, reps)
	if rc := b.RangeCheck; rc != nil && rc.Widened {
		t = fmt.Sprintf("[%s, %s] %s: the fit range is unsure, so the interval is the spread across ε (block bootstrap alone: [%s, %s])",
			sig3(iv[0]), sig3(iv[1]), per, sig3(rc.Bootstrap[0]), sig3(rc.Bootstrap[1]))
	}
	return t
}

// fractalStage renders the chain's "fractal" stage: the local slopes of the correlation sums
// with the scaling range drawn thicker (also when no range was found: the curves say why).
func fractalStage(res *analysis.Result, fg figure.Record) Stage {
	title := fg.Title
	return Stage{Key: "fractal", Title: "Correlation dimension: local slopes of the correlation sums", Run: func() (*Section, error) {
		err := stageErr(res, "fractal")
		run := res.FractalCurves
		if run == nil {
			return nil, err
		}
		pl, ferr := figure.Fractal(run, title)
		if ferr != nil {
			return nil, fmt.Errorf("fractal: figure: %w", ferr)
		}
		fig := []Figure{{Name: "fractal",
			Caption: "Local slopes d log C / d log r of the correlation sums against the radius, one curve per embedding dimension; the fitted scaling range is drawn thicker and D2 dashed.",
			Width:   figure.Width, Height: figure.Height, Rows: [][]*plot.Plot{{pl}}}}
		if res.Fractal == nil {
			// no scaling range: no JSON object to show, but the curves say why
			return &Section{JSON: nil, Figures: fig, Cautions: run.Cautions}, err
		}
		p, b := res.Fractal.Params, res.Fractal.Body
		js, err := json.Marshal(res.Fractal)
		if err != nil {
			return nil, err
		}
		g := func(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }
		r := run.R
		perDim := ""
		for _, c := range r.Curves {
			if c.Fitted {
				if perDim != "" {
					perDim += ", "
				}
				perDim += fmt.Sprintf("m %d: %s", c.Dim, sig3(c.D2))
			}
		}
		return &Section{JSON: js, Cautions: b.Cautions, Figures: fig, Summary: [][2]string{
			{"D2", fmt.Sprintf("%s [%s, %s] (dimensionless; 95 %% bootstrap) at m = %d, saturated: %s", sig3(r.D2), sig3(r.Lo), sig3(r.Hi), r.Dim, yesNo(r.Saturated))},
			{"scaling range", fmt.Sprintf("r = %s … %s %s", g(r.RLo), g(r.RHi), signalUnits(fg.Unit))},
			{"Takens estimate", sig3(r.Takens)},
			{"per dimension", perDim},
			{"lag, Theiler window", fmt.Sprintf("%d samples, %d samples; %s norm", p.Lag, p.Theiler, p.Norm)},
			{"pairs counted", b.Sampling},
		}}, nil
	}}
}

// regimeStage renders the chain's "regime" stage: the verdict, the evidence table (λ1 from the
// lyapunov stage, D2 from the fractal stage), the cautions and the evidence figure (spectrum
// with its lines, surrogate tests).
func regimeStage(res *analysis.Result, fig figure.Record) Stage {
	title := fig.Title
	return Stage{Key: "regime", Title: "Regime: verdict and evidence", Run: func() (*Section, error) {
		if res.Regime == nil {
			return nil, stageErr(res, "regime")
		}
		an, p, b := res.Regime.Analysis, res.Regime.Params, res.Regime.Body
		js, err := json.Marshal(res.Regime)
		if err != nil {
			return nil, err
		}
		rows, err := figure.Evidence(an, title, fig.TimeUnit)
		if err != nil {
			return nil, fmt.Errorf("regime: figure: %w", err)
		}
		ev, v := an.Evidence, an.Verdict
		lyapFrom := "not used (the lyapunov stage gave none)"
		if p.LyapunovFrom != "" {
			lyapFrom = "from the lyapunov stage"
		}
		d2From := "not used (the fractal stage gave none)"
		if p.DimensionFrom != "" {
			d2From = "from the fractal stage"
		}
		sum := [][2]string{
			{"regime", v.Regime + " — " + Strength(v.Regime, v.Confidence)},
			{"confidence", strconv.FormatFloat(v.Confidence, 'f', 2, 64) + " (the weighted share of the evidence that supports the verdict)"},
			{"rule", v.Rule},
			{"embedding", fmt.Sprintf("lag %d samples, dimension %d, Theiler window %d samples; λ1 %s; D2 %s; %d IAAFT surrogates",
				ev.Lag, ev.Dim, ev.Theiler, lyapFrom, d2From, p.Surrogates)},
		}
		w, h := figure.SizeFor(rows)
		return &Section{JSON: js, Summary: sum, Cautions: b.Cautions, Evidence: Evidence(an, analysis.Units{Time: fig.TimeUnit, Signal: fig.Unit}), Figures: []Figure{{Name: "regime",
			Caption: "The evidence: the spectrum with its significant lines, and the data's nonlinear prediction error and time-reversal asymmetry (bars) against the IAAFT surrogates' (points), in standard deviations of the surrogates from their mean.",
			Width:   w, Height: h, Rows: rows}}}, nil
	}}
}

// symbolsStage renders the chain's "symbols" stage: the return map of the partitioned values
// with the cut(s) marked. The stream is kept in memory for the entropy stage.
func symbolsStage(res *analysis.Result, title string) Stage {
	return Stage{Key: "symbols", Title: "Symbols: return map and partition", Run: func() (*Section, error) {
		if res.Symbols == nil {
			return nil, stageErr(res, "symbols")
		}
		run, p, b, sc := res.Symbols.Run, res.Symbols.Params, res.Symbols.Body, res.Symbols.Sidecar
		js, err := json.Marshal(res.Symbols)
		if err != nil {
			return nil, err
		}
		pl, drawn, err := figure.Symbols(run, title)
		if err != nil {
			return nil, fmt.Errorf("symbols: figure: %w", err)
		}
		g := func(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }
		part := run.Part
		from := "the samples (map-like record)"
		if run.Applied == "section" {
			from = fmt.Sprintf("%d section crossings, value %s", len(run.Values), run.ValueName)
			if p.Section != nil && p.Section.Method == "hyperplane" {
				from += fmt.Sprintf(" (plane through the %s, %s, lag %d samples: %s)", p.Section.LevelFrom, p.Section.Direction,
					p.Section.Lag, ruleWords(p.Section.LagMethod))
			}
		}
		lagArg := ""
		if p.Section != nil && p.Section.Lag > 0 {
			lagArg = " --lag " + strconv.Itoa(p.Section.Lag)
		}
		sum := [][2]string{
			{"record", run.Rec.Kind + " (" + strings.Replace(run.RecFrom, "data", "judged from the data", 1) + "): " + run.Rec.Reason},
			{"symbols from", from},
			{"partition", fmt.Sprintf("%s, %d symbols %q, cut(s) at %s", part.Kind, part.K(), run.Alphabet, ThresholdText(part.Thresholds))},
			{"score", g(part.Score) + " (symbolic false-neighbour fraction; lower is better)"},
			{"entropy rate at the search", g(part.EntropyRate) + " bits/symbol"},
			{"symbols", fmt.Sprintf("%d (counts %s)", sc.Count, countsText(sc.Counts))},
			{"stream", "kept in memory and passed to the entropy stage: the report writes no files besides result.json, " +
				"html and figures/, so \"output\" and \"sidecar\" are empty; to write the stream and its sidecar run " +
				"unfold symbols" + lagArg + " -o OUT.sym on the input"},
		}
		if run.Rule != "" {
			sum = append(sum, [2]string{"rule", run.Rule})
		}
		caption := "Return map x_{n+1} against x_n of the values the partition is applied to; the partition's cut(s) are the purple lines, the dashed line is the diagonal."
		if drawn < len(run.Values)-1 {
			caption += fmt.Sprintf(" The first %d of %d pairs are drawn.", drawn, len(run.Values)-1)
		}
		return &Section{JSON: js, Summary: sum, Cautions: b.Cautions, Figures: []Figure{{Name: "symbols",
			Caption: caption, Width: figure.Width, Height: squareHeight(pl), Rows: [][]*plot.Plot{{pl}}}}}, nil
	}}
}

// countsText lists symbol counts, comma separated.
func countsText(c []int64) string {
	t := make([]string, len(c))
	for i, n := range c {
		t[i] = strconv.FormatInt(n, 10)
	}
	return strings.Join(t, ", ")
}

// entropyStage renders the chain's "entropy" stage: the block entropies H(L) and the
// entropy-rate estimates h(L) against the word length.
func entropyStage(res *analysis.Result) Stage {
	return Stage{Key: "entropy", Title: "Entropy of the symbol stream", Run: func() (*Section, error) {
		if res.Entropy == nil {
			return nil, stageErr(res, "entropy")
		}
		in, p, b := res.Entropy.Input, res.Entropy.Params, res.Entropy.Body
		js, err := json.Marshal(res.Entropy)
		if err != nil {
			return nil, err
		}
		rows, err := figure.Entropy(p, b)
		if err != nil {
			return nil, fmt.Errorf("entropy: figure: %w", err)
		}
		g := func(v float64) string { return strconv.FormatFloat(v, 'f', 4, 64) }
		return &Section{JSON: js, Cautions: b.Cautions, Summary: [][2]string{
			{"stream", fmt.Sprintf("%d symbols over %q from the symbols stage (in memory)", in.Samples, p.Alphabet)},
			{"entropy rate", g(b.EntropyRate) + " bits/symbol at L = " + strconv.Itoa(p.RateLength)},
			{"excess entropy", g(b.ExcessEntropy) + " bits"},
			{"LZ76", fmt.Sprintf("%s normalised (%d phrases)", g(b.LZ76), b.LZ76Detail.Phrases)},
			{"estimator", p.Estimator + ", word lengths 1 … " + strconv.Itoa(p.MaxLength)},
			{"estimate", p.Extrapolation},
		}, Figures: []Figure{{Name: "entropy",
			Caption: "Block entropy H(L) and entropy-rate estimates h(L) = H(L) − H(L−1) in bits against the word length L; " +
				"hollow points are lengths the data do not support, the entropy rate is read at the marked L*, and the dotted line is log2 K (random symbols).",
			Width: figure.Width, Height: figure.HeightFor(len(rows)), Rows: rows}}}, nil
	}}
}

// EvidenceRows are the rows of the evidence table: the item's name, then "points to (weight):
// detail", sorted by name.
func EvidenceRows(v *regime.Verdict) [][2]string {
	keys := make([]string, 0, len(v.Evidence))
	for k := range v.Evidence {
		keys = append(keys, k)
	}
	slices.Sort(keys)
	rows := make([][2]string, 0, len(keys))
	for _, k := range keys {
		it := v.Evidence[k]
		rows = append(rows, [2]string{k, fmt.Sprintf("%s (%g): %s", it.PointsTo, it.Weight, it.Detail)})
	}
	return rows
}

// ThresholdText lists cut values with 6 significant digits, comma separated.
func ThresholdText(th []float64) string {
	t := make([]string, len(th))
	for i, v := range th {
		t[i] = strconv.FormatFloat(v, 'g', 6, 64)
	}
	return strings.Join(t, ", ")
}

// squareHeight is the canvas height of a figure of one panel with equal axes.
func squareHeight(p *plot.Plot) vg.Length {
	_, h := figure.SizeFor([][]*plot.Plot{{p}})
	return h
}
