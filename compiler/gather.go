package compiler

import (
	"errors"
	"fmt"
	"io/fs"
	"path"
	"sort"
	"strconv"
	"strings"
	"sync"
	"unicode/utf8"

	"cuelang.org/go/cue/parser"
	"cuelang.org/go/mod/modfile"

	"github.com/ampwright/ampwright/schema"
)

// gather reads the files the package in dir is made of, from fsys, the
// module's root (shown in messages as label): the module file, the vendored copy of the schema, the
// .cue files of the package's directory and of its parents up to the
// module root (CUE adds a parent's files of the same package), and the
// same for every package it imports from the module or from cue.mod, found
// by reading each file's import declarations. cue/load is then given these
// files and nothing else. An import that leads nowhere is left for cue/load
// to report, with its position.
//
// Files that are not UTF-8 text are listed apart: cue/load would quietly
// turn their bytes into U+FFFD, and each is an input error at its first
// bad byte.
func gather(fsys fs.FS, dir, label string) (files map[string][]byte, notUTF8 []string, err error) {
	g, err := gatherAll(fsys, dir, label)
	if err != nil {
		return nil, nil, err
	}
	return g.files, g.notUTF8, nil
}

// gatherAll is gather, giving the gatherer: its files and the directories
// it read them from.
func gatherAll(fsys fs.FS, dir, label string) (*gatherer, error) {
	g := &gatherer{fsys: fsys, files: map[string][]byte{}, dirs: map[string]bool{}, pkgs: map[string]bool{}}
	mod, err := g.optional(modFile)
	if err != nil {
		return nil, err
	}
	if mod != nil {
		g.modPath = modulePath(mod)
		// cue/load would read the replacements' directories, which may lie
		// anywhere on the host.
		if _, err := fs.Stat(fsys, localModFile); err == nil || !errors.Is(err, fs.ErrNotExist) {
			return nil, fmt.Errorf("%s%s: module replacements are not supported; ampwright reads nothing outside the design's module", label, localModFile)
		}
	}
	if err := g.dirFiles(vendoredDir); err != nil {
		return nil, err
	}
	queue := []string{dir}
	for len(queue) > 0 {
		d := queue[0]
		queue = queue[1:]
		imports, err := g.pkg(d)
		if err != nil {
			return nil, err
		}
		queue = append(queue, imports...)
	}
	sort.Strings(g.notUTF8)
	return g, nil
}

// modulePaths remembers the module path of each module file read: parsing
// one evaluates CUE, and a fleet gathers every hull of the same module.
var modulePaths sync.Map // module file's contents → its path

// modulePath is the path a module file declares, without a major
// version, or "" when it does not parse.
func modulePath(mod []byte) string {
	if p, ok := modulePaths.Load(string(mod)); ok {
		return p.(string)
	}
	var p string
	if mf, err := modfile.ParseNonStrict(mod, modFile); err == nil {
		p = mf.QualifiedModule()
		if i := strings.IndexByte(p, '@'); i >= 0 {
			p = p[:i]
		}
	}
	modulePaths.Store(string(mod), p)
	return p
}

const (
	modFile      = "cue.mod/module.cue"
	localModFile = "cue.mod/local-module.cue"
)

// cueLister is a file system that lists a directory's .cue entries alone
// (guardFS).
type cueLister interface {
	cueEntries(dir string) ([]fs.DirEntry, error)
}

// importMemo is a file system that remembers the imports of the files it
// keeps (memoFS): the catalog's, read for every hull of a fleet.
type importMemo interface {
	imports(name string, find func() []string) []string
}

// vendoredDir is where a yard vendors the schema.
var vendoredDir = "cue.mod/pkg/" + schema.ImportPath

type gatherer struct {
	fsys    fs.FS
	modPath string // the module's path, without a major version
	files   map[string][]byte
	dirs    map[string]bool // directories whose files are read
	pkgs    map[string]bool // package directories whose imports are followed
	notUTF8 []string        // files that are not UTF-8 text
}

// dirList lists the directories the gatherer read, with cue.mod, which
// holds the module file, sorted.
func (g *gatherer) dirList() []string {
	out := []string{"cue.mod"}
	for d := range g.dirs {
		if d != "cue.mod" {
			out = append(out, d)
		}
	}
	sort.Strings(out)
	return out
}

