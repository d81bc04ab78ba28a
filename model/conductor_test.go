package model

// Reference tests: the model's conductor arithmetic against published
// tables. The values come from /work/shared/REFERENCES.md; each row names
// its source there, and values that REFERENCES.md tags [from memory] are
// marked "from memory" here.

import (
	"fmt"
	"math"
	"strings"
	"sync"
	"testing"

	"cuelang.org/go/cue/cuecontext"

	"github.com/ampwright/ampwright/schema"
	"github.com/ampwright/ampwright/schema/unit"
)

// mPerKft is the metres in 1000 ft, 304.8 exactly (NIST SP 811), to turn
// Ω/m into Ω/kft.
const mPerKft = 304.8

var defaultRulebookOnce = sync.OnceValues(func() (schema.Rulebook, error) {
	var r schema.Rulebook
	v, err := schema.Build(cuecontext.New())
	if err != nil {
		return r, err
	}
	err = v.LookupPath(schema.DefaultPath).Decode(&r)
	return r, err
})

// defaultRulebook is ampwright's built-in rulebook, decoded from the schema.
func defaultRulebook(t *testing.T) schema.Rulebook {
	t.Helper()
	r, err := defaultRulebookOnce()
	if err != nil {
		t.Fatalf("default rulebook: %v", err)
	}
	return r
}

func sizeOf(t *testing.T, s string) unit.Size {
	t.Helper()
	return mustQ(t, s, unit.DimSize, func(q unit.Quantity) unit.Size { return unit.Size{Quantity: q} })
}

func lengthOf(t *testing.T, s string) unit.Length {
	t.Helper()
	return mustQ(t, s, unit.DimLength, func(q unit.Quantity) unit.Length { return unit.Length{Quantity: q} })
}

func tempOf(t *testing.T, s string) unit.Temperature {
	t.Helper()
	return mustQ(t, s, unit.DimTemperature, func(q unit.Quantity) unit.Temperature { return unit.Temperature{Quantity: q} })
}

func currentOf(t *testing.T, s string) unit.Current {
	t.Helper()
	return mustQ(t, s, unit.DimCurrent, func(q unit.Quantity) unit.Current { return unit.Current{Quantity: q} })
}

// relDev is (got − want)/want.
func relDev(got, want float64) float64 { return (got - want) / want }

