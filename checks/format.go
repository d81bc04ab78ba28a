package checks

import (
	"math"
	"regexp"
	"strconv"
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
