package propose

import (
	"container/heap"
	"math"
	"runtime"
	"sync"
	"time"

	"github.com/ampwright/ampwright/checks"
	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/energy"
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// problem is one hull's search: its choices, what is fixed, what the
// search has learnt, and the cheapest passing design so far.
type problem struct {
	base  *schema.Design
	rules schema.Rulebook
	cat   *schema.Catalog
	sys0  *model.System // the designer's
	dims  []*dim
	// fixed is the price of the parts no choice changes (inverters,
	// chargers, converters, shunts, arrays without a place): with the
	// chosen parts' prices it bounds a combination's cost from below.
	fixed float64
	// floor is the least any completion costs (completer.floor), and
	// busFloor the least its bus parts do.
	floor, busFloor float64
	// direct are the protected runs straight from each bank, and
	// faultAgrees whether the fault current increment computes agreed with
	// the Interrupting check's on the designer's design (option.inc).
	direct      map[string][]string
	faultAgrees bool
	comp        *completer
	facts       *factBook
	now         func() time.Time
	until       time.Time

	best    *evaluation // the cheapest passing design so far
	closest *evaluation // the evaluated design with the fewest failures
	// blocking are failures no choice can mend.
	blocking []result.Finding
	cut      string

	considered, evaluated int
	// weak is true when the search bounds a combination's completion by
	// its floor alone (for tests of the stronger bounds).
	weak bool
}

// evaluation is one combination, completed and checked.
type evaluation struct {
	combo []int
	spec  *schema.Design
	sys   *model.System
	an    *energy.Analysis
	// findings are every check's, when the design was checked whole;
	// fails the failing ones of the checks it was put to.
	findings []result.Finding
	fails    []result.Finding
	bom      *result.BOM
	cost     float64
	passes   bool
	designer bool // the designer's own design, as written
	// dearer is true when the completed design was left unchecked: it
	// costs no less than the best found; checked when it was put to the
	// checks at all.
	dearer, checked bool
}

// screenChecks are the checks of the choices themselves, that the search
// decides a combination on before completing it: all but the wiring's,
// the devices' and the buses', which the completion answers.
var screenChecks = []*checks.Check{
	checks.BankVoltage, checks.EquipmentSystem, checks.StringFuse, checks.ChargeRate,
	checks.ColdCharge, checks.ColdVoc, checks.HotVmp, checks.InputCurrent,
	checks.InverterContinuous, checks.InverterSurge, checks.BankDischarge, checks.BankPeak,
	checks.ChargePath, checks.LinkCurrent,
}

// energyChecks need the energy analyses; they run last, on a combination
// that passes the others.
var energyChecks = []*checks.Check{checks.Autonomy, checks.VoyageFloor}

// lowerBound is the least a combination can cost: its parts, and the
// least its completion's cable, devices and buses can.
func (p *problem) lowerBound(combo []int) float64 {
	lb := p.parts(combo) + p.floor
	for i, c := range combo {
		lb += p.dims[i].opts[c].inc
	}
	return lb
}

// parts is the price of a combination's chosen parts and the fixed ones.
func (p *problem) parts(combo []int) float64 {
	lb := p.fixed
	for i, c := range combo {
		lb += p.dims[i].opts[c].cost
	}
	return lb
}

// increment is how much more than the floor's cheapest devices the
// devices on the runs straight from a bank must cost when the bank is
// option c of choice i: they must break the bank's whole fault current
// (there is no conductor ahead of them), which a blade fuse does not.
// Infinite when no device in the catalog breaks it.
func (p *problem) increment(i, c int) float64 {
	dm := p.dims[i]
	o := dm.opts[c]
	fault := p.rules.Protection.FaultVoltage * float64(o.series) * o.battery.Voltage.Volts() /
		(o.battery.Resistance.Ohms() * float64(o.series) / float64(o.parallel))
	var inc float64
	for range p.direct[dm.name] {
		least := math.Inf(1)
		for _, d := range p.comp.devices {
			if d.Interrupting.Amps() >= fault-0.1 {
				least = math.Min(least, devicePrice(d))
			}
		}
		inc += least - p.comp.minDevice()
	}
	return inc
}

// checkFault records the runs straight from each bank that carry a
// device, and whether the fault current increment computes agrees
// with the Interrupting check's on the designer's design.
func (p *problem) checkFault() {
	p.direct = map[string][]string{}
	for _, r := range p.sys0.Runs {
		if r.Parent == nil && r.Role != model.PV && r.Spec.Protection != nil && r.UpNode.Kind == model.KindBank {
			p.direct[r.Bank.Name] = append(p.direct[r.Bank.Name], r.Name)
		}
	}
	_, figs := checks.RunAll([]*checks.Check{checks.Interrupting}, checks.NewInput(p.sys0, nil, nil))
	p.faultAgrees = true
	for _, f := range figs {
		if f.ID != result.FigFaultCurrent {
			continue
		}
		r := p.sys0.Run(f.Subject)
		if r == nil || r.Parent != nil {
			continue
		}
		b := r.Bank.Spec
		mine := p.rules.Protection.FaultVoltage * r.Bank.NominalVoltage() / (b.Battery.Resistance.Ohms() * float64(b.Series) / float64(b.Parallel))
		if math.Abs(mine-f.Value) > 0.1 {
			p.faultAgrees = false
		}
	}
	if !p.faultAgrees {
		return
	}
	// Each bank option's increment, and the options sorted again by
	// price and increment: the search reaches a combination only after
	// those of a lower bound, which needs each choice's options in the
	// order of what they add to it.
	for i, dm := range p.dims {
		if dm.kind != dimBank {
			continue
		}
		for c := range dm.opts {
			dm.opts[c].inc = p.increment(i, c)
		}
		var was option
		if dm.designer >= 0 {
			was = dm.opts[dm.designer]
		}
		sortOptions(dm.opts)
		for c, o := range dm.opts {
			if dm.designer >= 0 && o.label == was.label {
				dm.designer = c
			}
		}
	}
}

// apply is the designer's design with the combination's choices made.
func (p *problem) apply(combo []int) *schema.Design {
	s := *p.base
	if len(s.Banks) > 0 {
		s.Banks = copyMap(s.Banks)
	}
	s.Arrays = copyMap(s.Arrays)
	s.Controllers = copyMap(s.Controllers)
	s.Links = copyMap(s.Links)
	for i, dm := range p.dims {
		o := dm.opts[combo[i]]
		switch dm.kind {
		case dimBank:
			if dm.path == "bank" {
				b := *s.Bank
				b.Battery, b.Series, b.Parallel = *o.battery, o.series, o.parallel
				s.Bank = &b
				continue
			}
			b := s.Banks[dm.name]
			b.Battery, b.Series, b.Parallel = *o.battery, o.series, o.parallel
			s.Banks[dm.name] = b
		case dimArray:
			a := s.Arrays[dm.name]
			a.Module, a.Series, a.Strings = *o.module, o.series, o.parallel
			s.Arrays[dm.name] = a
		case dimController:
			c := s.Controllers[dm.name]
			c.Part = *o.ctrl
			s.Controllers[dm.name] = c
		case dimLink:
			l := s.Links[dm.name]
			l.Part = *o.link
			s.Links[dm.name] = l
		}
	}
	return &s
}

func copyMap[V any](m map[string]V) map[string]V {
	if m == nil {
		return nil
	}
	out := make(map[string]V, len(m))
	for k, v := range m {
		out[k] = v
	}
	return out
}

// screen completes a combination's conductors and puts it to the checks
// of the choices: those that need no energy analysis first, then the
// energy checks if it passes them.
func (p *problem) screen(combo []int) *evaluation {
	p.evaluated++
	return p.screenWith(p.comp, combo, math.Inf(1))
}

// screenWith is screen with a completer of its own, for a worker. When
// best is finite and the light design's completion cannot beat it, the
// combination is left unchecked (dearer).
func (p *problem) screenWith(comp *completer, combo []int, best float64) *evaluation {
	ev := &evaluation{combo: append([]int(nil), combo...)}
	// light's model has its sizes set in place: nothing else of the
	// model depends on them.
	spec, sys, err := comp.light(p.apply(combo))
	if err != nil {
		ev.fails = []result.Finding{{ID: "model", Subject: "design", Status: result.Fail, Message: err.Error()}}
		return ev
	}
	ev.spec, ev.sys = spec, sys
	// The completion only raises what light sized: if even its least
	// cost cannot beat the best, the combination need not be checked.
	if !math.IsInf(best, 1) && !p.weak && p.parts(combo)+comp.bound(sys, p.busFloor) >= best-costEps {
		ev.dearer = true
		return ev
	}
	ev.checked = true
	in := checks.NewInput(sys, nil, nil)
	fs, _ := checks.RunAll(screenChecks, in)
	ev.fails = failing(fs)
	if len(ev.fails) > 0 {
		return ev
	}
	ev.an = energy.Analyze(sys)
	in.Energy = ev.an
	fs, _ = checks.RunAll(energyChecks, in)
	ev.fails = failing(fs)
	return ev
}

func failing(fs []result.Finding) []result.Finding {
	var out []result.Finding
	for _, f := range fs {
		if f.Status == result.Fail {
			out = append(out, f)
		}
	}
	return out
}

// finish completes a screened combination's devices, buses and whatever
// the completion checks still ask for, then checks it whole and costs it.
func (p *problem) finish(ev *evaluation) {
	best := math.Inf(1)
	if p.best != nil {
		best = p.best.cost
	}
	p.finishWith(p.comp, ev, best)
}

// finishWith is finish with a completer of its own and the cost to beat.
func (p *problem) finishWith(comp *completer, ev *evaluation, best float64) {
	spec, sys, rest, err := comp.full(ev.spec, ev.sys)
	if err != nil {
		ev.fails = []result.Finding{{ID: "model", Subject: "design", Status: result.Fail, Message: err.Error()}}
		return
	}
	if len(rest) > 0 {
		ev.fails = rest
		return
	}
	// Costed before it is checked whole: a design that costs no less than
	// the best needs no checking.
	if sys != nil {
		if c := compiler.BillOfMaterials(spec, p.rules, sys).Total; c >= best-costEps {
			ev.cost, ev.dearer = c, true
			return
		}
	}
	p.check(ev, spec)
}

// check runs every check over spec and costs it.
func (p *problem) check(ev *evaluation, spec *schema.Design) {
	sys, issues := model.Build(spec, p.rules)
	if len(issues) > 0 {
		ev.fails = []result.Finding{{ID: "model", Subject: issues[0].Path, Status: result.Fail, Message: issues[0].Msg}}
		return
	}
	an := energy.Analyze(sys)
	fs, _ := checks.RunAll(checks.All, checks.NewInput(sys, an, nil))
	ev.spec, ev.sys, ev.an, ev.findings = spec, sys, an, fs
	ev.fails = failing(fs)
	ev.bom = compiler.BillOfMaterials(spec, p.rules, sys)
	ev.cost = ev.bom.Total
	ev.passes = len(ev.fails) == 0
}

// learn records a combination's failures as facts, and notes the ones no
// choice can mend. It reports false when the search should stop.
func (p *problem) learn(ev *evaluation) bool {
	if len(ev.fails) == 0 {
		return true
	}
	if p.closest == nil || len(ev.fails) < len(p.closest.fails) ||
		(len(ev.fails) == len(p.closest.fails) && shortfall(ev.fails) < shortfall(p.closest.fails)) {
		p.closest = ev
	}
	for _, f := range ev.fails {
		deps := p.depsOf(f)
		if len(deps) == 0 {
			p.blocking = append(p.blocking, f)
			continue
		}
		p.addFact(signature{check: f.ID, subject: f.Subject, deps: deps}, ev.combo)
	}
	return len(p.blocking) == 0
}

// shortfall is how far failing findings fall short of their limits, each
// as a fraction of its limit: the closer to passing, the smaller.
func shortfall(fs []result.Finding) float64 {
	var t float64
	for _, f := range fs {
		if f.Limit != 0 && f.Margin < 0 {
			t += -f.Margin / math.Abs(f.Limit)
		}
	}
	return t
}

// gallop finds, for a combination that fails only checks that more
// batteries in parallel help, the fewest batteries that pass them, by
// halving between it and the most the cost bound allows: each evaluation
// on the way is a fact, and the parallel counts below the threshold are
// then ruled out without being evaluated one by one.
func (p *problem) gallop(ev *evaluation) {
	bank := -1
	for _, f := range ev.fails {
		if !monotoneInBank[f.ID] {
			return
		}
		for _, d := range p.depsOf(f) {
			if d.dir == atMost && p.dims[d.dim].kind == dimBank {
				if bank >= 0 && bank != d.dim {
					return
				}
				bank = d.dim
			}
		}
	}
	if bank < 0 {
		return
	}
	dm := p.dims[bank]
	cur := dm.opts[ev.combo[bank]]
	// The options of the same family, by amount.
	byAmount := map[int]int{}
	for i, o := range dm.opts {
		if o.family == cur.family {
			byAmount[o.amount] = i
		}
	}
	lo, hi := cur.amount, cur.amount
	for a := cur.amount + 1; ; a++ {
		i, ok := byAmount[a]
		if !ok {
			break
		}
		c := append([]int(nil), ev.combo...)
		c[bank] = i
		if p.best != nil && p.lowerBound(c) >= p.best.cost-costEps {
			break
		}
		hi = a
	}
	for lo < hi {
		if p.expired() {
			return
		}
		mid := (lo + hi + 1) / 2
		c := append([]int(nil), ev.combo...)
		c[bank] = byAmount[mid]
		if _, out := p.ruledOut(c); out {
			lo = mid
			continue
		}
		e := p.screen(c)
		if !p.learn(e) {
			return
		}
		still := false
		for _, f := range e.fails {
			if monotoneInBank[f.ID] {
				still = true
			}
		}
		if still {
			lo = mid
		} else {
			hi = mid - 1
		}
	}
}

// costEps is the least saving the search counts: a hundredth of the
// currency's unit, as the bill of materials rounds.
const costEps = 0.005

func (p *problem) expired() bool {
	if p.until.IsZero() || p.cut != "" {
		return p.cut != ""
	}
	if p.now().After(p.until) {
		p.cut = "the timeout"
		return true
	}
	return false
}

// node is a combination waiting in the search's queue; last is the
// choice its parent raised, so that each combination is reached once.
type node struct {
	combo []int
	last  int
	lb    float64
}

type queue []*node

func (q queue) Len() int { return len(q) }
func (q queue) Less(i, j int) bool {
	if q[i].lb != q[j].lb {
		return q[i].lb < q[j].lb
	}
	for k := range q[i].combo {
		if q[i].combo[k] != q[j].combo[k] {
			return q[i].combo[k] < q[j].combo[k]
		}
	}
	return false
}
func (q queue) Swap(i, j int) { q[i], q[j] = q[j], q[i] }
func (q *queue) Push(x any)   { *q = append(*q, x.(*node)) }
func (q *queue) Pop() any {
	old := *q
	n := old[len(old)-1]
	*q = old[:len(old)-1]
	return n
}

// batch is how many combinations the search evaluates together, on as
// many workers as there are processors. It is fixed, not the number of
// processors, so that the search evaluates the same combinations, and
// reports the same counts, on any machine.
const batch = 8

// search runs the branch and bound: combinations in order of their lower
// bound (parts' prices; ties by the options' order, which is by name), each
// decided by the facts learnt or evaluated; it ends when the next lower
// bound reaches the cheapest passing design's cost (the proof), when
// nothing is left, when a failure no choice can mend is found, or at the
// deadline. Combinations are evaluated a batch at a time, concurrently,
// and their results taken in order, so that the outcome is the one the
// batch's order gives whatever the workers' timing.
func (p *problem) search() {
	workers := max(1, min(batch, runtime.GOMAXPROCS(0)))
	comps := []*completer{p.comp}
	for len(comps) < workers {
		comps = append(comps, newCompleter(p.base, p.rules, p.cat))
	}
	q := &queue{}
	heap.Push(q, &node{combo: make([]int, len(p.dims)), lb: p.lowerBound(make([]int, len(p.dims)))})
	done := false
	for !done && q.Len() > 0 {
		if p.expired() {
			return
		}
		var todo []*node
		for len(todo) < batch && q.Len() > 0 {
			n := heap.Pop(q).(*node)
			if p.best != nil && n.lb >= p.best.cost-costEps {
				done = true
				break
			}
			for j := n.last; j < len(p.dims); j++ {
				if n.combo[j]+1 < len(p.dims[j].opts) {
					c := append([]int(nil), n.combo...)
					c[j]++
					heap.Push(q, &node{combo: c, last: j, lb: p.lowerBound(c)})
				}
			}
			p.considered++
			if _, out := p.ruledOut(n.combo); out {
				continue
			}
			todo = append(todo, n)
		}
		best := math.Inf(1)
		if p.best != nil {
			best = p.best.cost
		}
		evs := make([]*evaluation, len(todo))
		var wg sync.WaitGroup
		next := make(chan int)
		for w := range min(workers, len(todo)) {
			wg.Add(1)
			go func(comp *completer) {
				defer wg.Done()
				for i := range next {
					evs[i] = p.evaluate(comp, todo[i].combo, best)
				}
			}(comps[w])
		}
		for i := range todo {
			next <- i
		}
		close(next)
		wg.Wait()
		for _, ev := range evs {
			if ev.checked {
				p.evaluated++
			}
			if ev.dearer {
				continue
			}
			if !ev.passes {
				if !p.learn(ev) {
					return
				}
				p.gallop(ev)
				if len(p.blocking) > 0 {
					return
				}
				continue
			}
			if p.best == nil || ev.cost < p.best.cost-costEps {
				p.best = ev
			}
		}
	}
}

// evaluate screens a combination and, when it passes, completes it and
// checks it whole, unless it cannot beat best.
func (p *problem) evaluate(comp *completer, combo []int, best float64) *evaluation {
	ev := p.screenWith(comp, combo, best)
	if len(ev.fails) > 0 || ev.dearer {
		return ev
	}
	p.finishWith(comp, ev, best)
	return ev
}

// combinations is the number of combinations of the choices' options.
func (p *problem) combinations() float64 {
	n := 1.0
	for _, dm := range p.dims {
		n *= float64(len(dm.opts))
	}
	return n
}

// pruned estimates the combinations the bound left out: all but those
// considered.
func (p *problem) pruned() float64 {
	return math.Max(0, p.combinations()-float64(p.considered))
}
