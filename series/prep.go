package series

// Prep is the preprocessing every command shares, applied after reading in this order:
// range selection, decimation, detrending, standardisation.
type Prep struct {
	// From and To select a range: a sample index ("1000") or a time with a unit suffix
	// ("2.5s", "10min", "3h", "1.5y", or "t" for the record's own time unit: "12.5t").
	// Empty means the start or the end. To is exclusive. An index is 0-based. Units: ms, s,
	// min, h, d, y (Julian year, 365.25 d), converted to the record's Series.TimeUnit (an
	// error when the record states none; use t then); times are on the record's clock (T0 at
	// the first sample) and select the first sample at or after them. See Apply.
	From, To string
	// Detrend is "none" (or ""), "mean" or "linear".
	Detrend string
	// Standardize rescales to zero mean and unit variance.
	Standardize bool
	// Decimate keeps every K-th sample (K ≤ 1 keeps all) and multiplies Dt by K.
	Decimate int
}
