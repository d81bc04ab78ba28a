package energy

import (
	"fmt"
	"math"
	"time"

	"github.com/ampwright/ampwright/energy/solar"
	"github.com/ampwright/ampwright/model"
	"github.com/ampwright/ampwright/schema"
)

// Months are the months in calendar order, as a design names them.
var Months = []string{"Jan", "Feb", "Mar", "Apr", "May", "Jun", "Jul", "Aug", "Sep", "Oct", "Nov", "Dec"}

// meanDay is the recommended average day of each month, the day whose
// extraterrestrial radiation is nearest the month's mean (Duffie &
// Beckman, Table 1.6.1; from memory).
var meanDay = [12]int{17, 16, 16, 15, 15, 11, 17, 16, 15, 15, 14, 10}

// MonthIndex returns 0 for "Jan" … 11 for "Dec", or −1.
func MonthIndex(m string) int {
	for i, x := range Months {
		if x == m {
			return i
		}
	}
	return -1
}

// meanDate is the month's recommended average day in a non-leap year.
func meanDate(month int) time.Time {
	return time.Date(2025, time.Month(month+1), meanDay[month], 12, 0, 0, 0, time.UTC)
}

// ClearSkyBound is the clear-sky daily horizontal irradiation of a
// month's average day at the site, kWh/m²/day: the physical upper bound of
// the month's mean, by the Haurwitz model integrated over the day at
// 10-minute steps of solar time. The Sun's declination comes from one SPA
// position at noon, the zenith from it and the hour angle, lifted by
// refraction (Bennett's formula). solar.ClearSkyDaily does the same with
// the full SPA position at every step; a test keeps the two within 1 %.
func ClearSkyBound(lat, lon float64, month int) float64 {
	noon := meanDate(month).Add(time.Duration(-lon / 15 * float64(time.Hour)))
	decl := solar.SPA(noon, solar.NewObserver(lat, lon)).Declination
	const steps = 144
	var wh float64
	for i := 0; i < steps; i++ {
		w := (float64(i)+0.5)*360/steps - 180
		sinE := math.Sin(rad(lat))*math.Sin(rad(decl)) + math.Cos(rad(lat))*math.Cos(rad(decl))*math.Cos(rad(w))
		e := deg(math.Asin(sinE))
		if e < -1 {
			continue
		}
		// Bennett (1982): refraction in arcminutes at apparent altitude.
		e += 1.02 / math.Tan(rad(e+10.3/(e+5.11))) / 60
		if e <= 0 {
			continue
		}
		wh += solar.ClearSkyHaurwitz(90-e) * 24 / steps
	}
	return wh / 1000
}

// STC are the standard test conditions of a module's rating: 1000 W/m² at
// 25 °C cell temperature (IEC 61215; common practice).
const (
	STCIrradiance  = 1000.0
	STCTemperature = 25.0
)

// ModuleEfficiency is a module's efficiency at STC:
// η = Pmax / (length × width × 1000 W/m²).
func ModuleEfficiency(m schema.Module) float64 {
	return m.Pmax.Watts() / (m.LengthDim.Metres() * m.WidthDim.Metres() * STCIrradiance)
}

// TemperatureFactor is the fraction of STC power a module gives at cell
// temperature tc with power coefficient gamma (per kelvin):
// 1 + γ × (Tc − 25 °C).
func TemperatureFactor(gamma, tc float64) float64 {
	return 1 + gamma*(tc-STCTemperature)
}

// ArrayMonth is one array's mean day in one month, with what a reviewer
// needs to recompute its harvest by hand:
//
//	MPPT: Wh = P_STC × POA ÷ 1 kW/m² × TempFactor × (1 − shading)(1 − soiling)(1 − mismatch) × Wiring × η − Clipped
//	PWM:  Wh = V_charge × Isc × N_strings × POA ÷ 1 kW/m² × TempFactor × (1 − shading)(1 − soiling)(1 − mismatch) × Wiring − Capped − Clipped
type ArrayMonth struct {
	Month string
	// H is the designer's daily horizontal irradiation, kWh/m²/day, and
	// POA the mean daily irradiation on the array.
	H, POA float64
	// Hourly is the mean power delivered into the bank in each hour of
	// solar time, W; Wh their sum.
	Hourly [24]float64
	Wh     float64
	// AltWh is what the other kind of controller (MPPT for PWM, PWM for
	// MPPT) would deliver.
	AltWh float64
	// Clipped is the energy lost to the controller's output limit, Wh.
	Clipped float64
	// PeakCell is the highest cell temperature of the day, °C; Cell the
	// day's mean weighted by the irradiance on the array (so that
	// Σ G × (1 + γ(Tc − 25)) = POA × (1 + γ(Cell − 25))), Ambient the
	// ambient temperature it was found at.
	PeakCell, Cell, Ambient float64
	// TempFactor is 1 + γ × (Cell − 25 °C) for MPPT, 1 + α × (Cell − 25 °C)
	// for PWM.
	TempFactor float64
	// Wiring is the energy-weighted fraction the wiring's drops leave:
	// (1 − ΔV_pv × G/1000)(1 − ΔV_charge × G/1000) for MPPT, the charge
	// run's alone for PWM.
	Wiring float64
	// Capped is what a PWM controller would take above the array's
	// maximum power, and is not credited, Wh.
	Capped float64
}

