package compiler

import (
	"fmt"
	"math"
	"path/filepath"
	"strconv"
	"strings"

	"cuelang.org/go/cue"
	"cuelang.org/go/cue/errors"
	"cuelang.org/go/cue/token"

	"github.com/ampwright/ampwright/schema/unit"
)

// validator walks a design unified with the schema and collects every
// error it finds, in the design's terms. cue.Value.Validate stops reporting
// some errors once others exist, so the walk visits every field itself:
// each quantity is parsed against the dimension and limits in its @q
// attribute, and CUE's own errors are reworded with the value, what was
// expected and near matches.
type validator struct {
	root cue.Value // the design unified with #Design
	// design is the schema's #Design, in the same context: what the
	// shapes of a clean design's walk are worked out from.
	design cue.Value
	data   cue.Value // the design as written
	refs   *refResolver
	errs   ErrorList
	quant  map[string]bool // paths of quantity fields already reported
	home   string          // the hull's package directory
	// clean is true when CUE finds no error in the whole design: the walk
	// then only checks quantities, without asking CUE about every node,
	// and writes the design to out.
	clean bool
	out   *jsonWriter
}

func (c *validator) run() {
	c.quant = map[string]bool{}
	c.clean = c.root.Validate(cue.Concrete(true)) == nil
	var s *shape
	if c.design.Exists() {
		s = designShape.of(c.design)
	}
	if c.clean {
		c.out = &jsonWriter{}
		c.walkClean(c.root, s)
		return
	}
	c.walk(c.root, s)
}

// sub is the shape of v's field or element, worked out, or nil.
func (c *validator) sub(s *shape, name string) *shape {
	if s == nil || !s.known {
		return nil
	}
	if name == "" {
		if s.kind == shapeList && s.elem != nil {
			return s.elem.of(c.design)
		}
		return nil
	}
	if f := s.field(name); f != nil {
		return f.of(c.design)
	}
	return nil
}

// walkClean is the one pass over a clean design: each quantity and number
// is checked, and the design is written as JSON (c.out) for decoding. A
// struct the schema fixes (s) is read field by field; only maps are
// listed, since CUE sorts what it lists, at a cost (see shape).
func (c *validator) walkClean(v cue.Value, s *shape) {
	if s != nil && !s.known {
		s = nil
	}
	if s != nil && s.hasQ {
		c.quantity(v, s.q)
		c.out.leaf(v)
		return
	}
	if s == nil {
		if a := v.Attribute("q"); a.Err() == nil {
			c.quantity(v, a)
			c.out.leaf(v)
			return
		}
	}
	switch k := v.IncompleteKind(); {
	case k != cue.BottomKind && k&^cue.NumberKind == 0:
		if v.IsConcrete() {
			c.number(v)
		}
		c.out.leaf(v)
	case k == cue.StructKind:
		c.out.open('{')
		if s != nil && s.kind == shapeFixed {
			for i := range s.fields {
				f := &s.fields[i]
				if fv := v.LookupPath(f.at); fv.Exists() {
					c.out.key(f.name)
					c.walkClean(fv, f.shape.of(c.design))
				}
			}
		} else if it, err := v.Fields(); err == nil {
			for it.Next() {
				sel := it.Selector()
				if sel.LabelType() != cue.StringLabel {
					continue
				}
				name := selName(sel)
				c.out.key(name)
				sub := s.field(name)
				if sub != nil {
					sub = sub.of(c.design)
				}
				c.walkClean(it.Value(), sub)
			}
		}
		c.out.close('}')
	case k == cue.ListKind:
		var elem *shape
		if s != nil && s.kind == shapeList && s.elem != nil {
			elem = s.elem.of(c.design)
		}
		c.out.open('[')
		for _, e := range elements(v) {
			c.walkClean(e, elem)
		}
		c.out.close(']')
	default:
		c.out.leaf(v)
	}
}

