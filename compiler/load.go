package compiler

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"os"
	"path"
	"path/filepath"
	"sort"
	"strings"
	"sync"
	"testing/fstest"

	"cuelang.org/go/cue/build"
	"cuelang.org/go/cue/errors"
	"cuelang.org/go/cue/load"
	"cuelang.org/go/cue/token"
	"cuelang.org/go/mod/modfile"
	"cuelang.org/go/mod/module"

	"github.com/ampwright/ampwright/schema"
)

// refusingRegistry is the module registry ampwright gives cue/load: it
// never reaches the network, and says which module a design asked for.
type refusingRegistry struct{}

func (refusingRegistry) refuse(what string) error {
	return fmt.Errorf("the design asks for module %s; ampwright never downloads modules: vendor it under cue.mod/pkg or remove it from cue.mod/module.cue", what)
}

func (r refusingRegistry) ModFile(_ context.Context, mv module.Version) (*modfile.File, error) {
	return nil, r.refuse(mv.String())
}

func (r refusingRegistry) Fetch(_ context.Context, mv module.Version) (module.SourceLoc, error) {
	return module.SourceLoc{}, r.refuse(mv.String())
}

func (r refusingRegistry) ModuleVersions(_ context.Context, mpath string) ([]string, error) {
	return nil, r.refuse(mpath)
}

// moduleRoot returns the directory holding cue.mod above or at dir, or ""
// when dir lies in no CUE module.
func moduleRoot(dir string) string {
	for d := dir; ; {
		if fi, err := os.Stat(filepath.Join(d, "cue.mod")); err == nil && fi.IsDir() {
			return d
		}
		parent := filepath.Dir(d)
		if parent == d {
			return ""
		}
		d = parent
	}
}

// Source is where a design's files come from when not from the host file
// system: a whole module held in memory, as read from a git revision, so
// that an old revision loads without touching the working tree.
type Source struct {
	// Files are the module's files by slash path relative to its root
	// ("cue.mod/module.cue", "hulls/tern/tern.cue").
	Files map[string][]byte
	// Label prefixes file names in messages, such as "a1b2c3d:designs/".
	Label string
}

// FS returns the source's files as a file system.
func (s *Source) FS() fstest.MapFS {
	m := fstest.MapFS{}
	for name, b := range s.Files {
		m[name] = &fstest.MapFile{Data: b, Mode: 0o644}
	}
	return m
}

// virtualBase is where a source's files are laid out for cue/load: a path
// that is not on the host, so every file comes from memory. (cue/load's
// in-memory file systems do not yet resolve cue.mod/pkg imports, so the
// source is given as an overlay.)
const virtualBase = "/.ampwright-revision"

// root is the source's module root in the overlay.
func (s *Source) root() string {
	return virtualBase + "/" + strings.Trim(strings.NewReplacer(":", "/", "\\", "/").Replace(s.Label), "/")
}

// read returns a file of the source by its overlay path.
func (s *Source) read(name string) ([]byte, error) {
	rel := strings.TrimPrefix(filepath.ToSlash(name), s.root()+"/")
	b, ok := s.Files[rel]
	if !ok {
		return nil, fmt.Errorf("%s: not in the revision", name)
	}
	return b, nil
}

// labels maps overlay roots to the labels messages show them by.
var labels sync.Map

// loadSourceInstance loads the package in dir, a slash path relative to
// the source's module root.
func loadSourceInstance(dir string, src *Source) (*build.Instance, []string, error) {
	if err := checkSourceSizes(src, DefaultLimits); err != nil {
		return nil, nil, err
	}
	if err := checkVendoredInSource(src); err != nil {
		return nil, nil, err
	}
	root := src.root()
	labels.Store(root, src.Label)
	overlay := make(map[string]load.Source, len(src.Files))
	for name, b := range src.Files {
		overlay[root+"/"+name] = load.FromBytes(b)
	}
	cfg := &load.Config{Dir: root, Overlay: overlay, Registry: refusingRegistry{}, ParseFile: hullParser(root + "/" + path.Clean(dir))}
	insts := load.Instances([]string{"./" + strings.TrimPrefix(path.Clean(dir), "./")}, cfg)
	return checkInstance(dir, insts, src.read)
}

// loadInstance loads the CUE package in dir. The instance's own files,
// and those of every package it imports, are returned sorted.
func loadInstance(dir string) (*build.Instance, []string, error) {
	abs, err := filepath.Abs(dir)
	if err != nil {
		return nil, nil, err
	}
	fi, err := os.Stat(abs)
	if err != nil {
		return nil, nil, fmt.Errorf("design %s: %w", dir, unwrapPathError(err))
	}
	if !fi.IsDir() {
		return nil, nil, fmt.Errorf("design %s: not a directory; give the directory of a hull's package", dir)
	}
	cfg := &load.Config{Dir: abs, Registry: refusingRegistry{}, ParseFile: hullParser(abs)}
	arg := "."
	sizeRoot := abs
	if root := moduleRoot(abs); root != "" {
		sizeRoot = root
	}
	if err := checkSizes(sizeRoot, DefaultLimits); err != nil {
		return nil, nil, err
	}
	if err := checkVendoredOnDisk(sizeRoot); err != nil {
		return nil, nil, err
	}
	if root := moduleRoot(abs); root != "" {
		rel, err := filepath.Rel(root, abs)
		if err != nil {
			return nil, nil, err
		}
		cfg.Dir = root
		arg = "./" + filepath.ToSlash(rel)
	}
	insts := load.Instances([]string{arg}, cfg)
	inst, files, err := checkInstance(dir, insts, os.ReadFile)
	if err == nil {
		err = checkInside(sizeRoot, files)
	}
	return inst, files, err
}

