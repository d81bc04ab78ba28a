package checks

import (
	"fmt"

	"github.com/ampwright/ampwright/energy"
	"github.com/ampwright/ampwright/result"
)

// VoyageFloor checks the design voyage never takes the bank below its floor.
var VoyageFloor = &Check{
	ID:    result.CheckVoyageFloor,
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
		v := in.Energy.Voyage
		if v == nil {
			return
		}
		vr := v.Result(in.Design.Voyage.Start)
		s := v.Sim
		out.Figure(result.Figure{
			ID: result.FigVoyageLowestSoC, Subject: "voyage", Value: vr.Lowest, Unit: "%",
			Formula: "min over the voyage of E(t) / E_full, with E(t+1) = min(E_full, E(t) + η × P_in − P_load)",
			Inputs: []result.Input{
				{Name: "E_full", Value: round(s.Stored, 1), Unit: "Wh", From: "bank: nominal × F_temp × F_eol"},
				{Name: "floor", Value: round(s.Floor, 1), Unit: "Wh", From: "E_full × (1 − DoD)"},
				{Name: "hours", Value: float64(len(v.Hours)), From: "voyage.legs"},
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
			f.Message = fmt.Sprintf("the bank reaches its %.0f %% floor on day %d (%s, %s) and %.0f Wh of load goes unmet over the voyage", floor, day+1, v.Hours[s.FirstBreach].Scenario, energy.Months[v.Hours[s.FirstBreach].Month], s.Unmet)
			f.Change = fmt.Sprintf("add about %.0f Wh of charge over the voyage (more array, or engine or shore charging), a larger bank, or less load", s.Unmet)
		}
		out.Add(f)
	},
}

// EnergyHarvest reports each array's harvest and the energy balance.
var EnergyHarvest = &Check{
	ID:    result.CheckEnergyHarvest,
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
		primary := in.Sys.Primary()
		totals := map[string]float64{}
		for _, ah := range in.Energy.Harvest {
			for _, m := range ah.Months {
				if ah.Bank == primary {
					totals[m.Month] += m.Wh
				}
				out.Figure(result.Figure{
					ID: result.FigEnergyHarvest, Subject: ah.Name + " " + m.Month, Value: round(m.Wh, 1), Unit: "Wh/day",
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
		for _, se := range in.Energy.Budget {
			for _, m := range d.Site.Months {
				if se.WhPerDay <= 0 {
					continue
				}
				out.Figure(result.Figure{
					ID: result.FigSolarFraction, Subject: se.Name + " " + m, Value: round(totals[m]/se.WhPerDay*100, 1), Unit: "%",
					Formula: "harvest per day / energy per day × 100",
					Inputs: []result.Input{
						{Name: "harvest", Value: round(totals[m], 1), Unit: "Wh/day", From: string(result.FigEnergyHarvest)},
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

// OtherKind names the controller kind an array's harvest is compared with.
func OtherKind(kind string) string { return otherKind(kind) }
