package report

import (
	"fmt"
	"strings"

	"github.com/ampwright/ampwright/result"
)

// wiring is the wiring schedule, one line per run, and the voltage-drop
// chart.
func (p *pack) wiring() {
	d, r := p.d, p.r
	p.start("wiring", "Wiring schedule and voltage drop", false)
	unit := "m"
	if r.Design.Units == "imperial" {
		unit = "ft"
	}
	p.note(8.5, colMuted, fmt.Sprintf("%s. Lengths are one way, in %s; the drop is over the run and its return, as a percentage of the nominal voltage, against the limit of the circuit's class. Ampacity is derated for engine spaces and bundling.", plural(len(r.Wiring), "run"), map[string]string{"m": "metres", "ft": "feet"}[unit]))
	d.y += 1
	var rows []trow
	for _, w := range r.Wiring {
		drop, limit := "-", "-"
		if w.DropLimit > 0 {
			drop, limit = fixed(w.Drop, 2), fnum(w.DropLimit)
		}
		prot := cell{s: orDash(w.Protection)}
		if w.Protection == "" {
			prot.color = &colMuted
		}
		row := trow{cells: []cell{
			{s: w.Name, bold: true},
			{s: w.From + " → " + w.To},
			{s: w.Role},
			{s: strings.TrimSuffix(strings.TrimSuffix(p.lengthIn(w.Length), " m"), " ft")},
			{s: w.Size},
			{s: currentText(w)},
			p.dropCell(w, drop),
			{s: limit},
			p.ampacityCell(w),
			prot,
			statusCell(w.Status),
		}, fill: statusFill(w.Status)}
		rows = append(rows, row)
	}
	d.table([]column{
		{head: "run", w: 25}, {head: "from → to", w: 38}, {head: "role", w: 11}, {head: "length " + unit, w: 12, align: "R"},
		{head: "size", w: 14}, {head: "current A", w: 13, align: "R"}, {head: "drop %", w: 11, align: "R"}, {head: "limit %", w: 11, align: "R"},
		{head: "ampacity A", w: 14, align: "R"}, {head: "protection", w: 19}, {head: "status", w: 12},
	}, rows, tableOpts{size: 7, title: "Wiring schedule", zebra: true})
	d.y += 1
	p.note(7, colMuted, "The status is the worst of the run's wiring and protection findings; a dash under protection means the run has no device of its own (it is protected upstream, or is a PV run checked at 1.56 × Isc). Currents are design currents: the loads fed at full draw, a source's maximum, PV at 1.56 × Isc; for a PV run the current its drop is taken at (its strings at maximum power, Imp × strings) follows the slash.")
	d.y += 4
	p.dropChart()
}

// currentText is a run's design current, and for a PV run the current its
// drop is taken at after a slash.
func currentText(w result.WiringLine) string {
	if w.DropCurrent > 0 {
		return fixed(w.Current, 1) + " / " + fixed(w.DropCurrent, 1)
	}
	return fixed(w.Current, 1)
}

// dropCell marks a drop over its limit.
func (p *pack) dropCell(w result.WiringLine, s string) cell {
	if f, ok := p.finding("wiring.voltageDrop", w.Name); ok && f.Status != result.Pass {
		c := statusColor(f.Status)
		return cell{s: s, bold: true, color: &c}
	}
	return cell{s: s}
}

// ampacityCell marks an ampacity the current exceeds.
func (p *pack) ampacityCell(w result.WiringLine) cell {
	c := cell{s: fixed(w.Ampacity, 0)}
	if f, ok := p.finding("wiring.ampacity", w.Name); ok && f.Status != result.Pass {
		col := statusColor(f.Status)
		c.bold, c.color = true, &col
	}
	return c
}
