package analysis

import (
	"fmt"

	"unfold/series"
)

// InspectResult is the JSON body of `inspect` (DESIGN.md §3).
type InspectResult struct {
	Duration       float64             `json:"duration"`
	Mean           float64             `json:"mean"`
	Std            float64             `json:"std"`
	Min            float64             `json:"min"`
	Max            float64             `json:"max"`
	Quantization   float64             `json:"quantization"`
	DominantPeriod float64             `json:"dominant_period"`
	GapsFilled     int                 `json:"gaps_filled"`
	Stationarity   series.Stationarity `json:"stationarity"`
	// Notes are the reader's automatic choices (series.Series.Notes): decimal commas, ISO
	// time stamps, the column taken among several.
	Notes    []string `json:"notes"`
	Cautions []string `json:"cautions"`
}

// InspectParams are the "parameters" of the inspect stage.
type InspectParams struct {
	Column      string `json:"column"`
	TimeColumn  string `json:"time_column"`
	Detrend     string `json:"detrend"`
	Standardize bool   `json:"standardize"`
	Decimate    int    `json:"decimate"`
	From        string `json:"from"`
	To          string `json:"to"`
	Gaps        string `json:"gaps"`
}

// Inspect describes s and returns the JSON parameters and body of `inspect` with the
// summary they came from; the command and the report both use it.
func (e *Env) Inspect(path string, s *series.Series) (InspectParams, InspectResult, *series.Summary, error) {
	sm, err := series.Describe(s)
	if err != nil {
		return InspectParams{}, InspectResult{}, nil, NoAnswer(fmt.Errorf("inspect: %s: %w", path, err))
	}
	if sm.Cautions == nil {
		sm.Cautions = []string{}
	}
	p := InspectParams{Column: s.Name, TimeColumn: s.TimeName, Detrend: e.Prep.Detrend,
		Standardize: e.Prep.Standardize, Decimate: max(e.Prep.Decimate, 1),
		From: e.Prep.From, To: e.Prep.To, Gaps: e.Read.Gaps}
	res := InspectResult{
		Duration: sm.Duration, Mean: sm.Mean, Std: sm.Std, Min: sm.Min, Max: sm.Max,
		Quantization: sm.Quantization, DominantPeriod: sm.DominantPeriod,
		GapsFilled: sm.GapsFilled, Stationarity: sm.Stationarity, Notes: CleanNotes(s.Notes), Cautions: sm.Cautions,
	}
	return p, res, sm, nil
}

// CleanNotes returns the reader's notes as valid UTF-8 text (series.CleanText; they quote
// header names from the input), [] when there are none.
func CleanNotes(notes []string) []string {
	out := make([]string, len(notes))
	for i, n := range notes {
		out[i] = series.CleanText(n)
	}
	return out
}
