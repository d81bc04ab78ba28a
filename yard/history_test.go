package yard

import (
	"os/exec"
	"path/filepath"
	"testing"
)

// TestHistory: a pack's history lists the commits that touched the
// hull's inputs, newest first, since the newest tag, and not those that
// touched only another hull; the module may sit below the top of the work
// tree, and a file named like pathspec magic means only itself.
func TestHistory(t *testing.T) {
	dir := gitRepo(t, map[string]string{
		"yard/catalog/c.cue":    "package catalog\n",
		"yard/hulls/a/a.cue":    "package a\n",
		"yard/hulls/b/b.cue":    "package b\n",
		"yard/hulls/a/:(glob)*": "package a\n",
	})
	commit := func(rel, content, msg string) {
		t.Helper()
		write(t, dir, rel, content)
		for _, args := range [][]string{{"add", "."}, {"commit", "-q", "-m", msg}} {
			cmd := exec.Command("git", append([]string{"-C", dir, "-c", "user.name=Tamsin Rowe", "-c", "user.email=t@example.invalid"}, args...)...)
			if out, err := cmd.CombinedOutput(); err != nil {
				t.Fatalf("git %v: %v\n%s", args, err, out)
			}
		}
	}
	commit("yard/hulls/a/a.cue", "package a\nx: 1\n", "before the tag")
	if out, err := exec.Command("git", "-C", dir, "tag", "v1").CombinedOutput(); err != nil {
		t.Fatalf("git tag: %v\n%s", err, out)
	}
	commit("yard/catalog/c.cue", "package catalog\ny: 1\n", "catalog: a dearer fuse")
	commit("yard/hulls/b/b.cue", "package b\nz: 1\n", "hull b only")
	commit("yard/hulls/a/a.cue", "package a\nx: 2\n", "hull a: a longer run")

	root := filepath.Join(dir, "yard")
	files := []string{filepath.Join(root, "catalog/c.cue"), filepath.Join(root, "hulls/a/a.cue"), filepath.Join(root, "hulls/a/:(glob)*")}
	h := History(root, files)
	if h.Since != "v1" {
		t.Errorf("since %q, want v1", h.Since)
	}
	var got []string
	for _, c := range h.Commits {
		got = append(got, c.Subject)
		if c.Author != "Tamsin Rowe" || c.Time == 0 || len(c.Commit) < 40 {
			t.Errorf("commit %+v: want an author, a time and a full name", c)
		}
	}
	want := []string{"hull a: a longer run", "catalog: a dearer fuse"}
	if len(got) != len(want) || got[0] != want[0] || got[1] != want[1] || h.More {
		t.Errorf("history %q (more %v), want %q", got, h.More, want)
	}
	if h := History(t.TempDir(), files); len(h.Commits) != 0 || h.Since != "" {
		t.Errorf("outside a work tree: %+v, want nothing", h)
	}
}
