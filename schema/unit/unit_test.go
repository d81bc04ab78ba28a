package unit

import (
	"encoding/json"
	"errors"
	"math"
	"strings"
	"testing"
)

// closeTo reports whether got is within rel of want, relative to want, or
// exactly equal when want is zero.
func closeTo(got, want, rel float64) bool {
	if want == 0 {
		return got == 0
	}
	return math.Abs(got-want) <= rel*math.Abs(want)
}

var parseTests = []struct {
	name   string
	in     string
	dim    Dim
	value  float64 // SI
	unit   string
	number float64
}{
	{"metres", "4.5 m", DimLength, 4.5, "m", 4.5},
	{"metres without space", "4.5m", DimLength, 4.5, "m", 4.5},
	{"centimetres", "30 cm", DimLength, 0.3, "cm", 30},
	{"millimetres", "250 mm", DimLength, 0.25, "mm", 250},
	{"feet", "15 ft", DimLength, 4.572, "ft", 15},
	{"inches", "6 in", DimLength, 0.1524, "in", 6},
	{"leading and trailing space", "  4.5 m\t", DimLength, 4.5, "m", 4.5},
	{"non-breaking space", "4.5\u00a0m", DimLength, 4.5, "m", 4.5},
	{"narrow no-break space", "4.5\u202fm", DimLength, 4.5, "m", 4.5},
	{"zero", "0 m", DimLength, 0, "m", 0},
	{"leading decimal point", ".5 m", DimLength, 0.5, "m", 0.5},

	{"AWG", "10 AWG", DimSize, 5.261e-6, "AWG", 10},
	{"AWG without space", "10AWG", DimSize, 5.261e-6, "AWG", 10},
	{"AWG lower case", "10 awg", DimSize, 5.261e-6, "AWG", 10},
	{"thinnest AWG", "40 AWG", DimSize, AWGArea(40), "AWG", 40},
	{"1/0 AWG", "1/0 AWG", DimSize, 53.475e-6, "AWG", 0},
	{"2/0 AWG", "2/0 AWG", DimSize, 67.431e-6, "AWG", -1},
	{"3/0 AWG", "3/0 AWG", DimSize, 85.029e-6, "AWG", -2},
	{"4/0 AWG", "4/0 AWG", DimSize, 107.219e-6, "AWG", -3},
	{"4/0 AWG without space", "4/0AWG", DimSize, 107.219e-6, "AWG", -3},
	{"0 AWG", "0 AWG", DimSize, 53.475e-6, "AWG", 0},
	{"00 AWG", "00 AWG", DimSize, 67.431e-6, "AWG", -1},
	{"000 AWG", "000 AWG", DimSize, 85.029e-6, "AWG", -2},
	{"0000 AWG", "0000 AWG", DimSize, 107.219e-6, "AWG", -3},
	{"square millimetres", "6 mm²", DimSize, 6e-6, "mm²", 6},
	{"square millimetres with 2", "6 mm2", DimSize, 6e-6, "mm²", 6},
	{"square millimetres without space", "2.5mm²", DimSize, 2.5e-6, "mm²", 2.5},

	{"volts", "12 V", DimVoltage, 12, "V", 12},
	{"volts without space", "12V", DimVoltage, 12, "V", 12},
	{"millivolts", "50 mV", DimVoltage, 0.05, "mV", 50},
	{"kilovolts", "1.5 kV", DimVoltage, 1500, "kV", 1.5},

	{"amperes", "8.5 A", DimCurrent, 8.5, "A", 8.5},
	{"milliamperes", "500 mA", DimCurrent, 0.5, "mA", 500},

	{"watts", "60 W", DimPower, 60, "W", 60},
	{"kilowatts", "1.2 kW", DimPower, 1200, "kW", 1.2},
	{"exponent", "1e3 W", DimPower, 1000, "W", 1000},
	{"exponent with sign", "1.5E+3 W", DimPower, 1500, "W", 1500},

	{"watt-hours", "850 Wh", DimEnergy, 850 * 3600, "Wh", 850},
	{"kilowatt-hours", "1.2 kWh", DimEnergy, 1.2e3 * 3600, "kWh", 1.2},

	{"ampere-hours", "100 Ah", DimCharge, 360000, "Ah", 100},
	{"milliampere-hours", "2500 mAh", DimCharge, 9000, "mAh", 2500},

	{"celsius", "45 °C", DimTemperature, 45, "°C", 45},
	{"celsius without space", "45°C", DimTemperature, 45, "°C", 45},
	{"celsius masculine ordinal", "45 ºC", DimTemperature, 45, "°C", 45},
	{"celsius sign", "45 ℃", DimTemperature, 45, "°C", 45},
	{"celsius degC", "45 degC", DimTemperature, 45, "°C", 45},
	{"celsius negative", "-10 °C", DimTemperature, -10, "°C", -10},
	{"celsius minus sign", "\u221210 °C", DimTemperature, -10, "°C", -10},
	{"celsius absolute zero", "-273.15 °C", DimTemperature, -273.15, "°C", -273.15},
	{"fahrenheit", "113 °F", DimTemperature, 45, "°F", 113},
	{"fahrenheit masculine ordinal", "113 ºF", DimTemperature, 45, "°F", 113},
	{"fahrenheit sign", "113 ℉", DimTemperature, 45, "°F", 113},
	{"fahrenheit degF", "113 degF", DimTemperature, 45, "°F", 113},
	{"kelvin", "318.15 K", DimTemperature, 45, "K", 318.15},

	{"kWh/m²/day", "5.8 kWh/m²/day", DimIrradiation, 5.8 * 3.6e6, "kWh/m²/day", 5.8},
	{"kWh/m2/day", "4.2 kWh/m2/day", DimIrradiation, 4.2 * 3.6e6, "kWh/m²/day", 4.2},
	{"Wh/m²/day", "5800 Wh/m²/day", DimIrradiation, 5800 * 3600, "Wh/m²/day", 5800},
	{"Wh/m2/day", "5800 Wh/m2/day", DimIrradiation, 5800 * 3600, "Wh/m²/day", 5800},
	{"MJ/m²/day", "20.88 MJ/m²/day", DimIrradiation, 20.88e6, "MJ/m²/day", 20.88},
	{"MJ/m2/day", "20.88 MJ/m2/day", DimIrradiation, 20.88e6, "MJ/m²/day", 20.88},

	{"percent per degree Celsius", "-0.29 %/°C", DimTempCoeff, -0.0029, "%/°C", -0.29},
	{"percent per degree Celsius, ordinal", "-0.29 %/ºC", DimTempCoeff, -0.0029, "%/°C", -0.29},
	{"percent per degC", "-0.29 %/degC", DimTempCoeff, -0.0029, "%/°C", -0.29},
	{"percent per kelvin", "-0.4 %/K", DimTempCoeff, -0.004, "%/K", -0.4},
	{"percent per kelvin, positive", "0.05 %/K", DimTempCoeff, 0.0005, "%/K", 0.05},

	{"ohms, Greek omega", "2 \u03a9", DimResistance, 2, "Ω", 2},
	{"ohms, ohm sign", "2 \u2126", DimResistance, 2, "Ω", 2},
	{"ohms, word", "0.004 ohm", DimResistance, 0.004, "Ω", 0.004},
	{"ohms, capital word", "0.004 Ohm", DimResistance, 0.004, "Ω", 0.004},
	{"milliohms, Greek omega", "2.5 m\u03a9", DimResistance, 0.0025, "mΩ", 2.5},
	{"milliohms, ohm sign", "2.5 m\u2126", DimResistance, 0.0025, "mΩ", 2.5},
	{"milliohms, word", "2.5 mohm", DimResistance, 0.0025, "mΩ", 2.5},
	{"kilohms", "10 kΩ", DimResistance, 10000, "kΩ", 10},
}

