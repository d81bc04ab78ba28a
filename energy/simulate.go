package energy

import "math"

// Flow is what one bank sees in one hour of a run: currents in amperes at
// the bank, means over the hour.
type Flow struct {
	// Load is what the bank's loads draw, at its nominal voltage.
	Load float64
	// Peukert is the factor (1 or more) on the charge the battery gives
	// its loads this hour: Peukert's law at the loads' currents. 0 is 1.
	Peukert float64
	// Solar is its solar controllers' output and Charger its other
	// sources' (alternators, chargers) while they run.
	Solar, Charger float64
	// Cold is true when the battery may not be charged this hour (LiFePO4
	// below its charge-temperature limit): its sources may still feed its
	// loads.
	Cold bool
}

// SimBank is a bank as the simulation sees it.
type SimBank struct {
	Name string
	// Volts is the nominal voltage at which charge (Ah) is counted as
	// energy (Wh) in the ledger.
	Volts float64
	Kin   Kinetic
	// Efficiency is the ampere-hour efficiency of charge: the fraction of
	// the current into the battery that it stores.
	Efficiency float64
	// MaxCharge is the largest current the battery takes at its terminals,
	// A (+Inf for no limit): the makers' maximum charge current, and for
	// lead-acid the rulebook's charge-rate bound.
	MaxCharge float64
	// Floor is the least charge the bank may hold, Ah.
	Floor float64
	// Full is the state of charge from which it counts as full again.
	Full float64
}

// SimLink is a link between two banks as the simulation sees it.
type SimLink struct {
	Name string
	Kind string // "dc-dc", "combiner" or "isolator"
	// From and To index the banks it joins.
	From, To int
	// Rating is the most current it passes, A: a DC-DC charger's rated
	// output, a combiner's contacts, an isolator's diodes.
	Rating float64
	// Efficiency of a DC-DC charger, and the voltages of its input and
	// output while it charges.
	Efficiency float64
	VIn, VOut  float64
	// Drop is an isolator's forward voltage drop, V.
	Drop float64
}

// Ledger is a bank's energy account over a run, Wh at its nominal voltage.
// Its terms balance:
//
//	End − Start = Charged − Drawn + Unmet
//	Offered = LinkOut + Direct + Charged + ChargeLoss + Spilled
//	Loads = Direct + Drawn − Peukert
type Ledger struct {
	// Start and End are the energy held before the first hour and after
	// the last.
	Start, End float64
	// Offered is what the bank's own sources and the links into it
	// offered; LinkIn the links' part of it, LinkOut what its sources'
	// surplus passed on through links to other banks.
	Offered, LinkIn, LinkOut float64
	// Direct is what the sources gave its loads directly, while they ran.
	Direct float64
	// Charged is what the battery stored, ChargeLoss what its charge
	// efficiency lost, Spilled what was offered and not taken (the bank
	// full, or accepting less: absorption).
	Charged, ChargeLoss, Spilled float64
	// Drawn is what the loads asked of the battery beyond the sources,
	// Peukert's law included; Peukert is that law's part of it, and Unmet
	// the part the bank could not give above its floor.
	Drawn, Peukert, Unmet float64
	// Loads is what the loads drew in all.
	Loads float64
}

// scale turns a ledger kept in ampere-hours into watt-hours at v volts.
func (lg *Ledger) scale(v float64) {
	for _, x := range []*float64{&lg.Start, &lg.End, &lg.Offered, &lg.LinkIn, &lg.LinkOut, &lg.Direct,
		&lg.Charged, &lg.ChargeLoss, &lg.Spilled, &lg.Drawn, &lg.Peukert, &lg.Unmet, &lg.Loads} {
		*x *= v
	}
}

// BankRun is the outcome of one bank's run.
type BankRun struct {
	// SoC is the state of charge at the end of each hour, 0–1.
	SoC []float64
	// Lowest is the lowest state of charge, at hour LowestAt (1 and 0
	// when it never fell).
	Lowest   float64
	LowestAt int
	// FirstBreach is the first hour with unmet load, or −1.
	FirstBreach int
	// RecoverHours is how long after the lowest point the bank was full
	// again (SimBank.Full), 0 when it never fell below full, −1 when it was
	// not full again within the run.
	RecoverHours int
	// Absorption is the hours the bank took all it would accept, less than
	// its maximum charge current, before it was full: the hours its
	// acceptance held the charge back.
	Absorption int
	Ledger     Ledger
}

