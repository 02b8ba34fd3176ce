package regime

import (
	"testing"

	"unfold/internal/workers"
)

// TestParallelForPanic: a panic in one item of parallelFor reaches the caller (where the
// command line's recover makes it an internal error) instead of ending the process, and the
// driver does not hang.
func TestParallelForPanic(t *testing.T) {
	defer func() {
		if _, ok := recover().(*workers.Panic); !ok {
			t.Error("the worker's panic did not reach the caller as a *workers.Panic")
		}
	}()
	parallelFor(50, 3, func(int, int) {}, func(i int) {
		if i == 7 {
			panic("item 7")
		}
	})
	t.Error("parallelFor returned normally")
}
