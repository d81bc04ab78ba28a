package model

import (
	"fmt"
	"sort"
	"strings"

	"github.com/ampwright/ampwright/schema"
)

// Build makes the model of design d under the rulebook in force. The
// phases, in order: declare every node; orient the positive wiring as a
// tree from each bank; hang the loads on their circuits; give each run its
// role, then the sources, the design currents and the voltage-drop
// classes; then the negative side and every run's return. A loop, a run
// or part no bank reaches, a run that leads nowhere and a link wired to
// the wrong bank are Issues; with issues the System is nil.
func Build(d *schema.Design, rules schema.Rulebook) (*System, []Issue) {
	b := &builder{s: &System{
		Design: d, Rules: rules, Volts: d.Vessel.SystemVolts(),
		Nodes: map[string]*Node{}, Negatives: map[string]*Node{},
	}, adj: map[string][]*Run{}}
	b.declare()
	if len(b.issues) == 0 {
		b.orient()
	}
	if len(b.issues) == 0 {
		b.attach()
	}
	if len(b.issues) > 0 {
		return nil, b.sorted()
	}
	b.roles()
	b.sources()
	b.currents()
	b.classes()
	b.negative()
	if len(b.issues) > 0 {
		return nil, b.sorted()
	}
	return b.s, nil
}

type builder struct {
	s      *System
	adj    map[string][]*Run // positive node name → runs ending there, by run name
	feed   map[*Run][]*Load  // run → loads whose circuit it is
	issues []Issue
}

func (b *builder) fail(path, format string, args ...any) {
	b.issues = append(b.issues, Issue{Path: path, Msg: fmt.Sprintf(format, args...)})
}

func (b *builder) sorted() []Issue {
	sort.SliceStable(b.issues, func(i, j int) bool { return b.issues[i].Path < b.issues[j].Path })
	return b.issues
}

func groupPath(group, name string) string { return group + "." + Label(name) }

// node declares a positive node; a name used twice is the validator's to
// report, so the first declaration stands.
func (b *builder) node(name string, kind Kind, path string) *Node {
	if n, ok := b.s.Nodes[name]; ok {
		return n
	}
	n := &Node{Name: name, Kind: kind, Path: path}
	b.s.Nodes[name] = n
	return n
}

