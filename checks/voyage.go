package checks

import (
	"fmt"

	"github.com/ampwright/ampwright/energy"
	"github.com/ampwright/ampwright/result"
)

// VoyageFloor checks the design voyage never takes a bank below its floor.
var VoyageFloor = &Check{
	ID:    result.CheckVoyageFloor,
	Title: "the design voyage keeps every bank that carries loads above its depth-of-discharge floor",
	Doc: `Runs every bank of the boat hour by hour over the design voyage, together
with the links between them, and checks that no bank that carries loads
falls below the floor its depth of discharge sets.

Method: the voyage starts at 00:00 on the 1st of its starting month with
every bank full and at rest. Charge is counted in ampere-hours at each
bank's own nominal voltage (its energy is Ah × V_nominal). Each hour:
  - the loads draw the scenario's energy at their times of day (within
    their windows; a load without windows evenly over the day);
  - the arrays deliver their mean day of the month hour by hour (see
    energy.harvest), as current at the bank's charging voltage; the other
    sources their current while they run: within their windows, else
    from 08:00 for their hours a day, past midnight if need be (an
    alternator the engine's hours, a shore charger all day on shore
    power);
  - the sources feed the loads directly, and the rest charges the battery
    up to what it accepts: a lead-acid bank by the kinetic battery model
    (Manwell & McGowan 1993; c and k from the rulebook's acceptance
    table): the available well fills first and the bound well follows at
    the rate constant, so the bank accepts less as it fills (absorption);
    never above the battery's maximum charge current or the rulebook's
    charge-rate bound. A LiFePO4 bank takes up to its maximum charge
    current, and nothing below its charge-temperature limit. What goes in
    is stored at the chemistry's ampere-hour efficiency;
  - what the sources do not cover the battery gives, times Peukert's
    factor C / C_eff at the loads' current (the larger of a load's own
    current and the hour's mean), down to its floor;
  - links: a DC-DC charger runs while its input bank is being charged (an
    engine-run trigger), drawing I_out × V_out / (η × V_in) from that
    bank's surplus for up to its rated output; a combiner closes while
    either bank is being charged and shares the two banks' surplus in
    proportion to what each accepts; an isolator passes its input bank's
    surplus one way, losing its forward drop. None passes more than its
    rating, and none moves charge out of a battery.

    q(t+1) = q(t) + η × I_charge − f_P × I_battery      (Ah, one hour)

q_full is the rated capacity × F_temp × F_eol, the floor q_full × (1 − DoD).
Where the loads would take a bank below its floor, what it cannot give is
unmet and the bank is held at the floor.

Limit: no unmet energy, on the primary bank and on every bank that carries
loads. Reported for every bank: the lowest state of charge and when, the
unmet energy, the days from the lowest point until it is full again (the
rulebook's acceptance.full), the hours it spent accepting less than it was
offered, and its energy ledger, which balances:
E_end − E_start = charged − drawn + unmet.
Source: the rulebook's acceptance table (kinetic battery model, common
practice parameters).`,
	Run: func(in *Input, out *Report) {
		v := in.Energy.Voyage
		if v == nil {
			return
		}
		src := "common practice"
		if a := in.Rules.Acceptance; a != nil {
			src = sourced(a.Sourced)
		}
		for _, vb := range v.Banks {
			if !v.Checked(vb) {
				continue
			}
			voyageBank(in, out, v, vb, src)
		}
	},
}

// voyageSubject is the subject of a bank's voyage figure and finding:
// "voyage" for the primary bank, as before there were several, and
// "voyage <bank>" for the others.
func voyageSubject(v *energy.VoyageRun, vb *energy.VoyageBank) string {
	if vb == v.Primary {
		return "voyage"
	}
	return "voyage " + vb.Bank.Name
}

