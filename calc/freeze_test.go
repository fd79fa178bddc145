package calc

import (
	"errors"
	"math"
	"testing"
)

// ashraeFreezeExample is ASHRAE Handbook—Fundamentals ch. 23 freeze example (docs/references.md):
// 2-in pipe, D1 2.067 in (inside), D2 2.375 in, D3 5.375 in (1.5 in insulation),
// k 0.30 Btu·in/h·ft²·°F, water 42 °F, with the handbook's simplifications: no wall
// capacity, no outer film, R = ln(D3/D2)/(2πk), ρ 62.4 lb/ft³ and cp 1.0 Btu/lb·°F.
func ashraeFreezeExample(airF float64) FreezeInput {
	const in, lbPerFt3, btuPerLbF = 0.0254, 0.45359237 / (0.3048 * 0.3048 * 0.3048), 4186.8
	d1, d2, d3 := 2.067*in, 2.375*in, 5.375*in
	k := 0.30 * 1055.05585262 / 3600 * 0.0254 / (0.3048 * 0.3048) * 1.8 // W/m·K
	rho := 62.4 * lbPerFt3
	area := math.Pi * d1 * d1 / 4
	r := math.Log(d3/d2) / (2 * math.Pi * k)
	return FreezeInput{
		WaterCapPerM:  rho * btuPerLbF * area,
		WaterMassPerM: rho * area,
		RCoolPerM:     r,
		RFreezePerM:   r,
		InitialC:      (42 - 32) / 1.8,
		AirC:          (airF - 32) / 1.8,
		Fraction:      0.25,
	}
}

func TestFreezeTimesASHRAEExample(t *testing.T) {
	cases := []struct {
		airF, computed, handbook float64
	}{
		// ASHRAE Fundamentals ch. 23 example: 1.4 h; 1.378 h computed from its formula
		// with the dimensions above (docs/references.md).
		{-18, 1.378, 1.4},
		// Same example, air 20 °F: 4.6 h; 4.583 h computed.
		{20, 4.583, 4.6},
	}
	for _, c := range cases {
		h0, _, err := FreezeTimes(ashraeFreezeExample(c.airF))
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(h0-c.computed)/c.computed > 0.01 {
			t.Errorf("air %g °F: %.4f h to 0 °C, want %g (computed)", c.airF, h0, c.computed)
		}
		if math.Abs(h0-c.handbook)/c.handbook > 0.05 {
			t.Errorf("air %g °F: %.4f h to 0 °C, handbook %g", c.airF, h0, c.handbook)
		}
	}
}

func TestFreezeTimesFractionHandCalc(t *testing.T) {
	// Hand calculation (ISO 12241 §6.2 form): water 0.25 kg/m, R 2 K·m/W, air −10 °C,
	// 40 % frozen: 0.4 × 0.25 × 333 550 × 2 / 10 = 6671 s = 1.853056 h, after
	// cooling 1000 J/K·m × 2 × ln(20/10) = 1386.294 s = 0.385082 h from 10 °C; the wall
	// (500 J/K·m) adds half again to the cooling time: 0.577623 h.
	in := FreezeInput{WaterCapPerM: 1000, WallCapPerM: 500, WaterMassPerM: 0.25, RCoolPerM: 2, RFreezePerM: 2,
		InitialC: 10, AirC: -10, Fraction: 0.4}
	h0, hf, err := FreezeTimes(in)
	if err != nil {
		t.Fatal(err)
	}
	want0 := 1500 * 2 * math.Ln2 / 3600
	if math.Abs(h0-want0) > 1e-9 || math.Abs(h0-0.577623) > 1e-6 {
		t.Errorf("hoursTo0 = %.6f, want %.6f", h0, want0)
	}
	if math.Abs(hf-h0-1.853056) > 1e-6 {
		t.Errorf("freezing stage = %.6f h, want 1.853056", hf-h0)
	}
	// Already at 0 °C or below: no cooling stage.
	in.InitialC = 0
	if h0, hf, err := FreezeTimes(in); err != nil || h0 != 0 || math.Abs(hf-1.853056) > 1e-6 {
		t.Errorf("InitialC 0: %g, %g, %v", h0, hf, err)
	}
}

func TestFreezeTimesErrors(t *testing.T) {
	base := FreezeInput{WaterCapPerM: 1000, WaterMassPerM: 0.25, RCoolPerM: 2, RFreezePerM: 2, InitialC: 10, AirC: -10, Fraction: 0.25}
	if _, _, err := FreezeTimes(base); err != nil {
		t.Fatal(err)
	}
	for _, air := range []float64{0, 5} {
		in := base
		in.AirC = air
		if _, _, err := FreezeTimes(in); !errors.Is(err, ErrNoFreeze) {
			t.Errorf("AirC %g: err %v, want ErrNoFreeze", air, err)
		}
	}
	for name, mod := range map[string]func(*FreezeInput){
		"fraction 0":     func(in *FreezeInput) { in.Fraction = 0 },
		"fraction 1.01":  func(in *FreezeInput) { in.Fraction = 1.01 },
		"water cap 0":    func(in *FreezeInput) { in.WaterCapPerM = 0 },
		"wall cap < 0":   func(in *FreezeInput) { in.WallCapPerM = -1 },
		"mass 0":         func(in *FreezeInput) { in.WaterMassPerM = 0 },
		"R cool 0":       func(in *FreezeInput) { in.RCoolPerM = 0 },
		"R freeze < 0":   func(in *FreezeInput) { in.RFreezePerM = -1 },
		"NaN initial":    func(in *FreezeInput) { in.InitialC = math.NaN() },
		"Inf resistance": func(in *FreezeInput) { in.RCoolPerM = math.Inf(1) },
	} {
		in := base
		mod(&in)
		if _, _, err := FreezeTimes(in); err == nil || errors.Is(err, ErrNoFreeze) {
			t.Errorf("%s: err %v, want a validation error", name, err)
		}
	}
}

func TestHandbookResistance(t *testing.T) {
	// ASHRAE Fundamentals ch. 23 example: R_T = ln(D3/D2)/(2πk), D2 2.375 in, D3 5.375 in,
	// k 0.30 Btu·in/h·ft²·°F (0.0432684 W/m·K): ln(2.2632)/(2π·0.0432684) = 3.00454 K·m/W (computed).
	in := 0.0254
	layers := []Layer{{Thickness: 1.5 * in}}
	r, err := HandbookResistancePerM(2.375*in, layers, []LayerState{{K: 0.0432684}})
	if err != nil {
		t.Fatal(err)
	}
	if math.Abs(r-3.00454)/3.00454 > 1e-4 {
		t.Errorf("R_T = %.5f K·m/W, want 3.00454", r)
	}
	// Two layers add as resistances in series (Fourier's law, common practice).
	two, _ := HandbookResistancePerM(2.375*in, []Layer{{Thickness: 0.75 * in}, {Thickness: 0.75 * in}},
		[]LayerState{{K: 0.0432684}, {K: 0.0432684}})
	if math.Abs(two-r) > 1e-9 {
		t.Errorf("split layer %.6f ≠ single layer %.6f", two, r)
	}
	if _, err := HandbookResistancePerM(0.06, layers, nil); err == nil {
		t.Error("missing layer states must be an error")
	}
}
