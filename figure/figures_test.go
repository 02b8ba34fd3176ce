package figure

import (
	"bytes"
	"math"
	"strings"
	"testing"

	"gonum.org/v1/plot"

	"unfold/analysis"
	"unfold/dimension"
	"unfold/partition"
	"unfold/regime"
	"unfold/symbolic"
)

// logistic returns n values of the logistic map x ← 4x(1−x) from x0 (an exact chaotic map:
// Ulam & von Neumann 1947).
func logistic(n int, x0 float64) []float64 {
	x := make([]float64, n)
	v := x0
	for i := range x {
		v = 4 * v * (1 - v)
		x[i] = v
	}
	return x
}

// writeChecked draws rows on the canvas SizeFor gives, checks the SVG (checkSVG) and that it
// holds only colours of the project's style (InStyle), and returns it.
func writeChecked(t *testing.T, name string, rows [][]*plot.Plot) string {
	t.Helper()
	w, h := SizeFor(rows)
	var b bytes.Buffer
	if err := Write(&b, "svg", w, h, rows); err != nil {
		t.Fatalf("%s: %v", name, err)
	}
	checkSVG(t, name, b.Bytes())
	if off := OffStyle(b.String()); len(off) > 0 {
		t.Errorf("%s: colours outside the project's palette: %v", name, off)
	}
	return b.String()
}

// slopesResult is a correlation-sum result with nine dimensions whose slopes saturate at 1.2
// (a synthetic curve set, common practice for a figure test).
func slopesResult() *dimension.Result {
	r := &dimension.Result{D2: 1.21, Dim: 9, Norm: "max"}
	for k := 0; k < 30; k++ {
		r.Radii = append(r.Radii, math.Pow(10, -3+0.1*float64(k)))
	}
	for m := 1; m <= 9; m++ {
		c := dimension.Curve{Dim: m, Fitted: m >= 2, From: 8, To: 20}
		for k := range r.Radii {
			s := math.Min(float64(m), 1.2) * (1 - float64(k)/40)
			if k == 0 || k == len(r.Radii)-1 {
				s = math.NaN()
			}
			c.Slopes = append(c.Slopes, s)
		}
		r.Curves = append(r.Curves, c)
	}
	return r
}