// ArrayHarvest is one array's harvest by month.
type ArrayHarvest struct {
	Name       string
	Controller string
	// Bank is the bank its controller charges.
	Bank   *model.Bank
	Kind   string // mppt or pwm
	Months []ArrayMonth
	// Losses are the derating fractions applied, for reports.
	Losses string
	// What the month's figures were found from: the array's power at STC
	// (W), its modules' short-circuit current (A) and its strings, the
	// charging voltage a PWM controller holds it at (V), the power and
	// current coefficients (per kelvin; AlphaGiven false where the module
	// gives none), the loss fractions, the controller's efficiency, the
	// wiring's fractional drops at the array's rated current, the cell
	// temperature model and the wind it was taken at (m/s).
	STC, Isc        float64
	Strings         int
	VCharge         float64
	Gamma, Alpha    float64
	AlphaGiven      bool
	Shading         float64
	Soiling         float64
	Mismatch        float64
	Efficiency      float64
	PVDrop, ChgDrop float64
	Cell            CellModel
	Wind            float64
}

// CellModel is how hot an array's cells run: the SAM NOCT model with the
// module's NOCT raised for the array's mounting (the installed NOCT), or,
// for a module that gives no NOCT, the Sandia model for its construction
// and mounting.
type CellModel struct {
	// SAM is true for the SAM NOCT model, false for Sandia.
	SAM bool
	// NOCT is the module's, and Rise what its mounting adds, °C; Standoff
	// the gap behind the modules, m, and StandoffFrom where it comes from.
	NOCT, Rise   float64
	Standoff     float64
	StandoffFrom string
	// Efficiency is the module's at STC (SAM).
	Efficiency float64
	// Sandia are the Sandia coefficients and SandiaName their set.
	Sandia     solar.SandiaParams
	SandiaName string
}

// samTauAlpha is SAM's transmittance–absorptance product, and samStoreys
// its array height: a boat's array is within one storey of the water.
const (
	samTauAlpha = 0.9
	samStoreys  = 1
)

// CellModelFor is the cell temperature model of array a (at CUE path
// path) under rules. Its standoff, else the rulebook's for its mount (a
// flexible module's is the rulebook's flexible gap), sets the installed
// NOCT's rise (SAM); for a module without NOCT it picks the Sandia
// coefficients: open rack where the gap adds nothing, else close roof
// mount (glass/glass) or insulated back (glass/polymer and flexible
// modules).
func CellModelFor(rules schema.Rulebook, path string, a schema.Array) CellModel {
	cm := CellModel{Efficiency: ModuleEfficiency(a.Module)}
	ct := rules.CellTemperature
	switch {
	case a.Standoff != nil:
		cm.Standoff, cm.StandoffFrom = a.Standoff.Metres(), path+".standoff"
	case ct == nil:
		cm.Standoff, cm.StandoffFrom = 1, "no cellTemperature table: taken as open"
	case a.Module.Construction == "flexible":
		cm.Standoff, cm.StandoffFrom = ct.Flexible.Metres(), "rules.cellTemperature.flexible"
	default:
		if s, ok := ct.Standoff[a.Mount]; ok {
			cm.Standoff, cm.StandoffFrom = s.Metres(), "rules.cellTemperature.standoff."+a.Mount
		} else {
			cm.Standoff, cm.StandoffFrom = 0, "no gap given for mount "+a.Mount+": taken as flush"
		}
	}
	if ct != nil {
		cm.Rise = ct.RiseAt(cm.Standoff)
	}
	if a.Module.NOCT != nil {
		cm.SAM = true
		cm.NOCT = a.Module.NOCT.Celsius()
		return cm
	}
	open := cm.Rise == 0
	switch {
	case a.Module.Construction == "flexible":
		cm.Sandia, cm.SandiaName = solar.SandiaGlassPolymerInsulated, "glass/polymer insulated back (flexible module)"
	case a.Module.Construction == "glass-glass" && open:
		cm.Sandia, cm.SandiaName = solar.SandiaGlassGlassOpenRack, "glass/glass open rack"
	case a.Module.Construction == "glass-glass":
		cm.Sandia, cm.SandiaName = solar.SandiaGlassGlassCloseRoof, "glass/glass close roof mount"
	case open:
		cm.Sandia, cm.SandiaName = solar.SandiaGlassPolymerOpenRack, "glass/polymer open rack"
	default:
		cm.Sandia, cm.SandiaName = solar.SandiaGlassPolymerInsulated, "glass/polymer insulated back (close to a surface)"
	}
	return cm
}

