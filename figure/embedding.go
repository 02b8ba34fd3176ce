package figure

import (
	"fmt"
	"image/color"
	"math"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/palette"
	"gonum.org/v1/plot/palette/moreland"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"

	"unfold/embed"
)

// Record describes the record a figure is drawn from: its title (the file name), the signal
// name and unit, and the sampling interval with its unit, so that every axis states units and
// every lag is given in samples and in time.
type Record struct {
	Title    string  // usually the input file name
	Signal   string  // signal name ("x" when empty)
	Unit     string  // unit of the signal ("" when unknown)
	Dt       float64 // sampling interval (time units; 1 when zero)
	TimeUnit string  // unit of Dt ("time units" when empty)
}

func (f Record) signal() string {
	if f.Signal == "" {
		return "x"
	}
	return f.Signal
}

func (f Record) unitSuffix() string {
	if f.Unit == "" {
		return ""
	}
	return " [" + f.Unit + "]"
}

func (f Record) timeUnit() string {
	if f.TimeUnit == "" {
		return "time units"
	}
	return f.TimeUnit
}

func (f Record) dt() float64 {
	if f.Dt > 0 {
		return f.Dt
	}
	return 1
}

// lagText is "15 samples = 0.15 s".
func (f Record) lagText(lag int) string {
	s := "samples"
	if lag == 1 {
		s = "sample"
	}
	return fmt.Sprintf("%d %s = %s %s", lag, s, strconv.FormatFloat(float64(lag)*f.dt(), 'g', 4, 64), f.timeUnit())
}

// LagPlots returns the two panels of the lag figure: the mutual information in bits against
// the lag, with its standard errors, the bias level and the chosen lag marked; and the
// autocorrelation with its zero and 1/e levels.
func LagPlots(c *embed.LagChoice, f Record) ([][]*plot.Plot, error) {
	if c == nil || c.MI == nil || c.ACF == nil || len(c.MI.Nats) == 0 {
		return nil, fmt.Errorf("figure: lag: no mutual-information curve to draw")
	}
	n := len(c.MI.Nats)
	if len(c.MI.Err) < n {
		return nil, fmt.Errorf("figure: lag: %d standard errors for %d lags", len(c.MI.Err), n)
	}
	lags := make([]float64, n)
	bits := make([]float64, n)
	lo := make([]float64, n)
	hi := make([]float64, n)
	for k := range lags {
		lags[k] = float64(k)
		bits[k] = c.MI.Bits(k)
		lo[k] = (c.MI.Nats[k] - c.MI.Err[k]) / math.Ln2
		hi[k] = (c.MI.Nats[k] + c.MI.Err[k]) / math.Ln2
	}
	xlabel := fmt.Sprintf("lag τ [samples; 1 sample = %s %s]", strconv.FormatFloat(f.dt(), 'g', 4, 64), f.timeUnit())
	est := "equiprobable bins, B = " + strconv.Itoa(c.MI.Bins)
	if c.MI.Estimator == embed.KSG {
		est = fmt.Sprintf("KSG, k = %d, %d points", c.MI.K, c.MI.Points)
	}
	top := New(fmt.Sprintf("%s — mutual information of %s(t) and %s(t+τ) (%s)", f.Title, f.signal(), f.signal(), est),
		"", "mutual information [bits]")
	// Leave out lag 0 (ln B or ψ(N)−ψ(k), off the scale) so the minimum is visible.
	from := min(1, n-1)
	if err := AddCurve(top, lags[from:], hi[from:], Faint(Main(), 0.45), "± 1 standard error", false); err != nil {
		return nil, err
	}
	if err := AddCurve(top, lags[from:], lo[from:], Faint(Main(), 0.45), "", false); err != nil {
		return nil, err
	}
	if err := AddCurve(top, lags[from:], bits[from:], Main(), "mutual information", n <= 80); err != nil {
		return nil, err
	}
	if c.MI.Bias > 0 {
		HLine(top, c.MI.Bias/math.Ln2, Guide(), "independence bias (B−1)²/2N")
	}
	VLine(top, float64(c.Lag), Mark(), "chosen lag "+f.lagText(c.Lag)+" ("+c.Method+")", false)
	padAxis(&top.Y, 0.04)
	top.Y.Min = 0

	bot := New("", xlabel, "autocorrelation r(τ)")
	if err := AddCurve(bot, lags, c.ACF.R, Second(), "autocorrelation", false); err != nil {
		return nil, err
	}
	HLine(bot, 1/math.E, Guide(), "1/e")
	HLine(bot, 0, color.Black, "")
	VLine(bot, float64(c.Lag), Mark(), "", false)
	bot.Y.Min, bot.Y.Max = math.Min(-0.2, minOf(c.ACF.R)), 1.05
	for _, p := range []*plot.Plot{top, bot} {
		p.X.Min, p.X.Max = 0, float64(n-1)
	}
	return [][]*plot.Plot{{top}, {bot}}, nil
}

