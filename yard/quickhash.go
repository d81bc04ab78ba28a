package yard

import (
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"io/fs"
	"path"
	"regexp"
	"sort"
	"strconv"
	"strings"
	"sync"
	"testing/fstest"

	"cuelang.org/go/cue/parser"

	"github.com/ampwright/ampwright/schema"
)

// quickHasher finds a hull's inputs, its package's directory and every
// directory it imports from, by reading only the import declarations of
// each directory's files, once per directory: a diff over a large yard
// hashes every hull on both sides, and cue/load would parse every file of
// every hull twice. Two hulls with the same quick hash have the same files
// and so the same result; the hash is not the result's inputsHash.
type quickHasher struct {
	fsys    fs.FS
	modPath string
	modFile []byte
	dirs    map[string]*dirInputs
}

type dirInputs struct {
	files   []string // slash paths of the directory's .cue files, sorted
	imports []string // directories its files import from
	digest  []byte   // SHA-256 of the files' names and contents
	err     error
}

var modulePath = regexp.MustCompile(`(?m)^\s*module:\s*"([^"]+)"`)

func newQuickHasher(s Side) *quickHasher {
	q := &quickHasher{dirs: map[string]*dirInputs{}}
	if s.Rev != nil {
		q.fsys = s.Rev.Source.FS()
	} else {
		fsys, err := yardFS(s.Dir)
		if err != nil {
			fsys = fstest.MapFS{} // every hash fails, and every hull is compiled
		}
		q.fsys = fsys
	}
	if b, err := fs.ReadFile(q.fsys, "cue.mod/module.cue"); err == nil {
		q.modFile = b
		if m := modulePath.FindSubmatch(b); m != nil {
			q.modPath = string(m[1])
			if i := strings.IndexByte(q.modPath, '@'); i >= 0 {
				q.modPath = q.modPath[:i]
			}
		}
	}
	return q
}

// dir reads a directory's .cue files and resolves their imports.
func (q *quickHasher) dir(d string) *dirInputs {
	if di, ok := q.dirs[d]; ok {
		return di
	}
	di := &dirInputs{}
	q.dirs[d] = di
	entries, err := fs.ReadDir(q.fsys, d)
	if err != nil {
		di.err = err
		return di
	}
	seen := map[string]bool{}
	h := sha256.New()
	for _, e := range entries {
		if e.IsDir() || !strings.HasSuffix(e.Name(), ".cue") {
			continue
		}
		p := path.Join(d, e.Name())
		di.files = append(di.files, p)
		b, err := fs.ReadFile(q.fsys, p)
		if err != nil {
			di.err = err
			return di
		}
		fmt.Fprintf(h, "%s\x00%d\x00", p, len(b))
		h.Write(b)
		f, err := parser.ParseFile(p, b, parser.ImportsOnly)
		if err != nil {
			continue // a syntax error: the file's bytes still count
		}
		for spec := range f.ImportSpecs() {
			ip, err := strconv.Unquote(spec.Path.Value)
			if err != nil {
				continue
			}
			if i := strings.IndexByte(ip, ':'); i >= 0 {
				ip = ip[:i]
			}
			if to, ok := q.resolve(ip); ok && !seen[to] {
				seen[to] = true
				di.imports = append(di.imports, to)
			}
		}
	}
	sort.Strings(di.files)
	sort.Strings(di.imports)
	di.digest = h.Sum(nil)
	return di
}

// resolve maps an import path to a directory of the module, or reports
// false for the standard library.
func (q *quickHasher) resolve(ip string) (string, bool) {
	switch {
	case q.modPath != "" && ip == q.modPath:
		return ".", true
	case q.modPath != "" && strings.HasPrefix(ip, q.modPath+"/"):
		return strings.TrimPrefix(ip, q.modPath+"/"), true
	}
	vendored := path.Join("cue.mod/pkg", ip)
	if fi, err := fs.Stat(q.fsys, vendored); err == nil && fi.IsDir() {
		return vendored, true
	}
	return "", false
}

// Hash is the quick hash of the hull in directory hull: of the schema, the
// module file and the digests of the directories its package is made of.
// Each directory's digest is computed once, so the catalog shared by every
// hull is read and hashed once a side.
func (q *quickHasher) Hash(hull string) (string, error) {
	var dirs []string
	visited := map[string]bool{}
	var walk func(d string) error
	walk = func(d string) error {
		if visited[d] {
			return nil
		}
		visited[d] = true
		di := q.dir(d)
		if di.err != nil {
			return di.err
		}
		dirs = append(dirs, d)
		for _, imp := range di.imports {
			if err := walk(imp); err != nil {
				return err
			}
		}
		return nil
	}
	if err := walk(path.Clean(hull)); err != nil {
		return "", fmt.Errorf("%s: %v", hull, err)
	}
	sort.Strings(dirs)
	h := sha256.New()
	h.Write(schemaDigest())
	fmt.Fprintf(h, "cue.mod/module.cue\x00%d\x00", len(q.modFile))
	h.Write(q.modFile)
	for _, d := range dirs {
		fmt.Fprintf(h, "%s\x00", d)
		h.Write(q.dirs[d].digest)
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}

// schemaDigest is the SHA-256 of the embedded schema's files.
var schemaDigest = sync.OnceValue(func() []byte {
	h := sha256.New()
	names, contents := schema.Files()
	for _, n := range names {
		fmt.Fprintf(h, "%s%s\x00%d\x00", schema.FilePrefix, n, len(contents[n]))
		h.Write(contents[n])
	}
	return h.Sum(nil)
})
