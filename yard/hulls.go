package yard

import (
	"io/fs"
	"path"
	"regexp"
	"sort"
	"strings"

	"github.com/ampwright/ampwright/compiler"
)

// isHullFile matches a CUE file that declares a vessel at its top level:
// what makes a package a hull rather than a catalog or a rulebook.
var isHullFile = regexp.MustCompile(`(?m)^vessel\s*:`)

// Hulls lists the hull packages under root, as slash paths relative to
// it, sorted. It reads src when given, else the host file system through
// compiler.ModuleFS; cue.mod and hidden directories are skipped. A
// directory with a .cue file that may not be read (a link leading out of
// the yard, a device) is listed too, so that compiling it says why.
func Hulls(root string, src *compiler.Source) ([]string, error) {
	if src != nil {
		return hullsIn(src.FS())
	}
	fsys, err := yardFS(root)
	if err != nil {
		return nil, err
	}
	return hullsIn(fsys)
}

// hullsIn lists the hull packages of a yard's module in fsys.
func hullsIn(fsys fs.FS) ([]string, error) {
	seen := map[string]bool{}
	err := fs.WalkDir(fsys, ".", func(p string, d fs.DirEntry, err error) error {
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
		if err != nil || isHullFile.Match(b) {
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

// yardFS is a yard on disk, read through compiler.ModuleFS with the limit
// on one file: a walk over the whole yard reads more than one design.
func yardFS(root string) (fs.FS, error) {
	return compiler.ModuleFS(root, compiler.Limits{MaxFile: compiler.DefaultLimits.MaxFile})
}
