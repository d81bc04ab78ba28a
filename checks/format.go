package checks

import (
	"math"
	"regexp"
	"strconv"

	"github.com/ampwright/ampwright/result"
)

// round rounds x to n decimal places, so that results print the same on
// every platform.
func round(x float64, n int) float64 {
	p := math.Pow(10, float64(n))
	return math.Round(x*p) / p
}

func volts(v float64) string { return strconv.FormatFloat(round(v, 2), 'f', -1, 64) + " V" }

var plainLabel = regexp.MustCompile(`^[A-Za-z_$][A-Za-z0-9_$]*$`)

// quotePath spells a name as a CUE path element: quoted unless it is an
// identifier.
func quotePath(name string) string {
	if plainLabel.MatchString(name) {
		return name
	}
	return strconv.Quote(name)
}

func amps(i float64) string { return strconv.FormatFloat(round(i, 2), 'f', -1, 64) + " A" }

// lengthText writes a length in the design's preferred units.
func lengthText(in *Input, metres float64) string {
	if in.Design.Vessel.Units == "imperial" {
		return strconv.FormatFloat(round(metres/0.3048, 2), 'f', -1, 64) + " ft"
	}
	return strconv.FormatFloat(round(metres, 3), 'f', -1, 64) + " m"
}

// fnum writes a figure rounded to two places, without trailing zeros or
// floating-point noise.
func fnum(v float64) string { return strconv.FormatFloat(round(v, 2), 'f', -1, 64) }

// units writes quantities in a design's preferred units, so that every
// formula a figure or finding shows can be worked as written in one
// system: metric (m, mm, °C, mΩ/m), or imperial (ft, in, °F, Ω per
// 1000 ft).
type units struct{ imperial bool }

func unitsOf(in *Input) units { return units{imperial: in.Design.Vessel.Units == "imperial"} }

// temp is a temperature, given in °C, in the design's units, rounded to
// 0.01.
func (u units) temp(c float64) (float64, string) {
	if u.imperial {
		return round(c*1.8+32, 2), "°F"
	}
	return round(c, 2), "°C"
}

// tempText is temp as text: "25 °C", "77 °F".
func (u units) tempText(c float64) string {
	v, s := u.temp(c)
	return strconv.FormatFloat(v, 'f', -1, 64) + " " + s
}

// tempRise is a temperature difference, given in kelvin, in the design's
// units.
func (u units) tempRise(k float64) (float64, string) {
	if u.imperial {
		return round(k*1.8, 2), "°F"
	}
	return round(k, 2), "°C"
}

// perDegree is a temperature coefficient, given per kelvin, in percent
// per degree of the design's units, to five significant figures.
func (u units) perDegree(perK float64) (float64, string) {
	if u.imperial {
		return sig(perK*100/1.8, 5), "%/°F"
	}
	return sig(perK*100, 5), "%/°C"
}

// alpha is a fractional temperature coefficient, given per kelvin, per
// degree of the design's units.
func (u units) alpha(perK float64) (float64, string) {
	if u.imperial {
		return sig(perK/1.8, 5), "1/°F"
	}
	return perK, "1/K"
}

// length is a length, given in metres, in feet or metres.
func (u units) length(m float64) (float64, string) {
	if u.imperial {
		return round(m/0.3048, 2), "ft"
	}
	return round(m, 4), "m"
}

// short is a short distance, given in metres, in inches or millimetres.
func (u units) short(m float64) (float64, string) {
	if u.imperial {
		return round(m/0.0254, 2), "in"
	}
	return round(m*1000, 1), "mm"
}

// shortText is short as text: "7 in", "178 mm".
func (u units) shortText(m float64) string {
	v, s := u.short(m)
	return strconv.FormatFloat(v, 'f', -1, 64) + " " + s
}

// resistance is a resistance per length, given in Ω/m, in mΩ/m or Ω per
// 1000 ft, to five significant figures.
func (u units) resistance(ohmPerM float64) (float64, string) {
	if u.imperial {
		return sig(ohmPerM*304.8, 5), "Ω/1000 ft"
	}
	return sig(ohmPerM*1000, 5), "mΩ/m"
}

// resistanceText is resistance as text, to four significant figures.
func (u units) resistanceText(ohmPerM float64) string {
	v, s := u.resistance(ohmPerM)
	return strconv.FormatFloat(sig(v, 4), 'f', -1, 64) + " " + s
}

// stc is the cell temperature of standard test conditions, 25 °C, in the
// design's units; ref20 the 20 °C of the copper tables.
func (u units) stc() string   { return u.tempText(25) }
func (u units) ref20() string { return u.tempText(20) }

// sig rounds x to n significant figures.
func sig(x float64, n int) float64 {
	if x == 0 || math.IsInf(x, 0) || math.IsNaN(x) {
		return x
	}
	d := n - 1 - int(math.Floor(math.Log10(math.Abs(x))))
	return round(x, d)
}

// tidy rounds every number a report carries to 12 significant figures:
// figures computed by floating-point arithmetic (2 × 12.8 × 3 × 100 is
// 7680.000000000001) print as people write them, the same on every
// platform.
func tidy(fs []result.Finding, figs []result.Figure) {
	for i := range fs {
		f := &fs[i]
		f.Value, f.Limit, f.Margin = sig(f.Value, 12), sig(f.Limit, 12), sig(f.Margin, 12)
	}
	for i := range figs {
		f := &figs[i]
		f.Value = sig(f.Value, 12)
		for j := range f.Inputs {
			f.Inputs[j].Value = sig(f.Inputs[j].Value, 12)
		}
	}
}
