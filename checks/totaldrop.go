package checks

import (
	"fmt"
	"strings"

	"github.com/ampwright/ampwright/energy"
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// loadClass is the voltage-drop class of a load itself: its own class, or
// critical for a kind the rulebook lists.
func loadClass(in *Input, l *model.Load) string {
	if l.Spec.Class != "" {
		return l.Spec.Class
	}
	for _, k := range in.Rules.VoltageDrop.CriticalKinds {
		if k == l.Spec.Kind {
			return "critical"
		}
	}
	return "other"
}

// together gives each conductor on load l's path the current of the loads
// beyond it that run together with l: in the scenarios and hours l runs,
// the most the others on at the same time draw with it. sums holds, run
// by run, what the loads beyond draw in each scenario and hour, worked
// out once for every load whose path crosses the run.
func together(in *Input, l *model.Load, sums runSums) func(*model.Run) float64 {
	scenarios := schema.Names(in.Design.Scenarios)
	return func(x *model.Run) float64 {
		at := sums.of(in, x, scenarios)
		var best float64
		for i, sn := range scenarios {
			if l.Spec.Hours[sn] <= 0 {
				continue
			}
			for h := 0; h < 24; h++ {
				if energy.OnAt(l.Spec.Windows, h) {
					best = max(best, at[i][h])
				}
			}
		}
		return best
	}
}

// runSums is, by run, the current the loads beyond it draw together in
// each scenario (in name order) and hour.
type runSums map[*model.Run][][24]float64

func (m runSums) of(in *Input, x *model.Run, scenarios []string) [][24]float64 {
	if at, ok := m[x]; ok {
		return at
	}
	s := in.Sys
	names := x.Loads
	if x.Role == model.Return {
		names = s.LoadsThrough(x)
	}
	beyond := x.Bank != nil && x.Volts != x.Bank.Volts
	at := make([][24]float64, len(scenarios))
	for _, n := range names {
		ld := s.Load(n)
		if ld == nil {
			continue
		}
		draw := ld.Current // a run beyond a converter carries the loads' own current
		if !beyond {
			draw = energy.BankCurrent(s, ld)
		}
		for i, sn := range scenarios {
			if ld.Spec.Hours[sn] <= 0 {
				continue
			}
			for h := 0; h < 24; h++ {
				if energy.OnAt(ld.Spec.Windows, h) {
					at[i][h] += draw
				}
			}
		}
	}
	m[x] = at
	return at
}

// Together is the current each conductor on DC load l's way from its bank
// carries when l runs, as wiring.totalDrop takes it: the loads beyond it
// that run together with l (in the scenarios and hours l runs), at their
// bank current. It depends on the loads and the topology alone, not on
// conductor sizes, so a tool sizing conductors may keep it.
func Together(in *Input, l *model.Load) func(*model.Run) float64 { return together(in, l, runSums{}) }

// LoadClass is the voltage-drop class wiring.totalDrop holds DC load l to.
func LoadClass(in *Input, l *model.Load) string { return loadClass(in, l) }

// TotalDrop checks the voltage drop from the bank to each load, over every
// run on the way and back.
var TotalDrop = &Check{
	ID:    result.CheckTotalDrop,
	Title: "voltage drop from the bank to each load, supply and return, within its class",
	Doc: `Checks the voltage a DC load loses on its whole way from its bank (or the
converter it lies beyond, which regulates its output): every run on the
way at the current of the loads beyond it that run together with this one
(in the scenarios and hours it runs, as in bank.discharge: a feeder carries
the other circuits' loads too), and the return: each run's own return conductor up to where the
return reaches the negative side the design draws, then each negative
conductor to the bank's negative post (or the converter) at the current of
the returns that pass it, taken the same way. A design that draws no negative side returns every run on a
conductor of its own size and length.

    ΔV = Σ I_run × L × R′(T)   (supply and return)
    drop = ΔV / V_nominal × 100 %

V_nominal is the nominal voltage of the load's side.

Limit: by the load's own class, as in wiring.voltageDrop (default: 3 % for
critical loads, 10 % for others, ABYC E-11 11.14.2.6): ABYC sizes a circuit
for the drop at the device, so the runs on the way share the limit.`,
	Run: func(in *Input, out *Report) {
		sums := runSums{}
		for _, l := range in.Sys.Loads {
			r := l.Circuit
			if r == nil || r.DropVoltage <= 0 {
				continue
			}
			v, terms := in.Sys.PathDrop(r, together(in, l, sums))
			pct := v / r.DropVoltage * 100
			class := loadClass(in, l)
			limit := model.DropLimit(in.Rules, class)
			var inputs []result.Input
			var parts []string
			for _, t := range terms {
				name := t.Run.Name
				if t.Return && t.Run.Role != model.Return {
					name += " return"
				}
				u := unitsOf(in)
				lv, ls := u.length(t.Length)
				inputs = append(inputs, result.Input{Name: name, Value: round(t.Volts, 4), Unit: "V",
					From: fmt.Sprintf("%s × %g %s × %s", amps(t.Current), lv, ls, u.resistanceText(t.R))})
				parts = append(parts, fmt.Sprintf("%s %.3g V", name, t.Volts))
			}
			inputs = append(inputs, result.Input{Name: "V", Value: r.DropVoltage, Unit: "V", From: r.VoltBasis})
			out.Figure(result.Figure{
				ID: result.FigTotalDrop, Subject: l.Name, Value: round(pct, 3), Unit: "%",
				Formula: "drop = Σ I × L × R′(T) over the runs from the bank and back / V × 100",
				Inputs:  inputs,
				Source:  in.Rules.VoltageDrop.Source,
			})
			f := result.Finding{
				Subject: l.Name, Value: round(pct, 2), Limit: limit, Unit: "%", Margin: round(limit-pct, 2),
				Source: sourced(in.Rules.VoltageDrop.Sourced), Position: in.Position(l.Path), Status: result.Pass,
				Message: fmt.Sprintf("%s = %.3g V, %.2f %% of %s (%s)", strings.Join(parts, " + "), v, pct, volts(r.DropVoltage), class),
			}
			if pct > limit+1e-9 {
				f.Status = result.Fail
				f.Change = fmt.Sprintf("larger conductors on the runs that lose most (%s), shorter runs, or a feeder of its own", worstTerm(terms))
			}
			out.Add(f)
		}
	},
}

// worstTerm names the run that loses most on a path.
func worstTerm(terms []model.DropTerm) string {
	best := model.DropTerm{}
	for _, t := range terms {
		if t.Volts > best.Volts {
			best = t
		}
	}
	if best.Run == nil {
		return ""
	}
	return fmt.Sprintf("%s, %.3g V", best.Run.Name, best.Volts)
}
