package energy

import (
	"math"
	"sync"
	"testing"
	"time"

	"cuelang.org/go/cue/cuecontext"
	"github.com/ampwright/ampwright/energy/solar"
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/schema"
	"github.com/ampwright/ampwright/schema/unit"
)

func q(t testing.TB, s string, d unit.Dim) unit.Quantity {
	t.Helper()
	v, err := unit.ParseAs(s, d)
	if err != nil {
		t.Fatal(err)
	}
	return v
}

func ptr[T any](v T) *T { return &v }

// bankOf is a bank of n parallel batteries with end of life 1, at
// 25 °C, for the trade-fact checks.
func bankOf(t testing.TB, chemistry, volts, ah string, parallel int, dod float64) *model.Bank {
	return &model.Bank{Name: "bank", Path: "bank", Role: "house", Volts: 12, System: "12 V", Spec: &schema.Bank{
		Series: 1, Parallel: parallel, EndOfLife: 1,
		Temperature:      unit.Temperature{Quantity: q(t, "25 °C", unit.DimTemperature)},
		DepthOfDischarge: ptr(dod),
		Battery: schema.Battery{
			Chemistry: chemistry,
			Voltage:   unit.Voltage{Quantity: q(t, volts, unit.DimVoltage)},
			Capacity:  unit.Charge{Quantity: q(t, ah, unit.DimCharge)},
		},
	}}
}

// TestBankTradeFacts checks the bank model against the trade's arithmetic
// (common practice check values, no source).
func TestBankTradeFacts(t *testing.T) {
	rules := defaultRulebook(t)
	tests := []struct {
		name        string
		chemistry   string
		volts, ah   string
		parallel    int
		dod         float64
		nominal     float64
		usable      float64
		description string
	}{
		// Common practice: 100 Ah × 12 V = 1200 Wh.
		{"one 100 Ah 12 V", "agm", "12 V", "100 Ah", 1, 0.5, 1200, 600, "1200 Wh nominal"},
		// Common practice: four 100 Ah 12 V lead-acid at 50 % give 2400 Wh.
		{"four lead-acid at 50 %", "flooded", "12 V", "100 Ah", 4, 0.5, 4800, 2400, "2400 Wh usable"},
		// Common practice: a 100 Ah 12 V lithium battery at 85 % gives 1020 Wh.
		{"one lithium at 85 %", "lifepo4", "12 V", "100 Ah", 1, 0.85, 1200, 1020, "1020 Wh usable"},
		// Common practice: four of them give 4080 Wh.
		{"four lithium at 85 %", "lifepo4", "12 V", "100 Ah", 4, 0.85, 4800, 4080, "4080 Wh usable"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			bm := Bank(bankOf(t, tt.chemistry, tt.volts, tt.ah, tt.parallel, tt.dod), rules)
			if math.Abs(bm.Nominal-tt.nominal) > 1e-9 {
				t.Errorf("nominal = %v Wh, want %v", bm.Nominal, tt.nominal)
			}
			if math.Abs(bm.Usable-tt.usable) > 1e-9 {
				t.Errorf("usable = %v Wh, want %v (%s)", bm.Usable, tt.usable, tt.description)
			}
		})
	}
}

// TestLeadAcidTemperature checks the IEEE 485 Table 1 factor is applied as
// available capacity = 1 / factor (from memory: 1.30 at 4.4 °C).
func TestLeadAcidTemperature(t *testing.T) {
	rules := defaultRulebook(t)
	b := bankOf(t, "agm", "12 V", "100 Ah", 1, 0.5)
	b.Spec.Temperature = unit.Temperature{Quantity: q(t, "40 °F", unit.DimTemperature)} // 4.4 °C
	bm := Bank(b, rules)
	if want := 1 / 1.30; math.Abs(bm.TempFactor-want) > 1e-9 {
		t.Errorf("F_temp at 40 °F = %v, want 1/1.30 = %v (IEEE 485 Table 1, from memory)", bm.TempFactor, want)
	}
	b.Spec.Temperature = unit.Temperature{Quantity: q(t, "35 °C", unit.DimTemperature)}
	if got := Bank(b, rules).TempFactor; got != 1 {
		t.Errorf("F_temp at 35 °C = %v, want 1 (extra capacity when warm is not credited)", got)
	}
}

