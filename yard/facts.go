package yard

import (
	"bytes"
	"crypto/sha1"
	"crypto/sha256"
	"encoding/hex"
	"fmt"
	"hash"
	"path/filepath"
	"strings"
	"sync"
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

var heads sync.Map // directory → *head (nil outside a work tree)

func headOf(dir string) *head {
	if h, ok := heads.Load(dir); ok {
		return h.(*head)
	}
	var h *head
	if out, err := git(dir, nil, "rev-parse", "--show-toplevel", "--show-object-format", "--verify", "--quiet", "HEAD"); err == nil {
		lines := strings.Fields(string(out))
		if len(lines) == 3 {
			h = &head{top: lines[0], format: lines[1], commit: lines[2]}
			h.time = commitTime(dir, h.commit)
		}
	}
	heads.Store(dir, h)
	return h
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
	h := headOf(root)
	if h == nil {
		return Facts{}
	}
	f := Facts{Revision: h.commit, Time: h.time}
	realTop, err := filepath.EvalSymlinks(h.top)
	if err != nil {
		return f
	}
	args := []string{"ls-tree", "-z", "--full-tree", h.commit, "--"}
	rels := make([]string, 0, len(files))
	for _, file := range files {
		real, err := filepath.EvalSymlinks(file)
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
	out, err := git(root, nil, append(args, rels...)...)
	if err != nil {
		f.Dirty = true
		return f
	}
	committed := map[string]string{}
	for _, rec := range bytes.Split(out, []byte{0}) {
		meta, p, ok := strings.Cut(string(rec), "\t")
		if fs := strings.Fields(meta); ok && len(fs) == 3 && fs[1] == "blob" {
			committed[p] = fs[2]
		}
	}
	for i, rel := range rels {
		want, ok := committed[rel]
		if !ok {
			f.Dirty = true
			return f
		}
		b, err := read(files[i])
		if err != nil || blobID(h.format, b) != want {
			f.Dirty = true
			return f
		}
	}
	return f
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
