package report

import (
	"math"
	"strings"

	"github.com/ampwright/ampwright/result"
)

// The graphic symbols of the one-line diagram, drawn in the manner of
// IEC 60617 (and IEEE 315) and kept simple: a battery is long and short
// plates, a fuse a rectangle the line runs through, a circuit breaker a
// make contact with a cross at its fixed end, a switch a make contact, a
// PV generator a square with a diagonal and light falling on it, a shunt
// a resistor with two current and two sense terminals, a converter a
// square with a diagonal and the kinds or voltages of its two sides, an
// alternator a circle with G and ~. Each symbol stands on its node's
// line, its left end at x and the line at y; symSize says how much room
// it takes.

// Line widths, mm.
const (
	wLine   = 0.3  // a run, a symbol's outline
	wHeavy  = 0.7  // a run that fails a check; a battery's short plate
	wMedium = 0.5  // a run that warns
	wFine   = 0.22 // a symbol's detail
)

var colAC = colAccent3

// symSize is how long a symbol is along its line and how far it reaches
// above and below the line, mm.
func symSize(k symKind) (w, up, down float64) {
	switch k {
	case symBank, symBankNeg:
		return 6, 3, 3
	case symBusbar, symNegBus:
		return 1.2, 3.6, 3.6
	case symPanel:
		return 3.2, 3.6, 3.6
	case symSwitch:
		return 5.4, 2.6, 0.4
	case symArray:
		return 7, 5.8, 3.5
	case symController, symInverter, symCharger, symDCDC, symConverter:
		return 9, 4.5, 4.5
	case symAlternator:
		return 7.2, 3.6, 3.6
	case symCombiner:
		return 5.4, 2.6, 4.4
	case symIsolator:
		return 4, 1.8, 1.8
	case symShunt:
		return 6.4, 3.8, 1
	case symLoad:
		return 2.2, 1.1, 1.1
	case symAC:
		return 3.2, 1.6, 1.6
	case symRef:
		return 4.4, 1.6, 1.6
	case symReturns:
		return 2, 0.9, 0.9
	}
	return 3, 1.5, 1.5
}

