package propose

import (
	"fmt"
	"math"
	"slices"
	"sort"
	"strings"

	"github.com/ampwright/ampwright/checks"
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
	"github.com/ampwright/ampwright/schema/unit"
)

// completer fits a design's wiring to the currents its choice of bank,
// arrays and controllers gives: every conductor's size and cable, every
// protective device where the designer put one, every bus's part and the
// string fuses. A conductor gets the smallest standard size of its family
// that passes its own wiring checks (package checks decides, through
// SmallestPassingSize): a larger conductor never raises a drop, so every
// larger size passes too. A device, bus or fuse gets the cheapest catalog
// part that passes its checks. The checks of the completed design then
// say what else to change (a device's interrupting rating, a start
// through it, the drop along a whole path), and the completion raises
// that part until they pass or nothing larger is left.
type completer struct {
	rules  schema.Rulebook
	cat    *schema.Catalog
	base   *schema.Design // the designer's design
	cables []schema.Cable // the catalog's, cheapest by the metre first
	// devices are the catalog's fuses and breakers, cheapest (with their
	// holder) first; busbars the busbars and panels, cheapest first.
	devices []schema.Protection
	busbars []schema.Busbar
	cache   map[string]sized
	// std and from cache the standard sizes of a family and the sizes a
	// run may take from a given one; together the current each conductor
	// carries on each load's way, which depends on the loads alone.
	std      map[string][]unit.Size
	from     map[string][]sized
	together map[string]map[string]float64
	amp      map[string]float64
}

// sized is the size chosen for a run at given currents.
type sized struct {
	size  unit.Size
	cable *schema.Cable
	ok    bool // some size passes
}

func newCompleter(base *schema.Design, rules schema.Rulebook, cat *schema.Catalog) *completer {
	c := &completer{rules: rules, cat: cat, base: base, cache: map[string]sized{},
		std: map[string][]unit.Size{}, from: map[string][]sized{}, together: map[string]map[string]float64{}, amp: map[string]float64{}}
	for _, id := range schema.Names(cat.Cable) {
		c.cables = append(c.cables, cat.Cable[id])
	}
	sort.SliceStable(c.cables, func(i, j int) bool { return perMetre(c.cables[i]) < perMetre(c.cables[j]) })
	for _, id := range schema.Names(cat.Protection) {
		c.devices = append(c.devices, cat.Protection[id])
	}
	sort.SliceStable(c.devices, func(i, j int) bool {
		a, b := c.devices[i], c.devices[j]
		if devicePrice(a) != devicePrice(b) {
			return devicePrice(a) < devicePrice(b)
		}
		return a.Rating.Amps() < b.Rating.Amps()
	})
	for _, id := range schema.Names(cat.Busbar) {
		c.busbars = append(c.busbars, cat.Busbar[id])
	}
	sort.SliceStable(c.busbars, func(i, j int) bool {
		pi, _ := price(c.busbars[i].Part)
		pj, _ := price(c.busbars[j].Part)
		return pi < pj
	})
	return c
}

func perMetre(c schema.Cable) float64 {
	p, _ := price(c.Part)
	if l := c.SaleUnit.Metres(); l > 0 {
		return p / l
	}
	return p
}

// minDevice is the cheapest device's price, with its holder.
func (c *completer) minDevice() float64 {
	least := math.Inf(1)
	for _, d := range c.devices {
		least = math.Min(least, devicePrice(d))
	}
	return least
}

// devicePrice is a device's price with its holder's: a run buys both.
func devicePrice(d schema.Protection) float64 {
	p, _ := price(d.Part)
	if d.Holder != nil {
		h, _ := price(*d.Holder)
		p += h
	}
	return p
}

// cloneWiring copies the parts of spec the completion changes, so that the
// designer's design and other candidates are left as they were.
func cloneWiring(spec *schema.Design) *schema.Design {
	s := *spec
	s.Wiring = make(map[string]schema.Conductor, len(spec.Wiring))
	for k, v := range spec.Wiring {
		s.Wiring[k] = v
	}
	if spec.Negative != nil {
		n := *spec.Negative
		n.Wiring = make(map[string]schema.Conductor, len(spec.Negative.Wiring))
		for k, v := range spec.Negative.Wiring {
			n.Wiring[k] = v
		}
		n.Buses = make(map[string]schema.NegativeBus, len(spec.Negative.Buses))
		for k, v := range spec.Negative.Buses {
			n.Buses[k] = v
		}
		s.Negative = &n
	}
	s.Buses = make(map[string]schema.Bus, len(spec.Buses))
	for k, v := range spec.Buses {
		s.Buses[k] = v
	}
	s.Arrays = make(map[string]schema.Array, len(spec.Arrays))
	for k, v := range spec.Arrays {
		s.Arrays[k] = v
	}
	return &s
}

// conductor returns a pointer to run name's conductor in spec (positive or
// negative), or nil.
func conductor(spec *schema.Design, name string) (schema.Conductor, func(schema.Conductor), bool) {
	if c, ok := spec.Wiring[name]; ok {
		return c, func(x schema.Conductor) { spec.Wiring[name] = x }, true
	}
	if spec.Negative != nil {
		if c, ok := spec.Negative.Wiring[name]; ok {
			return c, func(x schema.Conductor) { spec.Negative.Wiring[name] = x }, true
		}
	}
	return schema.Conductor{}, nil, false
}

