package report

import (
	"errors"
	"io/fs"
	"math"
	"path/filepath"
	"strings"

	"unfold/series"
)

// SweepOptions say how the records are read back for the bifurcation diagram.
type SweepOptions struct {
	// Read overrides how each record is read; its zero value reads each record with the
	// column, gap rule and sampling interval recorded in its result.json.
	Read series.ReadOptions
	// MaxPoints is the number of bifurcation-diagram values kept per record, from its end
	// (0 means 200).
	MaxPoints int
}

func val(p *float64) float64 {
	if p == nil {
		return math.NaN()
	}
	return *p
}

func interval(iv []*float64) (float64, float64) {
	if len(iv) != 2 {
		return math.NaN(), math.NaN()
	}
	return val(iv[0]), val(iv[1])
}

// SweepRows reads the result of every record of list from the batch directory dir (one
// folder per record named ResultFolderName(path), holding result.json; the spectral
// lines are the regime stage's) and reads each record again for its bifurcation-diagram
// values. A record without a result gets
// status "missing"; one whose result cannot be read gets status "error" with the reason. The
// rows are sorted by the parameter.
func SweepRows(dir string, list *SweepList, opt SweepOptions) []SweepRow {
	rows := make([]SweepRow, len(list.Entries))
	for i, e := range list.Entries {
		rows[i] = sweepRow(dir, e, opt)
	}
	SortSweepRows(rows)
	return rows
}

func sweepRow(dir string, e SweepEntry, opt SweepOptions) SweepRow {
	nan := math.NaN()
	r := SweepRow{Value: e.Value, Path: e.Path, Labels: e.Labels, Dt: nan, Confidence: nan,
		LambdaMax: nan, LambdaLo: nan, LambdaHi: nan, D2: nan, D2Lo: nan, D2Hi: nan,
		EntropyRate: nan, Complexity: nan}
	p := filepath.Join(dir, ResultFolderName(e.Path), "result.json")
	h, err := decodeResult(p)
	if errors.Is(err, fs.ErrNotExist) {
		r.Status, r.Error = "missing", "no result yet"
		return r
	}
	if err != nil {
		r.Status, r.Error = StatusError, err.Error()
		return r
	}
	r.Status, r.Error = h.Status, h.Error
	if h.Input.Samples != nil {
		r.Samples = *h.Input.Samples
	}
	r.Dt = val(h.Input.Dt)
	if h.Lag != nil && h.Lag.Lag != nil {
		r.Lag = *h.Lag.Lag
	}
	if h.Dim != nil && h.Dim.Dimension != nil {
		r.Dimension = *h.Dim.Dimension
	}
	if h.Lyapunov != nil {
		r.LambdaMax = val(h.Lyapunov.LambdaMax)
		r.LambdaLo, r.LambdaHi = interval(h.Lyapunov.Interval)
	}
	if h.Fractal != nil {
		r.D2 = val(h.Fractal.D2)
		r.D2Lo, r.D2Hi = interval(h.Fractal.Interval)
	}
	if h.Regime != nil {
		if h.Regime.Regime != nil {
			r.Regime = *h.Regime.Regime
		}
		r.Confidence = val(h.Regime.Confidence)
		if l := h.Regime.Lines; l != nil { // the regime stage's line analysis
			r.LineKind, r.Frequencies, r.Fundamentals = l.Kind, l.Frequencies, l.Fundamentals
		}
	}
	if h.States != nil {
		r.Complexity = val(h.States.StatisticalComplexity)
		r.EntropyRate = val(h.States.EntropyRate)
	}
	if r.Error == "" && h.Provenance != nil {
		var msgs []string
		for _, s := range h.Provenance.Stages {
			if s.Status != StatusOK {
				msgs = append(msgs, s.Key+": "+s.Error)
			}
		}
		r.Error = strings.Join(msgs, "; ")
	}
	if r.Status == StatusError {
		return r
	}
	ro := opt.Read
	if ro.Column == "" {
		ro.Column = h.Parameters.Column
	}
	if ro.Gaps == "" {
		ro.Gaps = h.Parameters.Gaps
	}
	if ro.Dt == 0 && !math.IsNaN(r.Dt) && r.Dt > 0 {
		ro.Dt = r.Dt
	}
	s, _, err := series.ReadFile(e.Path, nil, ro)
	if err != nil {
		r.RecordReadMessage = err.Error()
		return r
	}
	r.TimeUnit, r.Unit = s.TimeUnit, s.Unit
	r.Points, r.PointsAreMaxima = BifurcationPoints(s.Values, max(opt.MaxPoints, 0))
	return r
}

// BifurcationPoints returns the values a bifurcation-style diagram shows for one record, at
// most keep of them (0 means 200) from the end of the record: for a sampled flow (successive
// samples strongly correlated: lag-1 autocorrelation above 0.5) the local maxima, each refined
// by the parabola through it and its two neighbours; for a map (or a coarsely sampled flow)
// the samples themselves. Plotting the maxima of a flow against its control parameter is the
// flow's counterpart of the orbit diagram of a map (common practice; cf. the maxima return map
// of Lorenz 1963, "Deterministic nonperiodic flow").
func BifurcationPoints(x []float64, keep int) (pts []float64, maxima bool) {
	if keep <= 0 {
		keep = 200
	}
	if len(x) < 3 {
		return append([]float64(nil), x...), false
	}
	var mean float64
	for _, v := range x {
		mean += v
	}
	mean /= float64(len(x))
	var c0, c1 float64
	for i, v := range x {
		d := v - mean
		c0 += d * d
		if i > 0 {
			c1 += d * (x[i-1] - mean)
		}
	}
	if c0 == 0 || c1/c0 <= 0.5 {
		return append([]float64(nil), x[max(0, len(x)-keep):]...), false
	}
	var rev []float64
	for i := len(x) - 2; i >= 1 && len(rev) < keep; i-- {
		a, b, c := x[i-1], x[i], x[i+1]
		if b > a && b >= c {
			den := a - 2*b + c
			v := b
			if den != 0 {
				p := (a - c) / (2 * den)
				v = b - (a-c)*p/4
			}
			rev = append(rev, v)
		}
	}
	pts = make([]float64, len(rev))
	for i, v := range rev {
		pts[len(rev)-1-i] = v
	}
	return pts, true
}
