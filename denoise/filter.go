package denoise

import (
	"errors"
	"fmt"
	"math"
	"math/cmplx"
)

// ErrInput is wrapped by every error about unusable input or parameters.
var ErrInput = errors.New("denoise: bad input")

// Band is the kind of a frequency-selective filter.
type Band int

const (
	// LowPass passes frequencies below the corner.
	LowPass Band = iota
	// HighPass passes frequencies above the corner.
	HighPass
	// BandPass passes frequencies between two corners.
	BandPass
)

// String returns "lowpass", "highpass" or "bandpass".
func (b Band) String() string {
	switch b {
	case LowPass:
		return "lowpass"
	case HighPass:
		return "highpass"
	case BandPass:
		return "bandpass"
	}
	return fmt.Sprintf("Band(%d)", int(b))
}

// DefaultOrder is the Butterworth order used when none is given (common practice).
const DefaultOrder = 4

// Section is one second-order section (biquad) with a0 = 1:
//
//	H(z) = (B0 + B1 z⁻¹ + B2 z⁻²) / (1 + A1 z⁻¹ + A2 z⁻²).
//
// A first-order section has B2 = A2 = 0.
type Section struct {
	B0, B1, B2, A1, A2 float64
}

// Filter is a digital IIR filter held as a cascade of second-order sections.
type Filter struct {
	// Band is the filter kind.
	Band Band
	// Order is the order of the analogue prototype (a band-pass filter has 2·Order poles).
	Order int
	// Corners are the −3 dB frequencies of one pass, in cycles per time unit of Dt (Hz when Dt
	// is in seconds): one for low- and high-pass, two (low, high) for band-pass.
	Corners []float64
	// Dt is the sampling interval the filter was designed for, in time units.
	Dt float64
	// Sections is the cascade, applied in order.
	Sections []Section
}

