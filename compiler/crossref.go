package compiler

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"cuelang.org/go/cue"

	"github.com/ampwright/ampwright/schema/unit"
)

// crossCheck finds what the schema cannot say: names that refer to other
// parts of the design, names used twice, and fields that go together.
// It reads the unified value, so that it runs alongside the schema's own
// errors and every problem of a design is reported in one run.
func (c *validator) crossCheck() {
	scenarios := c.keys("scenarios")
	wiring := c.keys("wiring")
	inverters := c.keys("inverters")
	controllers := c.keys("controllers")
	loads := c.keys("loads")

	for _, name := range loads {
		base := cue.MakePath(cue.Str("loads"), cue.Str(name))
		c.ref(base, "circuit", "a conductor in wiring", wiring)
		c.ref(base, "inverter", "an inverter in inverters", inverters)
		hasCircuit := c.root.LookupPath(appendPath(base, "circuit")).Exists()
		hasInverter := c.root.LookupPath(appendPath(base, "inverter")).Exists()
		if hasCircuit && hasInverter {
			c.errs.Add(c.dataPos(appendPath(base, "circuit")), appendPath(base, "circuit").String(), "an AC load is fed by its inverter: give inverter or circuit, not both")
		}
		if !hasCircuit && !hasInverter && c.root.LookupPath(base).Exists() {
			c.errs.Add(c.dataPos(base), appendPath(base, "circuit").String(), "missing the load's circuit: name the conductor in wiring that feeds it, or, for an AC load, its inverter")
		}
		for _, s := range c.keysAt(appendPath(base, "hours")) {
			if !contains(scenarios, s) {
				p := appendPath(base, "hours", s)
				c.errs.Add(c.dataPos(p), p.String(), "unknown scenario %q%s", s, suggest(s, scenarios))
			}
		}
		cur := c.root.LookupPath(appendPath(base, "current")).Exists()
		pow := c.root.LookupPath(appendPath(base, "power")).Exists()
		switch {
		case cur && pow:
			cs, _ := c.root.LookupPath(appendPath(base, "current")).String()
			ps, _ := c.root.LookupPath(appendPath(base, "power")).String()
			c.errs.Add(c.dataPos(base), base.String(), "the load gives both current %q and power %q; give one", cs, ps)
		case !cur && !pow && c.root.LookupPath(base).Exists():
			c.errs.Add(c.dataPos(base), base.String(), "missing the load's draw: give current, such as \"4.5 A\", or power, such as \"60 W\"")
		}
	}
	for _, name := range inverters {
		c.ref(cue.MakePath(cue.Str("inverters"), cue.Str(name)), "circuit", "a conductor in wiring", wiring)
	}
	for _, name := range c.keys("arrays") {
		c.ref(cue.MakePath(cue.Str("arrays"), cue.Str(name)), "controller", "a controller in controllers", controllers)
	}
	days := 0.0
	for _, leg := range elements(c.root.LookupPath(cue.ParsePath("voyage.legs"))) {
		c.ref(leg.Path(), "scenario", "a scenario in scenarios", scenarios)
		if d, err := leg.LookupPath(cue.ParsePath("days")).Float64(); err == nil {
			days += d
		}
	}
	// The voyage is simulated hour by hour and its hours are in the
	// result: a voyage of thousands of legs would cost time and memory to
	// no purpose.
	if days > maxVoyageDays {
		p := cue.ParsePath("voyage.legs")
		c.errs.Add(c.dataPos(p), p.String(), "the voyage's legs add up to %g days; a design voyage may last at most %d days (ten years)", days, maxVoyageDays)
	}
	c.ref(cue.ParsePath("autonomy"), "scenario", "a scenario in scenarios", scenarios)
	c.months()

	// Nodes of the wiring: the bank and every named thing a conductor can
	// end at. A name used in two places would make a conductor ambiguous.
	nodes, owner := c.banks()
	for _, group := range []string{"buses", "arrays", "controllers", "chargers", "inverters", "links", "converters", "loads"} {
		for _, n := range c.keys(group) {
			if first, dup := owner[n]; dup {
				p := cue.MakePath(cue.Str(group), cue.Str(n))
				c.errs.Add(c.dataPos(p), p.String(), "duplicate name %q: %s already has it, and a conductor's from and to must name one node", n, first)
				continue
			}
			owner[n] = group
			nodes = append(nodes, n)
		}
	}
	for _, name := range wiring {
		base := cue.MakePath(cue.Str("wiring"), cue.Str(name))
		c.refNoun(base, "from", "node", "a bank, bus, array, controller, charger, inverter, link, converter or load", nodes)
		c.refNoun(base, "to", "node", "a bank, bus, array, controller, charger, inverter, link, converter or load", nodes)
		c.cableAgrees(base)
		from, _ := c.root.LookupPath(appendPath(base, "from")).String()
		to, _ := c.root.LookupPath(appendPath(base, "to")).String()
		if from != "" && from == to {
			c.errs.Add(c.dataPos(appendPath(base, "to")), appendPath(base, "to").String(), "the conductor runs from %q to itself", from)
		}
	}
	for _, name := range c.keys("chargers") {
		for _, s := range c.keysAt(cue.MakePath(cue.Str("chargers"), cue.Str(name), cue.Str("hours"))) {
			if !contains(scenarios, s) {
				p := cue.MakePath(cue.Str("chargers"), cue.Str(name), cue.Str("hours"), cue.Str(s))
				c.errs.Add(c.dataPos(p), p.String(), "unknown scenario %q%s", s, suggest(s, scenarios))
			}
		}
	}
	for _, group := range []string{"scenarios", "loads", "wiring", "buses", "arrays", "controllers", "chargers", "inverters", "banks", "links", "converters"} {
		c.similarNames(group)
	}
	c.fedFromLoad(wiring, loads)
	c.hoursWithinScenarios(scenarios)
	c.systemRefs(scenarios)
}

