package report

import (
	"math"
	"strconv"
	"strings"
)

// drawSheet draws a sheet's blocks with the sheet's top left corner at
// ox, oy.
func drawSheet(cv canvas, sh *sheet, ox, oy float64) {
	for _, b := range sh.blocks {
		if b.legend != nil {
			drawLegend(cv, b, ox+b.x, oy+b.y)
			continue
		}
		drawBlock(cv, b, ox+b.x, oy+b.y)
	}
}

// resolve is a line's spans with the sheet it cites written in.
func resolve(t tline) []span {
	ss := t.spans
	for i, s := range ss {
		if !strings.Contains(s.s, sheetMark) {
			continue
		}
		n := "?"
		if t.ref != nil && t.ref.sheet > 0 {
			n = strconv.Itoa(t.ref.sheet)
		}
		ss = append([]span(nil), ss...)
		ss[i].s = strings.ReplaceAll(s.s, sheetMark, n)
	}
	return ss
}

// drawLines draws lines from x, each at its baseline below y.
func drawLines(cv canvas, lines []tline, bases []float64, x, y float64) {
	for i, t := range lines {
		cv.label(x, y+bases[i], resolve(t), "L")
	}
}

// drawBlock draws a tree's block with its top left corner at x0, y0.
func drawBlock(cv canvas, b *block, x0, y0 float64) {
	bases, top, _ := textBlock(b.title, 0)
	drawLines(cv, b.title, bases, x0, y0-top)
	var walk func(n *dnode)
	walk = func(n *dnode) {
		drawNode(cv, b, n, x0, y0)
		for _, c := range n.children {
			walk(c)
		}
	}
	walk(b.tree.root)
}

// drawNode draws a node, its text, and the runs to its children.
func drawNode(cv canvas, b *block, n *dnode, x0, y0 float64) {
	x, y := x0+n.x, y0+n.y
	drawSymbol(cv, n, x, y)
	dx, bases, _, _ := n.nodeText()
	drawLines(cv, n.text, bases, x+dx, y)
	if n.leaf() {
		return
	}
	ink := lineStyle{w: wLine, c: colInk}
	tx := x0 + b.trunk[n.depth]
	cv.line(x+n.symW, y, tx, y, ink)
	if last := y0 + n.children[len(n.children)-1].y; last > y {
		cv.line(tx, y, tx, last, ink)
	}
	for _, c := range n.children {
		drawRun(cv, c, tx, x0+c.x, y0+c.y)
	}
}

// drawRun draws what joins a child to its parent's trunk at tx: a run
// with its protective device and label, the AC side of an inverter, or a
// plain line.
func drawRun(cv canvas, c *dnode, tx, cx, cy float64) {
	switch {
	case c.ac:
		s := lineStyle{w: wLine, c: colAC}
		cv.line(tx, cy, cx, cy, s)
		tilde(cv, (tx+cx)/2-1.2, cy-1.3, 2.4, lineStyle{w: wFine, c: colAC})
		return
	case c.run == nil:
		s := lineStyle{w: wLine, c: colInk}
		if c.sym == symRef {
			s = lineStyle{w: wLine, c: colAccent, dash: 0.8}
		}
		cv.line(tx, cy, cx, cy, s)
		return
	}
	w := c.run
	s := lineStyle{w: runWidth(w), c: runColor(w)}
	k := protSym(w.Protection)
	if k == symNoProt {
		cv.line(tx, cy, cx, cy, s)
	} else {
		px := tx + 1
		cv.line(tx, cy, px, cy, s)
		drawProt(cv, k, px, cy, s.c)
		cv.line(px+protWidth(k), cy, cx, cy, s)
	}
	top, bottom := c.runLabel()
	lx := tx + c.labelDx()
	drawLines(cv, c.runTop, top, lx, cy)
	drawLines(cv, c.runBottom, bottom, lx, cy)
}

// The legend lists the symbols and kinds of line the diagram draws, then
// its notes.