// Butterworth designs a Butterworth filter of the given order (Butterworth 1930) by the bilinear
// transform with frequency prewarping, so that the magnitude of one pass is exactly
// 1/√2 (−3.01 dB) at each corner frequency. corners are in cycles per time unit of dt (Hz when
// dt is in seconds) and must lie strictly between 0 and the Nyquist frequency 1/(2·dt); a
// band-pass filter takes two increasing corners. The poles of the analogue prototype,
// p_k = exp(iπ(2k+N+1)/(2N)), are mapped to the prewarped corner (low-pass s = Ωc·p, high-pass
// s = Ωc/p, band-pass s² − pBs + Ω0² = 0 with Ω0² = Ω1Ω2 and B = Ω2 − Ω1), then to the z-plane by
// z = (1+s)/(1−s) with Ω = tan(π f dt); conjugate pairs form the sections and each section's
// gain is set to one at DC (low-pass), at the Nyquist frequency (high-pass) or at the centre
// frequency 2·atan(Ω0)/(2π dt) (band-pass).
func Butterworth(band Band, order int, corners []float64, dt float64) (*Filter, error) {
	if order < 1 || order > 20 {
		return nil, fmt.Errorf("%w: Butterworth order %d, want 1 … 20", ErrInput, order)
	}
	if !(dt > 0) || math.IsInf(dt, 0) {
		return nil, fmt.Errorf("%w: sampling interval %v, want > 0", ErrInput, dt)
	}
	want := 1
	if band == BandPass {
		want = 2
	} else if band != LowPass && band != HighPass {
		return nil, fmt.Errorf("%w: unknown filter band %d", ErrInput, int(band))
	}
	if len(corners) != want {
		return nil, fmt.Errorf("%w: %s filter takes %d corner frequencies, got %d", ErrInput, band, want, len(corners))
	}
	nyq := 0.5 / dt
	for _, f := range corners {
		if !(f > 0 && f < nyq) {
			return nil, fmt.Errorf("%w: corner frequency %g is not strictly between 0 and the Nyquist frequency %g (= 1/(2·dt), dt = %g)", ErrInput, f, nyq, dt)
		}
	}
	if band == BandPass && !(corners[0] < corners[1]) {
		return nil, fmt.Errorf("%w: band-pass corners %g, %g must increase", ErrInput, corners[0], corners[1])
	}
	f := &Filter{Band: band, Order: order, Corners: append([]float64(nil), corners...), Dt: dt}
	warp := func(fc float64) float64 { return math.Tan(math.Pi * fc * dt) }
	bilinear := func(s complex128) complex128 { return (1 + s) / (1 - s) }
	// prototype poles in the upper half plane (and the real one for odd order)
	var proto []complex128
	for k := 0; k < order; k++ {
		p := cmplx.Exp(complex(0, math.Pi*float64(2*k+order+1)/float64(2*order)))
		if imag(p) > 1e-12 {
			proto = append(proto, p)
		} else if math.Abs(imag(p)) <= 1e-12 {
			proto = append(proto, complex(real(p), 0))
		}
	}
	var ref float64 // reference angular frequency (radians per sample) for unit gain
	switch band {
	case LowPass:
		wc := warp(corners[0])
		for _, p := range proto {
			f.addPoles(bilinear(complex(wc, 0)*p), imag(p) == 0, -1)
		}
		ref = 0
	case HighPass:
		wc := warp(corners[0])
		for _, p := range proto {
			f.addPoles(bilinear(complex(wc, 0)/p), imag(p) == 0, +1)
		}
		ref = math.Pi
	case BandPass:
		w1, w2 := warp(corners[0]), warp(corners[1])
		w0sq, bw := w1*w2, w2-w1
		for _, p := range proto {
			pb := p * complex(bw, 0)
			d := cmplx.Sqrt(pb*pb - complex(4*w0sq, 0))
			s1, s2 := (pb+d)/2, (pb-d)/2
			if imag(p) == 0 {
				if math.Abs(imag(s1)) > 1e-14 {
					// a conjugate pair from the real prototype pole
					if imag(s1) < 0 {
						s1 = s2
					}
					f.addBandSection(bilinear(s1), 0, false)
				} else {
					f.addBandSection(bilinear(complex(real(s1), 0)), real(bilinear(complex(real(s2), 0))), true)
				}
				continue
			}
			f.addBandSection(bilinear(s1), 0, false)
			f.addBandSection(bilinear(s2), 0, false)
		}
		ref = 2 * math.Atan(math.Sqrt(w0sq))
	}
	// unit gain of every section at the reference frequency
	for i := range f.Sections {
		g := cmplx.Abs(f.Sections[i].response(ref))
		if g == 0 || math.IsNaN(g) {
			return nil, fmt.Errorf("%w: degenerate filter design (order %d, corners %v, dt %g)", ErrInput, order, corners, dt)
		}
		s := &f.Sections[i]
		s.B0, s.B1, s.B2 = s.B0/g, s.B1/g, s.B2/g
	}
	return f, nil
}

// addPoles appends a section with the pole z (and its conjugate unless real) and zeros at
// z = zero (−1 for low-pass, +1 for high-pass), of multiplicity 1 for a real pole, 2 otherwise.
func (f *Filter) addPoles(z complex128, isReal bool, zero float64) {
	if isReal {
		f.Sections = append(f.Sections, Section{B0: 1, B1: -zero, A1: -real(z)})
		return
	}
	f.Sections = append(f.Sections, Section{
		B0: 1, B1: -2 * zero, B2: zero * zero,
		A1: -2 * real(z), A2: real(z)*real(z) + imag(z)*imag(z),
	})
}

// addBandSection appends a band-pass section with zeros at +1 and −1 and the poles z, conj(z)
// (or, when twoReal, the real poles real(z) and z2).
func (f *Filter) addBandSection(z complex128, z2 float64, twoReal bool) {
	s := Section{B0: 1, B1: 0, B2: -1}
	if twoReal {
		s.A1 = -(real(z) + z2)
		s.A2 = real(z) * z2
	} else {
		s.A1 = -2 * real(z)
		s.A2 = real(z)*real(z) + imag(z)*imag(z)
	}
	f.Sections = append(f.Sections, s)
}

// response returns the section's frequency response at w radians per sample.
func (s Section) response(w float64) complex128 {
	z1 := cmplx.Exp(complex(0, -w))
	z2 := z1 * z1
	num := complex(s.B0, 0) + complex(s.B1, 0)*z1 + complex(s.B2, 0)*z2
	den := 1 + complex(s.A1, 0)*z1 + complex(s.A2, 0)*z2
	return num / den
}

