package checks

import (
	"fmt"
	"math"
	"strings"

	"github.com/ampwright/ampwright/energy"
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
	"github.com/ampwright/ampwright/schema/unit"
)

// inverting reports whether inverter inv inverts in scenario sn: not on
// shore power when it is an inverter-charger that passes shore power
// through.
func inverting(in *Input, inv *model.Inverter) func(string) bool {
	return func(sn string) bool {
		return !(in.Design.Scenarios[sn].ShorePower && inv.Spec.Part.PassThrough != nil)
	}
}

// acTogether is the AC loads of inv that run together at most, W, when
// the inverter inverts.
func acTogether(in *Input, inv *model.Inverter) energy.Together {
	return energy.RunTogether(in.Sys, inv.Loads, energy.ACPower, inverting(in, inv))
}

// whenText says when loads run together: "anchor at 19:00", or "anchor,
// any hour" when none of them has a time window to keep it apart.
func whenText(scenario string, hour int, ls []*model.Load) string {
	for _, l := range ls {
		if len(l.Spec.Windows) > 0 {
			return fmt.Sprintf("%s at %02d:00", scenario, hour)
		}
	}
	return scenario + ", any hour"
}

func loadNames(ls []*model.Load) string {
	var names []string
	for _, l := range ls {
		names = append(names, l.Name)
	}
	return strings.Join(names, ", ")
}

// InverterContinuous checks an inverter's continuous rating against the AC
// loads that run together.
var InverterContinuous = &Check{
	ID:    result.CheckInverterLoad,
	Title: "inverter continuous rating at least the AC loads that run together",
	Doc: `Checks that each inverter can carry the AC loads that run together.

Method: in each scenario (but one on shore power through an
inverter-charger that passes it through), each hour of the day, the AC
loads that run in the scenario and whose time windows hold the hour (a load
without windows may run at any hour) run together at full power:

    P_together = Σ P_load × quantity

The largest P_together is the inverter's demand. Give loads that never run
together time windows that do not overlap.

Limit: the inverter's continuous rating (maker's data).`,
	Run: func(in *Input, out *Report) {
		for _, inv := range in.Sys.Inverters {
			if len(inv.Loads) == 0 {
				continue
			}
			p := inv.Spec.Part
			tg := acTogether(in, inv)
			var inputs []result.Input
			for _, l := range tg.Loads {
				inputs = append(inputs, result.Input{Name: l.Name, Value: round(energy.ACPower(l), 1), Unit: "W", From: l.Path})
			}
			out.Figure(result.Figure{
				ID: result.FigInverterDemand, Subject: inv.Name, Value: round(tg.Value, 1), Unit: "W",
				Formula: "P_together = Σ P_load × quantity of the AC loads on at once",
				Inputs:  inputs,
				Source:  "the loads' scenarios and time windows",
			})
			lim := p.Continuous.Watts()
			f := result.Finding{
				Subject: inv.Name, Value: round(tg.Value, 1), Limit: lim, Unit: "W", Margin: round(lim-tg.Value, 1),
				Source: "catalog data for " + p.ID, Position: in.Position(inv.Path), Status: result.Pass,
				Message: fmt.Sprintf("%s W together (%s: %s) against %s continuous", fnum(tg.Value), whenText(tg.Scenario, tg.Hour, tg.Loads), loadNames(tg.Loads), p.Continuous.Text),
			}
			if tg.Value > lim+1e-9 {
				f.Status = result.Fail
				f.Change = fmt.Sprintf("an inverter of at least %s W continuous, or time windows that keep these loads from running together", fnum(math.Ceil(tg.Value/100)*100))
			}
			out.Add(f)
		}
	},
}