// legendRow is a row of the legend: symbols with their meaning, or a
// line of a note.
type legendRow struct {
	items []legendItem
	text  *tline
	// up and down are how far the row's symbols reach about its line.
	up, down float64
	w, h     float64
}

// legendItem is one symbol or kind of line and what it means, and how
// far its symbol reaches above and below its line.
type legendItem struct {
	draw     func(cv canvas, x, y float64)
	text     []span
	up, down float64
	x        float64
}

// legendSlot is the room a legend symbol is drawn in, with a stub of
// line either side.
const legendSlot = 11.0

func (l *layout) legendRows(dg *diagram, notes []string) []legendRow {
	type entry struct {
		on   bool
		k    symKind
		text string
	}
	entries := []entry{
		{dg.used[symBank], symBank, "battery bank (long plate +)"},
		{dg.used[symBankNeg], symBankNeg, "bank's negative post"},
		{dg.used[symBusbar], symBusbar, "busbar"},
		{dg.used[symPanel], symPanel, "panel, fuse block or bus"},
		{dg.used[symSwitch], symSwitch, "switch"},
		{dg.used[symArray], symArray, "PV generator (array)"},
		{dg.used[symController], symController, "solar charge controller"},
		{dg.used[symCharger], symCharger, "shore charger (~ in, = out)"},
		{dg.used[symAlternator], symAlternator, "alternator or generator"},
		{dg.used[symInverter], symInverter, "inverter (= DC, ~ AC)"},
		{dg.used[symDCDC], symDCDC, "DC-DC charger between banks"},
		{dg.used[symCombiner], symCombiner, "combiner (relay) between banks"},
		{dg.used[symIsolator], symIsolator, "isolator (diodes) between banks"},
		{dg.used[symConverter], symConverter, "converter, input and output voltage"},
		{dg.used[symLoad], symLoad, "load: name, draw and quantity"},
		{dg.used[symAC], symAC, "AC loads behind an inverter"},
		{dg.used[symShunt], symShunt, "shunt: current and sense terminals"},
		{dg.used[symNegBus], symNegBus, "negative bus"},
		{dg.used[symReturns], symReturns, "returns landing on a negative node"},
		{dg.used[symRef], symRef, "continued on another sheet"},
		{dg.used[symNode], symNode, "other node"},
	}
	var items []legendItem
	text := func(s string) []span { return []span{{s: s, size: sizeText, c: colInk}} }
	for _, e := range entries {
		if !e.on {
			continue
		}
		k := e.k
		_, up, down := symSize(k)
		items = append(items, legendItem{text: text(e.text), up: up, down: down, draw: func(cv canvas, x, y float64) {
			n := &dnode{sym: k}
			if k == symConverter || k == symDCDC {
				n.volts = [2]string{"24 V", "12 V"}
				if k == symDCDC {
					n.volts = [2]string{"12 V", "12 V"}
				}
			}
			w, _, _ := symSize(k)
			sx := x + (legendSlot-w)/2
			ink := lineStyle{w: wLine, c: colInk}
			cv.line(x, y, sx, y, ink)
			if k != symLoad && k != symRef && k != symAC && k != symReturns {
				cv.line(sx+w, y, x+legendSlot, y, ink)
			}
			drawSymbol(cv, n, sx, y)
		}})
	}
	prot := func(k protKind) func(cv canvas, x, y float64) {
		return func(cv canvas, x, y float64) {
			s := lineStyle{w: wLine, c: colInk}
			px := x + (legendSlot-protWidth(k))/2
			cv.line(x, y, px, y, s)
			drawProt(cv, k, px, y, colInk)
			cv.line(px+protWidth(k), y, x+legendSlot, y, s)
		}
	}
	if dg.fuse {
		up, down := protExtent(symFuse)
		items = append(items, legendItem{text: text("fuse, at the run's source end"), up: up, down: down, draw: prot(symFuse)})
	}
	if dg.breaker {
		up, down := protExtent(symBreaker)
		items = append(items, legendItem{text: text("circuit breaker"), up: up, down: down, draw: prot(symBreaker)})
	}
	run := func(s lineStyle) func(cv canvas, x, y float64) {
		return func(cv canvas, x, y float64) { cv.line(x, y, x+legendSlot, y, s) }
	}
	items = append(items, legendItem{text: text("run: name above, size and device below"), draw: run(lineStyle{w: wLine, c: colInk})})
	if dg.charge {
		items = append(items, legendItem{text: text("charging or PV run"), draw: run(lineStyle{w: wLine, c: colAccent})})
	}
	if dg.acSide {
		items = append(items, legendItem{text: text("AC side"), draw: func(cv canvas, x, y float64) {
			cv.line(x, y, x+legendSlot, y, lineStyle{w: wLine, c: colAC})
			tilde(cv, x+legendSlot/2-1.2, y-1.3, 2.4, lineStyle{w: wFine, c: colAC})
		}})
	}
	if dg.warn {
		items = append(items, legendItem{text: text("run that warns"), draw: run(lineStyle{w: wMedium, c: colWarn})})
	}
	if dg.fail {
		items = append(items, legendItem{text: text("run that fails a check"), draw: run(lineStyle{w: wHeavy, c: colFail})})
	}

	var rows []legendRow
	title := tline{spans: []span{{s: "Legend", face: bold, size: sizeTitle, c: colInk}}}
	_, top, bottom := textBlock([]tline{title}, 0)
	rows = append(rows, legendRow{text: &title, up: -top, down: bottom, w: l.m.spansWidth(title.spans), h: bottom - top + 1.5})
	var row legendRow
	flush := func() {
		if len(row.items) == 0 {
			return
		}
		row.h = row.up + row.down + 2
		rows = append(rows, row)
		row = legendRow{}
	}
	x := 0.0
	for _, it := range items {
		w := legendSlot + textPad + l.m.spansWidth(it.text)
		if x > 0 && x+w > l.w {
			flush()
			x = 0
		}
		it.x = x
		row.items = append(row.items, it)
		x += w + 5
		row.w = math.Max(row.w, x-5)
		// The text's capitals are centred on the line.
		row.up = math.Max(row.up, math.Max(it.up, 1.6))
		row.down = math.Max(row.down, math.Max(it.down, 1.2))
	}
	flush()
	for i, n := range notes {
		first := true
		for _, s := range l.m.wrap(l.m.clean(n), regular, sizeText, l.w) {
			t := tline{spans: []span{{s: s, size: sizeText, c: colMuted}}}
			_, top, bottom := textBlock([]tline{t}, 0)
			r := legendRow{text: &t, up: -top, down: bottom, w: l.m.spansWidth(t.spans), h: lineH(sizeText)}
			if first && i == 0 {
				r.h += 1
				r.up += 1
			}
			first = false
			rows = append(rows, r)
		}
	}
	return rows
}

