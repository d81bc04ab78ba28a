package energy

import (
	"math"
	"testing"

	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/schema"
	"github.com/ampwright/ampwright/schema/unit"
)

// simOf is the simulation's view of a bank of n parallel 12 V batteries
// of the given chemistry and capacity, at 25 °C and end of life 1, under
// the default rulebook.
func simOf(t testing.TB, chemistry, ah string, parallel int, dod float64) SimBank {
	rules := defaultRulebook(t)
	b := bankOf(t, chemistry, "12 V", ah, parallel, dod)
	return simBank(b, Bank(b, rules), rules)
}

func constant(n int, f Flow) []Flow {
	out := make([]Flow, n)
	for i := range out {
		out[i] = f
	}
	return out
}

func one(t *testing.T, b SimBank, flows []Flow, start *Wells) BankRun {
	t.Helper()
	var st []Wells
	if start != nil {
		st = []Wells{*start}
	}
	runs, _ := simulateFrom([]SimBank{b}, nil, [][]Flow{flows}, st)
	return runs[0]
}

// TestChargeCappedBySourceCurrent: an hour of a source's current puts at
// most that current × one hour × the charge efficiency into the bank. The
// first charge model let an hour on a 40 A alternator take an AGM bank from
// 80.8 % to 98.5 %, and two hours on 60 A a flooded bank from 50 % to 95 %
// (issue 13): more ampere-hours than the alternator delivered.
func TestChargeCappedBySourceCurrent(t *testing.T) {
	tests := []struct {
		name      string
		chemistry string
		ah        string
		parallel  int
		from      float64
		amps      float64
		hours     int
		old       float64 // where the first model took it
	}{
		{"AGM 3 × 105 Ah, 40 A alternator, one hour", "agm", "105 Ah", 3, 0.808, 40, 1, 0.985},
		{"flooded 3 × 110 Ah, 60 A alternator, two hours", "flooded", "110 Ah", 3, 0.50, 60, 2, 0.95},
		{"LiFePO4 2 × 200 Ah, 40 A alternator, one hour", "lifepo4", "200 Ah", 2, 0.30, 40, 1, 0},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			b := simOf(t, tt.chemistry, tt.ah, tt.parallel, 0.5)
			start := b.Kin.At(tt.from)
			r := one(t, b, constant(tt.hours, Flow{Charger: tt.amps}), &start)
			prev := tt.from
			for h, soc := range r.SoC {
				rise := (soc - prev) * b.Kin.Qmax
				if limit := tt.amps * b.Efficiency; rise > limit+1e-9 {
					t.Errorf("hour %d: stored %.2f Ah from %g A, more than %g A × 1 h × η %g", h, rise, tt.amps, tt.amps, b.Efficiency)
				}
				prev = soc
			}
			if tt.old > 0 && r.SoC[len(r.SoC)-1] >= tt.old {
				t.Errorf("reached %.1f %%, as the first model's %.1f %%", r.SoC[len(r.SoC)-1]*100, tt.old*100)
			}
			if got, want := r.Ledger.Charged, tt.amps*float64(tt.hours)*b.Efficiency*12; got > want+1e-6 {
				t.Errorf("charged %v Wh, more than %v Wh", got, want)
			}
		})
	}
}

