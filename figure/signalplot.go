package figure

import (
	"math"

	"fmt"
	"strconv"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/vg"

	"unfold/series"
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
	k := extremeExponent(x[:n])
	if k != 0 {
		lab += " ×1e" + strconv.Itoa(k) // values near ±1e308 or denormal: the axis shows x/10^k
	}
	p1 := New(title, "time ["+timeUnit+"]", lab)
	t := make([]float64, n)
	y := make([]float64, n)
	for i := range t {
		t[i] = float64(i) * dt
		y[i] = timesPow10(x[i], -k)
	}
	if err := AddLine(p1, t, y, Main(), traceWidth, ""); err != nil {
		return nil, err
	}
	p1.X.Min, p1.X.Max = 0, float64(max(n-1, 1))*dt
	padAxis(&p1.Y, 0.03)

	p2 := New("power spectrum (Welch, Hann window)", "frequency [cycles per "+singular(timeUnit)+"]", "power [log scale]")
	f, pw, relative := welchScaled(x, dt)
	if relative {
		p2.Y.Label.Text = "power relative to its peak [log scale]"
	}
	var fs, ps []float64
	for k := 1; k < len(f); k++ {
		if pw[k] > 0 && isFinite(pw[k]) {
			fs = append(fs, f[k])
			ps = append(ps, pw[k])
		}
	}
	if len(fs) <= 1 {
		p2.Title.Text = "power spectrum: none (the record is too short, constant or not finite)"
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

// extremeExponent returns k such that the largest magnitude of x is about 10^k when that is
// beyond 10^±100 (a plotted axis of such values cannot be labelled), and 0 otherwise.
func extremeExponent(x []float64) int {
	var big float64
	for _, v := range x {
		if !math.IsInf(v, 0) {
			big = math.Max(big, math.Abs(v))
		}
	}
	if big == 0 || (big < 1e100 && big > 1e-100) {
		return 0
	}
	return int(math.Floor(math.Log10(big)))
}

// timesPow10 returns v·10^k in two steps, so that neither factor overflows (10^±310).
func timesPow10(v float64, k int) float64 {
	h := k / 2
	return v * math.Pow10(h) * math.Pow10(k-h)
}

// welchScaled is welch computed on the record scaled by a power of two 2^−e that brings its
// largest magnitude near 1, so that the squares of values near ±1e308 do not overflow and
// those of denormal values (1e−310) do not vanish. The power is scaled back by 2^2e when that
// is a finite normal number everywhere; otherwise (the power itself is beyond float64) it is
// returned relative to its peak and relative is true.
func welchScaled(x []float64, dt float64) (f, pw []float64, relative bool) {
	e := series.ScaleExponent(x)
	y := make([]float64, len(x))
	for i, v := range x {
		y[i] = math.Ldexp(v, -e)
	}
	f, pw = welch(y, dt)
	var peak float64
	back := true
	for _, p := range pw {
		peak = math.Max(peak, p)
		if q := math.Ldexp(p, 2*e); p > 0 && (math.IsInf(q, 0) || q < 0x1p-1022) {
			back = false
		}
	}
	for k := range pw {
		if back {
			pw[k] = math.Ldexp(pw[k], 2*e)
		} else if peak > 0 {
			pw[k] /= peak
		}
	}
	return f, pw, !back
}
