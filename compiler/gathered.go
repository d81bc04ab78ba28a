package compiler

import (
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

	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// Gathered are the files one design is made of, read (gather) but not yet
// evaluated, and the key of a compile of them: what a result cache looks
// a design up by, at the cost of reading and hashing alone. Compile
// compiles from these files without reading them again.
type Gathered struct {
	// Dir is the design directory as given.
	Dir string
	// Root is the module root on disk, "" for a module in memory.
	Root string
	// Label prefixes file names in messages (see Source.Label).
	Label string

	rel     string            // Dir relative to the module root, slash-separated
	files   map[string][]byte // by slash path relative to the module root
	notUTF8 []string
	dirs    []string // the directories the files were read from

	keyed   sync.Once
	digest  func(name string, b []byte) [32]byte // a Reader's, nil for none
	key     string
	digests map[string][32]byte // the files' SHA-256, as keyed
}

// Key is the SHA-256, in hex, of everything a compile of the design
// depends on besides ampwright itself: the embedded schema, how files and
// the design are named in messages (Label and Dir), and the name and
// contents of every file gathered. Two designs with the same key compile
// to the same result, byte for byte. It is computed when first asked for.
func (g *Gathered) Key() string {
	g.keyed.Do(g.computeKey)
	return g.key
}

// Gather reads the files of the design in dir on disk through the guard,
// as Compile would, and keys them. Its error is not the one Compile would
// report: compile the design to have that.
func Gather(dir string) (*Gathered, error) {
	return gatherDisk(dir, nil)
}

// GatherFS is Gather for a module held in fsys, such as a git revision,
// where dir is the design's directory relative to the module root and
// label prefixes file names in messages.
func GatherFS(fsys fs.FS, dir, label string) (*Gathered, error) {
	rel := path.Clean(filepath.ToSlash(dir))
	ga, err := gatherAll(fsys, rel, label)
	if err != nil {
		return nil, err
	}
	return &Gathered{Dir: dir, Label: label, rel: rel, files: ga.files, notUTF8: ga.notUTF8, dirs: ga.dirList()}, nil
}

// GatherError is the error Compile reports for the design when Gather or
// GatherFS fails with err.
func GatherError(err error) error {
	if verr := checkVirtualBase(); verr != nil {
		err = verr
	}
	return ErrorList{{Msg: unvirtual(err.Error())}}
}

// Read returns a gathered file by its slash path relative to the module
// root.
func (g *Gathered) Read(rel string) ([]byte, bool) {
	b, ok := g.files[rel]
	return b, ok
}

// Dirs are the directories of the module the files were read from, as
// slash paths relative to its root, sorted: those that hold the design's
// package, its parents, and the packages it imports (whether or not they
// exist), the vendored schema's and cue.mod. A design whose Dirs hold the
// same .cue files compiles to the same result; a change anywhere else in
// the module cannot change it.
func (g *Gathered) Dirs() []string { return g.dirs }

// Digest returns the SHA-256 of a gathered file, by its slash path
// relative to the module root.
func (g *Gathered) Digest(rel string) ([32]byte, bool) {
	g.keyed.Do(g.computeKey)
	d, ok := g.digests[rel]
	return d, ok
}

// Paths are the gathered files' paths on disk, sorted, as Design.Files
// gives them; none for a module in memory.
func (g *Gathered) Paths() []string {
	if g.Root == "" {
		return nil
	}
	out := make([]string, 0, len(g.files))
	for _, rel := range schema.Names(g.files) {
		out = append(out, filepath.Join(g.Root, filepath.FromSlash(rel)))
	}
	return out
}

// Compile compiles the design from the gathered files (see CompileFrom).
func (g *Gathered) Compile() (*result.Result, *Design, error) {
	return CompileFrom(g.Dir, &Source{Label: g.Label, gathered: g})
}

// load loads the gathered files as loadDisk or loadSource would.
func (g *Gathered) load() (loaded, error) {
	if err := checkVirtualBase(); err != nil {
		return loaded{}, err
	}
	l, err := loadFiles(g.rel, g.files, g.notUTF8, g.Label)
	if g.Root != "" {
		// The design's files are reported where they are on disk.
		for i, f := range l.files {
			l.files[i] = filepath.Join(g.Root, filepath.FromSlash(strings.TrimPrefix(f, l.root+"/")))
		}
		l.root = g.Root
	}
	return l, err
}

// keyVersion changes when what the key covers changes.
const keyVersion = "ampwright inputs 1"

// computeKey hashes what a compile of the files depends on. g.digest
// gives a file's SHA-256, remembered across designs by a Reader; nil
// computes it.
func (g *Gathered) computeKey() {
	digest := g.digest
	h := sha256.New()
	fmt.Fprintf(h, "%s\x00%x\x00%s\x00%s\x00%s\x00", keyVersion, schemaDigest(), g.Label, g.Dir, g.rel)
	names := make([]string, 0, len(g.files))
	for name := range g.files {
		names = append(names, name)
	}
	sort.Strings(names)
	g.digests = make(map[string][32]byte, len(names))
	for _, name := range names {
		b := g.files[name]
		var d [32]byte
		if digest != nil {
			d = digest(name, b)
		} else {
			d = sha256.Sum256(b)
		}
		g.digests[name] = d
		fmt.Fprintf(h, "%s\x00%d\x00", name, len(b))
		h.Write(d[:])
	}
	g.key = hex.EncodeToString(h.Sum(nil))
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

// gatherDisk reads the design in dir on disk: through a guard of its own,
// or through r, which reads a directory shared by several designs once.
func gatherDisk(dir string, r *Reader) (*Gathered, error) {
	abs, err := filepath.Abs(dir)
	if err != nil {
		return nil, err
	}
	fi, err := os.Stat(abs)
	if err != nil {
		return nil, fmt.Errorf("design %s: %w", dir, plainErr(err))
	}
	if !fi.IsDir() {
		return nil, fmt.Errorf("design %s: not a directory; give the directory of a hull's package", dir)
	}
	var root, label string
	if r != nil {
		root, label = r.rootOf(abs)
	} else {
		root, label = rootAndLabel(abs)
	}
	rel, err := filepath.Rel(root, abs)
	if err != nil {
		return nil, err
	}
	rel = filepath.ToSlash(rel)
	var fsys fs.FS
	var digest func(string, []byte) [32]byte
	if r == nil {
		g, err := openGuard(root, DefaultLimits)
		if err != nil {
			return nil, err
		}
		defer g.root.Close()
		fsys = g
	} else {
		m, err := r.module(root)
		if err != nil {
			return nil, err
		}
		mf := &memoFS{m: m, own: rel}
		fsys, digest = mf, mf.digest
	}
	ga, err := gatherAll(fsys, rel, label)
	if err != nil {
		return nil, err
	}
	if r != nil {
		if err := withinTotals(ga.files); err != nil {
			return nil, err
		}
	}
	return &Gathered{Dir: dir, Root: root, Label: label, rel: rel, files: ga.files, notUTF8: ga.notUTF8, dirs: ga.dirList(), digest: digest}, nil
}

// rootAndLabel finds the module root of the design directory abs, and how
// messages name the files under it.
func rootAndLabel(abs string) (root, label string) {
	root = moduleRoot(abs)
	if root == "" {
		root = abs
	}
	label = displayName(root)
	if label == "." {
		label = ""
	} else {
		label += "/"
	}
	return root, label
}

// withinTotals checks a design's files against the limits on all of them,
// which a guard shared by several designs cannot count.
func withinTotals(files map[string][]byte) error {
	lim := DefaultLimits
	var total int64
	for _, b := range files {
		total += int64(len(b))
	}
	if lim.MaxFiles > 0 && int64(len(files)) > lim.MaxFiles || lim.MaxModule > 0 && total > lim.MaxModule {
		return fmt.Errorf("the design's files are over the limits on all of them")
	}
	return nil
}

// A Reader gathers the designs of a yard on disk (Gather) reading each
// directory that several of them share (the catalog, the rulebook, the
// vendored schema, the parents of the hulls' directories) once, and a
// design's own directory afresh: what a fleet does before it looks each
// hull up in a result cache. It is safe for concurrent use; Close it when
// done.
type Reader struct {
	mu      sync.Mutex
	modules map[string]*moduleMemo // by module root
	roots   map[string][2]string   // a design directory's module root and label
}

// NewReader returns a Reader with nothing read yet.
func NewReader() *Reader {
	return &Reader{modules: map[string]*moduleMemo{}, roots: map[string][2]string{}}
}

// rootOf is rootAndLabel, found once for the directories of a yard's
// hulls, which share their parent's.
func (r *Reader) rootOf(abs string) (root, label string) {
	parent := filepath.Dir(abs)
	r.mu.Lock()
	known, ok := r.roots[parent]
	r.mu.Unlock()
	if ok {
		if _, err := os.Stat(filepath.Join(abs, "cue.mod")); err != nil {
			return known[0], known[1]
		}
	}
	root, label = rootAndLabel(abs)
	if root != abs {
		r.mu.Lock()
		r.roots[parent] = [2]string{root, label}
		r.mu.Unlock()
	}
	return root, label
}

// Gather is Gather through r.
func (r *Reader) Gather(dir string) (*Gathered, error) { return gatherDisk(dir, r) }

// Close closes the modules r opened.
func (r *Reader) Close() {
	r.mu.Lock()
	defer r.mu.Unlock()
	for _, m := range r.modules {
		m.g.root.Close()
	}
	r.modules = map[string]*moduleMemo{}
}

func (r *Reader) module(root string) (*moduleMemo, error) {
	r.mu.Lock()
	defer r.mu.Unlock()
	if m, ok := r.modules[root]; ok {
		return m, nil
	}
	// The totals are checked design by design (withinTotals).
	g, err := openGuard(root, Limits{MaxFile: DefaultLimits.MaxFile})
	if err != nil {
		return nil, err
	}
	m := &moduleMemo{g: g, dirs: map[string]dirMemo{}, files: map[string]fileMemo{}}
	r.modules[root] = m
	return m, nil
}

// moduleMemo is what a Reader has read of one module.
type moduleMemo struct {
	g     *guardFS
	mu    sync.Mutex
	dirs  map[string]dirMemo
	files map[string]fileMemo
}

type dirMemo struct {
	entries []fs.DirEntry
	err     error
}

type fileMemo struct {
	b       []byte
	digest  [32]byte
	err     error
	imports []string // the directories it imports from, once found
	found   bool
}

// memoFS is a module read through its memo, for one design: the design's
// own directory is read afresh and not kept.
type memoFS struct {
	m   *moduleMemo
	own string
}

func (f *memoFS) shared(name string) bool { return path.Dir(name) != f.own }

func (f *memoFS) Open(name string) (fs.File, error) { return f.m.g.Open(name) }

func (f *memoFS) Stat(name string) (fs.FileInfo, error) { return f.m.g.Stat(name) }

func (f *memoFS) ReadDir(name string) ([]fs.DirEntry, error) { return f.m.g.ReadDir(name) }

func (f *memoFS) cueEntries(name string) ([]fs.DirEntry, error) {
	if name == f.own {
		return f.m.g.cueEntries(name)
	}
	f.m.mu.Lock()
	defer f.m.mu.Unlock()
	d, ok := f.m.dirs[name]
	if !ok {
		d.entries, d.err = f.m.g.cueEntries(name)
		f.m.dirs[name] = d
	}
	return d.entries, d.err
}

func (f *memoFS) ReadFile(name string) ([]byte, error) {
	if !f.shared(name) {
		return f.m.g.ReadFile(name)
	}
	f.m.mu.Lock()
	defer f.m.mu.Unlock()
	m, ok := f.m.files[name]
	if !ok {
		m.b, m.err = f.m.g.ReadFile(name)
		if m.err == nil {
			m.digest = sha256.Sum256(m.b)
		}
		f.m.files[name] = m
	}
	return m.b, m.err
}

// imports are the import directories of a file, found once for a shared
// file.
func (f *memoFS) imports(name string, find func() []string) []string {
	if !f.shared(name) {
		return find()
	}
	f.m.mu.Lock()
	m, ok := f.m.files[name]
	f.m.mu.Unlock()
	if ok && m.found {
		return m.imports
	}
	dirs := find()
	if ok {
		m.imports, m.found = dirs, true
		f.m.mu.Lock()
		f.m.files[name] = m
		f.m.mu.Unlock()
	}
	return dirs
}

// digest is a file's SHA-256, computed once for a shared file.
func (f *memoFS) digest(name string, b []byte) [32]byte {
	if f.shared(name) {
		f.m.mu.Lock()
		m, ok := f.m.files[name]
		f.m.mu.Unlock()
		if ok && m.err == nil {
			return m.digest
		}
	}
	return sha256.Sum256(b)
}
