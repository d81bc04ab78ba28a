package main

import (
	"io"
	"os"
	"os/exec"
	"runtime"
	"sync"
	"time"

	"github.com/spf13/cobra"

	"github.com/ampwright/ampwright/cache"
	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/report"
	"github.com/ampwright/ampwright/worker"
	"github.com/ampwright/ampwright/yard"
)

// The bounds on one design's time and memory (--timeout, --max-memory)
// are enforced by ending the process that passes one: CUE evaluation
// cannot be stopped otherwise. A command that compiles one design does it
// in its own process under a watchdog (watchOne); fleet, diff and a check
// of several designs compile in worker processes (newPool), so that a hull
// that passes a bound is reported broken and the others finish.

// sizeValue is a flag holding a size in bytes, such as 512MiB.
type sizeValue struct{ n *int64 }

func (v sizeValue) String() string { return worker.Size(*v.n) }
func (v sizeValue) Type() string   { return "size" }
func (v sizeValue) Set(s string) error {
	n, err := worker.ParseSize(s)
	if err != nil {
		return err
	}
	*v.n = n
	return nil
}

// watchOne bounds the work of a command on one design in this process,
// until stop: when it passes --timeout (extended by grace) or
// --max-memory, the process says which bound it hit, removes its
// temporary files and exits 2. what names the design in the message.
func watchOne(stderr io.Writer, what string, grace time.Duration) (stop func()) {
	lim := compiler.DefaultLimits
	return worker.Watch(lim.Timeout+grace, lim.MaxMemory, func(b worker.Bound) {
		report.Printf(stderr, "ampwright: %s: %s\n", what, worker.Message(b, lim.Timeout, lim.MaxMemory))
		exitRemovingTemps(exitInput)
	})
}

// newPool returns the worker processes that compile hulls for fleet, diff
// and check: this same executable, run as `ampwright worker`, keeping what
// they compile in the result cache ch. A worker is started only for a hull
// not found in the cache. Where the executable cannot be found, hulls are
// compiled in this process under the watchdog, which ends the whole
// command on a bound.
func newPool(stderr io.Writer, ch *cache.Cache) (yard.Options, func()) {
	lim := compiler.DefaultLimits
	exe, err := executable()
	if err != nil {
		stop := watchOne(stderr, "ampwright", 0)
		return yard.Options{Cache: ch}, stop
	}
	args := []string{"worker", "--" + flagTimeout, lim.Timeout.String(), "--" + flagMaxMemory, worker.Size(lim.MaxMemory), "--" + flagResultCache, workerCacheArg(ch)}
	p := worker.NewPool(runtime.GOMAXPROCS(0), exe, args, lim)
	return yard.Options{Run: p.Run, Cache: ch}, p.Close
}

// executable is this program's file. os.Executable is not a name looked
// up again, so it is the same program even if PATH changes; a worker is
// started with argv[0] "ampwright", which the test binary of this package
// also answers to (testscript.Main).
func executable() (string, error) {
	if exe, err := os.Executable(); err == nil {
		return exe, nil
	}
	return exec.LookPath(os.Args[0])
}

func newWorkerCmd() *cobra.Command {
	var setting string
	c := &cobra.Command{
		Use:    "worker",
		Short:  "Compile hulls for another ampwright process (internal)",
		Hidden: true,
		Args:   cobra.NoArgs,
		RunE: func(cmd *cobra.Command, args []string) error {
			dir, err := cacheDir(setting)
			if err != nil {
				dir = ""
			}
			return worker.Serve(cmd.InOrStdin(), cmd.OutOrStdout(), compiler.DefaultLimits, dir)
		},
	}
	c.Flags().StringVar(&setting, flagResultCache, cacheOff, "the result cache's directory, or off")
	return c
}

// temps are the temporary files being written, removed when a bound ends
// the process.
var temps struct {
	sync.Mutex
	names map[string]bool
}

func addTemp(name string) {
	temps.Lock()
	defer temps.Unlock()
	if temps.names == nil {
		temps.names = map[string]bool{}
	}
	temps.names[name] = true
}

func dropTemp(name string) {
	temps.Lock()
	defer temps.Unlock()
	delete(temps.names, name)
}

// exitRemovingTemps removes the temporary files and exits, holding the
// lock so that no file is renamed into place after.
func exitRemovingTemps(code int) {
	temps.Lock()
	for name := range temps.names {
		os.Remove(name)
	}
	os.Exit(code)
}

// renameTemp renames a temporary file into place, unless the process is
// ending on a bound.
func renameTemp(tmp, name string) error {
	temps.Lock()
	defer temps.Unlock()
	delete(temps.names, tmp)
	return os.Rename(tmp, name)
}
