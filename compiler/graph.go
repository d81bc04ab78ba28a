package compiler

import (
	"fmt"
	"sort"
	"strings"

	"cuelang.org/go/cue/token"

	"github.com/ampwright/ampwright/checks"
	"github.com/ampwright/ampwright/schema"
)

// buildNetwork orients the design's wiring as a tree from the bank and
// derives each run's role, loads, design current and voltage-drop class.
// A loop, a run or load with no path to the bank, and a run that leads
// nowhere are input errors.
func buildNetwork(d *Design) (*checks.Network, ErrorList) {
	s := d.Spec
	g := &graph{d: d, kind: map[string]string{"bank": "bank"}, adj: map[string][]*checks.Run{}}
	for _, n := range schema.Names(s.Buses) {
		g.kind[n] = "bus"
	}
	for _, n := range schema.Names(s.Arrays) {
		g.kind[n] = "array"
	}
	for _, n := range schema.Names(s.Controllers) {
		g.kind[n] = "controller"
	}
	for _, n := range schema.Names(s.Inverters) {
		g.kind[n] = "inverter"
	}
	for _, n := range schema.Names(s.Chargers) {
		g.kind[n] = "charger"
	}
	for _, n := range schema.Names(s.Loads) {
		g.kind[n] = "load"
	}
	net := &checks.Network{}
	for _, name := range schema.Names(s.Wiring) {
		c := s.Wiring[name]
		r := &checks.Run{Name: name, Path: "wiring." + quoteLabel(name), Spec: &c}
		net.Runs = append(net.Runs, r)
		g.adj[c.From] = append(g.adj[c.From], r)
		g.adj[c.To] = append(g.adj[c.To], r)
	}
	g.net = net
	g.orient()
	if len(g.errs) == 0 {
		g.attach()
	}
	if len(g.errs) > 0 {
		g.errs.Sort()
		return nil, g.errs
	}
	g.roles()
	g.currents()
	g.classes()
	return net, nil
}

type graph struct {
	d    *Design
	net  *checks.Network
	kind map[string]string             // node name → bank, bus, array, controller, inverter, load
	adj  map[string][]*checks.Run      // node name → runs ending there
	kids map[*checks.Run][]*checks.Run // run → runs continuing from its Down end
	feed map[*checks.Run][]string      // run → loads whose circuit it is
	errs ErrorList
}

func (g *graph) pos(path string) token.Pos { return g.d.pos[path] }

func (g *graph) fail(path, format string, args ...any) {
	g.errs = append(g.errs, &Error{Pos: g.pos(path), Path: path, Msg: fmt.Sprintf(format, args...)})
}

// orient walks the wiring breadth first from the bank, in name order, so
// that each run's Up end is the one reached first.
func (g *graph) orient() {
	g.kids = map[*checks.Run][]*checks.Run{}
	reached := map[string]*checks.Run{"bank": nil} // node → run it was reached by
	used := map[*checks.Run]bool{}
	queue := []string{"bank"}
	if len(g.adj["bank"]) == 0 {
		g.fail("wiring", "no conductor runs from \"bank\": every design's wiring starts at the bank")
		return
	}
	for len(queue) > 0 {
		u := queue[0]
		queue = queue[1:]
		for _, r := range g.adj[u] {
			if used[r] {
				continue
			}
			used[r] = true
			w := r.Spec.To
			if w == u {
				w = r.Spec.From
			}
			if by, seen := reached[w]; seen {
				other := "the bank"
				if by != nil {
					other = fmt.Sprintf("run %q", by.Name)
				}
				g.fail(r.Path, "the wiring forms a loop: this run joins %q and %q, and %q is already reached through %s; a DC distribution must be a tree from the bank", u, w, w, other)
				continue
			}
			r.Up, r.Down = u, w
			r.Parent = reached[u]
			if r.Parent != nil {
				g.kids[r.Parent] = append(g.kids[r.Parent], r)
			}
			reached[w] = r
			queue = append(queue, w)
		}
	}
	for _, r := range g.net.Runs {
		if !used[r] {
			g.fail(r.Path, "the run from %q to %q has no path to the bank", r.Spec.From, r.Spec.To)
		}
	}
	for _, kind := range []string{"array", "controller", "charger", "inverter"} {
		for _, n := range sortedKeys(g.kind) {
			if g.kind[n] == kind {
				if _, ok := reached[n]; !ok {
					g.fail(groupPath(kind, n), "%s %q is not wired: no conductor run reaches it from the bank", kind, n)
				}
			}
		}
	}
}

