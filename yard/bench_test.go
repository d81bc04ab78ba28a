package yard

import (
	"os"
	"testing"
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
	}
}