// walk visits v and everything below it in a design CUE finds errors in,
// reporting each in the design's terms. A subtree CUE finds no error in
// is left to walkClean, which only checks its quantities and numbers.
func (c *validator) walk(v cue.Value, s *shape) {
	if a := v.Attribute("q"); a.Err() == nil {
		c.quantity(v, a)
		return
	}
	if k := v.IncompleteKind(); k != cue.BottomKind && k&^cue.NumberKind == 0 && v.IsConcrete() {
		c.number(v)
		return
	}
	if own := c.ownErrors(v); len(own) > 0 {
		c.report(v, own)
		return
	}
	err := v.Validate(cue.Concrete(true))
	if err == nil {
		c.walkClean(v, s)
		return
	}
	n := len(c.errs)
	if it, ferr := v.Fields(cue.All()); ferr == nil {
		for it.Next() {
			sel := it.Selector()
			if sel.LabelType() != cue.StringLabel {
				continue
			}
			switch sel.ConstraintType() {
			case cue.OptionalConstraint:
				continue
			case cue.RequiredConstraint:
				c.missing(v, sel, it.Value())
				continue
			}
			c.walk(it.Value(), c.sub(s, selName(sel)))
		}
	} else {
		for _, e := range elements(v) {
			c.walk(e, c.sub(s, ""))
		}
	}
	// Errors CUE gives for this value that no field below reported: a
	// field not allowed, say, can be the parent's error rather than the
	// field's.
	have := map[string]bool{}
	for _, e := range c.errs[n:] {
		have[e.Path] = true
	}
	var rest []errors.Error
	for _, e := range errors.Errors(err) {
		if p := pathString(e.Path()); !have[p] && !c.quant[p] {
			rest = append(rest, e)
		}
	}
	if len(rest) > 0 {
		c.report(v, rest)
	}
}

// Plain numbers are bounded in magnitude: CUE's numbers are exact and
// unbounded, and the checks compute in float64, where a rulebook's
// 1e400 or 1e-300 becomes an infinity or a division by almost nothing.
// No value of a design or rulebook comes near these bounds.
const maxMagnitude, minMagnitude = 1e12, 1e-12

// number checks that a plain number is one ampwright can compute with.
func (c *validator) number(v cue.Value) {
	f, err := v.Float64()
	a := math.Abs(f)
	msg := ""
	switch {
	case err != nil && a == 0, err == nil && a != 0 && a < minMagnitude:
		msg = fmt.Sprintf("%v is too small a number to compute with; give 0 or a number of at least %g", v, minMagnitude)
	case err != nil, a > maxMagnitude:
		msg = fmt.Sprintf("%v is too large a number to compute with; give a number of at most %g", v, maxMagnitude)
	default:
		return
	}
	p := pathString(selectorStrings(v.Path()))
	c.quant[p] = true
	c.errs = append(c.errs, &Error{Pos: c.dataPos(v.Path()), Path: p, Msg: msg})
}

// ownErrors returns the errors of v that are about v itself rather than
// something below it: a reference that does not resolve leaves the whole
// struct in error, and its schema's required fields are then no news.
func (c *validator) ownErrors(v cue.Value) []errors.Error {
	err := v.Err()
	if err == nil {
		return nil
	}
	self := pathString(selectorStrings(v.Path()))
	var own []errors.Error
	for _, e := range errors.Errors(err) {
		if pathString(e.Path()) == self {
			own = append(own, e)
		}
	}
	return own
}

// missing reports a required field that the design does not give.
func (c *validator) missing(parent cue.Value, sel cue.Selector, field cue.Value) {
	name := selName(sel)
	path := joinPath(pathString(selectorStrings(parent.Path())), sel)
	msg := fmt.Sprintf("missing required field %q", name)
	if a := field.Attribute("q"); a.Err() == nil {
		if d, ok := unit.DimByName(firstArg(a)); ok {
			msg += fmt.Sprintf(": expected %s %s such as %s", article(d.String()), d, d.Examples())
		}
	} else if what := docPhrase(field, name); what != "" {
		msg += ": " + what
	}
	c.errs = append(c.errs, &Error{Pos: c.dataPos(parent.Path()), Path: path, Msg: msg})
}