// TestResistanceNECTable8 checks R′(75 °C) of AWG conductors, computed from
// the ASTM B258 area and the rulebook's resistivity, lay factor, tinning
// factor and α, against the stranded columns of NEC Chapter 9 Table 8
// (REFERENCES.md §1). Copper is compared with the uncoated stranded column,
// tinned copper with the coated stranded one.
//
// Tolerance: 3 %. The checker models stranding with one lay factor (1.02)
// and tinning with one factor (1.03); the NEC's stranded values run 2–3 %
// above solid and its coated values 3–6 % above uncoated, varying with the
// size and the strand count, so a single factor cannot match every row
// exactly. Two rows are allowed 4 %: coated stranded 18 and 16 AWG, where
// the NEC's coated/uncoated ratio is 1.063 and 1.060 and the rulebook's
// 1.03 tinning factor leaves the checker about 3.0–3.5 % low (that is, not
// conservative) for small tinned conductors.
func TestResistanceNECTable8(t *testing.T) {
	rules := defaultRulebook(t)
	rows := []struct {
		awg      string
		uncoated float64 // Ω/kft at 75 °C, stranded, uncoated copper
		coated   float64 // Ω/kft at 75 °C, stranded, coated (tinned) copper
		coatTol  float64 // tolerance on the coated column
		source   string
	}{
		// NEC Ch. 9 Table 8 via REFERENCES §1 source a [secondary]: a public GPL code file transcribing the table.
		{"18 AWG", 7.95, 8.45, 0.04, "NEC Ch.9 Table 8, REFERENCES §1 source a [secondary]"},
		// NEC Ch. 9 Table 8 via REFERENCES §1 source a [secondary].
		{"16 AWG", 4.99, 5.29, 0.04, "NEC Ch.9 Table 8, REFERENCES §1 source a [secondary]"},
		// NEC Ch. 9 Table 8 via REFERENCES §1 source a [secondary].
		{"14 AWG", 3.14, 3.26, 0.03, "NEC Ch.9 Table 8, REFERENCES §1 source a [secondary]"},
		// NEC Ch. 9 Table 8 via REFERENCES §1 source a [secondary].
		{"12 AWG", 1.98, 2.05, 0.03, "NEC Ch.9 Table 8, REFERENCES §1 source a [secondary]"},
		// NEC Ch. 9 Table 8 via REFERENCES §1 source a [secondary].
		{"10 AWG", 1.24, 1.29, 0.03, "NEC Ch.9 Table 8, REFERENCES §1 source a [secondary]"},
		// NEC Ch. 9 Table 8 via REFERENCES §1 source a [secondary].
		{"8 AWG", 0.778, 0.809, 0.03, "NEC Ch.9 Table 8, REFERENCES §1 source a [secondary]"},
		// NEC Ch. 9 Table 8 via REFERENCES §1 sources a, b, c (uncoated) and a, b (coated) [secondary].
		{"6 AWG", 0.491, 0.510, 0.03, "NEC Ch.9 Table 8, REFERENCES §1 sources a,b,c [secondary]"},
		// NEC Ch. 9 Table 8, REFERENCES §1 [secondary; row without cell letter, confidence H for uncoated].
		{"4 AWG", 0.308, 0.321, 0.03, "NEC Ch.9 Table 8, REFERENCES §1 [secondary]"},
		// NEC Ch. 9 Table 8, REFERENCES §1 [secondary]. 3 AWG is not tabled there
		// (0.245 uncoated is from memory), so it is not a row here.
		{"2 AWG", 0.194, 0.201, 0.03, "NEC Ch.9 Table 8, REFERENCES §1 [secondary]"},
		// NEC Ch. 9 Table 8, REFERENCES §1 [secondary].
		{"1 AWG", 0.154, 0.160, 0.03, "NEC Ch.9 Table 8, REFERENCES §1 [secondary]"},
		// NEC Ch. 9 Table 8, REFERENCES §1 [secondary]; written "0 AWG" to
		// exercise the 0/00/000/0000 spellings of 1/0–4/0.
		{"0 AWG", 0.122, 0.127, 0.03, "NEC Ch.9 Table 8, REFERENCES §1 [secondary]"},
		// NEC Ch. 9 Table 8, REFERENCES §1 [secondary].
		{"2/0 AWG", 0.0967, 0.101, 0.03, "NEC Ch.9 Table 8, REFERENCES §1 [secondary]"},
		// NEC Ch. 9 Table 8, REFERENCES §1 [secondary].
		{"000 AWG", 0.0766, 0.0797, 0.03, "NEC Ch.9 Table 8, REFERENCES §1 [secondary]"},
		// NEC Ch. 9 Table 8, REFERENCES §1 [secondary].
		{"4/0 AWG", 0.0608, 0.0626, 0.03, "NEC Ch.9 Table 8, REFERENCES §1 [secondary]"},
	}
	type result struct {
		name          string
		got, want     float64
		dev, tol      float64
		source        string
		material, col string
	}
	var results []result
	for _, row := range rows {
		s := sizeOf(t, row.awg)
		for _, col := range []struct {
			material, name string
			want, tol      float64
		}{
			{"copper", "uncoated stranded", row.uncoated, 0.03},
			{"tinned-copper", "coated stranded", row.coated, row.coatTol},
		} {
			c := &schema.Conductor{Material: col.material}
			res := ConductorResistance(rules, c, s, 75)
			if res.Temp != 75 {
				t.Fatalf("%s: resistance at %v °C, asked for 75", row.awg, res.Temp)
			}
			got := res.RT * mPerKft
			results = append(results, result{row.awg + " " + col.material, got, col.want, relDev(got, col.want), col.tol, row.source, col.material, col.name})
		}
	}
	worst := map[string]result{}
	for _, r := range results {
		if w, ok := worst[r.material]; !ok || math.Abs(r.dev) > math.Abs(w.dev) {
			worst[r.material] = r
		}
	}
	for _, r := range results {
		t.Run(r.name, func(t *testing.T) {
			if math.Abs(r.dev) > r.tol {
				w := worst[r.material]
				t.Errorf("R′(75 °C) = %.4g Ω/kft, NEC %s %.4g Ω/kft (%s): %+.2f %%, beyond ±%g %%; worst %s deviation %+.2f %% at %s",
					r.got, r.col, r.want, r.source, 100*r.dev, 100*r.tol, r.material, 100*w.dev, w.name)
			}
		})
	}
	for _, m := range []string{"copper", "tinned-copper"} {
		w := worst[m]
		t.Logf("worst deviation from NEC Table 8 %s: %+.2f %% at %s (%.4g against %.4g Ω/kft)", w.col, 100*w.dev, w.name, w.got, w.want)
	}
}

