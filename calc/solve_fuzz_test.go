package calc

import (
	"math"
	"testing"
)

// FuzzSolve feeds random geometry, temperatures and conductivities: Solve must not panic,
// hang or return NaN/Inf; it returns an error or a finite result within bounded
// evaluations, with the surface between the fluid and environment temperatures.
func FuzzSolve(f *testing.F) {
	f.Add(uint8(0), 0.1143, 0.006, 0.05, 0.0, 0.036, 0.049, 180.0, 20.0, 20.0, 0.0, 0.1, 0.0, 0.0)
	f.Add(uint8(1), 0.0603, 0.0, 0.025, 0.025, 0.04, 0.03, -40.0, 30.0, 25.0, 3.0, 0.9, 0.0, 500.0)
	f.Add(uint8(2), 3.0, 0.0, 0.1, 0.0, 0.05, 0.09, 600.0, -20.0, -40.0, 40.0, 0.0, 0.0, 0.0)
	f.Add(uint8(3), 1.0, 0.0, 1e-4, 1.0, 1e-3, 2.0, -190.0, 35.0, 35.0, 0.0, 1.0, 0.0, 1e12)
	f.Add(uint8(4), 0.5, 0.0, 0.05, 0.0, 0.04, 0.001, 300.0, 20.0, 20.0, 0.0, 0.5, 12.0, 0.0)
	f.Add(uint8(5), 0.6, 0.0, 0.05, 0.02, 0.035, 0.05, 10.0, 32.0, 32.0, 2.0, 0.05, 0.0, 0.0)
	f.Fuzz(func(t *testing.T, shape uint8, size, wall, t1, t2, k1, k2, fluid, airC, surC, wind, eps, fixed, inner float64) {
		sys := System{
			Shape: Shape(shape % 6), PipeOD: size, PipeWall: wall, WallK: 45, InnerCoeff: inner,
			DuctWidth: size, DuctHeight: size / 2, Height: 3 * size, Width: size, PlateLength: size, PlateWidth: 2 * size,
			Emittance: eps, FixedCoeff: fixed,
		}
		// k1 at 0 °C, k2 at 200 °C: rising, falling (floored when extended) or flat.
		curve := KCurve{{0, k1}, {200, k2}}
		if t1 != 0 {
			sys.Layers = append(sys.Layers, Layer{Thickness: t1, K: curve, HasLimits: true, MinC: -50, MaxC: 250})
		}
		if t2 != 0 {
			sys.Layers = append(sys.Layers, Layer{Thickness: t2, K: KCurve{{50, k2}}})
		}
		air := Air{TempC: airC, SurroundingsC: surC, WindMS: wind}
		r, err := Solve(sys, fluid, air)
		if err != nil {
			return
		}
		if !resultFinite(r) {
			t.Fatalf("non-finite result %+v", r)
		}
		if r.Evaluations > 4*solveMaxEval {
			t.Fatalf("%d evaluations", r.Evaluations)
		}
		lo := math.Min(fluid, math.Min(airC, surC))
		hi := math.Max(fluid, math.Max(airC, surC))
		if r.SurfaceC < lo-1e-6 || r.SurfaceC > hi+1e-6 {
			t.Fatalf("surface %g outside %g…%g", r.SurfaceC, lo, hi)
		}
		for _, l := range r.Layers {
			if !(l.K > 0) {
				t.Fatalf("layer k %g", l.K)
			}
		}
	})
}
