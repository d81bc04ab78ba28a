package checks

import (
	"fmt"
	"math"
	"testing"

	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
	"github.com/ampwright/ampwright/schema/unit"
)

func TestValidateAll(t *testing.T) {
	if err := Validate(All); err != nil {
		t.Fatal(err)
	}
	bad := []*Check{{ID: "Bad ID", Title: "x", Doc: "x", Run: BankVoltage.Run}}
	if Validate(bad) == nil {
		t.Error("Validate accepted a bad ID")
	}
	if Validate([]*Check{BankVoltage, BankVoltage}) == nil {
		t.Error("Validate accepted a duplicate")
	}
}

func TestBankVoltage(t *testing.T) {
	volt := func(q unit.Quantity) unit.Voltage { return unit.Voltage{Quantity: q} }
	tests := []struct {
		name    string
		system  string
		battery string
		series  int
		want    result.Status
	}{
		// A 12 V lead-acid block on a 12 V system (definition).
		{"lead-acid 12 V", "12 V", "12 V", 1, result.Pass},
		// A four-cell LiFePO4 battery is 12.8 V nominal (4 × 3.2 V, common
		// practice), 6.7 % above 12 V: inside the tolerance.
		{"LiFePO4 12.8 V on 12 V", "12 V", "12.8 V", 1, result.Pass},
		{"two in series for 24 V", "24 V", "12 V", 2, result.Pass},
		{"one 12 V block on 24 V", "24 V", "12 V", 1, result.Fail},
		{"6 V blocks, four for 24 V", "24 V", "6 V", 4, result.Pass},
		{"6 V blocks, three on 24 V", "24 V", "6 V", 3, result.Fail},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			d := testDesign(t, tt.system)
			d.Bank = leadBank(t, "agm", tt.battery, "100 Ah", tt.series, 1)
			d.Bank.Battery.Voltage = mustQ(t, tt.battery, unit.DimVoltage, volt)
			d.Loads["l"] = schema.Load{Circuit: "r", Kind: "general", Current: ptr(currentOf(t, "1 A")), Duty: 1, Quantity: 1}
			d.Wiring["r"] = conductor(t, "bank", "l", "10 AWG", "1 m")
			var rep Report
			BankVoltage.Run(build(t, d), &rep)
			fs := rep.Findings
			if len(fs) != 1 {
				t.Fatalf("got %d findings, want 1", len(fs))
			}
			if fs[0].Status != tt.want {
				t.Errorf("status = %s, want %s (%s)", fs[0].Status, tt.want, fs[0].Message)
			}
			if tt.want == result.Fail && fs[0].Change == "" {
				t.Error("a failing finding must say what to change")
			}
		})
	}
}

// TestColdVoc checks the NEC 690.7 coefficient method on the worked values
// of REFERENCES.md §7 (from memory; verify against the standard).
func TestColdVoc(t *testing.T) {
	tests := []struct {
		name                  string
		voc, beta, tmin       string
		series                int
		want                  float64
		tolerance, controller float64
	}{
		// Voc 45.0 V, −0.28 %/°C, 3 °C: factor 1.0616 (from memory).
		{"45 V at 3 °C", "45 V", "-0.28 %/°C", "3 °C", 1, 45 * 1.0616, 0.001, 600},
		// Voc 40 V, −0.30 %/°C, −10 °C: 44.2 V a module, 11 modules 486.2 V
		// (from memory).
		{"11 × 40 V at −10 °C", "40 V", "-0.30 %/°C", "-10 °C", 11, 486.2, 0.001, 600},
		// Same string on a 450 V controller: fails.
		{"11 × 40 V on a 450 V controller", "40 V", "-0.30 %/°C", "-10 °C", 11, 486.2, 0.001, 450},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			d := testDesign(t, "48 V")
			d.Site.RecordLow = tempOf(t, tt.tmin)
			d.Bank = leadBank(t, "agm", "48 V", "100 Ah", 1, 1)
			d.Arrays = map[string]schema.Array{"a": {
				Series: tt.series, Strings: 1, Controller: "c",
				Module: schema.Module{
					Voc:     voltageOf(t, tt.voc),
					BetaVoc: &unit.TempCoeff{Quantity: q(t, tt.beta, unit.DimTempCoeff)},
				},
			}}
			d.Controllers = map[string]schema.Controller{"c": {Part: schema.ControllerPart{
				Kind:         "mppt",
				MaxPVVoltage: voltageOf(t, fmt.Sprintf("%g V", tt.controller)),
				Output:       currentOf(t, "10 A"),
				Efficiency:   0.97,
			}}}
			d.Wiring["bank-c"] = conductor(t, "bank", "c", "10 AWG", "1 m")
			d.Wiring["a-c"] = conductor(t, "a", "c", "10 AWG", "1 m")
			var rep Report
			ColdVoc.Run(build(t, d), &rep)
			f := rep.Findings[0]
			if math.Abs(f.Value-tt.want) > tt.tolerance*tt.want {
				t.Errorf("Voc_max = %v V, want %v V", f.Value, tt.want)
			}
			wantStatus := result.Pass
			if tt.want > tt.controller {
				wantStatus = result.Fail
			}
			if f.Status != wantStatus {
				t.Errorf("status %s, want %s: %s", f.Status, wantStatus, f.Message)
			}
		})
	}
}

// TestChargeRateBounds: lead-acid bulk charge at roughly 10–30 % of
// capacity (common practice).
func TestChargeRateBounds(t *testing.T) {
	for _, tt := range []struct {
		output string
		want   result.Status
	}{
		{"5 A", result.Warn},  // 5 % of 100 Ah
		{"20 A", result.Pass}, // 20 %
		{"40 A", result.Fail}, // 40 %
	} {
		d := testDesign(t, "12 V")
		d.Bank = leadBank(t, "flooded", "12 V", "100 Ah", 1, 1)
		d.Controllers = map[string]schema.Controller{"c": {Part: schema.ControllerPart{Kind: "mppt", Output: currentOf(t, tt.output), Efficiency: 0.97}}}
		d.Wiring["bank-c"] = conductor(t, "bank", "c", "6 AWG", "1 m")
		var rep Report
		ChargeRate.Run(build(t, d), &rep)
		if got := rep.Findings[0].Status; got != tt.want {
			t.Errorf("%s into 100 Ah: %s, want %s (%s)", tt.output, got, tt.want, rep.Findings[0].Message)
		}
	}
}
