package compiler

import (
	"path"
	"strconv"

	"cuelang.org/go/cue/ast"

	"github.com/ampwright/ampwright/schema"
)

// dropDesignEmbed removes a top-level embedding of the vendored #Design
// from f, and the schema's import when the file no longer refers to it.
func dropDesignEmbed(f *ast.File) {
	var spec *ast.ImportSpec
	name := ""
	for s := range f.ImportSpecs() {
		if p, err := strconv.Unquote(s.Path.Value); err == nil && p == schema.ImportPath {
			spec, name = s, path.Base(p)
			if s.Name != nil {
				name = s.Name.Name
			}
		}
	}
	if spec == nil {
		return
	}
	decls := f.Decls[:0]
	dropped := false
	for _, d := range f.Decls {
		if e, ok := d.(*ast.EmbedDecl); ok && isDesignRef(e.Expr, name) {
			dropped = true
			continue
		}
		decls = append(decls, d)
	}
	f.Decls = decls
	if !dropped || refersTo(f, name, spec) {
		return
	}
	// Nothing else uses the schema: drop its import, or CUE reports it
	// unused.
	out := f.Decls[:0]
	for _, d := range f.Decls {
		if id, ok := d.(*ast.ImportDecl); ok {
			specs := id.Specs[:0]
			for _, s := range id.Specs {
				if s != spec {
					specs = append(specs, s)
				}
			}
			id.Specs = specs
			if len(specs) == 0 {
				continue
			}
		}
		out = append(out, d)
	}
	f.Decls = out
}

func isDesignRef(x ast.Expr, name string) bool {
	sel, ok := x.(*ast.SelectorExpr)
	if !ok {
		return false
	}
	id, ok := sel.X.(*ast.Ident)
	return ok && id.Name == name && labelName(sel.Sel) == "#Design"
}

// refersTo reports whether f uses the identifier name outside the import
// spec itself.
func refersTo(f *ast.File, name string, spec *ast.ImportSpec) bool {
	found := false
	ast.Walk(f, func(n ast.Node) bool {
		if found || n == spec {
			return false
		}
		if _, ok := n.(*ast.ImportDecl); ok {
			return false
		}
		if id, ok := n.(*ast.Ident); ok && id.Name == name {
			found = true
		}
		return true
	}, nil)
	return found
}
