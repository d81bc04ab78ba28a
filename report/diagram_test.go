package report

import (
	"bytes"
	"encoding/xml"
	"fmt"
	"io"
	"regexp"
	"strconv"
	"strings"
	"testing"

	"rsc.io/pdf"

	"github.com/ampwright/ampwright/result"
)

// recorder is a canvas that keeps what is drawn on it: every span of text
// with its box, measured as the layout measures it, and its size.
type recorder struct {
	m     *metrics
	texts []textBox
}

type textBox struct {
	s              string
	size           float64
	x0, y0, x1, y1 float64
}

func (r *recorder) line(x1, y1, x2, y2 float64, s lineStyle)        {}
func (r *recorder) polyline(pts []pt, s lineStyle)                  {}
func (r *recorder) polygon(pts []pt, fill *rgb, s lineStyle)        {}
func (r *recorder) box(x, y, w, h float64, fill *rgb, s lineStyle)  {}
func (r *recorder) circle(x, y, rr float64, fill *rgb, s lineStyle) {}

func (r *recorder) label(x, y float64, spans []span, align string) {
	w := r.m.spansWidth(spans)
	switch align {
	case "C":
		x -= w / 2
	case "R":
		x -= w
	}
	for _, sp := range spans {
		sw := r.m.width(sp.s, sp.face, sp.size)
		// A span's spaces at either end take no room of their own.
		t := strings.TrimLeft(sp.s, " ")
		lead := r.m.width(sp.s[:len(sp.s)-len(t)], sp.face, sp.size)
		t = strings.TrimRight(t, " ")
		if t != "" {
			r.texts = append(r.texts, textBox{s: t, size: sp.size,
				x0: x + lead, x1: x + lead + r.m.width(t, sp.face, sp.size),
				y0: y - ascent(sp.size), y1: y + descent(sp.size)})
		}
		x += sw
	}
}

// all is every text drawn, joined by newlines.
func (r *recorder) all() string {
	var b strings.Builder
	for _, t := range r.texts {
		b.WriteString(t.s + "\n")
	}
	return b.String()
}

// drawn lays r out on A4 sheets and draws each sheet on a recorder.
func drawn(t *testing.T, r *result.Result) ([]*sheet, []*recorder, float64, float64) {
	t.Helper()
	w, h, err := sheetArea("A4")
	if err != nil {
		t.Fatal(err)
	}
	sheets := layoutDiagram(r, w, h)
	var recs []*recorder
	for _, sh := range sheets {
		rec := &recorder{m: newMetrics()}
		drawSheet(rec, sh, 0, 0)
		recs = append(recs, rec)
	}
	return sheets, recs, w, h
}

// checkLegible fails on text under 6 pt, text outside its sheet and two
// texts that overlap: a label cut short or run into another.
func checkLegible(t *testing.T, recs []*recorder, w, h float64) {
	t.Helper()
	const eps = 0.02
	for i, rec := range recs {
		for j, a := range rec.texts {
			if a.size < sizeMin {
				t.Errorf("sheet %d: %q is %.2f pt, under %g pt", i+1, a.s, a.size, sizeMin)
			}
			if a.x0 < -eps || a.y0 < -eps || a.x1 > w+eps || a.y1 > h+eps {
				t.Errorf("sheet %d: %q (%.1f,%.1f)–(%.1f,%.1f) is outside the sheet %.1f × %.1f", i+1, a.s, a.x0, a.y0, a.x1, a.y1, w, h)
			}
			for _, b := range rec.texts[j+1:] {
				if a.x0 < b.x1-eps && b.x0 < a.x1-eps && a.y0 < b.y1-eps && b.y0 < a.y1-eps {
					t.Errorf("sheet %d: %q at (%.1f,%.1f) overlaps %q at (%.1f,%.1f)", i+1, a.s, a.x0, a.y0, b.s, b.x0, b.y0)
				}
			}
		}
	}
}

// wantDrawn is every name the diagram of r must show: every node of the
// system, every run, every load with its quantity.
func wantDrawn(r *result.Result) []string {
	var want []string
	if r.System != nil {
		for _, n := range r.System.Nodes {
			want = append(want, n.Name)
		}
	}
	for _, w := range r.Wiring {
		want = append(want, w.Name)
	}
	for _, l := range r.Summary.Loads {
		want = append(want, l.Name)
		if l.Quantity > 1 {
			want = append(want, fmt.Sprintf("%d × %s", l.Quantity, l.Draw))
		}
	}
	return want
}

