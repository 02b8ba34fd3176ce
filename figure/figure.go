// Package figure draws the figures of the commands and of the report page (gonum/plot): the
// local slopes of the correlation sums, the divergence curves, the regime evidence, the
// entropy curves, return maps and delay plots. It has its own package so that the command line
// and the report draw the same figures from the same results.
package figure

import (
	"fmt"
	"image/color"
	"math"
	"slices"
	"strconv"
	"strings"

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
	if run == nil || run.R == nil {
		return nil, fmt.Errorf("figure: fractal: no correlation sums to draw")
	}
	return Slopes(run.R, fmt.Sprintf("%s: local slopes (τ = %d, Theiler %d, %s norm)", name, run.Lag, run.Theiler, run.R.Norm))
}

// Slopes draws the local slopes d log C / d log r (Grassberger & Procaccia 1983, "Measuring
// the strangeness of strange attractors") against r on a log axis, one curve per embedding
// dimension, with the fitted scaling range of each curve drawn thicker and D2 dashed. The
// curves are named at their right ends ("m = 3", nudged apart where they meet) rather than in
// a legend of one entry per dimension.
func Slopes(r *dimension.Result, title string) (*plot.Plot, error) {
	if r == nil {
		return nil, fmt.Errorf("figure: slopes: no correlation sums to draw")
	}
	p := New(title, "radius r [signal units]", "local slope d log C / d log r")
	LogAxis(&p.X)
	var endX, endY []float64
	var endText []string
	var endCol []int
	drawn := 0
	for i, c := range r.Curves {
		var xs, ys, fx, fy []float64
		for k, s := range c.Slopes {
			if k >= len(r.Radii) || !isFinite(s) || !(r.Radii[k] > 0) || !isFinite(r.Radii[k]) {
				continue
			}
			xs, ys = append(xs, r.Radii[k]), append(ys, s)
			if c.Fitted && k >= c.From && k <= c.To {
				fx, fy = append(fx, r.Radii[k]), append(fy, s)
			}
		}
		if len(xs) < 2 {
			continue
		}
		col := curveColor(i)
		if err := AddLine(p, xs, ys, col, vg.Points(1.2), ""); err != nil {
			return nil, err
		}
		if len(fx) >= 2 {
			legend := ""
			if drawn == 0 {
				legend = "scaling range (thick)"
			}
			if err := AddLine(p, fx, fy, col, vg.Points(3.2), legend); err != nil {
				return nil, err
			}
			drawn++
		}
		endX, endY = append(endX, xs[len(xs)-1]), append(endY, ys[len(ys)-1])
		endText, endCol = append(endText, " m = "+strconv.Itoa(c.Dim)), append(endCol, i)
	}
	if len(endX) == 0 {
		return nil, fmt.Errorf("figure: slopes: no curve has two finite local slopes")
	}
	if r.D2 > 0 && isFinite(r.D2) {
		HLine(p, r.D2, Guide(), "D2 = "+strconv.FormatFloat(r.D2, 'g', 4, 64))
	}
	lo, hi := 0.0, 0.0
	for _, c := range r.Curves {
		for _, s := range c.Slopes {
			if isFinite(s) {
				lo, hi = math.Min(lo, s), math.Max(hi, s)
			}
		}
	}
	hi = math.Max(hi, r.D2)
	if !(hi > lo) {
		hi = lo + 1
	}
	// Name the curves at their right ends, nudged apart by at least one text line.
	ys := spread(endY, 0.065*(hi-lo))
	for k := range endX {
		if err := Labels(p, endX[k:k+1], ys[k:k+1], endText[k:k+1], curveColor(endCol[k])); err != nil {
			return nil, err
		}
	}
	p.Y.Min, p.Y.Max = lo, math.Max(hi, maxOf(ys))+0.04*(hi-lo)
	padAxis(&p.X, 0.02)
	return p, nil
}

// curveColor is the colour of the i-th of many curves: the palette without its last colour
// (yellow is faint on white).
func curveColor(i int) color.Color { return Color(i % (len(okabeIto) - 1)) }

// spread returns the values y moved apart so that any two differ by at least gap, each moved
// as little as it can while keeping their order (labels at the ends of curves that meet).
func spread(y []float64, gap float64) []float64 {
	idx := make([]int, len(y))
	for i := range idx {
		idx[i] = i
	}
	slices.SortStableFunc(idx, func(a, b int) int {
		switch {
		case y[a] < y[b]:
			return -1
		case y[a] > y[b]:
			return 1
		}
		return 0
	})
	out := slices.Clone(y)
	for k := 1; k < len(idx); k++ {
		if prev := out[idx[k-1]]; out[idx[k]] < prev+gap {
			out[idx[k]] = prev + gap
		}
	}
	return out
}

