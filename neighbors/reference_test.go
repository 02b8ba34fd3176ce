package neighbors

import (
	"bufio"
	"encoding/json"
	"math"
	"math/rand/v2"
	"os"
	"path/filepath"
	"slices"
	"strconv"
	"strings"
	"testing"

	"github.com/kyroy/kdtree"
	"github.com/kyroy/kdtree/points"
)

// TestKyroyCrossCheck compares all-points k-NN (Euclidean, w = 0) with github.com/kyroy/kdtree,
// an independent general-purpose kd-tree, on 10^4 points: the distances of the k nearest
// neighbours (other than the point itself) agree to 1e-12 relative (kyroy sums math.Pow terms,
// so the last bits may differ).
func TestKyroyCrossCheck(t *testing.T) {
	const n, k = 10000, 5
	rng := rand.New(rand.NewPCG(11, 12))
	for _, ds := range []dataset{
		{"uniform", uniform(rng, n, 3), 3},
		{"lorenz", delay(lorenzX(n+2*10, 0.01), 10, 3), 3},
	} {
		kp := make([]kdtree.Point, n)
		for i := range n {
			kp[i] = points.NewPoint(ds.pts[i*3:i*3+3], i)
		}
		tree := kdtree.New(slices.Clone(kp)) // New reorders its argument
		ix, err := Build(ds.pts, 3, Euclidean)
		if err != nil {
			t.Fatal(err)
		}
		_, dist := ix.AllKNN(k, 0, 0, 0, 0, nil)
		for i := range n {
			var ref []float64
			for _, p := range tree.KNN(kp[i], k+1) {
				if p.(*points.Point).Data.(int) == i {
					continue
				}
				ref = append(ref, bruteDist(ds.pts[i*3:i*3+3], p.(*points.Point).Coordinates, Euclidean))
			}
			ref = ref[:min(len(ref), k)]
			if len(ref) != k {
				t.Fatalf("%s point %d: kyroy returned %d neighbours", ds.name, i, len(ref))
			}
			for c := range k {
				if got := dist[i*k+c]; math.Abs(got-ref[c]) > 1e-12*ref[c] {
					t.Fatalf("%s point %d neighbour %d: distance %v, kyroy %v", ds.name, i, c, got, ref[c])
				}
			}
		}
	}
}

// corrsumGolden is the JSON written by the scipy reference script.
type corrsumGolden struct {
	CorrelationSum []struct {
		R float64 `json:"r"`
		C float64 `json:"c"`
	} `json:"correlation_sum"`
}

// readSecondColumn reads the t,x CSV written for the reference run.
func readSecondColumn(t *testing.T, path string) []float64 {
	f, err := os.Open(path)
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	var x []float64
	sc := bufio.NewScanner(f)
	sc.Scan() // header
	for line := 2; sc.Scan(); line++ {
		_, v, ok := strings.Cut(sc.Text(), ",")
		f, err := strconv.ParseFloat(v, 64)
		if !ok || err != nil {
			t.Fatalf("%s line %d: %q", path, line, sc.Text())
		}
		x = append(x, f)
	}
	return x
}

// TestPairCountsReference checks PairCounts against exact pair counts of
// /work/shared/bench/reference_corrsum.py (scipy cKDTree.count_neighbors, pairs at distance <= r,
// Theiler 1986 window; C(r) = pairs / ((N'−w−1)(N'−w)/2)) on a synthetic Hénon record. The
// golden files and the commands that made them are in testdata/neighbors/README.md.
func TestPairCountsReference(t *testing.T) {
	dir := filepath.Join("..", "testdata", "neighbors")
	x := readSecondColumn(t, filepath.Join(dir, "henon4000.csv"))
	for _, g := range []struct {
		file        string
		lag, dim, w int
		norm        Norm
	}{
		{"corrsum_henon_m3_w5_max.json", 1, 3, 5, Max},
		{"corrsum_henon_m2_w10_euclid.json", 1, 2, 10, Euclidean},
	} {
		raw, err := os.ReadFile(filepath.Join(dir, g.file))
		if err != nil {
			t.Fatal(err)
		}
		var ref corrsumGolden
		if err := json.Unmarshal(raw, &ref); err != nil {
			t.Fatalf("%s: %v", g.file, err)
		}
		if len(ref.CorrelationSum) != 16 {
			t.Fatalf("%s: %d radii", g.file, len(ref.CorrelationSum))
		}
		ix, err := FromEmbedding(x, g.lag, g.dim, g.norm)
		if err != nil {
			t.Fatal(err)
		}
		radii := make([]float64, len(ref.CorrelationSum))
		for i, e := range ref.CorrelationSum {
			radii[i] = e.R
		}
		got := ix.PairCounts(radii, g.w, 2, nil)
		n := ix.Len()
		norm := float64(n-g.w-1) * float64(n-g.w) / 2
		for i, e := range ref.CorrelationSum {
			want := int64(math.Round(e.C * norm)) // exact: the script divides an integer < 2^53
			if got[i] != want {
				t.Errorf("%s r=%v: %d pairs, reference %d (C %v)", g.file, e.R, got[i], want, e.C)
			}
			if c := float64(got[i]) / norm; math.Abs(c-e.C) > 1e-12*e.C {
				t.Errorf("%s r=%v: C %v, reference %v", g.file, e.R, c, e.C)
			}
		}
	}
}
