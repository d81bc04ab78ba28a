package checks

import (
	"math"
	"strings"
	"testing"

	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
	"github.com/ampwright/ampwright/schema/unit"
)

// dropOf runs the voltage-drop check over in and returns its one figure
// and one finding.
func dropOf(t *testing.T, in *Input) (result.Figure, result.Finding) {
	t.Helper()
	var rep Report
	VoltageDrop.Run(in, &rep)
	if len(rep.Figures) != 1 || len(rep.Findings) != 1 {
		t.Fatalf("voltage drop gave %d figures and %d findings, want 1 and 1", len(rep.Figures), len(rep.Findings))
	}
	return rep.Figures[0], rep.Findings[0]
}

// TestVoltageDropWorked checks the voltage-drop check against cases worked
// by hand. The default rulebook takes conductors at 30 °C, so
// R′(30) = R′(20) × (1 + 0.00393 × 10) = R′(20) × 1.0393.
func TestVoltageDropWorked(t *testing.T) {
	tests := []struct {
		name   string
		run    runSpec
		drop   float64 // percent, as the figure rounds it (3 places)
		limit  float64
		status result.Status
		change string // prefix of the suggested change, when failing
	}{
		{
			// 12 V, AWG and feet, plain copper.
			// A(10 AWG) = π/4 × (0.127 mm × 92^(26/39))² = π/4 × (2.5883 mm)² = 5.2612 mm²
			// R′(20) = 0.0172414 Ω·mm²/m ÷ 5.2612 mm² × 1.02 (lay) = 3.3426 mΩ/m
			// R′(30) = 3.3426 × 1.0393 = 3.4740 mΩ/m
			// ΔV = 10 A × 2 × 4.572 m (15 ft) × 3.4740 mΩ/m = 0.31766 V
			// drop = 0.31766 / 12 = 2.647 %, under the 10 % for "other".
			name:   "12 V 10 AWG 15 ft 10 A",
			run:    runSpec{size: "10 AWG", length: "15 ft", material: "copper", current: 10, volts: 12, class: "other"},
			drop:   2.647,
			limit:  10,
			status: result.Pass,
		},
		{
			// 24 V, mm² and metres, tinned.
			// R′(20) = 3.39 Ω/km (IEC 60228 class 5 tinned, 6 mm²)
			// R′(30) = 3.39 × 1.0393 = 3.5232 mΩ/m
			// ΔV = 20 A × 2 × 5 m × 3.5232 mΩ/m = 0.70465 V
			// drop = 0.70465 / 24 = 2.936 %, under the 3 % for "critical".
			name:   "24 V 6 mm² 5 m 20 A",
			run:    runSpec{size: "6 mm²", length: "5 m", material: "tinned-copper", current: 20, volts: 24, class: "critical"},
			drop:   2.936,
			limit:  3,
			status: result.Pass,
		},
		{
			// As above at 25 A: ΔV = 25 × 10 m × 3.5232 mΩ/m = 0.88081 V,
			// 0.88081 / 24 = 3.670 % > 3 %. 10 mm² tinned: 1.95 Ω/km × 1.0393
			// = 2.0266 mΩ/m; 25 × 10 × 2.0266e-3 = 0.50666 V = 2.11 %, and
			// 10 mm² is rated as 8 AWG, 80 A at 105 °C (33 CFR 183.425).
			name:   "24 V 6 mm² 5 m 25 A fails",
			run:    runSpec{size: "6 mm²", length: "5 m", material: "tinned-copper", current: 25, volts: 24, class: "critical"},
			drop:   3.670,
			limit:  3,
			status: result.Fail,
			change: "use 10 mm²: drop 2.11 % (limit 3 %), 80 A allowed",
		},
		{
			// The ABYC E-11 worked example (REFERENCES §8, from memory): a
			// 10 A bilge pump, 11 ft positive + 10 ft negative = 21 ft round
			// trip (10.5 ft = 3.2004 m one way), 12 V, 3 %.
			// A(12 AWG) = 3.3088 mm²; R′(20) = 0.0172414 ÷ 3.3088 × 1.02 = 5.3150 mΩ/m
			// R′(30) = 5.3150 × 1.0393 = 5.5239 mΩ/m
			// ΔV = 10 A × 6.4008 m × 5.5239 mΩ/m = 0.35357 V = 2.946 % ≤ 3 %:
			// 12 AWG plain copper passes, as ABYC's formula says.
			name:   "ABYC example 12 AWG copper",
			run:    runSpec{size: "12 AWG", length: "10.5 ft", material: "copper", current: 10, volts: 12, class: "critical"},
			drop:   2.946,
			limit:  3,
			status: result.Pass,
		},
		{
			// The same in tinned copper: × 1.04 → R′(30) = 5.7449 mΩ/m,
			// ΔV = 10 × 6.4008 × 5.7449e-3 = 0.36772 V = 3.064 % > 3 %. The
			// checker's tinning factor makes 12 AWG fail where ABYC's
			// formula (which has no tinning allowance) passes it.
			name:   "ABYC example 12 AWG tinned",
			run:    runSpec{size: "12 AWG", length: "10.5 ft", material: "tinned-copper", current: 10, volts: 12, class: "critical"},
			drop:   3.064,
			limit:  3,
			status: result.Fail,
			change: "use 10 AWG:",
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			in, _ := oneRun(t, tt.run)
			fig, f := dropOf(t, in)
			if math.Abs(fig.Value-tt.drop) > 0.0015 {
				t.Errorf("drop = %.3f %%, want %.3f %% (%s)", fig.Value, tt.drop, f.Message)
			}
			if f.Limit != tt.limit {
				t.Errorf("limit = %g %%, want %g %%", f.Limit, tt.limit)
			}
			if f.Status != tt.status {
				t.Errorf("status = %s, want %s (%s)", f.Status, tt.status, f.Message)
			}
			switch {
			case tt.status == result.Fail && !strings.HasPrefix(f.Change, tt.change):
				t.Errorf("change = %q, want it to begin %q", f.Change, tt.change)
			case tt.status == result.Pass && f.Change != "":
				t.Errorf("a passing run has a change: %q", f.Change)
			}
			if want := math.Round((f.Limit-f.Value)*100) / 100; math.Abs(f.Margin-want) > 0.011 {
				t.Errorf("margin = %g, want limit − value = %g", f.Margin, want)
			}
		})
	}
}

