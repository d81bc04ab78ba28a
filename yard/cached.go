package yard

import (
	"encoding/json"
	"errors"
	"io/fs"
	"path/filepath"

	"github.com/ampwright/ampwright/cache"
	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/result"
)

// The kinds of entry the result cache keeps for a hull's inputs: its whole
// result, the fleet line derived from it (a fleet of a thousand hulls
// would otherwise decode a thousand results of some hundreds of kilobytes
// each), and, once a diff has asked for them, its input values. A hull
// that does not compile has its problems under every kind. None holds
// git's facts.
const (
	kindResult = "result"
	kindLine   = "line"
	kindInputs = "inputs"
)

// store keeps c (one kind of what a compile of g gave) in the cache. The
// input files are kept relative to the module root.
func store(ch *cache.Cache, g *compiler.Gathered, kind string, c Compiled) {
	if !ch.On() || g == nil {
		return
	}
	files := c.Files
	c.Files = nil
	if g.Root != "" {
		for _, f := range files {
			rel, err := filepath.Rel(g.Root, f)
			if err != nil {
				return
			}
			c.Files = append(c.Files, filepath.ToSlash(rel))
		}
	}
	b, err := json.Marshal(c)
	if err != nil {
		ch.Fail(err)
		return
	}
	ch.Put(g.Key(), kind, b)
}

// load reads one kind of entry for g, false when there is none that
// checks out.
func load(ch *cache.Cache, g *compiler.Gathered, kind string) (Compiled, bool) {
	b, ok := ch.Get(g.Key(), kind)
	if !ok {
		return Compiled{}, false
	}
	var c Compiled
	if err := json.Unmarshal(b, &c); err != nil {
		return Compiled{}, false
	}
	if g.Root != "" {
		for i, f := range c.Files {
			c.Files[i] = filepath.Join(g.Root, filepath.FromSlash(f))
		}
	}
	return c, true
}

// lookup finds what want asks of g in the cache.
func lookup(ch *cache.Cache, g *compiler.Gathered, want Want) (Compiled, bool) {
	kind := kindResult
	if want == WantLine {
		kind = kindLine
	}
	c, ok := load(ch, g, kind)
	if !ok {
		return Compiled{}, false
	}
	switch {
	case !c.OK():
		return Compiled{Problems: c.Problems}, true
	case want == WantLine && c.Line == nil, want != WantLine && c.Result == nil:
		return Compiled{}, false
	case want == WantInputs:
		in, ok := load(ch, g, kindInputs)
		if !ok || in.Inputs == nil {
			return Compiled{}, false
		}
		c.Inputs, c.Entries, c.Own, c.Review = in.Inputs, in.Entries, in.Own, in.Review
	}
	return c, true
}

// Runner returns how the hulls of a fleet, a diff or a check of several
// designs are compiled: each hull is looked up in o.Cache first, in this
// process, from its files alone; a hull not found is compiled by o.Run
// (or here when it is nil), which keeps it in the cache. git's facts are
// then attached afresh, to a hull found and a hull compiled alike, and the
// result's path set to the hull's. Call done when every hull is compiled.
func (o Options) Runner() (run Runner, done func()) {
	rs := &runState{opts: o, reader: compiler.NewReader(), facts: newFactsBatch()}
	return rs.run, rs.reader.Close
}

type runState struct {
	opts   Options
	reader *compiler.Reader
	facts  *factsBatch
}

func (rs *runState) run(s Side, hull string, want Want) Compiled {
	ch := rs.opts.Cache
	var g *compiler.Gathered
	if ch.On() || rs.opts.Run == nil || s.Rev == nil && want != WantInputs {
		// For the cache's key, for a compile here, for git's facts. A hull
		// whose files cannot be gathered is left to the compile, which
		// says why.
		g, _ = s.gather(hull, rs.reader)
	}
	if ch.On() && g != nil {
		if c, ok := lookup(ch, g, want); ok {
			return rs.finish(s, hull, want, c, g)
		}
	}
	var c Compiled
	if rs.opts.Run != nil {
		c = rs.opts.Run(s, hull, want)
	} else {
		c = build(s, hull, want, ch, g)
	}
	if c.Warning != "" {
		ch.Fail(errors.New(c.Warning))
		c.Warning = ""
	}
	return rs.finish(s, hull, want, c, g)
}

// finish gives a hull what git says of it, where it is shown, as Local
// used to: a revision's commit; for a hull on disk, the commit checked out
// and whether its input files differ from it, except for a diff's inputs
// (a diff's sides know theirs). g, if not nil, holds the files as read.
func (rs *runState) finish(s Side, hull string, want Want, c Compiled, g *compiler.Gathered) Compiled {
	files := c.Files
	c.Files = nil
	if !c.OK() {
		return c
	}
	var f Facts
	switch {
	case s.Rev != nil:
		f = Facts{Revision: s.Rev.Commit, Time: s.Rev.Time}
	case want != WantInputs:
		f = rs.facts.of(files, g)
	}
	if c.Result != nil {
		attach(c.Result, f)
		c.Result.Design.Path = hull
	}
	if c.Line != nil {
		c.Line.Path = hull
		c.Line.Revision, c.Line.Dirty = f.Revision, f.Dirty
	}
	return c
}

// fleetLine is what becomes of a compiled hull in a fleet: its line, or
// a line with its problems.
func fleetLine(hull string, c Compiled) result.FleetLine {
	switch {
	case !c.OK():
		return result.FleetLine{Path: hull, Problems: c.Problems, LowestSoC: -1}
	case c.Line != nil:
		l := *c.Line
		l.Path = hull
		return l
	}
	return result.FleetLineOf(hull, c.Result)
}

// Check compiles the design in dir on disk, as check of one design does,
// or finds it in ch, and gives its result git's facts, asking git about
// the design's own files alone (FactsOf).
func Check(dir string, ch *cache.Cache) Compiled {
	g, err := compiler.Gather(dir)
	if err != nil {
		// The compile says why, as it would have.
		r, _, err := Compile(dir)
		if err != nil {
			return Compiled{Problems: problemsOf(err)}
		}
		return Compiled{Result: r}
	}
	a := askGit(g, false)
	c, ok := lookup(ch, g, WantResult)
	if !ok {
		c = build(Side{}, dir, WantResult, ch, g)
	}
	files := c.Files
	c.Files = nil
	if !c.OK() {
		return c // git's answers are not needed
	}
	f, _ := a.wait(files)
	attach(c.Result, f)
	c.Result.Design.Path = dir
	return c
}

// gatheredReader reads a design's input files (absolute paths) from its
// gathered files.
func gatheredReader(g *compiler.Gathered) func(string) ([]byte, error) {
	return func(f string) ([]byte, error) {
		rel, err := filepath.Rel(g.Root, f)
		if err != nil {
			return nil, err
		}
		if b, ok := g.Read(filepath.ToSlash(rel)); ok {
			return b, nil
		}
		return nil, fs.ErrNotExist
	}
}
