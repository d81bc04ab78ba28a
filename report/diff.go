package report

import (
	"fmt"
	"io"
	"sort"
	"strconv"
	"strings"

	"github.com/ampwright/ampwright/result"
)

// The text and Markdown views of a diff are summaries for a reviewer: they
// list the changed hulls only, most urgent first (broken, then
// regressions, fixes, margins that shrank, then the rest), give each
// shared change (a catalog part, a rulebook table) once rather than under
// every hull it reaches, and count the unchanged hulls in one line. The
// JSON (report.JSON of the YardDelta) is the whole diff.

// The groups of changed hulls, in the order a reviewer reads them.
const (
	groupBroken = iota
	groupRegressions
	groupFixes
	groupMargins
	groupOther
	groupCount
)

var groupTitles = [groupCount]string{"Broken", "Regressions", "Fixes", "Margins to review", "Other changes"}

// reviewOrder is the hulls a summary lists, by group, and what it counts
// instead of listing.
type reviewOrder struct {
	groups [groupCount][]*result.HullDelta
	// quiet are the hulls changed only by shared changes that moved
	// nothing of theirs; unchanged are the rest.
	quiet, unchanged int
	// takes lists, by hull path, the subjects of the shared changes each
	// hull takes.
	takes map[string][]string
}

func orderForReview(d *result.YardDelta) reviewOrder {
	o := reviewOrder{takes: map[string][]string{}}
	for _, s := range d.Shared {
		for _, h := range s.Hulls {
			o.takes[h] = append(o.takes[h], s.Subject)
		}
	}
	for i := range d.Hulls {
		h := &d.Hulls[i]
		switch {
		case h.State == result.HullUnchanged:
			o.unchanged++
		case !h.HasEffect():
			o.quiet++
		case h.State == result.HullBroken:
			o.groups[groupBroken] = append(o.groups[groupBroken], h)
		case h.Regressions() > 0:
			o.groups[groupRegressions] = append(o.groups[groupRegressions], h)
		case h.Fixes() > 0:
			o.groups[groupFixes] = append(o.groups[groupFixes], h)
		case len(h.Margins) > 0:
			o.groups[groupMargins] = append(o.groups[groupMargins], h)
		default:
			o.groups[groupOther] = append(o.groups[groupOther], h)
		}
	}
	// Within a group, the hull with most of what the group is about comes
	// first; then by path, so that the order is stable.
	weight := [groupCount]func(*result.HullDelta) int{
		func(h *result.HullDelta) int { return len(h.Problems) },
		func(h *result.HullDelta) int { return h.Regressions() },
		func(h *result.HullDelta) int { return h.Fixes() },
		func(h *result.HullDelta) int { return len(h.Margins) },
		func(*result.HullDelta) int { return 0 },
	}
	for g := range o.groups {
		hs := o.groups[g]
		sort.SliceStable(hs, func(i, j int) bool {
			if a, b := weight[g](hs[i]), weight[g](hs[j]); a != b {
				return a > b
			}
			return hs[i].Path < hs[j].Path
		})
	}
	return o
}

// DiffText writes what a change does to a yard, for the terminal: the
// counts, each shared change once, then each changed hull, most urgent
// first.
func DiffText(w io.Writer, d *result.YardDelta) error {
	p := &printer{w: w}
	o := orderForReview(d)
	p.line("ampwright diff: %s → %s", d.Base, d.Head)
	p.line("%s", countsLine(d.Counts))
	if len(d.Shared) > 0 {
		p.line("")
		for _, s := range d.Shared {
			p.line("shared: %s", sharedText(s))
		}
	}
	for g := range o.groups {
		if len(o.groups[g]) > fullSections {
			// Many hulls moved alike (a catalog change): a line each.
			p.line("")
			for _, h := range o.groups[g] {
				p.line("%s %s: %s", stateMark(*h), hullTitle(*h), changesText(h))
			}
			continue
		}
		for _, h := range o.groups[g] {
			p.line("")
			p.line("%s %s", stateMark(*h), hullTitle(*h))
			for _, l := range hullLines(h, o.takes[h.Path]) {
				p.line("    %s", l)
			}
		}
	}
	if tail := tailLines(o); len(tail) > 0 {
		p.line("")
		for _, l := range tail {
			p.line("%s", l)
		}
	}
	return p.err
}

