package report

// pdf.go is the only file of package report that calls fpdf: a thin
// drawing layer of text, wrapped and truncated lines, rules, boxes, lines,
// polylines, polygons, circles and tables whose header repeats on every
// page they run onto. doc is also a canvas (canvas.go), for the one-line
// diagram.
// fpdf is archived upstream; keeping it here keeps a replacement small.
// Lengths are millimetres from the page's top left corner, font sizes
// points.
//
// What fpdf does at great cost is done here instead. It compresses each
// page with a new zlib writer: its compression is off, and bytes hands
// the document to flateStreams (pdf_flate.go), which uses one. It writes
// every change of font, colour and line style even when nothing changes:
// doc keeps what it last set on the page (gstate) and writes only
// changes. It writes a font change to the page even to measure text: doc
// measures with the widths fpdf gave it for each character (symW) and
// gives fpdf the font only to draw. It wraps text whose colour is not the
// fill colour in q and Q with its colour: doc sets the fill to the text's
// colour before drawing text. It formats every text through fmt: once a
// text's characters are recorded in the font's subset, show writes the
// same bytes itself. Its page-number aliases are not used at all: see
// "Page numbers" below.

import (
	"bytes"
	"fmt"
	"slices"
	"strconv"
	"strings"
	"time"

	"github.com/go-pdf/fpdf"
	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/gomono"
	"golang.org/x/image/font/gofont/goregular"
	"golang.org/x/image/font/sfnt"
)

// rgb is a colour.
type rgb struct{ r, g, b int }

// The palette: plain ink, greys for rules and fills, and one colour for
// each verdict, dark enough to read on white and distinct in grey print.
var (
	colInk     = rgb{20, 20, 20}
	colMuted   = rgb{90, 90, 90}
	colRule    = rgb{150, 150, 150}
	colGrid    = rgb{215, 215, 215}
	colShade   = rgb{238, 238, 238}
	colWhite   = rgb{255, 255, 255}
	colFail    = rgb{170, 20, 20}
	colFailBg  = rgb{251, 226, 226}
	colWarn    = rgb{150, 95, 0}
	colWarnBg  = rgb{253, 240, 205}
	colPass    = rgb{20, 105, 45}
	colPassBg  = rgb{222, 240, 226}
	colAccent  = rgb{40, 80, 140}
	colAccent2 = rgb{120, 160, 205}
	colAccent3 = rgb{190, 130, 60}
)

// fontStyle names one of the three embedded faces.
type fontStyle int

const (
	regular fontStyle = iota
	bold
	mono
)

// mmPerPt converts points to millimetres.
const mmPerPt = 25.4 / 72

// pt is a point on the page.
type pt struct{ x, y float64 }

// doc is a PDF document being drawn, with a flow cursor y for content
// that runs down the page.
type doc struct {
	f         *fpdf.Fpdf
	paper     fpdf.SizeType
	margin    float64 // left and right
	top       float64 // where content starts below the header
	bottomGap float64 // space kept for the footer
	y         float64
	landscape bool
	w, h      float64 // the current page's size
	// header is drawn on every page as it is started; footer on every
	// page once the last is drawn, when pageCount is the number of pages.
	header     func()
	footer     func()
	orient     []bool // whether each page is landscape, from page 1 at [1]
	gs         gstate
	refKeys    []string       // the references, by marker
	refPage    map[string]int // the page each reference names, once known
	refsOK     bool           // the text being drawn may hold markers
	later      []laterText    // the lines waiting for a page number
	ink        rgb            // the text colour
	face       fontStyle      // the font selected (font), drawn in once fpdf has it (applyFont)
	size       float64
	widths     [3][]int32 // fpdf's width of each character below widthTable, by face, plus 1; 0 unknown
	shown      [3][]bool  // the characters below widthTable fpdf has drawn, by face (show)
	textBuf    []byte
	glyphs     *sfnt.Font
	glyphBuf   sfnt.Buffer
	haveGlyph  map[rune]bool
	inDecorate bool
	// maxPages and deadline bound the drawing (0 and zero for none); the
	// first bound passed is kept in stopped, and fpdf draws nothing more.
	maxPages int
	deadline time.Time
	stopped  error
	where    func() string // names the part being drawn, for stopped
}

// stop halts the drawing with err: fpdf ignores every call after an error,
// so the sections run on cheaply to their ends and Pack returns err.
func (d *doc) stop(err error) {
	if d.stopped == nil {
		d.stopped = err
		d.f.SetError(err)
	}
}

