package series

// Prep is the preprocessing every command shares, applied after reading in this order:
// range selection, decimation, detrending, standardisation.
type Prep struct {
	// From and To select a range: a sample index ("1000") or a time with a unit suffix
	// ("2.5s", "10min", "3h", "1.5y", or "t" for the record's own time unit: "12.5t").
	// Empty means the start or the end. To is exclusive.
	From, To string
	// Detrend is "none" (or ""), "mean" or "linear".
	Detrend string
	// Standardize rescales to zero mean and unit variance.
	Standardize bool
	// Decimate keeps every K-th sample (K ≤ 1 keeps all) and multiplies Dt by K.
	Decimate int
}
