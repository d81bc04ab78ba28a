package result

import (
	"reflect"
	"testing"
)

func TestFleetLineOf(t *testing.T) {
	price := 10.0
	r := &Result{
		Design: Identity{Name: "Skua", Hull: "X-1", Revision: "abc", Dirty: true},
		Checks: []Finding{
			{ID: "wiring.voltageDrop", Subject: "a", Status: Fail},
			{ID: "wiring.voltageDrop", Subject: "b", Status: Fail},
			{ID: "voyage.floor", Subject: "voyage", Status: Fail},
			{ID: "bank.chargeRate", Subject: "bank", Status: Warn},
			{ID: "wiring.ampacity", Subject: "a", Status: Pass},
		},
		BOM: &BOM{Currency: "GBP", Total: 120.5, Complete: false, Lines: []BOMLine{
			{Part: "tern-agm105", Total: &price}, {Part: "ring-awg4"}, {Part: "tern-agm105"},
		}},
	}
	l := FleetLineOf("hulls/skua", r)
	if want := []string{"voyage.floor", "wiring.voltageDrop"}; !reflect.DeepEqual(l.Failing, want) {
		t.Errorf("failing %v, want %v (each ID once, sorted)", l.Failing, want)
	}
	if want := []string{"bank.chargeRate"}; !reflect.DeepEqual(l.Warning, want) {
		t.Errorf("warning %v, want %v", l.Warning, want)
	}
	if l.Fail != 3 || l.Warn != 1 {
		t.Errorf("counts fail %d warn %d, want 3 and 1", l.Fail, l.Warn)
	}
	if l.Cost != 120.5 || l.Currency != "GBP" || l.CostComplete {
		t.Errorf("cost %v %s complete %v, want 120.5 GBP incomplete", l.Cost, l.Currency, l.CostComplete)
	}
	if want := []string{"ring-awg4", "tern-agm105"}; !reflect.DeepEqual(l.Parts, want) {
		t.Errorf("parts %v, want %v", l.Parts, want)
	}
	if l.Revision != "abc" || !l.Dirty {
		t.Errorf("revision %q dirty %v, want abc and dirty", l.Revision, l.Dirty)
	}
}

func TestFleetMatch(t *testing.T) {
	l := FleetLine{Failing: []string{"wiring.voltageDrop"}, Warning: []string{"bank.chargeRate"}, Parts: []string{"gannet-100", "tern-agm105"}}
	tests := []struct {
		name string
		got  bool
		want bool
	}{
		{"an ID that fails", l.Fails("wiring.voltageDrop"), true},
		{"a glob of the area", l.Fails("wiring.*"), true},
		{"any", l.Fails("*"), true},
		{"an ID that only warns", l.Fails("bank.chargeRate"), false},
		{"an ID that warns", l.Warns("bank.chargeRate"), true},
		{"a part used", l.Uses("tern-agm105"), true},
		{"a glob of parts", l.Uses("tern-*"), true},
		{"a part not used", l.Uses("tern-agm150"), false},
		{"a prefix is not a match", l.Uses("tern"), false},
		{"nothing fails on a passing hull", FleetLine{}.Fails("*"), false},
	}
	for _, tc := range tests {
		t.Run(tc.name, func(t *testing.T) {
			if tc.got != tc.want {
				t.Errorf("got %v, want %v", tc.got, tc.want)
			}
		})
	}
}

func TestSortFleetBy(t *testing.T) {
	lines := func() []FleetLine {
		return []FleetLine{
			{Path: "a", Verdict: Pass, Cost: 500},
			{Path: "b", Verdict: Fail, Fail: 1, Cost: 900},
			{Path: "c", Problems: []Problem{{Message: "broken"}}},
			{Path: "d", Verdict: Warn, Warn: 2, Cost: 100},
			{Path: "e", Verdict: Fail, Fail: 3, Cost: 900},
		}
	}
	tests := []struct {
		by   string
		want []string
	}{
		{ByPath, []string{"a", "b", "c", "d", "e"}},
		{ByVerdict, []string{"c", "e", "b", "d", "a"}},
		{ByCost, []string{"b", "e", "a", "d", "c"}},
	}
	for _, tc := range tests {
		t.Run(tc.by, func(t *testing.T) {
			ls := lines()
			SortFleetBy(ls, tc.by)
			var got []string
			for _, l := range ls {
				got = append(got, l.Path)
			}
			if !reflect.DeepEqual(got, tc.want) {
				t.Errorf("got %v, want %v", got, tc.want)
			}
		})
	}
}