// Palette returns the colour of curve i: the project's palette (Color).
func Palette(i int) color.Color { return Color(i) }

// Lyapunov draws the divergence curves with the fit range shaded and the fitted line; timeUnit
// is the record's time unit ("" means "time units").
func Lyapunov(run *analysis.LyapunovRun, name, timeUnit string) (*plot.Plot, error) {
	if run == nil || run.R == nil {
		return nil, fmt.Errorf("lyapunov: figure: no divergence curve to draw")
	}
	r := run.R
	p, err := DivergencePlot(r, fmt.Sprintf("%s: divergence (%s, m = %d, τ = %d, Theiler %d)", name, run.Method, r.Dim, r.Lag, r.Theiler), timeUnit)
	if err != nil {
		return nil, fmt.Errorf("lyapunov: figure: %w", err)
	}
	return p, nil
}

// Evidence draws the spectrum with its significant lines (Welch 1967) and the two surrogate
// tests (Theiler et al. 1992, "Testing for nonlinearity in time series: the method of
// surrogate data"): the surrogates' values as points, the data's as a vertical line. timeUnit
// is the record's time unit ("" means "time units").
func Evidence(an *regime.Analysis, name, timeUnit string) ([][]*plot.Plot, error) {
	if an == nil || an.Evidence == nil {
		return nil, fmt.Errorf("figure: evidence: nothing to draw")
	}
	ev := an.Evidence
	var row []*plot.Plot
	if l := ev.Lines; l != nil && l.Spectrum != nil {
		verdict := ""
		if an.Verdict != nil {
			verdict = " → " + an.Verdict.Regime
		}
		p := New(fmt.Sprintf("%s: spectrum (%s)%s", name, l.Kind, verdict), "frequency [cycles per "+singular(orTimeUnits(timeUnit))+"]", "power density")
		LogAxis(&p.Y)
		var fs, ps []float64
		for k, pw := range l.Spectrum.Power {
			if k > 0 && k < len(l.Spectrum.Freq) && pw > 0 {
				fs, ps = append(fs, l.Spectrum.Freq[k]), append(ps, pw)
			}
		}
		if len(fs) > 1 {
			if err := AddLine(p, fs, ps, Main(), vg.Points(1.2), "spectrum"); err != nil {
				return nil, err
			}
			var qf, qp []float64
			for _, q := range l.Peaks {
				if q.Power > 0 {
					qf, qp = append(qf, q.Freq), append(qp, q.Power)
				}
			}
			if err := AddPoints(p, qf, qp, Second(), vg.Points(3), "significant lines"); err != nil {
				return nil, err
			}
			Pad(p, 0.03)
			row = append(row, p)
		}
	}
	if p, err := rankPanel([]*regime.RankTest{ev.Prediction, ev.Reversal}); err != nil {
		return nil, err
	} else if p != nil {
		row = append(row, p)
	}
	if len(row) == 0 {
		return nil, fmt.Errorf("figure: evidence: no spectrum and no surrogate test to draw")
	}
	return [][]*plot.Plot{row}, nil
}

