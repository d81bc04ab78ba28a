package report

import (
	"fmt"
	"sort"
	"strconv"
	"strings"

	"github.com/ampwright/ampwright/result"
)

// The calculation sheets set out every figure so that a reviewer can
// redo the arithmetic by hand: the formula, each input with its value,
// unit and origin, the result, and for the finding on it the limit and
// the limit's source. Sources are cited by number and listed at the end.

type calcGroup struct {
	prefixes  []string
	title     string
	bySubject bool
}

var calcGroups = []calcGroup{
	{[]string{"bank."}, "Battery bank (bank.*)", false},
	{[]string{"energy."}, "Energy budget, harvest and balance (energy.*)", false},
	{[]string{"array.", "pv."}, "Solar array and controller (array.*, pv.*)", true},
	{[]string{"wiring."}, "Wiring: resistance, voltage drop, ampacity (wiring.*)", true},
	{[]string{"protection."}, "Protection: fault current, rating, distance (protection.*)", true},
	{[]string{"voyage."}, "Design voyage (voyage.*)", false},
	{[]string{"equipment."}, "Equipment (equipment.*)", false},
}

// calcItem is a figure with the findings on it, or a finding with no
// figure of its own.
type calcItem struct {
	id, subject string
	fig         *result.Figure
	finds       []result.Finding
}

func (g calcGroup) has(id string) bool {
	for _, p := range g.prefixes {
		if strings.HasPrefix(id, p) {
			return true
		}
	}
	return false
}

// cite numbers a source text.
func (p *pack) cite(s string) string {
	if s == "" {
		return "—"
	}
	n, ok := p.sources[s]
	if !ok {
		p.sourceList = append(p.sourceList, s)
		n = len(p.sourceList)
		p.sources[s] = n
	}
	_, marks := p.provenance(s)
	return "S" + strconv.Itoa(n) + marks
}

// provenance is provenance(s), worked out once a text for the pack: the
// sheets cite the same few sources and paths thousands of times.
func (p *pack) provenance(s string) (text, marks string) {
	if v, ok := p.provenances[s]; ok {
		return v[0], v[1]
	}
	text, marks = provenance(s)
	if p.provenances == nil {
		p.provenances = map[string][2]string{}
	}
	p.provenances[s] = [2]string{text, marks}
	return text, marks
}

// marked is marked(s) through p.provenance.
func (p *pack) marked(s string) string {
	text, marks := p.provenance(s)
	if marks == "" {
		return text
	}
	return text + " " + marks
}

// calcItems groups the figures and findings for the sheets.
func (p *pack) calcItems() ([]calcGroup, [][]calcItem) {
	r := p.r
	groups := append([]calcGroup(nil), calcGroups...)
	// Any prefix not foreseen gets a group of its own, at the end.
	known := func(id string) bool {
		for _, g := range groups {
			if g.has(id) {
				return true
			}
		}
		return false
	}
	for _, id := range append(figureIDs(r.Figures), findingIDs(r.Checks)...) {
		if !known(id) {
			pre := id
			if i := strings.Index(id, "."); i >= 0 {
				pre = id[:i+1]
			}
			groups = append(groups, calcGroup{prefixes: []string{pre}, title: strings.TrimSuffix(pre, ".") + " (" + pre + "*)"})
		}
	}
	used := make([]bool, len(r.Checks))
	items := make([][]calcItem, len(groups))
	p.index()
	for gi, g := range groups {
		var list []calcItem
		for i := range r.Figures {
			f := &r.Figures[i]
			if !g.has(string(f.ID)) {
				continue
			}
			it := calcItem{id: string(f.ID), subject: f.Subject, fig: f}
			for _, j := range p.findAt[idSubject{string(f.ID), f.Subject}] {
				if !used[j] {
					it.finds = append(it.finds, r.Checks[j])
					used[j] = true
				}
			}
			list = append(list, it)
		}
		for j, c := range r.Checks {
			if !used[j] && g.has(string(c.ID)) {
				list = append(list, calcItem{id: string(c.ID), subject: c.Subject, finds: []result.Finding{c}})
				used[j] = true
			}
		}
		if g.bySubject {
			rank := map[string]int{}
			for i, w := range r.Wiring {
				rank[w.Name] = i
			}
			for i, a := range r.Summary.Arrays {
				rank[a.Name] = 2 * i
				if _, ok := rank[a.Controller]; !ok {
					rank[a.Controller] = 2*i + 1
				}
			}
			sort.SliceStable(list, func(i, j int) bool {
				ri, oki := rank[list[i].subject]
				rj, okj := rank[list[j].subject]
				switch {
				case oki && okj && ri != rj:
					return ri < rj
				case oki != okj:
					return oki
				case !oki && list[i].subject != list[j].subject:
					return list[i].subject < list[j].subject
				}
				return false
			})
		}
		items[gi] = list
	}
	return groups, items
}

