// Package energy holds the energy analyses of a hull's system model: the
// energy budget of each bank by scenario, the solar harvest of each array
// by month, and the state of charge over the design voyage. Analyze runs
// them once, in that order, over a model.System; the checks, the result
// and the reports read the Analysis it returns.
package energy

import (
	"fmt"
	"math"

	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// Analysis is what Analyze finds.
type Analysis struct {
	// Budgets are the energy budgets of the banks that carry loads, by
	// bank; Budget is the primary bank's.
	Budgets []BankBudget
	Budget  []ScenarioEnergy
	// Harvest is each array's mean day by month.
	Harvest []ArrayHarvest
	// Voyage is the design voyage's run of the primary bank, nil when the
	// design has no voyage.
	Voyage *VoyageRun
}

// BankBudget is one bank's energy budget.
type BankBudget struct {
	Bank      *model.Bank
	Scenarios []ScenarioEnergy
}

// Analyze runs the energy analyses of sys.
func Analyze(sys *model.System) *Analysis {
	a := &Analysis{}
	primary := sys.Primary()
	for _, b := range sys.Banks {
		if len(b.Loads) == 0 && b != primary {
			continue
		}
		bb := BankBudget{Bank: b, Scenarios: Budget(sys, b)}
		a.Budgets = append(a.Budgets, bb)
		if b == primary {
			a.Budget = bb.Scenarios
		}
	}
	a.Harvest = Harvest(sys)
	a.Voyage = Voyage(sys, a)
	return a
}

// BudgetOf returns the budget of bank b, or nil.
func (a *Analysis) BudgetOf(b *model.Bank) []ScenarioEnergy {
	for _, bb := range a.Budgets {
		if bb.Bank == b {
			return bb.Scenarios
		}
	}
	return nil
}

// BankModel is a bank's capacity and what of it may be used.
type BankModel struct {
	Voltage   float64 // nominal, V
	Capacity  float64 // rated, Ah
	Nominal   float64 // Wh
	DoD       float64
	DoDSource string
	// TempFactor is the fraction of rated capacity available at the bank's
	// temperature.
	TempFactor float64
	TempSource string
	EndOfLife  float64
	// Usable is Nominal × DoD × TempFactor × EndOfLife, Wh, before Peukert.
	Usable float64
	// Stored is the energy the simulation starts with, Nominal × TempFactor
	// × EndOfLife, and Floor the least it may hold: Stored × (1 − DoD).
	Stored, Floor float64
}

// Bank models bank b under rules.
func Bank(b *model.Bank, rules schema.Rulebook) BankModel {
	spec := b.Spec
	m := BankModel{
		Voltage:   b.NominalVoltage(),
		Capacity:  b.Capacity(),
		EndOfLife: spec.EndOfLife,
	}
	m.Nominal = m.Voltage * m.Capacity
	m.DoD, m.DoDSource = depthOfDischarge(b, rules)
	m.TempFactor, m.TempSource = 1, "LiFePO4 capacity taken as rated (common practice)"
	if !spec.Battery.LeadAcid() {
		if f, src, ok := LithiumFactor(spec.Battery.CapacityByTemperature, rulesRows(rules, true), spec.Temperature.Celsius(), spec.Battery.ID, rules); ok {
			m.TempFactor = math.Min(f, 1)
			m.TempSource = fmt.Sprintf("%g at %s (%s)", m.TempFactor, spec.Temperature.Text, src)
		}
	}
	if spec.Battery.LeadAcid() && rules.CapacityTemp != nil {
		f := RowFactor(rules.CapacityTemp.Rows, spec.Temperature.Celsius())
		m.TempFactor = 1 / math.Max(f, 1)
		m.TempSource = fmt.Sprintf("1 ÷ %g at %s (%s)", math.Max(f, 1), spec.Temperature.Text, Sourced(rules.CapacityTemp.Sourced))
	}
	m.Stored = m.Nominal * m.TempFactor * m.EndOfLife
	m.Usable = m.Stored * m.DoD
	m.Floor = m.Stored - m.Usable
	return m
}

// Inputs are the figures the usable energy is made of, for a figure's
// inputs.
func (bm BankModel) Inputs(bankPath string) []result.Input {
	return []result.Input{
		{Name: "V_bank × C_bank", Value: round(bm.Nominal, 1), Unit: "Wh", From: bankPath + ".nominalEnergy"},
		{Name: "DoD", Value: bm.DoD, From: bm.DoDSource},
		{Name: "F_temp", Value: round(bm.TempFactor, 4), From: bm.TempSource},
		{Name: "F_eol", Value: bm.EndOfLife, From: bankPath + ".endOfLife"},
	}
}

func depthOfDischarge(b *model.Bank, rules schema.Rulebook) (float64, string) {
	spec := b.Spec
	switch {
	case spec.DepthOfDischarge != nil:
		return *spec.DepthOfDischarge, b.Path + ".depthOfDischarge"
	case spec.Battery.DepthOfDischarge != nil:
		return *spec.Battery.DepthOfDischarge, "catalog data for " + spec.Battery.ID
	}
	r := rules.DepthOfDischarge
	v := map[string]float64{"flooded": r.Flooded, "agm": r.AGM, "gel": r.Gel, "lifepo4": r.LiFePO4}[spec.Battery.Chemistry]
	return v, Sourced(r.Sourced)
}

// LithiumFactor is a LiFePO4 battery's factor at cell temperature t from
// its maker's table, else from the rulebook's, with where it came from;
// false when there is neither.
func LithiumFactor(own, rulebook []schema.VocRow, t float64, battery string, rules schema.Rulebook) (float64, string, bool) {
	switch {
	case len(own) > 0:
		return RowFactor(own, t), "catalog data for " + battery, true
	case len(rulebook) > 0 && rules.Lithium != nil:
		return RowFactor(rulebook, t), Sourced(rules.Lithium.Sourced), true
	}
	return 1, "", false
}

// rulesRows is the rulebook's LiFePO4 table of capacity (or, with
// capacity false, of charge acceptance) by temperature.
func rulesRows(rules schema.Rulebook, capacity bool) []schema.VocRow {
	if rules.Lithium == nil {
		return nil
	}
	if capacity {
		return rules.Lithium.Capacity
	}
	return rules.Lithium.Charge
}

// ChargeFactor is the fraction of a LiFePO4 battery's maximum charge
// current it accepts at cell temperature t, and where that came from.
func ChargeFactor(b schema.Battery, t float64, rules schema.Rulebook) (float64, string) {
	f, src, ok := LithiumFactor(b.ChargeByTemperature, rulesRows(rules, false), t, b.ID, rules)
	if !ok {
		return 1, ""
	}
	return f, src
}

// RowFactor is the factor of the first row, in the order given (warmest
// first), whose temperature t is at or above; the last row's below all.
func RowFactor(rows []schema.VocRow, t float64) float64 {
	if len(rows) == 0 {
		return 1
	}
	for _, r := range rows {
		if t >= r.From.Celsius()-1e-9 {
			return r.Factor
		}
	}
	return rows[len(rows)-1].Factor
}

// PeukertCapacity is the capacity a lead-acid battery rated c Ah at h hours
// delivers at current i, by Peukert's law in its normalised form
// t = H × (C / (I × H))^k, so C_eff = I × t = C × (C / (I × H))^(k − 1).
// Above the rated capacity it is not credited: a lighter load than the
// rating's is taken at the rated capacity.
func PeukertCapacity(c, h, k, i float64) float64 {
	if i <= 0 || k <= 1 {
		return c
	}
	return math.Min(c, c*math.Pow(c/(i*h), k-1))
}

// PeukertRuntime is the runtime, hours, of a battery rated c Ah at h hours
// discharged at i amperes: t = H × (C / (I × H))^k.
func PeukertRuntime(c, h, k, i float64) float64 {
	return h * math.Pow(c/(i*h), k)
}

// PeukertFor is bank b's effective capacity, Ah, at a mean bank current,
// and how it was found.
func PeukertFor(b *model.Bank, bankCurrent float64) (float64, string) {
	spec := b.Spec
	c := spec.Battery.Capacity.Ah()
	capBank := c * float64(spec.Parallel)
	if !spec.Battery.LeadAcid() || spec.Battery.Peukert == nil {
		return capBank, "no Peukert correction (LiFePO4, or no exponent given)"
	}
	k := *spec.Battery.Peukert
	i := bankCurrent / float64(spec.Parallel)
	ceff := PeukertCapacity(c, spec.Battery.RatedHours, k, i) * float64(spec.Parallel)
	return ceff, fmt.Sprintf("Peukert k = %g at %.3g A per battery, rated at %g h", k, i, spec.Battery.RatedHours)
}

// ChargeVoltage is bank b's voltage while charging: the battery's
// absorption voltage × series, else the rulebook's multiple of nominal.
func ChargeVoltage(b *model.Bank, rules schema.Rulebook) float64 {
	spec := b.Spec
	if spec.Battery.Absorption != nil {
		return spec.Battery.Absorption.Volts() * float64(spec.Series)
	}
	return rules.Charging.ChargeVoltage * float64(spec.Series) * spec.Battery.Voltage.Volts()
}

// Sourced is a rulebook table's source with its caveat.
func Sourced(s schema.Sourced) string {
	if c := s.Caveat(); c != "" {
		return s.Source + " (" + c + ")"
	}
	return s.Source
}

// round rounds x to n decimal places, so that results print the same on
// every platform.
func round(x float64, n int) float64 {
	p := math.Pow(10, float64(n))
	return math.Round(x*p) / p
}
