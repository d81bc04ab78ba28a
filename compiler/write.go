package compiler

import (
	"bytes"
	"encoding/json"
	"fmt"
	"path"
	"path/filepath"
	"regexp"
	"slices"
	"sort"
	"strconv"
	"strings"

	"cuelang.org/go/cue"
	"cuelang.org/go/cue/ast"
	"cuelang.org/go/cue/format"
	"cuelang.org/go/cue/parser"

	"github.com/ampwright/ampwright/schema"
)

// RewrittenGroups are the top-level fields of a design that Rewrite writes
// from the new design; every other top-level declaration of the hull's
// files is kept as the designer wrote it.
var RewrittenGroups = []string{"bank", "banks", "links", "arrays", "controllers", "buses", "negative", "wiring"}

// Rewrite returns the hull's package as one CUE file with the groups of
// RewrittenGroups written from spec: the hull's own files are merged, their
// other declarations (vessel, site, loads, rules …) kept with their
// comments, and the rewritten groups refer to catalog parts by their CUE
// paths (catalog.battery."tern-agm105"; a fitted device as
// catalog.protection.mrbf100 & {distance: "0 mm"}). notes are comments
// put above entries, by CUE path (bank, wiring."bank-switch"); header is
// put at the top of the file. The file is formatted as `cue fmt` does.
func (d *Design) Rewrite(spec *schema.Design, cat *schema.Catalog, ref CatalogRef, header string, notes map[string]string) ([]byte, error) {
	if d.inst == nil || d.read == nil {
		return nil, fmt.Errorf("design %s was not loaded from CUE files", d.Dir)
	}
	ctx := d.value.Context()
	sch, err := schema.Build(ctx)
	if err != nil {
		return nil, fmt.Errorf("internal error: the embedded schema does not compile: %v", err)
	}
	var own []string
	for _, f := range d.inst.BuildFiles {
		own = append(own, f.Filename)
	}
	sort.Strings(own)
	skip := map[string]bool{}
	for _, g := range RewrittenGroups {
		skip[g] = true
	}
	type imp struct{ name, path string }
	var imports []imp
	haveImport := map[string]bool{}
	var lead, kept bytes.Buffer
	docs := map[string]string{} // the designer's comments in the rewritten groups, by path
	for i, name := range own {
		src, err := d.read(name)
		if err != nil {
			return nil, err
		}
		f, err := parser.ParseFile(name, src, parser.ParseComments)
		if err != nil {
			return nil, err
		}
		pos := 0 // where the next declaration's text begins
		for _, decl := range f.Decls {
			start, end := decl.Pos().Offset(), lineEnd(src, decl.End().Offset())
			switch x := decl.(type) {
			case *ast.Package:
				if i == 0 {
					lead.Write(src[:start])
				}
				pos = end
				continue
			case *ast.ImportDecl:
				for _, s := range x.Specs {
					p, _ := strconv.Unquote(s.Path.Value)
					n := path.Base(p)
					if s.Name != nil {
						n = s.Name.Name
					}
					if !haveImport[p] {
						haveImport[p] = true
						imports = append(imports, imp{n, p})
					}
				}
				pos = end
				continue
			case *ast.Field:
				if l, _, _ := ast.LabelName(x.Label); skip[l] {
					docComments(docs, label(l), x)
					pos = end
					continue
				}
			}
			kept.WriteString("\n")
			kept.Write(bytes.TrimLeft(src[pos:end], "\n"))
			kept.WriteString("\n")
			pos = end
		}
		if rest := bytes.TrimSpace(src[pos:]); len(rest) > 0 {
			kept.WriteString("\n")
			kept.Write(rest)
			kept.WriteString("\n")
		}
	}
	if !haveImport[ref.ImportPath] && ref.ImportPath != "" {
		imports = append(imports, imp{ref.Name, ref.ImportPath})
	}

	// Notes by path as this file spells paths: labels quoted alike.
	spelt := map[string]string{}
	for k, v := range notes {
		parts := splitPath(k)
		for i, p := range parts {
			parts[i] = label(p)
		}
		spelt[strings.Join(parts, ".")] = v
	}
	e := &emitter{sch: sch, cat: cat, ref: ref, notes: spelt, docs: docs}
	var groups bytes.Buffer
	raw, err := json.Marshal(spec)
	if err != nil {
		return nil, err
	}
	fields, err := orderedObject(raw)
	if err != nil {
		return nil, err
	}
	design := sch.LookupPath(schema.DesignPath)
	for _, g := range RewrittenGroups {
		for _, kv := range fields {
			if kv.key != g {
				continue
			}
			groups.WriteString("\n")
			e.note(&groups, g)
			groups.WriteString(label(g) + ": ")
			if err := e.value(&groups, fieldDef(design, g), g, kv.raw); err != nil {
				return nil, err
			}
			groups.WriteString("\n")
		}
	}

	var out bytes.Buffer
	if header != "" {
		writeComment(&out, header, "")
		if lead.Len() > 0 {
			out.WriteString("//\n")
		}
	}
	out.Write(bytes.TrimLeft(lead.Bytes(), "\n"))
	fmt.Fprintf(&out, "package %s\n", d.inst.PkgName)
	body := kept.String() + groups.String()
	used := usedNames(body)
	var specs []string
	for _, im := range imports {
		if !used[im.name] {
			continue
		}
		if path.Base(im.path) == im.name {
			specs = append(specs, strconv.Quote(im.path))
		} else {
			specs = append(specs, im.name+" "+strconv.Quote(im.path))
		}
	}
	if len(specs) > 0 {
		out.WriteString("\nimport (\n")
		for _, s := range specs {
			out.WriteString("\t" + s + "\n")
		}
		out.WriteString(")\n")
	}
	out.WriteString(body)
	b, err := format.Source(out.Bytes(), format.Simplify())
	if err != nil {
		return nil, fmt.Errorf("internal error: the rewritten design does not parse: %v", err)
	}
	return b, nil
}