// drawLegend draws a block of legend rows.
func drawLegend(cv canvas, b *block, x0, y0 float64) {
	y := y0
	for _, r := range b.legend {
		ly := y + r.up
		if r.text != nil {
			cv.label(x0, ly, resolve(*r.text), "L")
		}
		for _, it := range r.items {
			it.draw(cv, x0+it.x, ly)
			cv.label(x0+it.x+legendSlot+textPad, ly+0.36*sizeText*mmPerPt, it.text, "L")
		}
		y += r.h
	}
}

// diagramNotes are the notes under the legend: runs left out and loads
// on no drawn circuit.
func diagramNotes(dg *diagram) []string {
	var notes []string
	if len(dg.loops) > 0 {
		var ls []string
		for _, w := range dg.loops {
			ls = append(ls, w.Name+" ("+w.From+" → "+w.To+")")
		}
		notes = append(notes, "Runs that close a loop, not drawn: "+strings.Join(ls, ", ")+".")
	}
	if len(dg.unplaced) > 0 {
		var ls []string
		for _, l := range dg.unplaced {
			ls = append(ls, l.Name+" (circuit "+orDash(l.Circuit)+")")
		}
		notes = append(notes, "Loads on no drawn circuit: "+strings.Join(ls, ", ")+".")
	}
	return notes
}
