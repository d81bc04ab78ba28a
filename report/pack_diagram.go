package report

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"github.com/ampwright/ampwright/result"
)

// The one-line diagram is a tree grown from the bank over the wiring
// runs, laid out left to right: a column for each depth, a row for each
// leaf, every conductor a line labelled with its name, size and
// protection. A tree too tall for a page continues on the next, with the
// branches it hangs from drawn again and marked "cont.".

type nodeKind int

const (
	kindBus nodeKind = iota
	kindBank
	kindLoad
	kindSource
	kindController
	kindArray
)

type dnode struct {
	name      string
	kind      nodeKind
	sub       string // second line of the box
	depth     int
	row, last int // first and last leaf row of the subtree
	children  []*dnode
	run       *result.WiringLine // the run from the parent
}

// diagramTree builds the tree from the wiring. It returns the roots, the
// bank's first, and the runs that close a loop and so are not drawn.
func (p *pack) diagramTree() ([]*dnode, []result.WiringLine) {
	r := p.r
	kinds := map[string]nodeKind{}
	subs := map[string]string{}
	for _, l := range r.Summary.Loads {
		kinds[l.Name] = kindLoad
		subs[l.Name] = l.Draw
	}
	for _, a := range r.Summary.Arrays {
		kinds[a.Name] = kindArray
		subs[a.Name] = fmt.Sprintf("PV %d × %d %s", a.Series, a.Strings, a.Module)
		kinds[a.Controller] = kindController
		subs[a.Controller] = strings.ToUpper(a.ControllerKind) + " controller"
	}
	b := r.Summary.Bank
	subs["bank"] = fmt.Sprintf("%dS × %dP %s", b.Series, b.Parallel, b.Battery)
	kinds["bank"] = kindBank

	adj := map[string][]int{}
	var names []string
	for i, w := range r.Wiring {
		for _, n := range []string{w.From, w.To} {
			if _, ok := adj[n]; !ok {
				names = append(names, n)
			}
		}
		adj[w.From] = append(adj[w.From], i)
		adj[w.To] = append(adj[w.To], i)
	}
	sort.Strings(names)
	// Sources and charging first under a node, then distribution, each by
	// run name.
	order := func(i int) string {
		w := r.Wiring[i]
		k := "1"
		if w.Role != "supply" {
			k = "0"
		}
		return k + w.Name
	}
	for _, list := range adj {
		sort.SliceStable(list, func(a, b int) bool { return order(list[a]) < order(list[b]) })
	}

	nodes := map[string]*dnode{}
	used := make([]bool, len(r.Wiring))
	var loops []result.WiringLine
	grow := func(root string) *dnode {
		rn := &dnode{name: root}
		nodes[root] = rn
		queue := []*dnode{rn}
		for len(queue) > 0 {
			n := queue[0]
			queue = queue[1:]
			for _, i := range adj[n.name] {
				if used[i] {
					continue
				}
				used[i] = true
				w := r.Wiring[i]
				other := w.To
				if other == n.name {
					other = w.From
				}
				if _, seen := nodes[other]; seen {
					loops = append(loops, w)
					continue
				}
				c := &dnode{name: other, depth: n.depth + 1, run: &r.Wiring[i]}
				nodes[other] = c
				n.children = append(n.children, c)
				queue = append(queue, c)
			}
		}
		return rn
	}
	var roots []*dnode
	if _, ok := adj["bank"]; ok || len(r.Wiring) == 0 {
		roots = append(roots, grow("bank"))
	}
	for _, n := range names {
		if _, seen := nodes[n]; !seen {
			roots = append(roots, grow(n))
		}
	}
	for name, n := range nodes {
		k, ok := kinds[name]
		if !ok {
			k = kindBus
			if len(n.children) == 0 && n.run != nil && n.run.Role != "supply" {
				k = kindSource
			}
		}
		n.kind = k
		n.sub = subs[name]
		if n.sub == "" {
			switch k {
			case kindSource:
				n.sub = "charging source"
			case kindBus:
				if len(n.children) == 0 {
					n.sub = "device"
				}
			}
		}
	}
	row := 0
	var place func(n *dnode)
	place = func(n *dnode) {
		if len(n.children) == 0 {
			n.row, n.last = row, row
			row++
			return
		}
		for _, c := range n.children {
			place(c)
		}
		n.row, n.last = n.children[0].row, n.children[len(n.children)-1].last
	}
	for _, rt := range roots {
		place(rt)
	}
	return roots, loops
}

