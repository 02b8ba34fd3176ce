package figure

import (
	"math"

	"bytes"
	"fmt"
	"image/color"
	"io"
	"strings"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/text"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
	"gonum.org/v1/plot/vg/vgimg"
	"gonum.org/v1/plot/vg/vgsvg"
)

// PNGDPI is the resolution of PNG figures (a Width figure is 975 pixels wide).
const PNGDPI = 150

// fontFamilies is the CSS font list written into SVG text, so that a browser without
// Liberation Sans falls back to a sans-serif face of the same metrics, never to a serif one.
const fontFamilies = `'Liberation Sans',Arial,Helvetica,sans-serif`

// Write draws the plots as a grid (rows of equal length; a nil plot leaves its tile empty) on
// a width × height canvas and writes it to w as "svg" or "png" (PNGDPI). Every plot is drawn
// in the project's style (Restyle is applied and stays); titles wider than their panel are
// broken at spaces; linear axes with the default Ticks get fewer labels on narrow panels;
// each plot's legend is drawn above its data area, below its title, never over the data; a
// plot whose two axes have the same linear range (SquareAxes) gets a square data area. Apart
// from Restyle, the plots are given back as they came (title, legend, ranges, tick markers).
// The SVG has width and height attributes and a viewBox, so that it scales with CSS
// (width: 100%; height: auto), and names a sans-serif fallback after Liberation Sans.
// Drawing errors (gonum/plot panics on, for example, a non-positive value on a log axis) are
// returned as errors.
func Write(w io.Writer, format string, width, height vg.Length, rows [][]*plot.Plot) (err error) {
	if len(rows) == 0 || len(rows[0]) == 0 {
		return fmt.Errorf("figure: nothing to draw")
	}
	for i, r := range rows {
		if len(r) != len(rows[0]) {
			return fmt.Errorf("figure: row %d has %d panels, row 1 has %d (rows must be of equal length)", i+1, len(r), len(rows[0]))
		}
	}
	if !(width > 0 && height > 0) {
		return fmt.Errorf("figure: canvas %g × %g pt: both sides must be positive", width.Points(), height.Points())
	}
	format = strings.ToLower(format)
	var c vg.CanvasWriterTo
	var svg *vgsvg.Canvas
	switch format {
	case "png":
		c = vgimg.PngCanvas{Canvas: vgimg.NewWith(vgimg.UseWH(width, height), vgimg.UseDPI(PNGDPI), vgimg.UseBackgroundColor(color.White))}
	case "svg":
		svg = vgsvg.New(width, height)
		c = svg
	default:
		return fmt.Errorf("figure: unknown format %q (want png or svg)", format)
	}
	defer func() {
		if r := recover(); r != nil {
			err = fmt.Errorf("figure: cannot draw: %v", r)
		}
	}()
	for _, r := range rows {
		for _, p := range r {
			if p == nil {
				continue
			}
			// The tick labelling of gonum/plot does not end on a range whose width overflows
			// (values near ±1.8e308); refuse it instead. An axis without data has Min > Max.
			for _, ax := range []*plot.Axis{&p.X, &p.Y} {
				if w := ax.Max - ax.Min; ax.Min <= ax.Max && (math.IsInf(w, 0) || math.IsNaN(w)) {
					return fmt.Errorf("figure: an axis from %g to %g spans more than a float64 can hold; rescale the record (for example --standardize)", ax.Min, ax.Max)
				}
			}
		}
	}
	states := make([]*saved, 0, len(rows)*len(rows[0]))
	defer func() {
		for _, s := range states {
			s.restore()
		}
	}()
	tiles := draw.Tiles{Rows: len(rows), Cols: len(rows[0]), PadTop: vg.Millimeter * 2, PadBottom: vg.Millimeter * 2,
		PadLeft: vg.Millimeter * 2, PadRight: vg.Millimeter * 4, PadX: vg.Millimeter * 7, PadY: vg.Millimeter * 5}
	tileW := (width - tiles.PadLeft - tiles.PadRight - vg.Length(tiles.Cols-1)*tiles.PadX) / vg.Length(tiles.Cols)
	tileH := (height - tiles.PadTop - tiles.PadBottom - vg.Length(tiles.Rows-1)*tiles.PadY) / vg.Length(tiles.Rows)
	tile := draw.Canvas{Rectangle: vg.Rectangle{Max: vg.Point{X: tileW, Y: tileH}}}
	legends := make([][]legendSpot, len(rows))
	for i, r := range rows {
		legends[i] = make([]legendSpot, len(r))
		for j, p := range r {
			if p == nil {
				continue
			}
			s := save(p)
			states = append(states, s)
			Restyle(p)
			p.Title.Text = wrap(p.Title.TextStyle, p.Title.Text, 0.85*tileW) // Align may shift the tile: keep a margin
			legends[i][j] = liftLegend(p)
			thinTicks(p, p.DataCanvas(tile))
			centreLogLabels(p)
		}
	}
	dc := draw.New(c)
	canvases := plot.Align(rows, tiles, dc)
	for i, r := range rows {
		for j, p := range r {
			if p == nil {
				continue
			}
			tc := canvases[i][j]
			if isSquare(p) {
				tc = squareTile(p, tc)
			}
			p.Draw(tc)
			legends[i][j].draw(p.DataCanvas(tc))
		}
	}
	if svg == nil {
		if _, err := c.WriteTo(w); err != nil {
			return fmt.Errorf("figure: %w", err)
		}
		return nil
	}
	var buf bytes.Buffer
	if _, err := svg.WriteTo(&buf); err != nil {
		return fmt.Errorf("figure: %w", err)
	}
	out := bytes.ReplaceAll(buf.Bytes(), []byte("font-family:Liberation Sans;"), []byte("font-family:"+fontFamilies+";"))
	if _, err := w.Write(out); err != nil {
		return fmt.Errorf("figure: %w", err)
	}
	return nil
}

