package main

import (
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"testing"

	"github.com/ampwright/ampwright/schema"
)

// TestVendoredSchemaCurrent checks that every copy of the schema vendored
// in the repository (the example yard's, the test yards') is what
// `ampwright schema --out` writes now. A stale copy would be unified with
// the embedded schema and give false errors. Refresh one with
//
//	go run ./cmd/ampwright schema --out DIR
func TestVendoredSchemaCurrent(t *testing.T) {
	var dirs []string
	suffix := filepath.FromSlash("cue.mod/pkg/" + schema.ImportPath)
	err := filepath.WalkDir("../..", func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() && strings.HasSuffix(p, suffix) {
			dirs = append(dirs, p)
			return fs.SkipDir
		}
		if d.IsDir() && (d.Name() == ".git" || d.Name() == "node_modules") {
			return fs.SkipDir
		}
		return nil
	})
	if err != nil {
		t.Fatal(err)
	}
	if len(dirs) == 0 {
		t.Fatal("found no vendored schema; the example yard must have one")
	}
	names, contents := schema.Vendored()
	for _, dir := range dirs {
		for _, n := range names {
			got, err := os.ReadFile(filepath.Join(dir, n))
			if err != nil {
				t.Errorf("%s: %v", dir, err)
				continue
			}
			if string(got) != string(contents[n]) {
				t.Errorf("%s/%s is stale; run: go run ./cmd/ampwright schema --out %s", dir, n, strings.TrimPrefix(dir, "../../"))
			}
		}
	}
}
