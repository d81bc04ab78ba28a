package yard

import (
	"errors"
	"io/fs"
	"os"
	"os/exec"
	"path/filepath"
	"reflect"
	"strings"
	"testing"
)

// twoHulls is a module of two hulls, one importing a catalog.
var twoHulls = map[string]string{
	"cue.mod/module.cue": "module: \"q.example/yard\"\nlanguage: version: \"v0.13.0\"\n",
	"catalog/c.cue":      "package catalog\nx: 1\n",
	"other/o.cue":        "package other\ny: 1\n",
	"hulls/a/a.cue":      "package a\nimport \"q.example/yard/catalog\"\nimport \"list\"\nvessel: {}\nv: catalog.x\nw: list.Sum([1])\n",
	"hulls/b/b.cue":      "package b\nvessel: {}\nv: 2\n",
}

// comparisonSteps are changes to a yard and which hulls each leaves
// unchanged; each step applies to the yard as the steps before left it.
var comparisonSteps = []struct {
	name   string
	change func(t *testing.T, dir string)
	same   map[string]bool
}{
	{"nothing", func(*testing.T, string) {}, map[string]bool{"hulls/a": true, "hulls/b": true}},
	{"a package neither imports", func(t *testing.T, dir string) { write(t, dir, "other/o.cue", "package other\ny: 2\n") }, map[string]bool{"hulls/a": true, "hulls/b": true}},
	{"a file that is not CUE", func(t *testing.T, dir string) { write(t, dir, "hulls/a/notes.txt", "x") }, map[string]bool{"hulls/a": true, "hulls/b": true}},
	{"the catalog a imports", func(t *testing.T, dir string) { write(t, dir, "catalog/c.cue", "package catalog\nx: 2\n") }, map[string]bool{"hulls/a": false, "hulls/b": true}},
	{"a file added to the catalog", func(t *testing.T, dir string) { write(t, dir, "catalog/d.cue", "package catalog\n") }, map[string]bool{"hulls/a": false, "hulls/b": true}},
	{"a file removed from the catalog", func(t *testing.T, dir string) { remove(t, dir, "catalog/c.cue") }, map[string]bool{"hulls/a": false, "hulls/b": true}},
	{"a new file in b", func(t *testing.T, dir string) { write(t, dir, "hulls/b/more.cue", "package b\n") }, map[string]bool{"hulls/a": true, "hulls/b": false}},
	{"a file in the hulls' parent", func(t *testing.T, dir string) { write(t, dir, "hulls/p.cue", "package b\n") }, map[string]bool{"hulls/a": false, "hulls/b": false}},
	{"a file at the module root", func(t *testing.T, dir string) { write(t, dir, "root.cue", "package a\n") }, map[string]bool{"hulls/a": false, "hulls/b": false}},
	{"the module file", func(t *testing.T, dir string) {
		write(t, dir, "cue.mod/module.cue", "module: \"q.example/yard\"\nlanguage: version: \"v0.14.0\"\n")
	}, map[string]bool{"hulls/a": false, "hulls/b": false}},
	{"a link in a hull's directory", func(t *testing.T, dir string) {
		if err := os.Symlink("../a/a.cue", filepath.Join(dir, "hulls/b/link.cue")); err != nil {
			t.Skip(err)
		}
	}, map[string]bool{"hulls/a": true, "hulls/b": false}},
}

func remove(t *testing.T, dir, rel string) {
	t.Helper()
	if err := os.Remove(filepath.Join(dir, filepath.FromSlash(rel))); err != nil {
		t.Fatal(err)
	}
}

// TestComparisonDirectories: between two directories, a hull is unchanged
// when the directories its files are read from hold the same .cue files,
// and changed by an edit to its own files, to what it imports, to a
// parent's files or to the module file.
func TestComparisonDirectories(t *testing.T) {
	for i, step := range comparisonSteps {
		t.Run(step.name, func(t *testing.T) {
			base, head := t.TempDir(), t.TempDir()
			for rel, s := range twoHulls {
				write(t, base, rel, s)
				write(t, head, rel, s)
			}
			step.change(t, head)
			cmp := newComparison(Side{Dir: base}, Side{Dir: head})
			defer cmp.close()
			for hull, want := range step.same {
				if got := cmp.unchanged(hull); got != want {
					t.Errorf("step %d: %s unchanged = %v, want %v", i, hull, got, want)
				}
			}
		})
	}
}