// saved is what Write changes on a plot, to put back afterwards.
type saved struct {
	p          *plot.Plot
	title      string
	padding    vg.Length
	legend     plot.Legend
	xt, yt     plot.Ticker
	xs, ys     plot.Normalizer
	xMin, xMax float64
	yMin, yMax float64
}

func save(p *plot.Plot) *saved {
	return &saved{p: p, title: p.Title.Text, padding: p.Title.Padding, legend: p.Legend,
		xt: p.X.Tick.Marker, yt: p.Y.Tick.Marker, xs: p.X.Scale, ys: p.Y.Scale, xMin: p.X.Min, xMax: p.X.Max, yMin: p.Y.Min, yMax: p.Y.Max}
}

func (s *saved) restore() {
	p := s.p
	p.Title.Text, p.Title.Padding, p.Legend = s.title, s.padding, s.legend
	p.X.Tick.Marker, p.Y.Tick.Marker = s.xt, s.yt
	p.X.Scale, p.Y.Scale = s.xs, s.ys
	p.X.Min, p.X.Max, p.Y.Min, p.Y.Max = s.xMin, s.xMax, s.yMin, s.yMax
}

// legendSpot is a plot's legend taken out of its data area, to be drawn above it.
type legendSpot struct {
	l      *plot.Legend
	height vg.Length
}

const legendGap = 3 * vg.Length(1) // points between the legend and the data area

// liftLegend takes the legend out of p (so that Draw does not put it over the data) and
// reserves its height between the title and the data area.
func liftLegend(p *plot.Plot) legendSpot {
	l := p.Legend
	r := l.Rectangle(draw.Canvas{})
	h := r.Max.Y - r.Min.Y
	if h <= 0 {
		return legendSpot{}
	}
	l.Top, l.Left, l.XOffs, l.YOffs = true, true, 0, 0
	p.Legend = plot.NewLegend()
	if p.Title.Text == "" {
		p.Title.Text = " "
	}
	p.Title.Padding += h + 2*legendGap
	return legendSpot{l: &l, height: h}
}

// draw puts the legend in the strip just above the data canvas.
func (s legendSpot) draw(data draw.Canvas) {
	if s.l == nil {
		return
	}
	c := data
	c.Min.Y = data.Max.Y + legendGap
	c.Max.Y = c.Min.Y + s.height
	s.l.Draw(c)
}

// thinTicks gives narrow axes fewer labels: about one label per 0.75 in of data area.
func thinTicks(p *plot.Plot, data draw.Canvas) {
	w, h := data.Max.X-data.Min.X, data.Max.Y-data.Min.Y
	if t, ok := p.X.Tick.Marker.(Ticks); ok && t.N == 0 {
		p.X.Tick.Marker = Ticks{N: min(7, max(3, int(w/(0.75*vg.Inch))))}
	}
	if t, ok := p.Y.Tick.Marker.(Ticks); ok && t.N == 0 {
		p.Y.Tick.Marker = Ticks{N: min(7, max(3, int(h/(0.4*vg.Inch))))}
	}
}

// wrap breaks text at spaces so that no line is wider than width (explicit line breaks kept).
func wrap(st text.Style, s string, width vg.Length) string {
	if s == "" || st.Width(s) <= width {
		return s
	}
	var out []string
	for _, line := range strings.Split(s, "\n") {
		words := strings.Fields(line)
		cur := ""
		for _, w := range words {
			next := w
			if cur != "" {
				next = cur + " " + w
			}
			if cur != "" && st.Width(next) > width {
				out = append(out, cur)
				cur = w
				continue
			}
			cur = next
		}
		out = append(out, cur)
	}
	return strings.Join(out, "\n")
}

// layoutLogScale is plot.LogScale except at the arithmetic midpoint of the range, where it
// gives 0.5. gonum/plot (v0.17) reserves room for a centred axis label around
// Norm((min+max)/2), which on a log axis lies near the end of the axis, so a label drawn at
// the centre shrank the data area; data never sit exactly at that midpoint of a padded range.
type layoutLogScale struct{}

// Normalize implements plot.Normalizer.
func (layoutLogScale) Normalize(lo, hi, x float64) float64 {
	if x == 0.5*(lo+hi) {
		return 0.5
	}
	return plot.LogScale{}.Normalize(lo, hi, x)
}

// centreLogLabels puts layoutLogScale on the log axes of p that carry a centred label.
func centreLogLabels(p *plot.Plot) {
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		if _, ok := a.Scale.(plot.LogScale); ok && a.Label.Text != "" && a.Label.Position == draw.PosCenter {
			a.Scale = layoutLogScale{}
		}
	}
}

// squareTile narrows (or shortens) the tile so that the plot's data area is square.
func squareTile(p *plot.Plot, c draw.Canvas) draw.Canvas {
	d := p.DataCanvas(c)
	w, h := d.Max.X-d.Min.X, d.Max.Y-d.Min.Y
	switch {
	case w > h:
		cut := (w - h) / 2
		c.Min.X += cut
		c.Max.X -= cut
	case h > w:
		c.Min.Y += h - w
	}
	return c
}
