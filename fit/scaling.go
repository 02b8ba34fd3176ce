package fit

import (
	"errors"
	"fmt"
	"math"
	"slices"
)

// ErrNoRange reports a curve with no linear range under the stated criterion. ScalingRange
// wraps it with the reason; test for it with errors.Is.
var ErrNoRange = errors.New("no linear range")

// RangeOptions tune ScalingRange. The zero value selects every default.
type RangeOptions struct {
	// Window is the number of consecutive points in each local slope (≥ 2; default 3).
	Window int
	// RelTol and AbsTol set the tolerance: a local slope s is stable against the median m of
	// the local slopes of its range when |s − m| ≤ RelTol·|m| + AbsTol. Defaults: RelTol 0.2,
	// AbsTol 0. Curves whose slope may be near zero (a plateau that is an answer) need AbsTol > 0.
	RelTol, AbsTol float64
	// MinPoints is the fewest points a range may have (default max(Window+2, 5)).
	MinPoints int
	// From and To restrict the search to the points [From, To); To = 0 means all points.
	From, To int
	// FlatFraction and FlatRise define a plateau (see ScalingRange): a range whose median local
	// slope is below FlatFraction times the steepest range's in magnitude, or whose fitted line
	// rises (or falls) by less than FlatRise in y over the range. Defaults: FlatFraction 0.1,
	// FlatRise 0 (no rise test).
	FlatFraction, FlatRise float64
}

func (o RangeOptions) withDefaults(n int) (RangeOptions, error) {
	if o.Window == 0 {
		o.Window = 3
	}
	if o.RelTol == 0 {
		o.RelTol = 0.2
	}
	if o.MinPoints == 0 {
		o.MinPoints = max(o.Window+2, 5)
	}
	if o.To == 0 {
		o.To = n
	}
	if o.FlatFraction == 0 {
		o.FlatFraction = 0.1
	}
	switch {
	case o.Window < 2:
		return o, fmt.Errorf("fit: local-slope window %d must be at least 2 points", o.Window)
	case o.FlatFraction < 0 || o.FlatRise < 0 || math.IsNaN(o.FlatFraction) || math.IsNaN(o.FlatRise):
		return o, fmt.Errorf("fit: plateau thresholds %g (fraction) and %g (rise) must be non-negative", o.FlatFraction, o.FlatRise)
	case o.RelTol < 0 || o.AbsTol < 0 || math.IsNaN(o.RelTol) || math.IsNaN(o.AbsTol):
		return o, fmt.Errorf("fit: tolerances %g (relative) and %g (absolute) must be non-negative", o.RelTol, o.AbsTol)
	case o.MinPoints < o.Window:
		return o, fmt.Errorf("fit: minimum range of %d points is shorter than the %d-point window", o.MinPoints, o.Window)
	case o.From < 0 || o.To > n || o.From >= o.To:
		return o, fmt.Errorf("fit: search range [%d, %d) is not inside the %d points of the curve", o.From, o.To, n)
	}
	return o, nil
}

// Range is a linear range of a curve found by ScalingRange: the points From..To (both
// included), the least-squares line through them, and the local slopes that qualified it.
type Range struct {
	From, To int     // first and last point of the range (inclusive indices into x and y)
	Line     Line    // least-squares line over x[From:To+1], y[From:To+1]
	Median   float64 // median of the local slopes inside the range
	Spread   float64 // largest |local slope − Median| inside the range
	// Plateau is true when every stable range of the curve was a plateau (step 4 of
	// ScalingRange) and this is the longest of them.
	Plateau bool
}

// LocalSlopes returns the least-squares slope of every window of w consecutive points:
// element k is the slope over points k … k+w−1, so there are len(x)−w+1 of them. A window
// holding a non-finite value (e.g. the log of a zero count) has slope NaN.
func LocalSlopes(x, y []float64, w int) []float64 {
	if w < 2 || len(x) != len(y) || len(x) < w {
		return nil
	}
	s := make([]float64, len(x)-w+1)
	for k := range s {
		s[k] = slope(x, y, k, k+w)
	}
	return s
}

