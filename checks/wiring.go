package checks

import (
	"fmt"
	"math"

	"github.com/ampwright/ampwright/energy"
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
	"github.com/ampwright/ampwright/schema/unit"
)

// VoltageDrop checks each run's voltage drop against its class limit.
var VoltageDrop = &Check{
	ID:    result.CheckVoltageDrop,
	Title: "voltage drop of each run within its class limit",
	Doc: `Checks the voltage drop of every conductor run at its design current.

Method: a DC run returns on its own conductor of the same size and length,
so the drop is over twice the one-way length. The resistance per metre R′ is
found at the conductor temperature (see wiring.resistance).

    ΔV = I × 2 × L × R′(T)
    drop = ΔV / V_nominal × 100 %

I is the run's design current: the loads it feeds at full draw (duty cycles
reduce energy, not current), a controller's rated output for a charge run.
V is the nominal system voltage. For a solar run, I is the strings' current
at maximum power (Imp × strings) and V the voltage the array works at: the
strings' Vmp behind an MPPT controller, the battery's nominal voltage behind
a PWM one.

Limit: by the run's class, from the rulebook (default: 3 % for critical
circuits, 10 % for others, ABYC E-11 11.14.2.6). Critical: navigation
lights, bilge pumps and blowers, electronics, panelboard main feeders, and
(common practice) charging runs; a design may set a run's class.

A failing run is given the smallest standard size of its family (AWG or
mm²) that passes every wiring check.`,
	Run: func(in *Input, out *Report) {
		for _, r := range in.Sys.Runs {
			if r.DropCurrent <= 0 {
				continue
			}
			m := measure(in, r, r.Spec.Size)
			limit := model.DropLimit(in.Rules, r.Class)
			u := unitsOf(in)
			lv, lu := u.length(r.Spec.Length.Metres())
			rv, ru := u.resistance(m.drop.Res.RT)
			fig := result.Figure{
				ID: result.FigVoltageDrop, Subject: r.Name, Value: round(m.drop.Pct, 3), Unit: "%",
				Formula: "drop = I × 2 × L × R′(T) / V × 100",
				Inputs: []result.Input{
					{Name: "I", Value: round(r.DropCurrent, 3), Unit: "A", From: r.DropBasis},
					{Name: "L", Value: lv, Unit: lu, From: r.Path + ".length"},
					{Name: "R′(T)", Value: rv, Unit: ru, From: string(result.FigResistance)},
					{Name: "V", Value: round(r.DropVoltage, 3), Unit: "V", From: r.VoltBasis},
				},
				Source: in.Rules.VoltageDrop.Source,
			}
			how := fmt.Sprintf("%s × 2 × %s × %s", amps(r.DropCurrent), lengthText(in, r.Spec.Length.Metres()), u.resistanceText(m.drop.Res.RT))
			if !r.Ret.Mirror {
				rlv, rlu := u.length(m.drop.RetLength)
				rrv, rru := u.resistance(m.drop.RetRes.RT)
				fig.Formula = "drop = (I × L × R′(T) + I_ret × L_ret × R′_ret(T)) / V × 100"
				fig.Inputs = append(fig.Inputs[:3:3],
					result.Input{Name: "I_ret", Value: round(m.drop.RetCurrent, 3), Unit: "A", From: returnFrom(r)},
					result.Input{Name: "L_ret", Value: rlv, Unit: rlu, From: returnFrom(r)},
					result.Input{Name: "R′_ret(T)", Value: rrv, Unit: rru, From: returnFrom(r)},
					fig.Inputs[3])
				how = fmt.Sprintf("%s × %s × %s + %s × %s × %s", amps(r.DropCurrent), lengthText(in, r.Spec.Length.Metres()), u.resistanceText(m.drop.Res.RT),
					amps(m.drop.RetCurrent), lengthText(in, m.drop.RetLength), u.resistanceText(m.drop.RetRes.RT))
			}
			out.Figure(fig)
			f := result.Finding{
				Subject: r.Name, Value: round(m.drop.Pct, 2), Limit: limit, Unit: "%",
				Margin:   round(limit-m.drop.Pct, 2),
				Source:   sourced(in.Rules.VoltageDrop.Sourced),
				Position: in.Position(r.Path),
				Message: fmt.Sprintf("%s = %.3g V, %.2f %% of %s (%s: %s)",
					how, m.drop.Volts, m.drop.Pct, volts(r.DropVoltage), r.Class, r.ClassBasis),
				Status: result.Pass,
			}
			if m.drop.Pct > limit {
				f.Status = result.Fail
				f.Change = changeFor(in, r)
			}
			out.Add(f)
		}
	},
}

