package main

import (
	"math"
	"math/rand/v2"
	"slices"
)

// Hull returns the CUE source of hull i, a function of i alone.
func Hull(i int) []byte {
	h := newHull(i)
	h.build()
	return h.source()
}

// scenario is one way the boat is used; the three of a hull are at
// anchor, under way and a third (a day sail or a night in a marina).
type scenario struct {
	name, desc string
	engine     float64 // engine hours in a day
}

// load is one generated consumer.
type load struct {
	name, kind, note string
	panel            string // "nav", "dc", "bilge", "bank" (off the bank), "ac" (through the inverter)
	share            string // loads with the same panel and share key share a circuit
	amps, watts      float64
	qty              int
	duty             float64
	hours            [3]float64 // by scenario
	surge            float64
	lengthM          float64 // run length from its panel
	circuit          string
}

// current is the load's full draw, A, as ampwright reckons a run's current.
func (l *load) current(vsys float64) float64 {
	if l.amps > 0 {
		return l.amps * float64(l.qty)
	}
	return l.watts / vsys * float64(l.qty)
}

// run is one generated conductor run.
type run struct {
	name, from, to, note string
	lengthM              float64
	parent               *run
	cab                  cable
	dev                  *device
	distance             string // where the device sits; "" leaves it out
	engineSpace          bool
	// what it is sized for: the current for ampacity and protection, and
	// the current, voltage and limit (%) of its voltage drop.
	iAmp, iDrop, vDrop, limit float64
}

type array struct {
	name, ctrlName  string
	mod             module
	ctrl            controller
	series, strings int
	mount           string
	tilt            float64
	shading         float64
}

type charger struct {
	name, kind string
	out        float64
	hours      map[int]float64 // by scenario index; nil: the engine hours
}

// hull is one generated design, built up by build.
type hull struct {
	i   int
	rng *rand.Rand

	name, hullID, kind, system, family string
	client, designer, checker          string
	imperial, sail                     bool
	lengthM, vsys                      float64

	site     site
	wind     float64 // m/s
	scen     [3]scenario
	loads    []*load
	panels   []string // bus names, in order
	runs     []*run
	bank     bankOption
	batt     battery
	arrays   []array
	chargers []charger
	inverter bool
	// busTopology: a class T fuse feeds a battery bus, from which every
	// other run leaves; else they all leave the bank.
	busTopology bool
	invCircuit  string
	mainAmps    float64
	invHours    [3]float64
	autonomy    float64
	voyage      []leg
	start       string
}

type leg struct {
	scen int
	days int
}

func newHull(i int) *hull {
	return &hull{i: i, rng: rand.New(rand.NewPCG(uint64(i), 0x6b697474697761))}
}

// uniform is a random value in [lo, hi].
func (h *hull) uniform(lo, hi float64) float64 { return lo + (hi-lo)*h.rng.Float64() }

// chance is true with probability p.
func (h *hull) chance(p float64) bool { return h.rng.Float64() < p }

func pick[T any](h *hull, xs []T) T { return xs[h.rng.IntN(len(xs))] }

// round to a step: round(3.14159, 0.05) = 3.15.
func round(x, step float64) float64 { return math.Round(x/step) * step }

func (h *hull) build() {
	h.vessel()
	h.site = pick(h, sites)
	h.site.irr = slices.Clone(h.site.irr)
	for k := range h.site.irr {
		h.site.irr[k] = round(h.site.irr[k]*h.uniform(0.95, 1.05), 0.1)
	}
	h.wind = round(h.uniform(2, 6), 1)
	h.scenarios()
	h.makeLoads()
	h.circuits()
	h.chooseBank()
	h.solar()
	h.charging()
	h.wire()
	h.plan()
}