// ScalingRange finds the linear range of the curve (x[i], y[i]) and fits a line over it.
// x must be strictly increasing; y values that are not finite (log 0) are allowed but never lie
// inside a range.
//
// The criterion, stated once:
//
//  1. Local slopes. s_k is the least-squares slope over the Window points k … k+Window−1.
//  2. Stable range. The points a … b (at least MinPoints of them) form a stable range when every
//     local slope whose window lies inside a … b is finite and within the tolerance of the
//     median m of those slopes: |s_k − m| ≤ RelTol·|m| + AbsTol.
//  3. Maximal ranges. From every start a, the range grows one point at a time while it stays
//     stable; the end where it stops is b(a). A range contained in an earlier one is dropped.
//  4. Plateaus. A maximal range whose median local slope is smaller in magnitude than
//     FlatFraction times the largest |median| of all maximal ranges, or whose fitted line rises
//     or falls by less than FlatRise over the range, is a plateau (a saturated stretch).
//  5. Choice: the longest range that is not a plateau (ties go to the earlier start); when every
//     range is a plateau, the longest plateau.
//
// Step 4 keeps the answer on the rising part of a curve that rises and then saturates (a
// divergence curve, a correlation sum), even when the plateau is longer; a flat curve, whose
// flatness is the answer (a zero exponent), still gives its flat range. Step 5 prefers the long
// linear stretch to a short curved transient before it: a transient is straight only over a
// few points, so it either fails MinPoints or loses on length. A range ends at a knee: the
// first window that straddles the knee has a slope between the two regimes and breaks the
// tolerance.
//
// The cost is O(n²) slope insertions for n points (fine for curves of up to a few thousand).
//
// When no range qualifies, the error wraps ErrNoRange and says why (the longest stable run that
// was found and the tolerance it failed).
func ScalingRange(x, y []float64, opt RangeOptions) (Range, error) {
	if len(x) != len(y) {
		return Range{}, fmt.Errorf("fit: %d x values but %d y values", len(x), len(y))
	}
	o, err := opt.withDefaults(len(x))
	if err != nil {
		return Range{}, err
	}
	for i := o.From + 1; i < o.To; i++ {
		if !(x[i] > x[i-1]) || math.IsInf(x[i], 0) {
			return Range{}, fmt.Errorf("fit: x must be finite and strictly increasing (x[%d] = %g after x[%d] = %g)", i, x[i], i-1, x[i-1])
		}
	}
	if o.To-o.From < o.MinPoints {
		return Range{}, fmt.Errorf("fit: %w: the curve has %d points in the search range, fewer than the %d a range needs", ErrNoRange, o.To-o.From, o.MinPoints)
	}
	w := o.Window
	// s[k] is the local slope over points o.From+k … o.From+k+w−1.
	s := LocalSlopes(x[o.From:o.To], y[o.From:o.To], w)
	nw := len(s)

	type cand struct{ a, b int } // point indices relative to o.From, inclusive
	var cands []cand
	sorted := make([]float64, 0, nw)
	lastEnd := -1
	bestRun := 0 // longest stable run seen, in points (for the error message)
	for a := 0; a < nw; a++ {
		sorted = sorted[:0]
		b := -1
		for k := a; k < nw; k++ {
			v := s[k]
			if math.IsNaN(v) {
				break
			}
			pos, _ := slices.BinarySearch(sorted, v)
			sorted = slices.Insert(sorted, pos, v)
			if !stable(sorted, o.RelTol, o.AbsTol) {
				break
			}
			b = k + w - 1
		}
		if b < 0 {
			continue
		}
		bestRun = max(bestRun, b-a+1)
		if b <= lastEnd { // contained in the range from an earlier start
			continue
		}
		lastEnd = b
		if b-a+1 >= o.MinPoints {
			cands = append(cands, cand{a, b})
		}
	}
	if len(cands) == 0 {
		return Range{}, fmt.Errorf("fit: %w: no run of at least %d points has local slopes (%d-point windows) within %g·|median| + %g of their median; the longest such run has %d points",
			ErrNoRange, o.MinPoints, w, o.RelTol, o.AbsTol, bestRun)
	}
	// Median slope and rise of every candidate, for the plateau test.
	meds := make([]float64, len(cands))
	steep := 0.0
	for c, cd := range cands {
		win := slices.Clone(s[cd.a : cd.b-w+2])
		slices.Sort(win)
		meds[c] = median(win)
		steep = math.Max(steep, math.Abs(meds[c]))
	}
	flat := func(c int) bool {
		cd := cands[c]
		if math.Abs(meds[c]) < o.FlatFraction*steep {
			return true
		}
		if o.FlatRise > 0 {
			l, err := LeastSquares(x[o.From+cd.a:o.From+cd.b+1], y[o.From+cd.a:o.From+cd.b+1])
			if err != nil || math.Abs(l.Slope*(x[o.From+cd.b]-x[o.From+cd.a])) < o.FlatRise {
				return true
			}
		}
		return false
	}
	bestIdx, bestFlat := -1, true
	for c, cd := range cands {
		f := flat(c)
		switch {
		case bestIdx < 0, bestFlat && !f:
			bestIdx, bestFlat = c, f
		case f == bestFlat && cd.b-cd.a > cands[bestIdx].b-cands[bestIdx].a:
			bestIdx = c
		}
	}
	best := cands[bestIdx]
	from, to := best.a+o.From, best.b+o.From
	line, err := LeastSquares(x[from:to+1], y[from:to+1])
	if err != nil {
		return Range{}, err
	}
	win := slices.Clone(s[best.a : best.b-w+2])
	slices.Sort(win)
	med := median(win)
	return Range{From: from, To: to, Line: line, Median: med,
		Spread: math.Max(win[len(win)-1]-med, med-win[0]), Plateau: bestFlat}, nil
}

// stable reports whether every value of the sorted slice lies within relTol·|m| + absTol of its
// median m.
func stable(sorted []float64, relTol, absTol float64) bool {
	m := median(sorted)
	tol := relTol*math.Abs(m) + absTol
	return sorted[len(sorted)-1]-m <= tol && m-sorted[0] <= tol
}

// median of a sorted, non-empty slice.
func median(sorted []float64) float64 {
	n := len(sorted)
	if n%2 == 1 {
		return sorted[n/2]
	}
	return 0.5 * (sorted[n/2-1] + sorted[n/2])
}