func TestDiagramExamples(t *testing.T) {
	t.Parallel()
	for _, hull := range hulls {
		t.Run(hull, func(t *testing.T) {
			r := fixture(t, hull)
			if r.System == nil {
				t.Fatal("the fixture has no system: regenerate it")
			}
			sheets, recs, w, h := drawn(t, r)
			checkLegible(t, recs, w, h)
			var text strings.Builder
			for _, rec := range recs {
				text.WriteString(rec.all())
			}
			all := text.String()
			for _, s := range wantDrawn(r) {
				if !strings.Contains(all, s) {
					t.Errorf("the diagram lacks %q", s)
				}
			}
			if strings.Contains(all, "?") {
				t.Errorf("a sheet reference is unresolved:\n%s", all)
			}
			if n := len(sheets); n > 3 {
				t.Errorf("%d sheets, want at most 3", n)
			}
		})
	}
}

// TestDiagramSystem checks what each example's drawing says about its
// system: the links between Tystie's banks named from both sides, the
// AC side of Marram's inverter, Sanderling's converter and negative side.
func TestDiagramSystem(t *testing.T) {
	t.Parallel()
	tests := []struct {
		hull string
		want []string
	}{
		{"tystie", []string{"house bank", "start bank", "thruster bank", "DC-DC charger 30 A", "combiner 140 A",
			"→ house bank, sheet 1", "← start bank, sheet 1", "→ thruster bank, sheet", "alternator 49 A"}},
		{"marram", []string{"AC loads", "induction-hob", "1800 W", "laptop", "cockpit-lights", "4 × 3 W", "saloon-lights", "6 × 4 W"}},
		{"sanderling", []string{"24 V", "12 V", "converter 24 V → 12 V, 20 A", "Negative side", "monitor", "shunt 500 A",
			"returns of 3 runs: nav-instruments, nav-plotter, nav-vhf", "carries the returns of bank-fuse, switch-panel", "negative: neg-nav"}},
	}
	for _, tt := range tests {
		t.Run(tt.hull, func(t *testing.T) {
			_, recs, _, _ := drawn(t, fixture(t, tt.hull))
			var all strings.Builder
			for _, rec := range recs {
				for _, x := range rec.texts {
					all.WriteString(x.s + " ")
				}
			}
			for _, s := range tt.want {
				if !strings.Contains(all.String(), s) {
					t.Errorf("the diagram lacks %q", s)
				}
			}
		})
	}
}

// svgTexts parses an SVG with encoding/xml and returns its texts and the
// font sizes they are set in, in points.
func svgTexts(t *testing.T, b []byte) (texts []string, sizes []float64) {
	t.Helper()
	dec := xml.NewDecoder(bytes.NewReader(b))
	depth := 0
	inText := false
	for {
		tok, err := dec.Token()
		if err == io.EOF {
			break
		}
		if err != nil {
			t.Fatalf("the SVG is not well-formed XML: %v", err)
		}
		switch e := tok.(type) {
		case xml.StartElement:
			depth++
			if depth == 1 && e.Name.Local != "svg" {
				t.Fatalf("root element %s, want svg", e.Name.Local)
			}
			if e.Name.Local == "text" {
				inText = true
				texts = append(texts, "")
				for _, a := range e.Attr {
					if a.Name.Local == "font-size" {
						v, err := strconv.ParseFloat(a.Value, 64)
						if err != nil {
							t.Fatalf("font-size %q", a.Value)
						}
						sizes = append(sizes, v/mmPerPt)
					}
				}
			}
		case xml.EndElement:
			depth--
			if e.Name.Local == "text" {
				inText = false
			}
		case xml.CharData:
			if inText {
				texts[len(texts)-1] += string(e)
			}
		}
	}
	if depth != 0 {
		t.Fatal("the SVG's elements are not closed")
	}
	return texts, sizes
}

func renderSVG(t *testing.T, r *result.Result) []byte {
	t.Helper()
	var b bytes.Buffer
	if err := DiagramSVG(&b, r, DiagramOptions{}); err != nil {
		t.Fatal(err)
	}
	return b.Bytes()
}