func (h *hull) vessel() {
	h.name = pick(h, nameFirst) + " " + pick(h, nameSecond)
	k := pick(h, kinds)
	h.kind, h.sail = k.kind, k.sail
	h.lengthM = round(h.uniform(k.lo, k.hi), 0.1)
	h.system = "12 V"
	if h.lengthM > 12 && h.chance(0.6) || h.chance(0.08) {
		h.system = "24 V"
	}
	h.vsys = 12
	if h.system == "24 V" {
		h.vsys = 24
	}
	h.family = "metric"
	if h.chance(0.5) {
		h.family = "awg"
		h.imperial = h.chance(0.4)
	}
	h.hullID = k.model + " " + fmtNum(math.Round(h.lengthM/0.3048), 1) + " hull no. " + fmtNum(float64(h.i), 1)
	h.client = pick(h, people) + " " + pick(h, surnames)
	k1 := h.rng.IntN(len(staff))
	k2 := (k1 + 1 + h.rng.IntN(len(staff)-1)) % len(staff)
	h.designer, h.checker = staff[k1], staff[k2]
}

func (h *hull) scenarios() {
	if h.sail {
		h.scen = [3]scenario{
			{"anchor", "at anchor or on a mooring, engine off", 0},
			{"passage", "coastal passage, day and night, mostly under sail", round(h.uniform(1, 4), 0.5)},
			{"daysail", "a day sail, back on the mooring for the night", 1},
		}
		return
	}
	h.scen = [3]scenario{
		{"anchor", "at anchor, engines off", 0},
		{"cruising", "a day under way between anchorages", round(h.uniform(4, 8), 0.5)},
		{"marina", "alongside, shore power not counted", 0},
	}
}

// makeLoads picks about 40 loads from the templates that suit the boat.
func (h *hull) makeLoads() {
	h.inverter = h.lengthM >= 10 && h.chance(0.6)
	cold := h.site.lat > 45
	var must, optional []tmpl
	for _, t := range templates {
		switch t.need {
		case "sail":
			if !h.sail {
				continue
			}
		case "motor":
			if h.sail {
				continue
			}
		case "big":
			if h.lengthM < 11 {
				continue
			}
		case "windlass":
			if h.lengthM < 9 {
				continue
			}
		case "cold":
			if !cold {
				continue
			}
		case "inverter":
			if !h.inverter {
				continue
			}
		}
		if t.must {
			must = append(must, t)
		} else {
			optional = append(optional, t)
		}
	}
	h.rng.Shuffle(len(optional), func(a, b int) { optional[a], optional[b] = optional[b], optional[a] })
	target := 38 + h.rng.IntN(5)
	chosen := must
	for _, t := range optional {
		if len(chosen) >= target {
			break
		}
		chosen = append(chosen, t)
	}
	// Sort back into template order, so the file reads by area.
	order := map[string]int{}
	for k, t := range templates {
		order[t.name] = k
	}
	slices.SortFunc(chosen, func(a, b tmpl) int { return order[a.name] - order[b.name] })
	for n := 1; len(chosen) < target; n++ {
		extra := extraLights
		extra.name = "spot-lights-" + fmtNum(float64(n), 1)
		chosen = append(chosen, extra)
	}
	hasBilgePanel := h.lengthM >= 12
	for _, t := range chosen {
		l := &load{name: t.name, kind: t.kind, note: t.note, panel: t.panel, share: t.share, qty: 1, duty: 1}
		if l.panel == "bilge" && !hasBilgePanel {
			l.panel = "dc"
		}
		if l.panel == "ac" && !h.inverter {
			l.panel = "dc"
		}
		scale := 1.0
		if h.vsys == 24 && t.amps[1] > 0 {
			scale = 0.5 // the same motor at 24 V draws half the current
		}
		if t.amps[1] > 0 {
			l.amps = round(h.uniform(t.amps[0], t.amps[1])*scale, 0.1)
		} else {
			step := 1.0
			if t.watts[1] < 10 {
				step = 0.5
			}
			if t.watts[1] > 200 {
				step = 50
			}
			l.watts = round(h.uniform(t.watts[0], t.watts[1]), step)
		}
		if t.qty[1] > 1 {
			l.qty = t.qty[0] + h.rng.IntN(t.qty[1]-t.qty[0]+1)
		}
		if t.duty[1] > 0 {
			l.duty = round(h.uniform(t.duty[0], t.duty[1]), 0.05)
		}
		if t.surge > 0 {
			l.surge = round(l.amps*t.surge, 5)
		}
		for s := range 3 {
			base := t.hours[s]
			if base < 0 { // the engine's hours
				base = h.scen[s].engine
			}
			if base == 24 || base == 0 {
				l.hours[s] = base
				continue
			}
			hr := base * h.uniform(0.8, 1.2)
			if hr >= 1 {
				hr = round(hr, 0.5)
			} else {
				hr = math.Max(round(hr, 0.01), 0.01)
			}
			l.hours[s] = math.Min(hr, 24)
		}
		reach := h.uniform(t.reach[0], t.reach[1])
		if !h.sail && t.reach[1] > 1.1 { // no mast: the light is on the arch
			reach = h.uniform(0.5, 0.8)
		}
		l.lengthM = reach*h.lengthM + h.uniform(0.5, 1.5)
		h.loads = append(h.loads, l)
	}
}

