package model

import (
	"fmt"
	"math"
	"sort"
	"sync"

	"github.com/ampwright/ampwright/schema"
	"github.com/ampwright/ampwright/schema/unit"
)

// Resistance is a conductor's resistance per metre and how it was found.
type Resistance struct {
	R20   float64 // Ω/m at 20 °C
	Temp  float64 // conductor temperature, °C
	RT    float64 // Ω/m at Temp
	Basis string
	// FromTable is false when a metric size is not in the rulebook's table
	// and its nominal area was used instead.
	FromTable bool
}

// ConductorResistance finds the resistance per metre of one conductor of
// the given size, at the temperature the rulebook takes for the run:
// AWG sizes from the ASTM B258 area and the resistivity of copper (with
// lay and tinning factors), metric sizes from the table of maximum
// resistances (IEC 60228 class 5 in the default rulebook).
func ConductorResistance(rules schema.Rulebook, c *schema.Conductor, size unit.Size, temp float64) Resistance {
	rr := rules.Resistance
	tinned := c.Material != "copper"
	res := Resistance{Temp: temp, FromTable: true}
	area := size.MM2()
	if _, ok := size.AWG(); ok {
		tf := 1.0
		if tinned {
			tf = rr.TinnedFactor
		}
		res.R20 = rr.Resistivity / area * rr.LayFactor * tf
		res.Basis = fmt.Sprintf("ρ/A × lay × tinning = %g Ω·mm²/m ÷ %.4g mm² × %g × %g", rr.Resistivity, area, rr.LayFactor, tf)
	} else {
		table := rr.Metric.Plain
		if tinned {
			table = rr.Metric.Tinned
		}
		if ohmPerKm, key, ok := LookupSize(table, area); ok {
			res.R20 = ohmPerKm / 1000
			res.Basis = fmt.Sprintf("%g Ω/km at 20 °C for %s (rulebook resistance table)", ohmPerKm, key)
		} else {
			tf := 1.0
			if tinned {
				tf = rr.TinnedFactor
			}
			res.R20 = rr.Resistivity / area * tf
			res.Basis = fmt.Sprintf("nominal area: ρ/A × tinning = %g Ω·mm²/m ÷ %g mm² × %g (size not in the rulebook table)", rr.Resistivity, area, tf)
			res.FromTable = false
		}
	}
	res.RT = res.R20 * (1 + rr.Alpha*(temp-20))
	return res
}

// Temperature is the conductor temperature of a run for its voltage
// drop: the rulebook's, or the engine-space temperature for a run through
// an engine space when that is higher.
func (s *System) Temperature(c *schema.Conductor) float64 {
	t := s.Rules.Resistance.Temperature.Celsius()
	if c.EngineSpace {
		t = math.Max(t, s.Design.Site.EngineSpace.Celsius())
	}
	return t
}

// LookupSize finds the entry of table (keyed by sizes such as "6 mm²" or
// "10 AWG") for a conductor of the given area, mm².
func LookupSize(table map[string]float64, area float64) (float64, string, bool) {
	for _, k := range schema.Names(table) {
		a, ok := keyArea(k)
		if !ok {
			continue
		}
		if math.Abs(a-area) <= 1e-3*area {
			return table[k], k, true
		}
	}
	return 0, "", false
}

// keyAreas caches the area, mm², of each size key of the rulebook's
// tables: the wiring checks look sizes up many times a design.
var keyAreas sync.Map // string → float64, or false when not a size

func keyArea(k string) (float64, bool) { return keyValue(&keyAreas, k, unit.DimSize, 1e6) }

// keyValue is a rulebook table's key k as a quantity of dimension dim,
// its SI value × scale, cached in m; false when k is not one.
func keyValue(m *sync.Map, k string, dim unit.Dim, scale float64) (float64, bool) {
	if v, ok := m.Load(k); ok {
		x, isQ := v.(float64)
		return x, isQ
	}
	q, err := unit.ParseAs(k, dim)
	if err != nil {
		m.Store(k, false)
		return 0, false
	}
	m.Store(k, q.Value*scale)
	return q.Value * scale, true
}

