package compiler

import (
	"path/filepath"

	"cuelang.org/go/cue"
	"cuelang.org/go/cue/ast"
	"cuelang.org/go/cue/literal"
	"cuelang.org/go/cue/token"
)

// entryGroups are the collections whose named entries a finding or an
// error can point at; negativeGroups are those under negative; topEntries
// the single entries at the top of a design.
var (
	entryGroups    = []string{"scenarios", "loads", "inverters", "arrays", "controllers", "chargers", "buses", "wiring", "banks", "links", "converters"}
	negativeGroups = []string{"buses", "shunts", "wiring"}
	topEntries     = []string{"vessel", "site", "bank", "voyage", "autonomy", "negative"}
)

// entryPositions records where the design declares each named entry.
//
// An entry written as a struct in the hull's own files is placed at the
// first field written in it there, read from the files' syntax: no value
// is evaluated for it. Any other entry (one built by a comprehension, or
// taken whole from an import) is found through the evaluated design, as
// validator.entryPos finds it.
func entryPositions(c *validator, files []*ast.File) map[string]token.Pos {
	written := writtenEntries(files, c.home)
	out := map[string]token.Pos{}
	place := func(p cue.Path) {
		k := p.String()
		if pos, ok := written[k]; ok {
			out[k] = pos
			return
		}
		out[k] = c.entryPos(p)
	}
	for _, group := range entryGroups {
		for _, name := range c.keys(group) {
			place(cue.MakePath(cue.Str(group), cue.Str(name)))
		}
	}
	for _, group := range negativeGroups {
		base := cue.MakePath(cue.Str("negative"), cue.Str(group))
		for _, name := range c.keysAt(base) {
			place(appendPath(base, name))
		}
	}
	for _, top := range topEntries {
		p := cue.MakePath(cue.Str(top))
		if !c.root.LookupPath(p).Exists() {
			continue
		}
		place(p)
	}
	return out
}

// writtenEntries finds, in the files of the hull's own package directory,
// the first field written inside each entry (by CUE path: loads.fridge,
// negative.wiring.x, vessel). Only struct literals are followed, through
// a: b: c shorthand and the struct operands of &; a value reached any
// other way is left to the evaluated design.
func writtenEntries(files []*ast.File, home string) map[string]token.Pos {
	out := map[string]token.Pos{}
	note := func(k string, p token.Pos) {
		if have, ok := out[k]; !ok || comparePos(p, have) < 0 {
			out[k] = p
		}
	}
	var visit func(prefix []string, x ast.Expr)
	visit = func(prefix []string, x ast.Expr) {
		for _, s := range structsOf(x) {
			for _, d := range s.Elts {
				f, ok := d.(*ast.Field)
				if !ok {
					continue
				}
				name, ok := fieldName(f.Label)
				if !ok {
					continue
				}
				if isEntry(prefix) {
					note(cue.MakePath(strSelectors(prefix)...).String(), f.Label.Pos())
				}
				if len(prefix) < 3 {
					visit(append(prefix[:len(prefix):len(prefix)], name), f.Value)
				}
			}
		}
	}
	for _, f := range files {
		if home == "" || filepath.Dir(f.Filename) != home {
			continue
		}
		visit(nil, &ast.StructLit{Elts: f.Decls})
	}
	return out
}

// isEntry reports whether a CUE path, as label names, is an entry.
func isEntry(p []string) bool {
	switch len(p) {
	case 1:
		return contains(topEntries, p[0])
	case 2:
		return contains(entryGroups, p[0])
	case 3:
		return p[0] == "negative" && contains(negativeGroups, p[1])
	}
	return false
}

// structsOf returns the struct literals x is made of: x itself, or the
// struct operands of a unification.
func structsOf(x ast.Expr) []*ast.StructLit {
	switch x := x.(type) {
	case *ast.StructLit:
		return []*ast.StructLit{x}
	case *ast.BinaryExpr:
		if x.Op == token.AND {
			return append(structsOf(x.X), structsOf(x.Y)...)
		}
	case *ast.ParenExpr:
		return structsOf(x.X)
	}
	return nil
}

// fieldName is the name of a regular field's label: an identifier or a
// quoted string; not a definition, a hidden field, a pattern or an
// interpolation.
func fieldName(l ast.Label) (string, bool) {
	switch l := l.(type) {
	case *ast.Ident:
		if n := l.Name; n != "" && n[0] != '#' && n[0] != '_' {
			return n, true
		}
	case *ast.BasicLit:
		if l.Kind == token.STRING {
			if s, err := literal.Unquote(l.Value); err == nil {
				return s, true
			}
		}
	}
	return "", false
}
