package calc

import (
	"fmt"
	"math"
)

// Saturated steam by IAPWS-IF97 (IAPWS Revised Release on the IAPWS Industrial Formulation
// 1997 for the Thermodynamic Properties of Water and Steam, 2007): the region 4 saturation
// equation and its backward form for the saturation line, region 1 (liquid) and region 2
// (vapour) Gibbs free-energy equations for enthalpies.

// IF97 constants.
const (
	if97R     = 461.526      // specific gas constant of water, J/kg·K
	if97Tc    = 647.096      // critical temperature, K
	if97Pc    = 22.064e6     // critical pressure, Pa
	if97PtrPa = 611.213      // lower end of the saturation line (273.15 K), Pa
	if97T13   = 623.15       // upper temperature of region 1 (and of region 2 along saturation), K
	if97Ps13  = 16.5291643e6 // p_s(623.15 K), Pa: above it the saturation line borders region 3
)

// SteamMinPressurePa and SteamMaxPressurePa bound the saturation line (IF97 region 4);
// SteamLatentMaxPressurePa bounds SteamLatentHeat, which uses regions 1 and 2 only.
const (
	SteamMinPressurePa       = if97PtrPa
	SteamMaxPressurePa       = if97Pc
	SteamLatentMaxPressurePa = if97Ps13
)

var if97n4 = [11]float64{0, // 1-based as in the release, Table 34
	0.11670521452767e4, -0.72421316703206e6, -0.17073846940092e2,
	0.12020824702470e5, -0.32325550322333e7, 0.14915108613530e2,
	-0.48232657361591e4, 0.40511340542057e6, -0.23855557567849,
	0.65017534844798e3}

// SteamSaturationPressure returns the saturation pressure, Pa (absolute), at tempC (°C),
// IAPWS-IF97 eq. 30; valid 0 °C (273.15 K) … 373.946 °C (the critical point).
func SteamSaturationPressure(tempC float64) (float64, error) {
	T := tempC + 273.15
	if math.IsNaN(T) || T < 273.15 || T > if97Tc {
		return 0, fmt.Errorf("calc: saturation temperature %g °C is outside 0 … 373.946 °C (IAPWS-IF97 region 4)", tempC)
	}
	n := &if97n4
	th := T + n[9]/(T-n[10])
	A := th*th + n[1]*th + n[2]
	B := n[3]*th*th + n[4]*th + n[5]
	C := n[6]*th*th + n[7]*th + n[8]
	x := 2 * C / (-B + math.Sqrt(B*B-4*A*C))
	return x * x * x * x * 1e6, nil
}

// SteamSaturationTemp returns the saturation temperature, °C, at absolute pressure
// absPressurePa, IAPWS-IF97 eq. 31 (the backward saturation-temperature equation); valid
// 611.213 Pa … 22.064 MPa.
func SteamSaturationTemp(absPressurePa float64) (float64, error) {
	if err := checkSatPressure(absPressurePa, if97Pc); err != nil {
		return 0, err
	}
	return if97Ts(absPressurePa) - 273.15, nil
}

func checkSatPressure(p, max float64) error {
	if math.IsNaN(p) || p < if97PtrPa || p > max {
		return fmt.Errorf("calc: absolute pressure %g Pa is outside the saturation range %g Pa … %g MPa", p, if97PtrPa, max/1e6)
	}
	return nil
}

// if97Ts is eq. 31, p in Pa, T in K.
func if97Ts(p float64) float64 {
	n := &if97n4
	beta := math.Pow(p/1e6, 0.25)
	E := beta*beta + n[3]*beta + n[6]
	F := n[1]*beta*beta + n[4]*beta + n[7]
	G := n[2]*beta*beta + n[5]*beta + n[8]
	D := 2 * G / (-F - math.Sqrt(F*F-4*E*G))
	return (n[10] + D - math.Sqrt((n[10]+D)*(n[10]+D)-4*(n[9]+n[10]*D))) / 2
}

// SteamLatentHeat returns the latent heat of vaporisation h” − h', J/kg, of saturated
// steam at absolute pressure absPressurePa: the saturation temperature from eq. 31, then h'
// from region 1 and h” from region 2 at that temperature and pressure. Valid 611.213 Pa …
// 16.529 MPa (p_s at 623.15 K): above it the saturated states lie in IF97 region 3, which
// is not implemented, and an error is returned although the saturation line itself
// continues to 22.064 MPa.
func SteamLatentHeat(absPressurePa float64) (float64, error) {
	if math.IsNaN(absPressurePa) || absPressurePa < if97PtrPa || absPressurePa > if97Pc {
		return 0, checkSatPressure(absPressurePa, if97Pc)
	}
	if absPressurePa > if97Ps13 {
		return 0, fmt.Errorf("calc: latent heat above %.4g MPa (IAPWS-IF97 region 3) is not implemented; got %g MPa", if97Ps13/1e6, absPressurePa/1e6)
	}
	T := if97Ts(absPressurePa)
	return if97H2(absPressurePa, T) - if97H1(absPressurePa, T), nil
}

