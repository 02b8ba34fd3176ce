package analysis

import (
	"bytes"
	"encoding/json"
	"fmt"
	"runtime"

	"unfold/internal/safejson"
	"unfold/series"
)

// Env is what every stage shares: the worker count, the seed, where messages and progress go,
// and how the record was read and prepared (recorded in the parameters; the stages do not
// apply it). The zero value is silent and uses all cores with seed 0.
type Env struct {
	// Threads is the number of goroutines (0 = all cores). Results do not depend on it.
	Threads int
	// Seed seeds every random step (bootstraps, surrogates).
	Seed uint64
	// Notef, when not nil, receives one-line messages (choices made, with their rule).
	Notef func(format string, args ...any)
	// Progress, when not nil, returns a (done, total) callback for a long loop named label.
	Progress func(label string) func(done, total int)
	// Read and Prep are how the record was read and prepared, for the parameters.
	Read series.ReadOptions
	Prep series.Prep
	// Indexes, when not nil, shares neighbour indexes between the stages of one run (see
	// IndexCache); nil builds each index where it is needed.
	Indexes *IndexCache
}

func (e *Env) threads() int {
	if e.Threads > 0 {
		return e.Threads
	}
	return runtime.NumCPU()
}

func (e *Env) notef(format string, args ...any) {
	if e.Notef != nil {
		e.Notef(format, args...)
	}
}

func (e *Env) progress(label string) func(done, total int) {
	if e.Progress == nil {
		return nil
	}
	return e.Progress(label)
}

// UsageError is a bad option value (the command line exits with status 2).
type UsageError struct{ Err error }

// Error is the message.
func (e *UsageError) Error() string { return e.Err.Error() }

// Unwrap returns the wrapped error.
func (e *UsageError) Unwrap() error { return e.Err }

// Usagef returns a *UsageError.
func Usagef(format string, args ...any) error {
	return &UsageError{fmt.Errorf(format, args...)}
}

// NoAnswerError means a stage ran but could not give an answer; the message says why (the
// command line exits with status 1).
type NoAnswerError struct{ Err error }

// Error is the message.
func (e *NoAnswerError) Error() string { return e.Err.Error() }

// Unwrap returns the wrapped error.
func (e *NoAnswerError) Unwrap() error { return e.Err }

// NoAnswer wraps err as a *NoAnswerError.
func NoAnswer(err error) error { return &NoAnswerError{err} }

// Input is the "input" object of every JSON output: the file, its SHA-256, the samples
// analysed and their interval.
type Input struct {
	Path    string  `json:"path"`
	SHA256  string  `json:"sha256"`
	Samples int     `json:"samples"`
	Dt      float64 `json:"dt"`
	// Units are the record's time and signal units; Envelope writes them as the top-level
	// "units" object beside "input" (DESIGN.md §3), not inside it.
	Units Units `json:"-"`
}

// Units are the "units" object of every JSON output: the unit of time (of dt, lags in time,
// periods; exponents are per this unit) and of the signal's values, from the input's header
// ("time (s)", "strain [µε]") or the --time-unit and --unit flags. Empty when not known.
type Units struct {
	Time   string `json:"time"`
	Signal string `json:"signal"`
}

