package calc

import (
	"math"
	"testing"
)

// The analytic slope d(flux)/dTs that drives the Newton step agrees with a central
// difference of the flux (computed) for every surface kind, hot and cold, still air and
// wind, both horizontal-plate branches and the slender-cylinder correction.
func TestSurfaceSlopeMatchesFiniteDifference(t *testing.T) {
	surfaces := []struct {
		name string
		s    surface
	}{
		{"horizontal pipe", surface{kind: surfCylH, d: 0.2159, lWind: 0.2159, emit: 0.1}},
		{"vertical pipe, thick", surface{kind: surfCylV, d: 0.3, l: 3, lWind: 0.3, emit: 0.9}},
		{"vertical pipe, slender", surface{kind: surfCylV, d: 0.02, l: 6, lWind: 0.02, emit: 0.3}},
		{"vertical flat", surface{kind: surfPlateV, l: 3, lWind: 4, emit: 0.9}},
		{"vertical flat, turbulent wind", surface{kind: surfPlateV, l: 3, lWind: 40, emit: 0.9}},
		{"plate up", surface{kind: surfPlateUp, l: 0.05, lWind: 0.2, emit: 0.9}},
		{"plate up, 0.15 Ra^1/3 branch", surface{kind: surfPlateUp, l: 1, lWind: 2, emit: 0.05}},
		{"plate down", surface{kind: surfPlateDown, l: 0.5, lWind: 2, emit: 0.9}},
	}
	airs := []Air{
		{TempC: 20, SurroundingsC: 20},
		{TempC: 20, SurroundingsC: 5, WindMS: 4},
		{TempC: -25, SurroundingsC: -30, WindMS: 12},
	}
	for _, c := range surfaces {
		for _, air := range airs {
			for _, dT := range []float64{-45, -8, -0.3, 0.4, 6, 35, 150, 400} {
				ts := air.TempC + dT
				const h = 1e-4
				want := (c.s.exchange(ts+h, air).flux - c.s.exchange(ts-h, air).flux) / (2 * h)
				got := c.s.exchange(ts, air).slope
				if math.Abs(got-want) > 1e-5*math.Abs(want)+1e-7 {
					t.Errorf("%s, %+v, ΔT %g: slope %.9g, central difference %.9g", c.name, air, dT, got, want)
				}
			}
		}
	}
}

// The rough exchange of the starting guess stays within 1e-4 of the correlations' convective
// coefficient for film temperatures from about −15 to 80 °C (computed), so that the guess
// hands the Newton iteration a start within about a millikelvin.
func TestRoughExchangeIsClose(t *testing.T) {
	surfaces := []surface{
		{kind: surfCylH, d: 0.2159, lWind: 0.2159, emit: 0.1},
		{kind: surfCylV, d: 0.05, l: 3, lWind: 0.05, emit: 0.9},
		{kind: surfPlateV, l: 3, lWind: 3, emit: 0.9},
		{kind: surfPlateUp, l: 0.5, lWind: 1, emit: 0.9},
		{kind: surfPlateDown, l: 0.5, lWind: 1, emit: 0.9},
	}
	for _, s := range surfaces {
		for _, air := range []Air{{TempC: 20, SurroundingsC: 20}, {TempC: 0, SurroundingsC: 0, WindMS: 5}, {TempC: 35, SurroundingsC: 35}} {
			for _, dT := range []float64{-30, -10, -2, 2, 10, 30, 60, 90} {
				ts := air.TempC + dT
				flux, _ := s.roughExchange(ts, air)
				hRough := (flux - RadiationFlux(s.emit, ts, air.SurroundingsC)) / dT
				if h := s.exchange(ts, air).hConv; math.Abs(hRough/h-1) > 1e-4 {
					t.Errorf("kind %d, %+v, ΔT %g: rough h_conv %.6g, correlations %.6g", s.kind, air, dT, hRough, h)
				}
			}
		}
	}
}
