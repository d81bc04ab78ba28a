package propose

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"github.com/ampwright/ampwright/checks"
	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
	"github.com/ampwright/ampwright/schema/unit"
)

// maxBinding is how many of the proposal's tightest findings the report
// lists.
const maxBinding = 10

// proposal assembles the search's outcome.
func (p *problem) proposal(d *compiler.Design, designer *result.Result) *Proposal {
	rep := &result.Proposal{
		Currency: d.Spec.Currency,
		Changes:  []result.ProposalChange{},
		Binding:  []result.Finding{},
		Premises: Premises,
		Search: result.ProposalSearch{
			Options: map[string]int{}, Combinations: p.combinations(),
			Considered: p.considered, Evaluated: p.evaluated, Pruned: p.pruned(),
		},
	}
	for _, dm := range p.dims {
		rep.Search.Options[dm.path] = len(dm.opts)
	}
	if designer != nil {
		rep.Designer = side(d.Spec, designer.Checks, designer.BOM)
	}
	out := &Proposal{Report: rep, Notes: map[string]string{}}
	rep.Design = d.Identity()
	switch {
	case p.best == nil:
		rep.Status = "none"
		rep.Blocking = p.blockers()
	case p.cut != "":
		rep.Status = "best-found"
	default:
		rep.Status = "proven"
	}
	switch {
	case p.cut != "" && p.best == nil:
		rep.Cut = fmt.Sprintf("the search stopped at %s after %d combinations, before any passed: that is no proof that nothing in the catalog passes", p.cut, p.considered)
	case p.cut != "":
		rep.Cut = fmt.Sprintf("the search stopped at %s after %d combinations; the proposal is the cheapest passing design found so far, not proven the cheapest", p.cut, p.considered)
	}
	if p.best == nil {
		return out
	}
	best := p.best
	out.Spec, out.Findings, out.BOM = best.spec, best.findings, best.bom
	rep.Proposed = side(best.spec, best.findings, best.bom)
	if designer != nil && designer.BOM != nil {
		rep.Saving = round2(designer.BOM.Total - best.cost)
	}
	rep.Binding = binding(best.findings)
	if !best.designer {
		p.changes(best, rep, out.Notes)
	}
	out.Header = header(d, rep)
	return out
}

func round2(x float64) float64 { return math.Round(x*100) / 100 }

// side is a design's cost, verdict and arrangement in a line each.
func side(spec *schema.Design, fs []result.Finding, bom *result.BOM) result.ProposalSide {
	s := result.ProposalSide{Bank: []string{}}
	if bom != nil {
		s.Cost, s.Complete = bom.Total, bom.Complete
	}
	for _, f := range fs {
		switch f.Status {
		case result.Fail:
			s.Fail++
		case result.Warn:
			s.Warn++
		default:
			s.Pass++
		}
	}
	if spec.Bank != nil {
		s.Bank = append(s.Bank, "bank: "+bankText(*spec.Bank))
	}
	for _, n := range schema.Names(spec.Banks) {
		s.Bank = append(s.Bank, n+": "+bankText(spec.Banks[n]))
	}
	for _, n := range schema.Names(spec.Arrays) {
		a := spec.Arrays[n]
		ctrl := spec.Controllers[a.Controller].Part.ID
		s.Arrays = append(s.Arrays, fmt.Sprintf("%s: %s on %s", n, arrayText(a), ctrl))
	}
	return s
}

func bankText(b schema.Bank) string {
	return fmt.Sprintf("%s (%s %s %s)", bankLabel(b.Series, b.Parallel, b.Battery.ID), b.Battery.Voltage.Text, b.Battery.Capacity.Text, b.Battery.Chemistry)
}

func arrayText(a schema.Array) string {
	return fmt.Sprintf("%s (%g W)", arrayLabel(a.Series, a.Strings, a.Module.ID), a.Module.Pmax.Watts()*float64(a.Series*a.Strings))
}