// TestLeadAcidNeedsHoursOfAbsorption checks the trade fact that a
// lead-acid bank charged from 50 % needs hours of absorption to reach full
// (common practice: the charge current tapers from about 80 % and the last
// fifth takes several hours), for each chemistry's default parameters,
// with a charger of a quarter of its capacity (within the rulebook's 30 %
// bound). In bulk alone the same charge would take about two hours.
func TestLeadAcidNeedsHoursOfAbsorption(t *testing.T) {
	for _, chem := range []string{"flooded", "agm", "gel"} {
		t.Run(chem, func(t *testing.T) {
			b := simOf(t, chem, "100 Ah", 1, 0.5)
			start := b.Kin.At(0.5)
			r := one(t, b, constant(24, Flow{Charger: 25}), &start)
			hours := -1
			for h, soc := range r.SoC {
				if soc >= b.Full {
					hours = h + 1
					break
				}
			}
			bulk := (b.Full - 0.5) * b.Kin.Qmax / (25 * b.Efficiency)
			t.Logf("%s: %d h to %.0f %% (%.1f h in bulk alone), %d h accepting less than offered", chem, hours, b.Full*100, bulk, r.Absorption)
			if hours < 0 || hours > 14 {
				t.Errorf("%d h to full from 50 %% on C/4; want within an overnight charge (≤ 14 h)", hours)
			}
			if float64(hours) < 2*bulk {
				t.Errorf("%d h to full, under twice the %.1f h of bulk alone: the absorption stage is missing", hours, bulk)
			}
			if r.Absorption < 3 {
				t.Errorf("%d h of absorption, want several (≥ 3)", r.Absorption)
			}
		})
	}
}

// week is a week of cruising days: the loads spread over the day, solar
// by day, and the engine's alternator for engine hours from 08:00.
func week(loadAh, peakAmps, alternator, engine float64) []Flow {
	out := make([]Flow, 7*24)
	for i := range out {
		h := float64(i % 24)
		out[i].Load = loadAh / 24
		if h >= 7 && h < 17 {
			out[i].Solar = peakAmps * math.Sin(math.Pi*(h-6)/11)
		}
		out[i].Charger = alternator * math.Max(0, math.Min(1, 8+engine-h))
		if h < 8 {
			out[i].Charger = 0
		}
	}
	return out
}

// TestAcceptanceMatters: with the first model, switching its taper off
// moved a design's lowest state of charge by 0.07 points (issue 13). A
// lead-acid bank charged by its engine an hour and a half a day is now held
// back by its acceptance: the same week with every ampere-hour accepted (one
// well) keeps it several points higher.
func TestAcceptanceMatters(t *testing.T) {
	b := simOf(t, "agm", "105 Ah", 3, 0.5)
	flows := week(110, 6, 60, 1.5)
	kinetic := one(t, b, flows, nil)
	open := b
	open.Kin = NewKinetic(1, 1, b.Kin.Qmax)
	all := one(t, open, flows, nil)
	t.Logf("lowest %.2f %% with acceptance, %.2f %% without; %d h of absorption", kinetic.Lowest*100, all.Lowest*100, kinetic.Absorption)
	if d := (all.Lowest - kinetic.Lowest) * 100; d < 3 {
		t.Errorf("acceptance moves the lowest state of charge by %.2f points, want at least 3", d)
	}
	if kinetic.Absorption == 0 {
		t.Error("no hour of absorption over the week")
	}
}

