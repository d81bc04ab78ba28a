package report

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strconv"
	"strings"
	"time"

	"github.com/ampwright/ampwright/result"
)

// PackOptions says how to print a calculation pack.
type PackOptions struct {
	// PageSize is "A4" (the default when empty) or "Letter".
	PageSize string
	// Date dates the pack and its PDF metadata. When zero, the pack is
	// dated by the result's commit time, or else by PackEpoch and marked
	// undated; it is never the clock's time, so the same inputs give the
	// same bytes.
	Date time.Time
	// MaxPages bounds the pack's pages, and Deadline the time it may take
	// to draw (0 and zero for none): Pack stops at the first bound passed
	// and returns a *PackBoundError, writing nothing.
	MaxPages int
	Deadline time.Time
	// History is the commits that touched the design's inputs, for the
	// cover (yard.History); empty, the cover says the pack has none.
	History result.History
}

// PackBoundError is a pack that passed a bound of PackOptions while it
// was drawn.
type PackBoundError struct {
	Pages   int    // the page bound passed, or 0
	Time    bool   // the deadline passed
	Section string // the section being drawn
}

func (e *PackBoundError) Error() string {
	at := ""
	if e.Section != "" {
		at = fmt.Sprintf(" while drawing %q", e.Section)
	}
	if e.Time {
		return "pack: drawing took longer than its time bound" + at + "; no pack written"
	}
	return fmt.Sprintf("pack: the pack passed its bound of %d pages%s; no pack written", e.Pages, at)
}

// PackEpoch is the PDF date of a pack with no date and no commit time:
// 2000-01-01 00:00 UTC. The pack's cover then says it is not dated.
var PackEpoch = time.Date(2000, 1, 1, 0, 0, 0, 0, time.UTC)

// Pack writes the printed calculation pack of r as a PDF: a cover with
// the verdict and sign-off, the findings, energy, solar, voyage, wiring,
// charts, a one-line diagram, calculation sheets for every figure, the
// bill of materials and the cautions. The same result and options give
// the same bytes.
func Pack(w io.Writer, r *result.Result, opts PackOptions) error {
	p, err := drawPack(r, opts)
	if err != nil {
		return err
	}
	b, err := p.d.bytes()
	if err != nil {
		return fmt.Errorf("pack: %w", err)
	}
	_, err = w.Write(b)
	return err
}

// drawPack draws the pack of r, not yet written.
func drawPack(r *result.Result, opts PackOptions) (*pack, error) {
	if r == nil {
		return nil, errors.New("pack: no result")
	}
	if len(r.Problems) > 0 {
		return nil, fmt.Errorf("pack: the design has %d input error(s); a pack needs a design that validates", len(r.Problems))
	}
	date, dated := opts.Date, !opts.Date.IsZero()
	if !dated && r.Design.CommitTime > 0 {
		date, dated = time.Unix(r.Design.CommitTime, 0), true
	}
	if !dated {
		date = PackEpoch
	}
	d, err := newDoc(opts.PageSize, date)
	if err != nil {
		return nil, err
	}
	p := &pack{d: d, r: r, date: date.UTC(), dated: dated, sources: map[string]int{}, changes: opts.History}
	d.maxPages, d.deadline = opts.MaxPages, opts.Deadline
	d.where = func() string { return p.section }
	p.build()
	p.layout.ended(d.page(), d.y, p.key)
	if d.stopped != nil {
		return nil, d.stopped
	}
	return p, nil
}

// pack is a calculation pack being drawn.
type pack struct {
	d       *doc
	r       *result.Result
	date    time.Time
	dated   bool
	section string
	// changes is the design's history, for the cover.
	changes result.History
	// key is the section being drawn, and layout what each page holds.
	key    string
	layout pageLayout
	ended  bool // start has recorded where the page before ended
	// contentsY is where the cover's contents list goes.
	contentsY float64
	// sources numbers the source texts cited on the calculation sheets.
	sources    map[string]int
	sourceList []string
	// provenances keeps each text's provenance (pack.provenance).
	provenances map[string][2]string
	// lastPos is the last design position shown on the sheets.
	lastPos string
	// The lookups of index.
	figAt   map[idSubject]int
	figByID map[string][]int
	findAt  map[idSubject][]int
}

