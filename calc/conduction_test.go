package calc

import (
	"math"
	"testing"
)

// The closed-form layer solution (k linear in the mean temperature on each segment) agrees
// with the safeguarded Newton iteration (computed) for one to four points, heat flowing
// either way, means inside the data, across segments and on both extensions, and falls
// back to the iteration on the extension's floor.
func TestLayerInnerClosedForm(t *testing.T) {
	curves := []KCurve{
		{{20, 0.04}},
		{{0, 0.03}, {200, 0.06}},
		{{38, 0.036}, {93, 0.040}, {204, 0.049}},
		{{-18, 0.039}, {24, 0.045}, {93, 0.058}, {204, 0.084}},
		{{0, 0.05}, {100, 0.03}, {300, 0.045}}, // falling then rising
		{{0, 0.06}, {50, 0.01}},                // steeply falling: the floor is reached
	}
	exact := 0
	for _, c := range curves {
		for _, s := range []float64{0.5, 3, 20, 150} {
			for _, to := range []float64{-150, -20, 25, 60, 150, 400} {
				for _, q := range []float64{-800, -30, -0.5, 0.5, 30, 800} {
					l := &pathLayer{s: s, curve: c}
					ti, k, _, _, err := layerInner(l, to, q)
					wi, wk, _, _, werr := layerInnerIter(l, to, q)
					if err != nil || werr != nil {
						if (err == nil) != (werr == nil) {
							t.Errorf("%v s %g to %g q %g: errors differ: %v, %v", c, s, to, q, err, werr)
						}
						continue
					}
					if math.Abs(ti-wi) > 1e-9*(1+math.Abs(wi-to)) || math.Abs(k-wk) > 1e-9*wk {
						t.Errorf("%v s %g to %g q %g: closed form Ti %.12g k %.9g, iteration %.12g k %.9g", c, s, to, q, ti, k, wi, wk)
					}
					if xi, ok := innerExact(l, to, q); ok {
						exact++
						if math.Abs(xi-wi) > 1e-9*(1+math.Abs(wi-to)) {
							t.Errorf("%v s %g to %g q %g: closed form Ti %.12g, iteration %.12g", c, s, to, q, xi, wi)
						}
					}
				}
			}
		}
	}
	if exact == 0 {
		t.Error("the closed form never applied")
	}
}
