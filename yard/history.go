package yard

import (
	"bytes"
	"path/filepath"
	"strconv"
	"strings"

	"github.com/ampwright/ampwright/result"
)

// historyLimit is how many commits History lists at most: those since the
// newest tag, or the last ones when the repository has no tag.
const historyLimit = 12

// History lists, newest first, the commits that touched a design's input
// files (absolute paths, as compiler.Design.Files gives them, in the
// module at root): those since the newest tag reachable from HEAD, at most
// historyLimit of them, or, without a tag, the last historyLimit. It is
// what a pack's cover shows a client of how the design came to be; outside
// a work tree, or without git, it is empty.
func History(root string, files []string) result.History {
	h := headOf(root)
	if h == nil || len(files) == 0 {
		return result.History{}
	}
	realTop, err := filepath.EvalSymlinks(h.top)
	if err != nil {
		return result.History{}
	}
	var out result.History
	rng := h.commit
	if tag, err := git(root, nil, "describe", "--tags", "--abbrev=0", h.commit); err == nil {
		out.Since = strings.TrimSpace(string(tag))
		rng = out.Since + ".." + h.commit
	}
	// The paths are given literally: a file named like a pathspec's magic
	// (":(exclude)…") means only itself.
	args := []string{"--literal-pathspecs", "log", "-z", "--no-merges", "--format=%H%x1f%ct%x1f%an%x1f%s",
		"-n", strconv.Itoa(historyLimit + 1), rng, "--"}
	for _, f := range files {
		real, err := filepath.EvalSymlinks(f)
		if err != nil {
			continue
		}
		rel, err := filepath.Rel(realTop, real)
		if err != nil || strings.HasPrefix(rel, "..") {
			continue
		}
		args = append(args, filepath.ToSlash(rel))
	}
	// Run at the top of the work tree, which the paths are relative to.
	b, err := git(realTop, nil, args...)
	if err != nil {
		return result.History{}
	}
	for _, rec := range bytes.Split(b, []byte{0}) {
		fs := strings.Split(strings.TrimSpace(string(rec)), "\x1f")
		if len(fs) != 4 {
			continue
		}
		t, _ := strconv.ParseInt(fs[1], 10, 64)
		if len(out.Commits) == historyLimit {
			out.More = true
			break
		}
		out.Commits = append(out.Commits, result.Commit{Commit: fs[0], Time: t, Author: fs[2], Subject: fs[3]})
	}
	return out
}
