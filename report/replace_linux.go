//go:build linux

package report

import (
	"errors"
	"os"

	"golang.org/x/sys/unix"
)

// exchange swaps the folders a and b in one atomic step (renameat2 with RENAME_EXCHANGE,
// Linux 3.15 and later). It returns an error wrapping errors.ErrUnsupported when the file
// system cannot do it, and one wrapping fs.ErrNotExist when either is missing.
func exchange(a, b string) error {
	err := unix.Renameat2(unix.AT_FDCWD, a, unix.AT_FDCWD, b, unix.RENAME_EXCHANGE)
	switch {
	case err == nil:
		return nil
	case errors.Is(err, unix.EINVAL), errors.Is(err, unix.ENOSYS), errors.Is(err, unix.EOPNOTSUPP):
		return &os.LinkError{Op: "exchange", Old: a, New: b, Err: errors.ErrUnsupported}
	}
	return &os.LinkError{Op: "exchange", Old: a, New: b, Err: err}
}
