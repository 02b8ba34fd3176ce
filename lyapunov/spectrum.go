package lyapunov

import (
	"fmt"
	"math"
	"sync"

	"gonum.org/v1/gonum/mat"

	"unfold/models"
	"unfold/neighbors"

	guard "unfold/internal/workers"
)

// SpectrumOptions set the embedding and the local fits of Spectrum. Lag and Dim are required;
// every other zero value selects the default stated beside the field.
type SpectrumOptions struct {
	Lag, Dim int // delay (samples, ≥ 1) and embedding dimension (≥ 1)
	// Theiler excludes temporal neighbours |i−j| ≤ Theiler from the neighbourhoods.
	Theiler int
	Norm    neighbors.Norm
	// Neighbors is the number of nearest neighbours of each local least-squares fit (default
	// max(5·Dim, 20)); at least Dim+1.
	Neighbors int
	// Evolve is the number of steps each local map spans (default Lag: one delay, so that a
	// flow's map is not nearly the identity; 1 for a map sampled per iteration).
	Evolve int
	// Exponents is the number of exponents computed, at most Dim (default Dim).
	Exponents int
	// MaxSteps caps the number of maps along the orbit (default all the record allows).
	MaxSteps int
	// Dt is the sampling interval in time units (default 1).
	Dt float64
	// Threads is the number of goroutines of the local fits (0 = all cores); Progress, when
	// not nil, is called with (maps fitted, total).
	Threads  int
	Progress func(done, total int)
	// Index, when not nil, is a prebuilt neighbour index of the delay vectors of x with Lag,
	// Dim and Norm (as for Options.Index); the result is the same as without it.
	Index *neighbors.Index
}

// SpectrumResult is a Lyapunov spectrum estimated from data.
type SpectrumResult struct {
	Lag, Dim, Theiler, Neighbors, Evolve int
	Dt                                   float64
	// Exponents are in nats per time unit, PerSample in nats per step, both descending.
	Exponents, PerSample []float64
	// KaplanYorke is the Kaplan–Yorke dimension of the spectrum (models.KaplanYorke).
	KaplanYorke float64
	// Steps is the number of local maps (QR steps) averaged over.
	Steps int
	// Note says which exponents can be spurious.
	Note     string
	Cautions []string
}