func (p *pack) diagram() {
	d := p.d
	p.start("diagram", "One-line diagram", true)
	roots, loops := p.diagramTree()
	if len(p.r.Wiring) == 0 {
		p.note(9, colMuted, "The design has no wiring runs.")
		return
	}
	var all []*dnode
	var walk func(n *dnode)
	walk = func(n *dnode) {
		all = append(all, n)
		for _, c := range n.children {
			walk(c)
		}
	}
	for _, rt := range roots {
		walk(rt)
	}
	rows, depth := 0, 0
	for _, n := range all {
		rows = max(rows, n.last+1)
		depth = max(depth, n.depth+1)
	}

	// Column widths at the base font size.
	const base = 6.5
	boxW := make([]float64, depth)
	gapW := make([]float64, depth)
	d.font(bold, base)
	for _, n := range all {
		w := d.textW(n.name)
		d.font(regular, base-0.8)
		w = math.Max(w, d.textW(n.sub))
		d.font(bold, base)
		boxW[n.depth] = math.Max(boxW[n.depth], w+3)
	}
	d.font(regular, base-0.5)
	for _, n := range all {
		if n.run == nil {
			continue
		}
		w := math.Max(d.textW(n.run.Name), d.textW(runLabel(n.run)))
		gapW[n.depth] = math.Max(gapW[n.depth], w+5)
	}
	for i := range boxW {
		boxW[i] = math.Min(math.Max(boxW[i], 16), 48)
		if i > 0 {
			gapW[i] = math.Min(math.Max(gapW[i], 14), 46)
		}
	}
	need := 0.0
	for i := range boxW {
		need += boxW[i] + gapW[i]
	}
	const pitch = 8.0 // row pitch at scale 1
	availW := d.width()
	legendH := 12.0
	availH := d.bottom() - d.y - legendH - 4
	// The scale fits the tree on one page, larger than the base size if
	// it is small; below minScale the labels would be too small to read,
	// so the tree runs onto more pages instead, and columns too wide even
	// then are narrowed, their labels cut short.
	const minScale = 0.8
	wS := availW / need
	hS := availH / (float64(rows) * pitch)
	s := math.Min(1.4, math.Min(wS, hS))
	if s < minScale {
		if wS < minScale {
			f := wS / minScale
			for i := range boxW {
				boxW[i] *= f
				gapW[i] *= f
			}
			wS = minScale
		}
		s = math.Min(1, wS)
	}
	perPage := max(1, int(availH/(pitch*s)))
	// Width to spare lengthens the conductors, up to a point.
	used := 0.0
	for i := range boxW {
		used += (boxW[i] + gapW[i]) * s
	}
	spare := 0.0
	if depth > 1 && used < availW {
		spare = math.Min((availW-used)/float64(depth-1), 15)
	}
	colX := make([]float64, depth)
	x := d.left()
	for i := range boxW {
		x += gapW[i] * s
		if i > 0 {
			x += spare
		}
		colX[i] = x
		x += boxW[i] * s
	}

	pages := (rows + perPage - 1) / perPage
	for pg := 0; pg < pages; pg++ {
		if pg > 0 {
			d.addPage(true)
			p.heading("One-line diagram (continued)")
		}
		a, b := pg*perPage, min(rows, (pg+1)*perPage)
		top := d.y + 2
		yOf := func(row int) float64 { return top + (float64(row-a)+0.5)*pitch*s }
		// visible is where a node is drawn on this page, if it is.
		visible := func(n *dnode) (int, bool, bool) {
			if n.last < a || n.row >= b {
				return 0, false, false
			}
			if n.row < a {
				return a, true, true
			}
			return n.row, true, false
		}
		for _, n := range all {
			row, ok, cont := visible(n)
			if !ok {
				continue
			}
			p.drawNode(n, colX[n.depth], yOf(row), boxW[n.depth]*s, s, cont)
			// Conductors to the children on this page.
			var ys []float64
			for _, c := range n.children {
				crow, cok, _ := visible(c)
				if !cok {
					continue
				}
				ys = append(ys, yOf(crow))
			}
			if len(ys) == 0 {
				continue
			}
			trunk := colX[n.depth] + boxW[n.depth]*s + 1.5*s
			py := yOf(row)
			d.line(colX[n.depth]+boxW[n.depth]*s, py, trunk, py, lineStyle{w: 0.35, c: colInk})
			if last := ys[len(ys)-1]; last > py {
				d.line(trunk, py, trunk, last, lineStyle{w: 0.35, c: colInk})
			}
			for _, c := range n.children {
				crow, cok, _ := visible(c)
				if !cok {
					continue
				}
				p.drawRun(c.run, trunk, colX[c.depth], yOf(crow), s)
			}
		}
		d.y = top + float64(b-a)*pitch*s + 2
	}
	p.diagramLegend(loops)
}

// runLabel is the second line of a run's label: size and protection.
func runLabel(w *result.WiringLine) string {
	prot := w.Protection
	if prot == "" {
		prot = "no device"
	}
	s := w.Size + " · " + prot
	if w.Status == result.Fail {
		s += " · FAIL"
	}
	return s
}