// newDoc starts a document on paper "A4" or "Letter", dated date.
func newDoc(paper string, date time.Time) (*doc, error) {
	var size fpdf.SizeType
	switch strings.ToLower(paper) {
	case "", "a4":
		size = fpdf.SizeType{Wd: 210, Ht: 297}
	case "letter":
		size = fpdf.SizeType{Wd: 215.9, Ht: 279.4}
	default:
		return nil, fmt.Errorf("page size %q: expected A4 or Letter", paper)
	}
	f := fpdf.NewCustom(&fpdf.InitType{OrientationStr: "P", UnitStr: "mm", Size: size})
	// fpdf writes into the font bytes it is given while it subsets them:
	// each document gets copies, so that the fonts' package variables
	// stay as they are and the next document in the process comes out
	// with the same bytes.
	f.AddUTF8FontFromBytes("go", "", bytes.Clone(goregular.TTF))
	f.AddUTF8FontFromBytes("go", "B", bytes.Clone(gobold.TTF))
	f.AddUTF8FontFromBytes("gomono", "", bytes.Clone(gomono.TTF))
	date = date.UTC()
	f.SetCreationDate(date)
	f.SetModificationDate(date)
	f.SetCatalogSort(true)
	// bytes compresses the streams (flateStreams).
	f.SetCompression(false)
	f.SetAutoPageBreak(false, 0)
	f.SetMargins(0, 0, 0)
	f.SetCellMargin(0)
	f.SetProducer("ampwright", true)
	f.SetCreator("ampwright pack", true)
	f.SetLang("en")
	d := &doc{f: f, paper: size, margin: 15, top: 20, bottomGap: 16, glyphs: goFonts()[0],
		orient: []bool{false}, refPage: map[string]int{}, haveGlyph: map[rune]bool{}}
	all := make([]int32, 3*widthTable)
	shown := make([]bool, 3*widthTable)
	for i := range d.widths {
		d.widths[i] = all[i*widthTable : (i+1)*widthTable]
		d.shown[i] = shown[i*widthTable : (i+1)*widthTable]
	}
	d.w, d.h = size.Wd, size.Ht
	f.SetHeaderFunc(func() { d.decorate(d.header) })
	return d, f.Error()
}

// decorate draws a header or footer, and leaves the font and text colour
// as they were: fpdf, too, restores its own after the header.
func (d *doc) decorate(fn func()) {
	if fn == nil || d.inDecorate {
		return
	}
	d.inDecorate = true
	face, size, ink := d.face, d.size, d.ink
	fn()
	d.face, d.size = face, size
	d.textColor(ink)
	d.inDecorate = false
}

// setInfo sets the document's title, subject and author.
func (d *doc) setInfo(title, subject, author string) {
	d.f.SetTitle(d.clean(title), true)
	d.f.SetSubject(d.clean(subject), true)
	if author != "" {
		d.f.SetAuthor(d.clean(author), true)
	}
}

// addPage starts a page, landscape or portrait, and puts the cursor at
// the top of its content area.
func (d *doc) addPage(landscape bool) {
	d.landscape = landscape
	where := ""
	if d.where != nil {
		where = d.where()
	}
	switch {
	case d.stopped != nil:
		d.y = d.top
		return
	case d.maxPages > 0 && d.page() >= d.maxPages:
		d.stop(&PackBoundError{Pages: d.maxPages, Section: where})
	case !d.deadline.IsZero() && time.Now().After(d.deadline):
		d.stop(&PackBoundError{Time: true, Section: where})
	}
	if d.stopped != nil {
		d.y = d.top
		return
	}
	o := "P"
	if landscape {
		o = "L"
	}
	d.setSize(landscape)
	d.f.AddPageFormat(o, d.paper)
	d.orient = append(d.orient, landscape)
	// fpdf has set the font, colours and line style again, and the header
	// may have changed them.
	d.gs = gstate{}
	d.y = d.top
}

// setSize sets the page size for the orientation.
func (d *doc) setSize(landscape bool) {
	d.w, d.h = d.paper.Wd, d.paper.Ht
	if landscape {
		d.w, d.h = d.h, d.w
	}
}

// page is the current page number, and pageCount the number of pages.
func (d *doc) page() int      { return d.f.PageNo() }
func (d *doc) pageCount() int { return d.f.PageCount() }

