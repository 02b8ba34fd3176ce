package analysis

import (
	"fmt"
	"math"
	"strconv"
	"strings"

	"unfold/denoise"
	"unfold/embed"
	"unfold/series"
)

// DenoiseOptions are the options of `unfold denoise` (see package denoise for the methods).
type DenoiseOptions struct {
	// Output and Plot name the files written (recorded in the body).
	Output, Plot string
	// Method is "projective", "constant" or "none".
	Method string
	// Dim, Lag (0: chosen) and Q shape the embedding and the local manifold.
	Dim, Lag, Q int
	// Eps is the neighbourhood radius (0: EpsFactor × the estimated noise level).
	Eps, EpsFactor float64
	// Iterations, MinNeighbors, MaxNeighbors and Theiler (0: no window) bound the reduction.
	Iterations, MinNeighbors, MaxNeighbors, Theiler int
	// Euclidean uses the Euclidean norm; EndWeight weighs the end coordinates (projective).
	Euclidean bool
	EndWeight float64
	// Lowpass, Highpass (0: none) and Bandpass ("F1,F2") are zero-phase Butterworth filters of
	// order FilterOrder.
	Lowpass, Highpass float64
	Bandpass          string
	FilterOrder       int
	// Resample is the new sampling interval (0: none); PolyDetrend the order of a polynomial
	// removed first (−1: none).
	Resample    float64
	PolyDetrend int
}

// DefaultDenoiseOptions returns the defaults of `unfold denoise`.
func DefaultDenoiseOptions() DenoiseOptions {
	return DenoiseOptions{Method: "projective", Dim: denoise.DefaultDim, Q: denoise.DefaultQ, EpsFactor: denoise.DefaultEpsFactor,
		Iterations: denoise.DefaultIterations, EndWeight: denoise.DefaultEndWeight, FilterOrder: denoise.DefaultOrder, PolyDetrend: -1}
}

// DenoiseParams are the "parameters" of the JSON output: every parameter used.
type DenoiseParams struct {
	Column       string    `json:"column"`
	Method       string    `json:"method"`
	Dim          int       `json:"dim,omitempty"`
	Lag          int       `json:"lag,omitempty"`
	LagMethod    string    `json:"lag_method,omitempty"`
	Q            int       `json:"q,omitempty"`
	Eps          float64   `json:"eps,omitempty"`
	EpsRule      string    `json:"eps_rule,omitempty"`
	EpsFactor    float64   `json:"eps_factor,omitempty"`
	Iterations   int       `json:"iterations,omitempty"`
	MinNeighbors int       `json:"min_neighbors,omitempty"`
	MaxNeighbors int       `json:"max_neighbors"`
	Theiler      int       `json:"theiler"`
	Norm         string    `json:"norm,omitempty"`
	EndWeight    float64   `json:"end_weight,omitempty"`
	Lowpass      float64   `json:"lowpass,omitempty"`
	Highpass     float64   `json:"highpass,omitempty"`
	Bandpass     []float64 `json:"bandpass,omitempty"`
	FilterOrder  int       `json:"filter_order,omitempty"`
	FilterUnit   string    `json:"filter_frequency_unit,omitempty"`
	FilterPad    int       `json:"filter_edge_pad,omitempty"`
	Resample     float64   `json:"resample_dt,omitempty"`
	PolyDetrend  int       `json:"poly_detrend"`
	Detrend      string    `json:"detrend"`
	Standardize  bool      `json:"standardize"`
	Decimate     int       `json:"decimate"`
	From         string    `json:"from"`
	To           string    `json:"to"`
	Threads      int       `json:"threads"`
}

// DenoiseResult is the JSON body of `denoise`.
type DenoiseResult struct {
	NoiseLevel    float64             `json:"noise_level,omitempty"`
	NoiseSteps    []denoise.NoiseStep `json:"noise_estimate_steps,omitempty"`
	Iterations    []denoise.Iteration `json:"iterations"`
	RMSCorrection float64             `json:"rms_correction"`
	Rows          int                 `json:"rows"`
	Dt            float64             `json:"output_dt"`
	Output        string              `json:"output"`
	Plot          string              `json:"plot,omitempty"`
	Cautions      []string            `json:"cautions"`
}