// Resistance reports each run's resistance at its conductor temperature.
var Resistance = &Check{
	ID:    result.CheckResistance,
	Title: "resistance of each conductor at its temperature",
	Doc: `Finds the resistance per metre of every conductor at the temperature
the voltage-drop check uses, and warns where it had to fall back on a
nominal area.

Method: for AWG sizes, the cross-section from the ASTM B258 diameter
d = 0.127 mm × 92^((36 − n)/39) and the resistivity of annealed copper
(IEC 60028: 1/58 Ω·mm²/m at 20 °C), times a lay factor for stranding and a
factor for tinned copper. For metric sizes, the maximum resistance at 20 °C
from the rulebook's table (IEC 60228 class 5, plain or tinned); a size not
in the table uses ρ/A on its nominal area, with a warning. Then

    R′(T) = R′(20 °C) × (1 + α × (T − 20 °C)),  α = 0.00393 /K

T is the rulebook's conductor temperature (default 30 °C: ABYC's voltage-drop
constant K = 10.75 Ω·cmil/ft is copper at about 29 °C, where 20 °C copper is
10.37), or the engine-space temperature for a run through an engine space
when that is higher.`,
	Run: func(in *Input, out *Report) {
		u := unitsOf(in)
		for _, r := range allRuns(in) {
			res := model.ConductorResistance(in.Rules, r.Spec, r.Spec.Size, in.Sys.Temperature(r.Spec))
			rv, ru := u.resistance(res.RT)
			r20, _ := u.resistance(res.R20)
			av, au := u.alpha(in.Rules.Resistance.Alpha)
			tv, tu := u.temp(res.Temp)
			ref := u.ref20()
			from := "rules.resistance.temperature"
			if r.Spec.EngineSpace && in.Design.Site.EngineSpace.Celsius() > in.Rules.Resistance.Temperature.Celsius() {
				from = "site.engineSpace"
			}
			out.Figure(result.Figure{
				ID: result.FigResistance, Subject: r.Name, Value: rv, Unit: ru,
				Formula: "R′(T) = R′(" + ref + ") × (1 + α × (T − " + ref + ")); " + resistanceBasis(in, u, r.Spec, r.Spec.Size, res),
				Inputs: []result.Input{
					{Name: "R′(" + ref + ")", Value: r20, Unit: ru, From: r.Path + ".size"},
					{Name: "α", Value: av, Unit: au, From: "rules.resistance.alpha"},
					{Name: "T", Value: tv, Unit: tu, From: from},
				},
				Source: in.Rules.Resistance.Source,
			})
			if !res.FromTable {
				out.Add(result.Finding{
					Subject: r.Name, Status: result.Warn, Value: rv, Unit: ru,
					Message:  fmt.Sprintf("%s is not in the rulebook's resistance table; %s", r.Spec.Size.Text, res.Basis),
					Source:   sourced(in.Rules.Resistance.Sourced),
					Position: in.Position(r.Path),
				})
			}
		}
	},
}

// Ampacity checks each run's derated ampacity against its design current.
var Ampacity = &Check{
	ID:    result.CheckAmpacity,
	Title: "derated ampacity of each run at least its design current",
	Doc: `Checks that every conductor can carry its design current.

Method: the allowable current from the rulebook's ampacity table, by the
conductor's size and the highest insulation rating not above its own
(default: 33 CFR 183.425 Table 5, conductors under 50 V, not bundled, 30 °C
ambient). A metric size takes the row of the largest tabled size of no
greater area, which is conservative. Then

    I_allowed = I_table × F_engine × F_bundle

F_engine is the rulebook's engine-space factor for the insulation rating
(33 CFR 183.425 Table 5 note 1) for a run through an engine space, else 1;
F_bundle the rulebook's factor for the number of current-carrying
conductors bundled together (note 2), else 1.

Limit: the design current I (as in wiring.voltageDrop) must not exceed
I_allowed. A solar run follows NEC 690.8(B): 1.56 × Isc × strings must not
exceed I_table, and 1.25 × Isc × strings must not exceed I_allowed (the
rulebook's conductorFactor and inputFactor).`,
	Run: func(in *Input, out *Report) {
		for _, r := range allRuns(in) {
			a := in.Sys.RunAmpacity(r, r.Spec.Size)
			f := result.Finding{
				Subject: r.Name, Unit: "A", Value: round(r.Current, 2),
				Source:   sourced(in.Rules.Ampacity.Sourced),
				Position: in.Position(r.Path),
				Status:   result.Pass,
			}
			if !a.OK {
				f.Status = result.Fail
				f.Message = a.Note
				f.Change = changeFor(in, r)
				out.Add(f)
				continue
			}
			out.Figure(result.Figure{
				ID: result.FigAmpacity, Subject: r.Name, Value: round(a.Derated, 2), Unit: "A",
				Formula: "I_allowed = I_table × F_engine × F_bundle",
				Inputs: []result.Input{
					{Name: "I_table", Value: a.Table, Unit: "A", From: fmt.Sprintf("rules.ampacity.table[%q][%q]", a.SizeKey, a.RatingKey)},
					{Name: "F_engine", Value: a.Engine, From: r.Path + ".engineSpace"},
					{Name: "F_bundle", Value: a.Bundle, From: r.Path + ".bundle"},
				},
				Source: in.Rules.Ampacity.Source,
			})
			need, needDerated := ampacityNeeds(in, r)
			f.Limit = round(a.Derated, 2)
			f.Margin = round(a.Derated-needDerated, 2)
			f.Value = round(needDerated, 2)
			f.Message = fmt.Sprintf("%s design current (%s) against %g A × %g × %g = %s allowed", amps(needDerated), r.Basis, a.Table, a.Engine, a.Bundle, amps(a.Derated))
			if r.Role == model.PV {
				f.Message = fmt.Sprintf("solar run (NEC 690.8(B)): %s before derating against %g A in the table, %s after against %g A × %g × %g = %s", amps(need), a.Table, amps(needDerated), a.Table, a.Engine, a.Bundle, amps(a.Derated))
			}
			if a.Note != "" {
				f.Message += "; " + a.Note
			}
			if needDerated > a.Derated || need > a.Table {
				f.Status = result.Fail
				f.Change = changeFor(in, r)
			}
			out.Add(f)
		}
	},
}

