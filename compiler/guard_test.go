package compiler

import (
	"errors"
	"io/fs"
	"os"
	"path/filepath"
	"strings"
	"syscall"
	"testing"
)

// TestGuard: the guard reads regular files inside the module, links that
// stay inside included, and refuses the rest before reading it, naming
// the path inside the module and never the link's target.
func TestGuard(t *testing.T) {
	dir := t.TempDir()
	root := filepath.Join(dir, "module")
	write := func(rel, s string) {
		p := filepath.Join(dir, rel)
		if err := os.MkdirAll(filepath.Dir(p), 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(p, []byte(s), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	link := func(target, rel string) {
		if err := os.Symlink(target, filepath.Join(dir, rel)); err != nil {
			t.Skip(err)
		}
	}
	write("module/a.cue", "package a\n")
	write("module/big.cue", strings.Repeat("x", 2000))
	write("secret/s.cue", "SECRET")
	if err := os.MkdirAll(filepath.Join(root, "sub"), 0o755); err != nil {
		t.Fatal(err)
	}
	link("../a.cue", "module/sub/in.cue")
	link("../secret/s.cue", "module/out.cue")
	link(filepath.Join(dir, "secret/s.cue"), "module/abs.cue")
	link("../secret", "module/dir")
	link("/dev/zero", "module/zero.cue")
	link("nowhere.cue", "module/dangling.cue")
	fifo := syscall.Mkfifo(filepath.Join(root, "pipe.cue"), 0o644) == nil

	g, err := openGuard(root, Limits{MaxFile: 1000, MaxModule: 1100})
	if err != nil {
		t.Fatal(err)
	}
	for _, name := range []string{"a.cue", "sub/in.cue"} {
		if b, err := g.ReadFile(name); err != nil || string(b) != "package a\n" {
			t.Errorf("ReadFile(%s) = %q, %v; want the file", name, b, err)
		}
	}
	refusals := map[string]string{
		"out.cue":      "leads outside the module through a symbolic link",
		"abs.cue":      "leads outside the module through a symbolic link",
		"dir/s.cue":    "leads outside the module through a symbolic link",
		"zero.cue":     "leads outside the module through a symbolic link",
		"dangling.cue": "does not exist",
		"big.cue":      "is 2000 bytes, more than the 1000-byte limit",
		"../x.cue":     "invalid argument",
	}
	if fifo {
		refusals["pipe.cue"] = "is not a regular file"
	}
	for name, want := range refusals {
		b, err := g.ReadFile(name)
		if err == nil {
			t.Errorf("ReadFile(%s) = %q, want a refusal", name, b)
			continue
		}
		if !strings.Contains(err.Error(), want) {
			t.Errorf("ReadFile(%s): %v; want it to say %q", name, err, want)
		}
		if strings.Contains(err.Error(), "secret") || strings.Contains(err.Error(), "/dev/zero") {
			t.Errorf("ReadFile(%s): %v names the link's target", name, err)
		}
	}
	if _, err := g.ReadFile("dangling.cue"); !errors.Is(err, fs.ErrNotExist) {
		t.Errorf("a link to nothing: %v, want fs.ErrNotExist", err)
	}
	if _, err := g.ReadDir("dir"); err == nil || !strings.Contains(err.Error(), "leads outside") {
		t.Errorf("ReadDir(dir) = %v, want a refusal", err)
	}
	// The bytes read in all are bounded: a.cue twice more passes 1100.
	g2, _ := openGuard(root, Limits{MaxFile: 1000, MaxModule: 25})
	var last error
	for i := 0; i < 3; i++ {
		_, last = g2.ReadFile("a.cue")
	}
	if last == nil || !strings.Contains(last.Error(), "past the 25-byte limit for one design") {
		t.Errorf("the third read: %v, want the limit for one design", last)
	}
}

// TestGatherFollowsImports: gather reads the package's files, its parents'
// and what it imports, from the module and from cue.mod/pkg, and nothing
// else.
func TestGatherFollowsImports(t *testing.T) {
	src := &Source{Label: "m/", Files: map[string][]byte{
		"cue.mod/module.cue":                   []byte("module: \"g.example/m@v0\"\nlanguage: version: \"v0.13.0\"\n"),
		"top.cue":                              []byte("package h\n"),
		"hulls/h/h.cue":                        []byte("package h\nimport (\n\t\"g.example/m/parts\"\n\t\"vendor.example/lib:lib\"\n\t\"list\"\n)\n"),
		"hulls/other/o.cue":                    []byte("package other\n"),
		"parts/p.cue":                          []byte("package parts\n"),
		"parts/_skip.cue":                      []byte("package parts\n"),
		"cue.mod/pkg/vendor.example/lib/l.cue": []byte("package lib\n"),
	}}
	files, notUTF8, err := gather(src.FS(), "hulls/h", src.Label)
	if err != nil || len(notUTF8) > 0 {
		t.Fatal(err, notUTF8)
	}
	for _, want := range []string{"cue.mod/module.cue", "top.cue", "hulls/h/h.cue", "parts/p.cue", "cue.mod/pkg/vendor.example/lib/l.cue"} {
		if _, ok := files[want]; !ok {
			t.Errorf("gather left out %s", want)
		}
	}
	for _, not := range []string{"hulls/other/o.cue", "parts/_skip.cue"} {
		if _, ok := files[not]; ok {
			t.Errorf("gather read %s, which the hull does not use", not)
		}
	}
}
