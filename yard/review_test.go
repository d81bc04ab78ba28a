package yard

import (
	"fmt"
	"reflect"
	"strings"
	"testing"

	"github.com/ampwright/ampwright/result"
)

// smallCatalog is a catalog of two lithium batteries, written by hand
// (without the schema's #Catalog, so each part gives its id).
func smallCatalog(maxCharge string) string {
	return `package catalog

currency: "GBP"
battery: {
	"tern-li100": {id: "tern-li100", chemistry: "lifepo4", voltage: "12 V", capacity: "100 Ah", resistance: "4 mΩ", maxCharge: "` + maxCharge + `", maxDischarge: "100 A", price: 600}
	"tern-li200": {id: "tern-li200", chemistry: "lifepo4", voltage: "12 V", capacity: "200 Ah", resistance: "3 mΩ", maxCharge: "100 A", maxDischarge: "150 A", price: 1100}
}
`
}

// smallHull is a hull of one lamp that imports the catalog: a hull that
// compiles in milliseconds, so a test can build a yard of dozens. A hull
// with a shore charger draws 40 A of charge into its bank.
type smallHull struct {
	battery    string
	charger    bool
	lampPower  string
	feedLength string
	fridge     bool
}

func (h smallHull) cue(i int) string {
	if h.lampPower == "" {
		h.lampPower = "10 W"
	}
	if h.feedLength == "" {
		h.feedLength = "2 m"
	}
	var b strings.Builder
	fmt.Fprintf(&b, `package h%[1]d

import "skua.example/yard/catalog"

vessel: {name: "Skua %[1]d", hull: "X-%[1]d", kind: "sloop", length: "9 m", system: "12 V"}
site: {latitude: 50, longitude: -4, months: ["Jun"], irradiation: {source: "test data", Jun: "5 kWh/m²/day"}, recordLow: "5 °C", designHigh: "30 °C"}
scenarios: anchor: {}
currency: catalog.currency
bank: battery: catalog.battery.%[2]q
loads: lamp: {circuit: "feed", power: %[3]q, hours: anchor: 4}
wiring: feed: {from: "bank", to: "lamp", length: %[4]q, size: "14 AWG", protection: {id: "f15", kind: "fuse", rating: "15 A", interrupting: "5000 A", voltage: "32 V", distance: "50 mm"}}
`, i, h.battery, h.lampPower, h.feedLength)
	if h.charger {
		b.WriteString(`chargers: shore: {kind: "shore", output: "40 A", hours: anchor: 2}
wiring: "shore-run": {from: "bank", to: "shore", length: "2 m", size: "6 AWG", protection: {id: "f60", kind: "fuse", rating: "60 A", interrupting: "5000 A", voltage: "32 V", distance: "50 mm"}}
`)
	}
	if h.fridge {
		b.WriteString(`loads: fridge: {circuit: "fridge-run", kind: "refrigeration", current: "4 A", duty: 0.4, hours: anchor: 24}
wiring: "fridge-run": {from: "bank", to: "fridge", length: "3 m", size: "12 AWG", protection: {id: "f10", kind: "fuse", rating: "10 A", interrupting: "5000 A", voltage: "32 V", distance: "50 mm"}}
`)
	}
	return b.String()
}

// smallYard writes a yard module of the hulls given into a temporary
// directory: hulls[i] is hulls/hN with N = i+1.
func smallYard(t *testing.T, maxCharge string, hulls []smallHull) string {
	t.Helper()
	dir := t.TempDir()
	write(t, dir, "cue.mod/module.cue", "module: \"skua.example/yard\"\nlanguage: version: \"v0.13.0\"\n")
	write(t, dir, "catalog/catalog.cue", smallCatalog(maxCharge))
	for i, h := range hulls {
		write(t, dir, fmt.Sprintf("hulls/h%d/hull.cue", i+1), h.cue(i+1))
	}
	return dir
}

