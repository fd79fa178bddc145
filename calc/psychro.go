package calc

import (
	"fmt"
	"math"
)

// Psychrometrics: saturation pressure of water vapour by the Hyland–Wexler formulation as
// given in ASHRAE Handbook—Fundamentals 2017, chapter 1, equations 5 (over ice) and 6 (over
// liquid water), and the dew point by inverting it.
//
// The formulation switches from ice to liquid water at the triple point, 0.01 °C, not at
// 0 °C, as PsychroLib does: the two branches then meet (to within 1e-4 relative) and the
// dew-point inversion stays continuous. Below 0 °C the dew point is a frost point.

// Validity range of the Hyland–Wexler equations as used here, °C (ASHRAE Fundamentals
// 2017 ch. 1 gives −100 … 0 °C over ice and 0 … 200 °C over water).
const (
	PsychroMinC = -100.0
	PsychroMaxC = 200.0
	// TriplePointC is the triple point of water, where the saturation pressure switches
	// from the ice branch to the liquid-water branch.
	TriplePointC = 0.01
)

// Hyland–Wexler coefficients, ASHRAE Handbook—Fundamentals 2017 ch. 1 eqs. 5–6 (T in K,
// p in Pa).
const (
	hwC1  = -5.6745359e3
	hwC2  = 6.3925247
	hwC3  = -9.677843e-3
	hwC4  = 6.2215701e-7
	hwC5  = 2.0747825e-9
	hwC6  = -9.484024e-13
	hwC7  = 4.1635019
	hwC8  = -5.8002206e3
	hwC9  = 1.3914993
	hwC10 = -4.8640239e-2
	hwC11 = 4.1764768e-5
	hwC12 = -1.4452093e-8
	hwC13 = 6.5459673
)

func checkPsychroTemp(tempC float64) error {
	if math.IsNaN(tempC) || tempC < PsychroMinC || tempC > PsychroMaxC {
		return fmt.Errorf("calc: temperature %g °C is outside the psychrometric range %g … %g °C", tempC, PsychroMinC, PsychroMaxC)
	}
	return nil
}

// lnPws returns ln(p_ws/Pa) and its derivative with respect to temperature (per K).
// The caller has checked the range.
func lnPws(tempC float64) (lnp, dlnp float64) {
	t := tempC + 273.15
	if tempC < TriplePointC {
		lnp = hwC1/t + hwC2 + t*(hwC3+t*(hwC4+t*(hwC5+t*hwC6))) + hwC7*math.Log(t)
		dlnp = -hwC1/(t*t) + hwC3 + t*(2*hwC4+t*(3*hwC5+t*4*hwC6)) + hwC7/t
		return lnp, dlnp
	}
	lnp = hwC8/t + hwC9 + t*(hwC10+t*(hwC11+t*hwC12)) + hwC13*math.Log(t)
	dlnp = -hwC8/(t*t) + hwC10 + t*(2*hwC11+t*3*hwC12) + hwC13/t
	return lnp, dlnp
}

// SaturationPressure returns the saturation pressure of water vapour, Pa, at tempC (°C):
// over ice below the triple point (0.01 °C), over liquid water at and above it.
// Hyland–Wexler, ASHRAE Handbook—Fundamentals 2017 ch. 1 eqs. 5–6; valid −100 … 200 °C.
func SaturationPressure(tempC float64) (float64, error) {
	if err := checkPsychroTemp(tempC); err != nil {
		return 0, err
	}
	lnp, _ := lnPws(tempC)
	return math.Exp(lnp), nil
}

// DewPoint returns the dew-point temperature, °C, of moist air at dryBulbC (°C) and
// relative humidity rhPct (percent, 0 < rh ≤ 100). Below 0 °C the result is the frost
// point (saturation over ice); see IsFrostPoint.
//
// The saturation-pressure equation is inverted by Newton's method on ln p_ws, kept inside a
// shrinking bracket by bisection, to 1e-9 K.
func DewPoint(dryBulbC, rhPct float64) (float64, error) {
	if err := checkPsychroTemp(dryBulbC); err != nil {
		return 0, err
	}
	if math.IsNaN(rhPct) || rhPct <= 0 || rhPct > 100 {
		return 0, fmt.Errorf("calc: relative humidity %g %% must be greater than 0 and at most 100", rhPct)
	}
	if rhPct == 100 {
		return dryBulbC, nil
	}
	lnSat, _ := lnPws(dryBulbC)
	target := lnSat + math.Log(rhPct/100) // ln of the partial pressure of the vapour
	lo, hi := PsychroMinC, dryBulbC
	if lnLo, _ := lnPws(lo); target < lnLo {
		return 0, fmt.Errorf("calc: dew point at %g °C and %g %% RH lies below %g °C, outside the psychrometric range", dryBulbC, rhPct, PsychroMinC)
	}
	t := dryBulbC
	const tol = 1e-9
	for range 200 {
		f, df := lnPws(t)
		f -= target
		if f > 0 {
			hi = t
		} else {
			lo = t
		}
		if f == 0 {
			return t, nil
		}
		next := t - f/df
		if !(next > lo && next < hi) { // Newton left the bracket: bisect instead
			next = 0.5 * (lo + hi)
		}
		if math.Abs(next-t) < tol || hi-lo < tol {
			return next, nil
		}
		t = next
	}
	return 0, fmt.Errorf("calc: dew point at %g °C and %g %% RH did not converge", dryBulbC, rhPct)
}

