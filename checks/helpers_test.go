package checks

import (
	"fmt"
	"sync"
	"testing"

	"cuelang.org/go/cue/cuecontext"

	"github.com/ampwright/ampwright/energy"
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/schema"
	"github.com/ampwright/ampwright/schema/unit"
)

var defaultRulebookOnce = sync.OnceValues(func() (schema.Rulebook, error) {
	var r schema.Rulebook
	v, err := schema.Build(cuecontext.New())
	if err != nil {
		return r, err
	}
	err = v.LookupPath(schema.DefaultPath).Decode(&r)
	return r, err
})

// defaultRulebook is ampwright's built-in rulebook, decoded from the schema.
func defaultRulebook(t *testing.T) schema.Rulebook {
	t.Helper()
	r, err := defaultRulebookOnce()
	if err != nil {
		t.Fatalf("default rulebook: %v", err)
	}
	return r
}

func mustQ[T any](t *testing.T, s string, dim unit.Dim, wrap func(unit.Quantity) T) T {
	t.Helper()
	q, err := unit.ParseAs(s, dim)
	if err != nil {
		t.Fatal(err)
	}
	return wrap(q)
}

func q(t testing.TB, s string, d unit.Dim) unit.Quantity {
	t.Helper()
	v, err := unit.ParseAs(s, d)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

func ptr[T any](v T) *T { return &v }

func sizeOf(t *testing.T, s string) unit.Size {
	t.Helper()
	return mustQ(t, s, unit.DimSize, func(q unit.Quantity) unit.Size { return unit.Size{Quantity: q} })
}

func lengthOf(t *testing.T, s string) unit.Length {
	t.Helper()
	return mustQ(t, s, unit.DimLength, func(q unit.Quantity) unit.Length { return unit.Length{Quantity: q} })
}

func tempOf(t *testing.T, s string) unit.Temperature {
	t.Helper()
	return mustQ(t, s, unit.DimTemperature, func(q unit.Quantity) unit.Temperature { return unit.Temperature{Quantity: q} })
}

func currentOf(t *testing.T, s string) unit.Current {
	t.Helper()
	return mustQ(t, s, unit.DimCurrent, func(q unit.Quantity) unit.Current { return unit.Current{Quantity: q} })
}

func voltageOf(t *testing.T, s string) unit.Voltage {
	t.Helper()
	return mustQ(t, s, unit.DimVoltage, func(q unit.Quantity) unit.Voltage { return unit.Voltage{Quantity: q} })
}

// relDev is (got − want)/want.
func relDev(got, want float64) float64 { return (got - want) / want }

// testDesign is a design with a vessel on the given system, a site with a
// 50 °C engine space and one scenario, and no parts: tests add the bank,
// loads and wiring they need.
func testDesign(t *testing.T, system string) *schema.Design {
	return &schema.Design{
		Vessel:    schema.Vessel{System: system, Units: "metric"},
		Site:      schema.Site{EngineSpace: tempOf(t, "50 °C"), RecordLow: tempOf(t, "0 °C"), DesignHigh: tempOf(t, "30 °C")},
		Scenarios: map[string]schema.Scenario{"s": {Hours: 24}},
		Loads:     map[string]schema.Load{},
		Wiring:    map[string]schema.Conductor{},
	}
}

// leadBank is a bank of parallel batteries of one chemistry whose voltage
// is the system's.
func leadBank(t *testing.T, chemistry, volts, ah string, series, parallel int) *schema.Bank {
	return &schema.Bank{
		Series: series, Parallel: parallel, EndOfLife: 1, Role: "house",
		Temperature: tempOf(t, "25 °C"),
		Battery: schema.Battery{
			Chemistry:  chemistry,
			Voltage:    voltageOf(t, volts),
			Capacity:   mustQ(t, ah, unit.DimCharge, func(q unit.Quantity) unit.Charge { return unit.Charge{Quantity: q} }),
			Resistance: mustQ(t, "5 mΩ", unit.DimResistance, func(q unit.Quantity) unit.Resistance { return unit.Resistance{Quantity: q} }),
			RatedHours: 20,
		},
	}
}

// conductor is a run of tinned 105 °C cable.
func conductor(t *testing.T, from, to, size, length string) schema.Conductor {
	return schema.Conductor{From: from, To: to, Size: sizeOf(t, size), Length: lengthOf(t, length), Material: "tinned-copper", Insulation: tempOf(t, "105 °C"), Bundle: 1}
}

// build makes the system model of d under the default rulebook and the
// Input of the checks over it.
func build(t *testing.T, d *schema.Design) *Input {
	t.Helper()
	sys, issues := model.Build(d, defaultRulebook(t))
	if issues != nil {
		t.Fatalf("model: %v", issues)
	}
	return NewInput(sys, energy.Analyze(sys), nil)
}

// runSpec is one hand-made run for the wiring checks.
type runSpec struct {
	size, length string
	material     string // "copper" or "tinned-copper"
	insulation   string // "" for 105 °C
	engineSpace  bool
	bundle       int // 0 for 1
	current      float64
	volts        float64 // nominal system voltage: 12, 24 or 48
	class        string
}

// oneRun builds the Input of a design whose wiring is the one run "run"
// from the bank to a load drawing the given current, with the default
// rulebook, a 50 °C engine space and metric output.
func oneRun(t *testing.T, s runSpec) (*Input, *model.Run) {
	t.Helper()
	ins := s.insulation
	if ins == "" {
		ins = "105 °C"
	}
	b := s.bundle
	if b == 0 {
		b = 1
	}
	system := fmt.Sprintf("%g V", s.volts)
	d := testDesign(t, system)
	d.Bank = leadBank(t, "agm", system, "100 Ah", 1, 1)
	d.Loads["load"] = schema.Load{Circuit: "run", Kind: "general", Current: ptr(currentOf(t, fmt.Sprintf("%g A", s.current))), Duty: 1, Quantity: 1}
	d.Wiring["run"] = schema.Conductor{
		From: "bank", To: "load", Length: lengthOf(t, s.length), Size: sizeOf(t, s.size),
		Material: s.material, Insulation: tempOf(t, ins), EngineSpace: s.engineSpace, Bundle: b, Class: s.class,
	}
	in := build(t, d)
	return in, in.Sys.Run("run")
}

// usable is the bank model of the design's primary bank.
func usable(t *testing.T, in *Input) energy.BankModel {
	t.Helper()
	return energy.Bank(in.Sys.Primary(), in.Rules)
}