type tocEntry struct {
	key, title string
}

func (p *pack) build() {
	r, d := p.r, p.d
	name := orDash(r.Design.Name)
	d.setInfo("Calculation pack: "+name+" "+r.Design.Hull, "DC electrical and solar-charging design", r.Design.Designer)
	d.header = p.header
	d.footer = p.footer
	// Once a bound stops the drawing (doc.stop), the sections left are
	// not drawn at all.
	for _, section := range []func(){p.cover, p.findings, p.energy, p.solar, p.voyage, p.wiring, p.diagram, p.calcSheets, p.bom, p.cautions, p.proposal} {
		if d.stopped == nil {
			section()
		}
	}
}

// start begins a section on a new page and lists it in the contents.
// start begins a section: below the section before it when a third of
// its page is left and the orientation is the same, else on a new page, so
// that no page holds less than a third of a page but the last of a
// section (before a landscape diagram, say, or at the end).
func (p *pack) start(key, title string, landscape bool) {
	d := p.d
	p.section = title
	if d.page() <= 1 || d.landscape != landscape || d.bottom()-d.y < (d.bottom()-d.top)/3 {
		// The page ends in the section before; the new one is this one's.
		p.layout.ended(d.page(), d.y, p.key)
		p.key, p.ended = key, true
		d.addPage(landscape)
	} else {
		d.y += 6
	}
	p.key = key
	p.layout.note(d.page(), key)
	d.mark(key)
	p.heading(title)
}

// pageLayout records, page by page, how much of its body was drawn and
// the sections drawn on it, for the test that no page is left near empty.
type pageLayout struct {
	pages []pageUse // by page, from 1
}

type pageUse struct {
	landscape   bool
	top, bottom float64  // the body's bounds
	end         float64  // the cursor when the page ended
	sections    []string // the sections drawn on it, in order
}

// filled is the share of the page's body drawn.
func (u pageUse) filled() float64 { return (u.end - u.top) / (u.bottom - u.top) }

func (l *pageLayout) at(page int) *pageUse {
	for len(l.pages) < page {
		l.pages = append(l.pages, pageUse{})
	}
	return &l.pages[page-1]
}

// note records that section key is drawn on page.
func (l *pageLayout) note(page int, key string) {
	u := l.at(page)
	if n := len(u.sections); n == 0 || u.sections[n-1] != key {
		u.sections = append(u.sections, key)
	}
}

// ended records where page ended, in section key.
func (l *pageLayout) ended(page int, y float64, key string) {
	if page < 1 {
		return
	}
	l.at(page).end = y
	l.note(page, key)
}

// pageRef is a marker that reads as the first page of the section key
// (doc.ref), in text drawn within doc.withRefs: noteRefs, or the cover's
// lines.
func (p *pack) pageRef(key string) string { return p.d.ref(key) }

// pageOf is the first page of the section key, drawn before the caller.
func (p *pack) pageOf(key string) string {
	if n, ok := p.d.refPage[key]; ok {
		return strconv.Itoa(n)
	}
	return "?"
}

// heading draws a section heading at the cursor.
func (p *pack) heading(title string) { p.d.heading(title) }

// sub draws a subheading, keeping room for what follows it.
func (p *pack) sub(title string, keep float64) {
	d := p.d
	d.need(8 + keep)
	d.y += 1.5
	d.font(bold, 10)
	d.textColor(colInk)
	d.text(d.left(), d.y+3.6, d.fit(title, d.width()))
	d.y += 5.5
}

// note draws a paragraph in the body font at the cursor.
func (p *pack) note(size float64, c rgb, s string) {
	d := p.d
	d.font(regular, size)
	d.textColor(c)
	d.para(d.left(), d.width(), s)
	d.textColor(colInk)
}

// noteRefs is note of text that names pages with pageRef.
func (p *pack) noteRefs(size float64, c rgb, s string) {
	p.d.withRefs(func() { p.note(size, c, s) })
}