// InverterSurge checks an inverter's surge rating against the largest
// start among the loads that run together.
var InverterSurge = &Check{
	ID:    result.CheckInverterSurge,
	Title: "inverter surge rating at least the largest start on top of the running loads",
	Doc: `Checks that each inverter can start its largest motor while the other AC
loads run.

Method: at each hour of each scenario (as in inverter.continuous), the
loads on run at full power and the one whose start adds most starts:

    P_peak = Σ P_load + max(P_start − P_load)

P_start is a load's surgePower (its motor's or its inrush's starting power,
maker's data or measured).

Limit: the inverter's surge rating (maker's data). An inverter whose catalog
entry gives none is a warning when one of its loads gives a starting power.`,
	Run: func(in *Input, out *Report) {
		for _, inv := range in.Sys.Inverters {
			p := inv.Spec.Part
			var peak, running float64
			var starter *model.Load
			var when string
			ok := inverting(in, inv)
			for _, sn := range schema.Names(in.Design.Scenarios) {
				if !ok(sn) {
					continue
				}
				for h := 0; h < 24; h++ {
					var sum, extra float64
					var st *model.Load
					for _, l := range inv.Loads {
						if l.Spec.Hours[sn] <= 0 || !energy.OnAt(l.Spec.Windows, h) {
							continue
						}
						sum += energy.ACPower(l)
						if l.Spec.SurgePower != nil {
							if e := l.Spec.SurgePower.Watts() - energy.ACPower(l)/float64(max(l.Spec.Quantity, 1)); e > extra {
								extra, st = e, l
							}
						}
					}
					if st != nil && sum+extra > peak+1e-9 {
						peak, running, starter, when = sum+extra, sum, st, fmt.Sprintf("%s at %02d:00", sn, h)
					}
				}
			}
			if starter == nil {
				continue
			}
			out.Figure(result.Figure{
				ID: result.FigInverterPeak, Subject: inv.Name, Value: round(peak, 1), Unit: "W",
				Formula: "P_peak = Σ P_load + max(P_start − P_load)",
				Inputs: []result.Input{
					{Name: "Σ P_load", Value: round(running, 1), Unit: "W", From: "AC loads on at once, " + when},
					{Name: "P_start", Value: starter.Spec.SurgePower.Watts(), Unit: "W", From: starter.Path + ".surgePower"},
				},
				Source: "the loads' scenarios, time windows and starting power",
			})
			f := result.Finding{
				Subject: inv.Name, Value: round(peak, 1), Unit: "W",
				Position: in.Position(inv.Path), Status: result.Pass, Source: "catalog data for " + p.ID,
			}
			if p.Surge == nil {
				f.Status = result.Warn
				f.Message = fmt.Sprintf("%s W at the start of %s (%s); the catalog gives no surge rating for %s", fnum(peak), starter.Name, when, p.ID)
				f.Change = "check the inverter's surge rating on its datasheet and give it in the catalog"
				out.Add(f)
				continue
			}
			lim := p.Surge.Watts()
			f.Limit, f.Margin = lim, round(lim-peak, 1)
			f.Message = fmt.Sprintf("%s W running + %s's start (%s) = %s W against %s surge (%s)", fnum(running), starter.Name, starter.Spec.SurgePower.Text, fnum(peak), p.Surge.Text, when)
			if peak > lim+1e-9 {
				f.Status = result.Fail
				f.Change = fmt.Sprintf("an inverter with at least %s W surge, a soft starter on %s, or a time window that keeps it from starting while the others run", fnum(math.Ceil(peak/100)*100), starter.Name)
			}
			out.Add(f)
		}
	},
}

