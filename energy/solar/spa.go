package solar

import (
	"math"
	"time"
)

// Position is the Sun's topocentric position.
type Position struct {
	Zenith    float64 // topocentric zenith angle θ, degrees, refraction-corrected
	Azimuth   float64 // topocentric azimuth Φ, degrees clockwise from north (navigators' convention)
	Elevation float64 // topocentric elevation e = 90 − Zenith, degrees, refraction-corrected

	// ElevationNoRefraction is the topocentric elevation e0 before the
	// refraction correction, degrees: the geometric elevation, which
	// does not depend on the air.
	ElevationNoRefraction float64

	Declination    float64 // geocentric declination δ, degrees
	HourAngle      float64 // observer local hour angle H, degrees in (−180, 180], positive west (afternoon)
	EquationOfTime float64 // equation of time E (apparent − mean solar time), minutes
}

// Observer is where and in what air the position is seen.
//
// The zero value is an observer at latitude 0, longitude 0 and sea level
// in air at 0 °C and standard pressure, with ΔT = 0; NewObserver gives the
// usual defaults instead.
type Observer struct {
	Latitude, Longitude float64 // degrees, north and east positive
	Elevation           float64 // metres above sea level
	Pressure            float64 // local pressure, millibars; 0 means 1013.25
	Temperature         float64 // local temperature, °C, used as given
	DeltaT              float64 // ΔT = TT − UT, seconds, used as given
	Refraction          float64 // atmospheric refraction at sunrise and sunset, degrees; 0 means 0.5667
}

// Defaults for an observer whose air and clock are not known.
const (
	// standardPressure is the sea-level standard atmosphere, millibars.
	standardPressure = 1013.25
	// defaultTemperature is a mean surface temperature, °C.
	defaultTemperature = 12.0
	// defaultDeltaT is TT − UT for the 2020s, seconds: about 69 s (an
	// estimate, from memory; the IERS publishes the measured value).
	defaultDeltaT = 69.0
	// defaultRefraction is the refraction at sunrise and sunset used by
	// the SPA, degrees.
	defaultRefraction = 0.5667
)

// NewObserver returns an observer at sea level at the given latitude and
// longitude (degrees, north and east positive) in a standard atmosphere
// (1013.25 mbar, 12 °C), with ΔT = 69 s and the SPA's refraction at
// sunrise and sunset, 0.5667°.
func NewObserver(lat, lon float64) Observer {
	return Observer{
		Latitude:    lat,
		Longitude:   lon,
		Pressure:    standardPressure,
		Temperature: defaultTemperature,
		DeltaT:      defaultDeltaT,
		Refraction:  defaultRefraction,
	}
}

// JulianDay returns the Julian day of t in UT (Reda & Andreas, section
// 3.1). The time's zone does not matter. Leap seconds are ignored, as by
// package time, so UT1 is taken as UTC (ΔUT1 = 0, as in the SPA's worked
// example); |ΔUT1| stays below 0.9 s, which moves the hour angle by under
// 0.004°.
func JulianDay(t time.Time) float64 {
	// The whole seconds and the fraction are divided separately so that
	// no precision is lost to the large count of seconds since 1970.
	return 2440587.5 + float64(t.Unix())/86400 + float64(t.Nanosecond())/86400e9
}

// spaResult holds the SPA's intermediate quantities, in the symbols and
// units of Reda & Andreas (2008): degrees unless stated.
type spaResult struct {
	jd, jde, jc, jce, jme float64 // days and centuries, millennia
	l, b                  float64 // heliocentric longitude and latitude
	r                     float64 // Earth radius vector, AU
	theta, beta           float64 // geocentric longitude Θ and latitude β
	deltaPsi, deltaEps    float64 // nutation in longitude Δψ and obliquity Δε
	eps                   float64 // true obliquity of the ecliptic ε
	deltaTau              float64 // aberration correction Δτ
	lambda                float64 // apparent Sun longitude λ
	nu                    float64 // apparent sidereal time at Greenwich ν
	alpha, delta          float64 // geocentric right ascension α and declination δ
	h                     float64 // observer local hour angle H, [0, 360)
	xi                    float64 // equatorial horizontal parallax ξ
	deltaAlpha            float64 // parallax in right ascension Δα
	alphaP, deltaP, hP    float64 // topocentric α′, δ′, H′
	e0, deltaE, e         float64 // elevation before refraction, refraction, elevation
	zenith                float64 // topocentric zenith θ
	gamma                 float64 // astronomers' azimuth Γ, westward from south
	phi                   float64 // azimuth Φ, eastward from north
	eot                   float64 // equation of time, minutes
}