// MinimumSize checks each conductor against the smallest size allowed.
var MinimumSize = &Check{
	ID:    result.CheckMinimumSize,
	Title: "no conductor smaller than the minimum size",
	Doc: `Checks that no conductor is smaller than the rulebook's minimum size.

Limit: the rulebook's general minimum, or its minimum for conductors in a
sheath (default: 16 AWG, or 18 AWG inside a sheath, 33 CFR 183.425).`,
	Run: func(in *Input, out *Report) {
		ms := in.Rules.MinimumSize
		for _, r := range allRuns(in) {
			min := ms.General
			if r.Spec.Sheathed {
				min = ms.Sheathed
			}
			area, limit := r.Spec.Size.MM2(), min.MM2()
			f := result.Finding{
				Subject: r.Name, Value: round(area, 3), Limit: round(limit, 3), Unit: "mm²",
				Margin:   round(area-limit, 3),
				Source:   sourced(ms.Sourced),
				Position: in.Position(r.Path),
				Message:  fmt.Sprintf("%s (%.3g mm²) against the minimum %s (%.3g mm²)", r.Spec.Size.Text, area, min.Text, limit),
				Status:   result.Pass,
			}
			if unitsOf(in).imperial {
				a, l := math.Round(area*cmilPerMM2), math.Round(limit*cmilPerMM2)
				f.Value, f.Limit, f.Margin, f.Unit = a, l, a-l, "cmil"
				f.Message = fmt.Sprintf("%s (%.0f cmil) against the minimum %s (%.0f cmil)", r.Spec.Size.Text, a, min.Text, l)
			}
			if area < limit*(1-1e-9) {
				f.Status = result.Fail
				f.Change = changeFor(in, r)
			}
			out.Add(f)
		}
	},
}

// cmilPerMM2 is the circular mils in a square millimetre:
// 1 cmil = π/4 × (0.0254 mm)², so 1 mm² = 1973.525 cmil.
var cmilPerMM2 = 1 / (math.Pi / 4 * 0.0254 * 0.0254)

// ftPerM is the feet in a metre (1 ft = 0.3048 m exactly).
const ftPerM = 1 / 0.3048

// resistanceBasis says how a conductor's resistance at 20 °C was found,
// in the design's units: for an imperial design, resistivity in Ω·cmil/ft
// over the area in circular mils, per 1000 ft at 68 °F.
func resistanceBasis(in *Input, u units, c *schema.Conductor, size unit.Size, res model.Resistance) string {
	if !u.imperial {
		return res.Basis
	}
	rr := in.Rules.Resistance
	tf := 1.0
	if c.Material != "copper" {
		tf = rr.TinnedFactor
	}
	rho := rr.Resistivity * cmilPerMM2 / ftPerM // Ω·cmil/ft
	area := size.MM2() * cmilPerMM2
	r20, ru := u.resistance(res.R20)
	if _, ok := size.AWG(); ok {
		return fmt.Sprintf("R′(68 °F) = ρ/A × lay × tinning × 1000 ft = %.5g Ω·cmil/ft ÷ %.0f cmil × %g × %g × 1000 ft = %s",
			rho, area, rr.LayFactor, tf, num(r20, ru))
	}
	if res.FromTable {
		return fmt.Sprintf("R′(68 °F) from the rulebook resistance table for %s: %g Ω/km × 0.3048 = %s", size.Text, sig(res.R20*1000, 5), num(r20, ru))
	}
	return fmt.Sprintf("nominal area: R′(68 °F) = ρ/A × tinning × 1000 ft = %.5g Ω·cmil/ft ÷ %.0f cmil × %g × 1000 ft = %s (size not in the rulebook table)",
		rho, area, tf, num(r20, ru))
}