// circuits groups the loads on circuits and names the buses.
func (h *hull) circuits() {
	h.panels = nil
	for _, p := range []string{"nav", "dc", "bilge"} {
		for _, l := range h.loads {
			if l.panel == p {
				h.panels = append(h.panels, p)
				break
			}
		}
	}
	for _, l := range h.loads {
		switch l.panel {
		case "ac":
			continue
		case "bank":
			l.circuit = "bank-" + l.name
		default:
			key := l.share
			if key == "" {
				key = l.name
			}
			l.circuit = panelPrefix[l.panel] + "-" + key
		}
	}
}

var panelPrefix = map[string]string{"nav": "nav", "dc": "dc", "bilge": "bp"}
var panelBus = map[string]string{"nav": "nav-panel", "dc": "dc-panel", "bilge": "bilge-panel"}
var panelPart = map[string]string{"nav": "panel-8", "dc": "panel-12", "bilge": "panel-4"}

// energy is the energy drawn from the bank in a day of scenario s, Wh, as
// ampwright's budget reckons it.
func (h *hull) energy(s int) float64 {
	inv := inverter[h.system]
	var wh float64
	for _, l := range h.loads {
		w := l.current(h.vsys) * h.vsys
		if l.panel == "ac" {
			w /= inv.eff
		}
		wh += w * l.hours[s] * l.duty
	}
	if h.inverter {
		wh += inv.idle * h.invHours[s]
	}
	return wh
}

func (h *hull) usable(b bankOption) float64 {
	bt := batteries[b.battery]
	return bt.volts * float64(b.series) * bt.ah * float64(b.parallel) * bt.dod * 0.8
}

// chooseBank takes the smallest bank of the chosen chemistry that carries
// the days of autonomy the owner asks for at anchor, or the largest.
func (h *hull) chooseBank() {
	if h.inverter {
		for s := range 3 {
			var on float64
			for _, l := range h.loads {
				if l.panel == "ac" {
					on += l.hours[s]
				}
			}
			if on > 0 {
				h.invHours[s] = math.Min(24, math.Ceil(on+0.5))
			}
		}
	}
	lithium := h.chance(0.45)
	var opts []bankOption
	for _, b := range bankOptions(h.system, h.vsys) {
		if batteries[b.battery].leadAcid != lithium {
			opts = append(opts, b)
		}
	}
	slices.SortStableFunc(opts, func(a, b bankOption) int {
		return int(h.usable(a) - h.usable(b))
	})
	want := pick(h, []float64{1, 1, 1.5, 2})
	// Days at anchor, and a day of the heaviest scenario with some charge.
	need := math.Max(want*h.energy(0), 0.8*max(h.energy(1), h.energy(2))) * 1.1
	h.bank = opts[len(opts)-1]
	for _, b := range opts {
		if h.usable(b) >= need {
			h.bank = b
			break
		}
	}
	// The owner is told what the bank carries: no more than it can.
	days := math.Floor(h.usable(h.bank)/h.energy(0)/1.05*2) / 2
	h.autonomy = math.Max(0.5, math.Min(want, days))
	h.batt = batteries[h.bank.battery]
	// Above an MRBF fuse's 10 kA the bank gets a class T main fuse and a
	// battery bus, and everything else is fused at the bus.
	h.busTopology = h.bank.fault() > 9000
}

