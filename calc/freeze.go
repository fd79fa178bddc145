package calc

import (
	"errors"
	"fmt"
	"math"
)

// Water properties for freeze calculations.
const (
	// WaterDensity is the density of liquid water near 0–4 °C, kg/m³ (from memory; 999.84
	// at 0 °C, 999.97 at 4 °C).
	WaterDensity = 999.8
	// WaterCp is the specific heat of liquid water at 0 °C, J/kg·K (from memory: 4.217 kJ/kg·K).
	WaterCp = 4217.0
	// LatentHeatFusion is the latent heat of fusion of ice at 0 °C, J/kg (333.55 kJ/kg, from
	// memory; 333.6 or 334 kJ/kg in common practice).
	LatentHeatFusion = 333.55e3
)

// ErrNoFreeze is returned by FreezeTimes when the air is at or above 0 °C: stagnant water
// cannot freeze.
var ErrNoFreeze = errors.New("calc: air at or above 0 °C: water does not freeze")

// FreezeInput describes stagnant water in an insulated pipe exposed to air below 0 °C.
type FreezeInput struct {
	WaterCapPerM  float64 // J/K per metre: water ρ·cp·π·Di²/4
	WallCapPerM   float64 // J/K per metre of pipe wall; 0 allowed (neglected)
	WaterMassPerM float64 // kg/m: ρ·π·Di²/4
	RCoolPerM     float64 // K·m/W: insulation + outer film at the mean of the start and 0 °C
	RFreezePerM   float64 // K·m/W: the same at 0 °C
	InitialC      float64 // water (and wall) temperature at the start, °C
	AirC          float64 // air temperature, °C, below 0
	Fraction      float64 // fraction of the water to freeze, 0 < f ≤ 1
}

// FreezeTimes returns the hours for stagnant water to cool to 0 °C and the hours until the
// given fraction of it has frozen.
//
// Cooling (ASHRAE Handbook—Fundamentals ch. 23 form, lumped capacity, no latent heat):
//
//	t_cool = (C_w + C_wall)·R'·ln((T_i − T_a)/(0 − T_a))
//
// Freezing at 0 °C (ISO 12241 §6.2 form):
//
//	t_freeze = f·m_w·h_if·R'_0/(0 − T_a),  h_if = LatentHeatFusion
//
// hoursToFraction = hoursTo0 + t_freeze. Water already at or below 0 °C gives hoursTo0 = 0.
// Air at or above 0 °C returns ErrNoFreeze.
func FreezeTimes(in FreezeInput) (hoursTo0, hoursToFraction float64, err error) {
	for _, v := range []float64{in.WaterCapPerM, in.WallCapPerM, in.WaterMassPerM, in.RCoolPerM, in.RFreezePerM, in.InitialC, in.AirC, in.Fraction} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return 0, 0, fmt.Errorf("calc: freeze input %+v is not finite", in)
		}
	}
	switch {
	case in.WaterCapPerM <= 0:
		return 0, 0, fmt.Errorf("calc: water heat capacity %g J/K·m must be greater than 0", in.WaterCapPerM)
	case in.WallCapPerM < 0:
		return 0, 0, fmt.Errorf("calc: wall heat capacity %g J/K·m must not be negative", in.WallCapPerM)
	case in.WaterMassPerM <= 0:
		return 0, 0, fmt.Errorf("calc: water mass %g kg/m must be greater than 0", in.WaterMassPerM)
	case in.RCoolPerM <= 0 || in.RFreezePerM <= 0:
		return 0, 0, fmt.Errorf("calc: thermal resistances %g and %g K·m/W must be greater than 0", in.RCoolPerM, in.RFreezePerM)
	case !(in.Fraction > 0 && in.Fraction <= 1):
		return 0, 0, fmt.Errorf("calc: freeze fraction %g must be greater than 0 and at most 1", in.Fraction)
	case in.AirC >= 0:
		return 0, 0, ErrNoFreeze
	}
	var cool float64 // seconds
	if in.InitialC > 0 {
		cool = (in.WaterCapPerM + in.WallCapPerM) * in.RCoolPerM * math.Log((in.InitialC-in.AirC)/(0-in.AirC))
	}
	freeze := in.Fraction * in.WaterMassPerM * LatentHeatFusion * in.RFreezePerM / (0 - in.AirC)
	return cool / 3600, (cool + freeze) / 3600, nil
}

// HandbookResistancePerM returns the insulation's thermal resistance per metre of pipe,
// K·m/W, R_T = Σ ln(D_out/D_in)/(2π·k) over the layers from the pipe's outside diameter
// outward, each layer at the conductivity of its solved state (states from Solve, same
// order). This is the basis of the freeze-time and heat-tracing formulas of ASHRAE
// Handbook—Fundamentals ch. 23, which neglect the pipe wall and the inner and outer
// films: conservative for freezing and for tracing.
func HandbookResistancePerM(pipeOD float64, layers []Layer, states []LayerState) (float64, error) {
	if len(layers) == 0 || len(states) != len(layers) {
		return 0, fmt.Errorf("calc: handbook resistance needs the %d layers' solved states, got %d", len(layers), len(states))
	}
	if !(pipeOD > 0) {
		return 0, fmt.Errorf("calc: pipe outside diameter %g m must be greater than 0", pipeOD)
	}
	var r float64
	d := pipeOD
	for i, ly := range layers {
		k := states[i].K
		if !(k > 0) || !(ly.Thickness > 0) {
			return 0, fmt.Errorf("calc: layer %d: conductivity %g W/m·K and thickness %g m must be greater than 0", i+1, k, ly.Thickness)
		}
		next := d + 2*ly.Thickness
		r += math.Log(next/d) / (2 * math.Pi * k)
		d = next
	}
	return r, nil
}