// banks checks that the design gives bank or banks, not both, and returns
// the wiring's bank nodes with their owners.
func (c *validator) banks() ([]string, map[string]string) {
	one := c.root.LookupPath(cue.ParsePath("bank")).Exists()
	several := c.keys("banks")
	owner := map[string]string{}
	var nodes []string
	switch {
	case one && len(several) > 0:
		p := cue.ParsePath("banks")
		c.errs.Add(c.dataPos(p), p.String(), "the design gives both bank and banks: give bank for a boat with one bank, banks for a boat with several")
	case !one && len(several) == 0:
		p := cue.ParsePath("bank")
		c.errs.Add(c.dataPos(cue.Path{}), p.String(), "missing required field \"bank\": the house battery bank (or banks, for a boat with several)")
	}
	if one || len(several) == 0 {
		// Without any bank, "bank" still names one, so that the missing
		// bank is the error and not every run from it.
		nodes, owner["bank"] = append(nodes, "bank"), "bank"
	}
	for _, n := range several {
		nodes, owner[n] = append(nodes, n), "banks"
	}
	return nodes, owner
}

// systemRefs resolves the names the parts of the system model use: a
// link's banks, a charger's and an inverter-charger's scenarios, a bus's
// negative bus.
func (c *validator) systemRefs(scenarios []string) {
	banks, _ := c.bankNames()
	for _, name := range c.keys("links") {
		base := cue.MakePath(cue.Str("links"), cue.Str(name))
		c.refNoun(base, "from", "bank", "a bank in banks", banks)
		c.refNoun(base, "to", "bank", "a bank in banks", banks)
	}
	for _, name := range c.keys("inverters") {
		hours := cue.MakePath(cue.Str("inverters"), cue.Str(name), cue.Str("charging"), cue.Str("hours"))
		for _, s := range c.keysAt(hours) {
			if !contains(scenarios, s) {
				p := appendPath(hours, s)
				c.errs.Add(c.dataPos(p), p.String(), "unknown scenario %q%s", s, suggest(s, scenarios))
			}
		}
	}
	negBuses := c.keysAt(cue.ParsePath("negative.buses"))
	for _, name := range c.keys("buses") {
		c.refNoun(cue.MakePath(cue.Str("buses"), cue.Str(name)), "negative", "negative bus", "a bus in negative.buses", negBuses)
	}
}

