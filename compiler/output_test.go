package compiler

import (
	"bytes"
	"regexp"
	"strings"
	"testing"

	"github.com/ampwright/ampwright/report"
	"github.com/ampwright/ampwright/result"
)

// numberPattern matches a decimal number as the reports write one.
var numberPattern = regexp.MustCompile(`-?\d+\.\d+(e-?\d+)?`)

// noisy returns the numbers of s written with more significant digits
// than a figure carries (12): 7680.000000000001, −2.7777777777777777.
func noisy(s string) []string {
	var out []string
	for _, n := range numberPattern.FindAllString(s, -1) {
		digits := strings.TrimLeft(strings.NewReplacer("-", "", ".", "").Replace(strings.SplitN(n, "e", 2)[0]), "0")
		if len(digits) > 12 {
			out = append(out, n)
		}
	}
	return out
}

// TestNoFloatNoise: no example hull's text report or JSON result shows a
// number with floating-point noise in it (issue 13).
func TestNoFloatNoise(t *testing.T) {
	for _, h := range voyageHulls {
		r, _, err := Compile("../designs/hulls/" + h)
		if err != nil {
			t.Fatal(err)
		}
		var text, js bytes.Buffer
		if err := report.Text(&text, r); err != nil {
			t.Fatal(err)
		}
		if err := report.JSON(&js, r); err != nil {
			t.Fatal(err)
		}
		if n := noisy(text.String()); len(n) > 0 {
			t.Errorf("%s: the text report shows %q", h, n)
		}
		if n := noisy(js.String()); len(n) > 0 {
			t.Errorf("%s: the JSON result shows %q", h, n)
		}
	}
	if n := noisy("7680.000000000001 and -2.7777777777777777 but 0.0021833 and 7680"); len(n) != 2 {
		t.Errorf("noisy finds %q, want the two noisy numbers", n)
	}
}

// metricInFormula matches metric units and metric-only temperatures in
// what an imperial design's figures and findings show: degrees Celsius,
// metres, millimetres, square millimetres, milliohms per metre.
var metricInFormula = regexp.MustCompile(`°C|mΩ/m|mm²|\d mm\b|\d m([\s,;)]|$)|Ω/km`)

// TestImperialOutput: Brackenwell is written in imperial units, and every
// formula, input, value and message its checks give is in feet, inches,
// °F and Ω per 1000 ft, so that it can be worked as written; none mixes
// in metric units. (Sources, which cite standards, and the provenance of
// inputs, which name rulebook keys, are not formulas.)
func TestImperialOutput(t *testing.T) {
	r, _, err := Compile("../designs/hulls/brackenwell")
	if err != nil {
		t.Fatal(err)
	}
	if r.Design.Units != "imperial" {
		t.Fatal("brackenwell is no longer imperial")
	}
	check := func(what, s string) {
		if m := metricInFormula.FindString(s); m != "" {
			t.Errorf("%s shows %q: %s", what, m, s)
		}
	}
	seen := map[result.FigureID]bool{}
	for _, f := range r.Figures {
		what := string(f.ID) + " " + f.Subject
		seen[f.ID] = true
		check(what+" formula", f.Formula)
		check(what+" unit", f.Unit)
		for _, in := range f.Inputs {
			check(what+" input "+in.Name, in.Name+" "+in.Unit)
			// The worked terms of a whole path's drop are formulas too;
			// other inputs' From cites a rulebook key or a source.
			if f.ID == result.FigTotalDrop {
				check(what+" input "+in.Name+" from", in.From)
			}
		}
	}
	for _, f := range r.Checks {
		what := string(f.ID) + " " + f.Subject
		check(what+" unit", f.Unit)
		check(what+" message", f.Message)
		check(what+" change", f.Change)
	}
	for _, id := range []result.FigureID{result.FigResistance, result.FigVoltageDrop, result.FigColdVoc, result.FigEnergyHarvest} {
		if !seen[id] {
			t.Errorf("brackenwell gives no %s figure: the test checks nothing there", id)
		}
	}
	if m := metricInFormula.FindString("R′(T) 0.9667 mΩ/m at 30 °C"); m == "" {
		t.Error("the pattern misses metric units")
	}
}
