// Package units converts, formats and parses Lagwright's quantities in SI and US
// customary units.
//
// Values are stored and computed in SI. The SI value of each quantity is in the unit that
// Label gives for SI — mm for Length, m for LongLength, °C for Temp, K for TempDiff, kWh for
// Energy, kPa for Pressure … — the same units as the machine interface's keys
// (thickness_mm, annual_kwh, steam_gauge_pressure_kpa). US customary values are in the
// unit Label gives for US.
//
// Conversion factors are built from exact definitions (NIST Special Publication 811,
// 2008 edition, Appendix B): 1 in = 25.4 mm, 1 ft = 0.3048 m, 1 lb = 0.45359237 kg,
// 1 Btu(IT) = 1055.05585262 J, 1 °F difference = 5/9 K, g_n = 9.80665 m/s². Temperatures
// convert with the offset; temperature differences without.
package units

import "math"

// System is a display system of units, chosen per project.
type System string

// The two systems.
const (
	SI System = "si"
	US System = "us"
)

// Valid reports whether s is SI or US.
func (s System) Valid() bool { return s == SI || s == US }

// Quantity is a kind of physical quantity with a display unit in each system.
type Quantity int

// The quantities (SI unit / US customary unit).
const (
	Length            Quantity = iota + 1 // mm / in: thickness, diameter
	LongLength                            // m / ft: run length, height
	Temp                                  // °C / °F, with offset
	TempDiff                              // K / °F, without offset
	HeatFlowPerLength                     // W/m / Btu/h·ft
	HeatFlux                              // W/m² / Btu/h·ft²
	HeatFlow                              // W / Btu/h
	Conductivity                          // W/m·K / Btu·in/h·ft²·°F
	Area                                  // m² / ft²
	Energy                                // kWh / MMBtu
	Speed                                 // m/s / mph
	SurfaceCoeff                          // W/m²·K / Btu/h·ft²·°F
	Pressure                              // kPa / psi
	MassFlow                              // kg/s / lb/h
	Volume                                // m³ / ft³
	RValue                                // m²·K/W / h·ft²·°F/Btu
	Permeance                             // ng/(Pa·s·m²) / perm (inch-pound)
)

// Exact base definitions (NIST SP 811 Appendix B) and factors derived from them.
const (
	Inch        = 0.0254                                // m
	Foot        = 0.3048                                // m
	Mile        = 1609.344                              // m
	Pound       = 0.45359237                            // kg
	BtuIT       = 1055.05585262                         // J
	PoundForce  = Pound * 9.80665                       // N
	Grain       = Pound / 7000                          // kg
	InchHg      = 3386.389                              // Pa, conventional (0 °C), NIST SP 811
	FahrenheitK = 5.0 / 9                               // K per °F difference
	BtuPerHour  = BtuIT / 3600                          // W: 0.29307107…
	Therm       = 1e5 * BtuIT                           // J: 105.505 585 262 MJ (100 000 Btu(IT))
	MMBtuKWh    = 1e6 * BtuIT / 3.6e6                   // kWh per MMBtu: 293.071 070 17…
	ThermKWh    = Therm / 3.6e6                         // kWh per therm
	Psi         = PoundForce / (Inch * Inch)            // Pa: 6894.757 293…
	Perm        = Grain / 3600 / (Foot * Foot) / InchHg // kg/(Pa·s·m²): 5.72135e-11
)