// TestResistanceSolidDerived checks ρ/A × (1 + α·55), with no lay factor,
// against the [derived] solid R75 table of REFERENCES.md §1 (ρ20 = 1/58
// Ω·mm²/m, α20 = 0.00393, ASTM B258 areas), within 0.3 %, and against the
// NEC Table 8 solid uncoated column within 0.5 % (its three significant
// figures round by up to 0.4 %).
func TestResistanceSolidDerived(t *testing.T) {
	rules := defaultRulebook(t)
	rr := rules.Resistance
	rows := []struct {
		gauge   int
		derived float64 // [derived], REFERENCES §1 "Check" table
		nec     float64 // NEC Ch.9 Table 8 uncoated solid
		necSrc  string
	}{
		{18, 7.765, 7.77, "from memory (REFERENCES §1)"},           // derived: REFERENCES §1 check table; NEC solid from memory
		{16, 4.884, 4.89, "from memory (REFERENCES §1)"},           // derived: REFERENCES §1 check table; NEC solid from memory
		{14, 3.071, 3.07, "REFERENCES §1 sources b,c [secondary]"}, // derived: REFERENCES §1 check table; NEC solid [secondary] b,c
		{12, 1.932, 1.93, "REFERENCES §1 sources b,c [secondary]"}, // derived: REFERENCES §1 check table; NEC solid [secondary] b,c
		{10, 1.215, 1.21, "REFERENCES §1 sources b,c [secondary]"}, // derived: REFERENCES §1 check table; NEC solid [secondary] b,c
		{8, 0.764, 0.764, "REFERENCES §1 sources b,c [secondary]"}, // derived: REFERENCES §1 check table; NEC solid [secondary] b,c
	}
	for _, row := range rows {
		t.Run(unit.AWGName(row.gauge), func(t *testing.T) {
			areaMM2 := unit.AWGArea(row.gauge) * 1e6
			got := rr.Resistivity / areaMM2 * (1 + rr.Alpha*55) * mPerKft
			if d := relDev(got, row.derived); math.Abs(d) > 0.003 {
				t.Errorf("ρ/A × (1 + α·55) = %.4f Ω/kft, derived table %.3f: %+.3f %%, beyond ±0.3 %%", got, row.derived, 100*d)
			}
			if d := relDev(got, row.nec); math.Abs(d) > 0.005 {
				t.Errorf("ρ/A × (1 + α·55) = %.4f Ω/kft, NEC solid %.3f (%s): %+.3f %%, beyond ±0.5 %%", got, row.nec, row.necSrc, 100*d)
			}
		})
	}
}

