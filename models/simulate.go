package models

import (
	"errors"
	"fmt"
	"math"
	"math/rand/v2"
)

// Random streams derived from Options.Seed: the process innovations and the measurement noise
// use separate PCG streams, so adding noise does not change the underlying signal.
const (
	streamProcess = 0x756e666f6c640001
	streamNoise   = 0x756e666f6c640002
)

// DefaultSubsteps is the default number of RK4 steps per output interval of a flow.
const DefaultSubsteps = 10

// Options control a simulation. Spec.DefaultOptions gives the model's defaults.
type Options struct {
	// N is the number of samples recorded (≥ 1).
	N int
	// Dt is the output (sampling) interval in time units; 0 takes the model's. Maps and the AR
	// and noise processes are defined per sample and accept only 0 or 1.
	Dt float64
	// Substeps is the number of RK4 steps per output interval for a flow (0 = DefaultSubsteps);
	// the integration step is Dt/Substeps.
	Substeps int
	// Transient is the time dropped before recording, in time units (iterations for maps,
	// samples for per-sample processes). It is used as given: 0 keeps everything.
	Transient float64
	// Seed seeds every random step (process innovations and measurement noise).
	Seed uint64
	// Noise adds Gaussian measurement noise with standard deviation Noise times the standard
	// deviation of each recorded column (0.01 is 1 % noise).
	Noise float64
	// Initial, when not empty, sets the first len(Initial) state variables of the initial
	// condition; the rest keep the model's default.
	Initial []float64
}

// DefaultOptions returns the model's default sampling: 10 000 samples at the model's Dt, its
// transient, DefaultSubsteps, seed 1 and no noise.
func (s Spec) DefaultOptions() Options {
	return Options{N: 10000, Dt: s.Dt, Substeps: DefaultSubsteps, Transient: s.Transient, Seed: 1}
}

// Trajectory is a simulated record: Data[c][i] is column c at time i·Dt (time counted from the
// first recorded sample, after the transient).
type Trajectory struct {
	Dt      float64
	Columns []string
	Data    [][]float64
}

// Len returns the number of samples.
func (t *Trajectory) Len() int {
	if len(t.Data) == 0 {
		return 0
	}
	return len(t.Data[0])
}

// Column returns the samples of the named column, or nil if there is none.
func (t *Trajectory) Column(name string) []float64 {
	for i, c := range t.Columns {
		if c == name {
			return t.Data[i]
		}
	}
	return nil
}

// perSample reports whether the model is defined per sample (its Dt is fixed at 1).
func (s Spec) perSample() bool { return s.Kind == KindMap || s.Name == "ar" || s.Name == "noise" }

// check validates the options against the model and fills zero values with defaults.
func (s Spec) check(opt Options) (Options, error) {
	if opt.Dt == 0 {
		opt.Dt = s.Dt
	}
	if opt.Substeps == 0 {
		opt.Substeps = DefaultSubsteps
	}
	switch {
	case opt.N < 1:
		return opt, fmt.Errorf("the number of samples must be at least 1, got %d", opt.N)
	case !(opt.Dt > 0) || math.IsInf(opt.Dt, 0):
		return opt, fmt.Errorf("the sampling interval must be positive and finite, got %g", opt.Dt)
	case s.perSample() && opt.Dt != 1:
		return opt, fmt.Errorf("model %s is defined per sample (one sample per iteration): the sampling interval is 1, got %g", s.Name, opt.Dt)
	case opt.Substeps < 1:
		return opt, fmt.Errorf("the number of integration steps per sample must be at least 1, got %d", opt.Substeps)
	case !(opt.Transient >= 0) || math.IsInf(opt.Transient, 0):
		return opt, fmt.Errorf("the transient must be non-negative and finite, got %g", opt.Transient)
	case !(opt.Noise >= 0) || math.IsInf(opt.Noise, 0):
		return opt, fmt.Errorf("the noise fraction must be non-negative and finite, got %g", opt.Noise)
	case s.Kind == KindProcess && len(opt.Initial) > 0:
		return opt, fmt.Errorf("model %s has no initial condition to set", s.Name)
	case len(opt.Initial) > len(s.Initial):
		return opt, fmt.Errorf("model %s has %d state variables, got %d initial values", s.Name, len(s.Initial), len(opt.Initial))
	}
	for i, v := range opt.Initial {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return opt, fmt.Errorf("initial value %d is not finite", i+1)
		}
	}
	return opt, nil
}

