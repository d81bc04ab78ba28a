package checks

import (
	"fmt"
	"slices"
	"strings"

	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
)

// ShuntPlacement checks that every return passes the battery monitor's
// shunt.
var ShuntPlacement = &Check{
	ID:    result.CheckShunt,
	Title: "every return passes the battery monitor's shunt, but those the rulebook allows around it",
	Doc: `Checks that the battery monitor counts all the current in and out of its
bank: every load's and every charge source's return reaches the bank's
negative post through the shunt. A load beyond a converter is counted
through the converter's own input. The rulebook may name load kinds
allowed around the shunt (default none, common practice).

Method: each circuit's return is followed from where it reaches the
negative side (its own landing, or the negative bus it travels to) to the
bank's negative post along the negative conductors the design draws.

Limit: no return around the shunt. (The negative bus the returns meet on
is checked against its rating by bus.current.)`,
	Run: func(in *Input, out *Report) {
		s := in.Sys
		bypass := []string{}
		if in.Rules.Shunt != nil {
			bypass = in.Rules.Shunt.BypassKinds
		}
		for _, sh := range s.Shunts {
			var around []string
			var bank *model.Bank
			for n := sh.Node; n != nil; {
				if n.Kind == model.KindBank {
					bank = n.Bank
					break
				}
				if n.In == nil {
					break
				}
				n = n.In.UpNode
			}
			counted := 0
			for _, r := range s.Runs {
				if r.Role == model.PV || r.Bank != bank || !leaf(r) {
					continue
				}
				if kind, isLoad := loadKind(s, r); isLoad && slices.Contains(bypass, kind) {
					continue
				}
				if beyondConverter(r) {
					continue
				}
				counted++
				if !s.PassesShunt(r, sh) {
					around = append(around, r.Name)
				}
			}
			f := result.Finding{
				Subject: sh.Name, Value: float64(len(around)), Limit: 0, Unit: "returns", Margin: -float64(len(around)),
				Source: "common practice", Position: in.Position(sh.Path), Status: result.Pass,
				Message: fmt.Sprintf("all %d returns of bank %q pass %s", counted, bank.Name, sh.Spec.Part.ID),
			}
			if in.Rules.Shunt != nil {
				f.Source = sourced(in.Rules.Shunt.Sourced)
			}
			if len(around) > 0 {
				f.Status = result.Fail
				f.Message = fmt.Sprintf("%d of %d returns of bank %q go around %s: %s", len(around), counted, bank.Name, sh.Spec.Part.ID, strings.Join(around, ", "))
				f.Change = "land those returns on the negative bus on the load side of the shunt, not on the bank's negative post"
			}
			out.Add(f)
		}
	},
}

// leaf reports whether run r ends at a part that draws or gives current
// (a load, a source, an inverter, a converter, a link), not at a bus.
func leaf(r *model.Run) bool {
	return r.DownNode.Kind != model.KindBus
}

// loadKind is the kind of the load a run ends at.
func loadKind(s *model.System, r *model.Run) (string, bool) {
	if r.DownNode.Kind != model.KindLoad {
		return "", false
	}
	if l := s.Load(r.Down); l != nil {
		return l.Spec.Kind, true
	}
	return "", false
}

// beyondConverter reports whether run r lies beyond a converter, whose
// own input the shunt counts.
func beyondConverter(r *model.Run) bool {
	for n := r.UpNode; n != nil && n.In != nil; n = n.In.UpNode {
		if n.Kind == model.KindConverter {
			return true
		}
	}
	return false
}
