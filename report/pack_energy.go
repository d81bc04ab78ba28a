package report

import (
	"fmt"
	"strings"

	"github.com/ampwright/ampwright/result"
)

// energy is the energy budget of each scenario and the battery bank.
func (p *pack) energy() {
	d, r := p.d, p.r
	p.start("energy", "Energy budget and battery bank", false)
	if len(r.Budget) == 0 {
		p.note(9, colMuted, "The design declares no scenarios.")
	}
	for _, b := range r.Budget {
		p.sub(fmt.Sprintf("%s: %s Wh per %s h", b.Scenario, fixed(b.Wh, 0), fnum(b.Hours)), 14)
		p.note(8.5, colMuted, fmt.Sprintf("%s Ah from the bank, mean %s A; %s Wh per day. Loads largest first.", fixed(b.Ah, 1), fixed(b.MeanCurrent, 2), fixed(b.WhPerDay, 0)))
		d.y += 1
		var rows []trow
		for _, l := range b.Loads {
			rows = append(rows, cellsOf(l.Name, fixed(l.Wh, 0), fixed(l.Share, 1), l.Formula))
		}
		total := cellsOf("total", fixed(b.Wh, 0), "100.0", fmt.Sprintf("over %s h = %s Ah at the nominal voltage", fnum(b.Hours), fixed(b.Ah, 1)))
		total.bold = true
		rows = append(rows, total)
		d.table([]column{{head: "load", w: 38}, {head: "Wh", w: 16, align: "R"}, {head: "share %", w: 15, align: "R"}, {head: "formula", w: 111}}, rows,
			tableOpts{size: 7.5, title: "Energy budget: " + b.Scenario, zebra: true})
		d.y += 3
	}

	p.sub("Battery bank", 20)
	for _, s := range banksOf(r) {
		bank := fmt.Sprintf("%d in series × %d in parallel of %s (%s).", s.Series, s.Parallel, orDash(s.Battery), orDash(s.Chemistry))
		if s.Name != "" {
			bank = fmt.Sprintf("%s (%s, %s): %s", s.Name, s.Role, s.System, bank)
		}
		p.note(9, colInk, bank)
	}
	d.y += 1
	var rows []trow
	for _, f := range r.Figures {
		if f.ID.Area() == "bank" {
			rows = append(rows, cellsOf(strings.TrimPrefix(string(f.ID), "bank."), f.Subject, fnum(f.Value), f.Unit, f.Formula))
		}
	}
	if len(rows) > 0 {
		d.table([]column{{head: "figure", w: 27}, {head: "for", w: 18}, {head: "value", w: 17, align: "R"}, {head: "unit", w: 11}, {head: "formula", w: 107}}, rows,
			tableOpts{size: 7.5, title: "Battery bank"})
		d.y += 3
	}
	p.findingTable("Bank checks", "bank.")
}

// findingTable lists the findings whose ID starts with prefix: value,
// limit, margin and verdict.
func (p *pack) findingTable(title, prefix string, also ...string) {
	d := p.d
	var rows []trow
	for _, f := range p.r.Checks {
		match := strings.HasPrefix(string(f.ID), prefix)
		for _, a := range also {
			match = match || strings.HasPrefix(string(f.ID), a)
		}
		if !match {
			continue
		}
		row := trow{cells: []cell{{s: string(f.ID)}, {s: f.Subject}, {s: fnum(f.Value)}, {s: relation(f)}, {s: fnum(f.Limit)}, {s: f.Unit}, {s: fnum(f.Margin)}, statusCell(f.Status)}, fill: statusFill(f.Status)}
		rows = append(rows, row)
	}
	if len(rows) == 0 {
		return
	}
	p.sub(title, 12)
	d.table([]column{{head: "check", w: 34}, {head: "subject", w: 34}, {head: "value", w: 19, align: "R"}, {head: "", w: 11, align: "C"}, {head: "limit", w: 19, align: "R"},
		{head: "unit", w: 17}, {head: "margin", w: 19, align: "R"}, {head: "status", w: 13}}, rows, tableOpts{size: 7.5, title: title})
	d.y += 3
}

// months are the months of the harvest, in the order of the first array.
func (p *pack) months() []string {
	var ms []string
	seen := map[string]bool{}
	for _, a := range p.r.Harvest {
		for _, m := range a.Months {
			if !seen[m.Month] {
				seen[m.Month] = true
				ms = append(ms, m.Month)
			}
		}
	}
	return ms
}

