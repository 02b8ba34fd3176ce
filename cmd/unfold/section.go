package main

import (
	"fmt"
	"image/color"
	"strconv"

	"github.com/spf13/cobra"
	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"unfold/partition"
	"unfold/series"
)

type sectionOptions struct {
	in        inputOptions
	lag, dim  int
	level     string
	direction string
	interp    string
	maxima    bool
	output    string
	plot      string
}

func newSectionCmd(a *app) *cobra.Command {
	o := &sectionOptions{}
	cmd := &cobra.Command{
		Use:   "section FILE",
		Short: "Poincaré section and first-return map of a sampled flow",
		Long: `section cuts the delay embedding (x(t), x(t+τ), …, x(t+(m−1)τ)) of a sampled flow with a
hyperplane normal to the first delay coordinate — by default through the mean of the signal,
upward crossings only — and locates every crossing between samples by linear or cubic
(four-point Lagrange) interpolation. With --maxima it takes the local maxima of the signal
instead (the first-return map of maxima), refined by the vertex of the parabola through three
samples. The lag is chosen from the mutual information unless --lag is given.

It reports the number of crossings, crossings per unit time and the mean return time, with a
caution when the crossings are too few (under 100) for a return map. -o writes the crossing
times and coordinates (CSV); --plot draws the return map x_{n+1} against x_n, where x is the
first in-plane coordinate x(t+τ) (or the height of the maximum).`,
		Example: `  # upward crossings of the mean, lag chosen automatically, crossings to CSV, return map
  unfold section lorenz.csv --column x -o crossings.csv --plot return.png
  # the maxima of z: Lorenz's return map of successive maxima
  unfold section --column z --maxima --plot lorenz-map.svg lorenz.csv
  # a given plane and lag, both directions, cubic interpolation, as JSON
  unfold section --json --lag 12 --dim 3 --level 0.5 --direction both --interp cubic signal.csv`,
		Args: exactArgs(1),
		RunE: func(cmd *cobra.Command, args []string) error {
			return a.runSection(args[0], o)
		},
	}
	addInputFlags(cmd, &o.in)
	f := cmd.Flags()
	f.IntVar(&o.lag, "lag", 0, "delay τ of the embedding in samples (default: chosen from the mutual information)")
	f.IntVar(&o.dim, "dim", 3, "embedding dimension m; a crossing has m−1 in-plane coordinates")
	f.StringVar(&o.level, "level", "mean", "where the plane cuts the first delay coordinate, in signal units (default: the mean)")
	f.StringVar(&o.direction, "direction", "up", "crossing direction: up, down or both")
	f.StringVar(&o.interp, "interp", "linear", "interpolation between samples: linear or cubic")
	f.BoolVar(&o.maxima, "maxima", false, "use the local maxima of the signal instead of a hyperplane")
	f.StringVarP(&o.output, "output", "o", "", "write the crossings (CSV: t, then the coordinates)")
	f.StringVar(&o.plot, "plot", "", "draw the return map x_{n+1} vs x_n (.png or .svg)")
	return cmd
}

type sectionParams struct {
	Column    string  `json:"column"`
	Method    string  `json:"method"`
	Lag       int     `json:"lag,omitempty"`
	LagMethod string  `json:"lag_method,omitempty"`
	Dim       int     `json:"dim,omitempty"`
	Level     float64 `json:"level"`
	LevelFrom string  `json:"level_from"`
	Direction string  `json:"direction"`
	Interp    string  `json:"interp"`
}

type sectionResult struct {
	Crossings   int      `json:"crossings"`
	Rate        float64  `json:"rate_per_time_unit"`
	MeanReturn  float64  `json:"mean_return_time"`
	Duration    float64  `json:"duration"`
	ValueColumn string   `json:"value"`
	Output      string   `json:"output"`
	Plot        string   `json:"plot"`
	Cautions    []string `json:"cautions"`
}