// binding are the passing findings with the least margin against their
// limit, tightest first.
func binding(fs []result.Finding) []result.Finding {
	type rel struct {
		f result.Finding
		r float64
	}
	var list []rel
	for _, f := range fs {
		if f.Status != result.Pass || f.Limit == 0 || f.Margin < 0 || !isMargin(f) {
			continue
		}
		list = append(list, rel{f, f.Margin / math.Abs(f.Limit)})
	}
	sort.SliceStable(list, func(i, j int) bool {
		a, b := list[i], list[j]
		if a.r != b.r {
			return a.r < b.r
		}
		if a.f.ID != b.f.ID {
			return a.f.ID < b.f.ID
		}
		return a.f.Subject < b.f.Subject
	})
	// At most two of a check, so that many conductors at the minimum
	// size do not hide the bank's or the array's margin.
	out := []result.Finding{}
	per := map[result.CheckID]int{}
	for _, x := range list {
		if len(out) == maxBinding {
			break
		}
		if per[x.f.ID] == 2 {
			continue
		}
		per[x.f.ID]++
		out = append(out, x.f)
	}
	return out
}

// isMargin reports whether a finding's margin measures something: a
// part made for the system voltage, or a run protected by its own device,
// is reported against itself, with no margin to speak of.
func isMargin(f result.Finding) bool {
	switch f.ID {
	case result.CheckEquipmentSystem:
		return false
	case result.CheckProtected:
		return f.Value != f.Limit
	}
	return true
}

// blockers are the failures that kept every combination from passing: the
// ones no choice can mend, else those of the evaluated combination that
// came closest.
func (p *problem) blockers() []result.Finding {
	fs := p.blocking
	if len(fs) == 0 && p.closest != nil {
		fs = p.closest.fails
	}
	out := []result.Finding{}
	seen := map[string]bool{}
	for _, f := range fs {
		k := string(f.ID) + "\x00" + f.Subject
		if seen[k] {
			continue
		}
		seen[k] = true
		out = append(out, f)
	}
	return out
}

// header is the comment at the top of the proposal's CUE file.
func header(d *compiler.Design, rep *result.Proposal) string {
	var b strings.Builder
	fmt.Fprintf(&b, "Proposed by `ampwright propose %s`", d.Dir)
	switch rep.Status {
	case "proven":
		b.WriteString(": the cheapest design from the yard's catalog that passes every check.")
	default:
		b.WriteString(": the cheapest design found that passes every check, not proven the cheapest (the search was cut).")
	}
	if len(rep.Designer.Bank) > 0 {
		fmt.Fprintf(&b, " It costs %s against the designer's %s.", money(rep.Proposed.Cost, rep.Currency), money(rep.Designer.Cost, rep.Currency))
	} else {
		fmt.Fprintf(&b, " It costs %s.", money(rep.Proposed.Cost, rep.Currency))
	}
	b.WriteString(" Check it with `ampwright check`; the comments marked \"proposed\" say what changed and why.")
	return b.String()
}

func money(x float64, cur string) string {
	s := fmt.Sprintf("%.2f", x)
	if cur != "" {
		s += " " + cur
	}
	return s
}

