package compiler

import (
	"fmt"
	"time"
)

// Limits bound what one design may cost, so that a hostile or broken
// design cannot hang or exhaust a yard's CI.
type Limits struct {
	// Timeout bounds the compilation of one design, and MaxMemory the heap
	// of the process compiling it, in bytes. Neither is enforced here: CUE
	// evaluation cannot be stopped inside a process, so the command
	// enforces them by ending the process that passes one (package worker).
	Timeout   time.Duration
	MaxMemory int64
	// MaxFile bounds one file, and MaxModule all the files one design is
	// made of (or the .cue files of a git revision), in bytes; MaxFiles
	// bounds how many files one design is made of.
	MaxFile, MaxModule, MaxFiles int64
}

// DefaultLimits are the limits Compile applies to what it reads; the
// command sets Timeout and MaxMemory from --timeout and --max-memory, and
// enforces them.
var DefaultLimits = Limits{
	Timeout:   60 * time.Second,
	MaxMemory: 512 << 20,
	MaxFile:   4 << 20,
	MaxModule: 64 << 20,
	MaxFiles:  10000,
}

// recovered turns a panic in CUE or in ampwright on some input, a bug,
// into an input error naming the design rather than a crash.
func recovered(dir string, err *error) {
	if r := recover(); r != nil {
		*err = ErrorList{{Msg: fmt.Sprintf("design %s: internal error (%v); please report it with the design", dir, r)}}
	}
}
