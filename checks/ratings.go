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

// sideVoltage is the highest voltage the positive side of a bank reaches,
// and what sets it: the battery's charging voltage, a regulator's or a
// charger's set voltage, a DC-DC charger's absorption into it.
func sideVoltage(in *Input, b *model.Bank) (float64, string) {
	v := energy.ChargeVoltage(b, in.Rules)
	why := fmt.Sprintf("%s charging voltage", b.Name)
	raise := func(x *unit.Voltage, what string) {
		if x != nil && x.Volts() > v {
			v, why = x.Volts(), what
		}
	}
	for _, src := range b.Sources {
		if ch := src.Charger; ch != nil && ch.Part != nil {
			raise(ch.Part.Regulator, src.Name+"'s regulator")
			raise(ch.Part.Absorption, src.Name+"'s absorption")
		}
	}
	for _, l := range in.Sys.Links {
		if l.To == b {
			raise(l.Spec.Part.Absorption, l.Name+"'s absorption")
		}
	}
	return v, why
}

// coldVoc is the open-circuit voltage of array a's strings at the record
// low, and how it was found (NEC 690.7).
func coldVoc(in *Input, a *model.Array) (float64, string) {
	spec := a.Spec
	tmin := in.Design.Site.RecordLow.Celsius()
	voc := spec.Module.Voc.Volts()
	ns := float64(spec.Series)
	if b := spec.Module.BetaVoc; b != nil {
		return ns * voc * (1 + b.PerKelvin()*(tmin-25)), fmt.Sprintf("cold Voc of %s", a.Name)
	}
	return ns * voc * energy.RowFactor(in.Rules.VocFactor.Rows, tmin), fmt.Sprintf("cold Voc of %s (table factor)", a.Name)
}

// runVoltage is the highest voltage run r's devices see: a PV run's
// strings' cold Voc, else the highest voltage of its side (beyond a
// converter, its output at the rulebook's charging multiple).
func runVoltage(in *Input, r *model.Run) (float64, string) {
	if r.Role == model.PV {
		var v float64
		why := ""
		for _, a := range in.Sys.Arrays {
			for x := a.Node.In; x != nil; x = x.Parent {
				if x == r {
					if cv, w := coldVoc(in, a); cv > v {
						v, why = cv, w
					}
					break
				}
			}
		}
		return v, why
	}
	for n := r.UpNode; n != nil; {
		if n.Kind == model.KindConverter {
			return r.Volts * in.Rules.Charging.ChargeVoltage, fmt.Sprintf("%s output × %g", n.Name, in.Rules.Charging.ChargeVoltage)
		}
		if n.In == nil {
			break
		}
		n = n.In.UpNode
	}
	return sideVoltage(in, r.Bank)
}