// TestVoltageDropUnits checks that the same physical conductor gives the
// same drop however it is written: 15 ft is 4.572 m exactly (NIST SP 811:
// 1 ft = 0.3048 m).
func TestVoltageDropUnits(t *testing.T) {
	pairs := []struct {
		name string
		a, b runSpec
	}{
		{
			"15 ft and 4.572 m",
			runSpec{size: "10 AWG", length: "15 ft", material: "copper", current: 10, volts: 12, class: "other"},
			runSpec{size: "10 AWG", length: "4.572 m", material: "copper", current: 10, volts: 12, class: "other"},
		},
		{
			"180 in and 457.2 cm",
			runSpec{size: "1/0 AWG", length: "180 in", material: "tinned-copper", current: 120, volts: 24, class: "critical"},
			runSpec{size: "0 AWG", length: "457.2 cm", material: "tinned-copper", current: 120, volts: 24, class: "critical"},
		},
	}
	for _, p := range pairs {
		t.Run(p.name, func(t *testing.T) {
			ina, ra := oneRun(t, p.a)
			inb, rb := oneRun(t, p.b)
			ma, mb := measure(ina, ra, ra.Spec.Size), measure(inb, rb, rb.Spec.Size)
			if math.Abs(ma.drop.Volts-mb.drop.Volts) > 1e-12*ma.drop.Volts || ma.drop.Volts == 0 {
				t.Errorf("drop %s = %.15g V, %s = %.15g V; want the same", p.a.length, ma.drop.Volts, p.b.length, mb.drop.Volts)
			}
			fa, _ := dropOf(t, ina)
			fb, _ := dropOf(t, inb)
			if fa.Value != fb.Value {
				t.Errorf("figures %v %% and %v %%; want the same", fa.Value, fb.Value)
			}
		})
	}
}

