package energy

import (
	"math"
	"time"

	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/schema"
)

// Hour is one hour of a voyage: which scenario and month it falls in, the
// power drawn and offered, W.
type Hour struct {
	Scenario string
	Month    int // 0 = January
	Load     float64
	Solar    float64
	Charger  float64
}

// Sim is the outcome of a state-of-charge run.
type Sim struct {
	// SoC is the state of charge at the end of each hour, 0–1 of the
	// energy stored when full.
	SoC []float64
	// Stored is the energy when full and Floor the least the bank may
	// hold, Wh.
	Stored, Floor float64
	// Lowest is the lowest state of charge, at hour LowestAt.
	Lowest   float64
	LowestAt int
	// Unmet is the energy the loads asked for below the floor, Wh, and
	// FirstBreach the first hour it happened, or −1.
	Unmet       float64
	FirstBreach int
	// RecoverHours is how long after the lowest point the bank was full
	// again, or −1 when it was not within the voyage.
	RecoverHours int
	// Ledger totals, Wh: what the sources offered and the bank took in
	// (after charge efficiency), what the loads drew from the bank, what
	// was offered but not taken, and the charge losses.
	Offered, Charged, Drawn, Spilled, ChargeLoss float64
}

// Chemistry is what the simulation needs to know of the bank.
type Chemistry struct {
	LeadAcid   bool
	Efficiency float64 // fraction of charge energy stored
	TaperFrom  float64 // state of charge above which lead-acid acceptance falls
	TaperEnd   float64 // acceptance at full, as a fraction of the bulk rate
	// MaxCharge is the most charge power the bank takes in bulk, W
	// (infinite for none).
	MaxCharge float64
}

// Simulate runs the bank hour by hour over hours, starting full. Each hour
// the sources' offer, limited by the bank's acceptance (a lead-acid bank's
// tapers above TaperFrom), is stored at the chemistry's efficiency, and the
// loads are drawn; the bank never rises above Stored, and where it would
// fall below Floor the shortfall is recorded as unmet and the bank held at
// the floor.
func Simulate(hours []Hour, stored, floor float64, ch Chemistry) Sim {
	s := Sim{Stored: stored, Floor: floor, Lowest: 1, FirstBreach: -1, RecoverHours: -1, SoC: make([]float64, len(hours))}
	e := stored
	for i, h := range hours {
		soc := e / stored
		accept := ch.MaxCharge
		if ch.LeadAcid && soc > ch.TaperFrom {
			f := 1 - (1-ch.TaperEnd)*(soc-ch.TaperFrom)/(1-ch.TaperFrom)
			accept *= f
		}
		offer := h.Solar + h.Charger
		in := math.Min(offer, accept)
		// No more in than the bank has room for, loads included.
		room := (stored - e + h.Load) / ch.Efficiency
		in = math.Max(0, math.Min(in, room))
		s.Offered += offer
		s.Spilled += offer - in
		s.Charged += in * ch.Efficiency
		s.ChargeLoss += in * (1 - ch.Efficiency)
		s.Drawn += h.Load
		e += in*ch.Efficiency - h.Load
		if e < floor {
			s.Unmet += floor - e
			if s.FirstBreach < 0 {
				s.FirstBreach = i
			}
			e = floor
		}
		if e > stored {
			e = stored
		}
		s.SoC[i] = e / stored
		if s.SoC[i] < s.Lowest-1e-12 {
			s.Lowest, s.LowestAt = s.SoC[i], i
		}
	}
	for i := s.LowestAt; i < len(hours) && s.Lowest < 1; i++ {
		if s.SoC[i] >= 0.999 {
			s.RecoverHours = i - s.LowestAt
			break
		}
	}
	return s
}

