package compiler

import (
	"path/filepath"

	"cuelang.org/go/cue"
)

// Inputs returns every concrete value of the design, defaults included, by
// CUE path, as CUE prints it: what a reviewer compares between revisions.
func (d *Design) Inputs() map[string]string {
	out := map[string]string{}
	var walk func(v cue.Value)
	walk = func(v cue.Value) {
		if it, err := v.Fields(); err == nil {
			for it.Next() {
				walk(it.Value())
			}
			return
		}
		if elems := elements(v); v.IncompleteKind() == cue.ListKind {
			for _, e := range elems {
				walk(e)
			}
			return
		}
		if !v.IsConcrete() {
			return
		}
		out[v.Path().String()] = valueText(v)
	}
	walk(d.value)
	return out
}

// Entry names the entry of the design that the input at p (a CUE path
// as Inputs gives it) belongs to: a named entry of a collection
// (loads.fridge, wiring."panel-pilot"), a table of the rulebook
// (rules.voltageDrop), or else the path's first label (bank, vessel,
// site). A diff shows one row an entry.
func (d *Design) Entry(p string) string {
	sels := cue.ParsePath(p).Selectors()
	if len(sels) == 0 {
		return p
	}
	if len(sels) >= 2 {
		two := cue.MakePath(sels[:2]...).String()
		if _, ok := d.pos[two]; ok || (sels[0].String() == "rules" && len(sels) > 2) {
			return two
		}
	}
	return cue.MakePath(sels[0]).String()
}

// WrittenInHull reports whether the value at p (a CUE path as Inputs
// gives it) is written in the hull's own package files, rather than taken
// from an import (a catalog part, the yard's rulebook) or a default of the
// schema. It is false when the design has no value there.
func (d *Design) WrittenInHull(p string) bool {
	v := d.value.LookupPath(cue.ParsePath(p))
	if !v.Exists() {
		return false
	}
	pos := v.Pos()
	if !pos.IsValid() {
		return false
	}
	return d.home != "" && filepath.Dir(pos.Filename()) == d.home
}