// drawSymbol draws n's symbol with its left end at x and its line at y.
func drawSymbol(cv canvas, n *dnode, x, y float64) {
	ink := lineStyle{w: wLine, c: colInk}
	fine := lineStyle{w: wFine, c: colInk}
	w, up, down := symSize(n.sym)
	switch n.sym {
	case symBank:
		battery(cv, x, y, false)
	case symBankNeg:
		battery(cv, x, y, true)
	case symBusbar, symNegBus:
		cv.box(x, y-up, w, up+down, &colInk, lineStyle{})
	case symPanel:
		cv.box(x, y-up, w, up+down, &colWhite, ink)
		cv.box(x+1.1, y-up+0.8, 1, up+down-1.6, &colInk, lineStyle{})
	case symSwitch:
		contact(cv, x, y, false)
	case symArray:
		cv.box(x, y-3.5, 7, 7, &colWhite, ink)
		cv.line(x, y+3.5, x+7, y-3.5, fine)
		for _, ax := range []float64{1.4, 3.4} {
			arrow(cv, x+ax, y-5.8, x+ax+1.5, y-3.9, fine)
		}
	case symController:
		square(cv, x, y)
		equals(cv, x+1.2, y-2.8)
		equals(cv, x+5.6, y+2.4)
	case symInverter:
		square(cv, x, y)
		equals(cv, x+1.2, y-2.8)
		tilde(cv, x+5.6, y+2.4, 2.2, fine)
	case symCharger:
		square(cv, x, y)
		tilde(cv, x+1.2, y-2.6, 2.2, fine)
		equals(cv, x+5.6, y+2.4)
	case symDCDC, symConverter:
		square(cv, x, y)
		if n.volts[0] == "" || n.volts[1] == "" {
			equals(cv, x+1.2, y-2.8)
			equals(cv, x+5.6, y+2.4)
			break
		}
		cv.label(x+0.6, y-4.5+0.6+ascent(sizeMin), []span{{s: n.volts[0], size: sizeMin, c: colInk}}, "L")
		cv.label(x+8.4, y+4.5-0.6-descent(sizeMin), []span{{s: n.volts[1], size: sizeMin, c: colInk}}, "R")
	case symAlternator:
		cv.circle(x+3.6, y, 3.6, &colWhite, ink)
		cv.label(x+3.6, y+0.5, []span{{s: "G", face: bold, size: sizeName, c: colInk}}, "C")
		tilde(cv, x+2.4, y+1.9, 2.4, fine)
	case symCombiner:
		contact(cv, x, y, false)
		cv.line(x+2.3, y-1.2, x+2.3, y+2.4, lineStyle{w: wFine, c: colInk, dash: 0.5})
		cv.box(x+1.1, y+2.4, 2.4, 1.8, &colWhite, fine)
	case symIsolator:
		cv.polygon([]pt{{x, y - 1.6}, {x, y + 1.6}, {x + 3, y}}, &colInk, lineStyle{})
		cv.line(x+3.2, y-1.7, x+3.2, y+1.7, ink)
		cv.line(x+3.2, y, x+4, y, ink)
	case symShunt:
		cv.line(x, y, x+6.4, y, ink)
		cv.box(x+1.2, y-0.9, 4, 1.8, &colWhite, ink)
		for _, sx := range []float64{1.9, 4.5} {
			cv.line(x+sx, y-0.9, x+sx, y-2.9, fine)
			cv.circle(x+sx, y-3.3, 0.42, &colWhite, fine)
		}
		for _, sx := range []float64{0.45, 5.95} {
			cv.circle(x+sx, y, 0.42, &colWhite, fine)
		}
	case symLoad:
		cv.circle(x+1.1, y, 1, &colWhite, ink)
	case symAC:
		cv.circle(x+1.6, y, 1.5, &colWhite, lineStyle{w: wLine, c: colAC})
		tilde(cv, x+0.7, y, 1.8, lineStyle{w: wFine, c: colAC})
	case symReturns:
		cv.polygon([]pt{{x, y}, {x + 2, y - 0.9}, {x + 2, y + 0.9}}, &colInk, lineStyle{})
	case symRef:
		cv.polygon([]pt{{x, y - 1.5}, {x + 3, y - 1.5}, {x + 4.4, y}, {x + 3, y + 1.5}, {x, y + 1.5}}, &colWhite, lineStyle{w: wLine, c: colAccent})
	default:
		cv.box(x, y-up, w, up+down, &colWhite, ink)
	}
}

// battery draws two cells, long plate (positive) and short plate
// (negative) each; neg turns them so that the negative faces right.
func battery(cv canvas, x, y float64, neg bool) {
	long := lineStyle{w: wLine, c: colInk}
	short := lineStyle{w: wHeavy, c: colInk}
	plates := []float64{0.8, 1.9, 3.7, 4.8} // short, long, short, long
	if neg {
		plates = []float64{4.8, 3.7, 1.9, 0.8}
	}
	for i, px := range plates {
		if i%2 == 0 {
			cv.line(x+px, y-1.5, x+px, y+1.5, short)
		} else {
			cv.line(x+px, y-3, x+px, y+3, long)
		}
	}
	cv.line(x+1.9, y, x+3.7, y, lineStyle{w: wFine, c: colInk, dash: 0.4})
	cv.line(x+4.8, y, x+6, y, long)
}

// contact draws a make contact: the blade from the pivot at x, open,
// towards the fixed contact at x+5, where a breaker has a cross.
func contact(cv canvas, x, y float64, breaker bool) {
	ink := lineStyle{w: wLine, c: colInk}
	cv.line(x, y, x+4.6, y-2.4, ink)
	if breaker {
		cv.line(x+4.4, y-0.6, x+5.6, y+0.6, ink)
		cv.line(x+4.4, y+0.6, x+5.6, y-0.6, ink)
		return
	}
	cv.line(x+5.0, y, x+5.0, y-1.2, ink)
	cv.line(x+5.0, y, x+5.4, y, ink)
}