// Temp is the cell temperature, °C, at irradiance poa (W/m²) on the array,
// ambient temperature (°C) and wind speed (m/s, at 10 m).
func (c CellModel) Temp(poa, ambient, wind float64) float64 {
	if c.SAM {
		return solar.CellTempSAM(poa, 0, ambient, wind, c.NOCT+c.Rise, c.Efficiency, samTauAlpha, samStoreys)
	}
	p := c.Sandia
	return solar.SandiaCellTemp(poa, ambient, wind, p.A, p.B, p.DeltaT)
}

// Harvest computes each array's mean day in every month in use: hourly
// horizontal irradiance from the month's daily value (Collares-Pereira &
// Rabl, scaled so the hours sum to it), beam and diffuse by Erbs, plane of
// array by the isotropic model (averaged over azimuth when the boat swings
// at anchor), cell temperature by the array's CellModel (the installed
// NOCT for its mounting, or Sandia), the module's power coefficient,
// shading, soiling, mismatch, the wiring's loss, and the controller: an
// MPPT controller tracks the array's maximum power at its efficiency, a
// PWM one holds the array at the charging voltage. Output is clipped at
// the controller's rated output.
func Harvest(sys *model.System) []ArrayHarvest {
	d := sys.Design
	var out []ArrayHarvest
	for _, arr := range sys.Arrays {
		name, a := arr.Name, *arr.Spec
		ctrl := arr.Controller.Spec.Part
		bank := arr.Controller.Node.Bank
		ah := ArrayHarvest{
			Name: name, Controller: a.Controller, Kind: ctrl.Kind, Bank: bank,
			STC: a.Module.Pmax.Watts() * float64(a.Series*a.Strings), Isc: a.Module.Isc.Amps(), Strings: a.Strings,
			VCharge: ChargeVoltage(bank, sys.Rules), Gamma: a.Module.GammaPmax.PerKelvin(), Alpha: alphaDefault,
			Shading: a.Shading, Soiling: a.Soiling, Mismatch: a.Mismatch, Efficiency: ctrl.Efficiency,
			Cell: CellModelFor(sys.Rules, arr.Path, a), Wind: d.Site.WindSpeed,
		}
		if a.Module.AlphaIsc != nil {
			ah.Alpha, ah.AlphaGiven = a.Module.AlphaIsc.PerKelvin(), true
		}
		ah.Losses = fmt.Sprintf("shading %g, soiling %g, mismatch %g", a.Shading, a.Soiling, a.Mismatch)
		ah.PVDrop, ah.ChgDrop = wiringLosses(sys, name, a.Controller)
		for _, m := range d.Site.Months {
			mi := MonthIndex(m)
			if mi < 0 {
				continue
			}
			h := d.Site.Irradiation.Monthly[m].KWhPerM2Day()
			mine := arrayDay(sys, &ah, a, ctrl, mi, h)
			mine.Month, mine.H = m, h
			ah.Months = append(ah.Months, mine)
		}
		out = append(out, ah)
	}
	return out
}

// alphaDefault is the rise of Isc with temperature where a module gives no
// coefficient: about 0.05 %/°C (common practice).
const alphaDefault = 0.0005

// wiringLosses are the fractional voltage drops, at the array's rated
// current, of the runs between the array and its controller and between
// the controller and the bank.
func wiringLosses(sys *model.System, array, controller string) (pv, charge float64) {
	for _, r := range sys.Runs {
		if r.DropCurrent <= 0 || r.DropVoltage <= 0 {
			continue
		}
		switch {
		case r.Role == model.PV && (r.Down == array || r.Up == array):
			pv += sys.RunDrop(r, r.Spec.Size).Pct / 100
		case r.Role == model.Charge && r.Down == controller:
			charge += sys.RunDrop(r, r.Spec.Size).Pct / 100
		}
	}
	return pv, charge
}

// HourlyHorizontal is the mean day's horizontal irradiance hour by hour
// of solar time, W/m² (so Wh/m² in the hour), for daily irradiation h
// (kWh/m²/day) with the sunset hour angle ws (degrees): each hour's share
// r_t of the day by Collares-Pereira & Rabl at the middle of the hour,
// scaled so that the shares sum to one and the hours add up to the
// designer's figure (the shares at the middles of the hours alone sum to
// 0.97–1.03 of it, by latitude and season).
func HourlyHorizontal(h, ws float64) [24]float64 {
	var share [24]float64
	var sum float64
	for hour := range 24 {
		w := 15 * (float64(hour) + 0.5 - 12)
		if math.Abs(w) >= ws {
			continue
		}
		share[hour] = solar.CollaresPereiraRabl(w, ws)
		sum += share[hour]
	}
	if sum <= 0 {
		return [24]float64{}
	}
	for hour := range share {
		share[hour] *= h * 1000 / sum
	}
	return share
}