// standardSizes are the standard sizes of a family, thin to thick, as the
// wiring checks offer them: every AWG gauge, and the metric sizes the
// rulebook's resistance table gives.
func (c *completer) standardSizes(like unit.Size) []unit.Size {
	fam := like.Family()
	if out, ok := c.std[fam]; ok {
		return out
	}
	out := model.StandardSizes(c.rules.Resistance.Metric.Plain, like)
	c.std[fam] = out
	return out
}

func sameSize(a, b unit.Size) bool {
	return math.Abs(a.MM2()-b.MM2()) <= 1e-6*math.Max(1, b.MM2())
}

// cableFor is the catalog cable of a size for a run cut from catalog
// cable like the designer's: of its insulation and material, in its colour
// where the catalog has it, else the cheapest by the metre.
func (c *completer) cableFor(size unit.Size, like *schema.Cable, insulation unit.Temperature, material string) *schema.Cable {
	var best *schema.Cable
	for i := range c.cables {
		cb := &c.cables[i]
		if !sameSize(cb.Size, size) || math.Abs(cb.Insulation.Celsius()-insulation.Celsius()) > 1e-9 || cb.Material != material {
			continue
		}
		if like != nil && cb.Colour == like.Colour && cb.Colour != "" {
			return cb
		}
		if best == nil {
			best = cb
		}
	}
	return best
}

// sizes are the standard sizes a run may take from its smallest passing
// one up: only those the catalog sells, for a run cut from catalog cable.
func (c *completer) sizesFrom(r *model.Run, from unit.Size, designer *schema.Conductor) []sized {
	key := fmt.Sprintf("%s\x00%s\x00%.6g", r.Name, r.Spec.Size.Family(), from.MM2())
	if out, ok := c.from[key]; ok {
		return out
	}
	out := c.listFrom(r, from, designer)
	c.from[key] = out
	return out
}

func (c *completer) listFrom(r *model.Run, from unit.Size, designer *schema.Conductor) []sized {
	var out []sized
	for _, s := range c.standardSizes(r.Spec.Size) {
		if s.MM2() < from.MM2()*(1-1e-9) {
			continue
		}
		z := sized{size: s, ok: true}
		if designer != nil && designer.Cable != nil {
			z.cable = c.cableFor(s, designer.Cable, r.Spec.Insulation, r.Spec.Material)
			if z.cable == nil {
				continue
			}
		}
		out = append(out, z)
	}
	return out
}

// designerRun is the designer's conductor of a run.
func (c *completer) designerRun(name string) *schema.Conductor {
	if x, _, ok := conductor(c.base, name); ok {
		return &x
	}
	return nil
}

// smallest is the size a run takes at its present currents: the smallest
// standard size, sold in the catalog where the run is cut from catalog
// cable, that passes the run's wiring checks.
func (c *completer) smallest(in *checks.Input, r *model.Run) sized {
	key := runKey(r)
	if z, ok := c.cache[key]; ok {
		return z
	}
	std := c.standardSizes(r.Spec.Size)
	z := sized{size: r.Spec.Size, cable: r.Spec.Cable}
	if len(std) > 0 {
		orig := r.Spec.Size
		r.Spec.Size = std[0]
		s, _, ok := checks.SmallestPassingSize(in, r)
		r.Spec.Size = orig
		if ok {
			if opts := c.sizesFrom(r, s, c.designerRun(r.Name)); len(opts) > 0 {
				z = opts[0]
			}
		}
	}
	if z.ok {
		c.cache[key] = z
	}
	return z
}

// runKey is what a run's size depends on besides the design's fixed
// values: its currents, class and voltage, and the conductor its return
// travels on.
func runKey(r *model.Run) string {
	k := fmt.Sprintf("%s|%.9g|%.9g|%.9g|%s|%.9g|%s", r.Name, r.Current, r.DropCurrent, r.DropVoltage, r.Class, r.Volts, r.Role)
	if v := r.Ret.Via; v != nil {
		k += fmt.Sprintf("|%s %.9g %.9g", v.Spec.Size.Text, v.Current, v.DropCurrent)
	}
	return k
}

// setSize puts size z on run name in spec, and on its model run.
func setSize(spec *schema.Design, r *model.Run, z sized) {
	cd, put, ok := conductor(spec, r.Name)
	if !ok {
		return
	}
	cd.Size = z.size
	cd.Cable = z.cable
	put(cd)
	r.Spec.Size, r.Spec.Cable = z.size, z.cable
	// A return of no size of its own is of the run's, as the model
	// builds it.
	if r.Role != model.Return && (r.Spec.Return == nil || r.Spec.Return.Size == nil) {
		r.Ret.Size = z.size
	}
}

