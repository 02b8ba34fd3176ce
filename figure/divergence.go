package figure

import (
	"fmt"
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"

	"unfold/lyapunov"
)

// DivergencePlot draws the divergence curves of r (Rosenstein et al. 1993, "A practical method
// for calculating largest Lyapunov exponents from small data sets"; Kantz 1994, "A robust
// method to estimate the maximal Lyapunov exponent of a time series") against the steps
// followed: every curve (Kantz: one per ε, the chosen one emphasised), the fit range shaded,
// and the fitted line over it, with λ in the legend. timeUnit names the unit of r.Dt ("" means
// "time units").
func DivergencePlot(r *lyapunov.Result, title, timeUnit string) (*plot.Plot, error) {
	if r == nil || len(r.Curves) == 0 {
		return nil, fmt.Errorf("figure: divergence: no curve to draw")
	}
	if r.Chosen < 0 || r.Chosen >= len(r.Curves) {
		return nil, fmt.Errorf("figure: divergence: chosen curve %d of %d", r.Chosen, len(r.Curves))
	}
	if timeUnit == "" {
		timeUnit = "time units"
	}
	p := New(title, fmt.Sprintf("steps ahead k (1 step = %s %s)", fmtG(r.Dt), timeUnit), "mean log separation S(k) [nats]")
	lo, hi := math.Inf(1), math.Inf(-1)
	for _, c := range r.Curves {
		for _, v := range c.MeanLog {
			if isFinite(v) {
				lo, hi = math.Min(lo, v), math.Max(hi, v)
			}
		}
	}
	if math.IsInf(lo, 0) {
		return nil, fmt.Errorf("figure: divergence: the curves have no finite point")
	}
	pad := 0.05*(hi-lo) + 1e-9
	lo, hi = lo-pad, hi+pad
	ch := r.Curves[r.Chosen]
	if ch.FitErr == nil {
		if err := Shade(p, float64(r.From), float64(r.To), lo, hi, Faint(Color(5), 0.25), fmt.Sprintf("fit range %d…%d", r.From, r.To)); err != nil {
			return nil, err
		}
	}
	others := color.Gray{Y: 0xa8}
	for e, c := range r.Curves {
		if e == r.Chosen || c.References == 0 {
			continue // the chosen curve is drawn last; a radius without neighbours has no curve
		}
		l, err := curveLine(c.MeanLog)
		if err != nil {
			continue
		}
		l.Color = others
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
	l.Color = Main()
	l.Width = vg.Points(2)
	p.Add(l)
	name := "S(k), " + r.Method.String()
	if r.Method == lyapunov.Kantz {
		name += fmt.Sprintf(", ε = %s (chosen)", fmtG(ch.Eps))
	}
	p.Legend.Add(name, l)
	if ch.FitErr == nil {
		ln := ch.Fit.Line
		fl, err := plotter.NewLine(plotter.XYs{{X: float64(r.From), Y: ln.At(float64(r.From))}, {X: float64(r.To), Y: ln.At(float64(r.To))}})
		if err != nil {
			return nil, fmt.Errorf("figure: divergence: %w", err)
		}
		fl.Color = Mark()
		fl.Width = vg.Points(2)
		fl.Dashes = Dashes()
		p.Add(fl)
		p.Legend.Add(fmt.Sprintf("fit: λ = %s per %s (%s per step)", fmtG(r.Lambda), singular(timeUnit), fmtG(r.LambdaPerSample)), fl)
	}
	p.Y.Min, p.Y.Max = lo, hi
	p.X.Min, p.X.Max = 0, float64(max(r.Horizon, 1))
	return p, nil
}

// curveLine is the line through the finite points of y against its index.
func curveLine(y []float64) (*plotter.Line, error) {
	pts := make(plotter.XYs, 0, len(y))
	for k, v := range y {
		if isFinite(v) {
			pts = append(pts, plotter.XY{X: float64(k), Y: v})
		}
	}
	if len(pts) == 0 {
		return nil, fmt.Errorf("figure: divergence: a curve has no finite point")
	}
	return plotter.NewLine(pts)
}

// fmtG formats v with 4 significant digits.
func fmtG(v float64) string { return fmt.Sprintf("%.4g", v) }

// singular turns "time units" into "time unit" and "seconds" into "second"; symbols such as
// "s" and "ms" stay as they are.
func singular(u string) string {
	if len(u) > 3 && u[len(u)-1] == 's' && u[len(u)-2] != 's' {
		return u[:len(u)-1]
	}
	return u
}