// Spectrum estimates the Lyapunov spectrum of x from local linear maps (Eckmann, Kamphorst,
// Ruelle & Ciliberto 1986; Sano & Sawada 1985). Along the orbit of delay vectors v_n, at the
// points i = 0, E, 2E, … (E = Evolve), the k nearest neighbours j of v_i outside the Theiler
// window give the differences Δx_j = v_j − v_i and Δy_j = v_{j+E} − v_{i+E}; the local tangent
// map J_i (Dim × Dim) is the least-squares solution of Δy_j ≈ J_i Δx_j (Gram–Schmidt QR in
// preallocated buffers, no allocation per point). A set of Exponents orthonormal tangent vectors
// Q is carried along: J_i Q = Q' R (QR factorisation by gonum/mat), and exponent k is the
// average of ln |R_kk| per step (Benettin et al. 1980 re-orthonormalisation, the same scheme as
// models' spectra from equations).
//
// Exponents beyond the attractor's dimension are properties of the embedding, not of the
// dynamics, and can be spurious (Sano & Sawada 1985; Eckmann et al. 1986 reduce the local
// dimension for this reason): the result's Note says so.
//
// The local fits run in parallel in batches of 2048; the QR chain is sequential (gonum's QR
// allocates a few small buffers per step). Memory is O(N·m) for the index plus one batch of
// maps. The result does not depend on the number of threads.
func Spectrum(x []float64, opt SpectrumOptions) (*SpectrumResult, error) {
	o := opt
	if o.Lag < 1 || o.Dim < 1 {
		return nil, fmt.Errorf("lyapunov spectrum: lag %d and dimension %d must be at least 1", o.Lag, o.Dim)
	}
	if o.Theiler < 0 {
		return nil, fmt.Errorf("lyapunov spectrum: Theiler window %d must not be negative", o.Theiler)
	}
	m := o.Dim
	if o.Neighbors == 0 {
		o.Neighbors = max(5*m, 20)
	}
	if o.Evolve == 0 {
		o.Evolve = o.Lag
	}
	if o.Exponents == 0 {
		o.Exponents = m
	}
	if o.Dt == 0 {
		o.Dt = 1
	}
	switch {
	case o.Neighbors < m+1:
		return nil, fmt.Errorf("lyapunov spectrum: %d neighbours cannot fit a %d×%d map (need at least %d)", o.Neighbors, m, m, m+1)
	case o.Evolve < 1:
		return nil, fmt.Errorf("lyapunov spectrum: evolution of %d steps must be at least 1", o.Evolve)
	case o.Exponents < 1 || o.Exponents > m:
		return nil, fmt.Errorf("lyapunov spectrum: %d exponents requested; between 1 and the dimension %d", o.Exponents, m)
	case !(o.Dt > 0) || math.IsInf(o.Dt, 0):
		return nil, fmt.Errorf("lyapunov spectrum: sampling interval %g must be positive", o.Dt)
	}
	ix := o.Index
	if ix == nil {
		var err error
		if ix, err = neighbors.FromEmbedding(x, o.Lag, m, o.Norm); err != nil {
			return nil, fmt.Errorf("lyapunov spectrum: %w", err)
		}
	} else if ix.Dim() != m || ix.Norm() != o.Norm || ix.Len() != len(x)-(m-1)*o.Lag {
		return nil, fmt.Errorf("lyapunov spectrum: %w: the index given is not of the %d-dimensional delay vectors with lag %d (%s norm)", neighbors.ErrInput, m, o.Lag, o.Norm)
	}
	nv := ix.Len()
	hi := nv - o.Evolve // vectors that have an image
	steps := (hi + o.Evolve - 1) / o.Evolve
	if o.MaxSteps > 0 {
		steps = min(steps, o.MaxSteps)
	}
	if hi < 2*o.Theiler+o.Neighbors+2 || steps < 10 {
		return nil, fmt.Errorf("lyapunov spectrum: %d samples give %d delay vectors: too few for %d neighbours outside a Theiler window of %d", len(x), nv, o.Neighbors, o.Theiler)
	}
	p := o.Exponents
	threads := o.Threads
	if threads <= 0 {
		threads = runtimeThreads()
	}
	const batch = 2048
	maps := make([]float64, batch*m*m)
	ok := make([]bool, batch)
	sums := make([]float64, p)
	q := mat.NewDense(m, p, nil)
	for k := range p {
		q.Set(k, k, 1)
	}
	var jq mat.Dense
	var qr mat.QR
	var qq, rr mat.Dense
	jm := mat.NewDense(m, m, nil)
	used := 0
	workers := make([]*localFit, threads)
	for t := range workers {
		workers[t] = newLocalFit(ix, x, o)
	}
	for start := 0; start < steps; start += batch {
		nb := min(batch, steps-start)
		var wg sync.WaitGroup
		var g guard.Guard
		for t := range threads {
			wg.Go(func() {
				g.Run(func() {
					w := workers[t]
					for b := t; b < nb; b += threads {
						i := (start + b) * o.Evolve
						ok[b] = w.fit(i, hi, maps[b*m*m:(b+1)*m*m])
					}
				})
			})
		}
		wg.Wait()
		g.Repanic()
		for b := range nb {
			if !ok[b] {
				continue
			}
			copy(jm.RawMatrix().Data, maps[b*m*m:(b+1)*m*m])
			jq.Mul(jm, q)
			qr.Factorize(&jq)
			qr.QTo(&qq)
			// Keep the first p columns of Q; R's diagonal gives the growth.
			for r := range m {
				for c := range p {
					q.Set(r, c, qq.At(r, c))
				}
			}
			qr.RTo(&rr)
			for k := range p {
				d := math.Abs(rr.At(k, k))
				if d == 0 {
					d = math.SmallestNonzeroFloat64
				}
				sums[k] += math.Log(d)
			}
			used++
		}
		if o.Progress != nil {
			o.Progress(start+nb, steps)
		}
	}
	if used < 10 {
		return nil, fmt.Errorf("lyapunov spectrum: only %d of %d local maps could be fitted (degenerate neighbourhoods)", used, steps)
	}
	res := &SpectrumResult{Lag: o.Lag, Dim: m, Theiler: o.Theiler, Neighbors: o.Neighbors, Evolve: o.Evolve,
		Dt: o.Dt, Steps: used, PerSample: make([]float64, p), Exponents: make([]float64, p)}
	for k := range p {
		res.PerSample[k] = sums[k] / float64(used*o.Evolve)
	}
	// Sort descending (the QR order is already nearly sorted).
	for a := 1; a < p; a++ {
		for b := a; b > 0 && res.PerSample[b] > res.PerSample[b-1]; b-- {
			res.PerSample[b], res.PerSample[b-1] = res.PerSample[b-1], res.PerSample[b]
		}
	}
	for k := range p {
		res.Exponents[k] = res.PerSample[k] / o.Dt
	}
	res.KaplanYorke = models.KaplanYorke(res.Exponents)
	res.Note = fmt.Sprintf("%d exponents from %d delay coordinates: exponents beyond the attractor's dimension (Kaplan–Yorke %.3g) are properties of the embedding and can be spurious, above all the most negative ones (Sano & Sawada 1985; Eckmann et al. 1986)",
		p, m, res.KaplanYorke)
	if lg := math.Log10(float64(nv)); lg < float64(m) {
		res.Cautions = append(res.Cautions, fmt.Sprintf(
			"N = %d delay vectors may be too few for dimension %d: Eckmann & Ruelle (1992) argue that exponents from data need roughly log10 N > D (here log10 N = %.1f; D ≤ m)",
			nv, m, lg))
	}
	if float64(p) > math.Ceil(res.KaplanYorke)+0.5 {
		res.Cautions = append(res.Cautions, fmt.Sprintf(
			"%d exponents exceed the attractor's Kaplan–Yorke dimension %.3g: the last %d are likely spurious",
			p, res.KaplanYorke, p-int(math.Ceil(res.KaplanYorke))))
	}
	if used < steps {
		res.Cautions = append(res.Cautions, fmt.Sprintf("%d of %d local maps were degenerate and skipped", steps-used, steps))
	}
	return res, nil
}