// lineEnd extends the end of a declaration over a comment on its own line.
func lineEnd(src []byte, end int) int {
	i := end
	for i < len(src) && (src[i] == ' ' || src[i] == '\t' || src[i] == ',') {
		i++
	}
	if bytes.HasPrefix(src[i:], []byte("//")) {
		for i < len(src) && src[i] != '\n' {
			i++
		}
		return i
	}
	return end
}

// usedNames are the identifiers a CUE body refers to as X in X.y, found
// by parsing it: an import is kept only where it is used.
func usedNames(body string) map[string]bool {
	used := map[string]bool{}
	f, err := parser.ParseFile("body.cue", body)
	if err != nil {
		// Keep every import: the formatter reports the error.
		return map[string]bool{"": true}
	}
	ast.Walk(f, func(n ast.Node) bool {
		if s, ok := n.(*ast.SelectorExpr); ok {
			if x, ok := s.X.(*ast.Ident); ok {
				used[x.Name] = true
			}
		}
		return true
	}, nil)
	return used
}

// emitter writes decoded design values as CUE, catalog parts as
// references, leaving out fields at their schema default.
type emitter struct {
	sch   cue.Value
	cat   *schema.Catalog
	ref   CatalogRef
	notes map[string]string
	// docs are the designer's own comments on the entries, kept above
	// them: why a run goes where it goes is still true of the proposal.
	docs map[string]string
}

func (e *emitter) note(b *bytes.Buffer, p string) {
	if d := e.docs[p]; d != "" {
		for _, l := range strings.Split(strings.TrimRight(d, "\n"), "\n") {
			b.WriteString(strings.TrimRight("// "+l, " ") + "\n")
		}
	}
	if n := e.notes[p]; n != "" {
		writeComment(b, n, "  ")
	}
}

