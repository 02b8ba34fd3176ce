package main

import (
	"fmt"
	"strconv"

	"github.com/spf13/cobra"
	"gonum.org/v1/plot"

	"unfold/analysis"
	"unfold/figure"
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
	d := analysis.DefaultSectionOptions()
	f.IntVar(&o.lag, "lag", d.Lag, "delay τ of the embedding in samples (default: chosen from the mutual information)")
	f.IntVar(&o.dim, "dim", d.Dim, "embedding dimension m; a crossing has m−1 in-plane coordinates")
	f.StringVar(&o.level, "level", d.Level, "where the plane cuts the first delay coordinate, in signal units (default: the mean)")
	f.StringVar(&o.direction, "direction", d.Direction, "crossing direction: up, down or both")
	f.StringVar(&o.interp, "interp", d.Interp, "interpolation between samples: linear or cubic")
	f.BoolVar(&o.maxima, "maxima", d.Maxima, "use the local maxima of the signal instead of a hyperplane")
	f.StringVarP(&o.output, "output", "o", "", "write the crossings (CSV: t, then the coordinates)")
	f.StringVar(&o.plot, "plot", "", "draw the return map x_{n+1} vs x_n (.png or .svg)")
	return cmd
}

func (o *sectionOptions) options() analysis.SectionOptions {
	return analysis.SectionOptions{Lag: o.lag, Dim: o.dim, Level: o.level, Direction: o.direction, Interp: o.interp,
		Maxima: o.maxima, Output: o.output, Plot: o.plot}
}

func (a *app) runSection(path string, o *sectionOptions) error {
	if err := checkFigurePath(o.plot); err != nil {
		return err
	}
	s, in, err := a.loadInput(path, &o.in)
	if err != nil {
		return err
	}
	run, p, res, err := a.env(&o.in).Section(path, s, o.options())
	if err != nil {
		return err
	}
	sec := run.Sec
	if o.output != "" {
		cols := [][]float64{sec.Times}
		for c := 0; c < sec.Width; c++ {
			col := make([]float64, sec.Len())
			for i := range col {
				col[i] = sec.Points[i*sec.Width+c]
			}
			cols = append(cols, col)
		}
		if err := writeCSVFile(o.output, path, run.Header, cols...); err != nil {
			return err
		}
	}
	if o.plot != "" {
		p, err := figure.ReturnMap(sec.Values(), run.ValueName, figureOf(path, s).Title)
		if err != nil {
			return err
		}
		if err := writeFigureFile(o.plot, path, [][]*plot.Plot{{p}}); err != nil {
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
			s.Name, g(sec.Level), run.LevelFrom, sec.Lag, run.LagMethod, sec.Dim, o.direction, sec.Interp)
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
