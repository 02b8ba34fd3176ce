package report

import (
	"image/color"
	"math"

	"gonum.org/v1/plot"
	"gonum.org/v1/plot/plotter"
	"gonum.org/v1/plot/vg"

	"unfold/spectral"
)

// SignalFigure draws the record (at most maxShown samples from its start, so that single
// oscillations stay visible) above its power spectrum, estimated by Welch's (1967) method:
// the average periodogram of Hann-windowed half-overlapping segments of up to 4096 samples
// ("The use of fast Fourier transform for the estimation of power spectra", IEEE Trans. Audio
// Electroacoust. 15, 70). Frequencies are in cycles per time unit, power in signal units² per
// frequency unit on a log axis.
func SignalFigure(name, signal, unit, timeUnit string, x []float64, dt float64, maxShown int) (Figure, error) {
	if dt <= 0 {
		dt = 1
	}
	if signal == "" {
		signal = "x"
	}
	lab := signal
	if unit != "" {
		lab += " (" + unit + ")"
	}
	n := min(len(x), maxShown)
	trace := make(plotter.XYs, n)
	k := extremeExponent(x[:n])
	if k != 0 {
		lab += " ×1e" + itoa(k) // values near ±1e308 or denormal: the axis shows x/10^k
	}
	for i := 0; i < n; i++ {
		trace[i] = plotter.XY{X: float64(i) * dt, Y: timesPow10(x[i], -k)}
	}
	p1 := plot.New()
	p1.Title.Text = "the signal"
	if n < len(x) {
		p1.Title.Text = "the signal (first " + itoa(n) + " of " + itoa(len(x)) + " samples)"
	}
	p1.X.Label.Text = "time (" + timeUnit + ")"
	p1.Y.Label.Text = lab
	l, err := plotter.NewLine(trace)
	if err != nil {
		return Figure{}, err
	}
	l.Color = color.RGBA{R: 0x1f, G: 0x5f, B: 0xa8, A: 0xff}
	l.Width = vg.Points(0.7)
	p1.Add(plotter.NewGrid(), l)

	f, pw, relative := welchScaled(x, dt)
	p2 := plot.New()
	p2.Title.Text = "power spectrum (Welch, Hann window)"
	p2.X.Label.Text = "frequency (cycles per " + singular(timeUnit) + ")"
	p2.Y.Label.Text = "power (log scale)"
	if relative {
		p2.Y.Label.Text = "power relative to its peak (log scale)"
	}
	var spec plotter.XYs
	for k := 1; k < len(f); k++ {
		if pw[k] > 0 && !math.IsInf(pw[k], 0) {
			spec = append(spec, plotter.XY{X: f[k], Y: pw[k]})
		}
	}
	// A log axis needs two positive values (gonum/plot panics on an empty one); a constant
	// record has no spectrum to draw.
	if len(spec) < 2 {
		p2.Title.Text = "power spectrum: none (the record is constant or too short)"
	} else {
		p2.Y.Scale = plot.LogScale{}
		p2.Y.Tick.Marker = plot.LogTicks{Prec: -1}
		ls, err := plotter.NewLine(spec)
		if err != nil {
			return Figure{}, err
		}
		ls.Color = color.RGBA{R: 0xd9, G: 0x6b, B: 0x0b, A: 0xff}
		ls.Width = vg.Points(0.8)
		p2.Add(plotter.NewGrid(), ls)
	}
	return Figure{Name: name, Caption: "The record as read (after any preprocessing) and its power spectrum.",
		Width: 9 * vg.Inch, Height: 6.5 * vg.Inch, Rows: [][]*plot.Plot{{p1}, {p2}}}, nil
}

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
	var big float64
	for _, v := range x {
		big = math.Max(big, math.Abs(v))
	}
	e := 0
	if big > 0 && !math.IsInf(big, 0) {
		_, e = math.Frexp(big)
	}
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

// welch returns the frequencies and the Welch spectrum of x with the symmetric Hann window and
// segments of 4096 samples, halved (down to 16) until one fits the record; nil for records
// shorter than 16 samples.
func welch(x []float64, dt float64) ([]float64, []float64) {
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

func itoa(n int) string {
	if n < 0 {
		return "-" + itoa(-n)
	}
	if n < 10 {
		return string(rune('0' + n))
	}
	return itoa(n/10) + string(rune('0'+n%10))
}

// singular turns "time units" into "time unit" and "seconds" into "second".
func singular(u string) string {
	if len(u) > 1 && u[len(u)-1] == 's' {
		return u[:len(u)-1]
	}
	return u
}
