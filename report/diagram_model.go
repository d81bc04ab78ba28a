package report

import (
	"fmt"
	"sort"
	"strings"

	"github.com/ampwright/ampwright/result"
)

// The one-line diagram is drawn from the result's system (result.System):
// a tree for each bank's positive side, grown over the wiring runs from
// the bank, and a tree for each bank's negative side, grown over the
// negative conductors from its negative post. A link between banks is a
// leaf of both banks' trees, each naming the other. A result from before
// the system was recorded is drawn from its wiring lines alone, from the
// node named "bank".
//
// diagram_model.go builds the trees, diagram_layout.go measures them and
// lays them out on sheets (cutting a tree too large for one into parts
// that refer to each other), diagram_symbols.go draws the graphic symbols
// and diagram_draw.go draws the sheets on a canvas.

// symKind is the graphic symbol a node is drawn with.
type symKind int

const (
	symNode       symKind = iota // a node of no known kind
	symBank                      // a battery, its positive side to the right
	symBankNeg                   // a battery's negative post
	symBusbar                    // a busbar
	symPanel                     // a panel, fuse block, terminal block or bus
	symSwitch                    // a switch: a make contact
	symArray                     // a PV generator
	symController                // a solar charge controller
	symInverter                  // an inverter or inverter-charger
	symCharger                   // a shore (mains) charger
	symAlternator                // an alternator or generator
	symDCDC                      // a DC-DC charger between banks
	symCombiner                  // a combiner (voltage-sensing relay)
	symIsolator                  // a diode isolator
	symConverter                 // a converter to another voltage
	symLoad                      // a load or several on one circuit
	symAC                        // the AC side of an inverter
	symShunt                     // a battery monitor's shunt
	symNegBus                    // a negative bus
	symRef                       // a reference to another sheet
	symReturns                   // the returns landing on a negative node
)

// The text sizes of the diagram, points: never under 6 at print size.
const (
	sizeName  = 6.5 // a node's name
	sizeText  = 6.0 // labels, run sizes and protection
	sizeTitle = 8.0 // a tree's title
	sizeMin   = 6.0
)

// sheetMark stands in a line's text for the sheet number it refers to,
// filled in once the sheets are laid out; it is measured as three digits
// (metrics.width). It is a private-use character, which clean never lets
// through from a design's text.
const sheetMark = "\uE000"

// mark is one appearance of a node on the sheets: the sheet it is drawn
// on, once it is placed. Parts of one node split across sheets share it
// when they are the same appearance, and a continuation gets its own.
type mark struct{ sheet int }

// tline is one line of text: its spans, and the node whose sheet its
// sheetMark cites, if any.
type tline struct {
	spans []span
	ref   *mark
}

// dnode is a node of a diagram tree, with the run from its parent.
type dnode struct {
	name  string
	sym   symKind
	volts [2]string // a converter's two sides, drawn in its symbol
	lines []tline
	// run is the conductor from the parent; ac marks the AC side of an
	// inverter, joined without a run.
	run      *result.WiringLine
	runNote  []string // more about the run: the returns a negative conductor carries
	ac       bool
	children []*dnode
	at       *mark
	// text is lines wrapped to the node's width, set by measure.
	text []tline

	// Set by measure: the symbol's width and extents; the text's width;
	// the run label's lines, width and extents; the node's own extents
	// and its subtree's; each child's offset from the node.
	symW, symUp, symDown float64
	textW                float64
	runTop, runBottom    []tline
	gapW                 float64
	boxW                 float64
	ownUp, ownDown       float64
	up, down             float64
	dy                   float64
	depth                int
	// Set by place: where it is in its block.
	x, y float64
}

func (n *dnode) leaf() bool { return len(n.children) == 0 }

// clone copies n for a part of it drawn on a sheet; the copy shares n's
// children list only until it is given its own.
func (n *dnode) clone() *dnode {
	c := *n
	c.children = append([]*dnode(nil), n.children...)
	return &c
}

// dtree is a tree drawn as one or more blocks: a bank's positive or
// negative side, or a part continued from another sheet.
type dtree struct {
	title []span
	// back is the appearance the title's sheetMark cites.
	back *mark
	root *dnode
	// origin is what the tree continues, for a continuation: "house
	// bank, 12 V".
	origin string
	// widthDone is set once the tree has been cut to the sheet's width.
	widthDone bool
}

