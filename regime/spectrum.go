package regime

import (
	"math"
	"slices"

	"gonum.org/v1/gonum/dsp/fourier"

	"unfold/spectral"
)

// Spectrum is a one-sided power spectral density estimate (Welch 1967), computed by
// spectral.Welch.
type Spectrum = spectral.Spectrum

// Peak is a significant spectral line.
type Peak struct {
	// Freq is the refined line frequency in cycles per time unit; FreqPerSample in cycles
	// per sample (0…0.5).
	Freq, FreqPerSample float64
	// Power is the Welch density at the peak bin and Ratio its ratio to the local background
	// (the running median of the spectrum).
	Power, Ratio float64
	// Combination are the integer coefficients expressing the line in the fundamentals of
	// the line analysis (and a multiple of the sampling rate, folded), when it was explained.
	Combination []int `json:",omitempty"`
}

// LineKind is what the line analysis concluded.
type LineKind string

// The outcomes of the line analysis.
const (
	LinesPeriodic      LineKind = "periodic"      // lines are harmonics of one fundamental
	LinesQuasiperiodic LineKind = "quasiperiodic" // lines are integer combinations of 2–3 incommensurate fundamentals
	LinesBroadband     LineKind = "broadband"     // most power is not in lines, or the lines are not explained
)

// Lines is the result of LineAnalysis.
type Lines struct {
	Kind LineKind
	// Spectrum is the Welch spectrum the peaks were detected in.
	Spectrum *Spectrum
	// Peaks are the significant lines, strongest first (at most 24).
	Peaks []Peak
	// Fundamentals are the generating frequencies (cycles per time unit) when Kind is
	// periodic or quasiperiodic.
	Fundamentals []float64
	// LineFraction is the fraction of the variance within ±4 bins of the lines in the
	// full-length Hann periodogram; 1 − LineFraction is the broadband power.
	LineFraction float64
	// Tolerance is the frequency tolerance per unit of |coefficient| used when matching
	// combinations, in cycles per sample (half a bin of the full-length periodogram).
	Tolerance float64
	// Threshold is the ratio a bin must exceed over its background to be a line: the
	// χ²_ν/ν quantile at 1 − 0.01/bins (Bonferroni over the bins).
	Threshold float64
}

// LineOptions configure LineAnalysis; the zero value uses the defaults.
type LineOptions struct {
	// SegLen is the Welch segment length (0: spectral.DefaultSegLen).
	SegLen int
	// Alpha is the family-wise false-line rate of the significance rule (0 means 0.01).
	Alpha float64
	// MinLineFraction is the share of power the lines must carry for a line verdict
	// (0 means 0.5).
	MinLineFraction float64
}

