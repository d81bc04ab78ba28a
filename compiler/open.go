package compiler

import (
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// BillOfMaterials is the bill of materials of a decoded design spec whose
// model is sys, under rules: what `ampwright bom` lists for it, so that a
// design made in Go (a proposal) is costed as a loaded one is.
func BillOfMaterials(spec *schema.Design, rules schema.Rulebook, sys *model.System) *result.BOM {
	return billOfMaterials(&Design{Spec: spec, Rules: rules}, sys)
}

// CompileOpen is Compile for `ampwright propose`, which takes designs that
// leave parts open for it to choose (a link without a part): such a design
// comes back loaded, with a nil result; any other design as Compile gives
// it.
func CompileOpen(dir string) (r *result.Result, d *Design, err error) {
	defer recovered(dir, &err)
	d, err = LoadFrom(dir, nil)
	if err != nil {
		return nil, nil, err
	}
	for _, l := range d.Spec.Links {
		if l.Open() {
			return nil, d, nil
		}
	}
	return d.compile()
}

// Identity names the design as its result does.
func (d *Design) Identity() result.Identity {
	v := d.Spec.Vessel
	return result.Identity{
		Name: v.Name, Hull: v.Hull, Kind: v.Kind, System: v.System, Path: d.Dir, InputsHash: d.Hash, Units: v.Units,
		Length: v.Length.Text, Client: v.Client, Yard: v.Yard, Designer: v.Designer, Checker: v.Checker, Approver: v.Approver,
	}
}