func (d *doc) pageW() float64 { return d.w }
func (d *doc) pageH() float64 { return d.h }

// left, right and width are the content area's horizontal bounds.
func (d *doc) left() float64  { return d.margin }
func (d *doc) right() float64 { return d.pageW() - d.margin }
func (d *doc) width() float64 { return d.pageW() - 2*d.margin }

// bottom is the lowest y content may reach.
func (d *doc) bottom() float64 { return d.pageH() - d.bottomGap }

// need starts a new page, of the same orientation, unless h fits below
// the cursor. It reports whether it did.
func (d *doc) need(h float64) bool {
	if d.y+h <= d.bottom() {
		return false
	}
	d.addPage(d.landscape)
	return true
}

// Page numbers. A pack names the pages its sections start on ("see
// Findings, page 2", the contents on its cover) before those pages are
// drawn, and every page says "page X of N" before N is known. fpdf's
// aliases would leave placeholders in the pages and replace them as the
// document is written, copying every page for each alias (27 MB for a
// pack of 70 pages), and the placeholder would be measured, wrapped and
// aligned in place of the number. Instead:
//
//   - A reference to a page is a marker, one rune (ref), allowed only in
//     text drawn within withRefs, so that a design's own text never reads
//     as one. It is measured as a number of three digits (standIn).
//   - A line holding a marker is not drawn: it is kept (laterText) with
//     its page, place, font and colour.
//   - The footer is not drawn as each page ends.
//   - Once the last page is drawn, finish goes back to each page (fpdf's
//     SetPage) and draws its footer and its kept lines, the numbers now
//     known, each in its own measure.
//
// The markers are Unicode's noncharacters U+FDD0 to U+FDEF, which are set
// aside for a program's internal use and which no font has a glyph for.
const (
	refFirst = '\uFDD0'
	refLast  = '\uFDEF'
)

func isRef(r rune) bool { return r >= refFirst && r <= refLast }

// hasRef reports whether s holds a marker (UTF-8 EF B7 90 to EF B7 AF).
func hasRef(s string) bool {
	for {
		i := strings.Index(s, "\xef\xb7")
		if i < 0 || i+2 >= len(s) {
			return false
		}
		if c := s[i+2]; c >= 0x90 && c <= 0xaf {
			return true
		}
		s = s[i+2:]
	}
}

// ref is the marker that reads as the page mark gives key.
func (d *doc) ref(key string) string {
	i := slices.Index(d.refKeys, key)
	if i < 0 {
		i = len(d.refKeys)
		if refFirst+rune(i) > refLast {
			panic("pdf: too many page references") // a fault of the code, not of a design
		}
		d.refKeys = append(d.refKeys, key)
	}
	return string(refFirst + rune(i))
}

// mark makes key's references read as the current page.
func (d *doc) mark(key string) { d.refPage[key] = d.page() }

// withRefs runs draw, in which text may hold markers from ref.
func (d *doc) withRefs(draw func()) {
	d.refsOK = true
	defer func() { d.refsOK = false }()
	draw()
}

// standIn is s with each marker as a number of three digits, for
// measuring: a page number is drawn no wider unless the pack has a
// thousand pages.
func standIn(s string) string {
	var b strings.Builder
	for _, r := range s {
		if isRef(r) {
			b.WriteString("000")
		} else {
			b.WriteRune(r)
		}
	}
	return b.String()
}

// resolve is s with each marker as the page number it reads as ("?" for
// a page never marked, which is a fault of the pack's code).
func (d *doc) resolve(s string) string {
	var b strings.Builder
	for _, r := range s {
		if !isRef(r) {
			b.WriteRune(r)
			continue
		}
		if n, ok := d.refPage[d.refKeys[r-refFirst]]; ok {
			b.WriteString(strconv.Itoa(n))
		} else {
			b.WriteString("?")
		}
	}
	return b.String()
}

// laterText is a line of text kept to be drawn by finish: at x, y as text
// draws it, or in the box x, y, w, h as textIn draws it when align is
// set.
type laterText struct {
	page       int
	x, y, w, h float64
	align      string
	fromTextIn bool
	s          string
	face       fontStyle
	size       float64
	color      rgb
}

// keep keeps a line holding a marker for finish.
func (d *doc) keep(t laterText) {
	t.page, t.face, t.size, t.color = d.page(), d.face, d.size, d.ink
	d.later = append(d.later, t)
}