// rankPanel draws the surrogate tests in one panel, one row per test: each surrogate's
// statistic as a point and the data's as a bar, in standard deviations of the surrogates from
// their mean, so that tests on different scales share the axis; the p-values are in the title.
func rankPanel(tests []*regime.RankTest) (*plot.Plot, error) {
	var use []*regime.RankTest
	for _, t := range tests {
		if t != nil && len(t.Surrogates) > 0 {
			use = append(use, t)
		}
	}
	if len(use) == 0 {
		return nil, nil
	}
	title := "surrogate tests:"
	var ticks []plot.Tick
	p := New("", "statistic − surrogate mean [surrogate SD]", "")
	for i, t := range use {
		mean, sd, n := 0.0, 0.0, 0
		for _, s := range t.Surrogates {
			if isFinite(s) {
				mean += s
				n++
			}
		}
		if n > 0 {
			mean /= float64(n)
		}
		for _, s := range t.Surrogates {
			if isFinite(s) {
				sd += (s - mean) * (s - mean)
			}
		}
		if n > 1 {
			sd = math.Sqrt(sd / float64(n-1))
		}
		if !(sd > 0) {
			sd = 1
		}
		y := float64(len(use) - i)
		xs, ys := make([]float64, len(t.Surrogates)), make([]float64, len(t.Surrogates))
		for k, s := range t.Surrogates {
			xs[k], ys[k] = (s-mean)/sd, y+0.25*(float64(k%5)-2)/2
		}
		legend, dl := "", ""
		if i == 0 {
			legend, dl = fmt.Sprintf("%d IAAFT surrogates", len(xs)), "data"
		}
		if err := AddPoints(p, xs, ys, Main(), vg.Points(2.5), legend); err != nil {
			return nil, err
		}
		d := (t.Data - mean) / sd
		if err := AddLine(p, []float64{d, d}, []float64{y - 0.35, y + 0.35}, Second(), vg.Points(3), dl); err != nil {
			return nil, err
		}
		name := shortTest(t.Name)
		ticks = append(ticks, plot.Tick{Value: y, Label: name})
		title += fmt.Sprintf(" %s p = %.2g", name, t.P)
		if i+1 < len(use) {
			title += ","
		}
	}
	p.Title.Text = title
	Pad(p, 0.06)
	p.Y.Min, p.Y.Max = 0.4, float64(len(use))+0.6
	p.Y.Tick.Marker = plot.ConstantTicks(ticks)
	return p, nil
}

// shortTest is the short name of a surrogate test for an axis ("prediction", "reversal").
func shortTest(name string) string {
	switch {
	case strings.Contains(name, "prediction"):
		return "prediction"
	case strings.Contains(name, "reversal"):
		return "reversal"
	}
	return name
}

// Entropy draws the block entropies H(L) and the entropy-rate estimates h(L) side by side
// (Grassberger 1988, "Finite sample corrections to entropy and dimension estimates"), with
// the values of random symbols (L·log2 K and log2 K) dotted and the length L* the rate is
// read at marked; lengths the data do not support are hollow.
func Entropy(p analysis.EntropyParams, res analysis.EntropyResult) ([][]*plot.Plot, error) {
	n := len(res.BlockEntropies)
	if n == 0 || len(res.EntropyRates) != n {
		return nil, fmt.Errorf("figure: entropy: no block entropies to draw")
	}
	k := float64(len([]rune(p.Alphabet)))
	lk := 0.0
	if k > 1 {
		lk = math.Log2(k)
	}
	panel := func(title, ylabel string, ys []float64, supported []bool, ref func(l float64) float64, refName string) (*plot.Plot, error) {
		pl := New(title, "word length L [symbols]", ylabel)
		ls := make([]float64, len(ys))
		var sx, sy, ux, uy []float64
		for i, y := range ys {
			ls[i] = float64(i + 1)
			if supported[i] {
				sx, sy = append(sx, ls[i]), append(sy, y)
			} else {
				ux, uy = append(ux, ls[i]), append(uy, y)
			}
		}
		if lk > 0 {
			rx, ry := []float64{1, float64(len(ys))}, []float64{ref(1), ref(float64(len(ys)))}
			rl, err := plotter.NewLine(finite(rx, ry))
			if err == nil {
				rl.Color, rl.Width, rl.Dashes = Guide(), vg.Points(1.2), []vg.Length{vg.Points(1.5), vg.Points(3)}
				pl.Add(rl)
				pl.Legend.Add(refName, rl)
			}
		}
		if err := AddLine(pl, ls, ys, Main(), vg.Points(1.5), ""); err != nil {
			return nil, err
		}
		if err := AddPoints(pl, sx, sy, Main(), vg.Points(3), "supported"); err != nil {
			return nil, err
		}
		if len(ux) > 0 {
			sc, err := plotter.NewScatter(finite(ux, uy))
			if err == nil {
				sc.GlyphStyle = draw.GlyphStyle{Shape: draw.RingGlyph{}, Radius: vg.Points(3), Color: Main()}
				pl.Add(sc)
				pl.Legend.Add("not supported", sc)
			}
		}
		if p.RateLength >= 1 {
			VLine(pl, float64(p.RateLength), Mark(), "L* = "+strconv.Itoa(p.RateLength), true)
		}
		pl.X.Tick.Marker = IntegerTicks{}
		pl.X.Min, pl.X.Max = 0.5, float64(len(ys))+0.5
		hi := math.Max(maxOf(ys), ref(float64(len(ys))))
		if !isFinite(hi) || hi <= 0 {
			hi = 1
		}
		pl.Y.Min, pl.Y.Max = 0, hi*1.05
		return pl, nil
	}
	hb, hr, sup := make([]float64, n), make([]float64, n), make([]bool, n)
	for i, b := range res.BlockEntropies {
		hb[i], hr[i], sup[i] = b.Bits, res.EntropyRates[i].Bits, b.Supported
	}
	left, err := panel("Block entropy", "H(L) [bits]", hb, sup, func(l float64) float64 { return l * lk }, "random symbols: L·log2 K")
	if err != nil {
		return nil, err
	}
	right, err := panel(fmt.Sprintf("Entropy rate (h = %.3f bits/symbol)", res.EntropyRate), "h(L) [bits/symbol]", hr, sup,
		func(float64) float64 { return lk }, "random symbols: log2 K")
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
	if run == nil {
		return nil, 0, fmt.Errorf("figure: symbols: nothing to draw")
	}
	v := run.Values
	if len(v) < 2 {
		return nil, 0, fmt.Errorf("%d values are too few for a return map", len(v))
	}
	v = v[:min(len(v), SymbolsMapPoints+1)]
	p, err := ReturnMap(v, run.ValueName, title)
	if err != nil {
		return nil, 0, err
	}
	if run.Part != nil {
		for i, c := range run.Part.Thresholds {
			legend := ""
			if i == 0 {
				legend = "partition cut"
			}
			VLine(p, c, Mark(), legend, false)
			p.Add(&marker{y: c, c: Mark()})
		}
	}
	return p, len(v) - 1, nil
}

