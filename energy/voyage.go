package energy

import (
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
)

// VoyageRun is a bank's state-of-charge run over the design voyage and
// what it ran on.
type VoyageRun struct {
	Bank  *model.Bank
	Hours []Hour
	Sim   Sim
	Model BankModel
}

// Voyage runs the primary bank over the design voyage, or returns nil
// when the design has no voyage.
func Voyage(sys *model.System, a *Analysis) *VoyageRun {
	b := sys.Primary()
	if sys.Design.Voyage == nil || b == nil {
		return nil
	}
	bm := Bank(b, sys.Rules)
	hours := VoyageHours(sys, b, a.BudgetOf(b), a.Harvest)
	return &VoyageRun{Bank: b, Hours: hours, Model: bm, Sim: Simulate(hours, bm.Stored, bm.Floor, BankChemistry(b, sys.Rules))}
}

// Result is the run as the result reports it.
func (v *VoyageRun) Result(start string) *result.Voyage {
	s := v.Sim
	out := &result.Voyage{
		Start: start, Hours: len(v.Hours),
		Lowest: round(s.Lowest*100, 2), LowestDay: s.LowestAt / 24, LowestHour: s.LowestAt % 24,
		Floor: round(s.Floor/s.Stored*100, 2), Unmet: round(s.Unmet, 1), RecoverDays: -1,
		Offered: round(s.Offered, 1), Charged: round(s.Charged, 1), Drawn: round(s.Drawn, 1),
		Spilled: round(s.Spilled, 1), ChargeLoss: round(s.ChargeLoss, 1),
	}
	if s.RecoverHours >= 0 {
		out.RecoverDays = round(float64(s.RecoverHours)/24, 2)
	}
	if len(v.Hours) > 0 && s.LowestAt < len(v.Hours) {
		out.LowestScenario = v.Hours[s.LowestAt].Scenario
		out.LowestMonth = Months[v.Hours[s.LowestAt].Month]
	}
	out.SoC = make([]float64, len(s.SoC))
	for i, x := range s.SoC {
		out.SoC[i] = round(x*100, 1)
	}
	return out
}