// IF97 region 1, Table 2: I, J, n.
var if97r1 = [34][3]float64{
	{0, -2, 0.14632971213167}, {0, -1, -0.84548187169114}, {0, 0, -0.37563603672040e1},
	{0, 1, 0.33855169168385e1}, {0, 2, -0.95791963387872}, {0, 3, 0.15772038513228},
	{0, 4, -0.16616417199501e-1}, {0, 5, 0.81214629983568e-3}, {1, -9, 0.28319080123804e-3},
	{1, -7, -0.60706301565874e-3}, {1, -1, -0.18990068218419e-1}, {1, 0, -0.32529748770505e-1},
	{1, 1, -0.21841717175414e-1}, {1, 3, -0.52838357969930e-4}, {2, -3, -0.47184321073267e-3},
	{2, 0, -0.30001780793026e-3}, {2, 1, 0.47661393906987e-4}, {2, 3, -0.44141845330846e-5},
	{2, 17, -0.72694996297594e-15}, {3, -4, -0.31679644845054e-4}, {3, 0, -0.28270797985312e-5},
	{3, 6, -0.85205128120103e-9}, {4, -5, -0.22425281908000e-5}, {4, -2, -0.65171222895601e-6},
	{4, 10, -0.14341729937924e-12}, {5, -8, -0.40516996860117e-6}, {8, -11, -0.12734301741641e-8},
	{8, -6, -0.17424871230634e-9}, {21, -29, -0.68762131295531e-18}, {23, -31, 0.14478307828521e-19},
	{29, -38, 0.26335781662795e-22}, {30, -39, -0.11947622640071e-22}, {31, -40, 0.18228094581404e-23},
	{32, -41, -0.93537087292458e-25},
}

// if97H1 is the specific enthalpy, J/kg, of region 1 (compressed liquid) at p (Pa) and
// T (K): h/(RT) = τ·γ_τ, π = p/16.53 MPa, τ = 1386 K/T (IF97 eq. 7, Table 3).
func if97H1(p, T float64) float64 {
	pi := p / 16.53e6
	tau := 1386 / T
	a, b := 7.1-pi, tau-1.222
	var gt float64
	for _, c := range if97r1 {
		gt += c[2] * math.Pow(a, c[0]) * c[1] * math.Pow(b, c[1]-1)
	}
	return if97R * T * tau * gt
}

// IF97 region 2, ideal-gas part (Table 10: J°, n°) and residual part (Table 11: I, J, n).
var if97r2o = [9][2]float64{
	{0, -0.96927686500217e1}, {1, 0.10086655968018e2}, {-5, -0.56087911283020e-2},
	{-4, 0.71452738081455e-1}, {-3, -0.40710498223928}, {-2, 0.14240819171444e1},
	{-1, -0.43839511319450e1}, {2, -0.28408632460772}, {3, 0.21268463753307e-1},
}

var if97r2r = [43][3]float64{
	{1, 0, -0.17731742473213e-2}, {1, 1, -0.17834862292358e-1}, {1, 2, -0.45996013696365e-1},
	{1, 3, -0.57581259083432e-1}, {1, 6, -0.50325278727930e-1}, {2, 1, -0.33032641670203e-4},
	{2, 2, -0.18948987516315e-3}, {2, 4, -0.39392777243355e-2}, {2, 7, -0.43797295650573e-1},
	{2, 36, -0.26674547914087e-4}, {3, 0, 0.20481737692309e-7}, {3, 1, 0.43870667284435e-6},
	{3, 3, -0.32277677238570e-4}, {3, 6, -0.15033924542148e-2}, {3, 35, -0.40668253562649e-1},
	{4, 1, -0.78847309559367e-9}, {4, 2, 0.12790717852285e-7}, {4, 3, 0.48225372718507e-6},
	{5, 7, 0.22922076337661e-5}, {6, 3, -0.16714766451061e-10}, {6, 16, -0.21171472321355e-2},
	{6, 35, -0.23895741934104e2}, {7, 0, -0.59059564324270e-17}, {7, 11, -0.12621808899101e-5},
	{7, 25, -0.38946842435739e-1}, {8, 8, 0.11256211360459e-10}, {8, 36, -0.82311340897998e1},
	{9, 13, 0.19809712802088e-7}, {10, 4, 0.10406965210174e-18}, {10, 10, -0.10234747095929e-12},
	{10, 14, -0.10018179379511e-8}, {16, 29, -0.80882908646985e-10}, {16, 50, 0.10693031879409},
	{18, 57, -0.33662250574171}, {20, 20, 0.89185845355421e-24}, {20, 35, 0.30629316876232e-12},
	{20, 48, -0.42002467698208e-5}, {21, 21, -0.59056029685639e-25}, {22, 53, 0.37826947613457e-5},
	{23, 39, -0.12768608934681e-14}, {24, 26, 0.73087610595061e-28}, {24, 40, 0.55414715350778e-16},
	{24, 58, -0.94369707241210e-6},
}

// if97H2 is the specific enthalpy, J/kg, of region 2 (superheated and saturated vapour)
// at p (Pa) and T (K): h/(RT) = τ(γ°_τ + γʳ_τ), π = p/1 MPa, τ = 540 K/T (IF97 eqs. 15–17,
// Table 12).
func if97H2(p, T float64) float64 {
	pi := p / 1e6
	tau := 540 / T
	var go_, gr float64
	for _, c := range if97r2o {
		go_ += c[1] * c[0] * math.Pow(tau, c[0]-1)
	}
	b := tau - 0.5
	for _, c := range if97r2r {
		gr += c[2] * math.Pow(pi, c[0]) * c[1] * math.Pow(b, c[1]-1)
	}
	return if97R * T * tau * (go_ + gr)
}