// diagram is a design's trees and notes, ready to lay out.
type diagram struct {
	trees []*dtree
	// loops are runs left out because they join two nodes already drawn.
	loops []result.WiringLine
	// unplaced are loads on no drawn circuit.
	unplaced []result.LoadLine
	// used are the symbols drawn, for the legend.
	used map[symKind]bool
	// Whether fuses, breakers, failing or warning runs, charging runs
	// and AC sides are drawn, for the legend.
	fuse, breaker, fail, warn, charge, acSide bool
}

// nodeKey names a node: its name and whether it is on the negative side,
// where a bank's negative post has the bank's name.
type nodeKey struct {
	name string
	neg  bool
}

// builder grows the trees from a result.
type builder struct {
	r     *result.Result
	m     *metrics
	dg    *diagram
	info  map[nodeKey]result.Node
	adj   map[nodeKey][]int
	used  []bool
	seen  map[nodeKey]bool
	loads map[string][]result.LoadLine // by circuit
	ac    map[string][]result.LoadLine // by inverter
	// placed are the loads drawn.
	placed map[string]bool
	// returnsTo lists the runs whose return lands on a negative node;
	// carries the runs whose return travels on a negative conductor.
	returnsTo map[string][]string
	carries   map[string][]string
	// links are the link leaves drawn, by link name, each with the bank
	// it is drawn under, to refer from one to the other.
	links map[string][]linkLeaf
	banks map[string]*mark
}

type linkLeaf struct {
	n    *dnode
	bank string
}

// newDiagram builds the trees of r's one-line diagram.
func newDiagram(r *result.Result, m *metrics) *diagram {
	dg := &diagram{used: map[symKind]bool{}}
	b := &builder{r: r, m: m, dg: dg, info: map[nodeKey]result.Node{}, adj: map[nodeKey][]int{},
		used: make([]bool, len(r.Wiring)), seen: map[nodeKey]bool{}, loads: map[string][]result.LoadLine{},
		ac: map[string][]result.LoadLine{}, placed: map[string]bool{}, returnsTo: map[string][]string{},
		carries: map[string][]string{}, links: map[string][]linkLeaf{}, banks: map[string]*mark{}}
	for _, l := range r.Summary.Loads {
		switch {
		case l.Inverter != "":
			b.ac[l.Inverter] = append(b.ac[l.Inverter], l)
		case l.Circuit != "":
			b.loads[l.Circuit] = append(b.loads[l.Circuit], l)
		}
	}
	var roots []nodeKey
	if r.System != nil {
		for _, n := range r.System.Nodes {
			k := nodeKey{n.Name, n.Negative}
			if _, dup := b.info[k]; dup {
				continue
			}
			b.info[k] = n
			if n.Kind == "bank" {
				roots = append(roots, k)
			}
		}
	} else {
		roots = b.legacyNodes()
	}
	for i, w := range r.Wiring {
		neg := w.Role == "return"
		b.adj[nodeKey{w.From, neg}] = append(b.adj[nodeKey{w.From, neg}], i)
		b.adj[nodeKey{w.To, neg}] = append(b.adj[nodeKey{w.To, neg}], i)
		if w.ReturnTo != "" {
			b.returnsTo[w.ReturnTo] = append(b.returnsTo[w.ReturnTo], w.Name)
		}
		if w.ReturnVia != "" {
			b.carries[w.ReturnVia] = append(b.carries[w.ReturnVia], w.Name)
		}
	}
	// Sources and charging first under a node, then distribution, each by
	// run name.
	order := func(i int) string {
		w := r.Wiring[i]
		if w.Role == "supply" || w.Role == "return" {
			return "1" + w.Name
		}
		return "0" + w.Name
	}
	for _, list := range b.adj {
		sort.SliceStable(list, func(i, j int) bool { return order(list[i]) < order(list[j]) })
	}
	// Every bank's positive side, then whatever no bank reaches; then the
	// negative sides the same way.
	for _, neg := range []bool{false, true} {
		for _, k := range roots {
			if k.neg == neg && !b.seen[k] {
				b.tree(k)
			}
		}
		var rest []nodeKey
		for k := range b.adj {
			if k.neg == neg && !b.seen[k] {
				rest = append(rest, k)
			}
		}
		sort.Slice(rest, func(i, j int) bool { return rest[i].name < rest[j].name })
		for _, k := range rest {
			if !b.seen[k] {
				b.tree(k)
			}
		}
	}
	b.linkRefs()
	for _, l := range r.Summary.Loads {
		if !b.placed[l.Name] {
			dg.unplaced = append(dg.unplaced, l)
		}
	}
	for _, t := range dg.trees {
		dg.note(t.root)
	}
	return dg
}