// docPhrase is what the schema's doc comment on a field says it is: for
// "// bank is the house battery bank." it returns "the house battery bank".
func docPhrase(v cue.Value, name string) string {
	for _, cg := range v.Doc() {
		text := strings.TrimSpace(cg.Text())
		if text == "" {
			continue
		}
		first, _, _ := strings.Cut(text, ".")
		first = strings.Join(strings.Fields(first), " ")
		for _, verb := range []string{" is ", " are ", " names "} {
			if rest, ok := strings.CutPrefix(first, name+verb); ok {
				if verb == " names " {
					return "it names " + rest
				}
				return rest
			}
		}
	}
	return ""
}

// dataPos is the design's own position of the value at p, or of the
// nearest enclosing value the design gives.
func (c *validator) dataPos(p cue.Path) token.Pos {
	sels := p.Selectors()
	for i := len(sels); i >= 0; i-- {
		v := c.data.LookupPath(cue.MakePath(sels[:i]...))
		if !v.Exists() {
			continue
		}
		if pos := c.ownPos(v); pos.IsValid() {
			return pos
		}
	}
	return token.NoPos
}

// ownPos is where the design writes v. A struct's own position may be that
// of a schema it embeds, so for a struct take the first position of the
// fields it holds, preferring the hull's own files to its imports'.
func (c *validator) ownPos(v cue.Value) token.Pos {
	if v.IncompleteKind() == cue.StructKind {
		if it, err := v.Fields(); err == nil {
			var first token.Pos
			better := func(p token.Pos) bool {
				if !first.IsValid() {
					return true
				}
				if ph, fh := c.isHome(p), c.isHome(first); ph != fh {
					return ph
				}
				return comparePos(p, first) < 0
			}
			for it.Next() {
				if p := c.ownPos(it.Value()); p.IsValid() && better(p) {
					first = p
				}
			}
			if first.IsValid() {
				return first
			}
		}
	}
	if p := v.Pos(); p.IsValid() && !isSchemaPos(p) {
		return p
	}
	// A value in error: the operand the design wrote.
	if _, args := v.Expr(); len(args) > 1 {
		for _, a := range args {
			if p := a.Pos(); p.IsValid() && !isSchemaPos(p) {
				return p
			}
		}
	}
	return token.NoPos
}

// entryPos is where the design declares a named entry: the first position,
// in the hull's own files if it has one there, of the fields written in it,
// looking two levels deep only, where ownPos walks the whole value
// (catalog parts included).
func (c *validator) entryPos(p cue.Path) token.Pos {
	v := c.data
	if c.clean {
		v = c.root // the design's own values, already evaluated
	}
	if pos := c.shallowPos(v.LookupPath(p), 2); pos.IsValid() {
		return pos
	}
	return c.dataPos(p)
}

func (c *validator) shallowPos(v cue.Value, depth int) token.Pos {
	it, err := v.Fields()
	if err != nil {
		return token.NoPos
	}
	var first token.Pos
	for it.Next() {
		pos := it.Value().Pos()
		if (!pos.IsValid() || isSchemaPos(pos)) && depth > 1 {
			pos = c.shallowPos(it.Value(), depth-1)
		}
		if !pos.IsValid() || isSchemaPos(pos) {
			continue
		}
		if !first.IsValid() || (c.isHome(pos) && !c.isHome(first)) || (c.isHome(pos) == c.isHome(first) && comparePos(pos, first) < 0) {
			first = pos
		}
	}
	return first
}

// isHome reports whether p lies in the hull's own package directory.
func (c *validator) isHome(p token.Pos) bool {
	return c.home != "" && filepath.Dir(p.Filename()) == c.home
}

// written returns the value the design writes at path, as CUE prints it.
func (c *validator) written(path string) (string, bool) {
	dv := c.data.LookupPath(parsePath(path))
	if !dv.Exists() {
		return "", false
	}
	if s, err := writtenString(dv); err == nil {
		return fmt.Sprintf("%q", s), true
	}
	if dv.IsConcrete() && dv.Err() == nil {
		return fmt.Sprint(dv), true
	}
	if _, args := dv.Expr(); len(args) > 0 {
		for _, a := range args {
			if a.IsConcrete() && a.Err() == nil {
				return fmt.Sprint(a), true
			}
		}
	}
	return "", false
}

