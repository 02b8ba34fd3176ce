package partition

import (
	"errors"
	"fmt"
	"math"
	"slices"
)

// CriticalOptions set the local regression of the return map. The zero value works.
type CriticalOptions struct {
	// Bandwidth is the half-width of the tricube kernel as a fraction of the range of the
	// values; 0 chooses 0.04 (widened where fewer than 20 points fall inside).
	Bandwidth float64
	// Grid is the number of evaluation points of the fitted map; 0 chooses 400.
	Grid int
}

// Critical is the critical-point partition of a return map with the fit it came from.
type Critical struct {
	Partition
	// Cut is the location of the extremum of the fitted map x_{n+1} = f(x_n).
	Cut float64
	// Extremum is "maximum" or "minimum".
	Extremum string
	// Bandwidth is the kernel half-width used, in signal units.
	Bandwidth float64
	// GridX and GridY are the fitted map on the evaluation grid.
	GridX, GridY []float64
}

// ErrMonotone is wrapped when the fitted return map has no interior extremum.
var ErrMonotone = errors.New("the return map has no interior extremum")

// CriticalPoint fits the return map x_{n+1} = f(x_n) of x by local quadratic regression with a
// tricube kernel (Cleveland 1979), finds the interior extremum of the fit that departs most
// from the chord between the fitted end points, refines it to the vertex of the local
// quadratic there, and returns the binary partition cut at it: for a unimodal map this is the
// critical point, the boundary of its generating partition.
func CriticalPoint(x []float64, opt CriticalOptions) (*Critical, error) {
	n := len(x) - 1
	if n < 30 {
		return nil, fmt.Errorf("critical point: %d return-map points are too few (need 30)", n)
	}
	pts := make([][2]float64, n)
	for i := 0; i < n; i++ {
		if math.IsNaN(x[i]) || math.IsInf(x[i], 0) {
			return nil, fmt.Errorf("critical point: value %d is %v", i, x[i])
		}
		pts[i] = [2]float64{x[i], x[i+1]}
	}
	slices.SortFunc(pts, func(a, b [2]float64) int {
		switch {
		case a[0] < b[0]:
			return -1
		case a[0] > b[0]:
			return 1
		}
		return 0
	})
	xs := make([]float64, n)
	for i := range pts {
		xs[i] = pts[i][0]
	}
	lo, hi := xs[0], xs[n-1]
	rng := hi - lo
	if !(rng > 0) {
		return nil, fmt.Errorf("critical point: the values are constant")
	}
	bw := opt.Bandwidth
	if bw <= 0 {
		bw = 0.04
	}
	h0 := bw * rng
	grid := opt.Grid
	if grid <= 0 {
		grid = 400
	}
	fitAt := func(g float64) (a, b, c float64, h float64, ok bool) {
		h = h0
		for tries := 0; tries < 8; tries++ {
			i0, _ := slices.BinarySearch(xs, g-h)
			i1, _ := slices.BinarySearch(xs, g+h)
			if i1-i0 >= 20 {
				a, b, c, ok = localQuadratic(pts[i0:i1], g, h)
				if ok {
					return a, b, c, h, true
				}
			}
			h *= 1.5
		}
		return 0, 0, 0, h, false
	}
	res := &Critical{GridX: make([]float64, grid), GridY: make([]float64, grid)}
	valid := make([]bool, grid)
	for j := 0; j < grid; j++ {
		g := lo + rng*float64(j)/float64(grid-1)
		a, _, _, _, ok := fitAt(g)
		res.GridX[j], res.GridY[j], valid[j] = g, a, ok
	}
	// interior extrema, away from the outer 2 % of the range
	y0, y1 := res.GridY[0], res.GridY[grid-1]
	best, bestDev := -1, 0.0
	edge := max(grid/50, 1)
	for j := edge; j < grid-edge; j++ {
		if !valid[j-1] || !valid[j] || !valid[j+1] {
			continue
		}
		l, m, r := res.GridY[j-1], res.GridY[j], res.GridY[j+1]
		isMax := m > l && m >= r
		isMin := m < l && m <= r
		if !isMax && !isMin {
			continue
		}
		chord := y0 + (y1-y0)*float64(j)/float64(grid-1)
		if d := math.Abs(m - chord); d > bestDev {
			best, bestDev = j, d
		}
	}
	if best < 0 {
		return nil, fmt.Errorf("critical point: %w (the map looks monotone; use a quantile or threshold partition)", ErrMonotone)
	}
	isMax := res.GridY[best] > res.GridY[best-1]
	res.Extremum = "minimum"
	if isMax {
		res.Extremum = "maximum"
	}
	// refine: move to the vertex of the local quadratic, a few times
	cut := res.GridX[best]
	step := rng / float64(grid-1)
	var usedH float64
	for it := 0; it < 5; it++ {
		_, b, c, h, ok := fitAt(cut)
		usedH = h
		if !ok || c == 0 || (isMax && c > 0) || (!isMax && c < 0) {
			break
		}
		nc := cut - b/(2*c)
		if math.Abs(nc-res.GridX[best]) > 2*step {
			break // the vertex left the neighbourhood of the grid extremum: keep the last
		}
		cut = nc
	}
	res.Cut, res.Bandwidth = cut, usedH
	res.Partition = Partition{Kind: "critical", Thresholds: []float64{cut}, Score: math.NaN(), EntropyRate: math.NaN()}
	return res, nil
}

// localQuadratic fits y ≈ a + b(x−g) + c(x−g)² with tricube weights of half-width h and returns
// the coefficients.
func localQuadratic(pts [][2]float64, g, h float64) (a, b, c float64, ok bool) {
	var s0, s1, s2, s3, s4, t0, t1, t2 float64
	for _, p := range pts {
		u := (p[0] - g) / h
		if u <= -1 || u >= 1 {
			continue
		}
		au := math.Abs(u)
		w := 1 - au*au*au
		w = w * w * w
		d := p[0] - g
		d2 := d * d
		s0 += w
		s1 += w * d
		s2 += w * d2
		s3 += w * d2 * d
		s4 += w * d2 * d2
		t0 += w * p[1]
		t1 += w * d * p[1]
		t2 += w * d2 * p[1]
	}
	// solve [[s0 s1 s2][s1 s2 s3][s2 s3 s4]] (a b c) = (t0 t1 t2) by Cramer's rule
	det := s0*(s2*s4-s3*s3) - s1*(s1*s4-s3*s2) + s2*(s1*s3-s2*s2)
	if !(math.Abs(det) > 1e-300) {
		return 0, 0, 0, false
	}
	a = (t0*(s2*s4-s3*s3) - s1*(t1*s4-s3*t2) + s2*(t1*s3-s2*t2)) / det
	b = (s0*(t1*s4-t2*s3) - t0*(s1*s4-s3*s2) + s2*(s1*t2-t1*s2)) / det
	c = (s0*(s2*t2-s3*t1) - s1*(s1*t2-t1*s2) + t0*(s1*s3-s2*s2)) / det
	return a, b, c, true
}