func TestParse(t *testing.T) {
	for _, tt := range parseTests {
		t.Run(tt.name, func(t *testing.T) {
			q, err := Parse(tt.in)
			if err != nil {
				t.Fatalf("Parse(%q): %v", tt.in, err)
			}
			if q.Dim != tt.dim {
				t.Errorf("Parse(%q).Dim = %v, want %v", tt.in, q.Dim, tt.dim)
			}
			// AWG values are checked against published areas rounded
			// to 5 figures; everything else is exact.
			rel := 1e-12
			if q.Unit == "AWG" && tt.number != 40 {
				rel = 1e-4
			}
			if !closeTo(q.Value, tt.value, rel) {
				t.Errorf("Parse(%q).Value = %g, want %g", tt.in, q.Value, tt.value)
			}
			if q.Unit != tt.unit {
				t.Errorf("Parse(%q).Unit = %q, want %q", tt.in, q.Unit, tt.unit)
			}
			if q.Number != tt.number {
				t.Errorf("Parse(%q).Number = %g, want %g", tt.in, q.Number, tt.number)
			}
			if want := strings.TrimSpace(tt.in); q.Text != want {
				t.Errorf("Parse(%q).Text = %q, want %q", tt.in, q.Text, want)
			}
			q2, err := ParseAs(tt.in, tt.dim)
			if err != nil || q2 != q {
				t.Errorf("ParseAs(%q, %v) = %+v, %v; want %+v, nil", tt.in, tt.dim, q2, err, q)
			}
		})
	}
}

// NIST SP 811, Appendix B: the foot and the inch are exact multiples of the
// metre.
func TestImperialLengthExact(t *testing.T) {
	tests := []struct {
		name string
		in   string
		want float64
	}{
		{"foot", "1 ft", 0.3048},
		{"inch", "1 in", 0.0254},
		{"twelve inches", "12 in", 0.3048},
		{"15 feet", "15 ft", 4.572},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			q, err := ParseAs(tt.in, DimLength)
			if err != nil {
				t.Fatal(err)
			}
			if q.Value != tt.want {
				t.Errorf("ParseAs(%q).Value = %.17g, want exactly %.17g", tt.in, q.Value, tt.want)
			}
		})
	}
}

