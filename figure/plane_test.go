package figure

import (
	"math"
	"testing"

	"gonum.org/v1/plot"

	"unfold/symbolic"
)

// TestComplexityPlane draws the plane for the logistic map at r = 4, order 5: a valid SVG in
// the project's style, and the record's point between the smallest and largest complexity at
// its entropy (Rosso et al. 2007, Fig. 1: chaotic maps lie near the upper curve; a point
// outside the curves is impossible by construction, Martin, Plastino & Rosso 2006).
func TestComplexityPlane(t *testing.T) {
	x := logistic(20000, 0.1234)
	pe, err := symbolic.PermutationEntropy(x, 5, 1)
	if err != nil {
		t.Fatal(err)
	}
	pt := pe.Complexity()
	cmin, cmax := symbolic.ComplexityBounds(120, pt.Entropy)
	if !(pt.Complexity >= cmin-1e-9 && pt.Complexity <= cmax+1e-9) {
		t.Errorf("logistic r = 4: C = %.4f outside [%.4f, %.4f] at H = %.4f", pt.Complexity, cmin, cmax, pt.Entropy)
	}
	// near the upper curve (Rosso et al. 2007, Fig. 1): nearer to it than to the lower one
	if cmax-pt.Complexity > pt.Complexity-cmin {
		t.Errorf("logistic r = 4: C = %.4f nearer the lower curve %.4f than the upper %.4f", pt.Complexity, cmin, cmax)
	}
	p, err := ComplexityPlane(5, pt, "logistic r = 4")
	if err != nil {
		t.Fatal(err)
	}
	if pt.Complexity >= p.Y.Max || pt.Entropy <= p.X.Min || pt.Entropy >= p.X.Max {
		t.Errorf("the point (%g, %g) is not inside the axes", pt.Entropy, pt.Complexity)
	}
	writeChecked(t, "plane", [][]*plot.Plot{{p}})

	for _, bad := range []struct {
		order int
		pt    symbolic.PlanePoint
	}{{1, pt}, {symbolic.MaxOrder + 1, pt}, {4, symbolic.PlanePoint{Entropy: math.NaN()}}} {
		if _, err := ComplexityPlane(bad.order, bad.pt, "t"); err == nil {
			t.Errorf("order %d, point %v: want an error", bad.order, bad.pt)
		}
	}
	// white noise sits at H ≈ 1, C ≈ 0 (Rosso et al. 2007): a figure, not an error
	p, err = ComplexityPlane(3, symbolic.PlanePoint{Entropy: 1, Complexity: 0}, "noise")
	draw2(t, "plane/noise", [][]*plot.Plot{{p}}, err)
}
