package spectral

import "math"

// Hann fills w with the Hann window of len(w) points, w_i = ½ − ½·cos(2πi/D), and returns the
// sum of its squares (the power normalisation of a windowed periodogram). With symmetric false
// D = len(w): the periodic ("DFT-even") window for spectral analysis, whose transform is exactly
// three bins wide; with symmetric true D = len(w) − 1: the symmetric window, zero at both ends
// (Harris 1978, "On the use of windows for harmonic analysis with the discrete Fourier
// transform"; Blackman & Tukey 1958, "The Measurement of Power Spectra").
func Hann(w []float64, symmetric bool) float64 {
	d := float64(len(w))
	if symmetric {
		d = float64(len(w) - 1)
	}
	var ss float64
	for i := range w {
		w[i] = 0.5 - 0.5*math.Cos(2*math.Pi*float64(i)/d)
		ss += w[i] * w[i]
	}
	return ss
}

// HannLeakage bounds the power of a Hann-windowed line d bins from its centre relative to the
// centre: 1/(π² d² (d² − 1)²), from the window's transform sinc(d)/(1 − d²) (Harris 1978;
// arithmetic). Within 1.5 bins of the centre it returns 1 (the main lobe).
func HannLeakage(d float64) float64 {
	if d < 1.5 {
		return 1
	}
	return 1 / (math.Pi * math.Pi * d * d * (d*d - 1) * (d*d - 1))
}