// InverterDC checks an inverter's DC feeder and its fuse at the current it
// draws at full output on a nearly flat bank.
var InverterDC = &Check{
	ID:    result.CheckInverterDC,
	Title: "inverter DC cable and fuse sized at its current at the low-voltage cut-off",
	Doc: `Checks the run that feeds each inverter at the largest current the
inverter draws: its continuous output on a bank at its low-voltage cut-off
(common practice):

    I_cutoff = P_continuous / (η × V_cutoff)

V_cutoff is the inverter's own cut-off voltage from the catalog, else the
rulebook's fraction of nominal (default 0.875: 10.5 V on a 12 V system,
common practice).

Limits: the run's derated ampacity (see wiring.ampacity), and the rating of
the device that protects it, which must be at least I_cutoff or it opens at
full output on a low bank (and at most the rulebook's ratio × ampacity, see
protection.rating).`,
	Run: func(in *Input, out *Report) {
		for _, inv := range in.Sys.Inverters {
			r := inv.Node.In
			if r == nil {
				continue
			}
			p := inv.Spec.Part
			vcut, cutFrom := 0.0, ""
			switch {
			case p.Cutoff != nil:
				vcut, cutFrom = p.Cutoff.Volts(), "catalog data for "+p.ID
			case in.Rules.Inverter != nil:
				vcut, cutFrom = in.Rules.Inverter.Cutoff*inv.Node.Volts, sourced(in.Rules.Inverter.Sourced)
			default:
				continue
			}
			i := p.Continuous.Watts() / (p.Efficiency * vcut)
			out.Figure(result.Figure{
				ID: result.FigInverterDCCurrent, Subject: inv.Name, Value: round(i, 2), Unit: "A",
				Formula: "I_cutoff = P_continuous / (η × V_cutoff)",
				Inputs: []result.Input{
					{Name: "P_continuous", Value: p.Continuous.Watts(), Unit: "W", From: "catalog data for " + p.ID},
					{Name: "η", Value: p.Efficiency, From: "catalog data for " + p.ID},
					{Name: "V_cutoff", Value: round(vcut, 3), Unit: "V", From: cutFrom},
				},
				Source: "common practice: the inverter's current at full output on a bank at its cut-off",
			})
			a := in.Sys.RunAmpacity(r, r.Spec.Size)
			lim, what := a.Derated, fmt.Sprintf("%s allowed on %s", amps(a.Derated), r.Spec.Size.Text)
			dev := r
			if r.Spec.Protection == nil {
				dev = upstreamDevice(r)
			}
			if dev != nil && dev.Spec.Protection.Rating.Amps() < lim {
				lim, what = dev.Spec.Protection.Rating.Amps(), fmt.Sprintf("the %s %s on %q", dev.Spec.Protection.Rating.Text, dev.Spec.Protection.Kind, dev.Name)
			}
			f := result.Finding{
				Subject: inv.Name, Value: round(i, 2), Limit: round(lim, 2), Unit: "A", Margin: round(lim-i, 2),
				Source: cutFrom, Position: in.Position(r.Path), Status: result.Pass,
				Message: fmt.Sprintf("%s ÷ (%g × %s) = %s at the cut-off, on run %q, against %s", p.Continuous.Text, p.Efficiency, volts(vcut), amps(i), r.Name, what),
			}
			if !a.OK || i > lim+1e-9 {
				f.Status = result.Fail
				if s, ok := smallestFor(in, r, i); ok && s.MM2() > r.Spec.Size.MM2()*(1+1e-9) {
					f.Change = fmt.Sprintf("run %q in %s", r.Name, s.String())
				}
				if rating, ok := fittingRating(in, i, math.Max(a.Derated, lim)); ok && (dev == nil || dev.Spec.Protection.Rating.Amps() < i) {
					if f.Change != "" {
						f.Change += ", "
					}
					f.Change += fmt.Sprintf("protected at %g A", rating)
				}
			}
			out.Add(f)
		}
	},
}

// smallestFor is the smallest standard size of run r's family, at least its
// own, whose derated ampacity carries current i.
func smallestFor(in *Input, r *model.Run, i float64) (sz unit.Size, ok bool) {
	for _, s := range standardSizes(in, r.Spec.Size) {
		if s.MM2() < r.Spec.Size.MM2()*(1-1e-9) {
			continue
		}
		if a := in.Sys.RunAmpacity(r, s); a.OK && a.Derated >= i {
			return s, true
		}
	}
	return sz, false
}
