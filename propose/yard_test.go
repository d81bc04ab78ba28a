package propose

import (
	"fmt"
	"math/rand/v2"
	"os"
	"path/filepath"
	"strings"
	"testing"
)

// testYard copies the example yard into a temporary directory with its
// catalog's blocks replaced by those given (battery, module, controller …)
// and its hulls replaced by those given, by name, and returns the yard's
// root.
func testYard(t testing.TB, blocks map[string]string, hulls map[string]string) string {
	t.Helper()
	root := filepath.Join(t.TempDir(), "yard")
	if err := os.CopyFS(root, os.DirFS("../designs")); err != nil {
		t.Fatal(err)
	}
	if err := os.RemoveAll(filepath.Join(root, "hulls")); err != nil {
		t.Fatal(err)
	}
	cat, err := os.ReadFile(filepath.Join(root, "catalog", "catalog.cue"))
	if err != nil {
		t.Fatal(err)
	}
	text := string(cat)
	for name, block := range blocks {
		text = replaceBlock(t, text, name, block)
	}
	if err := os.WriteFile(filepath.Join(root, "catalog", "catalog.cue"), []byte(text), 0o644); err != nil {
		t.Fatal(err)
	}
	for name, src := range hulls {
		dir := filepath.Join(root, "hulls", name)
		if err := os.MkdirAll(dir, 0o755); err != nil {
			t.Fatal(err)
		}
		if err := os.WriteFile(filepath.Join(dir, name+".cue"), []byte(src), 0o644); err != nil {
			t.Fatal(err)
		}
	}
	return root
}

// replaceBlock replaces the top-level field name: {…} of a CUE file by
// name: {block}.
func replaceBlock(t testing.TB, text, name, block string) string {
	t.Helper()
	start := strings.Index(text, "\n"+name+": {\n")
	if start < 0 {
		t.Fatalf("the catalog has no block %q", name)
	}
	end := strings.Index(text[start:], "\n}\n")
	if end < 0 {
		t.Fatalf("block %q does not end", name)
	}
	return text[:start] + "\n" + name + ": {\n" + block + "\n}\n" + text[start+end+3:]
}

// smallHull is a small 12 V sloop for hand-made catalogs: a bank of
// BATTERY × PARALLEL, an array of MODULE on rails that take at most
// PLACE modules, a CONTROLLER; a fridge, lights, navigation lights and a
// pump on a panel; a voyage of a week and a day of autonomy.
const smallHull = `package small

import (
	"ampwright.dev/schema"
	"kittiwake.example/yard/catalog"
	"kittiwake.example/yard/rulebook"
)

schema.#Design

rules:    rulebook.yard
currency: catalog.currency

vessel: {name: "Small", hull: "test hull", kind: "sloop", length: "8 m", system: "12 V"}

site: {
	latitude:  50.2
	longitude: -4.9
	months: ["May", "Jun", "Jul", "Aug"]
	irradiation: {source: "test", May: "5.4 kWh/m²/day", Jun: "5.9 kWh/m²/day", Jul: "5.8 kWh/m²/day", Aug: "4.9 kWh/m²/day"}
	recordLow:  "0 °C"
	designHigh: "28 °C"
}

scenarios: {anchor: {}, passage: {engineHours: 2}}

voyage: {start: "Jun", legs: [{scenario: "passage", days: 1}, {scenario: "anchor", days: 5}, {scenario: "passage", days: 1}]}

autonomy: {days: AUTONOMY, scenario: "anchor"}

bank: {battery: catalog.battery."BATTERY", parallel: PARALLEL, temperature: "20 °C"}

arrays: rails: {
	module:         catalog.module."MODULE"
	series:         1
	strings:        1
	controller:     "ctl"
	mount:          "rail"
	swingsAtAnchor: true
	place: {maxModules: PLACE}
}

controllers: ctl: part: catalog.controller."CONTROLLER"

chargers: alternator: {kind: "alternator", output: "30 A"}

buses: panel: {kind: "panel", part: catalog.busbar."panel-8"}

loads: {
	fridge: {circuit: "panel-fridge", kind: "refrigeration", current: "4 A", duty: 0.4, hours: {anchor: 24, passage: 24}}
	lights: {circuit: "panel-lights", kind: "lighting", power: "20 W", hours: {anchor: 4, passage: 2}}
	nav: {circuit: "panel-nav", kind: "navigation-lights", power: "10 W", hours: {passage: 10}}
	pump: {circuit: "panel-pump", kind: "water-pump", current: "6 A", hours: {anchor: 0.3, passage: 0.2}}
}

wiring: {
	"bank-panel": {from: "bank", to: "panel", length: "2 m", size: "6 AWG", cable: catalog.cable."awg6-red", protection: catalog.protection.mrbf60 & {distance: "0 mm"}}
	"bank-alt": {from: "bank", to: "alternator", length: "1.5 m", size: "6 AWG", cable: catalog.cable."awg6-red", protection: catalog.protection.mrbf60 & {distance: "0 mm"}}
	"bank-ctl": {from: "bank", to: "ctl", length: "1.2 m", size: "10 AWG", cable: catalog.cable."awg10-red", protection: catalog.protection.mrbf30 & {distance: "0 mm"}}
	"rails-ctl": {from: "rails", to: "ctl", length: "4 m", size: "10 AWG", cable: catalog.cable."awg10-red"}
	"panel-fridge": {from: "panel", to: "fridge", length: "3 m", size: "12 AWG", cable: catalog.cable."awg12-red", protection: catalog.protection.cb10 & {distance: "0 mm"}}
	"panel-lights": {from: "panel", to: "lights", length: "6 m", size: "14 AWG", cable: catalog.cable."awg14-red", protection: catalog.protection.cb5 & {distance: "0 mm"}}
	"panel-nav": {from: "panel", to: "nav", length: "10 m", size: "12 AWG", cable: catalog.cable."awg12-red", protection: catalog.protection.cb5 & {distance: "0 mm"}}
	"panel-pump": {from: "panel", to: "pump", length: "4 m", size: "12 AWG", cable: catalog.cable."awg12-red", protection: catalog.protection.cb10 & {distance: "0 mm"}}
}
`

