package solar

import (
	"math"
	"time"
)

// solarConstant is the irradiance at one astronomical unit, W/m², as
// pvlib-python's get_extra_radiation default. Kopp & Lean (2011) measured
// 1360.8 ± 0.5; 1367 is the older World Radiation Center value.
const solarConstant = 1366.1

// DayOfYear returns the day of the year of t, 1 on 1 January, in t's own
// time zone: give the time in the place's zone (or its solar time) when
// the day matters.
func DayOfYear(t time.Time) int {
	return t.YearDay()
}

// ExtraterrestrialNormal returns the irradiance on a plane normal to the
// Sun at the top of the atmosphere on day doy, W/m²: the solar constant
// 1366.1 W/m² times the Spencer (1971) series for (R0/R)², with the day
// angle B = 2π(doy − 1)/365, as pvlib-python's get_extra_radiation
// (method "spencer").
func ExtraterrestrialNormal(doy int) float64 {
	b := 2 * math.Pi * float64(doy-1) / 365
	return solarConstant * (1.00011 + 0.034221*math.Cos(b) + 0.00128*math.Sin(b) +
		0.000719*math.Cos(2*b) + 0.000077*math.Sin(2*b))
}

// DeclinationCooper returns the Sun's declination on day n of the year,
// degrees, by Cooper (1969): δ = 23.45·sin(2π(284 + n)/365). It is within
// about 1° of the true declination; SPA gives the exact value.
func DeclinationCooper(doy int) float64 {
	return 23.45 * math.Sin(2*math.Pi*float64(284+doy)/365)
}

// SunsetHourAngle returns the sunset hour angle ωs = arccos(−tan φ tan δ),
// degrees, for latitude φ and declination δ (Duffie & Beckman eq. 1.6.10).
// It is 180 when the Sun does not set (polar day) and 0 when it does not
// rise (polar night). Refraction and the Sun's radius are ignored, as in
// the textbook: sunrise is when the Sun's centre meets a level horizon.
func SunsetHourAngle(latitude, declination float64) float64 {
	return acosd(-tand(latitude) * tand(declination))
}

// DailyExtraterrestrialHorizontal returns the irradiation on a horizontal
// plane at the top of the atmosphere over day doy at the latitude, Wh/m²
// (Duffie & Beckman eq. 1.10.3, in Wh rather than J):
//
//	H0 = (24/π)·Gon·[cos φ cos δ sin ωs + (π ωs/180) sin φ sin δ]
//
// with Gon = ExtraterrestrialNormal(doy) (Spencer, where the textbook uses
// 1367·(1 + 0.033 cos(360 n/365))), δ = DeclinationCooper(doy) held
// constant over the day, and ωs = SunsetHourAngle(φ, δ). It is the
// integral of Gon·cos z from sunrise to sunset.
func DailyExtraterrestrialHorizontal(latitude float64, doy int) float64 {
	decl := DeclinationCooper(doy)
	ws := SunsetHourAngle(latitude, decl)
	gon := ExtraterrestrialNormal(doy)
	return 24 / math.Pi * gon * (cosd(latitude)*cosd(decl)*sind(ws) +
		deg2rad(ws)*sind(latitude)*sind(decl))
}

// ClearSkyHaurwitz returns the clear-sky global horizontal irradiance,
// W/m², for the Sun's apparent (refraction-corrected) zenith angle, by
// Haurwitz (1945): GHI = 1098·cos z·exp(−0.059/cos z), and 0 when
// cos z ≤ 0. The model has no inputs for the air's turbidity or water.
func ClearSkyHaurwitz(apparentZenith float64) float64 {
	c := cosd(apparentZenith)
	if c <= 0 {
		return 0
	}
	return 1098 * c * math.Exp(-0.059/c)
}

// clearSkyStep is the time step of ClearSkyDaily's integration.
const clearSkyStep = 5 * time.Minute

// ClearSkyDaily returns the clear-sky global irradiation on a horizontal
// plane over one day, Wh/m²: ClearSkyHaurwitz integrated over 24 hours at
// 5-minute steps (midpoint rule), with the apparent zenith from SPA for
// NewObserver(latitude, longitude).
//
// The day is the local mean solar day of the given date: it starts at
// 00:00 UTC less longitude/15 hours, the mean midnight at that longitude,
// so the whole of that date's daylight at the place falls inside it
// whatever the zone the place keeps (solar noon is then within about
// 16 minutes of its middle).
func ClearSkyDaily(latitude, longitude float64, year int, month time.Month, day int) float64 {
	o := NewObserver(latitude, longitude)
	offset := time.Duration(-longitude / 15 * float64(time.Hour))
	start := time.Date(year, month, day, 0, 0, 0, 0, time.UTC).Add(offset)
	steps := int(24 * time.Hour / clearSkyStep)
	hours := clearSkyStep.Hours()
	total := 0.0
	// Steps with the Sun well below the horizon give nothing; a cheap
	// estimate (Cooper's declination, the mean-time hour angle) finds them
	// without the full SPA. Six degrees below is far outside that
	// estimate's error.
	decl := DeclinationCooper(DayOfYear(start.Add(12 * time.Hour)))
	sinLat, cosLat := sind(latitude), cosd(latitude)
	sinDec, cosDec := sind(decl), cosd(decl)
	for i := range steps {
		mid := time.Duration(i)*clearSkyStep + clearSkyStep/2
		w := (mid.Hours() - 12) * 15
		if sinLat*sinDec+cosLat*cosDec*cosd(w) < -0.1 {
			continue
		}
		total += ClearSkyHaurwitz(SPA(start.Add(mid), o).Zenith) * hours
	}
	return total
}

