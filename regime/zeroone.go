package regime

import (
	"fmt"
	"math"
	"math/rand/v2"
	"slices"

	"gonum.org/v1/gonum/dsp/fourier"

	"unfold/spectral"
)

// ZeroOneOptions configure ZeroOne; the zero value uses the defaults.
type ZeroOneOptions struct {
	// Subsample keeps every Subsample-th sample before the test (0 or 1: none). Gottwald &
	// Melbourne (2009) advise subsampling oversampled flows, whose consecutive samples are
	// nearly equal, or the test reports K < 1 for chaotic flows; Analyze passes ⌈τ/2⌉ for
	// the embedding delay τ.
	Subsample int
	// MaxSamples caps the samples used after subsampling (0 means 20 000).
	MaxSamples int
	// Cs is the number of random frequencies c in (π/5, 4π/5) (0 means 100).
	Cs int
	// Seed seeds the draw of the c values.
	Seed uint64
}

// ZeroOneResult is the result of ZeroOne.
type ZeroOneResult struct {
	// K is the median over c of the correlation K_c; near 0 for regular (periodic or
	// quasiperiodic) dynamics, near 1 for chaotic dynamics (and for noise).
	K float64
	// KValues are the K_c, in the order of the drawn c (Cs values).
	KValues []float64 `json:"-"`
	// Subsample is the subsampling step used and Samples the number of samples tested.
	Subsample, Samples int
	// NCut is the largest displacement n of the mean-square displacement (N/10).
	NCut int
}

// ZeroOne runs the 0-1 test for chaos on x by the correlation method.
//
// For each c the translation variables p_c(n) = Σ_{j≤n} φ_j cos(jc) and q_c(n) = Σ_{j≤n}
// φ_j sin(jc) are formed, their mean-square displacement M_c(n) = mean_j |z(j+n) − z(j)|²
// (z = p + iq, averaged over j = 1…N−n, computed for all n at once by an FFT autocorrelation)
// is corrected by the oscillatory term, D_c(n) = M_c(n) − (Eφ)²(1 − cos nc)/(1 − cos c), and
// K_c is the correlation coefficient of D_c(n) with n for n = 1…N/10. K is the median of K_c
// over 100 c drawn uniformly from (π/5, 4π/5), which absorbs the resonant c.
//
// References: G. A. Gottwald and I. Melbourne (2004), "A new test for chaos in deterministic
// systems", Proc. R. Soc. Lond. A 460, 603–611; G. A. Gottwald and I. Melbourne (2009), "On the
// implementation of the 0–1 test for chaos", SIAM J. Appl. Dyn. Syst. 8, 129–145 (correlation
// method, modified mean-square displacement, choice of c and n_cut, subsampling of flows).
func ZeroOne(x []float64, opt ZeroOneOptions) (*ZeroOneResult, error) {
	if opt.Subsample < 1 {
		opt.Subsample = 1
	}
	if opt.MaxSamples <= 0 {
		opt.MaxSamples = 20000
	}
	if opt.Cs <= 0 {
		opt.Cs = 100
	}
	phi := make([]float64, 0, min(len(x)/opt.Subsample+1, opt.MaxSamples))
	for i := 0; i < len(x) && len(phi) < opt.MaxSamples; i += opt.Subsample {
		phi = append(phi, x[i])
	}
	n := len(phi)
	if n < 100 {
		return nil, fmt.Errorf("0-1 test: %d samples after subsampling by %d: need at least 100", n, opt.Subsample)
	}
	ncut := n / 10
	mean, _ := meanVar(phi)
	rng := rand.New(rand.NewPCG(splitmix(opt.Seed), 0x0123456789abcdef))
	L := spectral.LengthAtLeast(2*n, maxFactor)
	fft := fourier.NewCmplxFFT(L)
	z := make([]complex128, L)
	sq := make([]float64, n+1) // prefix sums of |z_j|²
	m := make([]float64, ncut+1)
	res := &ZeroOneResult{Subsample: opt.Subsample, Samples: n, NCut: ncut, KValues: make([]float64, opt.Cs)}
	for ci := range opt.Cs {
		c := math.Pi/5 + rng.Float64()*3*math.Pi/5
		var p, q float64
		for j := range n {
			s, co := math.Sincos(float64(j+1) * c)
			p += phi[j] * co
			q += phi[j] * s
			z[j] = complex(p, q)
			sq[j+1] = sq[j] + p*p + q*q
		}
		for j := n; j < L; j++ {
			z[j] = 0
		}
		fft.Coefficients(z, z)
		for k, v := range z {
			z[k] = complex(real(v)*real(v)+imag(v)*imag(v), 0)
		}
		fft.Sequence(z, z)
		inv := 1 / float64(L)
		osc := mean * mean / (1 - math.Cos(c))
		for k := 1; k <= ncut; k++ {
			// Σ_{j<n−k} |z_{j+k} − z_j|² = Σ_{j≥k}|z_j|² + Σ_{j<n−k}|z_j|² − 2 Re R(k).
			r := real(z[k]) * inv
			s := (sq[n] - sq[k]) + sq[n-k] - 2*r
			m[k] = s/float64(n-k) - osc*(1-math.Cos(float64(k)*c))
		}
		res.KValues[ci] = corrWithIndex(m[1:])
	}
	sorted := slices.Clone(res.KValues)
	slices.Sort(sorted)
	if len(sorted)%2 == 1 {
		res.K = sorted[len(sorted)/2]
	} else {
		res.K = 0.5 * (sorted[len(sorted)/2-1] + sorted[len(sorted)/2])
	}
	return res, nil
}

// corrWithIndex returns the Pearson correlation of d with 1, 2, …, len(d) (0 when d is
// constant).
func corrWithIndex(d []float64) float64 {
	n := float64(len(d))
	mx := (n + 1) / 2
	var md float64
	for _, v := range d {
		md += v
	}
	md /= n
	var sxy, sxx, syy float64
	for i, v := range d {
		dx := float64(i+1) - mx
		dy := v - md
		sxy += dx * dy
		sxx += dx * dx
		syy += dy * dy
	}
	if syy == 0 || sxx == 0 {
		return 0
	}
	return sxy / math.Sqrt(sxx*syy)
}