// declare makes a node for every bank, bus and part a run can end at, and
// a run for every conductor.
func (b *builder) declare() {
	s, d := b.s, b.s.Design
	addBank := func(name, path string, spec *schema.Bank) {
		bk := &Bank{Name: name, Path: path, Spec: spec, Role: spec.Role, Volts: s.Volts, System: d.Vessel.System}
		if bk.Role == "" {
			bk.Role = "house"
		}
		if spec.System != "" {
			bk.Volts, bk.System = schema.Volts(spec.System), spec.System
		}
		bk.Node = b.node(name, KindBank, path)
		bk.Node.Bank, bk.Node.Volts = bk, bk.Volts
		s.Banks = append(s.Banks, bk)
	}
	if d.Bank != nil {
		addBank("bank", "bank", d.Bank)
	}
	for _, n := range schema.Names(d.Banks) {
		spec := d.Banks[n]
		addBank(n, groupPath("banks", n), &spec)
	}
	if len(s.Banks) == 0 {
		b.fail("bank", "the design has no bank: give bank, or banks for a boat with several")
		return
	}
	for _, n := range schema.Names(d.Buses) {
		spec := d.Buses[n]
		p := groupPath("buses", n)
		s.Buses = append(s.Buses, &Bus{Name: n, Path: p, Spec: &spec, Node: b.node(n, KindBus, p)})
	}
	for _, n := range schema.Names(d.Controllers) {
		spec := d.Controllers[n]
		p := groupPath("controllers", n)
		s.Controllers = append(s.Controllers, &Controller{Name: n, Path: p, Spec: &spec, Node: b.node(n, KindController, p)})
	}
	for _, n := range schema.Names(d.Arrays) {
		spec := d.Arrays[n]
		p := groupPath("arrays", n)
		a := &Array{Name: n, Path: p, Spec: &spec, Node: b.node(n, KindArray, p)}
		if c := s.Controller(spec.Controller); c != nil {
			a.Controller = c
			c.Arrays = append(c.Arrays, a)
		}
		s.Arrays = append(s.Arrays, a)
	}
	for _, n := range schema.Names(d.Inverters) {
		spec := d.Inverters[n]
		p := groupPath("inverters", n)
		s.Inverters = append(s.Inverters, &Inverter{Name: n, Path: p, Spec: &spec, Node: b.node(n, KindInverter, p)})
	}
	for _, n := range schema.Names(d.Chargers) {
		b.node(n, KindCharger, groupPath("chargers", n))
	}
	for _, n := range schema.Names(d.Links) {
		spec := d.Links[n]
		p := groupPath("links", n)
		l := &Link{Name: n, Path: p, Spec: &spec, Node: b.node(n, KindLink, p), From: s.Bank(spec.From), To: s.Bank(spec.To)}
		switch {
		case l.From == nil:
			b.fail(p+".from", "link %q draws from %q, which is not a bank", n, spec.From)
		case l.To == nil:
			b.fail(p+".to", "link %q charges %q, which is not a bank", n, spec.To)
		case l.From == l.To:
			b.fail(p+".to", "link %q joins bank %q to itself", n, spec.From)
		case spec.Open():
			b.fail(p, "link %q has no part: give one from the catalog, or let `ampwright propose` choose one", n)
		case spec.Kind != "" && spec.Part.Kind != spec.Kind:
			b.fail(p+".part", "link %q is to be a %s, but its part %s is a %s", n, spec.Kind, spec.Part.ID, spec.Part.Kind)
		}
		s.Links = append(s.Links, l)
	}
	for _, n := range schema.Names(d.Converters) {
		spec := d.Converters[n]
		p := groupPath("converters", n)
		s.Converters = append(s.Converters, &Converter{Name: n, Path: p, Spec: &spec, Node: b.node(n, KindConverter, p), Out: schema.Volts(spec.Part.Output)})
	}
	for _, n := range schema.Names(d.Loads) {
		spec := d.Loads[n]
		p := groupPath("loads", n)
		s.Loads = append(s.Loads, &Load{Name: n, Path: p, Spec: &spec})
		b.node(n, KindLoad, p)
	}
	for _, name := range schema.Names(d.Wiring) {
		c := d.Wiring[name]
		r := &Run{Name: name, Path: groupPath("wiring", name), Spec: &c}
		s.Runs = append(s.Runs, r)
		b.adj[c.From] = append(b.adj[c.From], r)
		b.adj[c.To] = append(b.adj[c.To], r)
	}
	for _, r := range s.Runs {
		for _, end := range []string{r.Spec.From, r.Spec.To} {
			if s.Nodes[end] == nil {
				b.fail(r.Path, "the run ends at %q, which is not a bank, bus, array, controller, charger, inverter, link, converter or load", end)
			}
		}
	}
}

// outVolts is the nominal voltage of the runs leaving a node: a
// converter's output, else its side's.
func (b *builder) outVolts(n *Node) float64 {
	if n.Kind == KindConverter {
		for _, c := range b.s.Converters {
			if c.Node == n {
				return c.Out
			}
		}
	}
	return n.Volts
}

