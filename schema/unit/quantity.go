package unit

import (
	"fmt"
	"math"
	"strconv"
	"strings"
	"unicode"
	"unicode/utf8"
)

// A unitDef is a unit and the spellings accepted for it.
type unitDef struct {
	spellings []string // the first is the canonical spelling
	dim       Dim
	// The SI value is (number − offset) × mul / div. Keeping the factor as
	// a ratio of exact numbers, rather than one rounded float, makes
	// "15 ft" exactly the float nearest 4.572 m.
	mul, div float64
	offset   float64
	zero     float64 // absolute zero in this unit; temperatures only
	gauge    bool    // the number is an AWG gauge, not a multiple of the unit
	imperial bool
}

func (u *unitDef) symbol() string { return u.spellings[0] }

// toSI converts a number in the unit to the SI value. It can overflow to an
// infinity only when the result is out of range.
func (u *unitDef) toSI(x float64) float64 {
	if u.gauge {
		return AWGArea(int(x))
	}
	x -= u.offset
	if v := x * u.mul / u.div; !math.IsInf(v, 0) {
		return v
	}
	return x * (u.mul / u.div)
}

// units lists every accepted unit. The order matters only for the spelling
// suggested for a unit written in the wrong case.
var units = []*unitDef{
	{spellings: []string{"m"}, dim: DimLength, mul: 1, div: 1},
	{spellings: []string{"cm"}, dim: DimLength, mul: 1, div: 100},
	{spellings: []string{"mm"}, dim: DimLength, mul: 1, div: 1000},
	// NIST SP 811, Appendix B: 1 ft = 0.3048 m and 1 in = 0.0254 m exactly.
	{spellings: []string{"ft"}, dim: DimLength, mul: 3048, div: 10000, imperial: true},
	{spellings: []string{"in"}, dim: DimLength, mul: 254, div: 10000, imperial: true},

	{spellings: []string{"AWG", "awg"}, dim: DimSize, gauge: true, imperial: true},
	{spellings: []string{"mm²", "mm2"}, dim: DimSize, mul: 1, div: 1e6},

	{spellings: []string{"V"}, dim: DimVoltage, mul: 1, div: 1},
	{spellings: []string{"mV"}, dim: DimVoltage, mul: 1, div: 1000},
	{spellings: []string{"kV"}, dim: DimVoltage, mul: 1000, div: 1},

	{spellings: []string{"A"}, dim: DimCurrent, mul: 1, div: 1},
	{spellings: []string{"mA"}, dim: DimCurrent, mul: 1, div: 1000},

	{spellings: []string{"W"}, dim: DimPower, mul: 1, div: 1},
	{spellings: []string{"kW"}, dim: DimPower, mul: 1000, div: 1},

	{spellings: []string{"Wh"}, dim: DimEnergy, mul: 3600, div: 1},
	{spellings: []string{"kWh"}, dim: DimEnergy, mul: 3600e3, div: 1},

	{spellings: []string{"Ah"}, dim: DimCharge, mul: 3600, div: 1},
	{spellings: []string{"mAh"}, dim: DimCharge, mul: 3600, div: 1000},

	// "º" is the masculine ordinal indicator, which some keyboards give
	// for a degree sign; "℃" and "℉" are the compatibility characters
	// that some documents use.
	{spellings: []string{"°C", "ºC", "℃", "degC"}, dim: DimTemperature, mul: 1, div: 1, zero: -273.15},
	{spellings: []string{"°F", "ºF", "℉", "degF"}, dim: DimTemperature, mul: 5, div: 9, offset: 32, zero: -459.67, imperial: true},
	{spellings: []string{"K"}, dim: DimTemperature, mul: 1, div: 1, offset: 273.15, zero: 0},

	{spellings: []string{"kWh/m²/day", "kWh/m2/day"}, dim: DimIrradiation, mul: 3600e3, div: 1},
	{spellings: []string{"Wh/m²/day", "Wh/m2/day"}, dim: DimIrradiation, mul: 3600, div: 1},
	{spellings: []string{"MJ/m²/day", "MJ/m2/day"}, dim: DimIrradiation, mul: 1e6, div: 1},

	{spellings: []string{"%/°C", "%/ºC", "%/℃", "%/degC"}, dim: DimTempCoeff, mul: 1, div: 100},
	{spellings: []string{"%/K"}, dim: DimTempCoeff, mul: 1, div: 100},

	// The ohm is written with the Greek capital omega U+03A9, which
	// Unicode prefers, or with the ohm sign U+2126, which it keeps for
	// compatibility; both are in use.
	{spellings: []string{"\u03a9", "\u2126", "ohm", "Ohm"}, dim: DimResistance, mul: 1, div: 1},
	{spellings: []string{"m\u03a9", "m\u2126", "mohm", "mOhm"}, dim: DimResistance, mul: 1, div: 1000},
	{spellings: []string{"k\u03a9", "k\u2126", "kohm", "kOhm"}, dim: DimResistance, mul: 1000, div: 1},
}

