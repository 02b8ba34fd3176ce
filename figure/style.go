// Package figure draws every figure of unfold (with gonum/plot) in one style: one palette,
// one typeface, one canvas width, light grids, legends outside the data area, ticks without
// spurious decimals and at most eight labels per axis.
//
// The palette is the colour-blind-safe set of Okabe and Ito (2008, "Color Universal Design
// (CUD): how to make figures and presentations that are friendly to colorblind people",
// J*Fly, jfly.uni-koeln.de/color), in an order of the project's own: blue, vermillion, bluish
// green, reddish purple, sky blue, orange, black, yellow.
//
// The package sits above the analysis packages (it may import embed, lyapunov, dimension,
// regime, partition, symbolic, series, spectral); none of them imports it. Nothing here holds
// state: colours, fonts and sizes are constants or functions, and every figure function
// returns plots that Write draws.
package figure

import (
	"image/color"
	"math"
	"regexp"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/font"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"
)

// Canvas sizes. Every report figure is Width wide: the report page shows figures about 6.3 in
// wide (a 46 rem column, printed on A4), so text drawn at MinTextSize on a Width canvas prints
// at 11 × 6.3/6.5 ≈ 10.7 pt, above the 10 pt floor.
const (
	Width        = 6.5 * vg.Inch  // the width of every figure
	Height       = 4.25 * vg.Inch // one row of panels
	RowHeight    = 3.6 * vg.Inch  // per row of a figure with two or more rows of panels
	SquareHeight = 6.5 * vg.Inch  // a figure with one square panel (return maps)
)

// Text sizes at the canvas size (see Width for the printed size).
const (
	MinTextSize   = 11 * vg.Length(1) // points; tick labels, legends and annotations
	LabelTextSize = 11.5 * vg.Length(1)
	TitleTextSize = 12 * vg.Length(1)
)

// HeightFor is the canvas height of a figure with the given number of rows of panels.
func HeightFor(rows int) vg.Length {
	if rows <= 1 {
		return Height
	}
	return vg.Length(rows) * RowHeight
}

// Font is the project's sans-serif typeface (Liberation Sans, from gonum/plot's font cache)
// at the given size.
func Font(size vg.Length) font.Font {
	return font.Font{Typeface: "Liberation", Variant: "Sans", Size: size}
}

// The palette (Okabe & Ito 2008) in the project's order.
var okabeIto = [...]color.RGBA{
	{R: 0x00, G: 0x72, B: 0xb2, A: 0xff}, // blue
	{R: 0xd5, G: 0x5e, B: 0x00, A: 0xff}, // vermillion
	{R: 0x00, G: 0x9e, B: 0x73, A: 0xff}, // bluish green
	{R: 0xcc, G: 0x79, B: 0xa7, A: 0xff}, // reddish purple
	{R: 0x56, G: 0xb4, B: 0xe9, A: 0xff}, // sky blue
	{R: 0xe6, G: 0x9f, B: 0x00, A: 0xff}, // orange
	{R: 0x00, G: 0x00, B: 0x00, A: 0xff}, // black
	{R: 0xf0, G: 0xe4, B: 0x42, A: 0xff}, // yellow (faint on white: last)
}

// Colors returns the palette in the order curves take it: the first colour is the main curve,
// the second the one compared with it, and so on.
func Colors() []color.Color {
	c := make([]color.Color, len(okabeIto))
	for i, p := range okabeIto {
		c[i] = p
	}
	return c
}

// Color is the i-th colour of the palette (cycling).
func Color(i int) color.Color {
	if i < 0 {
		i = -i
	}
	return okabeIto[i%len(okabeIto)]
}

// Roles of colours, the same in every figure.

// Main is the colour of the main curve or cloud (blue).
func Main() color.Color { return okabeIto[0] }

// Second is the colour of the curve compared with the main one (vermillion).
func Second() color.Color { return okabeIto[1] }