// solar sizes one or two arrays to cover a day at anchor in the dullest
// month in use, as far as the boat has room for modules.
func (h *hull) solar() {
	dull := slices.Min(h.site.irr)
	// Wh a day from a watt of flat array behind an MPPT controller, per
	// kWh/m²/day, after temperature and wiring losses.
	perWatt := dull * 0.75
	watts := h.energy(0) * h.uniform(0.8, 1.3) / perWatt
	mod := pick(h, modules)
	maxMods := 2
	switch {
	case h.lengthM >= 13:
		maxMods = 8
	case h.lengthM >= 11:
		maxMods = 6
	case h.lengthM >= 9:
		maxMods = 4
	}
	n := max(1, min(int(math.Ceil(watts/mod.pmax)), maxMods))
	// Arrangements, each of one or two arrays of series × strings that
	// suit the system: two or more in series behind an MPPT controller at
	// 12 V (one module alone goes on a PWM controller), three or four at
	// 24 V, where two would fall below the charging voltage when hot.
	type layout struct{ arrays, series, strings int }
	var lay layout
	if h.system == "12 V" {
		switch {
		case n == 1:
			lay = layout{1, 1, 1}
		case n <= 2 && mod.isc < 8 && h.chance(0.4):
			lay = layout{1, 1, 2} // in parallel on a PWM controller
		case n <= 2:
			lay = layout{1, 2, 1}
		case n <= 4:
			lay = layout{1, 2, 2}
		case n <= 6:
			lay = layout{2, 2, 1}
			if n > 5 || maxMods >= 8 {
				lay = layout{2, 2, 2}
			}
		default:
			lay = layout{2, 2, 2}
		}
	} else {
		switch {
		case n <= 3:
			lay = layout{1, 3, 1}
		case n <= 6:
			lay = layout{1, 3, 2}
		default:
			lay = layout{2, 4, 1}
		}
	}
	mounts := []string{"arch", "bimini", "coachroof", "davits", "hardtop", "rail", "deck"}
	mount := pick(h, mounts)
	for a := range lay.arrays {
		ar := array{mod: mod, mount: mount, series: lay.series, strings: lay.strings, shading: round(h.uniform(0, 0.1), 0.01)}
		switch ar.mount {
		case "arch", "davits", "hardtop":
			ar.tilt = 0
		default:
			ar.tilt = round(h.uniform(0, 15), 5)
		}
		ar.ctrl = mppt30
		vocCold := 1.12 * mod.voc * float64(ar.series)
		pv := mod.pmax * float64(ar.series*ar.strings)
		switch {
		case ar.series == 1 && 1.25*mod.isc*float64(ar.strings) <= pwm20.maxI:
			ar.ctrl = pwm20
		case ar.series == 1:
			ar.series = 2 // too much current for the PWM controller
			ar.ctrl = mppt30
		}
		if !ar.ctrl.pwm && (pv/h.vsys > mppt30.out*1.1 || 1.25*mod.isc*float64(ar.strings) > mppt30.maxI || vocCold > mppt30.maxV) {
			ar.ctrl = mppt45
		}
		ar.name = ar.mount
		ar.ctrlName = map[bool]string{true: "pwm", false: "mppt"}[ar.ctrl.pwm]
		if lay.arrays > 1 {
			side := []string{"port", "stbd"}[a]
			ar.name = ar.mount + "-" + side
			ar.ctrlName += "-" + side
		}
		h.arrays = append(h.arrays, ar)
	}
}

