package report

import "fmt"

// diagram draws the one-line diagram (diagram*.go) on landscape pages, a
// sheet a page, each headed with its sheet number when there are more
// than one.
func (p *pack) diagram() {
	d := p.d
	p.start("diagram", "One-line diagram", true)
	if len(p.r.Wiring) == 0 && (p.r.System == nil || len(p.r.System.Nodes) == 0) {
		p.note(9, colMuted, "The design has no wiring runs.")
		return
	}
	sheets := layoutDiagram(p.r, d.width(), d.bottom()-d.y,
		"Lengths, currents and voltage drops of the runs are in the wiring schedule, page "+p.pageOf("wiring")+".")
	for i, sh := range sheets {
		if i > 0 {
			d.addPage(true)
			p.heading("One-line diagram (continued)")
		}
		if len(sheets) > 1 {
			// Beside the heading, which has moved the cursor 10.5 mm down.
			d.font(regular, 9)
			d.textColor(colMuted)
			s := fmt.Sprintf("sheet %d of %d", i+1, len(sheets))
			d.text(d.right()-d.textW(s), d.y-5.5, s)
			d.textColor(colInk)
		}
		drawSheet(d, sh, d.left(), d.y)
		d.y += sh.h // the sheet is drawn at fixed places: the cursor follows
	}
}
