package model

import (
	"strings"
	"testing"

	"github.com/ampwright/ampwright/schema"
	"github.com/ampwright/ampwright/schema/unit"
)

func qty[T any](t *testing.T, s string, dim unit.Dim, wrap func(unit.Quantity) T) T {
	t.Helper()
	q, err := unit.ParseAs(s, dim)
	if err != nil {
		t.Fatal(err)
	}
	return wrap(q)
}

func amp(t *testing.T, s string) *unit.Current {
	c := qty(t, s, unit.DimCurrent, func(q unit.Quantity) unit.Current { return unit.Current{Quantity: q} })
	return &c
}

func volt(t *testing.T, s string) unit.Voltage {
	return qty(t, s, unit.DimVoltage, func(q unit.Quantity) unit.Voltage { return unit.Voltage{Quantity: q} })
}

func run(t *testing.T, from, to string) schema.Conductor {
	return schema.Conductor{
		From: from, To: to, Bundle: 1, Material: "tinned-copper",
		Size:       qty(t, "6 AWG", unit.DimSize, func(q unit.Quantity) unit.Size { return unit.Size{Quantity: q} }),
		Length:     qty(t, "2 m", unit.DimLength, func(q unit.Quantity) unit.Length { return unit.Length{Quantity: q} }),
		Insulation: qty(t, "105 °C", unit.DimTemperature, func(q unit.Quantity) unit.Temperature { return unit.Temperature{Quantity: q} }),
	}
}

func bank(t *testing.T, volts string, series int) schema.Bank {
	return schema.Bank{Series: series, Parallel: 1, Role: "house", EndOfLife: 1, Battery: schema.Battery{
		Chemistry: "agm", Voltage: volt(t, volts),
		Capacity: qty(t, "100 Ah", unit.DimCharge, func(q unit.Quantity) unit.Charge { return unit.Charge{Quantity: q} }),
	}}
}

func load(t *testing.T, circuit, current string) schema.Load {
	return schema.Load{Circuit: circuit, Kind: "general", Current: amp(t, current), Duty: 1, Quantity: 1}
}

// rules is the least of a rulebook Build and the conductor physics read.
var rules = schema.Rulebook{
	Resistance: &schema.ResistanceRule{
		Resistivity: 1 / 58.0, Alpha: 0.00393, LayFactor: 1, TinnedFactor: 1,
		Temperature: unit.Temperature{Quantity: unit.Quantity{Value: 30, Unit: "°C", Text: "30 °C"}},
	},
	VoltageDrop: &schema.VoltageDropRule{Critical: 3, Other: 10, Charging: "critical"},
	PV:          &schema.PVRule{ConductorFactor: 1.56, InputFactor: 1.25},
	Sources:     &schema.SourcesRule{AlternatorHotFactor: 0.75},
}

// twoBanks is a 12 V boat with a house and a start bank: an alternator
// on the start bank, a DC-DC charger from start to house, and one load on
// the house side.
func twoBanks(t *testing.T) *schema.Design {
	start := bank(t, "12 V", 1)
	start.Role = "start"
	return &schema.Design{
		Vessel:    schema.Vessel{System: "12 V"},
		Scenarios: map[string]schema.Scenario{"s": {Hours: 24, EngineHours: 2}},
		Banks:     map[string]schema.Bank{"house": bank(t, "12 V", 1), "start": start},
		Links: map[string]schema.Link{"dcdc": {From: "start", To: "house", Part: schema.LinkPart{
			Kind: "dc-dc", Rating: *amp(t, "30 A"), Efficiency: 0.92,
		}}},
		Chargers: map[string]schema.Charger{"alt": {Kind: "alternator", Part: &schema.ChargerPart{Kind: "alternator", Output: *amp(t, "80 A")}}},
		Loads:    map[string]schema.Load{"fridge": load(t, "house-fridge", "5 A")},
		Wiring: map[string]schema.Conductor{
			"house-fridge": run(t, "house", "fridge"),
			"house-dcdc":   run(t, "house", "dcdc"),
			"start-dcdc":   run(t, "start", "dcdc"),
			"start-alt":    run(t, "start", "alt"),
		},
	}
}

