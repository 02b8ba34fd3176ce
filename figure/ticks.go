package figure

import (
	"math"
	"strconv"
	"strings"

	"gonum.org/v1/plot"
)

// MaxLabels is the most tick labels an axis carries.
const MaxLabels = 8

// Ticks marks a linear axis at multiples of a "nice" step (1, 2 or 5 × 10^k) with at most N
// labels (0 means 7, fewer on narrow panels: see Write), each written with no trailing zero:
// "250", not "250.00"; "1" and "0.5", not "1.0" and "0.5". Very large or very small values are written as "1.5e6".
type Ticks struct {
	N int // the most labels; 0 means 7, values above MaxLabels mean MaxLabels
}

// Ticks implements plot.Ticker.
func (t Ticks) Ticks(lo, hi float64) []plot.Tick {
	n := t.N
	if n <= 0 {
		n = 7
	}
	n = min(max(n, 2), MaxLabels)
	if math.IsNaN(lo) || math.IsNaN(hi) || math.IsInf(lo, 0) || math.IsInf(hi, 0) {
		return nil
	}
	if hi < lo {
		lo, hi = hi, lo
	}
	if hi == lo {
		return []plot.Tick{{Value: lo, Label: formatTick(lo, niceStep(math.Abs(lo)/2), math.Abs(lo))}}
	}
	// The smallest nice step that gives at most n labels; if that leaves fewer than three,
	// the next smaller step when it gives at most n+1 (and MaxLabels).
	count := func(step float64) (float64, float64, int) {
		a, b := math.Ceil(lo/step-1e-9), math.Floor(hi/step+1e-9)
		return a, b, int(b - a + 1)
	}
	step := niceStep((hi - lo) / float64(4*n))
	prev := 0.0
	first, last, k := count(step)
	for k > n {
		prev = step
		step = niceStep(step * 1.01)
		first, last, k = count(step)
	}
	if k < 3 && prev > 0 {
		if a, b, kp := count(prev); kp <= min(n+1, MaxLabels) {
			step, first, last = prev, a, b
		}
	}
	span := math.Max(math.Abs(lo), math.Abs(hi))
	ticks := make([]plot.Tick, 0, int(last-first)+1)
	for k := first; k <= last; k++ {
		v := k * step
		ticks = append(ticks, plot.Tick{Value: v, Label: formatTick(v, step, span)})
	}
	return ticks
}

// niceStep is the smallest of 1, 2, 2.5, 5 × 10^k not below raw.
func niceStep(raw float64) float64 {
	if !(raw > 0) || math.IsInf(raw, 0) {
		return 1
	}
	e := math.Floor(math.Log10(raw))
	p := math.Pow(10, e)
	for _, m := range []float64{1, 2, 2.5, 5, 10} {
		if m*p >= raw*(1-1e-9) {
			return m * p
		}
	}
	return 10 * p
}

// formatTick writes v, a multiple of step, with the decimals step needs; span is the largest
// magnitude on the axis and decides between plain and exponent notation.
func formatTick(v, step, span float64) string {
	if v == 0 || math.Abs(v) < step*1e-6 {
		return "0"
	}
	se := -decimals(step)
	if span >= 1e6 || span < 1e-3 {
		e := int(math.Floor(math.Log10(math.Abs(v)) + 1e-9))
		if span >= 1e6 {
			e = int(math.Floor(math.Log10(span) + 1e-9))
		}
		dec := max(0, e-se)
		m := trimZeros(strconv.FormatFloat(v/math.Pow(10, float64(e)), 'f', dec, 64))
		return m + "e" + strconv.Itoa(e)
	}
	return trimZeros(strconv.FormatFloat(v, 'f', max(0, -se), 64))
}

// decimals is the number of decimals that writes step exactly (0.25 → 2, 50 → 0).
func decimals(step float64) int {
	for d := -20; d < 20; d++ {
		v := step * math.Pow(10, float64(d))
		if math.Abs(v-math.Round(v)) < 1e-6*v {
			return d
		}
	}
	return 20
}

// trimZeros drops trailing zeros after a decimal point, and the point itself: "1.50" → "1.5",
// "2.0" → "2".
func trimZeros(s string) string {
	if !strings.Contains(s, ".") {
		return s
	}
	s = strings.TrimRight(s, "0")
	return strings.TrimSuffix(s, ".")
}

