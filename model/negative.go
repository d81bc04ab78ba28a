package model

import (
	"fmt"
	"sort"
	"strings"

	"github.com/ampwright/ampwright/schema"
)

// negative builds the return side. Without a negative side in the design,
// every run returns on a conductor of its own size and length straight to
// its source, as the voltage-drop check has always taken it. With one, the
// negative conductors form a tree (or a forest) joining the banks'
// negative posts, negative buses and shunts; each positive run's return
// lands on a negative node, or, for a run that feeds a bus paired with a
// negative bus, travels on that negative bus's conductor; and each
// negative conductor carries the returns whose path to their bank's post
// passes it.
func (b *builder) negative() {
	s, d := b.s, b.s.Design
	for _, r := range s.Runs {
		r.Ret = ReturnPath{Own: true, Mirror: true, Size: r.Spec.Size, Length: r.Spec.Length.Metres(), LengthText: r.Spec.Length.Text}
		if rt := r.Spec.Return; rt != nil {
			if rt.Size != nil {
				r.Ret.Size, r.Ret.Mirror = *rt.Size, false
			}
			if rt.Length != nil {
				r.Ret.Length, r.Ret.LengthText, r.Ret.Mirror = rt.Length.Metres(), rt.Length.Text, false
			}
			if rt.To != "" && d.Negative == nil {
				b.fail(r.Path+".return.to", "the return lands on %q, but the design draws no negative side: declare it in negative", rt.To)
			}
		}
	}
	if d.Negative == nil {
		for _, bus := range s.Buses {
			if bus.Spec.Negative != "" {
				b.fail(bus.Path+".negative", "bus %q returns to %q, but the design draws no negative side: declare it in negative", bus.Name, bus.Spec.Negative)
			}
		}
		return
	}
	neg := d.Negative
	nodes := s.Negatives
	for _, bk := range s.Banks {
		bk.Negative = &Node{Name: bk.Name, Kind: KindBank, Path: bk.Path, Bank: bk, Volts: bk.Volts}
		nodes[bk.Name] = bk.Negative
	}
	for _, n := range schema.Names(neg.Buses) {
		spec := neg.Buses[n]
		p := "negative.buses." + Label(n)
		nb := &NegativeBus{Name: n, Path: p, Spec: &spec, Node: &Node{Name: n, Kind: KindNegativeBus, Path: p}}
		s.NegativeBuses = append(s.NegativeBuses, nb)
		b.negNode(nb.Node)
	}
	for _, n := range schema.Names(neg.Shunts) {
		spec := neg.Shunts[n]
		p := "negative.shunts." + Label(n)
		sh := &Shunt{Name: n, Path: p, Spec: &spec, Node: &Node{Name: n, Kind: KindShunt, Path: p}}
		s.Shunts = append(s.Shunts, sh)
		b.negNode(sh.Node)
	}
	adj := map[string][]*Run{}
	for _, name := range schema.Names(neg.Wiring) {
		c := neg.Wiring[name]
		r := &Run{Name: name, Path: "negative.wiring." + Label(name), Spec: &c, Role: Return}
		if s.Run(name) != nil {
			b.fail(r.Path, "run %q is in both wiring and negative.wiring: give each conductor its own name", name)
		}
		if c.Protection != nil {
			b.fail(r.Path+".protection", "a negative conductor carries no fuse or breaker: protect the positive conductor")
		}
		if c.Return != nil {
			b.fail(r.Path+".return", "a negative conductor is itself a return: give no return for it")
		}
		ok := true
		for _, end := range []string{c.From, c.To} {
			if nodes[end] == nil {
				b.fail(r.Path, "the negative conductor ends at %q, which is not a bank, a negative bus or a shunt", end)
				ok = false
			}
		}
		s.Returns = append(s.Returns, r)
		if ok {
			adj[c.From] = append(adj[c.From], r)
			adj[c.To] = append(adj[c.To], r)
		}
	}
	for _, bus := range s.Buses {
		if n := bus.Spec.Negative; n != "" {
			if nodes[n] == nil || nodes[n].Kind != KindNegativeBus {
				b.fail(bus.Path+".negative", "bus %q returns to %q, which is not a negative bus in negative.buses", bus.Name, n)
				continue
			}
			bus.Negative = nodes[n]
		}
	}
	if len(b.issues) > 0 {
		return
	}
	b.orientNegative(adj)
	if len(b.issues) > 0 {
		return
	}
	b.landReturns()
	if len(b.issues) > 0 {
		return
	}
	b.returnCurrents()
}

