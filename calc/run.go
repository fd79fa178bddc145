package calc

import (
	"fmt"
	"math"
)

// MaxRunSegments bounds the number of segments OutletTemp will march.
const MaxRunSegments = 100000

// OutletTemp returns the fluid temperature, °C, at the end of a run of lengthM metres,
// marching the energy balance dT/dx = −q'(T)/(ṁ·cp) in `segments` equal segments.
//
// heatFlowPerM(T) is the heat flow per metre, W/m, from fluid at T to the air (positive
// when the fluid is warmer than the air). In each segment the resistance per metre
// R' = (T − Ta)/q' is taken at the segment's mid temperature, found by one
// predictor-corrector step, and the segment is crossed with the exact solution for a
// constant R' (ISO 12241 §5.1 form, from memory):
//
//	T_out = Ta + (T_in − Ta)·exp(−Δx/(ṁ·cp·R'))
//
// so the fluid approaches the air temperature but never crosses it. A zero heat flow, or a
// fluid at the air temperature, leaves the temperature unchanged. A heat flow that runs
// against the temperature difference is an error.
func OutletTemp(inletC, airC, lengthM, massFlowKgS, cpJkgK float64, heatFlowPerM func(fluidC float64) (float64, error), segments int) (float64, error) {
	for _, v := range []float64{inletC, airC, lengthM, massFlowKgS, cpJkgK} {
		if math.IsNaN(v) || math.IsInf(v, 0) {
			return 0, fmt.Errorf("calc: run inputs must be finite (inlet %g °C, air %g °C, length %g m, flow %g kg/s, cp %g J/kg·K)", inletC, airC, lengthM, massFlowKgS, cpJkgK)
		}
	}
	switch {
	case heatFlowPerM == nil:
		return 0, fmt.Errorf("calc: no heat-flow function for the run")
	case lengthM < 0:
		return 0, fmt.Errorf("calc: run length %g m must not be negative", lengthM)
	case massFlowKgS <= 0:
		return 0, fmt.Errorf("calc: mass flow %g kg/s must be greater than 0", massFlowKgS)
	case cpJkgK <= 0:
		return 0, fmt.Errorf("calc: specific heat %g J/kg·K must be greater than 0", cpJkgK)
	case segments < 1 || segments > MaxRunSegments:
		return 0, fmt.Errorf("calc: segments %d must be 1 … %d", segments, MaxRunSegments)
	}
	capRate := massFlowKgS * cpJkgK // W/K
	dx := lengthM / float64(segments)
	// resistance returns R' at T, or 0 when no heat flows (T at the air temperature or q' = 0).
	resistance := func(T float64) (float64, error) {
		q, err := heatFlowPerM(T)
		if err != nil {
			return 0, err
		}
		if math.IsNaN(q) || math.IsInf(q, 0) {
			return 0, fmt.Errorf("calc: heat flow %g W/m at %g °C is not finite", q, T)
		}
		d := T - airC
		if q == 0 || d == 0 {
			return 0, nil
		}
		r := d / q
		if r < 0 {
			return 0, fmt.Errorf("calc: heat flow %g W/m at %g °C runs against the difference to the air at %g °C", q, T, airC)
		}
		return r, nil
	}
	cross := func(T, r float64) float64 {
		if r == 0 || math.IsInf(r, 1) {
			return T
		}
		return airC + (T-airC)*math.Exp(-dx/(capRate*r))
	}
	T := inletC
	for range segments {
		if T == airC || dx == 0 {
			break
		}
		r0, err := resistance(T)
		if err != nil {
			return 0, err
		}
		if r0 == 0 {
			continue // no heat flow at the segment inlet: nothing changes
		}
		mid := (T + cross(T, r0)) / 2
		rm, err := resistance(mid)
		if err != nil {
			return 0, err
		}
		if rm == 0 {
			rm = r0
		}
		T = cross(T, rm)
	}
	return T, nil
}

// CondensateKgPerH returns the condensate formed, kg/h, when saturated steam loses
// heatFlowW watts with latent heat latentJkg (J/kg): Q/h_fg × 3600. No heat loss (≤ 0),
// or a latent heat that is not positive and finite, gives 0.
func CondensateKgPerH(heatFlowW, latentJkg float64) float64 {
	if !(heatFlowW > 0) || !(latentJkg > 0) || math.IsInf(heatFlowW, 0) || math.IsInf(latentJkg, 0) {
		return 0
	}
	return heatFlowW / latentJkg * 3600
}