func (p *pack) header() {
	d := p.d
	// The cursor is still where the page before ended, unless start has
	// recorded it.
	if !p.ended {
		p.layout.ended(d.page()-1, d.y, p.key)
	}
	p.ended = false
	u := p.layout.at(d.page())
	u.top, u.bottom, u.landscape = d.top, d.bottom(), d.landscape
	p.layout.note(d.page(), p.key)
	if d.page() == 1 {
		return
	}
	d.font(regular, 7.5)
	d.textColor(colMuted)
	y := 9.0
	right := "ampwright calculation pack"
	c := p.r.Count()
	if c.Fail > 0 {
		right = fmt.Sprintf("NOT APPROVED — %s fail", plural(c.Fail, "check"))
		d.font(bold, 7.5)
		d.textColor(colFail)
	}
	rw := d.textW(right)
	d.textIn(d.right()-rw, y, rw, 4, right, "R")
	d.font(regular, 7.5)
	d.textColor(colMuted)
	d.textIn(d.left(), y, d.width()-rw-4, 4, p.section, "L")
	d.line(d.left(), 13.5, d.right(), 13.5, lineStyle{w: 0.2, c: colRule})
	d.textColor(colInk)
}

func (p *pack) footer() {
	d := p.d
	id := p.r.Design
	y := d.pageH() - 11.5
	d.line(d.left(), y, d.right(), y, lineStyle{w: 0.2, c: colRule})
	d.font(regular, 7.5)
	d.textColor(colMuted)
	pg := fmt.Sprintf("page %d of %d", d.page(), d.pageCount())
	pw := d.textW(fmt.Sprintf("page %d of %d", d.page(), 999)) + 2
	// The revision and hash always show; the name and hull give way.
	ident := " · rev " + p.shortRev() + " · inputs " + shortHash(id.InputsHash, 12)
	iw := d.textW(ident)
	name := d.fit(strings.Join(nonEmpty(orDash(id.Name), id.Hull), " · "), d.width()-pw-iw-2)
	d.textIn(d.left(), y+1.5, d.width()-pw, 4, name+ident, "L")
	d.textIn(d.right()-pw, y+1.5, pw, 4, pg, "R")
	d.textColor(colInk)
}

// shortRev is the revision as the footer shows it.
func (p *pack) shortRev() string {
	id := p.r.Design
	if id.Revision == "" {
		return "not in git"
	}
	s := shortHash(id.Revision, 7)
	if id.Dirty {
		s += "+uncommitted"
	}
	return s
}

// revision is the revision as the cover shows it.
func (p *pack) revision() string {
	id := p.r.Design
	if id.Revision == "" {
		return "not in git"
	}
	s := "git commit " + shortHash(id.Revision, 12)
	if id.CommitTime > 0 {
		s += " of " + time.Unix(id.CommitTime, 0).UTC().Format("2006-01-02 15:04 UTC")
	}
	if id.Dirty {
		s += "; uncommitted changes: the inputs hash identifies what was checked"
	}
	return s
}