// orient walks the wiring breadth first from each bank in name order, and
// from each node in run-name order, so that each run's Up end is the one
// reached first. A link is reached from both its banks and continues to
// neither.
func (b *builder) orient() {
	s := b.s
	used := map[*Run]bool{}
	reached := map[*Node]bool{}
	links := map[*Node]*Link{}
	for _, l := range s.Links {
		links[l.Node] = l
	}
	for _, bk := range s.Banks {
		reached[bk.Node] = true
	}
	for _, bk := range s.Banks {
		if len(b.adj[bk.Name]) == 0 {
			if bk.Path == "bank" {
				b.fail("wiring", "no conductor runs from \"bank\": every design's wiring starts at the bank")
			} else {
				b.fail(bk.Path, "no conductor runs from bank %q: wire it to what it feeds or to a link", bk.Name)
			}
			continue
		}
		queue := []*Node{bk.Node}
		for len(queue) > 0 {
			u := queue[0]
			queue = queue[1:]
			for _, r := range b.adj[u.Name] {
				if used[r] {
					continue
				}
				used[r] = true
				wn := r.otherEnd(u.Name)
				w := s.Nodes[wn]
				r.Up, r.Down, r.UpNode, r.DownNode = u.Name, wn, u, w
				r.Bank, r.Volts = bk, b.outVolts(u)
				r.Parent = u.In
				if r.Parent != nil {
					r.Parent.Children = append(r.Parent.Children, r)
				}
				u.Out = append(u.Out, r)
				if l := links[w]; l != nil {
					b.reachLink(l, r, bk)
					continue
				}
				if w.Kind == KindBank && w != bk.Node {
					b.fail(r.Path, "the run joins bank %q's side to bank %q: banks are joined only through a link (a combiner, an isolator or a DC-DC charger) declared in links", bk.Name, wn)
					continue
				}
				if reached[w] {
					other := "the bank"
					if w.In != nil {
						other = fmt.Sprintf("run %q", w.In.Name)
					}
					b.fail(r.Path, "the wiring forms a loop: this run joins %q and %q, and %q is already reached through %s; a DC distribution must be a tree from the bank", u.Name, wn, wn, other)
					continue
				}
				reached[w] = true
				w.In, w.Bank, w.Volts = r, bk, r.Volts
				queue = append(queue, w)
			}
		}
	}
	for _, r := range s.Runs {
		if !used[r] {
			b.fail(r.Path, "the run from %q to %q has no path to the bank", r.Spec.From, r.Spec.To)
		}
	}
	for _, kind := range []Kind{KindArray, KindController, KindCharger, KindInverter, KindConverter} {
		for _, n := range sortedNodes(s.Nodes) {
			if n.Kind == kind && !reached[n] {
				b.fail(n.Path, "%s %q is not wired: no conductor run reaches it from the bank", kind, n.Name)
			}
		}
	}
	for _, l := range s.Links {
		if l.From == nil || l.To == nil {
			continue
		}
		for _, side := range []struct {
			run  *Run
			bank *Bank
		}{{l.FromRun, l.From}, {l.ToRun, l.To}} {
			if side.run == nil {
				b.fail(l.Path, "link %q is not wired to bank %q's side: a link is reached by a run from each of its two banks", l.Name, side.bank.Name)
			}
		}
	}
}

// reachLink records the run that reaches link l from bank bk's side.
func (b *builder) reachLink(l *Link, r *Run, bk *Bank) {
	switch {
	case bk == l.From && l.FromRun == nil:
		l.FromRun = r
	case bk == l.To && l.ToRun == nil:
		l.ToRun = r
	case bk == l.From || bk == l.To:
		b.fail(r.Path, "link %q is reached twice from bank %q's side", l.Name, bk.Name)
	default:
		b.fail(r.Path, "link %q joins banks %q and %q, but this run reaches it from bank %q's side", l.Name, l.Spec.From, l.Spec.To, bk.Name)
	}
}

func sortedNodes(m map[string]*Node) []*Node {
	out := make([]*Node, 0, len(m))
	for _, k := range schema.Names(m) {
		out = append(out, m[k])
	}
	return out
}

