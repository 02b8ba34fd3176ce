package main

import (
	"bytes"
	"fmt"
	"image/color"
	"strconv"
	"strings"

	"github.com/spf13/pflag"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"

	"unfold/demo"
	"unfold/report"
	"unfold/series"
	"unfold/symbolic"
)

// symbolStream hands the symbols stage's stream to the entropy stage. The report package writes
// only result.json, report.html and figures/ into the output directory, so the stream and its
// sidecar are kept in memory (exactly the bytes `unfold symbols -o` would write).
type symbolStream struct {
	stream  []byte
	sidecar *symbolic.Sidecar
}

// symbolsMapPoints is the most pairs (x_n, x_{n+1}) drawn in the report's return map; a
// map-like record of 10^5 samples would otherwise put 10^5 circles into the page.
const symbolsMapPoints = 5000

// symbolsStage is the report's "symbols" stage: `unfold symbols` with its defaults (map or flow
// decided from the data, a flow cut at its Poincaré section, the generating-like partition
// search) on the lag chosen upstream (st.lag; the section and the partition do not use the
// dimension). The figure is the return map of the partitioned values with the cut(s) marked.
// The stream is kept in sym for the entropy stage.
func (a *app) symbolsStage(path string, s *series.Series, in *inputInfo, o *reportOptions, st *chainState, sym *symbolStream,
	envelope func(command string, params, body any) ([]byte, error)) report.Stage {
	return report.Stage{Key: "symbols", Title: "Symbols: return map and partition", Run: func() (*report.Section, error) {
		so := &symbolsOptions{}
		addSymbolsFlags(pflag.NewFlagSet("symbols", pflag.ContinueOnError), so)
		so.in, so.lag = o.in, st.lag
		if err := checkSymbolsOptions(so, false); err != nil {
			return nil, err
		}
		run, p, err := a.symbolsCompute(path, s, so, st.lagMethod)
		if err != nil {
			return nil, err
		}
		var buf bytes.Buffer
		sc, err := run.writeSymbols(&buf, "the report's symbol stream", symbolic.Source{Path: in.Path, SHA256: in.SHA256},
			"unfold report (symbols stage)")
		if err != nil {
			return nil, err
		}
		sym.stream, sym.sidecar = buf.Bytes(), sc
		res := run.result(sc, "", "")
		js, err := envelope("symbols", p, res)
		if err != nil {
			return nil, err
		}
		title := figureOf(path, s).Title
		if o.demo {
			title = demo.Name
		}
		pl, drawn, err := symbolsFigure(run, title)
		if err != nil {
			return nil, fmt.Errorf("symbols: figure: %w", err)
		}
		g := func(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }
		part := run.part
		from := "the samples (map-like record)"
		if run.applied == "section" {
			from = fmt.Sprintf("%d section crossings, value %s", len(run.values), run.valueName)
			if p.Section != nil && p.Section.Method == "hyperplane" {
				from += fmt.Sprintf(" (plane through the %s, %s, lag %d samples from %s)", p.Section.LevelFrom, p.Section.Direction,
					p.Section.Lag, p.Section.LagMethod)
			}
		}
		lagArg := ""
		if p.Section != nil && p.Section.Lag > 0 {
			lagArg = " --lag " + strconv.Itoa(p.Section.Lag)
		}
		sum := [][2]string{
			{"record", run.rec.Kind + " (" + run.recFrom + "): " + run.rec.Reason},
			{"symbols from", from},
			{"partition", fmt.Sprintf("%s, %d symbols %q, cut(s) at %s", part.Kind, part.K(), run.alphabet, thresholdText(part.Thresholds))},
			{"score", g(part.Score) + " (symbolic false-neighbour fraction; lower is better)"},
			{"entropy rate at the search", g(part.EntropyRate) + " bits/symbol"},
			{"symbols", fmt.Sprintf("%d (counts %s)", sc.Count, countsText(sc.Counts))},
			{"stream", "kept in memory and passed to the entropy stage: the report writes no files besides result.json, " +
				"report.html and figures/, so \"output\" and \"sidecar\" are empty; to write the stream and its sidecar run " +
				"unfold symbols" + lagArg + " -o OUT.sym on the input"},
		}
		if run.rule != "" {
			sum = append(sum, [2]string{"rule", run.rule})
		}
		caption := "Return map x_{n+1} against x_n of the values the partition is applied to; the partition's cut(s) are the red lines, the dashed line is the diagonal."
		if drawn < len(run.values)-1 {
			caption += fmt.Sprintf(" The first %d of %d pairs are drawn.", drawn, len(run.values)-1)
		}
		return &report.Section{JSON: js, Summary: sum, Cautions: res.Cautions, Figures: []report.Figure{{Name: "symbols",
			Caption: caption, Width: 6 * vg.Inch, Height: 6 * vg.Inch, Rows: [][]*plot.Plot{{pl}}}}}, nil
	}}
}

// symbolsFigure is the return map of run's values (at most symbolsMapPoints pairs) with every
// cut of the partition drawn as a vertical and a horizontal line; it returns the pairs drawn.
func symbolsFigure(run *symbolsRun, title string) (*plot.Plot, int, error) {
	v := run.values
	if len(v) < 2 {
		return nil, 0, fmt.Errorf("%d values are too few for a return map", len(v))
	}
	v = v[:min(len(v), symbolsMapPoints+1)]
	p, err := returnMapPlot(v, run.valueName, title)
	if err != nil {
		return nil, 0, err
	}
	lo, hi := v[0], v[0]
	for _, x := range v {
		lo, hi = min(lo, x), max(hi, x)
	}
	red := color.RGBA{R: 0xc0, G: 0x20, B: 0x20, A: 0xff}
	for i, c := range run.part.Thresholds {
		for _, seg := range []plotter.XYs{{{X: c, Y: lo}, {X: c, Y: hi}}, {{X: lo, Y: c}, {X: hi, Y: c}}} {
			l, err := plotter.NewLine(seg)
			if err != nil {
				return nil, 0, err
			}
			l.Color, l.Width = red, vg.Points(1.2)
			p.Add(l)
			if i == 0 && seg[0].X == c {
				p.Legend.Add("cut", l)
			}
		}
	}
	p.Legend.Top = true
	return p, len(v) - 1, nil
}

// countsText lists symbol counts, comma separated.
func countsText(c []int64) string {
	t := make([]string, len(c))
	for i, n := range c {
		t[i] = strconv.FormatInt(n, 10)
	}
	return strings.Join(t, ", ")
}
