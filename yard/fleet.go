package yard

import (
	"crypto/sha256"
	"encoding/binary"
	"path/filepath"
	"runtime"
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

// FleetOptions are what Fleet does besides compiling.
type FleetOptions struct {
	// Progress, if not nil, is called after each hull with the number
	// done.
	Progress func(done, total int)
	// Keep, if not nil, picks the hulls whose whole results Fleet returns
	// besides their lines, so that a caller can render them (the packs of
	// the changed hulls) without compiling them again.
	Keep func(hull string) bool
}

// Fleet compiles the hulls (slash paths relative to root) concurrently,
// as many at once as there are cores, and returns one line per hull in the
// order given, and the results of the hulls opts.Keep picks, by hull. A
// hull that does not compile gets a line with its errors and does not stop
// the others.
func Fleet(root string, hulls []string, opts FleetOptions) ([]result.FleetLine, map[string]*result.Result) {
	out := make([]result.FleetLine, len(hulls))
	kept := map[string]*result.Result{}
	workers := runtime.GOMAXPROCS(0)
	jobs := make(chan int)
	var wg sync.WaitGroup
	var mu sync.Mutex
	done := 0
	for w := 0; w < workers; w++ {
		wg.Add(1)
		go func() {
			defer wg.Done()
			for i := range jobs {
				var r *result.Result
				out[i], r = fleetLine(root, hulls[i])
				mu.Lock()
				if r != nil && opts.Keep != nil && opts.Keep(hulls[i]) {
					kept[hulls[i]] = r
				}
				done++
				if opts.Progress != nil {
					opts.Progress(done, len(hulls))
				}
				mu.Unlock()
			}
		}()
	}
	for i := range hulls {
		jobs <- i
	}
	close(jobs)
	wg.Wait()
	return out, kept
}

func fleetLine(root, hull string) (result.FleetLine, *result.Result) {
	r, _, err := Compile(filepath.Join(root, filepath.FromSlash(hull)))
	if err != nil {
		b := broken(hull, err)
		return result.FleetLine{Path: hull, Problems: b.Problems, LowestSoC: -1}, nil
	}
	return result.FleetLineOf(hull, r), r
}

// ChangedSince reports which of the hulls (slash paths relative to the
// module root, in a git work tree) have inputs that differ from those at
// revision rev, by the diff's quick hash of their files and imports, or
// did not exist at rev. Nothing is compiled.
func ChangedSince(root, rev string, hulls []string) (map[string]bool, error) {
	src, err := ReadRevision(root, rev)
	if err != nil {
		return nil, err
	}
	bq, hq := newQuickHasher(Side{Rev: src}), newQuickHasher(Side{Dir: root})
	changed := map[string]bool{}
	for _, h := range hulls {
		a, errA := bq.Hash(h)
		b, errB := hq.Hash(h)
		changed[h] = errA != nil || errB != nil || a != b
	}
	return changed, nil
}
