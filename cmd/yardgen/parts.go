package main

import "math"

// The parts of the example yard's catalog (designs/catalog/catalog.cue)
// that generated hulls use, with the figures yardgen sizes them by. They
// must match the catalog: a hull refers to each part by its id.

// cable is a catalog cable (its red, positive conductor).
type cable struct {
	id, size string
	// r20 is the resistance per metre at 20 °C, as the default rulebook
	// reckons it for tinned copper: ρ/A × lay × tinning for AWG, the IEC
	// 60228 table for metric sizes.
	r20 float64
	// amp is the allowable amperage at 105 °C, 33 CFR 183.425 Table 5; a
	// metric size takes the row of the largest AWG of no greater area.
	amp float64
}

// awg is the cable of AWG gauge n (0 is 1/0, -1 is 2/0).
func awg(n int, id, size string, amp float64) cable {
	d := 0.127 * math.Pow(92, float64(36-n)/39) // ASTM B258, mm
	a := math.Pi / 4 * d * d
	return cable{id: id, size: size, r20: 0.0172414 / a * 1.02 * 1.04, amp: amp}
}

var awgCables = []cable{
	awg(16, "awg16-red", "16 AWG", 25),
	awg(14, "awg14-red", "14 AWG", 35),
	awg(12, "awg12-red", "12 AWG", 45),
	awg(10, "awg10-red", "10 AWG", 60),
	awg(8, "awg8-red", "8 AWG", 80),
	awg(6, "awg6-red", "6 AWG", 120),
	awg(4, "awg4-red", "4 AWG", 160),
	awg(2, "awg2-red", "2 AWG", 210),
	awg(0, "awg1-0-red", "1/0 AWG", 285),
	awg(-1, "awg2-0-red", "2/0 AWG", 330),
}

var metricCables = []cable{
	{"mm1.5-red", "1.5 mm²", 13.7e-3, 25},
	{"mm2.5-red", "2.5 mm²", 8.21e-3, 35},
	{"mm4-red", "4 mm²", 5.09e-3, 45},
	{"mm6-red", "6 mm²", 3.39e-3, 60},
	{"mm10-red", "10 mm²", 1.95e-3, 80},
	{"mm16-red", "16 mm²", 1.24e-3, 120},
	{"mm25-red", "25 mm²", 0.795e-3, 160},
	{"mm35-red", "35 mm²", 0.565e-3, 210},
	{"mm50-red", "50 mm²", 0.393e-3, 245},
}

// device is a catalog fuse or breaker.
type device struct {
	id                   string
	rating, interrupting float64 // A
}

// breakers are panel toggle breakers, for the circuits of a panel.
var breakers = []device{
	{"cb5", 5, 5000}, {"cb10", 10, 5000}, {"cb15", 15, 5000},
	{"cb20", 20, 5000}, {"cb30", 30, 5000},
}

// terminalFuses are MRBF fuses, on a battery terminal or a busbar stud,
// and the class T fuse for a main feeder.
var terminalFuses = []device{
	{"mrbf30", 30, 10000}, {"mrbf60", 60, 10000}, {"mrbf100", 100, 10000},
	{"mrbf150", 150, 10000}, {"mrbf200", 200, 10000}, {"classT300", 300, 20000},
}

// battery is a catalog battery.
type battery struct {
	id        string
	volts     float64 // nominal
	ah        float64
	ohms      float64 // internal resistance
	leadAcid  bool
	dod       float64 // usable fraction: the battery's own, else the default rulebook's
	maxCharge float64 // A, per battery
}

var batteries = map[string]battery{
	"tern-fl110":     {"tern-fl110", 12, 110, 0.005, true, 0.5, 27},
	"tern-agm105":    {"tern-agm105", 12, 105, 0.004, true, 0.5, 31},
	"tern-gel90":     {"tern-gel90", 12, 90, 0.006, true, 0.5, 18},
	"skua-lfp100":    {"skua-lfp100", 12.8, 100, 0.003, false, 0.9, 50},
	"skua-lfp200":    {"skua-lfp200", 12.8, 200, 0.0025, false, 0.9, 100},
	"skua-lfp24-100": {"skua-lfp24-100", 25.6, 100, 0.005, false, 0.9, 50},
}

// bankOption is one way of building a bank for a system voltage.
type bankOption struct {
	battery          string
	series, parallel int
}

// bankOptions lists the banks for a system voltage: each battery, enough
// in series for the voltage, one to six strings in parallel, as long as a
// class T fuse (20 kA) can break the fault current at the terminals.
func bankOptions(system string, vsys float64) []bankOption {
	var out []bankOption
	for _, id := range []string{"tern-fl110", "tern-agm105", "tern-gel90", "skua-lfp100", "skua-lfp200", "skua-lfp24-100"} {
		bt := batteries[id]
		series := int(math.Round(vsys / bt.volts))
		if series < 1 || math.Abs(float64(series)*bt.volts-vsys)/vsys > 0.1 {
			continue
		}
		for p := 1; p <= 6; p++ {
			b := bankOption{id, series, p}
			if b.fault() <= 18500 {
				out = append(out, b)
			}
		}
	}
	return out
}

// fault is the prospective fault current at the bank's terminals, as
// protection.interrupting reckons it: 1.07 × nominal over the internal
// resistance.
func (b bankOption) fault() float64 {
	bt := batteries[b.battery]
	return 1.07 * float64(b.series) * bt.volts / (bt.ohms * float64(b.series) / float64(b.parallel))
}

// module is a catalog solar module.
type module struct {
	id                string
	pmax, vmp, imp    float64
	voc, isc, maxFuse float64
}

var modules = []module{
	{"gannet-100", 100, 18.2, 5.49, 22.1, 5.83, 15},
	{"fulmar-flex-110", 110, 18.5, 5.95, 22.2, 6.30, 15},
	{"gannet-175m", 175, 19.6, 8.93, 23.6, 9.45, 15},
	{"gannet-200", 200, 20.4, 9.80, 24.5, 10.35, 20},
}

// controller is a catalog solar charge controller.
type controller struct {
	id              string
	pwm             bool
	maxV, maxI, out float64 // PV input voltage and current, output current
}

var (
	pwm20    = controller{"skerry-pwm20", true, 30, 20, 20} // 12 V only
	mppt30   = controller{"skerry-mppt100-30", false, 100, 35, 30}
	mppt45   = controller{"skerry-mppt150-45", false, 150, 50, 45}
	inverter = map[string]struct {
		id                    string
		continuous, eff, idle float64 // W, fraction, W
	}{
		"12 V": {"brent-800-12", 800, 0.90, 8},
		"24 V": {"brent-2000-24", 2000, 0.93, 15},
	}
)
