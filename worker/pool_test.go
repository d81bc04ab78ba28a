package worker

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
	"time"

	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/yard"
)

// The test binary is its own worker: run with AMPWRIGHT_TEST_WORKER set,
// it serves requests as `ampwright worker` does.
func TestMain(m *testing.M) {
	if os.Getenv("AMPWRIGHT_TEST_WORKER") != "" {
		lim := compiler.DefaultLimits
		lim.Timeout = 2 * time.Second
		lim.MaxMemory = 150 << 20
		if err := Serve(os.Stdin, os.Stdout, lim, os.Getenv("AMPWRIGHT_TEST_WORKER_CACHE")); err != nil {
			os.Exit(1)
		}
		os.Exit(0)
	}
	os.Exit(m.Run())
}

// TestPool: a worker answers hull after hull; one whose hull passes the
// time bound is killed and replaced, one whose hull passes the memory
// bound ends itself and is replaced; each such hull comes back with its
// bound named, and the next hull is compiled.
func TestPool(t *testing.T) {
	if testing.Short() {
		t.Skip("compiles runaway designs")
	}
	t.Setenv("AMPWRIGHT_TEST_WORKER", "1")
	exe, err := os.Executable()
	if err != nil {
		t.Skip(err)
	}
	yardDir, err := filepath.Abs("../testdata/hostile/yard")
	if err != nil {
		t.Fatal(err)
	}
	lim := compiler.Limits{Timeout: time.Second, MaxMemory: 150 << 20}
	p := NewPool(1, exe, nil, lim)
	defer p.Close()
	side := yard.Side{Dir: yardDir}
	good := func() {
		t.Helper()
		c := p.Run(side, "hulls/good", yard.WantLine)
		if !c.OK() || c.Line == nil || c.Line.Name != "Good" {
			t.Fatalf("the good hull: %+v", c)
		}
	}
	good()
	good()
	for hull, want := range map[string]string{
		"hulls/slow":   "took longer than the --timeout bound of 1s",
		"hulls/greedy": "needed more memory than the --max-memory bound of 150MiB",
	} {
		start := time.Now()
		c := p.Run(side, hull, yard.WantLine)
		if c.OK() || !strings.Contains(c.Problems[0].Message, "stopped: it ") {
			t.Errorf("%s: %+v, want it stopped at a bound (%s)", hull, c, want)
		}
		if d := time.Since(start); d > 20*time.Second {
			t.Errorf("%s took %s to stop", hull, d)
		}
		good()
	}
}
