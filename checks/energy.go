package checks

import (
	"fmt"
	"math"
	"sort"

	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// LoadEnergy is one load's energy in one period of a scenario.
type LoadEnergy struct {
	Name string
	// Wh is the energy drawn from the bank, inverter losses included.
	Wh float64
	// Watts is the load's draw from the bank while on.
	Watts   float64
	Hours   float64
	Duty    float64
	Formula string
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

// Budget returns the energy budget of every scenario, sorted by name: each
// load's current or power × hours × duty × quantity, an AC load's energy
// divided by its inverter's efficiency, and each inverter's idle draw while
// it is on.
func Budget(d *schema.Design) []ScenarioEnergy {
	vsys := d.Vessel.SystemVolts()
	var out []ScenarioEnergy
	for _, sn := range schema.Names(d.Scenarios) {
		sc := d.Scenarios[sn]
		se := ScenarioEnergy{Name: sn, Hours: sc.Hours}
		acOn := map[string]bool{}
		for _, ln := range schema.Names(d.Loads) {
			l := d.Loads[ln]
			h := l.Hours[sn]
			if h == 0 {
				continue
			}
			q := float64(max(l.Quantity, 1))
			var w float64
			var formula string
			switch {
			case l.Current != nil:
				w = l.Current.Amps() * vsys * q
				formula = fmt.Sprintf("%s × %s", l.Current.Text, d.Vessel.System)
			case l.Power != nil:
				w = l.Power.Watts() * q
				formula = l.Power.Text
			}
			if q > 1 {
				formula += fmt.Sprintf(" × %g fitted", q)
			}
			if l.Inverter != "" {
				eff := d.Inverters[l.Inverter].Part.Efficiency
				w /= eff
				formula += fmt.Sprintf(" ÷ %g inverter efficiency", eff)
				acOn[l.Inverter] = true
			}
			wh := w * h * l.Duty
			formula += fmt.Sprintf(" × %g h × duty %g", h, l.Duty)
			se.Loads = append(se.Loads, LoadEnergy{Name: ln, Wh: wh, Watts: w, Hours: h, Duty: l.Duty, Formula: formula})
		}
		for _, in := range schema.Names(d.Inverters) {
			inv := d.Inverters[in]
			h, given := inv.Hours[sn]
			if !given {
				if !acOn[in] {
					continue
				}
				h = sc.Hours
			}
			if h == 0 {
				continue
			}
			w := inv.Part.Idle.Watts()
			se.Loads = append(se.Loads, LoadEnergy{
				Name: "inverter " + in + " idle", Wh: w * h, Watts: w, Hours: h, Duty: 1,
				Formula: fmt.Sprintf("idle %s × %g h", inv.Part.Idle.Text, h),
			})
		}
		sort.SliceStable(se.Loads, func(i, j int) bool { return se.Loads[i].Wh > se.Loads[j].Wh })
		for _, l := range se.Loads {
			se.Wh += l.Wh
		}
		se.Ah = se.Wh / vsys
		se.MeanCurrent = se.Ah / sc.Hours
		se.WhPerDay = se.Wh * 24 / sc.Hours
		out = append(out, se)
	}
	return out
}

// BankModel is the bank's capacity and what of it may be used.
type BankModel struct {
	Voltage   float64 // nominal, V
	Capacity  float64 // rated, Ah
	Nominal   float64 // Wh
	DoD       float64
	DoDSource string
	// TempFactor is the fraction of rated capacity available at the bank's
	// temperature.
	TempFactor float64
	TempSource string
	EndOfLife  float64
	// Usable is Nominal × DoD × TempFactor × EndOfLife, Wh, before Peukert.
	Usable float64
	// Stored is the energy the simulation starts with, Nominal × TempFactor
	// × EndOfLife, and Floor the least it may hold: Stored × (1 − DoD).
	Stored, Floor float64
}

// Bank models the bank of d under rules.
func Bank(d *schema.Design, rules schema.Rulebook) BankModel {
	b := d.Bank
	m := BankModel{
		Voltage:   float64(b.Series) * b.Battery.Voltage.Volts(),
		Capacity:  float64(b.Parallel) * b.Battery.Capacity.Ah(),
		EndOfLife: b.EndOfLife,
	}
	m.Nominal = m.Voltage * m.Capacity
	m.DoD, m.DoDSource = depthOfDischarge(d, rules)
	m.TempFactor, m.TempSource = 1, "LiFePO4 capacity taken as rated (common practice)"
	if b.Battery.LeadAcid() && rules.CapacityTemp != nil {
		f := rowFactor(rules.CapacityTemp.Rows, b.Temperature.Celsius())
		m.TempFactor = 1 / math.Max(f, 1)
		m.TempSource = fmt.Sprintf("1 ÷ %g at %s (%s)", math.Max(f, 1), b.Temperature.Text, sourced(rules.CapacityTemp.Sourced))
	}
	m.Stored = m.Nominal * m.TempFactor * m.EndOfLife
	m.Usable = m.Stored * m.DoD
	m.Floor = m.Stored - m.Usable
	return m
}

// inputs are the figures the usable energy is made of, for a figure's
// inputs.
func (bm BankModel) inputs() []result.Input {
	return []result.Input{
		{Name: "V_bank × C_bank", Value: round(bm.Nominal, 1), Unit: "Wh", From: "bank.nominalEnergy"},
		{Name: "DoD", Value: bm.DoD, From: bm.DoDSource},
		{Name: "F_temp", Value: round(bm.TempFactor, 4), From: bm.TempSource},
		{Name: "F_eol", Value: bm.EndOfLife, From: "bank.endOfLife"},
	}
}

func depthOfDischarge(d *schema.Design, rules schema.Rulebook) (float64, string) {
	switch {
	case d.Bank.DepthOfDischarge != nil:
		return *d.Bank.DepthOfDischarge, "bank.depthOfDischarge"
	case d.Bank.Battery.DepthOfDischarge != nil:
		return *d.Bank.Battery.DepthOfDischarge, "catalog data for " + d.Bank.Battery.ID
	}
	r := rules.DepthOfDischarge
	v := map[string]float64{"flooded": r.Flooded, "agm": r.AGM, "gel": r.Gel, "lifepo4": r.LiFePO4}[d.Bank.Battery.Chemistry]
	return v, sourced(r.Sourced)
}

// rowFactor is the factor of the first row, in the order given (warmest
// first), whose temperature t is at or above; the last row's below all.
func rowFactor(rows []schema.VocRow, t float64) float64 {
	if len(rows) == 0 {
		return 1
	}
	for _, r := range rows {
		if t >= r.From.Celsius()-1e-9 {
			return r.Factor
		}
	}
	return rows[len(rows)-1].Factor
}

// PeukertCapacity is the capacity a lead-acid battery rated c Ah at h hours
// delivers at current i, by Peukert's law in its normalised form
// t = H × (C / (I × H))^k, so C_eff = I × t = C × (C / (I × H))^(k − 1).
// Above the rated capacity it is not credited: a lighter load than the
// rating's is taken at the rated capacity.
func PeukertCapacity(c, h, k, i float64) float64 {
	if i <= 0 || k <= 1 {
		return c
	}
	return math.Min(c, c*math.Pow(c/(i*h), k-1))
}

// PeukertRuntime is the runtime, hours, of a battery rated c Ah at h hours
// discharged at i amperes: t = H × (C / (I × H))^k.
func PeukertRuntime(c, h, k, i float64) float64 {
	return h * math.Pow(c/(i*h), k)
}

// Autonomy checks that the bank carries the required days without charge.
var Autonomy = &Check{
	ID:    "bank.autonomy",
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
		if d.Autonomy == nil {
			return
		}
		bm := Bank(d, in.Rules)
		var se ScenarioEnergy
		for _, s := range in.Budget() {
			if s.Name == d.Autonomy.Scenario {
				se = s
			}
		}
		ceff, peukertNote := peukertFor(d, se.MeanCurrent)
		days := math.Inf(1)
		if se.WhPerDay > 0 {
			days = bm.Usable * ceff / bm.Capacity / se.WhPerDay
		}
		out.Figure(result.Figure{
			ID: "bank.autonomy", Subject: d.Autonomy.Scenario, Value: round(days, 3), Unit: "days",
			Formula: "days = V_bank × C_bank × DoD × F_temp × F_eol × (C_eff / C_bank) / E_day",
			Inputs: append(bm.inputs(),
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
			need := d.Autonomy.Days / days * float64(d.Bank.Parallel)
			f.Change = fmt.Sprintf("about %d batteries in parallel (now %d), or less energy per day in %s", int(math.Ceil(need)), d.Bank.Parallel, d.Autonomy.Scenario)
		}
		out.Add(f)
	},
}

// peukertFor is the bank's effective capacity at a mean bank current.
func peukertFor(d *schema.Design, bankCurrent float64) (float64, string) {
	b := d.Bank
	c := b.Battery.Capacity.Ah()
	capBank := c * float64(b.Parallel)
	if !b.Battery.LeadAcid() || b.Battery.Peukert == nil {
		return capBank, "no Peukert correction (LiFePO4, or no exponent given)"
	}
	k := *b.Battery.Peukert
	i := bankCurrent / float64(b.Parallel)
	ceff := PeukertCapacity(c, b.Battery.RatedHours, k, i) * float64(b.Parallel)
	return ceff, fmt.Sprintf("Peukert k = %g at %.3g A per battery, rated at %g h", k, i, b.Battery.RatedHours)
}

// ChargeRate checks the charge current against the chemistry's limits.
var ChargeRate = &Check{
	ID:    "bank.chargeRate",
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
		d := in.Design
		var solarOut float64
		for _, n := range schema.Names(d.Controllers) {
			solarOut += d.Controllers[n].Part.Output.Amps()
		}
		// The largest current the sources give together in any scenario.
		ic, worst := solarOut, ""
		for _, sn := range schema.Names(d.Scenarios) {
			i := solarOut
			for _, n := range schema.Names(d.Chargers) {
				if d.Chargers[n].ChargeHours(sn, d.Scenarios[sn]) > 0 {
					i += d.Chargers[n].Output.Amps()
				}
			}
			if i > ic {
				ic, worst = i, sn
			}
		}
		if ic == 0 {
			return
		}
		capBank := d.Bank.Battery.Capacity.Ah() * float64(d.Bank.Parallel)
		f := result.Finding{Subject: "bank", Position: in.Position("bank"), Status: result.Pass}
		from := "the solar controllers"
		if worst != "" {
			from = "the sources charging together in " + worst
		}
		if d.Bank.Battery.LeadAcid() {
			cr := in.Rules.ChargeRate
			frac := ic / capBank
			f.Value, f.Limit, f.Unit = round(frac*100, 2), cr.LeadAcidMax*100, "% of C"
			f.Margin = round((cr.LeadAcidMax-frac)*100, 2)
			f.Source = sourced(cr.Sourced)
			f.Message = fmt.Sprintf("%s from %s ÷ %g Ah = %.1f %% of C; bounds %g–%g %%", amps(ic), from, capBank, frac*100, cr.LeadAcidMin*100, cr.LeadAcidMax*100)
			switch {
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
			f.Source = "catalog data for " + d.Bank.Battery.ID
			if d.Bank.Battery.MaxCharge == nil {
				f.Status = result.Warn
				f.Message = fmt.Sprintf("the catalog gives no maximum charge current for %s; check %s against its data", d.Bank.Battery.ID, amps(ic))
			} else {
				lim := d.Bank.Battery.MaxCharge.Amps() * float64(d.Bank.Parallel)
				f.Limit, f.Margin = lim, round(lim-ic, 2)
				f.Message = fmt.Sprintf("%s from %s against %d × %s = %s", amps(ic), from, d.Bank.Parallel, d.Bank.Battery.MaxCharge.Text, amps(lim))
				if ic > lim {
					f.Status = result.Fail
					f.Change = fmt.Sprintf("limit the charge current to %s", amps(lim))
				}
			}
		}
		out.Add(f)
	},
}

// ColdCharge checks lithium charging below its low-temperature limit.
var ColdCharge = &Check{
	ID:    "bank.coldCharge",
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
		bt := d.Bank.Battery
		if bt.LeadAcid() || bt.ChargeLowLimit == nil {
			return
		}
		lim := bt.ChargeLowLimit.Celsius()
		tb, tl := d.Bank.Temperature.Celsius(), d.Site.RecordLow.Celsius()
		f := result.Finding{
			Subject: "bank", Value: math.Min(tb, tl), Limit: lim, Unit: "°C", Margin: round(math.Min(tb, tl)-lim, 2),
			Source: "catalog data for " + bt.ID, Position: in.Position("bank"), Status: result.Pass,
			Message: fmt.Sprintf("bank at %s, record low %s, charge limit %s", d.Bank.Temperature.Text, d.Site.RecordLow.Text, bt.ChargeLowLimit.Text),
		}
		switch {
		case tb < lim:
			f.Status = result.Fail
			f.Change = "move or heat the bank, or choose a battery that may be charged at " + d.Bank.Temperature.Text
		case tl < lim:
			f.Status = result.Warn
			f.Change = "make sure charging is cut off below " + bt.ChargeLowLimit.Text + " (battery management or controller low-temperature cut-off)"
		}
		out.Add(f)
	},
}

// EnergyBudget reports the energy each scenario draws from the bank.
var EnergyBudget = &Check{
	ID:    "energy.budget",
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
		d := in.Design
		for _, se := range in.Budget() {
			var inputs []result.Input
			for _, l := range se.Loads {
				inputs = append(inputs, result.Input{Name: l.Name, Value: round(l.Wh, 2), Unit: "Wh", From: l.Formula})
			}
			out.Figure(result.Figure{
				ID: "energy.scenario", Subject: se.Name, Value: round(se.Wh, 2), Unit: "Wh",
				Formula: fmt.Sprintf("E = Σ loads over %g h = %.1f Ah at %s", se.Hours, se.Ah, d.Vessel.System),
				Inputs:  inputs,
				Source:  "definition",
			})
		}
		bm := Bank(d, in.Rules)
		out.Figure(result.Figure{
			ID: "bank.usableEnergy", Subject: "bank", Value: round(bm.Usable, 1), Unit: "Wh",
			Formula: "E_usable = V_bank × C_bank × DoD × F_temp × F_eol",
			Inputs:  bm.inputs(),
			Source:  bm.DoDSource,
		})
	},
}
