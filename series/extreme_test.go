package series

import (
	"errors"
	"math"
	"testing"
)

// extremeRecord is a square-ish wave a·(±1, ±0.5) of 64 samples: mean 0 and population
// standard deviation a·√((1+0.25)/2) exactly (arithmetic).
func extremeRecord(a float64) []float64 {
	x := make([]float64, 64)
	for i := range x {
		v := a
		if i%4 >= 2 {
			v = a / 2
		}
		if i%2 == 1 {
			v = -v
		}
		x[i] = v
	}
	return x
}

func TestDescribeExtremeMagnitudes(t *testing.T) {
	for _, a := range []float64{1.5e308, -1.5e308, 1e-310, 4.9e-324 * 4, 1} {
		x := extremeRecord(a)
		sm, err := Describe(&Series{Values: x, Dt: 1})
		if err != nil {
			t.Fatal(err)
		}
		want := math.Abs(a) * math.Sqrt(0.625) // exact (arithmetic)
		if math.IsInf(sm.Mean, 0) || math.IsNaN(sm.Mean) || math.Abs(sm.Mean) > 1e-15*math.Abs(a) {
			t.Errorf("a=%g: mean %g, want 0", a, sm.Mean)
		}
		tol := 1e-12 * want
		if a == 4.9e-324*4 {
			tol = 4.9e-324 // denormals carry only a few bits
		}
		if math.Abs(sm.Std-want) > tol {
			t.Errorf("a=%g: std %g, want %g", a, sm.Std, want)
		}
		if len(sm.Cautions) > 0 && sm.Cautions[0] == "the signal is constant: there is nothing to analyse" {
			t.Errorf("a=%g: called constant", a)
		}
		if err := CheckVariable(x); err != nil {
			t.Errorf("a=%g: CheckVariable: %v", a, err)
		}
		// exact: the smallest step between distinct values is a/2 (|a|/2 − (−|a|/2) = |a| is larger).
		if q := sm.Quantization; math.Abs(q-math.Abs(a)/2) > 1e-9*math.Abs(a) && a != 4.9e-324*4 {
			t.Errorf("a=%g: quantisation %g, want %g", a, q, math.Abs(a)/2)
		}
		if math.Abs(sm.Stationarity.HalfStds[0]-want) > tol {
			t.Errorf("a=%g: half std %g, want %g", a, sm.Stationarity.HalfStds[0], want)
		}
		s, err := (Prep{Standardize: true}).Apply(&Series{Values: x, Dt: 1})
		if err != nil {
			t.Fatal(err)
		}
		if m, sd := MeanStd(s.Values); math.Abs(m) > 1e-12 || math.Abs(sd-1) > 1e-6 {
			t.Errorf("a=%g: standardised mean %g std %g", a, m, sd)
		}
	}
}

func TestConstantOnlyWhenAllEqual(t *testing.T) {
	var ce *ErrConstant
	negZero := math.Copysign(0, -1)
	for _, x := range [][]float64{
		{7, 7, 7, 7, 7, 7, 7, 7, 7, 7},
		{negZero, negZero, negZero, negZero, negZero, negZero, negZero, negZero},
		{0, negZero, 0, negZero, 0, negZero, 0, negZero},
		{1e-310, 1e-310, 1e-310, 1e-310, 1e-310, 1e-310, 1e-310, 1e-310},
	} {
		if err := CheckVariable(x); !errors.As(err, &ce) {
			t.Errorf("%v: %v, want *ErrConstant", x, err)
		}
		sm, err := Describe(&Series{Values: x, Dt: 1})
		if err != nil || sm.Std != 0 || len(sm.Cautions) != 1 || math.Signbit(sm.Std) {
			t.Errorf("%v: %+v, %v", x, sm, err)
		}
	}
	if err := CheckVariable([]float64{-3, -3}); err == nil || err.Error() != "the signal is constant (all 2 samples are -3): there is no dynamics to analyse" {
		t.Errorf("message: %v", err)
	}
	// Not constant: one sample differs by one unit in the last place.
	for _, x := range [][]float64{
		{1, 1, 1, 1, 1, 1, 1, math.Nextafter(1, 2)},
		{0, 0, 0, 0, 0, 0, 0, 1e-310},
		{1e300, 1e300, 1e300, 1e300, 1e300, 1e300, 1e300, -1e300},
	} {
		if err := CheckVariable(x); err != nil {
			t.Errorf("%v: %v", x, err)
		}
		sm, err := Describe(&Series{Values: x, Dt: 1})
		if err != nil || !(sm.Std > 0) || math.IsInf(sm.Mean, 0) {
			t.Errorf("%v: %+v, %v", x, sm, err)
		}
	}
}