// TestDiffSharedCatalogChange is the catalog change: a battery's
// maximum charge lowered from 50 to 30 A, in a yard of 80 hulls of which
// 72 use the battery and 3 of those charge it at 40 A. The change is one
// shared change reaching 72 hulls, 3 regressing; the other 69 are changed
// without effect, and no hull has an entry of its own.
func TestDiffSharedCatalogChange(t *testing.T) {
	hulls := make([]smallHull, 80)
	for i := range hulls {
		hulls[i].battery = "tern-li200"
		if i < 72 {
			hulls[i].battery = "tern-li100"
		}
		hulls[i].charger = i%24 == 5 // hulls 6, 30 and 54
	}
	base := smallYard(t, "50 A", hulls)
	head := smallYard(t, "30 A", hulls)
	yd, err := DiffYard(Side{Name: "a", Dir: base}, Side{Name: "b", Dir: head}, Options{})
	if err != nil {
		t.Fatal(err)
	}
	if len(yd.Shared) != 1 {
		t.Fatalf("shared changes %+v, want one", yd.Shared)
	}
	s := yd.Shared[0]
	wantChanges := []result.InputChange{{Path: "maxCharge", Old: `"50 A"`, New: `"30 A"`}}
	if s.Kind != result.SharedPart || s.Subject != "battery tern-li100" || s.Part != "tern-li100" || !reflect.DeepEqual(s.Changes, wantChanges) {
		t.Errorf("shared change %s %q part %q %+v, want part battery tern-li100 maxCharge 50 A → 30 A", s.Kind, s.Subject, s.Part, s.Changes)
	}
	if want := []string{"hulls/h30", "hulls/h54", "hulls/h6"}; len(s.Hulls) != 72 || !reflect.DeepEqual(s.Regressed, want) {
		t.Errorf("reaches %d hulls, regressed %v; want 72 and %v", len(s.Hulls), s.Regressed, want)
	}
	var effect []string
	for _, h := range yd.Hulls {
		if len(h.Entries) > 0 {
			t.Errorf("%s: entries %+v, want none (the hull's files did not change)", h.Path, h.Entries)
		}
		if h.HasEffect() {
			effect = append(effect, h.Path)
		}
	}
	if want := []string{"hulls/h30", "hulls/h54", "hulls/h6"}; !reflect.DeepEqual(effect, want) {
		t.Errorf("hulls with an effect %v, want %v", effect, want)
	}
	if yd.Counts.Changed != 72 || yd.Counts.Unchanged != 8 || yd.Counts.Regressions != 3 {
		t.Errorf("counts %+v, want 72 changed, 8 unchanged, 3 regressions", yd.Counts)
	}
}

// TestDiffOwnChanges: changes written in a hull's own files are its
// entries, one a load or run or part swapped, and a margin that shrank
// past the rulebook's review threshold is flagged without being a
// regression.
func TestDiffOwnChanges(t *testing.T) {
	before := []smallHull{{battery: "tern-li100"}, {battery: "tern-li100"}, {battery: "tern-li100"}, {battery: "tern-li100"}}
	after := append([]smallHull(nil), before...)
	after[0].fridge = true                                   // a load and its run added
	after[1].battery = "tern-li200"                          // a part swapped
	after[2].lampPower, after[2].feedLength = "30 W", "20 m" // a run's drop from 0.24 % to 7.2 % of a 10 % limit
	yd, err := DiffYard(Side{Name: "a", Dir: smallYard(t, "50 A", before)}, Side{Name: "b", Dir: smallYard(t, "50 A", after)}, Options{})
	if err != nil {
		t.Fatal(err)
	}
	byPath := map[string]result.HullDelta{}
	for _, h := range yd.Hulls {
		byPath[h.Path] = h
	}
	entries := func(h result.HullDelta) []string {
		var out []string
		for _, e := range h.Entries {
			out = append(out, e.Change+" "+e.Entry)
		}
		return out
	}
	tests := []struct {
		hull    string
		entries []string
		margins int
	}{
		{"hulls/h1", []string{"added loads.fridge", `added wiring."fridge-run"`}, 0},
		// The larger bank raises the fault current at the lamp's fuse from
		// 3210 to 4280 A, against its 5000 A interrupting rating.
		{"hulls/h2", []string{"changed bank"}, 1},
		// The lamp's own run is its whole way from the bank: its drop and
		// its total drop shrink alike.
		{"hulls/h3", []string{"changed loads.lamp", "changed wiring.feed"}, 2},
		{"hulls/h4", nil, 0},
	}
	for _, tc := range tests {
		t.Run(tc.hull, func(t *testing.T) {
			h := byPath[tc.hull]
			if got := entries(h); !reflect.DeepEqual(got, tc.entries) {
				t.Errorf("entries %v, want %v", got, tc.entries)
			}
			if len(h.Margins) != tc.margins {
				t.Errorf("margins %+v, want %d", h.Margins, tc.margins)
			}
		})
	}
	if bank := byPath["hulls/h2"].Entries; len(bank) == 1 && bank[0].Inputs[0].Path != "battery.id" {
		t.Errorf("the swapped bank's first input is %q, want battery.id", bank[0].Inputs[0].Path)
	}
	if len(yd.Shared) != 0 {
		t.Errorf("shared changes %+v, want none: every change is the hulls' own", yd.Shared)
	}
	if m := byPath["hulls/h3"].Margins; len(m) == 2 && (m[0].ID != "wiring.totalDrop" || m[1].ID != "wiring.voltageDrop" || m[1].Status != result.Pass) {
		t.Errorf("margins %+v, want passing wiring.totalDrop and wiring.voltageDrop", m)
	}
	if yd.Counts.Margins != 3 || yd.Counts.Regressions != 0 {
		t.Errorf("counts %+v, want 3 margins and no regression", yd.Counts)
	}
}