// TestLedgerBalances runs three banks joined by a DC-DC charger, a
// combiner and an isolator, with windows of load and charge, a cold hour
// and Peukert factors, and checks each bank's ledger balances hour by
// hour's sum: E_end − E_start = charged − drawn + unmet, offered = link out
// + direct + charged + charge loss + not taken, loads = direct + drawn −
// Peukert.
func TestLedgerBalances(t *testing.T) {
	banks := []SimBank{
		simOf(t, "lifepo4", "200 Ah", 2, 0.8),
		simOf(t, "flooded", "110 Ah", 2, 0.5),
		simOf(t, "agm", "105 Ah", 2, 0.5),
		simOf(t, "gel", "90 Ah", 1, 0.5),
	}
	banks[0].MaxCharge = 100
	links := []SimLink{
		{Name: "dcdc", Kind: "dc-dc", From: 1, To: 0, Rating: 30, Efficiency: 0.92, VIn: 14.8, VOut: 14.2},
		{Name: "vsr", Kind: "combiner", From: 1, To: 2, Rating: 140},
		{Name: "iso", Kind: "isolator", From: 2, To: 3, Rating: 70, Drop: 0.7},
	}
	n := 24 * 12
	flows := make([][]Flow, len(banks))
	for b := range flows {
		flows[b] = make([]Flow, n)
	}
	for i := range n {
		h := i % 24
		day := i / 24
		flows[0][i] = Flow{Load: 4 + 6*math.Abs(math.Sin(float64(i)/5)), Peukert: 1}
		if h >= 7 && h < 18 {
			flows[0][i].Solar = 20 * math.Sin(math.Pi*float64(h-6)/12)
		}
		flows[0][i].Cold = day == 3
		flows[2][i] = Flow{Load: 0.5, Peukert: 1.3}
		flows[3][i] = Flow{Load: 1.5, Peukert: 1}
		if h == 20 && day%3 == 0 {
			flows[2][i].Load = 120 // a thruster's burst
			flows[2][i].Peukert = 1.5
		}
		if day%2 == 0 && h >= 9 && h < 13 {
			flows[1][i].Charger = 49 // the engine's alternator
		}
		if day%4 == 1 && h >= 8 && h < 10 {
			flows[3][i].Charger = 10
		}
	}
	runs, lruns := Simulate(banks, links, flows)
	for b, r := range runs {
		lg := r.Ledger
		if got, want := lg.End-lg.Start, lg.Charged-lg.Drawn+lg.Unmet; math.Abs(got-want) > 1e-6 {
			t.Errorf("%s: ΔE %v Wh, charged − drawn + unmet %v Wh", banks[b].Name, got, want)
		}
		if got, want := lg.Offered, lg.LinkOut+lg.Direct+lg.Charged+lg.ChargeLoss+lg.Spilled; math.Abs(got-want) > 1e-6 {
			t.Errorf("%s: offered %v Wh, accounted for %v Wh", banks[b].Name, got, want)
		}
		if got, want := lg.Loads, lg.Direct+lg.Drawn-lg.Peukert; math.Abs(got-want) > 1e-6 {
			t.Errorf("%s: loads %v Wh, direct + drawn − Peukert %v Wh", banks[b].Name, got, want)
		}
		for h, soc := range r.SoC {
			if soc > 1+1e-9 || soc < banks[b].Floor/banks[b].Kin.Qmax-1e-9 {
				t.Fatalf("%s hour %d: SoC %v outside [floor, full]", banks[b].Name, h, soc)
			}
		}
	}
	if runs[0].Ledger.LinkIn == 0 || runs[1].Ledger.LinkOut == 0 || runs[2].Ledger.LinkIn == 0 || runs[3].Ledger.LinkIn == 0 {
		t.Errorf("a link passed nothing: %+v", lruns)
	}
	if runs[2].Ledger.Peukert == 0 {
		t.Error("no Peukert loss on the thruster bank's bursts")
	}
}

// TestDCDC works a DC-DC charger by hand: 30 A rated at 92 %, from a start
// bank charged at 14.8 V to a lithium bank at 14.2 V, draws
// 30 × 14.2 / (0.92 × 14.8) = 31.287 A; on a 49 A alternator the start
// bank keeps the other 17.713 A. On a 10 A alternator it draws the 10 A and gives
// 10 × 0.92 × 14.8 / 14.2 = 9.589 A. With the engine off it draws nothing.
func TestDCDC(t *testing.T) {
	house := simOf(t, "lifepo4", "200 Ah", 2, 0.8)
	house.MaxCharge = 200
	start := simOf(t, "flooded", "110 Ah", 2, 0.5)
	link := []SimLink{{Name: "dcdc", Kind: "dc-dc", From: 1, To: 0, Rating: 30, Efficiency: 0.92, VIn: 14.8, VOut: 14.2}}
	at := []Wells{house.Kin.At(0.5), start.Kin.At(0.99)}
	for _, tt := range []struct {
		alternator, in, out float64
	}{
		{49, 31.2867, 30},
		{10, 10, 9.5887},
		{0, 0, 0},
	} {
		flows := [][]Flow{{{}}, {{Charger: tt.alternator}}}
		runs, lruns := simulateFrom([]SimBank{house, start}, link, flows, at)
		if got := runs[1].Ledger.LinkOut / start.Volts; math.Abs(got-tt.in) > 1e-3 {
			t.Errorf("alternator %g A: DC-DC draws %.4f A, want %v", tt.alternator, got, tt.in)
		}
		if got := lruns[0].Ah; math.Abs(got-tt.out) > 1e-3 {
			t.Errorf("alternator %g A: DC-DC gives %.4f A, want %v", tt.alternator, got, tt.out)
		}
		if got, want := runs[0].Ledger.Charged/house.Volts, lruns[0].Ah*house.Efficiency; math.Abs(got-want) > 1e-9 {
			t.Errorf("alternator %g A: house stores %.4f Ah, want %.4f", tt.alternator, got, want)
		}
		if runs[1].Ledger.Drawn != 0 {
			t.Errorf("alternator %g A: the start battery gave %v Wh to the DC-DC charger", tt.alternator, runs[1].Ledger.Drawn)
		}
	}
}