// LogTicks marks a log axis: decades labelled, thinned to at most N labels (0 means
// MaxLabels) by labelling every second, third… decade; the other decades (and, over at most
// three decades, 2…9 × 10^k) get unlabelled minor ticks. A range within one decade is
// labelled at 1, 2 and 5 × 10^k, or like a linear axis.
type LogTicks struct {
	N int // the most labels; 0 means MaxLabels
}

// Ticks implements plot.Ticker.
func (t LogTicks) Ticks(lo, hi float64) []plot.Tick {
	n := t.N
	if n <= 0 || n > MaxLabels {
		n = MaxLabels
	}
	if hi < lo {
		lo, hi = hi, lo
	}
	if !(lo > 0) || math.IsInf(hi, 0) || math.IsNaN(hi) {
		return nil
	}
	const eps = 1e-9
	e0 := int(math.Ceil(math.Log10(lo) - eps))
	e1 := int(math.Floor(math.Log10(hi) + eps))
	decades := e1 - e0 + 1
	var ticks []plot.Tick
	if decades >= 2 {
		stride := (decades + n - 1) / n
		for stride > 1 && countMultiples(e0, e1, stride) > n {
			stride++
		}
		for e := e0; e <= e1; e++ {
			v := math.Pow(10, float64(e))
			if mod(e, stride) == 0 {
				ticks = append(ticks, plot.Tick{Value: v, Label: formatPow(1, e)})
			} else {
				ticks = append(ticks, plot.Tick{Value: v})
			}
		}
		if decades <= 4 {
			for e := e0 - 1; e <= e1; e++ {
				for m := 2; m <= 9; m++ {
					v := float64(m) * math.Pow(10, float64(e))
					if v >= lo*(1-eps) && v <= hi*(1+eps) {
						ticks = append(ticks, plot.Tick{Value: v})
					}
				}
			}
		}
		return ticks
	}
	// Less than two decades: 1, 2, 5 × 10^k.
	for e := e0 - 1; e <= e1; e++ {
		for _, m := range []int{1, 2, 5} {
			v := float64(m) * math.Pow(10, float64(e))
			if v >= lo*(1-eps) && v <= hi*(1+eps) {
				ticks = append(ticks, plot.Tick{Value: v, Label: formatPow(m, e)})
			}
		}
	}
	if len(ticks) >= 2 && len(ticks) <= n {
		return ticks
	}
	return Ticks{N: min(n, 5)}.Ticks(lo, hi)
}

func countMultiples(e0, e1, s int) int {
	c := 0
	for e := e0; e <= e1; e++ {
		if mod(e, s) == 0 {
			c++
		}
	}
	return c
}

func mod(a, b int) int { return ((a % b) + b) % b }

// formatPow writes m × 10^e plainly for 10^-3 … 10^4 ("0.002", "5000"), else as "2e-6".
func formatPow(m, e int) string {
	if e >= -3 && e <= 4 {
		s := strconv.FormatFloat(float64(m)*math.Pow(10, float64(e)), 'f', max(0, -e), 64)
		return strings.TrimSpace(s)
	}
	return strconv.Itoa(m) + "e" + strconv.Itoa(e)
}

// IntegerTicks labels every integer of the axis range, thinned to at most N labels (0 means
// MaxLabels) by labelling multiples of 2, 5, 10…; for counts such as dimensions and lags.
type IntegerTicks struct {
	N int
}

// Ticks implements plot.Ticker.
func (t IntegerTicks) Ticks(lo, hi float64) []plot.Tick {
	n := t.N
	if n <= 0 || n > MaxLabels {
		n = MaxLabels
	}
	if math.IsNaN(lo) || math.IsNaN(hi) || math.IsInf(lo, 0) || math.IsInf(hi, 0) {
		return nil
	}
	a, b := math.Ceil(lo), math.Floor(hi)
	if b-a+1 > float64(n) {
		return Ticks{N: n}.Ticks(lo, hi)
	}
	var ticks []plot.Tick
	for v := a; v <= b; v++ {
		ticks = append(ticks, plot.Tick{Value: v, Label: strconv.Itoa(int(v))})
	}
	return ticks
}
