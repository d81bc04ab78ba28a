// Package propose finds, from a yard's catalog, the cheapest design for a
// hull that passes every check: for the hull's loads, scenarios, voyage,
// site and wiring (its runs, their lengths and what they feed), the
// battery and its series × parallel for each bank, the module and its
// series × strings for each array on a mounting place, each controller,
// the part of each link the design leaves open, and every conductor's
// size, protective device, bus part and string fuse.
//
// The phases:
//
//	choices   each bank, placed array, controller and open link is a
//	          choice among the catalog's options, sorted by price
//	          (dims.go);
//	search    branch and bound over the combinations of options in order
//	          of their parts' price, a lower bound of their cost
//	          (search.go): each is decided by the failures learnt so far
//	          and the monotone premises (facts.go), or completed and
//	          checked; the search ends when the next lower bound reaches
//	          the cheapest passing design's cost, which proves it the
//	          cheapest, or at the deadline;
//	complete  a combination's conductors get the smallest size that
//	          passes at their currents, its devices, buses and fuses the
//	          cheapest catalog part that passes (complete.go);
//	explain   the proposal beside the designer's design: each change, the
//	          cost of both, the margins that bind, and for each choice the
//	          next smaller option and the check it fails (explain.go).
//
// Every verdict is the checks' own (package checks over package model and
// energy.Analyze, as `ampwright check` runs them): the search decides
// nothing by a formula of its own, so a proposal always passes `check`.
package propose