// optional reads a file that may be missing.
func (g *gatherer) optional(name string) ([]byte, error) {
	b, err := fs.ReadFile(g.fsys, name)
	if errors.Is(err, fs.ErrNotExist) {
		return nil, nil
	}
	if err != nil {
		return nil, err
	}
	if !utf8.Valid(b) {
		g.notUTF8 = append(g.notUTF8, name)
	}
	g.files[name] = b
	return b, nil
}

// pkg reads the files of the package in directory d, and of its parents,
// and returns the directories of the packages they import.
func (g *gatherer) pkg(d string) ([]string, error) {
	if g.pkgs[d] {
		return nil, nil
	}
	g.pkgs[d] = true
	stop := "."
	for _, base := range []string{"cue.mod/gen", "cue.mod/pkg", "cue.mod/usr"} {
		if d == base || strings.HasPrefix(d, base+"/") {
			stop = base
		}
	}
	chain := map[string]bool{}
	for p := d; ; p = path.Dir(p) {
		if err := g.dirFiles(p); err != nil {
			return nil, err
		}
		chain[p] = true
		if p == stop || p == "." {
			break
		}
	}
	var imports []string
	memo, _ := g.fsys.(importMemo)
	for name, b := range g.files {
		if !chain[path.Dir(name)] {
			continue
		}
		if memo != nil {
			imports = append(imports, memo.imports(name, func() []string { return g.importDirs(name, b) })...)
		} else {
			imports = append(imports, g.importDirs(name, b)...)
		}
	}
	sort.Strings(imports)
	return imports, nil
}

// dirFiles reads the .cue files of directory d that cue/load would read:
// not those whose names start with "." or "_". A directory that does not
// exist has none; cue/load says so where that matters.
func (g *gatherer) dirFiles(d string) error {
	if g.dirs[d] {
		return nil
	}
	g.dirs[d] = true
	var entries []fs.DirEntry
	var err error
	if l, ok := g.fsys.(cueLister); ok {
		entries, err = l.cueEntries(d)
	} else {
		entries, err = fs.ReadDir(g.fsys, d)
	}
	if errors.Is(err, fs.ErrNotExist) {
		return nil
	}
	if err != nil {
		return err
	}
	for _, e := range entries {
		name := e.Name()
		if e.IsDir() || !strings.HasSuffix(name, ".cue") || strings.HasPrefix(name, ".") || strings.HasPrefix(name, "_") {
			continue
		}
		p := path.Join(d, name)
		b, err := fs.ReadFile(g.fsys, p)
		if err != nil {
			return err
		}
		if !utf8.Valid(b) {
			g.notUTF8 = append(g.notUTF8, p)
		}
		g.files[p] = b
	}
	return nil
}

// importDirs are the directories of the module that a file imports from:
// a package of the module itself, or one under cue.mod/gen, pkg or usr.
func (g *gatherer) importDirs(name string, src []byte) []string {
	f, err := parser.ParseFile(name, src, parser.ImportsOnly)
	if err != nil {
		return nil // cue/load reports the syntax error
	}
	var out []string
	for spec := range f.ImportSpecs() {
		ip, err := strconv.Unquote(spec.Path.Value)
		if err != nil {
			continue
		}
		if i := strings.IndexByte(ip, ':'); i >= 0 {
			ip = ip[:i]
		}
		if i := strings.IndexByte(ip, '@'); i >= 0 {
			ip = ip[:i]
		}
		// The standard library's paths have no dot in their first element.
		if first, _, _ := strings.Cut(ip, "/"); !strings.Contains(first, ".") || !fs.ValidPath(ip) {
			continue
		}
		switch {
		case g.modPath != "" && ip == g.modPath:
			out = append(out, ".")
			continue
		case g.modPath != "" && strings.HasPrefix(ip, g.modPath+"/"):
			out = append(out, strings.TrimPrefix(ip, g.modPath+"/"))
			continue
		}
		for _, base := range []string{"cue.mod/gen", "cue.mod/pkg", "cue.mod/usr"} {
			out = append(out, path.Join(base, ip))
		}
	}
	return out
}