// attach hangs each load on its circuit and finds runs that lead nowhere.
func (g *graph) attach() {
	s := g.d.Spec
	g.feed = map[*checks.Run][]string{}
	byName := map[string]*checks.Run{}
	for _, r := range g.net.Runs {
		byName[r.Name] = r
	}
	for _, n := range schema.Names(s.Loads) {
		l := s.Loads[n]
		if l.Circuit == "" {
			continue // an AC load, fed by its inverter
		}
		r := byName[l.Circuit]
		g.feed[r] = append(g.feed[r], n)
	}
	for _, n := range schema.Names(s.Inverters) {
		if r := byName[s.Inverters[n].Circuit]; r != nil && r.Down != n {
			g.fail("inverters."+quoteLabel(n)+".circuit", "inverter %q names circuit %q, which runs from %q to %q, not to the inverter", n, r.Name, r.Up, r.Down)
		}
	}
	for _, r := range g.net.Runs {
		// A load ends the wiring: nothing is fed from it.
		if g.kind[r.Up] == "load" {
			g.fail(r.Path, "the run continues from load %q to %q: a load ends the wiring and feeds nothing; feed %q from a bus or the bank", r.Up, r.Down, r.Down)
			continue
		}
		// A run that ends at a load must be that load's circuit.
		if g.kind[r.Down] == "load" && s.Loads[r.Down].Circuit != r.Name && s.Loads[r.Down].Circuit != "" {
			g.fail(r.Path, "the run ends at load %q, whose circuit is %q", r.Down, s.Loads[r.Down].Circuit)
		}
		switch g.kind[r.Down] {
		case "load", "array", "controller", "charger", "inverter":
			continue
		}
		if len(g.kids[r]) == 0 && len(g.feed[r]) == 0 {
			g.fail(r.Path, "the run connects to nothing: nothing continues from %q and no load names it as its circuit", r.Down)
		}
	}
	for _, n := range schema.Names(s.Arrays) {
		a := s.Arrays[n]
		if !g.upstreamOf(n, a.Controller) {
			g.fail("arrays."+quoteLabel(n), "array %q is wired toward the bank without passing its controller %q", n, a.Controller)
		}
	}
}

// upstreamOf reports whether the path from node n to the bank passes node via.
func (g *graph) upstreamOf(n, via string) bool {
	for _, r := range g.net.Runs {
		if r.Down != n {
			continue
		}
		for x := r; x != nil; x = x.Parent {
			if x.Up == via || x.Down == via {
				return true
			}
		}
	}
	return false
}

// roles marks runs beyond a controller as PV and runs into a controller as
// charge runs.
func (g *graph) roles() {
	for _, r := range g.net.Runs {
		r.Role = checks.Supply
		for x := r; x != nil; x = x.Parent {
			if g.kind[x.Up] == "controller" {
				r.Role = checks.PV
				break
			}
		}
		if k := g.kind[r.Down]; r.Role == checks.Supply && (k == "controller" || k == "charger") {
			r.Role = checks.Charge
		}
	}
}

// subtree returns r and every run beyond it.
func (g *graph) subtree(r *checks.Run) []*checks.Run {
	out := []*checks.Run{r}
	for _, k := range g.kids[r] {
		out = append(out, g.subtree(k)...)
	}
	return out
}

