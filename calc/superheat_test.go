package calc

import (
	"math"
	"testing"
)

func TestIF97Region2Verification(t *testing.T) {
	// IAPWS R7-97(2012), Table 15: verification values for region 2 (h in kJ/kg, cp in
	// kJ/kg·K).
	for _, c := range []struct{ TK, pMPa, h, cp float64 }{
		{300, 0.0035, 2549.91145, 1.91300162},
		{700, 0.0035, 3335.68375, 2.08141274},
		{700, 30, 2631.49474, 10.3505092},
	} {
		if got := if97Cp2(c.pMPa*1e6, c.TK) / 1e3; math.Abs(got-c.cp)/c.cp > 1e-8 {
			t.Errorf("cp(%g MPa, %g K) = %.9g kJ/kg·K, want %.9g", c.pMPa, c.TK, got, c.cp)
		}
		if got := if97H2(c.pMPa*1e6, c.TK) / 1e3; math.Abs(got-c.h)/c.h > 1e-8 {
			t.Errorf("h(%g MPa, %g K) = %.9g kJ/kg, want %.9g", c.pMPa, c.TK, got, c.h)
		}
	}
	// The exported form at the second point (the third, 30 MPa, is above the critical
	// pressure: not a steam line's state, and refused).
	h, cp, err := SuperheatedSteam(3500, 700-273.15)
	if err != nil || math.Abs(h/1e3-3335.68375) > 1e-5 || math.Abs(cp/1e3-2.08141274) > 1e-7 {
		t.Errorf("SuperheatedSteam(3.5 kPa, 700 K) = %g, %g, %v", h, cp, err)
	}
}

func TestSuperheatedRange(t *testing.T) {
	// Saturation at 1 MPa abs is 179.88 °C (steam tables, from memory).
	for _, c := range []struct {
		pPa, tC float64
		ok      bool
	}{
		{1e6, 250, true}, {1e6, 179, false}, {1e6, 801, false}, {20e6, 370, false}, {20e6, 500, true},
	} {
		_, _, err := SuperheatedSteam(c.pPa, c.tC)
		if (err == nil) != c.ok {
			t.Errorf("SuperheatedSteam(%g Pa, %g °C): err %v, want ok %v", c.pPa, c.tC, err, c.ok)
		}
	}
	// 20 MPa, 500 °C: B23 gives p_B23(773.15 K) = 24.8 MPa (IF97 eq. 5, computed), so region 2.
}

// A constant heat loss makes the enthalpy fall linearly: the run reaches saturation where
// ṁ·(h(T_in) − h”) = q'·x, and condenses q'·(L − x)/h_fg after it (energy balance).
func TestSuperheatedRunEnergyBalance(t *testing.T) {
	const p, tin, m, L, qc = 1e6, 200.0, 0.05, 500.0, 100.0
	constant := func(float64) (float64, error) { return qc, nil }
	run, err := SuperheatedRun(p, tin, L, m, constant, 20)
	if err != nil {
		t.Fatal(err)
	}
	ts := if97Ts(p)
	hIn := if97H2(p, tin+273.15)
	hg := if97H2(p, ts)
	wantX := m * (hIn - hg) / qc
	if math.Abs(run.SaturatedAtM-wantX) > 1e-6*wantX {
		t.Errorf("saturated at %.4f m, want %.4f m", run.SaturatedAtM, wantX)
	}
	hfg, _ := SteamLatentHeat(p)
	if want := qc * (L - wantX) / hfg * 3600; math.Abs(run.CondensateKgPerH-want) > 1e-9*want {
		t.Errorf("condensate %.6f kg/h, want %.6f", run.CondensateKgPerH, want)
	}
	// Steam tables (Cengel Table A-6, from memory): 1 MPa, 200 °C: h = 2828.3 kJ/kg;
	// saturated vapour at 1 MPa: h_g = 2777.1 kJ/kg — a drop of about 51 kJ/kg.
	if d := (hIn - hg) / 1e3; math.Abs(d-51.2) > 0.5 {
		t.Errorf("h(200 °C) − h” at 1 MPa = %.2f kJ/kg, want about 51.2", d)
	}
	// A small loss leaves the steam superheated: no condensate, and the outlet between
	// saturation and the inlet.
	small := func(float64) (float64, error) { return 1, nil }
	run, err = SuperheatedRun(p, tin, 100, 1, small, 10)
	if err != nil || run.SaturatedAtM >= 0 || run.CondensateKgPerH != 0 || !(run.OutletC < tin && run.OutletC > ts-273.15) {
		t.Errorf("small loss: %+v, %v", run, err)
	}
	// Outlet by the mean specific heat: ΔT ≈ q'L/(ṁ·cp); cp ≈ 2.43 kJ/kg·K near 1 MPa, 200 °C
	// (computed from IF97), so 100 W over 1 kg/s cools about 0.041 K.
	if d := tin - run.OutletC; math.Abs(d-100.0/if97Cp2(p, tin+273.15)) > 1e-3 {
		t.Errorf("temperature drop %.5f K", d)
	}
}
