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
	for i := 0; i < n; i++ {
		trace[i] = plotter.XY{X: float64(i) * dt, Y: x[i]}
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

	f, pw := welch(x, dt)
	p2 := plot.New()
	p2.Title.Text = "power spectrum (Welch, Hann window)"
	p2.X.Label.Text = "frequency (cycles per " + singular(timeUnit) + ")"
	p2.Y.Label.Text = "power (log scale)"
	p2.Y.Scale = plot.LogScale{}
	p2.Y.Tick.Marker = plot.LogTicks{Prec: -1}
	var spec plotter.XYs
	for k := 1; k < len(f); k++ {
		if pw[k] > 0 && !math.IsInf(pw[k], 0) {
			spec = append(spec, plotter.XY{X: f[k], Y: pw[k]})
		}
	}
	if len(spec) > 1 {
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