// docComments records the comments written above field f, at path, and
// above every field in its struct values, by path.
func docComments(docs map[string]string, path string, f *ast.Field) {
	for _, cg := range ast.Comments(f) {
		if cg.Position == 0 && !cg.Line {
			if t := strings.TrimSpace(cg.Text()); t != "" {
				docs[path] = t
			}
		}
	}
	st, ok := f.Value.(*ast.StructLit)
	if !ok {
		return
	}
	for _, el := range st.Elts {
		if sub, ok := el.(*ast.Field); ok {
			if n, _, _ := ast.LabelName(sub.Label); n != "" {
				docComments(docs, path+"."+label(n), sub)
			}
		}
	}
}

// commentWidth is where comment lines are wrapped.
const commentWidth = 76

// writeComment writes text as // lines, each of its lines wrapped at
// commentWidth, the continuation lines indented by indent.
func writeComment(b *bytes.Buffer, text, indent string) {
	for _, l := range strings.Split(strings.TrimRight(text, "\n"), "\n") {
		line := ""
		for _, w := range strings.Fields(l) {
			if line != "" && len(line)+1+len(w) > commentWidth {
				b.WriteString("// " + line + "\n")
				line = indent
			}
			if line == "" || line == indent {
				line += w
			} else {
				line += " " + w
			}
		}
		b.WriteString(strings.TrimRight("// "+line, " ") + "\n")
	}
}

// partKinds maps the CUE path pattern of a part field ("*" for any name)
// to its catalog kind.
var partKinds = map[string]string{
	"bank.battery":                 "battery",
	"banks.*.battery":              "battery",
	"arrays.*.module":              "module",
	"arrays.*.stringFuse":          "protection",
	"controllers.*.part":           "controller",
	"links.*.part":                 "link",
	"buses.*.part":                 "busbar",
	"negative.buses.*.part":        "busbar",
	"negative.shunts.*.part":       "shunt",
	"wiring.*.protection":          "protection",
	"wiring.*.cable":               "cable",
	"negative.wiring.*.protection": "protection",
	"negative.wiring.*.cable":      "cable",
}

// fitted are the fields a design adds to a catalog protection device.
var fitted = []string{"distance", "sheathed"}

// value writes one value at CUE path p, whose schema is def.
func (e *emitter) value(b *bytes.Buffer, def cue.Value, p string, raw json.RawMessage) error {
	if kind, ok := partKinds[pattern(p)]; ok {
		if ref, extra, ok := e.catalogRef(kind, raw); ok {
			b.WriteString(ref)
			if len(extra) > 0 {
				b.WriteString(" & {")
				for i, kv := range extra {
					if i > 0 {
						b.WriteString(", ")
					}
					b.WriteString(label(kv.key) + ": " + string(kv.raw))
				}
				b.WriteString("}")
			}
			return nil
		}
	}
	switch trimmed := bytes.TrimSpace(raw); {
	case len(trimmed) > 0 && trimmed[0] == '{':
		fields, err := orderedObject(raw)
		if err != nil {
			return err
		}
		b.WriteString("{\n")
		for _, kv := range fields {
			fd := fieldDef(def, kv.key)
			if isDefault(fd, kv.raw) {
				continue
			}
			sub := p + "." + label(kv.key)
			e.note(b, sub)
			b.WriteString(label(kv.key) + ": ")
			if err := e.value(b, fd, sub, kv.raw); err != nil {
				return err
			}
			b.WriteString("\n")
		}
		b.WriteString("}")
	default:
		b.Write(cueJSON(trimmed))
	}
	return nil
}

