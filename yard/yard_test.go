package yard

import (
	"os"
	"os/exec"
	"path/filepath"
	"reflect"
	"testing"
)

// TestCompileAsksGitAlongside: Compile and CompileWithHistory ask git
// while the design compiles, about the files gathered for it; what they
// attach is what FactsOf and History say of the design's own input files,
// clean and after an edit to one of them, and an edit to another hull
// changes nothing.
func TestCompileAsksGitAlongside(t *testing.T) {
	if _, err := exec.LookPath("git"); err != nil {
		t.Skip("no git")
	}
	root := t.TempDir()
	if err := os.CopyFS(root, os.DirFS("../designs")); err != nil {
		t.Fatal(err)
	}
	for _, args := range [][]string{{"init", "-q"}, {"add", "."}, {"commit", "-q", "-m", "the example yard"}} {
		cmd := exec.Command("git", append([]string{"-C", root, "-c", "user.name=t", "-c", "user.email=t@example.invalid"}, args...)...)
		if out, err := cmd.CombinedOutput(); err != nil {
			t.Fatalf("git %v: %v\n%s", args, err, out)
		}
	}
	hull := filepath.Join(root, "hulls", "dunnock")
	check := func(state string, wantDirty bool) {
		t.Helper()
		r, d, h, err := CompileWithHistory(hull)
		if err != nil {
			t.Fatalf("%s: %v", state, err)
		}
		want := FactsOf(d.Root, d.Files, d.ReadInput)
		got := Facts{Revision: r.Design.Revision, Dirty: r.Design.Dirty, Time: r.Design.CommitTime}
		if got != want || want.Revision == "" || want.Dirty != wantDirty {
			t.Errorf("%s: facts %+v, FactsOf says %+v; want dirty %v", state, got, want, wantDirty)
		}
		if wantH := History(d.Root, d.Files); !reflect.DeepEqual(h, wantH) || len(h.Commits) != 1 {
			t.Errorf("%s: history %+v, History says %+v", state, h, wantH)
		}
		r2, _, err := Compile(hull)
		if err != nil || r2.Design.Revision != r.Design.Revision || r2.Design.Dirty != r.Design.Dirty {
			t.Errorf("%s: Compile gave %+v, %v; CompileWithHistory %+v", state, r2.Design, err, r.Design)
		}
		if c := Check(hull, nil); !c.OK() || c.Result.Design.Dirty != wantDirty || c.Result.Design.Revision != want.Revision {
			t.Errorf("%s: Check gave %+v", state, c)
		}
	}
	check("clean", false)
	other := filepath.Join(root, "hulls", "marram", "marram.cue")
	b, err := os.ReadFile(other)
	if err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(other, append(b, "\n// an edit to another hull\n"...), 0o644); err != nil {
		t.Fatal(err)
	}
	check("another hull edited", false)
	own := filepath.Join(hull, "dunnock.cue")
	if b, err = os.ReadFile(own); err != nil {
		t.Fatal(err)
	}
	if err := os.WriteFile(own, append(b, "\n// an edit to this hull\n"...), 0o644); err != nil {
		t.Fatal(err)
	}
	check("this hull edited", true)
}
