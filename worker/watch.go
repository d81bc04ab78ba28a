package worker

import (
	"fmt"
	"runtime/debug"
	"runtime/metrics"
	"sync"
	"time"
)

// A Bound is the bound a process passed.
type Bound int

const (
	TimeBound Bound = iota + 1
	MemoryBound
)

// heapMetric is the heap's live and not yet swept objects, bytes: what
// the evaluation holds, sampled cheaply while it runs.
const heapMetric = "/memory/classes/heap/objects:bytes"

// sampleEvery is how often Watch reads the heap. An evaluation that
// allocates as fast as it can passes the bound by what it allocates in
// this time, tens of megabytes at most.
const sampleEvery = 20 * time.Millisecond

// Watch calls hit, once, when timeout has passed (if it is positive) or
// when the heap holds more than maxMemory bytes (if it is positive), until
// stop is called. It also sets the runtime's soft memory limit to
// maxMemory, so that the collector works harder before the bound is
// reached, and restores it at stop. hit is expected to end the process:
// CUE evaluation cannot be stopped otherwise.
func Watch(timeout time.Duration, maxMemory int64, hit func(Bound)) (stop func()) {
	var once sync.Once
	fire := func(b Bound) { once.Do(func() { hit(b) }) }
	done := make(chan struct{})
	var timer *time.Timer
	if timeout > 0 {
		timer = time.AfterFunc(timeout, func() { fire(TimeBound) })
	}
	old := int64(-1)
	if maxMemory > 0 {
		old = debug.SetMemoryLimit(maxMemory)
		go func() {
			sample := []metrics.Sample{{Name: heapMetric}}
			tick := time.NewTicker(sampleEvery)
			defer tick.Stop()
			for {
				select {
				case <-done:
					return
				case <-tick.C:
					metrics.Read(sample)
					if sample[0].Value.Kind() == metrics.KindUint64 && sample[0].Value.Uint64() > uint64(maxMemory) {
						fire(MemoryBound)
						return
					}
				}
			}
		}()
	}
	var stopOnce sync.Once
	return func() {
		stopOnce.Do(func() {
			close(done)
			if timer != nil {
				timer.Stop()
			}
			if old >= 0 {
				debug.SetMemoryLimit(old)
			}
		})
	}
}

// Message says which bound stopped the work, in words a designer can act
// on.
func Message(b Bound, timeout time.Duration, maxMemory int64) string {
	switch b {
	case TimeBound:
		return fmt.Sprintf("stopped: it took longer than the --timeout bound of %s; a comprehension that expands without bound? (raise --timeout if the design is merely large)", timeout)
	case MemoryBound:
		return fmt.Sprintf("stopped: it needed more memory than the --max-memory bound of %s; a comprehension that builds without bound? (raise --max-memory if the design is merely large)", Size(maxMemory))
	}
	return "stopped"
}

// Size writes a number of bytes as --max-memory takes it: 512MiB, 2GiB.
func Size(n int64) string {
	switch {
	case n >= 1<<30 && n%(1<<30) == 0:
		return fmt.Sprintf("%dGiB", n>>30)
	case n >= 1<<20 && n%(1<<20) == 0:
		return fmt.Sprintf("%dMiB", n>>20)
	case n >= 1<<10 && n%(1<<10) == 0:
		return fmt.Sprintf("%dKiB", n>>10)
	}
	return fmt.Sprintf("%dB", n)
}

// ParseSize reads a size such as 512MiB, 2GiB, 300M or 1000000 (bytes).
func ParseSize(s string) (int64, error) {
	units := []struct {
		suffix string
		mult   int64
	}{{"KiB", 1 << 10}, {"MiB", 1 << 20}, {"GiB", 1 << 30}, {"KB", 1000}, {"MB", 1000 * 1000}, {"GB", 1000 * 1000 * 1000}, {"K", 1 << 10}, {"M", 1 << 20}, {"G", 1 << 30}, {"B", 1}}
	mult := int64(1)
	num := s
	for _, u := range units {
		if len(s) > len(u.suffix) && s[len(s)-len(u.suffix):] == u.suffix {
			num, mult = s[:len(s)-len(u.suffix)], u.mult
			break
		}
	}
	var n int64
	if _, err := fmt.Sscanf(num, "%d", &n); err != nil || n <= 0 || fmt.Sprint(n) != num || n > (1<<62)/mult {
		return 0, fmt.Errorf("%q: expected a size such as 512MiB or 2GiB", s)
	}
	return n * mult, nil
}
