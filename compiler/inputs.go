package compiler

import "cuelang.org/go/cue"

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
