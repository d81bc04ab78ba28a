package compiler

import (
	"fmt"
	"math"
	"sort"
	"strings"

	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// The categories of the bill of materials, in the order it lists them.
var bomCategories = []string{
	"solar modules", "batteries", "charge controllers", "inverters",
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
func billOfMaterials(d *Design) *result.BOM {
	s := d.Spec
	b := &bomBuilder{lines: map[string]*result.BOMLine{}, uses: map[string][]string{}}
	for _, n := range schema.Names(s.Arrays) {
		a := s.Arrays[n]
		b.add("solar modules", a.Module.Part, partText(a.Module.Part, a.Module.Pmax.Text+" module"), float64(a.Series*a.Strings), n)
		if f := a.StringFuse; f != nil {
			b.add("protection", f.Part, partText(f.Part, f.Rating.Text+" string "+f.Kind), float64(a.Strings), n+" strings")
		}
	}
	bt := s.Bank.Battery
	b.add("batteries", bt.Part, partText(bt.Part, fmt.Sprintf("%s %s %s battery", bt.Voltage.Text, bt.Capacity.Text, bt.Chemistry)), float64(s.Bank.Series*s.Bank.Parallel), "bank")
	for _, n := range schema.Names(s.Controllers) {
		c := s.Controllers[n].Part
		b.add("charge controllers", c.Part, partText(c.Part, fmt.Sprintf("%s controller, %s", strings.ToUpper(c.Kind), c.Output.Text)), 1, n)
	}
	for _, n := range schema.Names(s.Inverters) {
		p := s.Inverters[n].Part
		b.add("inverters", p.Part, partText(p.Part, p.Continuous.Text+" inverter"), 1, n)
	}
	for _, n := range schema.Names(s.Buses) {
		if p := s.Buses[n].Part; p != nil {
			b.add("busbars and panels", p.Part, partText(p.Part, s.Buses[n].Kind), 1, n)
		}
	}
	slack := 0.0
	slackSource := ""
	if r := d.Rules.BOM; r != nil {
		slack, slackSource = r.Slack, r.Source
	}
	cables := map[string]*result.BOMLine{}
	cableParts := map[string]*schema.Cable{}
	for _, n := range schema.Names(s.Wiring) {
		c := s.Wiring[n]
		if p := c.Protection; p != nil {
			b.add("protection", p.Part, partText(p.Part, fmt.Sprintf("%s %s", p.Rating.Text, p.Kind)), 1, n)
			if h := p.Holder; h != nil {
				b.add("fuse holders", *h, partText(*h, "fuse holder"), 1, n)
			}
		}
		one := c.Length.Metres() * (1 + slack)
		conductors := []*schema.Cable{c.Cable, c.Cable}
		if c.Cable != nil && c.Cable.ReturnCable != nil {
			conductors[1] = c.Cable.ReturnCable
		}
		for _, cab := range conductors {
			var l *result.BOMLine
			if cab == nil {
				key := "unlisted " + c.Size.Text
				l = b.add("cable", schema.Part{ID: key}, fmt.Sprintf("%s cable, %s insulation (not from the catalog)", c.Size.Text, c.Insulation.Text), 0, n)
				l.Unit = "m"
			} else {
				l = b.add("cable", cab.Part, partText(cab.Part, fmt.Sprintf("%s %s cable, %s", cab.Size.Text, cab.Colour, cab.Insulation.Text)), 0, n)
				cableParts[cab.ID] = cab
			}
			l.Length += one
			cables[l.Part] = l
		}
		for _, cab := range conductors {
			if cab != nil && cab.Terminal != nil {
				t := cab.Terminal
				b.add("terminals", t.Part, partText(t.Part, fmt.Sprintf("ring terminal, %s, %s stud", t.Size.Text, orText(t.Stud, "any"))), 2, n)
			} else {
				b.add("terminals", schema.Part{ID: "ring " + c.Size.Text}, fmt.Sprintf("ring terminal, %s (not from the catalog)", c.Size.Text), 2, n)
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
