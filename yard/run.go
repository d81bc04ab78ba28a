package yard

import (
	"errors"
	"path/filepath"
	"runtime"

	"github.com/ampwright/ampwright/cache"
	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// Want says what compiling a hull must give back: the fleet needs only a
// hull's line, the diff its result and inputs, check its result.
type Want int

const (
	WantLine Want = iota
	WantResult
	WantInputs // the result and the design's inputs
)

// Compiled is what compiling one hull gives: its result (or only its
// fleet line), or the problems that stopped it. It is also what a worker
// process sends back, and what the result cache keeps.
type Compiled struct {
	Result *result.Result    `json:"result,omitempty"`
	Line   *result.FleetLine `json:"line,omitempty"`
	Inputs map[string]string `json:"inputs,omitempty"`
	// Entries and Own say, for each input, the entry it belongs to and
	// whether the hull's own files write it (see splitInputs).
	Entries map[string]string `json:"entries,omitempty"`
	Own     map[string]bool   `json:"own,omitempty"`
	// Review is the rulebook's review table, for the diff's margins.
	Review   *schema.ReviewRule `json:"review,omitempty"`
	Problems []result.Problem   `json:"problems,omitempty"`
	// Files are the design's input files (compiler.Design.Files), which
	// git's facts are found for.
	Files []string `json:"files,omitempty"`
	// Warning is the first error of a worker's result cache, for the
	// command to report once.
	Warning string `json:"warning,omitempty"`
}

// OK reports whether the hull compiled.
func (c Compiled) OK() bool { return len(c.Problems) == 0 }

// A Runner compiles the hull in directory hull of a side, without git's
// facts (Options.Runner attaches them). Local does it in this process;
// the command gives a runner that does it in worker processes, which can
// be stopped when a hull passes a bound.
type Runner func(s Side, hull string, want Want) Compiled

// Local compiles a hull in this process, without a cache. It has no
// bound on time or memory: that is for the process that runs it (see
// package worker).
func Local(s Side, hull string, want Want) Compiled {
	return Build(s, hull, want, nil)
}

// Build compiles a hull in this process and keeps what it computed in c,
// when c is on: the result, the fleet line derived from it, and for
// WantInputs the inputs. git's facts are not attached, nor is the result's
// path set: Options.Runner does both, for a hull compiled or found in the
// cache alike.
func Build(s Side, hull string, want Want, c *cache.Cache) Compiled {
	var g *compiler.Gathered
	if c.On() {
		g, _ = s.gather(hull, nil)
	}
	return build(s, hull, want, c, g)
}

// build is Build from files already gathered, when g is not nil.
func build(s Side, hull string, want Want, c *cache.Cache, g *compiler.Gathered) Compiled {
	var r *result.Result
	var d *compiler.Design
	var err error
	if g != nil {
		r, d, err = g.Compile()
	} else {
		r, d, err = s.compile(hull)
	}
	if err != nil {
		out := Compiled{Problems: problemsOf(err)}
		for _, kind := range []string{kindLine, kindResult, kindInputs} {
			store(c, g, kind, Compiled{Problems: out.Problems})
		}
		return out
	}
	out := Compiled{Files: d.Files}
	if want == WantInputs {
		out.Inputs, out.Entries, out.Own = d.InputOrigins()
		out.Review = d.Rules.Review
	}
	// Everything this takes from the design's CUE value is taken: the
	// context it was evaluated in can take the next hull, and is free
	// while the entries are written.
	d.Release()
	line := result.FleetLineOf(hull, r)
	store(c, g, kindResult, Compiled{Result: r, Files: out.Files})
	store(c, g, kindLine, Compiled{Line: &line, Files: out.Files})
	switch want {
	case WantLine:
		out.Line = &line
	case WantResult:
		out.Result = r
	case WantInputs:
		out.Result = r
		store(c, g, kindInputs, Compiled{Inputs: out.Inputs, Entries: out.Entries, Own: out.Own, Review: out.Review})
	}
	return out
}

// problemsOf turns an error of the compiler into problems.
func problemsOf(err error) []result.Problem {
	var list compiler.ErrorList
	if errors.As(err, &list) {
		return list.Problems()
	}
	return []result.Problem{{Message: err.Error()}}
}

// Options say how a fleet or a diff compiles its hulls.
type Options struct {
	// Run compiles one hull; nil compiles in this process.
	Run Runner
	// Cache, when on, keeps compiled hulls between runs: a hull whose
	// inputs are in it is not compiled, nor sent to Run. Run keeps what it
	// compiles in the same cache (Build).
	Cache *cache.Cache
	// Parallel is how many hulls are compiled at once; 0 is one a core.
	Parallel int
	// Progress, if not nil, is called after each hull with the number done.
	Progress func(done, total int)
	// Keep, if not nil, picks the hulls of a fleet whose whole results it
	// returns besides their lines.
	Keep func(hull string) bool
}

func (o Options) parallel() int {
	if o.Parallel > 0 {
		return o.Parallel
	}
	return runtime.GOMAXPROCS(0)
}

// hullDir is the directory of a hull of a side on disk.
func hullDir(root, hull string) string { return filepath.Join(root, filepath.FromSlash(hull)) }
