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

// Fleet compiles the hulls (slash paths relative to root) concurrently,
// as many at once as there are cores, and returns one line per hull in the
// order given. A hull that does not compile gets a line with its errors
// and does not stop the others. progress, if not nil, is called after each
// hull with the number done.
func Fleet(root string, hulls []string, progress func(done, total int)) []result.FleetLine {
	out := make([]result.FleetLine, len(hulls))
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
				out[i] = fleetLine(root, hulls[i])
				if progress != nil {
					mu.Lock()
					done++
					progress(done, len(hulls))
					mu.Unlock()
				}
			}
		}()
	}
	for i := range hulls {
		jobs <- i
	}
	close(jobs)
	wg.Wait()
	return out
}

func fleetLine(root, hull string) result.FleetLine {
	r, _, err := Compile(filepath.Join(root, filepath.FromSlash(hull)))
	if err != nil {
		b := broken(hull, err)
		return result.FleetLine{Path: hull, Problems: b.Problems, LowestSoC: -1}
	}
	return result.FleetLineOf(hull, r)
}
