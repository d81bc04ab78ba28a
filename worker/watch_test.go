package worker

import (
	"runtime"
	"testing"
	"time"
)

func TestParseSize(t *testing.T) {
	for in, want := range map[string]int64{"512MiB": 512 << 20, "2GiB": 2 << 30, "300M": 300 << 20, "64KiB": 64 << 10, "1000000": 1000000, "1GB": 1e9} {
		got, err := ParseSize(in)
		if err != nil || got != want {
			t.Errorf("ParseSize(%q) = %d, %v; want %d", in, got, err, want)
		}
	}
	for _, in := range []string{"", "0", "-1MiB", "1.5GiB", "lots", "MiB", "99999999999GiB"} {
		if n, err := ParseSize(in); err == nil {
			t.Errorf("ParseSize(%q) = %d, want an error", in, n)
		}
	}
	for _, n := range []int64{512 << 20, 2 << 30, 1000, 64 << 10} {
		if back, err := ParseSize(Size(n)); err != nil || back != n {
			t.Errorf("Size(%d) = %q reads back as %d, %v", n, Size(n), back, err)
		}
	}
}

func TestWatchTime(t *testing.T) {
	hit := make(chan Bound, 1)
	stop := Watch(50*time.Millisecond, 0, func(b Bound) { hit <- b })
	defer stop()
	select {
	case b := <-hit:
		if b != TimeBound {
			t.Errorf("hit %v, want the time bound", b)
		}
	case <-time.After(5 * time.Second):
		t.Fatal("the time bound was not hit")
	}
}

func TestWatchMemory(t *testing.T) {
	var ms runtime.MemStats
	runtime.ReadMemStats(&ms)
	limit := int64(ms.HeapAlloc) + 64<<20
	hit := make(chan Bound, 1)
	stop := Watch(0, limit, func(b Bound) { hit <- b })
	defer stop()
	var keep [][]byte
	for i := 0; i < 40; i++ {
		keep = append(keep, make([]byte, 4<<20))
		for j := range keep[i] {
			keep[i][j] = byte(j)
		}
	}
	select {
	case b := <-hit:
		if b != MemoryBound {
			t.Errorf("hit %v, want the memory bound", b)
		}
	case <-time.After(5 * time.Second):
		t.Fatalf("holding %d MiB over a bound %d MiB above the heap, the memory bound was not hit", len(keep)*4, 64)
	}
	runtime.KeepAlive(keep)
}

func TestWatchStop(t *testing.T) {
	hit := make(chan Bound, 1)
	stop := Watch(50*time.Millisecond, 1<<40, func(b Bound) { hit <- b })
	stop()
	stop()
	select {
	case b := <-hit:
		t.Errorf("hit %v after stop", b)
	case <-time.After(200 * time.Millisecond):
	}
}
