package calc

import "math"

// Dry air at 1 atm, as functions of temperature. Checked against Cengel, Heat and Mass
// Transfer, Table A-15 (−50…400 °C) within 1 % (ν at −50 °C: 1.2 %, from Sutherland's law).
//
//   - density: ideal gas, p = 101325 Pa, R = 287.05 J/kg·K;
//   - viscosity: Sutherland's law, μ = 1.716e-5 (T/273.15)^1.5 · 383.55/(T + 110.4);
//   - cp: ideal-gas heat capacity of air as 79 % N2 and 21 % O2 by mole from statistical
//     mechanics: translation and rotation 7/2 R plus a harmonic-oscillator vibration term
//     R·x²eˣ/(eˣ − 1)² per molecule, x = θv/T, θv = 3393.5 K (N2) and 2273.6 K (O2) from
//     the vibrational wavenumbers 2358.6 and 1580.2 cm⁻¹. Counting argon (0.93 %) as N2
//     adds 0.3 %, about the real-gas excess of air at 1 atm near room temperature. Within
//     0.35 % of the table (0.6 % at −50 °C) and within 0.25 % of tabulated values to 1000 K
//     (Incropera Table A.4, from memory);
//     the Poling polynomial (fitted to 400 K) runs several % high there;
//   - conductivity: our least-squares quadratic in T (relative error) through the
//     Table A-15 rows −50…400 °C, max deviation 0.06 %; it stays positive and close to
//     published values from 100 K to 1000 K.
const (
	airPressure = 101325.0 // Pa
	airR        = 287.05   // J/kg·K
	gravity     = 9.80665  // m/s², standard gravity
	kelvin      = 273.15

	// Film temperatures where the fits were checked against the table.
	airMinC, airMaxC = -50.0, 400.0
)

// airProps are the dry-air properties used by the convection correlations.
type airProps struct {
	rho, cp, k, mu, nu, pr float64
	beta                   float64 // 1/K, ideal gas
}

// dryAir returns dry-air properties at tC (°C). The fits are smooth and physical from
// about −200 °C to 700 °C; callers warn when tC lies outside airMinC…airMaxC.
func dryAir(tC float64) airProps {
	t := tC + kelvin
	rho := airPressure / (airR * t)
	mu := 1.716e-5 * (t / 273.15) * math.Sqrt(t/273.15) * 383.55 / (t + 110.4)
	cp := airR * (3.5 + 0.79*einstein(3393.5/t) + 0.21*einstein(2273.6/t))
	k := 1.2863778e-3 + 8.8128307e-5*t - 2.3148287e-8*t*t
	return airProps{rho: rho, cp: cp, k: k, mu: mu, nu: mu / rho, pr: mu * cp / k, beta: 1 / t}
}

// einstein is the heat capacity of one harmonic vibrational mode in units of R,
// x²eˣ/(eˣ − 1)² with x = θv/T.
func einstein(x float64) float64 {
	if x > 700 {
		return 0
	}
	e := math.Exp(-x) // x²eˣ/(eˣ − 1)² = x²e⁻ˣ/(1 − e⁻ˣ)²
	return x * x * e / ((1 - e) * (1 - e))
}
