package report

import (
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// The sweep page's colours: the colour-blind-safe palette of M. Okabe & K. Ito (2008),
// "Color Universal Design (CUD): how to make figures and presentations that are friendly to
// colorblind people" (J*FLY), in an order of our own.
var (
	okBlack     = color.RGBA{0x00, 0x00, 0x00, 0xff}
	okOrange    = color.RGBA{0xe6, 0x9f, 0x00, 0xff}
	okGreen     = color.RGBA{0x00, 0x9e, 0x73, 0xff}
	okBlue      = color.RGBA{0x00, 0x72, 0xb2, 0xff}
	okVermilion = color.RGBA{0xd5, 0x5e, 0x00, 0xff}
	okPurple    = color.RGBA{0xcc, 0x79, 0xa7, 0xff}
	okGrey      = color.RGBA{0x9a, 0x9a, 0x9a, 0xff} // rules and zero lines only
)

// verdictOrder lists the verdicts (and the broadband line kind) in the order they are drawn;
// verdictColor gives each verdict (and each line kind) its colour on every figure of the page.
var verdictOrder = []string{"periodic", "quasiperiodic", "chaotic", "stochastic", "undetermined", "broadband"}

func verdictColor(v string) color.RGBA {
	switch v {
	case "periodic":
		return okBlue
	case "quasiperiodic":
		return okGreen
	case "chaotic", "broadband":
		return okVermilion
	case "stochastic":
		return okPurple
	case "undetermined":
		return okOrange
	}
	return okBlack
}

func hexColor(c color.RGBA) string {
	const d = "0123456789abcdef"
	b := []byte{'#', d[c.R>>4], d[c.R&15], d[c.G>>4], d[c.G&15], d[c.B>>4], d[c.B&15]}
	return string(b)
}

// sweepPlot is a plot in the page's style: sans-serif text of 10–12 pt, a light grid.
func sweepPlot(title, x, y string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.X.Label.Text = x
	p.Y.Label.Text = y
	p.Title.TextStyle.Font.Size = vg.Points(12)
	p.X.Label.TextStyle.Font.Size = vg.Points(11)
	p.Y.Label.TextStyle.Font.Size = vg.Points(11)
	p.X.Tick.Label.Font.Size = vg.Points(10)
	p.Y.Tick.Label.Font.Size = vg.Points(10)
	p.Legend.TextStyle.Font.Size = vg.Points(10)
	for _, f := range []*text.Style{&p.Title.TextStyle, &p.X.Label.TextStyle, &p.Y.Label.TextStyle,
		&p.X.Tick.Label, &p.Y.Tick.Label, &p.Legend.TextStyle} {
		f.Font.Variant = "Sans"
	}
	g := plotter.NewGrid()
	g.Vertical.Color = color.RGBA{0xe4, 0xe4, 0xe4, 0xff}
	g.Horizontal.Color = g.Vertical.Color
	p.Add(g)
	return p
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
	if err := addOrEmpty(p, xy, okBlack, vg.Points(0.9), draw.CircleGlyph{}); err != nil {
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
		z.Color = okGrey
		z.Width = vg.Points(1)
		z.Dashes = []vg.Length{vg.Points(4), vg.Points(3)}
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
	s, err := dots(xy, okBlue, vg.Points(2.6), draw.CircleGlyph{})
	if err != nil {
		return nil, err
	}
	p.Add(s)
	lb, err := plotter.NewLabels(plotter.XYLabels{XYs: xy, Labels: labels})
	if err != nil {
		return nil, err
	}
	for i := range lb.TextStyle {
		lb.TextStyle[i].Font.Size = vg.Points(10)
		lb.TextStyle[i].Font.Variant = "Sans"
		lb.TextStyle[i].Color = okBlack
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