// TestCombinerAndIsolator: a combiner shares a charged bank's surplus with
// the other bank in proportion to what each accepts, and passes nothing
// while neither is charged; an isolator passes one way only.
func TestCombinerAndIsolator(t *testing.T) {
	a := simOf(t, "flooded", "110 Ah", 2, 0.5)
	b := simOf(t, "agm", "105 Ah", 2, 0.5)
	at := []Wells{a.Kin.At(0.7), b.Kin.At(0.7)}
	for _, kind := range []string{"combiner", "isolator"} {
		link := []SimLink{{Name: kind, Kind: kind, From: 0, To: 1, Rating: 140}}
		// A charged at 60 A: both take part; the split follows acceptance.
		runs, lruns := simulateFrom([]SimBank{a, b}, link, [][]Flow{{{Charger: 60}}, {{Load: 2}}}, at)
		accA := math.Min(a.Kin.MaxCharge(at[0])/a.Efficiency, a.MaxCharge)
		accB := math.Min(b.Kin.MaxCharge(at[1])/b.Efficiency, b.MaxCharge)
		wantB := 58 * accB / (accA + accB) // the surplus 60 − 2, shared
		if got := lruns[0].Ah; math.Abs(got-(wantB+2)) > 1e-6 {
			t.Errorf("%s: passes %.4f A, want %.4f (B's loads and its share)", kind, got, wantB+2)
		}
		if runs[1].Ledger.Drawn != 0 {
			t.Errorf("%s: B's battery gave %v Wh while A was charged", kind, runs[1].Ledger.Drawn)
		}
		// Neither charged: nothing passes, each battery carries its own loads.
		_, lruns = simulateFrom([]SimBank{a, b}, link, [][]Flow{{{Load: 5}}, {{Load: 2}}}, at)
		if lruns[0].Ah != 0 {
			t.Errorf("%s: passed %v A with neither bank charged", kind, lruns[0].Ah)
		}
		// Only B charged: a combiner passes its surplus to A, an isolator not.
		_, lruns = simulateFrom([]SimBank{a, b}, link, [][]Flow{{{Load: 5}}, {{Charger: 30}}}, at)
		if kind == "combiner" && lruns[0].Ah == 0 {
			t.Error("combiner: passed nothing from a charged To bank")
		}
		if kind == "isolator" && lruns[0].Ah != 0 {
			t.Errorf("isolator: passed %v A backwards", lruns[0].Ah)
		}
	}
	// A rating caps what passes.
	link := []SimLink{{Name: "small", Kind: "combiner", From: 0, To: 1, Rating: 5}}
	_, lruns := simulateFrom([]SimBank{a, b}, link, [][]Flow{{{Charger: 60}}, {{Load: 20}}}, at)
	if lruns[0].Ah != 5 {
		t.Errorf("a 5 A combiner passed %v A", lruns[0].Ah)
	}
}