// catalogRef is the reference to the catalog part raw is, and the fitted
// fields to add to it, when the catalog has a part of that id equal to it.
func (e *emitter) catalogRef(kind string, raw json.RawMessage) (string, []keyValue, bool) {
	if e.cat == nil || e.ref.Name == "" {
		return "", nil, false
	}
	fields, err := orderedObject(raw)
	if err != nil {
		return "", nil, false
	}
	var id string
	var extra []keyValue
	var plain []keyValue
	for _, kv := range fields {
		switch {
		case kv.key == "id":
			_ = json.Unmarshal(kv.raw, &id)
		case kind == "protection" && slices.Contains(fitted, kv.key):
			if kv.key == "sheathed" && string(kv.raw) == "false" {
				continue
			}
			extra = append(extra, kv)
			continue
		}
		plain = append(plain, kv)
	}
	part, ok := catalogPart(e.cat, kind, id)
	if !ok {
		return "", nil, false
	}
	b, err := json.Marshal(part)
	if err != nil {
		return "", nil, false
	}
	all, err := orderedObject(b)
	if err != nil {
		return "", nil, false
	}
	var want []keyValue
	for _, kv := range all {
		if kind != "protection" || !slices.Contains(fitted, kv.key) {
			want = append(want, kv)
		}
	}
	if !sameJSON(objectOf(plain), objectOf(want)) {
		return "", nil, false
	}
	return e.ref.Name + "." + kind + "." + label(id), extra, true
}

// catalogPart returns the catalog's part of a kind by id, with the fields
// of a fitted device at their zero values.
func catalogPart(cat *schema.Catalog, kind, id string) (any, bool) {
	var v any
	var ok bool
	switch kind {
	case "battery":
		v, ok = cat.Battery[id]
	case "module":
		v, ok = cat.Module[id]
	case "controller":
		v, ok = cat.Controller[id]
	case "inverter":
		v, ok = cat.Inverter[id]
	case "protection":
		v, ok = cat.Protection[id]
	case "cable":
		v, ok = cat.Cable[id]
	case "busbar":
		v, ok = cat.Busbar[id]
	case "terminal":
		v, ok = cat.Terminal[id]
	case "charger":
		v, ok = cat.Charger[id]
	case "link":
		v, ok = cat.Link[id]
	case "converter":
		v, ok = cat.Converter[id]
	case "shunt":
		v, ok = cat.Shunt[id]
	}
	return v, ok
}

// sameJSON reports whether two JSON texts hold the same value.
func sameJSON(a, b []byte) bool {
	var x, y any
	if json.Unmarshal(a, &x) != nil || json.Unmarshal(b, &y) != nil {
		return false
	}
	ja, _ := json.Marshal(x)
	jb, _ := json.Marshal(y)
	return bytes.Equal(ja, jb)
}

// fieldDef is the schema of field key of a struct def: its own field, else
// the pattern every name takes.
func fieldDef(def cue.Value, key string) cue.Value {
	if !def.Exists() {
		return def
	}
	if v := def.LookupPath(cue.MakePath(cue.Str(key))); v.Exists() {
		return v
	}
	for _, sel := range []cue.Selector{cue.Str(key).Optional(), cue.Str(key).Required()} {
		if v := def.LookupPath(cue.MakePath(sel)); v.Exists() {
			return v
		}
	}
	// A name the struct's pattern takes ([#Name]: #Conductor): the field
	// exists once the name is given.
	probe := def.Context().CompileString(label(key) + ": _")
	return def.Unify(probe).LookupPath(cue.MakePath(cue.Str(key)))
}

// isDefault reports whether raw is the default the schema gives the field.
func isDefault(def cue.Value, raw json.RawMessage) bool {
	if !def.Exists() {
		return false
	}
	d, ok := def.Default()
	if !ok || d.Validate(cue.Concrete(true)) != nil {
		return false
	}
	if k := d.IncompleteKind(); k&(cue.StructKind|cue.ListKind) != 0 {
		return false
	}
	b, err := d.MarshalJSON()
	return err == nil && sameJSON(b, raw)
}

