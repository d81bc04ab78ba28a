package yard

import (
	"bytes"
	"errors"
	"fmt"
	"io"
	"io/fs"
	"path"
	"path/filepath"
	"sort"
	"strconv"
	"strings"
	"sync"
	"testing/fstest"
	"time"

	"github.com/ampwright/ampwright/compiler"
)

// Revision is a yard module as it was at a git commit. Its files are
// listed from the commit's tree when it is read, and a file's contents are
// read from git's objects only when asked for (FS), through one
// `git cat-file --batch` started on the first: a diff reads the hulls it
// compiles at the revision, and the directories of the others only where
// the work tree differs. Close it when done.
type Revision struct {
	// Commit is the commit's hash and Time its commit time, Unix seconds.
	Commit string
	Time   int64
	// Dir is the module's directory in the work tree it was read from,
	// absolute: with Commit, what a worker process reads it again by.
	Dir string

	top, format, label string
	files              map[string]revEntry // the .cue files, by path relative to the module
	bad                map[string]string   // files that may not be read, and why
	dirs               map[string][]fs.DirEntry

	mu    sync.Mutex
	cat   *gitProcess // started on the first read
	err   error       // the reader's error, once it has failed
	cache map[string][]byte
}

// ReadRevision lists the module whose root is moduleDir, a directory in a
// git work tree, as it was at revision rev, from git's objects: the work
// tree is not touched, and no file is read until asked for.
func ReadRevision(moduleDir, rev string) (*Revision, error) {
	if strings.HasPrefix(rev, "-") {
		return nil, fmt.Errorf("revision %q: a revision cannot start with '-'", rev)
	}
	abs, topDir, format, err := workTree(moduleDir)
	if err != nil {
		return nil, err
	}
	commit, err := git(abs, nil, "rev-parse", "--verify", "--quiet", "--end-of-options", rev+"^{commit}")
	if err != nil {
		return nil, fmt.Errorf("revision %q is not a commit in %s", rev, topDir)
	}
	rv, err := listRevision(abs, topDir, format, strings.TrimSpace(string(commit)))
	if err != nil {
		return nil, err
	}
	rv.Time = commitTime(topDir, rv.Commit)
	return rv, nil
}

// ReadCommit is ReadRevision for a commit named by its full hash, as
// ReadRevision resolved it, without its time: what a worker process reads
// a side of a diff by.
func ReadCommit(moduleDir, commit string) (*Revision, error) {
	if len(commit) != 40 && len(commit) != 64 || strings.Trim(commit, "0123456789abcdef") != "" {
		return nil, fmt.Errorf("%q is not a full commit hash", commit)
	}
	abs, topDir, format, err := workTree(moduleDir)
	if err != nil {
		return nil, err
	}
	return listRevision(abs, topDir, format, commit)
}

// workTree finds the work tree holding moduleDir, and its object format.
func workTree(moduleDir string) (abs, top, format string, err error) {
	abs, err = filepath.Abs(moduleDir)
	if err != nil {
		return "", "", "", err
	}
	out, err := git(abs, nil, "rev-parse", "--show-toplevel", "--show-object-format")
	if err != nil {
		return "", "", "", err
	}
	lines := strings.Split(strings.TrimSpace(string(out)), "\n")
	if len(lines) != 2 {
		return "", "", "", fmt.Errorf("git rev-parse: unexpected %q", out)
	}
	return abs, lines[0], lines[1], nil
}

// listRevision lists the module at abs as it is in commit hash.
func listRevision(abs, topDir, format, hash string) (*Revision, error) {
	realTop, _ := filepath.EvalSymlinks(topDir)
	realAbs, _ := filepath.EvalSymlinks(abs)
	prefix, err := filepath.Rel(realTop, realAbs)
	if err != nil {
		return nil, err
	}
	prefix = filepath.ToSlash(prefix)
	args := []string{"ls-tree", "-r", "-z", "-l", "--full-tree", hash}
	if prefix != "." {
		args = append(args, "--", prefix)
	}
	list, err := git(topDir, nil, args...)
	if err != nil {
		return nil, err
	}
	rv := &Revision{Commit: hash, Dir: abs, top: topDir, format: format, files: map[string]revEntry{}, bad: map[string]string{}, cache: map[string][]byte{}}
	rv.label = hash[:min(12, len(hash))] + ":"
	if prefix != "." {
		rv.label += prefix + "/"
	}
	entries, err := revisionEntries(list, prefix, rv.label, rv.bad)
	if err != nil {
		return nil, err
	}
	for _, e := range entries {
		rv.files[e.path] = e
	}
	rv.index()
	return rv, nil
}