// finish draws on every page what needed the number of pages: its footer
// and its kept lines. fpdf draws on a page it has gone back to as if the
// page were the size of the last one (it turns y upside down with the
// last page's height), so each page's drawing is moved by the difference;
// the drawing is wrapped in q and Q, and the font, colours and line style
// are set again, whatever the page's own drawing left in force.
func (d *doc) finish() {
	n := d.pageCount()
	lastH := d.h
	later := d.later
	for pg := 1; pg <= n; pg++ {
		d.f.SetPage(pg)
		d.setSize(d.orient[pg])
		d.landscape = d.orient[pg]
		d.gs = gstate{}
		d.f.TransformBegin()
		if dy := lastH - d.h; dy != 0 {
			d.f.TransformTranslate(0, dy)
		}
		if d.footer != nil {
			d.decorate(d.footer)
		}
		for len(later) > 0 && later[0].page == pg {
			t := later[0]
			later = later[1:]
			d.font(t.face, t.size)
			d.textColor(t.color)
			s := d.resolve(t.s)
			if t.fromTextIn {
				d.textIn(t.x, t.y, t.w, t.h, s, t.align)
			} else {
				d.text(t.x, t.y, s)
			}
		}
		d.f.TransformEnd()
	}
	d.textColor(colInk)
	d.f.SetPage(n)
}

// bytes finishes the document (finish) and returns it, its streams
// compressed.
func (d *doc) bytes() ([]byte, error) {
	d.finish()
	var b bytes.Buffer
	if err := d.f.Output(&b); err != nil {
		return nil, err
	}
	return flateStreams(b.Bytes())
}

// gstate is what doc last gave fpdf of the graphics state on the current
// page, so that a setting repeated is not written to the page again; each
// part is unknown (its flag false) at the start of a page.
type gstate struct {
	fontSet bool
	face    fontStyle
	size    float64
	lineSet bool
	line    lineStyle
	fillSet bool
	fill    rgb
}

// font selects a face and size for the text measured and drawn next.
func (d *doc) font(s fontStyle, size float64) { d.face, d.size = s, size }

// applyFont gives fpdf the selected font, to draw in or to measure with.
func (d *doc) applyFont() {
	if d.gs.fontSet && d.gs.face == d.face && d.gs.size == d.size {
		return
	}
	d.gs.fontSet, d.gs.face, d.gs.size = true, d.face, d.size
	switch d.face {
	case bold:
		d.f.SetFont("go", "B", d.size)
	case mono:
		d.f.SetFont("gomono", "", d.size)
	default:
		d.f.SetFont("go", "", d.size)
	}
}

// lineH is the line pitch for the current font size, leading included.
func (d *doc) lineH() float64 {
	return d.size * mmPerPt * 1.22
}

// textColor sets the colour of the text drawn next (inkFill).
func (d *doc) textColor(c rgb) {
	d.ink = c
	d.f.SetTextColor(c.r, c.g, c.b)
}

func (d *doc) fillColor(c rgb) {
	if d.gs.fillSet && d.gs.fill == c {
		return
	}
	d.gs.fillSet, d.gs.fill = true, c
	d.f.SetFillColor(c.r, c.g, c.b)
}

// clean makes text safe to draw: it is made inert (Inert: control
// characters, line breaks and bidirectional controls written as escapes),
// runes the embedded fonts have no glyph for become "?", so that nothing
// draws as an empty box or moves the text, and text longer than maxDrawn
// runes is cut short with a mark: measuring and wrapping a line costs
// time in its length, and no field of a pack needs more.
func (d *doc) clean(s string) string {
	s = Inert(s)
	if len(s) > maxDrawn {
		if r := []rune(s); len(r) > maxDrawn {
			s = string(r[:maxDrawn]) + " … (cut)"
		}
	}
	ok := true
	for _, r := range s {
		if !d.drawable(r) {
			ok = false
			break
		}
	}
	if ok {
		return s
	}
	var b strings.Builder
	for _, r := range s {
		if !d.drawable(r) {
			b.WriteRune('?')
		} else {
			b.WriteRune(r)
		}
	}
	return b.String()
}

// maxDrawn is the longest text clean lets through, in runes.
const maxDrawn = 2000

// drawable reports whether clean lets r through: ASCII, a rune the fonts
// have a glyph for, and a marker of a page reference within withRefs.
func (d *doc) drawable(r rune) bool {
	return r < 0x80 || d.refsOK && isRef(r) || d.hasGlyph(r)
}

