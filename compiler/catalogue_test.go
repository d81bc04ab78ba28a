package compiler

import (
	"go/ast"
	"go/parser"
	"go/token"
	"path/filepath"
	"strconv"
	"strings"
	"testing"

	"github.com/ampwright/ampwright/checks"
)

// idConstants reads the check and figure ID constants of result/ids.go:
// constant name → ID.
func idConstants(t *testing.T) map[string]string {
	t.Helper()
	f, err := parser.ParseFile(token.NewFileSet(), "../result/ids.go", nil, 0)
	if err != nil {
		t.Fatal(err)
	}
	out := map[string]string{}
	for _, d := range f.Decls {
		g, ok := d.(*ast.GenDecl)
		if !ok || g.Tok != token.CONST {
			continue
		}
		for _, s := range g.Specs {
			vs := s.(*ast.ValueSpec)
			for i, n := range vs.Names {
				if lit, ok := vs.Values[i].(*ast.BasicLit); ok {
					v, _ := strconv.Unquote(lit.Value)
					out[n.Name] = v
				}
			}
		}
	}
	return out
}

// viewReferences lists the ID constants that the views and the yard-level
// code look up, by constant name, with where.
func viewReferences(t *testing.T, consts map[string]string) map[string]string {
	t.Helper()
	refs := map[string]string{}
	for _, dir := range []string{"../report", "../result", "../yard", "../cmd/ampwright", "."} {
		files, err := filepath.Glob(filepath.Join(dir, "*.go"))
		if err != nil {
			t.Fatal(err)
		}
		for _, name := range files {
			if strings.HasSuffix(name, "_test.go") || strings.HasSuffix(name, "ids.go") {
				continue
			}
			fset := token.NewFileSet()
			f, err := parser.ParseFile(fset, name, nil, 0)
			if err != nil {
				t.Fatal(err)
			}
			ast.Inspect(f, func(n ast.Node) bool {
				var id string
				switch x := n.(type) {
				case *ast.SelectorExpr:
					if pkg, ok := x.X.(*ast.Ident); ok && pkg.Name == "result" {
						id = x.Sel.Name
					}
				case *ast.Ident:
					if f.Name.Name == "result" {
						id = x.Name
					}
				}
				if _, ok := consts[id]; ok {
					refs[id] = fset.Position(n.Pos()).String()
				}
				return true
			})
		}
	}
	return refs
}

// TestIDCatalogue: every check and figure ID is a constant of result and
// has its entry in the catalogue `ampwright explain` prints; every ID a
// compile of the example yard emits is in the catalogue; and every ID a
// view looks up is emitted by some example, so that renaming a figure
// cannot leave a table of the pack blank.
func TestIDCatalogue(t *testing.T) {
	if err := checks.ValidateFigures(checks.Figures); err != nil {
		t.Fatal(err)
	}
	consts := idConstants(t)
	known := map[string]bool{}
	for _, c := range checks.All {
		known[string(c.ID)] = true
	}
	for _, f := range checks.Figures {
		known[string(f.ID)] = true
	}
	values := map[string]bool{}
	for name, v := range consts {
		values[v] = true
		if !known[v] {
			t.Errorf("result.%s = %q is neither a check of checks.All nor a figure of checks.Figures", name, v)
		}
	}
	for v := range known {
		if !values[v] {
			t.Errorf("%q is catalogued but not a constant of result/ids.go", v)
		}
	}

	toRoot(t)
	emitted := map[string]bool{}
	for _, h := range exampleHulls(t) {
		r, _, err := Compile("designs/hulls/" + h)
		if err != nil {
			t.Fatalf("Compile(%s): %v", h, err)
		}
		for _, f := range r.Figures {
			emitted[string(f.ID)] = true
			if _, ok := checks.LookupFigure(string(f.ID)); !ok {
				t.Errorf("%s emits figure %q, which the catalogue lacks", h, f.ID)
			}
		}
		for _, f := range r.Checks {
			emitted[string(f.ID)] = true
			if _, ok := checks.Lookup(string(f.ID)); !ok {
				t.Errorf("%s emits finding %q of no check in checks.All", h, f.ID)
			}
		}
	}
	t.Chdir("compiler")
	for name, where := range viewReferences(t, consts) {
		if !emitted[consts[name]] {
			t.Errorf("%s looks up result.%s (%q), which no example hull emits", where, name, consts[name])
		}
	}
}