// hullLines are one hull's changes, a line each, for the terminal.
func hullLines(h *result.HullDelta, takes []string) []string {
	var out []string
	for _, pr := range h.Problems {
		out = append(out, "error: "+problemText(pr))
	}
	shown, quiet := splitFindings(h.Findings)
	for _, f := range shown {
		out = append(out, fmt.Sprintf("%s %s %s: %s → %s  %s", changeWord(f), f.ID, f.Subject, orNone(f.Old), orNone(f.New), f.Message))
	}
	if quiet != "" {
		out = append(out, quiet)
	}
	for _, m := range h.Margins {
		out = append(out, "margin "+marginText(m))
	}
	if len(takes) > 0 {
		out = append(out, "takes "+strings.Join(takes, ", "))
	}
	for _, e := range h.Entries {
		out = append(out, entryText(e))
	}
	for _, f := range h.Figures {
		out = append(out, fmt.Sprintf("figure %s %s: %s", f.ID, f.Subject, figureChange(f)))
	}
	for _, b := range h.BOM {
		out = append(out, fmt.Sprintf("part %s (%s): %s → %s %s, %s → %s %s", b.Part, b.Category, num2(b.Old), num2(b.New), b.Unit,
			orDash(plain(b.OldTotal)), orDash(plain(b.NewTotal)), h.Currency))
	}
	if h.State == result.HullChanged && h.Cost != 0 {
		out = append(out, "cost "+costText(*h))
	}
	return out
}

// tailLines count what a summary does not list.
func tailLines(o reviewOrder) []string {
	var out []string
	if o.quiet > 0 {
		out = append(out, countOf(o.quiet, "more hull takes", "more hulls take")+" the shared changes above with no figure, finding or part moved.")
	}
	if o.unchanged > 0 {
		out = append(out, countOf(o.unchanged, "hull", "hulls")+" unchanged.")
	}
	return out
}

// DiffMarkdownOptions bound the Markdown of a diff.
type DiffMarkdownOptions struct {
	// MaxBytes is the largest comment written, in bytes; 0 is no bound.
	// Over it, hulls go one a row rather than one a section, then the
	// least urgent are left out, and a notice says so.
	MaxBytes int
	// FullJSON says where the whole diff is (a file or an artifact), for
	// the notice; "" names the command that writes it.
	FullJSON string
}

// DefaultMaxBytes is the default bound on a diff's Markdown: a pull
// request comment on GitHub holds at most 65536 characters.
const DefaultMaxBytes = 64 << 10

// markdownReserve is kept free for the notice and the closing counts when
// sections are left out.
const markdownReserve = 1024

// DiffMarkdown writes the summary as a Markdown comment for a pull request
// or a CI job summary, within opts.MaxBytes. Every piece of text that
// comes from a design is escaped, so a vessel named with Markdown, HTML
// or an @mention renders as plain text.
func DiffMarkdown(w io.Writer, d *result.YardDelta, opts DiffMarkdownOptions) error {
	o := orderForReview(d)
	var head strings.Builder
	fmt.Fprintf(&head, "### ampwright: %s → %s\n\n%s\n", md(d.Base), md(d.Head), md(countsLine(d.Counts)))

	var tail strings.Builder
	if lines := tailLines(o); len(lines) > 0 {
		tail.WriteString("\n")
		for _, l := range lines {
			tail.WriteString(md(l) + "\n")
		}
	}

	budget := opts.MaxBytes - head.Len() - tail.Len() - markdownReserve
	// Too large for the bound, the hulls go one a row rather than one a
	// section, so that all are named if that fits: first those with only
	// a margin or other changes, then all. If even that is cut, the
	// urgent hulls keep their sections and the rest is left out.
	body := o.markdownBody(d, budget, opts.MaxBytes <= 0, rowsForMany)
	for level := rowsForLesser; body.left() > 0 && level <= rowsForAll; level++ {
		body = o.markdownBody(d, budget, false, level)
	}
	if body.left() > 0 {
		body = o.markdownBody(d, budget, false, rowsForLesser)
	}

	var b strings.Builder
	b.WriteString(head.String())
	if body.left() > 0 {
		where := "`ampwright diff --format json`"
		if opts.FullJSON != "" {
			where = md(opts.FullJSON)
		}
		var what []string
		if body.leftHulls > 0 {
			what = append(what, countOf(body.leftHulls, "changed hull", "changed hulls"))
		}
		if body.leftShared > 0 {
			what = append(what, countOf(body.leftShared, "shared change", "shared changes"))
		}
		verb := " are"
		if body.left() == 1 {
			verb = " is"
		}
		fmt.Fprintf(&b, "\n> **Cut to fit %s** (`--max-bytes`): %s not shown, the least urgent. The full diff, never cut, is %s.\n",
			byteSize(opts.MaxBytes), strings.Join(what, " and ")+verb, where)
	}
	b.WriteString(body.String())
	b.WriteString(tail.String())
	_, err := io.WriteString(w, b.String())
	return err
}