// hull fills smallHull's blanks.
func hull(battery string, parallel int, module, controller string, place int, autonomy float64) string {
	return strings.NewReplacer("BATTERY", battery, "PARALLEL", fmt.Sprint(parallel), "MODULE", module,
		"CONTROLLER", controller, "PLACE", fmt.Sprint(place), "AUTONOMY", fmt.Sprint(autonomy)).Replace(smallHull)
}

// battery, module and controller write catalog entries, typical of parts
// of each kind.
func battery(id, chemistry, volts string, ah, price float64) string {
	// Internal resistance falls as capacity rises: about 0.5 Ω·Ah.
	res := fmt.Sprintf("%.3g mΩ", 500/ah)
	extra := `peukert: 1.2, maxCharge: "` + fmt.Sprint(ah*0.25) + ` A", resistance: "` + res + `", absorption: "14.6 V", float: "13.5 V"`
	if chemistry == "lifepo4" {
		extra = `ratedHours: 5, maxCharge: "` + fmt.Sprint(ah*0.5) + ` A", maxDischarge: "` + fmt.Sprint(ah) + ` A", peakDischarge: "` + fmt.Sprint(ah*2) +
			` A", resistance: "3 mΩ", depthOfDischarge: 0.9, chargeLowLimit: "0 °C", absorption: "14.2 V", float: "13.5 V"`
	}
	if volts == "6 V" {
		extra = strings.NewReplacer(`"14.6 V"`, `"7.3 V"`, `"13.5 V"`, `"6.75 V"`).Replace(extra)
	}
	return fmt.Sprintf("\t%q: {price: %g, chemistry: %q, voltage: %q, capacity: \"%g Ah\", %s}\n", id, price, chemistry, volts, ah, extra)
}

func module(id string, watts, vmp, voc, price float64) string {
	imp, isc := watts/vmp, watts/vmp*1.06
	// About 19 % efficient, 1.5 : 1.
	area := watts / 190
	w := 1000 * sqrt(area/1.5)
	return fmt.Sprintf("\t%q: {price: %g, pmax: \"%g W\", vmp: \"%g V\", imp: \"%.2f A\", voc: \"%g V\", isc: \"%.2f A\", gammaPmax: \"-0.36 %%/°C\", betaVoc: \"-0.28 %%/°C\", noct: \"45 °C\", lengthDim: \"%.0f mm\", widthDim: \"%.0f mm\", maxSeriesFuse: \"15 A\"}\n",
		id, price, watts, vmp, imp, voc, isc, 1.5*w, w)
}

func controller(id, kind string, maxV, amps, price float64) string {
	headroom := "5 V"
	if kind == "pwm" {
		headroom = "1 V"
	}
	return fmt.Sprintf("\t%q: {price: %g, kind: %q, maxPVVoltage: \"%g V\", maxPVCurrent: \"%g A\", output: \"%g A\", headroom: %q, systems: [\"12 V\", \"24 V\"]}\n",
		id, price, kind, maxV, amps*1.2, amps, headroom)
}

func sqrt(x float64) float64 {
	z := x
	for range 30 {
		z = (z + x/z) / 2
	}
	return z
}

// syntheticCatalog is a catalog of nb batteries, nm modules and nc
// controllers, made the same from the same seed: 12 V and 6 V lead-acid
// and 12 V lithium batteries from 40 to 300 Ah, modules from 50 to 400 W,
// PWM and MPPT controllers from 10 to 60 A, priced about as the trade
// prices them, give or take a fifth.
func syntheticCatalog(nb, nm, nc int) map[string]string {
	r := rand.New(rand.NewPCG(16, 2026))
	jitter := func() float64 { return 0.8 + 0.4*r.Float64() }
	var b, m, c strings.Builder
	chem := []string{"flooded", "agm", "gel", "lifepo4"}
	for i := range nb {
		ch := chem[i%len(chem)]
		ah := float64(40 + 10*r.IntN(27))
		volts := "12 V"
		perAh := map[string]float64{"flooded": 1.3, "agm": 2.1, "gel": 2.6, "lifepo4": 4.2}[ch]
		if ch != "lifepo4" && i%7 == 3 {
			volts, ah = "6 V", ah*2
			perAh /= 2
		}
		if ch == "lifepo4" {
			volts = "12.8 V"
		}
		b.WriteString(battery(fmt.Sprintf("bat-%02d", i), ch, volts, ah, float64(int(ah*perAh*jitter()))))
	}
	for i := range nm {
		watts := float64(50 + 10*r.IntN(36))
		vmp := 18 + 2*float64(r.IntN(3))
		if watts > 250 {
			vmp = 31 + float64(r.IntN(6))
		}
		m.WriteString(module(fmt.Sprintf("mod-%02d", i), watts, vmp, vmp*1.22, float64(int(watts*0.85*jitter()))))
	}
	for i := range nc {
		kind, maxV, price := "pwm", 30.0, 2.0
		if i%3 != 0 {
			kind, maxV, price = "mppt", float64(75+25*r.IntN(4)), 6.5
		}
		amps := float64(10 + 5*r.IntN(11))
		c.WriteString(controller(fmt.Sprintf("ctl-%02d", i), kind, maxV, amps, float64(int(amps*price*jitter()))))
	}
	return map[string]string{"battery": b.String(), "module": m.String(), "controller": c.String()}
}
