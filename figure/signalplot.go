package figure

import (
	"fmt"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"

	"unfold/spectral"
)

// SignalPlots returns the two panels of the signal figure: the record (at most maxShown
// samples from its start, so that single oscillations stay visible) above its power spectrum,
// estimated by Welch's (1967) method: the average periodogram of Hann-windowed
// half-overlapping segments of up to 4096 samples ("The use of fast Fourier transform for the
// estimation of power spectra", IEEE Trans. Audio Electroacoust. 15, 70). Frequencies are in
// cycles per time unit, power in signal units² per frequency unit on a log axis (LogTicks).
// Non-finite samples are left out of the trace; the spectrum panel is empty when the record
// is too short or not finite.
func SignalPlots(signal, unit, timeUnit string, x []float64, dt float64, maxShown int) ([][]*plot.Plot, error) {
	if len(x) == 0 {
		return nil, fmt.Errorf("figure: signal: no sample to draw")
	}
	if !(dt > 0) {
		dt = 1
	}
	if signal == "" {
		signal = "x"
	}
	if timeUnit == "" {
		timeUnit = "time units"
	}
	lab := signal
	if unit != "" {
		lab += " [" + unit + "]"
	}
	n := len(x)
	if maxShown > 0 {
		n = min(n, maxShown)
	}
	title := "the signal"
	if n < len(x) {
		title = "the signal (first " + strconv.Itoa(n) + " of " + strconv.Itoa(len(x)) + " samples)"
	}
	p1 := New(title, "time ["+timeUnit+"]", lab)
	t := make([]float64, n)
	for i := range t {
		t[i] = float64(i) * dt
	}
	if err := AddLine(p1, t, x[:n], Main(), traceWidth, ""); err != nil {
		return nil, err
	}
	p1.X.Min, p1.X.Max = 0, float64(max(n-1, 1))*dt
	padAxis(&p1.Y, 0.03)

	p2 := New("power spectrum (Welch, Hann window)", "frequency [cycles per "+singular(timeUnit)+"]", "power [log scale]")
	f, pw := welch(x, dt)
	var fs, ps []float64
	for k := 1; k < len(f); k++ {
		if pw[k] > 0 && isFinite(pw[k]) {
			fs = append(fs, f[k])
			ps = append(ps, pw[k])
		}
	}
	if len(fs) > 1 {
		LogAxis(&p2.Y)
		if err := AddLine(p2, fs, ps, Second(), traceWidth, ""); err != nil {
			return nil, err
		}
		Pad(p2, 0.02)
		p2.X.Min = 0
	}
	return [][]*plot.Plot{{p1}, {p2}}, nil
}

// welch returns the frequencies and the Welch spectrum of x with the symmetric Hann window and
// segments of 4096 samples, halved (down to 16) until one fits the record; nil for records
// shorter than 16 samples or with non-finite values.
func welch(x []float64, dt float64) ([]float64, []float64) {
	for _, v := range x {
		if !isFinite(v) {
			return nil, nil
		}
	}
	seg := 4096
	for seg > 16 && seg > len(x) {
		seg /= 2
	}
	sp, err := spectral.Welch(x, dt, spectral.WelchOptions{SegLen: seg, Symmetric: true})
	if err != nil {
		return nil, nil
	}
	return sp.Freq, sp.Power
}

// traceWidth is the width of long traces (thinner than curves, so that oscillations stay apart).
const traceWidth = 0.8 * vg.Length(1)
