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
	p, _ := dryAirD(tC)
	return p
}

// airSlopes are logarithmic temperature derivatives of dry-air properties, d(ln x)/dT
// per K of film temperature, for the analytic slope of the surface heat flux.
type airSlopes struct {
	k, nu, pr, beta float64
}

// dryAirD returns dryAir(tC) and the logarithmic derivatives of k, ν, Pr and β with
// respect to temperature, from the same fits differentiated exactly.
func dryAirD(tC float64) (airProps, airSlopes) {
	t := tC + kelvin
	it := 1 / t
	rho := airPressure / airR * it
	tr := t / 273.15
	is := 1 / (t + 110.4)
	mu := 1.716e-5 * tr * math.Sqrt(tr) * 383.55 * is
	x1, x2 := 3393.5*it, 2273.6*it
	e1, xde1 := einsteinD(x1)
	e2, xde2 := einsteinD(x2)
	cp := airR * (3.5 + 0.79*e1 + 0.21*e2)
	k := 1.2863778e-3 + 8.8128307e-5*t - 2.3148287e-8*t*t
	ik := 1 / k
	// d ln μ/dT (Sutherland), dcp/dT (dE/dT = −(x/T)·dE/dx), d ln k/dT.
	dlnMu := 1.5*it - is
	dlnCp := -(0.79*xde1 + 0.21*xde2) / (3.5 + 0.79*e1 + 0.21*e2) * it
	dlnK := (8.8128307e-5 - 2*2.3148287e-8*t) * ik
	nu := mu * t * (airR / airPressure) // μ/ρ
	return airProps{rho: rho, cp: cp, k: k, mu: mu, nu: nu, pr: mu * cp * ik, beta: it},
		airSlopes{k: dlnK, nu: dlnMu + it, pr: dlnMu + dlnCp - dlnK, beta: -it}
}

// einsteinD returns the heat capacity of one harmonic vibrational mode in units of R,
// E = x²eˣ/(eˣ − 1)² with x = θv/T, and x times its derivative with respect to x,
// x·dE/dx = E·(2 − x(1 + e⁻ˣ)/(1 − e⁻ˣ)).
func einsteinD(x float64) (float64, float64) {
	if x > 700 {
		return 0, 0
	}
	e := math.Exp(-x) // x²eˣ/(eˣ − 1)² = x²e⁻ˣ/(1 − e⁻ˣ)²
	id := 1 / (1 - e)
	v := x * x * e * id * id
	return v, v * (2 - x*(1+e)*id)
}

// dryAirRough is dryAirD with cp from a quadratic in T fitted to the statistical-mechanics
// cp above over 250…470 K (within 0.15 J/kg·K there; our fit), which spares the two
// exponentials of the vibrational terms. For the starting guess only: away from that range
// it is merely less close.
func dryAirRough(tC float64) (airProps, airSlopes) {
	t := tC + kelvin
	it := 1 / t
	tr := t / 273.15
	is := 1 / (t + 110.4)
	mu := 1.716e-5 * tr * math.Sqrt(tr) * 383.55 * is
	x := (t - 350) / 100
	cp := 1009.8464154208057 + x*(8.015024676789611+x*3.6086474483465425)
	k := 1.2863778e-3 + 8.8128307e-5*t - 2.3148287e-8*t*t
	ik := 1 / k
	dlnMu := 1.5*it - is
	dlnCp := (8.015024676789611 + 2*3.6086474483465425*x) / 100 / cp
	dlnK := (8.8128307e-5 - 2*2.3148287e-8*t) * ik
	return airProps{rho: airPressure / airR * it, cp: cp, k: k, mu: mu, nu: mu * t * (airR / airPressure), pr: mu * cp * ik, beta: it},
		airSlopes{k: dlnK, nu: dlnMu + it, pr: dlnMu + dlnCp - dlnK, beta: -it}
}