// CheckDenoise validates o and returns the band-pass corners (nil when none) and the method
// ("none" or a denoise method name).
func CheckDenoise(o DenoiseOptions) ([]float64, string, error) {
	method := strings.ToLower(o.Method)
	if method != "none" {
		if _, err := denoise.ParseMethod(method); err != nil || method == "" {
			return nil, "", Usagef("denoise: --method %q: want projective, constant or none", o.Method)
		}
	}
	if o.PolyDetrend < -1 || o.PolyDetrend > denoise.MaxPolyOrder {
		return nil, "", Usagef("denoise: --poly-detrend %d: want -1 (none) or 0 … %d", o.PolyDetrend, denoise.MaxPolyOrder)
	}
	var band []float64
	if o.Bandpass != "" {
		parts := strings.Split(o.Bandpass, ",")
		if len(parts) != 2 {
			return nil, "", Usagef("denoise: --bandpass %q: want two frequencies F1,F2", o.Bandpass)
		}
		for _, p := range parts {
			v, err := strconv.ParseFloat(strings.TrimSpace(p), 64)
			if err != nil {
				return nil, "", Usagef("denoise: --bandpass %q: %q is not a number", o.Bandpass, p)
			}
			band = append(band, v)
		}
	}
	if method != "none" && (o.Dim < 2 || o.Q < 1 || o.Q >= o.Dim || o.Iterations < 1 || o.Eps < 0 || o.Lag < 0) {
		return nil, "", Usagef("denoise: want --dim >= 2, 1 <= --q < --dim, --max-iter >= 1, --eps >= 0 and --lag >= 0 (got dim %d, q %d, iterations %d, eps %g, lag %d)", o.Dim, o.Q, o.Iterations, o.Eps, o.Lag)
	}
	if o.Resample < 0 {
		return nil, "", Usagef("denoise: --resample %g: want a positive sampling interval", o.Resample)
	}
	return band, method, nil
}

// DenoiseRun is what Denoise made, for the renderers: the cleaned values, the values before
// the nonlinear step, their sampling interval, the lag and the filters and reduction used.
type DenoiseRun struct {
	Clean, Before []float64
	Dt            float64
	Lag           int
	Filters       []*denoise.Filter
	Res           *denoise.Result
}

