package workers

import (
	"strings"
	"sync"
	"testing"
)

// TestGuardCarriesPanic: a panic in one of several workers reaches the calling goroutine,
// where recover sees it with the worker's stack, and the other workers are not stopped.
func TestGuardCarriesPanic(t *testing.T) {
	var g Guard
	var wg sync.WaitGroup
	var mu sync.Mutex
	done := 0
	for w := range 4 {
		wg.Go(func() {
			g.Run(func() {
				if w == 2 {
					var m map[string]int
					m["x"] = 1 // a nil-map write panics
				}
				mu.Lock()
				done++
				mu.Unlock()
			})
		})
	}
	wg.Wait()
	if done != 3 || !g.Failed() {
		t.Errorf("done %d, failed %v; want 3 workers done and the failure seen", done, g.Failed())
	}
	defer func() {
		p, ok := recover().(*Panic)
		if !ok {
			t.Fatal("Repanic did not panic with a *Panic")
		}
		if !strings.Contains(p.Error(), "nil map") || !strings.Contains(string(p.WorkerStack()), "guard_test.go") {
			t.Errorf("panic %q, stack %.200s", p.Error(), p.WorkerStack())
		}
	}()
	g.Repanic()
}

// TestGuardQuiet: without a panic Repanic does nothing.
func TestGuardQuiet(t *testing.T) {
	var g Guard
	if !g.Run(func() {}) || g.Failed() {
		t.Error("a normal call was reported as failed")
	}
	g.Repanic()
}
