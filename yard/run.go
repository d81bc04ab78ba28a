package yard

import (
	"errors"
	"path/filepath"
	"runtime"

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
// process sends back.
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
}

// OK reports whether the hull compiled.
func (c Compiled) OK() bool { return len(c.Problems) == 0 }

// A Runner compiles the hull in directory hull of a side. Local does it
// in this process; the command gives a runner that does it in worker
// processes, which can be stopped when a hull passes a bound.
type Runner func(s Side, hull string, want Want) Compiled

// Local compiles a hull in this process. It has no bound on time or
// memory: that is for the process that runs it (see package worker).
func Local(s Side, hull string, want Want) Compiled {
	// git is asked only where its answer is shown: a result, and a fleet's
	// line (its revision and dirty flag); a diff's sides know theirs.
	r, d, err := s.compile(hull, want != WantInputs)
	if err != nil {
		return Compiled{Problems: problemsOf(err)}
	}
	// Everything this takes from the design's CUE value is taken below:
	// the context it was evaluated in can take the next hull.
	defer d.Release()
	c := Compiled{Result: r}
	switch want {
	case WantLine:
		l := result.FleetLineOf(hull, r)
		c.Result, c.Line = nil, &l
	case WantInputs:
		c.Inputs = d.Inputs()
		c.Entries, c.Own = origins(d, c.Inputs)
		c.Review = d.Rules.Review
	}
	return c
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
	// Run compiles one hull; nil is Local.
	Run Runner
	// Parallel is how many hulls are compiled at once; 0 is one a core.
	Parallel int
	// Progress, if not nil, is called after each hull with the number done.
	Progress func(done, total int)
	// Keep, if not nil, picks the hulls of a fleet whose whole results it
	// returns besides their lines.
	Keep func(hull string) bool
}

func (o Options) run() Runner {
	if o.Run == nil {
		return Local
	}
	return o.Run
}

func (o Options) parallel() int {
	if o.Parallel > 0 {
		return o.Parallel
	}
	return runtime.GOMAXPROCS(0)
}

// hullDir is the directory of a hull of a side on disk.
func hullDir(root, hull string) string { return filepath.Join(root, filepath.FromSlash(hull)) }
