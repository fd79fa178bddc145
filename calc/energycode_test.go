package calc

import (
	"math"
	"testing"
)

func TestCodeCorrectedThickness(t *testing.T) {
	const in = 0.0254
	cases := []struct {
		r, t, K, k, want float64
		src              string
	}{
		// docs/references.md worked values [computed from the ASHRAE 90.1 footnote formula]: NPS 2
		// (r = 1.1875 in), 141–200 °F row, t = 2 in.
		{1.1875 * in, 2 * in, 0.32, 0.29, 2.343 * in, "90.1 footnote, K 0.32 k 0.29"},
		{1.1875 * in, 2 * in, 0.22, 0.29, 1.324 * in, "90.1 footnote, K 0.22 k 0.29"},
		{1.1875 * in, 2 * in, 0.29, 0.29, 2 * in, "K = k leaves the table thickness"},
		{1.1875 * in, 0, 0.32, 0.29, 0, "no table thickness"},
	}
	for _, c := range cases {
		got, err := CodeCorrectedThickness(c.r, c.t, c.K, c.k)
		if err != nil {
			t.Fatal(err)
		}
		if math.Abs(got-c.want) > 0.0005*in {
			t.Errorf("%s: %.4f in, want %.3f in", c.src, got/in, c.want/in)
		}
	}
	// Units cancel: the same example in inches.
	if got, _ := CodeCorrectedThickness(1.1875, 2, 0.32*0.1442, 0.29*0.1442); math.Abs(got-2.343) > 5e-4 {
		t.Errorf("in inches: %g, want 2.343", got)
	}
	for _, c := range [][4]float64{{0, 1, 1, 1}, {1, -1, 1, 1}, {1, 1, 0, 1}, {1, 1, 1, 0}, {math.NaN(), 1, 1, 1}, {1e-300, 1e300, 100, 1}} {
		if _, err := CodeCorrectedThickness(c[0], c[1], c[2], c[3]); err == nil {
			t.Errorf("CodeCorrectedThickness%v: want error", c)
		}
	}
}
