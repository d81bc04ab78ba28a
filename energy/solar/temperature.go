package solar

import "math"

// CellTempNOCT returns the cell temperature, °C, by the NOCT (Ross) model:
// Tc = Ta + (NOCT − 20)/800·G, for the irradiance on the plane of the
// array poa (W/m²), the ambient temperature (°C) and the module's nominal
// operating cell temperature noct (°C, measured at 800 W/m², 20 °C and
// 1 m/s of wind). It ignores the wind.
func CellTempNOCT(poa, ambient, noct float64) float64 {
	return ambient + (noct-20)/800*poa
}

// SandiaModuleTemp returns the back-of-module temperature, °C, by the
// Sandia array performance model (King et al. 2004, SAND2004-3535):
// Tm = E·exp(a + b·WS) + Ta, for the irradiance on the plane of the array
// E (W/m²), the ambient temperature Ta (°C), the wind speed WS at 10 m
// (m/s) and the coefficients a and b of the module and its mounting.
func SandiaModuleTemp(poa, ambient, wind, a, b float64) float64 {
	return poa*math.Exp(a+b*wind) + ambient
}

// SandiaCellTemp returns the cell temperature, °C, by the Sandia array
// performance model (King et al. 2004): Tc = Tm + E/1000·ΔT, with
// Tm = SandiaModuleTemp(poa, ambient, wind, a, b) and ΔT the difference,
// °C, between cell and module back at 1000 W/m².
func SandiaCellTemp(poa, ambient, wind, a, b, deltaT float64) float64 {
	return SandiaModuleTemp(poa, ambient, wind, a, b) + poa/1000*deltaT
}

// SandiaParams are the coefficients of the Sandia temperature model for one
// kind of module and mounting.
type SandiaParams struct {
	A, B   float64 // a (dimensionless) and b (s/m) of exp(a + b·WS)
	DeltaT float64 // cell minus module back temperature at 1000 W/m², °C
}

// The Sandia coefficients of King et al. (2004), as pvlib-python's
// TEMPERATURE_MODEL_PARAMETERS["sapm"] and pvpmc.sandia.gov.
var (
	SandiaGlassGlassOpenRack    = SandiaParams{A: -3.47, B: -0.0594, DeltaT: 3}
	SandiaGlassGlassCloseRoof   = SandiaParams{A: -2.98, B: -0.0471, DeltaT: 1}
	SandiaGlassPolymerOpenRack  = SandiaParams{A: -3.56, B: -0.0750, DeltaT: 3}
	SandiaGlassPolymerInsulated = SandiaParams{A: -2.81, B: -0.0455, DeltaT: 0}
)

// CellTempSAM returns the cell temperature, °C, by the NOCT cell
// temperature model of the System Advisor Model (Gilman et al., "SAM
// Photovoltaic Model Technical Reference Update", NREL/TP-6A20-67399,
// 2018, section 10.6), as pvlib-python's temperature.noct_sam:
//
//	Tc = Ta + G/800 × (NOCT_inst − 20) × (1 − η/(τα × G_eff/G)) × 9.5/(5.7 + 3.8 × v)
//
// for the irradiance on the plane of the array poa and the part of it that
// reaches the cells effective (W/m²; 0 takes it as poa), the ambient
// temperature (°C), the wind speed (m/s, as weather data give it, at 10 m),
// the installed NOCT noctInstalled (°C: the module's NOCT raised for its
// mounting, see the rulebook's cellTemperature table), the module's
// efficiency at STC, the transmittance–absorptance product tauAlpha (SAM's
// 0.9) and the array's height in storeys, 1 or 2, which scales the wind to
// the array: v = 0.51 × wind for 1, 0.61 × wind for 2.
func CellTempSAM(poa, effective, ambient, wind, noctInstalled, efficiency, tauAlpha float64, storeys int) float64 {
	ratio := 1.0
	if effective > 0 && poa > 0 {
		ratio = effective / poa
	}
	v := 0.51 * wind
	if storeys == 2 {
		v = 0.61 * wind
	}
	heatLoss := 1 - efficiency/(tauAlpha*ratio)
	windLoss := 9.5 / (5.7 + 3.8*v)
	return ambient + poa/800*(noctInstalled-20)*heatLoss*windLoss
}
