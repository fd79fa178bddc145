package calc

import (
	"math"
	"testing"
)

// Incropera & DeWitt, Fundamentals of Heat and Mass Transfer, Example 3.9 (long rods,
// D = 5 mm, h = 100 W/m²·K, base 100 °C in air at 25 °C): q ≈ 8.3 W for copper
// (k 398) and 1.6 W for stainless steel (k 14) — from memory.
func TestInfiniteFinConductance(t *testing.T) {
	d := 0.005
	p, a := math.Pi*d, math.Pi*d*d/4
	for _, c := range []struct {
		name string
		k, q float64
	}{{"copper", 398, 8.3}, {"stainless steel", 14, 1.6}} {
		got := InfiniteFinConductance(100, p, c.k, a) * 75
		if math.Abs(got-c.q) > 0.05 {
			t.Errorf("%s rod: %.3f W, want %.1f W", c.name, got, c.q)
		}
	}
	if InfiniteFinConductance(0, p, 50, a) != 0 {
		t.Error("no surface coefficient must carry no heat")
	}
}

// Geometry (a fact of mensuration): a "flange" no wider than the pipe adds only its
// two rims, 2·π·D·t; a wider flange adds its two back faces.
func TestFlangePairBareArea(t *testing.T) {
	d, th := 0.1143, 0.024
	if got, want := FlangePairBareArea(d, d, th), 2*math.Pi*d*th; math.Abs(got-want) > 1e-12 {
		t.Errorf("flush flange pair: %g m², want %g", got, want)
	}
	df := 0.2286
	back := 2 * math.Pi / 4 * (df*df - d*d)
	if got := FlangePairBareArea(d, df, 0); math.Abs(got-back) > 1e-12 {
		t.Errorf("thin flange pair: %g m², want the two annuli %g", got, back)
	}
	if v, f := ValveBareArea(d, df, th, 0.229), FlangePairBareArea(d, df, th); v <= 2*f {
		t.Errorf("a valve (%g m²) must carry more surface than its two flanged joints (%g m²)", v, 2*f)
	}
}
