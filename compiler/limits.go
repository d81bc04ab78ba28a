package compiler

import (
	"fmt"
	"time"
)

// Limits bound what one design may cost, so that a hostile or broken
// design cannot hang or exhaust a yard's CI.
type Limits struct {
	// Timeout bounds the compilation of one design.
	Timeout time.Duration
	// MaxFile bounds one file, and MaxModule all the files one design is
	// made of (or the .cue files of a git revision), in bytes; MaxFiles
	// bounds how many files one design is made of.
	MaxFile, MaxModule, MaxFiles int64
}

// DefaultLimits are the limits Compile applies; the command sets Timeout
// from --timeout.
var DefaultLimits = Limits{
	Timeout:   60 * time.Second,
	MaxFile:   4 << 20,
	MaxModule: 64 << 20,
	MaxFiles:  10000,
}

// withTimeout runs f, giving up after lim.Timeout. CUE evaluation cannot be
// stopped, so a run that times out is abandoned; the command exits soon
// after.
func withTimeout[T any](dir string, lim Limits, f func() (T, error)) (T, error) {
	if lim.Timeout <= 0 {
		lim.Timeout = 1<<63 - 1
	}
	type answer struct {
		v   T
		err error
	}
	ch := make(chan answer, 1)
	go func() {
		// A panic in CUE or in ampwright on some input is a bug; it is
		// reported as an input error naming the design, not a crash.
		defer func() {
			if r := recover(); r != nil {
				ch <- answer{err: ErrorList{{Msg: fmt.Sprintf("design %s: internal error (%v); please report it with the design", dir, r)}}}
			}
		}()
		v, err := f()
		ch <- answer{v, err}
	}()
	select {
	case a := <-ch:
		return a.v, a.err
	case <-time.After(lim.Timeout):
		var zero T
		return zero, ErrorList{{Msg: fmt.Sprintf("design %s: compiling took longer than the %s timeout; a comprehension that expands without bound? (raise it with --timeout if the design is merely large)", dir, lim.Timeout)}}
	}
}