func TestDiagramSVG(t *testing.T) {
	t.Parallel()
	for _, hull := range hulls {
		t.Run(hull, func(t *testing.T) {
			r := fixture(t, hull)
			b := renderSVG(t, r)
			if !bytes.Equal(b, renderSVG(t, fixture(t, hull))) {
				t.Error("two renders of the same result differ")
			}
			texts, sizes := svgTexts(t, b)
			// Texts are drawn a span at a time: join them to find names.
			all := strings.Join(texts, "\n")
			for _, s := range wantDrawn(r) {
				if !strings.Contains(all, s) {
					t.Errorf("the SVG lacks %q", s)
				}
			}
			if len(sizes) != len(texts) {
				t.Errorf("%d texts but %d font sizes: a text has no size of its own", len(texts), len(sizes))
			}
			for i, s := range sizes {
				// Sizes are written to 0.01 mm.
				if s < sizeMin-0.02 {
					t.Errorf("%q is set in %.2f pt, under %g pt", texts[i], s, sizeMin)
				}
			}
			if !bytes.Contains(b, []byte("sheet 1 of ")) {
				t.Error("the SVG's sheets are not numbered")
			}
			for _, num := range regexp.MustCompile(`="(-?[0-9.]+)"`).FindAllSubmatch(b, -1) {
				if i := bytes.IndexByte(num[1], '.'); i >= 0 && len(num[1])-i-1 > 2 {
					t.Fatalf("%s has more than two decimals", num[1])
				}
			}
		})
	}
}

// TestDiagramEscapes draws design text with XML's special characters,
// control characters and characters the fonts lack.
func TestDiagramEscapes(t *testing.T) {
	t.Parallel()
	r := fixture(t, "tystie")
	odd := `fridge <b>&amp; "cold" 'box'`
	for i := range r.Summary.Loads {
		if r.Summary.Loads[i].Name == "fridge" {
			r.Summary.Loads[i].Name = odd
		}
	}
	for i := range r.Wiring {
		if r.Wiring[i].Name == "panel-fridge" {
			r.Wiring[i].Name = "run <&> \x07\U0001F6A2 end"
			for j := range r.Summary.Loads {
				if r.Summary.Loads[j].Circuit == "panel-fridge" {
					r.Summary.Loads[j].Circuit = r.Wiring[i].Name
				}
			}
		}
	}
	r.Design.Name = `Tystie & "Co" <test>`
	b := renderSVG(t, r)
	texts, _ := svgTexts(t, b)
	all := strings.Join(texts, "\n")
	for _, s := range []string{odd, "run <&> ", "? end", `Tystie & "Co" <test>`} {
		if !strings.Contains(all, s) {
			t.Errorf("the SVG lacks %q", s)
		}
	}
	if bytes.Contains(b, []byte("<b>")) || bytes.Contains(b, []byte{7}) {
		t.Error("design text is not escaped")
	}
}

// TestDiagramLegacy draws a result from before the system was recorded,
// from its wiring lines alone.
func TestDiagramLegacy(t *testing.T) {
	t.Parallel()
	for _, hull := range []string{"dunnock", "marram"} {
		r := fixture(t, hull)
		r.System = nil
		_, recs, w, h := drawn(t, r)
		checkLegible(t, recs, w, h)
		var all strings.Builder
		for _, rec := range recs {
			all.WriteString(rec.all())
		}
		for _, s := range wantDrawn(r) {
			if !strings.Contains(all.String(), s) {
				t.Errorf("%s: the diagram lacks %q", hull, s)
			}
		}
		svgTexts(t, renderSVG(t, r))
	}
}

// TestDiagramCompact draws a design of one load: one sheet, no larger
// than its drawing.
func TestDiagramCompact(t *testing.T) {
	t.Parallel()
	r := &result.Result{Design: result.Identity{Name: "Dinghy", InputsHash: strings.Repeat("0", 64)},
		Summary: result.Summary{Loads: []result.LoadLine{{Name: "lamp", Circuit: "bank-lamp", Draw: "5 W", Quantity: 1}}},
		Wiring: []result.WiringLine{{Name: "bank-lamp", From: "bank", To: "lamp", Role: "supply", Size: "1.5 mm²",
			Protection: "5 A fuse", Status: result.Pass}},
		System: &result.System{Nodes: []result.Node{
			{Name: "bank", Kind: "bank", Bank: "bank", Volts: 12, Label: "house bank, 1S × 1P cell"},
			{Name: "lamp", Kind: "load", Bank: "bank", Volts: 12, Label: "5 W"}}}}
	sheets, recs, w, h := drawn(t, r)
	checkLegible(t, recs, w, h)
	if len(sheets) != 1 {
		t.Fatalf("%d sheets, want 1", len(sheets))
	}
	if sh := sheets[0]; sh.h > 60 || sh.w > 200 {
		t.Errorf("one load takes %.0f × %.0f mm", sh.w, sh.h)
	}
	b := renderSVG(t, r)
	m := regexp.MustCompile(`height="([0-9.]+)mm"`).FindSubmatch(b)
	if m == nil {
		t.Fatal("the SVG has no height")
	}
	if v, _ := strconv.ParseFloat(string(m[1]), 64); v > 90 {
		t.Errorf("the SVG of one load is %.0f mm tall", v)
	}
}