// LinkRun is what a link passed over a run.
type LinkRun struct {
	// Ah is the charge delivered into its To bank (for a combiner, either
	// way), and Loss the energy lost in it, Wh: a DC-DC charger's
	// conversion, an isolator's forward drop.
	Ah, Loss float64
}

// Simulate runs banks hour by hour together, starting full at rest, with
// flows[b][h] what bank b sees in hour h and links between them. Each hour:
//
//   - each bank's acceptance: what its wells take in the hour by the
//     kinetic battery model (Kinetic.MaxCharge), over its charge
//     efficiency, not above its maximum charge current, nothing when Cold;
//   - its surplus: its own sources less its loads;
//   - DC-DC chargers (by name) run while their input bank has a surplus
//     (a charger with an engine-run trigger senses the charging voltage):
//     they draw from that surplus, no more than their rated output needs
//     at their efficiency, I_in = I_out × V_out / (η × V_in), and deliver
//     into their output bank no more than it takes;
//   - combiners close while either bank has a surplus (its voltage is up),
//     and share the surplus of both between them in proportion to what
//     each accepts; an isolator passes its input bank's surplus one way
//     the same way; neither passes more than its rating, and neither
//     passes charge out of a battery;
//   - what remains is each bank's net current: above zero it charges the
//     battery up to its acceptance, the rest not taken; below zero the
//     battery gives it to the loads, times the hour's Peukert factor, down
//     to its floor and no faster than its available well allows; what it
//     cannot give is unmet.
func Simulate(banks []SimBank, links []SimLink, flows [][]Flow) ([]BankRun, []LinkRun) {
	return simulateFrom(banks, links, flows, nil)
}

// simulateFrom is Simulate from the given wells (nil: every bank full at
// rest).
func simulateFrom(banks []SimBank, links []SimLink, flows [][]Flow, start []Wells) ([]BankRun, []LinkRun) {
	n := len(banks)
	hours := 0
	if n > 0 {
		hours = len(flows[0])
	}
	runs := make([]BankRun, n)
	lruns := make([]LinkRun, len(links))
	wells := make([]Wells, n)
	surplus := make([]float64, n)
	accept := make([]float64, n)
	full := make([]bool, n)
	inv := make([]float64, n)
	for b := range banks {
		inv[b] = 1 / banks[b].Kin.Qmax
	}
	linked := make([]bool, n)
	for _, l := range links {
		linked[l.From], linked[l.To] = true, true
	}
	for b := range banks {
		wells[b] = banks[b].Kin.At(1)
		if start != nil {
			wells[b] = start[b]
		}
		runs[b] = BankRun{SoC: make([]float64, hours), Lowest: 1, FirstBreach: -1, RecoverHours: -1}
		runs[b].Ledger.Start = wells[b].Q()
	}
	// The ledgers are kept in ampere-hours, and turned into watt-hours at
	// each bank's nominal voltage at the end.
	// DC-DC chargers first: they run on their input bank's surplus before
	// combiners and isolators share what is left.
	order := make([]int, 0, len(links))
	for pass := range 2 {
		for i, l := range links {
			if (l.Kind == "dc-dc") == (pass == 0) {
				order = append(order, i)
			}
		}
	}
	for h := range hours {
		for b := range banks {
			f := &flows[b][h]
			sb := &banks[b]
			w := wells[b]
			surplus[b] = f.Solar + f.Charger - f.Load
			accept[b] = 0
			// What the bank accepts matters when it has a surplus or a
			// link may bring it one.
			if !f.Cold && (surplus[b] > 0 || linked[b]) {
				stored := min(sb.Kin.MaxCharge(w), sb.Kin.Qmax-w.Q())
				accept[b] = max(0, min(stored/sb.Efficiency, sb.MaxCharge))
			}
			lg := &runs[b].Ledger
			lg.Offered += f.Solar + f.Charger
			lg.Loads += f.Load
		}
		for _, li := range order {
			l := &links[li]
			from, to := &runs[l.From].Ledger, &runs[l.To].Ledger
			if l.Kind == "dc-dc" {
				in, out := dcdc(l, surplus, accept)
				from.LinkOut += in
				to.LinkIn += out
				to.Offered += out
				lruns[li].Ah += out
				lruns[li].Loss += in*l.VIn - out*l.VOut
				continue
			}
			t := share(l, surplus, accept)
			if t < 0 {
				from, to = to, from
			}
			a := math.Abs(t)
			from.LinkOut += a
			to.LinkIn += a
			to.Offered += a
			lruns[li].Ah += a
			if l.Kind == "isolator" {
				lruns[li].Loss += a * l.Drop
			}
		}
		for b := range banks {
			f := &flows[b][h]
			sb := &banks[b]
			run := &runs[b]
			lg := &run.Ledger
			w := wells[b]
			net := surplus[b]
			switch {
			case net > 1e-12:
				lg.Direct += f.Load
				gross := min(net, accept[b])
				stored := gross * sb.Efficiency
				wells[b] = sb.Kin.Step(w, -stored)
				lg.Charged += stored
				lg.ChargeLoss += gross - stored
				lg.Spilled += net - gross
				// Held back by the wells, not by a current limit: a bank
				// given all it would take (a link passes no more) is absorbing.
				if net >= accept[b]-1e-9 && !full[b] && !f.Cold && accept[b] < sb.MaxCharge-1e-9 {
					run.Absorption++
				}
			case net > -1e-12: // sources and loads even: the wells settle
				lg.Direct += f.Load + net
				lg.Spilled += net
				wells[b] = sb.Kin.Step(w, 0)
			default:
				lg.Direct += f.Load + net
				pf := max(f.Peukert, 1)
				ask := -net * pf
				// The available well gives at least what it holds; the
				// closed form is needed only beyond that.
				room := w.Q() - sb.Floor
				if ask > w.Q1 {
					room = min(room, sb.Kin.MaxDischarge(w))
				}
				room = max(0, room)
				give := min(ask, room)
				wells[b] = sb.Kin.Step(w, give)
				lg.Drawn += ask
				lg.Peukert += ask + net
				if unmet := ask - give; unmet > 1e-12 {
					lg.Unmet += unmet
					if run.FirstBreach < 0 {
						run.FirstBreach = h
					}
				}
			}
			soc := wells[b].Q() * inv[b]
			full[b] = soc >= sb.Full
			run.SoC[h] = soc
			if soc < run.Lowest-1e-12 {
				run.Lowest, run.LowestAt = soc, h
			}
		}
	}
	for b := range banks {
		run := &runs[b]
		run.Ledger.End = wells[b].Q()
		run.Ledger.scale(banks[b].Volts)
		if run.Lowest >= banks[b].Full {
			run.RecoverHours = 0
			continue
		}
		for h := run.LowestAt; h < hours; h++ {
			if run.SoC[h] >= banks[b].Full {
				run.RecoverHours = h - run.LowestAt
				break
			}
		}
	}
	return runs, lruns
}

