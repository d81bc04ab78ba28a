package report

import (
	"fmt"

	"github.com/ampwright/ampwright/result"
)

// proposal draws the appendix of a pack made with the proposal: the
// cheapest design from the yard's catalog that passes every check, beside
// the designer's, each change with the margin it is sized to and the next
// smaller option and the check it fails, the margins that bind, and the
// premises the search's proof rests on. It draws nothing when the result
// has no proposal.
func (p *pack) proposal() {
	pr := p.r.Proposal
	if pr == nil {
		return
	}
	d := p.d
	p.start("proposal", "Appendix: proposal from the yard's catalog", false)
	p.note(9, colInk, "ampwright propose kept this design's loads, scenarios, voyage, site and wiring, and searched the yard's catalog for the cheapest bank, arrays, controllers, conductors, devices and bus parts that pass every check. It is a proposal for the designer, not part of the design this pack certifies.")
	d.y += 1
	p.note(9, colInk, "Status: "+ProposalStatus(pr)+".")
	if pr.Cut != "" {
		p.note(8.5, colWarn, pr.Cut)
	}
	p.note(8.5, colMuted, "Search: "+SearchText(pr)+".")
	d.y += 2

	if pr.Status == "none" {
		p.sub("Nothing in the catalog passes", 12)
		p.note(9, colInk, "The closest the search came still fails these checks; what would be needed is given with each.")
		d.y += 1
		for _, f := range pr.Blocking {
			p.findingBox(f)
		}
	} else {
		p.sub("The two designs", 20)
		verdict := func(s result.ProposalSide) string {
			return fmt.Sprintf("%d pass, %d warn, %d fail", s.Pass, s.Warn, s.Fail)
		}
		rows := []trow{
			cellsOf("cost", cost(pr.Designer, pr.Currency), cost(pr.Proposed, pr.Currency)),
			cellsOf("checks", verdict(pr.Designer), verdict(pr.Proposed)),
		}
		for i := range max(len(pr.Designer.Bank), len(pr.Proposed.Bank)) {
			rows = append(rows, cellsOf("bank", at(pr.Designer.Bank, i), at(pr.Proposed.Bank, i)))
		}
		for i := range max(len(pr.Designer.Arrays), len(pr.Proposed.Arrays)) {
			rows = append(rows, cellsOf("array", at(pr.Designer.Arrays, i), at(pr.Proposed.Arrays, i)))
		}
		d.table([]column{{head: "", w: 18}, {head: "designer", w: 81}, {head: "proposal", w: 81}}, rows, tableOpts{size: 8, title: "The two designs"})
		if s := saving(pr); s != "" {
			p.note(8.5, colMuted, "The proposal costs"+s[1:]+".")
		}
		d.y += 3

		p.sub(fmt.Sprintf("Changes (%d)", len(pr.Changes)), 14)
		if len(pr.Changes) == 0 {
			p.note(9, colInk, "None: the designer's design is the cheapest that passes.")
		} else {
			var crows []trow
			for _, c := range pr.Changes {
				smaller := ""
				if c.Smaller != "" {
					smaller = c.Smaller + " fails " + c.SmallerFails
				}
				crows = append(crows, trow{cells: []cell{{s: c.Entry, bold: true}, {s: c.What + ": " + c.From + " → " + c.To}, {s: c.Binds}, {s: smaller}}})
			}
			d.table([]column{{head: "entry", w: 30}, {head: "change", w: 42}, {head: "sized to", w: 48}, {head: "the next smaller fails", w: 60}}, crows, tableOpts{size: 7, title: "Changes", zebra: true})
		}
		d.y += 3

		p.sub("Margins that bind", 14)
		var brows []trow
		for _, f := range pr.Binding {
			brows = append(brows, cellsOf(string(f.ID), f.Subject, qty(f.Value, f.Unit), qty(f.Limit, f.Unit), qty(f.Margin, f.Unit)))
		}
		d.table([]column{{head: "check", w: 34}, {head: "subject", w: 40}, {head: "value", w: 34, align: "R"}, {head: "limit", w: 34, align: "R"}, {head: "margin", w: 38, align: "R"}}, brows, tableOpts{size: 7.5, title: "Margins that bind", zebra: true})
		d.y += 3
	}
	p.sub("Premises", 12)
	p.note(8.5, colInk, "The search prunes by these rules; its proof that the proposal is the cheapest rests on them and on the catalog's prices:")
	for _, s := range pr.Premises {
		p.note(8.5, colInk, "• "+s)
	}
}

func at(list []string, i int) string {
	if i < len(list) {
		return list[i]
	}
	return ""
}