// LineAnalysis detects the significant lines of x's spectrum and decides whether they are the
// harmonics of one fundamental (periodic), integer combinations of two or three incommensurate
// fundamentals (quasiperiodic), or whether the power is broadband.
//
// The rule: a bin of the Welch spectrum is a line when it is a local maximum over ±1 bin,
// lies above 2 bins from zero frequency, exceeds its background — the running median over
// ±max(8, SegLen/64) bins — by the χ²_ν/ν quantile at 1 − α/bins (ν = DOF; Wilson–Hilferty
// approximation), and is not within the Hann leakage skirt of a stronger line. Each line's
// frequency is refined in the full-length Hann periodogram (parabolic interpolation of log
// power), so the matching tolerance δ is half a bin of that periodogram, 0.5/L cycles per
// sample, and a combination Σk_j f_j (folded about multiples of the sampling rate, since
// harmonics above the Nyquist frequency alias) matches a line f when
// |fold(Σk_j f_j) − f| ≤ (1 + Σ|k_j|)·δ. Periodic: some f_i/n (i among the three strongest
// lines, n ≤ 8) generates every line with harmonic numbers up to 2·lines + 2. Quasiperiodic:
// two (|k| ≤ 10) or three (|k| ≤ 5) lines generate all lines and one does not suffice. In both
// cases the generators are then refitted by least squares and every line must lie within
// 2δ of its combination (so the tolerance does not grow with the harmonic number), and the
// lines must carry at least MinLineFraction of the power; otherwise the spectrum is
// broadband.
func LineAnalysis(x []float64, dt float64, opt LineOptions) (*Lines, error) {
	if opt.Alpha <= 0 {
		opt.Alpha = 0.01
	}
	if opt.MinLineFraction <= 0 {
		opt.MinLineFraction = 0.5
	}
	if dt <= 0 {
		dt = 1
	}
	sp, err := spectral.Welch(x, dt, spectral.WelchOptions{SegLen: opt.SegLen})
	if err != nil {
		return nil, err
	}
	nb := len(sp.Power)
	half := max(8, sp.SegLen/64)
	bg := runningMedian(sp.Power, half)
	z := normalQuantile(1 - opt.Alpha/float64(nb))
	nu := sp.DOF
	a := 2 / (9 * nu)
	thr := math.Pow(1-a+z*math.Sqrt(a), 3)
	res := &Lines{Spectrum: sp, Threshold: thr, Kind: LinesBroadband}
	type cand struct {
		k int
		p float64
	}
	var cands []cand
	for k := 3; k < nb; k++ {
		p := sp.Power[k]
		if bg[k] <= 0 || p <= thr*bg[k] {
			continue
		}
		// A local maximum over ±1 bin: lines closer to a stronger one than its Hann skirt are
		// left out below (d < 2.5 bins, or under 10× its leakage), so a wider window only
		// hides resolvable lines 2.5–4.5 bins from a stronger one, whose main lobe can top
		// them 2 bins away (two tones 3 bins apart lost the weaker).
		local := true
		for d := -1; d <= 1; d++ {
			if j := k + d; d != 0 && j >= 0 && j < nb && sp.Power[j] > p {
				local = false
			}
		}
		if local {
			cands = append(cands, cand{k, p})
		}
	}
	slices.SortFunc(cands, func(a, b cand) int {
		if a.p != b.p {
			if a.p > b.p {
				return -1
			}
			return 1
		}
		return a.k - b.k
	})
	var kept []cand
	for _, c := range cands {
		ok := true
		for _, s := range kept {
			d := math.Abs(float64(c.k - s.k))
			if d < 2.5 || c.p < 10*s.p*spectral.HannLeakage(d) {
				ok = false
				break
			}
		}
		if ok {
			kept = append(kept, c)
			if len(kept) == 24 {
				break
			}
		}
	}
	if len(kept) == 0 {
		return res, nil
	}
	// Full-length periodogram for refinement and the line fraction.
	L := spectral.LengthAtMost(len(x), maxFactor)
	full := fullPeriodogram(x[:L])
	res.Tolerance = 0.5 / float64(L)
	ratio := float64(L) / float64(sp.SegLen)
	var fs []float64
	inLine := make([]bool, len(full))
	for _, c := range kept {
		centre := int(math.Round(float64(c.k) * ratio))
		span := int(math.Ceil(ratio)) + 2
		best := -1
		for j := max(1, centre-span); j <= min(len(full)-1, centre+span); j++ {
			if best < 0 || full[j] > full[best] {
				best = j
			}
		}
		f := float64(best)
		if best > 0 && best < len(full)-1 && full[best-1] > 0 && full[best+1] > 0 && full[best] > 0 {
			l0, l1, l2 := math.Log(full[best-1]), math.Log(full[best]), math.Log(full[best+1])
			if den := l0 - 2*l1 + l2; den < 0 {
				f += 0.5 * (l0 - l2) / den
			}
		}
		fps := f / float64(L)
		for j := max(1, best-4); j <= min(len(full)-1, best+4); j++ {
			inLine[j] = true
		}
		fs = append(fs, fps)
		res.Peaks = append(res.Peaks, Peak{Freq: fps / dt, FreqPerSample: fps, Power: c.p, Ratio: c.p / bg[c.k]})
	}
	var tot, line float64
	for j := 1; j < len(full); j++ {
		tot += full[j]
		if inLine[j] {
			line += full[j]
		}
	}
	if tot > 0 {
		res.LineFraction = line / tot
	}
	if res.LineFraction < opt.MinLineFraction {
		return res, nil
	}
	gens, combos := explainLines(fs, res.Tolerance)
	if gens == nil {
		return res, nil
	}
	for i := range res.Peaks {
		res.Peaks[i].Combination = combos[i]
	}
	for _, g := range gens {
		res.Fundamentals = append(res.Fundamentals, g/dt)
	}
	if len(gens) == 1 {
		res.Kind = LinesPeriodic
	} else {
		res.Kind = LinesQuasiperiodic
	}
	return res, nil
}