// writtenString returns the string the design writes in v, even where v is
// in error: a design that embeds a vendored schema has its value unified
// with the schema's pattern already, and the string is one operand.
func writtenString(v cue.Value) (string, error) {
	s, err := v.String()
	if err == nil {
		return s, nil
	}
	if op, args := v.Expr(); op == cue.AndOp || op == cue.NoOp {
		for _, a := range args {
			if a.Kind() == cue.StringKind {
				if s, err := a.String(); err == nil {
					return s, nil
				}
			}
		}
	}
	return "", err
}

// writtenNonString finds a concrete operand that is not a string in a
// value in error: a number written where a quantity was expected.
func writtenNonString(v cue.Value) (string, cue.Kind, bool) {
	if _, args := v.Expr(); len(args) > 1 {
		for _, a := range args {
			if k := a.Kind(); a.IsConcrete() && k != cue.StringKind && k != cue.BottomKind {
				return fmt.Sprint(a), k, true
			}
		}
	}
	return "", 0, false
}

// isKind reports whether s names a CUE kind, as a type in a message.
func isKind(s string) bool {
	switch s {
	case "int", "float", "number", "string", "bool", "bytes", "null", "struct", "list":
		return true
	}
	return false
}

// isNumber reports whether s is a number as CUE prints one.
func isNumber(s string) bool {
	_, err := strconv.ParseFloat(s, 64)
	return err == nil
}

func unquote(s string) string {
	if u, err := strconv.Unquote(s); err == nil {
		return u
	}
	return s
}

// quantity checks a field pinned to a dimension by its @q attribute.
func (c *validator) quantity(v cue.Value, a cue.Attribute) {
	path := pathString(selectorStrings(v.Path()))
	dim, ok := unit.DimByName(firstArg(a))
	if !ok {
		c.errs.Add(v.Pos(), path, "schema: unknown dimension %q in @q", firstArg(a))
		return
	}
	var dv cue.Value
	if c.clean {
		// In a clean design the unified value is the design's own; looking
		// it up in the design as written would evaluate that a second time.
		// A default is the schema's only when the design does not write
		// the field: a design's own default (*"1000 m" | "5 m") is the
		// value used, and is checked like any other.
		if _, isDefault := v.Default(); isDefault && !c.data.LookupPath(v.Path()).Exists() {
			return // the schema's default
		}
		dv = v
	} else if dv = c.data.LookupPath(v.Path()); !dv.Exists() {
		// A default from the schema, or a required field reported by its
		// parent.
		return
	}
	bad := func(format string, args ...any) {
		c.quant[path] = true
		c.errs = append(c.errs, &Error{Pos: c.dataPos(v.Path()), Path: path, Msg: fmt.Sprintf(format, args...)})
	}
	s, err := writtenString(dv)
	if err != nil {
		switch k := dv.IncompleteKind(); {
		case k == cue.BottomKind:
			if lit, kind, ok := writtenNonString(dv); ok {
				bad("%s is %s %s, not a quantity; expected %s %s with its unit, such as %s", lit, article(kindName(kind)), kindName(kind), article(dim.String()), dim, dim.Examples())
				return
			}
			// An error in the expression itself, such as a bad reference.
			c.report(v, errors.Errors(dv.Err()))
		case !dv.IsConcrete():
			bad("incomplete value; expected %s %s such as %s", article(dim.String()), dim, dim.Examples())
		default:
			bad("%s is %s %s, not a quantity; expected %s %s with its unit, such as %s", valueText(dv), article(kindName(k)), kindName(k), article(dim.String()), dim, dim.Examples())
		}
		return
	}
	q, err := unit.ParseAs(s, dim)
	if err != nil {
		bad("%s", err)
		return
	}
	// A quantity the schema leaves unbounded is bounded like a plain
	// number, in SI units (a conductor of 1e-300 mm² would make a drop of
	// 1e303 V).
	if a := math.Abs(q.Value); a > maxMagnitude || (a != 0 && a < minMagnitude) {
		bad("%q is too large or too small a %s to compute with", s, dim)
		return
	}
	for i := 1; i < a.NumArgs(); i++ {
		op, bound := a.Arg(i)
		b, err := unit.ParseAs(bound, dim)
		if err != nil {
			c.errs.Add(v.Pos(), path, "schema: bad limit %s=%q in @q: %v", op, bound, err)
			continue
		}
		if msg := outOfLimit(q.Value, op, b.Value); msg != "" {
			bad("%q is out of range; it %s %s", s, msg, bound)
			return
		}
	}
	// Our parser accepted the value; CUE's pattern should have too. If it
	// did not, say so rather than hide a disagreement.
	if c.clean {
		return
	}
	if err := v.Validate(cue.Concrete(true)); err != nil {
		c.report(v, errors.Errors(err))
	}
}