func TestTemperatureScales(t *testing.T) {
	tests := []struct {
		name string
		in   string
		want float64 // °C
	}{
		{"freezing point", "32 °F", 0},
		{"boiling point", "212 °F", 100},
		{"scales cross", "-40 °F", -40},
		{"engine room", "113 °F", 45},
		{"absolute zero in °F", "-459.67 °F", -273.15},
		{"absolute zero in K", "0 K", -273.15},
		{"melting ice in K", "273.15 K", 0},
		{"boiling water in K", "373.15 K", 100},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			var temp Temperature
			if err := temp.UnmarshalText([]byte(tt.in)); err != nil {
				t.Fatal(err)
			}
			if got := temp.Celsius(); math.Abs(got-tt.want) > 1e-12*math.Max(1, math.Abs(tt.want)) {
				t.Errorf("%q = %.17g °C, want %g °C", tt.in, got, tt.want)
			}
		})
	}
}

// The AWG areas derived from the ASTM B258 formula agree with the
// circular-mil areas 10 AWG = 10,380 cmil and 4/0 = 211,600 cmil of the
// published solid-wire tables. The areas in mm² are derived from the same
// formula, rounded to three decimals.
func TestAWGArea(t *testing.T) {
	tests := []struct {
		name  string
		gauge int
		mm2   float64
	}{
		{"18 AWG", 18, 0.823},
		{"16 AWG", 16, 1.309},
		{"14 AWG", 14, 2.081},
		{"12 AWG", 12, 3.309},
		{"10 AWG", 10, 5.261},
		{"8 AWG", 8, 8.366},
		{"6 AWG", 6, 13.302},
		{"4 AWG", 4, 21.151},
		{"2 AWG", 2, 33.631},
		{"1 AWG", 1, 42.408},
		{"1/0 AWG", 0, 53.475},
		{"2/0 AWG", -1, 67.431},
		{"3/0 AWG", -2, 85.029},
		{"4/0 AWG", -3, 107.219},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := AWGArea(tt.gauge) * 1e6
			if math.Abs(got-tt.mm2) > 0.0005 {
				t.Errorf("AWGArea(%d) = %.4f mm², want %.3f mm²", tt.gauge, got, tt.mm2)
			}
			if name := AWGName(tt.gauge); name != tt.name {
				t.Errorf("AWGName(%d) = %q, want %q", tt.gauge, name, tt.name)
			}
		})
	}
}

// ASTM B258 formula; areas as published in NEC Chapter 9 Table 8 area
// column.
func TestAWGAreaPublished(t *testing.T) {
	tests := []struct {
		name  string
		gauge int
		mm2   float64
		tol   float64 // half a unit in the last published digit
	}{
		{"10 AWG", 10, 5.261, 0.0005},
		{"4/0 AWG", -3, 107.2, 0.05},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := AWGArea(tt.gauge) * 1e6; math.Abs(got-tt.mm2) > tt.tol {
				t.Errorf("AWGArea(%d) = %.4f mm², want %g mm²", tt.gauge, got, tt.mm2)
			}
		})
	}
}

func TestAWGCircularMils(t *testing.T) {
	// A circular mil is the area of a circle one mil (0.001 in) across:
	// π/4 × (0.0254 mm)².
	const mm2PerCmil = 0.000506707479
	tests := []struct {
		name  string
		gauge int
		cmil  float64
	}{
		{"10 AWG", 10, 10380},
		{"4/0 AWG", -3, 211600},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			got := AWGArea(tt.gauge) * 1e6 / mm2PerCmil
			if !closeTo(got, tt.cmil, 0.001) {
				t.Errorf("AWGArea(%d) = %.1f cmil, want %g cmil within 0.1 %%", tt.gauge, got, tt.cmil)
			}
		})
	}
}

func TestAWGDiameter(t *testing.T) {
	tests := []struct {
		name   string
		gauge  int
		inches float64
	}{
		{"36 AWG", 36, 0.0050},
		{"4/0 AWG", -3, 0.4600},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			if got := AWGDiameter(tt.gauge) / 0.0254; !closeTo(got, tt.inches, 1e-12) {
				t.Errorf("AWGDiameter(%d) = %.6f in, want %.4f in", tt.gauge, got, tt.inches)
			}
		})
	}
}

func TestStandardSizes(t *testing.T) {
	awg := StandardAWG()
	for i := 1; i < len(awg); i++ {
		if AWGArea(awg[i]) <= AWGArea(awg[i-1]) {
			t.Errorf("StandardAWG: %s is not thicker than %s", AWGName(awg[i]), AWGName(awg[i-1]))
		}
	}
	if first, last := awg[0], awg[len(awg)-1]; first != 18 || last != -3 {
		t.Errorf("StandardAWG runs from %s to %s, want 18 AWG to 4/0 AWG", AWGName(first), AWGName(last))
	}
	metric := StandardMetric()
	for i := 1; i < len(metric); i++ {
		if metric[i] <= metric[i-1] {
			t.Errorf("StandardMetric: %g mm² follows %g mm²", metric[i], metric[i-1])
		}
	}
	if first, last := metric[0], metric[len(metric)-1]; len(metric) != 18 || first != 0.5 || last != 240 {
		t.Errorf("StandardMetric has %d sizes from %g to %g mm², want 18 from 0.5 to 240", len(metric), first, last)
	}
	// Callers may change the slices they get.
	awg[0], metric[0] = 99, 99
	if StandardAWG()[0] != 18 || StandardMetric()[0] != 0.5 {
		t.Error("StandardAWG or StandardMetric returns a shared slice")
	}
}

