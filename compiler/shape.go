package compiler

import (
	"sync"

	"cuelang.org/go/cue"
)

// A shape is what the schema allows at one place of a design: a struct of
// named fields, a map (a struct of entries under a pattern), or a list.
// The validator's one pass over a clean design reads a struct of named
// fields by looking each up, rather than asking CUE for the struct's
// fields, which CUE sorts in the order they were written at a cost that
// dominated the pass; only maps, whose names only the design knows, are
// listed. Shapes are worked out from the schema the first time a design
// reaches them and kept for the process: they hold names and paths, no
// CUE value, so any context can use them.
type shape struct {
	// parent and sel say where the shape is in #Design: the field sel of
	// parent's value, or, for pattern, the value of parent's pattern.
	parent  *shape
	sel     cue.Selector
	pattern bool
	once    sync.Once

	known  bool // the schema has a value here; if not, the walk asks the design
	kind   shapeKind
	q      cue.Attribute // the field's @q attribute, if hasQ
	hasQ   bool
	fields []shapeField // a struct's fields, for kind fixed
	elem   *shape       // a map's entries or a list's elements
}

type shapeKind int

const (
	shapeOther shapeKind = iota // a scalar, or what the walk lists itself
	shapeFixed                  // a closed struct of named fields
	shapeMap                    // a struct of entries under [string]
	shapeList                   // a list
)

type shapeField struct {
	name  string
	at    cue.Path // the field in a design's value: a plain label
	shape *shape
}

// designShape is the shape of #Design.
var designShape = &shape{}

// of works s out, once, from the schema's #Design in the caller's context.
func (s *shape) of(design cue.Value) *shape {
	s.once.Do(func() {
		v := s.value(design)
		if !v.Exists() {
			return
		}
		s.known = true
		// Only the schema has @q attributes (hullParser refuses them
		// elsewhere), so the schema's field says what the design's is.
		if a := v.Attribute("q"); a.Err() == nil {
			s.q, s.hasQ = a, true
			return
		}
		switch v.IncompleteKind() {
		case cue.StructKind:
			s.structOf(v)
		case cue.ListKind:
			s.kind = shapeList
			s.elem = &shape{parent: s, sel: cue.AnyIndex}
		}
	})
	return s
}

func (s *shape) structOf(v cue.Value) {
	it, err := v.Fields(cue.Optional(true), cue.Patterns(true))
	if err != nil {
		return
	}
	var fields []shapeField
	patterns := 0
	for it.Next() {
		sel := it.Selector()
		if sel.ConstraintType()&cue.PatternConstraint != 0 {
			patterns++
			continue
		}
		if sel.LabelType() != cue.StringLabel {
			continue
		}
		name := selName(sel)
		fields = append(fields, shapeField{name: name, at: cue.MakePath(cue.Str(name)), shape: &shape{parent: s, sel: sel}})
	}
	switch {
	case patterns == 0:
		s.kind, s.fields = shapeFixed, fields
	case patterns == 1 && len(fields) == 0:
		s.kind, s.elem = shapeMap, &shape{parent: s, pattern: true}
	}
	// A struct with a pattern and named fields too is listed by the walk.
}

// value is the schema's value where s is.
func (s *shape) value(design cue.Value) cue.Value {
	if s.parent == nil {
		return design
	}
	v := s.parent.value(design)
	if !s.pattern {
		return v.LookupPath(cue.MakePath(s.sel))
	}
	// A pattern such as [#Name] is not looked up by a selector: take the
	// value of the struct's one pattern.
	it, err := v.Fields(cue.Optional(true), cue.Patterns(true))
	if err == nil {
		for it.Next() {
			if it.Selector().ConstraintType()&cue.PatternConstraint != 0 {
				return it.Value()
			}
		}
	}
	return cue.Value{}
}

// field is the shape of a struct's field name, or nil.
func (s *shape) field(name string) *shape {
	if s == nil {
		return nil
	}
	switch s.kind {
	case shapeMap:
		return s.elem
	case shapeFixed:
		for i := range s.fields {
			if s.fields[i].name == name {
				return s.fields[i].shape
			}
		}
	}
	return nil
}