// TestABYCCircularMils checks the ABYC E-11 worked example by its own
// formula (REFERENCES §8: CM = K × I × L / E, K = 10.75 Ω·cmil/ft
// [secondary]; the example itself is from memory): 10 A over a 21 ft round
// trip at 3 % of 12 V (E = 0.36 V):
//
//	CM = 10.75 × 10 × 21 / 0.36 = 6270.8 cmil [derived]
//
// which lies between 14 AWG (4107 cmil) and 12 AWG (6530 cmil), so the
// smallest gauge of at least that area is 12 AWG. 1 cmil = π/4 × (0.0254
// mm)² = 5.067075e-4 mm².
func TestABYCCircularMils(t *testing.T) {
	const cmilMM2 = 5.067075e-4
	cm := 10.75 * 10 * 21 / 0.36
	if math.Abs(cm-6270.8) > 0.1 {
		t.Fatalf("CM = %.1f, want 6270.8", cm)
	}
	smallest := 99
	for _, g := range unit.StandardAWG() {
		if unit.AWGArea(g)*1e6/cmilMM2 >= cm {
			smallest = g
			break
		}
	}
	if smallest != 12 {
		t.Errorf("smallest AWG of at least %.0f cmil is %s, want 12 AWG", cm, unit.AWGName(smallest))
	}
	for _, c := range []struct {
		gauge int
		cmil  float64
	}{{14, 4110}, {12, 6530}, {10, 10380}} { // NEC Ch.9 Table 8 cmil column, REFERENCES §1 [secondary]
		if got := unit.AWGArea(c.gauge) * 1e6 / cmilMM2; math.Abs(relDev(got, c.cmil)) > 0.001 {
			t.Errorf("%s = %.0f cmil, want %.0f (NEC Table 8)", unit.AWGName(c.gauge), got, c.cmil)
		}
	}
	// ABYC's formula on 12 AWG gives ΔV = 10.75 × 10 × 21 / 6530 = 0.3457 V
	// = 2.881 % of 12 V. The checker, with plain copper at 30 °C and the
	// 1.02 lay factor, gives 2.946 %: within 3 % of ABYC's constant, which
	// is copper at about 29 °C and no lay allowance.
	in, _ := oneRun(t, runSpec{size: "12 AWG", length: "10.5 ft", material: "copper", current: 10, volts: 12, class: "critical"})
	fig, _ := dropOf(t, in)
	abyc := 10.75 * 10 * 21 / 6530 / 12 * 100
	if d := relDev(fig.Value, abyc); d < 0 || d > 0.03 {
		t.Errorf("checker drop %.3f %% against ABYC's formula %.3f %%: %+.2f %%, want 0 to +3 %% (lay factor and 30 °C)", fig.Value, abyc, 100*d)
	}
}

