package compiler

import (
	"strconv"
	"strings"
	"sync"
)

// GitInfo is the revision a design was read from.
type GitInfo struct {
	Revision string // commit hash, "" outside a git work tree
	Time     int64  // commit time, Unix seconds
	// Dirty is true when the module has uncommitted changes.
	Dirty bool
}

// gitCache holds readGit's answers by directory: every hull of a yard
// shares its module root, and a fleet should ask git once, not three times
// a hull.
var gitCache sync.Map

// readGit asks git about the work tree holding dir, once per directory in
// a process. git runs with an argument list, never through a shell;
// without git, or outside a work tree, the result is empty.
func readGit(dir string) GitInfo {
	if g, ok := gitCache.Load(dir); ok {
		return g.(GitInfo)
	}
	g := askGit(dir)
	gitCache.Store(dir, g)
	return g
}

func askGit(dir string) GitInfo {
	run := func(args ...string) (string, bool) {
		out, err := git(dir, nil, args...)
		return strings.TrimSpace(string(out)), err == nil
	}
	rev, ok := run("rev-parse", "--verify", "--quiet", "HEAD")
	if !ok || rev == "" {
		return GitInfo{}
	}
	g := GitInfo{Revision: rev}
	if t, ok := run("log", "-1", "--format=%ct", "HEAD"); ok {
		g.Time, _ = strconv.ParseInt(t, 10, 64)
	}
	if st, ok := run("status", "--porcelain", "--", "."); ok && st != "" {
		g.Dirty = true
	}
	return g
}
