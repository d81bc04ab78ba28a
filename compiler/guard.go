package compiler

import (
	"errors"
	"fmt"
	"io"
	"io/fs"
	"os"
	"path"
	"path/filepath"
	"slices"
	"strings"
	"sync/atomic"
	"syscall"
)

// guardFS is a module on disk as ampwright reads it: every path is opened
// through an os.Root at the module's root, which follows a symbolic link
// only while it stays inside; a file is read only when it is a regular
// file within the size limits, checked on the open file before a byte of
// it is read; and the bytes read in all are bounded. A yard's CI runs
// ampwright on pull requests from outside the yard, and a link to
// /proc/self/environ, /dev/zero or a FIFO is as easy to commit as a .cue
// file.
//
// Its errors name the path inside the module, never where a link leads.
type guardFS struct {
	root  *os.Root
	dir   string // the module root, absolute
	lim   Limits
	total atomic.Int64 // bytes read so far
	files atomic.Int64 // files read so far
}

// ModuleFS opens the directory root as a guarded file system for reading
// a yard's files (see guardFS). A zero MaxModule or MaxFiles in lim leaves
// the total unbounded, for a walk over a whole yard.
func ModuleFS(root string, lim Limits) (fs.FS, error) {
	g, err := openGuard(root, lim)
	if err != nil {
		return nil, err
	}
	return g, nil
}

func openGuard(root string, lim Limits) (*guardFS, error) {
	abs, err := filepath.Abs(root)
	if err != nil {
		return nil, err
	}
	r, err := os.OpenRoot(abs)
	if err != nil {
		return nil, fmt.Errorf("%s: %v", displayName(abs), plainErr(err))
	}
	return &guardFS{root: r, dir: abs, lim: lim}, nil
}

// A refusal is a path ampwright will not read, and why.
type refusal struct {
	path string // as shown: inside the module
	why  string
	kind error // fs.ErrNotExist, fs.ErrPermission or nil
}

func (r *refusal) Error() string { return r.path + " " + r.why }
func (r *refusal) Unwrap() error { return r.kind }

// shown is how a path of the module appears in messages.
func (g *guardFS) shown(name string) string {
	return displayName(filepath.Join(g.dir, filepath.FromSlash(name)))
}

// refuse explains why name could not be opened, without repeating the
// operating system's message, which may name a link's target.
func (g *guardFS) refuse(name string, err error) error {
	r := &refusal{path: g.shown(name)}
	switch {
	case g.leadsOut(name):
		r.why = outside
	case errors.Is(err, fs.ErrNotExist):
		r.why, r.kind = "does not exist", fs.ErrNotExist
	case errors.Is(err, fs.ErrPermission):
		r.why, r.kind = "cannot be read: permission denied", fs.ErrPermission
	case errors.Is(err, syscall.ELOOP):
		r.why = "is a symbolic link in a loop"
	case !g.isLink(name):
		// Opening a socket fails; so would any special file.
		r.why = notRegular
	default:
		// os.Root refuses a link with an absolute target even when it
		// points back inside.
		r.why = "cannot be read inside the module: a symbolic link with an absolute target? make it relative"
	}
	return r
}

const (
	outside    = "leads outside the module through a symbolic link; ampwright reads nothing outside the design's module"
	notRegular = "is not a regular file (a device, FIFO or socket?); ampwright reads only regular files"
)

// isLink reports whether name is itself a symbolic link.
func (g *guardFS) isLink(name string) bool {
	fi, err := g.root.Lstat(name)
	return err == nil && fi.Mode()&fs.ModeSymlink != 0
}

// leadsOut reports whether name, or a directory on its way, is a symbolic
// link that leads outside the module. Only links are looked at, never a
// file's contents. A link that leads nowhere counts by what it names.
func (g *guardFS) leadsOut(name string) bool {
	realRoot, err := filepath.EvalSymlinks(g.dir)
	if err != nil {
		return false
	}
	p := g.dir
	for _, part := range strings.Split(name, "/") {
		p = filepath.Join(p, part)
		fi, err := os.Lstat(p)
		if err != nil {
			return false
		}
		if fi.Mode()&fs.ModeSymlink == 0 {
			continue
		}
		real, err := filepath.EvalSymlinks(p)
		if err != nil {
			target, err := os.Readlink(p)
			if err != nil {
				return false
			}
			if !filepath.IsAbs(target) {
				target = filepath.Join(filepath.Dir(p), target)
			}
			target = filepath.Clean(target)
			return !within(realRoot, target) && !within(g.dir, target)
		}
		if !within(realRoot, real) {
			return true
		}
		p = real
	}
	return false
}

func within(root, p string) bool {
	rel, err := filepath.Rel(root, p)
	return err == nil && rel != ".." && !strings.HasPrefix(rel, ".."+string(filepath.Separator))
}

func (g *guardFS) check(op, name string) (string, error) {
	if name == "" {
		name = "."
	}
	if !fs.ValidPath(name) {
		return "", &fs.PathError{Op: op, Path: name, Err: fs.ErrInvalid}
	}
	return name, nil
}

