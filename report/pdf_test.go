package report

import (
	"bytes"
	"fmt"
	"math"
	"regexp"
	"slices"
	"strings"
	"testing"

	"rsc.io/pdf"
)

// placedText is a string shown on a page, where it starts: in points
// from the page's bottom left corner, after the transformations in force.
type placedText struct {
	x, y float64
	s    string
}

// placed reads every page's shown strings with their places. fpdf shows
// each as "BT x y Td (…) Tj ET"; doc.finish moves the drawing it adds
// with cm inside q and Q.
func placed(t *testing.T, b []byte) [][]placedText {
	t.Helper()
	r, err := pdf.NewReader(bytes.NewReader(b), int64(len(b)))
	if err != nil {
		t.Fatalf("the document does not parse as PDF: %v", err)
	}
	var pages [][]placedText
	for i := 1; i <= r.NumPage(); i++ {
		var items []placedText
		type matrix [6]float64
		ctm := matrix{1, 0, 0, 1, 0, 0}
		var saved []matrix
		var tx, ty float64
		at := func(x, y float64) (float64, float64) {
			return ctm[0]*x + ctm[2]*y + ctm[4], ctm[1]*x + ctm[3]*y + ctm[5]
		}
		pdf.Interpret(r.Page(i).V.Key("Contents"), func(stk *pdf.Stack, op string) {
			n := stk.Len()
			args := make([]pdf.Value, n)
			for k := n - 1; k >= 0; k-- {
				args[k] = stk.Pop()
			}
			switch op {
			case "q":
				saved = append(saved, ctm)
			case "Q":
				ctm, saved = saved[len(saved)-1], saved[:len(saved)-1]
			case "cm":
				var m matrix
				for k := range m {
					m[k] = args[k].Float64()
				}
				ctm = matrix{
					m[0]*ctm[0] + m[1]*ctm[2], m[0]*ctm[1] + m[1]*ctm[3],
					m[2]*ctm[0] + m[3]*ctm[2], m[2]*ctm[1] + m[3]*ctm[3],
					m[4]*ctm[0] + m[5]*ctm[2] + ctm[4], m[4]*ctm[1] + m[5]*ctm[3] + ctm[5],
				}
			case "BT":
				tx, ty = 0, 0
			case "Td":
				tx, ty = tx+args[0].Float64(), ty+args[1].Float64()
			case "Tj":
				x, y := at(tx, ty)
				items = append(items, placedText{x, y, utf16be(args[0].RawString())})
			case "TJ":
				var s strings.Builder
				for k := 0; k < args[0].Len(); k++ {
					if v := args[0].Index(k); v.Kind() == pdf.String {
						s.WriteString(utf16be(v.RawString()))
					}
				}
				x, y := at(tx, ty)
				items = append(items, placedText{x, y, s.String()})
			}
		})
		pages = append(pages, items)
	}
	return pages
}

// lines is a page's text as it reads: the strings on one baseline (to
// half a point) joined from left to right, the lines from the top down.
func lines(items []placedText) []string {
	items = slices.Clone(items)
	key := func(p placedText) float64 { return math.Round(p.y * 2) }
	slices.SortStableFunc(items, func(a, b placedText) int {
		if ka, kb := key(a), key(b); ka != kb {
			if ka > kb {
				return -1
			}
			return 1
		}
		switch {
		case a.x < b.x:
			return -1
		case a.x > b.x:
			return 1
		}
		return 0
	})
	var out []string
	for i, p := range items {
		if i > 0 && key(p) == key(items[i-1]) {
			out[len(out)-1] += " " + p.s
		} else {
			out = append(out, p.s)
		}
	}
	return out
}

// TestDocFinish draws pages of both orientations, the last landscape, with
// a footer that counts them and a line that names a later page: each is
// drawn once the count is known, in its place on its own page.
func TestDocFinish(t *testing.T) {
	d, err := newDoc("A4", PackEpoch)
	if err != nil {
		t.Fatal(err)
	}
	d.footer = func() {
		d.font(regular, 7.5)
		d.textColor(colMuted)
		d.line(d.left(), d.pageH()-11.5, d.right(), d.pageH()-11.5, lineStyle{w: 0.2, c: colRule})
		d.textIn(d.right()-40, d.pageH()-10, 40, 4, fmt.Sprintf("page %d of %d", d.page(), d.pageCount()), "R")
	}
	orient := []bool{false, true, false, true}
	for i, landscape := range orient {
		d.addPage(landscape)
		d.font(bold, 10)
		d.text(d.left(), 30, fmt.Sprintf("body %d", i+1))
		if i == 0 {
			d.font(regular, 9)
			d.withRefs(func() { d.text(d.left(), 40, "see page "+d.ref("last")+", and not "+d.ref("never")) })
		}
	}
	d.mark("last")
	b, err := d.bytes()
	if err != nil {
		t.Fatal(err)
	}
	pages := placed(t, b)
	if len(pages) != len(orient) {
		t.Fatalf("%d pages, want %d", len(pages), len(orient))
	}
	const pt = 72 / 25.4
	var footY float64
	for i, items := range pages {
		h, w := 297.0, 210.0
		if orient[i] {
			h, w = w, h
		}
		var body, foot *placedText
		for k := range items {
			switch items[k].s {
			case fmt.Sprintf("body %d", i+1):
				body = &items[k]
			case fmt.Sprintf("page %d of %d", i+1, len(orient)):
				foot = &items[k]
			}
		}
		if body == nil || foot == nil {
			t.Fatalf("page %d: body %v, footer %v in %q", i+1, body != nil, foot != nil, lines(items))
		}
		if want := (h - 30) * pt; math.Abs(body.y-want) > 0.01 {
			t.Errorf("page %d: the body at y %.2f pt, want %.2f", i+1, body.y, want)
		}
		if i == 0 {
			footY = foot.y
		} else if math.Abs(foot.y-footY) > 0.01 {
			t.Errorf("page %d: the footer at y %.2f pt, page 1's at %.2f", i+1, foot.y, footY)
		}
		if foot.y < 10 || foot.y > 40 {
			t.Errorf("page %d: the footer at y %.2f pt, not at the foot of the page", i+1, foot.y)
		}
		if foot.x < (w-15-40)*pt || foot.x > (w-15)*pt {
			t.Errorf("page %d: the footer at x %.2f pt, not at the right of a page %g mm wide", i+1, foot.x, w)
		}
	}
	got := lines(pages[0])
	if !slices.Contains(got, "see page 4, and not ?") {
		t.Errorf("page 1 reads %q, want the reference resolved in its place", got)
	}
	if n := len(regexp.MustCompile(`(?m)^<</Length \d+>>\nstream\n`).FindAll(b, -1)); n > 0 {
		t.Errorf("%d streams left uncompressed", n)
	}
}

