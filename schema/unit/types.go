package unit

// The typed wrappers below each hold a Quantity of one dimension. Their
// UnmarshalText rejects a value of any other dimension, so a decoded design
// field of such a type is known to be of its dimension. MarshalText is the
// embedded Quantity's, which gives back the value as it was written.

// unmarshalAs parses b as a quantity of dimension want into q, leaving q
// untouched on error.
func unmarshalAs(q *Quantity, b []byte, want Dim) error {
	v, err := ParseAs(string(b), want)
	if err != nil {
		return err
	}
	*q = v
	return nil
}

// Length is a length, such as "4.5 m" or "15 ft".
type Length struct{ Quantity }

// UnmarshalText parses a length.
func (l *Length) UnmarshalText(b []byte) error { return unmarshalAs(&l.Quantity, b, DimLength) }

// Metres returns the length in metres.
func (l Length) Metres() float64 { return l.Value }

// Size is the cross-section of a conductor, such as "10 AWG" or "6 mm²".
type Size struct{ Quantity }

// UnmarshalText parses a conductor size.
func (s *Size) UnmarshalText(b []byte) error { return unmarshalAs(&s.Quantity, b, DimSize) }

// MM2 returns the cross-section in square millimetres.
func (s Size) MM2() float64 { return s.in("mm²") }

// AWG returns the gauge, numbered as for [AWGDiameter], and reports whether
// the size was written as an AWG gauge.
func (s Size) AWG() (gauge int, ok bool) {
	if s.Unit != "AWG" {
		return 0, false
	}
	return int(s.Number), true
}

// Family returns the sizing system the size was written in, "AWG" or "mm²",
// or "" for the zero Size.
func (s Size) Family() string { return s.Unit }

// Voltage is a voltage, such as "12 V".
type Voltage struct{ Quantity }

// UnmarshalText parses a voltage.
func (v *Voltage) UnmarshalText(b []byte) error { return unmarshalAs(&v.Quantity, b, DimVoltage) }

// Volts returns the voltage in volts.
func (v Voltage) Volts() float64 { return v.Value }

// Current is a current, such as "8.5 A" or "500 mA".
type Current struct{ Quantity }

// UnmarshalText parses a current.
func (c *Current) UnmarshalText(b []byte) error { return unmarshalAs(&c.Quantity, b, DimCurrent) }

// Amps returns the current in amperes.
func (c Current) Amps() float64 { return c.Value }

// Power is a power, such as "60 W" or "1.2 kW".
type Power struct{ Quantity }

// UnmarshalText parses a power.
func (p *Power) UnmarshalText(b []byte) error { return unmarshalAs(&p.Quantity, b, DimPower) }

// Watts returns the power in watts.
func (p Power) Watts() float64 { return p.Value }

// Energy is an energy, such as "850 Wh" or "1.2 kWh".
type Energy struct{ Quantity }

// UnmarshalText parses an energy.
func (e *Energy) UnmarshalText(b []byte) error { return unmarshalAs(&e.Quantity, b, DimEnergy) }

// Wh returns the energy in watt-hours.
func (e Energy) Wh() float64 { return e.in("Wh") }

// Charge is an electric charge, such as a battery capacity of "100 Ah".
type Charge struct{ Quantity }

// UnmarshalText parses a charge.
func (c *Charge) UnmarshalText(b []byte) error { return unmarshalAs(&c.Quantity, b, DimCharge) }

// Ah returns the charge in ampere-hours.
func (c Charge) Ah() float64 { return c.in("Ah") }

// Temperature is a temperature, such as "45 °C" or "113 °F".
type Temperature struct{ Quantity }

// UnmarshalText parses a temperature.
func (t *Temperature) UnmarshalText(b []byte) error {
	return unmarshalAs(&t.Quantity, b, DimTemperature)
}

// Celsius returns the temperature in degrees Celsius.
func (t Temperature) Celsius() float64 { return t.Value }

// Irradiation is a daily solar irradiation, such as "5.8 kWh/m²/day".
type Irradiation struct{ Quantity }

// UnmarshalText parses a daily irradiation.
func (r *Irradiation) UnmarshalText(b []byte) error {
	return unmarshalAs(&r.Quantity, b, DimIrradiation)
}

// KWhPerM2Day returns the irradiation in kilowatt-hours per square metre
// per day, which is also the number of peak sun hours.
func (r Irradiation) KWhPerM2Day() float64 { return r.in("kWh/m²/day") }

// TempCoeff is a temperature coefficient, such as "-0.29 %/°C".
type TempCoeff struct{ Quantity }

// UnmarshalText parses a temperature coefficient.
func (c *TempCoeff) UnmarshalText(b []byte) error { return unmarshalAs(&c.Quantity, b, DimTempCoeff) }

// PerKelvin returns the coefficient as a fraction per kelvin: -0.29 %/°C is
// -0.0029.
func (c TempCoeff) PerKelvin() float64 { return c.Value }

// Resistance is a resistance, such as "2.5 mΩ".
type Resistance struct{ Quantity }

// UnmarshalText parses a resistance.
func (r *Resistance) UnmarshalText(b []byte) error {
	return unmarshalAs(&r.Quantity, b, DimResistance)
}

// Ohms returns the resistance in ohms.
func (r Resistance) Ohms() float64 { return r.Value }
