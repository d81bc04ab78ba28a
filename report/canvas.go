package report

import (
	"strings"
	"sync"
	"unicode"

	"golang.org/x/image/font/gofont/gobold"
	"golang.org/x/image/font/gofont/goregular"
	"golang.org/x/image/font/sfnt"
)

// canvas is a surface the one-line diagram draws on: a page of the PDF
// (doc, in pdf.go) or an SVG document (svgDoc, in svg.go). The diagram is
// laid out once and drawn the same way on either. Lengths are millimetres
// from the top left corner, font sizes points.
type canvas interface {
	line(x1, y1, x2, y2 float64, s lineStyle)
	polyline(pts []pt, s lineStyle)
	// polygon closes pts, filled with fill when non-nil.
	polygon(pts []pt, fill *rgb, s lineStyle)
	box(x, y, w, h float64, fill *rgb, s lineStyle)
	circle(x, y, r float64, fill *rgb, s lineStyle)
	// label draws spans on one line with its baseline at y, starting at x
	// (align "L"), centred on x ("C") or ending at x ("R"). The spans'
	// text is already clean (metrics.clean) and laid out with metrics.
	label(x, y float64, spans []span, align string)
}

// alignX is where a label w wide that is aligned at x as label says
// starts.
func alignX(x, w float64, align string) float64 {
	switch align {
	case "C":
		return x - w/2
	case "R":
		return x - w
	}
	return x
}

// span is a piece of text in one face, size and colour.
type span struct {
	s    string
	face fontStyle
	size float64 // points
	c    rgb
}

// goFonts are the regular and bold Go fonts, parsed once: the diagram
// measures its text with them, and both the PDF and the SVG draw in them
// (the SVG names the Go font first, then faces of near metrics).
var goFonts = sync.OnceValue(func() [2]*sfnt.Font {
	r, err := sfnt.Parse(goregular.TTF)
	if err != nil {
		panic(err) // the embedded font is fixed: a failure is a build fault
	}
	b, err := sfnt.Parse(gobold.TTF)
	if err != nil {
		panic(err)
	}
	return [2]*sfnt.Font{r, b}
})

// metrics measures text in the Go fonts without a PDF, so that the SVG
// and the PDF are laid out alike. A metrics is used by one goroutine.
type metrics struct {
	buf   sfnt.Buffer
	glyph map[rune]bool
	adv   [2]map[rune]float64 // advance in ems, by face
}

func newMetrics() *metrics {
	return &metrics{glyph: map[rune]bool{}, adv: [2]map[rune]float64{{}, {}}}
}

// width is the advance width of s in mm, with no kerning (fpdf applies
// none either).
func (m *metrics) width(s string, face fontStyle, size float64) float64 {
	fi := 0
	if face == bold {
		fi = 1
	}
	f := goFonts()[fi]
	em := 0.0
	for _, r := range s {
		if r == markRune {
			em += 3 * m.width("0", face, 1) / mmPerPt
			continue
		}
		a, ok := m.adv[fi][r]
		if !ok {
			g, err := f.GlyphIndex(&m.buf, r)
			if err == nil {
				// At advPPEM pixels to the em, unhinted (0): the
				// advance in 1/64 pixels, as untyped constants so that
				// package report need not import the fixed-point and
				// hinting packages.
				if v, err := f.GlyphAdvance(&m.buf, g, advPPEM<<6, 0); err == nil {
					a = float64(v) / 64 / advPPEM
				}
			}
			m.adv[fi][r] = a
		}
		em += a
	}
	return em * size * mmPerPt
}

// advPPEM is the scale glyph advances are read at: fine enough that
// rounding to 1/64 of a pixel is lost in the figures.
const advPPEM = 4096

// markRune is sheetMark's one rune.
const markRune = '\uE000'

// spansWidth is the width of spans drawn one after another.
func (m *metrics) spansWidth(ss []span) float64 {
	w := 0.0
	for _, s := range ss {
		w += m.width(s.s, s.face, s.size)
	}
	return w
}

// clean makes design text safe to draw and to measure: control
// characters become spaces and runes the Go fonts have no glyph for
// become "?", as doc.clean does for the rest of the pack.
func (m *metrics) clean(s string) string {
	s = strings.ToValidUTF8(s, "?")
	var b strings.Builder
	for _, r := range s {
		switch {
		case unicode.IsControl(r):
			b.WriteRune(' ')
		case r >= 0x80 && !m.has(r):
			b.WriteRune('?')
		default:
			b.WriteRune(r)
		}
	}
	return b.String()
}

func (m *metrics) has(r rune) bool {
	ok, seen := m.glyph[r]
	if !seen {
		g, err := goFonts()[0].GlyphIndex(&m.buf, r)
		ok = err == nil && g != 0
		m.glyph[r] = ok
	}
	return ok
}

// wrap breaks s into lines at most w wide in face and size: at spaces
// where it can, after "-", "/", ",", "." or "_" in a long word, and
// anywhere in a word longer than a line. No text is ever dropped.
func (m *metrics) wrap(s string, face fontStyle, size, w float64) []string {
	words := strings.Fields(s)
	if len(words) == 0 {
		return []string{""}
	}
	var lines []string
	cur := ""
	for _, word := range words {
		try := word
		if cur != "" {
			try = cur + " " + word
		}
		if m.width(try, face, size) <= w {
			cur = try
			continue
		}
		if cur != "" {
			lines = append(lines, cur)
			cur = ""
		}
		for m.width(word, face, size) > w {
			head, tail := m.split(word, face, size, w)
			lines = append(lines, head)
			word = tail
		}
		cur = word
	}
	return append(lines, cur)
}

// split cuts a word too wide for w after the last break character that
// fits in its second half, else after the last rune that fits.
func (m *metrics) split(word string, face fontStyle, size, w float64) (string, string) {
	r := []rune(word)
	n := 1
	for n < len(r)-1 && m.width(string(r[:n+1]), face, size) <= w {
		n++
	}
	for i := n; i > n/2 && i > 0; i-- {
		if strings.ContainsRune("-/,._", r[i-1]) {
			return string(r[:i]), string(r[i:])
		}
	}
	return string(r[:n]), string(r[n:])
}

// lineH is the pitch of lines of text of size points, in mm.
func lineH(size float64) float64 { return size * mmPerPt * 1.2 }

// ascent and descent are how far the Go fonts' letters reach above and
// below the baseline, in mm, for size points.
func ascent(size float64) float64  { return 0.76 * size * mmPerPt }
func descent(size float64) float64 { return 0.22 * size * mmPerPt }
