package compiler

import (
	"fmt"
	"path"
	"strconv"
	"strings"

	"cuelang.org/go/cue"
	"cuelang.org/go/cue/ast"
	"cuelang.org/go/cue/build"
	"cuelang.org/go/cue/token"
)

// refResolver explains references that do not resolve, such as a catalog
// part that does not exist, by finding the selector in the design's syntax
// and listing what the selected struct does have.
type refResolver struct {
	ctx  *cue.Context
	inst *build.Instance
	data cue.Value
	pkgs map[string]cue.Value // built imports by import path
}

// undefined words "undefined field: name" found at pos.
func (r *refResolver) undefined(pos token.Pos, name string) string {
	base, names, ok := r.selected(pos, name)
	if !ok {
		return fmt.Sprintf("undefined reference %q", name)
	}
	return fmt.Sprintf("unknown name %q in %s%s", name, base, suggest(name, names))
}

// selected finds the selector expression X.name at pos and returns X as
// written and the field names of the value X denotes.
func (r *refResolver) selected(pos token.Pos, name string) (string, []string, bool) {
	if r == nil || r.inst == nil {
		return "", nil, false
	}
	f, sel := r.findSelector(pos, name)
	if sel == nil {
		return "", nil, false
	}
	chain, ok := selectorChain(sel.X)
	if !ok || len(chain) == 0 {
		return "", nil, false
	}
	written := strings.Join(chain, ".")
	var v cue.Value
	if imp := importFor(f, chain[0]); imp != "" {
		pv, ok := r.pkg(imp)
		if !ok {
			return "", nil, false
		}
		v = pv.LookupPath(cue.MakePath(strSelectors(chain[1:])...))
	} else {
		v = r.data.LookupPath(cue.MakePath(strSelectors(chain)...))
	}
	if !v.Exists() {
		return "", nil, false
	}
	return written, fieldNames(v, ""), true
}

func (r *refResolver) findSelector(pos token.Pos, name string) (*ast.File, *ast.SelectorExpr) {
	for _, f := range r.allFiles() {
		if f.Filename != pos.Filename() {
			continue
		}
		var found *ast.SelectorExpr
		ast.Walk(f, func(n ast.Node) bool {
			if found != nil {
				return false
			}
			if s, ok := n.(*ast.SelectorExpr); ok {
				p := s.Sel.Pos()
				if p.Line() == pos.Line() && p.Column() == pos.Column() && labelName(s.Sel) == name {
					found = s
					return false
				}
			}
			return true
		}, nil)
		if found != nil {
			return f, found
		}
	}
	return nil, nil
}

// allFiles lists the syntax of the design and of its imports.
func (r *refResolver) allFiles() []*ast.File {
	var out []*ast.File
	seen := map[*build.Instance]bool{}
	var walk func(*build.Instance)
	walk = func(i *build.Instance) {
		if seen[i] {
			return
		}
		seen[i] = true
		out = append(out, i.Files...)
		for _, imp := range i.Imports {
			walk(imp)
		}
	}
	walk(r.inst)
	return out
}

// pkg builds the imported package with the given import path.
func (r *refResolver) pkg(importPath string) (cue.Value, bool) {
	if v, ok := r.pkgs[importPath]; ok {
		return v, true
	}
	var found *build.Instance
	seen := map[*build.Instance]bool{}
	var walk func(*build.Instance)
	walk = func(i *build.Instance) {
		if seen[i] || found != nil {
			return
		}
		seen[i] = true
		for _, imp := range i.Imports {
			if imp.ImportPath == importPath {
				found = imp
				return
			}
			walk(imp)
		}
	}
	walk(r.inst)
	if found == nil {
		return cue.Value{}, false
	}
	v := r.ctx.BuildInstance(found)
	if r.pkgs == nil {
		r.pkgs = map[string]cue.Value{}
	}
	r.pkgs[importPath] = v
	return v, true
}

// importFor returns the import path that ident names in f, or "".
func importFor(f *ast.File, ident string) string {
	for spec := range f.ImportSpecs() {
		p, err := strconv.Unquote(spec.Path.Value)
		if err != nil {
			continue
		}
		name := path.Base(p)
		if i := strings.IndexAny(name, ":@"); i >= 0 {
			name = name[:i]
		}
		if j := strings.LastIndex(p, ":"); j >= 0 {
			name = p[j+1:]
			p = p[:j]
		}
		if spec.Name != nil {
			name = spec.Name.Name
		}
		if name == ident {
			return p
		}
	}
	return ""
}

// selectorChain spells a.b.c as [a b c].
func selectorChain(x ast.Expr) ([]string, bool) {
	switch x := x.(type) {
	case *ast.Ident:
		return []string{x.Name}, true
	case *ast.SelectorExpr:
		head, ok := selectorChain(x.X)
		if !ok {
			return nil, false
		}
		return append(head, labelName(x.Sel)), true
	}
	return nil, false
}

func labelName(l ast.Label) string {
	name, _, err := ast.LabelName(l)
	if err != nil {
		return ""
	}
	return name
}

func strSelectors(names []string) []cue.Selector {
	out := make([]cue.Selector, len(names))
	for i, n := range names {
		out[i] = cue.Str(n)
	}
	return out
}

// literalAt reports whether a literal value (a string, number or boolean
// the design writes) starts at pos.
func (r *refResolver) literalAt(pos token.Pos) bool {
	if r == nil || r.inst == nil {
		return false
	}
	for _, f := range r.allFiles() {
		if f.Filename != pos.Filename() {
			continue
		}
		found := false
		ast.Walk(f, func(n ast.Node) bool {
			if found {
				return false
			}
			if lit, ok := n.(*ast.BasicLit); ok {
				p := lit.Pos()
				if p.Line() == pos.Line() && p.Column() == pos.Column() {
					found = true
				}
			}
			return true
		}, nil)
		return found
	}
	return false
}
