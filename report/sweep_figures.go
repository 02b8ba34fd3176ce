package report

import (
	"fmt"
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"unfold/figure"
)

// verdictOrder lists the verdicts (and the broadband line kind) in the order they are drawn;
// verdictColor gives each verdict (and each line kind) its colour on every figure of the page,
// from the project's palette (figure.Color: Okabe & Ito 2008).
var verdictOrder = []string{"periodic", "quasiperiodic", "chaotic", "stochastic", "undetermined", "broadband"}

func verdictColor(v string) color.Color {
	switch v {
	case "periodic":
		return figure.Main() // blue
	case "quasiperiodic":
		return figure.Color(2) // bluish green
	case "chaotic", "broadband":
		return figure.Second() // vermillion
	case "stochastic":
		return figure.Mark() // reddish purple
	case "undetermined":
		return figure.Color(5) // orange
	}
	return figure.Color(6) // black
}

func hexColor(c color.Color) string {
	r, g, b, _ := c.RGBA()
	return fmt.Sprintf("#%02x%02x%02x", r>>8, g>>8, b>>8)
}

// sweepPlot is a plot in the project's style (figure.New).
func sweepPlot(title, x, y string) *plot.Plot {
	return figure.New(title, x, y)
}

func dots(xy plotter.XYs, c color.Color, r vg.Length, shape draw.GlyphDrawer) (*plotter.Scatter, error) {
	s, err := plotter.NewScatter(xy)
	if err != nil {
		return nil, err
	}
	s.GlyphStyle.Color = c
	s.GlyphStyle.Radius = r
	s.GlyphStyle.Shape = shape
	return s, nil
}

// rangeOf returns the extent of the parameter values, widened when it is a single point.
func rangeOf(rows []SweepRow) (float64, float64) {
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, r := range rows {
		lo, hi = math.Min(lo, r.Value), math.Max(hi, r.Value)
	}
	if lo > hi {
		return 0, 1
	}
	if lo == hi {
		d := math.Max(math.Abs(lo)*0.05, 0.5)
		return lo - d, hi + d
	}
	return lo, hi
}

func setXRange(p *plot.Plot, rows []SweepRow) {
	lo, hi := rangeOf(rows)
	pad := 0.03 * (hi - lo)
	p.X.Min, p.X.Max = lo-pad, hi+pad
}

// bifurcationPlot draws the maxima (flows) or sampled values (maps) of each record against
// the parameter.
func bifurcationPlot(param, yLabel string, rows []SweepRow) (*plot.Plot, error) {
	p := sweepPlot("bifurcation diagram", param, yLabel)
	var xy plotter.XYs
	for _, r := range rows {
		for _, v := range r.Points {
			if !math.IsNaN(v) && !math.IsInf(v, 0) {
				xy = append(xy, plotter.XY{X: r.Value, Y: v})
			}
		}
	}
	if err := addOrEmpty(p, xy, figure.Color(6), vg.Points(1), draw.CircleGlyph{}); err != nil {
		return nil, err
	}
	setXRange(p, rows)
	return p, nil
}

// addOrEmpty adds the points, or fixes a unit y range when there are none (gonum/plot needs
// a range to draw axes).
func addOrEmpty(p *plot.Plot, xy plotter.XYs, c color.Color, r vg.Length, shape draw.GlyphDrawer) error {
	if len(xy) == 0 {
		p.Y.Min, p.Y.Max = 0, 1
		return nil
	}
	s, err := dots(xy, c, r, shape)
	if err != nil {
		return err
	}
	p.Add(s)
	return nil
}