// busFloor is the least the bus parts can cost: the cheapest of each
// bus's family.
func (c *completer) busFloor(sys *model.System) float64 {
	var total float64
	for _, b := range sys.Buses {
		if b.Spec.Part == nil {
			continue
		}
		for _, p := range c.busbars {
			if busFamily(b.Spec.Kind, c.base.Buses[b.Name].Part, p) {
				pr, _ := price(p.Part)
				total += pr
				break
			}
		}
	}
	for _, b := range sys.NegativeBuses {
		if b.Spec.Part == nil {
			continue
		}
		for _, p := range c.busbars {
			if busFamily("negative", b.Spec.Part, p) {
				pr, _ := price(p.Part)
				total += pr
				break
			}
		}
	}
	return total
}

// floor is the least any completion of the design can cost: a device on
// each run the designer protects, at the cheapest device's price; a part
// on each bus, at the cheapest of its family; and each run's conductors
// at the cheapest catalog cable of its family by the metre (the bill of
// materials buys whole sale units, never less). Added to the chosen
// parts' prices it keeps the search's lower bound a lower bound.
func (c *completer) floor(sys *model.System) float64 {
	minDevice := math.Inf(1)
	for _, d := range c.devices {
		minDevice = math.Min(minDevice, devicePrice(d))
	}
	slack := 0.0
	if c.rules.BOM != nil {
		slack = c.rules.BOM.Slack
	}
	var total float64
	for _, r := range append(sys.Runs[:len(sys.Runs):len(sys.Runs)], sys.Returns...) {
		if r.Spec.Protection != nil && !math.IsInf(minDevice, 1) {
			total += minDevice
		}
		if r.Spec.Cable == nil {
			continue
		}
		cheapest := math.Inf(1)
		for _, cb := range c.cables {
			if cb.Size.Family() == r.Spec.Size.Family() && cb.Material == r.Spec.Material &&
				math.Abs(cb.Insulation.Celsius()-r.Spec.Insulation.Celsius()) <= 1e-9 {
				cheapest = math.Min(cheapest, perMetre(cb))
			}
		}
		if math.IsInf(cheapest, 1) {
			continue
		}
		length := r.Spec.Length.Metres()
		if r.Role != model.Return && r.Ret.Own && sameSize(r.Ret.Size, r.Spec.Size) {
			length += r.Ret.Length
		}
		total += cheapest * length * (1 + slack)
	}
	total += c.busFloor(sys)
	// Rounded down to the cent, so that it never exceeds what the bill of
	// materials, rounding each line to the cent, totals.
	return math.Floor(total*100) / 100
}

// bound is the least the completion of a lightly sized design can cost,
// its chosen and fixed parts aside. A run the designer protects takes a
// device of at least its current that breaks the fault current the
// Interrupting check finds at the light sizes (the least it can be: larger
// conductors only lower the resistance ahead of it), on a conductor large
// enough for that device's rating; every run's conductors cost at least
// the cheapest cable by the metre of the sizes it may take; the buses at
// least their floor. It is +Inf when no device fits a run at any size:
// the completion cannot succeed.
func (c *completer) bound(sys *model.System, busFloor float64) float64 {
	slack := 0.0
	if c.rules.BOM != nil {
		slack = c.rules.BOM.Slack
	}
	fault := map[string]float64{}
	_, figs := checks.RunAll([]*checks.Check{checks.Interrupting}, checks.NewInput(sys, nil, nil))
	for _, f := range figs {
		if f.ID == result.FigFaultCurrent {
			fault[f.Subject] = f.Value
		}
	}
	total := busFloor
	for _, r := range append(sys.Runs[:len(sys.Runs):len(sys.Runs)], sys.Returns...) {
		length := r.Spec.Length.Metres()
		if r.Role != model.Return && r.Ret.Own && sameSize(r.Ret.Size, r.Spec.Size) {
			length += r.Ret.Length
		}
		opts := c.sizesFrom(r, r.Spec.Size, c.designerRun(r.Name))
		if len(opts) == 0 {
			continue
		}
		least := math.Inf(1)
		for _, z := range opts {
			cable := cablePerMetre(z) * length * (1 + slack)
			if r.Spec.Protection == nil {
				least = math.Min(least, cable)
				continue
			}
			hi := c.rules.Protection.Ratio * c.ampacity(sys, r, z.size)
			for _, d := range c.devices {
				rt := d.Rating.Amps()
				// fault is rounded to a tenth by the figure: a tenth off.
				if rt >= r.Current-1e-9 && rt <= hi+1e-9 && d.Interrupting.Amps() >= fault[r.Name]-0.1 {
					least = math.Min(least, cable+devicePrice(d))
				}
			}
		}
		if math.IsInf(least, 1) {
			if r.Spec.Protection != nil {
				return math.Inf(1)
			}
			continue
		}
		total += least
	}
	return math.Floor(total*100) / 100
}

// ampacity is run r's derated ampacity at size, which depends on the run
// as the design gives it (insulation, engine space, bundling) alone: kept
// across candidates.
func (c *completer) ampacity(sys *model.System, r *model.Run, size unit.Size) float64 {
	key := r.Name + "\x00" + size.Text
	if a, ok := c.amp[key]; ok {
		return a
	}
	a := sys.RunAmpacity(r, size).Derated
	c.amp[key] = a
	return a
}