func voyageBank(in *Input, out *Report, v *energy.VoyageRun, vb *energy.VoyageBank, src string) {
	r, s := vb.Run, vb.Sim
	lg := r.Ledger
	subject := voyageSubject(v, vb)
	lowest := round(r.Lowest*100, 2)
	floor := round(s.Floor/s.Kin.Qmax*100, 2)
	out.Figure(result.Figure{
		ID: result.FigVoyageLowestSoC, Subject: subject, Value: lowest, Unit: "%",
		Formula: "min over the voyage of q(t) / q_full × 100, with q(t+1) = q(t) + η × I_charge − f_P × I_battery (Ah at the bank's nominal voltage; see explain voyage.floor)",
		Inputs: []result.Input{
			{Name: "q_full", Value: round(s.Kin.Qmax, 2), Unit: "Ah", From: "rated capacity × F_temp × F_eol (bank.usableEnergy)"},
			{Name: "floor", Value: round(s.Floor, 2), Unit: "Ah", From: "q_full × (1 − DoD)"},
			{Name: "V_nominal", Value: vb.Model.Voltage, Unit: "V", From: "bank.nominalVoltage"},
			{Name: "hours", Value: float64(len(v.Slots)), From: "voyage.legs"},
			{Name: "offered", Value: round(lg.Offered, 1), Unit: "Wh", From: "sources and links, while they run"},
			{Name: "direct", Value: round(lg.Direct, 1), Unit: "Wh", From: "sources to the loads while they run"},
			{Name: "charged", Value: round(lg.Charged, 1), Unit: "Wh", From: "into the battery, after acceptance and efficiency"},
			{Name: "not taken", Value: round(lg.Spilled, 1), Unit: "Wh", From: "offered beyond acceptance (absorption, full)"},
			{Name: "drawn", Value: round(lg.Drawn, 1), Unit: "Wh", From: "from the battery, Peukert included"},
			{Name: "unmet", Value: round(lg.Unmet, 1), Unit: "Wh", From: "below the floor"},
		},
		Source: src,
	})
	// Where there are several banks, each finding names its bank.
	name := ""
	if in.Sys.MultiBank() {
		name = vb.Bank.Name + " bank: "
	}
	f := result.Finding{
		Subject: subject, Value: lowest, Limit: floor, Unit: "% SoC", Margin: round(lowest-floor, 2),
		Source: src, Position: in.Position(voyagePosition(v, vb)), Status: result.Pass,
	}
	if r.Lowest < 1 {
		sl := v.Slots[r.LowestAt]
		f.Message = fmt.Sprintf("%slowest %.1f %% on day %d at %02d:00 (%s, %s), floor %.0f %%", name, lowest, r.LowestAt/24+1, r.LowestAt%24, sl.Scenario, energy.Months[sl.Month], floor)
	} else {
		f.Message = fmt.Sprintf("%sfull throughout, floor %.0f %%", name, floor)
	}
	switch {
	case r.RecoverHours > 0:
		f.Message += fmt.Sprintf("; full again (%.0f %%) %.1f days later", s.Full*100, float64(r.RecoverHours)/24)
	case r.RecoverHours < 0:
		f.Message += fmt.Sprintf("; not full again (%.0f %%) within the voyage", s.Full*100)
	}
	if lg.Unmet > 0 {
		f.Status = result.Fail
		sl := v.Slots[r.FirstBreach]
		f.Message = fmt.Sprintf("%sthe bank reaches its %.0f %% floor on day %d (%s, %s) and %.0f Wh asked of it goes unmet over the voyage", name, floor, r.FirstBreach/24+1, sl.Scenario, energy.Months[sl.Month], lg.Unmet)
		f.Change = fmt.Sprintf("add about %.0f Wh of charge over the voyage (more array, or engine or shore charging), a larger bank, or less load", lg.Unmet)
	}
	out.Add(f)
}