// TestColdLithium: a LiFePO4 bank below its charge-temperature limit takes
// no charge; its sources still feed its loads.
func TestColdLithium(t *testing.T) {
	b := simOf(t, "lifepo4", "100 Ah", 1, 0.8)
	start := b.Kin.At(0.5)
	r := one(t, b, constant(3, Flow{Solar: 10, Load: 4, Cold: true}), &start)
	if r.Ledger.Charged != 0 || math.Abs(r.SoC[2]-0.5) > 1e-12 {
		t.Errorf("charged %v Wh below the limit; SoC %v", r.Ledger.Charged, r.SoC[2])
	}
	if got, want := r.Ledger.Direct, 3*4*b.Volts; math.Abs(got-want) > 1e-9 {
		t.Errorf("loads fed directly %v Wh, want %v", got, want)
	}
	warm := one(t, b, constant(3, Flow{Solar: 10, Load: 4}), &start)
	if warm.Ledger.Charged == 0 {
		t.Error("not charged above the limit")
	}
}

// TestPeukertOnDischarge: what the battery gives its loads is multiplied
// by the hour's Peukert factor, and the ledger names the difference.
func TestPeukertOnDischarge(t *testing.T) {
	b := simOf(t, "flooded", "110 Ah", 1, 0.5)
	r := one(t, b, constant(2, Flow{Load: 10, Peukert: 1.4}), nil)
	if got, want := (1-r.SoC[1])*b.Kin.Qmax, 2*10*1.4; math.Abs(got-want) > 1e-9 {
		t.Errorf("gave %v Ah for 20 Ah of load at factor 1.4, want %v", got, want)
	}
	if got, want := r.Ledger.Peukert, 2*10*0.4*b.Volts; math.Abs(got-want) > 1e-9 {
		t.Errorf("Peukert %v Wh, want %v", got, want)
	}
}

// TestPeukertFactor: the factor is C / C_eff by PeukertCapacity, per
// battery of the bank (REFERENCES.md §9, derived values for 100 Ah at
// 20 h, k = 1.25: 70.71 Ah at 20 A), and 1 at or below the rated current.
func TestPeukertFactor(t *testing.T) {
	b := bankOf(t, "flooded", "12 V", "100 Ah", 2, 0.5)
	b.Spec.Battery.RatedHours = 20
	b.Spec.Battery.Peukert = ptr(1.25)
	if got, want := peukertFactor(b, 40), 100/70.71; math.Abs(got-want) > 1e-3 {
		t.Errorf("40 A on two batteries: factor %v, want %v", got, want)
	}
	if got := peukertFactor(b, 10); got != 1 {
		t.Errorf("at the rated current (5 A each): factor %v, want 1", got)
	}
}

// TestTimesOfDay: a source runs from 08:00 for its hours, past midnight
// if long enough (a shore charger all day); within its windows otherwise;
// a load with windows draws within them, past midnight too.
func TestTimesOfDay(t *testing.T) {
	hoursOn := func(spans []span) []float64 {
		out := make([]float64, 24)
		for h := range out {
			out[h] = overlap(spans, h)
		}
		return out
	}
	tests := []struct {
		name  string
		spans []span
		want  map[int]float64 // hours not listed are 0
	}{
		{"engine 5 h from 08:00", runSpans(5, nil), map[int]float64{8: 1, 9: 1, 10: 1, 11: 1, 12: 1}},
		{"engine 2.5 h", runSpans(2.5, nil), map[int]float64{8: 1, 9: 1, 10: 0.5}},
		{"charger 18 h runs past midnight", runSpans(18, nil), map[int]float64{8: 1, 9: 1, 10: 1, 11: 1, 12: 1, 13: 1, 14: 1, 15: 1, 16: 1, 17: 1, 18: 1, 19: 1, 20: 1, 21: 1, 22: 1, 23: 1, 0: 1, 1: 1}},
		{"generator 3 h in its evening window", runSpans(3, []schema.Window{{From: 18, To: 23}}), map[int]float64{18: 1, 19: 1, 20: 1}},
		{"windows in turn", runSpans(3, []schema.Window{{From: 7, To: 9}, {From: 19, To: 21}}), map[int]float64{7: 1, 8: 1, 19: 1}},
		{"anchor light 21 to 06", windowSpans([]schema.Window{{From: 21, To: 6}}), map[int]float64{21: 1, 22: 1, 23: 1, 0: 1, 1: 1, 2: 1, 3: 1, 4: 1, 5: 1}},
		{"half hours", windowSpans([]schema.Window{{From: 18.5, To: 20.5}}), map[int]float64{18: 0.5, 19: 1, 20: 0.5}},
	}
	for _, tt := range tests {
		got := hoursOn(tt.spans)
		for h := range 24 {
			if math.Abs(got[h]-tt.want[h]) > 1e-12 {
				t.Errorf("%s: hour %d on %v, want %v", tt.name, h, got[h], tt.want[h])
			}
		}
	}
	// A shore charger set to the whole day runs every hour.
	for h, on := range hoursOn(runSpans(24, nil)) {
		if on != 1 {
			t.Errorf("24 h charger: hour %d on %v", h, on)
		}
	}
}