var bySpelling = func() map[string]*unitDef {
	m := make(map[string]*unitDef)
	for _, u := range units {
		for _, s := range u.spellings {
			m[s] = u
		}
	}
	return m
}()

var bySymbol = func() map[string]*unitDef {
	m := make(map[string]*unitDef)
	for _, u := range units {
		m[u.symbol()] = u
	}
	return m
}()

// Quantity is a parsed value: its SI value, its dimension and how it was
// written.
type Quantity struct {
	Value float64 // the value in SI units, as documented for each Dim
	Dim   Dim
	// Unit is the unit as canonically spelt, such as "ft", "mm²", "AWG",
	// "°F" or "kWh/m²/day".
	Unit string
	// Number is the number as written, in Unit. For AWG it is the gauge,
	// with 1/0, 2/0, 3/0 and 4/0 as 0, -1, -2 and -3.
	Number float64
	Text   string // the input, trimmed of surrounding space
}

// Imperial reports whether the value was written in an imperial unit: ft,
// in, AWG or °F.
func (q Quantity) Imperial() bool {
	u := bySymbol[q.Unit]
	return u != nil && u.imperial
}

// String returns the value spelt canonically: the number in the shortest
// form that reads back exactly, a space, and the canonical unit, such as
// "4.5 m", "2/0 AWG", "6 mm²" or "-0.29 %/°C". It returns "" for the zero
// Quantity.
func (q Quantity) String() string {
	switch q.Unit {
	case "":
		return ""
	case "AWG":
		return AWGName(int(q.Number))
	}
	return strconv.FormatFloat(q.Number, 'g', -1, 64) + " " + q.Unit
}

// MarshalText returns the value as it was written, or, for a Quantity not
// made by parsing, its canonical spelling.
func (q Quantity) MarshalText() ([]byte, error) {
	if q.Text != "" {
		return []byte(q.Text), nil
	}
	return []byte(q.String()), nil
}

// UnmarshalText parses a quantity of any dimension, as [Parse] does.
func (q *Quantity) UnmarshalText(b []byte) error { return unmarshalAs(q, b, Invalid) }

// in returns the value in the unit with the given canonical symbol. When the
// value was written in that unit it returns the number as written, so that
// no rounding creeps in on the way to SI and back.
func (q Quantity) in(symbol string) float64 {
	if q.Unit == symbol {
		return q.Number
	}
	u := bySymbol[symbol]
	return q.Value*u.div/u.mul + u.offset
}

// Parse parses a quantity of any dimension, such as "4.5 m" or "1/0 AWG".
//
// The input is a decimal number, then at most one space, then a unit symbol.
// Surrounding space is ignored. Any one Unicode space character separates
// the number from the unit, so that a non-breaking or thin space copied from
// a data sheet is accepted. The number may have an exponent ("1e3 W") and a
// leading minus sign, written as a hyphen-minus or as U+2212; it may not have
// a plus sign, a decimal comma or digit grouping, and it must be finite. A
// negative number is accepted only for a temperature or a temperature
// coefficient, and a temperature may not be below absolute zero. An AWG
// size is a gauge from 40 to 1, or 1/0 to 4/0, followed by the word AWG.
//
// The error is always an [*Error].
func Parse(s string) (Quantity, error) {
	return parse(s, Invalid)
}

// ParseAs parses a quantity as [Parse] does and also requires it to be of
// the dimension want. A want of Invalid accepts any dimension.
func ParseAs(s string, want Dim) (Quantity, error) {
	return parse(s, want)
}

// Causes of a malformed value, given in Error.Reason.
const (
	reasonEmpty        = "empty"
	reasonNoUnit       = "no unit"
	reasonNoNumber     = "no number"
	reasonNotNumber    = "not a number"
	reasonNotFinite    = "not finite"
	reasonNegative     = "negative"
	reasonComma        = "use a decimal point"
	reasonPlus         = "leading plus sign"
	reasonSpaces       = "more than one space before the unit"
	reasonAbsoluteZero = "below absolute zero"
	reasonWholeGauge   = "AWG gauges are whole numbers"
)