// VoltageRating checks every fuse, breaker, switch and bus against the
// highest voltage it can see.
var VoltageRating = &Check{
	ID:    result.CheckVoltageRating,
	Title: "every fuse, breaker, switch, bus and link rated for the highest voltage it sees",
	Doc: `Checks that every protective device, switch, bus, link and shunt is rated
for the highest DC voltage it can see (NEC 690.9 and IEC 62548 require PV
protection rated for the string's voltage; a device that opens a DC current
above its rated voltage may not clear the arc).

The highest voltage: in a PV circuit the strings' open-circuit voltage at
the record low (NEC 690.7, as in pv.coldVoc); on a bank's side its charging
voltage, or the set voltage of a regulator, charger or DC-DC charger that
charges it, whichever is highest; beyond a converter its output at the
rulebook's charging multiple.

Limit: the part's voltage rating from the catalog. A part whose catalog
entry gives none is a warning.`,
	Run: func(in *Input, out *Report) {
		check := func(subject, path, what string, part schema.Part, rated *unit.Voltage, v float64, why string) {
			f := result.Finding{
				Subject: subject, Value: round(v, 2), Unit: "V", Source: "catalog data for " + part.ID,
				Position: in.Position(path), Status: result.Pass,
			}
			if rated == nil {
				f.Status = result.Warn
				f.Message = fmt.Sprintf("%s %s sees up to %s (%s); the catalog gives no voltage rating for it", what, part.ID, volts(v), why)
				f.Change = "check its voltage rating on the datasheet and give it in the catalog"
				out.Add(f)
				return
			}
			f.Limit, f.Margin = rated.Volts(), round(rated.Volts()-v, 2)
			f.Message = fmt.Sprintf("%s %s rated %s, sees up to %s (%s)", what, part.ID, rated.Text, volts(v), why)
			if v > rated.Volts()+1e-9 {
				f.Status = result.Fail
				f.Change = fmt.Sprintf("a %s rated for at least %s DC", what, volts(math.Ceil(v)))
			}
			out.Add(f)
		}
		s := in.Sys
		for _, b := range s.Banks {
			v, why := sideVoltage(in, b)
			out.Figure(result.Figure{
				ID: result.FigMaxVoltage, Subject: b.Name, Value: round(v, 2), Unit: "V",
				Formula: "V_max = the highest of the charging voltage and the set voltages of what charges the bank",
				Inputs:  []result.Input{{Name: "V_max", Value: round(v, 2), Unit: "V", From: why}},
				Source:  "catalog data of the bank and its sources; rulebook charging table",
			})
		}
		for _, a := range s.Arrays {
			v, why := coldVoc(in, a)
			if f := a.Spec.StringFuse; f != nil {
				check(a.Name, a.Path, "string "+f.Kind, f.Part, f.Voltage, v, why)
			}
		}
		for _, r := range s.Runs {
			if d := r.Spec.Protection; d != nil {
				v, why := runVoltage(in, r)
				check(r.Name, r.Path, d.Kind, d.Part, d.Voltage, v, why)
			}
		}
		for _, bus := range s.Buses {
			if p := bus.Spec.Part; p != nil && bus.Node.In != nil {
				v, why := runVoltage(in, bus.Node.In)
				check(bus.Name, bus.Path, bus.Spec.Kind, p.Part, p.Voltage, v, why)
			}
		}
		for _, l := range s.Links {
			vf, wf := sideVoltage(in, l.From)
			vt, wt := sideVoltage(in, l.To)
			if vt > vf {
				vf, wf = vt, wt
			}
			check(l.Name, l.Path, l.Spec.Part.Kind, l.Spec.Part.Part, l.Spec.Part.Voltage, vf, wf)
		}
		for _, sh := range s.Shunts {
			var v float64
			why := ""
			for _, b := range s.Banks {
				if x, w := sideVoltage(in, b); x > v {
					v, why = x, w
				}
			}
			check(sh.Name, sh.Path, "shunt", sh.Spec.Part.Part, sh.Spec.Part.Voltage, v, why)
		}
	},
}

// demandFactor is the rulebook's demand factor for n circuits, and its
// source.
func demandFactor(in *Input, n int) (float64, string) {
	d := in.Rules.Demand
	if d == nil {
		return 1, "no demand factor"
	}
	f := 1.0
	for _, st := range d.Steps {
		if n >= st.From {
			f = st.Factor
		}
	}
	return f, sourced(d.Sourced)
}

// feedingDevice is the device that protects run r: its own, else the
// nearest toward the bank.
func feedingDevice(r *model.Run) *model.Run {
	if r.Spec.Protection != nil {
		return r
	}
	return upstreamDevice(r)
}

