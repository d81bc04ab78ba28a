package checks

import (
	"fmt"
	"math"

	"github.com/ampwright/ampwright/energy"
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// Autonomy checks that the bank carries the required days without charge.
var Autonomy = &Check{
	ID:    result.CheckAutonomy,
	Title: "bank carries the required days without charge within its depth of discharge",
	Doc: `Checks that the bank alone carries the named scenario's loads for the
required number of days without any charge, within its depth of discharge.

Method:

    E_usable = V_bank × C_bank × DoD × F_temp × F_eol
    days     = E_usable × (C_eff / C_bank) / E_day

V_bank × C_bank is the nominal energy (N_series × V_battery × N_parallel ×
C_battery). DoD is the usable depth of discharge (bank override, maker's
data, or the rulebook's default for the chemistry). F_temp is the capacity
available at the bank's temperature: for lead-acid, 1 ÷ the rulebook's
sizing factor (IEEE 485 Table 1), for LiFePO4 1. F_eol is the fraction of
capacity left at end of life. For lead-acid, C_eff is the capacity at the
scenario's mean current by Peukert's law, C_eff = C × (C / (I × H))^(k − 1),
not above C. E_day is the scenario's energy per 24 hours.

Limit: days at least the design's autonomy.days.`,
	Run: func(in *Input, out *Report) {
		d := in.Design
		bank := in.Sys.Primary()
		if d.Autonomy == nil || bank == nil {
			return
		}
		bm := energy.Bank(bank, in.Rules)
		var se energy.ScenarioEnergy
		for _, s := range in.Energy.Budget {
			if s.Name == d.Autonomy.Scenario {
				se = s
			}
		}
		ceff, peukertNote := energy.PeukertFor(bank, se.MeanCurrent)
		days := math.Inf(1)
		if se.WhPerDay > 0 {
			days = bm.Usable * ceff / bm.Capacity / se.WhPerDay
		}
		out.Figure(result.Figure{
			ID: result.FigBankAutonomy, Subject: d.Autonomy.Scenario, Value: round(days, 3), Unit: "days",
			Formula: "days = V_bank × C_bank × DoD × F_temp × F_eol × (C_eff / C_bank) / E_day",
			Inputs: append(bm.Inputs(bank.Path),
				result.Input{Name: "C_eff / C_bank", Value: round(ceff/bm.Capacity, 4), From: peukertNote},
				result.Input{Name: "E_day", Value: round(se.WhPerDay, 1), Unit: "Wh", From: "energy budget of " + d.Autonomy.Scenario},
			),
			Source: "definition; " + bm.DoDSource,
		})
		f := result.Finding{
			Subject: d.Autonomy.Scenario, Value: round(days, 2), Limit: d.Autonomy.Days, Unit: "days",
			Margin: round(days-d.Autonomy.Days, 2), Source: bm.DoDSource, Position: in.Position("autonomy"),
			Status: result.Pass,
			Message: fmt.Sprintf("%.0f Wh usable (%.0f Wh × DoD %g × %.3g × %g) × %.3g ÷ %.0f Wh/day = %.2f days; %g required",
				bm.Usable, bm.Nominal, bm.DoD, bm.TempFactor, bm.EndOfLife, ceff/bm.Capacity, se.WhPerDay, days, d.Autonomy.Days),
		}
		if days < d.Autonomy.Days {
			f.Status = result.Fail
			need := d.Autonomy.Days / days * float64(bank.Spec.Parallel)
			f.Change = fmt.Sprintf("about %d batteries in parallel (now %d), or less energy per day in %s", int(math.Ceil(need)), bank.Spec.Parallel, d.Autonomy.Scenario)
		}
		out.Add(f)
	},
}

// ChargeRate checks the charge current against the chemistry's limits.
var ChargeRate = &Check{
	ID:    result.CheckChargeRate,
	Title: "charge current within the chemistry's limits",
	Doc: `Checks the largest charge current the controllers can deliver against
what the bank accepts.

Method: I_charge is the largest current the sources give together in any
scenario: the solar controllers' rated output plus every other charger
(alternator, shore charger, generator, DC-DC) that runs in that scenario. For lead-acid, as a fraction
of the bank's rated capacity, I_charge / C_bank, against the rulebook's
bounds (default 10–30 % of C, common practice): above the upper bound
fails (gassing, heat); below the lower bound warns (a bank charged that
slowly from solar alone may not reach full charge and sulphates). For
LiFePO4, I_charge against N_parallel × the battery's maximum charge current
from its data.`,
	Run: func(in *Input, out *Report) {
		for _, b := range in.Sys.Banks {
			chargeRate(in, b, out)
		}
	},
}

// chargeRate checks the charge current into bank b.
func chargeRate(in *Input, b *model.Bank, out *Report) {
	d := in.Design
	var solarOut float64
	for _, src := range b.Sources {
		if src.Kind == model.Solar {
			solarOut += src.Output
		}
	}
	// The largest current the sources give together in any scenario.
	ic, worst := solarOut, ""
	for _, sn := range schema.Names(d.Scenarios) {
		i := solarOut + chargingIn(in.Sys, b, sn, d.Scenarios[sn])
		if i > ic {
			ic, worst = i, sn
		}
	}
	if ic == 0 {
		return
	}
	spec := b.Spec
	capBank := b.Capacity()
	f := result.Finding{Subject: b.Name, Position: in.Position(b.Path), Status: result.Pass}
	from := "the solar controllers"
	if worst != "" {
		from = "the sources charging together in " + worst
	}
	if spec.Battery.LeadAcid() {
		cr := in.Rules.ChargeRate
		frac := ic / capBank
		f.Value, f.Limit, f.Unit = round(frac*100, 2), cr.LeadAcidMax*100, "% of C"
		f.Margin = round((cr.LeadAcidMax-frac)*100, 2)
		f.Source = sourced(cr.Sourced)
		f.Message = fmt.Sprintf("%s from %s ÷ %g Ah = %.1f %% of C; bounds %g–%g %%", amps(ic), from, capBank, frac*100, cr.LeadAcidMin*100, cr.LeadAcidMax*100)
		switch {
		case spec.Battery.MaxCharge != nil && ic > spec.Battery.MaxCharge.Amps()*float64(spec.Parallel)+1e-9:
			// The maker's maximum binds before the rule of thumb's.
			lim := spec.Battery.MaxCharge.Amps() * float64(spec.Parallel)
			f.Status = result.Fail
			f.Value, f.Limit, f.Unit, f.Margin = round(ic, 2), lim, "A", round(lim-ic, 2)
			f.Source = "catalog data for " + spec.Battery.ID
			f.Message = fmt.Sprintf("%s from %s against the maker's %d × %s = %s", amps(ic), from, spec.Parallel, spec.Battery.MaxCharge.Text, amps(lim))
			f.Change = fmt.Sprintf("limit the charge current to %s", amps(lim))
		case frac > cr.LeadAcidMax:
			f.Status = result.Fail
			f.Change = fmt.Sprintf("limit the charge current to %s", amps(cr.LeadAcidMax*capBank))
		case frac < cr.LeadAcidMin:
			f.Status = result.Warn
			f.Change = fmt.Sprintf("%s or more of charge would reach full charge reliably (alternator or shore charger)", amps(cr.LeadAcidMin*capBank))
		}
	} else {
		f.Unit = "A"
		f.Value = round(ic, 2)
		f.Source = "catalog data for " + spec.Battery.ID
		if spec.Battery.MaxCharge == nil {
			f.Status = result.Warn
			f.Message = fmt.Sprintf("the catalog gives no maximum charge current for %s; check %s against its data", spec.Battery.ID, amps(ic))
		} else {
			lim := spec.Battery.MaxCharge.Amps() * float64(spec.Parallel)
			f.Message = fmt.Sprintf("%s from %s against %d × %s = %s", amps(ic), from, spec.Parallel, spec.Battery.MaxCharge.Text, amps(lim))
			// At the bank's temperature a lithium cell accepts less.
			if k, src := energy.ChargeFactor(spec.Battery, spec.Temperature.Celsius(), in.Rules); k < 1 {
				lim *= k
				f.Message += fmt.Sprintf(" × %g at %s = %s", k, spec.Temperature.Text, amps(lim))
				f.Source += "; " + src
			}
			f.Limit, f.Margin = round(lim, 2), round(lim-ic, 2)
			if ic > lim+1e-9 {
				f.Status = result.Fail
				f.Change = fmt.Sprintf("limit the charge current to %s", amps(lim))
			}
		}
	}
	out.Add(f)
}

// chargingIn is the current bank b's sources other than solar give
// together in scenario sn: its chargers and inverter-chargers that run in
// it, and the links into it while a charger of the other bank runs.
func chargingIn(sys *model.System, b *model.Bank, sn string, sc schema.Scenario) float64 {
	runs := func(src *model.Source) bool {
		switch {
		case src.Charger != nil:
			return src.Charger.ChargeHours(sn, sc) > 0
		case src.Inverter != nil:
			if c := src.Inverter.Spec.Charging; c != nil {
				if h, ok := c.Hours[sn]; ok {
					return h > 0
				}
			}
			return sc.ShorePower
		}
		return false
	}
	var i float64
	for _, src := range b.Sources {
		if runs(src) {
			i += src.Output
		}
	}
	for _, l := range sys.Links {
		other := l.From
		switch {
		case l.To == b:
		case l.From == b && l.Spec.Part.Kind == "combiner":
			other = l.To
		default:
			continue
		}
		var feed float64
		for _, src := range other.Sources {
			if runs(src) {
				feed += src.Output
			}
		}
		cap, _ := sys.LinkCurrent(l)
		i += math.Min(feed, cap)
	}
	return i
}

// ColdCharge checks lithium charging below its low-temperature limit.
var ColdCharge = &Check{
	ID:    result.CheckColdCharge,
	Title: "no lithium charging below its low-temperature limit",
	Doc: `Checks that a LiFePO4 bank is not charged below the lowest temperature its
maker allows.

Method: the bank's design temperature and the site's record low against
the battery's chargeLowLimit. The bank's temperature below the limit
fails; the record low below it warns: charging must then be cut off at low
temperature (by the battery's management system or the controllers).

Source: the maker's data for the battery, as entered in the catalog.`,
	Run: func(in *Input, out *Report) {
		d := in.Design
		for _, b := range in.Sys.Banks {
			bt := b.Spec.Battery
			if bt.LeadAcid() || bt.ChargeLowLimit == nil {
				continue
			}
			lim := bt.ChargeLowLimit.Celsius()
			tb, tl := b.Spec.Temperature.Celsius(), d.Site.RecordLow.Celsius()
			u := unitsOf(in)
			v, unit := u.temp(math.Min(tb, tl))
			l, _ := u.temp(lim)
			f := result.Finding{
				Subject: b.Name, Value: v, Limit: l, Unit: unit, Margin: round(v-l, 2),
				Source: "catalog data for " + bt.ID, Position: in.Position(b.Path), Status: result.Pass,
				Message: fmt.Sprintf("bank at %s, record low %s, charge limit %s", u.tempText(tb), u.tempText(tl), u.tempText(lim)),
			}
			switch {
			case tb < lim:
				f.Status = result.Fail
				f.Change = "move or heat the bank, or choose a battery that may be charged at " + u.tempText(tb)
			case tl < lim:
				f.Status = result.Warn
				f.Change = "make sure charging is cut off below " + u.tempText(lim) + " (battery management or controller low-temperature cut-off)"
			}
			out.Add(f)
		}
	},
}

// EnergyBudget reports the energy each scenario draws from the bank.
var EnergyBudget = &Check{
	ID:    result.CheckEnergyBudget,
	Title: "energy drawn from the bank in each scenario",
	Doc: `Reports the energy budget of every scenario; it has no limit of its own
(bank.autonomy and the voyage simulation use it).

Method, for each load in one period of the scenario:

    E = P × h × duty × quantity          (P = I × V_nominal for a load given in amperes)
    E_AC = P_AC × h × duty × quantity / η_inverter
    E_idle = P_idle × h_on               (an inverter, while on)

The scenario's energy is the sum, also given in Ah at the nominal voltage
and per 24 hours. Loads are listed largest first.`,
	Run: func(in *Input, out *Report) {
		primary := in.Sys.Primary()
		for _, bb := range in.Energy.Budgets {
			for _, se := range bb.Scenarios {
				var inputs []result.Input
				for _, l := range se.Loads {
					inputs = append(inputs, result.Input{Name: l.Name, Value: round(l.Wh, 2), Unit: "Wh", From: l.Formula})
				}
				out.Figure(result.Figure{
					ID: result.FigEnergyScenario, Subject: ScenarioSubject(in.Sys, bb.Bank, se.Name), Value: round(se.Wh, 2), Unit: "Wh",
					Formula: fmt.Sprintf("E = Σ loads over %g h = %.1f Ah at %s", se.Hours, se.Ah, model.VoltText(bb.Bank.Volts)),
					Inputs:  inputs,
					Source:  "definition",
				})
			}
		}
		for _, b := range in.Sys.Banks {
			if b != primary && len(b.Loads) == 0 && !in.Sys.MultiBank() {
				continue
			}
			bm := energy.Bank(b, in.Rules)
			out.Figure(result.Figure{
				ID: result.FigBankUsableEnergy, Subject: b.Name, Value: round(bm.Usable, 1), Unit: "Wh",
				Formula: "E_usable = V_bank × C_bank × DoD × F_temp × F_eol",
				Inputs:  bm.Inputs(b.Path),
				Source:  bm.DoDSource,
			})
		}
	},
}

// ScenarioSubject is the subject of a scenario's figures: the scenario's
// name for the primary bank, the scenario and the bank for another.
func ScenarioSubject(sys *model.System, b *model.Bank, scenario string) string {
	if b == sys.Primary() {
		return scenario
	}
	return scenario + " (" + b.Name + ")"
}