// bankNames are the names a bank goes by in the wiring.
func (c *validator) bankNames() ([]string, bool) {
	if c.root.LookupPath(cue.ParsePath("bank")).Exists() {
		return []string{"bank"}, true
	}
	return c.keys("banks"), false
}

// fedFromLoad reports a run whose supply end is a load: a load is where
// the wiring ends, and a run "from" it would be fed by a consumer.
func (c *validator) fedFromLoad(wiring, loads []string) {
	for _, name := range wiring {
		p := cue.MakePath(cue.Str("wiring"), cue.Str(name), cue.Str("from"))
		from, err := c.root.LookupPath(p).String()
		if err != nil || !contains(loads, from) {
			continue
		}
		c.errs.Add(c.dataPos(p), p.String(), "the run is fed from load %q: a run's from is its supply end, nearer the bank, and a load feeds nothing; feed the run from a bus or the bank", from)
	}
}

// hoursWithinScenarios reports hours of a load, inverter or charger, and
// engine hours, longer than the period of their scenario: a load cannot
// run 24 hours of a 12-hour period.
func (c *validator) hoursWithinScenarios(scenarios []string) {
	period := map[string]float64{}
	for _, s := range scenarios {
		p := cue.MakePath(cue.Str("scenarios"), cue.Str(s), cue.Str("hours"))
		h, err := c.root.LookupPath(p).Float64()
		if err != nil {
			continue
		}
		period[s] = h
		ep := cue.MakePath(cue.Str("scenarios"), cue.Str(s), cue.Str("engineHours"))
		if e, err := c.root.LookupPath(ep).Float64(); err == nil && e > h {
			c.errs.Add(c.dataPos(ep), ep.String(), "%g engine hours in scenario %q, whose period is %g hours; the engine cannot run longer than the period", e, s, h)
		}
	}
	for _, group := range []string{"loads", "inverters", "chargers"} {
		for _, name := range c.keys(group) {
			base := cue.MakePath(cue.Str(group), cue.Str(name), cue.Str("hours"))
			for _, s := range c.keysAt(base) {
				limit, ok := period[s]
				if !ok {
					continue // an unknown scenario, reported above
				}
				p := appendPath(base, s)
				h, err := c.root.LookupPath(p).Float64()
				if err != nil || h <= limit {
					continue
				}
				c.errs.Add(c.dataPos(p), p.String(), "%g hours in scenario %q, whose period is %g hours; give at most %g, or lengthen the scenario's hours", h, s, limit, limit)
			}
		}
	}
}

// maxVoyageDays bounds the design voyage.
const maxVoyageDays = 3660

// months checks the months in use: no month twice, and irradiation given
// for each.
func (c *validator) months() {
	seen := map[string]bool{}
	irr := cue.ParsePath("site.irradiation")
	for _, mv := range elements(c.root.LookupPath(cue.ParsePath("site.months"))) {
		m, err := mv.String()
		if err != nil {
			continue
		}
		p := mv.Path()
		if seen[m] {
			c.errs.Add(c.dataPos(p), p.String(), "duplicate month %q", m)
			continue
		}
		seen[m] = true
		if c.root.LookupPath(irr).Exists() && !c.root.LookupPath(appendPath(irr, m)).Exists() {
			c.errs.Add(c.dataPos(irr), irr.String(), "no irradiation for %q, a month in use; expected a value such as %s: \"5.2 kWh/m²/day\"", m, m)
		}
	}
}

