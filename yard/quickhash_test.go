package yard

import (
	"os"
	"path/filepath"
	"testing"
)

// TestQuickHash: the quick hash changes with a hull's own files and with
// what it imports, and with nothing else.
func TestQuickHash(t *testing.T) {
	dir := t.TempDir()
	write := func(rel, s string) {
		p := filepath.Join(dir, filepath.FromSlash(rel))
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, []byte(s), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	write("cue.mod/module.cue", "module: \"q.example/yard\"\nlanguage: version: \"v0.13.0\"\n")
	write("catalog/c.cue", "package catalog\nx: 1\n")
	write("other/o.cue", "package other\ny: 1\n")
	write("hulls/a/a.cue", "package a\nimport \"q.example/yard/catalog\"\nimport \"list\"\nv: catalog.x\nw: list.Sum([1])\n")
	write("hulls/b/b.cue", "package b\nv: 2\n")
	hash := func(hull string) string {
		h, err := newQuickHasher(Side{Dir: dir}).Hash(hull)
		if err != nil {
			t.Fatal(err)
		}
		return h
	}
	a0, b0 := hash("hulls/a"), hash("hulls/b")
	write("other/o.cue", "package other\ny: 2\n")
	if hash("hulls/a") != a0 || hash("hulls/b") != b0 {
		t.Error("a package neither hull imports changed their hashes")
	}
	write("catalog/c.cue", "package catalog\nx: 2\n")
	if hash("hulls/a") == a0 {
		t.Error("a change to the imported catalog left hull a's hash alone")
	}
	if hash("hulls/b") != b0 {
		t.Error("a change to the catalog changed hull b, which does not import it")
	}
	write("hulls/b/more.cue", "package b\n")
	if hash("hulls/b") == b0 {
		t.Error("a new file in hull b left its hash alone")
	}
}
