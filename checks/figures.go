package checks

import (
	"fmt"

	"github.com/ampwright/ampwright/energy"
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
)

const defined = "definition"

// SystemFigures reports the figures of the system model itself: each
// bank's arrangement, each array's power, what each source delivers, and
// the currents of converters, links, negative conductors and shunts.
var SystemFigures = &Check{
	ID:    result.CheckSystemFigures,
	Title: "figures of the system model: banks, arrays, sources, converters, links, the negative side",
	Doc: `Reports the figures the system model is built on; it has no limit of
its own (the other checks use them).

    V_bank = N_series × V_battery
    C_bank = N_parallel × C_battery
    E_bank = V_bank × C_bank
    P_STC  = N_series × N_strings × Pmax
    η      = Pmax / (length × width × 1000 W/m²)
    I_source = the charger's output, or an alternator's rated output × its
               hot factor (the part's, else the rulebook's)
    I_in   = I_out,rated × V_out / (η × V_in)      (converter, DC-DC charger)

A negative conductor carries the returns whose path to their bank's
negative post passes it: the larger of the loads' returns and the charge
sources' returns, which do not peak together. A shunt carries what the
conductors on its bank side carry.`,
	Run: func(in *Input, out *Report) {
		s := in.Sys
		for _, b := range s.Banks {
			bankFigures(b, out)
		}
		for _, a := range s.Arrays {
			arrayFigures(a, out)
		}
		for _, src := range s.Sources {
			if src.Charger == nil {
				continue
			}
			out.Figure(result.Figure{
				ID: result.FigSourceOutput, Subject: src.Name, Value: round(src.Output, 3), Unit: "A",
				Formula: "I_source = the charger's output, or rated output × hot factor",
				Inputs:  []result.Input{{Name: "I_source", Value: round(src.Output, 3), Unit: "A", From: src.OutputBasis}},
				Source:  "catalog data; rulebook sources table",
			})
		}
		for _, c := range s.Converters {
			p := c.Spec.Part
			i := p.Rating.Amps() * c.Out / (p.Efficiency * c.In)
			out.Figure(result.Figure{
				ID: result.FigConverterInput, Subject: c.Name, Value: round(i, 3), Unit: "A",
				Formula: "I_in = I_out,rated × V_out / (η × V_in)",
				Inputs: []result.Input{
					{Name: "I_out,rated", Value: p.Rating.Amps(), Unit: "A", From: "catalog data for " + p.ID},
					{Name: "V_out", Value: c.Out, Unit: "V", From: c.Path + ".part.output"},
					{Name: "η", Value: p.Efficiency, From: "catalog data for " + p.ID},
					{Name: "V_in", Value: c.In, Unit: "V", From: "nominal voltage of its side"},
				},
				Source: defined,
			})
		}
		for _, l := range s.Links {
			i, basis := s.LinkCurrent(l)
			out.Figure(result.Figure{
				ID: result.FigLinkCurrent, Subject: l.Name, Value: round(i, 3), Unit: "A",
				Formula: "I_link = a DC-DC charger's rated output; the sources a combiner or isolator passes",
				Inputs:  []result.Input{{Name: "I_link", Value: round(i, 3), Unit: "A", From: basis}},
				Source:  defined,
			})
		}
		for _, r := range s.Returns {
			out.Figure(result.Figure{
				ID: result.FigReturnCurrent, Subject: r.Name, Value: round(r.Current, 3), Unit: "A",
				Formula: "I = Σ returns whose path to their bank's negative post passes the conductor",
				Inputs:  []result.Input{{Name: "I", Value: round(r.Current, 3), Unit: "A", From: r.Basis}},
				Source:  defined,
			})
		}
		for _, sh := range s.Shunts {
			out.Figure(result.Figure{
				ID: result.FigShuntCurrent, Subject: sh.Name, Value: round(s.ShuntCurrent(sh), 3), Unit: "A",
				Formula: "I_shunt = the current of the negative conductors on its bank side",
				Inputs:  []result.Input{{Name: "rating", Value: sh.Spec.Part.Rating.Amps(), Unit: "A", From: "catalog data for " + sh.Spec.Part.ID}},
				Source:  defined,
			})
		}
	},
}

