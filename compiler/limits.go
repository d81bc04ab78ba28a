package compiler

import (
	"fmt"
	"io/fs"
	"path/filepath"
	"strings"
	"sync"
	"time"
)

// Limits bound what one design may cost, so that a hostile or broken
// design cannot hang or exhaust a yard's CI.
type Limits struct {
	// Timeout bounds the compilation of one design.
	Timeout time.Duration
	// MaxFile bounds one .cue file, and MaxModule all the .cue files of a
	// module, in bytes.
	MaxFile, MaxModule int64
}

// DefaultLimits are the limits Compile applies; the command sets Timeout
// from --timeout.
var DefaultLimits = Limits{
	Timeout:   60 * time.Second,
	MaxFile:   4 << 20,
	MaxModule: 64 << 20,
}

// sizeChecked remembers modules whose sizes were checked, by root.
var sizeChecked sync.Map

// checkSizes fails when a .cue file of the module at root, or all of them
// together, exceed the limits: checked before cue/load reads anything.
func checkSizes(root string, lim Limits) error {
	if v, ok := sizeChecked.Load(root); ok {
		if v == nil {
			return nil
		}
		return v.(error)
	}
	var total int64
	err := filepath.WalkDir(root, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return nil // an unreadable corner is cue/load's to report
		}
		if d.IsDir() {
			if p != root && (strings.HasPrefix(d.Name(), ".") || d.Name() == "node_modules") {
				return filepath.SkipDir
			}
			return nil
		}
		if !strings.HasSuffix(p, ".cue") {
			return nil
		}
		fi, err := d.Info()
		if err != nil {
			return nil
		}
		if fi.Size() > lim.MaxFile {
			return fmt.Errorf("%s is %d bytes, more than the %d-byte limit for one file (a bound that keeps a hostile design from exhausting CI)", displayName(p), fi.Size(), lim.MaxFile)
		}
		total += fi.Size()
		if total > lim.MaxModule {
			return fmt.Errorf("the .cue files under %s exceed the %d-byte limit for a module", displayName(root), lim.MaxModule)
		}
		return nil
	})
	if err != nil {
		sizeChecked.Store(root, err)
		return err
	}
	sizeChecked.Store(root, nil)
	return nil
}

// checkSourceSizes is checkSizes for a module held in memory.
func checkSourceSizes(src *Source, lim Limits) error {
	var total int64
	for name, b := range src.Files {
		if !strings.HasSuffix(name, ".cue") {
			continue
		}
		if int64(len(b)) > lim.MaxFile {
			return fmt.Errorf("%s%s is %d bytes, more than the %d-byte limit for one file", src.Label, name, len(b), lim.MaxFile)
		}
		total += int64(len(b))
	}
	if total > lim.MaxModule {
		return fmt.Errorf("the .cue files of %s exceed the %d-byte limit for a module", src.Label, lim.MaxModule)
	}
	return nil
}

// checkInside fails when a file the design is made of lies outside its
// module once symbolic links are followed: ampwright reads nothing outside
// the design's module.
func checkInside(root string, files []string) error {
	realRoot, err := filepath.EvalSymlinks(root)
	if err != nil {
		return nil
	}
	for _, f := range files {
		real, err := filepath.EvalSymlinks(f)
		if err != nil {
			continue
		}
		rel, err := filepath.Rel(realRoot, real)
		if err != nil || rel == ".." || strings.HasPrefix(rel, ".."+string(filepath.Separator)) {
			return fmt.Errorf("%s leads outside the module (to %s); ampwright reads nothing outside the design's module", displayName(f), real)
		}
	}
	return nil
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
