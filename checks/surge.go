package checks

import (
	"fmt"
	"math"

	"github.com/ampwright/ampwright/energy"
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// OpeningTime is the shortest time, seconds, a device with time-current
// curve pts takes to open at multiple m of its rating: +Inf below the
// curve's first point (it carries that current), the last point's time
// beyond its last, and in between interpolated on log-log axes, as
// time-current curves are drawn.
func OpeningTime(pts []schema.CurvePoint, m float64) float64 {
	if len(pts) == 0 || m <= pts[0].Multiple {
		return math.Inf(1)
	}
	for i := 1; i < len(pts); i++ {
		a, b := pts[i-1], pts[i]
		if m <= b.Multiple {
			t := (math.Log(m) - math.Log(a.Multiple)) / (math.Log(b.Multiple) - math.Log(a.Multiple))
			return math.Exp(math.Log(a.Seconds) + t*(math.Log(b.Seconds)-math.Log(a.Seconds)))
		}
	}
	return pts[len(pts)-1].Seconds
}

// CarryMultiple is the largest multiple of its rating a device with
// time-current curve pts carries for the given seconds without opening:
// where its shortest opening time equals the seconds, read on log-log axes.
// A start shorter than the curve's fastest point is held to that point's
// multiple, which errs on the side of the start opening it.
func CarryMultiple(pts []schema.CurvePoint, seconds float64) float64 {
	if len(pts) == 0 {
		return math.Inf(1)
	}
	if seconds >= pts[0].Seconds {
		return pts[0].Multiple
	}
	for i := 1; i < len(pts); i++ {
		a, b := pts[i-1], pts[i]
		if seconds >= b.Seconds {
			t := (math.Log(seconds) - math.Log(a.Seconds)) / (math.Log(b.Seconds) - math.Log(a.Seconds))
			return math.Exp(math.Log(a.Multiple) + t*(math.Log(b.Multiple)-math.Log(a.Multiple)))
		}
	}
	return pts[len(pts)-1].Multiple
}

// curveOf is a device's time-current curve, its own or the rulebook's for
// its kind, and where it came from.
func curveOf(in *Input, d *schema.Protection) ([]schema.CurvePoint, string) {
	if len(d.Curve) > 0 {
		return d.Curve, "catalog data for " + d.ID
	}
	sr := in.Rules.Surge
	if sr == nil {
		return nil, ""
	}
	if d.Kind == "breaker" {
		return sr.Breaker, sourced(sr.Sourced)
	}
	return sr.Fuse, sourced(sr.Sourced)
}

// start is one load's start as a run sees it.
type start struct {
	load    *model.Load
	extra   float64 // A above the run's design current
	seconds float64
}

// starts lists, for every run, the starts of the loads it feeds: each
// load's surge above its running current (one unit of several starting),
// at the voltage of the run's side.
func starts(in *Input) map[*model.Run][]start {
	out := map[*model.Run][]start{}
	for _, l := range in.Sys.Loads {
		var extra float64
		var r *model.Run
		switch {
		case l.Circuit != nil && l.Spec.Surge != nil:
			q := float64(max(l.Spec.Quantity, 1))
			extra, r = l.Spec.Surge.Amps()-l.Current/q, l.Circuit
		case l.Inverter != nil && l.Spec.SurgePower != nil:
			q := float64(max(l.Spec.Quantity, 1))
			p := l.Inverter.Spec.Part
			extra = (l.Spec.SurgePower.Watts() - energy.ACPower(l)/q) / p.Efficiency / l.Inverter.Node.Volts
			r = l.Inverter.Node.In
		}
		if r == nil || extra <= 0 {
			continue
		}
		for x := r; x != nil; x = x.Parent {
			out[x] = append(out[x], start{load: l, extra: extra, seconds: l.Spec.SurgeSeconds})
			if x.UpNode.Kind == model.KindConverter {
				c := converterAt(in.Sys, x.UpNode)
				extra = extra * c.Out / (c.Spec.Part.Efficiency * c.In)
			}
		}
	}
	return out
}

func converterAt(sys *model.System, n *model.Node) *model.Converter {
	for _, c := range sys.Converters {
		if c.Node == n {
			return c
		}
	}
	return nil
}

// ProtectionSurge checks motor starts and inrush against the devices that
// protect the runs they flow through.
var ProtectionSurge = &Check{
	ID:    result.CheckProtectionSurge,
	Title: "motor starts and inrush do not open the devices they flow through",
	Doc: `Checks that a motor's start (a windlass, a thruster, a pump) or an
inrush does not open the fuses and breakers on its way from the bank.

Method: for each device on the runs a start flows through, the current at
the start is the run's design current plus the load's starting current
above its running current (one unit of several starting; an AC load's
starting power through its inverter at the bank's voltage):

    I_start = I_design + (I_surge − I_run)
    m = I_start / I_rating

The device's time-current curve gives the shortest time it may take to
open at m (interpolated on log-log axes between the curve's points): the
maker's curve from the catalog, else the rulebook's for fuses or breakers
(default: minimum opening times as recalled from SAE J1284 for fuses and
IEC 60898-1 for breakers; verify against the maker's curve).

Limit: the shortest opening time must be longer than the start lasts (the
load's surgeSeconds, default 1 s).`,
	Run: func(in *Input, out *Report) {
		all := starts(in)
		for _, r := range in.Sys.Runs {
			d := r.Spec.Protection
			list := all[r]
			if d == nil || len(list) == 0 {
				continue
			}
			curve, src := curveOf(in, d)
			if curve == nil {
				continue
			}
			// The start with the least to spare: its current against what
			// the device carries for as long as it lasts.
			var worst start
			var worstI, carry float64
			ratio := math.Inf(1)
			for _, st := range list {
				i := r.Current + st.extra
				c := CarryMultiple(curve, st.seconds) * d.Rating.Amps()
				if q := c / i; q < ratio {
					worst, worstI, carry, ratio = st, i, c, q
				}
			}
			out.Figure(result.Figure{
				ID: result.FigSurgeCurrent, Subject: r.Name, Value: round(worstI, 2), Unit: "A",
				Formula: "I_start = I_design + (I_surge − I_run)",
				Inputs: []result.Input{
					{Name: "I_design", Value: round(r.Current, 3), Unit: "A", From: r.Basis},
					{Name: "I_surge − I_run", Value: round(worst.extra, 3), Unit: "A", From: worst.load.Path},
					{Name: "I_rating", Value: d.Rating.Amps(), Unit: "A", From: "catalog data for " + d.ID},
				},
				Source: src,
			})
			f := result.Finding{
				Subject: r.Name, Value: round(worstI, 2), Limit: round(carry, 2), Unit: "A", Margin: round(carry-worstI, 2),
				Source: src, Position: in.Position(r.Path), Status: result.Pass,
				Message: fmt.Sprintf("%s at the start of %s (%g s) against %.3g × the %s %s %s = %s it carries that long",
					amps(worstI), worst.load.Name, worst.seconds, carry/d.Rating.Amps(), d.Rating.Text, d.ID, d.Kind, amps(carry)),
			}
			if worstI > carry+1e-9 {
				f.Status = result.Fail
				f.Change = fmt.Sprintf("a time-delay device or a larger rating that carries %s for %g s and still protects %s, or a soft starter on %s", amps(math.Ceil(worstI)), worst.seconds, r.Spec.Size.Text, worst.load.Name)
			}
			out.Add(f)
		}
	},
}
