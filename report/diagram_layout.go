package report

import (
	"fmt"
	"math"
	"strings"
)

// A tree is laid out left to right: its root at the left, a column for
// each depth, each node's runs to its children drawn from a vertical
// trunk to the right of its column. A node with children has its text
// under its symbol; a leaf has it to the right. Every text is measured in
// the Go fonts and wrapped, never cut short, and every text has room of
// its own: the layout keeps the bands of sibling subtrees apart and each
// column's text clear of the trunk beside it.
//
// A sheet is the drawing area of one page. Trees are set on sheets in
// order, side by side while they fit across, then one under the other.
// A tree too wide for a sheet is cut at one depth: the nodes cut are
// drawn as leaves that say which sheet they continue on, and each
// continues there as a tree of its own. A tree too tall for the room
// left is split: what fits stays, and the rest continues on the next
// sheet under a title that says where it comes from.

// Lengths of the layout, mm.
const (
	maxTextW  = 60.0  // the widest line of a leaf's text
	maxInnerW = 40.0  // the widest line of the text under a node with children
	maxRunW   = 44.0  // the widest line of a run's label
	maxTitleW = 160.0 // the widest line of a tree's title
	gapSib    = 1.2   // between the bands of sibling subtrees
	trunkPad  = 1.6   // from a column's widest text to its trunk
	textPad   = 1.2   // between a symbol and its text
	runPad    = 0.8   // between a run's line and its label
	titleGap  = 2.5   // below a tree's title
	blockGap  = 7.0   // between blocks on a sheet
	minSplitH = 45.0  // the least room worth splitting a tree into
)

// layout sets a diagram on sheets w by h millimetres.
type layout struct {
	m    *metrics
	w, h float64
}

// block is a tree, or part of the legend, placed on a sheet.
type block struct {
	tree  *dtree
	title []tline
	// legend rows, for the legend's block.
	legend []legendRow
	// trunk is where the trunks of each depth stand, once placed.
	trunk []float64
	x, y  float64
	w, h  float64
	sheet int
}

// sheet is one sheet's blocks and the width and height they take.
type sheet struct {
	blocks []*block
	w, h   float64
}

// wrapLine wraps a paragraph to maxW: one span is wrapped where it must;
// several that do not fit together each start a line of their own.
func (l *layout) wrapLine(p tline, maxW float64) []tline {
	if l.m.spansWidth(p.spans) <= maxW {
		return []tline{p}
	}
	var out []tline
	for _, sp := range p.spans {
		for _, s := range l.m.wrap(strings.TrimSpace(sp.s), sp.face, sp.size, maxW) {
			c := sp
			c.s = s
			out = append(out, tline{spans: []span{c}, ref: p.ref})
		}
	}
	return out
}

// lineSize is the largest size of a line's spans.
func lineSize(t tline) float64 {
	s := 0.0
	for _, sp := range t.spans {
		s = math.Max(s, sp.size)
	}
	return s
}

// textBlock is where lines go: the baseline of the first line at first
// and each next line a pitch lower. It returns the baselines and how far
// the text reaches above the first baseline and below the last.
func textBlock(lines []tline, first float64) (bases []float64, top, bottom float64) {
	y := first
	for i, t := range lines {
		s := lineSize(t)
		if i > 0 {
			y += lineH(s)
		}
		bases = append(bases, y)
	}
	if len(lines) == 0 {
		return nil, first, first
	}
	return bases, first - ascent(lineSize(lines[0])), y + descent(lineSize(lines[len(lines)-1]))
}

// nodeText is where a node's text goes, from its symbol's left end at its
// line's height: to the right of a leaf's symbol, centred on the line,
// and under a node's symbol when it has children.
func (n *dnode) nodeText() (dx float64, bases []float64, top, bottom float64) {
	if len(n.text) == 0 {
		return 0, nil, 0, 0
	}
	if n.leaf() {
		// The first line's capitals centred on the line.
		first := 0.36 * lineSize(n.text[0]) * mmPerPt
		bases, top, bottom = textBlock(n.text, first)
		return n.symW + textPad, bases, top, bottom
	}
	first := n.symDown + runPad + ascent(lineSize(n.text[0]))
	bases, top, bottom = textBlock(n.text, first)
	return 0, bases, top, bottom
}

