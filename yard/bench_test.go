package yard

import (
	"os"
	"testing"

	"github.com/ampwright/ampwright/cache"
	"github.com/ampwright/ampwright/result"
)

// BenchmarkDiffYard measures DiffYard between a git revision and the work
// tree of the yard named by $AMPWRIGHT_BENCH_YARD (skipped without it), as
// `ampwright diff --base HEAD YARD` runs it. .ci/bench keeps such a yard
// with BENCH_KEEP=1:
//
//	AMPWRIGHT_BENCH_YARD=/tmp/ampwright-bench.XXXX/yard \
//		go test ./yard -run xxx -bench DiffYard -cpuprofile /tmp/diff.out
func BenchmarkDiffYard(b *testing.B) {
	yard := os.Getenv("AMPWRIGHT_BENCH_YARD")
	if yard == "" {
		b.Skip("set AMPWRIGHT_BENCH_YARD to a yard in a git work tree")
	}
	for b.Loop() {
		rev, err := ReadRevision(yard, "HEAD")
		if err != nil {
			b.Fatal(err)
		}
		if _, err := DiffYard(Side{Name: "HEAD", Rev: rev}, Side{Name: "work tree", Dir: yard}, Options{}); err != nil {
			b.Fatal(err)
		}
		rev.Close()
	}
}

// BenchmarkFleetWarm measures a fleet of the yard named by
// $AMPWRIGHT_BENCH_YARD whose every hull is in the result cache: the cost
// of a hit (gathering and hashing a hull's files, reading its entry,
// asking git's facts), with nothing compiled.
func BenchmarkFleetWarm(b *testing.B) {
	yard := os.Getenv("AMPWRIGHT_BENCH_YARD")
	if yard == "" {
		b.Skip("set AMPWRIGHT_BENCH_YARD to a yard in a git work tree")
	}
	hulls, err := Hulls(yard, nil)
	if err != nil {
		b.Fatal(err)
	}
	ch := cache.Open(b.TempDir(), "bench", func(err error) { b.Fatal(err) })
	opts := Options{Cache: ch}
	Fleet(yard, hulls, opts) // fills the cache
	b.ResetTimer()
	for b.Loop() {
		hulls, err := Hulls(yard, nil)
		if err != nil {
			b.Fatal(err)
		}
		for _, l := range mustFleet(b, yard, hulls, opts) {
			if l.Broken() && len(l.Problems) > 0 && l.Problems[0].Message == "" {
				b.Fatal("broken")
			}
		}
	}
}

func mustFleet(b *testing.B, yard string, hulls []string, opts Options) []result.FleetLine {
	lines, _ := Fleet(yard, hulls, opts)
	return lines
}

// BenchmarkDiffCompare measures what a diff does before it compiles
// anything, between the yard of $AMPWRIGHT_BENCH_YARD at HEAD and its work
// tree: reading the revision's tree, listing both sides' hulls, and
// finding the hulls whose inputs changed.
func BenchmarkDiffCompare(b *testing.B) {
	yard := os.Getenv("AMPWRIGHT_BENCH_YARD")
	if yard == "" {
		b.Skip("set AMPWRIGHT_BENCH_YARD to a yard in a git work tree")
	}
	for b.Loop() {
		rev, err := ReadRevision(yard, "HEAD")
		if err != nil {
			b.Fatal(err)
		}
		cmp := newComparison(Side{Rev: rev}, Side{Dir: yard})
		head, err := Hulls(yard, nil)
		if err != nil {
			b.Fatal(err)
		}
		changed := 0
		for range cmp.baseHulls(head) {
		}
		for _, h := range head {
			if !cmp.unchanged(h) {
				changed++
			}
		}
		if changed == 0 {
			b.Fatal("change a hull of the yard first")
		}
		cmp.close()
		rev.Close()
	}
}

// BenchmarkCheck measures check of one example hull as `ampwright check`
// does it (yard.Check, git's facts included): found in the result cache,
// and compiled with the cache off.
func BenchmarkCheck(b *testing.B) {
	const dir = "../designs/hulls/tystie"
	b.Run("cached", func(b *testing.B) {
		ch := cache.Open(b.TempDir(), "bench", func(err error) { b.Fatal(err) })
		if c := Check(dir, ch); !c.OK() {
			b.Fatal(c.Problems)
		}
		for b.Loop() {
			if c := Check(dir, ch); !c.OK() {
				b.Fatal(c.Problems)
			}
		}
	})
	b.Run("off", func(b *testing.B) {
		for b.Loop() {
			if c := Check(dir, nil); !c.OK() {
				b.Fatal(c.Problems)
			}
		}
	})
}
