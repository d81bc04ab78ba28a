package checks

import (
	"math"
	"testing"

	"github.com/ampwright/ampwright/schema"
	"github.com/ampwright/ampwright/schema/unit"
)

// coldVocDesign is a 48 V design with one string of 11 modules of Voc
// 40 V and βVoc −0.30 %/°C, at a record low of −10 °C (14 °F), in the
// given units.
func coldVocDesign(t *testing.T, units string) *schema.Design {
	d := testDesign(t, "48 V")
	d.Vessel.Units = units
	d.Site.RecordLow = tempOf(t, "-10 °C")
	d.Bank = leadBank(t, "agm", "48 V", "100 Ah", 1, 1)
	d.Arrays = map[string]schema.Array{"a": {
		Series: 11, Strings: 1, Controller: "c",
		Module: schema.Module{Voc: voltageOf(t, "40 V"), BetaVoc: &unit.TempCoeff{Quantity: q(t, "-0.30 %/°C", unit.DimTempCoeff)}},
	}}
	d.Controllers = map[string]schema.Controller{"c": {Part: schema.ControllerPart{
		Kind: "mppt", MaxPVVoltage: voltageOf(t, "600 V"), Output: currentOf(t, "10 A"), Efficiency: 0.97,
	}}}
	d.Wiring["bank-c"] = conductor(t, "bank", "c", "10 AWG", "1 m")
	d.Wiring["a-c"] = conductor(t, "a", "c", "10 AWG", "1 m")
	return d
}

// TestColdVocFigureInputs: the cold Voc figure lists the coefficient it
// used (issue 13: it did not), and it recomputes from its inputs in the
// design's own units: 11 × 40 V × (1 − 0.30 %/°C × (−10 °C − 25 °C)) =
// 486.2 V (REFERENCES.md §7, from memory), and in °F the same with
// −0.30/1.8 %/°F and 14 °F − 77 °F (°F = °C × 1.8 + 32, exact).
func TestColdVocFigureInputs(t *testing.T) {
	for _, tt := range []struct {
		units, beta, tmin, ref string
		stc                    float64
	}{
		{"metric", "%/°C", "°C", "25 °C", 25},
		{"imperial", "%/°F", "°F", "77 °F", 77},
	} {
		var rep Report
		ColdVoc.Run(build(t, coldVocDesign(t, tt.units)), &rep)
		f := rep.Figures[0]
		in := map[string]float64{}
		units := map[string]string{}
		for _, x := range f.Inputs {
			in[x.Name], units[x.Name] = x.Value, x.Unit
		}
		if units["βVoc"] != tt.beta || units["T_min"] != tt.tmin {
			t.Errorf("%s: inputs %v, want βVoc in %s and T_min in %s", tt.units, f.Inputs, tt.beta, tt.tmin)
		}
		got := in["N_series"] * in["Voc"] * (1 + in["βVoc"]/100*(in["T_min"]-tt.stc))
		if math.Abs(got-486.2) > 0.01 || math.Abs(f.Value-486.2) > 0.01 {
			t.Errorf("%s: recomputed %v V, figure %v V; want 486.2 V", tt.units, got, f.Value)
		}
		if want := "Voc_max = N_series × Voc × (1 + βVoc × (T_min − " + tt.ref + "))"; f.Formula != want {
			t.Errorf("%s: formula %q, want %q", tt.units, f.Formula, want)
		}
	}
}

// TestImperialWiringFigures: an imperial design's voltage drop and
// resistance figures are in feet, Ω per 1000 ft and °F, and recompute as
// written: drop = I × 2 × L × R′ / V × 100 with L in ft and R′ per
// 1000 ft, R′(T) = R′(68 °F) × (1 + α × (T − 68 °F)) with α per °F; and
// give the same drop as the metric figures (1 ft = 0.3048 m exactly).
func TestImperialWiringFigures(t *testing.T) {
	spec := runSpec{size: "10 AWG", length: "15 ft", material: "copper", current: 10, volts: 12, class: "other"}
	in, _ := oneRun(t, spec)
	metric, _ := dropOf(t, in)
	in.Design.Vessel.Units = "imperial"
	var rep Report
	VoltageDrop.Run(in, &rep)
	Resistance.Run(in, &rep)
	vals := map[string]float64{}
	units := map[string]string{}
	for _, f := range rep.Figures {
		for _, x := range f.Inputs {
			vals[string(f.ID)+" "+x.Name], units[string(f.ID)+" "+x.Name] = x.Value, x.Unit
		}
		vals[string(f.ID)], units[string(f.ID)] = f.Value, f.Unit
	}
	if units["wiring.voltageDrop L"] != "ft" || units["wiring.voltageDrop R′(T)"] != "Ω/1000 ft" || units["wiring.resistance T"] != "°F" {
		t.Fatalf("units %v", units)
	}
	drop := 10 * 2 * vals["wiring.voltageDrop L"] * vals["wiring.voltageDrop R′(T)"] / 1000 / 12 * 100
	if math.Abs(drop-vals["wiring.voltageDrop"]) > 0.001 || vals["wiring.voltageDrop"] != metric.Value {
		t.Errorf("drop recomputed %v %%, figure %v %%, metric figure %v %%", drop, vals["wiring.voltageDrop"], metric.Value)
	}
	rt := vals["wiring.resistance R′(68 °F)"] * (1 + vals["wiring.resistance α"]*(vals["wiring.resistance T"]-68))
	if math.Abs(rt-vals["wiring.resistance"]) > 1e-4 {
		t.Errorf("R′(T) recomputed %v, figure %v Ω/1000 ft", rt, vals["wiring.resistance"])
	}
}