// ErbsDiffuseFraction returns the ratio of diffuse to global horizontal
// irradiance for the hourly clearness index kt, by Erbs, Klein & Duffie
// (1982), eq. 1:
//
//	kt ≤ 0.22:        1 − 0.09·kt
//	0.22 < kt ≤ 0.80: 0.9511 − 0.1604·kt + 4.388·kt² − 16.638·kt³ + 12.336·kt⁴
//	kt > 0.80:        0.165
func ErbsDiffuseFraction(kt float64) float64 {
	switch {
	case kt <= 0.22:
		return 1 - 0.09*kt
	case kt <= 0.80:
		return 0.9511 + kt*(-0.1604+kt*(4.388+kt*(-16.638+kt*12.336)))
	default:
		return 0.165
	}
}

// Limits of Erbs, as pvlib-python's irradiance.erbs defaults.
const (
	// erbsMinCosZenith bounds cos z from below in the clearness index,
	// so that kt stays finite near the horizon (z = 86.273°).
	erbsMinCosZenith = 0.065
	// erbsMaxZenith is the zenith, degrees, beyond which DNI is set to 0.
	erbsMaxZenith = 87.0
	// erbsMaxClearness is the upper bound of kt; erbs passes 1 to
	// clearness_index, whose own default is 2.
	erbsMaxClearness = 1.0
)

// Erbs splits global horizontal irradiance ghi (W/m²) into direct normal
// dni and diffuse horizontal dhi (W/m²) by the Erbs diffuse fraction, for
// the true (not refraction-corrected) zenith, degrees, on day doy. It
// follows pvlib-python's irradiance.erbs exactly:
//
//	kt  = ghi / (ExtraterrestrialNormal(doy)·max(cos z, 0.065)), clipped to [0, 1]
//	dhi = ErbsDiffuseFraction(kt)·ghi
//	dni = (ghi − dhi)/cos z
//
// and where z > 87°, ghi < 0 or dni < 0, dni = 0 and dhi = ghi, so that
// ghi = dhi + dni·cos z still holds.
func Erbs(ghi, zenith float64, doy int) (dni, dhi, kt float64) {
	i0h := ExtraterrestrialNormal(doy) * math.Max(cosd(zenith), erbsMinCosZenith)
	kt = clamp(ghi/i0h, 0, erbsMaxClearness)
	dhi = ErbsDiffuseFraction(kt) * ghi
	dni = (ghi - dhi) / cosd(zenith)
	if zenith > erbsMaxZenith || ghi < 0 || dni < 0 {
		return 0, ghi, kt
	}
	return dni, dhi, kt
}

// LiuJordan returns r_d, the ratio of the diffuse irradiation in the hour
// centred on the hour angle to the day's diffuse irradiation, by Liu &
// Jordan (1960):
//
//	r_d = (π/24)·(cos ω − cos ωs)/(sin ωs − (π ωs/180)·cos ωs)
//
// Angles are degrees, ω negative before solar noon; r_d is 0 outside
// daylight, |ω| ≥ ωs.
func LiuJordan(hourAngle, sunsetHourAngle float64) float64 {
	if math.Abs(hourAngle) >= sunsetHourAngle {
		return 0
	}
	den := sind(sunsetHourAngle) - deg2rad(sunsetHourAngle)*cosd(sunsetHourAngle)
	return math.Pi / 24 * (cosd(hourAngle) - cosd(sunsetHourAngle)) / den
}

// CollaresPereiraRabl returns r_t, the ratio of the global irradiation in
// the hour centred on the hour angle to the day's global irradiation, by
// Collares-Pereira & Rabl (1979):
//
//	r_t = r_d·(a + b·cos ω)
//	a = 0.409 + 0.5016·sin(ωs − 60°)
//	b = 0.6609 − 0.4767·sin(ωs − 60°)
//
// with r_d = LiuJordan(ω, ωs). Angles are degrees; r_t is 0 outside
// daylight.
func CollaresPereiraRabl(hourAngle, sunsetHourAngle float64) float64 {
	a := 0.409 + 0.5016*sind(sunsetHourAngle-60)
	b := 0.6609 - 0.4767*sind(sunsetHourAngle-60)
	return LiuJordan(hourAngle, sunsetHourAngle) * (a + b*cosd(hourAngle))
}

// IsotropicPOA returns the global irradiance on the plane of an array,
// W/m², with an isotropic sky (Hottel & Woertz 1942, Liu & Jordan 1963)
// and ground reflection, as pvlib-python's get_total_irradiance with the
// isotropic model:
//
//	POA = DNI·max(cos θ, 0) + DHI·(1 + cos β)/2 + GHI·ρ·(1 − cos β)/2
//
// for the angle of incidence θ, the tilt β and the ground's albedo ρ
// (pvlib's default 0.25). The beam term is also 0 when the Sun's zenith is
// 90° or more, whatever dni says. Angles are degrees.
func IsotropicPOA(ghi, dni, dhi, zenith, incidence, tilt, albedo float64) float64 {
	beam := 0.0
	if zenith < 90 {
		beam = dni * math.Max(cosd(incidence), 0)
	}
	sky := dhi * (1 + cosd(tilt)) / 2
	ground := ghi * albedo * (1 - cosd(tilt)) / 2
	return beam + sky + ground
}
