// Package solar computes the Sun's position and the solar resource seen by
// a photovoltaic array: the angles, the irradiance on the array and the
// temperature of its cells, for sizing a boat's solar charging.
//
// Each function follows one published method and names it:
//
//   - Sun position: the NREL Solar Position Algorithm (SPA) of Reda and
//     Andreas, "Solar position algorithm for solar radiation applications",
//     Solar Energy 76(5), 577–589 (2004), corrigendum 81(6), 838 (2007), and
//     NREL/TP-560-34302 (rev. 2008); its stated uncertainty is ±0.0003° for
//     the years −2000 to 6000.
//   - Angles on a tilted surface: Duffie and Beckman, "Solar Engineering of
//     Thermal Processes", section 1.6 (eq. 1.6.2), the declination of Cooper
//     (1969) and the sunset hour angle ωs = arccos(−tan φ tan δ).
//   - Extraterrestrial irradiance: the Spencer (1971) series for (R0/R)²
//     with the solar constant 1366.1 W/m², as pvlib-python's
//     get_extra_radiation; the daily total on a horizontal plane is Duffie
//     and Beckman eq. 1.10.3.
//   - Clear sky: Haurwitz (1945, 1946), as given by Reno, Hansen and Stein,
//     SAND2012-2389 and pvlib-python's clearsky.haurwitz.
//   - Decomposition of global into beam and diffuse: Erbs, Klein and Duffie,
//     Solar Energy 28(4), 293–302 (1982), eq. 1, as pvlib-python's
//     irradiance.erbs.
//   - Hourly share of a daily total: Collares-Pereira and Rabl (1979) for
//     global and Liu and Jordan (1960) for diffuse irradiation.
//   - Irradiance on the plane of the array: the isotropic sky
//     (Hottel–Woertz, Liu–Jordan) with ground reflection.
//   - Cell temperature: the NOCT (Ross) model, the NOCT model of the
//     System Advisor Model (Gilman et al., NREL/TP-6A20-67399, 2018) with
//     its installed NOCT, and the Sandia array performance model of King,
//     Boyson and Kratochvil, SAND2004-3535.
//
// Angles are in degrees. Azimuths are clockwise from north (the navigators'
// convention) unless a name says otherwise. Irradiance is in W/m² and daily
// irradiation in Wh/m². The package uses only the standard library and
// holds no state: every function is pure.
package solar