// arrayDay models one mean day of array a, whose other figures are in ah,
// for its own controller; AltWh is the other kind's.
func arrayDay(sys *model.System, ah *ArrayHarvest, a schema.Array, ctrl schema.ControllerPart, month int, h float64) ArrayMonth {
	site := sys.Design.Site
	date := meanDate(month)
	doy := solar.DayOfYear(date)
	decl := solar.DeclinationCooper(doy)
	ws := solar.SunsetHourAngle(site.Latitude, decl)
	var mine ArrayMonth
	mine.Ambient = site.DesignHigh.Celsius()
	if t, ok := site.DayAmbient[Months[month]]; ok {
		mine.Ambient = t.Celsius()
	}
	loss := (1 - ah.Shading) * (1 - ah.Soiling) * (1 - ah.Mismatch)
	limit := ctrl.Output.Amps() * ah.VCharge
	pwmKind := ctrl.Kind == "pwm"
	var poa, poaCell, base, wired float64
	ghi := HourlyHorizontal(h, ws)
	for hour := range 24 {
		if ghi[hour] <= 0 {
			continue
		}
		w := 15 * (float64(hour) + 0.5 - 12)
		cosz := math.Sin(rad(site.Latitude))*math.Sin(rad(decl)) + math.Cos(rad(site.Latitude))*math.Cos(rad(decl))*math.Cos(rad(w))
		zen := deg(math.Acos(math.Min(1, cosz)))
		dni, dhi, _ := solar.Erbs(ghi[hour], zen, doy)
		g := planeOfArray(site.Latitude, decl, w, a, ghi[hour], dni, dhi, zen, site.Albedo)
		tc := ah.Cell.Temp(g, mine.Ambient, ah.Wind)
		poa += g
		poaCell += g * tc
		mine.PeakCell = math.Max(mine.PeakCell, tc)
		// MPPT: the array's maximum power at this irradiance and
		// temperature, less the drops of its wiring, at the controller's
		// efficiency.
		pm := ah.STC * g / STCIrradiance * TemperatureFactor(ah.Gamma, tc) * loss
		pmWired := pm * (1 - ah.PVDrop*g/1000) * (1 - ah.ChgDrop*g/1000)
		mppt := pmWired * ctrl.Efficiency
		// PWM: the strings' current, near Isc, at the charging voltage,
		// never more than the array's maximum power.
		pwmBase := ah.VCharge * ah.Isc * float64(ah.Strings) * g / 1000 * (1 + ah.Alpha*(tc-STCTemperature)) * loss
		pwmWired := pwmBase * (1 - ah.ChgDrop*g/1000)
		pwm := math.Min(pwmWired, pm)
		p, q := mppt, pwm
		if pwmKind {
			p, q = pwm, mppt
			base += pwmBase
			wired += pwmWired
			mine.Capped += pwmWired - pwm
		} else {
			base += pm
			wired += pmWired
		}
		if p > limit {
			mine.Clipped += p - limit
			p = limit
		}
		mine.Hourly[hour] = p
		mine.Wh += p
		mine.AltWh += math.Min(q, limit)
	}
	mine.POA = poa / 1000
	mine.Cell, mine.Wiring = mine.Ambient, 1
	if poa > 0 {
		mine.Cell = poaCell / poa
	}
	coeff := ah.Gamma
	if pwmKind {
		coeff = ah.Alpha
	}
	mine.TempFactor = 1 + coeff*(mine.Cell-STCTemperature)
	if base > 0 {
		mine.Wiring = wired / base
	}
	return mine
}

// planeOfArray is the irradiance on the array: isotropic sky, averaged
// over the compass when the boat swings at anchor.
func planeOfArray(lat, decl, w float64, a schema.Array, ghi, dni, dhi, zen, albedo float64) float64 {
	poa := func(azimuth float64) float64 {
		inc := solar.IncidenceFromAngles(lat, decl, w, a.Tilt, azimuth-180)
		return solar.IsotropicPOA(ghi, dni, dhi, zen, inc, a.Tilt, albedo)
	}
	if !a.SwingsAtAnchor || a.Tilt == 0 {
		return poa(a.Azimuth)
	}
	var sum float64
	const steps = 24
	for i := 0; i < steps; i++ {
		sum += poa(float64(i) * 360 / steps)
	}
	return sum / steps
}

func rad(x float64) float64 { return x * math.Pi / 180 }
func deg(x float64) float64 { return x * 180 / math.Pi }
