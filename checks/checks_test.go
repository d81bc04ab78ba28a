package checks

import (
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

func mustQ[T any](t *testing.T, s string, dim unit.Dim, wrap func(unit.Quantity) T) T {
	t.Helper()
	q, err := unit.ParseAs(s, dim)
	if err != nil {
		t.Fatal(err)
	}
	return wrap(q)
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
			d := &schema.Design{
				Vessel: schema.Vessel{System: tt.system},
				Bank:   schema.Bank{Series: tt.series, Parallel: 1, Battery: schema.Battery{Voltage: mustQ(t, tt.battery, unit.DimVoltage, volt)}},
			}
			var rep Report
			BankVoltage.Run(&Input{Design: d, Position: func(string) string { return "" }}, &rep)
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
