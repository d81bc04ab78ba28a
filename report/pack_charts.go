package report

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"github.com/ampwright/ampwright/result"
)

// The charts are drawn with the drawing layer's lines, boxes and
// polylines, as vector graphics.

// niceScale returns an axis maximum at or above v and its tick step, on a
// 1, 2, 2.5, 5 × 10ⁿ grid with about n ticks.
func niceScale(v float64, n int) (top, step float64) {
	if v <= 0 || math.IsNaN(v) || math.IsInf(v, 0) {
		return 1, 0.25
	}
	raw := v / float64(n)
	mag := math.Pow(10, math.Floor(math.Log10(raw)))
	for _, m := range []float64{1, 2, 2.5, 5, 10} {
		step = m * mag
		if step >= raw {
			break
		}
	}
	top = math.Ceil(v/step-1e-9) * step
	return top, step
}

// seriesColors colour the arrays' bars.
var seriesColors = []rgb{colAccent, colAccent2, {70, 130, 110}, {150, 170, 90}, {110, 90, 150}}

// scenarioColors colour the scenarios' lines; red is kept for failures.
var scenarioColors = []rgb{colAccent3, {110, 60, 140}, {0, 115, 115}, {90, 90, 90}, {160, 70, 110}}

// harvestChart draws bars of each month's harvest, stacked by array, the
// other controller kind beside them, and each scenario's daily use.
func (p *pack) harvestChart() {
	d, r := p.d, p.r
	months := p.months()
	if len(months) == 0 {
		return
	}
	const h = 64.0
	d.need(h + 28)
	p.sub("Monthly harvest against daily use", h+18)
	x0, x1 := d.left()+14, d.right()-40
	y0 := d.y + 7
	y1 := y0 + h

	total := make([]float64, len(months))
	alt := make([]float64, len(months))
	top := 0.0
	for i, m := range months {
		for _, a := range r.Harvest {
			for _, x := range a.Months {
				if x.Month == m {
					total[i] += x.Wh
					alt[i] += x.AltWh
				}
			}
		}
		top = math.Max(top, math.Max(total[i], alt[i]))
	}
	for _, b := range r.Budget {
		top = math.Max(top, b.WhPerDay)
	}
	ymax, step := niceScale(top*1.05, 5)
	yOf := func(v float64) float64 { return y1 - v/ymax*h }

	// Grid and axis.
	d.font(regular, 6.5)
	d.textColor(colMuted)
	for v := 0.0; v <= ymax+step/2; v += step {
		y := yOf(v)
		d.line(x0, y, x1, y, lineStyle{w: 0.1, c: colGrid})
		d.textIn(d.left(), y-2, 13, 4, fixed(v, 0), "R")
	}
	d.textIn(d.left(), y0-6, 60, 4, "Wh per day", "L")

	sw := (x1 - x0) / float64(len(months))
	kinds := map[string]bool{}
	for i, m := range months {
		bx := x0 + float64(i)*sw + sw*0.14
		bw := sw * 0.44
		base := 0.0
		for k, a := range r.Harvest {
			for _, x := range a.Months {
				if x.Month != m || x.Wh <= 0 {
					continue
				}
				c := seriesColors[k%len(seriesColors)]
				d.box(bx, yOf(base+x.Wh), bw, x.Wh/ymax*h, &c, lineStyle{})
				base += x.Wh
			}
			kinds[a.Alternative] = true
		}
		// The other controller kind, outlined.
		if alt[i] > 0 {
			d.box(bx+bw+sw*0.04, yOf(alt[i]), sw*0.24, alt[i]/ymax*h, &colShade, lineStyle{w: 0.25, c: colMuted})
		}
		d.textColor(colInk)
		d.textIn(x0+float64(i)*sw, y1+0.5, sw, 4, m, "C")
	}
	d.line(x0, y1, x1, y1, lineStyle{w: 0.3, c: colInk})

	// Each scenario's use per day, labelled at the right.
	type label struct {
		y    float64
		s    string
		c    rgb
		line float64
	}
	var labels []label
	for k, b := range r.Budget {
		c := scenarioColors[k%len(scenarioColors)]
		y := yOf(b.WhPerDay)
		d.line(x0, y, x1, y, lineStyle{w: 0.5, c: c, dash: 1.6})
		labels = append(labels, label{y: y, s: fmt.Sprintf("%s %s", b.Scenario, fixed(b.WhPerDay, 0)), c: c, line: y})
	}
	sort.SliceStable(labels, func(i, j int) bool { return labels[i].y < labels[j].y })
	for i := 1; i < len(labels); i++ {
		if labels[i].y < labels[i-1].y+3 {
			labels[i].y = labels[i-1].y + 3
		}
	}
	d.font(regular, 6.5)
	for _, l := range labels {
		d.line(x1, l.line, x1+1.5, l.y, lineStyle{w: 0.2, c: l.c})
		d.textColor(l.c)
		d.textIn(x1+2, l.y-1.5, d.right()-x1-2, 3, l.s, "L")
	}
	d.textColor(colInk)

	// Legend.
	ly := y1 + 6
	lx := x0
	legend := func(draw func(x, y float64), s string) {
		draw(lx, ly)
		d.font(regular, 6.5)
		d.textColor(colInk)
		d.textIn(lx+5, ly-0.5, 60, 3.5, s, "L")
		lx += 7 + d.textW(s) + 4
	}
	for k, a := range r.Harvest {
		c := seriesColors[k%len(seriesColors)]
		legend(func(x, y float64) { d.box(x, y, 3.5, 2.5, &c, lineStyle{}) }, a.Array+" ("+strings.ToUpper(a.Kind)+")")
	}
	var ks []string
	for k := range kinds {
		ks = append(ks, k)
	}
	sort.Strings(ks)
	legend(func(x, y float64) { d.box(x, y, 3.5, 2.5, &colShade, lineStyle{w: 0.25, c: colMuted}) }, "all arrays with "+strings.Join(ks, "/")+" instead")
	legend(func(x, y float64) {
		d.line(x, y+1.25, x+3.5, y+1.25, lineStyle{w: 0.5, c: colAccent3, dash: 1})
	}, "scenario use, Wh per day")
	d.y = ly + 6
}