// FS is the revision's module as a file system of its .cue files: a file
// is read from git when it is first opened, and kept. Opening a file that
// may not be read (a link that leads out, a file over the size limit)
// fails with why.
func (r *Revision) FS() fs.FS { return revFS{r} }

// Label prefixes the revision's file names in messages.
func (r *Revision) Label() string { return r.label }

// Close ends the revision's reader.
func (r *Revision) Close() {
	r.mu.Lock()
	defer r.mu.Unlock()
	if r.cat != nil {
		r.cat.close()
		r.cat = nil
	}
	if r.err == nil {
		r.err = errors.New("the revision is closed")
	}
}

// index lists each directory's entries, for ReadDir.
func (r *Revision) index() {
	children := map[string]map[string]fs.DirEntry{}
	add := func(name string, e fs.DirEntry) {
		d := path.Dir(name)
		if children[d] == nil {
			children[d] = map[string]fs.DirEntry{}
		}
		children[d][path.Base(name)] = e
	}
	var walkUp func(p string)
	walkUp = func(p string) {
		for d := path.Dir(p); d != "."; d = path.Dir(d) {
			if _, ok := children[path.Dir(d)][path.Base(d)]; ok {
				break
			}
			add(d, revInfo{name: path.Base(d), dir: true})
		}
	}
	for p, e := range r.files {
		add(p, revInfo{name: path.Base(p), size: e.size})
		walkUp(p)
	}
	for p := range r.bad {
		add(p, revInfo{name: path.Base(p)})
		walkUp(p)
	}
	r.dirs = map[string][]fs.DirEntry{}
	for d, m := range children {
		list := make([]fs.DirEntry, 0, len(m))
		for _, e := range m {
			list = append(list, e)
		}
		sort.Slice(list, func(i, j int) bool { return list[i].Name() < list[j].Name() })
		r.dirs[d] = list
	}
}

// refused is a file of a revision that may not be read, and why: as a
// file on disk is refused (see compiler.ModuleFS).
type refused struct{ path, why string }

func (e *refused) Error() string { return e.path + " " + e.why }

// readFile reads a .cue file of the revision: a link is followed to the
// .cue file of the module it leads to, as on disk.
func (r *Revision) readFile(name string) ([]byte, error) {
	if why, ok := r.bad[name]; ok {
		return nil, &refused{path: r.label + name, why: why}
	}
	e, ok := r.files[name]
	if !ok {
		return nil, &fs.PathError{Op: "open", Path: name, Err: fs.ErrNotExist}
	}
	if !e.link {
		return r.blob(e)
	}
	p := name
	for hops := 0; hops < 40; hops++ {
		b, err := r.blob(r.files[p])
		if err != nil {
			return nil, err
		}
		target := string(b)
		if path.IsAbs(target) {
			return nil, &refused{path: r.label + name, why: "is a symbolic link with an absolute target; ampwright follows only relative links that stay inside the module"}
		}
		next := path.Join(path.Dir(p), target)
		if next == ".." || strings.HasPrefix(next, "../") {
			return nil, &refused{path: r.label + name, why: "leads outside the module through a symbolic link; ampwright reads nothing outside the design's module"}
		}
		ne, ok := r.files[next]
		if !ok || !ne.link {
			if _, isBad := r.bad[next]; ok && !isBad {
				return r.blob(ne)
			}
			return nil, &refused{path: r.label + name, why: "is a symbolic link to no .cue file of the module"}
		}
		p = next
	}
	return nil, &refused{path: r.label + name, why: "is a symbolic link in a loop"}
}

