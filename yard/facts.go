package yard

import (
	"bytes"
	"crypto/sha1"
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"fmt"
	"hash"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"sync"

	"github.com/ampwright/ampwright/compiler"
)

// Facts are what git says of a design's inputs: the commit checked out
// and whether any input differs from it.
type Facts struct {
	// Revision is the commit hash of HEAD, "" outside a git work tree.
	Revision string
	// Time is the commit time, Unix seconds.
	Time int64
	// Dirty is true when one of the design's input files differs from
	// the commit, or is not in it.
	Dirty bool
}

// head is what git says of a work tree's HEAD, asked once per work tree.
type head struct {
	top, commit, format string
	time                int64
}

var heads sync.Map // directory → func() *head, its answer (nil outside a work tree)

// headOf asks git about dir's HEAD once, however many goroutines ask at
// once (a pack's facts and history do).
func headOf(dir string) *head {
	ask, _ := heads.LoadOrStore(dir, sync.OnceValue(func() *head {
		out, err := git(dir, nil, "rev-parse", "--show-toplevel", "--show-object-format", "--verify", "--quiet", "HEAD")
		if err != nil {
			return nil
		}
		lines := strings.Fields(string(out))
		if len(lines) != 3 {
			return nil
		}
		h := &head{top: lines[0], format: lines[1], commit: lines[2]}
		h.time = commitTime(dir, h.commit)
		return h
	}))
	return ask.(func() *head)()
}

// FactsOf asks git about the design whose input files (absolute paths) are
// files, in the module at root, read by read (the contents the design was
// loaded from). Only those files count towards Dirty: an
// edit to another hull, or an untracked file elsewhere, does not. git is
// asked for the commit's entries of those files alone, and the files are
// hashed here as git would hash them, so that git runs no filter, hook or
// monitor of the repository's. Outside a work tree, or without git, the
// facts are empty.
func FactsOf(root string, files []string, read func(string) ([]byte, error)) Facts {
	return factsOf(root, files, plainAsker{root: root, read: read})
}

// A factsAsker finds what factsOf needs of a design's files: where each
// really is, the commit's entries for them (by slash path relative to the
// top of the work tree), and the object name of each file's contents as
// loaded.
type factsAsker interface {
	real(file string) (string, error)
	committed(h *head, rels []string) (map[string]string, error)
	object(format, file string) (string, error)
}

// plainAsker asks git about the files alone, and hashes each.
type plainAsker struct {
	root string
	read func(string) ([]byte, error)
}

func (a plainAsker) real(file string) (string, error) { return filepath.EvalSymlinks(file) }

func (a plainAsker) committed(h *head, rels []string) (map[string]string, error) {
	out, err := git(a.root, nil, append([]string{"ls-tree", "-z", "--full-tree", h.commit, "--"}, rels...)...)
	if err != nil {
		return nil, err
	}
	return treeEntries(out), nil
}

func (a plainAsker) object(format, file string) (string, error) {
	b, err := a.read(file)
	if err != nil {
		return "", err
	}
	return blobID(format, b), nil
}

// factsOf is FactsOf asking through a.
func factsOf(root string, files []string, a factsAsker) Facts {
	h := headOf(root)
	if h == nil {
		return Facts{}
	}
	f := Facts{Revision: h.commit, Time: h.time}
	realTop, err := filepath.EvalSymlinks(h.top)
	if err != nil {
		return f
	}
	rels := make([]string, 0, len(files))
	for _, file := range files {
		real, err := a.real(file)
		if err != nil {
			f.Dirty = true
			return f
		}
		rel, err := filepath.Rel(realTop, real)
		if err != nil || strings.HasPrefix(rel, "..") {
			f.Dirty = true // not in the work tree at all
			return f
		}
		rels = append(rels, filepath.ToSlash(rel))
	}
	entries, err := a.committed(h, rels)
	if err != nil {
		f.Dirty = true
		return f
	}
	for i, rel := range rels {
		want, ok := entries[rel]
		if !ok {
			f.Dirty = true
			return f
		}
		if id, err := a.object(h.format, files[i]); err != nil || id != want {
			f.Dirty = true
			return f
		}
	}
	return f
}

// treeEntries are the blobs of `git ls-tree -z` output, by path.
func treeEntries(out []byte) map[string]string {
	entries := map[string]string{}
	for _, rec := range bytes.Split(out, []byte{0}) {
		meta, p, ok := strings.Cut(string(rec), "\t")
		if fs := strings.Fields(meta); ok && len(fs) == 3 && fs[1] == "blob" {
			entries[p] = fs[2]
		}
	}
	return entries
}

// factsBatch asks git about the designs of a fleet: the commit's entries
// under each module are listed once, rather than once a hull, and every
// hull's files are looked up in them, with FactsOf's answer. The object
// names of the files shared by the hulls (the catalog, the rulebook, the
// schema) are computed once, and so are the real paths of directories.
type factsBatch struct {
	mu    sync.Mutex
	trees map[string]*committedTree // by module root
	ids   map[objectKey]string      // a file's object name by its SHA-256
	reals map[string]string         // a file's or a directory's real path
}

// objectKey is a file's contents, by their SHA-256, in an object format.
type objectKey struct {
	format string
	sum    [32]byte
}

type committedTree struct {
	once    sync.Once
	prefix  string // the module's directory in the work tree
	entries map[string]string
	err     error
}