// voyagePosition is where a bank's finding points: the voyage for the
// primary bank, else the bank.
func voyagePosition(v *energy.VoyageRun, vb *energy.VoyageBank) string {
	if vb == v.Primary {
		return "voyage"
	}
	return vb.Bank.Path
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
    Collares-Pereira & Rabl, each hour's share r_t(ω, ωs) taken at the
    middle of the hour and the shares scaled to sum to one, so the hours
    add up to H;
  - beam and diffuse parts by Erbs et al. (1982);
  - plane of array by the isotropic sky model, with ground reflection at
    the site's albedo, averaged over 24 headings when the boat swings at
    anchor;
  - cell temperature by the SAM NOCT model (Gilman et al. 2018) where the
    module gives NOCT, with the installed NOCT: NOCT raised by the
    rulebook's cellTemperature rise for the gap behind the modules (the
    array's standoff, else the rulebook's gap for its mount; Fuentes
    1987), so a flush hardtop array runs hotter than one on an open rail;
    else by the Sandia model for its construction and mounting;
  - MPPT: P = P_STC × G/1000 × (1 + γ (Tc − 25)) × (1 − shading)(1 − soiling)
    (1 − mismatch) × (1 − ΔV_pv × G/1000)(1 − ΔV_charge × G/1000) × η_controller;
  - PWM: the array is held at the charging voltage: P = V_charge × Isc ×
    N_strings × G/1000 × (1 + α (Tc − 25)) × losses × (1 − ΔV_charge × G/1000),
    not above the array's maximum power (what it would take above is
    "capped");
  - clipped at the controller's rated output × V_charge.
The wiring's ΔV are the voltage drops of the solar and charge runs at the
array's rated current, as fractions, scaled with irradiance.

Each month's figure lists what recomputes it by hand from the day's
totals: with H_POA the day's irradiation on the array and T̄c its cells'
mean temperature weighted by irradiance,

    MPPT: E = P_STC × H_POA ÷ 1 kW/m² × (1 + γ (T̄c − 25 °C)) × (1 − shading)
              × (1 − soiling) × (1 − mismatch) × F_wiring × η_controller − clipped
    PWM:  E = V_charge × Isc × N_strings × H_POA ÷ 1 kW/m² × (1 + α (T̄c − 25 °C))
              × (1 − shading) × (1 − soiling) × (1 − mismatch) × F_wiring − capped − clipped