// charging adds an alternator (a DC-DC charger for a lithium bank) within
// what the bank accepts.
func (h *hull) charging() {
	var solar float64
	for _, a := range h.arrays {
		solar += a.ctrl.out
	}
	capAh := h.batt.ah * float64(h.bank.parallel)
	limit := 0.3 * capAh
	if !h.batt.leadAcid {
		limit = h.batt.maxCharge * float64(h.bank.parallel)
	}
	room := limit - solar
	if h.batt.leadAcid {
		for _, out := range []float64{90, 70, 60, 50, 40, 30} {
			if out <= room*h.uniform(0.8, 1) {
				h.chargers = append(h.chargers, charger{name: "alternator", kind: "alternator", out: out})
				return
			}
		}
		return
	}
	for _, out := range []float64{30, 20} {
		if out <= room {
			hours := map[int]float64{}
			for s := range 3 {
				if h.scen[s].engine > 0 {
					hours[s] = h.scen[s].engine
				}
			}
			h.chargers = append(h.chargers, charger{name: "dcdc", kind: "dc-dc", out: out, hours: hours})
			return
		}
	}
}

// fault is the prospective fault current just beyond r's device, as
// protection.interrupting reckons it.
func (h *hull) fault(r *run) float64 {
	v := 1.07 * float64(h.bank.series) * h.batt.volts
	rb := h.batt.ohms * float64(h.bank.series) / float64(h.bank.parallel)
	loop := 0.0
	for x := r.parent; x != nil; x = x.parent {
		loop += 2 * x.lengthM * x.cab.r20
	}
	return v / (rb + loop)
}

func (h *hull) cables() []cable {
	if h.family == "awg" {
		return awgCables
	}
	return metricCables
}

// size picks the smallest cable that carries r's current within its drop
// limit, and a device from devs that protects it: rated at least the
// current (125 % where it can) and at most 150 % of the ampacity, able to
// break the fault current.
func (h *hull) size(r *run, devs []device) {
	temp, derate := 30.0, 1.0
	if r.engineSpace {
		temp, derate = 50, 0.86
	}
	fam := h.cables()
	fault := h.fault(r)
	for _, c := range fam {
		amp := c.amp * derate
		if amp < r.iAmp*1.05 {
			continue
		}
		rT := c.r20 * (1 + 0.00393*(temp-20))
		if r.iDrop*2*r.lengthM*rT/r.vDrop*100 > r.limit*0.9 {
			continue
		}
		if devs == nil {
			r.cab = c
			return
		}
		if d, ok := pickDevice(devs, r.iAmp, 1.5*amp, fault); ok {
			r.cab, r.dev = c, &d
			return
		}
	}
	// Nothing fits: the largest, and the checks will say so.
	r.cab = fam[len(fam)-1]
	if devs != nil {
		r.dev = &devs[len(devs)-1]
	}
}

func pickDevice(devs []device, current, maxRating, fault float64) (device, bool) {
	for _, margin := range []float64{1.25, 1} {
		for _, d := range devs {
			if d.rating >= current*margin && d.rating <= maxRating && d.interrupting >= fault*1.05 {
				return d, true
			}
		}
	}
	return device{}, false
}

// metres gives a length as the design writes it, and the length it
// stands for: feet on an imperial hull, metres otherwise.
func (h *hull) metres(m float64) float64 {
	if h.imperial {
		return round(m/0.3048, 0.5) * 0.3048
	}
	if m < 2 {
		return round(m, 0.1)
	}
	return round(m, 0.5)
}

func (h *hull) add(r *run) *run {
	r.lengthM = h.metres(r.lengthM)
	h.runs = append(h.runs, r)
	return r
}

var criticalKinds = map[string]bool{
	"navigation-lights": true, "bilge-pump": true, "bilge-blower": true, "electronics": true,
	"communications": true, "autopilot": true, "panel-feeder": true,
}

