package energy

import (
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/schema"
)

// Together is the largest sum a set of loads reaches together, and when.
type Together struct {
	// Value is the sum, in the unit of the value function.
	Value float64
	// Scenario and Hour say when (the first such hour), and Loads which
	// loads were on then, by name.
	Scenario string
	Hour     int
	Loads    []*model.Load
}

// RunTogether finds when the loads can draw most together: in each
// scenario (those include accepts, every one when it is nil), each hour of
// the day, the loads that run in the scenario and whose time windows hold
// the hour (a load without windows may run at any hour) are on at their
// full draw, value(l) each. Duty cycles do not reduce it: a compressor that
// cycles still runs at full draw when on.
func RunTogether(sys *model.System, loads []*model.Load, value func(*model.Load) float64, include func(string) bool) Together {
	var best Together
	for _, sn := range schema.Names(sys.Design.Scenarios) {
		if include != nil && !include(sn) {
			continue
		}
		for h := 0; h < 24; h++ {
			var sum float64
			var on []*model.Load
			for _, l := range loads {
				if l.Spec.Hours[sn] <= 0 || !OnAt(l.Spec.Windows, h) {
					continue
				}
				sum += value(l)
				on = append(on, l)
			}
			if sum > best.Value+1e-9 {
				best = Together{Value: sum, Scenario: sn, Hour: h, Loads: on}
			}
		}
	}
	return best
}

// OnAt reports whether hour h (0–23) of the day falls in one of the
// windows, any hour when there are none: a window from 18 to 23 holds the
// hours from 18:00 to 23:00; one from 22 to 6 runs past midnight.
func OnAt(windows []schema.Window, h int) bool {
	if len(windows) == 0 {
		return true
	}
	t := float64(h) + 0.5
	for _, w := range windows {
		switch {
		case w.From == w.To:
			return true
		case w.From < w.To && t >= w.From && t < w.To:
			return true
		case w.From > w.To && (t >= w.From || t < w.To):
			return true
		}
	}
	return false
}

// BankCurrent is what load l draws from its bank at full draw, A: a DC
// load's current, through its converter at the converter's efficiency
// and voltages; an AC load's power through its inverter at the bank's
// nominal voltage.
func BankCurrent(sys *model.System, l *model.Load) float64 {
	if inv := l.Inverter; inv != nil {
		p := ACPower(l)
		return p / inv.Spec.Part.Efficiency / inv.Node.Volts
	}
	i := l.Current
	if c := converterOf(sys, l); c != nil {
		i = i * c.Out / (c.Spec.Part.Efficiency * c.In)
	}
	return i
}

// BankSurge is the extra current a load's start draws from its bank above
// its running current, A.
func BankSurge(sys *model.System, l *model.Load) float64 {
	if inv := l.Inverter; inv != nil {
		if l.Spec.SurgePower == nil {
			return 0
		}
		q := float64(max(l.Spec.Quantity, 1))
		extra := l.Spec.SurgePower.Watts()*q - ACPower(l)
		return max(0, extra) / inv.Spec.Part.Efficiency / inv.Node.Volts
	}
	if l.Spec.Surge == nil {
		return 0
	}
	extra := max(0, l.Spec.Surge.Amps()-l.Current)
	if c := converterOf(sys, l); c != nil {
		extra = extra * c.Out / (c.Spec.Part.Efficiency * c.In)
	}
	return extra
}

// ACPower is an AC load's running power, all of them fitted, W.
func ACPower(l *model.Load) float64 {
	q := float64(max(l.Spec.Quantity, 1))
	switch {
	case l.Spec.Power != nil:
		return l.Spec.Power.Watts() * q
	case l.Spec.Current != nil:
		// An AC load given in amperes is taken as the energy budget takes
		// it: that current at the nominal voltage of its inverter's side.
		return l.Spec.Current.Amps() * l.Volts * q
	}
	return 0
}