func figureIDs(fs []result.Figure) []string {
	var ids []string
	for _, f := range fs {
		ids = append(ids, string(f.ID))
	}
	return ids
}

func findingIDs(fs []result.Finding) []string {
	var ids []string
	for _, f := range fs {
		ids = append(ids, string(f.ID))
	}
	return ids
}

func (p *pack) calcSheets() {
	d := p.d
	p.start("calc", "Calculation sheets", false)
	p.noteRefs(8, colInk, "Every figure the checks computed: its formula, each input with its value, unit and where it came from (a path in the design, a rulebook entry or another figure), and the result; under it the finding on it, with the limit and where the limit comes from. Sources are cited as [S1], [S2] … and listed in full on page "+p.pageRef("sources")+". Values are as computed, to six significant digits.")
	d.y += 2
	groups, items := p.calcItems()
	for gi, g := range groups {
		list := items[gi]
		if len(list) == 0 {
			continue
		}
		nf, nc := 0, 0
		for _, it := range list {
			if it.fig != nil {
				nf++
			}
			nc += len(it.finds)
		}
		p.section = "Calculation sheets: " + g.title
		p.lastPos = ""
		first := p.calcBlock(list[0], true)
		if g.bySubject {
			first += 6
		}
		p.sub(fmt.Sprintf("%s — %s, %s", g.title, plural(nf, "figure"), plural(nc, "finding")), min(first, 60))
		prev := ""
		for _, it := range list {
			if d.stopped != nil {
				return
			}
			if g.bySubject && it.subject != prev {
				p.calcCaption(it.subject, p.calcBlock(it, true))
				prev = it.subject
			}
			p.calcBlock(it, false)
		}
		d.y += 2
	}
	p.section = "Calculation sheets: sources"
	p.sourceSheet()
}

const calcSize = 7.0

// calcCaption names the run, array or controller the blocks under it are
// about, kept with the first of them.
func (p *pack) calcCaption(subject string, keep float64) {
	d := p.d
	s := subject
	for _, w := range p.r.Wiring {
		if w.Name == subject {
			prot := w.Protection
			if prot == "" {
				prot = "no protective device of its own"
			}
			s = fmt.Sprintf("Run %s: %s → %s, %s, %s one way, %s", w.Name, w.From, w.To, w.Size, p.lengthIn(w.Length), prot)
		}
	}
	for _, a := range p.r.Summary.Arrays {
		switch subject {
		case a.Name:
			s = fmt.Sprintf("Array %s: %d in series × %d strings of %s, to %s", a.Name, a.Series, a.Strings, a.Module, a.Controller)
		case a.Controller:
			s = fmt.Sprintf("Controller %s (%s)", a.Controller, strings.ToUpper(a.ControllerKind))
		}
	}
	d.need(6 + min(keep, 60))
	d.y += 1
	d.font(bold, 8.5)
	d.textColor(colAccent)
	d.textIn(d.left(), d.y, d.width(), 4.5, s, "L")
	d.textColor(colInk)
	d.y += 5
}