func bankFigures(b *model.Bank, out *Report) {
	spec := b.Spec
	v := spec.Battery.Voltage.Volts()
	ah := spec.Battery.Capacity.Ah()
	ns, np := float64(spec.Series), float64(spec.Parallel)
	p := b.Path
	out.Figure(result.Figure{
		ID: result.FigBankNominalVoltage, Subject: b.Name, Value: ns * v, Unit: "V",
		Formula: "V_bank = N_series × V_battery",
		Inputs: []result.Input{
			{Name: "N_series", Value: ns, From: p + ".series"},
			{Name: "V_battery", Value: v, Unit: "V", From: p + ".battery.voltage"},
		},
		Source: defined,
	})
	out.Figure(result.Figure{
		ID: result.FigBankCapacity, Subject: b.Name, Value: np * ah, Unit: "Ah",
		Formula: "C_bank = N_parallel × C_battery",
		Inputs: []result.Input{
			{Name: "N_parallel", Value: np, From: p + ".parallel"},
			{Name: "C_battery", Value: ah, Unit: "Ah", From: p + ".battery.capacity"},
		},
		Source: defined,
	})
	out.Figure(result.Figure{
		ID: result.FigBankNominalEnergy, Subject: b.Name, Value: ns * v * np * ah, Unit: "Wh",
		Formula: "E_bank = N_series × V_battery × N_parallel × C_battery",
		Inputs: []result.Input{
			{Name: "N_series", Value: ns, From: p + ".series"},
			{Name: "V_battery", Value: v, Unit: "V", From: p + ".battery.voltage"},
			{Name: "N_parallel", Value: np, From: p + ".parallel"},
			{Name: "C_battery", Value: ah, Unit: "Ah", From: p + ".battery.capacity"},
		},
		Source: defined,
	})
}

func arrayFigures(a *model.Array, out *Report) {
	spec := a.Spec
	p := spec.Module.Pmax.Watts()
	ns, np := float64(spec.Series), float64(spec.Strings)
	out.Figure(result.Figure{
		ID: result.FigArraySTCPower, Subject: a.Name, Value: ns * np * p, Unit: "W",
		Formula: "P_STC = N_series × N_strings × Pmax",
		Inputs: []result.Input{
			{Name: "N_series", Value: ns, From: a.Path + ".series"},
			{Name: "N_strings", Value: np, From: a.Path + ".strings"},
			{Name: "Pmax", Value: p, Unit: "W", From: a.Path + ".module.pmax"},
		},
		Source: "module datasheet at STC (1000 W/m², 25 °C cell temperature)",
	})
	m := spec.Module
	out.Figure(result.Figure{
		ID: result.FigArrayEfficiency, Subject: a.Name, Value: round(energy.ModuleEfficiency(m)*100, 2), Unit: "%",
		Formula: "η = Pmax / (length × width × 1000 W/m²) × 100",
		Inputs: []result.Input{
			{Name: "Pmax", Value: p, Unit: "W", From: "catalog data for " + m.ID},
			{Name: "length", Value: m.LengthDim.Metres(), Unit: "m", From: "catalog data for " + m.ID},
			{Name: "width", Value: m.WidthDim.Metres(), Unit: "m", From: "catalog data for " + m.ID},
		},
		Source: "module datasheet at STC (1000 W/m², 25 °C cell temperature)",
	})
}

// FigureDoc is the catalogue entry of a figure: what `ampwright explain`
// prints for it.
type FigureDoc struct {
	ID    result.FigureID
	Title string
	Doc   string
}