// TestSmallestPassingSize checks that the suggested size passes every
// wiring check and that the standard size below it fails.
func TestSmallestPassingSize(t *testing.T) {
	tests := []struct {
		name string
		run  runSpec
		want string // "" when no standard size passes
	}{
		{
			// Brackenwell's windlass run: 85 A over 40 ft of tinned 4 AWG
			// through a 50 °C engine space, 12 V, 10 %. Drops at R′(50 °C)
			// (ρ/A × 1.02 × 1.03 × 1.1179): 4 AWG 16.54 %, 3 AWG 13.11 %,
			// 2 AWG 10.40 %, 1 AWG 8.25 %.
			name: "windlass 4 AWG",
			run:  runSpec{size: "4 AWG", length: "40 ft", material: "tinned-copper", engineSpace: true, bundle: 3, current: 85, volts: 12, class: "other"},
			want: "1 AWG",
		},
		{
			// 60 A over 12 m at 24 V, 3 %: ΔV ≤ 0.72 V, so R′(30) ≤ 0.72 /
			// (60 × 24 m) = 0.500 mΩ/m, R′(20) ≤ 0.481 Ω/km: 35 mm² tinned
			// (0.565) fails, 50 mm² (0.393) passes.
			name: "24 V 16 mm² 12 m 60 A",
			run:  runSpec{size: "16 mm²", length: "12 m", material: "tinned-copper", current: 60, volts: 24, class: "critical"},
			want: "50 mm²",
		},
		{
			// Ampacity, not drop: 50 A on 14 AWG 105 °C (35 A allowed) over
			// 1 m; 10 AWG allows 60 A.
			name: "ampacity-bound 14 AWG",
			run:  runSpec{size: "14 AWG", length: "1 m", material: "tinned-copper", current: 50, volts: 12, class: "other"},
			want: "10 AWG",
		},
		{
			// A run that passes keeps its size.
			name: "passing 10 AWG",
			run:  runSpec{size: "10 AWG", length: "15 ft", material: "copper", current: 10, volts: 12, class: "other"},
			want: "10 AWG",
		},
		{
			// 500 A is more than 4/0 AWG 105 °C is allowed (445 A): none passes.
			name: "none passes",
			run:  runSpec{size: "4/0 AWG", length: "1 m", material: "tinned-copper", current: 500, volts: 12, class: "other"},
			want: "",
		},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			in, r := oneRun(t, tt.run)
			s, m, ok := SmallestPassingSize(in, r)
			if tt.want == "" {
				if ok {
					t.Fatalf("SmallestPassingSize = %s, want none", s)
				}
				if c := changeFor(in, r); !strings.HasPrefix(c, "no standard AWG size passes") {
					t.Errorf("change = %q, want it to say no standard size passes", c)
				}
				return
			}
			if !ok {
				t.Fatalf("SmallestPassingSize found none, want %s", tt.want)
			}
			if s.String() != tt.want {
				t.Errorf("SmallestPassingSize = %s, want %s (drop %.2f %%, %.4g A allowed)", s, tt.want, m.drop.Pct, m.amp.Derated)
			}
			if _, pass := passesWiring(in, r, s); !pass {
				t.Errorf("%s does not pass the wiring checks it was chosen by", s)
			}
			// Every standard size from the run's own up to the suggested one fails.
			var below []unit.Size
			for _, x := range standardSizes(in, r.Spec.Size) {
				if x.MM2() >= r.Spec.Size.MM2()*(1-1e-9) && x.MM2() < s.MM2()*(1-1e-9) {
					below = append(below, x)
				}
			}
			for _, x := range below {
				if m, pass := passesWiring(in, r, x); pass {
					t.Errorf("%s, smaller than the suggested %s, passes too (drop %.2f %%, %.4g A allowed)", x, s, m.drop.Pct, m.amp.Derated)
				}
			}
			if s.String() != tt.run.size && len(below) == 0 {
				t.Errorf("suggested %s for a run of %s, with no size between that fails", s, tt.run.size)
			}
			if len(below) > 0 {
				next := below[len(below)-1]
				if _, pass := passesWiring(in, r, next); pass {
					t.Errorf("the next size down, %s, passes", next)
				}
			}
			c := changeFor(in, r)
			switch {
			case s.String() == tt.run.size && c != "":
				t.Errorf("change for a passing run = %q, want none", c)
			case s.String() != tt.run.size && !strings.HasPrefix(c, "use "+tt.want+":"):
				t.Errorf("change = %q, want it to begin %q", c, "use "+tt.want+":")
			}
		})
	}
}