import (
	"errors"
	"fmt"
	"time"

	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// Options bound a search.
type Options struct {
	// Until is when the search stops and returns the best design found so
	// far, not proven; the zero time is never.
	Until time.Time
	// Now is the clock; time.Now when nil.
	Now func() time.Time
}

// Proposal is a search's outcome.
type Proposal struct {
	// Spec is the proposed design; nil when nothing in the catalog passes.
	Spec *schema.Design
	// Findings and BOM are the proposed design's.
	Findings []result.Finding
	BOM      *result.BOM
	// Report is what the commands print and the pack shows.
	Report *result.Proposal
	// Header and Notes are comments for the proposal's CUE file: at its
	// top, and above each changed entry by CUE path.
	Header string
	Notes  map[string]string
}

// Premises are the monotone rules the search prunes by. Its proof that a
// proposal is the cheapest rests on them, as on the catalog's prices.
var Premises = []string{
	"more batteries in parallel, of the same battery in the same series string, never lower the bank's lowest state of charge, autonomy, discharge or charge-rate limits",
	"more strings of the same module, in the same series length and on the same controller, never lower the lowest state of charge, and never lower the PV input current",
	"more batteries in parallel never lower the prospective fault current a device must break",
	"a larger conductor never raises a voltage drop nor lowers an ampacity, so a run's smallest passing size is found by size alone",
	"a check that depends on no choice the search makes (a fixed inverter against its loads, a device's distance from its source) cannot be mended by any proposal",
	"each combination is completed one way, and costed so: every conductor at the smallest standard size that passes (a larger one from a reel the design buys anyway is not sought), every device, bus part and string fuse the cheapest that passes",
}

// Propose searches the catalog for the cheapest design of hull d that
// passes every check. designer is d's own result (from compiler.Compile),
// cat the whole yard catalog (d.Catalog).
func Propose(d *compiler.Design, designer *result.Result, cat *schema.Catalog, opts Options) (*Proposal, error) {
	p, err := newProblem(d, cat, opts)
	if err != nil {
		return nil, err
	}
	p.seed(designer)
	if len(p.blocking) == 0 {
		p.search()
	}
	return p.proposal(d, designer), nil
}

// newProblem sets up the search of hull d over catalog cat: its choices,
// the fixed parts' price and the completion's floor.
func newProblem(d *compiler.Design, cat *schema.Catalog, opts Options) (*problem, error) {
	sys0 := d.Sys
	if sys0 == nil {
		// The model of a design with links left open, each given the
		// catalog's first part of its kind to stand in: the search
		// chooses every one.
		spec := *d.Spec
		spec.Links = copyMap(spec.Links)
		for _, n := range schema.Names(spec.Links) {
			l := spec.Links[n]
			if !l.Open() {
				continue
			}
			for _, id := range schema.Names(cat.Link) {
				if l.Kind == "" || cat.Link[id].Kind == l.Kind {
					l.Part = cat.Link[id]
					break
				}
			}
			if l.Open() {
				return nil, fmt.Errorf("links.%s: the catalog has no %s to choose from", model.Label(n), orWord(l.Kind, "link"))
			}
			spec.Links[n] = l
		}
		var issues []model.Issue
		if sys0, issues = model.Build(&spec, d.Rules); len(issues) > 0 {
			return nil, fmt.Errorf("%s: %s", issues[0].Path, issues[0].Msg)
		}
	}
	p := &problem{base: d.Spec, rules: d.Rules, cat: cat, sys0: sys0, facts: newFactBook(), now: opts.Now, until: opts.Until}
	if p.now == nil {
		p.now = time.Now
	}
	if err := p.choices(); err != nil {
		var pe *pathError
		if errors.As(err, &pe) {
			if pos := d.Position(pe.path); pos != "" {
				return nil, fmt.Errorf("%s: %s: %s", pos, pe.path, pe.msg)
			}
		}
		return nil, err
	}
	p.comp = newCompleter(d.Spec, d.Rules, cat)
	p.floor = p.comp.floor(sys0)
	p.busFloor = p.comp.busFloor(sys0)
	p.checkFault()
	return p, nil
}

// pathError is an input error of the design at a CUE path.
type pathError struct{ path, msg string }

func (e *pathError) Error() string { return e.path + ": " + e.msg }

func orWord(s, alt string) string {
	if s == "" {
		return alt
	}
	return s
}

// choices lists the search's choices: every bank, every array on a
// place, every controller, every link left open.
func (p *problem) choices() error {
	for _, b := range p.sys0.Banks {
		p.dims = append(p.dims, bankDim(b, p.cat))
	}
	for _, a := range p.sys0.Arrays {
		if a.Spec.Place == nil {
			continue
		}
		dm, err := arrayDim(a, p.cat)
		if err != nil {
			return err
		}
		p.dims = append(p.dims, dm)
	}
	for _, c := range p.sys0.Controllers {
		p.dims = append(p.dims, controllerDim(c, p.cat))
	}
	// The model's links have stand-in parts where the design's are open.
	open := func(l *model.Link) bool { return p.base.Links[l.Name].Open() }
	for _, l := range p.sys0.Links {
		if open(l) {
			p.dims = append(p.dims, linkDim(l, p.cat))
		}
	}
	for _, dm := range p.dims {
		if len(dm.opts) == 0 {
			return &pathError{dm.path, "the catalog has nothing to choose from that fits"}
		}
	}
	// The parts no choice changes.
	for _, a := range p.sys0.Arrays {
		if a.Spec.Place == nil {
			pr, _ := price(a.Spec.Module.Part)
			p.fixed += pr * float64(a.Spec.Series*a.Spec.Strings)
		}
	}
	for _, inv := range p.sys0.Inverters {
		pr, _ := price(inv.Spec.Part.Part)
		p.fixed += pr
	}
	for _, src := range p.sys0.Sources {
		if src.Charger != nil && src.Charger.Part != nil {
			pr, _ := price(src.Charger.Part.Part)
			p.fixed += pr
		}
	}
	for _, l := range p.sys0.Links {
		if !open(l) {
			pr, _ := price(l.Spec.Part.Part)
			p.fixed += pr
		}
	}
	for _, c := range p.sys0.Converters {
		pr, _ := price(c.Spec.Part.Part)
		p.fixed += pr
	}
	for _, sh := range p.sys0.Shunts {
		pr, _ := price(sh.Spec.Part.Part)
		p.fixed += pr
	}
	return nil
}

// seed starts the search from the designer's own design: as written, when
// it passes (a proposal is never dearer than it), and completed anew, when
// every choice of it is in the catalog.
func (p *problem) seed(designer *result.Result) {
	if designer != nil && designer.Count().Fail == 0 && designer.BOM != nil {
		p.best = &evaluation{spec: p.base, sys: p.sys0, findings: designer.Checks, bom: designer.BOM, cost: designer.BOM.Total, passes: true, designer: true}
	}
	combo := make([]int, len(p.dims))
	for i, dm := range p.dims {
		if dm.designer < 0 {
			return
		}
		combo[i] = dm.designer
	}
	ev := p.screen(combo)
	if len(ev.fails) == 0 {
		p.finish(ev)
	}
	if !ev.passes {
		p.learn(ev)
		return
	}
	if p.best == nil || ev.cost < p.best.cost-costEps {
		p.best = ev
	}
}
