//go:build !linux

package report

import (
	"errors"
	"os"
)

// exchange is not available here: replaceDir falls back to two renames.
func exchange(a, b string) error {
	return &os.LinkError{Op: "exchange", Old: a, New: b, Err: errors.ErrUnsupported}
}
