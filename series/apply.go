package series

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// secondsPer gives the length of each time unit suffix in seconds. A year is the Julian year
// of 365.25 days (IAU convention).
func secondsPer(unit string) (float64, bool) {
	switch unit {
	case "ms":
		return 1e-3, true
	case "s":
		return 1, true
	case "min":
		return 60, true
	case "h":
		return 3600, true
	case "d":
		return 86400, true
	case "y":
		return 365.25 * 86400, true
	}
	return 0, false
}

// boundIndex turns a From/To value into a sample index of s (not clamped).
//
//   - "1000": a sample index, 0-based (the first sample is 0).
//   - "2.5s", "500ms", "10min", "3h", "2d", "1.5y": a time with a unit suffix, converted to
//     the record's time unit (Series.TimeUnit; a year is 365.25 days). The record must state
//     its unit (a time column named like "time (s)" or "year", or a WAV file).
//   - "12.5t": a time in the record's own unit, whatever it is.
//
// Times are on the record's clock: the time column's stamps, or 0 at the first sample when
// there is none (so with T0 = 1959 "1960y" is the start of 1960). The index is the first
// sample at or after the time.
func boundIndex(spec, flag string, s *Series) (int, error) {
	bad := func(format string, a ...any) error {
		return &InputError{Path: "", Msg: fmt.Sprintf("--%s %q: ", flag, spec) + fmt.Sprintf(format, a...)}
	}
	spec = strings.TrimSpace(spec)
	if k, err := strconv.Atoi(spec); err == nil {
		if k < 0 {
			return 0, bad("a sample index cannot be negative")
		}
		return k, nil
	}
	i := len(spec)
	for i > 0 && (spec[i-1] >= 'a' && spec[i-1] <= 'z' || spec[i-1] >= 'A' && spec[i-1] <= 'Z') {
		i--
	}
	num, unit := strings.TrimSpace(spec[:i]), spec[i:]
	if unit == "" {
		return 0, bad("give a whole sample index (1000) or a time with a unit (2.5s, 500ms, 10min, 3h, 2d, 1.5y, or 12.5t in the record's own time unit)")
	}
	v, err := strconv.ParseFloat(num, 64)
	if err != nil || math.IsNaN(v) || math.IsInf(v, 0) {
		return 0, bad("%q is not a number", num)
	}
	if unit != "t" {
		per, ok := secondsPer(unit)
		if !ok {
			return 0, bad("unknown unit %q: use ms, s, min, h, d, y, or t for the record's own time unit", unit)
		}
		own, ok := secondsPer(s.TimeUnit)
		if !ok {
			return 0, bad("the record does not state its time unit; use the t suffix (a time in the record's own unit) or a sample index")
		}
		v = v * per / own
	}
	if !(s.Dt > 0) {
		return 0, bad("the record has no positive sampling interval")
	}
	x := (v - s.T0) / s.Dt
	if x <= 0 {
		return 0, nil
	}
	if x > float64(math.MaxInt32) {
		return math.MaxInt32, nil
	}
	// The first sample at or after the time, forgiving round-off of the division.
	return int(math.Ceil(x - 1e-9*math.Max(1, x))), nil
}

// Apply returns a new Series with the preprocessing applied, in this order: range selection
// (From, To), decimation (every K-th sample, Dt×K; no anti-alias filtering, so low-pass the
// record first if it holds power above the new Nyquist frequency), detrending (mean: subtract
// the mean; linear: subtract the least-squares straight line against the sample index) and
// standardisation (zero mean, unit population variance). s is not changed.
func (p Prep) Apply(s *Series) (*Series, error) {
	n := len(s.Values)
	from, to := 0, n
	var err error
	if p.From != "" {
		if from, err = boundIndex(p.From, "from", s); err != nil {
			return nil, err
		}
	}
	if p.To != "" {
		if to, err = boundIndex(p.To, "to", s); err != nil {
			return nil, err
		}
	}
	from, to = min(from, n), min(to, n)
	if from >= to {
		return nil, &InputError{Msg: fmt.Sprintf("empty series: --from %q and --to %q select no samples of the %d", p.From, p.To, n)}
	}
	k := p.Decimate
	if k < 0 {
		return nil, &InputError{Msg: fmt.Sprintf("--decimate %d: give a positive factor", k)}
	}
	if k < 1 {
		k = 1
	}
	out := *s
	out.T0 = s.T0 + float64(from)*s.Dt
	out.Dt = s.Dt * float64(k)
	out.Values = make([]float64, 0, (to-from+k-1)/k)
	for i := from; i < to; i += k {
		out.Values = append(out.Values, s.Values[i])
	}
	x := out.Values
	switch p.Detrend {
	case "", "none":
	case "mean":
		m := mean(x)
		for i := range x {
			x[i] -= m
		}
	case "linear":
		a, b := lineFit(x)
		for i := range x {
			x[i] -= a + b*float64(i)
		}
	default:
		return nil, &InputError{Msg: fmt.Sprintf("--detrend %q: use none, mean or linear", p.Detrend)}
	}
	if p.Standardize {
		if err := CheckVariable(x); err != nil {
			return nil, fmt.Errorf("--standardize: %w", err)
		}
		e := scaleExp(x) // scaled so that x − m cannot overflow nor a square underflow
		ms, sds := scaledMeanStd(x, e)
		for i := range x {
			x[i] = (math.Ldexp(x[i], -e) - ms) / sds
		}
	}
	return &out, nil
}

func mean(x []float64) float64 {
	var s float64
	for _, v := range x {
		s += v
	}
	return s / float64(len(x))
}

// lineFit returns the least-squares line a + b·i through x against the index i = 0…n−1, using
// centred sums for accuracy.
func lineFit(x []float64) (a, b float64) {
	n := float64(len(x))
	if len(x) < 2 {
		return mean(x), 0
	}
	ic := (n - 1) / 2
	m := mean(x)
	var sxy, sxx float64
	for i, v := range x {
		d := float64(i) - ic
		sxy += d * (v - m)
		sxx += d * d
	}
	b = sxy / sxx
	return m - b*ic, b
}