// TestInterruptingLiFePO4 checks the prospective fault current of a
// LiFePO4 bank and the devices' interrupting ratings. The bank is four
// 12.8 V 100 Ah blocks in parallel, 2 mΩ each (an illustrative figure, not
// a datasheet's): R_bank = 2 mΩ × 1 ÷ 4 = 0.5 mΩ.
//
// The fault is driven by the charged bank at rest, the rulebook's
// faultVoltage × nominal: 1.07 × 12.8 V = 13.696 V.
//
// At the bank terminal: I = 13.696 V ÷ 0.5 mΩ = 27,392 A.
//
// Beyond 1 m of tinned 2/0 AWG: A = 67.431 mm² (ASTM B258), R′(20 °C) =
// 0.0172414 ÷ 67.431 × 1.02 (lay) × 1.04 (tinned) = 0.271235 mΩ/m, loop
// 2 × 1 m × 0.271235 = 0.54247 mΩ, I = 13.696 ÷ (0.5 + 0.54247) mΩ = 13,138 A.
//
// Interrupting ratings are illustrative catalog values: a blade fuse
// 1000 A, a class T fuse 20,000 A.
func TestInterruptingLiFePO4(t *testing.T) {
	volt := func(q unit.Quantity) unit.Voltage { return unit.Voltage{Quantity: q} }
	ohm := func(q unit.Quantity) unit.Resistance { return unit.Resistance{Quantity: q} }
	blade := &schema.Protection{Part: schema.Part{ID: "blade30"}, Kind: "fuse", Rating: currentOf(t, "30 A"), Interrupting: currentOf(t, "1000 A")}
	classT := &schema.Protection{Part: schema.Part{ID: "classT300"}, Kind: "fuse", Rating: currentOf(t, "300 A"), Interrupting: currentOf(t, "20000 A")}
	tests := []struct {
		name   string
		device *schema.Protection
		atBank bool // the device is on the run from the bank, else beyond the 2/0 run
		fault  float64
		status result.Status
		change string
	}{
		{"blade at the bank", blade, true, 27392, result.Fail, "use a device rated to interrupt at least 27400 A"},
		{"class T at the bank", classT, true, 27392, result.Fail, "use a device rated to interrupt at least 27400 A"},
		{"class T beyond 1 m of 2/0", classT, false, 13138.0, result.Pass, ""},
		{"blade beyond 1 m of 2/0", blade, false, 13138.0, result.Fail, `use a device rated to interrupt at least 13200 A, or fit a main fuse of that interrupting rating between the bank and "bus"`},
		// With a main fuse already fitted on the feeder, the advice does not
		// propose one.
		{"blade beyond a main fuse", blade, false, 13138.0, result.Fail, "use a device rated to interrupt at least 13200 A"},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			d := testDesign(t, "12 V")
			d.Bank = &schema.Bank{Series: 1, Parallel: 4, Role: "house", EndOfLife: 1, Temperature: tempOf(t, "25 °C"), Battery: schema.Battery{
				Chemistry:  "lifepo4",
				Voltage:    mustQ(t, "12.8 V", unit.DimVoltage, volt),
				Capacity:   mustQ(t, "100 Ah", unit.DimCharge, func(q unit.Quantity) unit.Charge { return unit.Charge{Quantity: q} }),
				Resistance: mustQ(t, "2 mΩ", unit.DimResistance, ohm),
			}}
			d.Buses = map[string]schema.Bus{"bus": {Kind: "busbar"}}
			d.Loads["load"] = schema.Load{Circuit: "bus-load", Kind: "general", Current: ptr(currentOf(t, "5 A")), Duty: 1, Quantity: 1}
			feed := conductor(t, "bank", "bus", "2/0 AWG", "1 m")
			branch := conductor(t, "bus", "load", "10 AWG", "2 m")
			subject := "bus-load"
			if tt.atBank {
				feed.Protection, subject = tt.device, "bank-bus"
			} else {
				branch.Protection = tt.device
			}
			if tt.name == "blade beyond a main fuse" {
				feed.Protection = classT
			}
			d.Wiring["bank-bus"], d.Wiring["bus-load"] = feed, branch
			in := build(t, d)
			var rep Report
			Interrupting.Run(in, &rep)
			var fig result.Figure
			var f result.Finding
			for i := range rep.Findings {
				if rep.Findings[i].Subject == subject {
					f, fig = rep.Findings[i], rep.Figures[i]
				}
			}
			if f.Subject != subject {
				t.Fatalf("finding on %q, want %q", f.Subject, subject)
			}
			if math.Abs(fig.Value-tt.fault) > 0.5 {
				t.Errorf("fault current = %.1f A, want %.1f A (%s)", fig.Value, tt.fault, f.Message)
			}
			if f.Limit != tt.device.Interrupting.Amps() {
				t.Errorf("limit = %g A, want the device's %g A", f.Limit, tt.device.Interrupting.Amps())
			}
			if f.Status != tt.status {
				t.Errorf("status = %s, want %s (%s)", f.Status, tt.status, f.Message)
			}
			if f.Change != tt.change {
				t.Errorf("change = %q, want %q", f.Change, tt.change)
			}
		})
	}
}