func TestParseErrors(t *testing.T) {
	tests := []struct {
		name   string
		in     string
		want   Dim
		msg    string
		reason string
		got    Dim
	}{
		{"unknown unit", "4.5 meters", DimLength,
			`"4.5 meters" is not a length (unknown unit "meters"); expected a value such as "4.5 m" or "15 ft"`,
			`unknown unit "meters"`, Invalid},
		{"unknown unit, any dim", "4.5 meters", Invalid,
			`"4.5 meters": unknown unit "meters"`, `unknown unit "meters"`, Invalid},
		{"unknown unit without space", "4.5meters", DimLength,
			`"4.5meters" is not a length (unknown unit "meters"); expected a value such as "4.5 m" or "15 ft"`,
			`unknown unit "meters"`, Invalid},
		{"upper case unit", "4.5 MM", DimLength,
			`"4.5 MM" is not a length (unknown unit "MM", did you mean "mm"?); expected a value such as "4.5 m" or "15 ft"`,
			`unknown unit "MM", did you mean "mm"?`, Invalid},
		{"capital K in kWh", "1.2 KWh", DimEnergy,
			`"1.2 KWh" is not an energy (unknown unit "KWh", did you mean "kWh"?); expected a value such as "850 Wh" or "1.2 kWh"`,
			`unknown unit "KWh", did you mean "kWh"?`, Invalid},
		{"bare C", "45 C", DimTemperature,
			`"45 C" is not a temperature (unknown unit "C", did you mean "°C"?); expected a value such as "45 °C" or "113 °F"`,
			`unknown unit "C", did you mean "°C"?`, Invalid},
		{"bare F", "113 F", Invalid, `"113 F": unknown unit "F", did you mean "°F"?`,
			`unknown unit "F", did you mean "°F"?`, Invalid},
		{"foot mark", "15'", DimLength,
			`"15'" is not a length (unknown unit "'"); expected a value such as "4.5 m" or "15 ft"`,
			`unknown unit "'"`, Invalid},
		{"decimal comma", "4,5 m", DimLength,
			`"4,5 m" is not a length (use a decimal point); expected a value such as "4.5 m" or "15 ft"`,
			"use a decimal point", DimLength},
		{"digit grouping", "1,200 W", Invalid, `"1,200 W": use a decimal point`, "use a decimal point", DimPower},
		{"unit alone", "m", DimLength,
			`"m" is not a length (no number); expected a value such as "4.5 m" or "15 ft"`, "no number", Invalid},
		{"word for number", "abc V", DimVoltage,
			`"abc V" is not a voltage (not a number); expected a value such as "12 V" or "14.4 V"`,
			"not a number", DimVoltage},
		{"two decimal points", "1.2.3 V", DimVoltage,
			`"1.2.3 V" is not a voltage (not a number); expected a value such as "12 V" or "14.4 V"`,
			"not a number", DimVoltage},
		{"hexadecimal", "0x10 V", DimVoltage,
			`"0x10 V" is not a voltage (not a number); expected a value such as "12 V" or "14.4 V"`,
			"not a number", DimVoltage},
		{"underscore", "1_000 W", Invalid, `"1_000 W": not a number`, "not a number", DimPower},
		{"plus sign", "+12 V", DimVoltage,
			`"+12 V" is not a voltage (leading plus sign); expected a value such as "12 V" or "14.4 V"`,
			"leading plus sign", DimVoltage},
		{"two spaces", "4.5  m", DimLength,
			`"4.5  m" is not a length (more than one space before the unit); expected a value such as "4.5 m" or "15 ft"`,
			"more than one space before the unit", Invalid},
		{"no unit", "4.5", DimLength,
			`"4.5" has no unit; expected a length such as "4.5 m" or "15 ft"`, "no unit", Invalid},
		{"no unit, any dim", "4.5", Invalid, `"4.5": no unit`, "no unit", Invalid},
		{"empty", "", DimLength, `"" is empty; expected a length such as "4.5 m" or "15 ft"`, "empty", Invalid},
		{"empty, any dim", "", Invalid, `"": empty`, "empty", Invalid},
		{"whitespace only", " \t ", DimCurrent,
			`" \t " is empty; expected a current such as "8.5 A" or "500 mA"`, "empty", Invalid},
		{"negative length", "-4.5 m", DimLength, `"-4.5 m" is negative; a length must be zero or more`,
			"negative", DimLength},
		{"negative length, any dim", "-4.5 m", Invalid, `"-4.5 m" is negative; a length must be zero or more`,
			"negative", DimLength},
		{"negative current", "-3 A", DimCurrent, `"-3 A" is negative; a current must be zero or more`,
			"negative", DimCurrent},
		{"negative energy", "-1 kWh", Invalid, `"-1 kWh" is negative; an energy must be zero or more`,
			"negative", DimEnergy},
		{"negative zero", "-0 m", DimLength, `"-0 m" is negative; a length must be zero or more`,
			"negative", DimLength},
		{"NaN", "NaN V", DimVoltage,
			`"NaN V" is not a voltage (not a number); expected a value such as "12 V" or "14.4 V"`,
			"not a number", DimVoltage},
		{"lower case nan", "nan m", DimLength,
			`"nan m" is not a length (not a number); expected a value such as "4.5 m" or "15 ft"`,
			"not a number", DimLength},
		{"Inf", "Inf W", DimPower,
			`"Inf W" is not a power (not finite); expected a value such as "60 W" or "1.2 kW"`,
			"not finite", DimPower},
		{"negative infinity", "-Infinity °C", Invalid, `"-Infinity °C": not finite`, "not finite", DimTemperature},
		{"overflow", "1e400 W", Invalid, `"1e400 W": not finite`, "not finite", DimPower},
		{"overflow in conversion", "1e305 kWh", Invalid, `"1e305 kWh": not finite`, "not finite", DimEnergy},
		{"wrong dimension", "12 V", DimLength, `"12 V" is a voltage; a length is expected, such as "4.5 m" or "15 ft"`,
			"", DimVoltage},
		{"wrong dimension, an", "100 A", DimEnergy,
			`"100 A" is a current; an energy is expected, such as "850 Wh" or "1.2 kWh"`, "", DimCurrent},
		{"wrong dimension before sign", "-12 V", DimLength,
			`"-12 V" is a voltage; a length is expected, such as "4.5 m" or "15 ft"`, "", DimVoltage},
		{"charge for energy", "100 Ah", DimEnergy,
			`"100 Ah" is a charge; an energy is expected, such as "850 Wh" or "1.2 kWh"`, "", DimCharge},
		{"below absolute zero", "-300 °C", DimTemperature,
			`"-300 °C" is below absolute zero; a temperature must be -273.15 °C (0 K, -459.67 °F) or more`,
			"below absolute zero", DimTemperature},
		{"negative kelvin", "-1 K", Invalid,
			`"-1 K" is below absolute zero; a temperature must be -273.15 °C (0 K, -459.67 °F) or more`,
			"below absolute zero", DimTemperature},
		{"below absolute zero in °F", "-460 °F", Invalid,
			`"-460 °F" is below absolute zero; a temperature must be -273.15 °C (0 K, -459.67 °F) or more`,
			"below absolute zero", DimTemperature},
		{"AWG without the word", "2/0", DimSize,
			`"2/0" has no unit; expected a conductor size such as "10 AWG" or "6 mm²"`, "no unit", Invalid},
		{"AWG too thick", "5/0 AWG", DimSize,
			`"5/0 AWG" is not a conductor size (no AWG gauge "5/0", gauges run from 40 to 4/0); expected a value such as "10 AWG" or "6 mm²"`,
			`no AWG gauge "5/0", gauges run from 40 to 4/0`, DimSize},
		{"AWG too thin", "41 AWG", Invalid, `"41 AWG": no AWG gauge "41", gauges run from 40 to 4/0`,
			`no AWG gauge "41", gauges run from 40 to 4/0`, DimSize},
		{"AWG five zeros", "00000 AWG", Invalid, `"00000 AWG": no AWG gauge "00000", gauges run from 40 to 4/0`,
			`no AWG gauge "00000", gauges run from 40 to 4/0`, DimSize},
		{"AWG leading zero", "010 AWG", Invalid, `"010 AWG": no AWG gauge "010", gauges run from 40 to 4/0`,
			`no AWG gauge "010", gauges run from 40 to 4/0`, DimSize},
		{"AWG decimal", "10.5 AWG", DimSize,
			`"10.5 AWG" is not a conductor size (AWG gauges are whole numbers); expected a value such as "10 AWG" or "6 mm²"`,
			"AWG gauges are whole numbers", DimSize},
		{"AWG fraction", "1/2 AWG", Invalid, `"1/2 AWG": not a number`, "not a number", DimSize},
		{"AWG negative", "-10 AWG", DimSize, `"-10 AWG" is negative; a conductor size must be zero or more`,
			"negative", DimSize},
		{"AWG sign alone", "-AWG", Invalid, `"-AWG": not a number`, "not a number", DimSize},
		{"fraction for other units", "1/2 in", DimLength,
			`"1/2 in" is not a length (not a number); expected a value such as "4.5 m" or "15 ft"`,
			"not a number", DimLength},
		{"AWG as length", "10 AWG", DimLength,
			`"10 AWG" is a conductor size; a length is expected, such as "4.5 m" or "15 ft"`, "", DimSize},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			q, err := ParseAs(tt.in, tt.want)
			if err == nil {
				t.Fatalf("ParseAs(%q, %v) = %+v, want error", tt.in, tt.want, q)
			}
			if q != (Quantity{}) {
				t.Errorf("ParseAs(%q, %v) returned %+v with its error, want the zero Quantity", tt.in, tt.want, q)
			}
			if got := err.Error(); got != tt.msg {
				t.Errorf("ParseAs(%q, %v) error:\n got %s\nwant %s", tt.in, tt.want, got, tt.msg)
			}
			var e *Error
			if !errors.As(err, &e) {
				t.Fatalf("ParseAs(%q, %v) error is %T, want *Error", tt.in, tt.want, err)
			}
			if e.Reason != tt.reason {
				t.Errorf("Reason = %q, want %q", e.Reason, tt.reason)
			}
			if e.Got != tt.got {
				t.Errorf("Got = %v, want %v", e.Got, tt.got)
			}
			if e.Want != tt.want || e.Input != tt.in {
				t.Errorf("Want, Input = %v, %q; want %v, %q", e.Want, e.Input, tt.want, tt.in)
			}
		})
	}
}