// TestPeukert checks the normalised form t = H × (C / (I × H))^k for
// 100 Ah at the 20 h rate with k = 1.25 (REFERENCES.md §9, derived values),
// and that the naive form I^k × t = C is not what is computed.
func TestPeukert(t *testing.T) {
	tests := []struct {
		current, runtime, delivered float64
	}{
		{5, 20.0, 100}, // the 20 h rate current: exactly the rating
		{10, 8.409, 84.09},
		{20, 3.536, 70.71},
		{50, 1.125, 56.23},
	}
	for _, tt := range tests {
		got := PeukertRuntime(100, 20, 1.25, tt.current)
		if math.Abs(got-tt.runtime) > 5e-4*tt.runtime {
			t.Errorf("runtime at %g A = %.4f h, want %.4g h (derived)", tt.current, got, tt.runtime)
		}
		if c := PeukertCapacity(100, 20, 1.25, tt.current); math.Abs(c-tt.delivered) > 5e-4*tt.delivered {
			t.Errorf("capacity at %g A = %.3f Ah, want %.4g Ah (derived)", tt.current, c, tt.delivered)
		}
	}
	// The naive form would give 5 A for 14.5 h from 100 Ah at k = 1.2; the
	// normalised form gives the rating, 20 h, at the 20 h current.
	if got := PeukertRuntime(100, 20, 1.2, 5); math.Abs(got-20) > 1e-9 {
		t.Errorf("runtime at the rated current = %v h, want 20 h", got)
	}
	// A lighter load than the rating's is not credited with more capacity.
	if got := PeukertCapacity(100, 20, 1.25, 1); got != 100 {
		t.Errorf("capacity at 1 A = %v, want 100 (not above the rating)", got)
	}
}

// TestModuleTradeFacts: common practice check values.
func TestModuleTradeFacts(t *testing.T) {
	// STC is 1000 W/m² at 25 °C cell temperature.
	if STCIrradiance != 1000 || STCTemperature != 25 {
		t.Errorf("STC = %v W/m², %v °C; want 1000 W/m², 25 °C", STCIrradiance, STCTemperature)
	}
	// A 400 W module of 2 m² is 20 % efficient.
	m := schema.Module{
		Pmax:      unit.Power{Quantity: q(t, "400 W", unit.DimPower)},
		LengthDim: unit.Length{Quantity: q(t, "2 m", unit.DimLength)},
		WidthDim:  unit.Length{Quantity: q(t, "1 m", unit.DimLength)},
	}
	if got := ModuleEfficiency(m); math.Abs(got-0.20) > 1e-12 {
		t.Errorf("efficiency = %v, want 0.20", got)
	}
	// A −0.5 %/°C coefficient loses 0.5 % of output per °C above 25 °C.
	gamma := q(t, "-0.5 %/°C", unit.DimTempCoeff).Value
	for _, tc := range []float64{26, 35, 45} {
		want := 1 - 0.005*(tc-25)
		if got := TemperatureFactor(gamma, tc); math.Abs(got-want) > 1e-12 {
			t.Errorf("factor at %v °C = %v, want %v", tc, got, want)
		}
	}
}

// TestColdVocTable checks the table method where a module gives no βVoc:
// NEC Table 690.7(A), −6 to −10 °C → 1.14 (from memory).
func TestColdVocTable(t *testing.T) {
	rules := defaultRulebook(t)
	if got := RowFactor(rules.VocFactor.Rows, -7); got != 1.14 {
		t.Errorf("factor at −7 °C = %v, want 1.14 (NEC Table 690.7(A), from memory)", got)
	}
	if got := RowFactor(rules.VocFactor.Rows, 22); got != 1.02 {
		t.Errorf("factor at 22 °C = %v, want 1.02", got)
	}
	if got := RowFactor(rules.VocFactor.Rows, -45); got != 1.25 {
		t.Errorf("factor below the table = %v, want its last row, 1.25", got)
	}
}

// TestClearSkyBound keeps the fast bound within 1 % of the clear-sky day
// integrated over the full SPA position (both Haurwitz).
func TestClearSkyBound(t *testing.T) {
	for _, site := range []struct{ lat, lon float64 }{{50.2, -4.9}, {28.1, -15.4}, {56.4, -5.5}, {-33.9, 18.4}, {64, -22}} {
		for m := 0; m < 12; m++ {
			fast := ClearSkyBound(site.lat, site.lon, m)
			full := solar.ClearSkyDaily(site.lat, site.lon, 2025, time.Month(m+1), meanDay[m]) / 1000
			if math.Abs(fast-full) > 0.01*full+1e-6 {
				t.Errorf("lat %v month %d: fast %.4f, SPA %.4f kWh/m²/day", site.lat, m+1, fast, full)
			}
		}
	}
}

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
func defaultRulebook(t testing.TB) schema.Rulebook {
	t.Helper()
	r, err := defaultRulebookOnce()
	if err != nil {
		t.Fatalf("default rulebook: %v", err)
	}
	return r
}
