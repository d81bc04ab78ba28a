package model

import (
	"fmt"
	"sort"
	"strings"

	"github.com/ampwright/ampwright/schema"
)

// subtree returns r and every run beyond it, stopping at a converter: the
// runs beyond one are at its output voltage and reach r through the
// converter's input current.
func subtree(r *Run) []*Run {
	out := []*Run{r}
	if r.DownNode.Kind == KindConverter {
		return out
	}
	for _, k := range r.Children {
		out = append(out, subtree(k)...)
	}
	return out
}

// VoltText writes a nominal voltage as the schema does: "12 V".
func VoltText(v float64) string { return fmt.Sprintf("%g V", v) }

// currents sets each run's design current: for ampacity the loads it
// feeds at full draw (duty applies to energy only), an inverter at its
// continuous rating, a converter at its rated output, a DC-DC charger's
// input at its rated output, a source's rated output, a link the charge it
// can pass, and PV runs at the rulebook's factor × Isc of the strings
// they carry.
func (b *builder) currents() {
	s := b.s
	rules := s.Rules
	links := b.linksByNode()
	convs := map[*Node]*Converter{}
	for _, c := range s.Converters {
		convs[c.Node] = c
	}
	inverters := map[*Node]*Inverter{}
	for _, inv := range s.Inverters {
		inverters[inv.Node] = inv
	}
	sources := map[*Node]*Source{}
	for _, src := range s.Sources {
		if src.Kind != InverterCharger {
			sources[src.Node] = src
		}
	}
	for _, r := range s.Runs {
		var loads, charge float64
		var terms []string
		reach := map[string]*Run{} // node → the run of the subtree that reaches it
		var imp, vmp float64
		pwm := false
		for _, x := range subtree(r) {
			reach[x.Down] = x
			for _, l := range b.feed[x] {
				loads += l.Current
				r.Loads = append(r.Loads, l.Name)
				terms = append(terms, fmt.Sprintf("%s %s", l.Name, amps(l.Current)))
			}
		}
		for _, n := range schema.Names(reach) {
			node := s.Nodes[n]
			switch node.Kind {
			case KindInverter:
				inv := inverters[node]
				p := inv.Spec.Part
				i := p.Continuous.Watts() / p.Efficiency / node.Volts
				loads += i
				terms = append(terms, fmt.Sprintf("inverter %s %s (%s ÷ %g ÷ %s)", n, amps(i), p.Continuous.Text, p.Efficiency, VoltText(node.Volts)))
				for _, l := range inv.Loads {
					r.Loads = append(r.Loads, l.Name)
				}
				if p.Charger != nil {
					charge += p.Charger.Amps()
				}
			case KindConverter:
				c := convs[node]
				p := c.Spec.Part
				i := p.Rating.Amps() * c.Out / (p.Efficiency * c.In)
				loads += i
				terms = append(terms, fmt.Sprintf("converter %s %s (%s × %s ÷ %g ÷ %s)", n, amps(i), p.Rating.Text, VoltText(c.Out), p.Efficiency, VoltText(c.In)))
				for _, l := range c.Loads {
					r.Loads = append(r.Loads, l.Name)
				}
			case KindLink:
				l := links[node]
				p := l.Spec.Part
				if p.Kind == "dc-dc" && reach[n] == l.FromRun {
					i := p.Rating.Amps() * l.To.Volts / (p.Efficiency * l.From.Volts)
					loads += i
					terms = append(terms, fmt.Sprintf("DC-DC charger %s input %s (%s × %s ÷ %g ÷ %s)", n, amps(i), p.Rating.Text, VoltText(l.To.Volts), p.Efficiency, VoltText(l.From.Volts)))
					continue
				}
				i, _ := s.LinkCurrent(l)
				charge += i
			case KindController:
				if r.Role != PV {
					charge += sources[node].Output
				}
			case KindCharger:
				charge += sources[node].Output
			case KindArray:
				var a *Array
				for _, x := range s.Arrays {
					if x.Node == node {
						a = x
					}
				}
				r.Strings += a.Spec.Strings
				r.Isc = a.Spec.Module.Isc.Amps()
				imp += a.Spec.Module.Imp.Amps() * float64(a.Spec.Strings)
				vmp = a.Spec.Module.Vmp.Volts() * float64(a.Spec.Series)
				if a.Controller != nil && a.Controller.Spec.Part.Kind == "pwm" {
					pwm = true
				}
			}
		}
		sort.Strings(r.Loads)
		r.DropVoltage, r.VoltBasis = r.Volts, "nominal system voltage"
		if r.Volts != s.Volts {
			r.VoltBasis = "nominal voltage of its side"
		}
		if r.Role == PV {
			r.DropCurrent = imp
			r.DropBasis = fmt.Sprintf("strings at maximum power: Imp × strings = %s", amps(imp))
			if !pwm {
				r.DropVoltage, r.VoltBasis = vmp, fmt.Sprintf("string Vmp %.4g V (MPPT)", vmp)
			} else {
				r.VoltBasis = "PWM holds the array at battery voltage"
			}
		}
		switch {
		case r.Role == PV:
			f := rules.PV.ConductorFactor
			r.Current = f * r.Isc * float64(r.Strings)
			r.Basis = fmt.Sprintf("%g × Isc %s × %d string(s) (%s)", f, amps(r.Isc), r.Strings, rules.PV.Source)
		case charge > loads:
			r.Current = charge
			r.Basis = fmt.Sprintf("charge sources' rated output %s", amps(charge))
		default:
			r.Current = loads
			if len(terms) == 0 {
				r.Basis = "no load downstream"
			} else {
				r.Basis = "loads at full draw: " + strings.Join(terms, " + ")
			}
		}
		if r.Role != PV {
			r.DropCurrent, r.DropBasis = r.Current, r.Basis
		}
	}
}

// classes sets each run's voltage-drop class.
func (b *builder) classes() {
	s := b.s
	vd := s.Rules.VoltageDrop
	critical := map[string]bool{}
	for _, k := range vd.CriticalKinds {
		critical[k] = true
	}
	buses := map[*Node]*Bus{}
	for _, bus := range s.Buses {
		buses[bus.Node] = bus
	}
	for _, r := range s.Runs {
		switch {
		case r.Spec.Class != "":
			r.Class, r.ClassBasis = r.Spec.Class, "given in the design"
			continue
		case r.Role != Supply:
			r.Class, r.ClassBasis = vd.Charging, "solar and charge runs (rulebook)"
			continue
		case r.DownNode.Kind == KindBus && buses[r.DownNode].Spec.Kind == "panel":
			r.Class, r.ClassBasis = "critical", fmt.Sprintf("panelboard feeder to %q", r.Down)
			continue
		}
		r.Class, r.ClassBasis = "other", "no critical load downstream"
		for _, ln := range r.Loads {
			l := s.Load(ln).Spec
			if l.Class == "critical" || (l.Class == "" && critical[l.Kind]) {
				r.Class, r.ClassBasis = "critical", fmt.Sprintf("feeds %s (%s)", ln, l.Kind)
				break
			}
		}
	}
}