func TestDims(t *testing.T) {
	tests := []struct {
		dim      Dim
		name     string
		text     string
		examples string
	}{
		{DimLength, "length", "length", `"4.5 m" or "15 ft"`},
		{DimSize, "size", "conductor size", `"10 AWG" or "6 mm²"`},
		{DimVoltage, "voltage", "voltage", `"12 V" or "14.4 V"`},
		{DimCurrent, "current", "current", `"8.5 A" or "500 mA"`},
		{DimPower, "power", "power", `"60 W" or "1.2 kW"`},
		{DimEnergy, "energy", "energy", `"850 Wh" or "1.2 kWh"`},
		{DimCharge, "charge", "charge", `"100 Ah" or "280 Ah"`},
		{DimTemperature, "temperature", "temperature", `"45 °C" or "113 °F"`},
		{DimIrradiation, "irradiation", "daily irradiation", `"5.8 kWh/m²/day" or "4.2 kWh/m2/day"`},
		{DimTempCoeff, "tempcoeff", "temperature coefficient", `"-0.29 %/°C" or "-0.4 %/K"`},
		{DimResistance, "resistance", "resistance", `"2.5 mΩ" or "0.004 ohm"`},
	}
	dims := Dims()
	if len(dims) != len(tests) {
		t.Fatalf("Dims() has %d dims, want %d", len(dims), len(tests))
	}
	for i, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			d := tt.dim
			if dims[i] != d {
				t.Errorf("Dims()[%d] = %v, want %v", i, dims[i], d)
			}
			if got := d.String(); got != tt.text {
				t.Errorf("String() = %q, want %q", got, tt.text)
			}
			if got := d.Name(); got != tt.name {
				t.Errorf("Name() = %q, want %q", got, tt.name)
			}
			if got := d.Examples(); got != tt.examples {
				t.Errorf("Examples() = %q, want %q", got, tt.examples)
			}
			if got, ok := DimByName(d.Name()); got != d || !ok {
				t.Errorf("DimByName(%q) = %v, %v; want %v, true", d.Name(), got, ok, d)
			}
			// The examples shown in error messages must themselves be
			// good values.
			for _, ex := range dimInfo[d].examples {
				if _, err := ParseAs(ex, d); err != nil {
					t.Errorf("example %q: %v", ex, err)
				}
			}
		})
	}
	for _, name := range []string{"", "Length", "invalid", "area"} {
		if d, ok := DimByName(name); ok {
			t.Errorf("DimByName(%q) = %v, true; want false", name, d)
		}
	}
	if got := Invalid.Name() + Invalid.Examples(); got != "" {
		t.Errorf("Invalid.Name() + Invalid.Examples() = %q, want empty", got)
	}
	if got := Dim(99).String(); got != "Dim(99)" {
		t.Errorf("Dim(99).String() = %q, want %q", got, "Dim(99)")
	}
}