func (d *doc) hasGlyph(r rune) bool {
	ok, seen := d.haveGlyph[r]
	if !seen {
		g, err := d.glyphs.GlyphIndex(&d.glyphBuf, r)
		ok = err == nil && g != 0
		d.haveGlyph[r] = ok
	}
	return ok
}

// strW is the width of clean text in the current font, a marker
// measured as its stand-in.
func (d *doc) strW(s string) float64 { return d.symToW(d.symW(s)) }

// symW is the width of clean text in the current font in the font's
// units, which add up: the width of a line is the sum of its characters'.
// Each character's is fpdf's (GetStringSymbolWidth), asked once a face,
// so that measuring writes nothing to the page. symToW converts it to
// millimetres as fpdf's GetStringWidth does, to the same bits. Once the
// drawing is stopped, text measures nothing, as fpdf's does after an
// error, so that the section being drawn runs to its end cheaply.
func (d *doc) symW(s string) int {
	if d.stopped != nil {
		return 0
	}
	if d.refsOK && hasRef(s) {
		s = standIn(s)
	}
	widths := d.widths[d.face]
	w := 0
	for _, r := range s {
		if r < widthTable {
			if c := widths[r]; c > 0 {
				w += int(c - 1)
				continue
			}
		}
		w += d.runeW(r)
	}
	return w
}

// widthTable bounds the characters whose widths are kept: Latin,
// Greek, Cyrillic and the punctuation, arrows and signs of mathematics.
const widthTable = 0x2300

// runeW is fpdf's width of r in the current font, kept below widthTable.
func (d *doc) runeW(r rune) int {
	d.applyFont()
	w := d.f.GetStringSymbolWidth(string(r))
	if r < widthTable {
		d.widths[d.face][r] = int32(w + 1)
	}
	return w
}

func (d *doc) symToW(sym int) float64 {
	size := d.size / d.f.GetConversionRatio() // as fpdf's SetFont has it
	return float64(sym) * size / 1000
}

// textW is the width of s in the current font.
func (d *doc) textW(s string) float64 { return d.strW(d.clean(s)) }

// text draws s with its baseline at y.
func (d *doc) text(x, y float64, s string) {
	s = d.clean(s)
	if d.refsOK && hasRef(s) {
		d.keep(laterText{x: x, y: y, s: s})
		return
	}
	d.inkFill()
	d.show(x, y, s)
}

// inkFill readies fpdf to draw text: the font, and the fill in the
// text's colour, so that fpdf writes the text without a colour of its
// own.
func (d *doc) inkFill() {
	d.applyFont()
	d.fillColor(d.ink)
}

// textIn draws s on one line within the box x, y, w, h, aligned "L", "C"
// or "R" and centred vertically, truncated with an ellipsis to fit.
func (d *doc) textIn(x, y, w, h float64, s, align string) {
	s = d.fit(s, w)
	if d.refsOK && hasRef(s) {
		d.keep(laterText{x: x, y: y, w: w, h: h, align: align, fromTextIn: true, s: s})
		return
	}
	if s == "" {
		return
	}
	// Where fpdf's CellFormat would put it, to the same bits: aligned in
	// the box with no cell margin, the baseline 0.3 of the font size below
	// the box's middle. fpdf's Text does less work to write it.
	dx := 0.0
	switch align {
	case "R":
		dx = w - d.strW(s)
	case "C":
		dx = (w - d.strW(s)) / 2
	}
	size := d.size / d.f.GetConversionRatio()
	d.inkFill()
	d.show(x+dx, y+.5*h+.3*size, s)
}

// show writes clean text s with its baseline at x, y, in the font and
// colour inkFill readied, as fpdf's Text writes it, to the byte: "BT x y
// Td (s) Tj ET", s in UTF-16BE with \, (, ) and CR escaped. fpdf's Text
// also records each character drawn in the font, for the font's subset
// in the PDF, and spends most of its time formatting: so the first text
// with a character not yet drawn in its face goes through Text, and the
// rest are written here (fpdf's RawWriteStr).
func (d *doc) show(x, y float64, s string) {
	shown := d.shown[d.face]
	for _, r := range s {
		if r >= widthTable || !shown[r] {
			d.f.Text(x, y, s)
			for _, r := range s {
				if r < widthTable {
					shown[r] = true
				}
			}
			return
		}
	}
	k := d.f.GetConversionRatio()
	_, h := d.f.GetPageSize() // fpdf's, which finish relies on
	b := append(d.textBuf[:0], "BT "...)
	b = strconv.AppendFloat(b, x*k, 'f', 2, 64)
	b = append(b, ' ')
	b = strconv.AppendFloat(b, (h-y)*k, 'f', 2, 64)
	b = append(b, " Td ("...)
	for _, r := range s {
		for _, c := range [2]byte{byte(r >> 8), byte(r)} {
			switch c {
			case '\\', '(', ')':
				b = append(b, '\\', c)
			case '\r':
				b = append(b, '\\', 'r')
			default:
				b = append(b, c)
			}
		}
	}
	b = append(b, ") Tj ET"...)
	d.textBuf = b
	d.f.RawWriteStr(string(b))
}