// explainLines finds the fewest generators (1, 2 or 3, in cycles per sample) whose folded
// integer combinations match every frequency in fs; it returns nil when none is found. A
// candidate set is accepted in two passes: integer vectors are assigned with the loose
// tolerance (1 + Σ|k_j|)·tol, the generators are refitted by least squares to all lines, and
// every line must then lie within 2·tol of its combination of the refitted generators.
func explainLines(fs []float64, tol float64) ([]float64, [][]int) {
	np := len(fs)
	try := func(g []float64, kmax int) ([]float64, [][]int) {
		c := matchAll(fs, g, kmax, tol)
		if c == nil {
			return nil, nil
		}
		g2, ok := refit(fs, g, c, 2*tol)
		if !ok {
			return nil, nil
		}
		return g2, c
	}
	// One fundamental: f_i/n for the three strongest lines.
	kmax := 2*np + 2
	for n := 1; n <= 8; n++ {
		for i := 0; i < min(3, np); i++ {
			if g, c := try([]float64{fs[i] / float64(n)}, kmax); g != nil {
				return g, c
			}
		}
	}
	top := min(np, 6)
	for i := 0; i < top; i++ {
		for j := i + 1; j < top; j++ {
			if g, c := try([]float64{fs[i], fs[j]}, 10); g != nil {
				return g, c
			}
		}
	}
	for i := 0; i < top; i++ {
		for j := i + 1; j < top; j++ {
			for k := j + 1; k < top; k++ {
				if g, c := try([]float64{fs[i], fs[j], fs[k]}, 5); g != nil {
					return g, c
				}
			}
		}
	}
	return nil, nil
}

// refit solves the least-squares problem k_i·g = m_i + σ_i f_i for the generators g, where the
// alias m_i and sign σ_i come from folding k_i·g0, and reports whether every line then lies
// within tol of its combination.
func refit(fs, g0 []float64, ks [][]int, tol float64) ([]float64, bool) {
	d := len(g0)
	// Normal equations A g = b with A = Σ k kᵀ, b = Σ k t.
	var a [3][3]float64
	var b [3]float64
	ts := make([]float64, len(fs))
	for i, k := range ks {
		var s float64
		for j := range d {
			s += float64(k[j]) * g0[j]
		}
		m := math.Round(s)
		sign := 1.0
		if s-m < 0 {
			sign = -1
		}
		ts[i] = m + sign*fs[i]
		for r := range d {
			b[r] += float64(k[r]) * ts[i]
			for c := range d {
				a[r][c] += float64(k[r] * k[c])
			}
		}
	}
	g, ok := solveSmall(a, b, d)
	if !ok {
		return nil, false
	}
	for i, k := range ks {
		var s float64
		for j := range d {
			s += float64(k[j]) * g[j]
		}
		if math.Abs(s-ts[i]) > tol {
			return nil, false
		}
	}
	for j := range g {
		if !(g[j] > 0) {
			return nil, false
		}
	}
	return g, true
}

