package energy

import (
	"fmt"
	"sort"

	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/schema"
)

// LoadEnergy is one load's energy in one period of a scenario.
type LoadEnergy struct {
	Name string
	// Wh is the energy drawn from the bank, inverter and converter losses
	// included.
	Wh float64
	// Watts is the load's draw from the bank while on.
	Watts   float64
	Hours   float64
	Duty    float64
	Formula string
	// Windows are the times of day it runs, if the design gives them.
	Windows []schema.Window
}

// ScenarioEnergy is the energy budget of one period of a scenario.
type ScenarioEnergy struct {
	Name  string
	Hours float64
	// Loads are largest first.
	Loads []LoadEnergy
	Wh    float64
	Ah    float64
	// MeanCurrent is the mean current drawn from the bank, A.
	MeanCurrent float64
	// PerDay scales the period to 24 hours.
	WhPerDay float64
}

// Budget returns bank b's energy budget for every scenario, sorted by
// name: each of its loads' current or power × hours × duty × quantity; an
// AC load's energy divided by its inverter's efficiency (nothing on shore
// power through an inverter-charger that passes it through) and a load
// beyond a converter's by the converter's; each inverter's and converter's
// idle draw while it is on.
func Budget(sys *model.System, b *model.Bank) []ScenarioEnergy {
	d := sys.Design
	var out []ScenarioEnergy
	for _, sn := range schema.Names(d.Scenarios) {
		sc := d.Scenarios[sn]
		se := ScenarioEnergy{Name: sn, Hours: sc.Hours}
		acOn := map[*model.Inverter]bool{}
		convOn := map[*model.Converter]bool{}
		for _, l := range b.Loads {
			spec := l.Spec
			h := spec.Hours[sn]
			if h == 0 {
				continue
			}
			q := float64(max(spec.Quantity, 1))
			var w float64
			var formula string
			switch {
			case spec.Current != nil:
				w = spec.Current.Amps() * l.Volts * q
				formula = fmt.Sprintf("%s × %s", spec.Current.Text, model.VoltText(l.Volts))
			case spec.Power != nil:
				w = spec.Power.Watts() * q
				formula = spec.Power.Text
			}
			if q > 1 {
				formula += fmt.Sprintf(" × %g fitted", q)
			}
			if inv := l.Inverter; inv != nil {
				if sc.ShorePower && inv.Spec.Part.PassThrough != nil {
					continue // shore power passed through the inverter-charger
				}
				eff := inv.Spec.Part.Efficiency
				w /= eff
				formula += fmt.Sprintf(" ÷ %g inverter efficiency", eff)
				acOn[inv] = true
			}
			if c := converterOf(sys, l); c != nil {
				eff := c.Spec.Part.Efficiency
				w /= eff
				formula += fmt.Sprintf(" ÷ %g converter efficiency", eff)
				convOn[c] = true
			}
			wh := w * h * spec.Duty
			formula += fmt.Sprintf(" × %g h × duty %g", h, spec.Duty)
			se.Loads = append(se.Loads, LoadEnergy{Name: l.Name, Wh: wh, Watts: w, Hours: h, Duty: spec.Duty, Formula: formula, Windows: spec.Windows})
		}
		for _, inv := range sys.Inverters {
			if inv.Node.Bank != b {
				continue
			}
			h, given := inv.Spec.Hours[sn]
			if !given {
				if !acOn[inv] {
					continue
				}
				h = sc.Hours
			}
			if h == 0 {
				continue
			}
			w := inv.Spec.Part.Idle.Watts()
			se.Loads = append(se.Loads, LoadEnergy{
				Name: "inverter " + inv.Name + " idle", Wh: w * h, Watts: w, Hours: h, Duty: 1,
				Formula: fmt.Sprintf("idle %s × %g h", inv.Spec.Part.Idle.Text, h),
			})
		}
		for _, c := range sys.Converters {
			if c.Node.Bank != b || !convOn[c] || c.Spec.Part.Idle.Watts() == 0 {
				continue
			}
			w := c.Spec.Part.Idle.Watts()
			se.Loads = append(se.Loads, LoadEnergy{
				Name: "converter " + c.Name + " idle", Wh: w * sc.Hours, Watts: w, Hours: sc.Hours, Duty: 1,
				Formula: fmt.Sprintf("idle %s × %g h", c.Spec.Part.Idle.Text, sc.Hours),
			})
		}
		sort.SliceStable(se.Loads, func(i, j int) bool { return se.Loads[i].Wh > se.Loads[j].Wh })
		for _, l := range se.Loads {
			se.Wh += l.Wh
		}
		se.Ah = se.Wh / b.Volts
		se.MeanCurrent = se.Ah / sc.Hours
		se.WhPerDay = se.Wh * 24 / sc.Hours
		out = append(out, se)
	}
	return out
}

// converterOf is the converter a DC load hangs beyond, or nil.
func converterOf(sys *model.System, l *model.Load) *model.Converter {
	for _, c := range sys.Converters {
		for _, x := range c.Loads {
			if x == l {
				return c
			}
		}
	}
	return nil
}