// fit truncates s with an ellipsis to at most w wide.
func (d *doc) fit(s string, w float64) string {
	s = d.clean(s)
	if d.strW(s) <= w {
		return s
	}
	r := []rune(s)
	lo, hi := 0, len(r)
	for lo < hi {
		mid := (lo + hi + 1) / 2
		if d.strW(string(r[:mid])+"…") <= w {
			lo = mid
		} else {
			hi = mid - 1
		}
	}
	return strings.TrimRight(string(r[:lo]), " ") + "…"
}

// wrap breaks s into lines at most w wide in the current font: at spaces
// where it can, after "/", "-", "," or "." in a long word, and anywhere in
// a word longer than a line. Newlines in s are kept.
func (d *doc) wrap(s string, w float64) []string {
	s = d.clean(s)
	var lines []string
	for _, para := range strings.Split(s, "\n") {
		lines = append(lines, d.wrapPara(para, w)...)
	}
	if len(lines) == 0 {
		lines = []string{""}
	}
	return lines
}

func (d *doc) wrapPara(s string, w float64) []string {
	words := strings.Fields(s)
	if len(words) == 0 {
		return []string{""}
	}
	// Each word is measured once: the line so far is the sum of its
	// words and spaces.
	space := d.symW(" ")
	var lines, cur []string
	curW := 0
	for _, word := range words {
		ww := d.symW(word)
		try := ww
		if len(cur) > 0 {
			try = curW + space + ww
		}
		if d.symToW(try) <= w {
			cur, curW = append(cur, word), try
			continue
		}
		if len(cur) > 0 {
			lines = append(lines, strings.Join(cur, " "))
			cur = cur[:0]
		}
		// The word alone: split it if it is wider than a line.
		for d.symToW(ww) > w {
			head, tail := d.splitWord(word, w)
			lines = append(lines, head)
			word = tail
			ww = d.symW(word)
		}
		if word != "" {
			cur, curW = append(cur, word), ww
		}
	}
	if len(cur) > 0 {
		lines = append(lines, strings.Join(cur, " "))
	}
	return lines
}

// splitWord cuts a word too wide for w: after the last break character
// that fits, else after the last rune that fits.
func (d *doc) splitWord(word string, w float64) (string, string) {
	r := []rune(word)
	n := 1
	for n < len(r) && d.strW(string(r[:n+1])) <= w {
		n++
	}
	for i := n; i > n/2 && i > 0; i-- {
		if strings.ContainsRune("/-,._:", r[i-1]) {
			return string(r[:i]), string(r[i:])
		}
	}
	return string(r[:n]), string(r[n:])
}

// para draws wrapped text across x..x+w starting at the cursor, moving it
// down, with a page break between lines when needed.
func (d *doc) para(x, w float64, s string) {
	lh := d.lineH()
	for _, l := range d.wrap(s, w) {
		d.need(lh)
		d.text(x, d.y+lh*0.78, l)
		d.y += lh
	}
}

// lineStyle is how a line is stroked.
type lineStyle struct {
	w     float64 // width, mm
	c     rgb
	dash  float64 // dash length, mm; 0 for solid
	round bool    // round caps and joins
}