func (p *pack) cover() {
	d, r := p.d, p.r
	id := r.Design
	p.section, p.key = "Cover", "cover"
	d.addPage(false)
	x, w := d.left(), d.width()

	d.y = 18
	d.font(bold, 8.5)
	d.textColor(colMuted)
	d.text(x, d.y, "DC ELECTRICAL AND SOLAR-CHARGING DESIGN · CALCULATION PACK")
	d.y += 3
	d.line(x, d.y, x+w, d.y, lineStyle{w: 0.8, c: colInk})
	d.y += 12
	// The vessel's name, wrapped, in a smaller size if it is long.
	size := 26.0
	d.font(bold, size)
	lines := d.wrap(orDash(id.Name), w)
	if len(lines) > 2 {
		size = 17
		d.font(bold, size)
		lines = d.wrap(orDash(id.Name), w)
	}
	d.textColor(colInk)
	for i, l := range lines {
		if i == 3 {
			break
		}
		if i == 2 && len(lines) > 3 {
			l = d.fit(l+" "+lines[3], w)
		}
		if i > 0 {
			d.y += size * mmPerPt * 1.1
		}
		d.text(x, d.y, l)
	}
	d.y += 8
	d.font(regular, 12)
	d.text(x, d.y, d.fit(strings.Join(nonEmpty(id.Hull, id.Kind, id.Length, id.System), " · "), w))
	d.y += 7

	units := id.Units
	if units == "" {
		units = "metric"
	}
	date := "not dated: no SOURCE_DATE_EPOCH and no commit time"
	if p.dated {
		date = p.date.Format("2006-01-02")
	}
	kv := [][2]string{
		{"Client", orDash(id.Client)},
		{"Yard", orDash(id.Yard)},
		{"Design", orDash(id.Path)},
		{"Revision", p.revision()},
		{"Inputs (SHA-256)", orDash(id.InputsHash)},
		{"Rulebook", strings.Join(nonEmpty(r.Rulebook.Name, editionOf(r.Rulebook.Edition)), ", ")},
		{"Units", units},
		{"Pack date", date},
	}
	for _, e := range kv {
		d.font(regular, 9)
		d.textColor(colMuted)
		d.text(x, d.y+3.3, e[0])
		st := regular
		if e[0] == "Inputs (SHA-256)" {
			st = mono
		}
		d.font(st, 9)
		d.textColor(colInk)
		lines := d.wrap(e[1], w-38)
		for i, l := range lines {
			if i == 2 {
				break
			}
			d.text(x+38, d.y+3.3, l)
			d.y += 4.4
		}
		d.y += 0.6
	}
	d.y += 1.5
	p.history()
	d.y += 1.5

	// The verdict band.
	c := r.Count()
	var band, ink rgb
	var title string
	switch {
	case c.Fail > 0:
		band, ink = colFail, colWhite
		title = fmt.Sprintf("NOT APPROVED — %s fail", plural(c.Fail, "check"))
	case c.Warn > 0:
		band, ink = colWarnBg, colWarn
		title = fmt.Sprintf("CHECKS PASS WITH %s", strings.ToUpper(plural(c.Warn, "warning")))
	default:
		band, ink = colPassBg, colPass
		title = fmt.Sprintf("ALL %d CHECKS PASS", c.Pass)
	}
	bh := 17.0
	d.box(x, d.y, w, bh, &band, lineStyle{w: 0.6, c: ink})
	if c.Fail == 0 {
		d.box(x, d.y, 3, bh, &ink, lineStyle{})
	}
	d.font(bold, 16)
	d.textColor(ink)
	d.textIn(x+6, d.y+2, w-12, 8, title, "L")
	d.font(regular, 9.5)
	d.textIn(x+6, d.y+10, w-12, 5, fmt.Sprintf("%d fail · %d warn · %d pass — %d findings", c.Fail, c.Warn, c.Pass, len(r.Checks)), "L")
	d.y += bh + 2.5
	d.textColor(colInk)

	// What fails or warns, in short.
	shown := 0
	for _, f := range r.Checks {
		if f.Status == result.Pass {
			continue
		}
		if shown == 5 {
			d.font(regular, 8.5)
			d.withRefs(func() { d.text(x+2, d.y+3.2, "… and more: see Findings, page "+p.pageRef("findings")) })
			d.y += 4.4
			break
		}
		shown++
		d.font(bold, 8.5)
		tag := strings.ToUpper(string(f.Status))
		d.textColor(statusColor(f.Status))
		d.text(x+2, d.y+3.2, tag)
		d.textColor(colInk)
		line := fmt.Sprintf("%s · %s: %s %s limit %s", f.ID, f.Subject, qty(f.Value, f.Unit), relation(f), qty(f.Limit, f.Unit))
		d.font(regular, 8.5)
		d.text(x+12, d.y+3.2, d.fit(line, w-14))
		d.y += 4.4
	}
	if shown > 0 {
		d.font(regular, 8.5)
		d.textColor(colMuted)
		d.withRefs(func() {
			d.text(x+2, d.y+3.2, d.fit("Each is set out with what to change under Findings, page "+p.pageRef("findings")+".", w-4))
		})
		d.textColor(colInk)
		d.y += 4.4
	}
	d.y += 4

	// Sign-off.
	d.font(bold, 10)
	d.text(x, d.y+3.6, "Sign-off")
	d.y += 5.5
	cols := []float64{26, 50, 64, 40}
	heads := []string{"", "Name", "Signature", "Date"}
	rowH := 11.0
	d.font(bold, 8)
	cx := x
	for i, cw := range cols {
		d.textIn(cx+1.5, d.y, cw*w/180-3, 5, heads[i], "L")
		cx += cw * w / 180
	}
	d.y += 5
	d.line(x, d.y, x+w, d.y, lineStyle{w: 0.4, c: colInk})
	for _, s := range [][2]string{{"Prepared", id.Designer}, {"Checked", id.Checker}, {"Approved", id.Approver}} {
		cx = x
		d.font(bold, 9)
		d.textIn(cx+1.5, d.y, cols[0]*w/180-3, rowH, s[0], "L")
		cx += cols[0] * w / 180
		d.font(regular, 9)
		name := s[1]
		if name == "" {
			name = "(not named in the design)"
			d.textColor(colMuted)
		}
		d.textIn(cx+1.5, d.y, cols[1]*w/180-3, rowH, name, "L")
		d.textColor(colInk)
		cx += cols[1] * w / 180
		// Blank lines to sign and date on.
		d.line(cx+2, d.y+rowH-2.5, cx+cols[2]*w/180-4, d.y+rowH-2.5, lineStyle{w: 0.2, c: colRule})
		cx += cols[2] * w / 180
		d.line(cx+2, d.y+rowH-2.5, cx+cols[3]*w/180-2, d.y+rowH-2.5, lineStyle{w: 0.2, c: colRule})
		d.y += rowH
		d.line(x, d.y, x+w, d.y, lineStyle{w: 0.1, c: colGrid})
	}
	d.y += 1.5
	d.font(regular, 7.5)
	d.textColor(colMuted)
	if c.Fail > 0 {
		d.textColor(colFail)
		d.para(x, w, "Do not approve this design while any check fails: change the design, check it again and print a new pack.")
	} else {
		d.para(x, w, "Checked and approved by signature; the inputs hash above identifies the design that was checked.")
	}
	d.textColor(colInk)
	d.y += 4

	// Contents: the page numbers are drawn once known (drawContents).
	d.font(bold, 10)
	d.text(x, d.y+3.6, "Contents")
	d.y += 5.5
	p.contentsY = d.y
	n := len(packSections)
	if p.r.Proposal != nil {
		n++
	}
	d.y += float64(n) * 4.4

	d.y = max(d.y+2, d.bottom()-12)
	d.font(regular, 7.5)
	d.textColor(colMuted)
	d.withRefs(func() {
		d.para(x, w, "This pack supports, and does not replace, a qualified marine electrician and the standards, class rules and local regulations that apply to the boat. Read the cautions on page "+p.pageRef("cautions")+" before work on the system.")
	})
	d.textColor(colInk)
	p.drawContents()
}