// socChart draws a bank's state of charge hour by hour over the design
// voyage, h mm high, with its depth-of-discharge floor dashed.
func (p *pack) socChart(v result.BankVoyage, start, title string, h float64) {
	d := p.d
	if len(v.SoC) == 0 {
		return
	}
	p.sub(title, h+20)
	x0, x1 := d.left()+12, d.right()-2
	y0 := d.y + 7
	y1 := y0 + h
	n := len(v.SoC)
	xOf := func(hour float64) float64 { return x0 + hour/float64(n)*(x1-x0) }
	yOf := func(soc float64) float64 { return y1 - soc/100*h }

	d.font(regular, 6.5)
	d.textColor(colMuted)
	for s := 0.0; s <= 100; s += 20 {
		y := yOf(s)
		d.line(x0, y, x1, y, lineStyle{w: 0.1, c: colGrid})
		d.textIn(d.left(), y-2, 10, 4, fixed(s, 0), "R")
	}
	d.textIn(d.left(), y0-6, 60, 4, "state of charge, % of full", "L")
	days := int(math.Ceil(float64(n) / 24))
	every := max(1, int(math.Ceil(float64(days)/16)))
	for day := 0; day <= days; day++ {
		x := xOf(float64(day * 24))
		if x > x1+0.01 {
			break
		}
		d.line(x, y0, x, y1, lineStyle{w: 0.1, c: colGrid})
		d.line(x, y1, x, y1+1.2, lineStyle{w: 0.2, c: colInk})
		if day%every == 0 && day < days {
			d.textColor(colMuted)
			d.textIn(x, y1+1, xOf(float64(24*every))-x0, 3.5, fmt.Sprintf("day %d", day+1), "L")
		}
	}
	d.line(x0, y1, x1, y1, lineStyle{w: 0.3, c: colInk})
	d.line(x0, y0, x0, y1, lineStyle{w: 0.3, c: colInk})

	// The floor.
	fy := yOf(v.Floor)
	d.line(x0, fy, x1, fy, lineStyle{w: 0.5, c: colFail, dash: 1.8})
	d.font(bold, 6.5)
	d.textColor(colFail)
	floorLab := fmt.Sprintf("floor %s %%", fnum(v.Floor))
	fw := d.textW(floorLab) + 1
	d.textIn(x1-50, fy-4, 50, 3.5, floorLab, "R")

	pts := make([]pt, 0, n)
	for i, s := range v.SoC {
		pts = append(pts, pt{xOf(float64(i + 1)), yOf(math.Max(0, math.Min(100, s)))})
	}
	d.polyline(pts, lineStyle{w: 0.45, c: colAccent, round: true})

	// The lowest point, if the bank fell at all.
	if v.Lowest >= 100 {
		d.font(regular, 6.5)
		d.textColor(colMuted)
		d.textIn(x0, y1+4.5, x1-x0, 3.5, fmt.Sprintf("hours from the start of the voyage in %s; a grid line each day", start), "C")
		d.textColor(colInk)
		d.y = y1 + 10
		return
	}
	lh := float64(v.LowestDay*24 + v.LowestHour)
	lx, ly := xOf(lh), yOf(v.Lowest)
	c := colInk
	if v.Lowest <= v.Floor+1e-9 {
		c = colFail
	}
	d.dot(lx, ly, 0.9, c)
	d.font(regular, 6.5)
	d.textColor(c)
	lab := fmt.Sprintf("lowest %s %% on day %d at %02d:00", fixed(v.Lowest, 1), v.LowestDay+1, v.LowestHour)
	lw := d.textW(lab) + 1
	// Right of the point, or left of it near the chart's end; below it,
	// unless that runs off the chart or onto the floor's label.
	tx := lx + 1.5
	if tx+lw > x1 {
		tx = lx - 1.5 - lw
	}
	ty := ly + 1.5
	if ty+3.5 > y1 || (ty+3.5 > fy-0.5 && ty < fy+0.5) || (tx+lw > x1-fw && ty+3.5 > fy-4 && ty < fy) {
		ty = ly - 5
	}
	// On white, so that the curve does not run through it.
	d.box(tx-0.3, ty+0.2, lw+0.6, 3.1, &colWhite, lineStyle{})
	d.textIn(tx, ty, lw, 3.5, lab, "L")
	d.textColor(colMuted)
	d.textIn(x0, y1+4.5, x1-x0, 3.5, fmt.Sprintf("hours from the start of the voyage in %s; a grid line each day", start), "C")
	d.textColor(colInk)
	d.y = y1 + 10
}