// TestTwoBanks: each bank is the root of its own side; a DC-DC charger is
// reached from both and draws its input current at its rated output.
func TestTwoBanks(t *testing.T) {
	sys, issues := Build(twoBanks(t), rules)
	if issues != nil {
		t.Fatal(issues)
	}
	if len(sys.Banks) != 2 || sys.Primary().Name != "house" {
		t.Fatalf("banks %d, primary %v; want 2 and house", len(sys.Banks), sys.Primary())
	}
	tests := []struct {
		run     string
		bank    string
		role    Role
		current float64
	}{
		{"house-fridge", "house", Supply, 5},
		// The DC-DC output charges the house bank at its rating.
		{"house-dcdc", "house", Charge, 30},
		// Its input: 30 A × 12 V ÷ (0.92 × 12 V) = 32.609 A (hand-worked).
		{"start-dcdc", "start", Supply, 30 / 0.92},
		// The alternator's rated 80 A hot: × the rulebook's 0.75 = 60 A.
		{"start-alt", "start", Charge, 60},
	}
	for _, tt := range tests {
		r := sys.Run(tt.run)
		if r.Bank.Name != tt.bank || r.Role != tt.role || !near(r.Current, tt.current) {
			t.Errorf("%s: bank %s, role %s, current %.4f; want %s, %s, %.4f (%s)", tt.run, r.Bank.Name, r.Role, r.Current, tt.bank, tt.role, tt.current, r.Basis)
		}
	}
	l := sys.Links[0]
	if l.FromRun != sys.Run("start-dcdc") || l.ToRun != sys.Run("house-dcdc") {
		t.Errorf("link runs %v and %v", l.FromRun.Name, l.ToRun.Name)
	}
	if got := sys.Bank("start").Sources; len(got) != 1 || got[0].Name != "alt" {
		t.Errorf("start bank's sources %v, want the alternator", got)
	}
	if got := sys.Bank("house").Loads; len(got) != 1 || got[0].Name != "fridge" {
		t.Errorf("house bank's loads %v, want the fridge", got)
	}
}

func near(a, b float64) bool { d := a - b; return d < 1e-9 && d > -1e-9 }

// TestWiringIssues: wirings no electrician would fit are refused with the
// run or part at fault named.
func TestWiringIssues(t *testing.T) {
	tests := []struct {
		name   string
		change func(*schema.Design)
		path   string
		msg    string
	}{
		{"banks joined without a link", func(d *schema.Design) {
			d.Wiring["house-start"] = run(t, "house", "start")
		}, `wiring."house-start"`, "banks are joined only through a link"},
		{"link reached twice from one bank", func(d *schema.Design) {
			d.Wiring["house-dcdc-2"] = run(t, "house", "dcdc")
		}, `wiring."house-dcdc-2"`, `reached twice from bank "house"`},
		{"run fed from a load", func(d *schema.Design) {
			d.Loads["lamp"] = load(t, "fridge-lamp", "1 A")
			d.Wiring["fridge-lamp"] = run(t, "fridge", "lamp")
		}, `wiring."fridge-lamp"`, "continues from load"},
		{"link wired on one side", func(d *schema.Design) {
			delete(d.Wiring, "house-dcdc")
		}, "links.dcdc", `not wired to bank "house"`},
		{"converter feeding nothing", func(d *schema.Design) {
			d.Converters = map[string]schema.Converter{"conv": {Part: schema.ConverterPart{Output: "12 V", Rating: *amp(t, "10 A"), Efficiency: 0.9}}}
			d.Wiring["house-conv"] = run(t, "house", "conv")
		}, "converters.conv", "feeds nothing"},
		{"return to a negative side not drawn", func(d *schema.Design) {
			c := d.Wiring["house-fridge"]
			c.Return = &schema.Return{To: "neg"}
			d.Wiring["house-fridge"] = c
		}, `wiring."house-fridge".return.to`, "draws no negative side"},
		{"link left open", func(d *schema.Design) {
			l := d.Links["dcdc"]
			l.Part, l.Kind = schema.LinkPart{}, "dc-dc"
			d.Links["dcdc"] = l
		}, "links.dcdc", "has no part"},
		{"link of another kind than asked", func(d *schema.Design) {
			l := d.Links["dcdc"]
			l.Kind = "combiner"
			d.Links["dcdc"] = l
		}, "links.dcdc.part", "is to be a combiner"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			d := twoBanks(t)
			tt.change(d)
			sys, issues := Build(d, rules)
			if sys != nil || len(issues) == 0 {
				t.Fatal("Build accepted the design")
			}
			var found bool
			for _, is := range issues {
				if strings.Contains(is.Msg, tt.msg) && (tt.path == "" || is.Path == tt.path) {
					found = true
				}
			}
			if !found {
				t.Errorf("issues %v; want one at %q saying %q", issues, tt.path, tt.msg)
			}
		})
	}
}

