package calc

import (
	"math"
	"testing"
)

// Verification values: IAPWS-IF97 (2007 revised release), verification table — the
// release's own computer-program verification values (Tables 35, 15 and 5; pressures in
// MPa, enthalpies in kJ/kg). Compared to 1e-8 relative.

func TestIF97Region4SaturationTemp(t *testing.T) {
	// IAPWS-IF97 (2007 revised release), verification table 36 (eq. 31).
	for _, c := range []struct{ pMPa, wantK float64 }{
		{0.1, 372.755919},
		{1, 453.035632},
		{10, 584.149488},
	} {
		got, err := SteamSaturationTemp(c.pMPa * 1e6)
		if err != nil {
			t.Fatal(err)
		}
		if rel := math.Abs(got+273.15-c.wantK) / c.wantK; rel > 1e-8 {
			t.Errorf("Ts(%g MPa) = %.6f K, want %.6f", c.pMPa, got+273.15, c.wantK)
		}
	}
}

func TestIF97Region4SaturationPressure(t *testing.T) {
	// IAPWS-IF97 (2007 revised release), verification table 35 (eq. 30).
	for _, c := range []struct{ TK, wantMPa float64 }{
		{300, 3.53658941e-3},
		{500, 2.63889776},
		{600, 12.3443146},
	} {
		got, err := SteamSaturationPressure(c.TK - 273.15)
		if err != nil {
			t.Fatal(err)
		}
		if rel := math.Abs(got/1e6-c.wantMPa) / c.wantMPa; rel > 1e-8 {
			t.Errorf("ps(%g K) = %.9g MPa, want %.9g", c.TK, got/1e6, c.wantMPa)
		}
	}
}

func TestIF97Region1Enthalpy(t *testing.T) {
	// IAPWS-IF97 (2007 revised release), verification table 5 (region 1).
	for _, c := range []struct{ pMPa, TK, wantKJ float64 }{
		{3, 300, 115.331273},
		{80, 300, 184.142828},
		{3, 500, 975.542239},
	} {
		got := if97H1(c.pMPa*1e6, c.TK) / 1e3
		if rel := math.Abs(got-c.wantKJ) / c.wantKJ; rel > 1e-8 {
			t.Errorf("h1(%g MPa, %g K) = %.9g kJ/kg, want %.9g", c.pMPa, c.TK, got, c.wantKJ)
		}
	}
}

func TestIF97Region2Enthalpy(t *testing.T) {
	// IAPWS-IF97 (2007 revised release), verification table 15 (region 2).
	for _, c := range []struct{ pMPa, TK, wantKJ float64 }{
		{0.0035, 300, 2549.91145},
		{0.0035, 700, 3335.68375},
		{30, 700, 2631.49474},
	} {
		got := if97H2(c.pMPa*1e6, c.TK) / 1e3
		if rel := math.Abs(got-c.wantKJ) / c.wantKJ; rel > 1e-8 {
			t.Errorf("h2(%g MPa, %g K) = %.9g kJ/kg, want %.9g", c.pMPa, c.TK, got, c.wantKJ)
		}
	}
}

func TestSteamTables(t *testing.T) {
	// Standard saturated-steam tables (from memory): 101.325 kPa → 100.0 °C, h_fg 2256.4 kJ/kg;
	// 1.0 MPa abs → 179.9 °C, h_fg 2014.6 kJ/kg. Tolerance 0.1 %.
	for _, c := range []struct{ pPa, wantC, wantHfg float64 }{
		{101325, 100.0, 2256.4e3},
		{1.0e6, 179.9, 2014.6e3},
	} {
		ts, err := SteamSaturationTemp(c.pPa)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(ts-c.wantC)/c.wantC > 1e-3 {
			t.Errorf("Ts(%g Pa) = %.3f °C, want %g", c.pPa, ts, c.wantC)
		}
		hfg, err := SteamLatentHeat(c.pPa)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(hfg-c.wantHfg)/c.wantHfg > 1e-3 {
			t.Errorf("h_fg(%g Pa) = %.1f J/kg, want %g", c.pPa, hfg, c.wantHfg)
		}
	}
}

func TestSteamRangeAndConsistency(t *testing.T) {
	for _, p := range []float64{0, 611, 22.065e6, math.NaN(), math.Inf(1), -1} {
		if _, err := SteamSaturationTemp(p); err == nil {
			t.Errorf("SteamSaturationTemp(%g): want error", p)
		}
		if _, err := SteamLatentHeat(p); err == nil {
			t.Errorf("SteamLatentHeat(%g): want error", p)
		}
	}
	// Region 3 (above p_s(623.15 K)) is not implemented for the latent heat.
	if _, err := SteamLatentHeat(20e6); err == nil {
		t.Error("SteamLatentHeat(20 MPa): want error (region 3)")
	}
	if _, err := SteamSaturationTemp(20e6); err != nil {
		t.Errorf("SteamSaturationTemp(20 MPa): %v", err)
	}
	for _, tc := range []float64{-0.01, 374, math.NaN()} {
		if _, err := SteamSaturationPressure(tc); err == nil {
			t.Errorf("SteamSaturationPressure(%g): want error", tc)
		}
	}
	// Eq. 31 inverts eq. 30 (IF97 states the two are consistent to well below 1e-5 relative);
	// the latent heat falls monotonically with pressure.
	prev := math.Inf(1)
	for _, p := range []float64{SteamMinPressurePa, 1e3, 1e4, 1e5, 1e6, 5e6, 1e7, SteamLatentMaxPressurePa} {
		ts, err := SteamSaturationTemp(p)
		if err != nil {
			t.Fatal(err)
		}
		back, err := SteamSaturationPressure(ts)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(back-p)/p > 1e-6 {
			t.Errorf("ps(Ts(%g)) = %g", p, back)
		}
		h, err := SteamLatentHeat(p)
		if err != nil {
			t.Fatal(err)
		}
		if !(h < prev) || h <= 0 {
			t.Errorf("h_fg(%g Pa) = %g, not below %g", p, h, prev)
		}
		prev = h
	}
}
