package symbolic

import (
	"fmt"
	"math"
)

// The complexity–entropy plane of O. A. Rosso, H. A. Larrondo, M. T. Martin, A. Plastino and
// M. A. Fuentes (2007), "Distinguishing noise from chaos", Phys. Rev. Lett. 99, 154102: a
// probability distribution P over N states (here the D! ordinal patterns of Bandt & Pompe) is
// placed at its normalised Shannon entropy H[P] = S[P]/ln N and its Jensen–Shannon statistical
// complexity C_JS[P] = Q_J[P, Pe]·H[P], where Pe is the uniform distribution and
// Q_J = Q0·(S[(P+Pe)/2] − S[P]/2 − S[Pe]/2) is the Jensen–Shannon divergence normalised to
// 1 at a delta distribution. At a given H, C_JS lies between the minimum and maximum curves
// of M. T. Martin, A. Plastino and O. A. Rosso (2006), "Generalized statistical complexity
// measures: geometrical and analytical properties", Physica A 369, 439.

// PlanePoint is a point of the complexity–entropy plane: normalised entropy H and
// Jensen–Shannon complexity C.
type PlanePoint struct {
	Entropy    float64 `json:"entropy"`
	Complexity float64 `json:"complexity"`
}

// jsQ0 returns the normalisation Q0 = −2/[((N+1)/N) ln(N+1) − 2 ln(2N) + ln N], the inverse of
// the largest Jensen–Shannon divergence from the uniform distribution (at a delta).
func jsQ0(n int) float64 {
	fn := float64(n)
	return -2 / ((fn+1)/fn*math.Log(fn+1) - 2*math.Log(2*fn) + math.Log(fn))
}

func xlogx(x float64) float64 {
	if x <= 0 {
		return 0
	}
	return x * math.Log(x)
}

// JensenShannonComplexity returns the normalised entropy H and the Jensen–Shannon statistical
// complexity C_JS = Q_J·H of the distribution given by counts over len(counts) ≥ 2 states
// (Rosso et al. 2007).
func JensenShannonComplexity(counts []int64) (PlanePoint, error) {
	n := len(counts)
	if n < 2 {
		return PlanePoint{}, fmt.Errorf("complexity: %d states; want at least 2", n)
	}
	var tot float64
	for _, c := range counts {
		if c < 0 {
			return PlanePoint{}, fmt.Errorf("complexity: negative count %d", c)
		}
		tot += float64(c)
	}
	if tot == 0 {
		return PlanePoint{}, fmt.Errorf("complexity: no counts")
	}
	pe := 1 / float64(n)
	var s, sm float64 // −S[P], −S[(P+Pe)/2]
	for _, c := range counts {
		p := float64(c) / tot
		s += xlogx(p)
		sm += xlogx((p + pe) / 2)
	}
	return planePoint(-s, -sm, n), nil
}

// planePoint assembles H and C from S[P] and S[(P+Pe)/2] over n states.
func planePoint(sp, smix float64, n int) PlanePoint {
	smax := math.Log(float64(n))
	h := sp / smax
	js := smix - sp/2 - smax/2
	c := jsQ0(n) * js * h
	h = min(max(h, 0), 1)
	c = max(c, 0)
	return PlanePoint{Entropy: h, Complexity: c}
}

// Complexity returns the point of the permutation entropy p in the complexity–entropy plane:
// its normalised entropy (p.Normalized) and the Jensen–Shannon complexity of its pattern
// distribution (Rosso et al. 2007).
func (p *Permutation) Complexity() PlanePoint {
	pt, err := JensenShannonComplexity(p.Counts)
	if err != nil {
		return PlanePoint{}
	}
	return pt
}

// family is the distribution with z zero entries, one entry q and n−z−1 equal entries
// (1−q)/(n−z−1): the minimum curve is z = 0, q ∈ [1/n, 1], and the maximum curve is made of
// z = 0 … n−2 with q ∈ [0, 1/(n−z)] (Martin, Plastino & Rosso 2006).
func family(n, z int, q float64) PlanePoint {
	pe := 1 / float64(n)
	m := float64(n - z - 1)
	r := (1 - q) / m
	sp := -xlogx(q) - m*xlogx(r)
	smix := -float64(z)*xlogx(pe/2) - xlogx((q+pe)/2) - m*xlogx((r+pe)/2)
	return planePoint(sp, smix, n)
}

// ComplexityBounds returns the smallest and largest Jensen–Shannon complexity that a
// distribution over n ≥ 2 states with normalised entropy h ∈ [0, 1] can have (Martin, Plastino
// & Rosso 2006). Both are 0 at h = 0 and h = 1.
func ComplexityBounds(n int, h float64) (cmin, cmax float64) {
	if n < 2 || !(h > 0 && h < 1) {
		return 0, 0
	}
	// minimum: z = 0, q from 1/n (h = 1) to 1 (h = 0); h falls as q grows
	q := bisect(1/float64(n), 1, func(q float64) float64 { return family(n, 0, q).Entropy - h }, true)
	cmin = family(n, 0, q).Complexity
	// maximum: the z whose range [ln(n−z−1), ln(n−z)]/ln n holds h; h grows with q there
	lh := h * math.Log(float64(n))
	z := n - 1 - int(math.Floor(math.Exp(lh)+1e-12))
	z = min(max(z, 0), n-2)
	q = bisect(0, 1/float64(n-z), func(q float64) float64 { return family(n, z, q).Entropy - h }, false)
	cmax = family(n, z, q).Complexity
	return cmin, cmax
}

// bisect finds the root of f on [lo, hi], where f falls (falling) or grows with its argument.
func bisect(lo, hi float64, f func(float64) float64, falling bool) float64 {
	for range 200 {
		mid := (lo + hi) / 2
		v := f(mid)
		if (v > 0) == falling {
			lo = mid
		} else {
			hi = mid
		}
		if hi-lo < 1e-15 {
			break
		}
	}
	return (lo + hi) / 2
}

// ComplexityCurves returns the minimum and maximum complexity curves for n ≥ 2 states, each
// sampled at points+1 entropies from 0 to 1, for drawing the plane.
func ComplexityCurves(n, points int) (lower, upper []PlanePoint) {
	if n < 2 || points < 1 {
		return nil, nil
	}
	for i := 0; i <= points; i++ {
		h := float64(i) / float64(points)
		cmin, cmax := ComplexityBounds(n, h)
		lower = append(lower, PlanePoint{h, cmin})
		upper = append(upper, PlanePoint{h, cmax})
	}
	return lower, upper
}
