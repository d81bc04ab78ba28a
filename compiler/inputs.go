package compiler

import (
	"path/filepath"

	"cuelang.org/go/cue"
)

// Inputs returns every concrete value of the design, defaults included, by
// CUE path, as CUE prints it: what a reviewer compares between revisions.
func (d *Design) Inputs() map[string]string {
	out := map[string]string{}
	d.eachInput(func(p string, v cue.Value) { out[p] = valueText(v) })
	return out
}

// InputOrigins is Inputs with, for each input, the entry it belongs to
// (Entry) and whether the hull's own files write it (WrittenInHull), in
// one walk over the design.
func (d *Design) InputOrigins() (inputs, entries map[string]string, own map[string]bool) {
	inputs, entries, own = map[string]string{}, map[string]string{}, map[string]bool{}
	d.eachInput(func(p string, v cue.Value) {
		inputs[p] = valueText(v)
		entries[p] = d.entryOf(v.Path().Selectors(), p)
		if d.ownPos(v) {
			own[p] = true
		}
	})
	return inputs, entries, own
}

// eachInput calls f with every concrete value of the design and its path.
func (d *Design) eachInput(f func(p string, v cue.Value)) {
	var walk func(v cue.Value)
	walk = func(v cue.Value) {
		kind := v.IncompleteKind()
		// Fields of a value that is not a struct is an error, and an
		// error costs more than asking.
		if kind&cue.StructKind != 0 {
			if it, err := v.Fields(); err == nil {
				for it.Next() {
					walk(it.Value())
				}
				return
			}
		}
		if elems := elements(v); kind == cue.ListKind {
			for _, e := range elems {
				walk(e)
			}
			return
		}
		if !v.IsConcrete() {
			return
		}
		f(v.Path().String(), v)
	}
	walk(d.value)
}

// Entry names the entry of the design that the input at p (a CUE path
// as Inputs gives it) belongs to: a named entry of a collection
// (loads.fridge, wiring."panel-pilot"), a table of the rulebook
// (rules.voltageDrop), or else the path's first label (bank, vessel,
// site). A diff shows one row an entry.
func (d *Design) Entry(p string) string {
	return d.entryOf(cue.ParsePath(p).Selectors(), p)
}

// entryOf is Entry for the path p whose selectors are sels.
func (d *Design) entryOf(sels []cue.Selector, p string) string {
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
	return v.Exists() && d.ownPos(v)
}

// ownPos reports whether v is written in the hull's own package files.
func (d *Design) ownPos(v cue.Value) bool {
	pos := v.Pos()
	if !pos.IsValid() {
		return false
	}
	return d.home != "" && filepath.Dir(pos.Filename()) == d.home
}
