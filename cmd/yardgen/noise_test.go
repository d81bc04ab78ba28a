package main

import (
	"bytes"
	"io"
	"path/filepath"
	"regexp"
	"strings"
	"testing"

	"github.com/ampwright/ampwright/compiler"
	"github.com/ampwright/ampwright/report"
	"github.com/ampwright/ampwright/yard"
)

// TestNoFloatNoise compiles a dozen generated hulls, whose banks and runs
// are of every size the generator makes, and checks that no text report
// or JSON result shows a number with floating-point noise in it (hull 9's
// bank once gave 2 × 12.8 V × 3 × 100 Ah = 7680.000000000001 Wh).
func TestNoFloatNoise(t *testing.T) {
	if testing.Short() {
		t.Skip("compiles a dozen hulls")
	}
	out := filepath.Join(t.TempDir(), "yard")
	if err := runMain([]string{"-hulls", "12", "-from", "../../designs", "-out", out}, io.Discard); err != nil {
		t.Fatal(err)
	}
	hulls, err := yard.Hulls(out, nil)
	if err != nil {
		t.Fatal(err)
	}
	number := regexp.MustCompile(`-?\d+\.\d+`)
	for _, hl := range hulls {
		r, _, err := compiler.Compile(filepath.Join(out, filepath.FromSlash(hl)))
		if err != nil {
			t.Fatalf("%s: %v", hl, err)
		}
		var b bytes.Buffer
		if err := report.Text(&b, r); err != nil {
			t.Fatal(err)
		}
		if err := report.JSON(&b, r); err != nil {
			t.Fatal(err)
		}
		for _, n := range number.FindAllString(b.String(), -1) {
			if digits := strings.TrimLeft(strings.NewReplacer("-", "", ".", "").Replace(n), "0"); len(digits) > 12 {
				t.Errorf("%s shows %s", hl, n)
			}
		}
	}
}
