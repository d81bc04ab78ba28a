package compiler

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
	"github.com/ampwright/ampwright/schema/unit"
)

// The categories of the bill of materials, in the order it lists them.
var bomCategories = []string{
	"solar modules", "batteries", "charge controllers", "inverters",
	"chargers", "links", "converters", "shunts",
	"protection", "fuse holders", "busbars and panels", "cable", "terminals",
}

// bomBuilder collects the parts of a design by catalog id.
type bomBuilder struct {
	lines map[string]*result.BOMLine // by category and part
	uses  map[string][]string
}

func (b *bomBuilder) add(category string, p schema.Part, description string, qty float64, use string) *result.BOMLine {
	key := category + "\x00" + p.ID
	l := b.lines[key]
	if l == nil {
		l = &result.BOMLine{Category: category, Part: p.ID, Description: description, Unit: "each"}
		if p.Price != nil {
			l.UnitPrice = ptr(*p.Price)
		}
		b.lines[key] = l
	}
	l.Quantity += qty
	b.uses[key] = append(b.uses[key], use)
	return l
}

// billOfMaterials lists every catalog part the design uses, by quantity:
// modules, batteries, controllers, inverters, protection devices and their
// holders, busbars and panels, cable by catalog cable (both conductors of
// each run plus the rulebook's slack, rounded up to the sale unit), and
// crimp terminals (four a run). A line without a price leaves the total
// incomplete rather than wrong.
func billOfMaterials(d *Design, sys *model.System) *result.BOM {
	s := d.Spec
	b := &bomBuilder{lines: map[string]*result.BOMLine{}, uses: map[string][]string{}}
	for _, a := range sys.Arrays {
		n, spec := a.Name, a.Spec
		b.add("solar modules", spec.Module.Part, partText(spec.Module.Part, spec.Module.Pmax.Text+" module"), float64(spec.Series*spec.Strings), n)
		if f := spec.StringFuse; f != nil {
			b.add("protection", f.Part, partText(f.Part, f.Rating.Text+" string "+f.Kind), float64(spec.Strings), n+" strings")
		}
	}
	for _, bk := range sys.Banks {
		bt := bk.Spec.Battery
		b.add("batteries", bt.Part, partText(bt.Part, fmt.Sprintf("%s %s %s battery", bt.Voltage.Text, bt.Capacity.Text, bt.Chemistry)), float64(bk.Spec.Series*bk.Spec.Parallel), bk.Name)
	}
	for _, c := range sys.Controllers {
		p := c.Spec.Part
		b.add("charge controllers", p.Part, partText(p.Part, fmt.Sprintf("%s controller, %s", strings.ToUpper(p.Kind), p.Output.Text)), 1, c.Name)
	}
	for _, inv := range sys.Inverters {
		p := inv.Spec.Part
		b.add("inverters", p.Part, partText(p.Part, p.Continuous.Text+" inverter"), 1, inv.Name)
	}
	for _, src := range sys.Sources {
		if src.Charger != nil && src.Charger.Part != nil {
			p := src.Charger.Part
			b.add("chargers", p.Part, partText(p.Part, fmt.Sprintf("%s %s", p.Output.Text, p.Kind)), 1, src.Name)
		}
	}
	for _, l := range sys.Links {
		p := l.Spec.Part
		b.add("links", p.Part, partText(p.Part, fmt.Sprintf("%s %s", p.Rating.Text, p.Kind)), 1, l.Name)
	}
	for _, c := range sys.Converters {
		p := c.Spec.Part
		b.add("converters", p.Part, partText(p.Part, fmt.Sprintf("%s converter, %s", p.Output, p.Rating.Text)), 1, c.Name)
	}
	for _, sh := range sys.Shunts {
		p := sh.Spec.Part
		b.add("shunts", p.Part, partText(p.Part, p.Rating.Text+" shunt"), 1, sh.Name)
	}
	for _, bus := range sys.Buses {
		if p := bus.Spec.Part; p != nil {
			b.add("busbars and panels", p.Part, partText(p.Part, bus.Spec.Kind), 1, bus.Name)
		}
	}
	for _, nb := range sys.NegativeBuses {
		if p := nb.Spec.Part; p != nil {
			b.add("busbars and panels", p.Part, partText(p.Part, "negative bus"), 1, nb.Name)
		}
	}
	slack := 0.0
	slackSource := ""
	if r := d.Rules.BOM; r != nil {
		slack, slackSource = r.Slack, r.Source
	}
	cables := map[string]*result.BOMLine{}
	cableParts := map[string]*schema.Cable{}
	// A run's conductors: the run and its own return, of the run's cable
	// (its return cable where the catalog gives one) when of the run's size,
	// else a cable of the return's size; a negative conductor alone.
	type conductor struct {
		cab    *schema.Cable
		size   unit.Size
		length float64
	}
	for _, run := range append(sys.Runs[:len(sys.Runs):len(sys.Runs)], sys.Returns...) {
		n, c := run.Name, run.Spec
		if p := c.Protection; p != nil {
			b.add("protection", p.Part, partText(p.Part, fmt.Sprintf("%s %s", p.Rating.Text, p.Kind)), 1, n)
			if h := p.Holder; h != nil {
				b.add("fuse holders", *h, partText(*h, "fuse holder"), 1, n)
			}
		}
		conductors := []conductor{{c.Cable, c.Size, c.Length.Metres()}}
		if run.Role != model.Return && run.Ret.Own {
			ret := conductor{c.Cable, run.Ret.Size, run.Ret.Length}
			if c.Cable != nil && c.Cable.ReturnCable != nil {
				ret.cab = c.Cable.ReturnCable
			}
			if !sameSize(ret.size, c.Size) {
				ret.cab = nil
			}
			conductors = append(conductors, ret)
		}
		for _, cd := range conductors {
			var l *result.BOMLine
			if cd.cab == nil {
				key := "unlisted " + cd.size.Text
				l = b.add("cable", schema.Part{ID: key}, fmt.Sprintf("%s cable, %s insulation (not from the catalog)", cd.size.Text, c.Insulation.Text), 0, n)
				l.Unit = "m"
			} else {
				l = b.add("cable", cd.cab.Part, partText(cd.cab.Part, fmt.Sprintf("%s %s cable, %s", cd.cab.Size.Text, cd.cab.Colour, cd.cab.Insulation.Text)), 0, n)
				cableParts[cd.cab.ID] = cd.cab
			}
			l.Length += cd.length * (1 + slack)
			cables[l.Part] = l
		}
		for _, cd := range conductors {
			if cd.cab != nil && cd.cab.Terminal != nil {
				t := cd.cab.Terminal
				b.add("terminals", t.Part, partText(t.Part, fmt.Sprintf("ring terminal, %s, %s stud", t.Size.Text, orText(t.Stud, "any"))), 2, n)
			} else {
				b.add("terminals", schema.Part{ID: "ring " + cd.size.Text}, fmt.Sprintf("ring terminal, %s (not from the catalog)", cd.size.Text), 2, n)
			}
		}
	}
	// Cable is bought in whole sale units.
	for id, l := range cables {
		l.Length = math.Round(l.Length*1000) / 1000
		cab := cableParts[id]
		if cab == nil {
			l.Quantity = math.Ceil(l.Length*10) / 10
			continue
		}
		unitLen := cab.SaleUnit.Metres()
		l.Quantity = math.Ceil(l.Length/unitLen - 1e-9)
		l.Unit = cab.SaleUnit.Text
	}
	out := &result.BOM{Currency: s.Currency, Complete: true, Slack: slack, SlackSource: slackSource, Lines: []result.BOMLine{}}
	order := map[string]int{}
	for i, c := range bomCategories {
		order[c] = i
	}
	for key, l := range b.lines {
		uses := b.uses[key]
		sort.Strings(uses)
		l.For = strings.Join(dedupe(uses), ", ")
		if l.UnitPrice != nil {
			t := math.Round(*l.UnitPrice*l.Quantity*100) / 100
			l.Total = &t
			out.Total += t
		} else {
			out.Complete = false
		}
		out.Lines = append(out.Lines, *l)
	}
	out.Total = math.Round(out.Total*100) / 100
	sort.Slice(out.Lines, func(i, j int) bool {
		a, b := out.Lines[i], out.Lines[j]
		if order[a.Category] != order[b.Category] {
			return order[a.Category] < order[b.Category]
		}
		return a.Part < b.Part
	})
	return out
}

// sameSize reports whether two conductor sizes are the same.
func sameSize(a, b unit.Size) bool {
	return math.Abs(a.MM2()-b.MM2()) <= 1e-9*math.Max(1, b.MM2())
}

func partText(p schema.Part, fallback string) string {
	var parts []string
	if p.Maker != "" {
		parts = append(parts, p.Maker)
	}
	if p.Model != "" {
		parts = append(parts, p.Model)
	}
	if p.Description != "" {
		parts = append(parts, p.Description)
	} else {
		parts = append(parts, fallback)
	}
	return strings.Join(parts, " ")
}

func orText(s, alt string) string {
	if s == "" {
		return alt
	}
	return s
}

func dedupe(s []string) []string {
	out := s[:0]
	for i, x := range s {
		if i == 0 || x != s[i-1] {
			out = append(out, x)
		}
	}
	return out
}

func ptr[T any](v T) *T { return &v }