// Figures is the catalogue of every figure a check reports, with the
// check that reports it named in its doc.
var Figures = []FigureDoc{
	{result.FigBankNominalVoltage, "bank nominal voltage", "N_series × V_battery, volts (see system.figures)."},
	{result.FigBankCapacity, "bank rated capacity", "N_parallel × C_battery, Ah at the battery's rated hours (see system.figures)."},
	{result.FigBankNominalEnergy, "bank nominal energy", "V_bank × C_bank, Wh (see system.figures)."},
	{result.FigBankUsableEnergy, "bank usable energy", "E_usable = V_bank × C_bank × DoD × F_temp × F_eol, Wh (see energy.budget and bank.autonomy)."},
	{result.FigBankAutonomy, "days the bank carries a scenario without charge", "See bank.autonomy."},
	{result.FigArraySTCPower, "array power at STC", "N_series × N_strings × Pmax, W at 1000 W/m² and 25 °C cells (see system.figures)."},
	{result.FigArrayEfficiency, "module efficiency at STC", "η = Pmax / (length × width × 1000 W/m²), percent; a module outside 5–25 % is refused as a misread datasheet (see system.figures)."},
	{result.FigEnergyScenario, "energy drawn from a bank in one period of a scenario", "See energy.budget."},
	{result.FigEnergyHarvest, "an array's harvest into its bank on the month's mean day", "See energy.harvest."},
	{result.FigSolarFraction, "solar harvest as a share of a scenario's use", "Harvest per day ÷ energy per day × 100 (see energy.harvest)."},
	{result.FigVoyageLowestSoC, "the lowest state of charge over the design voyage", "See voyage.floor."},
	{result.FigColdVoc, "string open-circuit voltage at the record low", "See pv.coldVoc."},
	{result.FigVoltageDrop, "voltage drop of a run", "See wiring.voltageDrop."},
	{result.FigResistance, "resistance per metre of a run's conductor at its temperature", "See wiring.resistance."},
	{result.FigAmpacity, "derated ampacity of a run's conductor", "See wiring.ampacity."},
	{result.FigFaultCurrent, "prospective fault current just beyond a device", "See protection.interrupting."},
	{result.FigConverterInput, "a converter's input current at its rated output", "I_in = I_out,rated × V_out / (η × V_in), the current its feeder is sized for (see system.figures)."},
	{result.FigLinkCurrent, "the current a link between banks passes at most", "A DC-DC charger's rated output; for a combiner the larger of the two banks' sources, for an isolator its input bank's sources (see system.figures)."},
	{result.FigReturnCurrent, "design current of a negative conductor", "The returns whose path to their bank's negative post passes it (see system.figures)."},
	{result.FigShuntCurrent, "current through a battery monitor's shunt", "The current of the negative conductors on its bank side (see system.figures)."},
	{result.FigSourceOutput, "the current a charger delivers", "Its output, or an alternator's rated output × its hot factor (see system.figures)."},
	{result.FigInverterDemand, "the AC loads an inverter carries at once", "See inverter.continuous."},
	{result.FigInverterPeak, "an inverter's largest start on top of its running loads", "See inverter.surge."},
	{result.FigInverterDCCurrent, "an inverter's DC current at its low-voltage cut-off", "See inverter.dcCurrent."},
	{result.FigSurgeCurrent, "the current through a device at the start it is nearest to opening on", "See protection.surge."},
	{result.FigMaxVoltage, "the highest voltage a bank's side reaches", "See equipment.voltage."},
	{result.FigBusCurrent, "the current through a bus, panel or switch", "See bus.current."},
	{result.FigBankDischarge, "the current a bank gives to its loads running together", "See bank.discharge."},
	{result.FigBankPeak, "a bank's largest current with a start on top of its running loads", "See bank.peak."},
	{result.FigTotalDrop, "the voltage drop from the bank to a load and back", "See wiring.totalDrop."},
}

// LookupFigure returns the catalogue entry of a figure ID.
func LookupFigure(id string) (FigureDoc, bool) {
	for _, f := range Figures {
		if string(f.ID) == id {
			return f, true
		}
	}
	return FigureDoc{}, false
}

// ValidateFigures reports a catalogue with a duplicate or undocumented
// figure.
func ValidateFigures(list []FigureDoc) error {
	seen := map[result.FigureID]bool{}
	for _, f := range list {
		switch {
		case !idPattern.MatchString(string(f.ID)):
			return fmt.Errorf("figure %q: ID must look like area.name", f.ID)
		case seen[f.ID]:
			return fmt.Errorf("figure %q listed twice", f.ID)
		case f.Title == "" || f.Doc == "":
			return fmt.Errorf("figure %q: needs Title and Doc", f.ID)
		}
		seen[f.ID] = true
	}
	return nil
}