// sectionOpts turns the flags into partition.SectionOptions, choosing the lag if needed.
func (a *app) sectionOpts(x []float64, lag, dim int, level, direction, interp string, maxima bool) (partition.SectionOptions, string, string, []string, error) {
	opt := partition.SectionOptions{Maxima: maxima, Dim: dim}
	var cautions []string
	switch direction {
	case "up", "":
		opt.Direction = 1
	case "down":
		opt.Direction = -1
	case "both":
		opt.Direction = 0
	default:
		return opt, "", "", nil, usagef("--direction %q: want up, down or both", direction)
	}
	m, err := partition.ParseInterp(interp)
	if err != nil {
		return opt, "", "", nil, usagef("--interp: %v", err)
	}
	opt.Interp = m
	levelFrom := "mean"
	if level != "mean" && level != "" {
		v, err := strconv.ParseFloat(level, 64)
		if err != nil {
			return opt, "", "", nil, usagef("--level %q: want a number or mean", level)
		}
		opt.Level, opt.LevelSet, levelFrom = v, true, "given"
	}
	if dim < 1 || lag < 0 {
		return opt, "", "", nil, usagef("--dim must be ≥ 1 and --lag ≥ 0")
	}
	lagMethod := "given"
	if !maxima {
		if lag == 0 {
			l, lm, _, _, cs, err := a.embeddingDefaults(x, 0, 0)
			if err != nil {
				return opt, "", "", nil, noAnswer(fmt.Errorf("choosing the lag: %w", err))
			}
			lag, lagMethod, cautions = l, lm, cs
		}
		opt.Lag = lag
	}
	return opt, lagMethod, levelFrom, cautions, nil
}

// sectionRun is what sectionCompute found, for the command's files and figure.
type sectionRun struct {
	sec       *partition.Section
	header    []string // CSV header of the crossings
	valueName string   // the value the return map is drawn of
	lagMethod string
	levelFrom string
}

// sectionCompute takes the section of s as `section` does and returns it with the JSON
// parameters and body of `section` (the body names o.output and o.plot; the caller writes
// them).
func (a *app) sectionCompute(path string, s *series.Series, o *sectionOptions) (*sectionRun, sectionParams, sectionResult, error) {
	if err := series.CheckVariable(s.Values); err != nil {
		return nil, sectionParams{}, sectionResult{}, err
	}
	opt, lagMethod, levelFrom, cautions, err := a.sectionOpts(s.Values, o.lag, o.dim, o.level, o.direction, o.interp, o.maxima)
	if err != nil {
		return nil, sectionParams{}, sectionResult{}, err
	}
	sec, err := partition.TakeSection(s.Values, s.Dt, s.T0, opt)
	if err != nil {
		return nil, sectionParams{}, sectionResult{}, noAnswer(fmt.Errorf("section: %s: %w", path, err))
	}
	cautions = append(cautions, sec.Cautions...)
	header, valueName := sectionColumns(sec, s.Name)
	if cautions == nil {
		cautions = []string{}
	}
	res := sectionResult{Crossings: sec.Len(), Rate: sec.Rate, MeanReturn: sec.MeanReturn, Duration: sec.Duration,
		ValueColumn: valueName, Output: o.output, Plot: o.plot, Cautions: cautions}
	dir := map[int]string{1: "up", -1: "down", 0: "both"}[opt.Direction]
	p := sectionParams{Column: s.Name, Method: sec.Method, Level: sec.Level, LevelFrom: levelFrom, Direction: dir, Interp: sec.Interp}
	if sec.Method == "hyperplane" {
		p.Lag, p.LagMethod, p.Dim = sec.Lag, lagMethod, sec.Dim
	} else {
		p.LevelFrom, p.Direction = "", ""
	}
	return &sectionRun{sec: sec, header: header, valueName: valueName, lagMethod: lagMethod, levelFrom: levelFrom}, p, res, nil
}