// blob reads a file's object from git, once.
func (r *Revision) blob(e revEntry) ([]byte, error) {
	r.mu.Lock()
	defer r.mu.Unlock()
	if b, ok := r.cache[e.object]; ok {
		return b, nil
	}
	if r.err != nil {
		return nil, r.err
	}
	if r.cat == nil {
		r.cat, r.err = startGit(r.top, "cat-file", "--batch")
		if r.err != nil {
			return nil, r.err
		}
	}
	b, err := r.catBlob(e)
	if err != nil {
		// The reader is out of step: it reads nothing more.
		r.err = err
		r.cat.close()
		r.cat = nil
		return nil, err
	}
	r.cache[e.object] = b
	return b, nil
}

func (r *Revision) catBlob(e revEntry) ([]byte, error) {
	if _, err := io.WriteString(r.cat.stdin, e.object+"\n"); err != nil {
		return nil, fmt.Errorf("git cat-file: %v %s", err, strings.TrimSpace(r.cat.stderr.String()))
	}
	header, err := r.cat.stdout.ReadString('\n')
	if err != nil {
		return nil, fmt.Errorf("git cat-file: %v %s", err, strings.TrimSpace(r.cat.stderr.String()))
	}
	f := strings.Fields(header)
	if len(f) != 3 || f[0] != e.object || f[1] != "blob" {
		return nil, fmt.Errorf("git cat-file: unexpected %q", header)
	}
	size, err := strconv.ParseInt(f[2], 10, 64)
	if err != nil || size != e.size {
		return nil, fmt.Errorf("git cat-file: unexpected %q", header)
	}
	data := make([]byte, size+1) // the content and a newline
	if _, err := io.ReadFull(r.cat.stdout, data); err != nil {
		return nil, fmt.Errorf("git cat-file: %v", err)
	}
	return data[:size], nil
}

// revFS is a Revision as a file system.
type revFS struct{ r *Revision }

func (f revFS) Open(name string) (fs.File, error) {
	if !fs.ValidPath(name) {
		return nil, &fs.PathError{Op: "open", Path: name, Err: fs.ErrInvalid}
	}
	if entries, ok := f.r.dirs[name]; ok || name == "." {
		return &revDir{info: revInfo{name: path.Base(name), dir: true}, entries: entries}, nil
	}
	b, err := f.ReadFile(name)
	if err != nil {
		return nil, err
	}
	return fstest.MapFS{name: {Data: b, Mode: 0o644}}.Open(name)
}

func (f revFS) ReadFile(name string) ([]byte, error) {
	if !fs.ValidPath(name) {
		return nil, &fs.PathError{Op: "read", Path: name, Err: fs.ErrInvalid}
	}
	return f.r.readFile(name)
}

func (f revFS) ReadDir(name string) ([]fs.DirEntry, error) {
	entries, ok := f.r.dirs[name]
	if !ok && name != "." {
		if _, isFile := f.r.files[name]; isFile {
			return nil, &fs.PathError{Op: "readdir", Path: name, Err: errors.New("not a directory")}
		}
		return nil, &fs.PathError{Op: "readdir", Path: name, Err: fs.ErrNotExist}
	}
	return append([]fs.DirEntry(nil), entries...), nil
}

func (f revFS) Stat(name string) (fs.FileInfo, error) {
	if _, ok := f.r.dirs[name]; ok || name == "." {
		return revInfo{name: path.Base(name), dir: true}, nil
	}
	if e, ok := f.r.files[name]; ok {
		return revInfo{name: path.Base(name), size: e.size}, nil
	}
	if _, ok := f.r.bad[name]; ok {
		return revInfo{name: path.Base(name)}, nil
	}
	return nil, &fs.PathError{Op: "stat", Path: name, Err: fs.ErrNotExist}
}

// revInfo describes a file or directory of a revision.
type revInfo struct {
	name string
	size int64
	dir  bool
}