// Conversion factors from the US unit to the SI unit of each quantity (SI = US × factor);
// Temp also subtracts 32 °F first.
const (
	lengthF            = Inch * 1000                                     // mm per in
	longLengthF        = Foot                                            // m per ft
	tempDiffF          = FahrenheitK                                     // K per °F
	heatFlowPerLengthF = BtuPerHour / Foot                               // W/m per Btu/h·ft: 0.96152…
	heatFluxF          = BtuPerHour / (Foot * Foot)                      // W/m² per Btu/h·ft²: 3.15459…
	heatFlowF          = BtuPerHour                                      // W per Btu/h
	conductivityF      = BtuPerHour * Inch / (Foot * Foot) / FahrenheitK // W/m·K per Btu·in/h·ft²·°F: 0.1442279
	areaF              = Foot * Foot                                     // m² per ft²
	energyF            = MMBtuKWh                                        // kWh per MMBtu
	speedF             = Mile / 3600                                     // m/s per mph: 0.44704
	surfaceCoeffF      = BtuPerHour / (Foot * Foot) / FahrenheitK        // W/m²·K per Btu/h·ft²·°F: 5.678263
	pressureF          = Psi / 1000                                      // kPa per psi
	massFlowF          = Pound / 3600                                    // kg/s per lb/h
	volumeF            = Foot * Foot * Foot                              // m³ per ft³
	rValueF            = 1 / surfaceCoeffF                               // m²·K/W per h·ft²·°F/Btu: 0.176110
	permeanceF         = Perm * 1e12                                     // ng/(Pa·s·m²) per perm: 57.2135
)

type quantityInfo struct {
	name           string
	siUnit, usUnit string
	factor         float64 // SI value = US value × factor (+ offset handling for Temp)
}

var quantities = map[Quantity]quantityInfo{
	Length:            {"length", "mm", "in", lengthF},
	LongLength:        {"length", "m", "ft", longLengthF},
	Temp:              {"temperature", "°C", "°F", FahrenheitK},
	TempDiff:          {"temperature difference", "K", "°F", tempDiffF},
	HeatFlowPerLength: {"heat flow per length", "W/m", "Btu/h·ft", heatFlowPerLengthF},
	HeatFlux:          {"heat flux", "W/m²", "Btu/h·ft²", heatFluxF},
	HeatFlow:          {"heat flow", "W", "Btu/h", heatFlowF},
	Conductivity:      {"thermal conductivity", "W/m·K", "Btu·in/h·ft²·°F", conductivityF},
	Area:              {"area", "m²", "ft²", areaF},
	Energy:            {"energy", "kWh", "MMBtu", energyF},
	Speed:             {"speed", "m/s", "mph", speedF},
	SurfaceCoeff:      {"surface coefficient", "W/m²·K", "Btu/h·ft²·°F", surfaceCoeffF},
	Pressure:          {"pressure", "kPa", "psi", pressureF},
	MassFlow:          {"mass flow", "kg/s", "lb/h", massFlowF},
	Volume:            {"volume", "m³", "ft³", volumeF},
	RValue:            {"thermal resistance", "m²·K/W", "h·ft²·°F/Btu", rValueF},
	Permeance:         {"water vapour permeance", "ng/Pa·s·m²", "perm", permeanceF},
}

// String names the quantity ("length", "temperature" …).
func (q Quantity) String() string {
	if qi, ok := quantities[q]; ok {
		return qi.name
	}
	return "unknown quantity"
}

// Label returns the unit symbol of q in sys ("mm", "in", "°C", "°F", "W/m", "Btu/h·ft" …);
// "" for an unknown quantity. Any system other than US is SI.
func Label(q Quantity, sys System) string {
	qi := quantities[q]
	if sys == US {
		return qi.usUnit
	}
	return qi.siUnit
}

// FromSI converts v from the SI unit of q to the unit of sys. An unknown quantity or
// system returns v unchanged.
func FromSI(q Quantity, sys System, v float64) float64 {
	qi, ok := quantities[q]
	if !ok || sys != US {
		return v
	}
	if q == Temp {
		return v/FahrenheitK + 32
	}
	return v / qi.factor
}

// ToSI converts v from the unit of sys to the SI unit of q. An unknown quantity or system
// returns v unchanged.
func ToSI(q Quantity, sys System, v float64) float64 {
	qi, ok := quantities[q]
	if !ok || sys != US {
		return v
	}
	if q == Temp {
		return (v - 32) * FahrenheitK
	}
	return v * qi.factor
}

// finite reports whether v is neither NaN nor infinite.
func finite(v float64) bool { return !math.IsNaN(v) && !math.IsInf(v, 0) }