// fullSections is the most hulls of a group given a section each; more
// (a catalog change reaching dozens of hulls) are one row each, so that
// the comment stays one a reviewer reads in a minute.
const fullSections = 10

// How far a Markdown body puts hulls one a row rather than one a section.
const (
	rowsForMany   = iota // in a group of more than fullSections
	rowsForLesser        // and in the groups of margins and other changes
	rowsForAll           // in every group
)

// markdownBody renders the shared changes and the hulls' sections, most
// urgent first, within budget bytes, with hulls one a row as level says.
func (o reviewOrder) markdownBody(d *result.YardDelta, budget int, unbounded bool, level int) *boundedBody {
	body := &boundedBody{budget: budget, unbounded: unbounded}
	if len(d.Shared) > 0 {
		body.heading("\n#### Shared changes\n\n")
		for _, s := range d.Shared {
			body.add("- "+md(sharedText(s))+"\n", &body.leftShared)
		}
	}
	for g := range o.groups {
		hs := o.groups[g]
		if len(hs) == 0 {
			continue
		}
		title := fmt.Sprintf("\n#### %s (%d)\n", groupTitles[g], len(hs))
		rows := len(hs) > fullSections || level == rowsForAll || (level == rowsForLesser && g >= groupMargins)
		if rows {
			body.heading(title + "\n| hull | vessel | state | changes |\n| --- | --- | --- | --- |\n")
			for _, h := range hs {
				body.add(fmt.Sprintf("| %s | %s | %s | %s |\n", md(h.Path), md(strings.TrimSpace(h.Name+" "+h.Hull)), h.State, md(changesText(h))), &body.leftHulls)
			}
			continue
		}
		body.heading(title)
		for _, h := range hs {
			body.add(hullMarkdown(h, o.takes[h.Path]), &body.leftHulls)
		}
	}
	return body
}

// changesText says what changed of a hull in one row: its first input
// error, its regressions and fixes, its margins, and how many entries,
// figures and parts changed.
func changesText(h *result.HullDelta) string {
	var parts []string
	if len(h.Problems) > 0 {
		t := problemText(h.Problems[0])
		if n := len(h.Problems) - 1; n > 0 {
			t += fmt.Sprintf(" (and %d more)", n)
		}
		parts = append(parts, t)
	}
	for _, f := range h.Findings {
		if f.Regression || f.Fix {
			parts = append(parts, fmt.Sprintf("%s %s %s %s → %s", changeWord(f), f.ID, f.Subject, orNone(f.Old), orNone(f.New)))
		}
	}
	for _, m := range h.Margins {
		parts = append(parts, fmt.Sprintf("margin of %s %s %s → %s", m.ID, m.Subject, numUnit(m.OldMargin, m.Unit), numUnit(m.Margin, m.Unit)))
	}
	if n := len(h.Entries); n > 0 {
		parts = append(parts, countOf(n, "entry", "entries"))
	}
	if n := len(h.Figures); n > 0 {
		parts = append(parts, countOf(n, "figure", "figures"))
	}
	if n := len(h.BOM); n > 0 {
		parts = append(parts, countOf(n, "part", "parts"))
	}
	if h.State == result.HullChanged && h.Cost != 0 {
		parts = append(parts, "cost "+costText(*h))
	}
	return strings.Join(parts, ", ")
}

// boundedBody collects sections while they fit its budget; once one does
// not, it counts the rest instead (so that the order of urgency holds:
// nothing after a section left out is shown).
type boundedBody struct {
	strings.Builder
	budget    int
	unbounded bool
	full      bool
	// leftHulls and leftShared count what was left out.
	leftHulls, leftShared int
	// pending is a heading held until a section under it fits.
	pending string
}

func (b *boundedBody) heading(s string) { b.pending = s }

// add writes section s if it fits, else counts it in *left.
func (b *boundedBody) add(s string, left *int) {
	if b.full || (!b.unbounded && b.Len()+len(b.pending)+len(s) > b.budget) {
		b.full = true
		*left++
		return
	}
	b.WriteString(b.pending)
	b.pending = ""
	b.WriteString(s)
}