// outOfLimit returns how value breaks the limit "op bound", or "".
func outOfLimit(value float64, op string, bound float64) string {
	const eps = 1e-12
	tol := eps * math.Max(1, math.Abs(bound))
	switch op {
	case "gt":
		if value <= bound+tol {
			return "must be more than"
		}
	case "ge":
		if value < bound-tol {
			return "must be at least"
		}
	case "lt":
		if value >= bound-tol {
			return "must be less than"
		}
	case "le":
		if value > bound+tol {
			return "must be at most"
		}
	}
	return ""
}

// report rewords CUE errors found at v.
func (c *validator) report(v cue.Value, errs []errors.Error) {
	// Errors of one disjunction share a path; reword them as one.
	groups := map[string][]errors.Error{}
	var order []string
	for _, e := range errs {
		p := pathString(e.Path())
		if c.quant[p] {
			continue
		}
		if _, ok := groups[p]; !ok {
			order = append(order, p)
		}
		groups[p] = append(groups[p], e)
	}
	for _, p := range order {
		c.reportGroup(p, groups[p])
	}
}

func (c *validator) reportGroup(path string, errs []errors.Error) {
	var positions []token.Pos
	disjunction := false
	var alts []errors.Error
	for _, e := range errs {
		positions = append(positions, e.Position())
		positions = append(positions, e.InputPositions()...)
		format, _ := e.Msg()
		if strings.Contains(format, "errors in empty disjunction") {
			disjunction = true
			continue
		}
		alts = append(alts, e)
	}
	pos, related := designPos(positions)
	if !pos.IsValid() {
		pos = c.dataPos(parsePath(path))
	}
	add := func(msg string) {
		c.errs = append(c.errs, &Error{Pos: pos, Path: path, Msg: msg, Related: related})
	}
	// The design itself giving the field two values says more than how
	// either fails the schema.
	if dv := c.data.LookupPath(parsePath(path)); dv.Exists() {
		for _, e := range errors.Errors(dv.Err()) {
			format, args := e.Msg()
			if !strings.HasPrefix(format, "conflicting values %s and %s") || len(args) < 2 {
				continue
			}
			ps := append([]token.Pos{e.Position()}, e.InputPositions()...)
			// Count the design's own literals: a schema embedded in the
			// hull puts its choices' positions at the embedding's line.
			own := 0
			for _, p := range ps {
				if p.IsValid() && !isSchemaPos(p) && c.refs.literalAt(p) {
					own++
				}
			}
			if own >= 2 {
				pos, related := designPos(ps)
				c.errs = append(c.errs, &Error{Pos: pos, Path: path, Related: related,
					Msg: fmt.Sprintf("the design gives two values, %v and %v; a field can have only one", args[0], args[1])})
				return
			}
		}
	}
	if disjunction && len(alts) > 1 {
		// One schema position says where the choices are; one per
		// alternative is noise.
		// Keep the first position of the last schema line: the field's own
		// list of choices, not the struct that holds it.
		if len(related) > 1 {
			last := related[len(related)-1]
			for _, p := range related {
				if p.Filename() == last.Filename() && p.Line() == last.Line() {
					related = []token.Pos{p}
					break
				}
			}
		}
		add(c.disjunctionMessage(path, alts))
		return
	}
	for _, e := range alts {
		add(c.message(path, e))
	}
}