// dcdc runs DC-DC charger l for one hour: from its input bank's surplus,
// no more than its rated output needs, into what its output bank takes
// beyond its own surplus. It moves the currents between the banks'
// surpluses and returns its input and output currents, A.
func dcdc(l *SimLink, surplus, accept []float64) (in, out float64) {
	have := surplus[l.From]
	if have <= 0 {
		return 0, 0
	}
	ratio := l.VOut / (l.Efficiency * l.VIn) // input amperes per output ampere
	out = min(l.Rating, have/ratio)
	if room := accept[l.To] - surplus[l.To]; out > room {
		out = max(0, room)
	}
	in = out * ratio
	surplus[l.From] -= in
	surplus[l.To] += out
	return in, out
}

// share runs combiner or isolator l for one hour and returns the current
// it passes from its From bank to its To bank (negative the other way).
// Closed while either bank has a surplus (an isolator: while its From bank
// has), it shares the two surpluses in proportion to what each bank
// accepts; where together they do not cover both banks' loads, or neither
// bank accepts more, it only carries one bank's surplus to the other's
// loads. It passes no more than the receiving bank takes, and never
// takes charge out of a battery.
func share(l *SimLink, surplus, accept []float64) float64 {
	a, b := l.From, l.To
	sa, sb := surplus[a], surplus[b]
	if (sa <= 0 && sb <= 0) || (l.Kind == "isolator" && sa <= 0) {
		return 0
	}
	var t float64
	total, acc := sa+sb, accept[a]+accept[b]
	switch {
	case total > 0 && acc > 0:
		t = sa - total*accept[a]/acc
	case sa > 0 && sb < 0:
		t = min(sa, -sb)
	case sb > 0 && sa < 0:
		t = -min(sb, -sa)
	}
	if l.Kind == "isolator" {
		t = max(t, 0)
	}
	// Nothing passes that the receiving bank would not take: what neither
	// accepts stays with the bank whose sources offered it.
	if t > 0 {
		t = min(t, max(0, accept[b]-sb))
	} else {
		t = -min(-t, max(0, accept[a]-sa))
	}
	t = max(-l.Rating, min(l.Rating, t))
	surplus[a] -= t
	surplus[b] += t
	return t
}