// Ampacity is a conductor's allowable current and how it was found.
type Ampacity struct {
	Table     float64 // from the rulebook table, A
	SizeKey   string
	RatingKey string
	Engine    float64 // engine-space factor
	Bundle    float64 // bundling factor
	Derated   float64 // Table × Engine × Bundle
	Note      string
	OK        bool
}

// Ampacity looks up the allowable current of a conductor of the
// given size: the table row of its size (a metric size takes the row of
// the largest tabled size of no greater area, which is conservative), the
// column of the highest insulation rating not above its own, derated for
// an engine space and for bundling.
func (s *System) Ampacity(c *schema.Conductor, size unit.Size) Ampacity {
	return s.ampacityAt(c, size, s.Volts)
}

// RunAmpacity is Ampacity for run r at the given size, the bundling rule
// taken at the voltage of the run's side.
func (s *System) RunAmpacity(r *Run, size unit.Size) Ampacity {
	return s.ampacityAt(r.Spec, size, r.Volts)
}

// ampacityRow is a row of the rulebook's ampacity table: its size key and
// area, mm².
type ampacityRow struct {
	key  string
	area float64
}

// ampacityRows are the rows of the ampacity table, thin to thick, parsed
// once for the system: every wiring check asks for them.
func (s *System) ampacityRows() []ampacityRow {
	if s.ampRows != nil {
		return s.ampRows
	}
	rows := []ampacityRow{}
	for _, k := range schema.Names(s.Rules.Ampacity.Table) {
		if q, err := unit.ParseAs(k, unit.DimSize); err == nil {
			rows = append(rows, ampacityRow{k, q.Value * 1e6})
		}
	}
	sort.Slice(rows, func(i, j int) bool { return rows[i].area < rows[j].area })
	s.ampRows = rows
	return rows
}

func (s *System) ampacityAt(c *schema.Conductor, size unit.Size, volts float64) Ampacity {
	rules := s.Rules
	a := Ampacity{Engine: 1, Bundle: 1}
	area := size.MM2()
	rows := s.ampacityRows()
	_, isAWG := size.AWG()
	for _, r := range rows {
		switch {
		case isAWG && math.Abs(r.area-area) <= 5e-3*area:
			a.SizeKey = r.key
		case !isAWG && r.area <= area*(1+1e-6):
			a.SizeKey = r.key
			a.Note = fmt.Sprintf("%s rated as %s, the largest tabled size of no greater area", size.Text, r.key)
		}
	}
	if a.SizeKey == "" {
		a.Note = fmt.Sprintf("no row for %s in the ampacity table", size.Text)
		return a
	}
	cols := rules.Ampacity.Table[a.SizeKey]
	a.RatingKey = RatingAtMost(cols, c.Insulation.Celsius())
	if a.RatingKey == "" {
		a.Note = fmt.Sprintf("no column for insulation rated %s", c.Insulation.Text)
		return a
	}
	a.Table = cols[a.RatingKey]
	if c.EngineSpace && rules.EngineSpace != nil {
		if k := RatingAtMost(rules.EngineSpace.Factor, c.Insulation.Celsius()); k != "" {
			a.Engine = rules.EngineSpace.Factor[k]
		}
	}
	if b := rules.Bundling; b != nil && volts >= b.MinVoltage {
		for _, st := range b.Steps {
			if c.Bundle >= st.From {
				a.Bundle = st.Factor
			}
		}
	}
	a.Derated = a.Table * a.Engine * a.Bundle
	a.OK = true
	return a
}

// RatingAtMost returns the key of m (temperatures such as "105 °C") that is
// the highest not above t.
func RatingAtMost[V any](m map[string]V, t float64) string {
	best, bestT := "", math.Inf(-1)
	for _, k := range schema.Names(m) {
		v, ok := keyTemperature(k)
		if !ok {
			continue
		}
		if v <= t+1e-9 && v > bestT {
			best, bestT = k, v
		}
	}
	return best
}

