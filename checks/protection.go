package checks

import (
	"fmt"
	"math"

	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
)

// Protected checks that every run from a source is protected.
var Protected = &Check{
	ID:    result.CheckProtected,
	Title: "every run from a source is protected against overcurrent",
	Doc: `Checks that every supply and charge run is protected against overcurrent.

Method: a run with its own fuse or breaker is protected by it. A run without
one is protected by the nearest device between it and the bank only if that
device's rating is at most the rulebook's ratio × this run's derated
ampacity (see protection.rating); a run from the bank itself must have its
own device. Solar runs are covered by pv.stringFuse.

Source: every ungrounded conductor protected at its source, 33 CFR 183.455
and ABYC E-11 (as given in the rulebook's protection table).`,
	Run: func(in *Input, out *Report) {
		p := in.Rules.Protection
		for _, r := range in.Sys.Runs {
			if r.Role == model.PV {
				continue
			}
			f := result.Finding{Subject: r.Name, Unit: "A", Source: sourced(p.Sourced), Position: in.Position(r.Path), Status: result.Pass}
			if d := r.Spec.Protection; d != nil {
				f.Value, f.Limit = d.Rating.Amps(), d.Rating.Amps()
				f.Message = fmt.Sprintf("protected by its own %s %s (%s) at %q", d.Rating.Text, d.Kind, d.ID, r.Up)
				out.Add(f)
				continue
			}
			up := upstreamDevice(r)
			a := in.Sys.RunAmpacity(r, r.Spec.Size)
			max := p.Ratio * a.Derated
			switch {
			case up == nil:
				f.Status = result.Fail
				f.Message = fmt.Sprintf("no fuse or breaker between the bank and this run from %q", r.Up)
				if rating, ok := fittingRating(in, r.Current, a.Derated); ok {
					f.Change = fmt.Sprintf("fit a %g A fuse or breaker at %q", rating, r.Up)
				}
			default:
				d := up.Spec.Protection
				f.Value, f.Limit = d.Rating.Amps(), round(max, 2)
				f.Margin = round(max-d.Rating.Amps(), 2)
				f.Message = fmt.Sprintf("no device of its own; %s %s on run %q upstream, against %g × %s = %s allowed for this run",
					d.Rating.Text, d.Kind, up.Name, p.Ratio, amps(a.Derated), amps(max))
				if !a.OK || d.Rating.Amps() > max {
					f.Status = result.Fail
					if rating, ok := fittingRating(in, r.Current, a.Derated); ok {
						f.Change = fmt.Sprintf("fit a %g A fuse or breaker at %q", rating, r.Up)
					}
				}
			}
			out.Add(f)
		}
	},
}

// upstreamDevice is the nearest run toward the bank with a device.
func upstreamDevice(r *model.Run) *model.Run {
	for x := r.Parent; x != nil; x = x.Parent {
		if x.Spec.Protection != nil {
			return x
		}
	}
	return nil
}

// Rating checks each device's rating against its run.
var Rating = &Check{
	ID:    result.CheckRating,
	Title: "device rating between the design current and the ratio of ampacity",
	Doc: `Checks each fuse or breaker's rating against the run it protects.

Limit: the rating must be at least the run's design current, or the
device opens under normal load, and at most the rulebook's ratio × the
run's derated ampacity (default 150 % of the Table 5 amperage for circuits
under 50 V, 33 CFR 183.455), or the conductor can overheat before the device
opens.`,
	Run: func(in *Input, out *Report) {
		p := in.Rules.Protection
		for _, r := range in.Sys.Runs {
			d := r.Spec.Protection
			if d == nil {
				continue
			}
			a := in.Sys.RunAmpacity(r, r.Spec.Size)
			max := p.Ratio * a.Derated
			rating := d.Rating.Amps()
			f := result.Finding{
				Subject: r.Name, Value: rating, Limit: round(max, 2), Unit: "A", Margin: round(max-rating, 2),
				Source: sourced(p.Sourced), Position: in.Position(r.Path), Status: result.Pass,
				Message: fmt.Sprintf("%s %s: at least the design current %s, at most %g × %s = %s", d.Rating.Text, d.ID, amps(r.Current), p.Ratio, amps(a.Derated), amps(max)),
			}
			switch {
			case rating < r.Current:
				f.Status = result.Fail
				f.Margin = round(rating-r.Current, 2)
				f.Message = fmt.Sprintf("%s %s is below the design current %s (%s): it will open in normal use", d.Rating.Text, d.ID, amps(r.Current), r.Basis)
			case !a.OK || rating > max:
				f.Status = result.Fail
				f.Message = fmt.Sprintf("%s %s is above %g × %s = %s allowed for %s", d.Rating.Text, d.ID, p.Ratio, amps(a.Derated), amps(max), r.Spec.Size.Text)
			}
			if f.Status == result.Fail {
				if fit, ok := fittingRating(in, r.Current, a.Derated); ok {
					f.Change = fmt.Sprintf("use a %g A device", fit)
				} else {
					f.Change = changeFor(in, r)
				}
			}
			out.Add(f)
		}
	},
}