// Mark is the colour of a chosen value (a chosen lag, a fitted line): reddish purple.
func Mark() color.Color { return okabeIto[3] }

// InStyle reports whether c may appear in a figure: a colour of the palette, a neutral grey
// (reference lines, grid, text) or a light tint (Faint bands, backgrounds: every channel at
// 0xd0 or more).
func InStyle(c color.Color) bool {
	r, g, b, _ := c.RGBA()
	r, g, b = r>>8, g>>8, b>>8
	if r == g && g == b || r >= 0xd0 && g >= 0xd0 && b >= 0xd0 {
		return true
	}
	for _, p := range okabeIto {
		if uint32(p.R) == r && uint32(p.G) == g && uint32(p.B) == b {
			return true
		}
	}
	return false
}

// OffStyle returns the colours written in an SVG or HTML text (#rrggbb or rgb(r,g,b)) that
// are not InStyle: what a test of the project's palette looks for.
func OffStyle(text string) []string {
	var off []string
	for _, m := range colourText.FindAllStringSubmatch(text, -1) {
		var c color.RGBA
		if m[1] != "" {
			v, _ := strconv.ParseUint(m[1], 16, 32)
			c = color.RGBA{R: uint8(v >> 16), G: uint8(v >> 8), B: uint8(v), A: 0xff}
		} else {
			r, _ := strconv.Atoi(m[2])
			g, _ := strconv.Atoi(m[3])
			b, _ := strconv.Atoi(m[4])
			c = color.RGBA{R: uint8(r), G: uint8(g), B: uint8(b), A: 0xff}
		}
		if !InStyle(c) {
			off = append(off, m[0])
		}
	}
	return off
}

var colourText = regexp.MustCompile(`#([0-9a-fA-F]{6})\b|rgb\((\d+),\s*(\d+),\s*(\d+)\)`)

// Guide is the colour of reference levels and thresholds (mid grey).
func Guide() color.Color { return color.RGBA{R: 0x88, G: 0x88, B: 0x88, A: 0xff} }

// Faint is a light tint of c (mixed with white, weight w of c in 0…1) for bands and shaded
// ranges.
func Faint(c color.Color, w float64) color.Color {
	r, g, b, _ := c.RGBA()
	mix := func(v uint32) uint8 { return uint8(math.Round(w*float64(v>>8) + (1-w)*255)) }
	return color.RGBA{R: mix(r), G: mix(g), B: mix(b), A: 0xff}
}

// GridColor is the colour of the grid lines: light, so that they stay in the background on
// paper.
func GridColor() color.Color { return color.Gray{Y: 0xe2} }

// Grid returns light grid lines at the major ticks.
func Grid() *plotter.Grid {
	g := plotter.NewGrid()
	st := draw.LineStyle{Color: GridColor(), Width: vg.Points(0.6)}
	g.Vertical, g.Horizontal = st, st
	return g
}

// New returns a plot in the project's style: sans-serif title and labels, light grid, the
// project's tick markers. Legends are drawn by Write above the data area.
func New(title, xlabel, ylabel string) *plot.Plot {
	p := plot.New()
	p.Title.Text = title
	p.X.Label.Text = xlabel
	p.Y.Label.Text = ylabel
	Restyle(p)
	p.Add(Grid())
	return p
}

// Restyle applies the project's text style and tick markers to a plot made elsewhere (it adds
// no grid): sans-serif text no smaller than MinTextSize, Ticks on linear axes and LogTicks on
// log axes that use gonum/plot's default markers. Calling it twice changes nothing more.
func Restyle(p *plot.Plot) {
	set := func(f *font.Font, size vg.Length) {
		sz := max(f.Size, size)
		*f = Font(sz)
	}
	set(&p.Title.TextStyle.Font, TitleTextSize)
	p.Title.Padding = max(p.Title.Padding, vg.Points(6))
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		set(&a.Label.TextStyle.Font, LabelTextSize)
		set(&a.Tick.Label.Font, MinTextSize)
		a.Tick.Length = vg.Points(4)
		a.Tick.LineStyle.Color = color.Gray{Y: 0x40}
		a.LineStyle.Color = color.Gray{Y: 0x40}
		switch a.Tick.Marker.(type) {
		case plot.DefaultTicks:
			a.Tick.Marker = Ticks{}
		case plot.LogTicks:
			a.Tick.Marker = LogTicks{}
		}
	}
	set(&p.Legend.TextStyle.Font, MinTextSize)
	p.Legend.ThumbnailWidth = vg.Points(22)
}