// BusCurrent checks each rated bus, panel, switch and negative bus against
// the current through it and the device that protects it.
var BusCurrent = &Check{
	ID:    result.CheckBusCurrent,
	Title: "buses, panels and switches rated for their current and the device that feeds them",
	Doc: `Checks that every bus, panel, switch and negative bus whose part gives a
current rating carries what flows through it.

Method: a bus carries its feeder's design current (see
wiring.voltageDrop) × the rulebook's demand factor for the number of
circuits it feeds (default 1: every circuit at full draw; common practice,
no public source: a yard that knows how its loads coincide gives its own
factors; the factor used is shown). A negative bus carries its negative
conductor's current (the returns that pass it).

    I_bus = I_feeder × F_demand(N_circuits)

A positive bus is protected by the device on its feeder (or the nearest
toward the bank): until that device opens, the bus may carry its rating.

Limit: the part's current rating (maker's data) must be at least I_bus and
at least the rating of the device that protects it (common practice: the
bus is protected like any conductor).`,
	Run: func(in *Input, out *Report) {
		s := in.Sys
		type bus struct {
			name, path, kind string
			part             *schema.Busbar
			node             *model.Node
			negative         bool
		}
		var all []bus
		for _, b := range s.Buses {
			all = append(all, bus{b.Name, b.Path, b.Spec.Kind, b.Spec.Part, b.Node, false})
		}
		for _, b := range s.NegativeBuses {
			all = append(all, bus{b.Name, b.Path, "negative bus", b.Spec.Part, b.Node, true})
		}
		for _, b := range all {
			if b.part == nil || b.part.Rating == nil || b.node.In == nil {
				continue
			}
			feeder := b.node.In
			n := len(b.node.Out)
			fd, fdSrc := 1.0, "the negative conductor's current"
			if !b.negative {
				fd, fdSrc = demandFactor(in, n)
			}
			i := feeder.Current * fd
			inputs := []result.Input{
				{Name: "I_feeder", Value: round(feeder.Current, 3), Unit: "A", From: feeder.Path + ": " + feeder.Basis},
				{Name: "F_demand", Value: fd, From: fmt.Sprintf("%d circuits; %s", n, fdSrc)},
			}
			out.Figure(result.Figure{
				ID: result.FigBusCurrent, Subject: b.name, Value: round(i, 2), Unit: "A",
				Formula: "I_bus = I_feeder × F_demand(N_circuits)", Inputs: inputs, Source: fdSrc,
			})
			rating := b.part.Rating.Amps()
			value, what := i, fmt.Sprintf("%s through it (%s × %g)", amps(i), amps(feeder.Current), fd)
			var dev *model.Run
			if !b.negative {
				dev = feedingDevice(feeder)
			}
			if dev != nil && dev.Spec.Protection.Rating.Amps() > value {
				value, what = dev.Spec.Protection.Rating.Amps(), fmt.Sprintf("the %s %s on %q that protects it (%s through it)", dev.Spec.Protection.Rating.Text, dev.Spec.Protection.Kind, dev.Name, amps(i))
			}
			f := result.Finding{
				Subject: b.name, Value: round(value, 2), Limit: rating, Unit: "A", Margin: round(rating-value, 2),
				Source: "catalog data for " + b.part.ID + "; " + fdSrc, Position: in.Position(b.path), Status: result.Pass,
				Message: fmt.Sprintf("%s %s rated %s against %s", b.kind, b.part.ID, b.part.Rating.Text, what),
			}
			if value > rating+1e-9 {
				f.Status = result.Fail
				f.Change = fmt.Sprintf("a %s rated at least %s", b.kind, amps(math.Ceil(value)))
				if dev != nil && i <= rating {
					f.Change += fmt.Sprintf(", or protect its feeder with a device of at most %s", b.part.Rating.Text)
				}
			}
			out.Add(f)
		}
	},
}

// BusWays checks that a panel or fuse block has a way for each circuit.
var BusWays = &Check{
	ID:    result.CheckBusWays,
	Title: "panels and fuse blocks have a way for every circuit",
	Doc: `Checks that every panel or fuse block whose part gives its number of ways
(circuits) has one for each run that leaves it.

Limit: the part's ways (maker's data).`,
	Run: func(in *Input, out *Report) {
		for _, b := range in.Sys.Buses {
			p := b.Spec.Part
			if p == nil || p.Ways == 0 {
				continue
			}
			n := len(b.Node.Out)
			f := result.Finding{
				Subject: b.Name, Value: float64(n), Limit: float64(p.Ways), Unit: "circuits", Margin: float64(p.Ways - n),
				Source: "catalog data for " + p.ID, Position: in.Position(b.Path), Status: result.Pass,
				Message: fmt.Sprintf("%d circuits on %s's %d ways", n, p.ID, p.Ways),
			}
			if n > p.Ways {
				f.Status = result.Fail
				f.Change = fmt.Sprintf("a %s of at least %d ways, or a second one", b.Spec.Kind, n)
			}
			out.Add(f)
		}
	},
}

