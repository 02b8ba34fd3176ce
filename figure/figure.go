// Package figure draws the figures of the commands and of the report page (gonum/plot): the
// local slopes of the correlation sums, the divergence curves, the regime evidence, the
// entropy curves, return maps and delay plots. It has its own package so that the command line
// and the report draw the same figures from the same results.
package figure

import (
	"fmt"
	"image/color"
	"math"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
	"gonum.org/v1/plot/vg/draw"

	"unfold/analysis"
	"unfold/dimension"
	"unfold/regime"
)

// Fractal draws the local slopes of the correlation sums of run.
func Fractal(run *analysis.FractalRun, name string) (*plot.Plot, error) {
	return Slopes(run.R, fmt.Sprintf("%s: local slopes (τ = %d, Theiler %d, %s norm)", name, run.Lag, run.Theiler, run.R.Norm))
}

// Slopes draws the local slopes against r (log axis) for every dimension, with the fitted
// scaling range of each curve drawn thicker.
func Slopes(r *dimension.Result, title string) (*plot.Plot, error) {
	p := plot.New()
	p.Title.Text = title
	p.X.Label.Text = "r (signal units, log scale)"
	p.Y.Label.Text = "d log C / d log r"
	p.X.Scale = plot.LogScale{}
	p.X.Tick.Marker = plot.LogTicks{Prec: -1}
	for i, c := range r.Curves {
		var pts, fitPts plotter.XYs
		for k, s := range c.Slopes {
			if math.IsNaN(s) || math.IsInf(s, 0) {
				continue
			}
			pts = append(pts, plotter.XY{X: r.Radii[k], Y: s})
			if c.Fitted && k >= c.From && k <= c.To {
				fitPts = append(fitPts, plotter.XY{X: r.Radii[k], Y: s})
			}
		}
		if len(pts) < 2 {
			continue
		}
		col := Palette(i)
		l, err := plotter.NewLine(pts)
		if err != nil {
			return nil, err
		}
		l.Color = col
		p.Add(l)
		p.Legend.Add(fmt.Sprintf("m = %d", c.Dim), l)
		if len(fitPts) >= 2 {
			f, err := plotter.NewLine(fitPts)
			if err != nil {
				return nil, err
			}
			f.Color, f.Width = col, vg.Points(3)
			p.Add(f)
		}
	}
	if r.D2 > 0 {
		h := plotter.NewFunction(func(float64) float64 { return r.D2 })
		h.Dashes = []vg.Length{vg.Points(4), vg.Points(3)}
		h.Color = color.Gray{Y: 80}
		p.Add(h)
		p.Legend.Add(fmt.Sprintf("D2 = %.3g", r.D2), h)
	}
	p.Legend.Top, p.Legend.Left = true, true
	p.Y.Min = 0
	return p, nil
}

// Palette returns a distinguishable colour for curve i: the project's palette (Color).
func Palette(i int) color.Color { return Color(i) }

// Lyapunov draws the divergence curves with the fit range shaded and the fitted line.
func Lyapunov(run *analysis.LyapunovRun, name string) (*plot.Plot, error) {
	r := run.R
	p, err := DivergencePlot(r, fmt.Sprintf("%s: divergence (%s, m = %d, τ = %d, Theiler %d)", name, run.Method, r.Dim, r.Lag, r.Theiler), "")
	if err != nil {
		return nil, fmt.Errorf("lyapunov: figure: %w", err)
	}
	return p, nil
}