// LogAxis puts the axis on a log scale with LogTicks.
func LogAxis(a *plot.Axis) {
	a.Scale = plot.LogScale{}
	a.Tick.Marker = LogTicks{}
}

// Pad widens the plot's current data ranges by the fraction frac of their span on each side
// (multiplicatively on log axes), so that no point sits on the frame. Call it after the data
// are added and before fixing any limit by hand.
func Pad(p *plot.Plot, frac float64) {
	for _, a := range []*plot.Axis{&p.X, &p.Y} {
		padAxis(a, frac)
	}
}

func padAxis(a *plot.Axis, frac float64) {
	lo, hi := a.Min, a.Max
	if math.IsNaN(lo) || math.IsNaN(hi) || math.IsInf(lo, 0) || math.IsInf(hi, 0) || lo > hi {
		return
	}
	if _, log := a.Scale.(plot.LogScale); log {
		if lo <= 0 || hi <= 0 {
			return
		}
		l0, l1 := math.Log10(lo), math.Log10(hi)
		d := frac * (l1 - l0)
		if d == 0 {
			d = 0.1
		}
		a.Min, a.Max = math.Pow(10, l0-d), math.Pow(10, l1+d)
		return
	}
	d := frac * (hi - lo)
	if d == 0 {
		d = math.Max(math.Abs(lo)*0.05, 0.5)
	}
	a.Min, a.Max = lo-d, hi+d
}

// SquareAxes gives both axes the same range, the union of the current ranges padded by frac on
// each side, for pictures whose axes measure the same quantity (a return map x_{n+1} against
// x_n, a delay plot). Write draws a plot whose axes have equal ranges with a square data area.
func SquareAxes(p *plot.Plot, frac float64) {
	lo, hi := math.Min(p.X.Min, p.Y.Min), math.Max(p.X.Max, p.Y.Max)
	if math.IsNaN(lo) || math.IsNaN(hi) || math.IsInf(lo, 0) || math.IsInf(hi, 0) {
		return
	}
	p.X.Min, p.X.Max = lo, hi
	padAxis(&p.X, frac)
	p.Y.Min, p.Y.Max = p.X.Min, p.X.Max
}

// isSquare reports whether the plot asks for equal scales (same linear range on both axes).
func isSquare(p *plot.Plot) bool {
	_, lx := p.X.Scale.(plot.LinearScale)
	_, ly := p.Y.Scale.(plot.LinearScale)
	return lx && ly && p.X.Min == p.Y.Min && p.X.Max == p.Y.Max && p.X.Max > p.X.Min
}

// SizeFor is the canvas of a grid of plots: Width wide; HeightFor(rows) high, or, when every
// plot has equal axes (SquareAxes), high enough for square panels (at most SquareHeight for a
// single panel).
func SizeFor(rows [][]*plot.Plot) (w, h vg.Length) {
	if len(rows) == 0 || len(rows[0]) == 0 {
		return Width, Height
	}
	square := true
	for _, r := range rows {
		for _, p := range r {
			if p != nil && !isSquare(p) {
				square = false
			}
		}
	}
	if !square {
		return Width, HeightFor(len(rows))
	}
	h = vg.Length(len(rows)) * (Width/vg.Length(len(rows[0])) + 0.4*vg.Inch)
	if len(rows) == 1 && len(rows[0]) == 1 {
		h = min(h, SquareHeight)
	}
	return Width, h
}
