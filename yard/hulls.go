package yard

import (
	"io/fs"
	"os"
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
// it, sorted. It reads src when given, else the host file system; cue.mod
// and hidden directories are skipped.
func Hulls(root string, src *compiler.Source) ([]string, error) {
	var fsys fs.FS
	if src != nil {
		fsys = src.FS()
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