// changes lists every entry the proposal changes, with what binds it and
// the next smaller option and the check it fails; and the notes for the
// CUE file.
func (p *problem) changes(best *evaluation, rep *result.Proposal, notes map[string]string) {
	base, spec := p.base, best.spec
	add := func(c result.ProposalChange) {
		rep.Changes = append(rep.Changes, c)
		n := fmt.Sprintf("proposed: %s %s (was %s)", c.What, c.To, c.From)
		if c.Binds != "" {
			n += "\nsized to " + c.Binds
		}
		if c.Smaller != "" {
			n += fmt.Sprintf("\n%s would fail %s", c.Smaller, c.SmallerFails)
		}
		if old := notes[c.Entry]; old != "" {
			n = old + "\n" + n
		}
		notes[c.Entry] = n
	}
	for i, dm := range p.dims {
		o := dm.opts[best.combo[i]]
		switch dm.kind {
		case dimBank:
			was := base.Bank
			if dm.path != "bank" {
				b := base.Banks[dm.name]
				was = &b
			}
			if was.Battery.ID == o.battery.ID && was.Series == o.series && was.Parallel == o.parallel {
				continue
			}
			c := result.ProposalChange{Entry: dm.path, What: "bank", From: bankLabel(was.Series, was.Parallel, was.Battery.ID), To: o.label}
			primary := p.sys0.Primary() != nil && p.sys0.Primary().Name == dm.name
			c.Binds = bindsFor(best.findings, func(f result.Finding) bool {
				// The voyage and autonomy are the primary bank's.
				if f.ID == result.CheckVoyageFloor || f.ID == result.CheckAutonomy {
					return primary
				}
				return monotoneInBank[f.ID] && f.Subject == dm.name
			})
			c.Smaller, c.SmallerFails = p.smallerOption(best, i)
			add(c)
		case dimArray:
			was := base.Arrays[dm.name]
			if was.Module.ID == o.module.ID && was.Series == o.series && was.Strings == o.parallel {
				continue
			}
			c := result.ProposalChange{Entry: dm.path, What: "array", From: arrayLabel(was.Series, was.Strings, was.Module.ID), To: o.label}
			c.Binds = bindsFor(best.findings, func(f result.Finding) bool {
				return f.ID == result.CheckVoyageFloor || (strings.HasPrefix(string(f.ID), "pv.") && f.Subject == dm.name)
			})
			c.Smaller, c.SmallerFails = p.smallerOption(best, i)
			add(c)
		case dimController:
			was := base.Controllers[dm.name].Part.ID
			if was == o.ctrl.ID {
				continue
			}
			c := result.ProposalChange{Entry: dm.path, What: "controller", From: was, To: o.label}
			c.Binds = bindsFor(best.findings, func(f result.Finding) bool {
				return (f.ID == result.CheckInputCurrent && f.Subject == dm.name) || f.ID == result.CheckColdVoc || f.ID == result.CheckHotVmp
			})
			c.Smaller, c.SmallerFails = p.smallerOption(best, i)
			add(c)
		case dimLink:
			c := result.ProposalChange{Entry: dm.path, What: "link", From: "left open", To: o.label}
			c.Binds = bindsFor(best.findings, func(f result.Finding) bool { return f.Subject == dm.name })
			c.Smaller, c.SmallerFails = p.smallerOption(best, i)
			add(c)
		}
	}
	for _, n := range schema.Names(spec.Buses) {
		was, now := base.Buses[n].Part, spec.Buses[n].Part
		if was == nil || now == nil || was.ID == now.ID {
			continue
		}
		path := "buses." + model.Label(n)
		c := result.ProposalChange{Entry: path, What: "part", From: was.ID, To: now.ID}
		c.Binds = bindsFor(best.findings, func(f result.Finding) bool { return f.Subject == n && strings.HasPrefix(string(f.ID), "bus.") })
		c.Smaller, c.SmallerFails = p.smallerBus(best, spec.Buses[n].Kind, was, now, func(s *schema.Design, part *schema.Busbar) {
			b := s.Buses[n]
			b.Part = part
			s.Buses[n] = b
		}, n)
		add(c)
	}
	if spec.Negative != nil && base.Negative != nil {
		for _, n := range schema.Names(spec.Negative.Buses) {
			was, now := base.Negative.Buses[n].Part, spec.Negative.Buses[n].Part
			if was == nil || now == nil || was.ID == now.ID {
				continue
			}
			add(result.ProposalChange{Entry: "negative.buses." + model.Label(n), What: "part", From: was.ID, To: now.ID,
				Binds: bindsFor(best.findings, func(f result.Finding) bool { return f.Subject == n && strings.HasPrefix(string(f.ID), "bus.") })})
		}
	}
	for _, n := range schema.Names(spec.Arrays) {
		was, now := base.Arrays[n].StringFuse, spec.Arrays[n].StringFuse
		if partID(was) == partID(now) {
			continue
		}
		add(result.ProposalChange{Entry: "arrays." + model.Label(n), What: "string fuse", From: fuseText(was), To: fuseText(now),
			Binds: bindsFor(best.findings, func(f result.Finding) bool { return f.ID == result.CheckStringFuse && f.Subject == n })})
	}
	for _, r := range append(best.sys.Runs[:len(best.sys.Runs):len(best.sys.Runs)], best.sys.Returns...) {
		was, _, ok := conductor(base, r.Name)
		if !ok {
			continue
		}
		now := *r.Spec
		if !sameSize(was.Size, now.Size) || partID(was.Cable) != partID(now.Cable) {
			c := result.ProposalChange{Entry: r.Path, What: "size", From: sizeText(was), To: sizeText(now)}
			c.Binds = bindsFor(best.findings, func(f result.Finding) bool {
				return f.Subject == r.Name && (f.ID == result.CheckVoltageDrop || f.ID == result.CheckAmpacity || f.ID == result.CheckMinimumSize || f.ID == result.CheckProtected)
			})
			c.Smaller, c.SmallerFails = p.smallerSize(best, r)
			add(c)
		}
		if was.Protection != nil && now.Protection != nil && was.Protection.ID != now.Protection.ID {
			c := result.ProposalChange{Entry: r.Path, What: "protection", From: deviceText(was.Protection), To: deviceText(now.Protection)}
			c.Binds = bindsFor(best.findings, func(f result.Finding) bool {
				return f.Subject == r.Name && strings.HasPrefix(string(f.ID), "protection.")
			})
			c.Smaller, c.SmallerFails = p.smallerDevice(best, r)
			add(c)
		}
	}
}