// largeResult is a system far larger than the examples: a long chain of
// switches to a busbar feeding three panels of 150 circuits each, one
// circuit with three loads, names too long for a line, and a negative bus
// that every return lands on.
func largeResult() *result.Result {
	r := &result.Result{Version: result.Version,
		Design: result.Identity{Name: "Leviathan", Hull: "test hull", InputsHash: strings.Repeat("ab", 32)},
		System: &result.System{}}
	node := func(name, kind, label string) {
		r.System.Nodes = append(r.System.Nodes, result.Node{Name: name, Kind: kind, Bank: "house", Volts: 24, Label: label})
	}
	run := func(name, from, to, prot string) {
		r.Wiring = append(r.Wiring, result.WiringLine{Name: name, From: from, To: to, Role: "supply", Size: "6 mm²",
			Protection: prot, Status: result.Pass, ReturnTo: "neg-main"})
	}
	node("house", "bank", "house bank, 2S × 4P some-very-long-battery-part-number-lfp200")
	prev := "house"
	for i := 1; i <= 7; i++ {
		s := fmt.Sprintf("isolator-switch-number-%d", i)
		node(s, "switch", "switch 350 A")
		run(fmt.Sprintf("chain-run-%d", i), prev, s, "")
		prev = s
	}
	node("main-bus", "busbar", "busbar 400 A")
	run("chain-bus", prev, "main-bus", "300 A fuse")
	long := strings.Repeat("a-load-with-a-name-far-too-long-for-one-line-", 3)
	for _, p := range []string{"panel-a", "panel-b", "panel-c"} {
		node(p, "panel", "panel 100 A, 150 ways")
		run("bus-"+p, "main-bus", p, "100 A fuse")
		for i := 0; i < 150; i++ {
			load := fmt.Sprintf("%s-load-%03d", p, i)
			if i == 7 {
				load = p + long
			}
			circuit := fmt.Sprintf("%s-circuit-%03d", p, i)
			node(load, "load", "3 W")
			run(circuit, p, load, "5 A breaker")
			r.Summary.Loads = append(r.Summary.Loads, result.LoadLine{Name: load, Circuit: circuit, Draw: "3 W", Quantity: 1 + i%4})
			if i == 11 {
				for _, extra := range []string{"-also", "-and-this"} {
					r.Summary.Loads = append(r.Summary.Loads, result.LoadLine{Name: load + extra, Circuit: circuit, Draw: "2 A", Quantity: 2})
				}
			}
		}
	}
	r.System.Nodes = append(r.System.Nodes,
		result.Node{Name: "house", Kind: "bank", Negative: true, Bank: "house", Volts: 24, Label: "negative post"},
		result.Node{Name: "neg-main", Kind: "negative-bus", Negative: true, Volts: 24, Label: "negative bus"})
	r.Wiring = append(r.Wiring, result.WiringLine{Name: "neg-run", From: "house", To: "neg-main", Role: "return", Size: "50 mm²", Status: result.Pass})
	return r
}

