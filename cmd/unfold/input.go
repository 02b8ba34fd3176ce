package main

import (
	"github.com/spf13/cobra"
	"github.com/spf13/pflag"

	"unfold/analysis"
	"unfold/series"
)

// inputOptions are the input and preprocessing flags of every command that reads a signal.
type inputOptions struct {
	read series.ReadOptions
	prep series.Prep
	// flags are the command's flags, to tell a value given from the default.
	flags *pflag.FlagSet
}

// addInputFlags binds the shared input and preprocessing flags (DESIGN.md §3) to cmd.
func addInputFlags(cmd *cobra.Command, o *inputOptions) {
	f := cmd.Flags()
	o.flags = f
	f.StringVar(&o.read.Column, "column", "", "signal column: a header name or a 1-based index (default: the only non-time numeric column, else the first)")
	f.StringVar(&o.read.TimeColumn, "time-column", "", "time column: a header name or a 1-based index (default: a column named t, time, seconds, year, …)")
	f.Float64Var(&o.read.Dt, "dt", 0, "sampling interval in time units (default: from the time column or the WAV rate, else 1)")
	f.StringVar(&o.read.Format, "format", "", "input format: csv, npy, f32le, f64le or wav (default: detected from the name and content)")
	f.StringVar(&o.read.TimeUnit, "time-unit", "", "unit of time: s, ms, min, h, d, y or any word (default: from the time column's header, as in \"time (s)\"; seconds for WAV)")
	f.StringVar(&o.read.Unit, "unit", "", "unit of the signal's values (default: from the column's header, as in \"strain [µε]\")")
	f.IntVar(&o.read.Channel, "channel", 1, "WAV channel (1-based)")
	f.StringVar(&o.read.Gaps, "gaps", "", "what to do with NaN, Inf or empty cells: drop or linear (default: refuse them)")
	f.StringVar(&o.prep.From, "from", "", "first sample to use: an index (1000) or a time with a unit (2.5s, 10min, 3h, 2d, 1.5y, or 12t in the record's own unit)")
	f.StringVar(&o.prep.To, "to", "", "end of the range (exclusive), in the same forms as --from")
	f.StringVar(&o.prep.Detrend, "detrend", "none", "remove a trend before analysis: none, mean or linear")
	f.BoolVar(&o.prep.Standardize, "standardize", false, "rescale to zero mean and unit variance")
	f.IntVar(&o.prep.Decimate, "decimate", 1, "keep every K-th sample (Dt is multiplied by K)")
}

// loadInput reads and preprocesses the signal named by path ("-" for standard input) and
// returns it with the "input" object of the JSON output.
func (a *app) loadInput(path string, o *inputOptions) (*series.Series, *inputInfo, error) {
	if err := o.check(); err != nil {
		return nil, nil, err
	}
	s, src, err := series.ReadFile(path, a.stdin, o.read)
	if err != nil {
		return nil, nil, err
	}
	s, err = o.prep.Apply(s)
	if err != nil {
		return nil, nil, err
	}
	return s, &inputInfo{Path: src.Path, SHA256: src.SHA256, Samples: s.Len(), Dt: s.Dt, Units: unitsOf(s)}, nil
}

// unitsOf is the "units" object of the JSON output of s.
func unitsOf(s *series.Series) analysis.Units {
	return analysis.Units{Time: s.TimeUnit, Signal: s.Unit}
}

// check validates the input flags before any reading (exit status 2 with the allowed range).
func (o *inputOptions) check() error {
	err := o.read.Check()
	if err == nil && o.flags != nil && o.flags.Changed("dt") {
		err = series.CheckDt(o.read.Dt)
	}
	if err == nil {
		err = series.CheckChannel(o.read.Channel)
	}
	if err == nil {
		err = series.CheckDecimate(o.prep.Decimate)
	}
	if err != nil {
		return &usageError{err}
	}
	return nil
}