// VoyageHours lays out the design voyage hour by hour for bank b, from
// the 1st of its starting month: each leg's scenario, the bank's loads at
// their mean power over the scenario's period, the mean day of the month
// of the arrays whose controllers charge the bank, and the bank's other
// sources while they run (from 08:00 each day). A link into the bank (a
// DC-DC charger, a combiner, an isolator) passes charge while a charger of
// its other bank runs: that charger's output up to the link's current.
func VoyageHours(sys *model.System, b *model.Bank, budget []ScenarioEnergy, harvest []ArrayHarvest) []Hour {
	d := sys.Design
	if d.Voyage == nil {
		return nil
	}
	byName := map[string]ScenarioEnergy{}
	for _, se := range budget {
		byName[se.Name] = se
	}
	solarByMonth := map[int][24]float64{}
	for _, ah := range harvest {
		if ah.Bank != b {
			continue
		}
		for _, am := range ah.Months {
			mi := MonthIndex(am.Month)
			p := solarByMonth[mi]
			for h := range p {
				p[h] += am.Hourly[h]
			}
			solarByMonth[mi] = p
		}
	}
	vcharge := ChargeVoltage(b, sys.Rules)
	start := time.Date(2025, time.Month(MonthIndex(d.Voyage.Start)+1), 1, 0, 0, 0, 0, time.UTC)
	var out []Hour
	for _, leg := range d.Voyage.Legs {
		se := byName[leg.Scenario]
		sc := d.Scenarios[leg.Scenario]
		load := 0.0
		if se.Hours > 0 {
			load = se.Wh / se.Hours
		}
		own := chargersOf(b, leg.Scenario, sc)
		var links []linkFeed
		for _, l := range sys.Links {
			other := l.From
			switch {
			case l.To == b:
			case l.From == b && l.Spec.Part.Kind == "combiner":
				other = l.To
			default:
				continue
			}
			cap, _ := sys.LinkCurrent(l)
			if l.Spec.Part.Kind != "dc-dc" {
				cap = math.Min(cap, l.Spec.Part.Rating.Amps())
			}
			links = append(links, linkFeed{cap: cap, from: chargersOf(other, leg.Scenario, sc)})
		}
		n := int(math.Round(leg.Days * 24))
		for i := 0; i < n; i++ {
			t := start.Add(time.Duration(len(out)) * time.Hour)
			hod := t.Hour()
			h := Hour{Scenario: leg.Scenario, Month: int(t.Month()) - 1, Load: load}
			h.Solar = solarByMonth[h.Month][hod]
			for _, c := range own {
				h.Charger += c.amps * vcharge * c.on(hod)
			}
			for _, lf := range links {
				var i float64
				for _, c := range lf.from {
					i += c.amps * c.on(hod)
				}
				h.Charger += math.Min(i, lf.cap) * vcharge
			}
			out = append(out, h)
		}
	}
	return out
}

// charging is a charge source of a bank in one scenario: its current and
// its hours a day.
type charging struct {
	amps, hoursPerDay float64
}

// on is the fraction of hour hod (0–23) the source runs: from 08:00 for
// its hours a day; a part hour at the end counts pro rata.
func (c charging) on(hod int) float64 {
	if hod < 8 {
		return 0
	}
	return math.Min(1, math.Max(0, c.hoursPerDay-float64(hod-8)))
}

type linkFeed struct {
	cap  float64
	from []charging
}

// chargersOf lists bank b's chargers and inverter-chargers in scenario sn,
// by name.
func chargersOf(b *model.Bank, sn string, sc schema.Scenario) []charging {
	var out []charging
	for _, src := range b.Sources {
		var h float64
		switch {
		case src.Charger != nil:
			h = src.Charger.ChargeHours(sn, sc)
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
		out = append(out, charging{amps: src.Output, hoursPerDay: h * 24 / sc.Hours})
	}
	return out
}

// BankChemistry is the simulation's view of bank b.
func BankChemistry(b *model.Bank, rules schema.Rulebook) Chemistry {
	spec := b.Spec
	c := rules.Charging
	ch := Chemistry{LeadAcid: spec.Battery.LeadAcid(), TaperFrom: c.TaperFrom, TaperEnd: c.TaperEnd, MaxCharge: math.Inf(1)}
	vcharge := ChargeVoltage(b, rules)
	capBank := spec.Battery.Capacity.Ah() * float64(spec.Parallel)
	if ch.LeadAcid {
		ch.Efficiency = c.LeadAcidEfficiency
		ch.MaxCharge = rules.ChargeRate.LeadAcidMax * capBank * vcharge
	} else {
		ch.Efficiency = c.LiFePO4Efficiency
		if mc := spec.Battery.MaxCharge; mc != nil {
			ch.MaxCharge = mc.Amps() * float64(spec.Parallel) * vcharge
		}
	}
	return ch
}