// solar is the arrays, their controllers and string voltage window, the
// monthly harvest and the monthly balance.
func (p *pack) solar() {
	d, r := p.d, p.r
	p.start("solar", "Solar array, controller and monthly balance", false)
	if len(r.Summary.Arrays) == 0 {
		p.note(9, colMuted, "The design has no solar array.")
		return
	}
	var rows []trow
	for _, a := range r.Summary.Arrays {
		stc := "-"
		if f, ok := p.figure(result.FigArraySTCPower, a.Name); ok {
			stc = qty(f.Value, f.Unit)
		}
		rows = append(rows, cellsOf(a.Name, a.Module, fmt.Sprintf("%d × %d", a.Series, a.Strings), stc, a.Controller, strings.ToUpper(a.ControllerKind)))
	}
	d.table([]column{{head: "array", w: 32}, {head: "module", w: 36}, {head: "series × strings", w: 26, align: "R"}, {head: "STC power", w: 24, align: "R"}, {head: "controller", w: 40}, {head: "kind", w: 22}}, rows, tableOpts{size: 8})
	d.y += 3

	// The string voltage window: cold Voc under the controller's maximum,
	// hot Vmp above what charging needs, input current within rating.
	p.sub("String voltage window and controller input", 16)
	rows = nil
	what := map[result.CheckID]string{
		result.CheckColdVoc:      "cold Voc ≤ controller maximum",
		result.CheckHotVmp:       "hot Vmp ≥ charging voltage + headroom",
		result.CheckInputCurrent: "1.25 × Isc × strings ≤ controller input",
		result.CheckStringFuse:   "(strings − 1) × Isc ≤ module series fuse",
	}
	for _, a := range r.Summary.Arrays {
		for _, id := range []result.CheckID{result.CheckColdVoc, result.CheckHotVmp, result.CheckInputCurrent, result.CheckStringFuse} {
			subject := a.Name
			if id == result.CheckInputCurrent {
				subject = a.Controller
			}
			f, ok := p.finding(id, subject)
			if !ok {
				continue
			}
			rows = append(rows, trow{cells: []cell{{s: a.Name}, {s: what[id]}, {s: qty(f.Value, f.Unit)}, {s: relation(f)}, {s: qty(f.Limit, f.Unit)}, {s: qty(f.Margin, f.Unit)}, statusCell(f.Status)}, fill: statusFill(f.Status)})
		}
	}
	if len(rows) > 0 {
		d.table([]column{{head: "array", w: 28}, {head: "check", w: 58}, {head: "value", w: 22, align: "R"}, {head: "", w: 8, align: "C"}, {head: "limit", w: 22, align: "R"}, {head: "margin", w: 26, align: "R"}, {head: "status", w: 16}}, rows, tableOpts{size: 7.5})
	} else {
		p.note(8.5, colMuted, "No string or controller findings.")
	}
	d.y += 3

	months := p.months()
	if len(months) > 0 {
		p.sub("Harvest into the bank, Wh per mean day of the month", 16)
		cols := []column{{head: "array", w: 26}, {head: "controller", w: 30}}
		mw := 124 / float64(max(len(months), 6))
		for _, m := range months {
			cols = append(cols, column{head: m, w: mw, align: "R"})
		}
		rows = nil
		for _, a := range r.Harvest {
			row := cellsOf(a.Array, a.Controller+" ("+strings.ToUpper(a.Kind)+")")
			alt := cellsOf("", "with "+a.Alternative+" instead")
			for _, m := range months {
				wh, altWh := "-", "-"
				for _, x := range a.Months {
					if x.Month == m {
						wh, altWh = fixed(x.Wh, 0), fixed(x.AltWh, 0)
					}
				}
				row.cells = append(row.cells, cell{s: wh, bold: true})
				alt.cells = append(alt.cells, cell{s: altWh, color: &colMuted})
			}
			alt.cells[1].color = &colMuted
			rows = append(rows, row, alt)
		}
		d.table(cols, rows, tableOpts{size: 7.5})
		d.y += 1
		p.note(7.5, colMuted, "The bold row is the design's controller; the grey row the same array with the other kind of controller (MPPT tracks the module's maximum power point, PWM pins the array to battery voltage).")
		d.y += 2
	}

	if len(months) > 0 && len(r.Budget) > 0 {
		p.sub("Monthly balance: harvest as a share of each scenario's use per day", 16)
		cols := []column{{head: "scenario", w: 26}, {head: "use Wh/day", w: 30, align: "R"}}
		mw := 124 / float64(max(len(months), 6))
		for _, m := range months {
			cols = append(cols, column{head: m, w: mw, align: "R"})
		}
		rows = nil
		for _, b := range r.Budget {
			row := cellsOf(b.Scenario, fixed(b.WhPerDay, 0))
			for _, m := range months {
				c := cell{s: "-"}
				if f, ok := p.figure("energy.solarFraction", b.Scenario+" "+m); ok {
					c.s = fixed(f.Value, 0) + " %"
					if f.Value < 100 {
						c.color = &colWarn
					}
				}
				row.cells = append(row.cells, c)
			}
			rows = append(rows, row)
		}
		d.table(cols, rows, tableOpts{size: 7.5})
		d.y += 1
		p.note(7.5, colMuted, "Below 100 % (amber) the sun alone does not meet that scenario's daily use in that month; the design voyage on page "+pageAlias("voyage")+" shows what the bank does over a passage.")
		d.y += 3
		p.harvestChart()
	}
}

