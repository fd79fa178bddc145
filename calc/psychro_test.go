package calc

import (
	"bufio"
	"math"
	"os"
	"strconv"
	"strings"
	"testing"
)

func TestSaturationPressureASHRAETable3(t *testing.T) {
	// ASHRAE Handbook—Fundamentals 2017 ch. 1 Table 3 (thermodynamic properties of water at
	// saturation), p_ws; tolerance 300 ppm.
	cases := []struct {
		tempC, wantPa float64
	}{
		{-20, 103.24},
		{-5, 401.74},
		{5, 872.6},
		{25, 3169.7},
		{50, 12351.3},
		{100, 101418},
	}
	for _, c := range cases {
		got, err := SaturationPressure(c.tempC)
		if err != nil {
			t.Fatalf("SaturationPressure(%g): %v", c.tempC, err)
		}
		if rel := math.Abs(got-c.wantPa) / c.wantPa; rel > 300e-6 {
			t.Errorf("SaturationPressure(%g) = %.6g Pa, want %g (rel. error %.0f ppm)", c.tempC, got, c.wantPa, rel*1e6)
		}
	}
}

func TestSaturationPressureRangeAndContinuity(t *testing.T) {
	for _, bad := range []float64{-100.001, 200.001, math.NaN(), math.Inf(1), math.Inf(-1)} {
		if _, err := SaturationPressure(bad); err == nil {
			t.Errorf("SaturationPressure(%g): want error", bad)
		}
	}
	for _, ok := range []float64{-100, 200} {
		if _, err := SaturationPressure(ok); err != nil {
			t.Errorf("SaturationPressure(%g): %v", ok, err)
		}
	}
	// Both branches give ≈ 611.657 Pa at the triple point (computed from eqs. 5 and 6); the
	// jump across the switch is below 1e-4 relative.
	below, _ := SaturationPressure(TriplePointC - 1e-12)
	at, _ := SaturationPressure(TriplePointC)
	if rel := math.Abs(at-below) / at; rel > 1e-4 {
		t.Errorf("jump at the triple point %g Pa → %g Pa (rel. %g)", below, at, rel)
	}
	if math.Abs(at-611.657) > 0.1 {
		t.Errorf("p_ws(0.01 °C) = %g, want 611.657 Pa (IAPWS triple-point pressure, from memory)", at)
	}
}

func TestDewPointPsychroLib(t *testing.T) {
	cases := []struct {
		db, rh, want float64
		src          string
	}{
		{25, 80, 21.3094, "PsychroLib documented example"},
		{24, 50, 12.95, "computed with PsychroLib"},
		{20, 50, 9.27, "computed with PsychroLib"},
		{30, 70, 23.93, "computed with PsychroLib"},
		{32, 80, 28.11, "computed with PsychroLib"},
	}
	for _, c := range cases {
		got, err := DewPoint(c.db, c.rh)
		if err != nil {
			t.Fatalf("DewPoint(%g, %g): %v", c.db, c.rh, err)
		}
		if math.Abs(got-c.want) > 0.01 {
			t.Errorf("DewPoint(%g, %g) = %.4f, want %g (%s)", c.db, c.rh, got, c.want, c.src)
		}
	}
}

// TestDewPointPsychroLibFile checks against testdata/psychrolib_dewpoints.csv, generated with
// PsychroLib 1.1.1 by scripts/psychrolib_dewpoints.js (header names the library and version).
// PsychroLib stops its dew-point iteration at 0.001 K, hence the 0.002 K tolerance; its
// saturation pressure is the same closed form, so that column must agree to 1e-9.
func TestDewPointPsychroLibFile(t *testing.T) {
	f, err := os.Open("testdata/psychrolib_dewpoints.csv")
	if err != nil {
		t.Fatal(err)
	}
	defer f.Close()
	sc := bufio.NewScanner(f)
	n, frost := 0, 0
	for sc.Scan() {
		line := sc.Text()
		if strings.HasPrefix(line, "#") || strings.HasPrefix(line, "dry_bulb") || line == "" {
			continue
		}
		var v [4]float64
		for i, s := range strings.Split(line, ",") {
			if v[i], err = strconv.ParseFloat(s, 64); err != nil {
				t.Fatalf("%q: %v", line, err)
			}
		}
		db, rh, wantDP, wantP := v[0], v[1], v[2], v[3]
		dp, err := DewPoint(db, rh)
		if err != nil {
			t.Errorf("DewPoint(%g, %g): %v", db, rh, err)
			continue
		}
		if math.Abs(dp-wantDP) > 0.002 {
			t.Errorf("DewPoint(%g, %g) = %.6f, PsychroLib %.6f", db, rh, dp, wantDP)
		}
		if IsFrostPoint(dp) != (wantDP < 0) {
			t.Errorf("IsFrostPoint(%g) = %v", dp, IsFrostPoint(dp))
		}
		if wantDP < 0 {
			frost++
		}
		p, _ := SaturationPressure(db)
		if rel := math.Abs(p-wantP) / wantP; rel > 1e-9 {
			t.Errorf("SaturationPressure(%g) = %.12g, PsychroLib %.12g", db, p, wantP)
		}
		n++
	}
	if n < 20 || frost < 5 {
		t.Fatalf("read %d points (%d frost points), want ≥ 20 (≥ 5)", n, frost)
	}
}