// DimPlots returns the two panels of the dimension figure: the false-neighbour fraction in
// percent against m with the threshold, and Cao's E1 and E2 against d with the 0.9 level; the
// chosen dimension is marked on both.
func DimPlots(c *embed.DimChoice, f Record) ([][]*plot.Plot, error) {
	if c == nil || (len(c.FNN) == 0 && len(c.Cao) == 0) {
		return nil, fmt.Errorf("figure: dimension: no false-neighbour or Cao curve to draw")
	}
	ms := make([]float64, len(c.FNN))
	fr := make([]float64, len(c.FNN))
	for i, p := range c.FNN {
		ms[i] = float64(p.Dim)
		fr[i] = 100 * p.Fraction
	}
	top := New(fmt.Sprintf("%s — false nearest neighbours of %s, lag %s, Theiler window %d samples", f.Title, f.signal(), f.lagText(c.Lag), c.Theiler),
		"", "false neighbours [% of points]")
	if err := AddCurve(top, ms, fr, Main(), fmt.Sprintf("false fraction (R_tol %g, A_tol %g)", c.RTol, c.ATol), true); err != nil {
		return nil, err
	}
	HLine(top, 100*c.Threshold, Guide(), fmt.Sprintf("threshold %g %%", 100*c.Threshold))
	padAxis(&top.Y, 0.04)
	top.Y.Min = 0
	bot := New("", "embedding dimension m (d for Cao's E1, E2)", "E1(d), E2(d) [ratio, no unit]")
	ds := make([]float64, len(c.Cao))
	e1 := make([]float64, len(c.Cao))
	e2 := make([]float64, len(c.Cao))
	for i, p := range c.Cao {
		ds[i], e1[i], e2[i] = float64(p.Dim), p.E1, p.E2
	}
	if err := AddCurve(bot, ds, e1, Main(), "E1 (saturates at the dimension)", true); err != nil {
		return nil, err
	}
	if err := AddCurve(bot, ds, e2, Second(), "E2 (≈ 1 everywhere for noise)", true); err != nil {
		return nil, err
	}
	HLine(bot, 0.9, Guide(), "E1 = 0.9")
	bot.Y.Min = 0
	bot.Y.Max = math.Max(1.2, maxOf(e2)*1.05)
	if c.Dimension > 0 {
		lbl := fmt.Sprintf("chosen m = %d (%s)", c.Dimension, c.Method)
		VLine(top, float64(c.Dimension), Mark(), lbl, false)
		VLine(bot, float64(c.Dimension), Mark(), "", false)
	}
	for _, p := range []*plot.Plot{top, bot} {
		p.X.Min, p.X.Max = 0.5, float64(c.MaxDim)+0.5
		p.X.Tick.Marker = IntegerTicks{}
	}
	return [][]*plot.Plot{{top}, {bot}}, nil
}

// STPPlot returns the space–time separation plot: one contour per fraction, the distance
// against the time separation, with the Theiler window marked when theiler > 0.
func STPPlot(s *embed.STP, e embed.Embedding, theiler int, f Record) (*plot.Plot, error) {
	if s == nil || len(s.Dt) == 0 || len(s.Dist) < len(s.Fractions) {
		return nil, fmt.Errorf("figure: space–time separation: no contour to draw")
	}
	p := New(fmt.Sprintf("%s — space–time separation, m = %d, lag %s", f.Title, e.Dim, f.lagText(e.Lag)),
		fmt.Sprintf("time separation Δt [samples; 1 sample = %s %s]", strconv.FormatFloat(f.dt(), 'g', 4, 64), f.timeUnit()),
		"distance between delay vectors"+f.unitSuffix())
	dts := make([]float64, len(s.Dt))
	for i, d := range s.Dt {
		dts[i] = float64(d)
	}
	// Each contour is labelled at its right end (a legend of six contours would take half
	// the figure); the title says what the percentages are.
	p.Title.Text += "; each curve: the distance that the given % of pairs fall within"
	for i, fr := range s.Fractions {
		col := Color(i)
		if err := AddCurve(p, dts, s.Dist[i], col, "", false); err != nil {
			return nil, err
		}
		if k := lastFinite(dts, s.Dist[i]); k >= 0 {
			if err := Labels(p, []float64{dts[k]}, []float64{s.Dist[i][k]}, []string{fmt.Sprintf(" %g %%", 100*fr)}, col); err != nil {
				return nil, err
			}
		}
	}
	if theiler > 0 {
		VLine(p, float64(theiler), Guide(), "Theiler window "+f.lagText(theiler), true)
	}
	p.Y.Min = 0
	p.X.Min = 0
	return p, nil
}