// TestSimulateNoCharge: with no charge source the state of charge falls by
// exactly the loads' charge down to the floor, where the run records the
// unmet energy.
func TestSimulateNoCharge(t *testing.T) {
	b := simOf(t, "lifepo4", "100 Ah", 1, 0.5) // one well: nothing held back
	r := one(t, b, constant(24, Flow{Load: 3}), nil)
	for i, soc := range r.SoC {
		want := math.Max(50, 100-3*float64(i+1)) / 100
		if math.Abs(soc-want) > 1e-12 {
			t.Fatalf("hour %d: SoC %v, want %v", i, soc, want)
		}
	}
	// 24 × 3 = 72 Ah asked, 50 Ah above the floor: 22 Ah = 264 Wh unmet
	// at the battery's 12 V.
	if math.Abs(r.Ledger.Unmet-22*12) > 1e-9 {
		t.Errorf("unmet = %v Wh, want %v", r.Ledger.Unmet, 22*12)
	}
	if r.FirstBreach != 16 { // the 17th hour takes it below 50 Ah
		t.Errorf("first breach at hour %d, want 16", r.FirstBreach)
	}
}

// TestSimulateMoreArrayNeverWorse: doubling the array never lowers the
// lowest state of charge nor adds unmet load.
func TestSimulateMoreArrayNeverWorse(t *testing.T) {
	b := simOf(t, "agm", "105 Ah", 2, 0.5)
	for _, peak := range []float64{0, 2, 6, 15, 40} {
		flows := week(100, peak, 40, 1)
		one1 := one(t, b, flows, nil)
		for i := range flows {
			flows[i].Solar *= 2
		}
		two := one(t, b, flows, nil)
		if two.Lowest < one1.Lowest-1e-12 {
			t.Errorf("array %v A: doubled gives lowest %v, below %v", peak, two.Lowest, one1.Lowest)
		}
		if two.Ledger.Unmet > one1.Ledger.Unmet+1e-9 {
			t.Errorf("array %v A: doubled leaves %v Wh unmet, more than %v", peak, two.Ledger.Unmet, one1.Ledger.Unmet)
		}
	}
}

// yearOf is a year of hours on one bank: a steady load, solar by day, an
// engine every third day.
func yearOf() []Flow {
	out := make([]Flow, 365*24)
	for i := range out {
		h := i % 24
		out[i] = Flow{Load: 4, Peukert: 1}
		if h >= 7 && h <= 17 {
			out[i].Solar = 20 * math.Sin(math.Pi*float64(h-6)/12)
		}
		if (i/24)%3 == 0 && h >= 8 && h < 10 {
			out[i].Charger = 40
		}
	}
	return out
}

// BenchmarkSimulateYear runs one lead-acid bank over a year of hours; it
// must take well under a millisecond.
func BenchmarkSimulateYear(b *testing.B) {
	bank := simOf(b, "agm", "105 Ah", 3, 0.5)
	flows := [][]Flow{yearOf()}
	b.ReportAllocs()
	for b.Loop() {
		Simulate([]SimBank{bank}, nil, flows)
	}
}