// currents sets each run's design current: for ampacity the loads it
// feeds at full draw (duty applies to energy only), a source's maximum,
// and PV runs at the rulebook's factor × Isc of the strings they carry.
func (g *graph) currents() {
	s := g.d.Spec
	rules := g.d.Rules
	vsys := s.Vessel.SystemVolts()
	for _, r := range g.net.Runs {
		var loads, charge float64
		var terms []string
		nodes := map[string]bool{}
		var imp, vmp float64
		pwm := false
		for _, x := range g.subtree(r) {
			nodes[x.Down] = true
			for _, ln := range g.feed[x] {
				i := loadCurrent(s.Loads[ln], vsys)
				loads += i
				r.Loads = append(r.Loads, ln)
				terms = append(terms, fmt.Sprintf("%s %s", ln, amps(i)))
			}
		}
		for _, n := range sortedKeys(nodes) {
			switch g.kind[n] {
			case "inverter":
				p := s.Inverters[n].Part
				i := p.Continuous.Watts() / p.Efficiency / vsys
				loads += i
				terms = append(terms, fmt.Sprintf("inverter %s %s (%s ÷ %g ÷ %s)", n, amps(i), p.Continuous.Text, p.Efficiency, s.Vessel.System))
				for _, ln := range schema.Names(s.Loads) {
					if s.Loads[ln].Inverter == n {
						r.Loads = append(r.Loads, ln)
					}
				}
			case "controller":
				if r.Role != checks.PV {
					charge += s.Controllers[n].Part.Output.Amps()
				}
			case "charger":
				charge += s.Chargers[n].Output.Amps()
			case "array":
				a := s.Arrays[n]
				r.Strings += a.Strings
				r.Isc = a.Module.Isc.Amps()
				imp += a.Module.Imp.Amps() * float64(a.Strings)
				vmp = a.Module.Vmp.Volts() * float64(a.Series)
				if c, ok := s.Controllers[a.Controller]; ok && c.Part.Kind == "pwm" {
					pwm = true
				}
			}
		}
		sort.Strings(r.Loads)
		r.DropVoltage, r.VoltBasis = vsys, "nominal system voltage"
		if r.Role == checks.PV {
			r.DropCurrent = imp
			r.DropBasis = fmt.Sprintf("strings at maximum power: Imp × strings = %s", amps(imp))
			if !pwm {
				r.DropVoltage, r.VoltBasis = vmp, fmt.Sprintf("string Vmp %.4g V (MPPT)", vmp)
			} else {
				r.VoltBasis = "PWM holds the array at battery voltage"
			}
		}
		switch {
		case r.Role == checks.PV:
			f := rules.PV.ConductorFactor
			r.Current = f * r.Isc * float64(r.Strings)
			r.Basis = fmt.Sprintf("%g × Isc %s × %d string(s) (%s)", f, amps(r.Isc), r.Strings, rules.PV.Source)
		case charge > loads:
			r.Current = charge
			r.Basis = fmt.Sprintf("charge sources' rated output %s", amps(charge))
		default:
			r.Current = loads
			if len(terms) == 0 {
				r.Basis = "no load downstream"
			} else {
				r.Basis = "loads at full draw: " + strings.Join(terms, " + ")
			}
		}
		if r.Role != checks.PV {
			r.DropCurrent, r.DropBasis = r.Current, r.Basis
		}
	}
}

// loadCurrent is a load's full draw: its current, or its power at the
// nominal system voltage, times the number fitted.
func loadCurrent(l schema.Load, vsys float64) float64 {
	q := float64(max(l.Quantity, 1))
	switch {
	case l.Current != nil:
		return l.Current.Amps() * q
	case l.Power != nil:
		return l.Power.Watts() / vsys * q
	}
	return 0
}

// classes sets each run's voltage-drop class.
func (g *graph) classes() {
	s := g.d.Spec
	vd := g.d.Rules.VoltageDrop
	critical := map[string]bool{}
	for _, k := range vd.CriticalKinds {
		critical[k] = true
	}
	for _, r := range g.net.Runs {
		switch {
		case r.Spec.Class != "":
			r.Class, r.ClassBasis = r.Spec.Class, "given in the design"
			continue
		case r.Role != checks.Supply:
			r.Class, r.ClassBasis = vd.Charging, "solar and charge runs (rulebook)"
			continue
		case g.kind[r.Down] == "bus" && s.Buses[r.Down].Kind == "panel":
			r.Class, r.ClassBasis = "critical", fmt.Sprintf("panelboard feeder to %q", r.Down)
			continue
		}
		r.Class, r.ClassBasis = "other", "no critical load downstream"
		for _, ln := range r.Loads {
			l := s.Loads[ln]
			if l.Class == "critical" || (l.Class == "" && critical[l.Kind]) {
				r.Class, r.ClassBasis = "critical", fmt.Sprintf("feeds %s (%s)", ln, l.Kind)
				break
			}
		}
	}
}

func groupPath(kind, name string) string {
	return kind + "s." + quoteLabel(name)
}

func sortedKeys[V any](m map[string]V) []string { return schema.Names(m) }

func amps(i float64) string { return fmt.Sprintf("%.4g A", i) }
