package calc

import (
	"math"
	"strings"
	"testing"
)

func TestKCurveAt(t *testing.T) {
	three := KCurve{{38, 0.036}, {93, 0.040}, {204, 0.049}}
	falling := KCurve{{0, 0.05}, {100, 0.03}} // slope −2e-4 per K
	for _, c := range []struct {
		name       string
		curve      KCurve
		mean       float64
		want       float64
		wantBeyond bool
	}{ // all computed by hand from the points
		{"single point is constant", KCurve{{24, 0.04}}, 500, 0.04, false},
		{"at a point", three, 93, 0.040, false},
		{"first segment", three, 65.5, 0.038, false},
		{"second segment", three, 148.5, 0.0445, false},
		{"first end", three, 38, 0.036, false},
		{"last end", three, 204, 0.049, false},
		{"above: last segment extended, not clamped", three, 315, 0.049 + 0.009/111*111, true},
		{"below: first segment extended", three, -17, 0.036 - 0.004/55*55, true},
		{"falling curve extended above", falling, 200, 0.01, true},
		{"falling curve floored at 10 % of the end point", falling, 1000, 0.003, true},
		{"rising curve floored at 10 % of the first point", three, -1000, 0.0036, true},
	} {
		k, beyond := c.curve.At(c.mean)
		if math.Abs(k-c.want) > 1e-12 || beyond != c.wantBeyond {
			t.Errorf("%s: At(%g) = %g, %v; want %g, %v", c.name, c.mean, k, beyond, c.want, c.wantBeyond)
		}
	}
}

func TestKCurveValidate(t *testing.T) {
	for _, c := range []struct {
		curve KCurve
		want  string // "" = valid
	}{
		{KCurve{{24, 0.04}}, ""},
		{KCurve{{0, 0.03}, {100, 0.04}}, ""},
		{nil, "no points"},
		{KCurve{{0, 0}}, "k 0"},
		{KCurve{{0, -0.1}}, "k -0.1"},
		{KCurve{{0, math.NaN()}}, "k NaN"},
		{KCurve{{math.Inf(1), 0.04}}, "mean temperature"},
		{KCurve{{-300, 0.04}}, "mean temperature"},
		{KCurve{{50, 0.04}, {50, 0.05}}, "strictly increasing"},
		{KCurve{{50, 0.04}, {20, 0.05}}, "strictly increasing"},
	} {
		err := c.curve.Validate()
		if c.want == "" && err != nil || c.want != "" && (err == nil || !strings.Contains(err.Error(), c.want)) {
			t.Errorf("%v: Validate() = %v, want %q", c.curve, err, c.want)
		}
	}
}