// ReturnMap draws v[n+1] against v[n] with the diagonal, on equal axes (SquareAxes) that hold
// every point.
func ReturnMap(v []float64, name, title string) (*plot.Plot, error) {
	if len(v) < 2 {
		return nil, fmt.Errorf("return map: %d values are too few (want at least 2)", len(v))
	}
	if name == "" {
		name = "x"
	}
	p := New("Return map — "+title, name+"(n)", name+"(n+1)")
	xs, ys := v[:len(v)-1], v[1:]
	pts := finite(xs, ys)
	if len(pts) == 0 {
		return nil, fmt.Errorf("return map: no pair of finite values")
	}
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, q := range pts {
		lo, hi = math.Min(lo, math.Min(q.X, q.Y)), math.Max(hi, math.Max(q.X, q.Y))
	}
	if err := addDiagonal(p, lo, hi); err != nil {
		return nil, err
	}
	if err := AddPoints(p, xs, ys, Main(), vg.Points(1.4), ""); err != nil {
		return nil, fmt.Errorf("return map: %w", err)
	}
	SquareAxes(p, 0.04)
	return p, nil
}

// addDiagonal draws the dashed diagonal y = x from lo to hi.
func addDiagonal(p *plot.Plot, lo, hi float64) error {
	d, err := plotter.NewLine(plotter.XYs{{X: lo, Y: lo}, {X: hi, Y: hi}})
	if err != nil {
		return fmt.Errorf("figure: %w", err)
	}
	d.Color, d.Width, d.Dashes = Guide(), vg.Points(1), Dashes()
	p.Add(d)
	p.Legend.Add("diagonal", d)
	return nil
}

// DelayPanel draws x(t+lag) against x(t) for at most DelayPanelPoints vectors, on equal axes.
func DelayPanel(x []float64, lag int, title string) (*plot.Plot, error) {
	if lag < 1 {
		return nil, fmt.Errorf("denoise: figure: lag %d: want at least 1", lag)
	}
	n := min(len(x)-lag, DelayPanelPoints)
	if n < 1 {
		return nil, fmt.Errorf("denoise: figure: too few samples for lag %d", lag)
	}
	p := New(title, "x(t)", fmt.Sprintf("x(t + %d·dt)", lag))
	if len(finite(x[:n], x[lag:lag+n])) == 0 {
		return nil, fmt.Errorf("denoise: figure: no pair of finite values")
	}
	if err := AddPoints(p, x[:n], x[lag:lag+n], Main(), vg.Points(0.8), ""); err != nil {
		return nil, fmt.Errorf("denoise: figure: %w", err)
	}
	SquareAxes(p, 0.04)
	return p, nil
}

// DelayPanelPoints is the largest number of delay vectors DelayPanel draws.
const DelayPanelPoints = 20000

// orTimeUnits is u, or "time units" when the record states no time unit.
func orTimeUnits(u string) string {
	if u == "" {
		return "time units"
	}
	return u
}