// numberChars are the characters that can be part of a number written
// without a space before its unit, or of a malformed one worth reporting as
// such. No unit symbol begins with one of them.
const numberChars = "0123456789.,+-\u2212eE/"

func parse(s string, want Dim) (Quantity, error) {
	text := strings.TrimSpace(s)
	fail := func(got Dim, reason string) (Quantity, error) {
		return Quantity{}, &Error{Input: s, Want: want, Got: got, Reason: reason}
	}
	if text == "" {
		return fail(Invalid, reasonEmpty)
	}
	num, sym, reason := split(text)
	if reason != "" {
		return fail(Invalid, reason)
	}
	u := bySpelling[sym]
	if u == nil {
		return fail(Invalid, unknownUnit(sym))
	}

	if rest, ok := strings.CutPrefix(num, "\u2212"); ok {
		num = "-" + rest
	}
	neg := strings.HasPrefix(num, "-")
	switch {
	case strings.Contains(num, ","):
		return fail(u.dim, reasonComma)
	case strings.HasPrefix(num, "+"):
		return fail(u.dim, reasonPlus)
	}
	var x float64
	if u.gauge {
		var g int
		g, reason = parseGauge(strings.TrimPrefix(num, "-"))
		x = float64(g)
	} else {
		x, reason = parseNumber(num)
	}
	if reason != "" {
		return fail(u.dim, reason)
	}

	// The dimension is checked before the sign and range, because a value
	// of the wrong dimension is wrong whatever its number.
	if want != Invalid && u.dim != want {
		return fail(u.dim, "")
	}
	if neg && !u.dim.signed() {
		return fail(u.dim, reasonNegative)
	}
	if u.dim == DimTemperature && x < u.zero {
		return fail(u.dim, reasonAbsoluteZero)
	}
	v := u.toSI(x)
	if math.IsInf(v, 0) {
		return fail(u.dim, reasonNotFinite)
	}
	return Quantity{Value: v, Dim: u.dim, Unit: u.symbol(), Number: x, Text: text}, nil
}

// split splits trimmed text into its number and unit.
func split(text string) (num, sym, reason string) {
	if i := strings.IndexFunc(text, unicode.IsSpace); i >= 0 {
		_, n := utf8.DecodeRuneInString(text[i:])
		num, sym = text[:i], text[i+n:]
		if r, _ := utf8.DecodeRuneInString(sym); unicode.IsSpace(r) {
			return "", "", reasonSpaces
		}
		return num, sym, ""
	}
	// Without a space the number is the longest run of characters that can
	// be in one, which works because no unit symbol begins with one.
	i := strings.IndexFunc(text, func(r rune) bool { return !strings.ContainsRune(numberChars, r) })
	switch i {
	case -1:
		return "", "", reasonNoUnit
	case 0:
		return "", "", reasonNoNumber
	}
	return text[:i], text[i:], ""
}

// unknownUnit returns the reason for an unknown unit symbol, with a
// suggestion when the symbol is a known one in the wrong case or a bare
// letter for a temperature scale.
func unknownUnit(sym string) string {
	reason := fmt.Sprintf("unknown unit %q", sym)
	switch sym {
	case "C", "F":
		return fmt.Sprintf("%s, did you mean %q?", reason, "°"+sym)
	}
	for _, u := range units {
		for _, s := range u.spellings {
			if strings.EqualFold(s, sym) {
				return fmt.Sprintf("%s, did you mean %q?", reason, s)
			}
		}
	}
	return reason
}

// parseNumber parses a decimal number with an optional leading minus sign
// and exponent. The sign of a negative zero is dropped.
func parseNumber(num string) (float64, string) {
	switch strings.ToLower(strings.TrimPrefix(num, "-")) {
	case "inf", "infinity":
		return 0, reasonNotFinite
	}
	if !isDecimal(num) {
		return 0, reasonNotNumber
	}
	x, err := strconv.ParseFloat(num, 64)
	if math.IsInf(x, 0) {
		return 0, reasonNotFinite
	}
	if err != nil {
		return 0, reasonNotNumber
	}
	if x == 0 {
		x = 0 // not -0, which would print as "-0"
	}
	return x, ""
}