// SPA returns the Sun's position at t seen by o, by the full NREL Solar
// Position Algorithm (Reda & Andreas 2004, rev. 2008). The time's zone does
// not matter. Refraction follows the SPA: it is added only while the Sun's
// upper limb can be above the horizon, e0 ≥ −(0.26667° + o.Refraction).
func SPA(t time.Time, o Observer) Position {
	s := spa(t, o)
	return Position{
		Zenith:                s.zenith,
		Azimuth:               s.phi,
		Elevation:             s.e,
		ElevationNoRefraction: s.e0,
		Declination:           s.delta,
		HourAngle:             signedAngle(s.h),
		EquationOfTime:        s.eot,
	}
}

// spa runs the algorithm step by step, numbered as in section 3 of Reda &
// Andreas (2008).
func spa(t time.Time, o Observer) spaResult {
	pressure := o.Pressure
	if pressure == 0 {
		pressure = standardPressure
	}
	refraction := o.Refraction
	if refraction == 0 {
		refraction = defaultRefraction
	}

	var s spaResult
	// 3.1: Julian day, ephemeris day, century and millennium.
	s.jd = JulianDay(t)
	s.jde = s.jd + o.DeltaT/86400
	s.jc = (s.jd - 2451545) / 36525
	s.jce = (s.jde - 2451545) / 36525
	s.jme = s.jce / 10

	// 3.2: the Earth's heliocentric position.
	s.l = normalize(rad2deg(series(heliocentricLongitude[:], s.jme)))
	s.b = rad2deg(series(heliocentricLatitude[:], s.jme))
	s.r = series(heliocentricRadius[:], s.jme)

	// 3.3: the Sun's geocentric position.
	s.theta = normalize(s.l + 180)
	s.beta = -s.b

	// 3.4, 3.5: nutation and the true obliquity of the ecliptic.
	s.deltaPsi, s.deltaEps = nutation(s.jce)
	s.eps = meanObliquity(s.jme)/3600 + s.deltaEps

	// 3.6, 3.7: aberration and the apparent longitude.
	s.deltaTau = -20.4898 / (3600 * s.r)
	s.lambda = s.theta + s.deltaPsi + s.deltaTau

	// 3.8: apparent sidereal time at Greenwich.
	nu0 := normalize(280.46061837 + 360.98564736629*(s.jd-2451545) +
		0.000387933*s.jc*s.jc - s.jc*s.jc*s.jc/38710000)
	s.nu = nu0 + s.deltaPsi*cosd(s.eps)

	// 3.9, 3.10: geocentric right ascension and declination.
	s.alpha = normalize(atan2d(sind(s.lambda)*cosd(s.eps)-tand(s.beta)*sind(s.eps), cosd(s.lambda)))
	s.delta = asind(sind(s.beta)*cosd(s.eps) + cosd(s.beta)*sind(s.eps)*sind(s.lambda))

	// 3.11: observer local hour angle, westward from south.
	s.h = normalize(s.nu + o.Longitude - s.alpha)

	// 3.12: topocentric right ascension, declination and hour angle.
	s.xi = 8.794 / (3600 * s.r)
	s.deltaAlpha, s.deltaP = parallax(o.Latitude, o.Elevation, s.xi, s.h, s.delta)
	s.alphaP = s.alpha + s.deltaAlpha
	s.hP = s.h - s.deltaAlpha

	// 3.14: topocentric elevation and zenith, with refraction.
	s.e0 = asind(sind(o.Latitude)*sind(s.deltaP) + cosd(o.Latitude)*cosd(s.deltaP)*cosd(s.hP))
	if s.e0 >= -(sunRadius + refraction) {
		s.deltaE = pressure / 1010 * 283 / (273 + o.Temperature) *
			1.02 / (60 * tand(s.e0+10.3/(s.e0+5.11)))
	}
	s.e = s.e0 + s.deltaE
	s.zenith = 90 - s.e

	// 3.15: topocentric azimuth.
	s.gamma = normalize(atan2d(sind(s.hP), cosd(s.hP)*sind(o.Latitude)-tand(s.deltaP)*cosd(o.Latitude)))
	s.phi = normalize(s.gamma + 180)

	// Appendix A.1: the equation of time.
	s.eot = equationOfTime(s.jme, s.alpha, s.deltaPsi, s.eps)
	return s
}