// attach hangs each load on its circuit and finds runs that lead nowhere.
func (b *builder) attach() {
	s := b.s
	b.feed = map[*Run][]*Load{}
	inverters := map[string]*Inverter{}
	for _, inv := range s.Inverters {
		inverters[inv.Name] = inv
	}
	for _, l := range s.Loads {
		if l.Spec.Circuit == "" {
			if inv := inverters[l.Spec.Inverter]; inv != nil {
				l.Inverter = inv
				inv.Loads = append(inv.Loads, l)
				l.Bank, l.Volts = inv.Node.Bank, inv.Node.Volts
			}
			continue
		}
		r := s.Run(l.Spec.Circuit)
		if r == nil {
			continue // the validator reports an unknown circuit
		}
		l.Circuit, l.Bank, l.Volts = r, r.Bank, r.Volts
		l.Current = loadCurrent(*l.Spec, r.Volts)
		b.feed[r] = append(b.feed[r], l)
	}
	for _, inv := range s.Inverters {
		if r := s.Run(inv.Spec.Circuit); r != nil && r.Down != inv.Name {
			b.fail(inv.Path+".circuit", "inverter %q names circuit %q, which runs from %q to %q, not to the inverter", inv.Name, r.Name, r.Up, r.Down)
		}
	}
	for _, r := range s.Runs {
		if r.UpNode.Kind == KindLoad {
			b.fail(r.Path, "the run continues from load %q to %q: a load ends the wiring and feeds nothing; feed %q from a bus or a bank", r.Up, r.Down, r.Down)
			continue
		}
		// A run that ends at a load must be that load's circuit.
		if r.DownNode.Kind == KindLoad {
			if l := s.Load(r.Down); l.Spec.Circuit != r.Name && l.Spec.Circuit != "" {
				b.fail(r.Path, "the run ends at load %q, whose circuit is %q", r.Down, l.Spec.Circuit)
			}
		}
		switch r.DownNode.Kind {
		case KindLoad, KindArray, KindController, KindCharger, KindInverter, KindLink:
			continue
		case KindConverter:
			if len(r.DownNode.Out) == 0 {
				b.fail(r.DownNode.Path, "converter %q feeds nothing: no run continues from it", r.Down)
			}
			continue
		}
		if len(r.Children) == 0 && len(b.feed[r]) == 0 {
			b.fail(r.Path, "the run connects to nothing: nothing continues from %q and no load names it as its circuit", r.Down)
		}
	}
	for _, a := range s.Arrays {
		if !b.upstreamOf(a.Name, a.Spec.Controller) {
			b.fail(a.Path, "array %q is wired toward the bank without passing its controller %q", a.Name, a.Spec.Controller)
		}
	}
	for _, bk := range s.Banks {
		for _, l := range s.Loads {
			if l.Bank == bk {
				bk.Loads = append(bk.Loads, l)
			}
		}
	}
	for _, c := range s.Converters {
		for _, l := range s.Loads {
			for x := l.Circuit; x != nil; x = x.Parent {
				if x.UpNode == c.Node {
					c.Loads = append(c.Loads, l)
					break
				}
			}
		}
		c.In = c.Node.Volts
	}
}