// Denoise cleans s as `unfold denoise` does: polynomial detrend, zero-phase filters,
// resampling, then nonlinear noise reduction (locally constant or local projective), and
// returns the values with the JSON parameters and body (the body names o.Output and o.Plot).
func (e *Env) Denoise(path string, s *series.Series, o DenoiseOptions) (*DenoiseRun, DenoiseParams, DenoiseResult, error) {
	fail := func(err error) (*DenoiseRun, DenoiseParams, DenoiseResult, error) {
		return nil, DenoiseParams{}, DenoiseResult{}, err
	}
	band, method, err := CheckDenoise(o)
	if err != nil {
		return fail(err)
	}
	if s.Len() < 2 {
		return fail(NoAnswer(fmt.Errorf("denoise: %s: %d samples: nothing to clean", path, s.Len())))
	}
	run := &DenoiseRun{}
	p := DenoiseParams{Column: s.Name, Method: method, Theiler: o.Theiler, PolyDetrend: o.PolyDetrend,
		Detrend: e.Prep.Detrend, Standardize: e.Prep.Standardize, Decimate: max(e.Prep.Decimate, 1),
		From: e.Prep.From, To: e.Prep.To, Threads: e.threads()}
	body := DenoiseResult{Output: o.Output, Plot: o.Plot, Cautions: []string{}, Iterations: []denoise.Iteration{}}
	x := append([]float64(nil), s.Values...)
	dt := s.Dt

	// 1. polynomial detrend
	if o.PolyDetrend >= 0 {
		if x, _, err = denoise.PolyDetrend(x, o.PolyDetrend); err != nil {
			return fail(Usagef("denoise: --poly-detrend: %v", err))
		}
	}
	// 2. filters
	type fspec struct {
		band    denoise.Band
		corners []float64
		flag    string
	}
	var fs []fspec
	if o.Highpass != 0 {
		fs = append(fs, fspec{denoise.HighPass, []float64{o.Highpass}, "--highpass"})
		p.Highpass = o.Highpass
	}
	if o.Lowpass != 0 {
		fs = append(fs, fspec{denoise.LowPass, []float64{o.Lowpass}, "--lowpass"})
		p.Lowpass = o.Lowpass
	}
	if band != nil {
		fs = append(fs, fspec{denoise.BandPass, band, "--bandpass"})
		p.Bandpass = band
	}
	for _, f := range fs {
		flt, err := denoise.Butterworth(f.band, o.FilterOrder, f.corners, dt)
		if err != nil {
			return fail(Usagef("denoise: %s: %v", f.flag, err))
		}
		if x, err = flt.ZeroPhase(x); err != nil {
			return fail(NoAnswer(fmt.Errorf("denoise: %s: %w", f.flag, err)))
		}
		p.FilterOrder = o.FilterOrder
		p.FilterPad = max(p.FilterPad, flt.PadLength(len(x)))
		run.Filters = append(run.Filters, flt)
	}
	if len(fs) > 0 {
		p.FilterUnit = "cycles per time unit"
		if s.TimeUnit != "" {
			p.FilterUnit = "cycles per " + s.TimeUnit
		}
	}
	// 3. resampling
	if o.Resample > 0 {
		if x, err = denoise.Resample(x, dt, o.Resample); err != nil {
			return fail(Usagef("denoise: --resample: %v", err))
		}
		dt = o.Resample
		p.Resample = o.Resample
	}
	before := append([]float64(nil), x...)
	// 4. nonlinear noise reduction
	lag := o.Lag
	if method != "none" {
		if lag == 0 {
			c, err := embed.ChooseLag(x, embed.LagOptions{})
			if err != nil {
				return fail(NoAnswer(fmt.Errorf("denoise: %s: choosing the lag: %w (give --lag)", path, err)))
			}
			lag = c.Lag
			p.LagMethod = c.Method
			e.notef("denoise: lag %d samples (%s)", lag, c.Reason)
		} else {
			p.LagMethod = "given"
		}
		m, _ := denoise.ParseMethod(method)
		res, err := denoise.Reduce(x, denoise.Options{Method: m, Dim: o.Dim, Lag: lag, Q: o.Q, Eps: o.Eps,
			EpsFactor: o.EpsFactor, Iterations: o.Iterations, MinNeighbors: o.MinNeighbors, MaxNeighbors: o.MaxNeighbors, Theiler: o.Theiler,
			Euclidean: o.Euclidean, EndWeight: o.EndWeight, Threads: e.threads(), Progress: e.progress("denoise")})
		if err != nil {
			return fail(NoAnswer(fmt.Errorf("denoise: %s: %w", path, err)))
		}
		x = res.Values
		p.Dim, p.Lag, p.Q, p.Eps, p.EpsRule = res.Dim, res.Lag, res.Q, res.Eps, res.EpsRule
		p.MaxNeighbors = res.MaxNeighbors
		p.Iterations, p.MinNeighbors, p.Norm, p.EndWeight = o.Iterations, res.MinNeighbors, res.Norm, res.EndWeight
		if o.Eps == 0 {
			p.EpsFactor = o.EpsFactor
		}
		if res.Noise != nil {
			body.NoiseLevel = res.Noise.Sigma
			body.NoiseSteps = res.Noise.Steps
		}
		body.Iterations = res.Iterations
		body.Cautions = append(body.Cautions, res.Cautions...)
		run.Res = res
		for _, it := range res.Iterations {
			state := "applied"
			if !it.Applied {
				state = "discarded (did not shrink)"
			}
			e.notef("denoise: iteration %d: rms correction %.4g, %d uncorrected, %s", it.Iteration, it.RMSCorrection, it.Uncorrected, state)
		}
	}
	// rms correction relative to the record as read (same grid only)
	if o.Resample == 0 {
		var ss float64
		for i := range x {
			d := x[i] - s.Values[i]
			ss += d * d
		}
		body.RMSCorrection = rmsOf(ss, len(x))
	} else if run.Res != nil {
		body.RMSCorrection = run.Res.RMSCorrection
	}
	body.Rows, body.Dt = len(x), dt

	run.Clean, run.Before, run.Dt, run.Lag = x, before, dt, lag
	return run, p, body, nil
}

func rmsOf(ss float64, n int) float64 {
	if n == 0 {
		return 0
	}
	return math.Sqrt(ss / float64(n))
}
