package yard

import (
	"bufio"
	"bytes"
	"fmt"
	"io"
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
	args := []string{"ls-tree", "-r", "-z", "--full-tree", hash}
	if prefix != "." {
		args = append(args, "--", prefix)
	}
	list, err := git(topDir, nil, args...)
	if err != nil {
		return nil, err
	}
	type entry struct{ path, object string }
	var entries []entry
	var batch bytes.Buffer
	for _, rec := range bytes.Split(list, []byte{0}) {
		if len(rec) == 0 {
			continue
		}
		meta, p, ok := strings.Cut(string(rec), "\t")
		f := strings.Fields(meta)
		if !ok || len(f) != 3 || f[1] != "blob" {
			continue
		}
		rel := p
		if prefix != "." {
			rel = strings.TrimPrefix(p, prefix+"/")
		}
		entries = append(entries, entry{rel, f[2]})
		batch.WriteString(f[2] + "\n")
	}
	out, err := git(topDir, &batch, "cat-file", "--batch")
	if err != nil {
		return nil, err
	}
	src := &compiler.Source{Files: map[string][]byte{}, Label: hash[:min(12, len(hash))] + ":"}
	if prefix != "." {
		src.Label += prefix + "/"
	}
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
		if err != nil {
			return nil, err
		}
		data := make([]byte, size+1) // the content and a newline
		if _, err := io.ReadFull(r, data); err != nil {
			return nil, err
		}
		src.Files[e.path] = data[:size]
	}
	rv := &Revision{Source: src, Commit: hash}
	if t, err := git(topDir, nil, "log", "-1", "--format=%ct", hash); err == nil {
		rv.Time, _ = strconv.ParseInt(strings.TrimSpace(string(t)), 10, 64)
	}
	return rv, nil
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