// light sizes every conductor of spec at its currents and fits the string
// fuses: the wiring the search decides the energy checks on.
func (c *completer) light(spec *schema.Design) (*schema.Design, *model.System, error) {
	out := cloneWiring(spec)
	sys, issues := model.Build(out, c.rules)
	if len(issues) > 0 {
		return nil, nil, fmt.Errorf("%s: %s", issues[0].Path, issues[0].Msg)
	}
	in := checks.NewInput(sys, nil, nil)
	// The negative conductors first: a run whose return travels on one
	// has that conductor's drop in its own.
	for _, r := range sys.Returns {
		setSize(out, r, c.smallest(in, r))
	}
	for _, r := range sys.Runs {
		z := c.smallest(in, r)
		// A run whose return travels on a negative conductor too thin for
		// its drop passes once that conductor is larger.
		for v := r.Ret.Via; !z.ok && v != nil; {
			next, ok := c.larger(v)
			if !ok {
				break
			}
			setSize(out, v, next)
			z = c.smallest(in, r)
		}
		setSize(out, r, z)
	}
	c.stringFuses(out, nil)
	for _, a := range sys.Arrays {
		a.Spec.StringFuse = out.Arrays[a.Name].StringFuse
	}
	return out, sys, nil
}

// larger is the next standard size above run r's present one that the
// catalog sells (for a run cut from catalog cable).
func (c *completer) larger(r *model.Run) (sized, bool) {
	for _, z := range c.sizesFrom(r, r.Spec.Size, c.designerRun(r.Name)) {
		if z.size.MM2() > r.Spec.Size.MM2()*(1+1e-9) {
			return z, true
		}
	}
	return sized{}, false
}

// floors are what a part must at least have: raised by the checks a
// completed design fails.
type floors struct {
	rating, interrupting, voltage float64
	ways                          int
}

// stringFuses fits each array the string fuses it needs: the cheapest
// catalog fuse within the rulebook's bounds of its strings' Isc and the
// module's series fuse rating (IEC 62548), at least the voltage floor
// given; and none where the strings cannot back-feed a fault beyond the
// module's rating. An array that needs fuses none fits keeps none: the
// pv.stringFuse check then fails.
func (c *completer) stringFuses(spec *schema.Design, fl map[string]floors) {
	pv := c.rules.PV
	for _, name := range schema.Names(spec.Arrays) {
		a := spec.Arrays[name]
		isc := a.Module.Isc.Amps()
		if float64(a.Strings-1)*isc <= a.Module.MaxSeriesFuse.Amps() {
			a.StringFuse = nil
			spec.Arrays[name] = a
			continue
		}
		lo, hi := pv.FuseMin*isc, math.Min(pv.FuseMax*isc, a.Module.MaxSeriesFuse.Amps())
		var pick *schema.Protection
		for _, tier := range c.deviceTiers(a.StringFuse, "fuse") {
			for i := range c.devices {
				d := c.devices[i]
				if !tier(d) || d.Kind != "fuse" || d.Rating.Amps() < lo-1e-9 || d.Rating.Amps() > hi+1e-9 {
					continue
				}
				if v := fl[name].voltage; v > 0 && (d.Voltage == nil || d.Voltage.Volts() < v-1e-9) {
					continue
				}
				pick = &d
				break
			}
			if pick != nil {
				break
			}
		}
		if pick != nil {
			pick.Distance, pick.Sheathed = nil, false
			if a.StringFuse != nil {
				pick.Distance, pick.Sheathed = a.StringFuse.Distance, a.StringFuse.Sheathed
			}
		}
		a.StringFuse = pick
		spec.Arrays[name] = a
	}
}

// deviceTiers are the devices a fitted one may be replaced by, in order of
// preference: of its kind and style, of its kind, any. A panel of breakers
// keeps breakers; a terminal fuse stays a terminal fuse where one fits.
func (c *completer) deviceTiers(like *schema.Protection, kind string) []func(schema.Protection) bool {
	if like == nil {
		return []func(schema.Protection) bool{
			func(d schema.Protection) bool { return kind == "" || d.Kind == kind },
			func(schema.Protection) bool { return true },
		}
	}
	return []func(schema.Protection) bool{
		func(d schema.Protection) bool { return d.Kind == like.Kind && d.Style == like.Style },
		func(d schema.Protection) bool { return d.Kind == like.Kind },
		func(schema.Protection) bool { return true },
	}
}

// device is the cheapest catalog device for run r at its present size,
// within the rating window of the protection checks (at least the run's
// design current, at most the rulebook's ratio × its derated ampacity)
// and the floors; ok is false when none is.
func (c *completer) device(sys *model.System, r *model.Run, like *schema.Protection, fl floors) (schema.Protection, bool) {
	a := sys.RunAmpacity(r, r.Spec.Size)
	lo := math.Max(r.Current, fl.rating)
	hi := c.rules.Protection.Ratio * a.Derated
	for _, tier := range c.deviceTiers(like, "") {
		for _, d := range c.devices {
			if !tier(d) {
				continue
			}
			rt := d.Rating.Amps()
			if rt < lo-1e-9 || rt > hi+1e-9 || d.Interrupting.Amps() < fl.interrupting-1e-9 {
				continue
			}
			if fl.voltage > 0 && (d.Voltage == nil || d.Voltage.Volts() < fl.voltage-1e-9) {
				continue
			}
			d.Distance, d.Sheathed = like.Distance, like.Sheathed
			return d, true
		}
	}
	return schema.Protection{}, false
}

