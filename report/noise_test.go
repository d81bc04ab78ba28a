package report

import (
	"regexp"
	"strings"
	"testing"
)

// TestPackNoFloatNoise: no example hull's pack shows a number with
// floating-point noise in it (7680.000000000001), in its figures or in the
// checks' messages it quotes (issue 13).
func TestPackNoFloatNoise(t *testing.T) {
	number := regexp.MustCompile(`\d+\.\d+`)
	for _, h := range hulls {
		text := readPDF(t, render(t, fixture(t, h), PackOptions{})).all()
		for _, n := range number.FindAllString(text, -1) {
			if digits := strings.TrimLeft(strings.Replace(n, ".", "", 1), "0"); len(digits) > 12 {
				t.Errorf("%s: the pack shows %s", h, n)
			}
		}
	}
}
