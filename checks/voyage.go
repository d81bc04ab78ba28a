package checks

import (
	"fmt"

	"github.com/ampwright/ampwright/result"
)

// voyageRun is the design voyage's simulation and what it ran on.
type voyageRun struct {
	hours []Hour
	sim   Sim
	bank  BankModel
}

// Voyage returns the design voyage's state-of-charge run, computed once
// per Input, or nil when the design has no voyage.
func (in *Input) Voyage() *voyageRun {
	if in.sim == nil && in.Design.Voyage != nil {
		bm := Bank(in.Design, in.Rules)
		hours := VoyageHours(in, in.Harvest())
		in.sim = &voyageRun{hours: hours, bank: bm, sim: Simulate(hours, bm.Stored, bm.Floor, chemistry(in.Design, in.Rules))}
	}
	return in.sim
}

// VoyageResult is the simulation as the result reports it.
func (in *Input) VoyageResult() *result.Voyage {
	v := in.Voyage()
	if v == nil {
		return nil
	}
	s := v.sim
	out := &result.Voyage{
		Start: in.Design.Voyage.Start, Hours: len(v.hours),
		Lowest: round(s.Lowest*100, 2), LowestDay: s.LowestAt / 24, LowestHour: s.LowestAt % 24,
		Floor: round(s.Floor/s.Stored*100, 2), Unmet: round(s.Unmet, 1), RecoverDays: -1,
		Offered: round(s.Offered, 1), Charged: round(s.Charged, 1), Drawn: round(s.Drawn, 1),
		Spilled: round(s.Spilled, 1), ChargeLoss: round(s.ChargeLoss, 1),
	}
	if s.RecoverHours >= 0 {
		out.RecoverDays = round(float64(s.RecoverHours)/24, 2)
	}
	if len(v.hours) > 0 && s.LowestAt < len(v.hours) {
		out.LowestScenario = v.hours[s.LowestAt].Scenario
		out.LowestMonth = Months[v.hours[s.LowestAt].Month]
	}
	out.SoC = make([]float64, len(s.SoC))
	for i, x := range s.SoC {
		out.SoC[i] = round(x*100, 1)
	}
	return out
}

// VoyageFloor checks the design voyage never takes the bank below its floor.
var VoyageFloor = &Check{
	ID:    "voyage.floor",
	Title: "the design voyage keeps the bank above its depth-of-discharge floor",
	Doc: `Runs the bank hour by hour over the design voyage and checks that its
state of charge never falls below the floor its depth of discharge sets.

Method: the voyage starts on the 1st of its starting month with the bank
full. Each hour:
  - the loads draw the scenario's energy spread evenly over its period;
  - the arrays deliver their mean day of the month, hour by hour (see
    energy.harvest), and the other chargers their output while they run
    (an alternator for the scenario's engine hours, from 08:00);
  - the bank takes in what it accepts: a lead-acid bank's acceptance falls
    linearly above the rulebook's taperFrom state of charge to taperEnd of
    its bulk rate when full (the absorption taper), and is bounded by the
    rulebook's largest charge rate; a LiFePO4 bank by its maximum charge
    current;
  - what it takes in is stored at the chemistry's charge efficiency.

    E(t+1) = min(E_full, E(t) + η × P_in − P_load)

E_full is the nominal energy × F_temp × F_eol; the floor is
E_full × (1 − DoD). Where the loads would take the bank below the floor the
shortfall is recorded as unmet energy and the bank held at the floor.

Limit: no unmet energy. Reported: the lowest state of charge and when, and
the days from the lowest point until the bank is full again.
Source: the charge model of the rulebook (common practice).`,
	Run: func(in *Input, out *Report) {
		v := in.Voyage()
		if v == nil {
			return
		}
		vr := in.VoyageResult()
		s := v.sim
		out.Figure(result.Figure{
			ID: "voyage.lowestSoC", Subject: "voyage", Value: vr.Lowest, Unit: "%",
			Formula: "min over the voyage of E(t) / E_full, with E(t+1) = min(E_full, E(t) + η × P_in − P_load)",
			Inputs: []result.Input{
				{Name: "E_full", Value: round(s.Stored, 1), Unit: "Wh", From: "bank: nominal × F_temp × F_eol"},
				{Name: "floor", Value: round(s.Floor, 1), Unit: "Wh", From: "E_full × (1 − DoD)"},
				{Name: "hours", Value: float64(len(v.hours)), From: "voyage.legs"},
				{Name: "charged", Value: round(s.Charged, 1), Unit: "Wh", From: "sources, after acceptance and efficiency"},
				{Name: "drawn", Value: round(s.Drawn, 1), Unit: "Wh", From: "energy budget by scenario"},
			},
			Source: sourced(in.Rules.Charging.Sourced),
		})
		floor := s.Floor / s.Stored * 100
		f := result.Finding{
			Subject: "voyage", Value: vr.Lowest, Limit: round(floor, 2), Unit: "% SoC", Margin: round(vr.Lowest-floor, 2),
			Source: sourced(in.Rules.Charging.Sourced), Position: in.Position("voyage"), Status: result.Pass,
			Message: fmt.Sprintf("lowest %.1f %% on day %d at %02d:00 (%s, %s), floor %.0f %%", vr.Lowest, vr.LowestDay+1, vr.LowestHour, vr.LowestScenario, vr.LowestMonth, floor),
		}
		if vr.RecoverDays >= 0 {
			f.Message += fmt.Sprintf("; full again %.1f days later", vr.RecoverDays)
		} else if s.Lowest < 0.999 {
			f.Message += "; not full again within the voyage"
		}
		if s.Unmet > 0 {
			f.Status = result.Fail
			day := s.FirstBreach / 24
			f.Message = fmt.Sprintf("the bank reaches its %.0f %% floor on day %d (%s, %s) and %.0f Wh of load goes unmet over the voyage", floor, day+1, v.hours[s.FirstBreach].Scenario, Months[v.hours[s.FirstBreach].Month], s.Unmet)
			f.Change = fmt.Sprintf("add about %.0f Wh of charge over the voyage (more array, or engine or shore charging), a larger bank, or less load", s.Unmet)
		}
		out.Add(f)
	},
}

