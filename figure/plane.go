package figure

import (
	"fmt"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"

	"unfold/symbolic"
)

// PlaneCurvePoints is the number of entropy steps at which the plane's bounding curves are
// drawn.
const PlaneCurvePoints = 200

// ComplexityPlane draws the complexity–entropy plane of ordinal patterns of the given order
// (Rosso, Larrondo, Martin, Plastino & Fuentes 2007, "Distinguishing noise from chaos", Phys.
// Rev. Lett. 99, 154102): the normalised permutation entropy H on x, the Jensen–Shannon
// statistical complexity C_JS on y, the smallest and largest complexity possible at each
// entropy for order! patterns (Martin, Plastino & Rosso 2006), and the record's point.
func ComplexityPlane(order int, pt symbolic.PlanePoint, title string) (*plot.Plot, error) {
	if order < 2 || order > symbolic.MaxOrder {
		return nil, fmt.Errorf("figure: complexity plane: order %d: want 2 … %d", order, symbolic.MaxOrder)
	}
	if !isFinite(pt.Entropy) || !isFinite(pt.Complexity) {
		return nil, fmt.Errorf("figure: complexity plane: the point (%g, %g) is not finite", pt.Entropy, pt.Complexity)
	}
	n := 1
	for i := 2; i <= order; i++ {
		n *= i
	}
	lower, upper := symbolic.ComplexityCurves(n, PlaneCurvePoints)
	p := New(title, "normalised permutation entropy H", "statistical complexity C_JS")
	xs, ys := make([]float64, len(upper)), make([]float64, len(upper))
	for i, q := range upper {
		xs[i], ys[i] = q.Entropy, q.Complexity
	}
	if err := AddLine(p, xs, ys, Guide(), vg.Points(1.5), "largest complexity"); err != nil {
		return nil, err
	}
	lx, ly := make([]float64, len(lower)), make([]float64, len(lower))
	for i, q := range lower {
		lx[i], ly[i] = q.Entropy, q.Complexity
	}
	if len(lx) > 1 {
		l, err := plotter.NewLine(finite(lx, ly))
		if err != nil {
			return nil, fmt.Errorf("figure: complexity plane: %w", err)
		}
		l.Color, l.Width, l.Dashes = Guide(), vg.Points(1.5), Dashes()
		p.Add(l)
		p.Legend.Add("smallest complexity", l)
	}
	label := "this record: H = " + strconv.FormatFloat(pt.Entropy, 'f', 3, 64) + ", C = " + strconv.FormatFloat(pt.Complexity, 'f', 3, 64)
	if err := AddPoints(p, []float64{pt.Entropy}, []float64{pt.Complexity}, Second(), vg.Points(4.5), label); err != nil {
		return nil, err
	}
	top := max(maxOf(ys), pt.Complexity)
	p.X.Min, p.X.Max = 0, 1
	p.Y.Min, p.Y.Max = 0, top*1.08+1e-3
	padAxis(&p.X, 0.02)
	return p, nil
}
