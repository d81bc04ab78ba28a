package report

import (
	"errors"
	"fmt"
	"io"
	"math"
	"strings"
	"time"

	"github.com/ampwright/ampwright/result"
)

// DiagramOptions says how to draw a one-line diagram on its own.
type DiagramOptions struct {
	// PageSize is the paper the sheets are laid out for, landscape: "A4"
	// (the default when empty) or "Letter". The SVG's sheets are the
	// pack's, so that it prints alike.
	PageSize string
	// Date dates the PDF's metadata, as PackOptions.Date does.
	Date time.Time
}

// sheetArea is the drawing area of a diagram sheet on paper, landscape:
// the pack's content area under a section heading.
func sheetArea(paper string) (w, h float64, err error) {
	switch strings.ToLower(paper) {
	case "", "a4":
		w, h = 297, 210
	case "letter":
		w, h = 279.4, 215.9
	default:
		return 0, 0, fmt.Errorf("page size %q: expected A4 or Letter", paper)
	}
	// The margins, header and heading above, the footer below: as
	// newDoc, pack.heading and pack.start set them.
	const margin, top, heading, bottom = 15, 20, 10.5, 16
	return w - 2*margin, h - top - heading - bottom, nil
}

// layoutDiagram builds and lays out r's diagram on sheets w by h mm, with
// notes under its legend.
func layoutDiagram(r *result.Result, w, h float64, notes ...string) []*sheet {
	m := newMetrics()
	dg := newDiagram(r, m)
	l := &layout{m: m, w: w, h: h}
	sheets := l.sheets(dg, append(diagramNotes(dg), notes...))
	for _, sh := range sheets {
		for _, b := range sh.blocks {
			if b.tree != nil {
				place(b)
			}
		}
	}
	return sheets
}

// checkDiagram refuses a result a diagram cannot be drawn from.
func checkDiagram(r *result.Result) error {
	if r == nil {
		return errors.New("diagram: no result")
	}
	if len(r.Problems) > 0 {
		return fmt.Errorf("diagram: the design has %d input error(s); a diagram needs a design that validates", len(r.Problems))
	}
	return nil
}

// Lengths of the SVG's frame around each sheet, mm.
const (
	svgMargin = 10.0
	svgHead   = 12.0 // from a sheet's top to its drawing
	svgFoot   = 9.0  // from its drawing to the next sheet
)

// DiagramSVG writes r's one-line diagram as an SVG document: its sheets
// one under the other, each headed with the vessel and its sheet number
// and as large as its drawing (the sheets are laid out for the pack's
// page, so that they print alike). The same result gives the same bytes.
func DiagramSVG(w io.Writer, r *result.Result, opts DiagramOptions) error {
	if err := checkDiagram(r); err != nil {
		return err
	}
	aw, ah, err := sheetArea(opts.PageSize)
	if err != nil {
		return err
	}
	sheets := layoutDiagram(r, aw, ah)
	s := &svgDoc{m: newMetrics()}
	title := diagramTitle(r)
	titleSpans := []span{{s: s.m.clean(title), face: bold, size: 9, c: colInk}}
	ident := s.m.clean(diagramIdent(r))
	width := s.m.spansWidth(titleSpans) + 20 + s.m.width("sheet 000 of 000", regular, 7.5)
	width = math.Max(width, s.m.width(ident, regular, 7))
	for _, sh := range sheets {
		width = math.Max(width, sh.w)
	}
	width += 2 * svgMargin
	y := 0.0
	for i, sh := range sheets {
		s.group(fmt.Sprintf("sheet-%d", i+1), y)
		s.label(svgMargin, 7, titleSpans, "L")
		s.label(width-svgMargin, 7, []span{{s: fmt.Sprintf("sheet %d of %d", i+1, len(sheets)), size: 7.5, c: colMuted}}, "R")
		s.line(svgMargin, 8.6, width-svgMargin, 8.6, lineStyle{w: 0.3, c: colInk})
		drawSheet(s, sh, svgMargin, svgHead)
		fy := svgHead + sh.h + 5
		s.label(svgMargin, fy, []span{{s: ident, size: 7, c: colMuted}}, "L")
		s.endGroup()
		y += svgHead + sh.h + svgFoot
		if i < len(sheets)-1 {
			s.line(0, y-1.5, width, y-1.5, lineStyle{w: 0.2, c: colRule, dash: 1.5})
		}
	}
	_, err = w.Write(s.document(width, y, title, diagramDesc(r)))
	return err
}

// diagramTitle names the drawing: vessel, hull and what it is.
func diagramTitle(r *result.Result) string {
	return strings.Join(nonEmpty(orDash(r.Design.Name), r.Design.Hull), " · ") + " — one-line diagram"
}

// diagramIdent identifies the design drawn: its revision and inputs hash,
// and its verdict when a check fails.
func diagramIdent(r *result.Result) string {
	rev := "not in git"
	if r.Design.Revision != "" {
		rev = shortHash(r.Design.Revision, 7)
		if r.Design.Dirty {
			rev += "+uncommitted"
		}
	}
	s := "rev " + rev + " · inputs " + shortHash(r.Design.InputsHash, 12) + " · drawn by ampwright"
	if c := r.Count(); c.Fail > 0 {
		s = fmt.Sprintf("NOT APPROVED — %s fail · ", plural(c.Fail, "check")) + s
	}
	return s
}

// diagramDesc says what the drawing shows, for a reader that cannot see
// it.
func diagramDesc(r *result.Result) string {
	banks := len(r.Summary.Banks)
	if banks == 0 {
		banks = 1
	}
	return fmt.Sprintf("One-line diagram of the DC system of %s: %s, %s, %s.", orDash(r.Design.Name),
		plural(banks, "bank"), plural(len(r.Wiring), "run"), plural(len(r.Summary.Loads), "load"))
}

// DiagramPDF writes r's one-line diagram as a PDF of landscape pages, one
// sheet a page. The same result and options give the same bytes.
func DiagramPDF(w io.Writer, r *result.Result, opts DiagramOptions) error {
	if err := checkDiagram(r); err != nil {
		return err
	}
	date := opts.Date
	if date.IsZero() && r.Design.CommitTime > 0 {
		date = time.Unix(r.Design.CommitTime, 0)
	}
	if date.IsZero() {
		date = PackEpoch
	}
	d, err := newDoc(opts.PageSize, date)
	if err != nil {
		return err
	}
	title := diagramTitle(r)
	d.setInfo(title, "DC electrical system: one-line diagram", r.Design.Designer)
	aw, ah, err := sheetArea(opts.PageSize)
	if err != nil {
		return err
	}
	sheets := layoutDiagram(r, aw, ah)
	ident := diagramIdent(r)
	d.footer = func() {
		y := d.pageH() - 11.5
		d.line(d.left(), y, d.right(), y, lineStyle{w: 0.2, c: colRule})
		d.font(regular, 7.5)
		d.textColor(colMuted)
		pg := fmt.Sprintf("sheet %d of %d", d.page(), len(sheets))
		pw := d.textW(pg) + 2
		d.textIn(d.left(), y+1.5, d.width()-pw, 4, ident, "L")
		d.textIn(d.right()-pw, y+1.5, pw, 4, pg, "R")
		d.textColor(colInk)
	}
	for _, sh := range sheets {
		d.addPage(true)
		d.heading(title)
		drawSheet(d, sh, d.left(), d.y)
	}
	b, err := d.bytes()
	if err != nil {
		return fmt.Errorf("diagram: %w", err)
	}
	_, err = w.Write(b)
	return err
}
