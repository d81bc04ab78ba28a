package compiler

import (
	"testing"

	"cuelang.org/go/cue"
	"cuelang.org/go/cue/build"
	"cuelang.org/go/cue/cuecontext"
	"cuelang.org/go/cue/load"

	"github.com/ampwright/ampwright/schema"
)

// The benchmarks run on the example yard. Profile one with
//
//	go test ./compiler -run xxx -bench CompileMarram -cpuprofile /tmp/cpu.out
//	go tool pprof -top -nodecount=40 compiler.test /tmp/cpu.out
//
// docs/performance.md records what they measured and where the time goes.

// BenchmarkLoadDunnock measures Load (load, unify, validate, decode,
// rules) of the smallest example hull.
func BenchmarkLoadDunnock(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		if _, err := Load("../designs/hulls/dunnock"); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkCompileMarram measures Compile (Load, then the network and
// every check, the voyage simulation included) of the largest example
// hull.
func BenchmarkCompileMarram(b *testing.B) {
	b.ReportAllocs()
	for b.Loop() {
		if _, _, err := Compile("../designs/hulls/marram"); err != nil {
			b.Fatal(err)
		}
	}
}

// BenchmarkPhases measures the pipeline of Load step by step, each
// sub-benchmark doing one step more than the one before, with CUE's public
// API only, so that the difference of two is the cost of a step:
//
//	1-cue-load  cue/load reads the hull's package and its imports
//	2-build     and builds it: the hull with the vendored #Design embedded
//	3-schema    and compiles the embedded schema (Load does, per hull)
//	4-unify     and unifies the hull with the embedded #Design, validated
//	5-decode    and decodes the result into schema.Design
//
// Load itself adds the validation walk, positions and rules; Compile the
// checks. separate-3 runs steps 1 to 5 on the three example hulls, each
// in its own context as Load does; shared-3 does the same work with one
// cue/load call and one context, sharing the catalog, rulebook and schema
// as `cue vet ./...` does. Their ns/hull differ by what sharing saves.
func BenchmarkPhases(b *testing.B) {
	const root = "../designs"
	hulls := []string{"./hulls/marram", "./hulls/dunnock", "./hulls/brackenwell"}
	instances := func(b *testing.B, args ...string) []*build.Instance {
		insts := load.Instances(args, &load.Config{Dir: root})
		for _, inst := range insts {
			if inst.Err != nil {
				b.Fatal(inst.Err)
			}
		}
		return insts
	}
	// through runs the steps up to n on the first hull.
	through := func(b *testing.B, n int) {
		inst := instances(b, hulls[0])[0]
		if n < 2 {
			return
		}
		ctx := cuecontext.New()
		data := ctx.BuildInstance(inst)
		if err := data.Err(); err != nil {
			b.Fatal(err)
		}
		if n < 3 {
			return
		}
		sch, err := schema.Build(ctx)
		if err != nil {
			b.Fatal(err)
		}
		if n < 4 {
			return
		}
		unified := data.Unify(sch.LookupPath(schema.DesignPath))
		if err := unified.Validate(cue.Concrete(true)); err != nil {
			b.Fatal(err)
		}
		if n < 5 {
			return
		}
		var d schema.Design
		if err := unified.Decode(&d); err != nil {
			b.Fatal(err)
		}
	}
	for n, name := range []string{"1-cue-load", "2-build", "3-schema", "4-unify", "5-decode"} {
		b.Run(name, func(b *testing.B) {
			b.ReportAllocs()
			for b.Loop() {
				through(b, n+1)
			}
		})
	}
	b.Run("6-load", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, err := Load(root + "/" + hulls[0]); err != nil {
				b.Fatal(err)
			}
		}
	})
	b.Run("7-compile", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			if _, _, err := Compile(root + "/" + hulls[0]); err != nil {
				b.Fatal(err)
			}
		}
	})
	// unifyDecode is steps 4 and 5 on a built hull.
	unifyDecode := func(b *testing.B, data, design cue.Value) {
		unified := data.Unify(design)
		if err := unified.Validate(cue.Concrete(true)); err != nil {
			b.Fatal(err)
		}
		var d schema.Design
		if err := unified.Decode(&d); err != nil {
			b.Fatal(err)
		}
	}
	perHull := func(b *testing.B) {
		b.ReportMetric(float64(b.Elapsed().Nanoseconds())/float64(b.N)/float64(len(hulls)), "ns/hull")
	}
	b.Run("separate-3", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			for _, h := range hulls {
				ctx := cuecontext.New()
				sch, err := schema.Build(ctx)
				if err != nil {
					b.Fatal(err)
				}
				unifyDecode(b, ctx.BuildInstance(instances(b, h)[0]), sch.LookupPath(schema.DesignPath))
			}
		}
		perHull(b)
	})
	b.Run("shared-3", func(b *testing.B) {
		b.ReportAllocs()
		for b.Loop() {
			ctx := cuecontext.New()
			sch, err := schema.Build(ctx)
			if err != nil {
				b.Fatal(err)
			}
			values, err := ctx.BuildInstances(instances(b, hulls...))
			if err != nil {
				b.Fatal(err)
			}
			for _, data := range values {
				unifyDecode(b, data, sch.LookupPath(schema.DesignPath))
			}
		}
		perHull(b)
	})
}

// BenchmarkCompileReleased measures Compile of the example hulls one
// after another, each released when done, as a fleet's worker compiles
// them: the contexts (and the schema built in each) are reused.
func BenchmarkCompileReleased(b *testing.B) {
	hulls := []string{"marram", "dunnock", "brackenwell", "tystie", "sanderling"}
	b.ReportAllocs()
	i := 0
	for b.Loop() {
		_, d, err := Compile("../designs/hulls/" + hulls[i%len(hulls)])
		if err != nil {
			b.Fatal(err)
		}
		d.Release()
		i++
	}
}