// IsFrostPoint reports whether a dew point dpC (°C) is a frost point: vapour deposits as
// frost (over ice) rather than condensing as water, which is so below 0 °C.
func IsFrostPoint(dpC float64) bool { return dpC < 0 }

// Relative humidity below 0 °C is quoted either over liquid (supercooled) water — the
// convention of weather observations and design weather data (WMO) — or over ice. Over
// water, the saturation pressure is the Hyland–Wexler liquid-water equation (ASHRAE
// Fundamentals 2017 ch. 1 eq. 6) carried below 0 °C; it agrees with Murphy & Koop (2005)
// eq. 10 for supercooled water within 0.1 % down to −20 °C and 1 % down to −40 °C.

// SaturationPressureOverWater returns the saturation pressure of water vapour over liquid
// water, Pa, at tempC, supercooled below 0 °C; valid −50 … 200 °C.
func SaturationPressureOverWater(tempC float64) (float64, error) {
	if math.IsNaN(tempC) || tempC < -50 || tempC > PsychroMaxC {
		return 0, fmt.Errorf("calc: temperature %g °C is outside −50 … %g °C for saturation over liquid water", tempC, PsychroMaxC)
	}
	t := tempC + 273.15
	return math.Exp(hwC8/t + hwC9 + t*(hwC10+t*(hwC11+t*hwC12)) + hwC13*math.Log(t)), nil
}

// DewPointRH returns the dew (or frost) point, °C, of air at dryBulbC and relative humidity
// rhPct. overWater takes an RH below 0 °C as over liquid water (weather data); otherwise it
// is over ice, as DewPoint takes it. At and above 0.01 °C the two agree.
func DewPointRH(dryBulbC, rhPct float64, overWater bool) (float64, error) {
	if !overWater || dryBulbC >= TriplePointC {
		return DewPoint(dryBulbC, rhPct)
	}
	if math.IsNaN(rhPct) || rhPct <= 0 || rhPct > 100 {
		return 0, fmt.Errorf("calc: relative humidity %g %% must be greater than 0 and at most 100", rhPct)
	}
	pw, err := SaturationPressureOverWater(dryBulbC)
	if err != nil {
		return 0, err
	}
	return DewPointOfVapourPressure(pw * rhPct / 100)
}

// DewPointOfVapourPressure returns the temperature, °C, at which a vapour pressure pvPa
// saturates (over ice below 0.01 °C: a frost point), by bisection on Hyland–Wexler to 1e-9 K.
func DewPointOfVapourPressure(pvPa float64) (float64, error) {
	lo, hi := PsychroMinC, PsychroMaxC
	pLo, _ := SaturationPressure(lo)
	pHi, _ := SaturationPressure(hi)
	if math.IsNaN(pvPa) || pvPa < pLo || pvPa > pHi {
		return 0, fmt.Errorf("calc: vapour pressure %g Pa saturates outside the psychrometric range %g … %g °C", pvPa, PsychroMinC, PsychroMaxC)
	}
	target := math.Log(pvPa)
	for hi-lo > 1e-9 {
		mid := (lo + hi) / 2
		if f, _ := lnPws(mid); f < target {
			lo = mid
		} else {
			hi = mid
		}
	}
	return (lo + hi) / 2, nil
}

// RelativeHumidity returns the relative humidity, %, of air at dryBulbC whose dew (or
// frost) point is dewPointC: p_ws(dew point)/p_ws(dry bulb), the latter over liquid water
// below 0 °C when overWater, over ice otherwise.
func RelativeHumidity(dryBulbC, dewPointC float64, overWater bool) (float64, error) {
	if dewPointC > dryBulbC {
		return 0, fmt.Errorf("calc: dew point %g °C is above the air temperature %g °C", dewPointC, dryBulbC)
	}
	pv, err := SaturationPressure(dewPointC)
	if err != nil {
		return 0, err
	}
	ps, err := SaturationPressure(dryBulbC)
	if overWater && dryBulbC < TriplePointC {
		ps, err = SaturationPressureOverWater(dryBulbC)
	}
	if err != nil {
		return 0, err
	}
	return 100 * pv / ps, nil
}