// note records the symbols and run styles a tree draws, for the legend.
func (dg *diagram) note(n *dnode) {
	dg.used[n.sym] = true
	if w := n.run; w != nil {
		switch protSym(w.Protection) {
		case symFuse:
			dg.fuse = true
		case symBreaker:
			dg.breaker = true
		}
		switch {
		case w.Status == result.Fail:
			dg.fail = true
		case w.Status == result.Warn:
			dg.warn = true
		}
		if w.Role == "charge" || w.Role == "pv" {
			dg.charge = true
		}
	}
	if n.ac {
		dg.acSide = true
	}
	for _, c := range n.children {
		dg.note(c)
	}
}

// legacyNodes describes the nodes of a result with no system from its
// summary: the bank, the loads, the arrays and their controllers. It
// returns the root, "bank".
func (b *builder) legacyNodes() []nodeKey {
	r := b.r
	bk := r.Summary.Bank
	b.info[nodeKey{"bank", false}] = result.Node{Name: "bank", Kind: "bank",
		Label: fmt.Sprintf("%dS × %dP %s", bk.Series, bk.Parallel, bk.Battery)}
	for _, a := range r.Summary.Arrays {
		b.info[nodeKey{a.Name, false}] = result.Node{Name: a.Name, Kind: "array",
			Label: fmt.Sprintf("PV %d × %d %s", a.Series, a.Strings, a.Module)}
		b.info[nodeKey{a.Controller, false}] = result.Node{Name: a.Controller, Kind: "controller",
			Label: strings.ToUpper(a.ControllerKind) + " controller"}
	}
	for _, w := range r.Wiring {
		for _, l := range b.loads[w.Name] {
			if l.Name == w.To {
				b.info[nodeKey{w.To, false}] = result.Node{Name: w.To, Kind: "load"}
			}
		}
	}
	return []nodeKey{{"bank", false}}
}

// tree grows the tree from root, breadth first, so that each node hangs
// from the shortest way to the root. Links between banks and other banks
// end a branch.
func (b *builder) tree(root nodeKey) {
	rn := b.node(root, nil)
	t := &dtree{root: rn}
	info := b.info[root]
	switch {
	case root.neg && info.Kind == "bank":
		t.title = b.title("Negative side", strings.Join(nonEmpty(bankName(root.name), bankLabel(info)), ", "))
	case root.neg:
		t.title = b.title("Negative side", "not joined to a bank's negative post")
	case info.Kind == "bank":
		t.title = b.title(bankTitle(root.name), bankLabel(info))
		b.banks[root.name] = rn.at
	default:
		t.title = b.title(root.name, "not joined to a bank")
	}
	b.dg.trees = append(b.dg.trees, t)
	b.seen[root] = true
	inTree := map[nodeKey]bool{root: true}
	queue := []*dnode{rn}
	keys := map[*dnode]nodeKey{rn: root}
	for len(queue) > 0 {
		n := queue[0]
		queue = queue[1:]
		k := keys[n]
		if n != rn && (n.sym == symDCDC || n.sym == symCombiner || n.sym == symIsolator || b.info[k].Kind == "bank") {
			continue
		}
		for _, i := range b.adj[k] {
			if b.used[i] {
				continue
			}
			w := &b.r.Wiring[i]
			ok := nodeKey{w.To, k.neg}
			if w.To == k.name {
				ok = nodeKey{w.From, k.neg}
			}
			link := b.info[ok].Kind == "link"
			if inTree[ok] || (b.seen[ok] && !link) {
				b.used[i] = true
				b.dg.loops = append(b.dg.loops, *w)
				continue
			}
			b.used[i] = true
			inTree[ok] = true
			b.seen[ok] = true
			c := b.node(ok, w)
			keys[c] = ok
			n.children = append(n.children, c)
			queue = append(queue, c)
			if link {
				b.links[ok.name] = append(b.links[ok.name], linkLeaf{c, bankOf(b.info[root], root.name)})
			}
		}
	}
}

func bankOf(n result.Node, name string) string {
	if n.Bank != "" {
		return n.Bank
	}
	return name
}

// bankTitle is a positive tree's title: "house bank", or "Bank" for the
// single bank of a design that names it "bank".
func bankTitle(name string) string {
	if name == "bank" {
		return "Bank"
	}
	return bankName(name)
}