// drawRun draws the conductor from the trunk at x1 to a box at x2, at y.
func (p *pack) drawRun(w *result.WiringLine, x1, x2, y, s float64) {
	d := p.d
	c := colInk
	lw := 0.35
	switch {
	case w.Status == result.Fail:
		c, lw = colFail, 0.8
	case w.Status == result.Warn:
		c, lw = colWarn, 0.6
	case w.Role != "supply":
		c = colAccent
	}
	d.line(x1, y, x2, y, lineStyle{w: lw, c: c})
	tw := x2 - x1 - 1.5*s
	d.font(bold, 6*s)
	d.textColor(c)
	d.textIn(x1+1.2*s, y-3.1*s, tw, 2.8*s, w.Name, "L")
	d.font(regular, 6*s)
	if c == colInk {
		d.textColor(colMuted)
	}
	d.textIn(x1+1.2*s, y+0.3*s, tw, 2.8*s, runLabel(w), "L")
	d.textColor(colInk)
}

// drawNode draws a node's box centred on y.
func (p *pack) drawNode(n *dnode, x, y, w, s float64, cont bool) {
	d := p.d
	h := 6.6 * s
	if n.sub == "" {
		h = 4.6 * s
	}
	top := y - h/2
	line := lineStyle{w: 0.3, c: colInk}
	var fill *rgb
	switch n.kind {
	case kindBank:
		fill, line.w = &rgb{214, 226, 242}, 0.7
	case kindBus:
		fill = &colShade
	case kindArray:
		fill, line.c = &rgb{226, 236, 248}, colAccent
	case kindController, kindSource:
		fill, line.c = &rgb{236, 242, 250}, colAccent
	case kindLoad:
		fill, line.w = &colWhite, 0.25
	}
	if n.kind == kindLoad {
		d.roundBox(x, top, w, h, 1.2*s, fill, line)
	} else {
		d.box(x, top, w, h, fill, line)
	}
	if n.kind == kindArray {
		// A PV array: a diagonal across the box's corner.
		d.line(x+w-3*s, top, x+w, top+3*s, lineStyle{w: 0.3, c: colAccent})
	}
	name := n.name
	if cont {
		name += " (cont.)"
	}
	d.font(bold, 6.5*s)
	d.textColor(colInk)
	if n.sub == "" {
		d.textIn(x+1*s, top, w-2*s, h, name, "L")
		return
	}
	d.textIn(x+1*s, top+0.5*s, w-2*s, 3*s, name, "L")
	d.font(regular, 5.7*s)
	d.textColor(colMuted)
	d.textIn(x+1*s, top+3.3*s, w-2*s, 2.8*s, n.sub, "L")
	d.textColor(colInk)
}

func (p *pack) diagramLegend(loops []result.WiringLine) {
	d := p.d
	d.y = math.Max(d.y, d.bottom()-12)
	if d.y+10 > d.bottom() {
		d.addPage(true)
	}
	y := d.y
	x := d.left()
	d.font(regular, 6.5)
	item := func(draw func(x, y float64), s string) {
		draw(x, y)
		d.textColor(colInk)
		d.textIn(x+7, y-0.3, 60, 3.4, s, "L")
		x += 9 + d.textW(s) + 5
	}
	item(func(x, y float64) { d.box(x, y, 5.5, 2.8, &rgb{214, 226, 242}, lineStyle{w: 0.7, c: colInk}) }, "battery bank")
	item(func(x, y float64) { d.box(x, y, 5.5, 2.8, &colShade, lineStyle{w: 0.3, c: colInk}) }, "bus, switch or panel")
	item(func(x, y float64) { d.box(x, y, 5.5, 2.8, &rgb{236, 242, 250}, lineStyle{w: 0.3, c: colAccent}) }, "controller or charging source")
	item(func(x, y float64) {
		d.box(x, y, 5.5, 2.8, &rgb{226, 236, 248}, lineStyle{w: 0.3, c: colAccent})
		d.line(x+3.5, y, x+5.5, y+2, lineStyle{w: 0.3, c: colAccent})
	}, "solar array")
	item(func(x, y float64) { d.roundBox(x, y, 5.5, 2.8, 0.8, &colWhite, lineStyle{w: 0.25, c: colInk}) }, "load")
	item(func(x, y float64) { d.line(x, y+1.4, x+5.5, y+1.4, lineStyle{w: 0.35, c: colInk}) }, "supply run")
	item(func(x, y float64) { d.line(x, y+1.4, x+5.5, y+1.4, lineStyle{w: 0.35, c: colAccent}) }, "charging or PV run")
	item(func(x, y float64) { d.line(x, y+1.4, x+5.5, y+1.4, lineStyle{w: 0.8, c: colFail}) }, "run that fails a check")
	d.y = y + 4.5
	text := "Each run is labelled with its name above the line and its size and protective device below; lengths, currents and drops are in the wiring schedule (page " + pageAlias("wiring") + ")."
	if len(loops) > 0 {
		var ls []string
		for _, w := range loops {
			ls = append(ls, fmt.Sprintf("%s (%s → %s)", w.Name, w.From, w.To))
		}
		text += " Runs that close a loop, not drawn: " + strings.Join(ls, ", ") + "."
	}
	p.note(6.5, colMuted, text)
}
