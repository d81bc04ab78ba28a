// Package yard is ampwright's work over a whole yard: finding its hulls,
// checking them all (the fleet), comparing two revisions hull by hull (the
// diff), and asking git what a design was read from. It stands apart from
// the CUE front end (package compiler), which it calls one hull at a time.
//
// git runs only here, with an argument list and a hardened configuration
// (git.go): a yard's CI runs ampwright on pull requests from outside.
package yard

import (
	"path/filepath"
	"slices"

	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/result"
)

// Compile compiles the hull in dir on disk and gives its result what git
// says of its inputs: the commit, and whether one of its input files
// differs from it. git is asked while the design compiles.
func Compile(dir string) (*result.Result, *compiler.Design, error) {
	r, d, _, err := compileAsking(dir, false)
	return r, d, err
}

// CompileWithHistory is Compile that also lists the commits that touched
// the design's inputs (History), for a pack's cover.
func CompileWithHistory(dir string) (*result.Result, *compiler.Design, result.History, error) {
	return compileAsking(dir, true)
}

func compileAsking(dir string, history bool) (*result.Result, *compiler.Design, result.History, error) {
	g, err := compiler.Gather(dir)
	if err != nil {
		// The compile says why, as it would have.
		r, d, err := compiler.Compile(dir)
		return r, d, result.History{}, err
	}
	a := askGit(g, history)
	r, d, err := g.Compile()
	if err != nil {
		return r, d, result.History{}, err
	}
	f, h := a.wait(d.Files)
	attach(r, f)
	return r, d, h, nil
}

// gitAnswers are git's facts (and, if asked, the history) of a design's
// gathered files, found while the design compiles.
type gitAnswers struct {
	g       *compiler.Gathered
	paths   []string
	facts   chan Facts
	history chan result.History
}

// askGit asks git about the files gathered in g, in the background: the
// files the design is made of (compiler.Design.Files), as a rule, once
// the module's cue.mod/module.cue, which is gathered but is not one of
// them, is left out. wait checks that they are.
func askGit(g *compiler.Gathered, history bool) *gitAnswers {
	module := filepath.Join(g.Root, "cue.mod", "module.cue")
	paths := slices.DeleteFunc(g.Paths(), func(p string) bool { return p == module })
	a := &gitAnswers{g: g, paths: paths, facts: make(chan Facts, 1)}
	go func() { a.facts <- FactsOf(g.Root, a.paths, gatheredReader(g)) }()
	if history {
		a.history = make(chan result.History, 1)
		go func() { a.history <- History(g.Root, a.paths) }()
	}
	return a
}

// wait returns git's answers for a design compiled from the gathered
// files, whose input files are files, asking again, about those, should
// they not be the files asked about.
func (a *gitAnswers) wait(files []string) (Facts, result.History) {
	f := <-a.facts
	var h result.History
	if a.history != nil {
		h = <-a.history
	}
	if slices.Equal(files, a.paths) {
		return f, h
	}
	f = FactsOf(a.g.Root, files, gatheredReader(a.g))
	if a.history != nil {
		h = History(a.g.Root, files)
	}
	return f, h
}

// attach writes git's facts into a result's identity.
func attach(r *result.Result, f Facts) {
	r.Design.Revision = f.Revision
	r.Design.Dirty = f.Dirty
	r.Design.CommitTime = f.Time
}