// TestResistanceIEC60228 checks that a metric conductor's resistance at
// 20 °C is the IEC 60228 class 5 maximum, plain and tinned (REFERENCES.md
// §3 [secondary, H]: mycableengineering.com/knowledge-base/iec-60228-dc-resistance
// and etechnik-synergie.com, "extracted from DIN VDE 0295, IEC 60228, HD
// 383"). The values are typed here from the reference, not read from the
// rulebook, so a wrong rulebook cell fails.
func TestResistanceIEC60228(t *testing.T) {
	rules := defaultRulebook(t)
	rows := []struct {
		size          string
		plain, tinned float64 // Ω/km at 20 °C
	}{
		// IEC 60228 class 5, REFERENCES §3 [secondary, H], for every row.
		{"0.75 mm²", 26.0, 26.7}, // IEC 60228 class 5, REFERENCES §3
		{"1 mm²", 19.5, 20.0},    // IEC 60228 class 5, REFERENCES §3
		{"1.5 mm²", 13.3, 13.7},  // IEC 60228 class 5, REFERENCES §3
		{"2.5 mm²", 7.98, 8.21},  // IEC 60228 class 5, REFERENCES §3
		{"4 mm²", 4.95, 5.09},    // IEC 60228 class 5, REFERENCES §3
		{"6 mm²", 3.30, 3.39},    // IEC 60228 class 5, REFERENCES §3
		{"10 mm²", 1.91, 1.95},   // IEC 60228 class 5, REFERENCES §3
		{"16 mm²", 1.21, 1.24},   // IEC 60228 class 5, REFERENCES §3
		{"25 mm²", 0.780, 0.795}, // IEC 60228 class 5, REFERENCES §3
		{"35 mm²", 0.554, 0.565}, // IEC 60228 class 5, REFERENCES §3
		// 50 mm² class 5 plain (0.386) is below class 2 (0.387): so printed
		// in the standard, REFERENCES §3 note.
		{"50 mm²", 0.386, 0.393},  // IEC 60228 class 5, REFERENCES §3
		{"70 mm²", 0.272, 0.277},  // IEC 60228 class 5, REFERENCES §3
		{"95 mm²", 0.206, 0.210},  // IEC 60228 class 5, REFERENCES §3
		{"120 mm²", 0.161, 0.164}, // IEC 60228 class 5, REFERENCES §3
	}
	for _, row := range rows {
		for _, m := range []struct {
			material string
			want     float64
		}{{"copper", row.plain}, {"tinned-copper", row.tinned}} {
			t.Run(row.size+" "+m.material, func(t *testing.T) {
				res := ConductorResistance(rules, &schema.Conductor{Material: m.material}, sizeOf(t, row.size), 20)
				want := m.want / 1000 // Ω/km → Ω/m
				if !res.FromTable {
					t.Errorf("%s not found in the rulebook's table: %s", row.size, res.Basis)
				}
				if math.Abs(res.R20-want) > 1e-12 || math.Abs(res.RT-want) > 1e-12 {
					t.Errorf("R′(20 °C) = %.6g Ω/m (at T %.6g), want %.6g Ω/m (IEC 60228 class 5 %s)", res.R20, res.RT, want, m.material)
				}
			})
		}
	}
}

// TestResistanceTemperatureCorrection checks R(75)/R(20) = 1 + α × 55 =
// 1.21615 with α = 0.00393 /K (IEC 60028 / IACS, REFERENCES.md §2
// [secondary, H]), for an AWG and a metric size, and compares it with
// 1/Kt(75 °C), Kt = 0.820 (IEC 60228 temperature factor, from memory,
// REFERENCES §3), within 1 %.
func TestResistanceTemperatureCorrection(t *testing.T) {
	rules := defaultRulebook(t)
	const want = 1 + 0.00393*55
	const ktFromMemory = 0.820
	for _, s := range []string{"10 AWG", "6 mm²", "4/0 AWG", "120 mm²"} {
		for _, m := range []string{"copper", "tinned-copper"} {
			t.Run(s+" "+m, func(t *testing.T) {
				c := &schema.Conductor{Material: m}
				r20 := ConductorResistance(rules, c, sizeOf(t, s), 20)
				r75 := ConductorResistance(rules, c, sizeOf(t, s), 75)
				got := r75.RT / r20.RT
				if math.Abs(got-want) > 1e-9 {
					t.Errorf("R(75)/R(20) = %.6f, want 1 + 0.00393 × 55 = %.6f", got, want)
				}
				if d := relDev(got, 1/ktFromMemory); math.Abs(d) > 0.01 {
					t.Errorf("R(75)/R(20) = %.4f, 1/Kt(75 °C) = %.4f (Kt = 0.820, from memory): %+.2f %%, beyond ±1 %%", got, 1/ktFromMemory, 100*d)
				}
			})
		}
	}
}