// TestComparisonRevision: a revision against its work tree, step by
// step: the same answers as between directories, the base's hulls listed
// as reading them all would list them, and no file read from git for a
// directory the work tree has not changed.
func TestComparisonRevision(t *testing.T) {
	dir := gitRepo(t, twoHulls)
	for i, step := range comparisonSteps {
		step.change(t, dir)
		rv, err := ReadRevision(dir, "HEAD")
		if err != nil {
			t.Fatal(err)
		}
		cmp := newComparison(Side{Rev: rv}, Side{Dir: dir})
		for hull, want := range step.same {
			if got := cmp.unchanged(hull); got != want {
				t.Errorf("step %d (%s): %s unchanged = %v, want %v", i, step.name, hull, got, want)
			}
		}
		head, err := Hulls(dir, nil)
		if err != nil {
			t.Fatal(err)
		}
		if walked, err := cmp.head.hulls(); err != nil || !reflect.DeepEqual(walked, head) {
			t.Errorf("step %d (%s): the comparison's walk finds hulls %v, %v; Hulls %v", i, step.name, walked, err, head)
		}
		got := cmp.baseHulls(head)
		read := len(rv.cache)
		want, err := hullsIn(rv.FS())
		if err != nil {
			t.Fatal(err)
		}
		if !reflect.DeepEqual(got, want) {
			t.Errorf("step %d (%s): base hulls %v, want %v", i, step.name, got, want)
		}
		if step.name == "nothing" && read != 0 {
			t.Errorf("an unchanged work tree read %d files from git", read)
		}
		cmp.close()
		rv.Close()
		commit(t, dir)
	}
}

// commit commits everything in the work tree.
func commit(t *testing.T, dir string) {
	t.Helper()
	for _, args := range [][]string{{"add", "-A"}, {"commit", "-q", "--allow-empty", "-m", "step"}} {
		cmd := exec.Command("git", append([]string{"-C", dir, "-c", "user.name=t", "-c", "user.email=t@example.invalid", "-c", "commit.gpgsign=false"}, args...)...)
		if out, err := cmd.CombinedOutput(); err != nil {
			t.Fatalf("git %v: %v\n%s", args, err, out)
		}
	}
}

// TestRevisionFS: a revision's files are read from git when opened, under
// the rules of the work tree: a link is followed to a .cue file of the
// module, and refused, with why, when it leads out, is absolute, loops or
// leads to no .cue file; a file over the size limit is refused unread.
func TestRevisionFS(t *testing.T) {
	dir := gitRepo(t, map[string]string{
		"cue.mod/module.cue": "module: \"r.example/yard\"\n",
		"hulls/a/a.cue":      "package a\nvessel: {}\n",
		"hulls/a/notes.txt":  "not CUE\n",
		"hulls/b/big.cue":    "package b\n" + strings.Repeat("// padding\n", 5<<20/11+1),
	})
	for link, target := range map[string]string{
		"hulls/b/in.cue":    "../a/a.cue",
		"hulls/b/out.cue":   "../../../outside.cue",
		"hulls/b/abs.cue":   "/etc/passwd",
		"hulls/b/loop1.cue": "loop2.cue",
		"hulls/b/loop2.cue": "loop1.cue",
		"hulls/b/nocue.cue": "../a/notes.txt",
		"hulls/b/tobig.cue": "big.cue",
	} {
		if err := os.Symlink(target, filepath.Join(dir, link)); err != nil {
			t.Skip(err)
		}
	}
	commit(t, dir)
	rv, err := ReadRevision(dir, "HEAD")
	if err != nil {
		t.Fatal(err)
	}
	defer rv.Close()
	fsys := rv.FS()
	if b, err := fs.ReadFile(fsys, "hulls/b/in.cue"); err != nil || string(b) != "package a\nvessel: {}\n" {
		t.Errorf("a link inside the module: %q, %v", b, err)
	}
	for name, want := range map[string]string{
		"hulls/b/out.cue":   "leads outside the module",
		"hulls/b/abs.cue":   "absolute target",
		"hulls/b/loop1.cue": "in a loop",
		"hulls/b/nocue.cue": "to no .cue file",
		"hulls/b/tobig.cue": "to no .cue file",
		"hulls/b/big.cue":   "more than the 4194304-byte limit",
	} {
		_, err := fs.ReadFile(fsys, name)
		if err == nil || !strings.Contains(err.Error(), want) || !strings.HasPrefix(err.Error(), rv.Label()+name+" ") {
			t.Errorf("%s: %v, want %q after the file's name", name, err, want)
		}
	}
	entries, err := fs.ReadDir(fsys, "hulls/a")
	if err != nil || len(entries) != 1 || entries[0].Name() != "a.cue" {
		t.Errorf("hulls/a lists %v, %v: want its one .cue file", entries, err)
	}
	if _, err := fs.ReadDir(fsys, "hulls/none"); !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("a directory not in the revision: %v", err)
	}
	hulls, err := hullsIn(fsys)
	if err != nil || !reflect.DeepEqual(hulls, []string{"hulls/a", "hulls/b"}) {
		t.Errorf("hulls %v, %v", hulls, err)
	}
	if len(rv.cache) > 8 {
		t.Errorf("%d objects read", len(rv.cache))
	}
}
