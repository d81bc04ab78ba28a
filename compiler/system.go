package compiler

import (
	"fmt"
	"strings"

	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
)

// systemTable is the design's topology for the one-line diagram: every
// node of the model, positive side then negative, by name.
func systemTable(sys *model.System) *result.System {
	out := &result.System{Nodes: []result.Node{}}
	add := func(n *model.Node, negative bool, label, part string) *result.Node {
		rn := result.Node{Name: n.Name, Kind: string(n.Kind), Negative: negative, Volts: n.Volts, Label: label, Part: part}
		if n.Bank != nil {
			rn.Bank = n.Bank.Name
		}
		out.Nodes = append(out.Nodes, rn)
		return &out.Nodes[len(out.Nodes)-1]
	}
	for _, b := range sys.Banks {
		s := b.Spec
		add(b.Node, false, fmt.Sprintf("%s bank, %dS × %dP %s", b.Role, s.Series, s.Parallel, s.Battery.ID), s.Battery.ID)
	}
	for _, bus := range sys.Buses {
		label, part := bus.Spec.Kind, ""
		if p := bus.Spec.Part; p != nil {
			part = p.ID
			var r []string
			if p.Rating != nil {
				r = append(r, p.Rating.Text)
			}
			if p.Ways > 0 {
				r = append(r, fmt.Sprintf("%d ways", p.Ways))
			}
			if len(r) > 0 {
				label += " " + strings.Join(r, ", ")
			}
		}
		n := add(bus.Node, false, label, part)
		n.Kind = bus.Spec.Kind
		if bus.Negative != nil {
			n.Pair = bus.Negative.Name
		}
	}
	for _, a := range sys.Arrays {
		s := a.Spec
		add(a.Node, false, fmt.Sprintf("PV %d × %d %s", s.Series, s.Strings, s.Module.ID), s.Module.ID)
	}
	for _, c := range sys.Controllers {
		p := c.Spec.Part
		add(c.Node, false, fmt.Sprintf("%s controller %s", strings.ToUpper(p.Kind), p.Output.Text), p.ID)
	}
	for _, inv := range sys.Inverters {
		p := inv.Spec.Part
		label := "inverter " + p.Continuous.Text
		if p.Charger != nil {
			label = fmt.Sprintf("inverter-charger %s / %s", p.Continuous.Text, p.Charger.Text)
		}
		add(inv.Node, false, label, p.ID)
	}
	for _, src := range sys.Sources {
		if src.Charger == nil {
			continue
		}
		part := ""
		if src.Charger.Part != nil {
			part = src.Charger.Part.ID
		}
		add(src.Node, false, fmt.Sprintf("%s %.4g A", src.Kind, src.Output), part)
	}
	for _, l := range sys.Links {
		p := l.Spec.Part
		kind := map[string]string{"dc-dc": "DC-DC charger", "combiner": "combiner", "isolator": "isolator"}[p.Kind]
		n := add(l.Node, false, kind+" "+p.Rating.Text, p.ID)
		n.From, n.To = l.Spec.From, l.Spec.To
	}
	for _, c := range sys.Converters {
		p := c.Spec.Part
		add(c.Node, false, fmt.Sprintf("converter %s → %s, %s", model.VoltText(c.In), model.VoltText(c.Out), p.Rating.Text), p.ID)
	}
	for _, l := range sys.Loads {
		if l.Circuit == nil {
			continue // an AC load, drawn behind its inverter
		}
		n := sys.Nodes[l.Name]
		if n.In == nil {
			continue // a load its run does not end at: drawn on its circuit
		}
		add(n, false, loadLabel(l), "")
	}
	for _, b := range sys.Banks {
		if b.Negative != nil {
			add(b.Negative, true, "negative post", "")
		}
	}
	for _, nb := range sys.NegativeBuses {
		part := ""
		if nb.Spec.Part != nil {
			part = nb.Spec.Part.ID
		}
		add(nb.Node, true, "negative bus", part)
	}
	for _, sh := range sys.Shunts {
		p := sh.Spec.Part
		add(sh.Node, true, "shunt "+p.Rating.Text, p.ID)
	}
	return out
}

func loadLabel(l *model.Load) string {
	s := l.Spec
	draw := ""
	switch {
	case s.Current != nil:
		draw = s.Current.Text
	case s.Power != nil:
		draw = s.Power.Text
	}
	if s.Quantity > 1 {
		return fmt.Sprintf("%d × %s", s.Quantity, draw)
	}
	return draw
}
