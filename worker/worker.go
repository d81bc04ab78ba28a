// Package worker runs the compiles of a fleet, a diff or a check of
// several designs in child processes of ampwright, so that a hull that
// passes a bound of time or memory is stopped while the others finish.
// CUE evaluation cannot be cancelled inside a process: a compile that
// passes a bound is stopped by ending the process that runs it.
//
// A worker is the same binary run as `ampwright worker` (a hidden
// command): Serve reads requests, one JSON object a line, on its standard
// input and writes one answer a line on its standard output, for as many
// hulls as it is given. A Pool starts workers, hands each request to an
// idle one, kills a worker whose hull passes the time bound and replaces
// it; a worker whose heap passes the memory bound ends itself (Watch) with
// ExitMemory.
//
// Watch is also the watchdog of a command that compiles one design in its
// own process (check, pack, bom of one hull).
package worker

import (
	"bufio"
	"encoding/json"
	"fmt"
	"io"
	"os"
	"runtime/debug"
	"runtime/metrics"
	"time"

	"github.com/ampwright/ampwright/cache"
	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/yard"
)

// Exit statuses of a worker that ended itself on a bound.
const (
	ExitMemory = 3
	ExitTime   = 4
)

// Request asks a worker to compile one hull.
type Request struct {
	ID uint64 `json:"id"`
	// Dir is the side's directory on disk: a yard's module, or "" for a
	// design named by its own path in Hull.
	Dir string `json:"dir"`
	// Rev is a commit: the side is then Dir's module as it was at Rev,
	// read from git's objects.
	Rev  string    `json:"rev,omitempty"`
	Hull string    `json:"hull"`
	Want yard.Want `json:"want"`
}

// Answer is a worker's answer to a request.
type Answer struct {
	ID uint64 `json:"id"`
	yard.Compiled
}

// graceTime is how much longer than the time bound a worker lets a
// compile run before it ends itself: the pool's own timer should stop it
// first, and this one stops a worker whose pool has gone.
const graceTime = 5 * time.Second

// Serve answers requests from in on out until in ends, compiling each hull
// in this process within lim: a heap over lim.MaxMemory ends the process
// with ExitMemory, a compile longer than lim.Timeout and a grace period
// with ExitTime. What it compiles it keeps in the result cache in
// cacheDir ("" for none), and the cache's first error goes back with the
// answer, for the command to report.
func Serve(in io.Reader, out io.Writer, lim compiler.Limits, cacheDir string) error {
	stop := Watch(0, lim.MaxMemory, func(Bound) { os.Exit(ExitMemory) })
	defer stop()
	dec := json.NewDecoder(bufio.NewReader(in))
	w := bufio.NewWriter(out)
	enc := json.NewEncoder(w)
	revs := &revisions{}
	var warning string
	var ch *cache.Cache
	if cacheDir != "" {
		ch = cache.Open(cacheDir, cache.Tool(result.Version), func(err error) { warning = err.Error() })
	}
	for {
		var req Request
		if err := dec.Decode(&req); err == io.EOF {
			return nil
		} else if err != nil {
			return fmt.Errorf("worker: reading a request: %v", err)
		}
		var timer *time.Timer
		if lim.Timeout > 0 {
			timer = time.AfterFunc(lim.Timeout+graceTime, func() { os.Exit(ExitTime) })
		}
		ans := Answer{ID: req.ID, Compiled: compile(req, revs, ch)}
		ans.Warning, warning = warning, ""
		if timer != nil {
			timer.Stop()
		}
		if err := enc.Encode(ans); err != nil {
			return err
		}
		if err := w.Flush(); err != nil {
			return err
		}
		gc.tune()
	}
}

// heapTarget is the heap a worker lets grow between collections while
// the hulls it compiles hold little: a hull's compilation allocates tens
// of megabytes and keeps a few, so collecting only near this size spends
// a fraction of the collector's time at Go's default, and keeps the
// process within the fleet's memory target (docs/performance.md).
const heapTarget = 64 << 20

// gcTuner sets the collector's percentage after each hull so that the
// heap peaks near heapTarget: the live heap (the reused contexts, see
// compiler.Design.Release) grows and shrinks from hull to hull. GOGC in
// the environment wins.
type gcTuner struct {
	off    bool
	sample []metrics.Sample
}

var gc = &gcTuner{
	off:    os.Getenv("GOGC") != "",
	sample: []metrics.Sample{{Name: "/gc/heap/live:bytes"}},
}

func (t *gcTuner) tune() {
	if t.off {
		return
	}
	metrics.Read(t.sample)
	if t.sample[0].Value.Kind() != metrics.KindUint64 {
		return
	}
	live := max(t.sample[0].Value.Uint64(), 1<<20)
	pct := int(heapTarget/live)*100 - 100
	debug.SetGCPercent(min(max(pct, 100), 800))
}

func compile(req Request, revs *revisions, ch *cache.Cache) yard.Compiled {
	side := yard.Side{Dir: req.Dir}
	if req.Rev != "" {
		rv, err := revs.get(req.Dir, req.Rev)
		if err != nil {
			return yard.Compiled{Problems: problems(err)}
		}
		side = yard.Side{Rev: rv}
	}
	return yard.Build(side, req.Hull, req.Want, ch)
}

// revisions keeps the last revisions a worker read: a diff asks for two.
// Each reads its files from git when first asked for them.
type revisions struct {
	keys [2]string
	revs [2]*yard.Revision
	next int
}

func (r *revisions) get(dir, rev string) (*yard.Revision, error) {
	key := dir + "\x00" + rev
	for i, k := range r.keys {
		if k == key {
			return r.revs[i], nil
		}
	}
	rv, err := yard.ReadCommit(dir, rev)
	if err != nil {
		return nil, err
	}
	if old := r.revs[r.next]; old != nil {
		old.Close()
	}
	r.keys[r.next], r.revs[r.next] = key, rv
	r.next = (r.next + 1) % len(r.keys)
	return rv, nil
}
