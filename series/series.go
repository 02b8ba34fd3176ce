// Package series holds the Series type — one uniformly sampled scalar record — and everything
// that moves records in and out of the toolkit: readers for delimited text, NumPy .npy, raw
// little-endian floats and WAV (each optionally gzipped), the shared preprocessing steps
// (range selection, detrending, standardisation, decimation) and atomic writers.
package series

import "fmt"

// Series is one uniformly sampled scalar record.
type Series struct {
	// Values are the samples in time order.
	Values []float64
	// Dt is the sampling interval in time units (seconds, years, … as the source states);
	// 1 when nothing gives it.
	Dt float64
	// T0 is the time of the first sample (0 when the source has no time stamps).
	T0 float64
	// Name is the column or channel the values came from ("x" when unnamed).
	Name string
	// Unit is the unit of the values when known ("" otherwise).
	Unit string
	// TimeName is the name of the time column the sampling came from ("" when none).
	TimeName string
	// TimeUnit is the unit of Dt and T0 when the source states it: "s", "ms", "min", "h", "d"
	// or "y" (from a time column's name such as "time (s)" or "year", or "s" for WAV); "" when
	// unknown. Prep uses it to convert times given with a unit suffix.
	TimeUnit string
	// GapsFilled counts NaN/Inf/empty cells that were dropped or interpolated on reading.
	GapsFilled int
	// Notes are the automatic choices the reader made, in plain words, for `inspect` and the
	// report to show: the delimiter, decimal commas ("decimal commas: numbers are written like
	// "0,0047" …"), the time column (ISO-8601 date-times and the instant times count from),
	// dt, the signal column chosen among several ("3 numeric columns: using "x" …; choose with
	// --column") and gaps filled. The same list is Source.Notes.
	Notes []string
}

// Len returns the number of samples.
func (s *Series) Len() int { return len(s.Values) }

// Duration returns (N−1)·Dt, the time spanned by the record.
func (s *Series) Duration() float64 {
	if len(s.Values) < 2 {
		return 0
	}
	return float64(len(s.Values)-1) * s.Dt
}

// Time returns the time stamp of sample i.
func (s *Series) Time(i int) float64 { return s.T0 + float64(i)*s.Dt }

// InputError is bad input: it says what is wrong and where. Line and Column are 1-based and 0
// when they do not apply; for delimited text Column is the byte position in the line where
// the offending cell starts (its opening quote, if quoted). Commands exit with status 2 on an
// InputError.
type InputError struct {
	Path   string // file name as given ("-" for standard input)
	Line   int
	Column int
	Msg    string
}

// Error formats the error as path:line:column: message, leaving out what is unknown.
func (e *InputError) Error() string {
	p := e.Path
	if p == "" {
		p = "input"
	}
	switch {
	case e.Line > 0 && e.Column > 0:
		return fmt.Sprintf("%s:%d:%d: %s", p, e.Line, e.Column, e.Msg)
	case e.Line > 0:
		return fmt.Sprintf("%s:%d: %s", p, e.Line, e.Msg)
	default:
		return fmt.Sprintf("%s: %s", p, e.Msg)
	}
}

// ErrConstant is returned by CheckVariable for a record whose samples are all equal; analyses
// refuse such records (exit status 1: the analysis ran but has no answer).
type ErrConstant struct {
	// Value is the value every sample has.
	Value float64
	// Samples is the length of the record.
	Samples int
}

func (e *ErrConstant) Error() string {
	if e.Samples == 0 {
		return "the record is empty: there is no dynamics to analyse"
	}
	return fmt.Sprintf("the signal is constant (all %d samples are %g): there is no dynamics to analyse", e.Samples, e.Value)
}

// CheckVariable returns an *ErrConstant when the record is empty or all its samples are equal
// (−0 and +0 count as equal), and nil otherwise. A record of tiny (denormal) or huge magnitude
// is not constant: the estimators work on it after scaling.
func CheckVariable(x []float64) error {
	if len(x) == 0 || constant(x) {
		e := &ErrConstant{Samples: len(x)}
		if len(x) > 0 {
			e.Value = x[0] + 0 // −0 + 0 is +0: print "0"
		}
		return e
	}
	return nil
}