// similarNames reports names in one group that differ only in case or
// separators, which a reader takes for the same thing.
func (c *validator) similarNames(group string) {
	seen := map[string]string{}
	for _, n := range c.keys(group) {
		k := strings.NewReplacer("-", "", "_", "", ".", "").Replace(strings.ToLower(n))
		if first, dup := seen[k]; dup {
			p := cue.MakePath(cue.Str(group), cue.Str(n))
			c.errs.Add(c.dataPos(p), p.String(), "duplicate name: %q and %q differ only in case or separators", first, n)
			continue
		}
		seen[k] = n
	}
}

// ref checks that the string field of base names one of names.
func (c *validator) ref(base cue.Path, field, what string, names []string) {
	c.refNoun(base, field, field, what, names)
}

// refNoun is ref with the noun the message uses for the name.
func (c *validator) refNoun(base cue.Path, field, noun, what string, names []string) {
	p := appendPath(base, field)
	v := c.root.LookupPath(p)
	if !v.Exists() {
		return
	}
	s, err := v.String()
	if err != nil || contains(names, s) {
		return
	}
	c.errs = append(c.errs, &Error{
		Pos:  c.dataPos(p),
		Path: p.String(),
		Msg:  fmt.Sprintf("unknown %s %q: expected %s%s", noun, s, what, suggest(s, names)),
	})
}

// keys returns the sorted field names of the top-level struct name.
func (c *validator) keys(name string) []string {
	return c.keysAt(cue.MakePath(cue.Str(name)))
}

func (c *validator) keysAt(p cue.Path) []string {
	v := c.root.LookupPath(p)
	if !v.Exists() {
		return nil
	}
	it, err := v.Fields()
	if err != nil {
		return nil
	}
	var out []string
	for it.Next() {
		out = append(out, selName(it.Selector()))
	}
	sort.Strings(out)
	return out
}

func appendPath(p cue.Path, names ...string) cue.Path {
	return cue.MakePath(append(p.Selectors(), strSelectors(names)...)...)
}

func contains(list []string, s string) bool {
	for _, x := range list {
		if x == s {
			return true
		}
	}
	return false
}

// cableAgrees checks that a run cut from a catalog cable has the cable's
// size, insulation rating and material; where the design leaves the
// insulation or material to their defaults, the cable's are taken
// (fromCable).
func (c *validator) cableAgrees(run cue.Path) {
	if !c.root.LookupPath(appendPath(run, "cable")).Exists() {
		return
	}
	for _, field := range []string{"size", "insulation", "material"} {
		if field != "size" && c.isDefault(appendPath(run, field)) {
			continue // a default, which the cable's value replaces
		}
		mine, err1 := c.root.LookupPath(appendPath(run, field)).String()
		theirs, err2 := c.root.LookupPath(appendPath(run, "cable", field)).String()
		if err1 != nil || err2 != nil || sameQuantity(mine, theirs) {
			continue
		}
		p := appendPath(run, field)
		c.errs.Add(c.dataPos(p), p.String(), "%q differs from its cable's %s %q; give the cable's, or another cable", mine, field, theirs)
	}
}

// sameQuantity compares two written values, as quantities when both parse.
func sameQuantity(a, b string) bool {
	if a == b {
		return true
	}
	qa, err1 := unit.Parse(a)
	qb, err2 := unit.Parse(b)
	return err1 == nil && err2 == nil && qa.Dim == qb.Dim && math.Abs(qa.Value-qb.Value) <= 1e-9*math.Max(math.Abs(qa.Value), math.Abs(qb.Value))
}

// isDefault reports whether the value at p is the schema's default, the
// design giving none.
func (c *validator) isDefault(p cue.Path) bool {
	_, d := c.root.LookupPath(p).Default()
	return d
}