// Response returns the complex frequency response of one (forward) pass at frequency freq in
// cycles per time unit. The forward–backward application of ZeroPhase has the real response
// |Response(freq)|².
func (f *Filter) Response(freq float64) complex128 {
	w := 2 * math.Pi * freq * f.Dt
	h := complex(1, 0)
	for _, s := range f.Sections {
		h *= s.response(w)
	}
	return h
}

// Apply filters x causally (one forward pass, zero initial state) and returns a new slice.
func (f *Filter) Apply(x []float64) []float64 {
	y := append([]float64(nil), x...)
	for _, s := range f.Sections {
		s.run(y, 0, 0)
	}
	return y
}

// run filters y in place (transposed direct form II) from the state (z1, z2).
func (s Section) run(y []float64, z1, z2 float64) {
	for i, u := range y {
		v := s.B0*u + z1
		z1 = s.B1*u - s.A1*v + z2
		z2 = s.B2*u - s.A2*v
		y[i] = v
	}
}

// steady returns the state of the section after a long constant input u, and its DC gain.
func (s Section) steady(u float64) (z1, z2, gain float64) {
	den := 1 + s.A1 + s.A2
	if den != 0 {
		gain = (s.B0 + s.B1 + s.B2) / den
	}
	y := gain * u
	z2 = s.B2*u - s.A2*y
	z1 = s.B1*u - s.A1*y + z2
	return z1, z2, gain
}

// PadLength returns the number of samples ZeroPhase adds at each end of a record of n samples:
// the time for the slowest pole to decay to 10⁻⁶, at least 3·(2·sections+1), at most n−1.
func (f *Filter) PadLength(n int) int {
	rmax := 0.0
	for _, s := range f.Sections {
		// poles of 1 + A1 z⁻¹ + A2 z⁻²
		disc := complex(s.A1*s.A1-4*s.A2, 0)
		r1 := cmplx.Abs((complex(-s.A1, 0) + cmplx.Sqrt(disc)) / 2)
		r2 := cmplx.Abs((complex(-s.A1, 0) - cmplx.Sqrt(disc)) / 2)
		rmax = max(rmax, r1, r2)
	}
	pad := 3 * (2*len(f.Sections) + 1)
	if rmax > 0 && rmax < 1 {
		pad = max(pad, int(math.Ceil(math.Log(1e-6)/math.Log(rmax))))
	}
	return max(min(pad, n-1), 0)
}

// ZeroPhase filters x forward and backward (zero phase shift; magnitude |H|², so −6.02 dB at
// a corner) and returns a new slice of the same length. Edges: the record is extended at each
// end by PadLength samples of its odd reflection about the end value (2·x[0] − x[k]), and
// every section starts in the steady state of a constant input equal to the first sample of
// the pass, so that neither a step nor a trend at the ends produces a start-up transient.
// x needs at least 2 samples.
func (f *Filter) ZeroPhase(x []float64) ([]float64, error) {
	n := len(x)
	if n < 2 {
		return nil, fmt.Errorf("%w: zero-phase filtering needs at least 2 samples, got %d", ErrInput, n)
	}
	pad := f.PadLength(n)
	ext := make([]float64, n+2*pad)
	for k := 0; k < pad; k++ {
		ext[k] = 2*x[0] - x[pad-k]
		ext[pad+n+k] = 2*x[n-1] - x[n-2-k]
	}
	copy(ext[pad:], x)
	f.pass(ext)
	reverse(ext)
	f.pass(ext)
	reverse(ext)
	return append([]float64(nil), ext[pad:pad+n]...), nil
}

// pass filters y in place through every section, each starting in the steady state of a
// constant input y[0].
func (f *Filter) pass(y []float64) {
	u := y[0]
	for _, s := range f.Sections {
		z1, z2, g := s.steady(u)
		s.run(y, z1, z2)
		u *= g
	}
}

func reverse(y []float64) {
	for i, j := 0, len(y)-1; i < j; i, j = i+1, j-1 {
		y[i], y[j] = y[j], y[i]
	}
}