// TestDocRefsInert: a design's text holding the markers of references is
// drawn as "?", never as a page number.
func TestDocRefsInert(t *testing.T) {
	d, err := newDoc("A4", PackEpoch)
	if err != nil {
		t.Fatal(err)
	}
	d.addPage(false)
	marker := d.ref("here")
	d.mark("here")
	d.font(regular, 9)
	d.text(d.left(), 40, "a design's name "+marker+"\uFDD5")
	b, err := d.bytes()
	if err != nil {
		t.Fatal(err)
	}
	got := lines(placed(t, b)[0])
	if !slices.Contains(got, "a design's name ??") {
		t.Errorf("page 1 reads %q, want the markers drawn as ?", got)
	}
}

func TestFlateStreamsRefuses(t *testing.T) {
	for _, b := range []string{
		"",
		"%PDF-1.3\nstartxref\n5\n%%EOF\n",
		"%PDF-1.3\n1 0 obj\n<<>>\nendobj\nxref\n0 2\n0000000000 65535 f \n0000000099 00000 n \ntrailer\n<<>>\nstartxref\n30\n%%EOF\n",
	} {
		if _, err := flateStreams([]byte(b)); err == nil {
			t.Errorf("flateStreams(%q) gave no error", b)
		}
	}
}

func TestHasRef(t *testing.T) {
	for _, c := range []struct {
		s    string
		want bool
	}{
		{"", false},
		{"page 3", false},
		{"\uFDD0", true},
		{"page \uFDEF.", true},
		{"\uFDCF \uFDF0 \xef\xb7", false}, // beside the range, and a cut sequence
		{"\uFDCF then \uFDD5", true},
	} {
		if got := hasRef(c.s); got != c.want {
			t.Errorf("hasRef(%q) = %v, want %v", c.s, got, c.want)
		}
	}
}

// TestShowAsText: a text written by show, after fpdf's Text has drawn its
// characters in the face, is the same bytes Text writes, escapes in its
// UTF-16 included (Ĩ, ĩ, Ŝ and č end in the bytes of (, ), \ and CR).
func TestShowAsText(t *testing.T) {
	d, err := newDoc("A4", PackEpoch)
	if err != nil {
		t.Fatal(err)
	}
	d.addPage(false)
	d.font(regular, 9)
	d.textColor(colInk)
	const s = `a (b) \ c Ĩĩ Ŝ č × −1.5`
	d.text(20, 30, s) // by Text, which records the characters
	d.text(20, 30, s) // by show
	d.font(mono, 8)
	d.text(20, 40, s) // a face in which they are not yet drawn: by Text again
	b, err := d.bytes()
	if err != nil {
		t.Fatal(err)
	}
	r, err := pdf.NewReader(bytes.NewReader(b), int64(len(b)))
	if err != nil {
		t.Fatal(err)
	}
	var content bytes.Buffer
	if _, err := content.ReadFrom(r.Page(1).V.Key("Contents").Reader()); err != nil {
		t.Fatal(err)
	}
	var shown []string
	for _, l := range strings.Split(content.String(), "\n") {
		if strings.HasPrefix(l, "BT ") && strings.Contains(l, " Td (") {
			shown = append(shown, l)
		}
	}
	if len(shown) != 3 || shown[0] != shown[1] {
		t.Fatalf("the texts written: %q, want the first two the same", shown)
	}
	for _, esc := range []string{`\(`, `\)`, `\\`, `\r`} {
		if !strings.Contains(shown[1], esc) {
			t.Errorf("%q lacks the escape %s", shown[1], esc)
		}
	}
	if got := lines(placed(t, b)[0]); !slices.Contains(got, s) {
		t.Errorf("the page reads %q, want %q", got, s)
	}
}