// localFit holds one goroutine's scratch space for the local least-squares maps.
type localFit struct {
	ix  *neighbors.Index
	s   *neighbors.Searcher
	x   []float64
	o   SpectrumOptions
	buf []neighbors.Neighbor
	// a holds the Dim columns of Δx and b the Dim columns of Δy, each of length Neighbors
	// (column-major); r is the Dim×Dim triangular factor and y = Qᵀ·Δy.
	a, b, r, y []float64
}

func newLocalFit(ix *neighbors.Index, x []float64, o SpectrumOptions) *localFit {
	k, m := o.Neighbors, o.Dim
	return &localFit{ix: ix, s: ix.NewSearcher(), x: x, o: o,
		a: make([]float64, k*m), b: make([]float64, k*m), r: make([]float64, m*m), y: make([]float64, m*m)}
}

// fit writes the local map at vector i (row-major Dim × Dim) into dst and reports whether the
// neighbourhood determined it. The least-squares problem Δx·Jᵀ ≈ Δy is solved by modified
// Gram–Schmidt QR of Δx applied to the augmented columns (Björck 1967, "Solving linear least
// squares problems by Gram–Schmidt orthogonalization", BIT 7, 1), in preallocated buffers so
// that no allocation happens per point; a column whose remaining norm is below 1e-10 of the
// largest makes the neighbourhood degenerate.
func (w *localFit) fit(i, hi int, dst []float64) bool {
	o := w.o
	m, lag, e, k := o.Dim, o.Lag, o.Evolve, o.Neighbors
	w.buf = w.s.KNN(w.ix.Coords(i), k, neighbors.Query{Self: i, Theiler: o.Theiler, Hi: hi}, w.buf)
	if len(w.buf) < k {
		return false
	}
	x, a, b := w.x, w.a, w.b
	for r, nb := range w.buf {
		j := nb.Index
		for c := range m {
			a[c*k+r] = x[j+c*lag] - x[i+c*lag]
			b[c*k+r] = x[j+e+c*lag] - x[i+e+c*lag]
		}
	}
	var top float64
	for c := range m {
		col := a[c*k : (c+1)*k]
		var nn float64
		for _, v := range col {
			nn += v * v
		}
		nn = math.Sqrt(nn)
		top = math.Max(top, nn)
		if !(nn > 1e-10*top) {
			return false
		}
		w.r[c*m+c] = nn
		for t := range col {
			col[t] /= nn
		}
		for c2 := c + 1; c2 < m; c2++ {
			col2 := a[c2*k : (c2+1)*k]
			var d float64
			for t, v := range col {
				d += v * col2[t]
			}
			w.r[c*m+c2] = d
			for t, v := range col {
				col2[t] -= d * v
			}
		}
		for j := range m {
			bj := b[j*k : (j+1)*k]
			var d float64
			for t, v := range col {
				d += v * bj[t]
			}
			w.y[c*m+j] = d
			for t, v := range col {
				bj[t] -= d * v
			}
		}
	}
	// Back-substitution R·Jᵀ = Y; Jᵀ[c][j] is J[j][c].
	for c := m - 1; c >= 0; c-- {
		for j := range m {
			v := w.y[c*m+j]
			for c2 := c + 1; c2 < m; c2++ {
				v -= w.r[c*m+c2] * dst[j*m+c2]
			}
			v /= w.r[c*m+c]
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return false
			}
			dst[j*m+c] = v
		}
	}
	return true
}
