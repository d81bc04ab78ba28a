package report

import (
	"fmt"
	"strings"

	"github.com/ampwright/ampwright/result"
)

// bom is the bill of materials, by category.
func (p *pack) bom() {
	d := p.d
	p.start("bom", "Bill of materials", false)
	b := p.r.BOM
	if b == nil || len(b.Lines) == 0 {
		p.note(9, colMuted, "The design gives no bill of materials.")
		return
	}
	cur := b.Currency
	if cur == "" {
		cur = "no currency given"
	}
	slack := ""
	if b.Slack > 0 {
		slack = fmt.Sprintf(" Cable lengths include %s %% slack (%s).", fnum(b.Slack*100), orDash(b.SlackSource))
	}
	p.note(8.5, colMuted, "Parts from the yard's catalog, counted from the design; prices in "+cur+"."+slack)
	d.y += 1

	var cats []string
	byCat := map[string][]result.BOMLine{}
	for _, l := range b.Lines {
		if _, ok := byCat[l.Category]; !ok {
			cats = append(cats, l.Category)
		}
		byCat[l.Category] = append(byCat[l.Category], l)
	}
	unpriced := 0
	var rows []trow
	for _, c := range cats {
		g := trow{group: true, bold: true, fill: &colShade, cells: []cell{{s: orDash(c)}}}
		rows = append(rows, g)
		for _, l := range byCat[c] {
			desc := l.Description
			if l.Length > 0 {
				desc += " — " + p.lengthIn(l.Length) + " in all"
			}
			price, total := cell{s: "no price", color: &colWarn}, cell{s: "—", color: &colWarn}
			if l.UnitPrice != nil {
				price = cell{s: fixed(*l.UnitPrice, 2)}
			}
			if l.Total != nil {
				total = cell{s: fixed(*l.Total, 2)}
			}
			if l.UnitPrice == nil || l.Total == nil {
				unpriced++
			}
			rows = append(rows, trow{cells: []cell{{s: l.Part, bold: true}, {s: desc}, {s: fnum(l.Quantity)}, {s: l.Unit}, price, total, {s: l.For}}})
		}
	}
	tot := trow{bold: true, cells: []cell{{s: "total"}, {s: plural(len(b.Lines), "line")}, {}, {}, {}, {s: fixed(b.Total, 2)}, {s: b.Currency}}}
	if !b.Complete {
		tot.fill = &colWarnBg
	}
	rows = append(rows, tot)
	cu := strings.TrimSpace(b.Currency)
	if cu != "" {
		cu = " " + cu
	}
	d.table([]column{{head: "part", w: 24}, {head: "description", w: 58}, {head: "qty", w: 10, align: "R"}, {head: "unit", w: 11},
		{head: "unit price" + cu, w: 17, align: "R"}, {head: "total" + cu, w: 17, align: "R"}, {head: "for", w: 43}}, rows,
		tableOpts{size: 7, title: "Bill of materials"})
	d.y += 2
	if !b.Complete {
		if unpriced == 0 {
			unpriced = 1
		}
		d.font(bold, 9)
		d.textColor(colWarn)
		d.para(d.left(), d.width(), fmt.Sprintf("Total incomplete: %s without a price; the total leaves %s out.", plural(unpriced, "line"), map[bool]string{true: "it", false: "them"}[unpriced == 1]))
		d.textColor(colInk)
	}
}
