package figure

import (
	"fmt"
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Dashes is the dash pattern of reference lines.
func Dashes() []vg.Length { return []vg.Length{vg.Points(4), vg.Points(3)} }

// finite keeps the pairs whose both coordinates are finite.
func finite(xs, ys []float64) plotter.XYs {
	n := min(len(xs), len(ys))
	xy := make(plotter.XYs, 0, n)
	for i := 0; i < n; i++ {
		if isFinite(xs[i]) && isFinite(ys[i]) {
			xy = append(xy, plotter.XY{X: xs[i], Y: ys[i]})
		}
	}
	return xy
}

func isFinite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }

// AddCurve draws ys against xs as a line of colour c (and a dot at each point when points is
// true), leaving out non-finite pairs, and names it in the legend when legend is not empty.
// A curve with no finite point adds nothing.
func AddCurve(p *plot.Plot, xs, ys []float64, c color.Color, legend string, points bool) error {
	xy := finite(xs, ys)
	if len(xy) == 0 {
		return nil
	}
	l, err := plotter.NewLine(xy)
	if err != nil {
		return fmt.Errorf("figure: %w", err)
	}
	l.Color = c
	l.Width = vg.Points(1.5)
	p.Add(l)
	if points {
		s, err := plotter.NewScatter(xy)
		if err != nil {
			return fmt.Errorf("figure: %w", err)
		}
		s.Color = c
		s.Radius = vg.Points(2.2)
		s.Shape = draw.CircleGlyph{}
		p.Add(s)
	}
	if legend != "" {
		p.Legend.Add(legend, l)
	}
	return nil
}

// AddLine draws ys against xs as a line of colour c and the given width, leaving out
// non-finite pairs, and names it in the legend when legend is not empty.
func AddLine(p *plot.Plot, xs, ys []float64, c color.Color, width vg.Length, legend string) error {
	xy := finite(xs, ys)
	if len(xy) == 0 {
		return nil
	}
	l, err := plotter.NewLine(xy)
	if err != nil {
		return fmt.Errorf("figure: %w", err)
	}
	l.Color = c
	l.Width = width
	p.Add(l)
	if legend != "" {
		p.Legend.Add(legend, l)
	}
	return nil
}

// AddPoints draws the finite pairs (xs, ys) as dots of the given radius and colour.
func AddPoints(p *plot.Plot, xs, ys []float64, c color.Color, radius vg.Length, legend string) error {
	xy := finite(xs, ys)
	if len(xy) == 0 {
		return nil
	}
	s, err := plotter.NewScatter(xy)
	if err != nil {
		return fmt.Errorf("figure: %w", err)
	}
	s.Color = c
	s.Radius = radius
	s.Shape = draw.CircleGlyph{}
	p.Add(s)
	if legend != "" {
		p.Legend.Add(legend, s)
	}
	return nil
}

// VLine marks x = at across the plot's full height (dashed when asked) and names it in the
// legend when legend is not empty.
func VLine(p *plot.Plot, at float64, c color.Color, legend string, dashed bool) {
	if !isFinite(at) {
		return
	}
	p.Add(&marker{x: at, vertical: true, c: c, dashed: dashed})
	if legend != "" {
		l := &plotter.Line{LineStyle: draw.LineStyle{Color: c, Width: vg.Points(1.5)}}
		if dashed {
			l.Dashes = Dashes()
		}
		p.Legend.Add(legend, l)
	}
}

// HLine marks y = at across the plot's full width, dashed, and names it in the legend when
// legend is not empty.
func HLine(p *plot.Plot, at float64, c color.Color, legend string) {
	if !isFinite(at) {
		return
	}
	p.Add(&marker{y: at, c: c, dashed: true})
	if legend != "" {
		p.Legend.Add(legend, &plotter.Line{LineStyle: draw.LineStyle{Color: c, Width: vg.Points(1), Dashes: Dashes()}})
	}
}

// marker is a full-width or full-height line drawn in data coordinates.
type marker struct {
	x, y     float64
	vertical bool
	c        color.Color
	dashed   bool
}

// Plot implements plot.Plotter.
func (m *marker) Plot(c draw.Canvas, p *plot.Plot) {
	tx, ty := p.Transforms(&c)
	st := draw.LineStyle{Color: m.c, Width: vg.Points(1.3)}
	if m.dashed {
		st.Dashes = Dashes()
		st.Width = vg.Points(1)
	}
	if m.vertical {
		x := tx(m.x)
		c.StrokeLine2(st, x, c.Min.Y, x, c.Max.Y)
	} else {
		y := ty(m.y)
		c.StrokeLine2(st, c.Min.X, y, c.Max.X, y)
	}
}

// DataRange makes the marker count in the axis range only along its own axis.
func (m *marker) DataRange() (xmin, xmax, ymin, ymax float64) {
	if m.vertical {
		return m.x, m.x, math.Inf(1), math.Inf(-1)
	}
	return math.Inf(1), math.Inf(-1), m.y, m.y
}

// Shade fills the band x0 ≤ x ≤ x1 over the y range [y0, y1] with a light colour and names it
// in the legend when legend is not empty (a fit range, a scaling region).
func Shade(p *plot.Plot, x0, x1, y0, y1 float64, c color.Color, legend string) error {
	if !(isFinite(x0) && isFinite(x1) && isFinite(y0) && isFinite(y1)) {
		return nil
	}
	poly, err := plotter.NewPolygon(plotter.XYs{{X: x0, Y: y0}, {X: x1, Y: y0}, {X: x1, Y: y1}, {X: x0, Y: y1}})
	if err != nil {
		return fmt.Errorf("figure: %w", err)
	}
	poly.Color = c
	poly.LineStyle.Width = 0
	p.Add(poly)
	if legend != "" {
		p.Legend.Add(legend, poly)
	}
	return nil
}

// Labels writes short texts at data points in colour c, at MinTextSize in the project's face,
// starting at the point and centred on it vertically.
func Labels(p *plot.Plot, xs, ys []float64, texts []string, c color.Color) error {
	n := min(len(xs), len(ys), len(texts))
	var l plotter.XYLabels
	for i := 0; i < n; i++ {
		if isFinite(xs[i]) && isFinite(ys[i]) {
			l.XYs = append(l.XYs, plotter.XY{X: xs[i], Y: ys[i]})
			l.Labels = append(l.Labels, texts[i])
		}
	}
	if len(l.Labels) == 0 {
		return nil
	}
	lb, err := plotter.NewLabels(l)
	if err != nil {
		return fmt.Errorf("figure: %w", err)
	}
	for i := range lb.TextStyle {
		lb.TextStyle[i].Color = c
		lb.TextStyle[i].Font = Font(MinTextSize)
		lb.TextStyle[i].YAlign = draw.YCenter
	}
	p.Add(lb)
	return nil
}

func minOf(v []float64) float64 {
	m := math.Inf(1)
	for _, x := range v {
		if x < m {
			m = x
		}
	}
	return m
}

func maxOf(v []float64) float64 {
	m := math.Inf(-1)
	for _, x := range v {
		if x > m {
			m = x
		}
	}
	return m
}
