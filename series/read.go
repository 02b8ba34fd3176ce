package series

// ReadOptions say how to read a record. The zero value reads the default column of a delimited
// text file with the format detected from the name and content.
type ReadOptions struct {
	// Format overrides detection: "csv" (any delimited text), "npy", "f32le", "f64le", "wav".
	Format string
	// Column is a column name or a 1-based index ("" = the only non-time numeric column,
	// else the first numeric column; an empty-named first column, as R writes row names, is
	// never the default). Names match exactly, then ignoring case. For .npy it is the 1-based
	// index of the column of a 2-D array (default 1).
	Column string
	// TimeColumn names the time column, by name or 1-based index ("" = detect by the header
	// name: t, time, timestamp, date, seconds, sec, s, ms, min, hours, days, year, "time (s)",
	// "t_ms", …; "none" = no time column). The unit in the name sets Series.TimeUnit.
	TimeColumn string
	// Dt overrides the sampling interval (0 = from the time column or the WAV rate, else 1).
	// With Dt set the time column is not checked for uniform sampling.
	Dt float64
	// Channel selects the WAV channel (1-based; 0 means 1).
	Channel int
	// Gaps says what to do with NaN, Inf, empty or NA cells: "" (error), "drop" (leave the
	// sample out) or "linear" (interpolate between the neighbouring valid samples; repeat the
	// nearest one at the ends). Filled gaps are counted in Series.GapsFilled.
	Gaps string
	// TimeUnit and Unit override the units the source states (Series.TimeUnit, Series.Unit):
	// "" keeps them. A time unit word is written canonically ("seconds" → "s").
	TimeUnit, Unit string
}
