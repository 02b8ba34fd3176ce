package neighbors

import (
	"math"
	"math/rand/v2"
	"slices"

	"unfold/internal/testsignals"
)

// This file holds the test data generators and the brute-force reference searches.

// henonX returns n samples of the x coordinate of the Hénon map x' = 1 − a x² + y, y' = b x
// (a = 1.4, b = 0.3; Hénon 1976, Commun. Math. Phys. 50, 69) from (0.1, 0.1) after 1000
// transient steps (internal/testsignals).
func henonX(n int) []float64 { return testsignals.HenonX(n, 1000) }

// lorenzX returns n samples of x of the Lorenz (1963) system σ = 10, r = 28, β = 8/3, integrated
// with classical RK4 at step dt from (1, 1, 1), after 1000 transient steps (internal/testsignals).
func lorenzX(n int, dt float64) []float64 {
	return testsignals.LorenzX(n, testsignals.Sampling{Step: dt, Skip: 1000})
}

// delay returns the dense n×dim matrix of delay vectors of x.
func delay(x []float64, lag, dim int) []float64 {
	n := len(x) - (dim-1)*lag
	out := make([]float64, 0, n*dim)
	for i := range n {
		for d := range dim {
			out = append(out, x[i+d*lag])
		}
	}
	return out
}

// uniform returns n points uniform in [0,1)^dim.
func uniform(rng *rand.Rand, n, dim int) []float64 {
	out := make([]float64, n*dim)
	for i := range out {
		out[i] = rng.Float64()
	}
	return out
}

// withDuplicates returns pts where about a quarter of the points are copies of earlier ones and
// coordinates are quantised to a coarse grid, so that many distances tie exactly.
func withDuplicates(rng *rand.Rand, pts []float64, dim int) []float64 {
	n := len(pts) / dim
	out := slices.Clone(pts)
	for i := range out {
		out[i] = math.Round(out[i]*8) / 8
	}
	for i := 1; i < n; i++ {
		if rng.IntN(4) == 0 {
			j := rng.IntN(i)
			copy(out[i*dim:i*dim+dim], out[j*dim:j*dim+dim])
		}
	}
	return out
}

// bruteKey is the reference distance key: squared Euclidean distance summed in coordinate order,
// or the maximum absolute difference.
func bruteKey(a, b []float64, norm Norm) float64 {
	var s float64
	for d := range a {
		t := a[d] - b[d]
		if norm == Euclidean {
			s += float64(t * t)
		} else {
			s = max(s, math.Abs(t))
		}
	}
	return s
}

func bruteDist(a, b []float64, norm Norm) float64 {
	k := bruteKey(a, b, norm)
	if norm == Euclidean {
		return math.Sqrt(k)
	}
	return k
}

// bruteAdmissible applies the Query rules literally.
func bruteAdmissible(j, n int, opt Query) bool {
	hi := opt.Hi
	if hi == 0 || hi > n {
		hi = n
	}
	if j < max(opt.Lo, 0) || j >= hi {
		return false
	}
	if opt.Self >= 0 {
		w := max(opt.Theiler, 0)
		if j-opt.Self <= w && opt.Self-j <= w {
			return false
		}
	}
	return true
}

// bruteSorted returns every admissible point sorted by (key, index).
func bruteSorted(pts []float64, dim int, norm Norm, q []float64, opt Query) []Neighbor {
	n := len(pts) / dim
	type kc struct {
		key float64
		j   int
	}
	var all []kc
	for j := range n {
		if bruteAdmissible(j, n, opt) {
			all = append(all, kc{bruteKey(q, pts[j*dim:j*dim+dim], norm), j})
		}
	}
	slices.SortFunc(all, func(a, b kc) int {
		if a.key != b.key {
			if a.key < b.key {
				return -1
			}
			return 1
		}
		return a.j - b.j
	})
	out := make([]Neighbor, len(all))
	for i, c := range all {
		d := c.key
		if norm == Euclidean {
			d = math.Sqrt(d)
		}
		out[i] = Neighbor{c.j, d}
	}
	return out
}

func bruteKNN(pts []float64, dim int, norm Norm, q []float64, k int, opt Query) []Neighbor {
	all := bruteSorted(pts, dim, norm, q, opt)
	return all[:min(k, len(all))]
}

func bruteRadius(pts []float64, dim int, norm Norm, q []float64, r float64, opt Query) []Neighbor {
	var out []Neighbor
	for _, nb := range bruteSorted(pts, dim, norm, q, opt) {
		if nb.Dist <= r {
			out = append(out, nb)
		}
	}
	return out
}

// brutePairs counts pairs i < j, j − i > w, with distance <= r for each r.
func brutePairs(pts []float64, dim int, norm Norm, radii []float64, w int) []int64 {
	n := len(pts) / dim
	out := make([]int64, len(radii))
	for i := range n {
		for j := i + w + 1; j < n; j++ {
			d := bruteDist(pts[i*dim:i*dim+dim], pts[j*dim:j*dim+dim], norm)
			for k, r := range radii {
				if d <= r {
					out[k]++
				}
			}
		}
	}
	return out
}