// Distance checks how far each device sits from its source.
var Distance = &Check{
	ID:    result.CheckDistance,
	Title: "device within the allowed distance of its source",
	Doc: `Checks how far along the conductor each fuse or breaker sits from the
source end of its run.

Limit: the rulebook's distances (default, 33 CFR 183.455 and ABYC E-11
11.12.1.1.1): within 7 in (178 mm) of the source; within 40 in (1.02 m)
when the conductor is sheathed or enclosed up to the device; within 72 in
(1.83 m) of a battery terminal when sheathed. A device whose distance the
design does not give is a warning.`,
	Run: func(in *Input, out *Report) {
		p := in.Rules.Protection
		for _, r := range in.Sys.Runs {
			d := r.Spec.Protection
			if d == nil {
				continue
			}
			limit, why := p.Within, "unsheathed"
			switch {
			case d.Sheathed && r.UpNode.Kind == model.KindBank:
				limit, why = p.WithinBattery, "sheathed, from a battery terminal"
			case d.Sheathed:
				limit, why = p.WithinSheathed, "sheathed"
			}
			// Distances in the design's units: the rulebook's limits are in
			// inches, a metric design's distances in millimetres.
			u := unitsOf(in)
			lim := limit.Metres()
			f := result.Finding{
				Subject: r.Name, Limit: round(lim, 4), Unit: "m",
				Source: sourced(p.Sourced), Position: in.Position(r.Path), Status: result.Pass,
			}
			if u.imperial {
				f.Limit, f.Unit = round(lim/0.0254, 2), "in"
			}
			if d.Distance == nil {
				f.Status = result.Warn
				f.Message = fmt.Sprintf("the design does not say how far %s sits from %q; the limit is %s (%s)", d.ID, r.Up, u.shortText(lim), why)
				out.Add(f)
				continue
			}
			dist := d.Distance.Metres()
			f.Value = round(dist, 4)
			f.Margin = round(lim-dist, 4)
			if u.imperial {
				f.Value, f.Margin = round(dist/0.0254, 2), round((lim-dist)/0.0254, 2)
			}
			f.Message = fmt.Sprintf("%s sits %s from %q; limit %s (%s)", d.ID, u.shortText(dist), r.Up, u.shortText(lim), why)
			if dist > lim+1e-9 {
				f.Status = result.Fail
				f.Change = fmt.Sprintf("move %s to within %s of %q, or sheathe the conductor up to it", d.ID, u.shortText(lim), r.Up)
			}
			out.Add(f)
		}
	},
}

// Interrupting checks each device can break the fault current where it sits.
var Interrupting = &Check{
	ID:    result.CheckInterrupting,
	Title: "device interrupting rating at least the prospective fault current",
	Doc: `Checks that each fuse or breaker can break the current of a bolted fault
just beyond it.

Method: the bank drives the fault through its internal resistance and the
conductors between it and the device, positive and return, taken at 20 °C
(a cold conductor gives the larger current):

    R_bank  = R_battery × N_series / N_parallel
    I_fault = V_bank / (R_bank + Σ 2 × L × R′(20 °C) of the runs upstream)

V_bank is the fully charged bank's rest voltage, the rulebook's faultVoltage
× nominal (default 1.07, common practice); the nominal voltage would
understate the fault. Charge sources add little to a bolted fault and are
left out.

Limit: the device's interrupting rating from the catalog (the maker's
data). A LiFePO4 bank's low internal resistance gives fault currents of
several thousand amperes, beyond a blade fuse's rating.`,
	Run: func(in *Input, out *Report) {
		for _, r := range in.Sys.Runs {
			d := r.Spec.Protection
			if d == nil || r.Role == model.PV {
				continue
			}
			b := r.Bank.Spec
			// A fully charged bank at rest drives the fault.
			vbank := in.Rules.Protection.FaultVoltage * r.Bank.NominalVoltage()
			rbank := b.Battery.Resistance.Ohms() * float64(b.Series) / float64(b.Parallel)
			loop := 0.0
			for x := r.Parent; x != nil; x = x.Parent {
				res := model.ConductorResistance(in.Rules, x.Spec, x.Spec.Size, 20)
				loop += 2 * x.Spec.Length.Metres() * res.R20
			}
			fault := vbank / (rbank + loop)
			bankPath := r.Bank.Path
			out.Figure(result.Figure{
				ID: result.FigFaultCurrent, Subject: r.Name, Value: round(fault, 1), Unit: "A",
				Formula: "I_fault = V_bank / (R_bank + R_upstream)",
				Inputs: []result.Input{
					{Name: "V_bank", Value: round(vbank, 3), Unit: "V", From: "rules.protection.faultVoltage × nominal"},
					{Name: "R_bank", Value: round(rbank*1000, 4), Unit: "mΩ", From: bankPath + ".battery.resistance × series ÷ parallel"},
					{Name: "R_upstream", Value: round(loop*1000, 4), Unit: "mΩ", From: "runs between the bank and " + r.Up},
				},
				Source: "Ohm's law; battery internal resistance from the catalog",
			})
			ir := d.Interrupting.Amps()
			f := result.Finding{
				Subject: r.Name, Value: round(fault, 0), Limit: ir, Unit: "A", Margin: round(ir-fault, 0),
				Source:   "catalog data for " + d.ID + "; fault current by Ohm's law",
				Position: in.Position(r.Path), Status: result.Pass,
				Message: fmt.Sprintf("%s / (%.3g mΩ + %.3g mΩ) = %s prospective at %q, against %s interrupting rating %s",
					volts(vbank), rbank*1000, loop*1000, amps(math.Round(fault)), r.Up, d.ID, d.Interrupting.Text),
			}
			if fault > ir {
				f.Status = result.Fail
				f.Change = fmt.Sprintf("use a device rated to interrupt at least %s", amps(math.Ceil(fault/100)*100))
				// Advice never proposes what is fitted: a main fuse only
				// where there is none between the bank and this device.
				if r.UpNode.Kind != model.KindBank && mainDevice(r) == nil {
					f.Change += fmt.Sprintf(", or fit a main fuse of that interrupting rating between the bank and %q", r.Up)
				}
			}
			out.Add(f)
		}
	},
}