func checkInstance(dir string, insts []*build.Instance, read func(string) ([]byte, error)) (*build.Instance, []string, error) {
	if len(insts) != 1 {
		return nil, nil, fmt.Errorf("design %s: expected one CUE package, found %d", dir, len(insts))
	}
	inst := insts[0]
	if inst.Err != nil {
		return inst, nil, inst.Err
	}
	if len(inst.BuildFiles) == 0 {
		return inst, nil, fmt.Errorf("design %s: no .cue files", dir)
	}
	return inst, instanceFiles(inst), nil
}

// checkVendoredSchema fails when the module vendors a copy of the schema
// (cue.mod/pkg/ampwright.dev/schema) that is not the one built into this
// ampwright. ampwright's own results do not depend on the copy, which it
// leaves out (see hullParser), but `cue vet` and editors check the yard's
// designs with it, and a stale copy would have them disagree.
//
// files lists the copy's .cue files by base name, nil when there is none;
// read reads one of them.
func checkVendoredSchema(dir string, files []string, read func(string) ([]byte, error)) error {
	if files == nil {
		return nil
	}
	names, want := schema.Vendored()
	shown := displayName(dir)
	stale := func(why string) error {
		return fmt.Errorf("the schema vendored at %s is not the one built into this ampwright (%s); refresh it with: ampwright schema --out %s", shown, why, shown)
	}
	got := map[string]bool{}
	for _, base := range files {
		got[base] = true
		b, err := read(base)
		if err != nil {
			return err
		}
		if w, ok := want[base]; !ok {
			return stale(base + " is not part of it")
		} else if string(b) != string(w) {
			return stale(base + " differs")
		}
	}
	for _, n := range names {
		if !got[n] {
			return stale(n + " is missing")
		}
	}
	return nil
}

// vendoredChecked remembers the answer of checkVendoredSchema by module
// root, so that a fleet reads the copy once.
var vendoredChecked sync.Map

// checkVendoredOnDisk is checkVendoredSchema for a module on disk.
func checkVendoredOnDisk(root string) error {
	if v, ok := vendoredChecked.Load(root); ok {
		err, _ := v.(error)
		return err
	}
	dir := filepath.Join(root, "cue.mod", "pkg", filepath.FromSlash(schema.ImportPath))
	var files []string
	if entries, err := os.ReadDir(dir); err == nil {
		files = []string{}
		for _, e := range entries {
			if !e.IsDir() && strings.HasSuffix(e.Name(), ".cue") {
				files = append(files, e.Name())
			}
		}
	}
	err := checkVendoredSchema(dir, files, func(base string) ([]byte, error) { return os.ReadFile(filepath.Join(dir, base)) })
	vendoredChecked.Store(root, err)
	return err
}

// checkVendoredInSource is checkVendoredSchema for a module in memory.
func checkVendoredInSource(src *Source) error {
	prefix := "cue.mod/pkg/" + schema.ImportPath + "/"
	var files []string
	for name := range src.Files {
		if rest, ok := strings.CutPrefix(name, prefix); ok && !strings.Contains(rest, "/") && strings.HasSuffix(rest, ".cue") {
			files = append(files, rest)
		}
	}
	sort.Strings(files)
	return checkVendoredSchema(src.Label+prefix, files, func(base string) ([]byte, error) { return src.Files[prefix+base], nil })
}

func unwrapPathError(err error) error {
	if pe, ok := err.(*os.PathError); ok {
		return pe.Err
	}
	return err
}

// instanceFiles lists the files of inst and of everything it imports.
func instanceFiles(inst *build.Instance) []string {
	seen := map[string]bool{}
	var walk func(*build.Instance)
	walk = func(i *build.Instance) {
		for _, f := range i.BuildFiles {
			seen[f.Filename] = true
		}
		for _, imp := range i.Imports {
			walk(imp)
		}
	}
	walk(inst)
	out := make([]string, 0, len(seen))
	for f := range seen {
		out = append(out, f)
	}
	sort.Strings(out)
	return out
}

// inputsHash is the SHA-256 of the schema and every input file, each
// preceded by its name relative to root, so that moving a checkout does
// not change it and renaming a file does.
func inputsHash(root string, files []string, read func(string) ([]byte, error)) (string, error) {
	h := sha256.New()
	names, contents := schema.Files()
	for _, n := range names {
		fmt.Fprintf(h, "%s%s\x00%d\x00", schema.FilePrefix, n, len(contents[n]))
		h.Write(contents[n])
	}
	for _, f := range files {
		b, err := read(f)
		if err != nil {
			return "", err
		}
		rel, err := filepath.Rel(root, f)
		if err != nil {
			rel = f
		}
		fmt.Fprintf(h, "%s\x00%d\x00", filepath.ToSlash(rel), len(b))
		h.Write(b)
	}
	return hex.EncodeToString(h.Sum(nil)), nil
}

// loadErrors turns a cue/load error into positioned errors.
func loadErrors(err error) ErrorList {
	var l ErrorList
	for _, e := range errors.Errors(err) {
		pos, rel := designPos(append([]token.Pos{e.Position()}, e.InputPositions()...))
		l = append(l, &Error{Pos: pos, Path: pathString(e.Path()), Msg: errors.StringWithConfig(e, &errors.Config{OmitPath: true}), Related: rel})
	}
	if len(l) == 0 {
		l = append(l, &Error{Msg: err.Error()})
	}
	return l
}
