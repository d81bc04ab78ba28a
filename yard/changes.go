package yard

import (
	"crypto/sha256"
	"encoding/hex"
	"errors"
	"io/fs"
	"path"
	"path/filepath"
	"sort"
	"strings"
	"sync"

	"github.com/ampwright/ampwright/compiler"
)

// A comparison finds which hulls of two sides of a yard may differ,
// without compiling any. A hull's result depends only on the .cue files of
// the directories its files are read from (compiler.Gathered.Dirs: its
// package's directory and its parents, the packages it imports, the
// vendored schema, cue.mod), so a hull whose directories hold the same
// .cue files on both sides is unchanged. The directories are found on the
// head, by gathering each hull there; if every one of them is the same on
// the base, the base's hull reads the same files, imports included.
//
// A directory is compared by the object names of its .cue files: for a
// git revision, as its tree lists them, so that nothing is read from git
// for a directory the work tree has not changed; on disk, by hashing the
// files as git would. A directory holding a symbolic link, or a file that
// cannot be read, counts as changed: what it leads to is compared nowhere.
type comparison struct {
	base, head *sideTree
	reader     *compiler.Reader
}

func newComparison(base, head Side) *comparison {
	format := "" // two directories: files are named by their SHA-256
	switch {
	case base.Rev != nil:
		format = base.Rev.format
	case head.Rev != nil:
		format = head.Rev.format
	}
	return &comparison{base: newSideTree(base, format), head: newSideTree(head, format), reader: compiler.NewReader()}
}

func (c *comparison) close() { c.reader.Close() }

// unchanged reports whether the hull, present on both sides, reads the
// same .cue files on both. A hull that cannot be gathered on the head
// counts as changed: compiling it says why.
func (c *comparison) unchanged(hull string) bool {
	g, err := c.head.side.gather(hull, c.reader)
	if err != nil {
		return false
	}
	for _, d := range g.Dirs() {
		d, ok := c.head.sideDir(g, d)
		if !ok || !c.equal(d) {
			return false
		}
	}
	return true
}

// equal reports whether directory d, relative to the sides' roots, holds
// the same .cue files on both sides.
func (c *comparison) equal(d string) bool {
	a, b := c.base.dir(d), c.head.dir(d)
	if a.odd || b.odd || len(a.files) != len(b.files) {
		return false
	}
	for name, sum := range a.files {
		if b.files[name] != sum {
			return false
		}
	}
	return true
}

// baseHulls lists the hulls of a base that is a git revision, given the
// head's: a directory whose .cue files are the same on both sides is a
// hull on the base when it is one on the head; only the files of the
// others are read from git, to see whether one declares a vessel (as
// Hulls does).
func (c *comparison) baseHulls(headHulls []string) []string {
	isHead := map[string]bool{}
	for _, h := range headHulls {
		isHead[h] = true
	}
	rv := c.base.side.Rev
	var out []string
	for d, entries := range rv.dirs {
		if skippedDir(d) {
			continue
		}
		var cue []string
		for _, e := range entries {
			if !e.IsDir() && strings.HasSuffix(e.Name(), ".cue") {
				cue = append(cue, path.Join(d, e.Name()))
			}
		}
		if len(cue) == 0 {
			continue
		}
		if c.equal(d) {
			if isHead[d] {
				out = append(out, d)
			}
			continue
		}
		for _, p := range cue {
			if b, err := rv.readFile(p); err != nil || isHullFile.Match(b) {
				out = append(out, d)
				break
			}
		}
	}
	sort.Strings(out)
	return out
}

// skippedDir reports whether Hulls leaves directory d out: cue.mod, and
// hidden and node_modules directories, at any depth.
func skippedDir(d string) bool {
	if d == "." {
		return false
	}
	for _, part := range strings.Split(d, "/") {
		if part == "cue.mod" || part == "node_modules" || strings.HasPrefix(part, ".") {
			return true
		}
	}
	return false
}

// sideTree is one side of a comparison: what each of its directories
// holds, found once.
type sideTree struct {
	side   Side
	format string // git's object format ("sha1", "sha256"), or "" for SHA-256 of the contents
	fsys   fs.FS  // a side on disk, through the guard
	err    error  // why it cannot be read, if it cannot
	root   string // a side on disk: its directory, absolute

	mu   sync.Mutex
	dirs map[string]*dirFiles
}

// dirFiles are the .cue files directly in a directory, by name, with the
// object names of their contents; odd when one is a symbolic link or
// cannot be read, or the directory holds a link to a directory.
type dirFiles struct {
	files map[string]string
	odd   bool
}

func newSideTree(s Side, format string) *sideTree {
	t := &sideTree{side: s, format: format, dirs: map[string]*dirFiles{}}
	if s.Rev == nil {
		t.root, t.err = filepath.Abs(s.Dir)
		if t.err == nil {
			t.fsys, t.err = yardFS(s.Dir)
		}
	}
	return t
}