// negativeSide is a 24 V boat whose 12 V electronics hang beyond a
// converter, with its negative drawn: bank post → shunt → main negative
// bus → the nav station's negative bus.
func negativeSide(t *testing.T) *schema.Design {
	b := bank(t, "12 V", 2)
	return &schema.Design{
		Vessel:    schema.Vessel{System: "24 V"},
		Scenarios: map[string]schema.Scenario{"s": {Hours: 24}},
		Bank:      &b,
		Buses: map[string]schema.Bus{
			"panel": {Kind: "panel", Negative: "neg-main"},
			"nav":   {Kind: "fuse-block", Negative: "neg-nav"},
		},
		Converters:  map[string]schema.Converter{"conv": {Part: schema.ConverterPart{Output: "12 V", Rating: *amp(t, "20 A"), Efficiency: 0.9}}},
		Controllers: map[string]schema.Controller{"mppt": {Part: schema.ControllerPart{Kind: "mppt", Output: *amp(t, "30 A")}}},
		Loads: map[string]schema.Load{
			"fridge": load(t, "panel-fridge", "4 A"),
			"radio":  load(t, "nav-radio", "6 A"),
		},
		Wiring: map[string]schema.Conductor{
			"bank-panel":   run(t, "bank", "panel"),
			"bank-mppt":    withReturn(run(t, "bank", "mppt"), "neg-main"),
			"panel-fridge": run(t, "panel", "fridge"),
			"panel-conv":   run(t, "panel", "conv"),
			"conv-nav":     run(t, "conv", "nav"),
			"nav-radio":    run(t, "nav", "radio"),
		},
		Negative: &schema.Negative{
			Buses:  map[string]schema.NegativeBus{"neg-main": {}, "neg-nav": {}},
			Shunts: map[string]schema.Shunt{"shunt": {Part: schema.ShuntPart{Rating: *amp(t, "500 A")}}},
			Wiring: map[string]schema.Conductor{
				"bank-shunt": run(t, "bank", "shunt"),
				"shunt-main": run(t, "shunt", "neg-main"),
				"main-nav":   run(t, "neg-main", "neg-nav"),
			},
		},
	}
}