// Envelope returns the indented JSON object every command prints with --json (with its final
// newline): "command", "version", "input" and "units" (when in is not nil) and "parameters",
// followed by the fields of body (a struct or map that marshals to a JSON object), in that order.
func Envelope(command, version string, in *Input, params any, body any) ([]byte, error) {
	var buf bytes.Buffer
	buf.WriteString(`{"command":`)
	b, _ := json.Marshal(command)
	buf.Write(b)
	buf.WriteString(`,"version":`)
	b, _ = json.Marshal(version)
	buf.Write(b)
	if in != nil {
		buf.WriteString(`,"input":`)
		b, err := json.Marshal(in)
		if err != nil {
			return nil, fmt.Errorf("%s: encoding JSON input: %w", command, err)
		}
		buf.Write(b)
		buf.WriteString(`,"units":`)
		if b, err = json.Marshal(in.Units); err != nil {
			return nil, fmt.Errorf("%s: encoding JSON units: %w", command, err)
		}
		buf.Write(b)
	}
	if params == nil {
		params = struct{}{}
	}
	b, nulledParams, err := safejson.Marshal(params) // non-finite numbers as null
	if err != nil {
		return nil, fmt.Errorf("%s: encoding JSON parameters: %w", command, err)
	}
	buf.WriteString(`,"parameters":`)
	buf.Write(b)
	if body != nil {
		b, nulled, err := safejson.Marshal(body)
		if err != nil {
			return nil, fmt.Errorf("%s: encoding JSON result: %w", command, err)
		}
		for _, p := range nulledParams {
			nulled = append(nulled, "parameters."+p)
		}
		if len(nulled) > 0 {
			if b, err = withCautions(b, safejson.Cautions(nulled)); err != nil {
				return nil, fmt.Errorf("%s: encoding JSON result: %w", command, err)
			}
		}
		b = bytes.TrimSpace(b)
		if len(b) < 2 || b[0] != '{' {
			return nil, fmt.Errorf("%s: JSON result is not an object", command)
		}
		if inner := bytes.TrimSpace(b[1 : len(b)-1]); len(inner) > 0 {
			buf.WriteByte(',')
			buf.Write(inner)
		}
	}
	buf.WriteString("}\n")
	var out bytes.Buffer
	if err := json.Indent(&out, buf.Bytes(), "", "  "); err != nil {
		return nil, fmt.Errorf("%s: JSON: %w", command, err)
	}
	return out.Bytes(), nil
}

// Output is one stage's JSON object: the envelope of its command with the parameters P and
// the body B. It marshals exactly as that command prints with --json.
type Output[P, B any] struct {
	Command, Version string
	Input            *Input
	Params           P
	Body             B
}

// newOutput is the stage object of command with its envelope.
func newOutput[P, B any](command, version string, in *Input, p P, b B) Output[P, B] {
	return Output[P, B]{Command: command, Version: version, Input: in, Params: p, Body: b}
}

// MarshalJSON writes the envelope (see Envelope), compact.
func (o Output[P, B]) MarshalJSON() ([]byte, error) {
	b, err := Envelope(o.Command, o.Version, o.Input, o.Params, o.Body)
	if err != nil {
		return nil, err
	}
	var c bytes.Buffer
	if err := json.Compact(&c, b); err != nil {
		return nil, err
	}
	return c.Bytes(), nil
}

// PrepParams are the reading and preprocessing parameters recorded in every JSON output of the
// embedding commands.
type PrepParams struct {
	Column      string `json:"column"`
	Detrend     string `json:"detrend"`
	Standardize bool   `json:"standardize"`
	Decimate    int    `json:"decimate"`
	From        string `json:"from"`
	To          string `json:"to"`
	Gaps        string `json:"gaps"`
}

func (e *Env) prepParams(s *series.Series) PrepParams {
	return PrepParams{Column: s.Name, Detrend: e.Prep.Detrend, Standardize: e.Prep.Standardize,
		Decimate: max(e.Prep.Decimate, 1), From: e.Prep.From, To: e.Prep.To, Gaps: e.Read.Gaps}
}

const ln2 = 0.6931471805599453

func fmtErr(command, path string, err error) error {
	return fmt.Errorf("%s: %s: %w", command, path, err)
}

// withCautions adds the texts to the "cautions" array of the JSON object obj (appending the
// key when obj has none), keeping the order of every other key.
func withCautions(obj []byte, texts []string) ([]byte, error) {
	dec := json.NewDecoder(bytes.NewReader(obj))
	if t, err := dec.Token(); err != nil || t != json.Delim('{') {
		return nil, fmt.Errorf("not a JSON object")
	}
	var out bytes.Buffer
	out.WriteByte('{')
	found := false
	for dec.More() {
		t, err := dec.Token()
		if err != nil {
			return nil, err
		}
		key, _ := t.(string)
		var v json.RawMessage
		if err := dec.Decode(&v); err != nil {
			return nil, err
		}
		if out.Len() > 1 {
			out.WriteByte(',')
		}
		k, _ := json.Marshal(key)
		out.Write(k)
		out.WriteByte(':')
		if key == "cautions" {
			found = true
			var list []string
			_ = json.Unmarshal(v, &list) // null or an array of strings
			v, _ = json.Marshal(append(list, texts...))
		}
		out.Write(v)
	}
	if !found {
		if out.Len() > 1 {
			out.WriteByte(',')
		}
		v, _ := json.Marshal(texts)
		out.WriteString(`"cautions":`)
		out.Write(v)
	}
	out.WriteByte('}')
	return out.Bytes(), nil
}