// lastFinite is the last index where both xs and ys are finite, -1 when there is none.
func lastFinite(xs, ys []float64) int {
	for k := min(len(xs), len(ys)) - 1; k >= 0; k-- {
		if isFinite(xs[k]) && isFinite(ys[k]) {
			return k
		}
	}
	return -1
}

// StateSpaceOptions choose how the state-space picture is drawn.
type StateSpaceOptions struct {
	// Azimuth and Elevation (degrees) rotate the 3-D view: azimuth about the third axis,
	// elevation above the plane of the first two.
	Azimuth, Elevation float64
	// DensityAbove is the number of vectors above which a density image is drawn instead of
	// points; 0 means 20000.
	DensityAbove int
	// Bins is the number of density cells per axis; 0 means 250.
	Bins int
}

// StateSpacePlots returns the state-space picture of e: the 2-D delay plot x(t+τ) against
// x(t) and, for Dim ≥ 3, an oblique projection of (x(t), x(t+τ), x(t+2τ)) rotated by the
// azimuth and elevation. Up to DensityAbove vectors are drawn as points, more as a density
// image (log of counts per cell, gonum/plot HeatMap).
func StateSpacePlots(e embed.Embedding, f Record, opt StateSpaceOptions) ([][]*plot.Plot, error) {
	if err := e.Validate(); err != nil {
		return nil, err
	}
	if opt.DensityAbove <= 0 {
		opt.DensityAbove = 20000
	}
	if opt.Bins <= 0 {
		opt.Bins = 250
	}
	n := e.Len()
	dense := n > opt.DensityAbove
	sig, u := f.signal(), f.unitSuffix()
	lag := f.lagText(e.Lag)
	flat := embed.Embedding{X: e.X, Lag: e.Lag, Dim: 2}
	if e.Dim == 1 {
		flat.Dim = 2
	}
	xs := make([]float64, flat.Len())
	ys := make([]float64, flat.Len())
	for i := range xs {
		xs[i], ys[i] = flat.At(i, 0), flat.At(i, 1)
	}
	p2 := New(fmt.Sprintf("%s — delay plot, τ = %s", f.Title, lag),
		sig+"(t)"+u, sig+"(t + τ)"+u)
	if err := addCloud(p2, xs, ys, dense, opt.Bins); err != nil {
		return nil, err
	}
	SquareAxes(p2, 0.03)
	row := []*plot.Plot{p2}
	if dense {
		p2.Title.Text += "\ncolour: log10 of the number of vectors per cell (white: none)"
	}
	if e.Dim >= 3 {
		az, el := opt.Azimuth*math.Pi/180, opt.Elevation*math.Pi/180
		px := make([]float64, n)
		py := make([]float64, n)
		for i := 0; i < n; i++ {
			px[i], py[i] = project(e.At(i, 0), e.At(i, 1), e.At(i, 2), az, el)
		}
		p3 := New(fmt.Sprintf("3-D view of (%s(t), %s(t+τ), %s(t+2τ)), m = %d; azimuth %g°, elevation %g°", sig, sig, sig, e.Dim, opt.Azimuth, opt.Elevation),
			"projected horizontal"+u, "projected vertical"+u)
		if err := addCloud(p3, px, py, dense, opt.Bins); err != nil {
			return nil, err
		}
		addAxesTriad(p3, px, py, az, el, sig)
		SquareAxes(p3, 0.03)
		row = append(row, p3)
	}
	return [][]*plot.Plot{row}, nil
}

// project maps (a, b, c) to the screen of an oblique view: rotate by az about the c axis, then
// tilt by el about the screen's horizontal axis; returns (horizontal, vertical).
func project(a, b, c, az, el float64) (float64, float64) {
	h := a*math.Cos(az) - b*math.Sin(az)
	depth := a*math.Sin(az) + b*math.Cos(az)
	v := c*math.Cos(el) - depth*math.Sin(el)
	return h, v
}