// voyage is the state of charge over the design voyage.
func (p *pack) voyage() {
	d := p.d
	p.start("voyage", "Design voyage: state of charge", false)
	v := p.r.Voyage
	if v == nil {
		p.note(9, colMuted, "The design declares no design voyage.")
		return
	}
	days := float64(v.Hours) / 24
	p.note(9, colInk, fmt.Sprintf("%s days from %s, hour by hour: loads by scenario, the arrays' output from the hourly irradiance, charge efficiency and the controllers' limits.", fnum(days), v.Start))
	d.y += 2
	if f, ok := p.finding("voyage.floor", "voyage"); ok {
		fill := statusFill(f.Status)
		if fill == nil {
			fill = &colPassBg
		}
		col := statusColor(f.Status)
		d.font(bold, 9)
		lines := d.wrap(strings.ToUpper(string(f.Status))+": "+f.Message, d.width()-8)
		h := float64(len(lines))*d.lineH() + 3
		d.box(d.left(), d.y, d.width(), h, fill, lineStyle{})
		d.box(d.left(), d.y, 2.2, h, &col, lineStyle{})
		d.textColor(col)
		for i, l := range lines {
			d.text(d.left()+5, d.y+1.5+d.lineH()*(float64(i)+0.78), l)
		}
		d.textColor(colInk)
		d.y += h + 3
	}
	p.socChart()
	d.y += 3
	recover := "not full again within the voyage"
	if v.RecoverDays >= 0 {
		recover = fnum(v.RecoverDays) + " days"
	}
	rows := []trow{
		cellsOf("lowest state of charge", fixed(v.Lowest, 1)+" %", fmt.Sprintf("day %d at %02d:00 (%s, %s)", v.LowestDay+1, v.LowestHour, v.LowestScenario, v.LowestMonth)),
		cellsOf("depth-of-discharge floor", fnum(v.Floor)+" %", "the bank is not drawn below it"),
		cellsOf("load unmet at the floor", fixed(v.Unmet, 0)+" Wh", "load energy the bank could not supply"),
		cellsOf("from the lowest point to full", recover, ""),
		cellsOf("offered by the sources", fixed(v.Offered, 0)+" Wh", "what the arrays and chargers could deliver"),
		cellsOf("stored in the bank", fixed(v.Charged, 0)+" Wh", ""),
		cellsOf("drawn by the loads", fixed(v.Drawn, 0)+" Wh", ""),
		cellsOf("not taken (bank full or tapering)", fixed(v.Spilled, 0)+" Wh", ""),
		cellsOf("charge losses", fixed(v.ChargeLoss, 0)+" Wh", ""),
	}
	if v.Unmet > 0 {
		rows[2].fill = &colFailBg
	}
	p.sub("Energy ledger", 20)
	d.table([]column{{head: "quantity", w: 60}, {head: "value", w: 30, align: "R"}, {head: "note", w: 90}}, rows, tableOpts{size: 8})
	if f, ok := p.figure("voyage.lowestSoC", "voyage"); ok {
		d.y += 2
		p.note(7.5, colMuted, "The lowest state of charge is figure voyage.lowestSoC; its inputs are on the calculation sheets. "+f.Formula)
	}
}
