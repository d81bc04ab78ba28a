package report

import (
	"fmt"
	"sort"
	"strings"
)

// cautions are the hazards of the work, what the pack does not do, and
// the rulebook values to verify.
func (p *pack) cautions() {
	d, r := p.d, p.r
	p.start("cautions", "Cautions", false)
	d.font(bold, 9.5)
	d.para(d.left(), d.width(), "This pack supports, and does not replace, a qualified marine electrician, nor the standards, class rules and local regulations that apply to the boat. Installation, inspection and sign-off are for competent people working to those rules.")
	d.y += 3

	fault := ""
	maxI := 0.0
	for _, f := range p.figures("protection.faultCurrent") {
		if f.Value > maxI {
			maxI = f.Value
			fault = fmt.Sprintf(" In this design the bank can drive about %s A into a short circuit on run %s.", fixed(f.Value, 0), f.Subject)
		}
	}
	hazards := [][2]string{
		{"DC fault currents and fire.", "A battery bank can deliver thousands of amperes into a short circuit, enough to heat a conductor to ignition in seconds and to weld tools." + fault + " Every conductor from a source needs its own overcurrent device, as close to the source as the rules require, with an interrupting rating above the prospective fault current. Never bypass a fuse or fit a larger one to stop it blowing: find the fault."},
		{"Battery gases and thermal runaway.", "Lead-acid batteries give off hydrogen when charged, which is explosive in air: ventilate battery spaces and keep sparks and flames away from them. Lithium batteries can go into thermal runaway, with fire and toxic gas, when overcharged, overdischarged, charged below their low-temperature limit, short-circuited or damaged: keep the battery management system and its disconnects in the circuit, and follow the maker's instructions. Secure every battery against the boat's motion and a capsize."},
		{"Ignition protection in engine and fuel spaces.", "Where petrol engines, petrol or LPG tanks or their fittings are, any device that can spark — switches, relays, breakers, motors, alternators, chargers — must be ignition-protected. A device that is not can ignite fuel vapour."},
		{"Isolate before work.", "Open the battery switches and disconnect the bank at its terminals before working on the system. Solar arrays are live whenever light falls on them: cover them or open their isolators. Chargers, the alternator, shore power and the inverter can energise the system too. Prove it dead with a meter before touching it."},
		{"Chafe and corrosion.", "Support conductors along their length and protect them where they pass through bulkheads, near edges, hot or moving parts. Use tinned marine cable and sealed terminals, keep connections out of bilge water, and inspect them regularly: a loose or corroded joint has resistance, heats up and can start a fire."},
	}
	for _, h := range hazards {
		d.need(14)
		d.font(bold, 9)
		d.text(d.left(), d.y+3.2, h[0])
		d.y += 4.4
		p.note(8.5, colInk, h[1])
		d.y += 2.5
	}

	p.sub("What the figures are and are not", 20)
	for _, s := range []string{
		"The figures are computed from the design as declared. The boat must be built as designed — conductor lengths, sizes, devices and their positions — or the design changed and checked again. The inputs hash on every page identifies the inputs that were checked; a pack with a different hash is of a different design.",
		"The harvest, balance and design-voyage figures are estimates from the designer's irradiation data and published models, for mean days of each month; real days vary with the weather, shading and soiling.",
		fmt.Sprintf("The limits, tables and factors come from the rulebook %q, edition %s. The pack names where each comes from on the calculation sheets; the yard is responsible for the rulebook matching the standards it works to.", r.Rulebook.Name, orDash(r.Rulebook.Edition)),
	} {
		p.note(8.5, colInk, s)
		d.y += 1.5
	}

	// Sources the rulebook marks as recalled, common practice or
	// secondary, with the checks and figures that use them.
	uses := map[string]map[string]bool{}
	add := func(src, id string) {
		if !needsVerifying(src) {
			return
		}
		if uses[src] == nil {
			uses[src] = map[string]bool{}
		}
		uses[src][id] = true
	}
	for _, f := range r.Figures {
		add(f.Source, string(f.ID))
	}
	for _, f := range r.Checks {
		add(f.Source, string(f.ID))
	}
	d.y += 2
	p.sub("Marks on sources", 16)
	p.note(8.5, colInk, "The calculation sheets, the findings and the list of sources mark a value that does not come from a published text, instead of repeating a caveat beside it:")
	d.y += 1
	for _, m := range provenanceLegend {
		d.need(8)
		d.font(bold, 10)
		d.textColor(colWarn)
		d.text(d.left()+1, d.y+3.4, m[0])
		d.textColor(colInk)
		d.font(regular, 8.5)
		y := d.y
		d.para(d.left()+7, d.width()-7, m[1])
		d.y = max(d.y, y+4.4) + 1
	}
	d.y += 2
	p.sub("Rulebook values to verify", 16)
	if len(uses) == 0 {
		p.note(8.5, colMuted, "The rulebook marks no value as recalled, common practice or secondary.")
		return
	}
	p.note(8.5, colInk, "The rulebook marks these values as recalled ("+markRecalled+"), common practice ("+markCommon+") or taken from secondary sources ("+markSecond+"), used by the checks and figures named. Verify each before the design is approved.")
	d.y += 1
	var srcs []string
	for s := range uses {
		srcs = append(srcs, s)
	}
	sort.Strings(srcs)
	var rows []trow
	for _, s := range srcs {
		var ids []string
		for id := range uses[s] {
			ids = append(ids, id)
		}
		sort.Strings(ids)
		rows = append(rows, cellsOf(marked(s), strings.Join(ids, ", ")))
	}
	d.table([]column{{head: "source as the rulebook gives it", w: 120}, {head: "used by", w: 60}}, rows, tableOpts{size: 7.5, title: "Rulebook values to verify", zebra: true})
}