// runLabel is where a run's label goes: its name above the line, ending
// runPad above it, and its size, protection and notes below.
func (n *dnode) runLabel() (topBases, bottomBases []float64) {
	if len(n.runTop) > 0 {
		last := -runPad - descent(sizeText)
		first := last
		for i := len(n.runTop) - 1; i > 0; i-- {
			first -= lineH(lineSize(n.runTop[i]))
		}
		topBases, _, _ = textBlock(n.runTop, first)
	}
	if len(n.runBottom) > 0 {
		bottomBases, _, _ = textBlock(n.runBottom, runPad+ascent(sizeText))
	}
	return topBases, bottomBases
}

// labelDx is where a run's label starts, from the trunk: after the
// protective device's symbol.
func (n *dnode) labelDx() float64 {
	if n.run == nil {
		return runPad
	}
	if k := protSym(n.run.Protection); k != symNoProt {
		return 1 + protWidth(k) + 1.2
	}
	return 1.2
}

// measure sets the sizes and extents of n and its subtree, n at depth.
func (l *layout) measure(n *dnode, depth int) {
	n.depth = depth
	n.symW, n.symUp, n.symDown = symSize(n.sym)
	maxW := maxTextW
	if !n.leaf() {
		maxW = maxInnerW
	}
	// A fresh slice: clones share their original's until measured.
	n.text = nil
	for _, p := range n.lines {
		n.text = append(n.text, l.wrapLine(p, maxW)...)
	}
	n.textW = 0
	for _, t := range n.text {
		n.textW = math.Max(n.textW, l.m.spansWidth(t.spans))
	}
	_, _, top, bottom := n.nodeText()
	if n.leaf() {
		n.boxW = n.symW + textPad + n.textW
		n.ownUp = math.Max(n.symUp, -top)
		n.ownDown = math.Max(n.symDown, bottom)
	} else {
		n.boxW = math.Max(n.symW, n.textW)
		n.ownUp = n.symUp
		n.ownDown = math.Max(n.symDown, bottom)
	}

	// The run's label.
	n.runTop, n.runBottom = nil, nil
	n.gapW = 0
	switch {
	case n.run != nil:
		w := n.run
		c := runColor(w)
		n.runTop = l.wrapLine(tline{spans: []span{{s: l.m.clean(w.Name), face: bold, size: sizeText, c: c}}}, maxRunW)
		spec := strings.Join(nonEmpty(w.Size, w.Protection), " · ")
		switch w.Status {
		case "fail":
			spec += " · FAIL"
		case "warn":
			spec += " · WARN"
		}
		sc := colMuted
		if c != colInk && c != colAccent {
			sc = c
		}
		if spec != "" {
			n.runBottom = l.wrapLine(tline{spans: []span{{s: l.m.clean(spec), face: regular, size: sizeText, c: sc}}}, maxRunW)
		}
		if len(n.runNote) > 0 {
			note := "carries the returns of " + strings.Join(n.runNote, ", ")
			n.runBottom = append(n.runBottom, l.wrapLine(tline{spans: []span{{s: l.m.clean(note), face: regular, size: sizeText, c: colMuted}}}, maxRunW)...)
		}
		tw := 0.0
		for _, t := range append(append([]tline(nil), n.runTop...), n.runBottom...) {
			tw = math.Max(tw, l.m.spansWidth(t.spans))
		}
		n.gapW = math.Max(8, n.labelDx()+tw+1.5)
		top, bottom := n.runLabel()
		if len(top) > 0 {
			n.ownUp = math.Max(n.ownUp, -top[0]+ascent(sizeText))
		}
		if len(bottom) > 0 {
			n.ownDown = math.Max(n.ownDown, bottom[len(bottom)-1]+descent(sizeText))
		}
		if k := protSym(w.Protection); k != symNoProt {
			pu, pd := protExtent(k)
			n.ownUp = math.Max(n.ownUp, pu)
			n.ownDown = math.Max(n.ownDown, pd)
		}
	case n.ac:
		n.gapW = 9
	}

	n.up, n.down = n.ownUp, n.ownDown
	off := 0.0
	for i, c := range n.children {
		l.measure(c, depth+1)
		if i == 0 {
			n.up = math.Max(n.up, c.up)
		} else {
			off += n.children[i-1].down + gapSib + c.up
		}
		c.dy = off
	}
	if len(n.children) > 0 {
		last := n.children[len(n.children)-1]
		n.down = math.Max(n.down, off+last.down)
	}
}

