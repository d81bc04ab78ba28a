package main

import (
	"bytes"
	"fmt"
	"io/fs"
	"os"
	"os/exec"
	"path/filepath"
	"strings"
	"sync"
	"testing"
)

// The result cache must never change what a command prints: these tests
// run the commands that use it with the cache cold (an empty directory),
// warm (the same directory again) and off, and compare the bytes.

// cached runs a command in this process with the result cache in dir, or
// off when dir is "off".
func cached(dir string, args ...string) outcome {
	var stdout, stderr bytes.Buffer
	full := append([]string{args[0], "--" + flagResultCache, dir}, args[1:]...)
	code := run(full, &stdout, &stderr)
	return outcome{args: full, stdout: stdout.String(), stderr: stderr.String(), code: code}
}

// sameOutcomes runs args cold, warm and off and fails on any difference
// in exit status, standard output or standard error, and when the warm
// run writes an entry: everything it looks up, it finds.
func sameOutcomes(t *testing.T, dir string, args ...string) outcome {
	t.Helper()
	off := cached(cacheOff, args...)
	var written map[string]fs.FileInfo
	for _, mode := range []string{"cold", "warm"} {
		got := cached(dir, args...)
		if got.code != off.code || got.stdout != off.stdout || got.stderr != off.stderr {
			t.Errorf("ampwright %s with the cache %s: exit %d, differs from the cache off (exit %d)\n%s", strings.Join(args, " "), mode, got.code, off.code, firstDifference(got.all(), off.all()))
		}
		now := entryInfo(t, dir)
		if mode == "cold" {
			if len(now) == 0 {
				t.Errorf("ampwright %s wrote nothing to the cache", strings.Join(args, " "))
			}
			written = now
			continue
		}
		for p, fi := range now {
			if was, ok := written[p]; !ok || !fi.ModTime().Equal(was.ModTime()) || !os.SameFile(fi, was) {
				t.Errorf("ampwright %s, warm, wrote %s: it did not find what it looked up", strings.Join(args, " "), p)
			}
		}
	}
	return off
}

// entryInfo describes the cache's entries.
func entryInfo(t *testing.T, dir string) map[string]fs.FileInfo {
	t.Helper()
	out := map[string]fs.FileInfo{}
	for p := range entries(t, dir) {
		fi, err := os.Stat(p)
		if err != nil {
			t.Fatal(err)
		}
		out[p] = fi
	}
	return out
}

// firstDifference shows where two outputs part.
func firstDifference(a, b string) string {
	i := 0
	for i < len(a) && i < len(b) && a[i] == b[i] {
		i++
	}
	from := max(0, i-200)
	return fmt.Sprintf("with the cache: …%s…\nwithout:        …%s…", a[from:min(len(a), i+200)], b[from:min(len(b), i+200)])
}

// cheapHostile are the hulls of the hostile corpus that compile, or are
// refused, without passing a bound and without a link or special file the
// hostile tests make.
var cheapHostile = []string{"attr-q", "attr-q-import", "default-loosen", "empty-table", "fed-from-load", "good", "hours", "inverted-range", "names", "nan-inf", "voyage-long"}

// TestCacheByteIdentical: check of each example hull and of each hull of
// the test yards (one at a time in this process, and all at once in
// workers) and a fleet of each yard give the same JSON, and the same text,
// with the cache cold, warm and off; a design's input errors included.
func TestCacheByteIdentical(t *testing.T) {
	examples, _ := filepath.Glob("../../designs/hulls/*")
	bad, _ := filepath.Glob("../../testdata/designs/yard/hulls/*")
	var hostile []string
	for _, h := range cheapHostile {
		hostile = append(hostile, "../../testdata/hostile/yard/hulls/"+h)
	}
	if len(examples) < 5 || len(bad) < 30 {
		t.Fatalf("found %d example hulls and %d bad designs", len(examples), len(bad))
	}
	for _, set := range []struct {
		name string
		dirs []string
	}{{"examples", examples}, {"bad", bad}, {"hostile", hostile}} {
		t.Run(set.name, func(t *testing.T) {
			dir := t.TempDir()
			for _, d := range set.dirs {
				sameOutcomes(t, dir, "check", "--format", "json", d)
			}
			sameOutcomes(t, dir, append([]string{"check", "--format", "json"}, set.dirs...)...)
			sameOutcomes(t, dir, append([]string{"check"}, set.dirs...)...)
		})
	}
	for _, yard := range []string{"../../designs", "../../testdata/designs/yard"} {
		t.Run("fleet "+yard, func(t *testing.T) {
			dir := t.TempDir()
			o := sameOutcomes(t, dir, "fleet", "--format", "json", yard)
			if !strings.Contains(o.stdout, `"hulls"`) {
				t.Fatalf("no fleet:\n%s", o.all())
			}
			sameOutcomes(t, dir, "fleet", yard)
			// The whole results a fleet keeps for its packs come from the
			// cache too.
			sameOutcomes(t, dir, "fleet", "--format", "json", "--packs", t.TempDir(), yard)
		})
	}
}

