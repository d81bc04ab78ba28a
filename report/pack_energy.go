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
		for _, a := range r.Harvest {
			p.harvestSheet(a, months)
		}
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
		p.noteRefs(7.5, colMuted, "Below 100 % (amber) the sun alone does not meet that scenario's daily use in that month; the design voyage on page "+p.pageRef("voyage")+" shows what the bank does over a passage.")
		d.y += 3
		p.harvestChart()
	}
}

// voyage is the state of charge over the design voyage: each bank's
// finding, its state of charge and the energy ledgers.
func (p *pack) voyage() {
	d := p.d
	p.start("voyage", "Design voyage: state of charge", false)
	v := p.r.Voyage
	if v == nil {
		p.note(9, colMuted, "The design declares no design voyage.")
		return
	}
	banks := v.Banks
	if len(banks) == 0 {
		banks = []result.BankVoyage{v.BankVoyage} // a result from before banks were listed
	}
	multi := len(banks) > 1
	days := float64(v.Hours) / 24
	what := "the bank"
	if multi {
		what = "every bank together, with the links between them"
	}
	p.note(9, colInk, fmt.Sprintf("%s days from %s, hour by hour, %s: loads by scenario at their times of day, the arrays' output from the hourly irradiance, chargers while they run, what each battery accepts (the kinetic battery model for lead-acid), charge efficiency and Peukert's law. Charge is counted in ampere-hours at each bank's nominal voltage.", fnum(days), v.Start, what))
	d.y += 2
	for _, b := range banks {
		subject := "voyage"
		if b.Bank != "" && b.Bank != v.Bank {
			subject = "voyage " + b.Bank
		}
		f, ok := p.finding("voyage.floor", subject)
		if !ok {
			continue
		}
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
	for _, b := range banks {
		title, h := "State of charge over the design voyage", 70.0
		if multi {
			title, h = fmt.Sprintf("State of charge of the %s bank (%s)", b.Bank, b.Role), 42
			if !b.Checked {
				title += ": no loads, run but not checked"
			}
		}
		p.socChart(b, v.Start, title, h)
		d.y += 2
	}
	d.y += 1

	cols := []column{{head: "quantity", w: 56}}
	vw, nw := 30.0, 94.0
	if multi {
		vw = min(30, 124/float64(len(banks)))
		nw = 180 - 56 - vw*float64(len(banks))
	}
	for _, b := range banks {
		head := "value"
		if multi {
			head = b.Bank
		}
		cols = append(cols, column{head: head, w: vw, align: "R"})
	}
	cols = append(cols, column{head: "note", w: nw})
	row := func(q string, note string, value func(result.BankVoyage) string) trow {
		r := cellsOf(q)
		for _, b := range banks {
			r.cells = append(r.cells, cell{s: value(b)})
		}
		r.cells = append(r.cells, cell{s: note})
		return r
	}
	wh := func(f func(result.BankVoyage) float64) func(result.BankVoyage) string {
		return func(b result.BankVoyage) string { return fixed(f(b), 0) + " Wh" }
	}
	rows := []trow{
		row("lowest state of charge", "", func(b result.BankVoyage) string { return fixed(b.Lowest, 1) + " %" }),
		row("when", "", func(b result.BankVoyage) string {
			if b.Lowest >= 100 || b.LowestScenario == "" {
				return "—"
			}
			return fmt.Sprintf("day %d %02d:00", b.LowestDay+1, b.LowestHour)
		}),
		row("depth-of-discharge floor", "not drawn below it", func(b result.BankVoyage) string { return fnum(b.Floor) + " %" }),
		row("unmet at the floor", "asked of the bank, not given", wh(func(b result.BankVoyage) float64 { return b.Unmet })),
		row("from the lowest point to full", "", func(b result.BankVoyage) string {
			switch {
			case b.RecoverDays < 0:
				return "not within"
			case b.RecoverDays == 0:
				return "—"
			}
			return fnum(b.RecoverDays) + " days"
		}),
		row("hours in absorption", "offered more than it accepted, before full", func(b result.BankVoyage) string { return fmt.Sprintf("%d h", b.AbsorptionHours) }),
		row("offered", "sources, and links into the bank", wh(func(b result.BankVoyage) float64 { return b.Offered })),
		row("to the loads directly", "while the sources ran", wh(func(b result.BankVoyage) float64 { return b.Direct })),
		row("stored in the battery", "after acceptance and efficiency", wh(func(b result.BankVoyage) float64 { return b.Charged })),
		row("charge losses", "ampere-hour efficiency", wh(func(b result.BankVoyage) float64 { return b.ChargeLoss })),
		row("not taken", "bank full or accepting less", wh(func(b result.BankVoyage) float64 { return b.Spilled })),
		row("passed on through links", "", wh(func(b result.BankVoyage) float64 { return b.LinkOut })),
		row("drawn from the battery", "Peukert's law included", wh(func(b result.BankVoyage) float64 { return b.Drawn })),
		row("of which Peukert", "", wh(func(b result.BankVoyage) float64 { return b.Peukert })),
		row("held at the start", "", wh(func(b result.BankVoyage) float64 { return b.StartWh })),
		row("held at the end", "end − start = stored − drawn + unmet", wh(func(b result.BankVoyage) float64 { return b.EndWh })),
	}
	for i, b := range banks {
		if b.Unmet > 0 {
			rows[3].cells[i+1].color = &colFail
			rows[3].cells[i+1].bold = true
		}
	}
	p.sub("Energy ledger", 20)
	d.table(cols, rows, tableOpts{size: 7.5, title: "Energy ledger"})
	if len(v.Links) > 0 {
		d.y += 3
		var lr []trow
		for _, l := range v.Links {
			lr = append(lr, cellsOf(l.Link, l.Kind, l.From+" → "+l.To, fixed(l.Ah, 0)+" Ah", fixed(l.Loss, 0)+" Wh"))
		}
		p.sub("Links between the banks", 16)
		d.table([]column{{head: "link", w: 40}, {head: "kind", w: 24}, {head: "from → to", w: 56}, {head: "delivered", w: 30, align: "R"}, {head: "lost in it", w: 30, align: "R"}}, lr, tableOpts{size: 7.5})
	}
	if f, ok := p.figure("voyage.lowestSoC", "voyage"); ok {
		d.y += 2
		p.note(7.5, colMuted, "The lowest state of charge is figure voyage.lowestSoC; its inputs are on the calculation sheets. "+f.Formula)
	}
}

// harvestSheet sets out by month how an array's harvest is found, so that
// a reviewer can recompute it: the irradiation, on the array, the cells'
// temperature, the temperature factor, the losses, the wiring factor, the
// controller and what was clipped. The harvest figures on the calculation
// sheets carry the same inputs with their sources.
func (p *pack) harvestSheet(a result.ArrayHarvest, months []string) {
	d := p.d
	if len(a.Months) == 0 || a.Months[0].TempFactor == 0 {
		return // a result from before the sheet's figures were kept
	}
	imperial := p.r.Design.Units == "imperial"
	temp := func(c float64) string {
		if imperial {
			return fixed(c*1.8+32, 1) + " °F"
		}
		return fixed(c, 1) + " °C"
	}
	rise := func(k float64) string {
		if imperial {
			return fnum(k*1.8) + " °F"
		}
		return fnum(k) + " °C"
	}
	pwm := a.Kind == "pwm"
	cols := []column{{head: "", w: 56}}
	mw := 124 / float64(max(len(months), 6))
	for _, m := range months {
		cols = append(cols, column{head: m, w: mw, align: "R"})
	}
	fig := map[string]result.Figure{}
	for _, f := range p.figures(result.FigEnergyHarvest) {
		fig[f.Subject] = f
	}
	input := func(m, name string) (float64, bool) {
		for _, in := range fig[a.Array+" "+m].Inputs {
			if in.Name == name {
				return in.Value, true
			}
		}
		return 0, false
	}
	type line struct {
		name  string
		value func(result.MonthHarvest) string
	}
	tfName := "1 + γ (T̄c − 25 °C)"
	if imperial {
		tfName = "1 + γ (T̄c − 77 °F)"
	}
	if pwm {
		tfName = strings.Replace(tfName, "γ", "α", 1)
	}
	lines := []line{
		{"H, kWh/m² a day", func(m result.MonthHarvest) string { return fnum(m.Irradiation) }},
		{"H_POA on the array", func(m result.MonthHarvest) string { return fixed(m.POA, 3) }},
		{"ambient", func(m result.MonthHarvest) string { return temp(m.Ambient) }},
		{"T̄c, cells (mean by irradiance)", func(m result.MonthHarvest) string { return temp(m.Cell) }},
		{"peak cell temperature", func(m result.MonthHarvest) string { return temp(m.PeakCell) }},
		{tfName, func(m result.MonthHarvest) string { return fixed(m.TempFactor, 4) }},
		{"shading × soiling × mismatch", func(m result.MonthHarvest) string {
			s, _ := input(m.Month, "shading")
			so, _ := input(m.Month, "soiling")
			mi, _ := input(m.Month, "mismatch")
			return fixed((1-s)*(1-so)*(1-mi), 4)
		}},
		{"F_wiring", func(m result.MonthHarvest) string { return fixed(m.Wiring, 4) }},
	}
	if pwm {
		lines = append(lines, line{"capped at maximum power, Wh", func(m result.MonthHarvest) string { return fixed(m.Capped, 0) }})
	} else {
		lines = append(lines, line{"η controller", func(m result.MonthHarvest) string {
			v, _ := input(m.Month, "η_controller")
			return fnum(v)
		}})
	}
	lines = append(lines,
		line{"clipped at the controller, Wh", func(m result.MonthHarvest) string { return fixed(m.Clipped, 0) }},
		line{"harvest E, Wh a day", func(m result.MonthHarvest) string { return fixed(m.Wh, 0) }},
	)
	var rows []trow
	for i, l := range lines {
		row := cellsOf(l.name)
		for _, mn := range months {
			c := cell{s: "-"}
			for _, m := range a.Months {
				if m.Month == mn {
					c.s = l.value(m)
				}
			}
			c.bold = i == len(lines)-1
			row.cells = append(row.cells, c)
		}
		row.bold = i == len(lines)-1
		rows = append(rows, row)
	}
	title := fmt.Sprintf("How the harvest of %s is found, by month", a.Array)
	p.sub(title, 50)
	formula := "E = P_STC × H_POA ÷ 1 kW/m² × (1 + γ (T̄c − 25 °C)) × (1 − shading)(1 − soiling)(1 − mismatch) × F_wiring × η − clipped"
	if pwm {
		formula = "E = V_charge × Isc × N_strings × H_POA ÷ 1 kW/m² × (1 + α (T̄c − 25 °C)) × (1 − shading)(1 − soiling)(1 − mismatch) × F_wiring − capped − clipped"
	}
	if imperial {
		formula = strings.Replace(formula, "25 °C", "77 °F", 1)
	}
	model := a.CellModel
	if strings.HasPrefix(model, "SAM") {
		model = fmt.Sprintf("the SAM NOCT model at the installed NOCT %s (NOCT %s + %s for a %s gap behind the modules)",
			temp(a.NOCT+a.NOCTRise), temp(a.NOCT), rise(a.NOCTRise), p.shortIn(a.Standoff))
	}
	stc := ""
	if a.STC > 0 {
		stc = fmt.Sprintf("P_STC = %s W. ", fnum(a.STC))
	}
	p.note(7.5, colInk, formula+". "+stc+"Cells by "+model+"; the wind and the coefficients are on the calculation sheets (energy.harvest).")
	d.y += 1
	d.table(cols, rows, tableOpts{size: 7.5, title: title})
	d.y += 3
}

// shortIn writes a short distance in inches or millimetres, by the design's
// units.
func (p *pack) shortIn(m float64) string {
	if p.r.Design.Units == "imperial" {
		return fnum(m/0.0254) + " in"
	}
	return fnum(m*1000) + " mm"
}