// stroke sets the line style for the next stroke, writing only what
// changes. Every stroke is drawn through it, so a dash pattern set here
// needs no undoing.
func (d *doc) stroke(s lineStyle) {
	g := &d.gs
	set := g.lineSet
	if !set || g.line.w != s.w {
		d.f.SetLineWidth(s.w)
	}
	if !set || g.line.c != s.c {
		d.f.SetDrawColor(s.c.r, s.c.g, s.c.b)
	}
	if !set || g.line.dash != s.dash {
		if s.dash > 0 {
			d.f.SetDashPattern([]float64{s.dash, s.dash * 0.7}, 0)
		} else {
			d.f.SetDashPattern(nil, 0)
		}
	}
	if !set || g.line.round != s.round {
		if s.round {
			d.f.SetLineCapStyle("round")
			d.f.SetLineJoinStyle("round")
		} else {
			d.f.SetLineCapStyle("butt")
			d.f.SetLineJoinStyle("miter")
		}
	}
	g.lineSet, g.line = true, s
}

// line draws a straight line.
func (d *doc) line(x1, y1, x2, y2 float64, s lineStyle) {
	d.stroke(s)
	d.f.Line(x1, y1, x2, y2)
}

// rule draws a horizontal rule across the content area at the cursor.
func (d *doc) rule(w float64, c rgb) {
	d.line(d.left(), d.y, d.right(), d.y, lineStyle{w: w, c: c})
}

// polyline draws connected segments through pts.
func (d *doc) polyline(pts []pt, s lineStyle) {
	if len(pts) < 2 {
		return
	}
	d.stroke(s)
	d.f.MoveTo(pts[0].x, pts[0].y)
	for _, p := range pts[1:] {
		d.f.LineTo(p.x, p.y)
	}
	d.f.DrawPath("D")
}

// box draws a rectangle, filled with fill when non-nil and outlined when
// s.w > 0.
func (d *doc) box(x, y, w, h float64, fill *rgb, s lineStyle) {
	style := d.paint(fill, s)
	if style == "" {
		return
	}
	d.f.Rect(x, y, w, h, style)
}

// roundBox is box with rounded corners of radius r.
func (d *doc) roundBox(x, y, w, h, r float64, fill *rgb, s lineStyle) {
	d.f.RoundedRect(x, y, w, h, r, "1234", d.paint(fill, s))
}

// circle draws a circle, filled with fill when non-nil and outlined when
// s.w > 0.
func (d *doc) circle(x, y, r float64, fill *rgb, s lineStyle) {
	style := d.paint(fill, s)
	if style == "" {
		return
	}
	d.f.Circle(x, y, r, style)
}

// polygon draws the closed outline through pts, filled with fill when
// non-nil and outlined when s.w > 0.
func (d *doc) polygon(pts []pt, fill *rgb, s lineStyle) {
	style := d.paint(fill, s)
	if style == "" || len(pts) < 3 {
		return
	}
	ps := make([]fpdf.PointType, len(pts))
	for i, p := range pts {
		ps[i] = fpdf.PointType{X: p.x, Y: p.y}
	}
	d.f.Polygon(ps, style)
}

// paint sets the fill and stroke for a closed shape and returns fpdf's
// style string for them.
func (d *doc) paint(fill *rgb, s lineStyle) string {
	style := ""
	if fill != nil {
		d.fillColor(*fill)
		style += "F"
	}
	if s.w > 0 {
		d.stroke(s)
		style += "D"
	}
	return style
}

// heading draws a section heading at the cursor, ruled off below.
func (d *doc) heading(title string) {
	d.font(bold, 14)
	d.textColor(colInk)
	d.text(d.left(), d.y+5, d.fit(title, d.width()))
	d.y += 7.5
	d.rule(0.4, colInk)
	d.y += 3
}

// label draws spans on one line with its baseline at y, from x ("L"),
// centred on x ("C") or ending at x ("R").
func (d *doc) label(x, y float64, spans []span, align string) {
	w := 0.0
	for _, sp := range spans {
		d.font(sp.face, sp.size)
		w += d.textW(sp.s)
	}
	x = alignX(x, w, align)
	for _, sp := range spans {
		d.font(sp.face, sp.size)
		d.textColor(sp.c)
		d.text(x, y, sp.s)
		x += d.textW(sp.s)
	}
	d.textColor(colInk)
}

// dot draws a filled circle.
func (d *doc) dot(x, y, r float64, c rgb) {
	d.fillColor(c)
	d.f.Circle(x, y, r, "F")
}

// A table is drawn row by row down the page; when a row does not fit, the
// table continues on a new page under its header again.

// column is one column of a table: its heading, its share of the table's
// width and its alignment, "L", "C" or "R".
type column struct {
	head  string
	w     float64
	align string
	mono  bool
}

// cell is one cell's text and how to draw it.
type cell struct {
	s     string
	bold  bool
	color *rgb
}

