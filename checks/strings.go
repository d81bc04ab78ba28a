package checks

import (
	"fmt"
	"strconv"

	"github.com/ampwright/ampwright/energy"
	"github.com/ampwright/ampwright/result"
	"github.com/ampwright/ampwright/schema"
)

// ColdVoc checks the strings' open-circuit voltage at the record low.
var ColdVoc = &Check{
	ID:    result.CheckColdVoc,
	Title: "string open-circuit voltage at the record low within the controller's maximum",
	Doc: `Checks that a string's open-circuit voltage on the coldest morning stays
within the controller's maximum PV voltage.

Method (NEC 690.7, temperature-coefficient method), with the cells at the
record low ambient temperature at first light:

    Voc_max = N_series × Voc × (1 + βVoc × (T_min − 25 °C))

(in °F for an imperial design: βVoc per °F and T_min − 77 °F). Where the
module gives no βVoc, the rulebook's low-temperature factor table is used:
Voc_max = N_series × Voc × factor(T_min) (NEC Table 690.7(A)).

Limit: the controller's maximum PV input voltage (maker's data). Above it,
the controller can be destroyed.`,
	Run: func(in *Input, out *Report) {
		d := in.Design
		u := unitsOf(in)
		tmin := d.Site.RecordLow.Celsius()
		tv, tu := u.temp(tmin)
		for _, arr := range in.Sys.Arrays {
			name, a := arr.Name, arr.Spec
			ctrl := arr.Controller.Spec.Part
			voc := a.Module.Voc.Volts()
			ns := float64(a.Series)
			catalog := "catalog data for " + a.Module.ID
			fig := result.Figure{
				ID: result.FigColdVoc, Subject: name, Unit: "V",
				Inputs: []result.Input{
					{Name: "N_series", Value: ns, From: "arrays." + quotePath(name) + ".series"},
					{Name: "Voc", Value: voc, Unit: "V", From: catalog},
				},
			}
			var vmax float64
			var how, source string
			if b := a.Module.BetaVoc; b != nil {
				vmax = ns * voc * (1 + b.PerKelvin()*(tmin-25))
				bv, bu := u.perDegree(b.PerKelvin())
				how = fmt.Sprintf("%d × %s × (1 + %s × (%s − %s))", a.Series, a.Module.Voc.Text, num(bv, bu), u.tempText(tmin), u.stc())
				source = "NEC 690.7, temperature-coefficient method (from memory; verify against the edition you work to)"
				fig.Formula = "Voc_max = N_series × Voc × (1 + βVoc × (T_min − " + u.stc() + "))"
				fig.Inputs = append(fig.Inputs,
					result.Input{Name: "βVoc", Value: bv, Unit: bu, From: catalog},
					result.Input{Name: "T_min", Value: tv, Unit: tu, From: "site.recordLow"})
			} else {
				f := energy.RowFactor(in.Rules.VocFactor.Rows, tmin)
				vmax = ns * voc * f
				how = fmt.Sprintf("%d × %s × %g (table factor at %s)", a.Series, a.Module.Voc.Text, f, u.tempText(tmin))
				source = sourced(in.Rules.VocFactor.Sourced)
				fig.Formula = "Voc_max = N_series × Voc × factor(T_min), the factor of the rulebook's row for T_min"
				fig.Inputs = append(fig.Inputs,
					result.Input{Name: "factor", Value: f, From: "rules.vocFactor (the module gives no βVoc)"},
					result.Input{Name: "T_min", Value: tv, Unit: tu, From: "site.recordLow"})
			}
			fig.Value, fig.Source = round(vmax, 2), source
			out.Figure(fig)
			lim := ctrl.MaxPVVoltage.Volts()
			f := result.Finding{
				Subject: name, Value: round(vmax, 2), Limit: lim, Unit: "V", Margin: round(lim-vmax, 2),
				Source: source, Position: in.Position("arrays." + quotePath(name)), Status: result.Pass,
				Message: fmt.Sprintf("%s = %s against %s's maximum %s", how, volts(vmax), ctrl.ID, ctrl.MaxPVVoltage.Text),
			}
			if vmax > lim {
				f.Status = result.Fail
				if n := int(lim / (vmax / ns)); n >= 1 {
					f.Change = fmt.Sprintf("at most %d modules in series, or a controller rated above %s", n, volts(vmax))
				}
			}
			out.Add(f)
		}
	},
}

// hotWind is the wind the hot-Vmp check takes: still air, the 1 m/s of
// the NOCT test (IEC 61215), so that the hottest cells are checked.
const hotWind = 1.0

