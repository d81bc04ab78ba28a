// Package yard is ampwright's work over a whole yard: finding its hulls,
// checking them all (the fleet), comparing two revisions hull by hull (the
// diff), and asking git what a design was read from. It stands apart from
// the CUE front end (package compiler), which it calls one hull at a time.
//
// git runs only here, with an argument list and a hardened configuration
// (git.go): a yard's CI runs ampwright on pull requests from outside.
package yard

import (
	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/result"
)

// Compile compiles the hull in dir on disk and gives its result what git
// says of its inputs: the commit, and whether one of its input files
// differs from it.
func Compile(dir string) (*result.Result, *compiler.Design, error) {
	r, d, err := compiler.Compile(dir)
	if err == nil {
		attach(r, FactsOf(d.Root, d.Files, d.ReadInput))
	}
	return r, d, err
}

// attach writes git's facts into a result's identity.
func attach(r *result.Result, f Facts) {
	r.Design.Revision = f.Revision
	r.Design.Dirty = f.Dirty
	r.Design.CommitTime = f.Time
}
