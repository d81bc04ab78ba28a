package compiler

import (
	"bytes"
	"encoding/csv"
	"math"
	"strconv"
	"strings"
	"testing"

	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/report"
	"github.com/ampwright/ampwright/result"
)

func bomLine(t *testing.T, b *result.BOM, part string) result.BOMLine {
	t.Helper()
	for _, l := range b.Lines {
		if l.Part == part {
			return l
		}
	}
	t.Fatalf("no BOM line for %s", part)
	return result.BOMLine{}
}

// TestBOMDunnock works part of the example sloop's bill of materials by
// hand.
func TestBOMDunnock(t *testing.T) {
	r, _, err := Compile("../designs/hulls/dunnock")
	if err != nil {
		t.Fatal(err)
	}
	b := r.BOM
	// 1 series × 2 strings of 100 W modules: 2. Bank 1 × 3 AGM: 3.
	if l := bomLine(t, b, "gannet-100"); l.Quantity != 2 {
		t.Errorf("modules: %v, want 2", l.Quantity)
	}
	if l := bomLine(t, b, "tern-agm105"); l.Quantity != 3 {
		t.Errorf("batteries: %v, want 3", l.Quantity)
	}
	// 16 AWG runs: panel-anchor 15 m, panel-tricolour 15 m, panel-decknav
	// 9 m, panel-instruments 5 m = 44 m one way; each colour carries one
	// conductor of each: 44 m × (1 + 0.15 yard slack) = 50.6 m, bought in
	// 30 m reels: ⌈50.6 / 30⌉ = 2 reels of red and 2 of yellow.
	for _, id := range []string{"awg16-red", "awg16-yel"} {
		l := bomLine(t, b, id)
		if math.Abs(l.Length-50.6) > 1e-9 || l.Quantity != 2 || l.Unit != "30 m" {
			t.Errorf("%s: %v m, %v × %s; want 50.6 m, 2 × 30 m", id, l.Length, l.Quantity, l.Unit)
		}
		if l.Total == nil || *l.Total != 54 {
			t.Errorf("%s total %v, want 2 × 27.00 = 54.00", id, l.Total)
		}
	}
	// Four terminals a run: 4 runs of 16 AWG → 16.
	if l := bomLine(t, b, "ring-awg16"); l.Quantity != 16 {
		t.Errorf("16 AWG terminals: %v, want 16", l.Quantity)
	}
	// Every line priced: the total is the sum of the lines.
	var sum float64
	for _, l := range b.Lines {
		sum += *l.Total
	}
	if !b.Complete || math.Abs(sum-b.Total) > 0.005 || b.Currency != "GBP" {
		t.Errorf("total %v %s complete %v; lines sum to %v", b.Total, b.Currency, b.Complete, sum)
	}
}

// TestBOMIncomplete: a part without a price gives a total marked
// incomplete, which leaves the part out rather than counting it as free.
func TestBOMIncomplete(t *testing.T) {
	d, err := Load("../designs/hulls/dunnock")
	if err != nil {
		t.Fatal(err)
	}
	bom := func() *result.BOM {
		sys, issues := model.Build(d.Spec, d.Rules)
		if issues != nil {
			t.Fatal(issues)
		}
		return billOfMaterials(d, sys)
	}
	full := bom()
	spec := *d.Spec
	bank := *spec.Bank
	bank.Battery.Price = nil
	spec.Bank = &bank
	d.Spec = &spec
	b := bom()
	if b.Complete {
		t.Error("a battery without a price: total marked complete")
	}
	if l := bomLine(t, b, "tern-agm105"); l.Total != nil || l.UnitPrice != nil {
		t.Errorf("unpriced line has a price: %+v", l)
	}
	if want := full.Total - 3*219; math.Abs(b.Total-want) > 0.005 {
		t.Errorf("total %v, want %v (the priced lines only)", b.Total, want)
	}
	var sb strings.Builder
	if err := report.BOMText(&sb, &result.Result{BOM: b}); err != nil {
		t.Fatal(err)
	}
	if !strings.Contains(sb.String(), "incomplete: 1 lines have no price") {
		t.Errorf("text does not mark the total incomplete:\n%s", sb.String())
	}
}

// TestBOMCSV parses the CSV back: a header row, one part a line, numbers
// that parse, no thousands separators.
func TestBOMCSV(t *testing.T) {
	r, _, err := Compile("../designs/hulls/marram")
	if err != nil {
		t.Fatal(err)
	}
	var buf bytes.Buffer
	if err := report.BOMCSV(&buf, r); err != nil {
		t.Fatal(err)
	}
	rows, err := csv.NewReader(&buf).ReadAll()
	if err != nil {
		t.Fatal(err)
	}
	if rows[0][0] != "category" || rows[0][3] != "quantity" || rows[0][7] != "total" {
		t.Fatalf("header %v", rows[0])
	}
	if len(rows)-1 != len(r.BOM.Lines) {
		t.Fatalf("%d rows, want %d", len(rows)-1, len(r.BOM.Lines))
	}
	var sum float64
	for _, row := range rows[1:] {
		for _, col := range []int{3, 6, 7} {
			if strings.ContainsAny(row[col], ", ") {
				t.Errorf("number %q has a separator", row[col])
			}
		}
		total, err := strconv.ParseFloat(row[7], 64)
		if err != nil {
			t.Errorf("total %q: %v", row[7], err)
		}
		sum += total
	}
	if math.Abs(sum-r.BOM.Total) > 0.01 {
		t.Errorf("CSV totals sum to %v, want %v", sum, r.BOM.Total)
	}
}
