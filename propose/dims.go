package propose

import (
	"fmt"
	"math"
	"sort"

	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/schema"
)

// dimKind is what a choice of the search is.
type dimKind int

const (
	dimBank dimKind = iota
	dimArray
	dimController
	dimLink
)

// dim is one choice the search makes: a bank's batteries, an array's
// modules on its place, a controller, an open link's part. Its options
// are sorted by cost, then by label, so that the search meets them in
// one order whatever the catalog's map order.
type dim struct {
	kind dimKind
	name string // the entry's name in the design
	path string // its CUE path: bank, banks.house, arrays.rails
	opts []option
	// designer is the index of the designer's own choice among opts, or -1.
	designer int
	// volts is a bank's nominal voltage, or a controller's side's.
	volts float64
}

// option is one way of making a choice.
type option struct {
	cost float64 // the parts' price; a part without one counts 0
	// inc is what the option adds to the completion's least cost beyond
	// its floor (a bank's fault current, see problem.increment).
	inc   float64
	label string
	// family and amount order options for the monotone premises: a bank
	// of one battery in one series string, more in parallel; an array of
	// one module in one series length, more strings.
	family string
	amount int

	battery  *schema.Battery
	series   int // batteries or modules in series
	parallel int // batteries in parallel, or strings
	module   *schema.Module
	ctrl     *schema.ControllerPart
	link     *schema.LinkPart
	priced   bool // every part has a price
}

// maxParallel and maxSeries are the schema's bounds on a bank's and an
// array's arrangement (#Bank, #Array).
const (
	maxBankSeries, maxBankParallel = 16, 16
	maxArraySeries, maxStrings     = 24, 24
)

// bankVoltageTolerance is how far a bank's nominal voltage may sit from its
// side's, as the bank.voltage check allows (common practice there); a
// wider arrangement is not offered at all.
const bankVoltageTolerance = 0.10

func price(p schema.Part) (float64, bool) {
	if p.Price == nil {
		return 0, false
	}
	return *p.Price, true
}

// bankDim lists every arrangement of every catalog battery that gives the
// bank's voltage: the series count is fixed by the voltage, parallel runs
// from 1 to the schema's bound.
func bankDim(b *model.Bank, cat *schema.Catalog) *dim {
	d := &dim{kind: dimBank, name: b.Name, path: b.Path, designer: -1, volts: b.Volts}
	for _, id := range schema.Names(cat.Battery) {
		bt := cat.Battery[id]
		v := bt.Voltage.Volts()
		for s := 1; s <= maxBankSeries; s++ {
			if math.Abs(float64(s)*v-b.Volts)/b.Volts > bankVoltageTolerance {
				continue
			}
			p0, ok := price(bt.Part)
			for p := 1; p <= maxBankParallel; p++ {
				btc := bt
				d.opts = append(d.opts, option{
					cost: p0 * float64(s*p), label: bankLabel(s, p, id), family: fmt.Sprintf("%s×%d", id, s), amount: p,
					battery: &btc, series: s, parallel: p, priced: ok,
				})
			}
		}
	}
	sortOptions(d.opts)
	for i, o := range d.opts {
		if o.battery.ID == b.Spec.Battery.ID && o.series == b.Spec.Series && o.parallel == b.Spec.Parallel {
			d.designer = i
		}
	}
	return d
}

func bankLabel(s, p int, id string) string { return fmt.Sprintf("%d × %d %s", s, p, id) }

// arrayDim lists every module of the catalog in every series × strings
// arrangement the array's place takes.
func arrayDim(a *model.Array, cat *schema.Catalog) (*dim, error) {
	pl := a.Spec.Place
	d := &dim{kind: dimArray, name: a.Name, path: a.Path, designer: -1}
	if (pl.Length == nil) != (pl.Width == nil) {
		return nil, &pathError{a.Path + ".place", "give both length and width, or neither"}
	}
	if pl.MaxModules == 0 && pl.Length == nil {
		return nil, &pathError{a.Path + ".place", "give maxModules, or the place's length and width, for the proposal to choose the array"}
	}
	for _, id := range schema.Names(cat.Module) {
		m := cat.Module[id]
		most := maxArraySeries * maxStrings
		if pl.MaxModules > 0 {
			most = min(most, pl.MaxModules)
		}
		if pl.Length != nil {
			most = min(most, Fit(pl.Length.Metres(), pl.Width.Metres(), m.LengthDim.Metres(), m.WidthDim.Metres()))
		}
		p0, ok := price(m.Part)
		for s := 1; s <= maxArraySeries; s++ {
			for n := 1; n <= maxStrings && s*n <= most; n++ {
				mc := m
				d.opts = append(d.opts, option{
					cost: p0 * float64(s*n), label: arrayLabel(s, n, id), family: fmt.Sprintf("%s×%d", id, s), amount: n,
					module: &mc, series: s, parallel: n, priced: ok,
				})
			}
		}
	}
	sortOptions(d.opts)
	for i, o := range d.opts {
		if o.module.ID == a.Spec.Module.ID && o.series == a.Spec.Series && o.parallel == a.Spec.Strings {
			d.designer = i
		}
	}
	return d, nil
}

func arrayLabel(s, n int, id string) string { return fmt.Sprintf("%d × %d %s", s, n, id) }

// Fit is how many modules of mL × mW fit on a place of pL × pW, in rows,
// all one way round: the better of the two ways.
func Fit(pL, pW, mL, mW float64) int {
	const eps = 1e-9 // a module exactly the place's size fits
	n1 := int(math.Floor(pL/mL+eps)) * int(math.Floor(pW/mW+eps))
	n2 := int(math.Floor(pL/mW+eps)) * int(math.Floor(pW/mL+eps))
	return max(n1, n2)
}

// controllerDim lists every catalog controller.
func controllerDim(c *model.Controller, cat *schema.Catalog) *dim {
	d := &dim{kind: dimController, name: c.Name, path: c.Path, designer: -1, volts: c.Node.Volts}
	for _, id := range schema.Names(cat.Controller) {
		p := cat.Controller[id]
		p0, ok := price(p.Part)
		d.opts = append(d.opts, option{cost: p0, label: id, family: id, ctrl: &p, priced: ok})
	}
	sortOptions(d.opts)
	for i, o := range d.opts {
		if o.ctrl.ID == c.Spec.Part.ID {
			d.designer = i
		}
	}
	return d
}

// linkDim lists the catalog's link parts of the kind an open link asks
// for (any kind when it names none).
func linkDim(l *model.Link, cat *schema.Catalog) *dim {
	d := &dim{kind: dimLink, name: l.Name, path: l.Path, designer: -1}
	for _, id := range schema.Names(cat.Link) {
		p := cat.Link[id]
		if l.Spec.Kind != "" && p.Kind != l.Spec.Kind {
			continue
		}
		p0, ok := price(p.Part)
		d.opts = append(d.opts, option{cost: p0, label: id, family: id, link: &p, priced: ok})
	}
	sortOptions(d.opts)
	return d
}

func sortOptions(opts []option) {
	sort.SliceStable(opts, func(i, j int) bool {
		a, b := opts[i], opts[j]
		if a.cost+a.inc != b.cost+b.inc {
			return a.cost+a.inc < b.cost+b.inc
		}
		if a.family != b.family {
			return a.family < b.family
		}
		if a.amount != b.amount {
			return a.amount < b.amount
		}
		return a.label < b.label
	})
}
