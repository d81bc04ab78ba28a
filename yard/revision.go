package yard

import (
	"bufio"
	"bytes"
	"fmt"
	"io"
	"io/fs"
	"path"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/ampwright/ampwright/compiler"
)

// Revision is a yard module as it was at a git commit, held in memory.
type Revision struct {
	// Source is the module's files at the commit.
	Source *compiler.Source
	// Commit is the commit's hash and Time its commit time, Unix seconds.
	Commit string
	Time   int64
	// Dir is the module's directory in the work tree it was read from,
	// absolute: with Commit, what a worker process reads it again by.
	Dir string
}

// ReadRevision reads the module whose root is moduleDir, a directory in a
// git work tree, as it was at revision rev, from git's objects: the work
// tree is not touched.
func ReadRevision(moduleDir, rev string) (*Revision, error) {
	abs, err := filepath.Abs(moduleDir)
	if err != nil {
		return nil, err
	}
	if strings.HasPrefix(rev, "-") {
		return nil, fmt.Errorf("revision %q: a revision cannot start with '-'", rev)
	}
	top, err := git(abs, nil, "rev-parse", "--show-toplevel")
	if err != nil {
		return nil, err
	}
	topDir := strings.TrimSpace(string(top))
	commit, err := git(abs, nil, "rev-parse", "--verify", "--quiet", "--end-of-options", rev+"^{commit}")
	if err != nil {
		return nil, fmt.Errorf("revision %q is not a commit in %s", rev, topDir)
	}
	hash := strings.TrimSpace(string(commit))
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
	src := &compiler.Source{Files: map[string][]byte{}, Bad: map[string]string{}, Label: hash[:min(12, len(hash))] + ":"}
	if prefix != "." {
		src.Label += prefix + "/"
	}
	entries, err := revisionEntries(list, prefix, src)
	if err != nil {
		return nil, err
	}
	var batch bytes.Buffer
	for _, e := range entries {
		batch.WriteString(e.object + "\n")
	}
	out, err := git(topDir, &batch, "cat-file", "--batch")
	if err != nil {
		return nil, err
	}
	contents := map[string][]byte{} // by path relative to the module
	r := bufio.NewReader(bytes.NewReader(out))
	for _, e := range entries {
		header, err := r.ReadString('\n')
		if err != nil {
			return nil, fmt.Errorf("git cat-file: %v", err)
		}
		f := strings.Fields(header)
		if len(f) != 3 {
			return nil, fmt.Errorf("git cat-file: unexpected %q", header)
		}
		size, err := strconv.Atoi(f[2])
		if err != nil || int64(size) != e.size {
			return nil, fmt.Errorf("git cat-file: unexpected %q", header)
		}
		data := make([]byte, size+1) // the content and a newline
		if _, err := io.ReadFull(r, data); err != nil {
			return nil, err
		}
		contents[e.path] = data[:size]
	}
	for _, e := range entries {
		if !e.link {
			src.Files[e.path] = contents[e.path]
		}
	}
	for _, e := range entries {
		if e.link {
			resolveLink(e.path, entries, contents, src)
		}
	}
	rv := &Revision{Source: src, Commit: hash, Dir: abs}
	rv.Time = commitTime(topDir, hash)
	return rv, nil
}

// FS is the revision's module as a file system.
func (r *Revision) FS() fs.FS { return r.Source.FS() }

// Label prefixes the revision's file names in messages.
func (r *Revision) Label() string { return r.Source.Label }

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
func revisionEntries(list []byte, prefix string, src *compiler.Source) ([]revEntry, error) {
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
			src.Bad[rel] = fmt.Sprintf("is %d bytes, more than the %d-byte limit for one file (a bound that keeps a hostile design from exhausting CI)", size, lim.MaxFile)
			continue
		}
		if total += size; total > lim.MaxModule {
			return nil, fmt.Errorf("the .cue files of %s exceed the %d-byte limit for a revision", strings.TrimSuffix(src.Label, "/"), lim.MaxModule)
		}
		if len(out) >= maxRevisionFiles {
			return nil, fmt.Errorf("%s has more than %d .cue files, the limit for a revision", strings.TrimSuffix(src.Label, "/"), maxRevisionFiles)
		}
		out = append(out, revEntry{path: rel, object: f[2], size: size, link: f[0] == "120000"})
	}
	return out, nil
}

// resolveLink gives a symbolic link of the revision the content of the
// file it leads to, when that is a file of the module; a link that leads
// elsewhere is marked bad, as it would be on disk.
func resolveLink(name string, entries []revEntry, contents map[string][]byte, src *compiler.Source) {
	link := map[string]bool{}
	for _, e := range entries {
		link[e.path] = e.link
	}
	p := name
	for hops := 0; hops < 40; hops++ {
		target := string(contents[p])
		if path.IsAbs(target) {
			src.Bad[name] = "is a symbolic link with an absolute target; ampwright follows only relative links that stay inside the module"
			return
		}
		next := path.Join(path.Dir(p), target)
		if next == ".." || strings.HasPrefix(next, "../") {
			src.Bad[name] = "leads outside the module through a symbolic link; ampwright reads nothing outside the design's module"
			return
		}
		if !link[next] {
			if b, ok := src.Files[next]; ok {
				src.Files[name] = b
			} else {
				src.Bad[name] = "is a symbolic link to no .cue file of the module"
			}
			return
		}
		p = next
	}
	src.Bad[name] = "is a symbolic link in a loop"
}