// packSections are the pack's sections in order, for the contents.
var packSections = []tocEntry{
	{"findings", "Findings"},
	{"energy", "Energy budget and battery bank"},
	{"solar", "Solar array, controller and monthly balance"},
	{"voyage", "Design voyage: state of charge"},
	{"wiring", "Wiring schedule and voltage drop"},
	{"diagram", "One-line diagram"},
	{"calc", "Calculation sheets"},
	{"bom", "Bill of materials"},
	{"cautions", "Cautions"},
}

// drawContents lists the sections with their first pages, drawn once
// they are known (doc.finish).
func (p *pack) drawContents() {
	d := p.d
	y := p.contentsY
	d.font(regular, 9)
	sections := packSections
	if p.r.Proposal != nil {
		sections = append(sections[:len(sections):len(sections)], tocEntry{"proposal", "Appendix: proposal from the yard's catalog"})
	}
	for _, s := range sections {
		d.text(d.left()+2, y+3.3, s.title)
		d.withRefs(func() { d.text(d.left()+100, y+3.3, p.pageRef(s.key)) })
		y += 4.4
	}
}

// Formatting.

// fnum writes a figure to six significant digits, no exponent, with a
// true minus sign.
func fnum(v float64) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "—"
	}
	a := math.Abs(v)
	var s string
	switch {
	case a == 0:
		s = "0"
	case a >= 1e5:
		s = strconv.FormatFloat(v, 'f', 0, 64)
	default:
		dec := 5 - int(math.Floor(math.Log10(a)))
		dec = min(max(dec, 0), 9)
		s = strconv.FormatFloat(v, 'f', dec, 64)
		if strings.Contains(s, ".") {
			s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
		}
	}
	return minus(s)
}

