package models

import (
	"fmt"
	"math"
	"strconv"
	"strings"
)

// MaxGrid is the largest number of values a parameter grid may hold.
const MaxGrid = 100000

// ParseGrid reads the values of a parameter sweep: either a range "START:STOP:STEP" or a
// comma-separated list "3.5,3.835,4". A range holds START + i·STEP for i = 0, 1, … up to STOP
// inclusive, with STOP itself taken when it lies within 10⁻⁹ of a step of a grid point
// (so 3.5:4:0.02 gives 26 values whose ends are exactly 3.5 and 4). Each value is rounded to
// the decimals written in START and STEP, so 3.5 + 13·0.02 is 3.76 and not 3.7600000000000002.
// STEP may be negative when STOP < START. A list keeps its order; its values must be distinct.
func ParseGrid(s string) ([]float64, error) {
	s = strings.TrimSpace(s)
	if s == "" {
		return nil, fmt.Errorf("empty parameter grid: give START:STOP:STEP or a comma-separated list")
	}
	if strings.Contains(s, ":") {
		parts := strings.Split(s, ":")
		if len(parts) != 3 {
			return nil, fmt.Errorf("parameter grid %q: a range is START:STOP:STEP (three numbers)", s)
		}
		var v [3]float64
		for i, p := range parts {
			x, err := gridNumber(p)
			if err != nil {
				return nil, fmt.Errorf("parameter grid %q: %w", s, err)
			}
			v[i] = x
		}
		start, stop, step := v[0], v[1], v[2]
		switch {
		case step == 0:
			return nil, fmt.Errorf("parameter grid %q: the step must not be zero", s)
		case (stop-start)*step < 0:
			return nil, fmt.Errorf("parameter grid %q: the step %g goes away from STOP %g; give a step of the other sign", s, step, stop)
		}
		span := (stop - start) / step
		n := int(math.Floor(span+1e-9)) + 1
		if n > MaxGrid {
			return nil, fmt.Errorf("parameter grid %q holds %d values, more than %d; give a larger step", s, n, MaxGrid)
		}
		dec := max(decimals(parts[0]), decimals(parts[2]))
		out := make([]float64, n)
		for i := range out {
			out[i] = roundTo(start+float64(i)*step, dec)
		}
		if math.Abs(float64(n-1)-span) <= 1e-9 {
			out[n-1] = stop
		}
		return out, nil
	}
	var out []float64
	seen := map[float64]bool{}
	for _, p := range strings.Split(s, ",") {
		x, err := gridNumber(p)
		if err != nil {
			return nil, fmt.Errorf("parameter grid %q: %w", s, err)
		}
		if seen[x] {
			return nil, fmt.Errorf("parameter grid %q: the value %g is given twice", s, x)
		}
		seen[x] = true
		out = append(out, x)
	}
	if len(out) > MaxGrid {
		return nil, fmt.Errorf("parameter grid %q holds more than %d values", s, MaxGrid)
	}
	return out, nil
}

func gridNumber(p string) (float64, error) {
	x, err := strconv.ParseFloat(strings.TrimSpace(p), 64)
	if err != nil || math.IsNaN(x) || math.IsInf(x, 0) {
		return 0, fmt.Errorf("%q is not a finite number", strings.TrimSpace(p))
	}
	return x, nil
}

// decimals counts the digits after the decimal point of a number as written (-1 when it has
// an exponent, meaning: do not round).
func decimals(p string) int {
	p = strings.TrimSpace(p)
	if strings.ContainsAny(p, "eE") {
		return -1
	}
	if i := strings.IndexByte(p, '.'); i >= 0 {
		return len(p) - i - 1
	}
	return 0
}

func roundTo(x float64, dec int) float64 {
	if dec < 0 {
		return x
	}
	y, err := strconv.ParseFloat(strconv.FormatFloat(x, 'f', dec, 64), 64)
	if err != nil {
		return x
	}
	return y
}

// GridDecimals returns the number of decimals that writes every value of grid exactly as
// the shortest decimal that reads back to it (at most 12), for file names and labels.
func GridDecimals(grid []float64) int {
	d := 0
	for _, v := range grid {
		s := strconv.FormatFloat(v, 'f', -1, 64)
		if i := strings.IndexByte(s, '.'); i >= 0 {
			d = max(d, len(s)-i-1)
		}
	}
	return min(d, 12)
}

// SweepParam names the parameter a sweep varies: a scalar parameter ("r", "c"), or one
// element of a list parameter ("amplitudes[2]", 1-based), so that for example the amplitude
// ratio of two sines can be swept with the first amplitude held at 1.
type SweepParam struct {
	Name  string // the model parameter
	Index int    // 1-based element of a list parameter; 0 for a scalar parameter
}

// Label is the name of the swept parameter as a column header and in file names: "r", or
// "amplitudes_2" for an element of a list.
func (p SweepParam) Label() string {
	if p.Index > 0 {
		return p.Name + "_" + strconv.Itoa(p.Index)
	}
	return p.Name
}

// ParseSweepParam reads "NAME" or "NAME[K]" and checks it against the model: the parameter
// must exist; a list parameter needs an element K ≥ 1 and a scalar parameter takes none.
func (s Spec) ParseSweepParam(text string) (SweepParam, error) {
	text = strings.TrimSpace(text)
	p := SweepParam{Name: text}
	if i := strings.IndexByte(text, '['); i >= 0 {
		if !strings.HasSuffix(text, "]") {
			return p, fmt.Errorf("sweep parameter %q: write NAME[K] with a 1-based element K", text)
		}
		k, err := strconv.Atoi(text[i+1 : len(text)-1])
		if err != nil || k < 1 {
			return p, fmt.Errorf("sweep parameter %q: the element K in NAME[K] is a whole number from 1", text)
		}
		p = SweepParam{Name: text[:i], Index: k}
	}
	par, ok := s.Param(p.Name)
	switch {
	case !ok:
		return p, fmt.Errorf("model %s has no parameter %q (its parameters: %s)", s.Name, p.Name, s.paramNames())
	case par.List && p.Index == 0:
		return p, fmt.Errorf("model %s: parameter %s is a list; sweep one element, e.g. %s[2]", s.Name, p.Name, p.Name)
	case !par.List && p.Index > 0:
		return p, fmt.Errorf("model %s: parameter %s takes one value; sweep it as %s", s.Name, p.Name, p.Name)
	}
	return p, nil
}

// SweepValues returns the model's parameter values for every value of grid: the given values
// (defaults for the rest) with the swept parameter set to the grid value. For an element K of
// a list parameter the list is first extended to K elements by repeating its last value (so
// the default single amplitude of every tone stays the amplitude of the others). Every set
// of values is checked by building the model, and an invalid one is an error naming the value.
func (s Spec) SweepValues(given Values, p SweepParam, grid []float64) ([]Values, error) {
	base, err := s.Resolve(given)
	if err != nil {
		return nil, err
	}
	out := make([]Values, len(grid))
	for i, x := range grid {
		v := make(Values, len(base))
		for k, vals := range base {
			v[k] = append([]float64(nil), vals...)
		}
		if p.Index == 0 {
			v[p.Name] = []float64{x}
		} else {
			l := v[p.Name]
			for len(l) < p.Index {
				l = append(l, l[len(l)-1])
			}
			l[p.Index-1] = x
			v[p.Name] = l
		}
		if _, err := s.New(v); err != nil {
			return nil, fmt.Errorf("%s = %g: %w", p.Label(), x, err)
		}
		out[i] = v
	}
	return out, nil
}
