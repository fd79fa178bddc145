package calc

import (
	"fmt"
	"math"
)

// Superheated steam by IAPWS-IF97 region 2 (IAPWS R7-97(2012), eqs. 15–17 and Table 12):
// specific heat and enthalpy for the steam's cooling along a run, which ends in
// condensation only where the steam has cooled to saturation.

// SteamMaxSuperheatC is the upper temperature of IF97 region 2 (1073.15 K).
const SteamMaxSuperheatC = 800.0

// if97Cp2 is the isobaric specific heat, J/kg·K, of region 2 at p (Pa) and T (K):
// c_p/R = −τ²(γ°_ττ + γʳ_ττ), π = p/1 MPa, τ = 540 K/T.
func if97Cp2(p, T float64) float64 {
	pi := p / 1e6
	tau := 540 / T
	var g float64
	for _, c := range if97r2o {
		g += c[1] * c[0] * (c[0] - 1) * math.Pow(tau, c[0]-2)
	}
	b := tau - 0.5
	for _, c := range if97r2r {
		g += c[2] * math.Pow(pi, c[0]) * c[1] * (c[1] - 1) * math.Pow(b, c[1]-2)
	}
	return -if97R * tau * tau * g
}

// if97B23 is the boundary between regions 2 and 3, p in Pa at T in K (IF97 eq. 5).
func if97B23(T float64) float64 {
	return (0.34805185628969e3 - 0.11671859879975e1*T + 0.10192970039326e-2*T*T) * 1e6
}

// checkSuperheated reports whether (p, T) lies in region 2 above the saturation line:
// superheated steam whose properties this package computes.
func checkSuperheated(absPressurePa, tempC float64) error {
	if math.IsNaN(absPressurePa) || math.IsNaN(tempC) || absPressurePa < if97PtrPa || absPressurePa > if97Pc {
		return fmt.Errorf("calc: absolute pressure %g Pa is outside %g Pa … %g MPa", absPressurePa, if97PtrPa, if97Pc/1e6)
	}
	T := tempC + 273.15
	ts := if97Ts(absPressurePa)
	switch {
	case T <= ts:
		return fmt.Errorf("calc: %g °C is not above the saturation temperature %.2f °C at %g kPa", tempC, ts-273.15, absPressurePa/1e3)
	case tempC > SteamMaxSuperheatC:
		return fmt.Errorf("calc: %g °C is above %g °C, the upper limit of IAPWS-IF97 region 2", tempC, SteamMaxSuperheatC)
	case T > if97T13 && absPressurePa > if97B23(T) || T <= if97T13 && absPressurePa > if97Ps13:
		return fmt.Errorf("calc: %g °C at %g MPa lies in IAPWS-IF97 region 3 (near the critical point), which is not implemented", tempC, absPressurePa/1e6)
	}
	return nil
}

// SuperheatedSteam returns the specific enthalpy, J/kg, and isobaric specific heat,
// J/kg·K, of superheated steam at absolute pressure absPressurePa and tempC (IAPWS-IF97
// region 2). Error outside region 2 above saturation.
func SuperheatedSteam(absPressurePa, tempC float64) (h, cp float64, err error) {
	if err := checkSuperheated(absPressurePa, tempC); err != nil {
		return 0, 0, err
	}
	T := tempC + 273.15
	return if97H2(absPressurePa, T), if97Cp2(absPressurePa, T), nil
}

// SteamRun is the state of superheated steam along an insulated run.
type SteamRun struct {
	OutletC float64 // steam temperature at the end of the run, °C (saturation once reached)
	// SaturatedAtM is the distance from the inlet, m, where the steam has cooled to
	// saturation; negative when it stays superheated over the whole run.
	SaturatedAtM float64
	// CondensateKgPerH forms on the rest of the run, after saturation (0 when none).
	CondensateKgPerH float64
}

// SuperheatedRun marches superheated steam entering at inletC along lengthM metres at
// massFlowKgS, at absolute pressure absPressurePa (pressure drop neglected), in `segments`
// equal segments. The enthalpy balance ṁ·dh/dx = −q'(T) is crossed per segment at the
// heat flow of its mid state (one predictor-corrector step); T follows from h by IF97
// region 2. Where h falls to the saturated-vapour enthalpy h”(p), the point is
// interpolated within the segment and the remaining length condenses at q'(T_s):
// condensate = q'(T_s)·(L − x_s)/h_fg.
func SuperheatedRun(absPressurePa, inletC, lengthM, massFlowKgS float64, heatFlowPerM func(fluidC float64) (float64, error), segments int) (SteamRun, error) {
	if err := checkSuperheated(absPressurePa, inletC); err != nil {
		return SteamRun{}, err
	}
	switch {
	case heatFlowPerM == nil:
		return SteamRun{}, fmt.Errorf("calc: no heat-flow function for the run")
	case !(lengthM >= 0) || math.IsInf(lengthM, 0):
		return SteamRun{}, fmt.Errorf("calc: run length %g m must not be negative", lengthM)
	case !(massFlowKgS > 0) || math.IsInf(massFlowKgS, 0):
		return SteamRun{}, fmt.Errorf("calc: mass flow %g kg/s must be greater than 0", massFlowKgS)
	case segments < 1 || segments > MaxRunSegments:
		return SteamRun{}, fmt.Errorf("calc: segments %d must be 1 … %d", segments, MaxRunSegments)
	}
	p := absPressurePa
	tsK := if97Ts(p)
	tsC := tsK - 273.15
	hg := if97H2(p, tsK) // saturated vapour
	hfg := hg - if97H1(p, tsK)
	if p > if97Ps13 {
		return SteamRun{}, fmt.Errorf("calc: saturation at %g MPa lies in IAPWS-IF97 region 3, which is not implemented", p/1e6)
	}
	// tempOf inverts h(T) at p by Newton's method from a guess, staying at or above saturation.
	tempOf := func(h, guessC float64) float64 {
		if h <= hg {
			return tsC
		}
		T := math.Max(guessC+273.15, tsK+1e-6)
		for range 50 {
			d := (if97H2(p, T) - h) / if97Cp2(p, T)
			T = math.Max(T-d, tsK+1e-9)
			if math.Abs(d) < 1e-9 {
				break
			}
		}
		return T - 273.15
	}
	q := func(tC float64) (float64, error) {
		v, err := heatFlowPerM(tC)
		if err == nil && (math.IsNaN(v) || math.IsInf(v, 0)) {
			err = fmt.Errorf("calc: heat flow %g W/m at %g °C is not finite", v, tC)
		}
		return v, err
	}
	dx := lengthM / float64(segments)
	T := inletC
	h := if97H2(p, T+273.15)
	run := SteamRun{SaturatedAtM: -1}
	for i := range segments {
		q0, err := q(T)
		if err != nil {
			return SteamRun{}, err
		}
		mid := tempOf(h-q0*dx/(2*massFlowKgS), T)
		qm, err := q(mid)
		if err != nil {
			return SteamRun{}, err
		}
		drop := qm * dx / massFlowKgS // J/kg over the segment
		if drop > 0 && h-drop <= hg {
			x := float64(i)*dx + dx*(h-hg)/drop
			qs, err := q(tsC)
			if err != nil {
				return SteamRun{}, err
			}
			run.SaturatedAtM = x
			run.OutletC = tsC
			run.CondensateKgPerH = CondensateKgPerH(qs*(lengthM-x), hfg)
			return run, nil
		}
		h -= drop
		T = tempOf(h, T)
	}
	run.OutletC = T
	return run, nil
}
