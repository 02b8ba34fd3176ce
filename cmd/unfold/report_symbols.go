package main

import (
	"encoding/json"
	"fmt"
	"image/color"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"

	"unfold/analysis"
	"unfold/report"
)

// symbolsMapPoints is the most pairs (x_n, x_{n+1}) drawn in the report's return map; a
// map-like record of 10^5 samples would otherwise put 10^5 circles into the page.
const symbolsMapPoints = 5000

// symbolsStage renders the chain's "symbols" stage: the return map of the partitioned values
// with the cut(s) marked. The stream is kept in memory for the entropy stage.
func symbolsStage(res *analysis.Result, title string) report.Stage {
	return report.Stage{Key: "symbols", Title: "Symbols: return map and partition", Run: func() (*report.Section, error) {
		if res.Symbols == nil {
			return nil, stageErr(res, "symbols")
		}
		run, p, b, sc := res.Symbols.Run, res.Symbols.Params, res.Symbols.Body, res.Symbols.Sidecar
		js, err := json.Marshal(res.Symbols)
		if err != nil {
			return nil, err
		}
		pl, drawn, err := symbolsFigure(run, title)
		if err != nil {
			return nil, fmt.Errorf("symbols: figure: %w", err)
		}
		g := func(v float64) string { return strconv.FormatFloat(v, 'g', 4, 64) }
		part := run.Part
		from := "the samples (map-like record)"
		if run.Applied == "section" {
			from = fmt.Sprintf("%d section crossings, value %s", len(run.Values), run.ValueName)
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
			{"record", run.Rec.Kind + " (" + run.RecFrom + "): " + run.Rec.Reason},
			{"symbols from", from},
			{"partition", fmt.Sprintf("%s, %d symbols %q, cut(s) at %s", part.Kind, part.K(), run.Alphabet, thresholdText(part.Thresholds))},
			{"score", g(part.Score) + " (symbolic false-neighbour fraction; lower is better)"},
			{"entropy rate at the search", g(part.EntropyRate) + " bits/symbol"},
			{"symbols", fmt.Sprintf("%d (counts %s)", sc.Count, countsText(sc.Counts))},
			{"stream", "kept in memory and passed to the entropy stage: the report writes no files besides result.json, " +
				"report.html and figures/, so \"output\" and \"sidecar\" are empty; to write the stream and its sidecar run " +
				"unfold symbols" + lagArg + " -o OUT.sym on the input"},
		}
		if run.Rule != "" {
			sum = append(sum, [2]string{"rule", run.Rule})
		}
		caption := "Return map x_{n+1} against x_n of the values the partition is applied to; the partition's cut(s) are the red lines, the dashed line is the diagonal."
		if drawn < len(run.Values)-1 {
			caption += fmt.Sprintf(" The first %d of %d pairs are drawn.", drawn, len(run.Values)-1)
		}
		return &report.Section{JSON: js, Summary: sum, Cautions: b.Cautions, Figures: []report.Figure{{Name: "symbols",
			Caption: caption, Width: 6 * vg.Inch, Height: 6 * vg.Inch, Rows: [][]*plot.Plot{{pl}}}}}, nil
	}}
}

// symbolsFigure is the return map of run's values (at most symbolsMapPoints pairs) with every
// cut of the partition drawn as a vertical and a horizontal line; it returns the pairs drawn.
func symbolsFigure(run *symbolsRun, title string) (*plot.Plot, int, error) {
	v := run.Values
	if len(v) < 2 {
		return nil, 0, fmt.Errorf("%d values are too few for a return map", len(v))
	}
	v = v[:min(len(v), symbolsMapPoints+1)]
	p, err := returnMapPlot(v, run.ValueName, title)
	if err != nil {
		return nil, 0, err
	}
	lo, hi := v[0], v[0]
	for _, x := range v {
		lo, hi = min(lo, x), max(hi, x)
	}
	red := color.RGBA{R: 0xc0, G: 0x20, B: 0x20, A: 0xff}
	for i, c := range run.Part.Thresholds {
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