// solveSmall solves the d×d system a x = b (d ≤ 3) by Gaussian elimination with partial
// pivoting; ok is false when the system is singular.
func solveSmall(a [3][3]float64, b [3]float64, d int) ([]float64, bool) {
	for c := range d {
		p := c
		for r := c + 1; r < d; r++ {
			if math.Abs(a[r][c]) > math.Abs(a[p][c]) {
				p = r
			}
		}
		if math.Abs(a[p][c]) < 1e-12 {
			return nil, false
		}
		a[c], a[p] = a[p], a[c]
		b[c], b[p] = b[p], b[c]
		for r := c + 1; r < d; r++ {
			f := a[r][c] / a[c][c]
			for k := c; k < d; k++ {
				a[r][k] -= f * a[c][k]
			}
			b[r] -= f * b[c]
		}
	}
	x := make([]float64, d)
	for r := d - 1; r >= 0; r-- {
		s := b[r]
		for k := r + 1; k < d; k++ {
			s -= a[r][k] * x[k]
		}
		x[r] = s / a[r][r]
	}
	return x, true
}

// fold maps a frequency in cycles per sample to its alias in [0, 0.5].
func fold(f float64) float64 {
	return math.Abs(f - math.Round(f))
}

// fullPeriodogram returns the Hann-windowed periodogram |X_k|², k = 0…L/2, of x after the
// mean is removed.
func fullPeriodogram(x []float64) []float64 {
	n := len(x)
	mean, _ := meanVar(x)
	w := make([]float64, n)
	spectral.Hann(w, false)
	buf := make([]float64, n)
	for i := range buf {
		buf[i] = (x[i] - mean) * w[i]
	}
	c := fourier.NewFFT(n).Coefficients(nil, buf)
	p := make([]float64, len(c))
	for k, v := range c {
		p[k] = real(v)*real(v) + imag(v)*imag(v)
	}
	return p
}

// runningMedian returns the median of p over [k−half, k+half] (clipped at the ends) for
// every k.
func runningMedian(p []float64, half int) []float64 {
	out := make([]float64, len(p))
	win := make([]float64, 0, 2*half+1)
	for k := range p {
		win = append(win[:0], p[max(0, k-half):min(len(p), k+half+1)]...)
		slices.Sort(win)
		out[k] = win[len(win)/2]
	}
	return out
}

// normalQuantile returns the standard normal quantile at probability p (0 < p < 1).
func normalQuantile(p float64) float64 {
	return math.Sqrt2 * math.Erfinv(2*p-1)
}

// matchAll returns for each f in fs the smallest-norm integer vector k (|k_j| ≤ kmax, not all
// zero, first non-zero entry positive) with |fold(Σk_j g_j) − f| ≤ (1 + Σ|k_j|)·tol, or nil
// when some f has none.
func matchAll(fs, g []float64, kmax int, tol float64) [][]int {
	out := make([][]int, len(fs))
	k := make([]int, len(g))
	for i, f := range fs {
		var best []int
		bestNorm := math.MaxInt
		var rec func(d, norm int)
		rec = func(d, norm int) {
			if norm >= bestNorm {
				return
			}
			if d == len(g) {
				if norm == 0 {
					return
				}
				var s float64
				for j, v := range k {
					s += float64(v) * g[j]
				}
				if math.Abs(fold(s)-f) <= float64(1+norm)*tol {
					best, bestNorm = slices.Clone(k), norm
				}
				return
			}
			lo := -kmax
			if d == 0 {
				lo = 0 // the sign of the whole vector is immaterial after folding
			}
			for v := lo; v <= kmax; v++ {
				k[d] = v
				rec(d+1, norm+abs(v))
			}
			k[d] = 0
		}
		rec(0, 0)
		if best == nil {
			return nil
		}
		out[i] = best
	}
	return out
}

func abs(v int) int {
	if v < 0 {
		return -v
	}
	return v
}