// square draws the outline of a converter, 9 mm, with its diagonal.
func square(cv canvas, x, y float64) {
	cv.box(x, y-4.5, 9, 9, &colWhite, lineStyle{w: wLine, c: colInk})
	cv.line(x, y+4.5, x+9, y-4.5, lineStyle{w: wFine, c: colInk})
}

// equals draws the DC mark, two short lines, from x at y.
func equals(cv canvas, x, y float64) {
	s := lineStyle{w: wFine, c: colInk}
	cv.line(x, y-0.4, x+2.2, y-0.4, s)
	cv.line(x, y+0.4, x+2.2, y+0.4, s)
}

// tilde draws the AC mark, one period of a sine w long, from x at y.
func tilde(cv canvas, x, y, w float64, s lineStyle) {
	var pts []pt
	for i := 0; i <= 12; i++ {
		f := float64(i) / 12
		pts = append(pts, pt{x + f*w, y - 0.45*math.Sin(2*math.Pi*f)})
	}
	s.round = true
	cv.polyline(pts, s)
}

// arrow draws a line from (x1, y1) to (x2, y2) with a head at its end.
func arrow(cv canvas, x1, y1, x2, y2 float64, s lineStyle) {
	cv.line(x1, y1, x2, y2, s)
	a := math.Atan2(y2-y1, x2-x1)
	const l, h = 0.9, 0.4
	p := func(da float64) pt { return pt{x2 - l*math.Cos(a+da), y2 - l*math.Sin(a+da)} }
	cv.polygon([]pt{{x2, y2}, p(h), p(-h)}, &s.c, lineStyle{})
}

// protKind is the protective device at a run's source end.
type protKind int

const (
	symNoProt protKind = iota
	symFuse
	symBreaker
)

// protSym is the kind of the protective device the wiring schedule
// names: "30 A fuse", "10 A breaker".
func protSym(text string) protKind {
	t := strings.ToLower(text)
	switch {
	case t == "":
		return symNoProt
	case strings.Contains(t, "breaker"):
		return symBreaker
	}
	return symFuse
}

func protWidth(k protKind) float64 {
	if k == symBreaker {
		return 5.6
	}
	return 4.6
}

// protExtent is how far a protective device reaches above and below the
// run.
func protExtent(k protKind) (up, down float64) {
	if k == symBreaker {
		return 2.6, 0.6
	}
	return 0.95, 0.95
}

// drawProt draws a protective device from x on a run at y, in the run's
// colour; the run is drawn up to x and on from x + protWidth.
func drawProt(cv canvas, k protKind, x, y float64, c rgb) {
	s := lineStyle{w: wLine, c: c}
	switch k {
	case symFuse:
		cv.box(x, y-0.95, 4.6, 1.9, &colWhite, s)
		cv.line(x, y, x+4.6, y, s)
	case symBreaker:
		cv.line(x, y, x+4.6, y-2.4, s)
		cv.line(x+4.4, y-0.6, x+5.6, y+0.6, s)
		cv.line(x+4.4, y+0.6, x+5.6, y-0.6, s)
		cv.line(x+5.0, y, x+5.6, y, s)
	}
}

// runColor is the colour a run is drawn in: a failing or warning run in
// its verdict's colour, a charging or PV run in the accent, others in
// ink.
func runColor(w *result.WiringLine) rgb {
	switch {
	case w.Status == result.Fail:
		return colFail
	case w.Status == result.Warn:
		return colWarn
	case w.Role == "charge" || w.Role == "pv":
		return colAccent
	}
	return colInk
}

// runWidth is the line width of a run.
func runWidth(w *result.WiringLine) float64 {
	switch w.Status {
	case result.Fail:
		return wHeavy
	case result.Warn:
		return wMedium
	}
	return wLine
}