func partID[T interface {
	*schema.Cable | *schema.Protection
}](x T) string {
	switch v := any(x).(type) {
	case *schema.Cable:
		if v != nil {
			return v.ID
		}
	case *schema.Protection:
		if v != nil {
			return v.ID
		}
	}
	return ""
}

func fuseText(f *schema.Protection) string {
	if f == nil {
		return "none"
	}
	return deviceText(f)
}

func deviceText(d *schema.Protection) string {
	return fmt.Sprintf("%s (%s %s)", d.ID, d.Rating.Text, d.Kind)
}

func sizeText(c schema.Conductor) string {
	if c.Cable != nil {
		return fmt.Sprintf("%s (%s)", c.Size.Text, c.Cable.ID)
	}
	return c.Size.Text
}

// bindsFor is the tightest passing finding that keep selects, as
// "check subject: margin of limit".
func bindsFor(fs []result.Finding, keep func(result.Finding) bool) string {
	var best *result.Finding
	bestR := math.Inf(1)
	for i, f := range fs {
		if f.Status == result.Fail || !keep(f) || f.Limit == 0 || !isMargin(f) {
			continue
		}
		r := f.Margin / math.Abs(f.Limit)
		if r < bestR {
			best, bestR = &fs[i], r
		}
	}
	if best == nil {
		return ""
	}
	return fmt.Sprintf("%s %s: %g %s against %g %s (margin %g %s)", best.ID, best.Subject, best.Value, best.Unit, best.Limit, best.Unit, best.Margin, best.Unit)
}

// smallerOption is the option of choice i next below the proposal's and
// the check it fails: for a bank or an array one battery or string
// fewer, else the next cheaper part.
func (p *problem) smallerOption(best *evaluation, i int) (string, string) {
	dm := p.dims[i]
	cur := dm.opts[best.combo[i]]
	// One battery or string fewer of the same; for a single one, or for
	// a part, the next cheaper option.
	next := -1
	if dm.kind == dimBank || dm.kind == dimArray {
		for j, o := range dm.opts {
			if o.family == cur.family && o.amount == cur.amount-1 {
				next = j
			}
		}
	}
	if next < 0 && best.combo[i] > 0 {
		next = best.combo[i] - 1
	}
	if next < 0 {
		return "", ""
	}
	c := append([]int(nil), best.combo...)
	c[i] = next
	ev := p.screen(c)
	if len(ev.fails) == 0 {
		p.finish(ev)
	}
	label := dm.opts[next].label
	if len(ev.fails) == 0 {
		if ev.passes {
			return label, fmt.Sprintf("nothing, but the design with it costs %s", money(ev.cost, p.base.Currency))
		}
		return label, "nothing"
	}
	return label, failText(ev.fails[0])
}

