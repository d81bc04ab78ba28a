package report

import (
	"fmt"
	"io"
	"strconv"
	"strings"

	"github.com/ampwright/ampwright/result"
)

// DiffText writes what a change does to every hull, for the terminal.
func DiffText(w io.Writer, d *result.YardDelta) error {
	p := &printer{w: w}
	p.line("ampwright diff: %s → %s", d.Base, d.Head)
	for _, h := range d.Hulls {
		p.line("")
		p.line("%s %s", stateMark(h), hullTitle(h))
		if h.State == result.HullUnchanged {
			continue
		}
		for _, pr := range h.Problems {
			p.line("    error: %s", problemText(pr))
		}
		for _, f := range h.Findings {
			p.line("    %s %s %s: %s → %s  %s", changeWord(f), f.ID, f.Subject, orNone(f.Old), orNone(f.New), f.Message)
		}
		for _, in := range h.Inputs {
			p.line("    input %s: %s → %s", in.Path, orDash(in.Old), orDash(in.New))
		}
		for _, f := range h.Figures {
			p.line("    figure %s %s: %s", f.ID, f.Subject, figureChange(f))
		}
		for _, b := range h.BOM {
			p.line("    part %s (%s): %s → %s %s", b.Part, b.Category, num2(b.Old), num2(b.New), b.Unit)
		}
		if h.State == result.HullChanged && h.Cost != 0 {
			p.line("    cost %s", costText(h))
		}
	}
	p.line("")
	p.line("%s", countsLine(d.Counts))
	return p.err
}

// DiffMarkdown writes the same as a Markdown comment for a pull request or
// a CI job summary. Every piece of text that comes from a design is
// escaped, so a vessel named with Markdown, HTML or an @mention renders as
// plain text.
func DiffMarkdown(w io.Writer, d *result.YardDelta) error {
	p := &printer{w: w}
	p.line("### ampwright: %s → %s", md(d.Base), md(d.Head))
	p.line("")
	p.line("%s", md(countsLine(d.Counts)))
	p.line("")
	p.line("| hull | vessel | state | regressions | fixes | verdict |")
	p.line("| --- | --- | --- | ---: | ---: | --- |")
	for _, h := range d.Hulls {
		p.line("| %s | %s | %s | %d | %d | %s |", md(h.Path), md(strings.TrimSpace(h.Name+" "+h.Hull)), h.State, h.Regressions(), h.Fixes(), md(string(h.Verdict)))
	}
	for _, h := range d.Hulls {
		if h.State == result.HullUnchanged || !h.HasChanges() {
			continue
		}
		p.line("")
		p.line("#### %s %s", stateMark(h), md(hullTitle(h)))
		if len(h.Problems) > 0 {
			p.line("")
			p.line("Input errors:")
			p.line("")
			for _, pr := range h.Problems {
				p.line("- %s", md(problemText(pr)))
			}
		}
		if len(h.Findings) > 0 {
			var rows [][]string
			for _, f := range h.Findings {
				rows = append(rows, []string{changeWord(f), md(f.ID), md(f.Subject), orNone(f.Old), orNone(f.New),
					md(numUnit(f.Value, f.Unit)), md(numUnit(f.Limit, f.Unit)), md(f.Message)})
			}
			p.line("")
			p.mdTable("| change | check | subject | was | now | value | limit | message |", "| --- | --- | --- | --- | --- | ---: | ---: | --- |", rows)
		}
		if len(h.Inputs) > 0 {
			var rows [][]string
			for _, in := range h.Inputs {
				rows = append(rows, []string{md(in.Path), md(in.Old), md(in.New)})
			}
			p.mdDetails(fmt.Sprintf("%d input(s) changed", len(h.Inputs)), "| input | was | now |", "| --- | --- | --- |", rows)
		}
		if len(h.Figures) > 0 {
			var rows [][]string
			for _, f := range h.Figures {
				rows = append(rows, []string{md(f.ID), md(f.Subject), md(numUnit(f.Old, f.Unit)), md(numUnit(f.New, f.Unit)), md(deltaText(f))})
			}
			p.mdDetails(fmt.Sprintf("%d figure(s) changed", len(h.Figures)), "| figure | subject | was | now | change |", "| --- | --- | ---: | ---: | ---: |", rows)
		}
		if len(h.BOM) > 0 {
			var rows [][]string
			for _, b := range h.BOM {
				rows = append(rows, []string{md(b.Part), md(b.Category), num2(b.Old), num2(b.New), md(b.Unit)})
			}
			p.line("")
			p.line("Bill of materials: %s", md(costText(h)))
			p.line("")
			p.mdTable("| part | category | was | now | unit |", "| --- | --- | ---: | ---: | --- |", rows)
		}
	}
	return p.err
}