// LinkCurrent checks a combiner's or isolator's rating against the charge
// it can pass.
var LinkCurrent = &Check{
	ID:    result.CheckLinkCurrent,
	Title: "combiners and isolators rated for the charge current through them",
	Doc: `Checks that a combiner (voltage-sensitive relay) or isolator can carry the
charge current that flows through it: the sources that charge the bank it
passes charge from (for a combiner, the larger of its two banks'), at their
rated output (see link.current among the figures).

Limit: the part's continuous rating (maker's data). A DC-DC charger
limits its own output; its input current is its feeder's design current
(see wiring.ampacity and protection.rating).`,
	Run: func(in *Input, out *Report) {
		for _, l := range in.Sys.Links {
			p := l.Spec.Part
			if p.Kind == "dc-dc" {
				continue
			}
			i, basis := in.Sys.LinkCurrent(l)
			lim := p.Rating.Amps()
			f := result.Finding{
				Subject: l.Name, Value: round(i, 2), Limit: lim, Unit: "A", Margin: round(lim-i, 2),
				Source: "catalog data for " + p.ID, Position: in.Position(l.Path), Status: result.Pass,
				Message: fmt.Sprintf("%s through it (%s) against %s's %s", amps(i), basis, p.ID, p.Rating.Text),
			}
			if i > lim+1e-9 {
				f.Status = result.Fail
				f.Change = fmt.Sprintf("a %s rated at least %s", p.Kind, amps(math.Ceil(i)))
			}
			out.Add(f)
		}
	},
}

// ChargePath checks that nothing drives a lithium bank with current that
// nothing limits.
var ChargePath = &Check{
	ID:    result.CheckChargePath,
	Title: "an alternator charges a lithium bank only through a current-limiting path",
	Doc: `Checks that every alternator that can charge a LiFePO4 bank does so
through something that limits its current: a regulator that says so in the
catalog (currentLimited), or a DC-DC charger. A lithium bank's low
resistance takes whatever an alternator gives, until the alternator
overheats or the battery's management system disconnects the bank under
charge, which can destroy the alternator's diodes (common practice).

An alternator on a lead-acid bank joined to a lithium bank by a combiner
or isolator reaches the lithium bank unlimited, and fails too.`,
	Run: func(in *Input, out *Report) {
		s := in.Sys
		for _, src := range s.Sources {
			if src.Kind != model.Alternator {
				continue
			}
			f := result.Finding{
				Subject: src.Name, Value: round(src.Output, 2), Unit: "A", Position: in.Position(src.Path),
				Source: "common practice (alternators and lithium banks)", Status: result.Pass,
			}
			lithium := !src.Bank.Spec.Battery.LeadAcid()
			var via *model.Link
			for _, l := range s.Links {
				if l.Spec.Part.Kind == "dc-dc" || l.Spec.Part.CurrentLimited {
					continue
				}
				other := l.To
				switch {
				case l.From == src.Bank:
				case l.To == src.Bank && l.Spec.Part.Kind == "combiner":
					other = l.From
				default:
					continue
				}
				if !other.Spec.Battery.LeadAcid() {
					via = l
				}
			}
			switch {
			case src.CurrentLimited:
				f.Message = fmt.Sprintf("%s charges bank %q through a current-limiting regulator", src.Name, src.Bank.Name)
			case lithium:
				f.Status = result.Fail
				f.Message = fmt.Sprintf("%s charges the lithium bank %q with nothing to limit its current (%s)", src.Name, src.Bank.Name, src.OutputBasis)
				f.Change = "charge the lithium bank through a DC-DC charger from a lead-acid start bank, or fit a regulator that limits the alternator's current"
			case via != nil:
				f.Status = result.Fail
				f.Message = fmt.Sprintf("%s charges bank %q, and %s %q passes its current unlimited to lithium bank %q", src.Name, src.Bank.Name, via.Spec.Part.Kind, via.Name, via.To.Name)
				f.Change = fmt.Sprintf("replace %s with a DC-DC charger", via.Name)
			default:
				f.Message = fmt.Sprintf("%s charges the lead-acid bank %q", src.Name, src.Bank.Name)
			}
			out.Add(f)
		}
	},
}