// upstreamOf reports whether the path from node n to its bank passes node
// via.
func (b *builder) upstreamOf(n, via string) bool {
	for _, r := range b.s.Runs {
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

// roles marks runs beyond a controller as PV, runs into a charge source or
// that carry charge to a bank through a link as charge runs, and the rest
// as supply runs.
func (b *builder) roles() {
	links := b.linksByNode()
	for _, r := range b.s.Runs {
		r.Role = Supply
		for x := r; x != nil; x = x.Parent {
			if x.UpNode.Kind == KindController {
				r.Role = PV
				break
			}
		}
		if r.Role != Supply {
			continue
		}
		switch r.DownNode.Kind {
		case KindController, KindCharger:
			r.Role = Charge
		case KindLink:
			// A DC-DC charger draws from its input side; every other side
			// of a link carries charge.
			if l := links[r.DownNode]; l.Spec.Part.Kind != "dc-dc" || r != l.FromRun {
				r.Role = Charge
			}
		}
	}
}

func (b *builder) linksByNode() map[*Node]*Link {
	m := map[*Node]*Link{}
	for _, l := range b.s.Links {
		m[l.Node] = l
	}
	return m
}

// sources lists every charge source with the bank it charges and the
// current it delivers.
func (b *builder) sources() {
	s := b.s
	for _, c := range s.Controllers {
		s.Sources = append(s.Sources, &Source{
			Name: c.Name, Path: c.Path, Kind: Solar, Node: c.Node, Bank: c.Node.Bank, Controller: c,
			Output: c.Spec.Part.Output.Amps(), OutputBasis: fmt.Sprintf("rated output %s (%s)", c.Spec.Part.Output.Text, c.Spec.Part.ID),
			CurrentLimited: true,
		})
	}
	for _, n := range schema.Names(s.Design.Chargers) {
		ch := s.Design.Chargers[n]
		node := s.Nodes[n]
		src := &Source{Name: n, Path: node.Path, Kind: SourceKind(ch.Kind), Node: node, Bank: node.Bank, Charger: &ch}
		src.Output, src.OutputBasis = chargerOutput(ch, s.Rules)
		src.CurrentLimited = ch.Kind != "alternator" || (ch.Part != nil && ch.Part.CurrentLimited)
		s.Sources = append(s.Sources, src)
	}
	for _, inv := range s.Inverters {
		if c := inv.Spec.Part.Charger; c != nil {
			s.Sources = append(s.Sources, &Source{
				Name: inv.Name, Path: inv.Path, Kind: InverterCharger, Node: inv.Node, Bank: inv.Node.Bank, Inverter: inv,
				Output: c.Amps(), OutputBasis: fmt.Sprintf("charger output %s (%s)", c.Text, inv.Spec.Part.ID), CurrentLimited: true,
			})
		}
	}
	sort.SliceStable(s.Sources, func(i, j int) bool { return s.Sources[i].Name < s.Sources[j].Name })
	for _, bk := range s.Banks {
		for _, src := range s.Sources {
			if src.Bank == bk {
				bk.Sources = append(bk.Sources, src)
			}
		}
	}
}

// chargerOutput is the current a charger delivers: the design's output,
// else its part's (an alternator's rated output × its hot factor, the
// part's or the rulebook's).
func chargerOutput(ch schema.Charger, rules schema.Rulebook) (float64, string) {
	switch {
	case ch.Output != nil:
		return ch.Output.Amps(), "output " + ch.Output.Text
	case ch.Part == nil:
		return 0, "no output given"
	case ch.Part.Kind == "alternator":
		f, from := 1.0, ""
		switch {
		case ch.Part.HotFactor != nil:
			f, from = *ch.Part.HotFactor, "catalog data for "+ch.Part.ID
		case rules.Sources != nil:
			f, from = rules.Sources.AlternatorHotFactor, rules.Sources.Source
		}
		return ch.Part.Output.Amps() * f, fmt.Sprintf("rated %s × hot factor %g (%s)", ch.Part.Output.Text, f, from)
	}
	return ch.Part.Output.Amps(), fmt.Sprintf("rated output %s (%s)", ch.Part.Output.Text, ch.Part.ID)
}

// LinkCurrent is the current a link passes at most: a DC-DC charger its
// rated output; a combiner the larger of what the sources of either bank
// deliver, an isolator what its input bank's sources deliver, not above
// their sum.
func (s *System) LinkCurrent(l *Link) (float64, string) {
	p := l.Spec.Part
	if p.Kind == "dc-dc" {
		return p.Rating.Amps(), "rated output " + p.Rating.Text
	}
	sum := func(bk *Bank) (float64, []string) {
		var i float64
		var terms []string
		for _, src := range bk.Sources {
			i += src.Output
			terms = append(terms, fmt.Sprintf("%s %s", src.Name, amps(src.Output)))
		}
		return i, terms
	}
	from, ft := sum(l.From)
	if p.Kind == "isolator" {
		return from, fmt.Sprintf("sources charging %q: %s", l.From.Name, joinOr(ft))
	}
	to, tt := sum(l.To)
	if to > from {
		return to, fmt.Sprintf("sources charging %q: %s", l.To.Name, joinOr(tt))
	}
	return from, fmt.Sprintf("sources charging %q: %s", l.From.Name, joinOr(ft))
}

func joinOr(terms []string) string {
	if len(terms) == 0 {
		return "none"
	}
	return strings.Join(terms, " + ")
}

// loadCurrent is a load's full draw: its current, or its power at the
// nominal voltage of its side, times the number fitted.
func loadCurrent(l schema.Load, volts float64) float64 {
	q := float64(max(l.Quantity, 1))
	switch {
	case l.Current != nil:
		return l.Current.Amps() * q
	case l.Power != nil && volts > 0:
		return l.Power.Watts() / volts * q
	}
	return 0
}

func amps(i float64) string { return fmt.Sprintf("%.4g A", i) }
