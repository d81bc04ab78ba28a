package report

import (
	"fmt"
	"strings"

	"github.com/ampwright/ampwright/result"
)

// findings lists what fails and warns, each with what to change, where
// and the limit's source, then the passing checks in a small table.
func (p *pack) findings() {
	d, r := p.d, p.r
	p.start("findings", "Findings", false)
	c := r.Count()
	p.noteRefs(9, colInk, fmt.Sprintf("%d findings: %d fail, %d warn, %d pass. Failing and warning findings come first, each with what to change; every finding's arithmetic is on the calculation sheets (page %s).", len(r.Checks), c.Fail, c.Warn, c.Pass, p.pageRef("calc")))
	d.y += 2

	var bad []result.Finding
	for _, f := range r.Checks {
		if f.Status != result.Pass {
			bad = append(bad, f)
		}
	}
	if len(bad) == 0 {
		p.note(9, colPass, "No check fails or warns.")
	}
	for _, f := range bad {
		p.findingBox(f)
	}

	// The passing checks, grouped by check.
	type group struct {
		id       string
		subjects []string
	}
	var groups []*group
	byID := map[string]*group{}
	for _, f := range r.Checks {
		if f.Status != result.Pass {
			continue
		}
		g := byID[string(f.ID)]
		if g == nil {
			g = &group{id: string(f.ID)}
			byID[string(f.ID)] = g
			groups = append(groups, g)
		}
		g.subjects = append(g.subjects, f.Subject)
	}
	d.y += 2
	p.sub(fmt.Sprintf("Passing checks (%d)", c.Pass), 12)
	if len(groups) == 0 {
		p.note(9, colMuted, "None.")
		return
	}
	var rows []trow
	for _, g := range groups {
		rows = append(rows, cellsOf(g.id, fmt.Sprint(len(g.subjects)), strings.Join(g.subjects, ", ")))
	}
	d.table([]column{{head: "check", w: 30}, {head: "passes", w: 13, align: "R"}, {head: "subjects", w: 137}}, rows, tableOpts{size: 7.5, title: "Passing checks", zebra: true})
}

// findingBox draws one failing or warning finding as a block with a bar
// of its verdict's colour down its left side.
func (p *pack) findingBox(f result.Finding) {
	d := p.d
	x, w := d.left(), d.width()
	const size = 8.5
	tx, tw := x+5, w-7
	type line struct {
		st     fontStyle
		c      rgb
		s      string
		label  string
		indent bool
	}
	var lines []line
	add := func(st fontStyle, c rgb, label, s string) {
		if s == "" {
			return
		}
		d.font(st, size)
		lw := 0.0
		if label != "" {
			lw = 24
		}
		for i, l := range d.wrap(s, tw-lw) {
			lab := ""
			if i == 0 {
				lab = label
			}
			lines = append(lines, line{st: st, c: c, s: l, label: lab, indent: label != ""})
		}
	}
	add(regular, colInk, "", f.Message)
	add(bold, colInk, "Change", f.Change)
	add(regular, colInk, "Value", fmt.Sprintf("%s %s limit %s; margin %s", qty(f.Value, f.Unit), relation(f), qty(f.Limit, f.Unit), qty(f.Margin, f.Unit)))
	add(mono, colInk, "Position", f.Position)
	add(regular, colMuted, "Limit from", marked(f.Source))

	d.font(regular, size)
	lh := d.lineH()
	h := 7 + float64(len(lines))*lh + 2
	d.need(min(h, d.bottom()-d.top))
	top := d.y
	fill := statusFill(f.Status)
	col := statusColor(f.Status)
	d.box(x, top, w, h, fill, lineStyle{})
	d.box(x, top, 2.2, h, &col, lineStyle{})
	d.font(bold, 9.5)
	d.textColor(col)
	tag := strings.ToUpper(string(f.Status))
	d.text(tx, top+5, tag)
	tagW := d.textW(tag) + 3
	d.textColor(colInk)
	d.text(tx+tagW, top+5, d.fit(string(f.ID)+" · "+f.Subject, tw-tagW))
	d.y = top + 7
	for _, l := range lines {
		if d.y+lh > d.bottom() {
			d.addPage(false)
		}
		if l.label != "" {
			d.font(regular, size)
			d.textColor(colMuted)
			d.text(tx, d.y+lh*0.78, l.label)
		}
		d.font(l.st, size)
		d.textColor(l.c)
		lx := tx
		if l.indent {
			lx = tx + 24
		}
		d.text(lx, d.y+lh*0.78, l.s)
		d.y += lh
	}
	d.textColor(colInk)
	d.y = top + h + 3
	if d.y > d.bottom() {
		d.y = d.bottom()
	}
}