// isDecimal reports whether s is a decimal number: an optional minus sign,
// digits with an optional decimal point, and an optional exponent. It
// excludes what strconv.ParseFloat also accepts but a design should not
// contain: "NaN", "Inf", hexadecimal and underscores.
func isDecimal(s string) bool {
	i := 0
	if strings.HasPrefix(s, "-") {
		i++
	}
	digits := 0
	for ; i < len(s) && isDigit(s[i]); i++ {
		digits++
	}
	if i < len(s) && s[i] == '.' {
		for i++; i < len(s) && isDigit(s[i]); i++ {
			digits++
		}
	}
	if digits == 0 {
		return false
	}
	if i < len(s) && (s[i] == 'e' || s[i] == 'E') {
		i++
		if i < len(s) && (s[i] == '+' || s[i] == '-') {
			i++
		}
		start := i
		for ; i < len(s) && isDigit(s[i]); i++ {
		}
		if i == start {
			return false
		}
	}
	return i == len(s)
}

func isDigit(c byte) bool { return '0' <= c && c <= '9' }

// parseGauge parses an AWG gauge without its sign: "40" to "1", "1/0" to
// "4/0", or "0" to "0000" for 1/0 to 4/0. It returns 1/0 to 4/0 as 0 to -3.
func parseGauge(num string) (int, string) {
	if num == "" {
		return 0, reasonNotNumber
	}
	if n := len(num); n >= 1 && n <= 4 && strings.Trim(num, "0") == "" {
		return 1 - n, ""
	}
	if len(num) == 3 && num[1:] == "/0" && '1' <= num[0] && num[0] <= '4' {
		return 1 - int(num[0]-'0'), ""
	}
	if num[0] != '0' && strings.Trim(num, "0123456789") == "" {
		if n, err := strconv.Atoi(num); err == nil && n <= thinnestAWG {
			return n, ""
		}
	}
	whole, fraction := strings.CutSuffix(num, "/0")
	switch {
	case !fraction && isDecimal(num) && strings.ContainsAny(num, ".eE"):
		return 0, reasonWholeGauge
	case isDecimal(whole) && !strings.ContainsAny(whole, ".eE"):
		return 0, fmt.Sprintf("no AWG gauge %q, gauges run from 40 to 4/0", num)
	}
	return 0, reasonNotNumber
}

// Error describes a value that is not a valid quantity of the wanted
// dimension.
type Error struct {
	Input string // the value as given
	Want  Dim    // Invalid when any dimension was acceptable
	// Got is the dimension of the value's unit, when the unit was
	// recognised. With an empty Reason, the value is well formed but of
	// dimension Got, not Want.
	Got Dim
	// Reason is a short cause, such as "no unit", `unknown unit "xyz"`,
	// "not a number", "empty", "negative" or "not finite". It is empty
	// when the value is of the wrong dimension.
	Reason string
}

// Error returns the message, which names the value, says what is wrong with
// it and, when a dimension was wanted, gives examples of a good value.
func (e *Error) Error() string {
	d := e.Want
	if d == Invalid {
		d = e.Got
	}
	switch {
	case e.Reason == "" && e.Want == Invalid:
		return fmt.Sprintf("%q is %s", e.Input, e.Got.withArticle())
	case e.Reason == "":
		return fmt.Sprintf("%q is %s; %s is expected, such as %s",
			e.Input, e.Got.withArticle(), e.Want.withArticle(), e.Want.Examples())
	case e.Reason == reasonNegative && d.valid():
		return fmt.Sprintf("%q is negative; %s must be zero or more", e.Input, d.withArticle())
	case e.Reason == reasonAbsoluteZero:
		return fmt.Sprintf("%q is below absolute zero; a temperature must be -273.15 °C (0 K, -459.67 °F) or more", e.Input)
	case !e.Want.valid():
		return fmt.Sprintf("%q: %s", e.Input, e.Reason)
	case e.Reason == reasonEmpty:
		return fmt.Sprintf("%q is empty; expected %s such as %s", e.Input, e.Want.withArticle(), e.Want.Examples())
	case e.Reason == reasonNoUnit:
		return fmt.Sprintf("%q has no unit; expected %s such as %s", e.Input, e.Want.withArticle(), e.Want.Examples())
	}
	return fmt.Sprintf("%q is not %s (%s); expected a value such as %s",
		e.Input, e.Want.withArticle(), e.Reason, e.Want.Examples())
}

// Spellings returns every unit spelling the parser accepts for d, canonical
// spellings first; the schema's patterns are checked against it.
func Spellings(d Dim) []string {
	var out []string
	for _, u := range units {
		if u.dim == d {
			out = append(out, u.spellings...)
		}
	}
	return out
}
