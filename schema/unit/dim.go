// Package unit decodes the physical quantities written in a design.
//
// A design gives every physical quantity as a string, written the way the
// trade writes it, with its unit: "4.5 m" or "15 ft", "10 AWG" or "6 mm²",
// "12 V", "100 Ah", "45 °C" or "113 °F". Metric and imperial units are both
// accepted. This package turns such a string into an SI number once, at the
// edge, so that the checks that follow do their arithmetic in one system and
// never see a unit again. The text as written is kept alongside, so that a
// report can quote the designer's own spelling back.
//
// A design field is pinned to a dimension ([Dim]); [ParseAs] rejects a value
// of any other dimension with a message that says what was expected and gives
// examples. The typed wrappers ([Length], [Size], [Voltage] and the rest)
// decode through [encoding.TextUnmarshaler], so that a field of such a type
// can only ever hold a value of its dimension.
//
// The syntax is a decimal number, then at most one space, then a unit symbol:
// "12 V" and "12V" are the same value. Unit symbols are case-sensitive, as the
// SI prefixes are ("mm" is a millimetre, "Mm" would be a megametre), except
// that "awg" is accepted for AWG and "ohm" and "Ohm" both spell the ohm. Only
// a decimal point is accepted: a decimal comma cannot be told apart from a
// thousands separator. Negative values are accepted only for temperatures
// and temperature coefficients. Zero is accepted; the limits of a particular
// field are enforced by the checks, not here.
package unit

import (
	"fmt"
	"strings"
)

// Dim is a physical dimension a design field is pinned to.
//
// The constants name the dimension with a Dim prefix, because the plain names
// belong to the typed wrappers ([Length], [Size] and so on) that hold a
// value of that dimension.
type Dim int

const (
	// Invalid is the zero Dim. As a wanted dimension it means that any
	// dimension is acceptable.
	Invalid Dim = iota

	// DimLength is a length, such as a cable run. Its SI value is in
	// metres. Units: m, cm, mm, ft, in. The foot and inch marks ' and "
	// are not accepted: in a CUE string they are too easily confused with
	// quotes.
	DimLength

	// DimSize is the cross-section of a conductor. Its SI value is in
	// square metres. Units: AWG, gauges 40 to 1 and 1/0 to 4/0 (with "0",
	// "00", "000" and "0000" accepted for 1/0 to 4/0), and mm² (also
	// written mm2).
	DimSize

	// DimVoltage is an electric potential difference. Its SI value is in
	// volts. Units: V, mV, kV.
	DimVoltage

	// DimCurrent is an electric current. Its SI value is in amperes.
	// Units: A, mA.
	DimCurrent

	// DimPower is a power. Its SI value is in watts. Units: W, kW.
	DimPower

	// DimEnergy is an energy, such as a day's consumption. Its SI value is
	// in joules (1 Wh = 3600 J). Units: Wh, kWh.
	DimEnergy

	// DimCharge is an electric charge, such as a battery's capacity. Its
	// SI value is in coulombs (1 Ah = 3600 C). Units: Ah, mAh.
	DimCharge

	// DimTemperature is a temperature. Its SI value is in degrees Celsius,
	// not kelvins. The degree Celsius is a coherent SI derived unit of the
	// same size as the kelvin, so a temperature difference has the same
	// number in both; and the arithmetic the checks do (an ambient
	// temperature plus a rise, the NOCT cell temperature model, derating
	// from a 25 °C reference, conductor ratings at 30 °C) is all written in
	// degrees Celsius. Keeping °C avoids adding and removing 273.15 at
	// every step. Units: °C (also ºC, with the masculine ordinal that
	// keyboards produce for a degree sign, ℃, and degC), °F (also ºF, ℉,
	// degF), K. A bare C or F is not accepted. A temperature below
	// absolute zero is rejected.
	DimTemperature

	// DimIrradiation is a daily solar irradiation on a surface, the
	// "peak sun hours" of a site. Its SI value is in joules per square metre
	// per day. Units: kWh/m²/day, Wh/m²/day, MJ/m²/day (each also with m2
	// for m²).
	DimIrradiation

	// DimTempCoeff is a temperature coefficient, such as a panel's power
	// coefficient. Its SI value is a fraction per kelvin: -0.29 %/°C is
	// -0.0029. A step of one degree Celsius is a step of one kelvin, so
	// %/°C and %/K are the same unit. Units: %/°C (also %/ºC, %/℃, %/degC),
	// %/K.
	DimTempCoeff

	// DimResistance is an electric resistance. Its SI value is in ohms.
	// Units: Ω, mΩ, kΩ (the ohm written as the Greek capital omega U+03A9
	// or the ohm sign U+2126, or as ohm or Ohm: ohm, mohm, kohm).
	DimResistance

	numDims
)