// TestNegativeSide: returns land where the design says, negative
// conductors carry the returns that pass them, and a converter's loads
// return to the converter, not to the bank (hand-worked).
func TestNegativeSide(t *testing.T) {
	d := negativeSide(t)
	sys, issues := Build(d, rules)
	if issues != nil {
		t.Fatal(issues)
	}
	// Converter input at its rating: 20 A × 12 V ÷ (0.9 × 24 V) = 11.111 A.
	if r := sys.Run("panel-conv"); !near(r.Current, 20*12/(0.9*24)) {
		t.Errorf("converter feeder %.4f A, want 11.111 A (%s)", r.Current, r.Basis)
	}
	if r := sys.Run("conv-nav"); r.Volts != 12 || r.DropVoltage != 12 {
		t.Errorf("beyond the converter: %g V side, drop against %g V; want 12 V", r.Volts, r.DropVoltage)
	}
	if r := sys.Run("bank-panel"); r.Ret.Own || r.Ret.Via != sys.Run("shunt-main") {
		t.Errorf("panel feeder's return: own %v via %v; want via shunt-main", r.Ret.Own, r.Ret.Via)
	}
	if r := sys.Run("nav-radio"); r.Ret.Lands == nil || r.Ret.Lands.Name != "neg-nav" {
		t.Errorf("radio's return lands on %v, want neg-nav", r.Ret.Lands)
	}
	tests := []struct {
		run     string
		current float64
	}{
		// The nav bar's return carries the 12 V radio's 6 A back to the
		// converter, which sits on neg-main.
		{"main-nav", 6},
		// Between neg-main and the bank: the loads' returns, fridge 4 A +
		// converter 11.111 A, against the controller's 30 A charge return:
		// the larger, 30 A.
		{"shunt-main", 30},
		{"bank-shunt", 30},
	}
	for _, tt := range tests {
		if r := sys.Run(tt.run); !near(r.Current, tt.current) {
			t.Errorf("%s: %.4f A, want %.4f A (%s)", tt.run, r.Current, tt.current, r.Basis)
		}
	}
	sh := sys.Shunts[0]
	for _, name := range []string{"panel-fridge", "bank-mppt", "panel-conv", "bank-panel"} {
		if !sys.PassesShunt(sys.Run(name), sh) {
			t.Errorf("%s's return does not pass the shunt", name)
		}
	}
	// A run from the bank's post returns to the post unless the design
	// lands it elsewhere, and so bypasses the shunt.
	c := d.Wiring["bank-mppt"]
	c.Return = nil
	d.Wiring["bank-mppt"] = c
	sys, issues = Build(d, rules)
	if issues != nil {
		t.Fatal(issues)
	}
	if sys.PassesShunt(sys.Run("bank-mppt"), sys.Shunts[0]) {
		t.Error("a return landed on the bank's post passes the shunt")
	}
	if r := sys.Run("shunt-main"); !near(r.Current, 4+20*12/(0.9*24)) {
		t.Errorf("shunt-main: %.4f A once the charge return bypasses it, want the loads' 15.111 A", r.Current)
	}
}

func withReturn(c schema.Conductor, to string) schema.Conductor {
	c.Return = &schema.Return{To: to}
	return c
}

// TestSwitchAheadOfPairedPanel: a battery switch between the bank and a
// panel with its own negative bus has no return beside it: the panel's
// circuits return over the negative side, and are counted once there.
func TestSwitchAheadOfPairedPanel(t *testing.T) {
	d := negativeSide(t)
	d.Buses["switch"] = schema.Bus{Kind: "switch"}
	delete(d.Wiring, "bank-panel")
	d.Wiring["bank-switch"] = run(t, "bank", "switch")
	d.Wiring["switch-panel"] = run(t, "switch", "panel")
	sys, issues := Build(d, rules)
	if issues != nil {
		t.Fatal(issues)
	}
	sw := sys.Run("bank-switch")
	if sw.Ret.Own || sw.Ret.Via != nil {
		t.Errorf("the switch's feeder has a return: %+v", sw.Ret)
	}
	if _, ok := sys.Landing(sw); ok {
		t.Error("the switch's feeder lands somewhere")
	}
	// Its drop is over the positive conductor alone.
	res := ConductorResistance(rules, sw.Spec, sw.Spec.Size, sys.Temperature(sw.Spec))
	if got, want := sys.RunDrop(sw, sw.Spec.Size).Volts, sw.DropCurrent*sw.Spec.Length.Metres()*res.RT; !near(got, want) {
		t.Errorf("drop %g V, want the positive conductor's %g V", got, want)
	}
	// The loads' 15.111 A against the 30 A charge return, as before.
	if r := sys.Run("shunt-main"); !near(r.Current, 30) {
		t.Errorf("shunt-main %g A, want 30 A (%s)", r.Current, r.Basis)
	}
	if r := sys.Run("shunt-main"); strings.Contains(r.Basis, "bank-switch") {
		t.Errorf("the switch's feeder counted among the returns: %s", r.Basis)
	}
}

// TestNegativeLoop: the negative side must be a tree.
func TestNegativeLoop(t *testing.T) {
	d := negativeSide(t)
	d.Negative.Wiring["bank-main"] = run(t, "bank", "neg-main")
	if _, issues := Build(d, rules); len(issues) == 0 || !strings.Contains(issues[0].Msg, "loop") {
		t.Errorf("issues %v, want a loop", issues)
	}
}
