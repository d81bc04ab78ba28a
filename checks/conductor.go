package checks

import (
	"fmt"
	"math"
	"sort"

	"github.com/ampwright/ampwright/schema"
	"github.com/ampwright/ampwright/schema/unit"
)

// resistance is a conductor's resistance per metre and how it was found.
type resistance struct {
	r20   float64 // Ω/m at 20 °C
	temp  float64 // conductor temperature, °C
	rT    float64 // Ω/m at temp
	basis string
	// fromTable is false when a metric size is not in the rulebook's table
	// and its nominal area was used instead.
	fromTable bool
}

// conductorResistance finds the resistance per metre of one conductor of
// the given size, at the temperature the rulebook takes for the run:
// AWG sizes from the ASTM B258 area and the resistivity of copper (with
// lay and tinning factors), metric sizes from the table of maximum
// resistances (IEC 60228 class 5 in the default rulebook).
func conductorResistance(rules schema.Rulebook, c *schema.Conductor, size unit.Size, temp float64) resistance {
	rr := rules.Resistance
	tinned := c.Material != "copper"
	res := resistance{temp: temp, fromTable: true}
	area := size.MM2()
	if _, ok := size.AWG(); ok {
		tf := 1.0
		if tinned {
			tf = rr.TinnedFactor
		}
		res.r20 = rr.Resistivity / area * rr.LayFactor * tf
		res.basis = fmt.Sprintf("ρ/A × lay × tinning = %g Ω·mm²/m ÷ %.4g mm² × %g × %g", rr.Resistivity, area, rr.LayFactor, tf)
	} else {
		table := rr.Metric.Plain
		if tinned {
			table = rr.Metric.Tinned
		}
		if ohmPerKm, key, ok := lookupSize(table, area); ok {
			res.r20 = ohmPerKm / 1000
			res.basis = fmt.Sprintf("%g Ω/km at 20 °C for %s (rulebook resistance table)", ohmPerKm, key)
		} else {
			tf := 1.0
			if tinned {
				tf = rr.TinnedFactor
			}
			res.r20 = rr.Resistivity / area * tf
			res.basis = fmt.Sprintf("nominal area: ρ/A × tinning = %g Ω·mm²/m ÷ %g mm² × %g (size not in the rulebook table)", rr.Resistivity, area, tf)
			res.fromTable = false
		}
	}
	res.rT = res.r20 * (1 + rr.Alpha*(temp-20))
	return res
}

// runTemperature is the conductor temperature for a run: the rulebook's,
// or the engine-space temperature for a run through an engine space when
// that is higher.
func runTemperature(in *Input, c *schema.Conductor) float64 {
	t := in.Rules.Resistance.Temperature.Celsius()
	if c.EngineSpace {
		t = math.Max(t, in.Design.Site.EngineSpace.Celsius())
	}
	return t
}

// lookupSize finds the entry of table (keyed by sizes such as "6 mm²" or
// "10 AWG") for a conductor of the given area, mm².
func lookupSize(table map[string]float64, area float64) (float64, string, bool) {
	for _, k := range schema.Names(table) {
		q, err := unit.ParseAs(k, unit.DimSize)
		if err != nil {
			continue
		}
		if math.Abs(q.Value*1e6-area) <= 1e-3*area {
			return table[k], k, true
		}
	}
	return 0, "", false
}

// ampacity is a conductor's allowable current and how it was found.
type ampacity struct {
	table     float64 // from the rulebook table, A
	sizeKey   string
	ratingKey string
	engine    float64 // engine-space factor
	bundle    float64 // bundling factor
	derated   float64 // table × engine × bundle
	note      string
	ok        bool
}

// conductorAmpacity looks up the allowable current of a conductor of the
// given size: the table row of its size (a metric size takes the row of
// the largest tabled size of no greater area, which is conservative), the
// column of the highest insulation rating not above its own, derated for
// an engine space and for bundling.
func conductorAmpacity(in *Input, c *schema.Conductor, size unit.Size) ampacity {
	rules := in.Rules
	a := ampacity{engine: 1, bundle: 1}
	area := size.MM2()
	type row struct {
		key  string
		area float64
	}
	var rows []row
	for _, k := range schema.Names(rules.Ampacity.Table) {
		if q, err := unit.ParseAs(k, unit.DimSize); err == nil {
			rows = append(rows, row{k, q.Value * 1e6})
		}
	}
	sort.Slice(rows, func(i, j int) bool { return rows[i].area < rows[j].area })
	_, isAWG := size.AWG()
	for _, r := range rows {
		switch {
		case isAWG && math.Abs(r.area-area) <= 5e-3*area:
			a.sizeKey = r.key
		case !isAWG && r.area <= area*(1+1e-6):
			a.sizeKey = r.key
			a.note = fmt.Sprintf("%s rated as %s, the largest tabled size of no greater area", size.Text, r.key)
		}
	}
	if a.sizeKey == "" {
		a.note = fmt.Sprintf("no row for %s in the ampacity table", size.Text)
		return a
	}
	cols := rules.Ampacity.Table[a.sizeKey]
	a.ratingKey = ratingAtMost(cols, c.Insulation.Celsius())
	if a.ratingKey == "" {
		a.note = fmt.Sprintf("no column for insulation rated %s", c.Insulation.Text)
		return a
	}
	a.table = cols[a.ratingKey]
	if c.EngineSpace && rules.EngineSpace != nil {
		if k := ratingAtMost(rules.EngineSpace.Factor, c.Insulation.Celsius()); k != "" {
			a.engine = rules.EngineSpace.Factor[k]
		}
	}
	if b := rules.Bundling; b != nil && in.Design.Vessel.SystemVolts() >= b.MinVoltage {
		for _, s := range b.Steps {
			if c.Bundle >= s.From {
				a.bundle = s.Factor
			}
		}
	}
	a.derated = a.table * a.engine * a.bundle
	a.ok = true
	return a
}

// ratingAtMost returns the key of m (temperatures such as "105 °C") that is
// the highest not above t.
func ratingAtMost[V any](m map[string]V, t float64) string {
	best, bestT := "", math.Inf(-1)
	for _, k := range schema.Names(m) {
		q, err := unit.ParseAs(k, unit.DimTemperature)
		if err != nil {
			continue
		}
		if q.Value <= t+1e-9 && q.Value > bestT {
			best, bestT = k, q.Value
		}
	}
	return best
}

// voltageDrop is the drop of a run: I × 2L × R′, the return conductor being
// the same size and length.
func voltageDrop(current, length, rPerM float64) float64 {
	return current * 2 * length * rPerM
}

// dropLimit is the rulebook's voltage-drop limit for a class, percent.
func dropLimit(rules schema.Rulebook, class string) float64 {
	if class == "critical" {
		return rules.VoltageDrop.Critical
	}
	return rules.VoltageDrop.Other
}
