package compiler

import (
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// copyYard copies the example yard into a temporary directory, so that a
// test may write a hull into it.
func copyYard(t testing.TB) string {
	t.Helper()
	dir := filepath.Join(t.TempDir(), "yard")
	if err := os.CopyFS(dir, os.DirFS("../designs")); err != nil {
		t.Fatal(err)
	}
	return dir
}

// TestRewriteRoundTrip writes every example hull back, unchanged, as one
// file through Rewrite: it must load and give the same findings, figures
// and bill of materials, its parts referred to in the catalog.
func TestRewriteRoundTrip(t *testing.T) {
	yard := copyYard(t)
	for _, h := range []string{"dunnock", "marram", "brackenwell", "tystie", "sanderling"} {
		t.Run(h, func(t *testing.T) {
			src := filepath.Join(yard, "hulls", h)
			want, d, err := Compile(src)
			if err != nil {
				t.Fatal(err)
			}
			cat, ref, err := d.Catalog()
			if err != nil {
				t.Fatal(err)
			}
			if ref.Name != "catalog" || ref.ImportPath != "kittiwake.example/yard/catalog" {
				t.Errorf("catalog %+v, want catalog at kittiwake.example/yard/catalog", ref)
			}
			b, err := d.Rewrite(d.Spec, cat, ref, "written back by a test", nil)
			if err != nil {
				t.Fatal(err)
			}
			for _, s := range []string{"package " + h, "rules: rulebook.yard", "catalog.battery.", "// written back by a test"} {
				if !strings.Contains(string(b), s) {
					t.Errorf("the rewritten design lacks %q", s)
				}
			}
			out := filepath.Join(yard, "hulls", h+"-again")
			if err := os.MkdirAll(out, 0o755); err != nil {
				t.Fatal(err)
			}
			if err := os.WriteFile(filepath.Join(out, h+".cue"), b, 0o644); err != nil {
				t.Fatal(err)
			}
			got, _, err := Compile(out)
			if err != nil {
				t.Fatalf("the rewritten design does not load: %v\n%s", err, b)
			}
			if got.BOM.Total != want.BOM.Total {
				t.Errorf("bill of materials %v, want %v", got.BOM.Total, want.BOM.Total)
			}
			if len(got.Checks) != len(want.Checks) || len(got.Figures) != len(want.Figures) {
				t.Errorf("%d findings and %d figures, want %d and %d", len(got.Checks), len(got.Figures), len(want.Checks), len(want.Figures))
			}
			for i := range min(len(got.Checks), len(want.Checks)) {
				g, w := got.Checks[i], want.Checks[i]
				if g.ID != w.ID || g.Subject != w.Subject || g.Status != w.Status || g.Value != w.Value {
					t.Errorf("finding %d: %s %s %s %v, want %s %s %s %v", i, g.ID, g.Subject, g.Status, g.Value, w.ID, w.Subject, w.Status, w.Value)
				}
			}
		})
	}
}
