package report

import (
	"bytes"
	"fmt"
	"strconv"
	"strings"
)

// svgDoc is an SVG document being drawn: a canvas (canvas.go) in
// millimetres, one user unit a millimetre. Every number is written with
// two decimals at most and every attribute in a fixed order, so that the
// same drawing gives the same bytes.
type svgDoc struct {
	b bytes.Buffer
	m *metrics
}

// svgFonts is the font stack: the Go font the layout is measured in, then
// faces of nearly the same widths (Lucida, by the Go font's designers),
// then common ones. Every text also carries the width it was laid out at
// (textLength), so that a viewer without these fonts spaces its own font
// to the same width instead of running one label into the next.
const svgFonts = `Go, 'Lucida Grande', 'Lucida Sans Unicode', 'Lucida Sans', Arial, Helvetica, sans-serif`

// svgNum writes a coordinate: two decimals, trailing zeros dropped.
func svgNum(v float64) string {
	s := strconv.FormatFloat(v, 'f', 2, 64)
	if strings.Contains(s, ".") {
		s = strings.TrimRight(strings.TrimRight(s, "0"), ".")
	}
	if s == "-0" {
		s = "0"
	}
	return s
}

func hex(c rgb) string { return fmt.Sprintf("#%02x%02x%02x", c.r, c.g, c.b) }

// strokeAttrs are the attributes of a line style.
func strokeAttrs(s lineStyle) string {
	if s.w <= 0 {
		return ` stroke="none"`
	}
	a := fmt.Sprintf(` stroke="%s" stroke-width="%s"`, hex(s.c), svgNum(s.w))
	if s.dash > 0 {
		a += fmt.Sprintf(` stroke-dasharray="%s %s"`, svgNum(s.dash), svgNum(s.dash*0.7))
	}
	if s.round {
		a += ` stroke-linecap="round" stroke-linejoin="round"`
	}
	return a
}

func fillAttr(fill *rgb) string {
	if fill == nil {
		return ` fill="none"`
	}
	return ` fill="` + hex(*fill) + `"`
}

func points(pts []pt) string {
	var b strings.Builder
	for i, p := range pts {
		if i > 0 {
			b.WriteByte(' ')
		}
		b.WriteString(svgNum(p.x) + "," + svgNum(p.y))
	}
	return b.String()
}

func (s *svgDoc) line(x1, y1, x2, y2 float64, ls lineStyle) {
	fmt.Fprintf(&s.b, "<line x1=\"%s\" y1=\"%s\" x2=\"%s\" y2=\"%s\"%s/>\n", svgNum(x1), svgNum(y1), svgNum(x2), svgNum(y2), strokeAttrs(ls))
}

func (s *svgDoc) polyline(pts []pt, ls lineStyle) {
	if len(pts) < 2 {
		return
	}
	fmt.Fprintf(&s.b, "<polyline points=\"%s\" fill=\"none\"%s/>\n", points(pts), strokeAttrs(ls))
}

func (s *svgDoc) polygon(pts []pt, fill *rgb, ls lineStyle) {
	if len(pts) < 3 {
		return
	}
	fmt.Fprintf(&s.b, "<polygon points=\"%s\"%s%s/>\n", points(pts), fillAttr(fill), strokeAttrs(ls))
}

func (s *svgDoc) box(x, y, w, h float64, fill *rgb, ls lineStyle) {
	fmt.Fprintf(&s.b, "<rect x=\"%s\" y=\"%s\" width=\"%s\" height=\"%s\"%s%s/>\n", svgNum(x), svgNum(y), svgNum(w), svgNum(h), fillAttr(fill), strokeAttrs(ls))
}

func (s *svgDoc) circle(x, y, r float64, fill *rgb, ls lineStyle) {
	fmt.Fprintf(&s.b, "<circle cx=\"%s\" cy=\"%s\" r=\"%s\"%s%s/>\n", svgNum(x), svgNum(y), svgNum(r), fillAttr(fill), strokeAttrs(ls))
}

func (s *svgDoc) label(x, y float64, spans []span, align string) {
	if len(spans) == 0 {
		return
	}
	x = alignX(x, s.m.spansWidth(spans), align)
	// One text element a span, each at its own x: viewers differ in how
	// they collapse a space at the edge of a tspan, and a span's leading
	// space is an offset here instead.
	for _, sp := range spans {
		t := strings.TrimLeft(sp.s, " ")
		lead := s.m.width(sp.s[:len(sp.s)-len(t)], sp.face, sp.size)
		t = strings.TrimRight(t, " ")
		if t != "" {
			weight := ""
			if sp.face == bold {
				weight = ` font-weight="bold"`
			}
			fmt.Fprintf(&s.b, "<text x=\"%s\" y=\"%s\" font-size=\"%s\"%s fill=\"%s\" textLength=\"%s\">%s</text>\n",
				svgNum(x+lead), svgNum(y), svgNum(sp.size*mmPerPt), weight, hex(sp.c), svgNum(s.m.width(t, sp.face, sp.size)), xmlText(t))
		}
		x += s.m.width(sp.s, sp.face, sp.size)
	}
}

// group opens a group moved down by dy, closed by endGroup.
func (s *svgDoc) group(id string, dy float64) {
	fmt.Fprintf(&s.b, "<g id=\"%s\" transform=\"translate(0,%s)\">\n", xmlText(id), svgNum(dy))
}

func (s *svgDoc) endGroup() { s.b.WriteString("</g>\n") }

// document is the whole SVG: w by h millimetres, with title and desc for
// readers and screen readers, on a white ground so that it reads on a
// dark page too.
func (s *svgDoc) document(w, h float64, title, desc string) []byte {
	var b bytes.Buffer
	b.WriteString("<?xml version=\"1.0\" encoding=\"UTF-8\"?>\n")
	fmt.Fprintf(&b, "<svg xmlns=\"http://www.w3.org/2000/svg\" version=\"1.1\" width=\"%smm\" height=\"%smm\" viewBox=\"0 0 %s %s\" font-family=\"%s\">\n",
		svgNum(w), svgNum(h), svgNum(w), svgNum(h), svgFonts)
	fmt.Fprintf(&b, "<title>%s</title>\n<desc>%s</desc>\n", xmlText(title), xmlText(desc))
	fmt.Fprintf(&b, "<rect x=\"0\" y=\"0\" width=\"%s\" height=\"%s\" fill=\"#ffffff\"/>\n", svgNum(w), svgNum(h))
	b.Write(s.b.Bytes())
	b.WriteString("</svg>\n")
	return b.Bytes()
}

// xmlText escapes s for XML text and attribute values and drops the
// characters XML 1.0 does not allow at all.
func xmlText(s string) string {
	var b strings.Builder
	for _, r := range strings.ToValidUTF8(s, "\uFFFD") {
		switch {
		case r == '&':
			b.WriteString("&amp;")
		case r == '<':
			b.WriteString("&lt;")
		case r == '>':
			b.WriteString("&gt;")
		case r == '"':
			b.WriteString("&quot;")
		case r == '\'':
			b.WriteString("&#39;")
		case r == '\t' || r == '\n' || r == '\r':
			b.WriteRune(' ')
		case r < 0x20, r >= 0xD800 && r <= 0xDFFF, r == 0xFFFE, r == 0xFFFF:
			// not allowed in XML 1.0
		default:
			b.WriteRune(r)
		}
	}
	return b.String()
}
