package energy

import (
	"math"
	"time"

	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// Slot is one hour of the design voyage.
type Slot struct {
	Scenario string
	Month    int // 0 = January
	Hour     int // of the day, 0–23
}

// VoyageBank is one bank's run over the design voyage and what it ran on.
type VoyageBank struct {
	Bank  *model.Bank
	Model BankModel
	Sim   SimBank
	// Flows are what it saw hour by hour.
	Flows []Flow
	Run   BankRun
}

// VoyageLink is a link's part in the voyage.
type VoyageLink struct {
	Link *model.Link
	Sim  SimLink
	Run  LinkRun
}

// VoyageRun is every bank's run over the design voyage.
type VoyageRun struct {
	Slots []Slot
	// Banks are every bank of the model, in its order; Primary the one
	// the boat's energy checks are about.
	Banks   []*VoyageBank
	Links   []*VoyageLink
	Primary *VoyageBank
}

// Voyage runs every bank of sys together over the design voyage (see
// Simulate), or returns nil when the design has no voyage.
func Voyage(sys *model.System, a *Analysis) *VoyageRun {
	d := sys.Design
	if d.Voyage == nil || len(sys.Banks) == 0 {
		return nil
	}
	v := &VoyageRun{}
	index := map[*model.Bank]int{}
	for i, b := range sys.Banks {
		bm := Bank(b, sys.Rules)
		vb := &VoyageBank{Bank: b, Model: bm, Sim: simBank(b, bm, sys.Rules)}
		v.Banks = append(v.Banks, vb)
		index[b] = i
		if b == sys.Primary() {
			v.Primary = vb
		}
	}
	for _, l := range sys.Links {
		v.Links = append(v.Links, &VoyageLink{Link: l, Sim: simLink(l, index[l.From], index[l.To], sys.Rules)})
	}
	v.Slots = layout(sys, a, v.Banks)
	banks := make([]SimBank, len(v.Banks))
	flows := make([][]Flow, len(v.Banks))
	for i, vb := range v.Banks {
		banks[i], flows[i] = vb.Sim, vb.Flows
	}
	links := make([]SimLink, len(v.Links))
	for i, vl := range v.Links {
		links[i] = vl.Sim
	}
	runs, lruns := Simulate(banks, links, flows)
	for i, vb := range v.Banks {
		vb.Run = runs[i]
	}
	for i, vl := range v.Links {
		vl.Run = lruns[i]
	}
	return v
}

// Checked reports whether voyage.floor checks the bank: it carries loads,
// or it is the primary bank.
func (v *VoyageRun) Checked(vb *VoyageBank) bool {
	return vb == v.Primary || len(vb.Bank.Loads) > 0
}

// simBank is the simulation's view of bank b: its capacity at its
// temperature and end of life as the model's charge, its floor, and its
// acceptance: the rulebook's kinetic model for its lead-acid chemistry
// (one well for LiFePO4), its charge efficiency, and the lower of the
// makers' maximum charge current and, for lead-acid, the rulebook's
// charge-rate bound.
func simBank(b *model.Bank, bm BankModel, rules schema.Rulebook) SimBank {
	spec := b.Spec
	qmax := bm.Stored / bm.Voltage
	s := SimBank{Name: b.Name, Volts: bm.Voltage, Floor: bm.Floor / bm.Voltage, MaxCharge: math.Inf(1), Full: 0.98, Efficiency: 1}
	s.Kin = NewKinetic(1, 1, qmax)
	if acc := rules.Acceptance; acc != nil {
		s.Full = acc.Full
		s.Efficiency = acc.LiFePO4Efficiency
		if k, ok := acc.For(spec.Battery.Chemistry); ok {
			s.Kin = NewKinetic(k.CapacityRatio, k.RateConstant, qmax)
			s.Efficiency = k.Efficiency
		}
	}
	if spec.Battery.LeadAcid() && rules.ChargeRate != nil {
		s.MaxCharge = rules.ChargeRate.LeadAcidMax * b.Capacity()
	}
	if mc := spec.Battery.MaxCharge; mc != nil {
		s.MaxCharge = math.Min(s.MaxCharge, mc.Amps()*float64(spec.Parallel))
	}
	return s
}

// simLink is the simulation's view of link l between the banks at from
// and to: a DC-DC charger works between its input bank's charging voltage
// and its own absorption voltage (else its output bank's charging
// voltage).
func simLink(l *model.Link, from, to int, rules schema.Rulebook) SimLink {
	p := l.Spec.Part
	s := SimLink{Name: l.Name, Kind: p.Kind, From: from, To: to, Rating: p.Rating.Amps(), Efficiency: p.Efficiency}
	s.VIn = ChargeVoltage(l.From, rules)
	s.VOut = ChargeVoltage(l.To, rules)
	if p.Absorption != nil {
		s.VOut = p.Absorption.Volts()
	}
	if p.Drop != nil {
		s.Drop = p.Drop.Volts()
	}
	if s.Efficiency <= 0 {
		s.Efficiency = 1
	}
	return s
}

// layout lays out the design voyage hour by hour from 00:00 on the 1st
// of its starting month, and fills each bank's flows: its loads by
// scenario at their times of day, the arrays of its controllers on the
// month's mean day, its other sources while they run.
func layout(sys *model.System, a *Analysis, banks []*VoyageBank) []Slot {
	d := sys.Design
	start := time.Date(2025, time.Month(MonthIndex(d.Voyage.Start)+1), 1, 0, 0, 0, 0, time.UTC)
	type monthly struct {
		solar [24]float64
		cold  bool
	}
	perMonth := make([]map[int]*monthly, len(banks))
	for i := range perMonth {
		perMonth[i] = map[int]*monthly{}
	}
	month := func(i, m int) *monthly {
		if x := perMonth[i][m]; x != nil {
			return x
		}
		b := banks[i].Bank
		x := &monthly{cold: tooColdToCharge(b, d.Site, m)}
		vcharge := ChargeVoltage(b, sys.Rules)
		for _, ah := range a.Harvest {
			if ah.Bank != b {
				continue
			}
			for _, am := range ah.Months {
				if MonthIndex(am.Month) == m {
					for h := range x.solar {
						x.solar[h] += am.Hourly[h] / vcharge
					}
				}
			}
		}
		perMonth[i][m] = x
		return x
	}
	var slots []Slot
	for _, leg := range d.Voyage.Legs {
		sc := d.Scenarios[leg.Scenario]
		type daily struct{ load, peukert, charger [24]float64 }
		days := make([]daily, len(banks))
		for i, vb := range banks {
			days[i].load, days[i].peukert = loadDay(vb, scenarioOf(a.BudgetOf(vb.Bank), leg.Scenario), sc)
			days[i].charger = chargerDay(vb.Bank, leg.Scenario, sc)
		}
		n := int(math.Round(leg.Days * 24))
		for range n {
			t := start.Add(time.Duration(len(slots)) * time.Hour)
			s := Slot{Scenario: leg.Scenario, Month: int(t.Month()) - 1, Hour: t.Hour()}
			slots = append(slots, s)
			for i, vb := range banks {
				m := month(i, s.Month)
				vb.Flows = append(vb.Flows, Flow{
					Load: days[i].load[s.Hour], Peukert: days[i].peukert[s.Hour],
					Solar: m.solar[s.Hour], Charger: days[i].charger[s.Hour], Cold: m.cold,
				})
			}
		}
	}
	return slots
}

// scenarioOf is the budget of scenario sn, or nil.
func scenarioOf(budget []ScenarioEnergy, sn string) *ScenarioEnergy {
	for i := range budget {
		if budget[i].Name == sn {
			return &budget[i]
		}
	}
	return nil
}

// loadDay is a bank's loads over one day of a scenario, A at its nominal
// voltage hour by hour, and the Peukert factor on what the battery gives
// them each hour. A load with windows draws its day's energy over them in
// proportion to the time each hour spends in them; a load without is
// spread evenly over the day. Peukert's law is taken for each load at the
// larger of its own current while it runs and the hour's mean current: a
// windlass or thruster is the bank's current while it runs, and lighter
// loads together are the hour's mean.
func loadDay(vb *VoyageBank, se *ScenarioEnergy, sc schema.Scenario) (load, peukert [24]float64) {
	if se == nil || sc.Hours <= 0 {
		return load, peukert
	}
	v := vb.Model.Voltage
	perLoad := make([][24]float64, len(se.Loads))
	for i, le := range se.Loads {
		day := le.Wh * 24 / sc.Hours / v // Ah a day
		spans := windowSpans(le.Windows)
		total := spanHours(spans)
		for h := range 24 {
			a := day / 24
			if total > 0 {
				a = day * overlap(spans, h) / total
			}
			perLoad[i][h] = a
			load[h] += a
		}
	}
	for h := range 24 {
		if load[h] <= 0 {
			peukert[h] = 1
			continue
		}
		var weighted float64
		for i, le := range se.Loads {
			weighted += perLoad[i][h] * peukertFactor(vb.Bank, math.Max(le.Watts/v, load[h]))
		}
		peukert[h] = weighted / load[h]
	}
	return load, peukert
}

// peukertFactor is how much more charge a lead-acid bank gives up than it
// delivers at bank current i: C / C_eff, with C_eff from Peukert's law
// per battery (PeukertCapacity); 1 for LiFePO4 or without an exponent.
func peukertFactor(b *model.Bank, i float64) float64 {
	bt := b.Spec.Battery
	if !bt.LeadAcid() || bt.Peukert == nil || i <= 0 {
		return 1
	}
	c := bt.Capacity.Ah()
	per := i / float64(b.Spec.Parallel)
	if per*bt.RatedHours <= c {
		return 1 // at or below the rated current: no more than rated
	}
	return c / PeukertCapacity(c, bt.RatedHours, *bt.Peukert, per)
}

// chargerDay is the current a bank's sources other than solar deliver
// over one day of scenario sn, hour by hour.
func chargerDay(b *model.Bank, sn string, sc schema.Scenario) [24]float64 {
	var out [24]float64
	for _, c := range chargersOf(b, sn, sc) {
		spans := runSpans(c.hoursPerDay, c.windows)
		for h := range out {
			out[h] += c.amps * overlap(spans, h)
		}
	}
	return out
}

// charging is a charge source of a bank in one scenario: its current, its
// hours a day and the times of day it may run.
type charging struct {
	amps, hoursPerDay float64
	windows           []schema.Window
}

// chargersOf lists bank b's chargers and inverter-chargers in scenario sn,
// by name.
func chargersOf(b *model.Bank, sn string, sc schema.Scenario) []charging {
	var out []charging
	for _, src := range b.Sources {
		var h float64
		var ws []schema.Window
		switch {
		case src.Charger != nil:
			h = src.Charger.ChargeHours(sn, sc)
			ws = src.Charger.Windows
		case src.Inverter != nil:
			if c := src.Inverter.Spec.Charging; c != nil {
				if given, ok := c.Hours[sn]; ok {
					h = given
					break
				}
			}
			if sc.ShorePower {
				h = sc.Hours
			}
		default:
			continue // solar, from the harvest
		}
		if sc.Hours > 0 {
			out = append(out, charging{amps: src.Output, hoursPerDay: h * 24 / sc.Hours, windows: ws})
		}
	}
	return out
}

// tooColdToCharge reports whether a LiFePO4 bank is below its battery's
// charge-temperature limit in month m: at the bank's temperature, or, for
// a bank outside the cabin and engine space, the site's daytime ambient
// for the month when that is lower.
func tooColdToCharge(b *model.Bank, site schema.Site, m int) bool {
	bt := b.Spec.Battery
	if bt.LeadAcid() || bt.ChargeLowLimit == nil {
		return false
	}
	t := b.Spec.Temperature.Celsius()
	if loc := b.Spec.Location; loc != "cabin" && loc != "engine-space" {
		if amb, ok := site.DayAmbient[Months[m]]; ok {
			t = math.Min(t, amb.Celsius())
		}
	}
	return t < bt.ChargeLowLimit.Celsius()
}

// span is a stretch of the day, hours from midnight; one past midnight
// runs on past 24.
type span struct{ from, to float64 }

// windowSpans are a design's windows as spans.
func windowSpans(ws []schema.Window) []span {
	var out []span
	for _, w := range ws {
		if l := w.Hours(); l > 0 {
			f := math.Mod(w.From, 24)
			out = append(out, span{f, f + l})
		}
	}
	return out
}

// runSpans are when a source runs for hours a day: from the start of each
// of its windows in turn until its hours are used, or, with no windows,
// from 08:00 (past midnight if it runs that long).
func runSpans(hours float64, ws []schema.Window) []span {
	hours = math.Max(0, math.Min(hours, 24))
	if len(ws) == 0 {
		return []span{{8, 8 + hours}}
	}
	var out []span
	for _, s := range windowSpans(ws) {
		if hours <= 0 {
			break
		}
		l := math.Min(hours, s.to-s.from)
		out = append(out, span{s.from, s.from + l})
		hours -= l
	}
	return out
}

func spanHours(spans []span) float64 {
	var t float64
	for _, s := range spans {
		t += s.to - s.from
	}
	return t
}

// overlap is the part of hour h (from h:00 to h+1:00) the spans cover,
// 0–1 for spans that do not overlap each other.
func overlap(spans []span, h int) float64 {
	var t float64
	for _, s := range spans {
		for _, lo := range []float64{float64(h), float64(h) + 24} {
			t += math.Max(0, math.Min(s.to, lo+1)-math.Max(s.from, lo))
		}
	}
	return t
}

// Result is the run as the result reports it: the primary bank's run at
// the top, for compatibility, and every bank's and link's.
func (v *VoyageRun) Result(start string) *result.Voyage {
	out := &result.Voyage{Start: start, Hours: len(v.Slots)}
	for _, vb := range v.Banks {
		bv := v.bankResult(vb)
		if vb == v.Primary {
			out.BankVoyage = bv
		}
		out.Banks = append(out.Banks, bv)
	}
	for _, vl := range v.Links {
		out.Links = append(out.Links, result.LinkVoyage{
			Link: vl.Link.Name, Kind: vl.Sim.Kind, From: vl.Link.From.Name, To: vl.Link.To.Name,
			Ah: round(vl.Run.Ah, 1), Loss: round(vl.Run.Loss, 1),
		})
	}
	return out
}

func (v *VoyageRun) bankResult(vb *VoyageBank) result.BankVoyage {
	r, s := vb.Run, vb.Sim
	lg := r.Ledger
	out := result.BankVoyage{
		Bank: vb.Bank.Name, Role: vb.Bank.Role, Checked: v.Checked(vb),
		Lowest: round(r.Lowest*100, 2), LowestDay: r.LowestAt / 24, LowestHour: r.LowestAt % 24,
		Floor: round(s.Floor/s.Kin.Qmax*100, 2), Unmet: round(lg.Unmet, 1), RecoverDays: -1,
		Full: round(s.Full*100, 2), AbsorptionHours: r.Absorption,
		Offered: round(lg.Offered, 1), Charged: round(lg.Charged, 1), Drawn: round(lg.Drawn, 1),
		Spilled: round(lg.Spilled, 1), ChargeLoss: round(lg.ChargeLoss, 1),
		Direct: round(lg.Direct, 1), Peukert: round(lg.Peukert, 1), Loads: round(lg.Loads, 1),
		LinkIn: round(lg.LinkIn, 1), LinkOut: round(lg.LinkOut, 1),
		StartWh: round(lg.Start, 1), EndWh: round(lg.End, 1),
	}
	if r.RecoverHours >= 0 {
		out.RecoverDays = round(float64(r.RecoverHours)/24, 2)
	}
	if r.LowestAt < len(v.Slots) {
		out.LowestScenario = v.Slots[r.LowestAt].Scenario
		out.LowestMonth = Months[v.Slots[r.LowestAt].Month]
	}
	out.SoC = make([]float64, len(r.SoC))
	for i, x := range r.SoC {
		out.SoC[i] = round(x*100, 1)
	}
	return out
}