// TestDiagramLarge lays out hundreds of loads: the drawing runs over
// several sheets, each part refers to where it continues and where it
// comes from, and no label is cut or overlaps another.
func TestDiagramLarge(t *testing.T) {
	t.Parallel()
	r := largeResult()
	sheets, recs, w, h := drawn(t, r)
	checkLegible(t, recs, w, h)
	if len(sheets) < 4 {
		t.Fatalf("%d sheets, want the drawing to continue over several", len(sheets))
	}
	var all strings.Builder
	for _, rec := range recs {
		all.WriteString(rec.all())
	}
	text := all.String()
	for _, s := range wantDrawn(r) {
		if strings.Contains(s, "far-too-long") {
			continue // wrapped over lines: checked below
		}
		if !strings.Contains(text, s) {
			t.Errorf("the diagram lacks %q", s)
		}
	}
	if !strings.Contains(strings.ReplaceAll(text, "\n", ""), "panel-a"+strings.Repeat("a-load-with-a-name-far-too-long-for-one-line-", 3)) {
		t.Error("the long name is not drawn whole over its lines")
	}
	onwards := regexp.MustCompile(`continued on sheet (\d+)`).FindAllStringSubmatch(text, -1)
	back := regexp.MustCompile(`continued from sheet (\d+)`).FindAllStringSubmatch(text, -1)
	if len(onwards) == 0 || len(back) == 0 {
		t.Fatalf("no references between sheets: %d onwards, %d back", len(onwards), len(back))
	}
	if len(onwards) != len(back) {
		t.Errorf("%d references onwards but %d back", len(onwards), len(back))
	}
	for _, m := range append(onwards, back...) {
		if n, _ := strconv.Atoi(m[1]); n < 1 || n > len(sheets) {
			t.Errorf("%q refers to no sheet", m[0])
		}
	}
	if strings.Contains(text, "sheet ?") {
		t.Error("a sheet reference is unresolved")
	}
	// A reference onwards from a sheet leads to a later sheet or the same.
	for i, rec := range recs {
		for _, m := range regexp.MustCompile(`continued on sheet (\d+)`).FindAllStringSubmatch(rec.all(), -1) {
			if n, _ := strconv.Atoi(m[1]); n < i+1 {
				t.Errorf("sheet %d: %q leads back", i+1, m[0])
			}
		}
	}
	svgTexts(t, renderSVG(t, r))
}

// pdfFontSizes returns the sizes of the fonts set (Tf) on each page of a
// PDF.
func pdfFontSizes(t *testing.T, b []byte) [][]float64 {
	t.Helper()
	rd, err := pdf.NewReader(bytes.NewReader(b), int64(len(b)))
	if err != nil {
		t.Fatal(err)
	}
	var out [][]float64
	for i := 1; i <= rd.NumPage(); i++ {
		var sizes []float64
		c := rd.Page(i).V.Key("Contents")
		pdf.Interpret(c, func(stk *pdf.Stack, op string) {
			n := stk.Len()
			args := make([]pdf.Value, n)
			for k := n - 1; k >= 0; k-- {
				args[k] = stk.Pop()
			}
			if op == "Tf" && n == 2 {
				sizes = append(sizes, args[1].Float64())
			}
		})
		out = append(out, sizes)
	}
	return out
}

// TestDiagramPDF checks the diagram on its own as a PDF and in the pack:
// no text under 6 pt on its pages, and the same bytes each time.
func TestDiagramPDF(t *testing.T) {
	t.Parallel()
	r := fixture(t, "sanderling")
	var a, b bytes.Buffer
	if err := DiagramPDF(&a, r, DiagramOptions{}); err != nil {
		t.Fatal(err)
	}
	if err := DiagramPDF(&b, fixture(t, "sanderling"), DiagramOptions{}); err != nil {
		t.Fatal(err)
	}
	if !bytes.Equal(a.Bytes(), b.Bytes()) {
		t.Error("two renders of the same result differ")
	}
	p := readPDF(t, a.Bytes())
	for i, pg := range p.pages {
		if p.boxes[i] != "[0 0 841.89 595.28]" {
			t.Errorf("sheet %d is not A4 landscape: %s", i+1, p.boxes[i])
		}
		if !strings.Contains(pg, fmt.Sprintf("sheet %d of %d", i+1, len(p.pages))) {
			t.Errorf("sheet %d is not numbered", i+1)
		}
	}
	for _, s := range wantDrawn(r) {
		if !strings.Contains(p.all(), s) {
			t.Errorf("the PDF lacks %q", s)
		}
	}
	check := func(what string, sizes [][]float64, pages []int) {
		for _, pg := range pages {
			for _, s := range sizes[pg] {
				if s < sizeMin-1e-9 {
					t.Errorf("%s page %d sets text in %g pt", what, pg+1, s)
				}
			}
		}
	}
	var all []int
	for i := range p.pages {
		all = append(all, i)
	}
	check("the diagram's", pdfFontSizes(t, a.Bytes()), all)

	pack := render(t, r, PackOptions{})
	pp := readPDF(t, pack)
	var diagram []int
	for i, pg := range pp.pages {
		if strings.Contains(pg, "One-line diagram") && pp.boxes[i] == "[0 0 841.89 595.28]" {
			diagram = append(diagram, i)
		}
	}
	if len(diagram) == 0 {
		t.Fatal("the pack has no diagram page")
	}
	check("the pack's diagram", pdfFontSizes(t, pack), diagram)
}