// keyTemperatures caches the temperature, in the unit's SI value, of each
// insulation-rating key of the rulebook's tables, as keyAreas the sizes.
var keyTemperatures sync.Map // string → float64, or false

func keyTemperature(k string) (float64, bool) {
	return keyValue(&keyTemperatures, k, unit.DimTemperature, 1)
}

// DropLimit is the rulebook's voltage-drop limit for a class, percent.
func DropLimit(rules schema.Rulebook, class string) float64 {
	if class == "critical" {
		return rules.VoltageDrop.Critical
	}
	return rules.VoltageDrop.Other
}

// Drop is a run's voltage drop at its drop current and the resistances it
// was found from.
type Drop struct {
	// Res is the run's conductor; RetRes its own return conductor's, or
	// that of the negative conductor its return travels on (Via).
	Res, RetRes Resistance
	// RetLength (m) and RetCurrent (A) are the return's.
	RetLength, RetCurrent float64
	Volts, Pct            float64
}

// RunDrop is the voltage drop of run r at size: over the run and its
// return. A return of the run's own size and length (every run of a design
// that draws no negative side) gives I × 2L × R′; another return adds its
// own I × L × R′, and a return that travels on a negative conductor adds
// that conductor's drop at its own current.
func (s *System) RunDrop(r *Run, size unit.Size) Drop {
	temp := s.Temperature(r.Spec)
	d := Drop{Res: ConductorResistance(s.Rules, r.Spec, size, temp)}
	l := r.Spec.Length.Metres()
	switch {
	case r.Ret.Via != nil:
		v := r.Ret.Via
		d.RetRes = ConductorResistance(s.Rules, v.Spec, v.Spec.Size, s.Temperature(v.Spec))
		d.RetLength, d.RetCurrent = v.Spec.Length.Metres(), v.Current
		d.Volts = r.DropCurrent*l*d.Res.RT + d.RetCurrent*d.RetLength*d.RetRes.RT
	case !r.Ret.Own:
		// No return conductor of its own: the run's current returns over
		// the negative side the design draws, counted on the circuits that
		// land there.
		d.Volts = r.DropCurrent * l * d.Res.RT
	case r.Ret.Own && !r.Ret.Mirror:
		d.RetRes = ConductorResistance(s.Rules, r.Spec, r.Ret.Size, temp)
		d.RetLength, d.RetCurrent = r.Ret.Length, r.DropCurrent
		d.Volts = r.DropCurrent*l*d.Res.RT + d.RetCurrent*d.RetLength*d.RetRes.RT
	default:
		d.RetRes, d.RetLength, d.RetCurrent = d.Res, l, r.DropCurrent
		d.Volts = r.DropCurrent * 2 * l * d.Res.RT
	}
	if r.DropVoltage > 0 {
		d.Pct = d.Volts / r.DropVoltage * 100
	}
	return d
}

// StandardSizes lists the standard sizes of like's family, thin to thick:
// every AWG gauge, or the metric sizes the rulebook's resistance table for
// plain metric conductors (metric) gives, so that a suggested size never
// rests on a nominal-area guess.
func StandardSizes(metric map[string]float64, like unit.Size) []unit.Size {
	var out []unit.Size
	if _, ok := like.AWG(); ok {
		for _, g := range unit.StandardAWG() {
			if q, err := unit.ParseAs(unit.AWGName(g), unit.DimSize); err == nil {
				out = append(out, unit.Size{Quantity: q})
			}
		}
		return out
	}
	for _, a := range unit.StandardMetric() {
		if _, _, ok := LookupSize(metric, a); !ok {
			continue
		}
		if q, err := unit.ParseAs(fmt.Sprintf("%g mm²", a), unit.DimSize); err == nil {
			out = append(out, unit.Size{Quantity: q})
		}
	}
	return out
}
