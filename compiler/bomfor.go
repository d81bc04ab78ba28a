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
