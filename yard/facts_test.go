package yard

import (
	"os"
	"os/exec"
	"path/filepath"
	"testing"
)

// gitRepo makes a git work tree in a temporary directory with the files
// given, committed.
func gitRepo(t *testing.T, files map[string]string) string {
	t.Helper()
	if _, err := exec.LookPath("git"); err != nil {
		t.Skip("no git")
	}
	dir := t.TempDir()
	for rel, s := range files {
		write(t, dir, rel, s)
	}
	run := func(args ...string) {
		cmd := exec.Command("git", append([]string{"-C", dir, "-c", "user.name=t", "-c", "user.email=t@example.invalid"}, args...)...)
		if out, err := cmd.CombinedOutput(); err != nil {
			t.Fatalf("git %v: %v\n%s", args, err, out)
		}
	}
	run("init", "-q")
	run("add", ".")
	run("commit", "-q", "-m", "first")
	return dir
}

func write(t *testing.T, dir, rel, s string) {
	t.Helper()
	p := filepath.Join(dir, filepath.FromSlash(rel))
	if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(p, []byte(s), 0o644); err != nil {
		t.Fatal(err)
	}
}

// TestFactsDirtyOnlyForInputs: a hull is dirty when one of its own input
// files differs from the commit, and not for an edit to another hull or an
// untracked file elsewhere.
func TestFactsDirtyOnlyForInputs(t *testing.T) {
	dir := gitRepo(t, map[string]string{
		"catalog/c.cue": "package catalog\n",
		"hulls/a/a.cue": "package a\n",
		"hulls/b/b.cue": "package b\n",
	})
	inputs := func(hull string) []string {
		return []string{filepath.Join(dir, "catalog/c.cue"), filepath.Join(dir, "hulls", hull, hull+".cue")}
	}
	if f := FactsOf(dir, inputs("a"), os.ReadFile); f.Revision == "" || f.Dirty || f.Time == 0 {
		t.Fatalf("clean tree: got %+v, want a revision, a time and not dirty", f)
	}
	write(t, dir, "hulls/b/b.cue", "package b\nx: 1\n")
	write(t, dir, "notes.txt", "untracked\n")
	if f := FactsOf(dir, inputs("a"), os.ReadFile); f.Dirty {
		t.Error("an edit to hull b and an untracked file made hull a dirty")
	}
	if f := FactsOf(dir, inputs("b"), os.ReadFile); !f.Dirty {
		t.Error("an edit to hull b's own file left it clean")
	}
	write(t, dir, "catalog/c.cue", "package catalog\ny: 2\n")
	if f := FactsOf(dir, inputs("a"), os.ReadFile); !f.Dirty {
		t.Error("an edit to the catalog hull a imports left it clean")
	}
}

// TestGitIgnoresRepositoryCommands: a repository's configured fsmonitor,
// pager or signature program is never run when ampwright asks git about
// it.
func TestGitIgnoresRepositoryCommands(t *testing.T) {
	dir := gitRepo(t, map[string]string{"cue.mod/module.cue": "module: \"x.example/y\"\n", "hulls/a/a.cue": "package a\nvessel: {}\n"})
	marker := filepath.Join(t.TempDir(), "ran")
	script := filepath.Join(t.TempDir(), "monitor.sh")
	if err := os.WriteFile(script, []byte("#!/bin/sh\ntouch "+marker+"\n"), 0o755); err != nil {
		t.Fatal(err)
	}
	for _, kv := range [][2]string{{"core.fsmonitor", script}, {"core.pager", script}, {"log.showSignature", "true"}, {"gpg.program", script}} {
		cfg := exec.Command("git", "-C", dir, "config", kv[0], kv[1])
		if out, err := cfg.CombinedOutput(); err != nil {
			t.Fatalf("%v: %s", err, out)
		}
	}
	heads.Delete(dir)
	FactsOf(dir, []string{filepath.Join(dir, "hulls/a/a.cue")}, os.ReadFile)
	if _, err := ReadRevision(dir, "HEAD"); err != nil {
		t.Fatal(err)
	}
	DefaultBase(dir)
	if _, err := os.Stat(marker); err == nil {
		t.Error("git ran the repository's fsmonitor command")
	}
	// The same repository does run it for a plain `git status`, so the
	// test would see it.
	st := exec.Command("git", "-C", dir, "status", "--porcelain")
	_ = st.Run()
	if _, err := os.Stat(marker); err != nil {
		t.Skip("this git does not run fsmonitor commands at all; the check above proves nothing here")
	}
}
