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
// the order given, and the whole results of the hulls opts.Keep picks, by
// hull, so that a caller can render them (the packs of the changed hulls)
// without compiling them again. A hull that does not compile, or that
// passes a bound of the runner, gets a line with its problems and does not
// stop the others.
func Fleet(root string, hulls []string, opts Options) ([]result.FleetLine, map[string]*result.Result) {
	out := make([]result.FleetLine, len(hulls))
	kept := map[string]*result.Result{}
	var mu sync.Mutex
	run, done := opts.Runner()
	defer done()
	each(len(hulls), opts, func(i int) {
		want := WantLine
		keep := opts.Keep != nil && opts.Keep(hulls[i])
		if keep {
			want = WantResult
		}
		c := run(Side{Dir: root}, hulls[i], want)
		out[i] = fleetLine(hulls[i], c)
		if keep && c.Result != nil {
			mu.Lock()
			kept[hulls[i]] = c.Result
			mu.Unlock()
		}
	})
	return out, kept
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

// ChangedSince reports which of the hulls (slash paths relative to the
// module root, in a git work tree) have inputs that differ from those at
// revision rev (see comparison), or did not exist at rev. Nothing is
// compiled, and nothing is read from git but rev's tree and the files of
// the directories that differ.
func ChangedSince(root, rev string, hulls []string) (map[string]bool, error) {
	rv, err := ReadRevision(root, rev)
	if err != nil {
		return nil, err
	}
	defer rv.Close()
	cmp := newComparison(Side{Rev: rv}, Side{Dir: root})
	defer cmp.close()
	changed := map[string]bool{}
	for _, h := range hulls {
		changed[h] = !cmp.unchanged(h)
	}
	return changed, nil
}