// TestCacheDiffByteIdentical: a diff of a yard in git, the work tree
// against a commit and two commits, gives the same JSON with the cache
// cold, warm and off.
func TestCacheDiffByteIdentical(t *testing.T) {
	yard := gitYard(t)
	// A change to one hull's own file and one to the catalog every hull
	// imports.
	edit(t, filepath.Join(yard, "hulls/dunnock/dunnock.cue"), "designer:", `designer: "A. Newhand"`)
	edit(t, filepath.Join(yard, "catalog/catalog.cue"), "", "")
	dir := t.TempDir()
	o := sameOutcomes(t, dir, "diff", "--base", "HEAD", "--format", "json", yard)
	if !strings.Contains(o.stdout, "A. Newhand") {
		t.Fatalf("the diff does not show the change:\n%s", o.all())
	}
	gitIn(t, yard, "commit", "-q", "-a", "-m", "change")
	sameOutcomes(t, dir, "diff", "--base", "HEAD~1", "--head", "HEAD", "--format", "json", yard)
	sameOutcomes(t, dir, "diff", "--base", "HEAD~1", "--format", "markdown", yard)
}

// gitYard copies the example yard into a git repository of its own, and
// commits it.
func gitYard(t *testing.T) string {
	t.Helper()
	if _, err := exec.LookPath("git"); err != nil {
		t.Skip("no git")
	}
	yard := filepath.Join(t.TempDir(), "yard")
	if err := os.CopyFS(yard, os.DirFS("../../designs")); err != nil {
		t.Fatal(err)
	}
	gitIn(t, yard, "init", "-q")
	gitIn(t, yard, "add", ".")
	gitIn(t, yard, "commit", "-q", "-m", "yard")
	return yard
}

func gitIn(t *testing.T, dir string, args ...string) {
	t.Helper()
	cmd := exec.Command("git", append([]string{"-C", dir, "-c", "user.name=t", "-c", "user.email=t@example.invalid", "-c", "commit.gpgsign=false"}, args...)...)
	if out, err := cmd.CombinedOutput(); err != nil {
		t.Fatalf("git %v: %v\n%s", args, err, out)
	}
}

// edit replaces the line of file that starts (after its indent) with
// prefix by repl, keeping the indent; with no prefix it adds a comment at
// the end.
func edit(t *testing.T, file, prefix, repl string) {
	t.Helper()
	b, err := os.ReadFile(file)
	if err != nil {
		t.Fatal(err)
	}
	if prefix == "" {
		b = append(b, "\n// edited\n"...)
	} else {
		lines := strings.Split(string(b), "\n")
		found := false
		for i, l := range lines {
			trimmed := strings.TrimLeft(l, "\t ")
			if strings.HasPrefix(trimmed, prefix) {
				lines[i] = l[:len(l)-len(trimmed)] + repl
				found = true
				break
			}
		}
		if !found {
			t.Fatalf("%s has no line starting %q", file, prefix)
		}
		b = []byte(strings.Join(lines, "\n"))
	}
	if err := os.WriteFile(file, b, 0o644); err != nil {
		t.Fatal(err)
	}
}

// entries lists the cache's entries with their contents.
func entries(t *testing.T, dir string) map[string][]byte {
	t.Helper()
	out := map[string][]byte{}
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err != nil || d.IsDir() || filepath.Dir(p) == dir {
			return err // the cache's own files are at its top
		}
		b, err := os.ReadFile(p)
		out[p] = b
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
	return out
}