// addAxesTriad draws the three coordinate directions as short labelled arrows in the lower
// left corner of the projected cloud.
func addAxesTriad(p *plot.Plot, px, py []float64, az, el float64, sig string) {
	x0, x1 := minOf(px), maxOf(px)
	y0, y1 := minOf(py), maxOf(py)
	size := 0.18 * math.Max(x1-x0, y1-y0)
	ox, oy := x0+0.08*(x1-x0), y0-0.02*(y1-y0)
	names := []string{sig + "(t)", sig + "(t+τ)", sig + "(t+2τ)"}
	dirs := [][3]float64{{1, 0, 0}, {0, 1, 0}, {0, 0, 1}}
	var labels plotter.XYLabels
	for k, d := range dirs {
		hx, hy := project(d[0], d[1], d[2], az, el)
		if math.Hypot(hx, hy) < 0.15 {
			continue // nearly along the line of sight
		}
		xy := plotter.XYs{{X: ox, Y: oy}, {X: ox + size*hx, Y: oy + size*hy}}
		l, err := plotter.NewLine(xy)
		if err != nil {
			continue
		}
		l.Color = Mark()
		l.Width = vg.Points(1.5)
		p.Add(l)
		labels.XYs = append(labels.XYs, plotter.XY{X: ox + 1.3*size*hx, Y: oy + 1.3*size*hy})
		labels.Labels = append(labels.Labels, names[k])
	}
	if len(labels.Labels) > 0 {
		if lb, err := plotter.NewLabels(labels); err == nil {
			for i := range lb.TextStyle {
				lb.TextStyle[i].Color = Mark()
				lb.TextStyle[i].Font = Font(MinTextSize)
			}
			p.Add(lb)
		}
	}
}

// addCloud draws points, or for dense clouds a log-density image.
func addCloud(p *plot.Plot, xs, ys []float64, dense bool, bins int) error {
	if !dense {
		return AddPoints(p, xs, ys, Main(), vg.Points(0.9), "")
	}
	xy := finite(xs, ys)
	if len(xy) == 0 {
		return nil
	}
	g := newDensity(xy, bins)
	cm := palette.Reverse(moreland.BlackBody())
	hm := plotter.NewHeatMap(g, cm.Palette(128))
	hm.NaN = color.Transparent
	hm.Min, hm.Max = g.min, g.max
	hm.Rasterized = true
	p.Add(hm)
	return nil
}

// density is a log-count grid for plotter.HeatMap (empty cells NaN).
type density struct {
	nx, ny         int
	x0, y0, dx, dy float64
	z              []float64
	min, max       float64
}

func newDensity(xy plotter.XYs, bins int) *density {
	x0, x1 := math.Inf(1), math.Inf(-1)
	y0, y1 := math.Inf(1), math.Inf(-1)
	for _, q := range xy {
		x0, x1 = math.Min(x0, q.X), math.Max(x1, q.X)
		y0, y1 = math.Min(y0, q.Y), math.Max(y1, q.Y)
	}
	if x1 == x0 {
		x1 = x0 + 1
	}
	if y1 == y0 {
		y1 = y0 + 1
	}
	g := &density{nx: bins, ny: bins, x0: x0, y0: y0, dx: (x1 - x0) / float64(bins), dy: (y1 - y0) / float64(bins), z: make([]float64, bins*bins)}
	for _, q := range xy {
		c := min(int((q.X-x0)/g.dx), bins-1)
		r := min(int((q.Y-y0)/g.dy), bins-1)
		g.z[r*bins+c]++
	}
	g.min, g.max = math.Inf(1), math.Inf(-1)
	for i, v := range g.z {
		if v == 0 {
			g.z[i] = math.NaN()
			continue
		}
		g.z[i] = math.Log10(v)
		g.min = math.Min(g.min, g.z[i])
		g.max = math.Max(g.max, g.z[i])
	}
	if !(g.max > g.min) {
		g.max = g.min + 1
	}
	return g
}

func (g *density) Dims() (c, r int)   { return g.nx, g.ny }
func (g *density) Z(c, r int) float64 { return g.z[r*g.nx+c] }
func (g *density) X(c int) float64    { return g.x0 + (float64(c)+0.5)*g.dx }
func (g *density) Y(r int) float64    { return g.y0 + (float64(r)+0.5)*g.dy }
