package calc

import "math"

// Convection correlations in dimensionless form (Nusselt number from Rayleigh, Grashof,
// Reynolds and Prandtl numbers). Properties at the film temperature are the caller's.

// NuCylinderNatural is Churchill & Chu (1975), IJHMT 18(9):1049, for a horizontal
// isothermal cylinder: Nu_D = {0.60 + 0.387 Ra^(1/6) / [1 + (0.559/Pr)^(9/16)]^(8/27)}²,
// for 1e-5 ≤ Ra_D ≤ 1e12.
func NuCylinderNatural(ra, pr float64) float64 {
	t, _ := churchillChu(ra, pr, 0.559)
	n := 0.60 + t
	return n * n
}

// churchillChuAt is churchillChu, or with rough the Prandtl factor [1 + (c/Pr)^(9/16)]^(−8/27)
// from its quadratic Taylor expansion about Pr 0.72 (within 2e-5 for Pr 0.66…0.78; our
// expansion) and w at Pr 0.72: for the starting guess only.
func churchillChuAt(ra, pr, c float64, rough bool) (term, w float64) {
	if !rough {
		return churchillChu(ra, pr, c)
	}
	f0, f1, f2, w := 0.831075024067075, 0.08935363846207522, -0.07593979600706291, 0.46446756536433514 // c = 0.559
	if c != 0.559 {
		f0, f1, f2, w = 0.8391701955747596, 0.08676437419852245, -0.07452170469601782, 0.4466576355404051 // c = 0.492
	}
	dp := pr - 0.72
	return 0.387 * math.Sqrt(math.Cbrt(ra)) * (f0 + dp*(f1+dp*f2)), w
}

// churchillChu returns the Rayleigh term of the Churchill–Chu correlations,
// 0.387 Ra^(1/6) / [1 + (c/Pr)^(9/16)]^(8/27), and w = u/(1 + u) with u = (c/Pr)^(9/16),
// which the analytic slope needs. The powers are taken by roots where they can be:
// Ra^(1/6) = √∛Ra and x^(9/16) = √x·√√√√x.
func churchillChu(ra, pr, c float64) (term, w float64) {
	s := math.Sqrt(c / pr)
	u := s * math.Sqrt(math.Sqrt(math.Sqrt(s)))
	v := 1 + u
	return 0.387 * math.Sqrt(math.Cbrt(ra)) * math.Exp(-8.0/27*math.Log(v)), u / v
}

// NuVerticalPlateNatural is Churchill & Chu (1975), IJHMT 18(11):1323, for a vertical
// isothermal plate over the whole range of Ra_L (≤ 1e12):
// Nu_L = {0.825 + 0.387 Ra^(1/6) / [1 + (0.492/Pr)^(9/16)]^(8/27)}².
func NuVerticalPlateNatural(ra, pr float64) float64 {
	t, _ := churchillChu(ra, pr, 0.492)
	n := 0.825 + t
	return n * n
}

// SlenderCylinderApplies reports whether a vertical cylinder of diameter d and height l
// is too slender to be treated as a vertical plate: D/L < 35/Gr_L^(1/4).
func SlenderCylinderApplies(gr, l, d float64) bool {
	return d/l < 35/math.Sqrt(math.Sqrt(gr))
}

// SlenderCylinderFactor is the correction Nu/Nu_plate of Popiel, Wojtkowiak & Bober
// (2007) for slender vertical cylinders: 1 + B·[32^0.5 Gr_L^(−1/4) L/D]^C with
// B = 0.0571322 + 0.20305 Pr^(−0.43) and
// C = 0.9165 − 0.0043 Pr^0.5 + 0.01333 ln Pr + 0.0004809/Pr (0.01 < Pr < 100).
func SlenderCylinderFactor(gr, pr, l, d float64) float64 {
	f, _ := slenderFactorD(gr, pr, l, d, 0, 0)
	return f
}

// slenderFactorD returns SlenderCylinderFactor and ΔT·dF/dTs, given gGr and gPr, the
// values of ΔT·d(ln Gr)/dTs and ΔT·d(ln Pr)/dTs.
func slenderFactorD(gr, pr, l, d, gGr, gPr float64) (f, gf float64) {
	lnPr := math.Log(pr)
	prm := math.Exp(-0.43 * lnPr)
	sq := math.Sqrt(pr)
	b := 0.0571322 + 0.20305*prm
	c := 0.9165 - 0.0043*sq + 0.01333*lnPr + 0.0004809/pr
	lnZ := math.Log(math.Sqrt(32) / math.Sqrt(math.Sqrt(gr)) * l / d)
	zc := math.Exp(c * lnZ)
	gB := 0.20305 * -0.43 * prm * gPr
	gC := (-0.0043*0.5*sq + 0.01333 - 0.0004809/pr) * gPr
	gZc := zc * (gC*lnZ - c*gGr/4)
	return 1 + b*zc, gB*zc + b*gZc
}