func failText(f result.Finding) string {
	s := fmt.Sprintf("%s %s: %s", f.ID, f.Subject, f.Message)
	return s
}

// variant checks the proposal with one change, the checks given only.
func (p *problem) variant(best *evaluation, change func(*schema.Design), list []*checks.Check, subject string) (string, bool) {
	spec := cloneWiring(best.spec)
	change(spec)
	sys, issues := model.Build(spec, p.rules)
	if len(issues) > 0 {
		return issues[0].Msg, true
	}
	fs, _ := checks.RunAll(list, checks.NewInput(sys, best.an, nil))
	var first *result.Finding
	for i, f := range fs {
		if f.Status != result.Fail {
			continue
		}
		if f.Subject == subject {
			return failText(f), true
		}
		if first == nil {
			first = &fs[i]
		}
	}
	if first != nil {
		return failText(*first), true
	}
	return "", false
}

// smallerSize is the run's next smaller standard size the catalog sells
// and the check it fails.
func (p *problem) smallerSize(best *evaluation, r *model.Run) (string, string) {
	var prev *sized
	for _, z := range p.comp.sizesFrom(r, unit.Size{}, p.comp.designerRun(r.Name)) {
		if z.size.MM2() >= r.Spec.Size.MM2()*(1-1e-9) {
			break
		}
		z := z
		prev = &z
	}
	if prev == nil {
		return "", ""
	}
	label := prev.size.Text
	msg, ok := p.variant(best, func(s *schema.Design) {
		cd, put, _ := conductor(s, r.Name)
		cd.Size, cd.Cable = prev.size, prev.cable
		put(cd)
	}, completionChecks, r.Name)
	if !ok {
		return label, "nothing (it is larger for the cost of the cable the design buys anyway)"
	}
	return label, msg
}

// smallerDevice is the next device below the run's, of its kind and
// style, and the check it fails.
func (p *problem) smallerDevice(best *evaluation, r *model.Run) (string, string) {
	cur := r.Spec.Protection
	var prev *schema.Protection
	for i := range p.comp.devices {
		d := p.comp.devices[i]
		if d.Kind != cur.Kind || d.Style != cur.Style || d.Rating.Amps() >= cur.Rating.Amps() {
			continue
		}
		if prev == nil || d.Rating.Amps() > prev.Rating.Amps() {
			prev = &d
		}
	}
	if prev == nil {
		return "", ""
	}
	dd := *prev
	dd.Distance, dd.Sheathed = cur.Distance, cur.Sheathed
	msg, ok := p.variant(best, func(s *schema.Design) {
		cd, put, _ := conductor(s, r.Name)
		cd.Protection = &dd
		put(cd)
	}, completionChecks, r.Name)
	if !ok {
		return deviceText(prev), "nothing"
	}
	return deviceText(prev), msg
}

// smallerBus is the next cheaper part of the bus's family and the check
// it fails.
func (p *problem) smallerBus(best *evaluation, kind string, like, now *schema.Busbar, set func(*schema.Design, *schema.Busbar), name string) (string, string) {
	var prev *schema.Busbar
	np, _ := price(now.Part)
	for i := range p.comp.busbars {
		b := p.comp.busbars[i]
		bp, _ := price(b.Part)
		if !busFamily(kind, like, b) || b.ID == now.ID || bp > np {
			continue
		}
		prev = &b
	}
	if prev == nil {
		return "", ""
	}
	msg, ok := p.variant(best, func(s *schema.Design) { set(s, prev) }, []*checks.Check{checks.BusCurrent, checks.BusWays, checks.VoltageRating}, name)
	if !ok {
		return prev.ID, "nothing"
	}
	return prev.ID, msg
}
