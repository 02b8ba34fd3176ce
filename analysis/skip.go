package analysis

import "errors"

// StatusSkipped is the status of a stage that does not apply to the record (a flow whose
// section has too few crossings for symbols, a symbol stream too short for causal states): it
// is recorded with its reason and does not make the chain's result partial.
const StatusSkipped = "skipped"

// SkipError means a stage does not apply to the record; the message says why and what to
// give. It wraps a *NoAnswerError, so a single command still exits with status 1.
type SkipError struct{ Err error }

// Error is the message.
func (e *SkipError) Error() string { return e.Err.Error() }

// Unwrap returns the wrapped error.
func (e *SkipError) Unwrap() error { return e.Err }

// Skip wraps err as a *SkipError (around a *NoAnswerError).
func Skip(err error) error {
	var na *NoAnswerError
	if !errors.As(err, &na) {
		err = NoAnswer(err)
	}
	return &SkipError{err}
}

// IsSkip reports whether err says that a stage does not apply (a *SkipError in its chain).
func IsSkip(err error) bool {
	var s *SkipError
	return errors.As(err, &s)
}