// columns are the x of each depth's symbols, and the width the tree
// takes: a column is as wide as its widest node with children (a leaf's
// text may reach past it, into rows of its own) and a trunk beyond it,
// then as wide as the widest run label of the next depth.
func columns(root *dnode) (colX, colW []float64, width float64) {
	var inner, gap []float64
	var walk func(n *dnode)
	walk = func(n *dnode) {
		for len(inner) <= n.depth {
			inner = append(inner, 0)
			gap = append(gap, 0)
		}
		if !n.leaf() {
			inner[n.depth] = math.Max(inner[n.depth], n.boxW)
		}
		gap[n.depth] = math.Max(gap[n.depth], n.gapW)
		for _, c := range n.children {
			walk(c)
		}
	}
	walk(root)
	colX = make([]float64, len(inner))
	for d := 1; d < len(inner); d++ {
		colX[d] = colX[d-1] + inner[d-1] + trunkPad + gap[d]
	}
	var reach func(n *dnode)
	reach = func(n *dnode) {
		width = math.Max(width, colX[n.depth]+n.boxW)
		for _, c := range n.children {
			reach(c)
		}
	}
	reach(root)
	return colX, inner, width
}

// titleLines are a tree's title wrapped to the sheet.
func (l *layout) titleLines(t *dtree) []tline {
	return l.wrapLine(tline{spans: t.title, ref: t.back}, math.Min(l.w, maxTitleW))
}

// titleH is the height of a block's title, its gap included.
func titleH(lines []tline) float64 {
	if len(lines) == 0 {
		return 0
	}
	_, top, bottom := textBlock(lines, 0)
	return bottom - top + titleGap
}

// block measures t and returns its block, not yet placed.
func (l *layout) block(t *dtree) *block {
	l.measure(t.root, 0)
	b := &block{tree: t, title: l.titleLines(t)}
	_, _, w := columns(t.root)
	for _, tl := range b.title {
		w = math.Max(w, l.m.spansWidth(tl.spans))
	}
	b.w = w
	b.h = titleH(b.title) + t.root.up + t.root.down
	return b
}

// width is the width t takes with its root in n.
func (l *layout) width(t *dtree, n *dnode) float64 {
	saved := t.root
	t.root = n
	b := l.block(t)
	t.root = saved
	return b.w
}

// depthOf is how deep the tree under n goes.
func depthOf(n *dnode) int {
	d := 0
	for _, c := range n.children {
		d = max(d, depthOf(c)+1)
	}
	return d
}

// fitWidth cuts t to the sheet's width, if it is too wide, at the depth
// that cuts fewest nodes (the deepest such), and returns the trees cut
// off, in order.
func (l *layout) fitWidth(t *dtree) []*dtree {
	if l.width(t, t.root) <= l.w {
		return nil
	}
	var best *dnode
	var bestCuts []*dtree
	for k := depthOf(t.root) - 1; k >= 1; k-- {
		root, cuts := l.cutAt(t, k)
		if l.width(t, root) <= l.w && (best == nil || len(cuts) < len(bestCuts)) {
			best, bestCuts = root, cuts
		}
	}
	if best == nil {
		best, bestCuts = l.cutAt(t, 1)
	}
	t.root = best
	return bestCuts
}

// cutAt cuts t's nodes at depth k that have children: each is drawn as a
// leaf that names the sheet it continues on, and continues there as the
// root of a tree of its own.
func (l *layout) cutAt(t *dtree, k int) (*dnode, []*dtree) {
	var cuts []*dtree
	var walk func(n *dnode, d int) *dnode
	walk = func(n *dnode, d int) *dnode {
		if n.leaf() {
			return n
		}
		if d < k {
			c := n.clone()
			for i, ch := range n.children {
				c.children[i] = walk(ch, d+1)
			}
			return c
		}
		cont := n.clone()
		cont.at, cont.run, cont.runNote = &mark{}, nil, nil
		leaf := n.clone()
		leaf.children = nil
		leaf.lines = append(append([]tline(nil), n.lines...), refLine("continued on sheet "+sheetMark, cont.at))
		cuts = append(cuts, l.continued(t, cont, leaf.at))
		return leaf
	}
	return walk(t.root, 0), cuts
}

// continued is the tree that continues t from root, drawn first at back.
func (l *layout) continued(t *dtree, root *dnode, back *mark) *dtree {
	name := root.name
	if root.sym == symRef || name == "" {
		name = "continued"
	}
	title := []span{{s: l.m.clean(name), face: bold, size: sizeTitle, c: colInk},
		{s: " · " + t.side() + ", continued from sheet " + sheetMark, face: regular, size: sizeTitle, c: colAccent}}
	return &dtree{title: title, back: back, root: root, origin: t.side()}
}