// wire lays out the tree: the bank, its main fuse, the isolator and the
// main bus; the panels off the main bus and the circuits off the panels;
// the heavy loads, the inverter and the charge sources straight off the
// bank on their own terminal fuses.
func (h *hull) wire() {
	v := h.vsys
	var panelAmps = map[string]float64{}
	var total, heavy, charge float64
	for _, l := range h.loads {
		switch l.panel {
		case "nav", "dc", "bilge":
			panelAmps[l.panel] += l.current(v)
			total += l.current(v)
		case "bank":
			heavy += l.current(v)
		}
	}
	if h.inverter {
		inv := inverter[h.system]
		heavy += inv.continuous / inv.eff / v
	}
	for _, a := range h.arrays {
		charge += a.ctrl.out
	}
	for _, c := range h.chargers {
		charge += c.out
	}
	src, prefix := "bank", "bank-"
	var srcRun *run
	if h.busTopology {
		i := math.Max(total+heavy, charge)
		if h.family == "metric" && i > 220 {
			h.family = "awg" // 50 mm² is the largest metric cable in the catalog
		}
		bf := h.add(&run{name: "bank-fuse", from: "bank", to: "battery-bus", lengthM: h.uniform(0.6, 1.2),
			iAmp: i, iDrop: i, vDrop: v, limit: 3, note: "the bank to the battery bus, on a class T fuse for the bank's fault current"})
		// Far enough from the bank for the bus's fault current to be within
		// an MRBF fuse's rating.
		for {
			h.size(bf, terminalFuses)
			if h.fault(&run{parent: bf}) <= 9000 || bf.lengthM > 3 {
				break
			}
			bf.lengthM = h.metres(bf.lengthM + 0.25)
		}
		bf.distance = h.distanceText(h.uniform(0.04, 0.15))
		src, prefix, srcRun = "battery-bus", "bbus-", bf
	}
	main := h.add(&run{name: prefix + "switch", from: src, to: "main-switch", lengthM: h.uniform(0.5, 1.5), parent: srcRun,
		iAmp: total, iDrop: total, vDrop: v, limit: 3, note: "to the isolator, on the main fuse"})
	sw := h.add(&run{name: "switch-bus", from: "main-switch", to: "main-bus", lengthM: h.uniform(0.4, 1.2), parent: main,
		iAmp: total, iDrop: total, vDrop: v, limit: 3, note: "the isolator to the main bus; the main fuse protects it"})
	// One size for both, sized for the longer, so that the main fuse
	// protects the second.
	l := main.lengthM
	main.lengthM = math.Max(main.lengthM, sw.lengthM)
	h.size(main, terminalFuses)
	main.lengthM = l
	main.distance = h.distanceText(h.uniform(0.04, 0.15))
	if h.busTopology {
		main.distance = "0 mm"
	}
	sw.cab = main.cab
	h.mainAmps = total

	feeders := map[string]*run{}
	for _, p := range h.panels {
		i := panelAmps[p]
		r := h.add(&run{name: "bus-" + panelBus[p], from: "main-bus", to: panelBus[p], lengthM: h.uniform(1.5, 0.35*h.lengthM+1.5), parent: sw,
			iAmp: i, iDrop: i, vDrop: v, limit: 3})
		h.size(r, terminalFuses)
		r.distance = "0 mm"
		feeders[p] = r
	}
	panelDevs := append(slices.Clone(breakers), terminalFuses...)
	slices.SortStableFunc(panelDevs, func(a, b device) int { return int(a.rating - b.rating) })
	done := map[string]bool{}
	for _, l := range h.loads {
		if l.circuit == "" || done[l.circuit] || l.panel == "bank" {
			continue
		}
		done[l.circuit] = true
		var i, length float64
		limit := 10.0
		var on []*load
		for _, m := range h.loads {
			if m.circuit == l.circuit {
				on = append(on, m)
				i += m.current(v)
				length = math.Max(length, m.lengthM)
				if criticalKinds[m.kind] {
					limit = 3
				}
			}
		}
		if len(on) > 1 {
			length += 1
		}
		r := h.add(&run{name: l.circuit, from: panelBus[l.panel], to: l.name, lengthM: length, parent: feeders[l.panel],
			iAmp: i, iDrop: i, vDrop: v, limit: limit})
		if len(on) > 1 {
			r.note = "one circuit for " + on[0].name
			for k, m := range on[1:] {
				if k == len(on)-2 {
					r.note += " and "
				} else {
					r.note += ", "
				}
				r.note += m.name
			}
		}
		h.size(r, panelDevs)
		r.distance = "0 mm"
	}
	// Off the bank on their own fuses.
	for _, l := range h.loads {
		if l.panel != "bank" {
			continue
		}
		i := l.current(v)
		r := h.add(&run{name: prefix + l.name, from: src, to: l.name, lengthM: l.lengthM, parent: srcRun, iAmp: i, iDrop: i, vDrop: v, limit: 10,
			note: "forward to the " + l.name + ", on its own fuse at the " + src})
		l.circuit = r.name
		h.size(r, terminalFuses)
		r.distance = "0 mm"
	}
	if h.inverter {
		inv := inverter[h.system]
		i := inv.continuous / inv.eff / v
		h.invCircuit = prefix + "inverter"
		r := h.add(&run{name: h.invCircuit, from: src, to: "inverter", lengthM: h.uniform(1, 3), parent: srcRun, iAmp: i, iDrop: i, vDrop: v, limit: 3,
			note: "sized for 3 %, though its AC loads would allow 10 %"})
		h.size(r, terminalFuses)
		r.distance = "0 mm"
	}
	for _, a := range h.arrays {
		r := h.add(&run{name: prefix + a.ctrlName, from: src, to: a.ctrlName, lengthM: h.uniform(0.8, 2.5), parent: srcRun,
			iAmp: a.ctrl.out, iDrop: a.ctrl.out, vDrop: v, limit: 3})
		h.size(r, terminalFuses)
		r.distance = "0 mm"
		strings := float64(a.strings)
		vd := a.mod.vmp * float64(a.series)
		if a.ctrl.pwm {
			vd = v
		}
		pv := h.add(&run{name: "pv-" + a.name, from: a.name, to: a.ctrlName, lengthM: h.uniform(3, 0.5*h.lengthM+3),
			iAmp: 1.56 * a.mod.isc * strings, iDrop: a.mod.imp * strings, vDrop: vd, limit: 3})
		h.size(pv, nil)
	}
	for _, c := range h.chargers {
		r := h.add(&run{name: prefix + c.name, from: src, to: c.name, lengthM: h.uniform(1, 3), engineSpace: true, parent: srcRun,
			iAmp: c.out, iDrop: c.out, vDrop: v, limit: 3, note: "through the engine space"})
		h.size(r, terminalFuses)
		r.distance = "0 mm"
	}
	// Now and then a designer leaves out where a breaker sits: a warning.
	if h.chance(0.15) {
		for k := len(h.runs) - 1; k >= 0; k-- {
			if r := h.runs[k]; r.dev != nil && r.from != "bank" && r.from != "battery-bus" && r.from != "main-bus" {
				r.distance = ""
				break
			}
		}
	}
}

func (h *hull) distanceText(m float64) string {
	if h.imperial {
		return fmtNum(math.Max(1, math.Round(m/0.0254)), 1) + " in"
	}
	return fmtNum(round(m*1000, 10), 1) + " mm"
}

// plan sets the design voyage: a fortnight or so of the scenarios, from a
// month of the season that leaves the voyage inside it.
func (h *hull) plan() {
	ms := h.site.months
	h.start = ms[h.rng.IntN(len(ms)-1)]
	n := 4 + h.rng.IntN(4)
	for k := range n {
		s := h.rng.IntN(3)
		if k%2 == 1 {
			s = 0 // anchor between the other days
		}
		h.voyage = append(h.voyage, leg{scen: s, days: 1 + h.rng.IntN(3)})
	}
}
