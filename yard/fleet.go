package yard

import (
	"crypto/sha256"
	"encoding/binary"
	"sync"

	"github.com/ampwright/ampwright/result"
)

// InShard reports whether hull falls in share k of n (1 ≤ k ≤ n): a stable
// split by a hash of the hull's path, so that every CI job of a matrix
// takes the same hulls on every run.
func InShard(hull string, k, n int) bool {
	if n <= 1 {
		return true
	}
	// SHA-256 rather than a fast hash: FNV's low bits follow the parity of
	// the bytes, which splits similar names badly.
	sum := sha256.Sum256([]byte(hull))
	return binary.BigEndian.Uint64(sum[:8])%uint64(n) == uint64(k-1)
}

// Fleet compiles the hulls (slash paths relative to root) as opts says,
// by default one a core in this process, and returns one line per hull in
// the order given. A hull that does not compile, or that passes a bound of
// the runner, gets a line with its problems and does not stop the others.
func Fleet(root string, hulls []string, opts Options) []result.FleetLine {
	out := make([]result.FleetLine, len(hulls))
	run := opts.run()
	each(len(hulls), opts, func(i int) {
		c := run(Side{Dir: root}, hulls[i], WantLine)
		switch {
		case !c.OK():
			out[i] = result.FleetLine{Path: hulls[i], Problems: c.Problems, LowestSoC: -1}
		case c.Line != nil:
			out[i] = *c.Line
			out[i].Path = hulls[i]
		default:
			out[i] = result.FleetLineOf(hulls[i], c.Result)
		}
	})
	return out
}

// each calls f for 0 ≤ i < n, opts.parallel() at a time, reporting
// progress after each.
func each(n int, opts Options, f func(i int)) {
	jobs := make(chan int)
	var wg sync.WaitGroup
	var mu sync.Mutex
	done := 0
	for w := 0; w < min(opts.parallel(), max(n, 1)); w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range jobs {
				f(i)
				if opts.Progress != nil {
					mu.Lock()
					done++
					opts.Progress(done, n)
					mu.Unlock()
				}
			}
		}()
	}
	for i := 0; i < n; i++ {
		jobs <- i
	}
	close(jobs)
	wg.Wait()
}