// sunRadius is the Sun's apparent radius, degrees, as used by the SPA to
// decide whether refraction applies.
const sunRadius = 0.26667

// series evaluates a heliocentric series (section 3.2): Σ Li·JME^i, each Li
// the sum of the terms of its table, scaled by 10⁻⁸. It returns radians for
// L and B and astronomical units for R.
func series(tables [][]periodicTerm, jme float64) float64 {
	sum, pow := 0.0, 1.0
	for _, table := range tables {
		li := 0.0
		for _, term := range table {
			li += term[0] * math.Cos(term[1]+term[2]*jme)
		}
		sum += li * pow
		pow *= jme
	}
	return sum / 1e8
}

// nutation returns the nutation in longitude Δψ and in obliquity Δε,
// degrees, for the Julian ephemeris century jce (section 3.4).
func nutation(jce float64) (deltaPsi, deltaEps float64) {
	x := nutationArgs(jce)
	for _, n := range nutationTerms {
		arg := 0.0
		for i, y := range n.y {
			arg += y * x[i]
		}
		deltaPsi += (n.a + n.b*jce) * sind(arg)
		deltaEps += (n.c + n.d*jce) * cosd(arg)
	}
	// The coefficients are in units of 0.0001 arc second.
	return deltaPsi / 36e6, deltaEps / 36e6
}

// nutationArgs returns the arguments X0..X4 of the nutation series,
// degrees, for the Julian ephemeris century jce (section 3.4).
func nutationArgs(jce float64) [5]float64 {
	return [5]float64{
		poly3(jce, 297.85036, 445267.111480, -0.0019142, 1.0/189474), // mean elongation of the Moon
		poly3(jce, 357.52772, 35999.050340, -0.0001603, -1.0/300000), // mean anomaly of the Sun
		poly3(jce, 134.96298, 477198.867398, 0.0086972, 1.0/56250),   // mean anomaly of the Moon
		poly3(jce, 93.27191, 483202.017538, -0.0036825, 1.0/327270),  // Moon's argument of latitude
		poly3(jce, 125.04452, -1934.136261, 0.0020708, 1.0/450000),   // longitude of the Moon's ascending node
	}
}

// meanObliquity returns the mean obliquity of the ecliptic ε0, arc seconds
// (section 3.5).
func meanObliquity(jme float64) float64 {
	u := jme / 10
	coef := [...]float64{84381.448, -4680.93, -1.55, 1999.25, -51.38, -249.67, -39.05, 7.12, 27.87, 5.79, 2.45}
	sum := 0.0
	for i := len(coef) - 1; i >= 0; i-- {
		sum = sum*u + coef[i]
	}
	return sum
}

// parallax returns the parallax in right ascension Δα and the topocentric
// declination δ′, degrees (section 3.12), for an observer at latitude lat
// and elevation elev metres.
func parallax(lat, elev, xi, h, delta float64) (deltaAlpha, deltaP float64) {
	const flattening = 0.99664719 // b/a of the Earth's ellipsoid
	const radius = 6378140.0      // equatorial radius, metres
	u := math.Atan(flattening * tand(lat))
	x := math.Cos(u) + elev/radius*cosd(lat)
	y := flattening*math.Sin(u) + elev/radius*sind(lat)
	den := cosd(delta) - x*sind(xi)*cosd(h)
	deltaAlpha = atan2d(-x*sind(xi)*sind(h), den)
	deltaP = atan2d((sind(delta)-y*sind(xi))*cosd(deltaAlpha), den)
	return deltaAlpha, deltaP
}