func TestQuantityString(t *testing.T) {
	tests := []struct {
		name     string
		in       string
		want     string
		imperial bool
	}{
		{"metres", "4.5m", "4.5 m", false},
		{"two spaces", "15  ft", "", true},
		{"feet", "15ft", "15 ft", true},
		{"inches", "6 in", "6 in", true},
		{"AWG", "10awg", "10 AWG", true},
		{"2/0 AWG", "00 AWG", "2/0 AWG", true},
		{"mm2", "6 mm2", "6 mm²", false},
		{"fahrenheit", "113ºF", "113 °F", true},
		{"celsius", "45 degC", "45 °C", false},
		{"kelvin", "300 K", "300 K", false},
		{"temperature coefficient", "-0.29 %/degC", "-0.29 %/°C", false},
		{"milliohm", "2.5 mohm", "2.5 mΩ", false},
		{"irradiation", "4.2 kWh/m2/day", "4.2 kWh/m²/day", false},
		{"exponent", "1e3 W", "1000 W", false},
		{"large", "1e21 W", "1e+21 W", false},
	}
	for _, tt := range tests {
		t.Run(tt.name, func(t *testing.T) {
			q, err := Parse(tt.in)
			if tt.want == "" {
				if err == nil {
					t.Fatalf("Parse(%q) = %v, want error", tt.in, q)
				}
				return
			}
			if err != nil {
				t.Fatal(err)
			}
			if got := q.String(); got != tt.want {
				t.Errorf("Parse(%q).String() = %q, want %q", tt.in, got, tt.want)
			}
			if got := q.Imperial(); got != tt.imperial {
				t.Errorf("Parse(%q).Imperial() = %v, want %v", tt.in, got, tt.imperial)
			}
			b, err := q.MarshalText()
			if err != nil || string(b) != tt.in {
				t.Errorf("Parse(%q).MarshalText() = %q, %v; want the input", tt.in, b, err)
			}
		})
	}
	if got := (Quantity{}).String(); got != "" {
		t.Errorf("zero Quantity String() = %q, want empty", got)
	}
	q := Quantity{Value: 4.5, Dim: DimLength, Unit: "m", Number: 4.5}
	if b, _ := q.MarshalText(); string(b) != "4.5 m" {
		t.Errorf("MarshalText without Text = %q, want %q", b, "4.5 m")
	}
}