// Evidence draws the spectrum with its significant lines and the two surrogate tests
// (surrogate values as points, the data as a vertical line).
func Evidence(an *regime.Analysis, name string) ([][]*plot.Plot, error) {
	ev := an.Evidence
	var row []*plot.Plot
	if l := ev.Lines; l != nil {
		p := plot.New()
		p.Title.Text = fmt.Sprintf("%s: spectrum (%s) → %s", name, l.Kind, an.Verdict.Regime)
		p.X.Label.Text = "frequency (cycles per time unit)"
		p.Y.Label.Text = "power density (log)"
		p.Y.Scale = plot.LogScale{}
		p.Y.Tick.Marker = plot.LogTicks{Prec: 1}
		var pts plotter.XYs
		floor := 0.0
		for k, pw := range l.Spectrum.Power {
			if k > 0 && pw > 0 {
				pts = append(pts, plotter.XY{X: l.Spectrum.Freq[k], Y: pw})
				if floor == 0 || pw < floor {
					floor = pw
				}
			}
		}
		if len(pts) > 1 {
			ln, err := plotter.NewLine(pts)
			if err != nil {
				return nil, err
			}
			ln.Color = Palette(0)
			p.Add(ln)
		}
		var pk plotter.XYs
		for _, q := range l.Peaks {
			pk = append(pk, plotter.XY{X: q.Freq, Y: q.Power})
		}
		if len(pk) > 0 {
			sc, err := plotter.NewScatter(pk)
			if err != nil {
				return nil, err
			}
			sc.Color = Palette(1)
			p.Add(sc)
			p.Legend.Add("significant lines", sc)
		}
		p.Legend.Top = true // the spectrum falls to the right: keep the legend off the noise floor
		row = append(row, p)
	}
	for _, t := range []*regime.RankTest{ev.Prediction, ev.Reversal} {
		if t == nil {
			continue
		}
		p := plot.New()
		p.Title.Text = fmt.Sprintf("%s: p = %.3g", t.Name, t.P)
		p.X.Label.Text = t.Name
		p.Y.Label.Text = "surrogate number"
		var pts plotter.XYs
		for i, s := range t.Surrogates {
			pts = append(pts, plotter.XY{X: s, Y: float64(i + 1)})
		}
		sc, err := plotter.NewScatter(pts)
		if err != nil {
			return nil, err
		}
		sc.Color = color.Gray{Y: 90}
		p.Add(sc)
		p.Legend.Add("IAAFT surrogates", sc)
		d, err := plotter.NewLine(plotter.XYs{{X: t.Data, Y: 0}, {X: t.Data, Y: float64(len(t.Surrogates) + 1)}})
		if err != nil {
			return nil, err
		}
		d.Color, d.Width = Palette(1), vg.Points(2)
		p.Add(d)
		p.Legend.Add("data", d)
		p.Legend.Top = true
		// head room above the surrogates so the legend covers no point
		p.Y.Min, p.Y.Max = 0, float64(len(t.Surrogates))*1.3+2
		row = append(row, p)
	}
	return [][]*plot.Plot{row}, nil
}