// BenchmarkSimulateYearThreeBanks runs a house, start and thruster bank
// with a DC-DC charger and a combiner over a year of hours: three
// bank-years, each well under a millisecond.
func BenchmarkSimulateYearThreeBanks(b *testing.B) {
	banks := []SimBank{
		simOf(b, "lifepo4", "200 Ah", 2, 0.8),
		simOf(b, "flooded", "110 Ah", 2, 0.5),
		simOf(b, "agm", "105 Ah", 2, 0.5),
	}
	links := []SimLink{
		{Name: "dcdc", Kind: "dc-dc", From: 1, To: 0, Rating: 30, Efficiency: 0.92, VIn: 14.8, VOut: 14.2},
		{Name: "vsr", Kind: "combiner", From: 1, To: 2, Rating: 140},
	}
	house := yearOf()
	start := make([]Flow, len(house))
	thruster := make([]Flow, len(house))
	for i := range house {
		start[i].Charger, house[i].Charger = house[i].Charger, 0
		thruster[i] = Flow{Load: 0.4, Peukert: 1.2}
	}
	flows := [][]Flow{house, start, thruster}
	b.ReportAllocs()
	for b.Loop() {
		Simulate(banks, links, flows)
	}
}

// TestLayoutDay: a shore charger set to run the whole period of a
// scenario on shore power charges every hour, overnight too (the first
// model ran every charger from 08:00 only); an alternator runs the
// engine's hours from 08:00; a load with windows draws within them and one
// without is spread over the day.
func TestLayoutDay(t *testing.T) {
	b := bankOf(t, "agm", "12 V", "105 Ah", 3, 0.5)
	b.Sources = []*model.Source{
		{Name: "shore", Kind: model.ShoreCharger, Output: 30, Charger: &schema.Charger{Kind: "shore"}},
		{Name: "alternator", Kind: model.Alternator, Output: 40, Charger: &schema.Charger{Kind: "alternator"}},
	}
	harbour := schema.Scenario{Hours: 24, ShorePower: true}
	for h, a := range chargerDay(b, "harbour", harbour) {
		if a != 30 {
			t.Errorf("harbour hour %d: %v A, want the shore charger's 30 A", h, a)
		}
	}
	passage := schema.Scenario{Hours: 24, EngineHours: 3}
	for h, a := range chargerDay(b, "passage", passage) {
		want := 0.0
		if h >= 8 && h < 11 {
			want = 40
		}
		if a != want {
			t.Errorf("passage hour %d: %v A, want %v", h, a, want)
		}
	}

	vb := &VoyageBank{Bank: b, Model: BankModel{Voltage: 12}}
	se := &ScenarioEnergy{Name: "anchor", Hours: 24, Loads: []LoadEnergy{
		{Name: "anchor-light", Wh: 18, Watts: 2, Windows: []schema.Window{{From: 21, To: 6}}},
		{Name: "fridge", Wh: 480, Watts: 48},
	}}
	load, peukert := loadDay(vb, se, schema.Scenario{Hours: 24})
	for h := range 24 {
		want := 40.0 / 24 // the fridge, 480 Wh ÷ 12 V over the day
		if h >= 21 || h < 6 {
			want += 18.0 / 12 / 9 // the anchor light's 1.5 Ah over its 9 hours
		}
		if math.Abs(load[h]-want) > 1e-12 {
			t.Errorf("hour %d: %v A, want %v", h, load[h], want)
		}
		if peukert[h] != 1 { // no exponent in the catalog entry
			t.Errorf("hour %d: Peukert factor %v, want 1", h, peukert[h])
		}
	}
}