func TestAccessors(t *testing.T) {
	var (
		l  Length
		sa Size
		sm Size
		v  Voltage
		c  Current
		p  Power
		e  Energy
		ek Energy
		q  Charge
		tf Temperature
		ir Irradiation
		im Irradiation
		tc TempCoeff
		r  Resistance
	)
	rows := []struct {
		name string
		in   string
		dst  interface{ UnmarshalText([]byte) error }
		get  func() float64
		want float64
		rel  float64
	}{
		{"Length.Metres", "15 ft", &l, func() float64 { return l.Metres() }, 4.572, 0},
		{"Size.MM2 AWG", "10 AWG", &sa, func() float64 { return sa.MM2() }, 5.261, 1e-4},
		{"Size.MM2 metric", "6 mm2", &sm, func() float64 { return sm.MM2() }, 6, 0},
		{"Voltage.Volts", "500 mV", &v, func() float64 { return v.Volts() }, 0.5, 0},
		{"Current.Amps", "500 mA", &c, func() float64 { return c.Amps() }, 0.5, 0},
		{"Power.Watts", "1.2 kW", &p, func() float64 { return p.Watts() }, 1200, 0},
		{"Energy.Wh", "850 Wh", &e, func() float64 { return e.Wh() }, 850, 0},
		{"Energy.Wh from kWh", "1.2 kWh", &ek, func() float64 { return ek.Wh() }, 1200, 1e-15},
		{"Charge.Ah", "2500 mAh", &q, func() float64 { return q.Ah() }, 2.5, 1e-15},
		{"Temperature.Celsius", "113 °F", &tf, func() float64 { return tf.Celsius() }, 45, 0},
		{"Irradiation.KWhPerM2Day", "5.8 kWh/m²/day", &ir, func() float64 { return ir.KWhPerM2Day() }, 5.8, 0},
		{"Irradiation.KWhPerM2Day from MJ", "18 MJ/m2/day", &im, func() float64 { return im.KWhPerM2Day() }, 5, 1e-15},
		{"TempCoeff.PerKelvin", "-0.29 %/°C", &tc, func() float64 { return tc.PerKelvin() }, -0.0029, 0},
		{"Resistance.Ohms", "2.5 mΩ", &r, func() float64 { return r.Ohms() }, 0.0025, 0},
	}
	for _, tt := range rows {
		t.Run(tt.name, func(t *testing.T) {
			if err := tt.dst.UnmarshalText([]byte(tt.in)); err != nil {
				t.Fatal(err)
			}
			if got := tt.get(); !closeTo(got, tt.want, tt.rel) {
				t.Errorf("%s of %q = %.17g, want %g", tt.name, tt.in, got, tt.want)
			}
		})
	}

	if g, ok := sa.AWG(); g != 10 || !ok {
		t.Errorf("Size(10 AWG).AWG() = %d, %v; want 10, true", g, ok)
	}
	if g, ok := sm.AWG(); g != 0 || ok {
		t.Errorf("Size(6 mm2).AWG() = %d, %v; want 0, false", g, ok)
	}
	if f := sa.Family(); f != "AWG" {
		t.Errorf("Size(10 AWG).Family() = %q, want AWG", f)
	}
	if f := sm.Family(); f != "mm²" {
		t.Errorf("Size(6 mm2).Family() = %q, want mm²", f)
	}
}

