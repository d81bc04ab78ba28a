// Package schema holds ampwright's design language: the CUE schema that a
// hull design is unified with, embedded in the binary, and the Go types a
// validated design decodes into.
//
// The CUE files under cue/ are the contract a yard writes to. Every quantity
// in them is a string with its unit ("4.5 m", "10 AWG"), pinned to its
// dimension and limits by a @q attribute on the field; the Go types use the
// quantity types of package unit, so past decoding every figure is an SI
// number. ImportPath is where a yard vendors the schema so that `cue vet`
// and editors check designs with it too.
package schema

import (
	"embed"
	"io/fs"
	"path"
	"sort"

	"cuelang.org/go/cue"
	"cuelang.org/go/cue/build"
	"cuelang.org/go/cue/parser"
)

// ImportPath is the import path under which a yard vendors the schema
// (cue.mod/pkg/ampwright.dev/schema).
const ImportPath = "ampwright.dev/schema"

// FilePrefix begins the name of every embedded schema file in positions,
// so that errors can tell the schema's positions from the design's.
const FilePrefix = "ampwright-schema/"

//go:embed cue/*.cue
var files embed.FS

// Files returns the schema's CUE files by base name, sorted by name.
func Files() (names []string, contents map[string][]byte) {
	entries, err := fs.ReadDir(files, "cue")
	if err != nil {
		panic(err) // embedded at build time: cannot fail
	}
	contents = make(map[string][]byte)
	for _, e := range entries {
		b, err := files.ReadFile(path.Join("cue", e.Name()))
		if err != nil {
			panic(err)
		}
		names = append(names, e.Name())
		contents[e.Name()] = b
	}
	sort.Strings(names)
	return names, contents
}

// Build compiles the embedded schema package in ctx.
func Build(ctx *cue.Context) (cue.Value, error) {
	names, contents := Files()
	inst := build.NewContext().NewInstance(FilePrefix, nil)
	for _, n := range names {
		f, err := parser.ParseFile(FilePrefix+n, contents[n], parser.ParseComments)
		if err != nil {
			return cue.Value{}, err
		}
		if err := inst.AddSyntax(f); err != nil {
			return cue.Value{}, err
		}
	}
	v := ctx.BuildInstance(inst)
	return v, v.Err()
}

// Definitions names the schema's top-level definitions a loader uses.
var (
	DesignPath  = cue.ParsePath("#Design")
	DefaultPath = cue.ParsePath("#DefaultRules")
)
