package compiler

import (
	"encoding/json"
	"os"
	"path/filepath"
	"testing"
)

// compileJSON is what Compile gives for a design, as JSON, or its errors.
func compileJSON(t *testing.T, compile func() (any, error)) string {
	t.Helper()
	v, err := compile()
	if err != nil {
		return "error: " + err.Error()
	}
	b, err := json.Marshal(v)
	if err != nil {
		t.Fatal(err)
	}
	return string(b)
}

// TestGatheredCompilesAsCompile: compiling from the gathered files gives
// what Compile gives, for good designs and for designs with input errors,
// and a Reader keys a design as Gather does.
func TestGatheredCompilesAsCompile(t *testing.T) {
	dirs, err := filepath.Glob("../designs/hulls/*")
	if err != nil {
		t.Fatal(err)
	}
	bad, _ := filepath.Glob("../testdata/designs/yard/hulls/*")
	dirs = append(dirs, bad...)
	if len(dirs) < 6 {
		t.Fatalf("found %d designs", len(dirs))
	}
	rd := NewReader()
	defer rd.Close()
	for _, dir := range dirs {
		t.Run(filepath.Base(dir), func(t *testing.T) {
			want := compileJSON(t, func() (any, error) { r, _, err := Compile(dir); return r, err })
			g, err := Gather(dir)
			if err != nil {
				t.Skipf("not gathered (%v): Compile reports it", err)
			}
			got := compileJSON(t, func() (any, error) { r, _, err := g.Compile(); return r, err })
			if got != want {
				t.Errorf("compiled from the gathered files:\n%.400s\nwant:\n%.400s", got, want)
			}
			g2, err := rd.Gather(dir)
			if err != nil {
				t.Fatal(err)
			}
			if g2.Key() != g.Key() {
				t.Errorf("a Reader keys %s as %s, Gather as %s", dir, g2.Key(), g.Key())
			}
		})
	}
}

// TestGatheredKey: the key changes with a file of the design, with one it
// imports, with a new file in its directory or a parent's, and with how it
// is named; not with a file it does not read.
func TestGatheredKey(t *testing.T) {
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
	write("cue.mod/module.cue", "module: \"k.example/yard\"\nlanguage: version: \"v0.13.0\"\n")
	write("catalog/c.cue", "package catalog\nx: 1\n")
	write("other/o.cue", "package other\ny: 1\n")
	write("hulls/a/a.cue", "package a\nimport \"k.example/yard/catalog\"\nv: catalog.x\n")
	hull := filepath.Join(dir, "hulls/a")
	key := func() string {
		t.Helper()
		g, err := Gather(hull)
		if err != nil {
			t.Fatal(err)
		}
		rd := NewReader()
		defer rd.Close()
		g2, err := rd.Gather(hull)
		if err != nil {
			t.Fatal(err)
		}
		if g2.Key() != g.Key() {
			t.Fatalf("a Reader keys it %s, Gather %s", g2.Key(), g.Key())
		}
		return g.Key()
	}
	k := key()
	for _, step := range []struct {
		name    string
		do      func()
		changes bool
	}{
		{"a package it does not import", func() { write("other/o.cue", "package other\ny: 2\n") }, false},
		{"a file outside the module's .cue files", func() { write("notes.txt", "x") }, false},
		{"the imported catalog", func() { write("catalog/c.cue", "package catalog\nx: 2\n") }, true},
		{"a new file in the catalog", func() { write("catalog/d.cue", "package catalog\n") }, true},
		{"its own file", func() { write("hulls/a/a.cue", "package a\nimport \"k.example/yard/catalog\"\nv: catalog.x + 1\n") }, true},
		{"a file in a parent directory", func() { write("hulls/p.cue", "package a\n") }, true},
		{"the module file", func() { write("cue.mod/module.cue", "module: \"k.example/yard\"\nlanguage: version: \"v0.14.0\"\n") }, true},
	} {
		step.do()
		next := key()
		if (next != k) != step.changes {
			t.Errorf("%s: key changed %v, want %v", step.name, next != k, step.changes)
		}
		k = next
	}
	// The same files named from elsewhere are another key: messages name
	// them differently.
	g, err := GatherFS(os.DirFS(dir), "hulls/a", "rev:")
	if err != nil {
		t.Fatal(err)
	}
	if g.Key() == k {
		t.Error("the same files under another label have the same key")
	}
}
