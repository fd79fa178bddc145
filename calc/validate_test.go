package calc

import (
	"math"
	"strings"
	"testing"
)

func TestSystemValidate(t *testing.T) {
	ok := nps4System()
	layer := func(th float64) []Layer { return []Layer{{Thickness: th, K: KCurve{{0, 0.04}}}} }
	mod := func(f func(*System)) System { s := ok; s.Layers = append([]Layer(nil), ok.Layers...); f(&s); return s }
	for _, c := range []struct {
		name string
		sys  System
		want string // "" = valid
	}{
		{"typical pipe", ok, ""},
		{"bare pipe", mod(func(s *System) { s.Layers = nil }), ""},
		{"duct", System{Shape: Duct, DuctWidth: 1, DuctHeight: 0.5, Layers: layer(0.05)}, ""},
		{"flat up", System{Shape: FlatUp, PlateLength: 1, PlateWidth: 1, Layers: layer(0.05)}, ""},
		{"unknown shape", mod(func(s *System) { s.Shape = 9 }), "unknown shape"},
		{"OD 0", mod(func(s *System) { s.PipeOD = 0 }), "outside diameter"},
		{"OD 6 m", mod(func(s *System) { s.PipeOD = 6 }), "outside diameter"},
		{"OD NaN", mod(func(s *System) { s.PipeOD = math.NaN() }), "outside diameter"},
		{"wall half the OD", mod(func(s *System) { s.PipeWall = s.PipeOD / 2 }), "pipe wall"},
		{"wall without k", mod(func(s *System) { s.WallK = 0 }), "wall conductivity"},
		{"vertical pipe without height", mod(func(s *System) { s.Shape = PipeVertical }), "height"},
		{"duct side 11 m", System{Shape: Duct, DuctWidth: 11, DuctHeight: 1}, "duct"},
		{"vertical flat without width", System{Shape: FlatVertical, Height: 3}, "vertical surface"},
		{"flat down without size", System{Shape: FlatDown}, "horizontal surface"},
		{"emittance 1.1", mod(func(s *System) { s.Emittance = 1.1 }), "emittance"},
		{"emittance −0.1", mod(func(s *System) { s.Emittance = -0.1 }), "emittance"},
		{"negative fixed coefficient", mod(func(s *System) { s.FixedCoeff = -1 }), "fixed surface coefficient"},
		{"Inf inner film", mod(func(s *System) { s.InnerCoeff = math.Inf(1) }), "inside film"},
		{"thickness 0", mod(func(s *System) { s.Layers = layer(0) }), "thickness"},
		{"thickness 1.5 m", mod(func(s *System) { s.Layers = layer(1.5) }), "thickness"},
		{"11 layers", mod(func(s *System) {
			for range 10 {
				s.Layers = append(s.Layers, layer(0.01)...)
			}
		}), "at most 10"},
		{"k 0", mod(func(s *System) { s.Layers[0].K = KCurve{{0, 0}} }), "layer 1 (mineral fiber): conductivity point 1"},
		{"limits reversed", mod(func(s *System) { s.Layers[0].HasLimits, s.Layers[0].MinC, s.Layers[0].MaxC = true, 100, 0 }), "service limits"},
	} {
		err := c.sys.Validate()
		if c.want == "" && err != nil || c.want != "" && (err == nil || !strings.Contains(err.Error(), c.want)) {
			t.Errorf("%s: Validate() = %v, want %q", c.name, err, c.want)
		}
		if _, serr := Solve(c.sys, 100, Air{TempC: 20, SurroundingsC: 20}); (serr == nil) != (err == nil) {
			t.Errorf("%s: Solve error %v disagrees with Validate %v", c.name, serr, err)
		}
	}
}

func TestSolveRejectsConditions(t *testing.T) {
	sys := nps4System()
	still := Air{TempC: 20, SurroundingsC: 20}
	for _, c := range []struct {
		name  string
		fluid float64
		air   Air
		want  string
	}{
		{"fluid NaN", math.NaN(), still, "fluid temperature"},
		{"fluid below absolute zero", -300, still, "fluid temperature"},
		{"fluid 1200 °C", 1200, still, "fluid temperature"},
		{"air Inf", 100, Air{TempC: math.Inf(1), SurroundingsC: 20}, "air temperature"},
		{"air 500 °C", 100, Air{TempC: 500, SurroundingsC: 20}, "air temperature"},
		{"surroundings NaN", 100, Air{TempC: 20, SurroundingsC: math.NaN()}, "surroundings"},
		{"negative wind", 100, Air{TempC: 20, SurroundingsC: 20, WindMS: -1}, "wind"},
		{"wind 150 m/s", 100, Air{TempC: 20, SurroundingsC: 20, WindMS: 150}, "wind"},
	} {
		_, err := Solve(sys, c.fluid, c.air)
		if err == nil || !strings.Contains(err.Error(), c.want) {
			t.Errorf("%s: Solve error %v, want %q", c.name, err, c.want)
		}
	}
}
