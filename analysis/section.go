package analysis

import (
	"fmt"
	"strconv"

	"unfold/embed"
	"unfold/partition"
	"unfold/series"
)

// SectionOptions are the options of `unfold section`.
type SectionOptions struct {
	// Lag is the delay (0: chosen); Dim the dimension of the delay vectors cut.
	Lag, Dim int
	// Level is where the plane cuts ("mean" or a number); Direction "up", "down" or "both";
	// Interp "linear" or "cubic".
	Level, Direction, Interp string
	// Maxima uses the local maxima as the section.
	Maxima bool
	// Output and Plot name the files written (recorded in the body).
	Output, Plot string
}

// DefaultSectionOptions returns the defaults of `unfold section`.
func DefaultSectionOptions() SectionOptions {
	return SectionOptions{Dim: 3, Level: "mean", Direction: "up", Interp: "linear"}
}

// SectionParams are the "parameters" of `unfold section` (and the section of a flow in symbols).
type SectionParams struct {
	Column    string  `json:"column"`
	Method    string  `json:"method"`
	Lag       int     `json:"lag,omitempty"`
	LagMethod string  `json:"lag_method,omitempty"`
	Dim       int     `json:"dim,omitempty"`
	Level     float64 `json:"level"`
	LevelFrom string  `json:"level_from"`
	Direction string  `json:"direction"`
	Interp    string  `json:"interp"`
}

// SectionResult is the JSON body of `unfold section`.
type SectionResult struct {
	Crossings   int      `json:"crossings"`
	Rate        float64  `json:"rate_per_time_unit"`
	MeanReturn  float64  `json:"mean_return_time"`
	Duration    float64  `json:"duration"`
	ValueColumn string   `json:"value"`
	Output      string   `json:"output"`
	Plot        string   `json:"plot"`
	Cautions    []string `json:"cautions"`
}

// SectionOpts turns the flags into partition.SectionOptions, choosing the lag if needed.
func (e *Env) SectionOpts(x []float64, lag, dim int, level, direction, interp string, maxima bool) (partition.SectionOptions, string, string, []string, error) {
	opt := partition.SectionOptions{Maxima: maxima, Dim: dim}
	var cautions []string
	switch direction {
	case "up", "":
		opt.Direction = 1
	case "down":
		opt.Direction = -1
	case "both":
		opt.Direction = 0
	default:
		return opt, "", "", nil, Usagef("--direction %q: want up, down or both", direction)
	}
	m, err := partition.ParseInterp(interp)
	if err != nil {
		return opt, "", "", nil, Usagef("--interp: %v", err)
	}
	opt.Interp = m
	levelFrom := "mean"
	if level != "mean" && level != "" {
		v, err := strconv.ParseFloat(level, 64)
		if err != nil {
			return opt, "", "", nil, Usagef("--level %q: want a number or mean", level)
		}
		opt.Level, opt.LevelSet, levelFrom = v, true, "given"
	}
	if dim < 1 || lag < 0 {
		return opt, "", "", nil, Usagef("--dim must be ≥ 1 and --lag ≥ 0")
	}
	lagMethod := "given"
	if !maxima {
		if lag == 0 {
			c, err := embed.Choose(x, embed.ChooseOptions{NoDim: true, LagOptions: embed.LagOptions{MI: embed.MIOptions{Threads: e.threads()}}})
			if err != nil {
				return opt, "", "", nil, NoAnswer(fmt.Errorf("choosing the lag: %w", err))
			}
			e.notef("lag %d chosen (%s): %s", c.Lag.Value, c.Lag.Rule, c.LagChoice.Reason)
			lag, lagMethod, cautions = c.Lag.Value, c.Lag.Rule, c.Cautions
		}
		opt.Lag = lag
	}
	return opt, lagMethod, levelFrom, cautions, nil
}

// SectionRun is what Section found, for the command's files and figure.
type SectionRun struct {
	Sec       *partition.Section
	Header    []string // CSV header of the crossings
	ValueName string   // the value the return map is drawn of
	LagMethod string
	LevelFrom string
}

// Section takes the section of s as `section` does and returns it with the JSON
// parameters and body of `section` (the body names o.Output and o.Plot; the caller writes
// them).
func (e *Env) Section(path string, s *series.Series, o SectionOptions) (*SectionRun, SectionParams, SectionResult, error) {
	if err := series.CheckVariable(s.Values); err != nil {
		return nil, SectionParams{}, SectionResult{}, err
	}
	opt, lagMethod, levelFrom, cautions, err := e.SectionOpts(s.Values, o.Lag, o.Dim, o.Level, o.Direction, o.Interp, o.Maxima)
	if err != nil {
		return nil, SectionParams{}, SectionResult{}, err
	}
	sec, err := partition.TakeSection(s.Values, s.Dt, s.T0, opt)
	if err != nil {
		return nil, SectionParams{}, SectionResult{}, NoAnswer(fmt.Errorf("section: %s: %w", path, err))
	}
	cautions = append(cautions, sec.Cautions...)
	header, valueName := SectionColumns(sec, s.Name)
	if cautions == nil {
		cautions = []string{}
	}
	res := SectionResult{Crossings: sec.Len(), Rate: sec.Rate, MeanReturn: sec.MeanReturn, Duration: sec.Duration,
		ValueColumn: valueName, Output: o.Output, Plot: o.Plot, Cautions: cautions}
	dir := map[int]string{1: "up", -1: "down", 0: "both"}[opt.Direction]
	p := SectionParams{Column: s.Name, Method: sec.Method, Level: sec.Level, LevelFrom: levelFrom, Direction: dir, Interp: sec.Interp}
	if sec.Method == "hyperplane" {
		p.Lag, p.LagMethod, p.Dim = sec.Lag, lagMethod, sec.Dim
	} else {
		p.LevelFrom, p.Direction = "", ""
	}
	return &SectionRun{Sec: sec, Header: header, ValueName: valueName, LagMethod: lagMethod, LevelFrom: levelFrom}, p, res, nil
}

// SectionColumns returns the CSV header of the crossings of sec taken from the signal called
// name (t, then the in-plane coordinates or the height of the maximum) and the name of the
// value the return map is drawn of.
func SectionColumns(sec *partition.Section, name string) ([]string, string) {
	header := []string{"t"}
	valueName := "max_" + name
	if sec.Method == "hyperplane" {
		if sec.Dim == 1 {
			header = append(header, name)
			valueName = name
		} else {
			for k := 1; k < sec.Dim; k++ {
				if k == 1 {
					header = append(header, name+"(t+τ)")
				} else {
					header = append(header, fmt.Sprintf("%s(t+%dτ)", name, k))
				}
			}
			valueName = header[1]
		}
	} else {
		header = append(header, valueName)
	}
	return header, valueName
}