// Open opens a regular file for reading, or a directory for listing.
func (g *guardFS) Open(name string) (fs.File, error) {
	name, err := g.check("open", name)
	if err != nil {
		return nil, err
	}
	f, err := g.root.OpenFile(name, os.O_RDONLY|openNonblock, 0)
	if err != nil {
		return nil, g.refuse(name, err)
	}
	fi, err := f.Stat()
	if err != nil {
		f.Close()
		return nil, g.refuse(name, err)
	}
	if fi.IsDir() {
		return f, nil
	}
	if err := g.admit(name, fi); err != nil {
		f.Close()
		return nil, err
	}
	return &boundedFile{File: f, r: io.LimitReader(f, g.lim.MaxFile+1), g: g, name: name}, nil
}

// admit checks a file about to be read against the kind and the limits.
func (g *guardFS) admit(name string, fi fs.FileInfo) error {
	if !fi.Mode().IsRegular() {
		return &refusal{path: g.shown(name), why: notRegular}
	}
	if g.lim.MaxFile > 0 && fi.Size() > g.lim.MaxFile {
		return &refusal{path: g.shown(name), why: fmt.Sprintf("is %d bytes, more than the %d-byte limit for one file (a bound that keeps a hostile design from exhausting CI)", fi.Size(), g.lim.MaxFile)}
	}
	if g.lim.MaxFiles > 0 && g.files.Add(1) > g.lim.MaxFiles {
		return &refusal{path: g.shown(name), why: fmt.Sprintf("is one file too many: a design may be made of at most %d files", g.lim.MaxFiles)}
	}
	if g.lim.MaxModule > 0 && g.total.Add(fi.Size()) > g.lim.MaxModule {
		return &refusal{path: g.shown(name), why: fmt.Sprintf("takes the files of the design past the %d-byte limit for one design", g.lim.MaxModule)}
	}
	return nil
}

// boundedFile reads at most the file limit, whatever the file grows to
// after it was measured.
type boundedFile struct {
	*os.File
	r    io.Reader
	n    int64
	g    *guardFS
	name string
}

func (f *boundedFile) Read(b []byte) (int, error) {
	n, err := f.r.Read(b)
	f.n += int64(n)
	if f.g.lim.MaxFile > 0 && f.n > f.g.lim.MaxFile {
		return n, &refusal{path: f.g.shown(f.name), why: fmt.Sprintf("grew past the %d-byte limit for one file while it was read", f.g.lim.MaxFile)}
	}
	return n, err
}

// ReadFile reads a whole regular file through Open's checks.
func (g *guardFS) ReadFile(name string) ([]byte, error) {
	f, err := g.Open(name)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	if _, ok := f.(*boundedFile); !ok {
		return nil, &refusal{path: g.shown(name), why: "is a directory, not a file"}
	}
	return io.ReadAll(f)
}

// ReadDir lists a directory of the module. Entries describe the entry
// itself: a link is listed as a link, and checked when it is opened.
func (g *guardFS) ReadDir(name string) ([]fs.DirEntry, error) {
	name, f, err := g.openDir(name)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	entries, err := f.ReadDir(-1)
	if err != nil {
		return nil, g.refuse(name, err)
	}
	return sortEntries(entries), nil
}

// cueEntries lists the entries of a directory that gather reads: its .cue
// files, as ReadDir describes them, without describing every other entry
// (the directory of the hulls holds one for each).
func (g *guardFS) cueEntries(name string) ([]fs.DirEntry, error) {
	name, f, err := g.openDir(name)
	if err != nil {
		return nil, err
	}
	defer f.Close()
	names, err := f.Readdirnames(-1)
	if err != nil {
		return nil, g.refuse(name, err)
	}
	var out []fs.DirEntry
	for _, n := range names {
		if !strings.HasSuffix(n, ".cue") {
			continue
		}
		fi, err := g.root.Lstat(path.Join(name, n))
		if err != nil {
			continue // gone since it was listed, as ReadDir would leave it
		}
		out = append(out, fs.FileInfoToDirEntry(fi))
	}
	return sortEntries(out), nil
}

// openDir checks and opens a directory of the module to list it,
// returning its checked name.
func (g *guardFS) openDir(name string) (string, *os.File, error) {
	name, err := g.check("readdir", name)
	if err != nil {
		return "", nil, err
	}
	f, err := g.root.Open(name)
	if err != nil {
		return "", nil, g.refuse(name, err)
	}
	return name, f, nil
}

// Stat describes a path, following links inside the module.
func (g *guardFS) Stat(name string) (fs.FileInfo, error) {
	name, err := g.check("stat", name)
	if err != nil {
		return nil, err
	}
	fi, err := g.root.Stat(name)
	if err != nil {
		return nil, g.refuse(name, err)
	}
	return fi, nil
}

func sortEntries(es []fs.DirEntry) []fs.DirEntry {
	slices.SortFunc(es, func(a, b fs.DirEntry) int { return strings.Compare(a.Name(), b.Name()) })
	return es
}

// plainErr drops the path from an operating-system error.
func plainErr(err error) error {
	var pe *fs.PathError
	if errors.As(err, &pe) {
		return pe.Err
	}
	return err
}
