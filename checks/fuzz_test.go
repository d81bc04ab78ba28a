package checks

import (
	"encoding/json"
	"fmt"
	"testing"

	"github.com/ampwright/ampwright/energy"
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// FuzzSystem builds systems of random shape from the fuzzer's bytes:
// banks, links, buses, converters, chargers, loads and runs joined at
// random, with or without a negative side; the model must refuse what it
// cannot build with issues, and whatever it builds every check must run
// over without a panic.
func FuzzSystem(f *testing.F) {
	f.Add([]byte{1, 2, 3, 4, 5, 6, 7, 8, 9, 10, 11, 12})
	f.Add([]byte{0, 0, 0, 0})
	f.Add([]byte{3, 1, 4, 1, 5, 9, 2, 6, 5, 3, 5, 8, 9, 7, 9, 3, 2, 3, 8, 4, 6, 2, 6, 4})
	f.Add([]byte{2, 2, 2, 9, 9, 9, 0, 1, 0, 1, 7, 7, 7, 7, 200, 13, 42})
	rules := schema.Rulebook{}
	f.Fuzz(func(t *testing.T, b []byte) {
		if len(b) > 200 {
			return
		}
		if rules.VoltageDrop == nil {
			rules = defaultRulebook(t)
		}
		d := randomDesign(t, b)
		sys, issues := model.Build(d, rules)
		if sys == nil {
			if len(issues) == 0 {
				t.Fatal("no system and no issue")
			}
			return
		}
		in := NewInput(sys, energy.Analyze(sys), nil)
		findings, figures := RunAll(All, in)
		// No figure or finding may carry a value JSON cannot hold.
		if _, err := json.Marshal(struct {
			A []result.Finding
			B []result.Figure
		}{findings, figures}); err != nil {
			t.Fatalf("%v", err)
		}
	})
}

// randomDesign reads a design's shape from b.
func randomDesign(t *testing.T, b []byte) *schema.Design {
	i := 0
	next := func(n int) int {
		if i >= len(b) || n <= 0 {
			return 0
		}
		v := int(b[i]) % n
		i++
		return v
	}
	d := testDesign(t, []string{"12 V", "24 V", "48 V"}[next(3)])
	nb := 1 + next(3)
	var nodes []string
	var banks []string
	if nb == 1 && next(2) == 0 {
		d.Bank = leadBank(t, []string{"agm", "lifepo4"}[next(2)], d.Vessel.System, "100 Ah", 1, 1+next(3))
		banks = []string{"bank"}
	} else {
		d.Banks = map[string]schema.Bank{}
		for k := 0; k < nb; k++ {
			n := fmt.Sprintf("b%d", k)
			d.Banks[n] = *leadBank(t, []string{"agm", "lifepo4", "flooded"}[next(3)], d.Vessel.System, "100 Ah", 1, 1+next(2))
			banks = append(banks, n)
		}
	}
	nodes = append(nodes, banks...)
	d.Buses = map[string]schema.Bus{}
	for k := 0; k < next(4); k++ {
		n := fmt.Sprintf("bus%d", k)
		d.Buses[n] = schema.Bus{Kind: []string{"busbar", "panel", "switch"}[next(3)]}
		nodes = append(nodes, n)
	}
	if next(2) == 1 {
		d.Converters = map[string]schema.Converter{"conv": {Part: schema.ConverterPart{Output: "12 V", Rating: currentOf(t, "20 A"), Efficiency: 0.9}}}
		nodes = append(nodes, "conv")
	}
	if len(banks) > 1 {
		d.Links = map[string]schema.Link{"link": {From: banks[0], To: banks[1], Part: schema.LinkPart{Kind: []string{"dc-dc", "combiner", "isolator"}[next(3)], Rating: currentOf(t, "30 A"), Efficiency: 0.9}}}
		nodes = append(nodes, "link")
	}
	if next(2) == 1 {
		d.Chargers = map[string]schema.Charger{"alt": {Kind: "alternator", Output: ptr(currentOf(t, "50 A"))}}
		nodes = append(nodes, "alt")
	}
	for k := 0; k < 1+next(5); k++ {
		n := fmt.Sprintf("load%d", k)
		d.Loads[n] = schema.Load{Circuit: "r-" + n, Kind: "general", Current: ptr(currentOf(t, fmt.Sprintf("%d A", 1+next(20)))), Duty: 1, Quantity: 1, Hours: map[string]float64{"s": float64(next(24))}}
		nodes = append(nodes, n)
	}
	for k := 0; k < len(nodes)+next(3); k++ {
		from, to := nodes[next(len(nodes))], nodes[next(len(nodes))]
		if from == to {
			continue
		}
		name := fmt.Sprintf("w%d", k)
		if len(to) > 4 && to[:4] == "load" {
			name = "r-" + to
		}
		c := conductor(t, from, to, []string{"14 AWG", "6 AWG", "2/0 AWG"}[next(3)], "2 m")
		if next(2) == 1 {
			c.Protection = fuse(t, "f", "fuse", "30 A", "32 V")
		}
		d.Wiring[name] = c
	}
	if next(2) == 1 {
		neg := &schema.Negative{Buses: map[string]schema.NegativeBus{"neg": {}}, Shunts: map[string]schema.Shunt{"sh": {Part: schema.ShuntPart{Rating: currentOf(t, "500 A")}}}, Wiring: map[string]schema.Conductor{}}
		neg.Wiring["n0"] = conductor(t, banks[0], "sh", "2/0 AWG", "0.3 m")
		neg.Wiring["n1"] = conductor(t, "sh", "neg", "2/0 AWG", "0.3 m")
		d.Negative = neg
		for bn := range d.Buses {
			if next(2) == 1 {
				bus := d.Buses[bn]
				bus.Negative = "neg"
				d.Buses[bn] = bus
			}
		}
	}
	return d
}