// trow is one row of a table.
type trow struct {
	cells []cell
	fill  *rgb
	bold  bool
	// group marks a heading row: its first cell spans the table.
	group bool
	head  bool
}

// cellsOf makes a row of plain cells.
func cellsOf(ss ...string) trow {
	r := trow{cells: make([]cell, len(ss))}
	for i, s := range ss {
		r.cells[i] = cell{s: s}
	}
	return r
}

// tableOpts says how to draw a table.
type tableOpts struct {
	size  float64 // font size, points
	title string  // drawn above the header on continuation pages
	x, w  float64 // position and width; zero for the content area
	zebra bool    // shade every other row
}

// table draws a table at the cursor and moves the cursor below it.
func (d *doc) table(cols []column, rows []trow, o tableOpts) {
	if o.size == 0 {
		o.size = 7.5
	}
	if o.w == 0 {
		o.x, o.w = d.left(), d.width()
	}
	total := 0.0
	for _, c := range cols {
		total += c.w
	}
	ws := make([]float64, len(cols))
	for i, c := range cols {
		ws[i] = c.w / total * o.w
	}
	const padX, padY = 1.2, 0.7
	d.font(regular, o.size)
	lh := d.lineH()

	layout := func(r trow) ([][]string, float64) {
		lines := make([][]string, len(cols))
		n := 1
		if r.group {
			st := regular
			if r.bold || (len(r.cells) > 0 && r.cells[0].bold) {
				st = bold
			}
			d.font(st, o.size)
			lines[0] = d.wrap(r.cells[0].s, o.w-2*padX)
			n = len(lines[0])
		} else {
			for i := range cols {
				if i >= len(r.cells) {
					continue
				}
				c := r.cells[i]
				st := regular
				switch {
				case cols[i].mono && !r.head:
					st = mono
				case c.bold || r.bold:
					st = bold
				}
				d.font(st, o.size)
				lines[i] = d.wrap(c.s, ws[i]-2*padX)
				n = max(n, len(lines[i]))
			}
		}
		return lines, float64(n)*lh + 2*padY
	}

	header := trow{bold: true, head: true, fill: &colShade}
	for _, c := range cols {
		header.cells = append(header.cells, cell{s: c.head, bold: true})
	}
	hlines, hh := layout(header)
	drawRow := func(r trow, lines [][]string, h float64) {
		y := d.y
		if r.fill != nil {
			d.box(o.x, y, o.w, h, r.fill, lineStyle{})
		}
		x := o.x
		for i := range cols {
			if r.group && i > 0 {
				break
			}
			w := ws[i]
			align := cols[i].align
			if r.group {
				w, align = o.w, "L"
			}
			if align == "" {
				align = "L"
			}
			var c cell
			if i < len(r.cells) {
				c = r.cells[i]
			}
			st := regular
			switch {
			case cols[i].mono && !r.group && !r.head:
				st = mono
			case c.bold || r.bold:
				st = bold
			}
			d.font(st, o.size)
			if c.color != nil {
				d.textColor(*c.color)
			} else {
				d.textColor(colInk)
			}
			for j, l := range lines[i] {
				ly := y + padY + float64(j)*lh
				d.textIn(x+padX, ly, w-2*padX, lh, l, align)
			}
			x += w
		}
		d.textColor(colInk)
		d.y += h
		d.line(o.x, d.y, o.x+o.w, d.y, lineStyle{w: 0.1, c: colGrid})
	}
	drawHeader := func(cont bool) {
		if cont && o.title != "" {
			d.font(regular, o.size)
			d.textColor(colMuted)
			d.textIn(o.x, d.y, o.w, lh+1, o.title+" (continued)", "L")
			d.textColor(colInk)
			d.y += lh + 1
		}
		drawRow(header, hlines, hh)
		d.line(o.x, d.y, o.x+o.w, d.y, lineStyle{w: 0.3, c: colRule})
	}
	// Keep the header with at least the first row.
	first := hh
	if len(rows) > 0 {
		_, h := layout(rows[0])
		first += h
	}
	d.need(first)
	drawHeader(false)
	for i, r := range rows {
		lines, h := layout(r)
		if d.y+h > d.bottom() {
			d.addPage(d.landscape)
			drawHeader(true)
		}
		if o.zebra && r.fill == nil && i%2 == 1 {
			r.fill = &rgb{246, 246, 246}
		}
		drawRow(r, lines, h)
	}
}
