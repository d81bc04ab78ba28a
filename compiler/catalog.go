package compiler

import (
	"encoding/json"
	"fmt"
	"path"
	"sort"
	"strconv"

	"cuelang.org/go/cue"
	"cuelang.org/go/cue/ast"
	"cuelang.org/go/cue/build"
	"cuelang.org/go/cue/literal"
	"cuelang.org/go/cue/token"

	"github.com/ampwright/ampwright/schema"
)

// CatalogRef names the catalog package a hull imports: its import path and
// the name the hull's files refer to it by.
type CatalogRef struct {
	ImportPath string
	Name       string
}

// Catalog decodes the whole yard catalog the design imports: the imported
// package (directly, else through another import) that embeds the schema's
// #Catalog. The decoded design holds only the parts it uses; a proposal
// chooses among all of them. The catalog comes from the packages the
// design's own load read, so it is read from the same module, offline and
// within the same bounds, and nothing is loaded twice. Its quantities are
// checked against their limits as a design's are; an error is positioned
// in the catalog's files.
func (d *Design) Catalog() (*schema.Catalog, CatalogRef, error) {
	if d.inst == nil {
		return nil, CatalogRef{}, fmt.Errorf("design %s was not loaded from CUE: it has no catalog", d.Dir)
	}
	imp := findCatalog(d.inst)
	if imp == nil {
		return nil, CatalogRef{}, ErrorList{{Msg: fmt.Sprintf("design %s imports no catalog: no package it imports embeds %s.#Catalog", d.Dir, path.Base(schema.ImportPath))}}
	}
	ref := CatalogRef{ImportPath: imp.ImportPath, Name: imp.PkgName}
	if n := importName(d.inst, imp.ImportPath); n != "" {
		ref.Name = n
	}
	if d.ec == nil {
		return nil, ref, fmt.Errorf("internal error: design %s was released before its catalog was read", d.Dir)
	}
	ctx := d.ec.ctx
	data := ctx.BuildInstance(imp)
	if err := data.Err(); err != nil {
		return nil, ref, loadErrors(err)
	}
	unified := data.Unify(d.ec.schema.LookupPath(cue.ParsePath("#Catalog")))
	// No shapes: they are #Design's (validator.design left unset).
	v := &validator{root: unified, data: data, home: imp.Dir, refs: &refResolver{ctx: ctx, inst: imp, data: data}}
	v.run()
	if err := v.errs.Err(); err != nil {
		return nil, ref, err
	}
	b, err := v.out.bytes()
	var cat schema.Catalog
	if err == nil {
		err = json.Unmarshal(b, &cat)
	}
	if err != nil {
		return nil, ref, loadErrors(err)
	}
	return &cat, ref, nil
}

// findCatalog returns the package inst imports, directly first, that
// embeds #Catalog from the schema; ties go to the import path that sorts
// first, so the same yard always gives the same catalog.
func findCatalog(inst *build.Instance) *build.Instance {
	seen := map[string]bool{}
	level := []*build.Instance{inst}
	for len(level) > 0 {
		var next []*build.Instance
		for _, i := range level {
			imps := append([]*build.Instance(nil), i.Imports...)
			sort.Slice(imps, func(a, b int) bool { return imps[a].ImportPath < imps[b].ImportPath })
			for _, imp := range imps {
				if seen[imp.ImportPath] || imp.ImportPath == schema.ImportPath {
					continue
				}
				seen[imp.ImportPath] = true
				if embedsCatalog(imp) {
					return imp
				}
				next = append(next, imp)
			}
		}
		level = next
	}
	return nil
}

// embedsCatalog reports whether a file of the package embeds
// <schema>.#Catalog at its top level.
func embedsCatalog(inst *build.Instance) bool {
	for _, f := range inst.Files {
		names := map[string]bool{}
		for s := range f.ImportSpecs() {
			p, err := strconv.Unquote(s.Path.Value)
			if err != nil || p != schema.ImportPath {
				continue
			}
			if s.Name != nil {
				names[s.Name.Name] = true
			} else {
				names[path.Base(p)] = true
			}
		}
		for _, decl := range f.Decls {
			e, ok := decl.(*ast.EmbedDecl)
			if !ok {
				continue
			}
			sel, ok := e.Expr.(*ast.SelectorExpr)
			if !ok {
				continue
			}
			x, ok := sel.X.(*ast.Ident)
			if n, _, _ := ast.LabelName(sel.Sel); ok && names[x.Name] && n == "#Catalog" {
				return true
			}
		}
	}
	return false
}

// importName is the name the hull's files give the import of p, or ""
// when they do not import it (or give it different names).
func importName(inst *build.Instance, p string) string {
	name := ""
	for _, f := range inst.Files {
		for s := range f.ImportSpecs() {
			q, err := strconv.Unquote(s.Path.Value)
			if err != nil || q != p {
				continue
			}
			n := path.Base(q)
			if s.Name != nil {
				n = s.Name.Name
			}
			if name != "" && name != n {
				return ""
			}
			name = n
		}
	}
	return name
}

// catalogCurrency is the currency of the catalog the design imports (see
// findCatalog), or "" when it imports none or the catalog gives none. A
// catalog writes its currency as a string: it is read from the syntax,
// since evaluating the whole catalog as a value of its own would cost a
// tenth of a check; a currency the catalog computes is evaluated.
func catalogCurrency(ctx *cue.Context, inst *build.Instance) string {
	imp := findCatalog(inst)
	if imp == nil {
		return ""
	}
	for _, f := range imp.Files {
		for _, decl := range f.Decls {
			fd, ok := decl.(*ast.Field)
			if !ok {
				continue
			}
			if name, ok := fieldName(fd.Label); !ok || name != "currency" {
				continue
			}
			if lit, ok := fd.Value.(*ast.BasicLit); ok && lit.Kind == token.STRING {
				if s, err := literal.Unquote(lit.Value); err == nil {
					return s
				}
			}
			s, err := ctx.BuildInstance(imp).LookupPath(cue.MakePath(cue.Str("currency"))).String()
			if err != nil {
				return ""
			}
			return s
		}
	}
	return ""
}
