package compiler

import (
	"strings"
	"testing"
)

// TestCurrencyFromCatalog: a design that gives no currency takes its
// catalog's, which its prices are in; one that gives another is refused
// at its currency field.
func TestCurrencyFromCatalog(t *testing.T) {
	src := readSource(t, "../"+yard)
	const hull = "hulls/good/good.cue"
	if _, ok := src.Files[hull]; !ok {
		t.Fatalf("the test yard has no %s", hull)
	}
	d, err := LoadFrom("hulls/good", src)
	if err != nil {
		t.Fatal(err)
	}
	if d.Spec.Currency != "GBP" {
		t.Errorf("currency %q, want the catalog's GBP", d.Spec.Currency)
	}
	// A currency the catalog computes rather than writes.
	const cat = "catalog/catalog.cue"
	written := src.Files[cat]
	src.Files[cat] = []byte(strings.Replace(string(written), `currency: "GBP"`, `currency: "G" + "BP"`, 1))
	if string(src.Files[cat]) == string(written) {
		t.Fatalf("%s does not write currency: \"GBP\"", cat)
	}
	if d, err := LoadFrom("hulls/good", src); err != nil || d.Spec.Currency != "GBP" {
		t.Errorf("a computed catalog currency: %v, %v; want GBP", d, err)
	}
	src.Files[cat] = written
	src.Files[hull] = append(append([]byte(nil), src.Files[hull]...), "\ncurrency: \"EUR\"\n"...)
	_, err = LoadFrom("hulls/good", src)
	if err == nil || !strings.Contains(err.Error(), `"EUR" differs from the catalog's currency "GBP"`) || !strings.Contains(err.Error(), "good.cue:") {
		t.Errorf("a currency other than the catalog's: got %v, want a positioned error", err)
	}
}