// negNode declares a negative node; a name used twice is an issue.
func (b *builder) negNode(n *Node) {
	if other, dup := b.s.Negatives[n.Name]; dup {
		b.fail(n.Path, "duplicate name %q on the negative side: %s already has it", n.Name, other.Path)
		return
	}
	if pos, dup := b.s.Nodes[n.Name]; dup && pos.Kind != KindBank {
		b.fail(n.Path, "duplicate name %q: %s already has it on the positive side", n.Name, pos.Path)
		return
	}
	b.s.Negatives[n.Name] = n
}

// orientNegative walks the negative conductors from the banks' posts, so
// that each conductor's Up end is the one nearer a post. The negative side
// must be a forest: the banks' posts may share negative buses (a common
// negative), but no loop.
func (b *builder) orientNegative(adj map[string][]*Run) {
	s := b.s
	used := map[*Run]bool{}
	reached := map[*Node]bool{}
	for _, bk := range s.Banks {
		if reached[bk.Negative] {
			continue
		}
		reached[bk.Negative] = true
		queue := []*Node{bk.Negative}
		for len(queue) > 0 {
			u := queue[0]
			queue = queue[1:]
			for _, r := range adj[u.Name] {
				if used[r] {
					continue
				}
				used[r] = true
				wn := r.otherEnd(u.Name)
				w := s.Negatives[wn]
				if reached[w] {
					b.fail(r.Path, "the negative side forms a loop: this conductor joins %q and %q, and %q is already reached from a bank's negative post", u.Name, wn, wn)
					continue
				}
				reached[w] = true
				r.Up, r.Down, r.UpNode, r.DownNode = u.Name, wn, u, w
				r.Parent = u.In
				if r.Parent != nil {
					r.Parent.Children = append(r.Parent.Children, r)
				}
				u.Out = append(u.Out, r)
				w.In = r
				r.Volts = u.Volts
				if w.Kind != KindBank {
					w.Volts = u.Volts
				}
				queue = append(queue, w)
			}
		}
	}
	for _, r := range s.Returns {
		if !used[r] {
			b.fail(r.Path, "the negative conductor from %q to %q reaches no bank's negative post", r.Spec.From, r.Spec.To)
		}
	}
	for _, n := range sortedNodes(s.Negatives) {
		if !reached[n] {
			b.fail(n.Path, "%s %q is not wired: no negative conductor joins it to a bank's negative post", strings.ReplaceAll(string(n.Kind), "-", " "), n.Name)
		}
	}
}

// landReturns finds where each positive run's return goes.
func (b *builder) landReturns() {
	s := b.s
	buses := map[*Node]*Bus{}
	for _, bus := range s.Buses {
		buses[bus.Node] = bus
	}
	for _, r := range s.Runs {
		if r.Role == PV {
			continue // the strings return to their controller, apart from the bank's negative
		}
		if bus := buses[r.DownNode]; bus != nil && bus.Negative != nil {
			r.Ret = ReturnPath{Via: bus.Negative.In}
			if r.Spec.Return != nil {
				b.fail(r.Path+".return", "the run feeds bus %q, whose circuits return to negative bus %q: its return is that bus's negative conductor, so give no return here", r.Down, bus.Negative.Name)
			}
			continue
		}
		if rt := r.Spec.Return; rt != nil && rt.To != "" {
			n := s.Negatives[rt.To]
			if n == nil {
				b.fail(r.Path+".return.to", "the return lands on %q, which is not a bank, a negative bus or a shunt", rt.To)
				continue
			}
			r.Ret.Lands = n
			continue
		}
		switch up := r.UpNode; {
		case up.Kind == KindBank:
			r.Ret.Lands = up.Bank.Negative
		case buses[up] != nil && buses[up].Negative != nil:
			r.Ret.Lands = buses[up].Negative
		default:
			// From a bus with no negative bus of its own, or a converter:
			// the return runs back beside the run that feeds it and joins
			// that run's return.
			r.Ret.Joins = up.In
		}
	}
	// A run to a bus with no negative bus of its own has a return beside
	// it only for the returns that join it there; when every run beyond
	// returns some other way (a battery switch ahead of a panel with its
	// own negative bus), nothing returns beside it, and it has no return
	// conductor.
	joined := map[*Run]bool{}
	for _, r := range s.Runs {
		if r.Ret.Joins != nil {
			joined[r.Ret.Joins] = true
		}
	}
	for _, r := range s.Runs {
		if r.Role != PV && r.DownNode.Kind == KindBus && r.Ret.Own && r.Ret.Via == nil && !joined[r] && len(r.Children) > 0 {
			if r.Spec.Return != nil {
				b.fail(r.Path+".return", "nothing returns beside the run: the runs beyond %q return to negative buses of their own, so give no return here", r.Down)
				continue
			}
			r.Ret = ReturnPath{}
		}
	}
}