// bankName is how text names a bank: "house bank", or "bank".
func bankName(name string) string {
	if name == "bank" {
		return name
	}
	return name + " bank"
}

func bankLabel(n result.Node) string {
	if n.Volts > 0 {
		return fmt.Sprintf("%s V", fnum(n.Volts))
	}
	return ""
}

// title is a tree's title: its name in bold, then what it is.
func (b *builder) title(name, what string) []span {
	ss := []span{{s: b.m.clean(name), face: bold, size: sizeTitle, c: colInk}}
	if what != "" {
		ss = append(ss, span{s: " · " + b.m.clean(what), face: regular, size: sizeTitle, c: colMuted})
	}
	return ss
}

// node makes the diagram node for k, reached over run w.
func (b *builder) node(k nodeKey, w *result.WiringLine) *dnode {
	info := b.info[k]
	n := &dnode{name: k.name, run: w, at: &mark{}}
	n.sym = symbolOf(info, k.neg)
	if n.sym == symNode && b.r.System == nil && w != nil && w.Role != "supply" && len(b.adj[k]) == 1 {
		n.sym = symCharger // a legacy result's charge source
	}
	if w != nil && w.Role == "return" {
		n.runNote = b.carries[w.Name]
	}
	name := b.nameLines(k.name)
	label := info.Label
	switch n.sym {
	case symBank:
		// The bank's voltage is in its tree's title.
		n.lines = append(n.lines, name...)
	case symBankNeg:
		n.lines = append(n.lines, b.nameLines(k.name+" (−)")...)
	case symLoad:
		if w != nil && len(b.loads[w.Name]) > 0 {
			for _, l := range b.loads[w.Name] {
				n.lines = append(n.lines, b.loadLines(l)...)
				b.placed[l.Name] = true
			}
			label = ""
		} else {
			n.lines = append(n.lines, name...)
		}
	case symConverter:
		n.lines = append(n.lines, name...)
		n.volts = b.converterVolts(k)
	case symDCDC:
		n.lines = append(n.lines, name...)
		n.volts = [2]string{b.bankVolts(info.From), b.bankVolts(info.To)}
	default:
		n.lines = append(n.lines, name...)
	}
	if label != "" {
		n.lines = append(n.lines, b.textLines(label, colMuted)...)
	}
	if info.Pair != "" {
		n.lines = append(n.lines, b.textLines("negative: "+info.Pair, colMuted)...)
	}
	// The returns that land on a negative node hang from it as a leaf of
	// their own, which a sheet can split between its lines however many
	// there are.
	if rs := b.returnsTo[k.name]; k.neg && len(rs) > 0 {
		c := &dnode{name: "returns", sym: symReturns, at: &mark{}}
		c.lines = b.textLines(fmt.Sprintf("returns of %s: %s", plural(len(rs), "run"), strings.Join(rs, ", ")), colInk)
		n.children = append(n.children, c)
	}
	// Loads on a run that ends at something other than a load hang from
	// its end; the AC loads of an inverter behind it.
	if w != nil && n.sym != symLoad && len(b.loads[w.Name]) > 0 {
		c := &dnode{name: b.loads[w.Name][0].Name, sym: symLoad, at: &mark{}}
		for _, l := range b.loads[w.Name] {
			c.lines = append(c.lines, b.loadLines(l)...)
			b.placed[l.Name] = true
		}
		n.children = append(n.children, c)
	}
	if ls := b.ac[k.name]; len(ls) > 0 && !k.neg && !b.acDone(k.name) {
		c := &dnode{name: "AC", sym: symAC, ac: true, at: &mark{}}
		c.lines = append(c.lines, tline{spans: []span{{s: "AC loads", face: bold, size: sizeName, c: colInk}}})
		for _, l := range ls {
			c.lines = append(c.lines, b.loadLines(l)...)
			b.placed[l.Name] = true
		}
		n.children = append(n.children, c)
	}
	return n
}

func (b *builder) acDone(inverter string) bool {
	for _, l := range b.ac[inverter] {
		if b.placed[l.Name] {
			return true
		}
	}
	return false
}