// pattern is a CUE path with the names of entries replaced by "*":
// wiring."bank-main".cable → wiring.*.cable.
func pattern(p string) string {
	parts := splitPath(p)
	groups := map[string]bool{"banks": true, "arrays": true, "controllers": true, "links": true, "buses": true, "wiring": true, "shunts": true}
	for i := 1; i < len(parts); i++ {
		if groups[parts[i-1]] && !(i == 1 && parts[0] == "negative") {
			parts[i] = "*"
		}
	}
	return strings.Join(parts, ".")
}

// splitPath splits a CUE path written by label into its labels, unquoted.
func splitPath(p string) []string {
	var out []string
	for p != "" {
		if p[0] == '"' {
			s, err := strconv.QuotedPrefix(p)
			if err != nil {
				return append(out, p)
			}
			u, _ := strconv.Unquote(s)
			out = append(out, u)
			p = strings.TrimPrefix(p[len(s):], ".")
			continue
		}
		i := strings.IndexByte(p, '.')
		if i < 0 {
			return append(out, p)
		}
		out = append(out, p[:i])
		p = p[i+1:]
	}
	return out
}

var cueIdent = regexp.MustCompile(`^[A-Za-z][A-Za-z0-9_]*$`)

// cueKeywords may not stand as labels unquoted.
var cueKeywords = map[string]bool{"package": true, "import": true, "for": true, "in": true, "if": true, "let": true, "true": true, "false": true, "null": true, "div": true, "mod": true, "quo": true, "rem": true, "_": true}

// label spells a name as a CUE label: quoted unless a plain identifier.
func label(name string) string {
	if cueIdent.MatchString(name) && !cueKeywords[name] {
		return name
	}
	return strconv.Quote(name)
}

// cueJSON writes a JSON scalar or list as CUE: the same text, except that
// Go's escapes of <, > and & are undone.
func cueJSON(b []byte) []byte {
	var v any
	if err := json.Unmarshal(b, &v); err != nil {
		return b
	}
	var out bytes.Buffer
	enc := json.NewEncoder(&out)
	enc.SetEscapeHTML(false)
	if err := enc.Encode(v); err != nil {
		return b
	}
	return bytes.TrimSpace(out.Bytes())
}

type keyValue struct {
	key string
	raw json.RawMessage
}

// orderedObject decodes a JSON object keeping the order of its keys.
func orderedObject(raw json.RawMessage) ([]keyValue, error) {
	dec := json.NewDecoder(bytes.NewReader(raw))
	dec.UseNumber()
	if t, err := dec.Token(); err != nil || t != json.Delim('{') {
		return nil, fmt.Errorf("expected a JSON object")
	}
	var out []keyValue
	for dec.More() {
		t, err := dec.Token()
		if err != nil {
			return nil, err
		}
		key, _ := t.(string)
		var v json.RawMessage
		if err := dec.Decode(&v); err != nil {
			return nil, err
		}
		out = append(out, keyValue{key, v})
	}
	return out, nil
}

// objectOf makes a JSON object of ordered fields.
func objectOf(fields []keyValue) json.RawMessage {
	var b bytes.Buffer
	b.WriteString("{")
	for i, kv := range fields {
		if i > 0 {
			b.WriteString(",")
		}
		k, _ := json.Marshal(kv.key)
		b.Write(k)
		b.WriteString(":")
		b.Write(kv.raw)
	}
	b.WriteString("}")
	return b.Bytes()
}

// HullFiles are the design's own files, relative to its directory.
func (d *Design) HullFiles() []string {
	if d.inst == nil {
		return nil
	}
	var out []string
	for _, f := range d.inst.BuildFiles {
		out = append(out, filepath.Base(f.Filename))
	}
	sort.Strings(out)
	return out
}

// PackageName is the name of the hull's CUE package.
func (d *Design) PackageName() string {
	if d.inst == nil {
		return ""
	}
	return d.inst.PkgName
}