// returnCurrents sets each negative conductor's design current: the
// returns whose path to their own bank's negative post passes it. Loads'
// returns and charge sources' returns flow in opposite directions and are
// not at their largest together, so the conductor is sized for the larger
// of the two sums.
func (b *builder) returnCurrents() {
	s := b.s
	type sum struct {
		i     float64
		terms []string
	}
	supply := map[*Run]*sum{}
	charge := map[*Run]*sum{}
	add := func(m map[*Run]*sum, n *Run, r *Run) {
		if m[n] == nil {
			m[n] = &sum{}
		}
		m[n].i += r.Current
		m[n].terms = append(m[n].terms, fmt.Sprintf("%s %s", r.Name, amps(r.Current)))
	}
	for _, r := range s.Runs {
		if !r.Ret.Own || r.Ret.Lands == nil {
			continue
		}
		m := supply
		if r.Role == Charge {
			m = charge
		}
		for _, n := range pathBetween(r.Ret.Lands, s.returnTarget(r)) {
			add(m, n, r)
		}
	}
	for _, n := range s.Returns {
		sp, ch := supply[n], charge[n]
		switch {
		case ch != nil && (sp == nil || ch.i > sp.i):
			n.Current, n.Basis = ch.i, "charge sources' returns: "+strings.Join(ch.terms, " + ")
		case sp != nil:
			n.Current, n.Basis = sp.i, "returns at full draw: "+strings.Join(sp.terms, " + ")
		default:
			n.Basis = "no return passes it"
		}
		n.Class, n.ClassBasis = "other", "negative conductor"
	}
	sort.SliceStable(s.Returns, func(i, j int) bool { return s.Returns[i].Name < s.Returns[j].Name })
}

// returnTarget is where run r's return current goes back to its source:
// its bank's negative post, or, beyond a converter, where the converter's
// own return lands (a converter's output current returns to the converter,
// and only its input current to the bank).
func (s *System) returnTarget(r *Run) *Node {
	for n := r.UpNode; n != nil && n.In != nil; n = n.In.UpNode {
		if n.Kind == KindConverter {
			if t, ok := s.Landing(n.In); ok {
				return t
			}
			break
		}
	}
	return r.Bank.Negative
}

// pathBetween is the negative conductors from node a to node b: up the
// tree from a to the common ancestor of the two, then down to b.
func pathBetween(a, b *Node) []*Run {
	up := func(x *Node) []*Run {
		var out []*Run
		for ; x != nil && x.In != nil; x = x.In.UpNode {
			out = append(out, x.In)
		}
		return out
	}
	pa, pb := up(a), up(b)
	// Drop the conductors the two paths share, from the root down.
	for len(pa) > 0 && len(pb) > 0 && pa[len(pa)-1] == pb[len(pb)-1] {
		pa, pb = pa[:len(pa)-1], pb[:len(pb)-1]
	}
	return append(pa, pb...)
}

// ShuntCurrent is the current through shunt sh: the current of the
// conductors on its bank side, the larger where it sits between two.
func (s *System) ShuntCurrent(sh *Shunt) float64 {
	var i float64
	if sh.Node.In != nil {
		i = sh.Node.In.Current
	}
	for _, r := range sh.Node.Out {
		i = max(i, r.Current)
	}
	return i
}

// Landing is where the return of run r reaches the negative tree, and
// false where the design draws no negative side: its own landing, or that
// of the run whose return it joins, or the negative bus its return
// travels to.
func (s *System) Landing(r *Run) (*Node, bool) {
	for x := r; x != nil; x = x.Ret.Joins {
		switch {
		case x.Ret.Lands != nil:
			return x.Ret.Lands, true
		case x.Ret.Via != nil:
			return x.Ret.Via.DownNode, true
		}
	}
	return nil, false
}

// PassesShunt reports whether the return of run r passes shunt sh on its
// way to its bank's negative post.
func (s *System) PassesShunt(r *Run, sh *Shunt) bool {
	lands, ok := s.Landing(r)
	if !ok {
		return false
	}
	if lands == sh.Node {
		return true
	}
	for _, n := range pathBetween(lands, s.returnTarget(r)) {
		if n.UpNode == sh.Node || n.DownNode == sh.Node {
			return true
		}
	}
	return false
}
