package calc

import "math"

// Convection correlations in dimensionless form (Nusselt number from Rayleigh, Grashof,
// Reynolds and Prandtl numbers). Properties at the film temperature are the caller's.

// NuCylinderNatural is Churchill & Chu (1975), IJHMT 18(9):1049, for a horizontal
// isothermal cylinder: Nu_D = {0.60 + 0.387 Ra^(1/6) / [1 + (0.559/Pr)^(9/16)]^(8/27)}²,
// for 1e-5 ≤ Ra_D ≤ 1e12.
func NuCylinderNatural(ra, pr float64) float64 {
	n := 0.60 + 0.387*math.Pow(ra, 1.0/6)/math.Pow(1+math.Pow(0.559/pr, 9.0/16), 8.0/27)
	return n * n
}

// NuVerticalPlateNatural is Churchill & Chu (1975), IJHMT 18(11):1323, for a vertical
// isothermal plate over the whole range of Ra_L (≤ 1e12):
// Nu_L = {0.825 + 0.387 Ra^(1/6) / [1 + (0.492/Pr)^(9/16)]^(8/27)}².
func NuVerticalPlateNatural(ra, pr float64) float64 {
	n := 0.825 + 0.387*math.Pow(ra, 1.0/6)/math.Pow(1+math.Pow(0.492/pr, 9.0/16), 8.0/27)
	return n * n
}

// SlenderCylinderApplies reports whether a vertical cylinder of diameter d and height l
// is too slender to be treated as a vertical plate: D/L < 35/Gr_L^(1/4).
func SlenderCylinderApplies(gr, l, d float64) bool {
	return d/l < 35/math.Pow(gr, 0.25)
}

// SlenderCylinderFactor is the correction Nu/Nu_plate of Popiel, Wojtkowiak & Bober
// (2007) for slender vertical cylinders: 1 + B·[32^0.5 Gr_L^(−1/4) L/D]^C with
// B = 0.0571322 + 0.20305 Pr^(−0.43) and
// C = 0.9165 − 0.0043 Pr^0.5 + 0.01333 ln Pr + 0.0004809/Pr (0.01 < Pr < 100).
func SlenderCylinderFactor(gr, pr, l, d float64) float64 {
	b := 0.0571322 + 0.20305*math.Pow(pr, -0.43)
	c := 0.9165 - 0.0043*math.Sqrt(pr) + 0.01333*math.Log(pr) + 0.0004809/pr
	return 1 + b*math.Pow(math.Sqrt(32)*math.Pow(gr, -0.25)*l/d, c)
}

// NuPlateUpNatural is the McAdams correlation (as in Incropera) for the hot face of a
// horizontal plate looking up, or the cold face looking down, with L = area/perimeter:
// Nu = 0.54 Ra^(1/4) below Ra 1e7 (published for 1e4…1e7, used here also below 1e4) and
// 0.15 Ra^(1/3) from 1e7 (published to 1e11).
func NuPlateUpNatural(ra float64) float64 {
	if ra < 1e7 {
		return 0.54 * math.Pow(ra, 0.25)
	}
	return 0.15 * math.Cbrt(ra)
}

// NuPlateDownNatural is the McAdams correlation (as in Incropera) for the hot face of a
// horizontal plate looking down, or the cold face looking up: Nu = 0.27 Ra^(1/4),
// published for 1e5…1e10, L = area/perimeter.
func NuPlateDownNatural(ra float64) float64 {
	return 0.27 * math.Pow(ra, 0.25)
}

// NuCylinderCrossFlow is Churchill & Bernstein (1977), J. Heat Transfer 99(2):300, for a
// cylinder in cross-flow, Re·Pr > 0.2:
// Nu_D = 0.3 + 0.62 Re^(1/2) Pr^(1/3) / [1 + (0.4/Pr)^(2/3)]^(1/4) · [1 + (Re/282000)^(5/8)]^(4/5).
func NuCylinderCrossFlow(re, pr float64) float64 {
	return 0.3 + 0.62*math.Sqrt(re)*math.Cbrt(pr)/math.Pow(1+math.Pow(0.4/pr, 2.0/3), 0.25)*
		math.Pow(1+math.Pow(re/282000, 5.0/8), 0.8)
}

// NuFlatPlateForced is the average Nusselt number of a flat plate in parallel flow:
// laminar 0.664 Re^(1/2) Pr^(1/3) below Re 5e5, mixed laminar–turbulent boundary layer
// (0.037 Re^0.8 − 871) Pr^(1/3) above (Incropera, to Re 1e8).
func NuFlatPlateForced(re, pr float64) float64 {
	if re < 5e5 {
		return 0.664 * math.Sqrt(re) * math.Cbrt(pr)
	}
	return (0.037*math.Pow(re, 0.8) - 871) * math.Cbrt(pr)
}

// MixedConvection combines natural and forced coefficients (or Nusselt numbers on a common
// length) as (n³ + f³)^(1/3), the usual combination for transverse and assisting flow.
func MixedConvection(natural, forced float64) float64 {
	return math.Cbrt(natural*natural*natural + forced*forced*forced)
}