func (i revInfo) Name() string       { return i.name }
func (i revInfo) Size() int64        { return i.size }
func (i revInfo) ModTime() time.Time { return time.Time{} }
func (i revInfo) IsDir() bool        { return i.dir }
func (i revInfo) Sys() any           { return nil }
func (i revInfo) Mode() fs.FileMode {
	if i.dir {
		return fs.ModeDir | 0o755
	}
	return 0o644
}
func (i revInfo) Type() fs.FileMode          { return i.Mode().Type() }
func (i revInfo) Info() (fs.FileInfo, error) { return i, nil }

// revDir is an open directory of a revision.
type revDir struct {
	info    revInfo
	entries []fs.DirEntry
	off     int
}

func (d *revDir) Stat() (fs.FileInfo, error) { return d.info, nil }
func (d *revDir) Read([]byte) (int, error) {
	return 0, &fs.PathError{Op: "read", Path: d.info.name, Err: errors.New("is a directory")}
}
func (d *revDir) Close() error { return nil }
func (d *revDir) ReadDir(n int) ([]fs.DirEntry, error) {
	rest := d.entries[d.off:]
	if n <= 0 {
		d.off = len(d.entries)
		return append([]fs.DirEntry(nil), rest...), nil
	}
	if len(rest) == 0 {
		return nil, io.EOF
	}
	n = min(n, len(rest))
	d.off += n
	return append([]fs.DirEntry(nil), rest[:n]...), nil
}

// DefaultBase is the revision a diff starts from when none is given: the
// merge base of HEAD with the default branch (origin/HEAD, main or master),
// else HEAD.
func DefaultBase(dir string) string {
	out, _ := git(dir, nil, "rev-parse", "HEAD")
	head := strings.TrimSpace(string(out))
	for _, branch := range []string{"origin/HEAD", "origin/main", "main", "origin/master", "master"} {
		if out, err := git(dir, nil, "merge-base", "HEAD", branch); err == nil {
			if mb := strings.TrimSpace(string(out)); mb != "" && mb != head {
				return mb
			}
		}
	}
	return "HEAD"
}

// maxRevisionFiles bounds the .cue files of a revision's module: empty
// files cost nothing against the size limit, and each is read and kept.
const maxRevisionFiles = 100000

// revEntry is a file of a revision's module that ampwright may read.
type revEntry struct {
	path, object string // path relative to the module
	size         int64
	link         bool // a symbolic link, whose content is its target
}

// revisionEntries picks the .cue files from `git ls-tree -l` output: what
// a design can be made of. A file over the size limit is marked bad rather
// than read, and the .cue files together are bounded too.
func revisionEntries(list []byte, prefix, label string, bad map[string]string) ([]revEntry, error) {
	lim := compiler.DefaultLimits
	var out []revEntry
	var total int64
	for _, rec := range bytes.Split(list, []byte{0}) {
		meta, p, ok := strings.Cut(string(rec), "\t")
		f := strings.Fields(meta)
		if !ok || len(f) != 4 || f[1] != "blob" || !strings.HasSuffix(p, ".cue") {
			continue
		}
		rel := p
		if prefix != "." {
			rel = strings.TrimPrefix(p, prefix+"/")
		}
		size, err := strconv.ParseInt(f[3], 10, 64)
		if err != nil {
			return nil, fmt.Errorf("git ls-tree: unexpected %q", meta)
		}
		if size > lim.MaxFile {
			bad[rel] = fmt.Sprintf("is %d bytes, more than the %d-byte limit for one file (a bound that keeps a hostile design from exhausting CI)", size, lim.MaxFile)
			continue
		}
		if total += size; total > lim.MaxModule {
			return nil, fmt.Errorf("the .cue files of %s exceed the %d-byte limit for a revision", strings.TrimSuffix(label, "/"), lim.MaxModule)
		}
		if len(out) >= maxRevisionFiles {
			return nil, fmt.Errorf("%s has more than %d .cue files, the limit for a revision", strings.TrimSuffix(label, "/"), maxRevisionFiles)
		}
		out = append(out, revEntry{path: rel, object: f[2], size: size, link: f[0] == "120000"})
	}
	return out, nil
}
