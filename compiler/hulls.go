package compiler

import (
	"io/fs"
	"os"
	"path"
	"regexp"
	"sort"
	"strings"

	"cuelang.org/go/cue"
)

// isHullFile matches a CUE file that declares a vessel at its top level:
// what makes a package a hull rather than a catalog or a rulebook.
var isHullFile = regexp.MustCompile(`(?m)^vessel\s*:`)

// Hulls lists the hull packages under root, as slash paths relative to
// it, sorted. It reads src when given, else the host file system; cue.mod
// and hidden directories are skipped.
func Hulls(root string, src *Source) ([]string, error) {
	var fsys fs.FS
	if src != nil {
		fsys = src.fs()
		root = "."
	} else {
		fsys = os.DirFS(root)
		root = "."
	}
	seen := map[string]bool{}
	err := fs.WalkDir(fsys, root, func(p string, d fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if d.IsDir() {
			if p != "." && (d.Name() == "cue.mod" || strings.HasPrefix(d.Name(), ".") || d.Name() == "node_modules") {
				return fs.SkipDir
			}
			return nil
		}
		if !strings.HasSuffix(p, ".cue") || seen[path.Dir(p)] {
			return nil
		}
		b, err := fs.ReadFile(fsys, p)
		if err != nil {
			return err
		}
		if isHullFile.Match(b) {
			seen[path.Dir(p)] = true
		}
		return nil
	})
	if err != nil {
		return nil, err
	}
	out := make([]string, 0, len(seen))
	for d := range seen {
		out = append(out, d)
	}
	sort.Strings(out)
	return out, nil
}

// Inputs returns every concrete value of the design, defaults included, by
// CUE path, as CUE prints it: what a reviewer compares between revisions.
func (d *Design) Inputs() map[string]string {
	out := map[string]string{}
	var walk func(v cue.Value)
	walk = func(v cue.Value) {
		if it, err := v.Fields(); err == nil {
			for it.Next() {
				walk(it.Value())
			}
			return
		}
		if elems := elements(v); v.IncompleteKind() == cue.ListKind {
			for _, e := range elems {
				walk(e)
			}
			return
		}
		if !v.IsConcrete() {
			return
		}
		out[v.Path().String()] = valueText(v)
	}
	walk(d.value)
	return out
}