// EnergyHarvest reports each array's harvest and the energy balance.
var EnergyHarvest = &Check{
	ID:    "energy.harvest",
	Title: "solar harvest by month, and its balance against each scenario",
	Doc: `Reports what each array delivers into the bank on the mean day of every
month in use, and the solar fraction of each scenario's use; it has no
limit of its own (voyage.floor uses it).

Method, hour by hour of solar time on the month's recommended average day
(Duffie & Beckman Table 1.6.1):
  - hourly horizontal irradiance from the month's daily irradiation H by
    Collares-Pereira & Rabl: I = H × r_t(ω, ωs);
  - beam and diffuse parts by Erbs et al. (1982);
  - plane of array by the isotropic sky model, with ground reflection at
    the site's albedo, averaged over 24 headings when the boat swings at
    anchor;
  - cell temperature by NOCT (Tc = Ta + (NOCT − 20)/800 × G) where the
    module gives NOCT, else by the Sandia model for its construction and
    mounting;
  - MPPT: P = P_STC × G/1000 × (1 + γ (Tc − 25)) × (1 − shading)(1 − soiling)
    (1 − mismatch) × (1 − wiring loss) × η_controller;
  - PWM: the array is held at the charging voltage: P = V_charge × Isc ×
    N_strings × G/1000 × (1 + α (Tc − 25)) × losses, not above the MPPT
    figure;
  - clipped at the controller's rated output × V_charge.
The other kind of controller's figure is shown beside it. The wiring loss is
the voltage drop of the solar and charge runs, scaled with irradiance.
Solar fraction = harvest / the scenario's energy per day.`,
	Run: func(in *Input, out *Report) {
		d := in.Design
		totals := map[string]float64{}
		for _, ah := range in.Harvest() {
			for _, m := range ah.Months {
				totals[m.Month] += m.Wh
				out.Figure(result.Figure{
					ID: "energy.harvest", Subject: ah.Name + " " + m.Month, Value: round(m.Wh, 1), Unit: "Wh/day",
					Formula: "Σ over the hours of the mean day of P(hour), see explain energy.harvest",
					Inputs: []result.Input{
						{Name: "H", Value: m.H, Unit: "kWh/m²/day", From: "site.irradiation." + m.Month},
						{Name: "H_POA", Value: round(m.POA, 3), Unit: "kWh/m²/day", From: "isotropic model"},
						{Name: "clipped", Value: round(m.Clipped, 1), Unit: "Wh", From: "controller output limit"},
						{Name: "other controller kind", Value: round(m.AltWh, 1), Unit: "Wh/day", From: otherKind(ah.Kind)},
					},
					Source: d.Site.Irradiation.Source + "; Collares-Pereira & Rabl (1979); Erbs et al. (1982); isotropic sky",
				})
			}
		}
		for _, se := range in.Budget() {
			for _, m := range d.Site.Months {
				if se.WhPerDay <= 0 {
					continue
				}
				out.Figure(result.Figure{
					ID: "energy.solarFraction", Subject: se.Name + " " + m, Value: round(totals[m]/se.WhPerDay*100, 1), Unit: "%",
					Formula: "harvest per day / energy per day × 100",
					Inputs: []result.Input{
						{Name: "harvest", Value: round(totals[m], 1), Unit: "Wh/day", From: "energy.harvest"},
						{Name: "use", Value: round(se.WhPerDay, 1), Unit: "Wh/day", From: "energy.scenario " + se.Name},
					},
					Source: "definition",
				})
			}
		}
	},
}

func otherKind(kind string) string {
	if kind == "pwm" {
		return "MPPT"
	}
	return "PWM"
}

// HarvestResult is the harvest by array and month for the result.
func (in *Input) HarvestResult() []result.ArrayHarvest {
	var out []result.ArrayHarvest
	for _, ah := range in.Harvest() {
		ra := result.ArrayHarvest{Array: ah.Name, Controller: ah.Controller, Kind: ah.Kind, Alternative: otherKind(ah.Kind)}
		for _, m := range ah.Months {
			ra.Months = append(ra.Months, result.MonthHarvest{
				Month: m.Month, Irradiation: m.H, POA: round(m.POA, 3), Wh: round(m.Wh, 1),
				AltWh: round(m.AltWh, 1), Clipped: round(m.Clipped, 1), PeakCell: round(m.PeakCell, 1),
			})
		}
		out = append(out, ra)
	}
	return out
}