// ampInput is the smallest System the ampacity lookup reads.
func ampInput(t *testing.T, rules schema.Rulebook) *System {
	return &System{
		Design: &schema.Design{
			Vessel: schema.Vessel{System: "12 V"},
			Site:   schema.Site{EngineSpace: tempOf(t, "50 °C")},
		},
		Rules: rules,
		Volts: 12,
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

// table5 is 33 CFR 183.425 Table 5, allowable amperage of conductors under
// 50 V, not bundled, 30 °C ambient, by insulation rating (REFERENCES.md §8
// [published, H]: federal.elaws.us/cfr/title-33/section-183.425, also on
// edocket.access.gpo.gov). Sizes as the CFR writes them (0, 00, 000, 0000).
var table5Ratings = []string{"60 °C", "75 °C", "80 °C", "90 °C", "105 °C", "125 °C", "200 °C"}

var table5 = []struct {
	size string
	amps [7]float64
}{
	{"18 AWG", [7]float64{10, 10, 15, 20, 20, 25, 25}},          // 33 CFR 183.425 Table 5
	{"16 AWG", [7]float64{15, 15, 20, 25, 25, 30, 35}},          // 33 CFR 183.425 Table 5
	{"14 AWG", [7]float64{20, 20, 25, 30, 35, 40, 45}},          // 33 CFR 183.425 Table 5
	{"12 AWG", [7]float64{25, 25, 35, 40, 45, 50, 55}},          // 33 CFR 183.425 Table 5
	{"10 AWG", [7]float64{40, 40, 50, 55, 60, 70, 70}},          // 33 CFR 183.425 Table 5
	{"8 AWG", [7]float64{55, 65, 70, 70, 80, 90, 100}},          // 33 CFR 183.425 Table 5
	{"6 AWG", [7]float64{80, 95, 100, 100, 120, 125, 135}},      // 33 CFR 183.425 Table 5
	{"4 AWG", [7]float64{105, 125, 130, 135, 160, 170, 180}},    // 33 CFR 183.425 Table 5
	{"3 AWG", [7]float64{120, 145, 150, 155, 180, 195, 210}},    // 33 CFR 183.425 Table 5
	{"2 AWG", [7]float64{140, 170, 175, 180, 210, 225, 240}},    // 33 CFR 183.425 Table 5
	{"1 AWG", [7]float64{165, 195, 210, 210, 245, 265, 280}},    // 33 CFR 183.425 Table 5
	{"0 AWG", [7]float64{195, 230, 245, 245, 285, 305, 325}},    // 33 CFR 183.425 Table 5
	{"00 AWG", [7]float64{225, 265, 285, 285, 330, 355, 370}},   // 33 CFR 183.425 Table 5
	{"000 AWG", [7]float64{260, 310, 330, 330, 385, 410, 430}},  // 33 CFR 183.425 Table 5
	{"0000 AWG", [7]float64{300, 360, 385, 385, 445, 475, 510}}, // 33 CFR 183.425 Table 5
}

// TestAmpacityTable5 checks every cell of 33 CFR 183.425 Table 5 (every row
// is that published table; see table5).
func TestAmpacityTable5(t *testing.T) {
	in := ampInput(t, defaultRulebook(t))
	for _, row := range table5 {
		for i, rating := range table5Ratings {
			t.Run(row.size+" "+rating, func(t *testing.T) {
				c := &schema.Conductor{Insulation: tempOf(t, rating), Bundle: 1}
				a := in.Ampacity(c, sizeOf(t, row.size))
				if !a.OK {
					t.Fatalf("no ampacity: %s", a.Note)
				}
				if a.Table != row.amps[i] || a.Derated != row.amps[i] {
					t.Errorf("ampacity = %g A (derated %g A, row %q, column %q), want %g A (33 CFR 183.425 Table 5)", a.Table, a.Derated, a.SizeKey, a.RatingKey, row.amps[i])
				}
				if a.Engine != 1 || a.Bundle != 1 {
					t.Errorf("factors %g × %g for a run outside the engine space, unbundled; want 1 × 1", a.Engine, a.Bundle)
				}
			})
		}
	}
	// An insulation rating between columns takes the column below it.
	c := &schema.Conductor{Insulation: tempOf(t, "100 °C"), Bundle: 1}
	if a := in.Ampacity(c, sizeOf(t, "10 AWG")); a.Table != 55 || a.RatingKey != "90 °C" {
		t.Errorf("10 AWG rated 100 °C: %g A from column %q, want 55 A from 90 °C (highest rating not above its own)", a.Table, a.RatingKey)
	}
	// An insulation rating written in °F: 221 °F = 105 °C.
	c = &schema.Conductor{Insulation: tempOf(t, "221 °F"), Bundle: 1}
	if a := in.Ampacity(c, sizeOf(t, "10 AWG")); a.Table != 60 {
		t.Errorf("10 AWG rated 221 °F: %g A from column %q, want 60 A (105 °C column)", a.Table, a.RatingKey)
	}
}

// TestAmpacityEngineSpace checks the engine-space correction of 33 CFR
// 183.425 Table 5 note 1 (30 °C → 50 °C ambient). The factor row is from
// memory (REFERENCES.md §8, [from memory, M]; confirm in the eCFR text). The
// same section also recalls 0.85 for 105 °C wire ("445 → 378.3 A", from
// memory), which disagrees with this row's 0.86; the rulebook uses 0.86.
func TestAmpacityEngineSpace(t *testing.T) {
	in := ampInput(t, defaultRulebook(t))
	factors := []float64{0.58, 0.75, 0.79, 0.82, 0.86, 0.89, 1.00} // from memory, by table5Ratings
	for _, sz := range []string{"10 AWG", "4/0 AWG"} {
		var row [7]float64
		for _, r := range table5 {
			if sizeOf(t, r.size).MM2() == sizeOf(t, sz).MM2() {
				row = r.amps
			}
		}
		for i, rating := range table5Ratings {
			t.Run(sz+" "+rating, func(t *testing.T) {
				c := &schema.Conductor{Insulation: tempOf(t, rating), EngineSpace: true, Bundle: 1}
				a := in.Ampacity(c, sizeOf(t, sz))
				want := row[i] * factors[i]
				if a.Engine != factors[i] || math.Abs(a.Derated-want) > 1e-9 {
					t.Errorf("engine-space ampacity %g A × %g = %g A, want %g × %g = %g A (Table 5 note 1, from memory)", a.Table, a.Engine, a.Derated, row[i], factors[i], want)
				}
			})
		}
	}
	// The worked figure for the 105 °C column: 10 AWG 60 A × 0.86 = 51.6 A.
	c := &schema.Conductor{Insulation: tempOf(t, "105 °C"), EngineSpace: true, Bundle: 1}
	if a := in.Ampacity(c, sizeOf(t, "10 AWG")); math.Abs(a.Derated-51.6) > 1e-9 {
		t.Errorf("10 AWG 105 °C in an engine space: %g A, want 60 × 0.86 = 51.6 A", a.Derated)
	}
}

// TestAmpacityBundling checks the bundling factors of 33 CFR 183.425 Table
// 5 note 2 (REFERENCES.md §8, from memory, H; verify against the standard):
// 3 conductors 0.70, 4–6 0.60, 7–24 0.50, 25 and above 0.40. The default
// rulebook applies them at every voltage (minVoltage 0), though 33 CFR
// 183.435(b) makes them mandatory only at 50 V and above (REFERENCES §8
// [secondary]).
func TestAmpacityBundling(t *testing.T) {
	in := ampInput(t, defaultRulebook(t))
	rows := []struct {
		bundle int
		factor float64
	}{
		{1, 1.0}, {2, 1.0}, // below 3, no factor
		{3, 0.70},                       // from memory
		{4, 0.60}, {5, 0.60}, {6, 0.60}, // from memory
		{7, 0.50}, {12, 0.50}, {24, 0.50}, // from memory
		{25, 0.40}, {100, 0.40}, // from memory
	}
	for _, row := range rows {
		t.Run(fmt.Sprintf("%d conductors", row.bundle), func(t *testing.T) {
			c := &schema.Conductor{Insulation: tempOf(t, "105 °C"), Bundle: row.bundle}
			a := in.Ampacity(c, sizeOf(t, "8 AWG"))
			if a.Bundle != row.factor || math.Abs(a.Derated-80*row.factor) > 1e-9 {
				t.Errorf("%d bundled: 80 A × %g = %g A, want factor %g (Table 5 note 2, from memory)", row.bundle, a.Bundle, a.Derated, row.factor)
			}
		})
	}
	// Engine space and bundling multiply: 4 AWG 105 °C, 160 A × 0.86 × 0.70.
	c := &schema.Conductor{Insulation: tempOf(t, "105 °C"), EngineSpace: true, Bundle: 3}
	if a := in.Ampacity(c, sizeOf(t, "4 AWG")); math.Abs(a.Derated-160*0.86*0.70) > 1e-9 {
		t.Errorf("4 AWG 105 °C, engine space, 3 bundled: %g A, want 160 × 0.86 × 0.70 = %g A", a.Derated, 160*0.86*0.70)
	}
}

// TestAmpacityMetric checks that a metric size takes the Table 5 row of the
// largest AWG of no greater area. AWG areas are ASTM B258's (REFERENCES.md
// §2 computed areas [derived]); amperes 33 CFR 183.425 Table 5, 105 °C.
func TestAmpacityMetric(t *testing.T) {
	in := ampInput(t, defaultRulebook(t))
	rows := []struct {
		size, row string
		amps      float64
	}{
		{"1 mm²", "18 AWG", 20},    // 0.823 ≤ 1 < 1.309
		{"1.5 mm²", "16 AWG", 25},  // 1.309 ≤ 1.5 < 2.081
		{"2.5 mm²", "14 AWG", 35},  // 2.081 ≤ 2.5 < 3.309
		{"4 mm²", "12 AWG", 45},    // 3.309 ≤ 4 < 5.261
		{"6 mm²", "10 AWG", 60},    // 5.261 ≤ 6 < 8.366
		{"10 mm²", "8 AWG", 80},    // 8.366 ≤ 10 < 13.302
		{"16 mm²", "6 AWG", 120},   // 13.302 ≤ 16 < 21.151
		{"25 mm²", "4 AWG", 160},   // 21.151 ≤ 25 < 26.67 (3 AWG)
		{"35 mm²", "2 AWG", 210},   // 33.631 ≤ 35 < 42.408
		{"50 mm²", "1 AWG", 245},   // 42.408 ≤ 50 < 53.475
		{"70 mm²", "2/0 AWG", 330}, // 67.431 ≤ 70 < 85.029
		{"95 mm²", "3/0 AWG", 385}, // 85.029 ≤ 95 < 107.219
		{"120 mm²", "4/0 AWG", 445},
	}
	for _, row := range rows {
		t.Run(row.size, func(t *testing.T) {
			c := &schema.Conductor{Insulation: tempOf(t, "105 °C"), Bundle: 1}
			a := in.Ampacity(c, sizeOf(t, row.size))
			if !a.OK || a.SizeKey != row.row || a.Table != row.amps {
				t.Errorf("%s rated from row %q at %g A (%s), want row %s at %g A", row.size, a.SizeKey, a.Table, a.Note, row.row, row.amps)
			}
			if !strings.Contains(a.Note, "rated as "+row.row) {
				t.Errorf("note %q does not say it is rated as %s", a.Note, row.row)
			}
		})
	}
	// Smaller than the smallest row: no ampacity, not a silent zero.
	c := &schema.Conductor{Insulation: tempOf(t, "105 °C"), Bundle: 1}
	if a := in.Ampacity(c, sizeOf(t, "0.75 mm²")); a.OK {
		t.Errorf("0.75 mm² (below 18 AWG's 0.823 mm²) rated %g A from row %q; want no row", a.Table, a.SizeKey)
	}
}