// side is what a tree is part of, for the titles of its continuations:
// the first part of its title, or its origin's.
func (t *dtree) side() string {
	if t.origin != "" {
		return t.origin
	}
	var parts []string
	for _, s := range t.title {
		parts = append(parts, strings.TrimPrefix(s.s, " · "))
	}
	return strings.Join(parts, ", ")
}

// refLine is a line that cites the sheet of at.
func refLine(text string, at *mark) tline {
	return tline{spans: []span{{s: "→ " + text, face: regular, size: sizeText, c: colAccent}}, ref: at}
}

// fitHeight splits the subtree under n so that what stays is at most
// budget tall. It returns what stays and the trees that continue the
// rest, in order; ok is false when not even n and a part of its first
// child fit.
func (l *layout) fitHeight(t *dtree, n *dnode, budget float64) (kept *dnode, rest []*dtree, ok bool) {
	l.measure(n, n.depth)
	if n.up+n.down <= budget {
		return n, nil, true
	}
	if n.leaf() {
		return l.splitLines(t, n, budget)
	}
	refH := l.refHeight() + gapSib
	// upTo is the height of n with its children up to the i-th, read from
	// the offsets measure set: a child's size does not depend on its
	// siblings.
	upTo := func(i int) float64 {
		ch := n.children[i]
		return math.Max(n.ownUp, n.children[0].up) + math.Max(n.ownDown, ch.dy+ch.down)
	}
	for i, ch := range n.children {
		more := i < len(n.children)-1
		need := upTo(i)
		if more {
			need += refH
		}
		if need <= budget {
			continue
		}
		// ch does not fit whole: keep what of it fits, if that is worth
		// it, and continue the rest of n's children.
		keep := append([]*dnode(nil), n.children[:i]...)
		used := n.ownUp + n.ownDown
		if i > 0 {
			used = upTo(i-1) + gapSib
		}
		room := budget - used
		if more {
			room -= refH
		}
		next := i
		if room >= minSplitH/2 || i == 0 {
			if k, r, ok := l.fitHeight(t, ch, room); ok {
				keep = append(keep, k)
				rest = append(rest, r...)
				next = i + 1
			} else if i == 0 {
				return nil, nil, false
			}
		}
		if next < len(n.children) {
			cont := n.clone()
			cont.children = append([]*dnode(nil), n.children[next:]...)
			cont.at, cont.run, cont.runNote = &mark{}, nil, nil
			what := "1 more branch"
			if len(cont.children) > 1 {
				what = fmt.Sprintf("%d more branches", len(cont.children))
			}
			ref := &dnode{sym: symRef, at: &mark{},
				lines: []tline{refLine(what+" continued on sheet "+sheetMark, cont.at)}}
			keep = append(keep, ref)
			rest = append(rest, l.continued(t, cont, ref.at))
		}
		c := n.clone()
		c.children = keep
		l.measure(c, n.depth)
		return c, rest, true
	}
	return n, nil, true
}

// splitLines splits a leaf taller than budget (one circuit with a great
// many loads, a negative bus with a great many returns) between its
// lines as they are wrapped: as many as fit stay.
func (l *layout) splitLines(t *dtree, n *dnode, budget float64) (*dnode, []*dtree, bool) {
	l.measure(n, n.depth)
	lines := append([]tline(nil), n.text...)
	split := func(k int) (*dnode, *dnode) {
		c, cont := n.clone(), n.clone()
		cont.at, cont.run, cont.runNote = &mark{}, nil, nil
		cont.lines = lines[k:]
		c.lines = append(append([]tline(nil), lines[:k]...), refLine("continued on sheet "+sheetMark, cont.at))
		l.measure(c, n.depth)
		return c, cont
	}
	// The height grows with k: find the largest k that fits.
	lo, hi := 0, len(lines)-1
	for lo < hi {
		mid := (lo + hi + 1) / 2
		if c, _ := split(mid); c.up+c.down <= budget {
			lo = mid
		} else {
			hi = mid - 1
		}
	}
	if lo == 0 {
		return nil, nil, false
	}
	c, cont := split(lo)
	return c, []*dtree{l.continued(t, cont, c.at)}, true
}