func TestDewPointProperties(t *testing.T) {
	if dp, err := DewPoint(21.5, 100); err != nil || dp != 21.5 {
		t.Errorf("DewPoint at 100 %% = %g, %v; want the dry bulb", dp, err)
	}
	for _, c := range []struct{ db, rh float64 }{
		{20, 0}, {20, -1}, {20, 100.01}, {20, math.NaN()}, {250, 50}, {-120, 50}, {math.NaN(), 50},
		{-100, 50}, // dew point below the range
	} {
		if _, err := DewPoint(c.db, c.rh); err == nil {
			t.Errorf("DewPoint(%g, %g): want error", c.db, c.rh)
		}
	}
	// Precision: the partial pressure at the dew point reproduces rh·p_ws to 1e-8 relative
	// (1e-9 K in temperature), across the ice/water switch.
	for _, c := range []struct{ db, rh float64 }{{0.5, 95}, {1, 93}, {0.01, 99.9}, {-3, 50}, {120, 10}} {
		dp, err := DewPoint(c.db, c.rh)
		if err != nil {
			t.Fatal(err)
		}
		pdp, _ := SaturationPressure(dp)
		pdb, _ := SaturationPressure(c.db)
		if rel := math.Abs(pdp-c.rh/100*pdb) / pdp; rel > 1e-8 {
			t.Errorf("DewPoint(%g, %g) = %g: p_ws(dp) off by %g", c.db, c.rh, dp, rel)
		}
	}
	if !IsFrostPoint(-0.1) || IsFrostPoint(0) || IsFrostPoint(5) {
		t.Error("IsFrostPoint: want true below 0 °C only")
	}
}

func FuzzDewPoint(f *testing.F) {
	f.Add(25.0, 80.0)
	f.Add(-10.0, 60.0)
	f.Add(0.01, 99.99)
	f.Add(200.0, 0.001)
	f.Fuzz(func(t *testing.T, db, rh float64) {
		dp, err := DewPoint(db, rh)
		if err != nil {
			return
		}
		if math.IsNaN(dp) || math.IsInf(dp, 0) || dp > db+1e-9 || dp < PsychroMinC {
			t.Fatalf("DewPoint(%g, %g) = %g", db, rh, dp)
		}
		pdp, _ := SaturationPressure(dp)
		pdb, _ := SaturationPressure(db)
		if rel := math.Abs(pdp-rh/100*pdb) / pdp; rel > 1e-7 {
			t.Fatalf("DewPoint(%g, %g) = %g: p_ws(dp) off by %g", db, rh, dp, rel)
		}
	})
}

func TestSaturationOverSupercooledWater(t *testing.T) {
	// Murphy & Koop (2005), Q. J. R. Meteorol. Soc. 131:1539, eq. 10 (liquid water, 123–332 K),
	// evaluated at these temperatures (formula from memory; it gives 611.657 Pa at the triple
	// point, the IAPWS value): over supercooled water.
	cases := []struct{ tempC, wantPa, tol float64 }{
		{-5, 421.761, 0.0005},
		{-10, 286.453, 0.0005},
		{-20, 125.504, 0.0015},
		{-40, 18.912, 0.01},
	}
	for _, c := range cases {
		got, err := SaturationPressureOverWater(c.tempC)
		if err != nil {
			t.Fatal(err)
		}
		if rel := math.Abs(got-c.wantPa) / c.wantPa; rel > c.tol {
			t.Errorf("over water at %g °C = %.4g Pa, want %g (rel. %.2g)", c.tempC, got, c.wantPa, rel)
		}
		ice, _ := SaturationPressure(c.tempC)
		if !(got > ice) {
			t.Errorf("at %g °C supercooled water (%g Pa) must hold more vapour than ice (%g Pa) (fact of physics)", c.tempC, got, ice)
		}
	}
}

func TestDewPointRHBasis(t *testing.T) {
	// −10 °C, 80 % RH over water (weather-data convention): p_v = 0.8 × 286.45 = 229.2 Pa
	// (Murphy & Koop 2005 eq. 10 for p_w); over ice ASHRAE Fundamentals 2017 ch. 1 Table 3
	// gives p_ws(−12 °C) = 217.6 Pa and (−11) = 237.6 Pa (from memory), so the frost point
	// lies between −12 and −11 °C, near −11.4 °C (interpolated in ln p).
	fp, err := DewPointRH(-10, 80, true)
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(fp-(-11.43)) > 0.05 {
		t.Errorf("frost point at −10 °C, 80 %% over water = %.3f °C, want about −11.43", fp)
	}
	// Over ice the same 80 % is drier air: p_v = 0.8 × 259.9 Pa (ASHRAE Table 3, −10 °C, from memory).
	fi, _ := DewPointRH(-10, 80, false)
	if !(fi < fp) {
		t.Errorf("over ice %.3f °C must be below over water %.3f °C", fi, fp)
	}
	// Above 0 °C the basis does not matter, and RelativeHumidity inverts DewPointRH.
	for _, c := range []struct {
		db, rh float64
		water  bool
	}{{25, 80, true}, {25, 80, false}, {-10, 80, true}, {-10, 80, false}, {-25, 60, true}} {
		dp, err := DewPointRH(c.db, c.rh, c.water)
		if err != nil {
			t.Fatal(err)
		}
		rh, err := RelativeHumidity(c.db, dp, c.water)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(rh-c.rh) > 1e-5 {
			t.Errorf("RelativeHumidity(%g, %g, %v) = %g, want %g", c.db, dp, c.water, rh, c.rh)
		}
	}
	a, _ := DewPointRH(25, 80, true)
	if math.Abs(a-21.3094) > 0.01 {
		t.Errorf("DewPointRH(25, 80) = %.4f, want 21.3094 (PsychroLib documented example)", a)
	}
	if _, err := RelativeHumidity(10, 12, true); err == nil {
		t.Error("a dew point above the air temperature must be an error")
	}
}