var dimInfo = [numDims]struct {
	name, text string
	examples   [2]string
}{
	DimLength:      {"length", "length", [2]string{"4.5 m", "15 ft"}},
	DimSize:        {"size", "conductor size", [2]string{"10 AWG", "6 mm²"}},
	DimVoltage:     {"voltage", "voltage", [2]string{"12 V", "14.4 V"}},
	DimCurrent:     {"current", "current", [2]string{"8.5 A", "500 mA"}},
	DimPower:       {"power", "power", [2]string{"60 W", "1.2 kW"}},
	DimEnergy:      {"energy", "energy", [2]string{"850 Wh", "1.2 kWh"}},
	DimCharge:      {"charge", "charge", [2]string{"100 Ah", "280 Ah"}},
	DimTemperature: {"temperature", "temperature", [2]string{"45 °C", "113 °F"}},
	DimIrradiation: {"irradiation", "daily irradiation", [2]string{"5.8 kWh/m²/day", "4.2 kWh/m2/day"}},
	DimTempCoeff:   {"tempcoeff", "temperature coefficient", [2]string{"-0.29 %/°C", "-0.4 %/K"}},
	DimResistance:  {"resistance", "resistance", [2]string{"2.5 mΩ", "0.004 ohm"}},
}

func (d Dim) valid() bool { return d > Invalid && d < numDims }

// String returns the dimension as it reads in a sentence, such as "length"
// or "conductor size".
func (d Dim) String() string {
	switch {
	case d == Invalid:
		return "invalid"
	case !d.valid():
		return fmt.Sprintf("Dim(%d)", int(d))
	}
	return dimInfo[d].text
}

// Name returns the short machine name of the dimension, as used in CUE
// attributes: "length", "size", "voltage", "current", "power", "energy",
// "charge", "temperature", "irradiation", "tempcoeff" or "resistance".
// It returns "" for Invalid or an unknown Dim.
func (d Dim) Name() string {
	if !d.valid() {
		return ""
	}
	return dimInfo[d].name
}

// Examples returns two example values of the dimension, each quoted, joined
// by " or ", such as `"4.5 m" or "15 ft"`. Error messages show them.
// It returns "" for Invalid or an unknown Dim.
func (d Dim) Examples() string {
	if !d.valid() {
		return ""
	}
	ex := dimInfo[d].examples
	return fmt.Sprintf("%q or %q", ex[0], ex[1])
}

// signed reports whether a value of the dimension may be negative.
func (d Dim) signed() bool { return d == DimTemperature || d == DimTempCoeff }

// withArticle returns the dimension's text behind "a" or "an".
func (d Dim) withArticle() string {
	s := d.String()
	if strings.ContainsRune("aeiou", rune(s[0])) {
		return "an " + s
	}
	return "a " + s
}

// Dims returns all valid dimensions, in the order they are declared.
func Dims() []Dim {
	ds := make([]Dim, 0, numDims-1)
	for d := Invalid + 1; d < numDims; d++ {
		ds = append(ds, d)
	}
	return ds
}

// DimByName returns the dimension with the given short machine name, as
// returned by [Dim.Name]. It reports false if there is none.
func DimByName(name string) (Dim, bool) {
	for d := Invalid + 1; d < numDims; d++ {
		if dimInfo[d].name == name {
			return d, true
		}
	}
	return Invalid, false
}
