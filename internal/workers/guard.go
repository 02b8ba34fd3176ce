// Package workers carries a panic out of a worker goroutine: a panic in a goroutine that a
// parallel driver started cannot be recovered by its caller and would end the process with a
// stack trace. A Guard catches it in the worker, lets the other workers finish or skip their
// work, and re-raises it on the calling goroutine (Repanic), where the command line's recover
// turns it into an internal error (exit status 3).
package workers

import (
	"fmt"
	"runtime/debug"
	"sync"
	"sync/atomic"
)

// Guard catches the panics of the workers of one parallel call. The zero value is ready.
type Guard struct {
	failed atomic.Bool
	mu     sync.Mutex
	first  *Panic
}

// Panic is a worker's panic re-raised on the calling goroutine: the value and the worker's
// stack at the panic.
type Panic struct {
	Value any
	Stack []byte
}

// Error says what panicked.
func (p *Panic) Error() string { return fmt.Sprintf("%v (in a worker goroutine)", p.Value) }

// WorkerStack is the stack of the worker goroutine at the panic.
func (p *Panic) WorkerStack() []byte { return p.Stack }

// Run calls f and catches a panic in it (the first one is kept for Repanic). It reports
// whether f returned normally.
func (g *Guard) Run(f func()) (ok bool) {
	defer func() {
		if v := recover(); v != nil {
			g.mu.Lock()
			if g.first == nil {
				g.first = &Panic{Value: v, Stack: debug.Stack()}
			}
			g.mu.Unlock()
			g.failed.Store(true)
			ok = false
		}
	}()
	f()
	return true
}

// Failed reports whether a worker has panicked (the others may skip their remaining work).
func (g *Guard) Failed() bool { return g.failed.Load() }

// Repanic panics on the calling goroutine with the first worker panic caught (a *Panic), and
// does nothing when there was none. Call it after every worker has finished.
func (g *Guard) Repanic() {
	g.mu.Lock()
	p := g.first
	g.mu.Unlock()
	if p != nil {
		panic(p)
	}
}