// Entropy draws H(L) and h(L) side by side.
func Entropy(p analysis.EntropyParams, res analysis.EntropyResult) ([][]*plot.Plot, error) {
	k := float64(len([]rune(p.Alphabet)))
	blue := color.RGBA{R: 0x1f, G: 0x5f, B: 0xa8, A: 0xff}
	grey := color.RGBA{R: 0x80, G: 0x80, B: 0x80, A: 0xff}
	red := color.RGBA{R: 0xc0, G: 0x20, B: 0x20, A: 0xff}
	panel := func(title, ylabel string, ys []float64, supported []bool, ref func(l float64) float64) (*plot.Plot, error) {
		pl := plot.New()
		pl.Title.Text = title
		pl.X.Label.Text = "word length L (symbols)"
		pl.Y.Label.Text = ylabel
		var all, sup, uns plotter.XYs
		for i, y := range ys {
			pt := plotter.XY{X: float64(i + 1), Y: y}
			all = append(all, pt)
			if supported[i] {
				sup = append(sup, pt)
			} else {
				uns = append(uns, pt)
			}
		}
		line, err := plotter.NewLine(all)
		if err != nil {
			return nil, err
		}
		line.Color = blue
		n := float64(len(ys))
		refLine := plotter.NewFunction(ref)
		refLine.XMin, refLine.XMax = 1, n
		refLine.Color, refLine.Dashes = grey, []vg.Length{vg.Points(1), vg.Points(3)}
		pl.Add(refLine, line)
		if len(sup) > 0 {
			sc, err := plotter.NewScatter(sup)
			if err != nil {
				return nil, err
			}
			sc.GlyphStyle = draw.GlyphStyle{Shape: draw.CircleGlyph{}, Radius: vg.Points(3), Color: blue}
			pl.Add(sc)
		}
		if len(uns) > 0 {
			sc, err := plotter.NewScatter(uns)
			if err != nil {
				return nil, err
			}
			sc.GlyphStyle = draw.GlyphStyle{Shape: draw.RingGlyph{}, Radius: vg.Points(3), Color: blue}
			pl.Add(sc)
		}
		if p.RateLength >= 1 {
			lo, hi := 0.0, 0.0
			for _, y := range ys {
				hi = math.Max(hi, y)
			}
			hi = math.Max(hi, ref(n))
			mark, err := plotter.NewLine(plotter.XYs{{X: float64(p.RateLength), Y: lo}, {X: float64(p.RateLength), Y: hi}})
			if err != nil {
				return nil, err
			}
			mark.Color, mark.Dashes = red, []vg.Length{vg.Points(4), vg.Points(2)}
			pl.Add(mark)
			pl.Legend.Add("L* = "+strconv.Itoa(p.RateLength), mark)
		}
		pl.Y.Min = 0
		pl.Legend.Top, pl.Legend.Left = false, false
		return pl, nil
	}
	n := len(res.BlockEntropies)
	if n == 0 || len(res.EntropyRates) != n {
		return nil, fmt.Errorf("no block entropies to draw")
	}
	hb, hr, sup := make([]float64, n), make([]float64, n), make([]bool, n)
	for i, b := range res.BlockEntropies {
		hb[i], hr[i], sup[i] = b.Bits, res.EntropyRates[i].Bits, b.Supported
	}
	lk := math.Log2(k)
	left, err := panel("Block entropy", "H(L) (bits)", hb, sup, func(l float64) float64 { return l * lk })
	if err != nil {
		return nil, err
	}
	right, err := panel(fmt.Sprintf("Entropy rate (h = %.3f bits/symbol)", res.EntropyRate), "h(L) (bits/symbol)", hr, sup,
		func(float64) float64 { return lk })
	if err != nil {
		return nil, err
	}
	return [][]*plot.Plot{{left, right}}, nil
}

// SymbolsMapPoints is the most pairs (x_n, x_{n+1}) drawn in the report's return map; a
// map-like record of 10^5 samples would otherwise put 10^5 circles into the page.
const SymbolsMapPoints = 5000

// Symbols is the return map of run's values (at most SymbolsMapPoints pairs) with every
// cut of the partition drawn as a vertical and a horizontal line; it returns the pairs drawn.
func Symbols(run *analysis.SymbolsRun, title string) (*plot.Plot, int, error) {
	v := run.Values
	if len(v) < 2 {
		return nil, 0, fmt.Errorf("%d values are too few for a return map", len(v))
	}
	v = v[:min(len(v), SymbolsMapPoints+1)]
	p, err := ReturnMap(v, run.ValueName, title)
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

// ReturnMap draws v[n+1] against v[n] with the diagonal.
func ReturnMap(v []float64, name, title string) (*plot.Plot, error) {
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

// DelayPanel draws x(t+lag) against x(t) for at most DelayPanelPoints vectors.
func DelayPanel(x []float64, lag int, title string) (*plot.Plot, error) {
	n := min(len(x)-lag, DelayPanelPoints)
	if n < 1 {
		return nil, fmt.Errorf("denoise: figure: too few samples for lag %d", lag)
	}
	pts := make(plotter.XYs, n)
	for i := range pts {
		pts[i].X, pts[i].Y = x[i], x[i+lag]
	}
	p := plot.New()
	p.Title.Text = title
	p.X.Label.Text = "x(t)"
	p.Y.Label.Text = fmt.Sprintf("x(t + %d·dt)", lag)
	sc, err := plotter.NewScatter(pts)
	if err != nil {
		return nil, fmt.Errorf("denoise: figure: %w", err)
	}
	sc.GlyphStyle.Shape = draw.CircleGlyph{}
	sc.GlyphStyle.Radius = vg.Points(0.6)
	sc.GlyphStyle.Color = color.RGBA{R: 0x1f, G: 0x4e, B: 0x9a, A: 0xff}
	p.Add(sc)
	return p, nil
}

// DelayPanelPoints is the largest number of delay vectors DelayPanel draws.
const DelayPanelPoints = 20000