// sideDir is directory d of g's module as a path relative to the side's
// root, false when it lies outside.
func (t *sideTree) sideDir(g *compiler.Gathered, d string) (string, bool) {
	if t.side.Rev != nil || g.Root == "" {
		return d, true
	}
	if g.Root == t.root {
		return d, true
	}
	rel, err := filepath.Rel(t.root, filepath.Join(g.Root, filepath.FromSlash(d)))
	if err != nil || rel == ".." || strings.HasPrefix(rel, ".."+string(filepath.Separator)) {
		return "", false
	}
	return filepath.ToSlash(rel), true
}

func (t *sideTree) dir(d string) *dirFiles {
	t.mu.Lock()
	defer t.mu.Unlock()
	if df, ok := t.dirs[d]; ok {
		return df
	}
	var df *dirFiles
	if t.side.Rev != nil {
		df = t.revDir(d)
	} else {
		df = t.diskDir(d)
	}
	t.dirs[d] = df
	return df
}

// revDir lists a directory of a revision from its tree, reading nothing.
func (t *sideTree) revDir(d string) *dirFiles {
	rv := t.side.Rev
	df := &dirFiles{files: map[string]string{}}
	for _, e := range rv.dirs[d] {
		if e.IsDir() || !strings.HasSuffix(e.Name(), ".cue") {
			continue
		}
		p := path.Join(d, e.Name())
		f, ok := rv.files[p]
		if _, bad := rv.bad[p]; bad || !ok || f.link {
			df.odd = true
			continue
		}
		df.files[e.Name()] = f.object
	}
	return df
}

// diskDir reads a directory of a side on disk and names its .cue files'
// contents.
func (t *sideTree) diskDir(d string) *dirFiles {
	df := &dirFiles{files: map[string]string{}}
	if t.err != nil {
		df.odd = true
		return df
	}
	entries, err := fs.ReadDir(t.fsys, d)
	if err != nil {
		// A directory that is not there holds no files; one that cannot
		// be read is not compared.
		df.odd = !errors.Is(err, fs.ErrNotExist)
		return df
	}
	for _, e := range entries {
		t.addEntry(df, d, e)
	}
	return df
}

// addEntry adds an entry of directory d to what d holds, reading a .cue
// file, and reports whether it is a .cue file that declares a vessel or
// cannot be read (what makes d a hull, as Hulls has it).
func (t *sideTree) addEntry(df *dirFiles, d string, e fs.DirEntry) (hull bool) {
	p := path.Join(d, e.Name())
	cue := strings.HasSuffix(e.Name(), ".cue")
	switch {
	case e.Type()&fs.ModeSymlink != 0:
		// A link to a .cue file, or to a directory a package or a hull
		// may be read through; a link to another file is not read.
		fi, err := fs.Stat(t.fsys, p)
		if cue || err != nil || fi.IsDir() {
			df.odd = true
		}
		if cue {
			b, err := fs.ReadFile(t.fsys, p)
			return err != nil || isHullFile.Match(b)
		}
	case e.IsDir() || !cue:
	case !e.Type().IsRegular():
		df.odd = true
		return true
	default:
		b, err := fs.ReadFile(t.fsys, p)
		if err != nil {
			df.odd = true
			return true
		}
		df.files[e.Name()] = t.object(b)
		return isHullFile.Match(b)
	}
	return false
}

// hulls lists the hulls of a side on disk, as Hulls does, in the same walk
// that names the contents of the directories it reads.
func (t *sideTree) hulls() ([]string, error) {
	if t.err != nil {
		return nil, t.err
	}
	seen := map[string]bool{}
	dirs := map[string]*dirFiles{}
	err := fs.WalkDir(t.fsys, ".", func(p string, e fs.DirEntry, err error) error {
		if err != nil {
			return err
		}
		if e.IsDir() {
			if p != "." && (e.Name() == "cue.mod" || strings.HasPrefix(e.Name(), ".") || e.Name() == "node_modules") {
				return fs.SkipDir
			}
			dirs[p] = &dirFiles{files: map[string]string{}}
			return nil
		}
		d := path.Dir(p)
		if t.addEntry(dirs[d], d, e) {
			seen[d] = true
		}
		return nil
	})
	if err != nil {
		return nil, err
	}
	t.mu.Lock()
	for d, df := range dirs {
		if _, ok := t.dirs[d]; !ok {
			t.dirs[d] = df
		}
	}
	t.mu.Unlock()
	out := make([]string, 0, len(seen))
	for d := range seen {
		out = append(out, d)
	}
	sort.Strings(out)
	return out, nil
}

// object names a file's contents as the other side names them: as git
// does, when one side is a revision.
func (t *sideTree) object(b []byte) string {
	if t.format != "" {
		return blobID(t.format, b)
	}
	sum := sha256.Sum256(b)
	return hex.EncodeToString(sum[:])
}