// initial returns the model's initial condition with the options' values laid over it.
func (s Spec) initial(opt Options) []float64 {
	x := append([]float64(nil), s.Initial...)
	copy(x, opt.Initial)
	return x
}

// Simulate builds the model with the given parameters (missing ones take their defaults) and
// records a trajectory. Flows are integrated by RK4 with step Dt/Substeps from the initial
// condition; the transient is dropped; measurement noise, if asked for, is added last. An orbit
// that leaves to infinity is an error.
func (s Spec) Simulate(params Values, opt Options) (*Trajectory, error) {
	sys, err := s.New(params)
	if err != nil {
		return nil, err
	}
	opt, err = s.check(opt)
	if err != nil {
		return nil, fmt.Errorf("simulate %s: %w", s.Name, err)
	}
	tr := &Trajectory{Dt: opt.Dt, Columns: append([]string(nil), s.Columns...)}
	tr.Data = make([][]float64, len(s.Columns))
	for c := range tr.Data {
		tr.Data[c] = make([]float64, opt.N)
	}
	switch {
	case sys.Flow != nil:
		h := opt.Dt / float64(opt.Substeps)
		x := s.initial(opt)
		rk := NewRK4(sys.Flow)
		rk.Advance(x, h, int(math.Round(opt.Transient/h)))
		for i := 0; i < opt.N; i++ {
			if i > 0 {
				rk.Advance(x, h, opt.Substeps)
			}
			for c := range tr.Data {
				tr.Data[c][i] = x[c]
			}
		}
	case sys.Map != nil:
		x := s.initial(opt)
		y := make([]float64, len(x))
		for k := int(math.Round(opt.Transient)); k > 0; k-- {
			sys.Map.Step(y, x)
			x, y = y, x
		}
		for i := 0; i < opt.N; i++ {
			if i > 0 {
				sys.Map.Step(y, x)
				x, y = y, x
			}
			for c := range tr.Data {
				tr.Data[c][i] = x[c]
			}
		}
	case sys.Process != nil:
		rng := rand.New(rand.NewPCG(opt.Seed, streamProcess))
		sys.Process.Generate(tr.Data[0], opt.Dt, int(math.Round(opt.Transient/opt.Dt)), rng)
	default:
		return nil, errors.New("simulate: empty system")
	}
	for c, col := range tr.Data {
		for i, v := range col {
			if math.IsNaN(v) || math.IsInf(v, 0) {
				return nil, fmt.Errorf("simulate %s: %w", s.Name, &EscapeError{Column: tr.Columns[c], Sample: i})
			}
		}
	}
	if opt.Noise > 0 {
		rng := rand.New(rand.NewPCG(opt.Seed, streamNoise))
		for _, col := range tr.Data {
			sd := opt.Noise * stdDev(col)
			for i := range col {
				col[i] += sd * rng.NormFloat64()
			}
		}
	}
	return tr, nil
}

// stdDev returns the population standard deviation of x.
func stdDev(x []float64) float64 {
	if len(x) == 0 {
		return 0
	}
	var m float64
	for _, v := range x {
		m += v
	}
	m /= float64(len(x))
	var ss float64
	for _, v := range x {
		ss += (v - m) * (v - m)
	}
	return math.Sqrt(ss / float64(len(x)))
}

// EscapeError reports an orbit that left to infinity (or became NaN): the parameters or the
// initial condition lie outside the basin of a bounded attractor.
type EscapeError struct {
	Column string // the state variable where it was seen ("" for tangent vectors)
	Sample int    // the sample (or renormalisation interval) where it was seen
}

func (e *EscapeError) Error() string {
	what := "the orbit"
	if e.Column == "" {
		what = "the orbit or its tangent vectors"
	}
	where := fmt.Sprintf("sample %d", e.Sample)
	if e.Column != "" {
		where = fmt.Sprintf("column %s, sample %d", e.Column, e.Sample)
	}
	return fmt.Sprintf("%s left to infinity (%s); choose parameters or an initial condition inside the basin of the attractor", what, where)
}