func (a *app) runSection(path string, o *sectionOptions) error {
	if err := checkFigurePath(o.plot); err != nil {
		return err
	}
	s, in, err := a.loadInput(path, &o.in)
	if err != nil {
		return err
	}
	run, p, res, err := a.sectionCompute(path, s, o)
	if err != nil {
		return err
	}
	sec := run.sec
	if o.output != "" {
		cols := [][]float64{sec.Times}
		for c := 0; c < sec.Width; c++ {
			col := make([]float64, sec.Len())
			for i := range col {
				col[i] = sec.Points[i*sec.Width+c]
			}
			cols = append(cols, col)
		}
		if err := writeCSVFile(o.output, path, run.header, cols...); err != nil {
			return err
		}
	}
	if o.plot != "" {
		p, err := returnMapPlot(sec.Values(), run.valueName, figureOf(path, s).Title)
		if err != nil {
			return err
		}
		if err := writeFigureFile(o.plot, path, 5.5*vg.Inch, 5.5*vg.Inch, [][]*plot.Plot{{p}}); err != nil {
			return err
		}
	}
	if a.global.JSON {
		return a.emitJSON("section", in, p, res)
	}
	g := func(v float64) string { return strconv.FormatFloat(v, 'g', 6, 64) }
	how := fmt.Sprintf("local maxima of %s (parabola refinement)", s.Name)
	if sec.Method == "hyperplane" {
		how = fmt.Sprintf("plane %s = %s (%s), lag %d (%s), dimension %d, direction %s, %s interpolation",
			s.Name, g(sec.Level), run.levelFrom, sec.Lag, run.lagMethod, sec.Dim, o.direction, sec.Interp)
	}
	rows := [][]string{
		{"file", path},
		{"section", how},
		{"crossings", strconv.Itoa(sec.Len())},
		{"rate", g(sec.Rate) + " per time unit"},
		{"mean return time", g(sec.MeanReturn) + " time units"},
	}
	if o.output != "" {
		rows = append(rows, []string{"written", o.output})
	}
	if o.plot != "" {
		rows = append(rows, []string{"return map", o.plot})
	}
	if err := a.table(rows); err != nil {
		return err
	}
	for _, c := range res.Cautions {
		fmt.Fprintf(a.stdout, "caution: %s\n", c)
	}
	return nil
}

// sectionColumns returns the CSV header of the crossings of sec taken from the signal called
// name (t, then the in-plane coordinates or the height of the maximum) and the name of the
// value the return map is drawn of.
func sectionColumns(sec *partition.Section, name string) ([]string, string) {
	header := []string{"t"}
	valueName := "max_" + name
	if sec.Method == "hyperplane" {
		if sec.Dim == 1 {
			header = append(header, name)
			valueName = name
		} else {
			for k := 1; k < sec.Dim; k++ {
				if k == 1 {
					header = append(header, name+"(t+τ)")
				} else {
					header = append(header, fmt.Sprintf("%s(t+%dτ)", name, k))
				}
			}
			valueName = header[1]
		}
	} else {
		header = append(header, valueName)
	}
	return header, valueName
}

// returnMapPlot draws v[n+1] against v[n] with the diagonal.
func returnMapPlot(v []float64, name, title string) (*plot.Plot, error) {
	p := plot.New()
	p.Title.Text = "Return map — " + title
	p.X.Label.Text = name + " (n)"
	p.Y.Label.Text = name + " (n+1)"
	pts := make(plotter.XYs, 0, max(len(v)-1, 0))
	lo, hi := v[0], v[0]
	for i := 0; i+1 < len(v); i++ {
		pts = append(pts, plotter.XY{X: v[i], Y: v[i+1]})
		lo, hi = min(lo, v[i]), max(hi, v[i])
	}
	sc, err := plotter.NewScatter(pts)
	if err != nil {
		return nil, fmt.Errorf("return map: %w", err)
	}
	sc.GlyphStyle.Shape = draw.CircleGlyph{}
	sc.GlyphStyle.Radius = vg.Points(1.2)
	sc.GlyphStyle.Color = color.RGBA{R: 0x1f, G: 0x5f, B: 0xa8, A: 0xff}
	diag, err := plotter.NewLine(plotter.XYs{{X: lo, Y: lo}, {X: hi, Y: hi}})
	if err != nil {
		return nil, fmt.Errorf("return map: %w", err)
	}
	diag.Color = color.RGBA{R: 0x80, G: 0x80, B: 0x80, A: 0xff}
	diag.Dashes = []vg.Length{vg.Points(3), vg.Points(3)}
	p.Add(diag, sc)
	return p, nil
}