func newFactsBatch() *factsBatch {
	return &factsBatch{trees: map[string]*committedTree{}, ids: map[objectKey]string{}, reals: map[string]string{}}
}

// of gives the facts of a design whose input files are files, as gathered
// in g (nil when the files were not gathered here: they are read again).
func (b *factsBatch) of(files []string, g *compiler.Gathered) Facts {
	if len(files) == 0 {
		return Facts{}
	}
	if g == nil || g.Root == "" {
		root := moduleRootOf(filepath.Dir(files[0]))
		fsys, err := compiler.ModuleFS(root, compiler.Limits{MaxFile: compiler.DefaultLimits.MaxFile})
		if err != nil {
			return FactsOf(root, files, func(string) ([]byte, error) { return nil, err })
		}
		return FactsOf(root, files, func(f string) ([]byte, error) {
			rel, err := filepath.Rel(root, f)
			if err != nil {
				return nil, err
			}
			return fs.ReadFile(fsys, filepath.ToSlash(rel))
		})
	}
	return factsOf(g.Root, files, batchAsker{b: b, g: g})
}

// batchAsker asks through a factsBatch about files gathered in g.
type batchAsker struct {
	b *factsBatch
	g *compiler.Gathered
}

// real resolves each file, and each directory of files, once.
func (a batchAsker) real(file string) (string, error) {
	a.b.mu.Lock()
	real, ok := a.b.reals[file]
	a.b.mu.Unlock()
	if ok {
		return real, nil
	}
	if fi, err := os.Lstat(file); err != nil || fi.Mode()&fs.ModeSymlink != 0 {
		real, err = filepath.EvalSymlinks(file)
		if err != nil {
			return "", err
		}
	} else {
		dir := filepath.Dir(file)
		a.b.mu.Lock()
		realDir, ok := a.b.reals[dir]
		a.b.mu.Unlock()
		if !ok {
			if realDir, err = filepath.EvalSymlinks(dir); err != nil {
				return "", err
			}
		}
		a.b.mu.Lock()
		a.b.reals[dir] = realDir
		a.b.mu.Unlock()
		real = filepath.Join(realDir, filepath.Base(file))
	}
	a.b.mu.Lock()
	a.b.reals[file] = real
	a.b.mu.Unlock()
	return real, nil
}

func (a batchAsker) committed(h *head, rels []string) (map[string]string, error) {
	t := a.b.tree(a.g.Root)
	t.once.Do(func() { t.prefix, t.entries, t.err = listModule(a.g.Root, h) })
	if t.err != nil {
		return nil, t.err
	}
	for _, rel := range rels {
		if t.prefix != "." && !strings.HasPrefix(rel, t.prefix+"/") {
			// Not under the module as listed: ask about these files.
			return plainAsker{root: a.g.Root}.committed(h, rels)
		}
	}
	return t.entries, nil
}

func (a batchAsker) object(format, file string) (string, error) {
	rel, err := filepath.Rel(a.g.Root, file)
	if err != nil {
		return "", err
	}
	rel = filepath.ToSlash(rel)
	b, ok := a.g.Read(rel)
	sum, known := a.g.Digest(rel)
	if !ok || !known {
		return "", fs.ErrNotExist
	}
	key := objectKey{format, sum}
	a.b.mu.Lock()
	id, ok := a.b.ids[key]
	a.b.mu.Unlock()
	if !ok {
		id = blobID(format, b)
		a.b.mu.Lock()
		a.b.ids[key] = id
		a.b.mu.Unlock()
	}
	return id, nil
}

func (b *factsBatch) tree(root string) *committedTree {
	b.mu.Lock()
	defer b.mu.Unlock()
	t, ok := b.trees[root]
	if !ok {
		t = &committedTree{}
		b.trees[root] = t
	}
	return t
}

// moduleRootOf is the directory holding cue.mod at or above dir, or dir.
func moduleRootOf(dir string) string {
	for d := dir; ; {
		if fi, err := os.Stat(filepath.Join(d, "cue.mod")); err == nil && fi.IsDir() {
			return d
		}
		parent := filepath.Dir(d)
		if parent == d {
			return dir
		}
		d = parent
	}
}

// listModule lists the commit's files under the module at root.
func listModule(root string, h *head) (string, map[string]string, error) {
	realTop, err := filepath.EvalSymlinks(h.top)
	if err != nil {
		return "", nil, err
	}
	realRoot, err := filepath.EvalSymlinks(root)
	if err != nil {
		return "", nil, err
	}
	prefix, err := filepath.Rel(realTop, realRoot)
	if err != nil || strings.HasPrefix(prefix, "..") {
		return "", nil, errors.New("the module is not in the work tree")
	}
	prefix = filepath.ToSlash(prefix)
	args := []string{"ls-tree", "-r", "-z", "--full-tree", h.commit}
	if prefix != "." {
		args = append(args, "--", prefix)
	}
	out, err := git(root, nil, args...)
	if err != nil {
		return "", nil, err
	}
	return prefix, treeEntries(out), nil
}

// blobID is git's object name of a file's contents: the hash of
// "blob <size>\0" and the bytes, in the repository's object format.
func blobID(format string, b []byte) string {
	var hh hash.Hash = sha1.New()
	if format == "sha256" {
		hh = sha256.New()
	}
	fmt.Fprintf(hh, "blob %d\x00", len(b))
	hh.Write(b)
	return hex.EncodeToString(hh.Sum(nil))
}
