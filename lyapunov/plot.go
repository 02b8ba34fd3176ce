package lyapunov

import (
	"fmt"
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"
)

// DivergencePlot draws the divergence curves of r against the steps followed: every curve
// (Kantz: one per ε, the chosen one emphasised), the fit range shaded, and the fitted line
// over it, with λ in the title. It belongs to this package's noun so that the command line and
// the report draw the same figure.
func DivergencePlot(r *Result, title string) (*plot.Plot, error) {
	if len(r.Curves) == 0 {
		return nil, fmt.Errorf("lyapunov: no curve to draw")
	}
	p := plot.New()
	p.Title.Text = title
	p.X.Label.Text = fmt.Sprintf("steps ahead k (1 step = %s time units)", fmtG(r.Dt))
	p.Y.Label.Text = "mean log separation S(k) (nats)"
	p.Add(plotter.NewGrid())
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, c := range r.Curves {
		for _, v := range c.MeanLog {
			if !math.IsNaN(v) {
				lo, hi = math.Min(lo, v), math.Max(hi, v)
			}
		}
	}
	if math.IsInf(lo, 0) {
		return nil, fmt.Errorf("lyapunov: the curves have no finite point")
	}
	pad := 0.05*(hi-lo) + 1e-9
	lo, hi = lo-pad, hi+pad
	ch := r.Curves[r.Chosen]
	if ch.FitErr == nil {
		a, b := float64(r.From), float64(r.To)
		shade, err := plotter.NewPolygon(plotter.XYs{{X: a, Y: lo}, {X: b, Y: lo}, {X: b, Y: hi}, {X: a, Y: hi}})
		if err != nil {
			return nil, err
		}
		shade.Color = color.RGBA{R: 0xfd, G: 0xe6, B: 0xc8, A: 0xff}
		shade.LineStyle.Width = 0
		p.Add(shade)
		p.Legend.Add(fmt.Sprintf("fit range %d…%d", r.From, r.To), shade)
	}
	grey := color.RGBA{R: 0x9a, G: 0x9a, B: 0x9a, A: 0xff}
	blue := color.RGBA{R: 0x1f, G: 0x5f, B: 0xa8, A: 0xff}
	for e, c := range r.Curves {
		if e == r.Chosen || c.References == 0 {
			continue // the chosen curve is drawn last; a radius without neighbours has no curve
		}
		l, err := curveLine(c.MeanLog)
		if err != nil {
			continue
		}
		l.Color = grey
		l.Width = vg.Points(1)
		p.Add(l)
		if e == 0 || e == len(r.Curves)-1 {
			p.Legend.Add(fmt.Sprintf("ε = %s", fmtG(c.Eps)), l)
		}
	}
	l, err := curveLine(ch.MeanLog)
	if err != nil {
		return nil, err
	}
	l.Color = blue
	l.Width = vg.Points(2)
	p.Add(l)
	name := "S(k), " + r.Method.String()
	if r.Method == Kantz {
		name += fmt.Sprintf(", ε = %s (chosen)", fmtG(ch.Eps))
	}
	p.Legend.Add(name, l)
	if ch.FitErr == nil {
		ln := ch.Fit.Line
		fl, err := plotter.NewLine(plotter.XYs{{X: float64(r.From), Y: ln.At(float64(r.From))}, {X: float64(r.To), Y: ln.At(float64(r.To))}})
		if err != nil {
			return nil, err
		}
		fl.Color = color.RGBA{R: 0xb2, G: 0x18, B: 0x2b, A: 0xff}
		fl.Width = vg.Points(1.5)
		fl.Dashes = []vg.Length{vg.Points(5), vg.Points(3)}
		p.Add(fl)
		p.Legend.Add(fmt.Sprintf("fit: λ = %s per time unit (%s per step)", fmtG(r.Lambda), fmtG(r.LambdaPerSample)), fl)
	}
	p.Y.Min, p.Y.Max = lo, hi
	p.X.Min, p.X.Max = 0, float64(r.Horizon)
	p.Legend.Top = false
	p.Legend.Left = false
	return p, nil
}

// curveLine is the line through the finite points of y against its index.
func curveLine(y []float64) (*plotter.Line, error) {
	pts := make(plotter.XYs, 0, len(y))
	for k, v := range y {
		if !math.IsNaN(v) {
			pts = append(pts, plotter.XY{X: float64(k), Y: v})
		}
	}
	if len(pts) == 0 {
		return nil, fmt.Errorf("lyapunov: a curve has no finite point")
	}
	return plotter.NewLine(pts)
}

// fmtG formats v with 4 significant digits.
func fmtG(v float64) string { return fmt.Sprintf("%.4g", v) }