// TestFiguresStyle draws every figure function of figure.go on ordinary inputs: valid SVG with
// a viewBox, text at MinTextSize or more in a sans-serif face, none of the default cycle.
func TestFiguresStyle(t *testing.T) {
	x := logistic(6000, 0.3)

	p, err := Slopes(slopesResult(), "slopes")
	if err != nil {
		t.Fatal(err)
	}
	// nine dimensions are named at the curve ends: the legend holds only the range and D2
	r := p.Legend.Rectangle(drawCanvas())
	if h := (r.Max.Y - r.Min.Y).Points(); h > 3*1.5*MinTextSize.Points() {
		t.Errorf("slopes: legend %.0f pt high, want at most 3 entries (curves named at their ends)", h)
	}
	svg := writeChecked(t, "slopes", [][]*plot.Plot{{p}})
	for _, m := range []string{"m = 1", "m = 9"} {
		if !strings.Contains(svg, m) {
			t.Errorf("slopes: no label %q", m)
		}
	}

	spec := &regime.Spectrum{}
	for k := 0; k < 200; k++ {
		spec.Freq = append(spec.Freq, float64(k)*0.01)
		spec.Power = append(spec.Power, math.Pow(10, -float64(k)/15)+1e-9)
	}
	an := &regime.Analysis{Verdict: &regime.Verdict{Regime: "chaotic"}, Evidence: &regime.Evidence{
		Lines:      &regime.Lines{Spectrum: spec, Peaks: []regime.Peak{{Freq: 0.1, Power: 0.2}}},
		Prediction: &regime.RankTest{Name: "prediction error", Data: 0.2, Surrogates: []float64{0.8, 0.9, 1, 0.95, 0.85}, P: 0.05},
		Reversal:   &regime.RankTest{Name: "time-reversal asymmetry", Data: 0.5, Surrogates: []float64{0.1, -0.1, 0.05, 0, 0.02}, P: 0.05},
	}}
	rows, err := Evidence(an, "ev", "")
	if err != nil {
		t.Fatal(err)
	}
	if len(rows[0]) != 2 {
		t.Errorf("evidence: %d panels, want 2 (spectrum, surrogate tests)", len(rows[0]))
	}
	svg = writeChecked(t, "evidence", rows)
	if strings.Count(svg, "<text") < 20 {
		t.Error("evidence: too few texts")
	}

	ep := analysis.EntropyParams{Alphabet: "01", RateLength: 4}
	er := analysis.EntropyResult{EntropyRate: 1}
	for l := 1; l <= 8; l++ {
		er.BlockEntropies = append(er.BlockEntropies, symbolic.Block{Length: l, Bits: float64(l), Supported: l <= 6})
		er.EntropyRates = append(er.EntropyRates, symbolic.Rate{Length: l, Bits: 1})
	}
	rows, err = Entropy(ep, er)
	if err != nil {
		t.Fatal(err)
	}
	writeChecked(t, "entropy", rows)

	sr := &analysis.SymbolsRun{Values: x, ValueName: "x", Part: &partition.Partition{Kind: "critical", Thresholds: []float64{0.5}}}
	sp, drawn, err := Symbols(sr, "logistic")
	if err != nil {
		t.Fatal(err)
	}
	if drawn != SymbolsMapPoints {
		t.Errorf("symbols: %d pairs drawn, want %d", drawn, SymbolsMapPoints)
	}
	writeChecked(t, "symbols", [][]*plot.Plot{{sp}})

	rm, err := ReturnMap(x, "x", "logistic")
	if err != nil {
		t.Fatal(err)
	}
	checkSquare(t, "return map", rm, x)
	if w, h := SizeFor([][]*plot.Plot{{rm}}); h < w*0.9 {
		t.Errorf("return map: canvas %g × %g pt, want about square", w.Points(), h.Points())
	}
	writeChecked(t, "return map", [][]*plot.Plot{{rm}})

	a, err := DelayPanel(x, 1, "before")
	if err != nil {
		t.Fatal(err)
	}
	b, err := DelayPanel(x, 2, "after")
	if err != nil {
		t.Fatal(err)
	}
	checkSquare(t, "delay panel", a, x)
	writeChecked(t, "delay panels", [][]*plot.Plot{{a, b}})
}

// checkSquare checks equal x and y ranges that hold every value of x (no clipped point).
func checkSquare(t *testing.T, name string, p *plot.Plot, x []float64) {
	t.Helper()
	if p.X.Min != p.Y.Min || p.X.Max != p.Y.Max {
		t.Errorf("%s: x range [%g, %g], y range [%g, %g]: want the same", name, p.X.Min, p.X.Max, p.Y.Min, p.Y.Max)
	}
	lo, hi := minOf(x), maxOf(x)
	if lo < p.X.Min || hi > p.X.Max || lo <= p.X.Min || hi >= p.X.Max {
		t.Errorf("%s: values [%g, %g] not strictly inside the axes [%g, %g]", name, lo, hi, p.X.Min, p.X.Max)
	}
}