// allRuns are the positive runs, then the negative conductors the design
// draws: the conductor checks apply to both.
func allRuns(in *Input) []*model.Run {
	return append(in.Sys.Runs[:len(in.Sys.Runs):len(in.Sys.Runs)], in.Sys.Returns...)
}

// returnFrom says where a run's return conductor comes from.
func returnFrom(r *model.Run) string {
	if v := r.Ret.Via; v != nil {
		return v.Path
	}
	return r.Path + ".return"
}

// measured is a run's drop and ampacity at one size.
type measured struct {
	drop model.Drop
	amp  model.Ampacity
}

func measure(in *Input, r *model.Run, size unit.Size) measured {
	return measured{drop: in.Sys.RunDrop(r, size), amp: in.Sys.RunAmpacity(r, size)}
}

// passesWiring reports whether the run at size passes the voltage-drop,
// ampacity and minimum-size checks.
func passesWiring(in *Input, r *model.Run, size unit.Size) (measured, bool) {
	m := measure(in, r, size)
	min := in.Rules.MinimumSize.General
	if r.Spec.Sheathed {
		min = in.Rules.MinimumSize.Sheathed
	}
	need, needDerated := ampacityNeeds(in, r)
	ok := m.amp.OK && need <= m.amp.Table && needDerated <= m.amp.Derated &&
		m.drop.Pct <= model.DropLimit(in.Rules, r.Class) &&
		size.MM2() >= min.MM2()*(1-1e-9)
	return m, ok
}

// ampacityNeeds is the current a run's conductor must carry before and
// after derating. For most runs both are the design current. A solar run
// follows NEC 690.8(B): the conductor carries conductorFactor × Isc (1.56)
// before correction and adjustment, and inputFactor × Isc (1.25) after.
func ampacityNeeds(in *Input, r *model.Run) (table, derated float64) {
	if r.Role != model.PV {
		return r.Current, r.Current
	}
	pv := in.Rules.PV
	return r.Current, r.Current * pv.InputFactor / pv.ConductorFactor
}

// SmallestPassingSize returns the smallest standard size in the run's
// family (AWG or mm²), at least its present size, that passes every wiring
// check, and false when none does.
func SmallestPassingSize(in *Input, r *model.Run) (unit.Size, measured, bool) {
	for _, s := range standardSizes(in, r.Spec.Size) {
		if s.MM2() < r.Spec.Size.MM2()*(1-1e-9) {
			continue
		}
		if m, ok := passesWiring(in, r, s); ok {
			return s, m, true
		}
	}
	return unit.Size{}, measured{}, false
}

// standardSizes lists the standard sizes of a conductor's family, thin to
// thick (model.StandardSizes).
func standardSizes(in *Input, like unit.Size) []unit.Size {
	return model.StandardSizes(in.Rules.Resistance.Metric.Plain, like)
}

// changeFor says what to change on a run that fails a wiring check: the
// smallest passing size and the protection rating that then fits.
func changeFor(in *Input, r *model.Run) string {
	s, m, ok := SmallestPassingSize(in, r)
	if !ok {
		return fmt.Sprintf("no standard %s size passes: shorten the run, split the load, or raise the system voltage", r.Spec.Size.Family())
	}
	if s.MM2() <= r.Spec.Size.MM2()*(1+1e-9) {
		return ""
	}
	msg := fmt.Sprintf("use %s: drop %.2f %% (limit %g %%), %s allowed", s.String(), m.drop.Pct, model.DropLimit(in.Rules, r.Class), amps(m.amp.Derated))
	if rating, ok := fittingRating(in, r.Current, m.amp.Derated); ok && (r.Spec.Protection != nil || r.UpNode.Kind == model.KindBank) {
		msg += fmt.Sprintf(", protected at %g A", rating)
	}
	return msg
}

// suggestHeadroom is the margin a suggested rating keeps over the design
// current, so that a device does not open on a motor's start or a long
// full load (common practice: 125 % of the continuous current).
const suggestHeadroom = 1.25

// fittingRating is the smallest standard device rating at least 1.25 × the
// design current (else at least the design current) and at most the
// rulebook's ratio × ampacity.
func fittingRating(in *Input, current, ampacity float64) (float64, bool) {
	p := in.Rules.Protection
	for _, floor := range []float64{suggestHeadroom * current, current} {
		for _, rating := range p.StandardRatings {
			if rating >= floor && rating <= p.Ratio*ampacity {
				return rating, true
			}
		}
	}
	return 0, false
}

// sourced is a rulebook table's source with its caveat.
var sourced = energy.Sourced
