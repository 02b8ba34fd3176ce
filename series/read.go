package series

// ReadOptions say how to read a record. The zero value reads the default column of a delimited
// text file with the format detected from the name and content.
type ReadOptions struct {
	// Format overrides detection: "csv" (any delimited text), "npy", "f32le", "f64le", "wav".
	Format string
	// Column is a column name or a 1-based index ("" = the only non-time numeric column,
	// else the first numeric column). For .npy it selects the column of a 2-D array.
	Column string
	// TimeColumn names the time column ("" = detect by name: t, time, seconds, year, …).
	TimeColumn string
	// Dt overrides the sampling interval (0 = from the time column or the WAV rate, else 1).
	Dt float64
	// Channel selects the WAV channel (1-based; 0 means 1).
	Channel int
	// Gaps says what to do with NaN, Inf or empty cells: "" (error), "drop" or "linear".
	Gaps string
}