// estimatePlot draws one estimate with its interval against the parameter, each point in
// the colour of its record's verdict; zero draws a horizontal rule at 0.
func estimatePlot(title, param, yLabel string, rows []SweepRow, get func(SweepRow) (v, lo, hi float64), zero bool) (*plot.Plot, error) {
	p := sweepPlot(title, param, yLabel)
	any := false
	for _, v := range verdictOrder {
		var xy plotter.XYs
		var bars plotter.XYs
		var errs plotter.YErrors
		for _, r := range rows {
			if r.Regime != v && !(v == "undetermined" && r.Regime == "") {
				continue
			}
			y, lo, hi := get(r)
			if math.IsNaN(y) || math.IsInf(y, 0) {
				continue
			}
			xy = append(xy, plotter.XY{X: r.Value, Y: y})
			if !math.IsNaN(lo) && !math.IsNaN(hi) && lo <= y && y <= hi {
				bars = append(bars, plotter.XY{X: r.Value, Y: y})
				errs = append(errs, struct{ Low, High float64 }{y - lo, hi - y})
			}
		}
		if len(xy) == 0 {
			continue
		}
		any = true
		c := verdictColor(v)
		if len(bars) > 0 {
			eb, err := plotter.NewYErrorBars(struct {
				plotter.XYs
				plotter.YErrors
			}{bars, errs})
			if err != nil {
				return nil, err
			}
			eb.Color = c
			eb.Width = vg.Points(0.8)
			eb.CapWidth = vg.Points(3)
			p.Add(eb)
		}
		s, err := dots(xy, c, vg.Points(2.4), draw.CircleGlyph{})
		if err != nil {
			return nil, err
		}
		p.Add(s)
	}
	if !any {
		p.Y.Min, p.Y.Max = 0, 1
	}
	setXRange(p, rows)
	if zero {
		if p.Y.Min > 0 {
			p.Y.Min = 0
		}
		if p.Y.Max < 0 {
			p.Y.Max = 0
		}
		z, err := plotter.NewLine(plotter.XYs{{X: p.X.Min, Y: 0}, {X: p.X.Max, Y: 0}})
		if err != nil {
			return nil, err
		}
		z.Color = figure.Guide()
		z.Width = vg.Points(1)
		z.Dashes = figure.Dashes()
		p.Add(z)
	}
	return p, nil
}

// linesPlot draws every significant spectral line of each record against the parameter,
// coloured by what the line analysis made of the record's lines.
func linesPlot(param, yLabel string, rows []SweepRow) (*plot.Plot, error) {
	p := sweepPlot("spectral lines", param, yLabel)
	n := 0
	for _, k := range []string{"periodic", "quasiperiodic", "broadband"} {
		var xy plotter.XYs
		for _, r := range rows {
			if r.LineKind != k {
				continue
			}
			for _, f := range r.Frequencies {
				xy = append(xy, plotter.XY{X: r.Value, Y: f})
			}
		}
		if len(xy) == 0 {
			continue
		}
		var shape draw.GlyphDrawer = draw.CircleGlyph{}
		if k == "broadband" {
			shape = draw.CrossGlyph{}
		}
		s, err := dots(xy, verdictColor(k), vg.Points(2), shape)
		if err != nil {
			return nil, err
		}
		p.Add(s)
		n += len(xy)
	}
	if n == 0 {
		p.Y.Min, p.Y.Max = 0, 1
	} else {
		p.Y.Min = 0
	}
	setXRange(p, rows)
	return p, nil
}

// planePlot draws the complexity–entropy plane: statistical complexity Cμ against entropy
// rate hμ, one point per record, labelled by the parameter (Crutchfield & Young 1989,
// "Inferring statistical complexity", Phys. Rev. Lett. 63, 105).
func planePlot(param string, rows []SweepRow) (*plot.Plot, error) {
	p := sweepPlot("complexity–entropy plane", "entropy rate hμ (bits per symbol)", "statistical complexity Cμ (bits)")
	var xy plotter.XYs
	var labels []string
	for _, r := range rows {
		if math.IsNaN(r.EntropyRate) || math.IsNaN(r.Complexity) {
			continue
		}
		xy = append(xy, plotter.XY{X: r.EntropyRate, Y: r.Complexity})
		labels = append(labels, param+" = "+fmtParam(r.Value))
	}
	if len(xy) == 0 {
		p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = 0, 1, 0, 1
		return p, nil
	}
	s, err := dots(xy, figure.Main(), vg.Points(2.6), draw.CircleGlyph{})
	if err != nil {
		return nil, err
	}
	p.Add(s)
	lb, err := plotter.NewLabels(plotter.XYLabels{XYs: xy, Labels: labels})
	if err != nil {
		return nil, err
	}
	for i := range lb.TextStyle {
		lb.TextStyle[i].Font = figure.Font(figure.MinTextSize)
		lb.TextStyle[i].Color = figure.Color(6)
		lb.TextStyle[i].XAlign = draw.XLeft
	}
	lb.Offset = vg.Point{X: vg.Points(4), Y: vg.Points(2)}
	p.Add(lb)
	xmax, ymax := 0.0, 0.0
	for _, q := range xy {
		xmax, ymax = math.Max(xmax, q.X), math.Max(ymax, q.Y)
	}
	// Room on the right for the labels, so that none runs off the plot.
	p.X.Min, p.X.Max = 0, math.Max(xmax*1.3, 0.1)
	p.Y.Min, p.Y.Max = 0, math.Max(ymax*1.1, 0.1)
	return p, nil
}