// busFamily reports whether catalog part p may serve as the part of a bus
// of kind ("negative" for a negative bus), whose designer fitted like.
// Where the catalog gives its parts' kinds, a part of the bus's kind or of
// the designer's part's; else by shape: a panel or fuse block takes a part
// with ways, a switch a part of the designer's studs and no ways, a
// busbar a part without ways that is not a two-stud switch.
func busFamily(kind string, like *schema.Busbar, p schema.Busbar) bool {
	if kind == "negative" {
		kind = "negative-bus"
	}
	if p.Kind != "" || (like != nil && like.Kind != "") {
		return p.Kind == kind || (like != nil && like.Kind != "" && p.Kind == like.Kind)
	}
	switch kind {
	case "panel", "fuse-block":
		return p.Ways > 0
	case "switch":
		return p.Ways == 0 && like != nil && p.Studs == like.Studs
	}
	return p.Ways == 0 && p.Studs != 2
}

// bus is the cheapest catalog part of the bus's family above the floors.
func (c *completer) bus(kind string, like *schema.Busbar, fl floors) (*schema.Busbar, bool) {
	for _, p := range c.busbars {
		if !busFamily(kind, like, p) {
			continue
		}
		if fl.rating > 0 && (p.Rating == nil || p.Rating.Amps() < fl.rating-1e-9) {
			continue
		}
		if fl.ways > 0 && p.Ways < fl.ways {
			continue
		}
		if fl.voltage > 0 && (p.Voltage == nil || p.Voltage.Volts() < fl.voltage-1e-9) {
			continue
		}
		return &p, true
	}
	return nil, false
}

// completionChecks are the checks the completion answers: those of the
// wiring, the devices, the buses and the string fuses.
var completionChecks = []*checks.Check{
	checks.VoltageDrop, checks.Ampacity, checks.MinimumSize, checks.Protected, checks.Rating,
	checks.Interrupting, checks.StringFuse, checks.ProtectionSurge, checks.VoltageRating,
	checks.BusCurrent, checks.BusWays, checks.InverterDC, checks.TotalDrop,
}

// roundChecks are the completion checks a round runs; wiring.totalDrop,
// the costly one, is answered by the drop repair (repairDrops) between
// rounds, and the whole design is checked at the end.
var roundChecks = completionChecks[:len(completionChecks)-1]

// maxRounds bounds the completion's rounds: each raises a part, so it ends
// well before on any real design.
const maxRounds = 200

// state is a completion in progress: how far each run is raised above its
// smallest passing size, and the floors of each part.
type state struct {
	start  map[string]unit.Size // run → its size after light
	bumps  map[string]int       // run → sizes above start
	dev    map[string]floors    // run → its device's floors
	busFl  map[string]floors    // bus path → its part's floors
	fuseFl map[string]floors    // array → its string fuses' floors
	// noBus are the buses no catalog part of their kind fits, this round.
	noBus []string
}

// full completes spec, which light has sized: devices, buses and fuses,
// then whatever the completion checks still fail. It returns the completed
// design, its model, and the completion checks' findings that still fail
// (none when it succeeded).
func (c *completer) full(spec *schema.Design, sys0 *model.System) (*schema.Design, *model.System, []result.Finding, error) {
	out := cloneWiring(spec)
	st := &state{start: map[string]unit.Size{}, bumps: map[string]int{}, dev: map[string]floors{}, busFl: map[string]floors{}, fuseFl: map[string]floors{}}
	for k, v := range out.Wiring {
		st.start[k] = v.Size
	}
	if out.Negative != nil {
		for k, v := range out.Negative.Wiring {
			st.start[k] = v.Size
		}
	}
	var last []result.Finding
	for round := 0; round < maxRounds; round++ {
		// Sizes, devices and parts do not change the model's currents:
		// each round resets them on the same model.
		sys := sys0
		if sys == nil {
			var issues []model.Issue
			if sys, issues = model.Build(out, c.rules); len(issues) > 0 {
				return nil, nil, nil, fmt.Errorf("%s: %s", issues[0].Path, issues[0].Msg)
			}
			sys0 = sys
		}
		st.noBus = nil
		noDevice := c.fit(out, sys, st)
		in := checks.NewInput(sys, nil, nil)
		findings, _ := checks.RunAll(roundChecks, in)
		last = c.reword(sys, st, failing(findings))
		if len(last) == 0 && len(noDevice) == 0 {
			changed, rest := c.repairDrops(out, sys, in, st)
			switch {
			case len(rest) > 0 && !changed:
				return out, sys, rest, nil
			case changed:
				continue
			}
			return out, sys, nil, nil
		}
		if !c.raise(sys, st, last, noDevice) {
			return out, sys, last, nil
		}
	}
	return out, nil, last, nil
}

