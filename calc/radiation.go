package calc

// StefanBoltzmann is σ, W/m²·K⁴ (CODATA 2018, exact in the 2019 SI).
const StefanBoltzmann = 5.670374419e-8

// RadiationFlux is the net grey-body exchange of a small surface with large surroundings,
// q” = εσ(Ts⁴ − Tsur⁴), W/m², temperatures in °C.
func RadiationFlux(emittance, surfaceC, surroundingsC float64) float64 {
	ts, tr := surfaceC+kelvin, surroundingsC+kelvin
	return emittance * StefanBoltzmann * (ts*ts*ts*ts - tr*tr*tr*tr)
}

// RadiationCoeff reports radiation as a coefficient on the air temperature,
// h_rad = q”_rad / (Ts − Ta). When Ts is within 1e-9 K of Ta (where that ratio is
// undefined) it returns the linearised coefficient εσ(Ts² + Tsur²)(Ts + Tsur), which is
// 4εσT³ when the surroundings are at the surface temperature.
func RadiationCoeff(emittance, surfaceC, airC, surroundingsC float64) float64 {
	if d := surfaceC - airC; d > 1e-9 || d < -1e-9 {
		return RadiationFlux(emittance, surfaceC, surroundingsC) / d
	}
	ts, tr := surfaceC+kelvin, surroundingsC+kelvin
	return emittance * StefanBoltzmann * (ts*ts + tr*tr) * (ts + tr)
}