// fixed writes v with dec decimals and a true minus sign.
func fixed(v float64, dec int) string {
	if math.IsNaN(v) || math.IsInf(v, 0) {
		return "—"
	}
	s := strconv.FormatFloat(v, 'f', dec, 64)
	if strings.Trim(s, "-0.") == "" {
		s = strings.TrimPrefix(s, "-")
	}
	return minus(s)
}

func minus(s string) string {
	if strings.HasPrefix(s, "-") {
		return "−" + s[1:]
	}
	return s
}

// qty writes a value with its unit.
func qty(v float64, unit string) string {
	if unit == "" {
		return fnum(v)
	}
	return fnum(v) + " " + unit
}

// relation says how a finding's value stands against its limit: "≤" or
// ">" against a maximum, "≥" or "<" against a minimum, read from how its
// margin was taken.
func relation(f result.Finding) string {
	near := func(a, b float64) bool {
		return math.Abs(a-b) <= 1e-6+0.002*math.Max(math.Abs(a), math.Abs(b))
	}
	up, down := near(f.Margin, f.Limit-f.Value), near(f.Margin, f.Value-f.Limit)
	switch {
	case up && down && f.Status != result.Pass:
		return "at"
	case up && down:
		return "="
	case up && f.Margin < 0:
		return ">"
	case up:
		return "≤"
	case down && f.Margin < 0:
		return "<"
	case down:
		return "≥"
	}
	return "against"
}

func statusColor(s result.Status) rgb {
	switch s {
	case result.Fail:
		return colFail
	case result.Warn:
		return colWarn
	}
	return colPass
}

func statusFill(s result.Status) *rgb {
	switch s {
	case result.Fail:
		return &colFailBg
	case result.Warn:
		return &colWarnBg
	}
	return nil
}

// statusCell is a verdict as a table cell.
func statusCell(s result.Status) cell {
	c := statusColor(s)
	return cell{s: strings.ToUpper(string(s)), bold: s != result.Pass, color: &c}
}

func plural(n int, word string) string {
	if n == 1 {
		return "1 " + word
	}
	return strconv.Itoa(n) + " " + word + "s"
}

func nonEmpty(ss ...string) []string {
	var out []string
	for _, s := range ss {
		if s != "" {
			out = append(out, s)
		}
	}
	return out
}

func editionOf(e string) string {
	if e == "" {
		return ""
	}
	return "edition " + e
}

func shortHash(h string, n int) string {
	if len(h) > n {
		return h[:n]
	}
	return h
}

// lengthIn writes metres in the design's units.
func (p *pack) lengthIn(m float64) string {
	return length(m, p.r.Design.Units == "imperial")
}

// figures returns the figures with the given ID.
func (p *pack) figures(id result.FigureID) []result.Figure {
	p.index()
	var out []result.Figure
	for _, i := range p.figByID[string(id)] {
		out = append(out, p.r.Figures[i])
	}
	return out
}

// figure returns the figure with the given ID and subject.
func (p *pack) figure(id result.FigureID, subject string) (result.Figure, bool) {
	p.index()
	if i, ok := p.figAt[idSubject{string(id), subject}]; ok {
		return p.r.Figures[i], true
	}
	return result.Figure{}, false
}

// finding returns the finding with the given ID and subject.
func (p *pack) finding(id result.CheckID, subject string) (result.Finding, bool) {
	p.index()
	if is := p.findAt[idSubject{string(id), subject}]; len(is) > 0 {
		return p.r.Checks[is[0]], true
	}
	return result.Finding{}, false
}

// idSubject keys a figure or finding.
type idSubject struct{ id, subject string }

// index builds the lookups of figures and findings once: a design of
// thousands of runs looks them up thousands of times.
func (p *pack) index() {
	if p.figAt != nil {
		return
	}
	p.figAt, p.figByID, p.findAt = map[idSubject]int{}, map[string][]int{}, map[idSubject][]int{}
	for i, f := range p.r.Figures {
		k := idSubject{string(f.ID), f.Subject}
		if _, ok := p.figAt[k]; !ok {
			p.figAt[k] = i
		}
		p.figByID[string(f.ID)] = append(p.figByID[string(f.ID)], i)
	}
	for i, f := range p.r.Checks {
		k := idSubject{string(f.ID), f.Subject}
		p.findAt[k] = append(p.findAt[k], i)
	}
}
