package calc

import (
	"errors"
	"math"
	"testing"
)

func TestOutletTempConstantResistance(t *testing.T) {
	// With q' = (T − Ta)/R' the march must reproduce the closed form
	// T_out = Ta + (T_in − Ta)·exp(−L/(ṁ cp R')) [ISO 12241 §5.1 form, from memory].
	cases := []struct {
		in, air, L, m, cp, r float64
		seg                  int
	}{
		{80, 20, 100, 0.5, 4186, 2.5, 1},
		{80, 20, 100, 0.5, 4186, 2.5, 7},
		{6, 30, 250, 0.2, 3900, 1.2, 13}, // chilled glycol gaining heat
		{150, -10, 1000, 0.01, 2000, 0.3, 50},
	}
	for _, c := range cases {
		q := func(T float64) (float64, error) { return (T - c.air) / c.r, nil }
		got, err := OutletTemp(c.in, c.air, c.L, c.m, c.cp, q, c.seg)
		if err != nil {
			t.Fatal(err)
		}
		want := c.air + (c.in-c.air)*math.Exp(-c.L/(c.m*c.cp*c.r))
		if math.Abs(got-want) > 1e-9 {
			t.Errorf("%+v: %.12f, want %.12f", c, got, want)
		}
	}
}

func TestOutletTempConverges(t *testing.T) {
	// q' = c·(T − Ta)²: a surface coefficient growing with the temperature difference. The
	// energy balance then has the closed form 1/θ_out = 1/θ_in + c·L/(ṁ cp), θ = T − Ta
	// (computed). From 2 segments on the error must fall about fourfold per doubling (the
	// mid-point rule is second order; one segment can be lucky) and be small at 256.
	const in, air, L, m, cp, c = 90.0, 10.0, 200.0, 0.05, 4186.0, 0.02
	q := func(T float64) (float64, error) { d := T - air; return c * d * math.Abs(d), nil }
	exact := air + 1/(1/(in-air)+c*L/(m*cp))
	prev := math.Inf(1)
	for _, n := range []int{2, 4, 8, 16, 32, 64, 128, 256} {
		got, err := OutletTemp(in, air, L, m, cp, q, n)
		if err != nil {
			t.Fatal(err)
		}
		e := math.Abs(got - exact)
		if e > prev/3 {
			t.Errorf("%d segments: error %g did not fall below a third of %g", n, e, prev)
		}
		prev = e
	}
	if prev > 1e-4 {
		t.Errorf("256 segments: error %g K, want ≤ 1e-4", prev)
	}
}

func TestOutletTempEdges(t *testing.T) {
	zero := func(float64) (float64, error) { return 0, nil }
	if got, err := OutletTemp(60, 20, 100, 1, 4186, zero, 10); err != nil || got != 60 {
		t.Errorf("q' = 0: %g, %v; want 60 unchanged", got, err)
	}
	lin := func(T float64) (float64, error) { return T - 20, nil }
	if got, err := OutletTemp(20, 20, 100, 1, 4186, lin, 10); err != nil || got != 20 {
		t.Errorf("T = Ta: %g, %v; want 20", got, err)
	}
	if got, err := OutletTemp(60, 20, 0, 1, 4186, lin, 10); err != nil || got != 60 {
		t.Errorf("L = 0: %g, %v; want 60", got, err)
	}
	// A very long run approaches, never crosses, the air temperature.
	if got, err := OutletTemp(60, 20, 1e6, 0.01, 4186, lin, 10); err != nil || got < 20 || got > 20.001 {
		t.Errorf("long run: %g, %v", got, err)
	}
	wrong := func(T float64) (float64, error) { return 20 - T, nil }
	boom := errors.New("boom")
	failing := func(float64) (float64, error) { return 0, boom }
	nan := func(float64) (float64, error) { return math.NaN(), nil }
	for name, call := range map[string]func() error{
		"wrong sign": func() error { _, err := OutletTemp(60, 20, 10, 1, 4186, wrong, 5); return err },
		"nil func":   func() error { _, err := OutletTemp(60, 20, 10, 1, 4186, nil, 5); return err },
		"flow 0":     func() error { _, err := OutletTemp(60, 20, 10, 0, 4186, lin, 5); return err },
		"cp 0":       func() error { _, err := OutletTemp(60, 20, 10, 1, 0, lin, 5); return err },
		"length < 0": func() error { _, err := OutletTemp(60, 20, -1, 1, 4186, lin, 5); return err },
		"segments 0": func() error { _, err := OutletTemp(60, 20, 10, 1, 4186, lin, 0); return err },
		"NaN inlet":  func() error { _, err := OutletTemp(math.NaN(), 20, 10, 1, 4186, lin, 5); return err },
		"NaN q":      func() error { _, err := OutletTemp(60, 20, 10, 1, 4186, nan, 5); return err },
		"q error":    func() error { _, err := OutletTemp(60, 20, 10, 1, 4186, failing, 5); return err },
	} {
		if call() == nil {
			t.Errorf("%s: want error", name)
		}
	}
	if _, err := OutletTemp(60, 20, 10, 1, 4186, failing, 5); !errors.Is(err, boom) {
		t.Errorf("heat-flow error not wrapped through: %v", err)
	}
}

func TestCondensateKgPerH(t *testing.T) {
	cases := []struct {
		q, hfg, want float64
		src          string
	}{
		// 100 W/m × 50 m at 1 MPa abs, h_fg 2014.6 kJ/kg [memory, standard steam tables]:
		// 5000/2014.6e3 × 3600 = 8.935 kg/h (hand calculation).
		{5000, 2014.6e3, 8.935, "hand calculation"},
		{0, 2014.6e3, 0, "no loss"},
		{-50, 2014.6e3, 0, "heat gain: no condensate"},
		{5000, 0, 0, "invalid latent heat"},
	}
	for _, c := range cases {
		if got := CondensateKgPerH(c.q, c.hfg); math.Abs(got-c.want) > 5e-4 {
			t.Errorf("%s: CondensateKgPerH(%g, %g) = %g, want %g", c.src, c.q, c.hfg, got, c.want)
		}
	}
	// With IF97 latent heat at 1 MPa abs: within 0.1 % of the steam-table answer.
	hfg, err := SteamLatentHeat(1e6)
	if err != nil {
		t.Fatal(err)
	}
	if got := CondensateKgPerH(5000, hfg); math.Abs(got-8.935)/8.935 > 1e-3 {
		t.Errorf("IF97 condensate = %g kg/h, want 8.935", got)
	}
}
