package compiler

import (
	"cuelang.org/go/cue"

	"github.com/ampwright/ampwright/schema"
	"github.com/ampwright/ampwright/schema/unit"
)

// rulebookErrors finds what #Rulebook cannot say about the tables a design
// gives: a table with no rows, whose checks would then fall back silently
// or find nothing; keys that are not the sizes or temperatures the checks
// look up by; rows out of the order the checks read them in; and a range
// whose minimum exceeds its maximum. Each error is at the table or value in
// the design (or in the yard's rulebook it imports).
func rulebookErrors(v *validator, r *schema.Rulebook) ErrorList {
	if r == nil {
		return nil
	}
	e := &ruleErrs{v: v}
	if t := r.Ampacity; t != nil {
		e.notEmpty(len(t.Table), "ampacity", "table")
		for _, size := range schema.Names(t.Table) {
			e.key(size, unit.DimSize, "ampacity", "table", size)
			if len(t.Table[size]) == 0 {
				e.add(e.path("ampacity", "table", size), "the row is empty; give the ampacity by insulation rating, such as \"105 °C\": 45")
			}
			for _, rating := range schema.Names(t.Table[size]) {
				e.key(rating, unit.DimTemperature, "ampacity", "table", size, rating)
			}
		}
	}
	if t := r.Resistance; t != nil {
		for _, group := range []struct {
			name string
			m    map[string]float64
		}{{"plain", t.Metric.Plain}, {"tinned", t.Metric.Tinned}} {
			e.notEmpty(len(group.m), "resistance", "metric", group.name)
			for _, size := range schema.Names(group.m) {
				e.key(size, unit.DimSize, "resistance", "metric", group.name, size)
			}
		}
	}
	if t := r.EngineSpace; t != nil {
		e.notEmpty(len(t.Factor), "engineSpace", "factor")
		for _, rating := range schema.Names(t.Factor) {
			e.key(rating, unit.DimTemperature, "engineSpace", "factor", rating)
		}
	}
	if t := r.Bundling; t != nil {
		e.notEmpty(len(t.Steps), "bundling", "steps")
		for i := 1; i < len(t.Steps); i++ {
			if t.Steps[i].From <= t.Steps[i-1].From {
				e.add(e.path("bundling", "steps").Append(cue.Index(i), cue.Str("from")), "%d follows %d: the steps apply from a count up, in rising order of from", t.Steps[i].From, t.Steps[i-1].From)
			}
		}
	}
	if t := r.Protection; t != nil {
		e.notEmpty(len(t.StandardRatings), "protection", "standardRatings")
		for i := 1; i < len(t.StandardRatings); i++ {
			if t.StandardRatings[i] <= t.StandardRatings[i-1] {
				e.add(e.path("protection", "standardRatings").Append(cue.Index(i)), "%g follows %g: the standard ratings are read smallest first, in rising order", t.StandardRatings[i], t.StandardRatings[i-1])
			}
		}
	}
	for _, rows := range []struct {
		table string
		t     []schema.VocRow
		given bool
	}{{"vocFactor", vocRows(r.VocFactor), r.VocFactor != nil}, {"capacityTemperature", capRows(r.CapacityTemp), r.CapacityTemp != nil}} {
		if !rows.given {
			continue
		}
		e.notEmpty(len(rows.t), rows.table, "rows")
		for i := 1; i < len(rows.t); i++ {
			if rows.t[i].From.Celsius() >= rows.t[i-1].From.Celsius() {
				e.add(e.path(rows.table, "rows").Append(cue.Index(i), cue.Str("from")), "%s follows %s: a temperature takes the first row whose from it is at or above, so the rows go from warmest to coldest", rows.t[i].From.Text, rows.t[i-1].From.Text)
			}
		}
	}
	if t := r.ChargeRate; t != nil && t.LeadAcidMin > t.LeadAcidMax {
		e.add(e.path("chargeRate", "leadAcidMin"), "the minimum %g is more than the maximum, leadAcidMax %g", t.LeadAcidMin, t.LeadAcidMax)
	}
	if t := r.PV; t != nil && t.FuseMin > t.FuseMax {
		e.add(e.path("pv", "fuseMin"), "the minimum %g is more than the maximum, fuseMax %g", t.FuseMin, t.FuseMax)
	}
	return e.errs
}

func vocRows(t *schema.VocFactorRule) []schema.VocRow {
	if t == nil {
		return nil
	}
	return t.Rows
}

func capRows(t *schema.CapacityTempRule) []schema.VocRow {
	if t == nil {
		return nil
	}
	return t.Rows
}

type ruleErrs struct {
	v    *validator
	errs ErrorList
}

// path is the CUE path of a part of the design's rulebook.
func (e *ruleErrs) path(names ...string) cue.Path {
	return cue.MakePath(strSelectors(append([]string{"rules"}, names...))...)
}

func (e *ruleErrs) add(p cue.Path, format string, args ...any) {
	e.errs.Add(e.v.dataPos(p), p.String(), format, args...)
}

// notEmpty reports a table given with nothing in it.
func (e *ruleErrs) notEmpty(n int, names ...string) {
	if n == 0 {
		e.add(e.path(names...), "the table is empty; give its rows, or leave the table out to take the default rulebook's")
	}
}

// key reports a key that does not read as a quantity of dimension dim:
// the checks look the table up by sizes and temperatures.
func (e *ruleErrs) key(k string, dim unit.Dim, names ...string) {
	if _, err := unit.ParseAs(k, dim); err != nil {
		e.add(e.path(names...), "%q is not %s %s, which the table is looked up by; expected one such as %s", k, article(dim.String()), dim, dim.Examples())
	}
}