// fit puts on spec (and on its model sys) each run's size, each device,
// bus part and string fuse the state asks for. It returns the runs for
// which no device fits at their present size.
func (c *completer) fit(out *schema.Design, sys *model.System, st *state) []string {
	for _, r := range append(sys.Runs[:len(sys.Runs):len(sys.Runs)], sys.Returns...) {
		opts := c.sizesFrom(r, st.start[r.Name], c.designerRun(r.Name))
		if len(opts) == 0 {
			continue
		}
		setSize(out, r, opts[min(st.bumps[r.Name], len(opts)-1)])
	}
	var noDevice []string
	for _, r := range sys.Runs {
		if r.Spec.Protection == nil {
			continue
		}
		likeDev := r.Spec.Protection
		if like := c.designerRun(r.Name); like != nil && like.Protection != nil {
			likeDev = like.Protection
		}
		d, ok := c.device(sys, r, likeDev, st.dev[r.Name])
		// No device fits the window at this size: a larger conductor
		// widens it.
		for opts := c.sizesFrom(r, st.start[r.Name], c.designerRun(r.Name)); !ok && st.bumps[r.Name]+1 < len(opts); {
			st.bumps[r.Name]++
			setSize(out, r, opts[st.bumps[r.Name]])
			d, ok = c.device(sys, r, likeDev, st.dev[r.Name])
		}
		if !ok {
			noDevice = append(noDevice, r.Name)
			continue
		}
		cd, put, _ := conductor(out, r.Name)
		cd.Protection = &d
		put(cd)
		r.Spec.Protection = &d
	}
	for _, b := range sys.Buses {
		if b.Spec.Part == nil {
			continue
		}
		if p, ok := c.bus(b.Spec.Kind, c.base.Buses[b.Name].Part, st.busFl[b.Path]); ok {
			bs := out.Buses[b.Name]
			bs.Part = p
			out.Buses[b.Name] = bs
			b.Spec.Part = p
		} else {
			st.noBus = append(st.noBus, b.Path)
		}
	}
	for _, b := range sys.NegativeBuses {
		if b.Spec.Part == nil {
			continue
		}
		var like *schema.Busbar
		if c.base.Negative != nil {
			like = c.base.Negative.Buses[b.Name].Part
		}
		if p, ok := c.bus("negative", like, st.busFl[b.Path]); ok {
			nb := out.Negative.Buses[b.Name]
			nb.Part = p
			out.Negative.Buses[b.Name] = nb
			b.Spec.Part = p
		} else {
			st.noBus = append(st.noBus, b.Path)
		}
	}
	c.stringFuses(out, st.fuseFl)
	for _, a := range sys.Arrays {
		a.Spec.StringFuse = out.Arrays[a.Name].StringFuse
	}
	return noDevice
}

// reword says of a bus that no catalog part of its kind fits what it
// needs, rather than what its last part lacked.
func (c *completer) reword(sys *model.System, st *state, fs []result.Finding) []result.Finding {
	if len(st.noBus) == 0 {
		return fs
	}
	for i, f := range fs {
		p := busPath(sys, f.Subject)
		if !slices.Contains(st.noBus, p) || (f.ID != result.CheckBusWays && f.ID != result.CheckBusCurrent) {
			continue
		}
		kind := "negative bus"
		for _, b := range sys.Buses {
			if b.Path == p {
				kind = b.Spec.Kind
			}
		}
		fl := st.busFl[p]
		var needs []string
		if fl.ways > 0 {
			needs = append(needs, fmt.Sprintf("at least %d ways", fl.ways))
		}
		if fl.rating > 0 {
			needs = append(needs, fmt.Sprintf("a rating of at least %.4g A", fl.rating))
		}
		if fl.voltage > 0 {
			needs = append(needs, fmt.Sprintf("a voltage rating of at least %.4g V", fl.voltage))
		}
		f.Message = fmt.Sprintf("no %s in the catalog has %s", kind, strings.Join(needs, " and "))
		f.Change = fmt.Sprintf("a %s of %s in the catalog, or the circuits split over two", kind, strings.Join(needs, " and "))
		fs[i] = f
	}
	return fs
}

