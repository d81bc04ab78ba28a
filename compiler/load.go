package compiler

import (
	"context"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"io/fs"
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

// Source is a module's files held in memory: a whole module as read from
// a git revision, or the files one design is made of, as ampwright read
// them through the guard (guardFS). cue/load is given them as an overlay
// under a path that is not on the host, so it reads nothing itself.
type Source struct {
	// Files are the module's files by slash path relative to its root
	// ("cue.mod/module.cue", "hulls/tern/tern.cue").
	Files map[string][]byte
	// Bad are paths of the module that may not be read, with the reason:
	// a symbolic link that leads outside it, a file over the size limit.
	Bad map[string]string
	// Label prefixes file names in messages, such as "a1b2c3d:designs/".
	Label string
	// gathered, when set, are the files of one design already gathered
	// (Gathered.Compile): they are loaded as they are.
	gathered *Gathered
}

// FS returns the source's files as a file system. Opening a bad path
// fails with its reason, and so does a file over the size limit.
func (s *Source) FS() fs.FS {
	m := fstest.MapFS{}
	for name, b := range s.Files {
		m[name] = &fstest.MapFile{Data: b, Mode: 0o644}
	}
	for name := range s.Bad {
		m[name] = &fstest.MapFile{Mode: 0o644}
	}
	return &sourceFS{MapFS: m, src: s}
}

// sourceFS is a Source as a file system, refusing its bad paths.
type sourceFS struct {
	fstest.MapFS
	src *Source
}

func (f *sourceFS) Open(name string) (fs.File, error) {
	if why, ok := f.src.Bad[name]; ok {
		return nil, &refusal{path: f.src.Label + name, why: why}
	}
	if b, ok := f.src.Files[name]; ok && int64(len(b)) > DefaultLimits.MaxFile {
		return nil, &refusal{path: f.src.Label + name, why: fmt.Sprintf("is %d bytes, more than the %d-byte limit for one file", len(b), DefaultLimits.MaxFile)}
	}
	return f.MapFS.Open(name)
}

func (f *sourceFS) ReadFile(name string) ([]byte, error) { return fs.ReadFile(onlyFS{f}, name) }

// onlyFS hides every method but Open, so that fs.ReadFile goes through it.
type onlyFS struct{ fs.FS }

// virtualBase is where a source's files are laid out for cue/load: a path
// that is not on the host, so every file comes from memory. (cue/load's
// io/fs mode, Config.FS, does not resolve packages under cue.mod/pkg in
// v0.17.1, so the source is given as an overlay.)
const virtualBase = "/.ampwright-source"

// root is the source's module root in the overlay: one directory per
// label, so that messages can name each file by its label.
func (s *Source) root() string {
	sum := sha256.Sum256([]byte(s.Label))
	return virtualBase + "/" + hex.EncodeToString(sum[:8])
}

// read returns a file of the source by its overlay path.
func (s *Source) read(name string) ([]byte, error) {
	rel := strings.TrimPrefix(filepath.ToSlash(name), s.root()+"/")
	b, ok := s.Files[rel]
	if !ok {
		return nil, fmt.Errorf("%s%s is not among the design's files", s.Label, rel)
	}
	return b, nil
}

// labels maps overlay roots to the labels messages show them by.
var labels sync.Map

// loadSource loads the package in dir, a slash path relative to the
// module root, from the files of src that it is made of. The files are
// gathered first (gather), so cue/load's overlay holds nothing else, and
// the vendored copy of the schema is checked current before any of it is
// parsed. A source made by Gathered.Compile holds files already gathered.
func loadSource(dir string, src *Source) (loaded, error) {
	if src.gathered != nil {
		return src.gathered.load()
	}
	dir = path.Clean(filepath.ToSlash(dir))
	if err := checkVirtualBase(); err != nil {
		return loaded{}, err
	}
	files, notUTF8, err := gather(src.FS(), dir, src.Label)
	if err != nil {
		return loaded{}, err
	}
	return loadFiles(dir, files, notUTF8, src.Label)
}

// checkVirtualBase refuses to load while the overlay's base exists on the
// host: cue/load looks on the host for what the overlay lacks, and under a
// path that does not exist it finds nothing.
func checkVirtualBase() error {
	if _, err := os.Lstat(virtualBase); !errors.Is(err, fs.ErrNotExist) {
		return fmt.Errorf("%s exists on this machine; ampwright lays designs out there in memory and will not load one while it exists", virtualBase)
	}
	return nil
}

// loadFiles loads the package in dir from the files gather found for it.
func loadFiles(dir string, files map[string][]byte, notUTF8 []string, label string) (loaded, error) {
	sub := &Source{Files: files, Label: label}
	if err := checkVendoredInSource(sub); err != nil {
		return loaded{}, err
	}
	root := sub.root()
	labels.Store(root, sub.Label)
	if len(notUTF8) > 0 {
		var errs errors.Error
		for _, name := range notUTF8 {
			errs = errors.Append(errs, invalidUTF8(root+"/"+name, files[name]))
		}
		return loaded{src: sub, root: root}, errs
	}
	overlay := make(map[string]load.Source, len(files))
	for name, b := range files {
		overlay[root+"/"+name] = load.FromBytes(b)
	}
	refused := &refusals{}
	cfg := &load.Config{Dir: root, Overlay: overlay, Registry: refusingRegistry{}, ParseFile: hullParser(root, root+"/"+dir, refused)}
	insts := load.Instances([]string{"./" + strings.TrimPrefix(dir, "./")}, cfg)
	if err := refused.err(); err != nil {
		return loaded{src: sub, root: root}, err
	}
	inst, list, err := checkInstance(dir, insts)
	return loaded{inst: inst, files: list, src: sub, root: root}, err
}

// loadDisk loads the CUE package in dir on disk: the files of its module
// that it is made of are read through the guard into memory, and loaded
// from there.
func loadDisk(dir string) (loaded, error) {
	g, err := gatherDisk(dir, nil)
	if err != nil {
		return loaded{}, err
	}
	return g.load()
}

func checkInstance(dir string, insts []*build.Instance) (*build.Instance, []string, error) {
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
	return checkVendoredSchema(src.Label+vendoredDir, files, func(base string) ([]byte, error) { return src.Files[prefix+base], nil })
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
		l = append(l, &Error{Pos: pos, Path: pathString(e.Path()), Msg: unvirtual(errors.StringWithConfig(e, &errors.Config{OmitPath: true})), Related: rel})
	}
	if len(l) == 0 {
		l = append(l, &Error{Msg: unvirtual(err.Error())})
	}
	return l
}

// unvirtual writes the overlay's paths in a message as messages show
// files, by their labels: cue/load names directories in some messages.
func unvirtual(msg string) string {
	if !strings.Contains(msg, virtualBase) {
		return msg
	}
	labels.Range(func(k, v any) bool {
		msg = strings.ReplaceAll(msg, k.(string)+"/", v.(string))
		msg = strings.ReplaceAll(msg, k.(string), strings.TrimSuffix(v.(string), "/"))
		return true
	})
	return msg
}