// disjunctionMessage words a value that matches none of a field's
// alternatives. Where an alternative failed on a bound or a type, that
// failure says most; where every alternative is a literal, list them.
func (c *validator) disjunctionMessage(path string, alts []errors.Error) string {
	// A value of the wrong kind against `*1 | int & >=1`: the
	// alternative that names the kind says what is wrong, not the default.
	for _, e := range alts {
		format, args := e.Msg()
		if strings.Contains(format, "mismatched types") && len(args) == 4 && (isKind(fmt.Sprint(args[0])) || isKind(fmt.Sprint(args[1]))) {
			return c.message(path, e)
		}
	}
	var literals []string
	var given string
	for _, e := range alts {
		format, args := e.Msg()
		if !strings.HasPrefix(format, "conflicting values %s and %s") || len(args) < 2 || strings.Contains(format, "mismatched types") {
			return c.message(path, e)
		}
		a, b := fmt.Sprint(args[0]), fmt.Sprint(args[1])
		if w, ok := c.written(path); ok {
			given = w
		}
		switch {
		case a == given:
			literals = append(literals, b)
		case b == given:
			literals = append(literals, a)
		default:
			literals = append(literals, b)
			if given == "" {
				given = a
			}
		}
	}
	var plain []string
	for _, l := range literals {
		plain = append(plain, unquote(l))
	}
	msg := fmt.Sprintf("%s is not allowed here; expected one of %s", given, strings.Join(literals, ", "))
	if m := nearMatches(unquote(given), plain); len(m) > 0 && len(m) < len(plain) && len(m) <= 2 {
		msg += "; did you mean " + quoteList(m, "or") + "?"
	}
	return msg
}

// message rewords one CUE error.
func (c *validator) message(path string, e errors.Error) string {
	format, args := e.Msg()
	switch {
	case format == "field not allowed":
		p := parsePath(path)
		sels := p.Selectors()
		if len(sels) == 0 {
			break
		}
		name := selName(sels[len(sels)-1])
		if len(sels) == 2 && namedGroups[selName(sels[0])] && !isName(name) {
			return fmt.Sprintf("%q is not a valid name; expected %s", name, namePhrase)
		}
		parent := c.root.LookupPath(cue.MakePath(sels[:len(sels)-1]...))
		fields := fieldNames(parent, name)
		if len(fields) == 0 {
			return fmt.Sprintf("field %q is not allowed here", name)
		}
		return fmt.Sprintf("field %q is not allowed here%s", name, suggest(name, fields))
	case strings.HasPrefix(format, "undefined field: %s") && len(args) == 1:
		return c.refs.undefined(e.Position(), unquote(fmt.Sprint(args[0])))
	case strings.HasPrefix(format, "reference %q not found") && len(args) == 1:
		return fmt.Sprintf("reference %q not found; is an import missing?", fmt.Sprint(args[0]))
	case strings.HasPrefix(format, "invalid value %v (out of bound %s)") && len(args) == 2:
		bound := fmt.Sprint(args[1])
		switch {
		case bound == `!=""`:
			return "the value is empty; give one"
		case strings.HasPrefix(bound, "=~") || strings.HasPrefix(bound, "!~"):
			return fmt.Sprintf("%v is not allowed here; expected %s", args[0], patternPhrase(path))
		}
		return fmt.Sprintf("%v is out of range; %s", args[0], boundPhrase(bound, path))
	case strings.HasPrefix(format, "conflicting values %s and %s (mismatched types %s and %s)") && len(args) == 4:
		a, b := fmt.Sprint(args[0]), fmt.Sprint(args[1])
		if isNumber(a) && isNumber(b) {
			// 50.1 and -91: CUE calls a float and an int different types.
			return fmt.Sprintf("conflicting values %s and %s; a field can have only one value", a, b)
		}
		given, want := b, fmt.Sprint(args[2])
		if w, ok := c.written(path); ok && w == a {
			given, want = a, fmt.Sprint(args[3])
		}
		if want == "int" && isNumber(given) {
			return fmt.Sprintf("%s is not a whole number; expected a whole number", given)
		}
		return fmt.Sprintf("%s is of the wrong type; expected %s", given, kindPhrase(want))
	case strings.HasPrefix(format, "conflicting values %s and %s") && len(args) >= 2:
		return fmt.Sprintf("conflicting values %v and %v; a field can have only one value", args[0], args[1])
	case strings.HasPrefix(format, "incomplete value %v") && len(args) > 0:
		return fmt.Sprintf("no value given; expected %s", expectation(fmt.Sprint(args[0]), path))
	case strings.HasPrefix(format, "non-concrete value %v") && len(args) > 0:
		return fmt.Sprintf("no value given; expected %s", expectation(fmt.Sprint(args[0]), path))
	}
	return fmt.Sprintf(format, args...)
}

