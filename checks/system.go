package checks

import (
	"fmt"
	"math"
	"slices"

	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// bankVoltageTolerance is how far a bank's nominal voltage may sit from
// the system voltage: chemistries differ in nominal cell voltage (a
// four-cell LiFePO4 battery is 12.8 V on a 12 V system). Common practice.
const bankVoltageTolerance = 0.10

// BankVoltage checks that the bank's arrangement gives the system voltage.
var BankVoltage = &Check{
	ID:    result.CheckBankVoltage,
	Title: "bank nominal voltage matches the system voltage",
	Doc: `Checks that the batteries in series give the boat's nominal system voltage.

Method: the bank's nominal voltage is the number of batteries in series
times one battery's nominal voltage.

    V_bank = N_series × V_battery

Finding: the deviation |V_bank − V_system| / V_system in percent.

Limit: V_bank within 10 % of the system voltage (12, 24 or 48 V). The
tolerance admits the nominal voltages of the chemistries (12.8 V for a
four-cell LiFePO4 battery on a 12 V system); it is common practice, not a
published rule. A bank outside it is wired for another system voltage.`,
	Run: func(in *Input, out *Report) {
		for _, b := range in.Sys.Banks {
			bankVoltage(in, b, out)
		}
	},
}

func bankVoltage(in *Input, b *model.Bank, out *Report) {
	spec := b.Spec
	sys := b.Volts
	vb := b.NominalVoltage()
	dev := math.Abs(vb-sys) / sys * 100
	f := result.Finding{
		Subject:  b.Name,
		Value:    round(dev, 3),
		Limit:    bankVoltageTolerance * 100,
		Unit:     "%",
		Margin:   round(bankVoltageTolerance*100-dev, 3),
		Source:   "common practice (tolerance for nominal cell voltages)",
		Position: in.Position(b.Path),
		Message: fmt.Sprintf("%d × %s = %s nominal on a %s system (%.1f %% off)",
			spec.Series, spec.Battery.Voltage.Text, volts(vb), b.System, dev),
		Status: result.Pass,
	}
	if dev > bankVoltageTolerance*100 {
		f.Status = result.Fail
		if n := int(math.Round(sys / spec.Battery.Voltage.Volts())); n >= 1 {
			f.Change = fmt.Sprintf("put %d batteries in series (%s), or choose a battery for the %s system", n, volts(float64(n)*spec.Battery.Voltage.Volts()), b.System)
		}
	}
	out.Add(f)
}

// EquipmentSystem checks that each charge controller and inverter is made
// for the system voltage.
var EquipmentSystem = &Check{
	ID:    result.CheckEquipmentSystem,
	Title: "controllers and inverters are rated for the system voltage",
	Doc: `Checks that every charge controller and inverter lists the boat's
nominal system voltage among the battery voltages it is made for.

Method: the part's "systems" list in the catalog must contain the system
voltage. A part whose catalog entry lists no systems is reported as a
warning: its datasheet must be checked by hand.

Source: the maker's data for the part, as entered in the yard catalog.`,
	Run: func(in *Input, out *Report) {
		check := func(path, subject string, part schema.Part, systems []string, side float64) {
			system := model.VoltText(side)
			f := result.Finding{
				Subject:  subject,
				Limit:    side,
				Value:    side,
				Unit:     "V",
				Source:   "catalog data for " + part.ID,
				Position: in.Position(path),
				Status:   result.Pass,
				Message:  fmt.Sprintf("%s is made for %v", part.ID, systems),
			}
			switch {
			case len(systems) == 0:
				f.Status = result.Warn
				f.Message = fmt.Sprintf("the catalog lists no system voltages for %s; check its datasheet for %s", part.ID, system)
			case !slices.Contains(systems, system):
				f.Status = result.Fail
				f.Message = fmt.Sprintf("%s is made for %v, not %s", part.ID, systems, system)
				f.Change = fmt.Sprintf("choose a part made for %s", system)
			}
			out.Add(f)
		}
		s := in.Sys
		for _, c := range s.Controllers {
			check(c.Path, c.Name, c.Spec.Part.Part, c.Spec.Part.Systems, c.Node.Volts)
		}
		for _, inv := range s.Inverters {
			check(inv.Path, inv.Name, inv.Spec.Part.Part, inv.Spec.Part.Systems, inv.Node.Volts)
		}
		for _, src := range s.Sources {
			if ch := src.Charger; ch != nil && ch.Part != nil {
				check(src.Path, src.Name, ch.Part.Part, ch.Part.Systems, src.Node.Volts)
			}
		}
		for _, c := range s.Converters {
			check(c.Path, c.Name, c.Spec.Part.Part, c.Spec.Part.Inputs, c.In)
		}
		for _, l := range s.Links {
			if p := l.Spec.Part; p.Kind == "dc-dc" {
				check(l.Path, l.Name+" input", p.Part, p.Inputs, l.From.Volts)
				check(l.Path, l.Name+" output", p.Part, p.Outputs, l.To.Volts)
			}
		}
	},
}