// NuPlateUpNatural is the McAdams correlation (as in Incropera) for the hot face of a
// horizontal plate looking up, or the cold face looking down, with L = area/perimeter:
// Nu = 0.54 Ra^(1/4) below Ra 1e7 (published for 1e4…1e7, used here also below 1e4) and
// 0.15 Ra^(1/3) from 1e7 (published to 1e11).
func NuPlateUpNatural(ra float64) float64 {
	if ra < 1e7 {
		return 0.54 * math.Sqrt(math.Sqrt(ra))
	}
	return 0.15 * math.Cbrt(ra)
}

// NuPlateDownNatural is the McAdams correlation (as in Incropera) for the hot face of a
// horizontal plate looking down, or the cold face looking up: Nu = 0.27 Ra^(1/4),
// published for 1e5…1e10, L = area/perimeter.
func NuPlateDownNatural(ra float64) float64 {
	return 0.27 * math.Sqrt(math.Sqrt(ra))
}

// NuCylinderCrossFlow is Churchill & Bernstein (1977), J. Heat Transfer 99(2):300, for a
// cylinder in cross-flow, Re·Pr > 0.2:
// Nu_D = 0.3 + 0.62 Re^(1/2) Pr^(1/3) / [1 + (0.4/Pr)^(2/3)]^(1/4) · [1 + (Re/282000)^(5/8)]^(4/5).
func NuCylinderCrossFlow(re, pr float64) float64 {
	nu, _ := crossFlowD(re, pr, 0, 0)
	return nu
}

// crossFlowD returns NuCylinderCrossFlow and ΔT·dNu/dTs, given gRe and gPr, the values of
// ΔT·d(ln Re)/dTs and ΔT·d(ln Pr)/dTs.
func crossFlowD(re, pr, gRe, gPr float64) (nu, gNu float64) {
	cb := math.Cbrt(0.4 / pr)
	v := cb * cb // (0.4/Pr)^(2/3)
	s := math.Sqrt(re / 282000)
	w := s * math.Sqrt(math.Sqrt(s)) // (Re/282000)^(5/8)
	x := 0.62 * math.Sqrt(re) * math.Cbrt(pr) / math.Sqrt(math.Sqrt(1+v)) * math.Exp(0.8*math.Log(1+w))
	gx := x * (gRe/2 + gPr/3 + v/(1+v)*gPr/6 + w/(1+w)*gRe/2)
	return 0.3 + x, gx
}

// NuFlatPlateForced is the average Nusselt number of a flat plate in parallel flow:
// laminar 0.664 Re^(1/2) Pr^(1/3) below Re 5e5, mixed laminar–turbulent boundary layer
// (0.037 Re^0.8 − 871) Pr^(1/3) above (Incropera, to Re 1e8).
func NuFlatPlateForced(re, pr float64) float64 {
	nu, _ := flatPlateForcedD(re, pr, 0, 0)
	return nu
}

// flatPlateForcedD returns NuFlatPlateForced and ΔT·dNu/dTs, given gRe and gPr, the
// values of ΔT·d(ln Re)/dTs and ΔT·d(ln Pr)/dTs.
func flatPlateForcedD(re, pr, gRe, gPr float64) (nu, gNu float64) {
	c := math.Cbrt(pr)
	if re < 5e5 {
		nu = 0.664 * math.Sqrt(re) * c
		return nu, nu * (gRe/2 + gPr/3)
	}
	r8 := math.Exp(0.8 * math.Log(re))
	nu = (0.037*r8 - 871) * c
	return nu, 0.037*0.8*r8*gRe*c + nu*gPr/3
}

// MixedConvection combines natural and forced coefficients (or Nusselt numbers on a common
// length) as (n³ + f³)^(1/3), the usual combination for transverse and assisting flow.
func MixedConvection(natural, forced float64) float64 {
	return math.Cbrt(natural*natural*natural + forced*forced*forced)
}