// raise answers a round's failures: a larger conductor, a device, bus or
// fuse with a higher floor. It reports whether it changed anything.
func (c *completer) raise(sys *model.System, st *state, last []result.Finding, noDevice []string) bool {
	changed := false
	bumped := map[string]bool{}
	bump := func(name string) {
		r := sys.Run(name)
		if r == nil || bumped[name] {
			return
		}
		if n := len(c.sizesFrom(r, st.start[name], c.designerRun(name))); st.bumps[name]+1 < n {
			st.bumps[name]++
			bumped[name] = true
			changed = true
		}
	}
	raise := func(m map[string]floors, key string, f func(*floors) bool) {
		fl := m[key]
		if f(&fl) {
			m[key] = fl
			changed = true
		}
	}
	for _, name := range noDevice {
		bump(name)
	}
	for _, f := range last {
		switch f.ID {
		case result.CheckVoltageDrop:
			// The larger loss of the run's own conductor and the negative
			// conductor its return travels on.
			r := sys.Run(f.Subject)
			if r != nil && r.Ret.Via != nil {
				d := sys.RunDrop(r, r.Spec.Size)
				if d.RetCurrent*d.RetLength*d.RetRes.RT > r.DropCurrent*r.Spec.Length.Metres()*d.Res.RT {
					bump(r.Ret.Via.Name)
					continue
				}
			}
			bump(f.Subject)
		case result.CheckProtected:
			// The device upstream must be at most the ratio of this run's
			// ampacity: the smallest size that carries it.
			r := sys.Run(f.Subject)
			up := r
			for up != nil && up.Spec.Protection == nil {
				up = up.Parent
			}
			if r == nil || up == nil || up == r {
				bump(f.Subject)
				continue
			}
			need := up.Spec.Protection.Rating.Amps() / c.rules.Protection.Ratio
			opts := c.sizesFrom(r, st.start[r.Name], c.designerRun(r.Name))
			for i := st.bumps[r.Name] + 1; i < len(opts); i++ {
				if a := sys.RunAmpacity(r, opts[i].size); a.OK && a.Derated >= need-1e-9 {
					st.bumps[r.Name] = i
					bumped[r.Name], changed = true, true
					break
				}
			}
			bump(f.Subject)
		case result.CheckAmpacity, result.CheckMinimumSize:
			bump(f.Subject)
		case result.CheckRating:
			r := sys.Run(f.Subject)
			if r != nil && r.Spec.Protection != nil && r.Spec.Protection.Rating.Amps() < r.Current {
				raise(st.dev, f.Subject, func(fl *floors) bool { return setMax(&fl.rating, r.Current) })
			} else {
				bump(f.Subject)
			}
		case result.CheckInterrupting:
			raise(st.dev, f.Subject, func(fl *floors) bool { return setMax(&fl.interrupting, f.Value+1) })
		case result.CheckProtectionSurge:
			// A rating that carries the start as long as it lasts: the
			// present one scaled by how far the start exceeds what it
			// carries (the curves of a kind scale with the rating).
			r := sys.Run(f.Subject)
			if r != nil && r.Spec.Protection != nil && f.Limit > 0 {
				need := math.Max(r.Spec.Protection.Rating.Amps()*f.Value/f.Limit, r.Spec.Protection.Rating.Amps()+1e-6)
				raise(st.dev, f.Subject, func(fl *floors) bool { return setMax(&fl.rating, need) })
			}
		case result.CheckVoltageRating:
			switch {
			case sys.Run(f.Subject) != nil:
				raise(st.dev, f.Subject, func(fl *floors) bool { return setMax(&fl.voltage, f.Value) })
			case isArray(sys, f.Subject):
				raise(st.fuseFl, f.Subject, func(fl *floors) bool { return setMax(&fl.voltage, f.Value) })
			default:
				if p := busPath(sys, f.Subject); p != "" {
					raise(st.busFl, p, func(fl *floors) bool { return setMax(&fl.voltage, f.Value) })
				}
			}
		case result.CheckBusCurrent:
			if p := busPath(sys, f.Subject); p != "" {
				raise(st.busFl, p, func(fl *floors) bool { return setMax(&fl.rating, f.Value) })
			}
		case result.CheckBusWays:
			if p := busPath(sys, f.Subject); p != "" {
				raise(st.busFl, p, func(fl *floors) bool {
					if int(f.Value) > fl.ways {
						fl.ways = int(f.Value)
						return true
					}
					return false
				})
			}
		case result.CheckInverterDC:
			for _, inv := range sys.Inverters {
				if inv.Name != f.Subject || inv.Node.In == nil {
					continue
				}
				r := inv.Node.In
				if a := sys.RunAmpacity(r, r.Spec.Size); !a.OK || a.Derated < f.Value {
					bump(r.Name)
				}
				d := r
				for d != nil && d.Spec.Protection == nil {
					d = d.Parent
				}
				if d != nil && d.Spec.Protection.Rating.Amps() < f.Value {
					raise(st.dev, d.Name, func(fl *floors) bool { return setMax(&fl.rating, f.Value) })
				}
			}
		}
	}
	return changed
}

// loadDrop is a DC load's drop from its bank and back, as wiring.totalDrop
// finds it.
type loadDrop struct {
	load       *model.Load
	pct, limit float64
	terms      []model.DropTerm
}