// calcBlock draws one figure or finding, kept on one page; with dry it
// only measures the height the block needs.
func (p *pack) calcBlock(it calcItem, dry bool) float64 {
	d := p.d
	x, w := d.left(), d.width()
	d.font(regular, calcSize)
	lh := d.lineH()
	// A figure has a header band; a finding with no figure is a few
	// compact lines.
	headH := 4.6
	if it.fig == nil {
		headH = 0
	}

	// Lay out first, to keep the block together.
	var formula []string
	if it.fig != nil {
		d.font(regular, calcSize)
		formula = d.wrap(it.fig.Formula, w-4)
	}
	colW := []float64{36, 22, 19, w - 36 - 22 - 19 - 4}
	type irow struct {
		name, val, unit []string
		from            []string
		n               int
	}
	var inputs []irow
	if it.fig != nil {
		for _, in := range it.fig.Inputs {
			var r irow
			d.font(regular, calcSize)
			r.name = d.wrap(in.Name, colW[0]-2)
			r.val = []string{fnum(in.Value)}
			r.unit = d.wrap(in.Unit, colW[2]-2)
			d.font(mono, calcSize-0.5)
			r.from = d.wrap(orDash(p.marked(in.From)), colW[3]-2)
			r.n = max(len(r.name), len(r.unit), len(r.from))
			inputs = append(inputs, r)
		}
	}
	type fline struct {
		st  fontStyle
		c   rgb
		s   string
		tag *result.Status
	}
	var finds []fline
	lastPos := p.lastPos
	for _, f := range it.finds {
		d.font(regular, calcSize)
		st := f.Status
		head := fmt.Sprintf("Check %s: %s %s %s; margin %s. Limit from [%s].", f.ID, qty(f.Value, f.Unit), relation(f), qty(f.Limit, f.Unit), qty(f.Margin, f.Unit), p.cite(f.Source))
		if it.fig == nil {
			head = fmt.Sprintf("%s · %s: %s %s %s; margin %s. Limit from [%s].", f.ID, f.Subject, qty(f.Value, f.Unit), relation(f), qty(f.Limit, f.Unit), qty(f.Margin, f.Unit), p.cite(f.Source))
		}
		for i, l := range d.wrap(head, w-16) {
			fl := fline{st: regular, c: colInk, s: l}
			if i == 0 {
				fl.tag = &st
			}
			finds = append(finds, fl)
		}
		for _, l := range d.wrap(f.Message, w-16) {
			finds = append(finds, fline{st: regular, c: colMuted, s: l})
		}
		// A position is given once for the findings that share it.
		if f.Position != "" && f.Position != lastPos {
			lastPos = f.Position
			d.font(mono, calcSize-0.5)
			for _, l := range d.wrap("at "+f.Position, w-16) {
				finds = append(finds, fline{st: mono, c: colMuted, s: l})
			}
		}
	}
	h := headH + 0.6 + float64(len(formula))*lh
	if len(inputs) > 0 {
		h += lh + 0.6
		for _, r := range inputs {
			h += float64(r.n) * lh
		}
	}
	h += float64(len(finds))*lh + 2.5
	if it.fig == nil {
		h -= 1
	}
	if dry {
		return h
	}
	d.need(min(h, d.bottom()-d.top))
	p.lastPos = lastPos

	// The header: what, for what, and the result.
	top := d.y
	fill := &colShade
	if len(it.finds) > 0 {
		if f := statusFill(worst(it.finds)); f != nil {
			fill = f
		}
	}
	if it.fig != nil {
		d.box(x, top, w, headH, fill, lineStyle{})
		d.font(bold, calcSize+0.5)
		d.textColor(colInk)
		right := "= " + qty(it.fig.Value, it.fig.Unit) + "   [" + p.cite(it.fig.Source) + "]"
		rw := d.textW(right) + 2
		d.textIn(x+1.5, top, w-rw-4, headH, it.id+" · "+it.subject, "L")
		d.textIn(x+w-rw-1.5, top, rw, headH, right, "R")
	} else if fill != &colShade {
		d.box(x, top, w, h-1.5, fill, lineStyle{})
	}
	d.y = top + headH + 0.6

	for _, l := range formula {
		d.need(lh)
		d.font(regular, calcSize)
		d.text(x+2, d.y+lh*0.78, l)
		d.y += lh
	}
	if len(inputs) > 0 {
		d.need(lh * 2)
		d.font(bold, calcSize-0.5)
		d.textColor(colMuted)
		cx := x + 2
		for i, hd := range []string{"input", "value", "unit", "from"} {
			align := "L"
			if i == 1 {
				align = "R"
			}
			d.textIn(cx, d.y, colW[i]-2, lh, hd, align)
			cx += colW[i]
		}
		d.textColor(colInk)
		d.y += lh
		d.line(x+2, d.y, x+w, d.y, lineStyle{w: 0.1, c: colGrid})
		d.y += 0.6
		for _, r := range inputs {
			rh := float64(r.n) * lh
			if d.need(rh) {
				d.font(regular, calcSize)
			}
			cx := x + 2
			d.font(regular, calcSize)
			for j, l := range r.name {
				d.textIn(cx, d.y+float64(j)*lh, colW[0]-2, lh, l, "L")
			}
			cx += colW[0]
			d.textIn(cx, d.y, colW[1]-2, lh, r.val[0], "R")
			cx += colW[1]
			for j, l := range r.unit {
				d.textIn(cx, d.y+float64(j)*lh, colW[2]-2, lh, l, "L")
			}
			cx += colW[2]
			d.font(mono, calcSize-0.5)
			d.textColor(colMuted)
			for j, l := range r.from {
				d.textIn(cx, d.y+float64(j)*lh, colW[3]-2, lh, l, "L")
			}
			d.textColor(colInk)
			d.y += rh
		}
	}
	for _, l := range finds {
		d.need(lh)
		if l.tag != nil {
			d.font(bold, calcSize)
			d.textColor(statusColor(*l.tag))
			d.textIn(x+2, d.y, 12, lh, strings.ToUpper(string(*l.tag)), "L")
		}
		d.font(l.st, calcSize)
		if l.st == mono {
			d.font(mono, calcSize-0.5)
		}
		d.textColor(l.c)
		d.textIn(x+14, d.y, w-16, lh, l.s, "L")
		d.y += lh
	}
	d.textColor(colInk)
	d.y += 2.5
	if it.fig == nil {
		d.y--
	}
	return h
}