// TestPeukertAtLoadCurrent: a windlass draws 85 A while it runs, a third
// of it from each of three 110 Ah batteries, so Peukert's law applies at
// 28.3 A a battery whatever the hour's mean; the fridge beside it, below
// the rated current, is not corrected. The hour's factor weighs the two by
// their charge.
func TestPeukertAtLoadCurrent(t *testing.T) {
	b := bankOf(t, "flooded", "12 V", "110 Ah", 3, 0.5)
	b.Spec.Battery.RatedHours = 20
	b.Spec.Battery.Peukert = ptr(1.25)
	vb := &VoyageBank{Bank: b, Model: BankModel{Voltage: 12}}
	se := &ScenarioEnergy{Name: "anchor", Hours: 24, Loads: []LoadEnergy{
		{Name: "windlass", Wh: 102, Watts: 1020},
		{Name: "fridge", Wh: 480, Watts: 60},
	}}
	_, peukert := loadDay(vb, se, schema.Scenario{Hours: 24})
	f := 110 / PeukertCapacity(110, 20, 1.25, 85.0/3)
	want := (102*f + 480) / 582
	for h := range 24 {
		if math.Abs(peukert[h]-want) > 1e-12 {
			t.Fatalf("hour %d: factor %v, want %v (windlass at %.3f)", h, peukert[h], want, f)
		}
	}
}

// TestTooColdToCharge: a LiFePO4 bank below its battery's charge limit is
// not charged: at its own temperature, or, outside the cabin and engine
// space, at the month's daytime ambient when that is lower.
func TestTooColdToCharge(t *testing.T) {
	b := bankOf(t, "lifepo4", "12.8 V", "100 Ah", 1, 0.8)
	b.Spec.Battery.ChargeLowLimit = &unit.Temperature{Quantity: q(t, "0 °C", unit.DimTemperature)}
	b.Spec.Temperature = unit.Temperature{Quantity: q(t, "12 °C", unit.DimTemperature)}
	site := schema.Site{DayAmbient: map[string]unit.Temperature{"Jan": {Quantity: q(t, "-3 °C", unit.DimTemperature)}}}
	for _, tt := range []struct {
		location string
		month    int
		want     bool
	}{
		{"cabin", 0, false},    // the cabin keeps its 12 °C
		{"deck-box", 0, true},  // a deck box follows January's −3 °C
		{"deck-box", 1, false}, // no February figure: the bank's own
		{"engine-space", 0, false},
	} {
		b.Spec.Location = tt.location
		if got := tooColdToCharge(b, site, tt.month); got != tt.want {
			t.Errorf("%s in %s: too cold %v, want %v", tt.location, Months[tt.month], got, tt.want)
		}
	}
	b.Spec.Temperature = unit.Temperature{Quantity: q(t, "-2 °C", unit.DimTemperature)}
	b.Spec.Location = "cabin"
	if !tooColdToCharge(b, site, 5) {
		t.Error("a bank at −2 °C charged against a 0 °C limit")
	}
}

// TestChargeCurrentLimits: a battery takes no more than its maker's
// maximum charge current, and a lead-acid bank no more than the rulebook's
// charge-rate bound (common practice: 30 % of capacity), however much is
// offered and however empty it is.
func TestChargeCurrentLimits(t *testing.T) {
	rules := defaultRulebook(t)
	lfp := bankOf(t, "lifepo4", "12.8 V", "100 Ah", 2, 0.8)
	lfp.Spec.Battery.MaxCharge = ptr(unit.Current{Quantity: q(t, "50 A", unit.DimCurrent)})
	agm := bankOf(t, "agm", "12 V", "100 Ah", 1, 0.5)
	for _, tt := range []struct {
		name  string
		b     SimBank
		limit float64
	}{
		{"LiFePO4 2 × 50 A", simBank(lfp, Bank(lfp, rules), rules), 100},
		{"AGM 100 Ah at 30 % of C", simBank(agm, Bank(agm, rules), rules), rules.ChargeRate.LeadAcidMax * 100},
	} {
		start := tt.b.Kin.At(0.3)
		r := one(t, tt.b, constant(1, Flow{Charger: 500}), &start)
		gross := (r.Ledger.Charged + r.Ledger.ChargeLoss) / tt.b.Volts
		if math.Abs(gross-tt.limit) > 1e-9 {
			t.Errorf("%s: took %.3f A of 500 A offered, limit %v A", tt.name, gross, tt.limit)
		}
	}
}