// drops are the loads whose whole path loses more than their class allows:
// wiring.totalDrop's verdicts, at the currents checks.Together gives, kept
// across rounds and candidates (they do not depend on sizes).
func (c *completer) drops(sys *model.System, in *checks.Input) []loadDrop {
	var out []loadDrop
	for _, l := range sys.Loads {
		r := l.Circuit
		if r == nil || r.DropVoltage <= 0 {
			continue
		}
		memo := c.together[l.Name]
		if memo == nil {
			memo = map[string]float64{}
			c.together[l.Name] = memo
		}
		var tg func(*model.Run) float64
		cur := func(x *model.Run) float64 {
			if v, ok := memo[x.Name]; ok {
				return v
			}
			if tg == nil {
				tg = checks.Together(in, l)
			}
			v := tg(x)
			memo[x.Name] = v
			return v
		}
		v, terms := sys.PathDrop(r, cur)
		pct := v / r.DropVoltage * 100
		limit := model.DropLimit(c.rules, checks.LoadClass(in, l))
		if pct > limit+1e-9 {
			out = append(out, loadDrop{l, pct, limit, terms})
		}
	}
	return out
}

// excess is how far the failing loads' drops exceed their limits in all.
func excess(ds []loadDrop) float64 {
	var e float64
	for _, d := range ds {
		e += d.pct - d.limit
	}
	return e
}

// repairDrops makes conductors larger until every load's whole path is
// within its limit: each step enlarges the conductor that cuts the
// excess most for the cable it adds, then steps back down every conductor
// that no longer needs to be larger. It reports whether it changed a size,
// and the loads still beyond their limit, as wiring.totalDrop findings.
func (c *completer) repairDrops(out *schema.Design, sys *model.System, in *checks.Input, st *state) (bool, []result.Finding) {
	fails := c.drops(sys, in)
	if len(fails) == 0 {
		return false, nil
	}
	size := func(r *model.Run) []sized { return c.sizesFrom(r, st.start[r.Name], c.designerRun(r.Name)) }
	apply := func(r *model.Run) {
		opts := size(r)
		setSize(out, r, opts[min(st.bumps[r.Name], len(opts)-1)])
	}
	touched := map[string]int{} // run → its bumps before the repair
	for step := 0; step < maxRounds && len(fails) > 0; step++ {
		before := excess(fails)
		cands := map[string]*model.Run{}
		for _, d := range fails {
			for _, t := range d.terms {
				cands[t.Run.Name] = t.Run
			}
		}
		best, bestScore := "", 0.0
		for _, n := range schema.Names(cands) {
			r := cands[n]
			opts := size(r)
			if st.bumps[n]+1 >= len(opts) {
				continue
			}
			cur, next := opts[st.bumps[n]], opts[st.bumps[n]+1]
			st.bumps[n]++
			apply(r)
			gain := before - excess(c.drops(sys, in))
			st.bumps[n]--
			apply(r)
			cost := math.Max(1e-6, (cablePerMetre(next)-cablePerMetre(cur))*2*r.Spec.Length.Metres())
			if next.cable == nil {
				cost = math.Max(1e-6, (next.size.MM2()-cur.size.MM2())*r.Spec.Length.Metres())
			}
			if score := gain / cost; gain > 1e-12 && score > bestScore {
				best, bestScore = n, score
			}
		}
		if best == "" {
			break
		}
		if _, ok := touched[best]; !ok {
			touched[best] = st.bumps[best]
		}
		st.bumps[best]++
		apply(cands[best])
		fails = c.drops(sys, in)
	}
	// Step back down what the later steps made unnecessary.
	for again := true; again; {
		again = false
		for _, n := range schema.Names(touched) {
			if st.bumps[n] <= touched[n] {
				continue
			}
			r := sys.Run(n)
			st.bumps[n]--
			apply(r)
			if len(c.drops(sys, in)) == 0 {
				again = true
				continue
			}
			st.bumps[n]++
			apply(r)
		}
	}
	changed := false
	for n, b := range touched {
		if st.bumps[n] != b {
			changed = true
		}
	}
	var rest []result.Finding
	for _, d := range c.drops(sys, in) {
		rest = append(rest, result.Finding{
			ID: result.CheckTotalDrop, Subject: d.load.Name, Status: result.Fail, Value: d.pct, Limit: d.limit, Unit: "%",
			Message: fmt.Sprintf("%.2f %% from the bank and back with every conductor on the way at the largest size the catalog sells, against %g %%", d.pct, d.limit),
			Change:  "a feeder of its own, shorter runs, or a higher system voltage",
		})
	}
	return changed, rest
}

func cablePerMetre(z sized) float64 {
	if z.cable == nil {
		return 0
	}
	return perMetre(*z.cable)
}

func setMax(x *float64, v float64) bool {
	if v > *x+1e-9 {
		*x = v
		return true
	}
	return false
}

func isArray(sys *model.System, name string) bool {
	for _, a := range sys.Arrays {
		if a.Name == name {
			return true
		}
	}
	return false
}

// busPath is the CUE path of the positive or negative bus named name.
func busPath(sys *model.System, name string) string {
	for _, b := range sys.Buses {
		if b.Name == name {
			return b.Path
		}
	}
	for _, b := range sys.NegativeBuses {
		if b.Name == name {
			return b.Path
		}
	}
	return ""
}

// describeFails joins failing findings as "id subject: message".
func describeFails(fs []result.Finding) string {
	var out []string
	for _, f := range fs {
		out = append(out, fmt.Sprintf("%s %s: %s", f.ID, f.Subject, f.Message))
	}
	return strings.Join(out, "; ")
}