func worst(fs []result.Finding) result.Status {
	s := result.Pass
	for _, f := range fs {
		if f.Status.Rank() < s.Rank() {
			s = f.Status
		}
	}
	return s
}

// sourceSheet lists the sources cited on the sheets.
func (p *pack) sourceSheet() {
	d := p.d
	p.sub("Sources cited", 20)
	d.mark("sources")
	p.noteRefs(8, colMuted, "A source marked "+markRecalled+" (recalled), "+markCommon+" (common practice) or "+markSecond+" (secondary) is not the standard's own text: what each mark means, and what to do about it, is under Cautions, page "+p.pageRef("cautions")+".")
	d.y += 1
	var rows []trow
	for i, s := range p.sourceList {
		text, marks := provenance(s)
		row := cellsOf("S"+strconv.Itoa(i+1), text, "")
		if marks != "" {
			row.cells[2] = cell{s: marks, bold: true, color: &colWarn}
		}
		rows = append(rows, row)
	}
	d.table([]column{{head: "", w: 10}, {head: "source", w: 155}, {head: "", w: 15}}, rows, tableOpts{size: 7.5, title: "Sources cited", zebra: true})
}

// needsVerifying reports whether a source says its value is recalled,
// common practice or secondary.
func needsVerifying(s string) bool {
	l := strings.ToLower(s)
	for _, k := range []string{"verify", "recalled", "common practice", "common-practice", "from memory", "secondary"} {
		if strings.Contains(l, k) {
			return true
		}
	}
	return false
}