func (b *boundedBody) left() int { return b.leftHulls + b.leftShared }

// hullMarkdown is one hull's section.
func hullMarkdown(h *result.HullDelta, takes []string) string {
	var s strings.Builder
	line := func(format string, args ...any) { fmt.Fprintf(&s, format+"\n", args...) }
	line("")
	line("##### %s %s", stateMark(*h), md(hullTitle(*h)))
	if len(h.Problems) > 0 {
		line("")
		line("Input errors:")
		line("")
		for _, pr := range h.Problems {
			line("- %s", md(problemText(pr)))
		}
	}
	shown, quiet := splitFindings(h.Findings)
	if len(shown) > 0 {
		var rows [][]string
		for _, f := range shown {
			rows = append(rows, []string{changeWord(f), md(string(f.ID)), md(f.Subject), orNone(f.Old), orNone(f.New),
				md(numUnit(f.Value, f.Unit)), md(numUnit(f.Limit, f.Unit)), md(f.Message)})
		}
		line("")
		mdTable(&s, "| change | check | subject | was | now | value | limit | message |", "| --- | --- | --- | --- | --- | ---: | ---: | --- |", rows)
	}
	if quiet != "" {
		line("")
		line("%s", md(quiet))
	}
	if len(h.Margins) > 0 {
		var rows [][]string
		for _, m := range h.Margins {
			rows = append(rows, []string{md(string(m.ID)), md(m.Subject), string(m.Status), md(numUnit(m.OldValue, m.Unit)), md(numUnit(m.Value, m.Unit)),
				md(limitText(m)), md(numUnit(m.OldMargin, m.Unit) + " → " + numUnit(m.Margin, m.Unit))})
		}
		line("")
		line("Margins that shrank past the rulebook's review threshold (the status is unchanged):")
		line("")
		mdTable(&s, "| check | subject | status | was | now | limit | margin |", "| --- | --- | --- | ---: | ---: | ---: | ---: |", rows)
	}
	if len(takes) > 0 || len(h.Entries) > 0 {
		line("")
		if len(takes) > 0 {
			line("- takes the shared %s", md(strings.Join(takes, ", ")))
		}
		for _, e := range h.Entries {
			line("- %s", md(entryText(e)))
		}
	}
	if len(h.Figures) > 0 {
		var rows [][]string
		for _, f := range h.Figures {
			rows = append(rows, []string{md(string(f.ID)), md(f.Subject), md(numUnit(f.Old, f.Unit)), md(numUnit(f.New, f.Unit)), md(deltaText(f))})
		}
		mdDetails(&s, countOf(len(h.Figures), "figure", "figures")+" changed", "| figure | subject | was | now | change |", "| --- | --- | ---: | ---: | ---: |", rows)
	}
	if len(h.BOM) > 0 {
		var rows [][]string
		for _, b := range h.BOM {
			rows = append(rows, []string{md(b.Part), md(b.Category), num2(b.Old), num2(b.New), md(b.Unit), orDash(plain(b.OldTotal)), orDash(plain(b.NewTotal))})
		}
		mdDetails(&s, "Bill of materials: "+md(costText(*h)), "| part | category | was | now | unit | cost was | cost now |", "| --- | --- | ---: | ---: | --- | ---: | ---: |", rows)
	}
	return s.String()
}

// splitFindings keeps the findings a reviewer reads (regressions, fixes,
// and any other that does not pass) and sums up the rest: a hull added
// brings a hundred new findings that pass.
func splitFindings(fs []result.StatusChange) ([]result.StatusChange, string) {
	var shown []result.StatusChange
	var added, gone int
	for _, f := range fs {
		switch {
		case f.Regression || f.Fix || (f.New != "" && f.New != result.Pass):
			shown = append(shown, f)
		case f.Old == "":
			added++
		default:
			gone++
		}
	}
	var quiet []string
	if added > 0 {
		quiet = append(quiet, countOf(added, "new finding passes", "new findings pass"))
	}
	if gone > 0 {
		quiet = append(quiet, countOf(gone, "passing finding is", "passing findings are")+" no longer checked")
	}
	return shown, strings.Join(quiet, "; ")
}

// mdTable writes a Markdown table whose cells are escaped already.
func mdTable(s *strings.Builder, header, align string, rows [][]string) {
	fmt.Fprintf(s, "%s\n%s\n", header, align)
	for _, r := range rows {
		fmt.Fprintf(s, "| %s |\n", strings.Join(r, " | "))
	}
}