// TestCacheCorruptEntries: an entry truncated, altered, emptied or
// replaced by another's is ignored, the output is what it would be without
// the cache, and the entry is written again, whole.
func TestCacheCorruptEntries(t *testing.T) {
	dir := t.TempDir()
	hulls, _ := filepath.Glob("../../designs/hulls/*")
	args := append([]string{"check", "--format", "json"}, hulls[:2]...)
	want := cached(cacheOff, args...)
	cached(dir, args...)
	good := entries(t, dir)
	if len(good) < 4 {
		t.Fatalf("%d entries after a check of two hulls", len(good))
	}
	var names []string
	for p := range good {
		names = append(names, p)
	}
	for _, c := range []struct {
		name  string
		spoil func(p string, b []byte) []byte
	}{
		{"truncated", func(_ string, b []byte) []byte { return b[:len(b)/2] }},
		{"a byte changed", func(_ string, b []byte) []byte {
			b = bytes.Clone(b)
			b[len(b)-20] ^= 0x40
			return b
		}},
		{"empty", func(string, []byte) []byte { return nil }},
		{"another entry's", func(p string, b []byte) []byte {
			for _, other := range names {
				if other != p {
					return good[other]
				}
			}
			return nil
		}},
		{"another version's", func(_ string, b []byte) []byte {
			return bytes.Replace(b, []byte("\ntool "), []byte("\ntool ampwright.result/v0 "), 1)
		}},
	} {
		t.Run(c.name, func(t *testing.T) {
			for p, b := range good {
				if err := os.WriteFile(p, c.spoil(p, b), 0o644); err != nil {
					t.Fatal(err)
				}
			}
			got := cached(dir, args...)
			if got.code != want.code || got.stdout != want.stdout || got.stderr != want.stderr {
				t.Fatalf("with spoilt entries: exit %d\n%s", got.code, firstDifference(got.all(), want.all()))
			}
			for p, b := range entries(t, dir) {
				if g, ok := good[p]; ok && !bytes.Equal(b, g) {
					t.Errorf("%s was not written again", p)
				}
			}
		})
	}
}

// TestCacheUnwritable: a cache that cannot be written is reported once,
// and the command gives what it gives without the cache.
func TestCacheUnwritable(t *testing.T) {
	file := filepath.Join(t.TempDir(), "not-a-directory")
	if err := os.WriteFile(file, []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	hulls, _ := filepath.Glob("../../designs/hulls/*")
	for _, args := range [][]string{
		{"check", "--format", "json", hulls[0]},
		append([]string{"check", "--format", "json"}, hulls...),
		{"fleet", "--format", "json", "../../designs"},
	} {
		want := cached(cacheOff, args...)
		got := cached(file, args...)
		if got.code != want.code || got.stdout != want.stdout {
			t.Errorf("%v: exit %d, want %d\n%s", args, got.code, want.code, firstDifference(got.stdout, want.stdout))
		}
		warnings := strings.Count(got.stderr, "warning: the result cache")
		if warnings != 1 || strings.TrimPrefix(got.stderr, want.stderr) == got.stderr && want.stderr != "" {
			t.Errorf("%v: %d warnings, want 1:\n%s", args, warnings, got.stderr)
		}
	}
}

// TestCacheConcurrentRuns: fleets run at once as processes, each with its
// workers, sharing one cold cache, print what a fleet without the cache
// prints, and leave whole entries and no temporary file.
func TestCacheConcurrentRuns(t *testing.T) {
	dir := t.TempDir()
	args := []string{"fleet", "--format", "json", "--" + flagResultCache, dir, "../../designs"}
	want := cached(cacheOff, "fleet", "--format", "json", "../../designs")
	var wg sync.WaitGroup
	outs := make([]outcome, 4)
	for i := range outs {
		wg.Add(1)
		go func() {
			defer wg.Done()
			cmd := exec.Command("ampwright", args...)
			var stdout, stderr bytes.Buffer
			cmd.Stdout, cmd.Stderr = &stdout, &stderr
			err := cmd.Run()
			code := 0
			if ee, ok := err.(*exec.ExitError); ok {
				code = ee.ExitCode()
			} else if err != nil {
				t.Error(err)
			}
			outs[i] = outcome{stdout: stdout.String(), stderr: stderr.String(), code: code}
		}()
	}
	wg.Wait()
	for i, o := range append(outs, cached(dir, "fleet", "--format", "json", "../../designs")) {
		if o.code != want.code || o.stdout != want.stdout || o.stderr != want.stderr {
			t.Errorf("run %d: exit %d\n%s", i, o.code, firstDifference(o.all(), want.all()))
		}
	}
	err := filepath.WalkDir(dir, func(p string, d fs.DirEntry, err error) error {
		if err == nil && strings.HasPrefix(d.Name(), ".tmp-") {
			t.Errorf("a temporary file is left: %s", p)
		}
		return err
	})
	if err != nil {
		t.Fatal(err)
	}
}