// mdTable writes a Markdown table whose cells are escaped already.
func (p *printer) mdTable(header, align string, rows [][]string) {
	p.line("%s", header)
	p.line("%s", align)
	for _, r := range rows {
		p.line("| %s |", strings.Join(r, " | "))
	}
}

// mdDetails writes a table folded under a summary line.
func (p *printer) mdDetails(summary, header, align string, rows [][]string) {
	p.line("")
	p.line("<details><summary>%s</summary>", summary)
	p.line("")
	p.mdTable(header, align, rows)
	p.line("")
	p.line("</details>")
}

func hullTitle(h result.HullDelta) string {
	t := h.Path
	if h.Name != "" {
		t += " (" + strings.TrimSpace(h.Name+" "+h.Hull) + ")"
	}
	return t + ": " + h.State
}

func stateMark(h result.HullDelta) string {
	switch {
	case h.State == result.HullBroken || h.Regressions() > 0:
		return "✗"
	case h.State == result.HullUnchanged:
		return "="
	}
	return "•"
}

func changeWord(f result.StatusChange) string {
	switch {
	case f.Regression:
		return "regression"
	case f.Fix:
		return "fix"
	}
	return "changed"
}

func orNone(s result.Status) string {
	if s == "" {
		return "none"
	}
	return string(s)
}

func figureChange(f result.FigureChange) string {
	switch {
	case f.Added:
		return "new, " + numUnit(f.New, f.Unit)
	case f.Removed:
		return "gone, was " + numUnit(f.Old, f.Unit)
	}
	return fmt.Sprintf("%s → %s (%s)", numUnit(f.Old, f.Unit), numUnit(f.New, f.Unit), deltaText(f))
}

func deltaText(f result.FigureChange) string {
	s := strconv.FormatFloat(f.Diff, 'g', 6, 64)
	if f.Diff > 0 {
		s = "+" + s
	}
	if f.Old != 0 && !f.Added && !f.Removed {
		s += fmt.Sprintf(", %+.1f %%", f.Percent)
	}
	return s
}

func numUnit(v float64, unit string) string {
	return strings.TrimSpace(strconv.FormatFloat(v, 'f', -1, 64) + " " + unit)
}

func costText(h result.HullDelta) string {
	s := fmt.Sprintf("%+.2f %s", h.Cost, h.Currency)
	if !h.CostComplete {
		s += " (some parts have no price)"
	}
	return s
}

func problemText(p result.Problem) string {
	var b strings.Builder
	if p.Position != "" {
		b.WriteString(p.Position + ": ")
	}
	if p.Path != "" {
		b.WriteString(p.Path + ": ")
	}
	b.WriteString(p.Message)
	return b.String()
}

func countsLine(c result.DeltaCounts) string {
	return fmt.Sprintf("%d hulls: %d changed, %d unchanged, %d added, %d removed, %d broken; %d regressions, %d fixes",
		c.Hulls, c.Changed, c.Unchanged, c.Added, c.Removed, c.Broken, c.Regressions, c.Fixes)
}

// md escapes text for Markdown: it is made inert first (Inert: control
// characters, line breaks and bidirectional controls written as escapes),
// then the punctuation that Markdown or a table could read as markup is
// backslash-escaped (emphasis, code, links, headings, images,
// strike-through, table cells), angle brackets and ampersands become
// entities so no HTML passes, and an @ is followed by a zero-width space,
// written as an entity (&#8203;), so that no mention is made.
func md(s string) string {
	var b strings.Builder
	for _, r := range Inert(s) {
		switch r {
		case '<':
			b.WriteString("&lt;")
		case '>':
			b.WriteString("&gt;")
		case '&':
			b.WriteString("&amp;")
		case '@':
			b.WriteString("@&#8203;")
		case '\\', '`', '*', '_', '[', ']', '#', '!', '|', '~':
			b.WriteByte('\\')
			b.WriteRune(r)
		default:
			b.WriteRune(r)
		}
	}
	return b.String()
}