F_wiring being the wiring factors weighted by energy over the day (°F for
an imperial design). The other kind of controller's figure is shown
beside it. Solar fraction = harvest / the scenario's energy per day.`,
	Run: func(in *Input, out *Report) {
		d := in.Design
		u := unitsOf(in)
		primary := in.Sys.Primary()
		totals := map[string]float64{}
		for _, ah := range in.Energy.Harvest {
			path := "arrays." + quotePath(ah.Name)
			for _, m := range ah.Months {
				if ah.Bank == primary {
					totals[m.Month] += m.Wh
				}
				out.Figure(harvestFigure(in, u, path, ah, m))
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

// harvestFigure is an array's harvest on the mean day of one month, with
// every input that recomputes it by hand from the day's totals.
func harvestFigure(in *Input, u units, path string, ah energy.ArrayHarvest, m energy.ArrayMonth) result.Figure {
	d := in.Design
	ambFrom := "site.designHigh"
	if _, ok := d.Site.DayAmbient[m.Month]; ok {
		ambFrom = "site.dayAmbient." + m.Month
	}
	av, au := u.temp(m.Ambient)
	cv, cu := u.temp(m.Cell)
	pwm := ah.Kind == "pwm"
	coeff, coeffName, coeffFrom := ah.Gamma, "γ", "catalog data: gammaPmax"
	if pwm {
		coeff, coeffName, coeffFrom = ah.Alpha, "α", "catalog data: alphaIsc"
		if !ah.AlphaGiven {
			coeffFrom = "common practice: Isc rises about 0.05 %/°C where the module gives no alphaIsc"
		}
	}
	kv, ku := u.perDegree(coeff)
	wiringFrom := fmt.Sprintf("(1 − %.4g × G/1000) for the charge run", ah.ChgDrop)
	if !pwm {
		wiringFrom = fmt.Sprintf("(1 − %.4g × G/1000) for the solar runs × (1 − %.4g × G/1000) for the charge run", ah.PVDrop, ah.ChgDrop)
	}
	wiringFrom += ", drops at rated current (wiring.voltageDrop), weighted by energy over the day"
	tilt := "flat"
	if a := in.Design.Arrays[ah.Name]; a.Tilt > 0 {
		tilt = fmt.Sprintf("tilted %g°", a.Tilt)
		if a.SwingsAtAnchor {
			tilt += ", averaged over 24 headings (swings at anchor)"
		} else {
			tilt += fmt.Sprintf(", facing %g°", a.Azimuth)
		}
	}
	var inputs []result.Input
	formula := ""
	tail := " × (1 − shading) × (1 − soiling) × (1 − mismatch) × F_wiring"
	if pwm {
		formula = "E = V_charge × Isc × N_strings × H_POA ÷ 1 kW/m² × (1 + α × (T̄c − " + u.stc() + "))" + tail + " − capped − clipped"
		inputs = append(inputs,
			result.Input{Name: "V_charge", Value: round(ah.VCharge, 3), Unit: "V", From: "bank's absorption voltage × series"},
			result.Input{Name: "Isc", Value: ah.Isc, Unit: "A", From: "catalog data"},
			result.Input{Name: "N_strings", Value: float64(ah.Strings), From: path + ".strings"})
	} else {
		formula = "E = P_STC × H_POA ÷ 1 kW/m² × (1 + γ × (T̄c − " + u.stc() + "))" + tail + " × η_controller − clipped"
		inputs = append(inputs, result.Input{Name: "P_STC", Value: round(ah.STC, 3), Unit: "W", From: string(result.FigArraySTCPower)})
	}
	inputs = append(inputs,
		result.Input{Name: "H", Value: m.H, Unit: "kWh/m²/day", From: "site.irradiation." + m.Month},
		result.Input{Name: "H_POA", Value: round(m.POA, 4), Unit: "kWh/m²/day", From: "H split into hours by Collares-Pereira & Rabl (scaled to H), Erbs, isotropic sky, " + tilt},
		result.Input{Name: "T_amb", Value: av, Unit: au, From: ambFrom},
		result.Input{Name: "T̄c", Value: cv, Unit: cu, From: "mean cell temperature weighted by the irradiance on the array, by " + cellModelText(u, ah.Cell, ah.Wind)},
		result.Input{Name: coeffName, Value: kv, Unit: ku, From: coeffFrom},
		result.Input{Name: "shading", Value: ah.Shading, From: path + ".shading"},
		result.Input{Name: "soiling", Value: ah.Soiling, From: path + ".soiling"},
		result.Input{Name: "mismatch", Value: ah.Mismatch, From: path + ".mismatch"},
		result.Input{Name: "F_wiring", Value: round(m.Wiring, 5), From: wiringFrom},
	)
	if pwm {
		inputs = append(inputs, result.Input{Name: "capped", Value: round(m.Capped, 1), Unit: "Wh", From: "PWM current beyond the array's maximum power, hour by hour"})
	} else {
		inputs = append(inputs, result.Input{Name: "η_controller", Value: ah.Efficiency, From: "catalog data for the controller"})
	}
	inputs = append(inputs,
		result.Input{Name: "clipped", Value: round(m.Clipped, 1), Unit: "Wh", From: "controller's rated output × V_charge, hour by hour"},
		result.Input{Name: "other controller kind", Value: round(m.AltWh, 1), Unit: "Wh/day", From: otherKind(ah.Kind) + " on the same array, for comparison"},
	)
	return result.Figure{
		ID: result.FigEnergyHarvest, Subject: ah.Name + " " + m.Month, Value: round(m.Wh, 1), Unit: "Wh/day",
		Formula: formula,
		Inputs:  inputs,
		Source:  d.Site.Irradiation.Source + "; Collares-Pereira & Rabl (1979); Erbs et al. (1982); isotropic sky; " + cellSource(in, ah.Cell),
	}
}

// cellSource cites the cell temperature model and, for the installed
// NOCT, the rulebook's table.
func cellSource(in *Input, cm energy.CellModel) string {
	s := "Sandia array performance model (King et al. 2004, SAND2004-3535)"
	if cm.SAM {
		s = "SAM NOCT cell temperature model (Gilman et al. 2018, NREL/TP-6A20-67399)"
	}
	if ct := in.Rules.CellTemperature; ct != nil {
		s += "; " + sourced(ct.Sourced)
	}
	return s
}

func otherKind(kind string) string {
	if kind == "pwm" {
		return "MPPT"
	}
	return "PWM"
}

// OtherKind names the controller kind an array's harvest is compared with.
func OtherKind(kind string) string { return otherKind(kind) }