// symbolOf is the symbol of a node of the system.
func symbolOf(n result.Node, neg bool) symKind {
	label := strings.ToLower(n.Label)
	switch n.Kind {
	case "bank":
		if neg {
			return symBankNeg
		}
		return symBank
	case "busbar":
		return symBusbar
	case "bus", "panel", "fuse-block", "terminal-block":
		return symPanel
	case "switch":
		return symSwitch
	case "array":
		return symArray
	case "controller":
		return symController
	case "inverter":
		return symInverter
	case "charger":
		if strings.HasPrefix(label, "alternator") || strings.HasPrefix(label, "generator") {
			return symAlternator
		}
		return symCharger
	case "link":
		switch {
		case strings.HasPrefix(label, "combiner"):
			return symCombiner
		case strings.HasPrefix(label, "isolator"):
			return symIsolator
		}
		return symDCDC
	case "converter":
		return symConverter
	case "load":
		return symLoad
	case "negative-bus":
		return symNegBus
	case "shunt":
		return symShunt
	}
	return symNode
}

// converterVolts are a converter's input and output voltages: its own
// side's, and that of the nodes it feeds.
func (b *builder) converterVolts(k nodeKey) [2]string {
	in := b.info[k].Volts
	out := 0.0
	for _, i := range b.adj[k] {
		w := b.r.Wiring[i]
		other := w.To
		if other == k.name {
			other = w.From
		}
		if o, ok := b.info[nodeKey{other, false}]; ok && o.Volts > 0 && o.Volts != in {
			out = o.Volts
			break
		}
	}
	v := [2]string{}
	if in > 0 {
		v[0] = fnum(in) + " V"
	}
	if out > 0 {
		v[1] = fnum(out) + " V"
	}
	return v
}

func (b *builder) bankVolts(bank string) string {
	if n, ok := b.info[nodeKey{bank, false}]; ok && n.Volts > 0 {
		return fnum(n.Volts) + " V"
	}
	return ""
}

// linkRefs adds to each link leaf the other bank it joins and the sheet
// where the link is drawn under that bank.
func (b *builder) linkRefs() {
	for name, leaves := range b.links {
		info := b.info[nodeKey{name, false}]
		for _, l := range leaves {
			other := info.To
			arrow := "→ "
			if l.bank == info.To {
				other, arrow = info.From, "← "
			}
			var at *mark
			for _, o := range leaves {
				if o.bank == other {
					at = o.n.at
				}
			}
			if at == nil {
				at = b.banks[other]
			}
			text := arrow + bankName(other)
			if at == nil {
				l.n.lines = append(l.n.lines, b.textLines(text, colAccent)...)
				continue
			}
			l.n.lines = append(l.n.lines, tline{spans: []span{{s: b.m.clean(text) + ", sheet " + sheetMark, face: regular, size: sizeText, c: colAccent}}, ref: at})
		}
	}
}

// nameLines are a node's name in bold, wrapped to the widest label.
func (b *builder) nameLines(name string) []tline {
	var out []tline
	for _, l := range b.m.wrap(b.m.clean(name), bold, sizeName, maxTextW) {
		out = append(out, tline{spans: []span{{s: l, face: bold, size: sizeName, c: colInk}}})
	}
	return out
}

// textLines are s in the label size, wrapped to the widest label.
func (b *builder) textLines(s string, c rgb) []tline {
	var out []tline
	for _, l := range b.m.wrap(b.m.clean(s), regular, sizeText, maxTextW) {
		out = append(out, tline{spans: []span{{s: l, face: regular, size: sizeText, c: c}}})
	}
	return out
}

// loadLines are a load's name in bold and its draw, with its quantity:
// "cabin-lights 8 × 3 W", on one line when it fits.
func (b *builder) loadLines(l result.LoadLine) []tline {
	draw := l.Draw
	if l.Quantity > 1 {
		draw = fmt.Sprintf("%d × %s", l.Quantity, l.Draw)
	}
	name := b.m.clean(l.Name)
	draw = b.m.clean(draw)
	one := []span{{s: name, face: bold, size: sizeName, c: colInk}, {s: " " + draw, face: regular, size: sizeText, c: colMuted}}
	if b.m.spansWidth(one) <= maxTextW {
		return []tline{{spans: one}}
	}
	var out []tline
	for _, s := range b.m.wrap(name, bold, sizeName, maxTextW) {
		out = append(out, tline{spans: []span{{s: s, face: bold, size: sizeName, c: colInk}}})
	}
	for _, s := range b.m.wrap(draw, regular, sizeText, maxTextW) {
		out = append(out, tline{spans: []span{{s: s, face: regular, size: sizeText, c: colMuted}}})
	}
	return out
}
