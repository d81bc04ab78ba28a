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

// ArrayMonth is one array's mean day in one month.
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
	// PeakCell is the highest cell temperature of the day, °C.
	PeakCell float64
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
}

// SandiaFor picks the Sandia module-temperature parameters for a module's
// construction and its mounting: rail, arch, davit and bimini mounts are
// open to the air behind, deck, coachroof and hardtop mounts close to a
// surface; a flexible module glued down is insulated behind.
func SandiaFor(construction, mount string) (solar.SandiaParams, string) {
	open := mount == "arch" || mount == "rail" || mount == "davits" || mount == "bimini"
	switch {
	case construction == "flexible":
		return solar.SandiaGlassPolymerInsulated, "Sandia, glass/polymer insulated back (flexible module)"
	case construction == "glass-glass" && open:
		return solar.SandiaGlassGlassOpenRack, "Sandia, glass/glass open rack"
	case construction == "glass-glass":
		return solar.SandiaGlassGlassCloseRoof, "Sandia, glass/glass close roof mount"
	case open:
		return solar.SandiaGlassPolymerOpenRack, "Sandia, glass/polymer open rack"
	}
	return solar.SandiaGlassPolymerInsulated, "Sandia, glass/polymer insulated back (close to a surface)"
}

// Harvest computes each array's mean day in every month in use: hourly
// horizontal irradiance from the month's daily value (Collares-Pereira &
// Rabl), beam and diffuse by Erbs, plane of array by the isotropic model
// (averaged over azimuth when the boat swings at anchor), cell temperature
// by NOCT or Sandia, the module's power coefficient, shading, soiling,
// mismatch, the wiring's loss, and the controller: an MPPT controller
// tracks the array's maximum power at its efficiency, a PWM one holds the
// array at the charging voltage. Output is clipped at the controller's
// rated output.
func Harvest(sys *model.System) []ArrayHarvest {
	d := sys.Design
	var out []ArrayHarvest
	for _, arr := range sys.Arrays {
		name, a := arr.Name, *arr.Spec
		ctrl := arr.Controller.Spec.Part
		ah := ArrayHarvest{Name: name, Controller: a.Controller, Kind: ctrl.Kind, Bank: arr.Controller.Node.Bank}
		loss := (1 - a.Shading) * (1 - a.Soiling) * (1 - a.Mismatch)
		ah.Losses = fmt.Sprintf("shading %g, soiling %g, mismatch %g", a.Shading, a.Soiling, a.Mismatch)
		pvDrop, chargeDrop := wiringLosses(sys, name, a.Controller)
		for _, m := range d.Site.Months {
			mi := MonthIndex(m)
			if mi < 0 {
				continue
			}
			h := d.Site.Irradiation.Monthly[m].KWhPerM2Day()
			mine, other := arrayDay(sys, ah.Bank, a, ctrl, mi, h, loss, pvDrop, chargeDrop)
			mine.Month, mine.H = m, h
			mine.AltWh = other.Wh
			ah.Months = append(ah.Months, mine)
		}
		out = append(out, ah)
	}
	return out
}

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

// arrayDay models one mean day, for the array's own controller and for the
// other kind.
func arrayDay(sys *model.System, bank *model.Bank, a schema.Array, ctrl schema.ControllerPart, month int, h, loss, pvDrop, chargeDrop float64) (mine, other ArrayMonth) {
	site := sys.Design.Site
	date := meanDate(month)
	doy := solar.DayOfYear(date)
	decl := solar.DeclinationCooper(doy)
	ws := solar.SunsetHourAngle(site.Latitude, decl)
	ambient := site.DesignHigh.Celsius()
	if t, ok := site.DayAmbient[Months[month]]; ok {
		ambient = t.Celsius()
	}
	vcharge := ChargeVoltage(bank, sys.Rules)
	mod := a.Module
	n := float64(a.Series * a.Strings)
	pstc := mod.Pmax.Watts() * n
	gamma := mod.GammaPmax.PerKelvin()
	alpha := 0.0005 // common practice: Isc rises about 0.05 %/°C where no coefficient is given
	if mod.AlphaIsc != nil {
		alpha = mod.AlphaIsc.PerKelvin()
	}
	sandia, _ := SandiaFor(mod.Construction, a.Mount)
	limit := ctrl.Output.Amps() * vcharge
	var poa float64
	for hour := 0; hour < 24; hour++ {
		w := 15 * (float64(hour) + 0.5 - 12)
		if math.Abs(w) >= ws {
			continue
		}
		ghi := h * 1000 * solar.CollaresPereiraRabl(w, ws) // Wh/m² in the hour = mean W/m²
		cosz := math.Sin(rad(site.Latitude))*math.Sin(rad(decl)) + math.Cos(rad(site.Latitude))*math.Cos(rad(decl))*math.Cos(rad(w))
		if cosz <= 0 || ghi <= 0 {
			continue
		}
		zen := deg(math.Acos(cosz))
		dni, dhi, _ := solar.Erbs(ghi, zen, doy)
		g := planeOfArray(site.Latitude, decl, w, a, ghi, dni, dhi, zen, site.Albedo)
		poa += g
		var tc float64
		if mod.NOCT != nil {
			tc = solar.CellTempNOCT(g, ambient, mod.NOCT.Celsius())
		} else {
			tc = solar.SandiaCellTemp(g, ambient, site.WindSpeed, sandia.A, sandia.B, sandia.DeltaT)
		}
		mine.PeakCell = math.Max(mine.PeakCell, tc)
		// MPPT: the array's maximum power at this irradiance and temperature.
		pm := pstc * g / STCIrradiance * TemperatureFactor(gamma, tc) * loss
		mppt := pm * (1 - pvDrop*g/1000) * ctrl.Efficiency * (1 - chargeDrop*g/1000)
		// PWM: the strings' current, near Isc, at the charging voltage.
		ipv := mod.Isc.Amps() * float64(a.Strings) * g / 1000 * (1 + alpha*(tc-25)) * loss
		pwm := vcharge * ipv * (1 - chargeDrop*g/1000)
		if pwm > pm {
			pwm = pm // a PWM controller cannot take more than the array's maximum power
		}
		p, q := mppt, pwm
		if ctrl.Kind == "pwm" {
			p, q = pwm, mppt
		}
		if p > limit {
			mine.Clipped += p - limit
			p = limit
		}
		q = math.Min(q, limit)
		mine.Hourly[hour] = p
		mine.Wh += p
		other.Wh += q
	}
	mine.POA = poa / 1000
	return mine, other
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
