package main

import (
	"bytes"
	"io"
	"os"
	"path/filepath"
	"testing"

	// Only the test imports the compiler: yardgen itself stays on the
	// standard library (the import-flow test counts non-test imports).
	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/yard"
)

// TestGeneratedHullsCompile generates a small yard and compiles every hull:
// none may have an input error, and each is of the size the harness wants.
func TestGeneratedHullsCompile(t *testing.T) {
	out := filepath.Join(t.TempDir(), "yard")
	if err := runMain([]string{"-hulls", "3", "-from", "../../designs", "-out", out}, io.Discard); err != nil {
		t.Fatal(err)
	}
	for _, p := range []string{"cue.mod/module.cue", "cue.mod/pkg/ampwright.dev/schema/design.cue", "catalog/catalog.cue", "rulebook/rulebook.cue"} {
		if _, err := os.Stat(filepath.Join(out, p)); err != nil {
			t.Errorf("the yard lacks %s: %v", p, err)
		}
	}
	hulls, err := yard.Hulls(out, nil)
	if err != nil {
		t.Fatal(err)
	}
	if len(hulls) != 3 {
		t.Fatalf("found hulls %v, want 3", hulls)
	}
	for _, hl := range hulls {
		r, _, err := compiler.Compile(filepath.Join(out, filepath.FromSlash(hl)))
		if err != nil {
			t.Errorf("%s: input errors:\n%v", hl, err)
			continue
		}
		if n := len(r.Summary.Loads); n < 35 || n > 45 {
			t.Errorf("%s: %d loads, want about 40", hl, n)
		}
		if n := len(r.Summary.Circuits); n < 25 || n > 40 {
			t.Errorf("%s: %d conductor runs, want about 30", hl, n)
		}
		t.Logf("%s: %s, %d loads, %d runs, %d findings", hl, r.Verdict(), len(r.Summary.Loads), len(r.Summary.Circuits), len(r.Checks))
	}
}

// TestHullDeterministic checks that a hull depends on its index alone.
func TestHullDeterministic(t *testing.T) {
	if !bytes.Equal(Hull(7), Hull(7)) {
		t.Error("Hull(7) differs between two calls")
	}
	if bytes.Equal(Hull(7), Hull(8)) {
		t.Error("Hull(7) and Hull(8) are the same")
	}
	out := filepath.Join(t.TempDir(), "yard")
	if err := generate("../../designs", out, 2); err != nil {
		t.Fatal(err)
	}
	b, err := os.ReadFile(filepath.Join(out, "hulls", "hull0002", "hull.cue"))
	if err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(b, Hull(2)) {
		t.Error("hull0002 of a 2-hull yard differs from Hull(2)")
	}
}

// TestRefusesNonEmpty checks that yardgen never writes over a directory
// that holds something.
func TestRefusesNonEmpty(t *testing.T) {
	dir := t.TempDir()
	if err := os.WriteFile(filepath.Join(dir, "keep.txt"), []byte("x"), 0o644); err != nil {
		t.Fatal(err)
	}
	if err := generate("../../designs", dir, 1); err == nil {
		t.Error("generate wrote into a non-empty directory")
	}
	if err := runMain([]string{"-hulls", "3"}, io.Discard); err == nil {
		t.Error("no -out: want a usage error")
	}
}