func TestJSON(t *testing.T) {
	var design struct {
		Run      Length
		Wire     Size
		Bank     Voltage
		Load     Current
		Panel    Power
		Daily    Energy
		Capacity Charge
		Ambient  Temperature
		Sun      Irradiation
		Coeff    TempCoeff
		Lug      Resistance
		Any      Quantity
	}
	in := `{"Run": "15 ft", "Wire": "2/0 AWG", "Bank": "12 V", "Load": "8.5 A",
		"Panel": "1.2 kW", "Daily": "850 Wh", "Capacity": "100 Ah", "Ambient": "113 °F",
		"Sun": "5.8 kWh/m²/day", "Coeff": "-0.29 %/°C", "Lug": "0.004 ohm", "Any": "6 mm²"}`
	if err := json.Unmarshal([]byte(in), &design); err != nil {
		t.Fatal(err)
	}
	checks := []struct {
		name string
		got  float64
		want float64
	}{
		{"Run", design.Run.Metres(), 4.572},
		{"Wire", design.Wire.MM2(), AWGArea(-1) * 1e6},
		{"Bank", design.Bank.Volts(), 12},
		{"Load", design.Load.Amps(), 8.5},
		{"Panel", design.Panel.Watts(), 1200},
		{"Daily", design.Daily.Wh(), 850},
		{"Capacity", design.Capacity.Ah(), 100},
		{"Ambient", design.Ambient.Celsius(), 45},
		{"Sun", design.Sun.KWhPerM2Day(), 5.8},
		{"Coeff", design.Coeff.PerKelvin(), -0.0029},
		{"Lug", design.Lug.Ohms(), 0.004},
		{"Any", design.Any.Value, 6e-6},
	}
	for _, c := range checks {
		if !closeTo(c.got, c.want, 1e-12) {
			t.Errorf("%s = %g, want %g", c.name, c.got, c.want)
		}
	}

	out, err := json.Marshal(design)
	if err != nil {
		t.Fatal(err)
	}
	const wantOut = `{"Run":"15 ft","Wire":"2/0 AWG","Bank":"12 V","Load":"8.5 A","Panel":"1.2 kW",` +
		`"Daily":"850 Wh","Capacity":"100 Ah","Ambient":"113 °F","Sun":"5.8 kWh/m²/day",` +
		`"Coeff":"-0.29 %/°C","Lug":"0.004 ohm","Any":"6 mm²"}`
	if string(out) != wantOut {
		t.Errorf("json.Marshal:\n got %s\nwant %s", out, wantOut)
	}

	wrong := []struct {
		name string
		in   string
		dst  any
		msg  string
	}{
		{"voltage as length", `"12 V"`, new(Length),
			`"12 V" is a voltage; a length is expected, such as "4.5 m" or "15 ft"`},
		{"length as size", `"4.5 m"`, new(Size),
			`"4.5 m" is a length; a conductor size is expected, such as "10 AWG" or "6 mm²"`},
		{"charge as energy", `"100 Ah"`, new(Energy),
			`"100 Ah" is a charge; an energy is expected, such as "850 Wh" or "1.2 kWh"`},
		{"temperature as coefficient", `"45 °C"`, new(TempCoeff),
			`"45 °C" is a temperature; a temperature coefficient is expected, such as "-0.29 %/°C" or "-0.4 %/K"`},
		{"irradiation as energy", `"5.8 kWh/m²/day"`, new(Energy),
			`"5.8 kWh/m²/day" is a daily irradiation; an energy is expected, such as "850 Wh" or "1.2 kWh"`},
		{"no unit", `"4.5"`, new(Length), `"4.5" has no unit; expected a length such as "4.5 m" or "15 ft"`},
	}
	for _, tt := range wrong {
		t.Run(tt.name, func(t *testing.T) {
			err := json.Unmarshal([]byte(tt.in), tt.dst)
			var e *Error
			if !errors.As(err, &e) {
				t.Fatalf("json.Unmarshal(%s) error = %v, want *Error", tt.in, err)
			}
			if got := e.Error(); got != tt.msg {
				t.Errorf("error:\n got %s\nwant %s", got, tt.msg)
			}
		})
	}

	// A failed decode leaves the old value in place.
	l := Length{}
	if err := l.UnmarshalText([]byte("4.5 m")); err != nil {
		t.Fatal(err)
	}
	if err := l.UnmarshalText([]byte("12 V")); err == nil {
		t.Fatal(`UnmarshalText("12 V") into a Length succeeded`)
	}
	if l.Metres() != 4.5 {
		t.Errorf("Length after a failed decode = %v, want 4.5 m", l)
	}
}

func FuzzParse(f *testing.F) {
	for _, tt := range parseTests {
		f.Add(tt.in)
	}
	for _, s := range []string{"4.5 meters", "4,5 m", "m", "abc V", "1.2.3 V", "-4.5 m", "-3 A",
		"NaN V", "nan m", "Inf W", "", "   ", "12 V", "5/0 AWG", "-300 °C", "1e400 W", "1e-400 K",
		"-0 °C", "1e308 kWh", "0x10 V", "- AWG"} {
		f.Add(s)
	}
	f.Fuzz(func(t *testing.T, s string) {
		q, err := Parse(s)
		if err != nil {
			var e *Error
			if !errors.As(err, &e) {
				t.Fatalf("Parse(%q) error is %T, want *Error", s, err)
			}
			_ = e.Error()
			return
		}
		if math.IsNaN(q.Value) || math.IsInf(q.Value, 0) {
			t.Fatalf("Parse(%q).Value = %v", s, q.Value)
		}
		canon := q.String()
		q2, err := Parse(canon)
		if err != nil {
			t.Fatalf("Parse(%q) = %q, which does not parse: %v", s, canon, err)
		}
		if q2.Dim != q.Dim {
			t.Errorf("Parse(%q).Dim = %v, Parse(%q).Dim = %v", s, q.Dim, canon, q2.Dim)
		}
		if !closeTo(q2.Value, q.Value, 1e-9) {
			t.Errorf("Parse(%q).Value = %g, Parse(%q).Value = %g", s, q.Value, canon, q2.Value)
		}
		if q3, err := ParseAs(s, q.Dim); err != nil || q3 != q {
			t.Errorf("ParseAs(%q, %v) = %+v, %v; want %+v", s, q.Dim, q3, err, q)
		}
	})
}

// Splitting "12V" into number and unit relies on no unit symbol beginning
// with a character that can be part of a number.
func TestUnitSymbolsStartAfterNumber(t *testing.T) {
	for _, u := range units {
		for _, s := range u.spellings {
			if strings.ContainsAny(s[:1], numberChars) {
				t.Errorf("unit %q begins with a character that can be part of a number", s)
			}
			if q, err := Parse("1" + s); err != nil || q.Unit != u.symbol() {
				t.Errorf("Parse(%q) = %v, %v; want 1 %s", "1"+s, q, err, u.symbol())
			}
		}
	}
}