// mdDetails writes a table folded under a summary line.
func mdDetails(s *strings.Builder, summary, header, align string, rows [][]string) {
	fmt.Fprintf(s, "\n<details><summary>%s</summary>\n\n", summary)
	mdTable(s, header, align, rows)
	s.WriteString("\n</details>\n")
}

// entryText is one entry of a design that changed: what it is, how, and
// its first few values.
func entryText(e result.EntryChange) string {
	const shown = 3
	var parts []string
	for i, in := range e.Inputs {
		if i == shown {
			parts = append(parts, fmt.Sprintf("and %d more", len(e.Inputs)-shown))
			break
		}
		parts = append(parts, inputText(in, e.Change))
	}
	return e.Change + " " + e.Entry + ": " + strings.Join(parts, ", ")
}

// inputText is one value: "length 6 m → 12 m", or for an entry added or
// removed, the value alone.
func inputText(in result.InputChange, change string) string {
	name := in.Path
	if name != "" {
		name += " "
	}
	switch change {
	case result.EntryAdded:
		return name + valueOf(in.New)
	case result.EntryRemoved:
		return name + valueOf(in.Old)
	}
	return name + orDash(valueOf(in.Old)) + " → " + orDash(valueOf(in.New))
}

// sharedText is one shared change: "battery tern-li100: maxCharge 50 A →
// 30 A; 72 hulls use it, 3 regress: hulls/a, hulls/b, hulls/c".
func sharedText(s result.SharedChange) string {
	var parts []string
	for _, c := range s.Changes {
		parts = append(parts, inputText(c, result.EntryChanged))
	}
	t := s.Subject + ": " + strings.Join(parts, ", ") + "; " + countOf(len(s.Hulls), "hull uses it", "hulls use it") + ", "
	switch n := len(s.Regressed); n {
	case 0:
		t += "none regress"
	case 1:
		t += "1 regresses: " + named(s.Regressed)
	default:
		t += strconv.Itoa(n) + " regress: " + named(s.Regressed)
	}
	if n := len(s.Margins); n > 0 {
		t += "; " + countOf(n, "has a margin", "have a margin") + " to review"
	}
	return t
}

// named lists the first few hulls of a list, and how many more.
func named(hulls []string) string {
	const shown = 5
	if len(hulls) > shown {
		return strings.Join(hulls[:shown], ", ") + fmt.Sprintf(" and %d more", len(hulls)-shown)
	}
	return strings.Join(hulls, ", ")
}

// valueOf is an input value as a reader writes it: a CUE string without its
// quotes ("6 m" → 6 m); other values as they are.
func valueOf(v string) string {
	if u, err := strconv.Unquote(v); err == nil && strings.HasPrefix(v, `"`) {
		return u
	}
	return v
}

func marginText(m result.MarginChange) string {
	return fmt.Sprintf("%s %s: %s → %s, limit %s (margin %s → %s; still %s)", m.ID, m.Subject, numUnit(m.OldValue, m.Unit), numUnit(m.Value, m.Unit),
		limitText(m), numUnit(m.OldMargin, m.Unit), numUnit(m.Margin, m.Unit), m.Status)
}

// limitText is a margin's limit, old and new when the change moved it (a
// catalog part's rating lowered).
func limitText(m result.MarginChange) string {
	if m.OldLimit != m.Limit {
		return numUnit(m.OldLimit, m.Unit) + " → " + numUnit(m.Limit, m.Unit)
	}
	return numUnit(m.Limit, m.Unit)
}

// countOf is n and the word for one or for many: "1 hull", "3 hulls".
func countOf(n int, one, many string) string {
	if n == 1 {
		return "1 " + one
	}
	return strconv.Itoa(n) + " " + many
}

func byteSize(n int) string {
	if n%1024 == 0 {
		return strconv.Itoa(n/1024) + " KiB"
	}
	return strconv.Itoa(n) + " bytes"
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
	case h.Fixes() > 0:
		return "✓"
	case len(h.Margins) > 0:
		return "!"
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
	return fmt.Sprintf("%d hulls: %d changed, %d unchanged, %d added, %d removed, %d broken; %d regressions, %d fixes, %d margins to review",
		c.Hulls, c.Changed, c.Unchanged, c.Added, c.Removed, c.Broken, c.Regressions, c.Fixes, c.Margins)
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
