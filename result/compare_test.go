package result

import (
	"math"
	"testing"
)

func TestCompare(t *testing.T) {
	price := func(x float64) *float64 { return &x }
	old := &Result{
		Design:  Identity{Name: "A", Path: "hulls/a"},
		Figures: []Figure{{ID: "wiring.voltageDrop", Subject: "r1", Value: 2, Unit: "%"}, {ID: "gone", Subject: "x", Value: 1}},
		Checks: []Finding{
			{ID: "wiring.voltageDrop", Subject: "r1", Status: Pass},
			{ID: "bank.autonomy", Subject: "anchor", Status: Fail},
			{ID: "same", Subject: "s", Status: Warn},
		},
		BOM: &BOM{Complete: true, Total: 100, Lines: []BOMLine{{Category: "cable", Part: "c", Quantity: 2, Total: price(100)}}},
	}
	new := &Result{
		Design:  Identity{Name: "A", Path: "hulls/a"},
		Figures: []Figure{{ID: "wiring.voltageDrop", Subject: "r1", Value: 5, Unit: "%"}, {ID: "new", Subject: "y", Value: 3}},
		Checks: []Finding{
			{ID: "wiring.voltageDrop", Subject: "r1", Status: Fail},
			{ID: "bank.autonomy", Subject: "anchor", Status: Pass},
			{ID: "same", Subject: "s", Status: Warn},
			{ID: "added", Subject: "z", Status: Warn},
		},
		BOM: &BOM{Complete: true, Total: 150, Lines: []BOMLine{{Category: "cable", Part: "c", Quantity: 3, Total: price(150)}}},
	}
	d := Compare(old, new)
	if got := d.Regressions(); got != 2 { // pass → fail, and a new warning
		t.Errorf("regressions = %d, want 2: %+v", got, d.Findings)
	}
	if got := d.Fixes(); got != 1 { // fail → pass
		t.Errorf("fixes = %d, want 1", got)
	}
	if len(d.Figures) != 3 {
		t.Fatalf("figure changes %+v, want changed, added and removed", d.Figures)
	}
	for _, f := range d.Figures {
		if f.ID == "wiring.voltageDrop" && (f.Diff != 3 || math.Abs(f.Percent-150) > 1e-9) {
			t.Errorf("drop change %+v, want +3, +150 %%", f)
		}
	}
	if len(d.BOM) != 1 || d.BOM[0].Old != 2 || d.BOM[0].New != 3 || d.Cost != 50 {
		t.Errorf("BOM %+v cost %v, want 2 → 3 and +50", d.BOM, d.Cost)
	}
	// The same result on both sides: nothing changed.
	if s := Compare(new, new); len(s.Figures)+len(s.Findings)+len(s.BOM) != 0 {
		t.Errorf("a result against itself: %+v", s)
	}
}

func TestCompareInputs(t *testing.T) {
	got := CompareInputs(map[string]string{"a": `"1 m"`, "b": "2", "c": "x"}, map[string]string{"a": `"2 m"`, "b": "2", "d": "y"})
	want := []InputChange{{Path: "a", Old: `"1 m"`, New: `"2 m"`}, {Path: "c", Old: "x"}, {Path: "d", New: "y"}}
	if len(got) != len(want) {
		t.Fatalf("got %+v, want %+v", got, want)
	}
	for i := range want {
		if got[i] != want[i] {
			t.Errorf("[%d] = %+v, want %+v", i, got[i], want[i])
		}
	}
}