// TestFiguresDegenerate feeds the figure functions of figure.go nil, empty, constant and
// non-finite inputs: each gives a figure or an error, never a panic.
func TestFiguresDegenerate(t *testing.T) {
	nan, inf := math.NaN(), math.Inf(1)
	signals := map[string][]float64{
		"empty": {}, "single": {1}, "two": {1, 2}, "constant": {2, 2, 2, 2, 2, 2},
		"nan": {nan, nan, nan, nan}, "mixed": {1, nan, 2, inf, 3, -inf, 0.5, 0.25},
	}
	for name, x := range signals {
		p, err := ReturnMap(x, "x", name)
		draw2(t, "returnmap/"+name, [][]*plot.Plot{{p}}, err)
		for _, lag := range []int{0, 1, 3} {
			p, err = DelayPanel(x, lag, name)
			draw2(t, "delay/"+name, [][]*plot.Plot{{p}}, err)
		}
		p, _, err = Symbols(&analysis.SymbolsRun{Values: x, Part: &partition.Partition{Thresholds: []float64{nan, 1}}}, name)
		draw2(t, "symbols/"+name, [][]*plot.Plot{{p}}, err)

		r := &dimension.Result{Radii: x, D2: nan, Curves: []dimension.Curve{{Dim: 1, Slopes: x, Fitted: true, From: 0, To: 10}}}
		p, err = Slopes(r, name)
		draw2(t, "slopes/"+name, [][]*plot.Plot{{p}}, err)

		spec := &regime.Spectrum{Freq: x, Power: x}
		an := &regime.Analysis{Evidence: &regime.Evidence{Lines: &regime.Lines{Spectrum: spec},
			Prediction: &regime.RankTest{Name: "e", Data: nan, Surrogates: x}}}
		rows, err := Evidence(an, name, "")
		draw2(t, "evidence/"+name, rows, err)

		var er analysis.EntropyResult
		for i, v := range x {
			er.BlockEntropies = append(er.BlockEntropies, symbolic.Block{Length: i + 1, Bits: v})
			er.EntropyRates = append(er.EntropyRates, symbolic.Rate{Length: i + 1, Bits: v})
		}
		for _, alpha := range []string{"", "0", "01"} {
			rows, err = Entropy(analysis.EntropyParams{Alphabet: alpha, RateLength: 2}, er)
			draw2(t, "entropy/"+name, rows, err)
		}
	}
	if _, err := Fractal(nil, "x"); err == nil {
		t.Error("Fractal(nil): want an error")
	}
	if _, err := Slopes(nil, "x"); err == nil {
		t.Error("Slopes(nil): want an error")
	}
	if _, err := Lyapunov(nil, "x", ""); err == nil {
		t.Error("Lyapunov(nil): want an error")
	}
	if _, err := Evidence(nil, "x", ""); err == nil {
		t.Error("Evidence(nil): want an error")
	}
	if _, err := Evidence(&regime.Analysis{Evidence: &regime.Evidence{}}, "x", ""); err == nil {
		t.Error("Evidence without spectrum and tests: want an error")
	}
	if _, _, err := Symbols(nil, "x"); err == nil {
		t.Error("Symbols(nil): want an error")
	}
}

// TestSpread checks the label nudging: order kept, gaps at least the given one, values apart
// already left alone.
func TestSpread(t *testing.T) {
	got := spread([]float64{0, 0, 0, 5}, 1)
	want := []float64{0, 1, 2, 5}
	for i := range want {
		if got[i] != want[i] {
			t.Fatalf("spread = %v, want %v", got, want)
		}
	}
}

// TestTimeUnitOnAxes: the record's time unit reaches the axes of the divergence and spectrum
// figures (issue 15: no axis says "time units" when the header states seconds).
func TestTimeUnitOnAxes(t *testing.T) {
	an := &regime.Analysis{Evidence: &regime.Evidence{Lines: &regime.Lines{Kind: regime.LinesBroadband,
		Spectrum: &regime.Spectrum{Freq: []float64{0, 1, 2, 3}, Power: []float64{1, 2, 1, 0.5}}}}}
	rows, err := Evidence(an, "ev", "s")
	if err != nil {
		t.Fatal(err)
	}
	if got := rows[0][0].X.Label.Text; got != "frequency [cycles per s]" {
		t.Errorf("spectrum axis %q, want cycles per s", got)
	}
}
