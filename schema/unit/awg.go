package unit

import (
	"fmt"
	"math"
)

// Gauges are numbered as the AWG formula numbers them: 1/0 is 0, 2/0 is -1,
// 3/0 is -2 and 4/0 is -3, so that one formula covers the whole range.
const (
	thickestAWG = -3 // 4/0
	thinnestAWG = 40
)

// AWGDiameter returns the diameter in metres of a solid round conductor of
// the given AWG gauge, by the formula of ASTM B258: 0.127 mm × 92^((36−n)/39).
// The gauge is numbered 0, -1, -2, -3 for 1/0, 2/0, 3/0, 4/0, so that 36 AWG
// is 0.005 in and 4/0 is 0.46 in.
func AWGDiameter(gauge int) float64 {
	return 0.127e-3 * math.Pow(92, float64(36-gauge)/39)
}

// AWGArea returns the cross-section in square metres of a conductor of the
// given AWG gauge, numbered as for [AWGDiameter]. A stranded conductor of a
// gauge has the same nominal area as the solid one.
func AWGArea(gauge int) float64 {
	d := AWGDiameter(gauge)
	return math.Pi * d * d / 4
}

// AWGName returns the gauge as the trade writes it, such as "10 AWG" or
// "2/0 AWG". The gauge is numbered as for [AWGDiameter].
func AWGName(gauge int) string {
	if gauge <= 0 {
		return fmt.Sprintf("%d/0 AWG", 1-gauge)
	}
	return fmt.Sprintf("%d AWG", gauge)
}

// StandardAWG returns the AWG gauges sold for boat wiring, thinnest first,
// numbered as for [AWGDiameter]: 18 to 1, then 1/0 to 4/0.
func StandardAWG() []int {
	return []int{18, 16, 14, 12, 10, 8, 6, 4, 3, 2, 1, 0, -1, -2, -3}
}

// StandardMetric returns the nominal conductor sizes of IEC 60228 in square
// millimetres, thinnest first.
func StandardMetric() []float64 {
	return []float64{0.5, 0.75, 1, 1.5, 2.5, 4, 6, 10, 16, 25, 35, 50, 70, 95, 120, 150, 185, 240}
}