// dropChart draws each run's voltage drop as a bar against its limit,
// across pages when there are many runs.
func (p *pack) dropChart() {
	d := p.d
	var runs []result.WiringLine
	top := 0.0
	for _, w := range p.r.Wiring {
		if w.DropLimit > 0 {
			runs = append(runs, w)
			top = math.Max(top, math.Max(w.Drop, w.DropLimit))
		}
	}
	if len(runs) == 0 {
		return
	}
	const rowH = 4.2
	// Keep the chart on one page when it fits on one.
	if whole := 24 + float64(len(runs))*rowH; whole < d.bottom()-d.top {
		d.need(whole)
	}
	p.sub("Voltage drop of each run against its limit", 12+3*rowH)
	xmax, step := niceScale(top*1.04, 6)
	nameW := 32.0
	x0 := d.left() + nameW
	x1 := d.right() - 34
	xOf := func(v float64) float64 { return x0 + v/xmax*(x1-x0) }
	axis := func() {
		d.font(regular, 6.5)
		d.textColor(colMuted)
		for v := 0.0; v <= xmax+step/2; v += step {
			x := xOf(v)
			d.textIn(x-8, d.y, 16, 3.5, fixed(v, 1), "C")
		}
		d.textIn(d.left(), d.y, nameW-10, 3.5, "drop, % of nominal", "R")
		d.y += 4
		d.line(x0, d.y, x1, d.y, lineStyle{w: 0.3, c: colInk})
	}
	axis()
	for _, w := range runs {
		if d.y+rowH > d.bottom()-6 {
			d.addPage(false)
			p.sub("Voltage drop of each run against its limit (continued)", 3*rowH)
			axis()
		}
		y := d.y
		for v := 0.0; v <= xmax+step/2; v += step {
			d.line(xOf(v), y, xOf(v), y+rowH, lineStyle{w: 0.1, c: colGrid})
		}
		d.line(x0, y, x0, y+rowH, lineStyle{w: 0.3, c: colInk})
		f, _ := p.finding("wiring.voltageDrop", w.Name)
		st := f.Status
		if st == "" {
			st = result.Pass
		}
		d.font(regular, 6.8)
		d.textColor(colInk)
		if st != result.Pass {
			d.font(bold, 6.8)
			d.textColor(statusColor(st))
		}
		d.textIn(d.left(), y, nameW-2, rowH, w.Name, "R")
		c := colAccent2
		if st != result.Pass {
			c = statusColor(st)
		}
		bw := math.Max(0.3, xOf(w.Drop)-x0)
		d.box(x0, y+0.8, bw, rowH-1.6, &c, lineStyle{})
		lx := xOf(w.DropLimit)
		d.line(lx, y+0.2, lx, y+rowH-0.2, lineStyle{w: 1.3, c: colWhite})
		d.line(lx, y+0.2, lx, y+rowH-0.2, lineStyle{w: 0.6, c: colInk})
		lab := fmt.Sprintf("%s / %s", fixed(w.Drop, 2), fnum(w.DropLimit))
		if st != result.Pass {
			lab += "  " + strings.ToUpper(string(st))
		}
		d.textIn(x1+2, y, 28, rowH, lab, "L")
		d.textColor(colInk)
		d.y += rowH
	}
	d.y += 2
	d.font(regular, 6.5)
	d.textColor(colMuted)
	lx := x0
	item := func(draw func(x float64), s string) {
		draw(lx)
		d.textIn(lx+5, d.y, d.textW(s)+1, 3.5, s, "L")
		lx += 5 + d.textW(s) + 6
	}
	y := d.y
	item(func(x float64) { d.box(x, y+0.5, 4, 2.4, &colAccent2, lineStyle{}) }, "drop over the run")
	item(func(x float64) { d.line(x+2, y+0.2, x+2, y+3.2, lineStyle{w: 0.6, c: colInk}) }, "its limit, by the class of the circuit")
	item(func(x float64) { d.box(x, y+0.5, 4, 2.4, &colFail, lineStyle{}) }, "over its limit")
	d.textIn(x1+2, d.y, d.right()-x1-2, 3.5, "drop / limit, %", "L")
	d.textColor(colInk)
	d.y += 6
}
