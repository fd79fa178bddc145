package calc

import (
	"math"
	"testing"
)

// Sunlight on the jacket: with a fixed surface coefficient h and a constant k, the steady
// balance is linear and solves by hand (the sol-air form of ASHRAE Fundamentals, heat
// balance of a sunlit surface): conducted = h·(ts − Ta) − absorbed, with absorbed α·G on a
// face square to the sun and α·G·D/(πD) = α·G/π per m² of a pipe's surface.
func TestSolarGainOnTheJacket(t *testing.T) {
	k, h, alpha, g, tf, ta := 0.04, 10.0, 0.9, 1000.0, 20.0, 30.0
	air := Air{TempC: ta, SurroundingsC: ta, SolarWm2: g}
	flat := System{Shape: FlatUp, PlateLength: 1, PlateWidth: 1, FixedCoeff: h, Emittance: 0.9, SolarAbsorptance: alpha,
		Layers: []Layer{{Thickness: 0.05, K: KCurve{{MeanC: 20, K: k}}}}}
	r, err := Solve(flat, tf, air)
	if err != nil {
		t.Fatal(err)
	}
	c := k / 0.05
	want := (c*tf + h*ta + alpha*g) / (c + h) // 112.6 °C
	if math.Abs(r.SurfaceC-want) > 1e-4 {
		t.Errorf("sunlit flat surface %v °C, by hand %v °C", r.SurfaceC, want)
	}
	pipe := System{Shape: PipeHorizontal, PipeOD: 0.1143, FixedCoeff: h, Emittance: 0.9, SolarAbsorptance: alpha,
		Layers: []Layer{{Thickness: 0.05, K: KCurve{{MeanC: 20, K: k}}}}}
	r, err = Solve(pipe, tf, air)
	if err != nil {
		t.Fatal(err)
	}
	r1, r2 := 0.1143/2, 0.1143/2+0.05
	// 2πk(tf − ts)/ln(r2/r1) = 2π·r2·(h(ts − ta) − αG/π)
	a := k / math.Log(r2/r1)
	want = (a*tf + r2*h*ta + r2*alpha*g/math.Pi) / (a + r2*h)
	if math.Abs(r.SurfaceC-want) > 1e-4 {
		t.Errorf("sunlit pipe surface %v °C, by hand %v °C", r.SurfaceC, want)
	}
	// With the correlations, sunlight only warms a hot pipe's jacket.
	hot := System{Shape: PipeHorizontal, PipeOD: 0.0603, Emittance: 0.15, SolarAbsorptance: 0.35,
		Layers: []Layer{{Thickness: 0.0254, K: KCurve{{MeanC: 20, K: 0.04}}}}}
	shade, err := Solve(hot, 150, Air{TempC: 32, SurroundingsC: 32})
	if err != nil {
		t.Fatal(err)
	}
	sun, err := Solve(hot, 150, Air{TempC: 32, SurroundingsC: 32, SolarWm2: 1000})
	if err != nil {
		t.Fatal(err)
	}
	if !(sun.SurfaceC > shade.SurfaceC+1) || !(sun.HeatFlowPerM < shade.HeatFlowPerM) {
		t.Errorf("sun %v °C / %v W/m, shade %v °C / %v W/m", sun.SurfaceC, sun.HeatFlowPerM, shade.SurfaceC, shade.HeatFlowPerM)
	}
}