// HotVmp checks an MPPT array's voltage stays above the charging voltage
// when hot.
var HotVmp = &Check{
	ID:    result.CheckHotVmp,
	Title: "string Vmp when hot above the charging voltage plus the controller's headroom",
	Doc: `Checks that an MPPT controller can still charge on the hottest day: the
string's maximum-power voltage at its hottest must exceed the bank's
charging voltage plus the controller's start headroom.

Method: the cell temperature at 1000 W/m², the design high ambient and
still air (1 m/s, the NOCT test's wind), by the array's cell temperature
model as in energy.harvest (the SAM NOCT model with the installed NOCT for
its mounting, or Sandia), and

    Vmp_hot = N_series × Vmp × (1 + βVoc × (T_cell − 25 °C))

(in °F for an imperial design) using the Voc coefficient for Vmp, as is
common practice where the datasheet gives none for Vmp (the Vmp
coefficient is somewhat larger, so the margin should not be thin). Where
βVoc is not given, the Pmax coefficient is used.

Limit: V_charge + headroom, V_charge the battery's absorption voltage ×
series (or the rulebook's multiple of nominal). PWM controllers are not
checked: they hold the array at battery voltage.`,
	Run: func(in *Input, out *Report) {
		d := in.Design
		u := unitsOf(in)
		for _, arr := range in.Sys.Arrays {
			name, a := arr.Name, arr.Spec
			ctrl := arr.Controller.Spec.Part
			vcharge := energy.ChargeVoltage(arr.Controller.Node.Bank, in.Rules)
			if ctrl.Kind != "mppt" {
				continue
			}
			ta := d.Site.DesignHigh.Celsius()
			cm := energy.CellModelFor(in.Rules, arr.Path, *a)
			tc := cm.Temp(1000, ta, hotWind)
			coeff, coeffText := a.Module.GammaPmax.PerKelvin(), "γPmax"
			if a.Module.BetaVoc != nil {
				coeff, coeffText = a.Module.BetaVoc.PerKelvin(), "βVoc"
			}
			cv, cu := u.perDegree(coeff)
			vmp := float64(a.Series) * a.Module.Vmp.Volts() * (1 + coeff*(tc-25))
			lim := vcharge + ctrl.Headroom.Volts()
			f := result.Finding{
				Subject: name, Value: round(vmp, 2), Limit: round(lim, 2), Unit: "V", Margin: round(vmp-lim, 2),
				Source:   "common practice (Voc coefficient for Vmp); " + cellSource(in, cm),
				Position: in.Position("arrays." + quotePath(name)), Status: result.Pass,
				Message: fmt.Sprintf("%d × %s × (1 + %s %s × (%s − %s)) = %s against charging %s + headroom %s; cells at 1000 W/m², %s ambient and still air, by %s",
					a.Series, a.Module.Vmp.Text, coeffText, num(cv, cu), u.tempText(round(tc, 1)), u.stc(), volts(vmp), volts(vcharge), ctrl.Headroom.Text,
					u.tempText(ta), cellModelText(u, cm, hotWind)),
			}
			if vmp < lim {
				f.Status = result.Fail
				f.Change = "more modules in series, so the hot string voltage clears the charging voltage"
			}
			out.Add(f)
		}
	},
}

// cellModelText says how the cell temperature was found, in the design's
// units.
func cellModelText(u units, cm energy.CellModel, wind float64) string {
	gap := u.shortText(cm.Standoff)
	if cm.SAM {
		rise, ru := u.tempRise(cm.Rise)
		return fmt.Sprintf("the SAM NOCT model (Gilman et al. 2018): installed NOCT %s = NOCT %s + %s for a %s standoff (%s), wind %g m/s",
			u.tempText(cm.NOCT+cm.Rise), u.tempText(cm.NOCT), num(rise, ru), gap, cm.StandoffFrom, wind)
	}
	dt, du := u.tempRise(cm.Sandia.DeltaT)
	return fmt.Sprintf("the Sandia model (King et al. 2004), %s for a %s standoff (%s): a %g, b %g s/m, ΔT %s, wind %g m/s",
		cm.SandiaName, gap, cm.StandoffFrom, cm.Sandia.A, cm.Sandia.B, num(dt, du), wind)
}

// num writes a value and its unit: "−0.29 %/°C".
func num(v float64, unit string) string {
	return strconv.FormatFloat(v, 'f', -1, 64) + " " + unit
}

// InputCurrent checks the controller's PV input current.
var InputCurrent = &Check{
	ID:    result.CheckInputCurrent,
	Title: "PV input current within the controller's rating",
	Doc: `Checks the array's maximum current against the controller's PV input
rating.

Method (NEC 690.8(A)(1)): I_max = inputFactor × Isc × N_strings, the
rulebook's inputFactor being 1.25 by default. Where several arrays feed one
controller their currents add.

Limit: the controller's maximum PV input current (maker's data). A
controller whose catalog entry gives none is reported as a warning.`,
	Run: func(in *Input, out *Report) {
		pv := in.Rules.PV
		per := map[string]float64{}
		for _, arr := range in.Sys.Arrays {
			a := arr.Spec
			per[a.Controller] += pv.InputFactor * a.Module.Isc.Amps() * float64(a.Strings)
		}
		for _, cn := range schema.Names(per) {
			ctrl := in.Sys.Controller(cn).Spec.Part
			i := per[cn]
			f := result.Finding{
				Subject: cn, Value: round(i, 2), Unit: "A", Source: sourced(pv.Sourced),
				Position: in.Position("controllers." + quotePath(cn)), Status: result.Pass,
			}
			if ctrl.MaxPVCurrent == nil {
				f.Status = result.Warn
				f.Message = fmt.Sprintf("%s from the arrays; the catalog gives no PV input rating for %s", amps(i), ctrl.ID)
			} else {
				lim := ctrl.MaxPVCurrent.Amps()
				f.Limit, f.Margin = lim, round(lim-i, 2)
				f.Message = fmt.Sprintf("%g × Isc × strings = %s against %s's %s", pv.InputFactor, amps(i), ctrl.ID, ctrl.MaxPVCurrent.Text)
				if i > lim {
					f.Status = result.Fail
					f.Change = "fewer strings on this controller, or a controller with a larger PV input rating"
				}
			}
			out.Add(f)
		}
	},
}