// equationOfTime returns the equation of time, minutes (Reda & Andreas
// 2008, Appendix A.1), from the Sun's mean longitude and its apparent
// right ascension.
func equationOfTime(jme, alpha, deltaPsi, eps float64) float64 {
	m := 280.4664567 + 360007.6982779*jme + 0.03032028*jme*jme +
		math.Pow(jme, 3)/49931 - math.Pow(jme, 4)/15300 - math.Pow(jme, 5)/2000000
	e := 4 * normalize(m-0.0057183-alpha+deltaPsi*cosd(eps))
	// E is within ±20 minutes; the 360° wrap shows as ±1440 minutes.
	if e > 20 {
		e -= 1440
	}
	return e
}

// Incidence returns the angle of incidence of the Sun's rays on a surface,
// degrees, from the Sun's refraction-corrected zenith and its azimuth
// (Reda & Andreas 2008, section 3.16). The surface is tilted tilt degrees
// from horizontal and faces azimuth degrees clockwise from north (180
// faces south). The SPA's azimuth rotation γ, measured from south and
// positive to the west, is azimuth − 180, and its astronomers' azimuth Γ
// is p.Azimuth − 180, so the SPA's cos(Γ − γ) is cos(p.Azimuth − azimuth):
// the worked example's γ = −10° is azimuth 170. An angle above 90° means
// the Sun is behind the surface.
func Incidence(p Position, tilt, azimuth float64) float64 {
	c := cosd(p.Zenith)*cosd(tilt) + sind(tilt)*sind(p.Zenith)*cosd(p.Azimuth-azimuth)
	return acosd(c)
}

// IncidenceFromAngles returns the angle of incidence of beam radiation on
// a surface, degrees, from the latitude, the declination, the hour angle
// (negative before solar noon), the tilt and the surface azimuth measured
// from south, west positive (Duffie & Beckman eq. 1.6.2). It takes no
// account of refraction or parallax.
func IncidenceFromAngles(lat, decl, hourAngle, tilt, surfaceAzimuthFromSouth float64) float64 {
	sd, cd := sind(decl), cosd(decl)
	sp, cp := sind(lat), cosd(lat)
	sb, cb := sind(tilt), cosd(tilt)
	sg, cg := sind(surfaceAzimuthFromSouth), cosd(surfaceAzimuthFromSouth)
	sw, cw := sind(hourAngle), cosd(hourAngle)
	c := sd*sp*cb - sd*cp*sb*cg + cd*cp*cb*cw + cd*sp*sb*cg*cw + cd*sb*sg*sw
	return acosd(c)
}

// poly3 returns c0 + c1·x + c2·x² + c3·x³.
func poly3(x, c0, c1, c2, c3 float64) float64 {
	return c0 + x*(c1+x*(c2+x*c3))
}

// normalize returns a mod 360 in [0, 360).
func normalize(a float64) float64 {
	a = math.Mod(a, 360)
	if a < 0 {
		a += 360
	}
	return a
}

// signedAngle returns a mod 360 in (−180, 180].
func signedAngle(a float64) float64 {
	a = normalize(a)
	if a > 180 {
		a -= 360
	}
	return a
}

func rad2deg(r float64) float64 { return r * 180 / math.Pi }
func deg2rad(d float64) float64 { return d * math.Pi / 180 }
func sind(d float64) float64    { return math.Sin(deg2rad(d)) }
func cosd(d float64) float64    { return math.Cos(deg2rad(d)) }
func tand(d float64) float64    { return math.Tan(deg2rad(d)) }
func asind(x float64) float64   { return rad2deg(math.Asin(clamp(x, -1, 1))) }
func acosd(x float64) float64   { return rad2deg(math.Acos(clamp(x, -1, 1))) }

func atan2d(y, x float64) float64 { return rad2deg(math.Atan2(y, x)) }

// clamp keeps rounding from pushing a cosine or sine outside [lo, hi].
func clamp(x, lo, hi float64) float64 {
	return math.Max(lo, math.Min(hi, x))
}