// mainDevice is the device nearest the bank on r's way to it, or nil.
func mainDevice(r *model.Run) *model.Run {
	var main *model.Run
	for x := r.Parent; x != nil; x = x.Parent {
		if x.Spec.Protection != nil {
			main = x
		}
	}
	return main
}

// StringFuse checks the string fuses of each array.
var StringFuse = &Check{
	ID:    result.CheckStringFuse,
	Title: "string fuses where parallel strings can back-feed a faulted one",
	Doc: `Checks whether each array needs string fuses, and that the fitted ones fit.

Method: with N_p strings in parallel, a fault in one string can be fed by
the others:

    fuses needed when (N_p − 1) × Isc > I_max series fuse (module datasheet)

Limit: a string fuse rating I_n with fuseMin × Isc ≤ I_n ≤ fuseMax × Isc
and I_n ≤ the module's maximum series fuse rating (default 1.5 and 2.4,
IEC 62548, as given in the rulebook's pv table).`,
	Run: func(in *Input, out *Report) {
		pv := in.Rules.PV
		for _, arr := range in.Sys.Arrays {
			name, a := arr.Name, arr.Spec
			isc := a.Module.Isc.Amps()
			maxFuse := a.Module.MaxSeriesFuse.Amps()
			back := float64(a.Strings-1) * isc
			path := "arrays." + quotePath(name)
			f := result.Finding{
				Subject: name, Value: round(back, 2), Limit: maxFuse, Unit: "A", Margin: round(maxFuse-back, 2),
				Source: sourced(pv.Sourced), Position: in.Position(path), Status: result.Pass,
			}
			needed := back > maxFuse
			sf := a.StringFuse
			switch {
			case !needed && sf == nil:
				f.Message = fmt.Sprintf("(%d − 1) × %s = %s back-feed, within the module's %s series fuse rating: no string fuses needed", a.Strings, a.Module.Isc.Text, amps(back), a.Module.MaxSeriesFuse.Text)
			case needed && sf == nil:
				f.Status = result.Fail
				f.Message = fmt.Sprintf("(%d − 1) × %s = %s back-feed exceeds the module's %s series fuse rating: string fuses are needed", a.Strings, a.Module.Isc.Text, amps(back), a.Module.MaxSeriesFuse.Text)
				f.Change = fmt.Sprintf("fit a fuse in each string rated between %s and %s", amps(pv.FuseMin*isc), amps(math.Min(pv.FuseMax*isc, maxFuse)))
			default:
				rating := sf.Rating.Amps()
				lo, hi := pv.FuseMin*isc, math.Min(pv.FuseMax*isc, maxFuse)
				f.Value, f.Limit, f.Margin = rating, round(hi, 2), round(hi-rating, 2)
				f.Message = fmt.Sprintf("string fuse %s within %g × %s = %s and %s", sf.Rating.Text, pv.FuseMin, a.Module.Isc.Text, amps(lo), amps(hi))
				if rating < lo || rating > hi {
					f.Status = result.Fail
					f.Change = fmt.Sprintf("use string fuses rated between %s and %s", amps(lo), amps(hi))
				}
			}
			out.Add(f)
		}
	},
}
