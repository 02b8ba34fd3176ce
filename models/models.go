// Package models holds published model systems — flows, maps and linear stochastic processes —
// with their usual parameters as defaults, a fixed-step integrator, a simulator that writes
// sampled trajectories with optional measurement noise, and the Lyapunov spectrum computed from
// the equations by the QR method of Benettin, Galgani, Giorgilli & Strelcyn (1980). The spectra
// are the ground truth that the estimators working on data are tested against.
//
// Systems are plain values: a Flow (vector field and Jacobian), a Map (step and Jacobian) or a
// Process (a signal generated sample by sample). Catalog returns the descriptions of every
// built-in model (name, equations, parameters, defaults, reference); Spec.New builds a System
// from parameter values. Nothing here keeps package-level state, and all randomness comes from
// an explicit *rand.Rand seeded from the options.
package models

import (
	"fmt"
	"math/rand/v2"
	"sort"
	"strings"
)

// Flow is an autonomous system of ordinary differential equations ẋ = F(x) of dimension Dim.
// A non-autonomous forced system is made autonomous by carrying the forcing phase as one more
// state variable.
type Flow interface {
	// Dim returns the number of state variables.
	Dim() int
	// Field writes F(x) into dst; len(dst) = len(x) = Dim.
	Field(dst, x []float64)
	// Jacobian writes ∂F_i/∂x_j at x into jac[i*Dim+j] (row-major, Dim×Dim).
	Jacobian(jac, x []float64)
}

// Map is a discrete-time system x_{n+1} = G(x_n) of dimension Dim.
type Map interface {
	// Dim returns the number of state variables.
	Dim() int
	// Step writes G(x) into dst; dst and x must not overlap.
	Step(dst, x []float64)
	// Jacobian writes ∂G_i/∂x_j at x into jac[i*Dim+j] (row-major, Dim×Dim).
	Jacobian(jac, x []float64)
}

// Process is a scalar signal generated sample by sample (a stochastic process or an explicit
// function of time); it has no tangent dynamics.
type Process interface {
	// Generate fills dst with successive samples at interval dt, after first discarding
	// skip samples (the transient). rng supplies all randomness.
	Generate(dst []float64, dt float64, skip int, rng *rand.Rand)
}

// Kind says what sort of system a model is.
type Kind int

// The kinds of model.
const (
	KindFlow    Kind = iota // continuous time, integrated by RK4
	KindMap                 // discrete time, one sample per iteration
	KindProcess             // generated sample by sample; no Lyapunov spectrum from equations
)

// String returns "flow", "map" or "process".
func (k Kind) String() string {
	switch k {
	case KindFlow:
		return "flow"
	case KindMap:
		return "map"
	case KindProcess:
		return "process"
	}
	return fmt.Sprintf("Kind(%d)", int(k))
}

// Param describes one model parameter.
type Param struct {
	// Name is the parameter's identifier and command-line flag name ("sigma", "a", "phi").
	Name string
	// Symbol is the symbol used in the equations ("σ", "a", "φ").
	Symbol string
	// Doc says what the parameter is.
	Doc string
	// Default holds the default value (one value unless List is set).
	Default []float64
	// List is set when the parameter takes a list of values (AR coefficients, frequency ratios).
	List bool
}

// Values maps parameter names to their values; a scalar parameter has one value.
type Values map[string][]float64

// Spec describes one built-in model: its equations, parameters and default sampling.
type Spec struct {
	// Name is the model's identifier on the command line ("lorenz").
	Name string
	// Title is a short human name with its origin ("Lorenz (1963) convection flow").
	Title string
	// Kind says whether the model is a flow, a map or a process.
	Kind Kind
	// Equations gives the equations in plain text, using the parameter symbols.
	Equations string
	// Reference names the published source of the system or its parameters.
	Reference string
	// Params lists the parameters in the order they appear in the equations.
	Params []Param
	// Columns names the recorded state variables (written after the time column).
	Columns []string
	// Initial is the default initial condition (length = the state dimension).
	Initial []float64
	// Dt is the default output interval in time units (1 for maps).
	Dt float64
	// Transient is the default time dropped before recording, in time units (iterations for maps).
	Transient float64
	// SpectrumN is the default number of renormalisation intervals of length Dt for the
	// Lyapunov spectrum (0 for processes).
	SpectrumN int

	build func(v Values) (System, error)
}

// System is a model built from parameter values: exactly one of Flow, Map and Process is set.
type System struct {
	Flow    Flow
	Map     Map
	Process Process
}

// Defaults returns a fresh copy of the model's default parameter values.
func (s Spec) Defaults() Values {
	v := make(Values, len(s.Params))
	for _, p := range s.Params {
		v[p.Name] = append([]float64(nil), p.Default...)
	}
	return v
}

// Param returns the parameter called name and whether it exists.
func (s Spec) Param(name string) (Param, bool) {
	for _, p := range s.Params {
		if p.Name == name {
			return p, true
		}
	}
	return Param{}, false
}

// Resolve returns the model's defaults overridden by the given values. It is an error to give a
// parameter the model does not have, or several values for a scalar parameter.
func (s Spec) Resolve(given Values) (Values, error) {
	v := s.Defaults()
	names := make([]string, 0, len(given))
	for name := range given {
		names = append(names, name)
	}
	sort.Strings(names)
	for _, name := range names {
		p, ok := s.Param(name)
		if !ok {
			return nil, fmt.Errorf("model %s has no parameter %q (its parameters: %s)", s.Name, name, s.paramNames())
		}
		val := given[name]
		if !p.List && len(val) != 1 {
			return nil, fmt.Errorf("model %s: parameter %s takes one value, got %d", s.Name, name, len(val))
		}
		if p.List && len(val) == 0 {
			return nil, fmt.Errorf("model %s: parameter %s needs at least one value", s.Name, name)
		}
		v[name] = append([]float64(nil), val...)
	}
	return v, nil
}

func (s Spec) paramNames() string {
	if len(s.Params) == 0 {
		return "none"
	}
	n := make([]string, len(s.Params))
	for i, p := range s.Params {
		n[i] = p.Name
	}
	return strings.Join(n, ", ")
}

// New builds the system with the given parameter values; parameters not given take their
// defaults. Invalid values (a non-stationary AR process, a negative noise level, …) are errors.
func (s Spec) New(given Values) (System, error) {
	v, err := s.Resolve(given)
	if err != nil {
		return System{}, err
	}
	sys, err := s.build(v)
	if err != nil {
		return System{}, fmt.Errorf("model %s: %w", s.Name, err)
	}
	return sys, nil
}

// Catalog returns the descriptions of every built-in model, in a fixed order. Each call
// returns fresh values that the caller may modify.
func Catalog() []Spec {
	return []Spec{
		lorenzSpec(), rosslerSpec(), duffingSpec(),
		henonSpec(), logisticSpec(), tentSpec(), loziSpec(), ikedaSpec(),
		sinesSpec(), arSpec(), noiseSpec(),
	}
}

// Lookup returns the built-in model called name (case-insensitive); the error lists the models
// that exist.
func Lookup(name string) (Spec, error) {
	cat := Catalog()
	for _, s := range cat {
		if strings.EqualFold(s.Name, name) {
			return s, nil
		}
	}
	names := make([]string, len(cat))
	for i, s := range cat {
		names[i] = s.Name
	}
	return Spec{}, fmt.Errorf("unknown model %q (models: %s)", name, strings.Join(names, ", "))
}

// one returns the single value of a scalar parameter.
func one(v Values, name string) float64 { return v[name][0] }
