package report

import (
	"fmt"
	"time"
)

// historyRows is how many commits the cover lists; the rest are counted.
const historyRows = 5

// history draws, on the cover, the commits that touched the design's
// inputs (PackOptions.History): since the tag the history starts from, or
// the last few. A pack of a design outside git, or drawn without its
// history, says so in one line.
func (p *pack) history() {
	d, h := p.d, p.changes
	x, w := d.left(), d.width()
	title := "Changes to the design's inputs"
	switch {
	case h.Since != "":
		title += " since " + h.Since
	case len(h.Commits) > 0:
		title += ", the latest"
	}
	d.font(bold, 9)
	d.textColor(colInk)
	d.text(x, d.y+3.3, d.fit(title, w))
	d.y += 4.6
	d.font(regular, 8)
	if len(h.Commits) == 0 {
		d.textColor(colMuted)
		msg := "No history: the design is not in git, or was drawn without it."
		if p.r.Design.Revision != "" && h.Since != "" {
			msg = "None: no commit since " + h.Since + " touched the design's inputs."
		}
		d.text(x+2, d.y+3, d.fit(msg, w-2))
		d.textColor(colInk)
		d.y += 5
		return
	}
	for i, c := range h.Commits {
		if i == historyRows {
			break
		}
		d.textColor(colMuted)
		d.text(x+2, d.y+3, time.Unix(c.Time, 0).UTC().Format("2006-01-02"))
		d.font(mono, 7.5)
		d.text(x+20, d.y+3, shortHash(c.Commit, 8))
		d.font(regular, 8)
		d.text(x+35, d.y+3, d.fit(Inert(c.Author), 30))
		d.textColor(colInk)
		d.text(x+67, d.y+3, d.fit(Inert(c.Subject), w-67))
		d.y += 3.9
	}
	if rest := len(h.Commits) - historyRows; rest > 0 || h.More {
		d.textColor(colMuted)
		more := "more"
		if rest > 0 && !h.More {
			more = fmt.Sprintf("%d more", rest)
		}
		d.text(x+2, d.y+3, d.fit("… and "+more+": git log lists them all", w-2))
		d.textColor(colInk)
		d.y += 3.9
	}
	d.y += 1.5
}
