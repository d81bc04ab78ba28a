package checks

import (
	"fmt"

	"github.com/ampwright/ampwright/energy"
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// dischargePeak is the largest current bank b gives with its loads
// running together and the one whose start adds most starting, and when.
func dischargePeak(in *Input, b *model.Bank) (peak, running float64, starter *model.Load, when string) {
	for _, sn := range schema.Names(in.Design.Scenarios) {
		for h := 0; h < 24; h++ {
			var sum, extra float64
			var st *model.Load
			for _, l := range b.Loads {
				if l.Spec.Hours[sn] <= 0 || !energy.OnAt(l.Spec.Windows, h) {
					continue
				}
				sum += energy.BankCurrent(in.Sys, l)
				if e := energy.BankSurge(in.Sys, l); e > extra {
					extra, st = e, l
				}
			}
			if sum+extra > peak+1e-9 {
				peak, running, starter, when = sum+extra, sum, st, fmt.Sprintf("%s at %02d:00", sn, h)
			}
		}
	}
	return peak, running, starter, when
}

// BankDischarge checks each bank's continuous discharge against the
// loads that run together.
var BankDischarge = &Check{
	ID:    result.CheckBankDischarge,
	Title: "each bank's continuous discharge limit above the loads that run together",
	Doc: `Checks that each bank can give the current its loads draw together.

Method: in each scenario, each hour of the day, the bank's loads that run
in it and whose time windows hold the hour (any hour without windows) draw
their full current from the bank: a DC load its current (through its
converter at the converter's efficiency), an AC load its power ÷ the
inverter's efficiency ÷ the bank's nominal voltage.

    I_together = Σ I_bank(load)

Limit: N_parallel × the battery's maximum continuous discharge current
(maker's data; for LiFePO4 the battery management system's limit, above
which it disconnects the bank). A LiFePO4 battery whose catalog entry gives
no limit is a warning.`,
	Run: func(in *Input, out *Report) {
		for _, b := range in.Sys.Banks {
			if len(b.Loads) == 0 {
				continue
			}
			tg := energy.RunTogether(in.Sys, b.Loads, func(l *model.Load) float64 { return energy.BankCurrent(in.Sys, l) }, nil)
			var inputs []result.Input
			for _, l := range tg.Loads {
				inputs = append(inputs, result.Input{Name: l.Name, Value: round(energy.BankCurrent(in.Sys, l), 3), Unit: "A", From: l.Path})
			}
			out.Figure(result.Figure{
				ID: result.FigBankDischarge, Subject: b.Name, Value: round(tg.Value, 2), Unit: "A",
				Formula: "I_together = Σ I_bank of the loads on at once",
				Inputs:  inputs,
				Source:  "the loads' scenarios and time windows",
			})
			spec := b.Spec.Battery
			f := result.Finding{Subject: b.Name, Value: round(tg.Value, 2), Unit: "A", Position: in.Position(b.Path), Source: "catalog data for " + spec.ID, Status: result.Pass}
			if spec.MaxDischarge == nil {
				if spec.LeadAcid() {
					continue
				}
				f.Status = result.Warn
				f.Message = fmt.Sprintf("%s together (%s); the catalog gives no maximum discharge current for %s", amps(tg.Value), whenText(tg.Scenario, tg.Hour, tg.Loads), spec.ID)
				f.Change = "give the battery management system's discharge limit in the catalog"
				out.Add(f)
				continue
			}
			lim := spec.MaxDischarge.Amps() * float64(b.Spec.Parallel)
			f.Limit, f.Margin = lim, round(lim-tg.Value, 2)
			f.Message = fmt.Sprintf("%s together (%s: %s) against %d × %s = %s", amps(tg.Value), whenText(tg.Scenario, tg.Hour, tg.Loads), loadNames(tg.Loads), b.Spec.Parallel, spec.MaxDischarge.Text, amps(lim))
			if tg.Value > lim+1e-9 {
				f.Status = result.Fail
				f.Change = "more batteries in parallel, a battery with a higher discharge limit, or time windows that keep these loads apart"
			}
			out.Add(f)
		}
	},
}

// BankPeak checks each bank's peak discharge against the largest start on
// top of the loads that run together.
var BankPeak = &Check{
	ID:    result.CheckBankPeak,
	Title: "each bank's peak discharge limit above the largest start on top of the running loads",
	Doc: `Checks that each bank can give its largest starting current on top of
the loads that run with it (as in bank.discharge): a windlass starting
while the inverter runs the galley.

    I_peak = Σ I_bank(load) + max(I_start − I_run)

A DC load's start is its surge current, an AC load's its surgePower through
the inverter.

Limit: N_parallel × the battery's peak discharge current for its
peakSeconds (maker's data), else its continuous limit. Only a start that
lasts no longer than the peak's seconds may use the peak limit.`,
	Run: func(in *Input, out *Report) {
		for _, b := range in.Sys.Banks {
			peak, running, starter, when := dischargePeak(in, b)
			if starter == nil {
				continue
			}
			spec := b.Spec.Battery
			out.Figure(result.Figure{
				ID: result.FigBankPeak, Subject: b.Name, Value: round(peak, 2), Unit: "A",
				Formula: "I_peak = Σ I_bank + max(I_start − I_run)",
				Inputs: []result.Input{
					{Name: "Σ I_bank", Value: round(running, 3), Unit: "A", From: "loads on at once, " + when},
					{Name: "I_start − I_run", Value: round(peak-running, 3), Unit: "A", From: starter.Path},
				},
				Source: "the loads' scenarios, time windows and starting currents",
			})
			f := result.Finding{Subject: b.Name, Value: round(peak, 2), Unit: "A", Position: in.Position(b.Path), Source: "catalog data for " + spec.ID, Status: result.Pass}
			lim, what := 0.0, ""
			switch {
			case spec.PeakDischarge != nil && starter.Spec.SurgeSeconds <= spec.PeakSeconds:
				lim, what = spec.PeakDischarge.Amps()*float64(b.Spec.Parallel), fmt.Sprintf("%d × %s for %g s", b.Spec.Parallel, spec.PeakDischarge.Text, spec.PeakSeconds)
			case spec.MaxDischarge != nil:
				lim, what = spec.MaxDischarge.Amps()*float64(b.Spec.Parallel), fmt.Sprintf("%d × %s continuous", b.Spec.Parallel, spec.MaxDischarge.Text)
			case spec.LeadAcid():
				continue
			default:
				f.Status = result.Warn
				f.Message = fmt.Sprintf("%s at the start of %s (%s); the catalog gives no discharge limit for %s", amps(peak), starter.Name, when, spec.ID)
				f.Change = "give the battery management system's discharge limits in the catalog"
				out.Add(f)
				continue
			}
			f.Limit, f.Margin = round(lim, 2), round(lim-peak, 2)
			f.Message = fmt.Sprintf("%s running + the start of %s = %s (%s) against %s = %s", amps(running), starter.Name, amps(peak), when, what, amps(lim))
			if peak > lim+1e-9 {
				f.Status = result.Fail
				f.Change = fmt.Sprintf("more batteries in parallel, a soft starter on %s, or keep it from starting while the others run", starter.Name)
			}
			out.Add(f)
		}
	},
}
