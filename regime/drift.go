package regime

import (
	"fmt"
	"math"
	"unfold/spectral"
)

// Drift compares the power spectra of the first and last thirds of a record: a check of
// stationarity beyond the mean and the variance (a chirp, a drifting rhythm or a change of
// regime keeps both but moves power between frequencies).
type Drift struct {
	// Distance is the total-variation distance ½ Σ|p₁ − p₂| between the two Welch spectra,
	// each normalised to unit sum (0: the same shape, 1: no power in common).
	Distance float64 `json:"distance"`
	// Noise is the distance expected from estimation error alone for two spectra of the same
	// process, about 0.8/√ν with ν the degrees of freedom of a bin (chi-square bins with
	// relative standard error √(2/ν); E|a − b| = 2σ/√π for independent Gaussian errors).
	Noise float64 `json:"noise"`
	// PeakFirst and PeakLast are the frequencies (cycles per time unit) of the strongest bin
	// of each third.
	PeakFirst float64 `json:"peak_first"`
	PeakLast  float64 `json:"peak_last"`
	// Changed is true when Distance exceeds max(0.3, 3·Noise) (judgement: three times the
	// estimation noise, and at least 30 % of the power moved).
	Changed bool `json:"changed"`
}

// SpectralDrift computes Drift for x sampled every dt: Welch spectra (Welch 1967) of the
// first and last thirds with the same segment length, the largest power of two ≤ N/24 (at
// least 16), so that each third averages about 15 segments. Records under 192 samples give
// an error.
func SpectralDrift(x []float64, dt float64) (*Drift, error) {
	n3 := len(x) / 3
	if n3 < 64 {
		return nil, fmt.Errorf("spectral drift: %d samples: need at least 192 (three thirds of 64)", len(x))
	}
	seg := 16
	for seg*2 <= n3/8 && seg < 4096 {
		seg *= 2
	}
	a, err := spectral.Welch(x[:n3], dt, spectral.WelchOptions{SegLen: seg})
	if err != nil {
		return nil, fmt.Errorf("spectral drift: %w", err)
	}
	b, err := spectral.Welch(x[len(x)-n3:], dt, spectral.WelchOptions{SegLen: seg})
	if err != nil {
		return nil, fmt.Errorf("spectral drift: %w", err)
	}
	norm := func(p []float64) ([]float64, int) {
		s, top := 0.0, 1
		for _, v := range p {
			s += v
		}
		q := make([]float64, len(p))
		for i, v := range p {
			if s > 0 {
				q[i] = v / s
			}
			if i > 0 && v > p[top] {
				top = i
			}
		}
		return q, top
	}
	pa, ta := norm(a.Power)
	pb, tb := norm(b.Power)
	d := &Drift{PeakFirst: a.Freq[ta], PeakLast: b.Freq[tb]}
	for i := range pa {
		d.Distance += 0.5 * math.Abs(pa[i]-pb[i])
	}
	d.Noise = 0.8 / math.Sqrt(math.Max(a.DOF, 1))
	d.Changed = d.Distance > math.Max(0.3, 3*d.Noise)
	return d, nil
}

// String says in words what the comparison found.
func (d *Drift) String() string {
	return fmt.Sprintf("the spectra of the first and last thirds differ by a distance of %.2f (estimation noise about %.2f); strongest frequency %.4g, then %.4g cycles per time unit",
		d.Distance, d.Noise, d.PeakFirst, d.PeakLast)
}