// refHeight is the height of a reference leaf.
func (l *layout) refHeight() float64 {
	r := &dnode{sym: symRef, lines: []tline{refLine("continued on sheet "+sheetMark, nil)}}
	l.measure(r, 0)
	return r.up + r.down
}

// sheets lays the diagram's trees out on sheets, then its legend with
// notes under it.
func (l *layout) sheets(dg *diagram, notes []string) []*sheet {
	var out []*sheet
	var cur *sheet
	var shelfY, shelfH, shelfX float64
	newSheet := func() {
		cur = &sheet{}
		out = append(out, cur)
		shelfY, shelfH, shelfX = 0, 0, 0
	}
	newSheet()
	put := func(b *block, x, y float64) {
		b.x, b.y, b.sheet = x, y, len(out)
		cur.blocks = append(cur.blocks, b)
		cur.w = math.Max(cur.w, x+b.w)
		cur.h = math.Max(cur.h, y+b.h)
		if b.tree != nil {
			markSheet(b.tree.root, b.sheet)
		}
	}
	// below is the top of a new shelf under the current one.
	below := func() float64 {
		if shelfH == 0 {
			return shelfY
		}
		return shelfY + shelfH + blockGap
	}
	newShelf := func(b *block, y float64) {
		shelfY, shelfH = y, b.h
		shelfX = b.w
		put(b, 0, y)
	}

	queue := append([]*dtree(nil), dg.trees...)
	for len(queue) > 0 {
		t := queue[0]
		queue = queue[1:]
		if !t.widthDone {
			t.widthDone = true
			if cuts := l.fitWidth(t); len(cuts) > 0 {
				queue = append(cuts, queue...)
			}
		}
		b := l.block(t)
		if shelfH > 0 && shelfX+blockGap+b.w <= l.w && shelfY+b.h <= l.h {
			put(b, shelfX+blockGap, shelfY)
			shelfX += blockGap + b.w
			shelfH = math.Max(shelfH, b.h)
			continue
		}
		y := below()
		if y+b.h <= l.h {
			newShelf(b, y)
			continue
		}
		if room := l.h - y; room >= minSplitH {
			if kept, rest, ok := l.fitHeight(t, t.root, room-titleH(b.title)); ok {
				t.root = kept
				queue = append(rest, queue...)
				newShelf(l.block(t), y)
				continue
			}
		}
		if y > 0 {
			newSheet()
		}
		if b.h > l.h {
			if kept, rest, ok := l.fitHeight(t, t.root, l.h-titleH(b.title)); ok {
				t.root = kept
				queue = append(rest, queue...)
				b = l.block(t)
			}
			// Else it cannot be split: it is drawn as it is, past the
			// sheet's foot, rather than lose a label.
		}
		newShelf(b, 0)
	}

	// The legend, under the last tree, split between sheets if it must.
	rows := l.legendRows(dg, notes)
	for len(rows) > 0 {
		y := below()
		n, h := 0, 0.0
		for n < len(rows) && y+h+rows[n].h <= l.h {
			h += rows[n].h
			n++
		}
		// The title goes with at least one row under it.
		if n == 1 && len(rows) > 1 && rows[0].items == nil && rows[1].items != nil {
			n = 0
		}
		if n == 0 && y > 0 {
			newSheet()
			continue
		}
		n = max(n, 1)
		h = 0
		w := 0.0
		for _, r := range rows[:n] {
			h += r.h
			w = math.Max(w, r.w)
		}
		b := &block{legend: rows[:n], w: w, h: h}
		rows = rows[n:]
		newShelf(b, y)
	}
	return out
}

// markSheet records the sheet every appearance under n is drawn on.
func markSheet(n *dnode, sheet int) {
	if n.at != nil && n.at.sheet == 0 {
		n.at.sheet = sheet
	}
	for _, c := range n.children {
		markSheet(c, sheet)
	}
}

// place sets the position of every node of a block's tree, from the
// block's top left corner, and where each depth's trunk stands.
func place(b *block) {
	root := b.tree.root
	colX, colW, _ := columns(root)
	b.trunk = make([]float64, len(colX))
	for d := range colX {
		b.trunk[d] = colX[d] + colW[d] + trunkPad
	}
	var walk func(n *dnode, y float64)
	walk = func(n *dnode, y float64) {
		n.x, n.y = colX[n.depth], y
		for _, c := range n.children {
			walk(c, y+c.dy)
		}
	}
	walk(root, titleH(b.title)+root.up)
}