// namedGroups are the fields of #Design whose keys are #Names.
var namedGroups = map[string]bool{"scenarios": true, "loads": true, "inverters": true, "arrays": true, "controllers": true, "chargers": true, "buses": true, "wiring": true}

// fieldNames lists the fields v allows, for suggestions, leaving out skip.
func fieldNames(v cue.Value, skip string) []string {
	it, err := v.Fields(cue.All())
	if err != nil {
		return nil
	}
	var out []string
	for it.Next() {
		sel := it.Selector()
		if sel.LabelType() != cue.StringLabel {
			continue
		}
		if n := selName(sel); n != skip {
			out = append(out, n)
		}
	}
	return out
}

func firstArg(a cue.Attribute) string {
	if a.NumArgs() == 0 {
		return ""
	}
	k, _ := a.Arg(0)
	return k
}

func kindName(k cue.Kind) string {
	switch k {
	case cue.IntKind, cue.FloatKind, cue.NumberKind:
		return "number"
	case cue.BoolKind:
		return "boolean"
	case cue.StructKind:
		return "struct"
	case cue.ListKind:
		return "list"
	}
	return k.String()
}

func article(noun string) string {
	if noun != "" && strings.ContainsRune("aeio", rune(noun[0])) {
		return "an"
	}
	return "a"
}

// valueText prints a concrete value as CUE would write it.
func valueText(v cue.Value) string {
	if s, err := v.String(); err == nil {
		return fmt.Sprintf("%q", s)
	}
	return fmt.Sprint(v)
}

// selectorStrings spells a path's selectors as CUE error paths do.
func selectorStrings(p cue.Path) []string {
	sels := p.Selectors()
	out := make([]string, len(sels))
	for i, s := range sels {
		if s.Type() == cue.IndexLabel {
			out[i] = strconv.Itoa(s.Index())
			continue
		}
		out[i] = s.String()
	}
	return out
}

// pathString spells a path given as CUE error paths give it, list
// indices as bare numbers, the way cue.Path prints it: a.b[0].c.
func pathString(sels []string) string {
	var b strings.Builder
	for i, s := range sels {
		if isIndex(s) {
			b.WriteString("[" + s + "]")
			continue
		}
		if i > 0 {
			b.WriteByte('.')
		}
		b.WriteString(s)
	}
	return b.String()
}

func isIndex(s string) bool {
	if s == "" {
		return false
	}
	for _, r := range s {
		if r < '0' || r > '9' {
			return false
		}
	}
	return true
}

// elements returns the elements of a list value, even one in which some
// element is in error, where v.List would give up on all of them.
func elements(v cue.Value) []cue.Value {
	if v.IncompleteKind() != cue.ListKind && v.IncompleteKind() != cue.BottomKind {
		return nil
	}
	var out []cue.Value
	for i := 0; ; i++ {
		e := v.LookupPath(cue.MakePath(cue.Index(i)))
		if !e.Exists() {
			return out
		}
		out = append(out, e)
	}
}

func joinPath(parent string, sel cue.Selector) string {
	s := selName(sel)
	label := cue.Str(s).String()
	if parent == "" {
		return label
	}
	return parent + "." + label
}

func parsePath(s string) cue.Path { return cue.ParsePath(s) }

// quoteLabel spells name as a CUE path element.
func quoteLabel(name string) string { return cue.Str(name).String() }

// selName is a selector's name without quotes. Selector.Unquoted panics
// on anything but a string label, and a path parsed back from an error
// message can hold one.
func selName(sel cue.Selector) string {
	if sel.LabelType() == cue.StringLabel {
		return sel.Unquoted()
	}
	return sel.String()
}
